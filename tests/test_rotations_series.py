"""Tests of amalgebra.rotations.series: composition of rotations and the Clebsch-Gordan series."""

import math

import numpy as np
import pytest
import scipy.linalg
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import Float, Poly, Rational, Symbol, cos, expand, expand_trig, eye, pi, simplify, sin, symbols, zeros

from amalgebra.errors import NotNumericError, ProjectionError
from amalgebra.rotations.wigner import RotationElement, small_d, small_d_matrix, wigner_D_matrix
from amalgebra.rotations.series import clebsch_gordan_series, compose_euler_angles, compose_rotations

BETA = Symbol("beta", real=True)
ALPHA, GAMMA = symbols("alpha gamma", real=True)
_C, _S = symbols("c s")


def half_angle_zero(expr, beta=BETA):
    """Exact ``expr == 0`` for polynomials in cos/sin(beta/2): reduce modulo c**2 + s**2 - 1 (written here)."""
    mapped = expr.xreplace({cos(beta / 2): _C, sin(beta / 2): _S})
    assert beta not in mapped.free_symbols, mapped
    _, rem = Poly(expand(mapped), _S, _C).div(Poly(_S ** 2 + _C ** 2 - 1, _S, _C))
    return rem.is_zero


def numeric(matrix):
    return np.array(matrix.evalf(20).tolist(), dtype=complex)


def expm_D(j, a, b, c):
    """exp(-i a Jz) exp(-i b Jy) exp(-i c Jz) with numpy-built J matrices (basis m = j..-j, Condon-Shortley)."""
    ms = np.arange(j, -j - 1, -1)
    dim = len(ms)
    jz = np.diag(ms).astype(complex)
    jp = np.zeros((dim, dim), dtype=complex)
    for col in range(1, dim):
        jp[col - 1, col] = math.sqrt((j - ms[col]) * (j + ms[col] + 1))
    jy = (jp - jp.conj().T) / 2j
    return scipy.linalg.expm(-1j * a * jz) @ scipy.linalg.expm(-1j * b * jy) @ scipy.linalg.expm(-1j * c * jz)


def index(j, m):
    return int(Rational(j) - Rational(m))


@given(tj=st.integers(0, 6),
       angles=st.lists(st.floats(-7, 7, allow_nan=False), min_size=6, max_size=6))
def test_composition_and_unitarity_numeric(tj, angles):
    j = Rational(tj, 2)
    first = [Float(x, 30) for x in angles[:3]]
    second = [Float(x, 30) for x in angles[3:]]
    result = compose_rotations(j, first, second)
    prod = numeric(result.matrix)
    # independent: scipy expm products
    assert np.allclose(prod, expm_D(tj / 2, *angles[:3]) @ expm_D(tj / 2, *angles[3:]), atol=1e-10)
    assert np.allclose(numeric(wigner_D_matrix(j, *result.angles)), prod, atol=1e-10)
    assert result.defect < 1e-10
    assert np.allclose(prod @ prod.conj().T, np.eye(tj + 1), atol=1e-10)


@pytest.mark.parametrize("j", ["1/2", "3/2"])
def test_composed_angles_right_sign_for_half_integer(j):
    # a 2 pi turn split in two: R(0, 3pi/2, 0) R(0, pi/2, 0) = exp(-2 pi i Jy) = -1 for half-integer j
    result = compose_rotations(j, (0, 3 * pi / 2, 0), (0, pi / 2, 0))
    n = int(2 * Rational(j)) + 1
    assert result.matrix == -eye(n)
    assert np.allclose(numeric(wigner_D_matrix(j, *result.angles)), -np.eye(n), atol=1e-12)


@pytest.mark.parametrize("first, second, beta", [
    ((0, 0, 0.5),     (0.3, 0, 0),                        0.0),
    ((0.2, 1.0, 0),   (0, -1.0, -0.2),                    0.0),
    ((0.5, 3.0, 0.0), (0.0, math.pi - 3.0, 0.7),          math.pi),
])
def test_compose_euler_angles_degenerate_beta(first, second, beta):
    three = compose_euler_angles(first, second)
    assert abs(three[1] - beta) < 1e-12
    for j in (0.5, 1.0, 1.5):
        # independent: scipy expm; beta = 0 or pi leaves only one combination of alpha, gamma defined
        assert np.allclose(expm_D(j, *first) @ expm_D(j, *second), expm_D(j, *three), atol=1e-12)


def test_compose_euler_angles_against_rotation_matrices():
    rng = np.random.default_rng(5)
    for _ in range(5):
        one, two = rng.uniform(-4, 4, 3), rng.uniform(-4, 4, 3)
        three = compose_euler_angles(tuple(one), tuple(two))
        assert 0 <= three[1] <= math.pi + 1e-12
        # independent: j = 1 via scipy expm
        assert np.allclose(expm_D(1.0, *one) @ expm_D(1.0, *two), expm_D(1.0, *three), atol=1e-12)


@pytest.mark.parametrize("j", ["1/2", 1, "3/2"])
def test_exact_composition_about_y(j):
    b1, b2 = symbols("b1 b2", real=True)
    result = compose_rotations(j, (0, b1, 0), (0, b2, 0))
    assert result.angles is None and result.defect is None
    target = small_d_matrix(j, b1 + b2).applyfunc(expand_trig)
    # common practice, no source: rotations about one axis add their angles
    assert simplify(result.matrix - target) == zeros(*target.shape)




# --- Clebsch-Gordan series -------------------------------------------------------------------

def test_series_structure_d1_squared():
    series = clebsch_gordan_series(1, 0, 0, 1, 0, 0, ALPHA, BETA, GAMMA)
    # PDG CG table: <1 0 1 0|2 0> = sqrt(2/3), <1 0 1 0|0 0> = -sqrt(1/3); squared: 2/3 and 1/3
    expected = (RotationElement(0, 0, 0, ALPHA, BETA, GAMMA) / 3
                + 2 * RotationElement(2, 0, 0, ALPHA, BETA, GAMMA) / 3)
    assert series == expected


SERIES_CASES = [
    # j1,    m1p,    m1,     j2,    m2p,    m2
    ("1/2",  "1/2",  "1/2",  "1/2", "-1/2", "1/2"),
    ("1/2",  "1/2",  "-1/2", 1,     0,      1),
    (1,      1,      0,      1,     0,      0),
    (1,      -1,     1,      "3/2", "1/2",  "-3/2"),
    (2,      1,      -2,     1,     1,      1),
    ("3/2",  "-1/2", "3/2",  "5/2", "3/2",  "-1/2"),
]


@pytest.mark.parametrize("j1, m1p, m1, j2, m2p, m2", SERIES_CASES)
def test_series_matches_product_numerically(j1, m1p, m1, j2, m2p, m2):
    rng = np.random.default_rng(17)
    a, b, c = rng.uniform(-3, 3, 3)
    angles = (Float(a, 30), Float(b, 30), Float(c, 30))
    series = clebsch_gordan_series(j1, m1p, m1, j2, m2p, m2, *angles)
    evaluated = clebsch_gordan_series(j1, m1p, m1, j2, m2p, m2, *angles, evaluate=True)
    # independent: product of scipy expm matrix elements
    d1 = expm_D(float(Rational(j1)), a, b, c)[index(j1, m1p), index(j1, m1)]
    d2 = expm_D(float(Rational(j2)), a, b, c)[index(j2, m2p), index(j2, m2)]
    assert abs(complex(series.doit().evalf(25)) - d1 * d2) < 1e-12
    assert abs(complex(evaluated.evalf(25)) - d1 * d2) < 1e-12
    assert abs(d1 * d2) > 1e-6  # the case is not a trivial zero


@pytest.mark.parametrize("j1, j2", [("1/2", "1/2"), ("1/2", 1), (1, 1), (1, "3/2")])
def test_series_exact_for_small_d(j1, j2):
    proj1 = [Rational(j1) - k for k in range(int(2 * Rational(j1)) + 1)]
    proj2 = [Rational(j2) - k for k in range(int(2 * Rational(j2)) + 1)]
    for m1p in proj1:
        for m2 in proj2:
            m1, m2p = proj1[-1], proj2[0]
            series = clebsch_gordan_series(j1, m1p, m1, j2, m2p, m2, 0, BETA, 0, evaluate=True)
            product = small_d(j1, m1p, m1, BETA) * small_d(j2, m2p, m2, BETA)
            # Edmonds 1957, eq. 4.3.1 (here checked exactly as a polynomial identity)
            assert half_angle_zero(series - product)


def test_series_errors():
    with pytest.raises(ProjectionError):
        clebsch_gordan_series(1, Rational(1, 2), 0, 1, 0, 0, ALPHA, BETA, GAMMA)
    with pytest.raises(NotNumericError):
        clebsch_gordan_series(Symbol("j"), 0, 0, 1, 0, 0, ALPHA, BETA, GAMMA)
    with pytest.raises(TypeError):
        clebsch_gordan_series(1, 0, 0, 1, 0, 0, "a", BETA, GAMMA)
    with pytest.raises(NotNumericError):
        compose_euler_angles((ALPHA, 0, 0), (0, 0, 0))
    with pytest.raises(NotNumericError):
        compose_euler_angles((0, 1j, 0), (0, 0, 0))
