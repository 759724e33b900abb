"""Published identities of Racah algebra, each derived by the reducer from its left side.

For every identity: the reducer must finish (``complete``), its result must agree with
direct summation of the left side with the library's exact coefficients at random
admissible points, must equal the published right side at those points, and must agree
with the independent float oracle (``float_oracle.py``: Racah's formulas written out
separately) at those points too.  The sources are given per row; equation numbers marked
"from memory" were not checked against the printed page.
"""

import sys
from pathlib import Path

import pytest
from sympy import Abs, KroneckerDelta as KD, Rational, Sum, expand, sqrt, symbols

from amalgebra.coupling import CouplingBracket as CG
from amalgebra.coupling import Coupling9j as NJ
from amalgebra.coupling import Coupling6j as SJ
from amalgebra.coupling import Coupling3j as TJ
from amalgebra.racah import (TriangleDelta as TD, direct_value, momentum_sum,
                             projection_sum, reduce_racah_sum)

sys.path.insert(0, str(Path(__file__).parent))
import float_oracle  # noqa: E402

a, b, c, cp, d, e, f, g, gp, h, hp, i, p, q, r, x = symbols("a b c cp d e f g gp h hp i p q r x")
m, m1, m2, m3, m1p, m2p, m3p, M, Mp = symbols("m m1 m2 m3 m1p m2p m3p M Mp")
j1, j2, j3, l1, l2, l3, u1, u2, u3 = symbols("j1 j2 j3 l1 l2 l3 u1 u2 u3")
n = [[symbols(f"n{r_}{k}") for k in range(3)] for r_ in range(3)]
HALF = Rational(1, 2)


def _ninej_sum():
    grid = [[a, b, c], [d, e, f], [g, h, i]]
    term = 1
    for row in range(3):
        term *= TJ(*grid[row], *n[row])
    for k in range(3):
        term *= TJ(grid[0][k], grid[1][k], grid[2][k], n[0][k], n[1][k], n[2][k])
    return projection_sum(term, *[n[row][k] for row in range(3) for k in range(3)])


TRIANGLE_LHS = projection_sum((-1)**(l1 + l2 + l3 + u1 + u2 + u3) * TJ(j1, l2, l3, m1, u2, -u3)
                              * TJ(l1, j2, l3, -u1, m2, u3) * TJ(l1, l2, j3, u1, -u2, m3), u1, u2, u3)

# name, left side, published right side, jmax of the draws, source
IDENTITIES = [
    ("orthogonality_3j",
     projection_sum(TJ(a, b, c, m1, m2, m3) * TJ(a, b, cp, m1, m2, m3p), m1, m2),
     KD(c, cp) * KD(m3, m3p) * TD(a, b, c) / (2 * c + 1), 2,
     "Edmonds 1957 eq. 3.7.8; DLMF 34.3.16 (from memory)"),
    ("normalisation_3j",
     projection_sum(TJ(a, b, c, m1, m2, m3)**2, m1, m2, m3), TD(a, b, c), 2,
     "Edmonds 1957 eq. 3.7.8 summed over m3 (from memory)"),
    ("completeness_3j",
     Sum((2 * c + 1) * TJ(a, b, c, m1, m2, m3) * TJ(a, b, c, m1p, m2p, m3), (m3, -c, c), (c, Abs(a - b), a + b)),
     KD(m1, m1p) * KD(m2, m2p), 2, "Edmonds 1957 eq. 3.7.7; DLMF 34.3.17 (from memory)"),
    ("orthogonality_cg",
     projection_sum(CG(a, m1, b, m2, c, M) * CG(a, m1, b, m2, cp, Mp), m1, m2),
     KD(c, cp) * KD(M, Mp) * TD(a, b, c), 2, "Edmonds 1957 eq. 3.5.4 (from memory)"),
    ("completeness_cg",
     Sum(CG(a, m1, b, m2, c, M) * CG(a, m1p, b, m2p, c, M), (M, -c, c), (c, Abs(a - b), a + b)),
     KD(m1, m1p) * KD(m2, m2p), 2, "Edmonds 1957 eq. 3.5.5 (from memory)"),
    ("loop_to_delta",
     projection_sum((-1)**(a - m) * TJ(a, a, c, m, -m, 0), m), sqrt(2 * a + 1) * KD(c, 0), 2,
     "(a a 0; m -m 0) = (-1)^(a-m)/sqrt(2a+1), DLMF 34.3.1, with orthogonality (from memory)"),
    ("three_3j_to_3j_6j", TRIANGLE_LHS,
     TJ(j1, j2, j3, m1, m2, m3) * SJ(j1, j2, j3, l1, l2, l3), HALF * 3,
     "Edmonds 1957 eq. 6.2.8 (from memory)"),
    ("four_3j_to_6j",
     projection_sum((-1)**(l1 + l2 + l3 + u1 + u2 + u3) * TJ(j1, j2, j3, m1, m2, m3) * TJ(j1, l2, l3, m1, u2, -u3)
                    * TJ(l1, j2, l3, -u1, m2, u3) * TJ(l1, l2, j3, u1, -u2, m3), m1, m2, m3, u1, u2, u3),
     SJ(j1, j2, j3, l1, l2, l3), 1, "Edmonds 1957 eq. 6.2.8 with 3.7.8 (from memory)"),
    ("orthogonality_6j",
     momentum_sum((2 * x + 1) * (2 * p + 1) * SJ(a, b, x, c, d, p) * SJ(a, b, x, c, d, q), x),
     KD(p, q) * TD(a, d, p) * TD(b, c, p), HALF * 3, "Edmonds 1957 eq. 6.2.9 (from memory)"),
    ("racah_sum_rule",
     momentum_sum((-1)**(p + q + x) * (2 * x + 1) * SJ(a, b, x, c, d, p) * SJ(a, b, x, d, c, q), x),
     SJ(a, c, q, b, d, p), HALF * 3, "Edmonds 1957 eq. 6.2.11 (from memory)"),
    ("biedenharn_elliott",
     momentum_sum((-1)**(a + b + c + d + e + f + p + q + r + x) * (2 * x + 1) * SJ(a, b, x, c, d, p)
                  * SJ(c, d, x, e, f, q) * SJ(e, f, x, b, a, r), x),
     SJ(p, q, r, e, a, d) * SJ(p, q, r, f, b, c), 1, "Edmonds 1957 eq. 6.2.12 (from memory)"),
    ("sum_of_6j",
     momentum_sum((2 * x + 1) * SJ(a, b, x, a, b, c), x), (-1)**(2 * a + 2 * b) * TD(a, b, c), 2,
     "Varshalovich et al. 1988, sec. 9.8 (from memory; triangle condition on (a b c) implicit there)"),
    ("sum_of_6j_with_phase",
     momentum_sum((-1)**(a + b + x) * (2 * x + 1) * SJ(a, b, x, b, a, c), x),
     sqrt((2 * a + 1) * (2 * b + 1)) * KD(c, 0), 2, "Varshalovich et al. 1988, sec. 9.8 (from memory)"),
    ("ninej_from_six_3j", _ninej_sum(), NJ(a, b, c, d, e, f, g, h, i), 1, "DLMF 34.6.1 (from memory)"),
    ("ninej_from_6j",
     momentum_sum((-1)**(2 * x) * (2 * x + 1) * SJ(a, b, c, f, i, x) * SJ(d, e, f, b, x, h)
                  * SJ(g, h, i, x, a, d), x),
     NJ(a, b, c, d, e, f, g, h, i), 1, "Edmonds 1957 eq. 6.4.3 (from memory)"),
    ("recoupling_three_momenta_cg",
     Sum(CG(j1, m1, j2, m2, l1, u1) * CG(l1, u1, j3, m3, l3, M) * CG(j2, m2, j3, m3, l2, u2)
         * CG(j1, m1, l2, u2, l3, M), (m1, -j1, j1), (m2, -j2, j2), (m3, -j3, j3), (u1, -l1, l1), (u2, -l2, l2)),
     (-1)**(j1 + j2 + j3 + l3) * sqrt((2 * l1 + 1) * (2 * l2 + 1)) * SJ(j1, j2, l1, j3, l3, l2), HALF * 3,
     "<(j1 j2)j12, j3; J M|j1, (j2 j3)j23; J M>, Edmonds 1957 eq. 6.1.5 (from memory)"),
    ("orthogonality_9j",
     Sum((2 * c + 1) * (2 * f + 1) * (2 * g + 1) * (2 * h + 1) * NJ(a, b, c, d, e, f, g, h, i)
         * NJ(a, b, c, d, e, f, gp, hp, i), (c, Abs(a - b), a + b), (f, Abs(d - e), d + e)),
     KD(g, gp) * KD(h, hp) * TD(a, d, g) * TD(b, e, h) * TD(g, h, i), 1,
     "Edmonds 1957 eq. 6.4.6 (from memory)"),
]


def _same(u, v):
    return u == v or expand(u - v) == 0


@pytest.mark.parametrize("name, lhs, rhs, jmax, source", IDENTITIES, ids=[t[0] for t in IDENTITIES])
def test_identity_derived_and_checked(name, lhs, rhs, jmax, source):
    red = reduce_racah_sum(lhs)
    assert red.complete, red.reason
    # direct summation with the library's exact coefficients (the built-in check)
    report = red.check(points=3, jmax=jmax, seed=name, attempts=400)
    assert report.passed, report.summary()
    assert report.nonzero >= 1
    for values, direct in report.samples:
        # the published right side (source in the table), at the same admissible points
        assert _same(direct_value(rhs, values), direct), (values, rhs)
        # the independent float oracle: left side summed and reduced form evaluated
        lhs_f = float_oracle.value(lhs, values)
        res_f = float_oracle.value(red.result, values)
        assert abs(lhs_f - complex(direct)) < 1e-9 and abs(res_f - lhs_f) < 1e-9, (values, lhs_f, res_f)


def test_racah_sum_rule_closed_form_is_the_printed_one():
    # Edmonds 1957 eq. 6.2.11 (from memory): the right side {a c q; b d p}
    lhs = dict((t[0], t[1]) for t in IDENTITIES)["racah_sum_rule"]
    assert reduce_racah_sum(lhs).result == SJ(a, c, q, b, d, p)


def test_ninej_closed_forms_are_the_printed_ones():
    # DLMF 34.6.1 and Edmonds 1957 eq. 6.4.3 (from memory): the 9j itself, no extra phase
    assert reduce_racah_sum(_ninej_sum()).result == NJ(a, b, c, d, e, f, g, h, i)
    assert reduce_racah_sum(dict((t[0], t[1]) for t in IDENTITIES)["ninej_from_6j"]).result == NJ(
        a, b, c, d, e, f, g, h, i)


def test_biedenharn_elliott_closed_form_is_a_product_of_two_6j():
    # Edmonds 1957 eq. 6.2.12 (from memory): two 6j symbols, no sum, no phase
    be = dict((t[0], t[1]) for t in IDENTITIES)["biedenharn_elliott"]
    res = reduce_racah_sum(be).result
    assert res.is_Mul and len(res.atoms(SJ)) == 2 and not res.has(Sum) and not res.has(-1)


def test_three_3j_closed_form():
    # Edmonds 1957 eq. 6.2.8 (from memory): exactly the 3j times the 6j
    assert reduce_racah_sum(TRIANGLE_LHS).result == TJ(j1, j2, j3, m1, m2, m3) * SJ(j1, j2, j3, l1, l2, l3)
