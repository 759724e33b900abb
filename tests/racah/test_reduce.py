"""The reducer's contract: input forms, partial results that say so, errors, steps, checks."""

import pickle

import pytest
from sympy import Abs, KroneckerDelta as KD, Rational, Sum, symbols

from amalgebra.coupling import Coupling6j as SJ
from amalgebra.coupling import Coupling3j as TJ
from amalgebra.errors import RacahSumError
from amalgebra.racah import (TriangleDelta, check_reduction, direct_value, momentum_sum,
                             projection_sum, reduce_racah_sum)

a, b, c, d, e, f, p, q, x = symbols("a b c d e f p q x")
m, m1, m2, m3, m4, mu, M = symbols("m m1 m2 m3 m4 mu M")
u1, u2, u3, u4 = symbols("u1 u2 u3 u4")


def test_sum_builders_use_full_ranges():
    s = projection_sum(TJ(a, b, c, m1, m2, m3), m1)
    assert s.limits == ((m1, -a, a),)
    t = momentum_sum((2 * x + 1) * SJ(a, b, x, c, d, e), x)
    assert t.limits == ((x, Abs(a - b), a + b),)


def test_plain_sympy_sum_and_summed_arguments_agree():
    # common practice, no source: the same sum written three ways reduces to the same form
    term = TJ(a, b, c, m1, m2, m3) ** 2
    one = reduce_racah_sum(Sum(term, (m1, -a, a), (m2, -b, b), (m3, -c, c))).result
    two = reduce_racah_sum(Sum(Sum(term, (m1, -a, a)), (m2, -b, b), (m3, -c, c))).result
    three = reduce_racah_sum(term, summed_m=(m1, m2, m3)).result
    assert one == two == three == TriangleDelta(a, b, c)


def test_sum_of_terms_reduced_term_by_term():
    s = projection_sum(TJ(a, b, c, m1, m2, m3) ** 2, m1, m2, m3)
    red = reduce_racah_sum(s + 2 * s)
    assert red.complete and red.result == 3 * TriangleDelta(a, b, c)


def test_tree_left_as_partial_result_and_said_so():
    # two 3j joined by one line, four open lines: no rule closes it
    s = projection_sum((-1) ** (e - mu) * TJ(a, b, e, m1, m2, mu) * TJ(e, c, d, -mu, m3, m4), mu)
    red = reduce_racah_sum(s)
    assert not red.complete and "still summed" in red.reason
    assert red.result.has(Sum)
    assert red.check(points=3, jmax=1, attempts=400).passed   # still equal to the input


def test_wrong_phase_is_not_forced_into_a_6j():
    # the three-3j sum without its phase (-1)^(u1+u2+u3+...) is not a 3j times a 6j
    j1, j2, j3, l1, l2, l3, n1, n2, n3 = symbols("j1 j2 j3 l1 l2 l3 n1 n2 n3")
    s = projection_sum(TJ(j1, l2, l3, n1, u2, -u3) * TJ(l1, j2, l3, -u1, n2, u3) * TJ(l1, l2, j3, u1, -u2, n3),
                       u1, u2, u3)
    red = reduce_racah_sum(s)
    assert not red.complete
    assert not red.result.atoms(SJ)
    assert red.check(points=2, attempts=400).passed


def test_open_square_shortened_by_an_interchange():
    # a cycle of four 3j with four open lines: one interchange (a new sum over x of a 6j)
    s = projection_sum((-1) ** (4 * a + a - u1 + a - u2 + a - u3 + a - u4)
                       * TJ(a, a, b, u1, -u2, m1) * TJ(a, a, b, u2, -u3, m2)
                       * TJ(a, a, b, u3, -u4, m3) * TJ(a, a, b, u4, -u1, m4), u1, u2, u3, u4)
    red = reduce_racah_sum(s)
    assert any(st.rule == "interchange" for st in red.steps)
    assert red.result.atoms(SJ)
    rep = red.check(points=2, jmax=1, attempts=600)
    assert rep.passed, rep.summary()


def test_zero_by_delta_and_momentum_delta_summed():
    # Edmonds 1957 eq. 3.7.8 (from memory), with one projection renamed under a delta
    m1p, cp, m3p = symbols("m1p cp m3p")
    s = projection_sum(KD(m1, m1p) * TJ(a, b, c, m1, m2, m3) * TJ(a, b, cp, m1p, m2, m3p), m1, m1p, m2)
    assert reduce_racah_sum(s).result == KD(c, cp) * KD(m3, m3p) * TriangleDelta(a, b, c) / (2 * c + 1)
    t = momentum_sum(KD(x, c) * SJ(a, b, x, d, e, f), x)
    assert reduce_racah_sum(t).result == SJ(a, b, c, d, e, f)


@pytest.mark.parametrize("bad", [
    Sum(TJ(a, b, c, m1, m2, m3), (m1, 0, a)),                       # half the range
    Sum(TJ(a, b, c, m1 ** 2, m2, m3), (m2, -b, b)),                 # not linear
    Sum(SJ(a, b, x, c, d, e), (x, 0, a + b)),                       # not the triangle's range
    Sum(TJ(a, b, c, m1, m2, m3), (q, -a, a)),                       # variable in no symbol
])
def test_unreadable_sums_raise_typed_errors(bad):
    with pytest.raises(RacahSumError):
        reduce_racah_sum(bad)
    assert issubclass(RacahSumError, ValueError)


def test_check_catches_a_wrong_closed_form():
    s = projection_sum(TJ(a, b, c, m1, m2, m3) ** 2, m1, m2, m3)
    assert check_reduction(s, TriangleDelta(a, b, c), points=3).passed
    assert not check_reduction(s, 2 * TriangleDelta(a, b, c), points=3).passed
    assert not check_reduction(s, (-1) ** (2 * a) * TriangleDelta(a, b, c), points=6).passed
    assert "symbols" in check_reduction(s, TriangleDelta(a, b, q)).summary()


def test_direct_value_matches_a_hand_sum():
    # (1 1 0; m -m 0) = (-1)^(1-m)/sqrt(3) (DLMF 34.3.1): squares sum to 1
    s = projection_sum(TJ(1, 1, 0, m, -m, 0) ** 2, m)
    assert direct_value(s, {}) == 1


def test_steps_are_sympy_expressions_equal_to_the_input():
    s = momentum_sum((-1) ** (p + q + x) * (2 * x + 1) * SJ(a, b, x, c, d, p) * SJ(a, b, x, d, c, q), x)
    red = reduce_racah_sum(s)
    rules = [st.rule for st in red.steps]
    assert rules[:2] == ["expand", "absorb"] and "completeness" in rules and "triangle" in rules
    for st in red.steps[1::3]:
        assert check_reduction(s, st.expr, points=1, jmax=1, attempts=300).passed, st.rule
    assert pickle.loads(pickle.dumps(red.result)) == red.result


def test_triangle_delta():
    # common practice, no source: the triangle rule
    assert TriangleDelta(1, 1, 2) == 1 and TriangleDelta(1, 1, 3) == 0
    assert TriangleDelta(Rational(1, 2), Rational(1, 2), 1) == 1
    assert TriangleDelta(c, a, b).args == (a, b, c)
    assert TriangleDelta(a, b, c).subs({a: 1, b: 2, c: Rational(5, 2)}) == 0


def _cube_sum(labels):
    """The cube graph (eight 3j, twelve lines, girth four), every line with its metric phase."""
    from sympy import Mul, Symbol

    edges = {}
    for v in range(8):
        for bit in range(3):
            w = v ^ (1 << bit)
            if v < w:
                edges[(v, w)] = (Symbol(f"n{v}{w}"), labels[bit])
    factors, limits = [], []
    for (v, w), (mm, j) in edges.items():
        factors.append((-1) ** (j - mm))
        limits.append((mm, -j, j))
    for v in range(8):
        slots = []
        for bit in range(3):
            w = v ^ (1 << bit)
            mm, j = edges[(min(v, w), max(v, w))]
            slots.append((j, mm if v < w else -mm))
        factors.append(TJ(*(j for j, _ in slots), *(s for _, s in slots)))
    return Sum(Mul(*factors), *limits)


def test_cube_graph_needs_interchanges_and_equals_brute_force():
    # common practice, no source: brute-force summation decides the value
    s = _cube_sum((1, Rational(1, 2), Rational(1, 2)))
    red = reduce_racah_sum(s)
    assert red.complete, red.reason
    assert any(st.rule == "interchange" for st in red.steps)
    from sympy import expand

    assert expand(direct_value(s, {}) - direct_value(red.result, {})) == 0


def test_projection_written_as_a_combination():
    # sum_{m1 m2} <a m1 b m2|c m1+m2><a m1 b m2|c' m1+m2> = (2c+1) delta(c, c') for a triad
    # (Edmonds 1957 eq. 3.5.4 summed over M; from memory)
    from amalgebra.coupling import CouplingBracket as CG

    cp = symbols("cp")
    s = Sum(CG(a, m1, b, m2, c, m1 + m2) * CG(a, m1, b, m2, cp, m1 + m2), (m1, -a, a), (m2, -b, b))
    red = reduce_racah_sum(s)
    assert red.complete
    assert red.result == (2 * c + 1) * KD(c, cp) * TriangleDelta(a, b, c)
    assert red.check(points=3, jmax=2).passed
