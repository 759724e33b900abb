"""Recoupling checks for the (fictitious) three-spin cluster of the ion "Vexium-9".

Vexium-9 is an invented scenario: three angular momenta j1 = 1/2, j2 = 1, j3 = 3/2
couple to a total J.  The identities below are the standard orthogonality and
special-value relations of Clebsch-Gordan coefficients and 6j symbols, checked
exactly at these numeric quantum numbers with ``amalgebra.coupling``.
"""

from sympy import Add, Rational, sqrt

from amalgebra.coupling import Coupling6j, cg, sixj
from amalgebra.derivations import derivation

HALF = Rational(1, 2)
J1, J2, J3 = HALF, 1, Rational(3, 2)


def _range(j):
    """j, j - 1, ..., -j as exact numbers."""
    return [j - k for k in range(int(2*j) + 1)]


def _totals(a, b):
    return [abs(a - b) + k for k in range(int(a + b - abs(a - b)) + 1)]


@derivation(title="Clebsch-Gordan orthogonality for the j1 = 1/2, j2 = 1 pair")
def cg_orthogonality(d):
    """$\\sum_{m_1 m_2} \\langle j_1 m_1 j_2 m_2|J M\\rangle
    \\langle j_1 m_1 j_2 m_2|J' M\\rangle = \\delta_{JJ'}$, the standard orthogonality
    of Clebsch-Gordan coefficients (e.g. Edmonds 1957, chapter 3; from memory)."""
    for J in _totals(J1, J2):
        for Jp in _totals(J1, J2):
            M = HALF
            # unevaluated, so that the report shows the individual products
            total = Add(*[cg(J1, m1, J2, M - m1, J, M) * cg(J1, m1, J2, M - m1, Jp, M)
                          for m1 in _range(J1) if abs(M - m1) <= J2], evaluate=False)
            name = f"J{int(2*J)}_J{int(2*Jp)}"
            d.step(f"overlap_{name}", total, 1 if J == Jp else 0,
                   f"orthogonality, J = {J}, J' = {Jp}, M = 1/2 (doubled labels in the name)")
    d.result("stretched_coefficient", cg(J1, HALF, J2, 1, Rational(3, 2), Rational(3, 2)))


@derivation(title="6j orthogonality and a special value for the Vexium-9 triad")
def sixj_relations(d):
    """Orthogonality $\\sum_x (2x+1)(2f+1)\\{a\\,b\\,x; c\\,d\\,f\\}\\{a\\,b\\,x; c\\,d\\,f'\\}
    = \\delta_{ff'}$ (e.g. Edmonds 1957, chapter 6; from memory) and the special value
    $\\{a\\,b\\,c; 0\\,c\\,b\\} = (-1)^{a+b+c}/\\sqrt{(2b+1)(2c+1)}$ (DLMF 34.5.1)."""
    a, b, c, e = J1, J2, J3, 1
    xs = [x for x in _totals(a, b) if x in _totals(c, e)]
    fs = [f for f in _totals(b, c) if f in _totals(a, e)]
    for f in fs:
        for fp in fs:
            if fp < f:
                continue
            total = Add(*[(2*x + 1)*(2*f + 1)*sixj(a, b, x, c, e, f)*sixj(a, b, x, c, e, fp)
                          for x in xs], evaluate=False)
            d.step(f"orthogonality_f{int(2*f)}_f{int(2*fp)}", total, 1 if f == fp else 0,
                   f"6j orthogonality over x, f = {f}, f' = {fp}")
    special = sixj(a, b, c, 0, c, b)
    d.step("special_value", Coupling6j(a, b, c, 0, c, b), (-1)**int(a + b + c)/sqrt((2*b + 1)*(2*c + 1)),
           "one zero entry (DLMF 34.5.1)")
    d.result("special_value", special)
    d.result("triad_sixj", sixj(a, b, Rational(3, 2), c, e, Rational(3, 2)))
