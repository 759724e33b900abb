"""The coefficient domain and its normal form (issue 12): uniqueness, exact zeros, readable output."""

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import (Add, Function, I, Matrix, Mul, Rational, S, Symbol, cos, exp, eye, latex, legendre,
                   pi, pretty, simplify, sin, solve, sqrt, symbols, tan)

from amalgebra.algebra import (AngularMomentum, canonical, commutator, operator_coefficients, to_cartesian,
                               to_ladder)
from amalgebra.algebra.coefficients import normal_scalar, scalar_is_zero
from amalgebra.algebra.convert import kernel_of
from amalgebra.algebra.shiftform import _sum
from amalgebra.errors import OperatorError
from amalgebra.testing.reference import evaluate
from amalgebra.testing.strategies import monomials

J, S_, L = AngularMomentum("J"), AngularMomentum("S"), AngularMomentum("L")
I1, I2 = AngularMomentum("I1"), AngularMomentum("I2")
a, b, t, phi = symbols("a b t phi")
th = Symbol("theta")
f = Function("f")

# exact coefficients of every supported kind, each with an equal value written differently
# (identities: common practice, no source)
COEFFICIENT_PAIRS = [
    (a, a),
    (b * (1 + I) / 2, b / 2 + I * b / 2),
    (I * a * b, a * I * b),
    (sqrt(6), sqrt(2) * sqrt(3)),
    (sqrt(3) * a, a * sqrt(12) / 2),
    (1 / sqrt(2), sqrt(2) / 2),
    (sin(t) ** 2, 1 - cos(t) ** 2),
    (cos(t) ** 2, (1 + cos(2 * t)) / 2),
    (exp(2 * I * t), (cos(t) + I * sin(t)) ** 2),
    (exp(-I * t) / 2, (cos(t) - I * sin(t)) / 2),
    (sin(2 * t), 2 * sin(t) * cos(t)),
    (a / (1 + b), a * (1 - b) / (1 - b**2)),
    (f(t) * a, a * f(t)),
    (exp(I * t / 2) ** 2, exp(I * t)),
    (sqrt(a) ** 3, a * sqrt(a)),
]
VALUES = {a: 0.7, b: -1.3, t: 0.41}
JS = [0.5, 1, 1.5]


@st.composite
def coefficient_polynomials(draw, labels=("J", "S"), max_terms=3, rewritten=False):
    """Sums of (exact coefficient) * (operator monomial); ``rewritten`` uses the equal forms."""
    terms = []
    for _ in range(draw(st.integers(1, max_terms))):
        pair = draw(st.sampled_from(COEFFICIENT_PAIRS))
        mono = draw(monomials(labels=labels, max_weight=3, gaussian=False))
        terms.append((pair, mono))
    return terms


def _build(terms, which):
    return Add(*[pair[which] * mono for pair, mono in terms])


def _numeric(expr):
    return expr.xreplace({k: S(v) for k, v in VALUES.items()}).xreplace({f(S(VALUES[t])): S(0.9)})


# ------------------------------------------------------------------ properties (hypothesis)
@settings(deadline=None)
@given(coefficient_polynomials())
@example([((b * (1 + I) / 2, b / 2 + I * b / 2), J.x)])
def test_idempotent_and_unique_under_coefficient_rewriting(terms):
    first, second = _build(terms, 0), _build(terms, 1)
    c = canonical(first)
    assert canonical(c) == c
    assert canonical(second) == c


@settings(deadline=None)
@given(coefficient_polynomials())
def test_unique_under_component_rewriting(terms):
    # J.x -> (J+ + J-)/2, J.y -> (J+ - J-)/(2i) and back: the same operator, the same form
    p = _build(terms, 0)
    c = canonical(p)
    assert canonical(to_ladder(p)) == c
    assert canonical(to_cartesian(p, casimir=True)) == c


@settings(deadline=None)
@given(coefficient_polynomials(max_terms=2), coefficient_polynomials(max_terms=2))
def test_products_and_sums_are_structurally_equal(p_terms, q_terms):
    p, q = _build(p_terms, 0), _build(q_terms, 1)
    assert canonical(p * q) == canonical(canonical(p) * canonical(q))
    assert canonical(p + q) == canonical(canonical(q) + canonical(p))
    assert canonical(p * q - q * p) == commutator(p, q)
    assert canonical(p - _build(p_terms, 1)) == 0


@settings(deadline=None)
@given(coefficient_polynomials(), st.sampled_from(JS), st.sampled_from(JS))
def test_against_independent_numpy_matrices(terms, jj, js):
    # reference: numpy matrices built independently (amalgebra.testing.reference), at numeric symbols
    p = _build(terms, 0)
    js_ = {"J": jj, "S": js}
    expected = evaluate(_numeric(p), js_)
    assert np.allclose(evaluate(_numeric(canonical(p)), js_), expected)
    assert np.allclose(evaluate(_numeric(canonical(p, components="cartesian")), js_), expected)


@settings(deadline=None)
@given(coefficient_polynomials(labels=("J",), max_terms=3))
def test_coefficients_as_data_rebuild_the_operator(terms):
    p = _build(terms, 0)
    data = operator_coefficients(p)
    assert canonical(Add(*[k * v for k, v in data.items()])) == canonical(p)
    assert operator_coefficients(_build(terms, 1)) == data


# ------------------------------------------------------------------ issue 12 regression cases
def test_issue_symbolic_gaussian_coefficient_is_unique():
    # issue 12: canonical(b*Jx + b*Jy) printed two forms that were not ==
    c = canonical(b * J.x + b * J.y)
    assert canonical(c) == c
    assert str(c) == "b*(1 + I)*J.minus/2 + b*(1 - I)*J.plus/2"
    assert commutator(J.x, b * (1 + I) * J.y / 2) == canonical(I * b * (1 + I) * J.z / 2)


@pytest.mark.parametrize("n", [2, 3, -2, 5])
def test_issue_exp_of_multiple_angle(n):
    # issue 12: exp(n*x), n >= 2 crashed the core with a raw SymPy ValueError
    e = exp(n * I * phi)
    assert canonical(e * J.z) == e * J.z
    assert commutator(J.z, e * J.plus) == e * J.plus          # [Jz, J+] = J+
    from amalgebra.matrices.explicit import to_matrix
    m = to_matrix(e * J.minus, {"J": 1})
    assert m[1, 0] == sqrt(2) * e and m[0, 1] == 0            # <1 0|J-|1 1> = sqrt(2), Condon-Shortley


def test_issue_rotate_operator_with_multiple_angle():
    from amalgebra.rotations.actions import rotate_operator
    # e^{-i phi Jz} J-^2 e^{i phi Jz} = e^{2 i phi} J-^2 (active rotation about z; common practice)
    assert rotate_operator(J.minus**2, phi, 0, 0, normal_order=True) == exp(2 * I * phi) * J.minus**2


def test_issue_trig_zero_is_recognised():
    assert canonical((sin(th) ** 2 + cos(th) ** 2 - 1) * I1.z * I2.z) == 0
    assert canonical((sin(th) ** 2 + cos(th) ** 2) * I1.z * I2.z) == I1.z * I2.z


def test_issue_degree_six_trig_polynomial():
    p = (sin(th) * I1.x + a * cos(th) * I2.plus + b * exp(I * phi) * I1.z * I2.minus) ** 3
    c = canonical(p * p)
    assert canonical(c) == c
    js = {"I1": 1, "I2": 1.5}
    vals = {th: S(0.3), phi: S(1.1), a: S(0.5), b: S(-2)}
    # reference: independent numpy matrices (amalgebra.testing.reference)
    assert np.allclose(evaluate(c.xreplace(vals), js), evaluate((p * p).xreplace(vals), js))


def test_unsupported_coefficients_raise_typed_errors():
    with pytest.raises(OperatorError):
        canonical(exp(I * pi / 7) * J.z)        # not a root of unity SymPy writes in radicals
    with pytest.raises(OperatorError):
        canonical(2 ** (I * a) * J.z)                # complex power of a number


def test_floats_keep_the_float_domain():
    assert canonical(0.5 * J.plus * J.minus) == 0.5 * J.squared + 0.5 * J.z - 0.5 * J.z**2


# ------------------------------------------------------------------ the normal form itself
@pytest.mark.parametrize("value, expected", [
    (sin(t) ** 2 + cos(t) ** 2, 1),                     # Pythagoras, common practice
    (2 * sin(t) * cos(t), sin(2 * t)),                  # double angle, common practice
    (exp(I * t) + exp(-I * t), 2 * cos(t)),             # Euler, common practice
    (sqrt(8) - 2 * sqrt(2), 0),
    ((a**2 - 1) / (a - 1), a + 1),
    (1 / (1 + I), (1 - I) / 2),
    (exp(I * pi / 3), Rational(1, 2) + sqrt(3) * I / 2),  # cos(pi/3) + i sin(pi/3), common practice
    (tan(t) - sin(t) / cos(t), 0),
])
def test_normal_scalar_values(value, expected):
    assert normal_scalar(value) == normal_scalar(expected)
    assert scalar_is_zero(value - expected)


def test_normal_form_rule_is_documented_shape():
    # c * N / D: rational content, primitive numerator with positive leading term (module docstring)
    assert str(canonical(-(1 + I) * J.minus / 2)) == "-(1 + I)*J.minus/2"
    assert str(canonical(a / (2 * b + 2) * J.z)) == "a*J.z/(2*(b + 1))"
    assert str(canonical((a + b) * J.z + a * J.plus)) == "a*J.plus + (a + b)*J.z"


def test_collected_output_in_every_printer():
    c = canonical(a * J.x + b * J.x + I * J.z / 2 + J.z / 2)
    assert str(c) == "(a + b)*J.minus/2 + (a + b)*J.plus/2 + (1 + I)*J.z/2"
    assert latex(c).count("+") == latex(canonical(c)).count("+")
    assert "(a + b)" in pretty(c) and r"\left(a + b\right)" in latex(c)


def test_direct_add_matches_generic_construction():
    # issue 16: the output Add is built without Add.flatten; it must be the same object as generic Add
    for expr in [(J.plus + J.minus + J.z) ** 6, (J.x + J.y) ** 4, (a * J.plus + b * S_.minus + J.z) ** 3,
                 (sin(t) * J.x + exp(I * t) * L.z) ** 3]:
        out = canonical(expr)
        terms = list(Add.make_args(out))
        generic = Add(*terms)
        assert _sum(terms) == generic and _sum(terms).args == generic.args
        assert _sum(list(reversed(terms))).args == generic.args
        for term in terms:
            assert term.func(*term.args) == term     # each term is a fixed point of generic Mul


def test_kernel_domain_names_its_generators():
    assert str(kernel_of(a * J.z)[0].domain) == "ZZ[a]"
    assert str(kernel_of(J.z / a)[0].domain) == "ZZ(a)"
    assert str(kernel_of(exp(I * t) * J.z)[0].domain) == "ZZ[exp(I*t), exp(-I*t), I]"


# ------------------------------------------------------------------ coefficients as data
def test_operator_coefficients_and_solve():
    c1, c2, c3 = symbols("c1 c2 c3")
    # find X with [Jz, X] = J+ + J- ... only J+ and J- components can do that: X = J+ - J- (common practice)
    X = c1 * J.plus + c2 * J.minus + c3 * J.z
    eqs = operator_coefficients(commutator(J.z, X) - J.plus - J.minus)
    assert set(eqs) == {J.plus, J.minus}
    assert solve(list(eqs.values()), [c1, c2], dict=True) == [{c1: 1, c2: -1}]
    assert operator_coefficients(J.plus * J.minus) == {S.One * J.squared: 1, J.z: 1, J.z**2: -1}


# ------------------------------------------------------------------ decidable zero elsewhere
def _dipolar_alphabet(theta, ph):
    """A..F of the dipolar coupling of two spins (Abragam 1961, ch. IV, eq. (IV.16), from memory)."""
    c, s = cos(theta), sin(theta)
    A = I1.z * I2.z * (1 - 3 * c**2)
    B = -Rational(1, 4) * (I1.plus * I2.minus + I1.minus * I2.plus) * (1 - 3 * c**2)
    C = -Rational(3, 2) * (I1.plus * I2.z + I1.z * I2.plus) * s * c * exp(-I * ph)
    D = -Rational(3, 2) * (I1.minus * I2.z + I1.z * I2.minus) * s * c * exp(I * ph)
    E = -Rational(3, 4) * I1.plus * I2.plus * s**2 * exp(-2 * I * ph)
    F = -Rational(3, 4) * I1.minus * I2.minus * s**2 * exp(2 * I * ph)
    return A, B, C, D, E, F


def test_dipolar_alphabet_is_pure_rank_two():
    from amalgebra.tensors.irreducible import bilinear_tensor_form, decompose
    A, B, C, D, E, F = _dipolar_alphabet(th, phi)
    n = Matrix([sin(th) * cos(phi), sin(th) * sin(phi), cos(th)])
    M = eye(3) - 3 * n * n.T
    assert bilinear_tensor_form(I1, M, I2).ranks == (2,)
    cartesian = Add(*[(I1.x, I1.y, I1.z)[i] * M[i, k] * (I2.x, I2.y, I2.z)[k] for i in range(3) for k in range(3)])
    H = A + B + C + D + E + F
    assert canonical(H) == canonical(cartesian)      # the alphabet is I1.(1 - 3 n n^T).I2
    for part in (A + B, C, D, E, F, H):
        assert sorted(decompose(part)) == [2]
    # 4x4 matrices: numpy Pauli matrices, I.I2 - 3 (I1.n)(I2.n), built independently of amalgebra
    sx, sy, sz = (np.array([[0, 1], [1, 0]]) / 2, np.array([[0, -1j], [1j, 0]]) / 2,
                  np.array([[1, 0], [0, -1]]) / 2)
    one = np.eye(2)
    t0, p0 = 0.7, -0.4
    nv = [np.sin(t0) * np.cos(p0), np.sin(t0) * np.sin(p0), np.cos(t0)]
    first = [np.kron(m, one) for m in (sx, sy, sz)]
    second = [np.kron(one, m) for m in (sx, sy, sz)]
    expected = sum(first[i] @ second[i] for i in range(3)) - 3 * (
        sum(nv[i] * first[i] for i in range(3)) @ sum(nv[i] * second[i] for i in range(3)))
    got = evaluate(canonical(H).xreplace({th: S(t0), phi: S(p0)}), {"I1": 0.5, "I2": 0.5})
    assert np.allclose(got, expected)


def test_derivation_verdicts_use_the_normal_form():
    from amalgebra.derivations.checks import check_equality
    (check,) = check_equality((sin(th) ** 2 + cos(th) ** 2) * I1.z * I2.z, I1.z * I2.z)
    assert check.passed and check.exact
    (check,) = check_equality(sin(th) ** 2 + cos(th) ** 2, 1)
    assert (check.method, check.passed, check.exact) == ("normal form", True, True)
    (check,) = check_equality(sin(th) ** 2, cos(th) ** 2)       # exactly nonzero: not sampled
    assert (check.method, check.passed, check.exact) == ("normal form", False, True)
    (check,) = check_equality(f(th) ** 2, f(th) ** 2 + sin(th) - sin(th))
    assert check.passed and check.exact


# ------------------------------------------------------------------ d-functions, two forms
def test_small_d_full_angle_form():
    from amalgebra.rotations.wigner import small_d
    beta = Symbol("beta")
    # d^2_00 = P_2(cos beta): Edmonds 1957, eq. (4.1.24)
    assert simplify(small_d(2, 0, 0, beta, form="cos_sin") - legendre(2, cos(beta))) == 0
    # d^1_{10} = -sin(beta)/sqrt(2): PDG table of d functions
    assert small_d(1, 1, 0, beta, form="cos_sin") == -sqrt(2) * sin(beta) / 2
    for j in (1, 2, 3):
        for mp in range(-j, j + 1):
            for m in range(-j, j + 1):
                half, full = small_d(j, mp, m, beta), small_d(j, mp, m, beta, form="cos_sin")
                assert normal_scalar(half - full) == 0
    with pytest.raises(ValueError):
        small_d(S.Half, S.Half, S.Half, beta, form="cos_sin")


_SEED_SCRIPT = """
from sympy import I, exp, sin, sqrt, symbols
from amalgebra.algebra import AngularMomentum, canonical
J, S = AngularMomentum("J"), AngularMomentum("S")
a, b, t = symbols("a b t")
print(canonical((sin(t)*J.x + sqrt(2)*a*S.plus + exp(I*t)*b*J.z*S.minus + a/(1 + b)*J.y)**2))
"""


def test_output_is_independent_of_the_hash_seed():
    import os
    import subprocess
    import sys
    outputs = set()
    for seed in ("1", "4242"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        run = subprocess.run([sys.executable, "-c", _SEED_SCRIPT], capture_output=True, text=True, env=env,
                             check=True)
        outputs.add(run.stdout)
    assert len(outputs) == 1 and "J" in outputs.pop()
