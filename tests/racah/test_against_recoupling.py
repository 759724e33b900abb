"""Cross-check with the coupling-tree route (amalgebra.coupling.recoupling), an independent
implementation: the overlap of two coupled states, written as a sum over projections of
Clebsch-Gordan coefficients, reduced here, must equal the tree route's recoupling
coefficient at random admissible values."""

import pytest
from sympy import Sum, expand, symbols

from amalgebra.coupling import CouplingBracket as CG
from amalgebra.racah import direct_value, reduce_racah_sum

recoupling = pytest.importorskip("amalgebra.coupling.recoupling")
trees = pytest.importorskip("amalgebra.coupling.trees")

a, b, c, d, e, f, g, h, j, M = symbols("a b c d e f g h j M")
ma, mb, mc, md, me, mf, mg, mh = symbols("ma mb mc md me mf mg mh")


def _compare(overlap, left, right, jmax):
    red = reduce_racah_sum(overlap)
    assert red.complete, red.reason
    report = red.check(points=3, jmax=jmax, attempts=400)
    assert report.passed, report.summary()
    tree_value = recoupling.recoupling_coefficient(trees.coupling_tree(left), trees.coupling_tree(right))
    for values, direct in report.samples:
        other = tree_value.xreplace(values).doit()
        assert expand(other - direct) == 0, (values, other, direct)


def test_associativity_overlap():
    # <((a b) e, c) j M | (a, (b c) g) j M> = sum over projections of four CG coefficients
    overlap = Sum(CG(a, ma, b, mb, e, me) * CG(e, me, c, mc, j, M) * CG(b, mb, c, mc, g, mg)
                  * CG(a, ma, g, mg, j, M), (ma, -a, a), (mb, -b, b), (mc, -c, c), (me, -e, e), (mg, -g, g))
    _compare(overlap, "((a b) e, c) j", "(a, (b c) g) j", 3 / 2)


def test_pair_exchange_overlap_is_a_9j():
    # <((a b) e, (c d) f) j M | ((a c) g, (b d) h) j M>, the LS-jj overlap
    overlap = Sum(CG(a, ma, b, mb, e, me) * CG(c, mc, d, md, f, mf) * CG(e, me, f, mf, j, M)
                  * CG(a, ma, c, mc, g, mg) * CG(b, mb, d, md, h, mh) * CG(g, mg, h, mh, j, M),
                  (ma, -a, a), (mb, -b, b), (mc, -c, c), (md, -d, d), (me, -e, e), (mf, -f, f),
                  (mg, -g, g), (mh, -h, h))
    red = reduce_racah_sum(overlap)
    assert red.complete and red.result.atoms(__import__("amalgebra").Coupling9j)
    _compare(overlap, "((a b) e, (c d) f) j", "((a c) g, (b d) h) j", 1)
