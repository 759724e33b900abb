"""Random coupling graphs with small numeric j: the reduction equals brute-force summation.

Brute force is ``direct_value`` (nested loops over every summed projection with the
library's exact coefficients) and, independently, the float oracle of ``float_oracle.py``.
"""

import sys
from pathlib import Path

import pytest
from hypothesis import given, settings
from sympy import Rational, Sum, expand

from amalgebra.racah import direct_value, reduce_racah_sum

sys.path.insert(0, str(Path(__file__).parent))
import float_oracle  # noqa: E402
from coupling_graphs import coupling_sums  # noqa: E402


def _exact_and_oracle(expr, result, env):
    brute = direct_value(expr, env)
    assert expand(brute - direct_value(result, env)) == 0, (expr, result)
    assert abs(complex(brute) - float_oracle.value(result, env)) < 1e-9


def _closed(case):
    expr, _ = case
    red = reduce_racah_sum(expr)
    # common practice, no source: a graph of two coupling trees has a closed form in 6j
    # symbols (Yutsis, Levinson, Vanagas 1962); brute force decides its value
    assert red.complete, (expr, red.reason)
    assert not red.result.has(Sum) or all(lim[0].name.startswith("x") for s in red.result.atoms(Sum)
                                          for lim in s.limits)
    _exact_and_oracle(expr, red.result, {})


@settings(deadline=None)
@given(coupling_sums(max_leaves=3))
def test_closed_recoupling_graphs_reduce_completely(case):
    _closed(case)


@pytest.mark.slow
@settings(deadline=None)
@given(coupling_sums(max_leaves=4))
def test_closed_recoupling_graphs_of_four_momenta(case):
    _closed(case)


@settings(deadline=None)
@given(coupling_sums(max_leaves=3, open_root=True))
def test_open_recoupling_graphs(case):
    expr, (M, Mp) = case
    red = reduce_racah_sum(expr)
    assert red.complete, red.reason
    for Mv in (Rational(1, 2), 0, 1):
        for Mpv in (Rational(1, 2), 0, 1):
            env = {M: Mv, Mp: Mpv}
            try:
                brute = direct_value(expr, env)
            except (ValueError, TypeError):
                continue      # projection incompatible with its line
            assert expand(brute - direct_value(red.result, env)) == 0


@settings(deadline=None)
@given(coupling_sums(max_leaves=3, broken=True))
def test_broken_phases_never_give_a_wrong_closed_form(case):
    # one line without its metric phase: the sum is another sum; whatever the reducer
    # returns (complete or partial) must equal it
    expr, _ = case
    red = reduce_racah_sum(expr)
    _exact_and_oracle(expr, red.result, {})
    if not red.complete:
        assert red.reason


@settings(deadline=None)
@given(coupling_sums(max_leaves=4, symbolic=True))
def test_symbolic_recoupling_graphs(case):
    # the same random graphs with a symbol for every momentum: the closed form must agree
    # with direct summation at random admissible values (common practice, no source)
    expr, _ = case
    red = reduce_racah_sum(expr)
    assert red.complete, (expr, red.reason)
    report = red.check(points=2, jmax=1, attempts=200)
    assert report.passed, report.summary()
