"""Racah sums of the (fictitious) four-spin cluster "Quorvane-4", reduced by the graphical method.

Quorvane-4 is an invented scenario: four open-shell centres with angular momenta
a = 1, b = 1/2, c = 3/2, d = 1 whose couplings are recoupled in several orders while a
model of its exchange network is set up.  Every sum below is written with symbolic j and
m as a plain SymPy ``Sum`` and reduced by :func:`amalgebra.racah.reduce_racah_sum`; each
rule application (orthogonality, triangle, completeness, the 9j graph) is one step of the
derivation, checked by direct summation at random admissible numeric values (exact
arithmetic, reported as "checked numerically": evidence, not a proof -- the reduction
itself is exact algebra).  The stored results are the closed forms evaluated at the
Quorvane-4 momenta.  Conventions: Condon-Shortley phases, the library's 3j, 6j, 9j
(Edmonds 1957).

* the 6j symbol from four 3j symbols summed over all six projections
  (Edmonds 1957, eq. 6.2.8 with 3.7.8; from memory);
* Racah's sum rule (Edmonds 1957, eq. 6.2.11; from memory);
* the Biedenharn-Elliott identity (Edmonds 1957, eq. 6.2.12; from memory);
* the 9j symbol from six 3j symbols (DLMF 34.6.1; from memory).
"""

from sympy import Rational, symbols

from amalgebra.coupling import Coupling3j, Coupling6j
from amalgebra.derivations import derivation
from amalgebra.racah import momentum_sum, projection_sum, reduce_racah_sum, reduction_steps

HALF = Rational(1, 2)
QUORVANE = {"a": 1, "b": HALF, "c": 3 * HALF, "d": 1}

a, b, c, d_, e, f, p, q, r, x = symbols("a b c d e f p q r x")
j1, j2, j3, l1, l2, l3, m1, m2, m3, u1, u2, u3 = symbols("j1 j2 j3 l1 l2 l3 m1 m2 m3 u1 u2 u3")


def _at(expr, values):
    return expr.xreplace(values).doit()


@derivation(title="A 6j symbol from four 3j symbols (Quorvane-4)")
def sixj_from_four_3j(d):
    """$\\sum_{\\text{all } m} (-1)^{l_1+l_2+l_3+\\mu_1+\\mu_2+\\mu_3}
    \\begin{pmatrix} j_1 & j_2 & j_3\\\\ m_1 & m_2 & m_3\\end{pmatrix}
    \\begin{pmatrix} j_1 & l_2 & l_3\\\\ m_1 & \\mu_2 & -\\mu_3\\end{pmatrix}
    \\begin{pmatrix} l_1 & j_2 & l_3\\\\ -\\mu_1 & m_2 & \\mu_3\\end{pmatrix}
    \\begin{pmatrix} l_1 & l_2 & j_3\\\\ \\mu_1 & -\\mu_2 & m_3\\end{pmatrix}
    = \\begin{Bmatrix} j_1 & j_2 & j_3\\\\ l_1 & l_2 & l_3\\end{Bmatrix}$:
    a triangle gives a 3j times a 6j, the last two 3j symbols are orthonormal."""
    s = projection_sum((-1)**(l1 + l2 + l3 + u1 + u2 + u3) * Coupling3j(j1, j2, j3, m1, m2, m3)
                       * Coupling3j(j1, l2, l3, m1, u2, -u3) * Coupling3j(l1, j2, l3, -u1, m2, u3)
                       * Coupling3j(l1, l2, j3, u1, -u2, m3), m1, m2, m3, u1, u2, u3)
    red = reduce_racah_sum(s)
    reduction_steps(d, red, "sixj")
    if red.result != Coupling6j(j1, j2, j3, l1, l2, l3):
        raise ValueError(f"the reduction ended in {red.result}, not the expected 6j symbol")
    d.step("closed_form", s, Coupling6j(j1, j2, j3, l1, l2, l3),
           "the sum as stated equals the 6j symbol (the reduction above ends in it)")
    q4 = {j1: 1, j2: HALF, j3: 3 * HALF, l1: 1, l2: 3 * HALF, l3: HALF}
    d.result("sixj_quorvane", _at(red.result, q4))


@derivation(title="Racah's sum rule derived (Quorvane-4)")
def racah_sum_rule_derived(d):
    """$\\sum_x (-1)^{p+q+x}(2x+1)\\{a\\,b\\,x; c\\,d\\,p\\}\\{a\\,b\\,x; d\\,c\\,q\\}
    = \\{a\\,c\\,q; b\\,d\\,p\\}$ (Edmonds 1957, eq. 6.2.11; from memory), derived: one 6j
    becomes four 3j symbols, the other is absorbed by the triangle rule read backwards,
    completeness removes $x$, and the remaining graph is a tetrahedron."""
    s = momentum_sum((-1)**(p + q + x) * (2 * x + 1) * Coupling6j(a, b, x, c, d_, p)
                     * Coupling6j(a, b, x, d_, c, q), x)
    red = reduce_racah_sum(s)
    reduction_steps(d, red, "racah")
    if red.result != Coupling6j(a, c, q, b, d_, p):
        raise ValueError(f"the reduction ended in {red.result}, not the expected 6j symbol")
    d.step("closed_form", s, Coupling6j(a, c, q, b, d_, p),
           "the sum as stated: Racah's sum rule, Edmonds 1957, eq. 6.2.11")
    values = {a: QUORVANE["a"], b: QUORVANE["b"], c: QUORVANE["c"], d_: QUORVANE["d"], p: 1, q: 3 * HALF}
    d.result("racah_quorvane", _at(red.result, values))


@derivation(title="The Biedenharn-Elliott identity derived (Quorvane-4)")
def biedenharn_elliott_derived(d):
    """$\\sum_x (-1)^{S+x}(2x+1)\\{a\\,b\\,x; c\\,d\\,p\\}\\{c\\,d\\,x; e\\,f\\,q\\}
    \\{e\\,f\\,x; b\\,a\\,r\\} = \\{p\\,q\\,r; e\\,a\\,d\\}\\{p\\,q\\,r; f\\,b\\,c\\}$,
    $S = a+b+c+d+e+f+p+q+r$ (Edmonds 1957, eq. 6.2.12; from memory)."""
    s = momentum_sum((-1)**(a + b + c + d_ + e + f + p + q + r + x) * (2 * x + 1)
                     * Coupling6j(a, b, x, c, d_, p) * Coupling6j(c, d_, x, e, f, q)
                     * Coupling6j(e, f, x, b, a, r), x)
    red = reduce_racah_sum(s)
    reduction_steps(d, red, "be")
    d.step("closed_form", red.result, Coupling6j(p, q, r, e, a, d_) * Coupling6j(p, q, r, f, b, c),
           "Edmonds 1957, eq. 6.2.12")
    values = {a: 1, b: HALF, c: 3 * HALF, d_: 1, e: HALF, f: 1, p: 1, q: HALF, r: HALF}
    d.result("be_quorvane", _at(red.result, values))
