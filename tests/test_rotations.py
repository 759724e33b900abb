"""Tests of amalgebra.rotations.wigner and amalgebra.rotations.series (Wigner D/d, composition, CG series)."""

import math
import pickle

import numpy as np
import pytest
import scipy.linalg
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import (
    Add, Basic, Float, Poly, Rational, S, Symbol, cos, eye, expand, latex, legendre, pi, pretty, sin, sqrt,
    srepr, symbols,
)

from amalgebra.errors import NotNumericError, ProjectionError, QuantumNumberError
from amalgebra.rotations.wigner import (
    RotationElement, clear_rotation_caches, inverse_euler_angles, small_d, small_d_matrix, wigner_D,
    wigner_D_matrix,
)

BETA = Symbol("beta", real=True)
ALPHA, GAMMA = symbols("alpha gamma", real=True)
_C, _S = symbols("c s")


def half_angle_zero(expr, beta=BETA):
    """Exact test for ``expr == 0`` when expr is a polynomial in cos/sin of beta and beta/2.

    Written here, independently of the library: map to c = cos(beta/2), s = sin(beta/2)
    and reduce modulo c**2 + s**2 - 1 (a Groebner basis of one element).
    """
    mapped = expr.xreplace({cos(beta / 2): _C, sin(beta / 2): _S,
                            cos(beta): _C ** 2 - _S ** 2, sin(beta): 2 * _C * _S})
    assert beta not in mapped.free_symbols, mapped
    poly = Poly(expand(mapped), _S, _C)
    _, rem = poly.div(Poly(_S ** 2 + _C ** 2 - 1, _S, _C))
    return rem.is_zero


def numeric(matrix):
    return np.array(matrix.evalf(20).tolist(), dtype=complex)


def j_matrices(j):
    """Jz, Jy as numpy arrays, basis m = j..-j, Condon-Shortley phase (built here with numpy)."""
    ms = np.arange(j, -j - 1, -1)
    dim = len(ms)
    jz = np.diag(ms).astype(complex)
    jp = np.zeros((dim, dim), dtype=complex)
    for col in range(1, dim):
        m = ms[col]
        jp[col - 1, col] = math.sqrt((j - m) * (j + m + 1))
    jy = (jp - jp.conj().T) / 2j
    return jz, jy


def expm_D(j, a, b, c):
    jz, jy = j_matrices(j)
    return scipy.linalg.expm(-1j * a * jz) @ scipy.linalg.expm(-1j * b * jy) @ scipy.linalg.expm(-1j * c * jz)


def wigner_formula(j, mp, m, beta):
    """Wigner's sum written out independently with sympy.factorial (Edmonds 1957, eq. 4.1.15)."""
    from sympy import factorial
    j, mp, m = Rational(j), Rational(mp), Rational(m)
    pref = sqrt(factorial(j + m) * factorial(j - m) * factorial(j + mp) * factorial(j - mp))
    terms = []
    k = max(0, m - mp)
    while k <= min(j + m, j - mp):
        terms.append((-1) ** (k - m + mp) / (factorial(j + m - k) * factorial(k) * factorial(j - mp - k)
                                              * factorial(k - m + mp))
                     * cos(beta / 2) ** (2 * j - 2 * k + m - mp) * sin(beta / 2) ** (2 * k - m + mp))
        k += 1
    return pref * Add(*terms)


def all_projections(j):
    j = Rational(j)
    return [j - k for k in range(int(2 * j) + 1)]


b = BETA
c2, s2 = cos(b / 2), sin(b / 2)
# Particle Data Group, "Clebsch-Gordan coefficients, spherical harmonics, and d functions" (RPP table 45.x)
PDG_D = [
    ("1/2", "1/2", "1/2", c2),
    ("1/2", "1/2", "-1/2", -s2),
    (1, 1, 1, (1 + cos(b)) / 2),
    (1, 1, 0, -sin(b) / sqrt(2)),
    (1, 1, -1, (1 - cos(b)) / 2),
    (1, 0, 0, cos(b)),
    ("3/2", "3/2", "3/2", (1 + cos(b)) / 2 * c2),
    ("3/2", "3/2", "1/2", -sqrt(3) * (1 + cos(b)) / 2 * s2),
    ("3/2", "3/2", "-1/2", sqrt(3) * (1 - cos(b)) / 2 * c2),
    ("3/2", "3/2", "-3/2", -(1 - cos(b)) / 2 * s2),
    ("3/2", "1/2", "1/2", (3 * cos(b) - 1) / 2 * c2),
    ("3/2", "1/2", "-1/2", -(3 * cos(b) + 1) / 2 * s2),
    (2, 2, 2, ((1 + cos(b)) / 2) ** 2),
    (2, 2, 1, -(1 + cos(b)) / 2 * sin(b)),
    (2, 2, 0, sqrt(6) / 4 * sin(b) ** 2),
    (2, 2, -1, -(1 - cos(b)) / 2 * sin(b)),
    (2, 2, -2, ((1 - cos(b)) / 2) ** 2),
    (2, 1, 1, (1 + cos(b)) / 2 * (2 * cos(b) - 1)),
    (2, 1, 0, -sqrt(Rational(3, 2)) * sin(b) * cos(b)),
    (2, 1, -1, (1 - cos(b)) / 2 * (2 * cos(b) + 1)),
    (2, 0, 0, Rational(3, 2) * cos(b) ** 2 - Rational(1, 2)),
]


@pytest.mark.parametrize("j, mp, m, expected", PDG_D)
def test_small_d_matches_pdg_table(j, mp, m, expected):
    got = small_d(j, mp, m, BETA)
    assert half_angle_zero(got - expected)
    assert not half_angle_zero(got)
    # PDG table footnote: d_{m'm} = (-1)^(m-m') d_{mm'} = d_{-m,-m'}
    mp_r, m_r = Rational(mp), Rational(m)
    assert half_angle_zero(small_d(j, m, mp, BETA) - (-1) ** (m_r - mp_r) * expected)
    assert half_angle_zero(small_d(j, -m_r, -mp_r, BETA) - expected)


def test_half_angle_helper_can_fail():
    assert not half_angle_zero(cos(BETA) - cos(BETA / 2) ** 2)


@pytest.mark.parametrize("j", ["0", "1/2", "1", "3/2", "2", "5/2", "3"])
def test_every_element_matches_independent_wigner_sum(j):
    for mp in all_projections(j):
        for m in all_projections(j):
            # Edmonds 1957, eq. 4.1.15, re-typed in this test
            assert half_angle_zero(small_d(j, mp, m, BETA) - wigner_formula(j, mp, m, BETA))


@pytest.mark.parametrize("j", [Rational(k, 2) for k in range(9)])
def test_D_matrix_matches_scipy_expm(j):
    rng = np.random.default_rng(int(2 * j) + 11)
    for _ in range(3):
        a, bb, c = rng.uniform(-2 * np.pi, 2 * np.pi, 3)
        got = numeric(wigner_D_matrix(j, Float(a, 30), Float(bb, 30), Float(c, 30)))
        # independent: scipy.linalg.expm of numpy-built J matrices
        assert np.allclose(got, expm_D(float(j), a, bb, c), atol=1e-12, rtol=0)


@pytest.mark.parametrize("j", [1, "3/2"])
def test_D_elements_agree_with_matrix_and_symbolic_substitution(j):
    M = wigner_D_matrix(j, ALPHA, BETA, GAMMA)
    ms = all_projections(j)
    for r, mp in enumerate(ms):
        for c, m in enumerate(ms):
            assert M[r, c] == wigner_D(j, mp, m, ALPHA, BETA, GAMMA)
    values = {ALPHA: Float("0.3", 30), BETA: Float("1.1", 30), GAMMA: Float("-2.4", 30)}
    assert np.allclose(numeric(M.xreplace(values)), expm_D(float(Rational(j)), 0.3, 1.1, -2.4), atol=1e-12)


@pytest.mark.parametrize("j", ["1/2", 1, "3/2", 2])
def test_small_d_matrix_is_exactly_orthogonal(j):
    d = small_d_matrix(j, BETA)
    product = d * d.T
    n = d.shape[0]
    for r in range(n):
        for c in range(n):
            # common practice, no source: d(beta) is real orthogonal
            assert half_angle_zero(product[r, c] - (1 if r == c else 0))


@pytest.mark.parametrize("j", [0, "1/2", 1, "3/2", 2, "7/2"])
def test_rotation_by_2pi_is_minus_one_to_the_2j(j):
    # common practice, no source: exp(-2 pi i J_y) = (-1)^(2j)
    sign = (-1) ** int(2 * Rational(j))
    assert small_d_matrix(j, 2 * pi) == sign * eye(int(2 * Rational(j)) + 1)


@pytest.mark.slow
@pytest.mark.parametrize("j", [6, Rational(19, 2), 12])
def test_large_D_matrix_matches_scipy_expm(j):
    a, bb, c = 0.7, 2.2, -1.3
    got = numeric(wigner_D_matrix(j, Float(a, 40), Float(bb, 40), Float(c, 40)))
    # independent: scipy.linalg.expm of numpy-built J matrices
    assert np.allclose(got, expm_D(float(j), a, bb, c), atol=1e-10, rtol=0)


@pytest.mark.slow
@pytest.mark.parametrize("j", [Rational(5, 2), 3])
def test_small_d_matrix_is_exactly_orthogonal_larger_j(j):
    d = small_d_matrix(j, BETA)
    product = d * d.T
    n = d.shape[0]
    # common practice, no source: d(beta) is real orthogonal
    assert all(half_angle_zero(product[r, c] - (1 if r == c else 0)) for r in range(n) for c in range(n))


def test_d00_is_legendre_polynomial_large_l():
    # Edmonds 1957, eq. 4.1.24: d^l_{00}(beta) = P_l(cos beta); at beta = pi/3 both sides are exact rationals
    for l in (7, 30, 100):
        assert small_d(l, 0, 0, pi / 3) == legendre(l, Rational(1, 2)) != 0


@given(tj=st.integers(0, 12), data=st.data())
@example(tj=5, data=None)
def test_reflection_symmetries(tj, data):
    j = Rational(tj, 2)
    if data is None:
        mp, m = Rational(3, 2), Rational(-1, 2)
    else:
        mp = j - data.draw(st.integers(0, tj))
        m = j - data.draw(st.integers(0, tj))
    # Varshalovich 1988, sec. 4.4 eq. (1): d_{m'm}(-beta) = d_{mm'}(beta)
    assert half_angle_zero(small_d(j, mp, m, -BETA) - small_d(j, m, mp, BETA))
    # Varshalovich 1988, sec. 4.4 eq. (1): d_{m'm}(pi - beta) = (-1)^(j+m') d_{m',-m}(beta)
    assert half_angle_zero(small_d(j, mp, m, pi - BETA) - (-1) ** (j + mp) * small_d(j, mp, -m, BETA))


def test_inverse():
    assert inverse_euler_angles(ALPHA, BETA, GAMMA) == (-GAMMA, -BETA, -ALPHA)
    rng = np.random.default_rng(9)
    for j in (Rational(1, 2), 1, Rational(5, 2)):
        a, bb, c = rng.uniform(-3, 3, 3)
        inv = inverse_euler_angles(Float(a, 30), Float(bb, 30), Float(c, 30))
        # independent: scipy expm; the inverse is the adjoint
        target = expm_D(float(j), a, bb, c).conj().T
        assert np.allclose(numeric(wigner_D_matrix(j, *inv)), target, atol=1e-12)


def test_out_of_range_projection_is_zero_and_j0():
    assert small_d(1, 2, 0, BETA) == 0
    assert wigner_D("1/2", "3/2", "1/2", ALPHA, BETA, GAMMA) == 0
    assert small_d(0, 0, 0, BETA) == 1
    assert wigner_D(0, 0, 0, ALPHA, BETA, GAMMA) == 1


@pytest.mark.parametrize("call, error", [
    (lambda: small_d(Symbol("j"), 0, 0, BETA), NotNumericError),
    (lambda: small_d(-1, 0, 0, BETA), QuantumNumberError),
    (lambda: small_d(Rational(1, 3), 0, 0, BETA), QuantumNumberError),
    (lambda: small_d(1, Rational(1, 2), 0, BETA), ProjectionError),
    (lambda: small_d(1, 0, 0, "beta"), TypeError),
    (lambda: small_d(1, 0, 0, True), NotNumericError),
    (lambda: wigner_D(1, 0, 0, object(), BETA, 0), NotNumericError),
    (lambda: small_d_matrix("x", BETA), NotNumericError),
    (lambda: wigner_D_matrix(1, 0, [1], 0), TypeError),
    (lambda: RotationElement(1, Rational(1, 2), 0, ALPHA, BETA, GAMMA), ProjectionError),
    (lambda: RotationElement(-2, 0, 0, ALPHA, BETA, GAMMA), QuantumNumberError),
])
def test_errors(call, error):
    with pytest.raises(error):
        call()


def test_error_message_format():
    with pytest.raises(NotNumericError, match=r"^beta='beta' must be a SymPy expression or a number"):
        small_d(1, 0, 0, "beta")


def test_angles_accept_python_numbers():
    from fractions import Fraction
    assert small_d(1, 0, 0, 0) == 1
    assert small_d(1, 0, 0, Fraction(0)) == 1
    assert small_d("1/2", "1/2", "1/2", 0.0) == 1


def test_single_element_large_j_is_one_sqrt_times_polynomial():
    e = small_d(100, 37, -5, BETA)
    roots = sorted({p for p in e.atoms() if p.is_Pow and p.exp == S.Half}, key=srepr)
    assert len(roots) <= 1
    # Edmonds 1957, eq. 4.1.23: sum_m |d^j_{m'm}|^2 = 1, numerically at beta = 0.7
    clear_rotation_caches()
    row = [small_d(10, 3, m, Float("0.7", 30)) for m in all_projections(10)]
    assert abs(sum(x ** 2 for x in row) - 1) < 1e-20


# --- the unevaluated D-element class ---------------------------------------------------------

def test_rotation_element_args_contract():
    D = RotationElement("3/2", "1/2", "-3/2", ALPHA, BETA, GAMMA)
    assert all(isinstance(a, Basic) for a in D.args)
    assert D.func(*D.args) == D
    assert pickle.loads(pickle.dumps(D)) == D
    assert D.j == Rational(3, 2) and D.mp == Rational(1, 2) and D.m == Rational(-3, 2)
    assert D.angles == (ALPHA, BETA, GAMMA)
    assert D.doit() == wigner_D("3/2", "1/2", "-3/2", ALPHA, BETA, GAMMA) != 0
    assert D.is_commutative


@given(tj=st.integers(0, 9), data=st.data())
def test_rotation_element_contract_property(tj, data):
    j = Rational(tj, 2)
    mp = j - data.draw(st.integers(0, tj))
    m = j - data.draw(st.integers(0, tj))
    angle = data.draw(st.sampled_from([ALPHA, 0, pi / 3, Rational(1, 7)]))
    D = RotationElement(j, mp, m, angle, BETA, GAMMA)
    assert D.func(*D.args) == D
    assert pickle.loads(pickle.dumps(D)) == D
    assert all(isinstance(a, Basic) for a in D.args)
    assert D.doit() == wigner_D(j, mp, m, angle, BETA, GAMMA)


def test_rotation_element_symbolic_stays_unevaluated():
    j, m = symbols("j m")
    D = RotationElement(j, m, m, 0, BETA, 0)
    assert D.doit() == D
    assert D.subs(j, 1).subs(m, 0).doit() == small_d(1, 0, 0, BETA)
    with pytest.raises(ProjectionError):
        RotationElement(1, Rational(1, 2) + Symbol("n", integer=True), 0, ALPHA, BETA, GAMMA)
    # a symbolic m that may or may not fit j is kept
    assert RotationElement(1, Symbol("n"), 0, ALPHA, BETA, GAMMA).mp == Symbol("n")


def test_rotation_element_conjugate():
    from sympy import conjugate
    D = RotationElement(2, 1, -1, ALPHA, BETA, GAMMA)
    # Edmonds 1957, eq. 4.2.7: conj(D^j_{m'm}) = (-1)^(m'-m) D^j_{-m',-m} for real angles
    assert conjugate(D) == RotationElement(2, -1, 1, ALPHA, BETA, GAMMA)
    assert expand(conjugate(D).doit() - conjugate(D.doit())) == 0
    z = Symbol("z")
    assert conjugate(RotationElement(1, 0, 0, z, BETA, 0)).func is not RotationElement
    from sympy import adjoint, transpose
    assert adjoint(D) == conjugate(D) and transpose(D) == D


ASCII_PRETTY = (" 1                      \n"   # j flush left after D, as D^{1}_{1,0} in TeX
                "D   (alpha, beta, gamma)\n"
                " 1,0                    ")

PRINT_TABLE = [
    # (j,    mp,     m,      str,                                        latex)
    (1,      1,      0,      "D^{1}_{1,0}(alpha, beta, gamma)",
     r"D^{1}_{1,0}\left(\alpha,\beta,\gamma\right)"),
    ("1/2",  "1/2",  "-1/2", "D^{1/2}_{1/2,-1/2}(alpha, beta, gamma)",
     r"D^{\frac{1}{2}}_{\frac{1}{2},- \frac{1}{2}}\left(\alpha,\beta,\gamma\right)"),
]


@pytest.mark.parametrize("j, mp, m, text, tex", PRINT_TABLE)
def test_rotation_element_printing(j, mp, m, text, tex):
    D = RotationElement(j, mp, m, ALPHA, BETA, GAMMA)
    assert str(D) == text
    assert latex(D) == tex


def test_rotation_element_printing_in_expressions():
    D = RotationElement(1, 1, 0, ALPHA, BETA, GAMMA)
    assert str(2 * D) == "2*D^{1}_{1,0}(alpha, beta, gamma)"
    assert latex(D ** 2) == r"D^{1}_{1,0}\left(\alpha,\beta,\gamma\right)^{2}"
    assert pretty(D, use_unicode=False) == ASCII_PRETTY
    assert pretty(D, use_unicode=True) == " 1           \nD   (α, β, γ)\n 1,0         "
    j = Symbol("j")
    assert str(RotationElement(j, 0, 0, 0, BETA, 0)) == "D^{j}_{0,0}(0, beta, 0)"
    assert latex(RotationElement(2, -1, 0, ALPHA, BETA, GAMMA) / 3) == (
        r"\frac{D^{2}_{-1,0}\left(\alpha,\beta,\gamma\right)}{3}")


@pytest.mark.parametrize("module_name", ["amalgebra.rotations.wigner", "amalgebra.rotations.series",
                                         "amalgebra.rotations.actions", "amalgebra.rotations.harmonics"])
def test_public_surface(module_name):
    import importlib
    module = importlib.import_module(module_name)
    public = sorted(name for name, value in vars(module).items()
                    if not name.startswith("_") and getattr(value, "__module__", None) == module_name)
    assert sorted(module.__all__) == public
