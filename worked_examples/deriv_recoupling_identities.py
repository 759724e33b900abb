"""Racah, Biedenharn-Elliott and 9j reduction identities for the (fictitious) nucleus "Orvane-12".

Orvane-12 is an invented nucleus used only as a scenario: its valence shell holds
angular momenta a = 1, b = 3/2, c = 1/2, d = 2, e = 3/2, f = 1 that recouple in
several orders.  The recoupling identities below (Edmonds 1957, ch. 6; from memory)
are checked exactly with :mod:`amalgebra.coupling`, at every admissible choice of the
remaining arguments up to 3 (doubled labels in the step names):

* Racah's sum rule (Edmonds eq. 6.2.11):
  sum_x (-1)^(p+q+x) (2x+1) {a b x; c d p} {a b x; d c q} = {a c q; b d p};
* the Biedenharn-Elliott identity (Edmonds eq. 6.2.12), with s = a+b+c+d+e+f+p+q+r:
  sum_x (-1)^(s+x) (2x+1) {a b x; c d p} {c d x; e f q} {e f x; b a r}
      = {p q r; e a d} {p q r; f b c};
* a 9j symbol with one zero argument (Edmonds eq. 6.4.14):
  {a b g; c d g; h h 0} = (-1)^(b+c+g+h) / sqrt((2g+1)(2h+1)) {a b g; d c h};
* the 9j symbol as a sum of products of three 6j symbols (Edmonds eq. 6.4.3).

Cases where the right side vanishes by a triangle rule are not stated one by one; a
separate step checks that the left sides vanish there too (sum of squares zero).
The orthogonality and special values already in ``deriv_recoupling_triad.py`` are
not repeated.
"""

from sympy import Add, Rational, sqrt

from amalgebra.coupling import Coupling6j, Coupling9j, ninej, sixj
from amalgebra.derivations import derivation, written

HALF = Rational(1, 2)
A, B, C, D, E, F = 1, 3*HALF, HALF, 2, 3*HALF, 1
VALUES = [HALF*k for k in range(7)]      # 0, 1/2, ..., 3


def _tag(*js):
    return "_".join(str(int(2*j)) for j in js)


def racah_sum(a, b, c, d, p, q):
    """The left side, unevaluated so that the report shows each term of the sum over x."""
    terms = [(-1)**(p + q + x)*(2*x + 1)*sixj(a, b, x, c, d, p)*sixj(a, b, x, d, c, q)
             for x in VALUES]
    return Add(*[t for t in terms if t != 0], evaluate=False)


def biedenharn_elliott_sum(a, b, c, d, e, f, p, q, r):
    s = a + b + c + d + e + f + p + q + r
    terms = [(-1)**(s + x)*(2*x + 1)*sixj(a, b, x, c, d, p)*sixj(c, d, x, e, f, q)
             *sixj(e, f, x, b, a, r) for x in VALUES]
    return Add(*[t for t in terms if t != 0], evaluate=False)


@derivation(title="Racah's sum rule for the Orvane-12 shell")
def racah_sum_rule(d):
    """$\\sum_x (-1)^{p+q+x}(2x+1)\\{a\\,b\\,x; c\\,d\\,p\\}\\{a\\,b\\,x; d\\,c\\,q\\}
    = \\{a\\,c\\,q; b\\,d\\,p\\}$ (Edmonds 1957, eq. 6.2.11; from memory), for every
    admissible $p, q \\le 3$ with $a, b, c, d = 1, 3/2, 1/2, 2$."""
    vanishing = []
    stated = 0
    for p in VALUES:
        for q in VALUES:
            rhs = sixj(A, C, q, B, D, p)
            lhs = racah_sum(A, B, C, D, p, q)
            if rhs == 0:
                vanishing.append(lhs**2)
                continue
            d.step(f"racah_{_tag(p, q)}", lhs, rhs, f"sum over x at p = {p}, q = {q}")
            stated += 1
    d.step("stated_cases", written(r"N_{(p,q)}", stated), 4,
           "four admissible $(p, q)$ with a nonzero right side")
    d.step("vanishing_cases", written(r"\sum_{(p,q)\ \text{vanishing}} \Sigma_{pq}^2", Add(*vanishing)), 0,
           "$\\Sigma_{pq}$ the sum over $x$: where the right side vanishes by a triangle rule, so does the sum")
    d.result("racah_p1_q1", sixj(A, C, HALF, B, D, 1))


@derivation(title="The Biedenharn-Elliott identity for the Orvane-12 shell")
def biedenharn_elliott(d):
    """$\\sum_x (-1)^{s+x}(2x+1)\\{a\\,b\\,x; c\\,d\\,p\\}\\{c\\,d\\,x; e\\,f\\,q\\}
    \\{e\\,f\\,x; b\\,a\\,r\\} = \\{p\\,q\\,r; e\\,a\\,d\\}\\{p\\,q\\,r; f\\,b\\,c\\}$,
    $s = a+b+c+d+e+f+p+q+r$ (Edmonds 1957, eq. 6.2.12; from memory), for every
    admissible $p, q, r \\le 3$."""
    vanishing = []
    stated = 0
    for p in VALUES:
        for q in VALUES:
            for r in VALUES:
                rhs = sixj(p, q, r, E, A, D)*sixj(p, q, r, F, B, C)
                lhs = biedenharn_elliott_sum(A, B, C, D, E, F, p, q, r)
                if rhs == 0:
                    vanishing.append(lhs**2)
                    continue
                d.step(f"be_{_tag(p, q, r)}", lhs, rhs, f"sum over x at p = {p}, q = {q}, r = {r}")
                stated += 1
    d.step("stated_cases", written(r"N_{(p,q,r)}", stated), 10,
           "ten admissible $(p, q, r)$ with a nonzero right side")
    d.step("vanishing_cases", written(r"\sum_{(p,q,r)\ \text{vanishing}} \Sigma_{pqr}^2", Add(*vanishing)), 0,
           "$\\Sigma_{pqr}$ the sum over $x$: where the right side vanishes by a triangle rule, so does the sum")
    d.result("be_1_half_half", biedenharn_elliott_sum(A, B, C, D, E, F, 1, HALF, HALF).doit())


@derivation(title="9j symbols of the Orvane-12 shell reduced to 6j symbols")
def ninej_reductions(d):
    """A 9j symbol with a zero reduces to one 6j symbol (Edmonds 1957, eq. 6.4.14), and
    every 9j symbol is a sum over $x$ of three 6j symbols (Edmonds 1957, eq. 6.4.3):
    $\\{a\\,b\\,c; d\\,e\\,f; g\\,h\\,i\\} = \\sum_x (-1)^{2x}(2x+1)
    \\{a\\,b\\,c; f\\,i\\,x\\}\\{d\\,e\\,f; b\\,x\\,h\\}\\{g\\,h\\,i; x\\,a\\,d\\}$ (from memory)."""
    stated = 0
    for g in VALUES:
        for h in VALUES:
            if sixj(A, B, g, D, C, h) == 0 and ninej(A, B, g, C, D, g, h, h, 0) == 0:
                continue
            rhs = (-1)**(B + C + g + h)/sqrt((2*g + 1)*(2*h + 1))*Coupling6j(A, B, g, D, C, h)
            lhs = Coupling9j(A, B, g, C, D, g, h, h, 0)
            d.step(f"zero_{_tag(g, h)}", lhs, rhs, f"one zero argument, g = {g}, h = {h}")
            stated += 1
    d.step("zero_cases", written(r"N_{(g,h)}", stated), 4,
           "g in {3/2, 5/2} (triads (a b g), (c d g)), h in {1/2, 3/2} (triads (a c h), (b d h))")
    # rows (a b c), (d e 3/2), (g h i): every row and column a triad with integer sum
    for g, h, i in ((1, 1, 1), (2, 1, 1), (1, 1, 2), (2, 2, 1)):
        a, b, c, dd, e, f = A, B, C, D, E, 3*HALF
        terms = [(-1)**(2*x)*(2*x + 1)*sixj(a, b, c, f, i, x)*sixj(dd, e, f, b, x, h)
                 *sixj(g, h, i, x, a, dd) for x in VALUES]
        total = Add(*[t for t in terms if t != 0], evaluate=False)
        value = ninej(a, b, c, dd, e, f, g, h, i)
        if value == 0:
            raise ValueError(f"9j at g, h, i = {g}, {h}, {i} vanishes: choose a nonvanishing case")
        d.step(f"sum_of_6j_{_tag(g, h, i)}", Coupling9j(a, b, c, dd, e, f, g, h, i), total,
               f"sum over $x$ of three 6j symbols, g, h, i = {g}, {h}, {i}")
        d.result(f"ninej_{_tag(g, h, i)}", value)
