"""Tests of amalgebra.rotations.harmonics: Y_lm, C^k_q, the addition theorem and three-harmonic integrals."""

import math

import numpy as np
import pytest
import scipy.special
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import (
    Float, I, Poly, Rational, Symbol, conjugate, cos, exp, expand, expand_trig, factorial, integrate, lambdify,
    legendre, pi, reduced, simplify,
    sin, sqrt, symbols,
)

import amalgebra.rotations.harmonics as harmonics
from amalgebra.errors import NotNumericError, ProjectionError, QuantumNumberError
from amalgebra.rotations.harmonics import (
    addition_theorem, check_addition_theorem, harmonic_triple_integral, racah_harmonic, spherical_harmonic,
)
from amalgebra.rotations.wigner import wigner_D

THETA, PHI = symbols("theta phi", real=True)
T, P = THETA, PHI


def as_complex(expr, theta, phi):
    return complex(expr.xreplace({THETA: Float(theta, 30), PHI: Float(phi, 30)}).evalf(25))


def scipy_y(l, m, theta, phi):
    # scipy 1.17: sph_harm_y(n, m, theta=polar, phi=azimuth), Condon-Shortley phase included
    return complex(scipy.special.sph_harm_y(l, m, theta, phi))


# Particle Data Group, "Clebsch-Gordan coefficients, spherical harmonics, and d functions" table
PDG_Y = [
    (0, 0, 1 / sqrt(4 * pi)),
    (1, 0, sqrt(3 / (4 * pi)) * cos(T)),
    (1, 1, -sqrt(3 / (8 * pi)) * sin(T) * exp(I * P)),
    (2, 0, sqrt(5 / (4 * pi)) * (Rational(3, 2) * cos(T) ** 2 - Rational(1, 2))),
    (2, 1, -sqrt(15 / (8 * pi)) * sin(T) * cos(T) * exp(I * P)),
    (2, 2, sqrt(15 / (2 * pi)) / 4 * sin(T) ** 2 * exp(2 * I * P)),
]


@pytest.mark.parametrize("l, m, expected", PDG_Y)
def test_spherical_harmonics_pdg_table(l, m, expected):
    got = spherical_harmonic(l, m, THETA, PHI)
    assert expand(got - expected) == 0
    assert got != 0
    # PDG table: Y_l^{-m} = (-1)^m conj(Y_l^m)
    assert expand(spherical_harmonic(l, -m, THETA, PHI) - (-1) ** m * conjugate(expected)) == 0


@pytest.mark.parametrize("l", range(0, 9))
def test_spherical_harmonics_against_scipy(l):
    rng = np.random.default_rng(100 + l)
    for m in range(-l - 1, l + 2):
        theta, phi = rng.uniform(0, np.pi), rng.uniform(0, 2 * np.pi)
        got = as_complex(spherical_harmonic(l, m, THETA, PHI), theta, phi)
        expected = scipy_y(l, m, theta, phi) if abs(m) <= l else 0.0  # independent: scipy.special
        assert abs(got - expected) < 1e-12


def test_spherical_harmonic_numeric_angles_exact():
    # PDG table: Y_1^0 = sqrt(3/(4 pi)) cos(theta); cos(pi/3) = 1/2
    assert spherical_harmonic(1, 0, pi / 3, 0) == sqrt(3) / (4 * sqrt(pi))
    assert spherical_harmonic(3, 3, 0, PHI) == 0


@pytest.mark.parametrize("l", range(0, 6))
def test_harmonic_is_conjugate_D_element(l):
    # the defining relation Y_lm = sqrt((2l+1)/(4pi)) conj(D^l_{m0}(phi, theta, 0)) (Edmonds 1957, eq. 4.1.25),
    # checked against the half-angle form of amalgebra.rotations.wigner as an exact polynomial identity
    c, s = symbols("c s")
    for m in range(-l, l + 1):
        y = spherical_harmonic(l, m, THETA, PHI)
        d = sqrt(Rational(2 * l + 1, 4) / pi) * conjugate(wigner_D(l, m, 0, PHI, THETA, 0))
        diff = expand((y - d) * exp(-I * m * PHI))
        diff = diff.xreplace({cos(THETA / 2): c, sin(THETA / 2): s,
                              cos(THETA): c ** 2 - s ** 2, sin(THETA): 2 * c * s})
        assert diff.free_symbols <= {c, s}
        _, rem = Poly(expand(diff), s, c).div(Poly(s ** 2 + c ** 2 - 1, s, c))
        assert rem.is_zero


@pytest.mark.parametrize("k", range(0, 7))
def test_racah_harmonics(k):
    # DLMF 14.30.? from memory: C^k_0(theta, phi) = P_k(cos theta)
    assert expand(racah_harmonic(k, 0, THETA, PHI) - legendre(k, cos(THETA))) == 0
    for q in range(-k, k + 1):
        lhs = racah_harmonic(k, q, THETA, PHI)
        rhs = sqrt(4 * pi / (2 * k + 1)) * spherical_harmonic(k, q, THETA, PHI)
        assert expand(lhs - rhs) == 0 != lhs  # the design.md convention C^k_q = sqrt(4 pi/(2k+1)) Y_kq


def gauss_sphere(n_theta=40, n_phi=64):
    x, w = np.polynomial.legendre.leggauss(n_theta)
    theta = np.arccos(x)
    phi = np.arange(n_phi) * 2 * np.pi / n_phi
    tt, pp = np.meshgrid(theta, phi, indexing="ij")
    weights = np.outer(w, np.full(n_phi, 2 * np.pi / n_phi))
    return tt, pp, weights


def test_orthonormality_by_quadrature():
    tt, pp, weights = gauss_sphere()
    pairs = [(l, m) for l in range(4) for m in range(-l, l + 1)]
    values = {}
    for l, m in pairs:
        f = lambdify((THETA, PHI), spherical_harmonic(l, m, THETA, PHI), "numpy")
        values[l, m] = np.broadcast_to(f(tt, pp), tt.shape)
    for a in pairs:
        for b in pairs:
            overlap = np.sum(weights * np.conj(values[a]) * values[b])
            # common practice, no source: orthonormality; numpy Gauss-Legendre quadrature
            assert abs(overlap - (1 if a == b else 0)) < 1e-12


@pytest.mark.parametrize("l", range(0, 6))
def test_addition_theorem_numeric(l):
    rng = np.random.default_rng(7 + l)
    t1, p1, t2, p2 = rng.uniform(0, np.pi), rng.uniform(0, 6), rng.uniform(0, np.pi), rng.uniform(0, 6)
    sides = addition_theorem(l, Float(t1, 30), Float(p1, 30), Float(t2, 30), Float(p2, 30))
    cos_gamma = np.cos(t1) * np.cos(t2) + np.sin(t1) * np.sin(t2) * np.cos(p1 - p2)
    # independent: scipy.special.eval_legendre and sph_harm_y
    rhs = (2 * l + 1) / (4 * np.pi) * scipy.special.eval_legendre(l, cos_gamma)
    lhs = sum(np.conj(scipy_y(l, m, t1, p1)) * scipy_y(l, m, t2, p2) for m in range(-l, l + 1))
    assert abs(complex(sides.rhs.evalf(25)) - rhs) < 1e-12
    assert abs(complex(sides.lhs.evalf(25)) - lhs) < 1e-12
    assert abs(lhs - rhs) < 1e-12


@pytest.mark.parametrize("l", [1, 2, 3])
def test_addition_theorem_symbolic_sides(l):
    t1, p1, t2, p2 = symbols("t1 p1 t2 p2", real=True)
    sides = addition_theorem(l, t1, p1, t2, p2)
    if l == 1:
        # Edmonds 1957, eq. 4.6.6 with P_1(x) = x
        assert sides.rhs == 3 / (4 * pi) * (cos(t1) * cos(t2) + sin(t1) * sin(t2) * cos(p1 - p2))
    # exact: rewrite in cos/sin of the four angles, reduce modulo sin^2 + cos^2 = 1 (written here)
    diff = expand(expand_trig((sides.lhs - sides.rhs).rewrite(cos)))
    gens, relations = [], []
    for angle in (t1, p1, t2, p2):
        s, c = Symbol(f"s_{angle}"), Symbol(f"c_{angle}")
        diff = diff.xreplace({sin(angle): s, cos(angle): c})
        gens += [s, c]
        relations.append(s ** 2 + c ** 2 - 1)
    assert not diff.free_symbols & {t1, p1, t2, p2}
    # the relations have pairwise coprime leading terms, so they form a Groebner basis
    _, remainder = reduced(diff, relations, *gens, order="lex")
    assert remainder == 0


@pytest.mark.parametrize("l", range(0, 6))
def test_check_addition_theorem_exact(l):
    assert check_addition_theorem(l) is True


def test_check_addition_theorem_detects_a_wrong_harmonic(monkeypatch):
    original = harmonics._harmonic_parts

    def broken(l, m):
        inside, factor, coeffs = original(l, m)
        return (inside, factor * 2, coeffs) if m == 1 else (inside, factor, coeffs)

    monkeypatch.setattr(harmonics, "_harmonic_parts", broken)
    assert check_addition_theorem(2) is False


def threej_000(l1, l2, l3):
    """(l1 l2 l3; 0 0 0) closed form, DLMF 34.3.5 (from memory), 2g = l1 + l2 + l3 even."""
    if (l1 + l2 + l3) % 2 or not abs(l1 - l2) <= l3 <= l1 + l2:
        return 0
    g = (l1 + l2 + l3) // 2
    return ((-1) ** g * sqrt(factorial(2 * g - 2 * l1) * factorial(2 * g - 2 * l2) * factorial(2 * g - 2 * l3)
                             / factorial(2 * g + 1))
            * factorial(g) / (factorial(g - l1) * factorial(g - l2) * factorial(g - l3)))


@pytest.mark.parametrize("l1, l2, l3", [(0, 0, 0), (1, 1, 0), (1, 1, 2), (2, 2, 2), (2, 3, 3), (3, 3, 4),
                                        (4, 2, 6), (5, 3, 4)])
def test_gaunt_m_zero_against_dlmf(l1, l2, l3):
    # DLMF 34.3.22 (from memory) with all m = 0: sqrt(prod(2l+1)/(4 pi)) (l1 l2 l3; 0 0 0)^2
    expected = sqrt(Rational((2 * l1 + 1) * (2 * l2 + 1) * (2 * l3 + 1), 4) / pi) * threej_000(l1, l2, l3) ** 2
    got = harmonic_triple_integral(l1, 0, l2, 0, l3, 0)
    assert simplify(got - expected) == 0
    assert (got == 0) == ((l1 + l2 + l3) % 2 == 1)


GAUNT_CASES = [
    # l1, m1,  l2, m2, l3, m3
    (1,   1,   1,  -1, 2,  0),
    (1,   1,   1,  0,  2,  -1),
    (2,   -2,  1,  1,  3,  1),
    (2,   1,   2,  1,  2,  -2),
    (3,   -1,  2,  2,  3,  -1),
    (4,   3,   2,  -1, 4,  -2),
    (3,   2,   3,  -3, 2,  1),
]


def test_gaunt_against_quadrature():
    tt, pp, weights = gauss_sphere(40, 32)
    for l1, m1, l2, m2, l3, m3 in GAUNT_CASES:
        integrand = (scipy.special.sph_harm_y(l1, m1, tt, pp) * scipy.special.sph_harm_y(l2, m2, tt, pp)
                     * scipy.special.sph_harm_y(l3, m3, tt, pp))
        expected = np.sum(weights * integrand)  # independent: scipy harmonics, numpy quadrature
        got = complex(harmonic_triple_integral(l1, m1, l2, m2, l3, m3).evalf(25))
        assert abs(got - expected) < 1e-12
        assert abs(expected) > 1e-3
        conj_integrand = np.conj(scipy.special.sph_harm_y(l1, -m1, tt, pp)) * integrand / \
            scipy.special.sph_harm_y(l1, m1, tt, pp)
        expected_conj = np.sum(weights * conj_integrand)
        got_conj = complex(harmonic_triple_integral(l1, -m1, l2, m2, l3, m3, conjugate_first=True).evalf(25))
        assert abs(got_conj - expected_conj) < 1e-12


def test_gaunt_exact_by_symbolic_integration():
    # sympy.integrate of the product of our (scipy-checked) harmonics: an independent exact route
    for l1, m1, l2, m2, l3, m3 in [(1, 1, 1, -1, 2, 0), (2, -2, 1, 1, 3, 1)]:
        product = (spherical_harmonic(l1, m1, THETA, PHI) * spherical_harmonic(l2, m2, THETA, PHI)
                   * spherical_harmonic(l3, m3, THETA, PHI))
        exact = integrate(expand(simplify(product)) * sin(THETA), (THETA, 0, pi), (PHI, 0, 2 * pi))
        assert simplify(exact - harmonic_triple_integral(l1, m1, l2, m2, l3, m3)) == 0 != exact


@given(ls=st.tuples(st.integers(0, 5), st.integers(0, 5), st.integers(0, 5)), data=st.data())
def test_gaunt_selection_rules(ls, data):
    ms = [data.draw(st.integers(-l - 1, l + 1)) for l in ls]
    value = harmonic_triple_integral(ls[0], ms[0], ls[1], ms[1], ls[2], ms[2])
    allowed = (sum(ms) == 0 and sum(ls) % 2 == 0 and abs(ls[0] - ls[1]) <= ls[2] <= ls[0] + ls[1]
               and all(abs(m) <= l for l, m in zip(ls, ms)))
    # common practice, no source: selection rules of the Gaunt integral (parity, triangle, m-sum)
    if not allowed:
        assert value == 0
    # symmetric under permutations of the three harmonics (the integrand commutes)
    assert value == harmonic_triple_integral(ls[1], ms[1], ls[2], ms[2], ls[0], ms[0])


@pytest.mark.parametrize("call, error", [
    (lambda: spherical_harmonic(Rational(1, 2), Rational(1, 2), THETA, PHI), QuantumNumberError),
    (lambda: spherical_harmonic(-1, 0, THETA, PHI), QuantumNumberError),
    (lambda: spherical_harmonic(Symbol("l"), 0, THETA, PHI), NotNumericError),
    (lambda: spherical_harmonic(1, Rational(1, 2), THETA, PHI), ProjectionError),
    (lambda: spherical_harmonic(1, 0, "theta", PHI), TypeError),
    (lambda: racah_harmonic(2, 0, THETA, None), NotNumericError),
    (lambda: addition_theorem(Rational(3, 2), 0, 0, 0, 0), QuantumNumberError),
    (lambda: harmonic_triple_integral(1, 0, 1, 0, Rational(1, 2), Rational(1, 2)), QuantumNumberError),
])
def test_errors(call, error):
    with pytest.raises(error):
        call()


def test_large_l_harmonic_normalisation():
    # DLMF 14.30.? (from memory) Y_l^l = (-1)^l sqrt((2l+1)!/(4 pi)) / (2^l l!) sin^l(theta) e^{i l phi}
    l = 20
    expected = ((-1) ** l * sqrt(factorial(2 * l + 1) / (4 * pi)) / (2 ** l * factorial(l))
                * sin(THETA) ** l * exp(I * l * PHI))
    assert expand(spherical_harmonic(l, l, THETA, PHI) - expected) == 0
    theta, phi = 1.234, 0.4
    assert abs(as_complex(spherical_harmonic(30, -7, THETA, PHI), theta, phi) - scipy_y(30, -7, theta, phi)) < 1e-12
    assert math.isfinite(abs(scipy_y(30, -7, theta, phi)))
