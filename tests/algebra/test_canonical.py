"""Canonical form: textbook identities, algebraic laws, matrices, symbolic coefficients."""

import os
import pickle
import subprocess
import sys

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import Add, Function, I, Integer, Mul, Rational, Symbol, expand, sqrt, symbols

from amalgebra.algebra import (AngularMomentum, canonical, collect_casimir, ladder_terms,
                               shift_form)
from amalgebra.errors import OperatorError
from amalgebra.testing.reference import evaluate
from amalgebra.testing.strategies import operator_polynomials

J, L, S = AngularMomentum("J"), AngularMomentum("L"), AngularMomentum("S")
a, b, t = symbols("a b t")
f = Function("f")

HALF_INTEGERS = [0.5, 1, 1.5, 2, 2.5]


# ----------------------------------------------------------------- textbook identities
@pytest.mark.parametrize("lhs, rhs", [
    (J.x * J.y - J.y * J.x, I * J.z),          # Sakurai (3.1.20) [Jx, Jy] = i Jz
    (J.y * J.z - J.z * J.y, I * J.x),          # Sakurai (3.1.20), cyclic
    (J.z * J.x - J.x * J.z, I * J.y),          # Sakurai (3.1.20), cyclic
    (J.plus * J.minus, J.squared - J.z**2 + J.z),   # Sakurai (3.5.x) from memory
    (J.minus * J.plus, J.squared - J.z**2 - J.z),   # Sakurai (3.5.x) from memory
    (J.x**2 + J.y**2 + J.z**2, J.squared),     # definition of J^2, Sakurai (3.5.x)
    (J.z * J.plus - J.plus * J.z, J.plus),     # [Jz, J+] = J+, Sakurai (3.5.x)
    (J.z * J.minus - J.minus * J.z, -J.minus),  # [Jz, J-] = -J-
    (J.plus * J.minus - J.minus * J.plus, 2 * J.z),  # [J+, J-] = 2 Jz
])
def test_textbook_identities(lhs, rhs):
    assert canonical(lhs) == canonical(rhs) != 0


@pytest.mark.parametrize("first", ["x", "y", "z", "plus", "minus", "squared"])
@pytest.mark.parametrize("second", ["x", "y", "z", "plus", "minus", "squared"])
def test_different_labels_commute(first, second):
    # common practice: independent angular momenta commute
    p, q = J.component(first), S.component(second)
    assert canonical(p * q - q * p) == 0
    assert canonical(p * q) == canonical(q * p) != 0


@pytest.mark.parametrize("component", ["x", "y", "z", "plus", "minus"])
def test_casimir_commutes(component):
    # [J^2, Ji] = 0, Sakurai (3.5.x) from memory
    c = J.component(component)
    assert canonical(J.squared * c - c * J.squared) == 0
    assert canonical(J.squared * c) != 0


@pytest.mark.parametrize("n", [1, 2, 3, 5, 8])
def test_jz_ladder_power(n):
    # [Jz, J+^n] = n J+^n, common practice (follows from [Jz, J+] = J+)
    assert canonical(J.z * J.plus**n - J.plus**n * J.z) == n * J.plus**n


def test_output_convention_ladder_left_of_polynomial():
    # f(Jz) J+ = J+ f(Jz + 1): the design's m-shift rule, common practice
    assert canonical(J.z**2 * J.plus) == J.plus * J.z**2 + 2 * J.plus * J.z + J.plus
    assert canonical(J.z * J.minus) == J.minus * J.z - J.minus


def test_closed_product_formula():
    # J+^2 J-^2 = (J^2 - Jz(Jz-1)) (J^2 - (Jz-1)(Jz-2)); from J+J- = J^2 - Jz^2 + Jz, derived by hand
    q, m = J.squared, J.z
    expected = expand((q - m * (m - 1)) * (q - (m - 1) * (m - 2)))
    assert canonical(J.plus**2 * J.minus**2) == canonical(expected) != 0


# --------------------------------------------------------------- structure of output
def test_fully_expanded_terms_and_fixed_order():
    out = canonical(J.minus * S.plus * (J.z + a) * S.z)
    for term in Add.make_args(out):
        nc = [arg for arg in Mul.make_args(term) if not arg.is_commutative]
        kinds = [(p.base if p.is_Pow else p).component for p in nc]
        # ladders first, then per label J^2 and Jz, labels sorted
        order = {"plus": 0, "minus": 0, "squared": 1, "z": 2}
        labels = [(p.base if p.is_Pow else p).label for p in nc]
        ladders = [lab for lab, k in zip(labels, kinds) if order[k] == 0]
        assert ladders == sorted(ladders)
        assert all(order[k] == 0 for k in kinds[:len(ladders)])


def test_func_args_and_pickle_round_trip():
    out = canonical((J.x + a * S.plus + J.squared) ** 3)
    assert out.func(*out.args) == out
    for term in out.args:
        assert term.func(*term.args) == term
    assert pickle.loads(pickle.dumps(out)) == out


def test_deterministic_under_hash_seed():
    code = ("from sympy import symbols\n"
            "from amalgebra.algebra import AngularMomentum, canonical\n"
            "J, S = AngularMomentum('J'), AngularMomentum('S')\n"
            "a, b = symbols('a b')\n"
            "e = canonical((a*J.x + b*S.y*J.plus + J.z*S.z)**3)\n"
            "print(e.args)\n")
    outputs = {subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                              env=dict(os.environ, PYTHONHASHSEED=str(seed)), check=True).stdout
               for seed in (0, 1, 2)}
    assert len(outputs) == 1


# ------------------------------------------------------------------ symbolic coefficients
@pytest.mark.parametrize("coeff", [a, f(t), I, sqrt(2), a * sqrt(2) + I, 1 / (a + b), Rational(3, 7)])
def test_symbolic_coefficients(coeff):
    # distributivity: common practice
    lhs = canonical(coeff * J.x * J.y + J.y * coeff * J.x)
    rhs = canonical(2 * coeff * J.y * J.x + coeff * I * J.z)
    assert expand(lhs - rhs) == 0
    assert lhs == rhs


def test_symbolic_coefficients_cancel_exactly():
    e = sqrt(2) * J.plus * sqrt(2) - 2 * J.plus
    assert canonical(e) == 0
    assert canonical(a / b * J.z - J.z * a / b) == 0


# ------------------------------------------------------------------ hypothesis properties
@settings(deadline=None)
@given(operator_polynomials(labels=("J", "S"), max_terms=3, max_weight=4))
@example(J.plus * J.minus * J.plus)
def test_idempotent(p):
    c = canonical(p)
    assert canonical(c) == c


@settings(deadline=None)
@given(operator_polynomials(labels=("J", "L"), max_terms=2, max_weight=3),
       operator_polynomials(labels=("J", "L"), max_terms=2, max_weight=3),
       operator_polynomials(labels=("J", "L"), max_terms=2, max_weight=3))
def test_associative_and_distributive(p, q, r):
    # common practice: the enveloping algebra is associative
    assert canonical(canonical(p * q) * r) == canonical(p * canonical(q * r))
    assert canonical(p * (q + r)) == canonical(canonical(p * q) + canonical(p * r))


@settings(deadline=None)
@given(operator_polynomials(labels=("J", "S"), max_terms=3, max_weight=4),
       st.sampled_from(HALF_INTEGERS), st.sampled_from(HALF_INTEGERS))
@example(J.x * J.y * S.plus * J.minus, 1.5, 0.5)
def test_same_matrix_as_independent_numpy(p, jj, js):
    # reference: products of independently built numpy matrices (amalgebra.testing.reference)
    js_ = {"J": jj, "S": js}
    assert np.allclose(evaluate(canonical(p), js_), evaluate(p, js_))


def _vanishes(expr, labels, max_weight):
    """True when expr's matrices vanish for j in {w, w+1/2, ..., 2w} on every label.

    Why that many: canonical(expr) = sum_d R^(d) p_d with p_d(J^2, Jz) of weighted
    degree <= w (J^2 weight 2, each factor adds at most 1 to the weight and |d| <= w),
    and P_d(j, m) = p_d(j(j+1), m) is a polynomial of total degree <= w in (j, m),
    nonzero iff p_d is (j(j+1) and m are algebraically independent).  On a
    matrix the term R^(d) p_d fills its own shifted diagonal with P_d(j, m) times a
    ladder factor that is nonzero for every m with -j <= m, m+d <= j, i.e. at
    2j + 1 - |d| >= w + 1 points when j >= w.  A polynomial of degree <= w in m
    vanishing at w + 1 points is zero for that j; its coefficients (polynomials of
    degree <= w in j) vanish at w + 1 values of j, hence identically.  With several
    labels, the same argument applies label by label on the product grid.
    """
    grid = [Rational(2 * max_weight + k, 2) for k in range(max_weight + 1)]
    if max_weight == 0:
        grid = [Integer(0)]
    import itertools
    for combo in itertools.product(grid, repeat=len(labels)):
        if not np.allclose(evaluate(expr, dict(zip(labels, combo))), 0, atol=1e-7):
            return False
    return True


@settings(deadline=None)
@given(operator_polynomials(labels=("J",), max_terms=3, max_weight=3, gaussian=False),
       operator_polynomials(labels=("J",), max_terms=3, max_weight=3, gaussian=False))
@example(J.x * J.y, J.y * J.x + I * J.z)
@example(J.plus * J.minus, J.squared - J.z**2 + J.z)
def test_zero_exactly_when_matrices_vanish(p, q):
    difference = p - q
    assert (canonical(difference) == 0) == _vanishes(difference, ["J"], 3)


# ------------------------------------------------------------------------- ladder_terms
def test_ladder_terms_jx_squared():
    j, m = symbols("j m")
    # <j m|Jx^2|j m> = (j(j+1) - m^2)/2, common practice (Sakurai problem 3.x, from memory)
    terms = ladder_terms(J.x**2, {"J": j * (j + 1)}, {"J": m})
    assert expand(terms[(("J", 0),)] - (j * (j + 1) - m**2) / 2) == 0
    assert terms[(("J", 2),)] == Rational(1, 4)


def test_ladder_terms_keys_cover_all_labels_in_jsq():
    j, m, s, ms = symbols("j m s m_s")
    terms = ladder_terms(J.plus * J.z, {"J": j * (j + 1), "S": s * (s + 1)}, {"J": m, "S": ms})
    assert list(terms) == [(("J", 1), ("S", 0))]
    assert terms[(("J", 1), ("S", 0))] == m  # J+ Jz: coefficient Jz at m, definition of the form


def test_ladder_terms_matches_numpy():
    # closed form vs independent numpy for (Jx^2 - Jy^2 + Jz Jx)^4 at j = 3/2
    j = Rational(3, 2)
    expr = (J.x**2 - J.y**2 + J.z * J.x) ** 4
    ref = evaluate(expr, {"J": 1.5})
    ms = [j - k for k in range(4)]
    for col, m in enumerate(ms):
        terms = ladder_terms(expr, {"J": j * (j + 1)}, {"J": m})
        for ((_, d),), coeff in terms.items():
            row = col - d
            if not 0 <= row < 4:
                continue
            factor = 1
            for k in range(abs(d)):
                factor *= (j - m - k) * (j + m + k + 1) if d > 0 else (j + m - k) * (j - m + k + 1)
            assert complex(coeff * sqrt(factor)) == pytest.approx(ref[row, col], abs=1e-9)


def test_ladder_terms_missing_label():
    with pytest.raises(OperatorError, match="label='S'"):
        ladder_terms(J.z * S.z, {"J": 2}, {"J": 1})


def test_ladder_terms_symbolic_coefficients_clash():
    # a user symbol used both as coefficient and as eigenvalue: slow path must agree
    terms = ladder_terms(a * J.z, {"J": a * (a + 1)}, {"J": a})
    assert terms == {(("J", 0),): a**2}


# --------------------------------------------------------------- collect / shift form
def test_collect_casimir_reassembles():
    e = (J.x**2 + J.squared * J.z) ** 2
    parts = collect_casimir(e, "J")
    rebuilt = Add(*[J.squared**k * c for k, c in parts.items()])
    assert canonical(rebuilt) == canonical(e)
    assert all(not c.has(J.squared) for c in parts.values())


def test_shift_form_keys():
    assert list(shift_form(J.x * S.z)) == [(("J", -1), ("S", 0)), (("J", 1), ("S", 0))]


# ----------------------------------------------------------------------------- errors
def test_negative_power_built_by_sympy_is_refused():
    from sympy import Pow
    with pytest.raises(OperatorError, match="nonnegative integer"):
        canonical(Pow(J.x, -1))
    with pytest.raises(OperatorError, match="nonnegative integer"):
        canonical(Pow(J.x, Rational(1, 2)))
    n = Symbol("n")
    with pytest.raises(OperatorError, match="nonnegative integer"):
        canonical(Pow(J.x, n))


def test_unknown_noncommutative_object_is_refused():
    A = Symbol("A", commutative=False)
    with pytest.raises(OperatorError, match="not a known operator"):
        canonical(A * J.x)


@pytest.mark.parametrize("bad", [[1, 2], "J.x", None, 1.5j])
def test_non_expression_input(bad):
    with pytest.raises(OperatorError):
        canonical(bad)


@pytest.mark.parametrize("bad", [
    lambda: __import__("sympy").exp(J.x),
    lambda: __import__("sympy").ImmutableMatrix([[1]]) * 1,
    lambda: J,
])
def test_unsupported_objects_raise_operator_error(bad):
    with pytest.raises(OperatorError):
        canonical(bad())


# --------------------------------------------------------------------------- slow checks
@pytest.mark.slow
@settings(deadline=None)
@given(operator_polynomials(labels=("I", "J", "S"), max_terms=4, max_weight=5),
       st.sampled_from(HALF_INTEGERS), st.sampled_from([0.5, 1]), st.sampled_from([0.5, 1.5]))
def test_three_labels_matrices_fuzz(p, jj, js, ji):
    js_ = {"I": ji, "J": jj, "S": js}
    assert np.allclose(evaluate(canonical(p), js_), evaluate(p, js_))


@pytest.mark.slow
@pytest.mark.parametrize("n", [12, 16])
def test_high_powers_against_numpy(n):
    # (J+ + J- + Jz)^n: matrix power of independent numpy matrices, j = 5/2 and 3
    expr = (J.plus + J.minus + J.z) ** n
    c = canonical(expr)
    for j in (2.5, 3):
        ref = np.linalg.matrix_power(evaluate(J.plus + J.minus + J.z, {"J": j}), n)
        # entries reach ~1e9 and the canonical polynomial cancels heavily: relative tolerance
        assert np.allclose(evaluate(c, {"J": j}), ref, rtol=1e-9, atol=1e-10 * abs(ref).max())


@settings(deadline=None)
@given(operator_polynomials(labels=("J", "S"), max_terms=2, max_weight=3),
       operator_polynomials(labels=("J", "S"), max_terms=2, max_weight=3),
       st.sampled_from([a, f(t), sqrt(2), a * sqrt(3) + I, 1 / (a + 2), a * b - I * f(t)]))
def test_symbolic_domains_match_numpy(p, q, coeff):
    # each coefficient kind takes another domain path (ZZ[a], ZZ_I[f(t)], QQ<sqrt 2>,
    # QQ<...>[a], fraction field); numeric values substituted afterwards, numpy reference
    values = {a: Rational(3, 7), b: Rational(-2, 5), f(t): Rational(5, 3)}
    expr = coeff * p * q + q * coeff**2
    js = {"J": 1, "S": 0.5}
    got = evaluate(canonical(expr).subs(values), js)
    ref = evaluate(p, js) @ evaluate(q, js) * complex(coeff.subs(values)) + \
        evaluate(q, js) * complex((coeff**2).subs(values))
    assert np.allclose(got, ref)


@settings(deadline=None)
@given(operator_polynomials(labels=("J", "S"), max_terms=3, max_weight=3),
       st.sampled_from([Integer(1), a, -I * sqrt(2) / 2, a * sqrt(3) + I, 1 / (a + 2), f(t) - 3 * I]))
def test_fast_construction_equals_sympy_construction(p, coeff):
    # the output is assembled with Mul._from_args / Add._from_args; it must be
    # exactly what SymPy's own flattening builds from the same args
    out = canonical(coeff * p)
    assert Add(*Add.make_args(out)) == out
    for term in Add.make_args(out):
        assert Mul(*Mul.make_args(term)) == term
