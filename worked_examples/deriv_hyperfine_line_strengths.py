"""Relative strengths of the hyperfine components of two lines of the (fictitious) "Tessarine-41".

Tessarine-41 is an invented atom used only as a scenario: nuclear spin I = 3/2 and an
electric-dipole transition from a lower level J = 1/2 to upper levels J' = 3/2 (the
"blue line") and J' = 1/2 (the "red line").  The nucleus is a spectator of the
rank-1 operator acting on the electrons, so (Edmonds 1957, eq. 7.1.7; from memory)

    <(J' I) F'||T^1||(J I) F> = (-1)^(J'+I+F+1) sqrt((2F+1)(2F'+1)) {J' F' I; F J 1} <J'||T^1||J>

and the relative strength of the component F -> F', normalised so that the strengths
from one lower level F add up to one, is

    S(F, F') = (2F'+1)(2J+1) {J J' 1; F' F I}^2.

Conventions: Edmonds' reduced matrix elements (``DEVELOPERS.md``).  The derivations
below check, at these numeric quantum numbers, that the 6j formula agrees with the
coupled-scheme engine (:func:`amalgebra.tensors.reduced_part1`), the sum rule over F'
for each F, the sum rule over F weighted by 2F + 1 for each F', and the total.
"""

from sympy import Add, Mul, Pow, Rational

from amalgebra.coupling import Coupling6j, sixj
from amalgebra.derivations import derivation, written
from amalgebra.tensors import reduced_part1

I_SPIN = Rational(3, 2)
J_LOW = Rational(1, 2)


def _totals(a, b):
    return [abs(a - b) + k for k in range(int(a + b - abs(a - b)) + 1)]


def strength(j, jp, f, fp, i=I_SPIN):
    """S(F -> F') = (2F'+1)(2J+1) {J J' 1; F' F I}^2 (zero off the triangle rules)."""
    return (2*fp + 1)*(2*j + 1)*sixj(j, jp, 1, fp, f, i)**2


def strength_written(j, jp, f, fp, i=I_SPIN):
    """S(F -> F') as the author writes it: (2F'+1)(2J+1) times the unevaluated 6j symbol squared."""
    return _shown(2*fp + 1, 2*j + 1, Pow(Coupling6j(j, jp, 1, fp, f, i), 2, evaluate=False))


def _shown(*factors):
    """A product left unevaluated, so that the report shows the numbers that enter it."""
    return Mul(*factors, evaluate=False)


def _tag(f):
    return str(int(2*f))


def _line(d, jp, label):
    """Steps for the line J_LOW -> jp; returns {(F, F'): S} for the results."""
    fs, fps = _totals(J_LOW, I_SPIN), _totals(jp, I_SPIN)
    table = {}
    for f in fs:
        for fp in fps:
            s = strength(J_LOW, jp, f, fp)
            table[f, fp] = s
            reduced = reduced_part1(jp, I_SPIN, fp, J_LOW, I_SPIN, f, 1, reduced=1)
            d.step(f"{label}_engine_F{_tag(f)}_Fp{_tag(fp)}",
                   strength_written(J_LOW, jp, f, fp),
                   _shown(2*J_LOW + 1, Pow(reduced, 2, evaluate=False), Pow(2*f + 1, -1, evaluate=False)),
                   f"6j formula against the coupled-scheme engine, F = {f}, F' = {fp}")
    for f in fs:
        d.step(f"{label}_sum_over_Fp_F{_tag(f)}", Add(*[table[f, fp] for fp in fps], evaluate=False), 1,
               f"sum rule over $F'$ for F = {f} (6j orthogonality)")
    for fp in fps:
        d.step(f"{label}_sum_over_F_Fp{_tag(fp)}",
               Add(*[_shown(2*f + 1, table[f, fp]) for f in fs], evaluate=False),
               _shown(2*fp + 1, 2*J_LOW + 1, Pow(2*jp + 1, -1, evaluate=False)),
               f"sum over F weighted by 2F+1, for F' = {fp}")
    d.step(f"{label}_total",
           written(r"\sum_{F, F'} (2F+1)\, S(F \to F')", Add(*[(2*f + 1)*table[f, fp] for f in fs for fp in fps])),
           _shown(2*I_SPIN + 1, 2*J_LOW + 1), "all components, weighted by the lower multiplicity")
    return table


@derivation(title="Hyperfine components of the Tessarine-41 blue line, J = 1/2 -> J' = 3/2")
def blue_line(d):
    """$F = 1, 2$ to $F' = 0, 1, 2, 3$; $\\Delta F = \\pm 2$ vanish by the triangle rule of
    the 6j symbol.  The strengths from $F = 2$ are $1/20, 1/4, 7/10$ to $F' = 1, 2, 3$
    and from $F = 1$ are $1/6, 5/12, 5/12$ to $F' = 0, 1, 2$ (the
    $S_{1/2} \\to P_{3/2}$ pattern for $I = 3/2$, as tabulated e.g. in D. A. Steck,
    "Rubidium 87 D Line Data"; from memory)."""
    jp = Rational(3, 2)
    table = _line(d, jp, "blue")
    d.step("blue_F2_stretched", strength_written(J_LOW, jp, 2, 3), Rational(7, 10),
           "cycling component $S(2 \\to 3)$")
    d.step("blue_F1_to_0", strength_written(J_LOW, jp, 1, 0), Rational(1, 6), "component $S(1 \\to 0)$")
    d.step("blue_forbidden", Add(strength_written(J_LOW, jp, 1, 3), strength_written(J_LOW, jp, 2, 0),
                                 evaluate=False), 0,
           "$S(1 \\to 3) + S(2 \\to 0)$: $|\\Delta F| = 2$ is forbidden (triangle rule of the 6j)")
    for (f, fp), s in sorted(table.items()):
        if s != 0:
            d.result(f"S_F{_tag(f)}_Fp{_tag(fp)}", s)


@derivation(title="Hyperfine components of the Tessarine-41 red line, J = 1/2 -> J' = 1/2")
def red_line(d):
    """$F = 1, 2$ to $F' = 1, 2$: from $F = 1$ the strengths are $1/6, 5/6$ and from $F = 2$
    they are $1/2, 1/2$ to $F' = 1, 2$ (the $S_{1/2} \\to P_{1/2}$ pattern for $I = 3/2$, as
    tabulated e.g. in D. A. Steck, "Rubidium 87 D Line Data"; from memory)."""
    jp = Rational(1, 2)
    table = _line(d, jp, "red")
    d.step("red_F1_F1", strength_written(J_LOW, jp, 1, 1), Rational(1, 6), "component $S(1 \\to 1)$")
    d.step("red_F2_F2", strength_written(J_LOW, jp, 2, 2), Rational(1, 2), "component $S(2 \\to 2)$")
    for (f, fp), s in sorted(table.items()):
        d.result(f"S_F{_tag(f)}_Fp{_tag(fp)}", s)
