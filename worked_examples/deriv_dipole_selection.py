"""The electric-dipole selection rule for the (fictitious) valence electron of "Velorium".

Velorium is an invented alkali-like atom used only as a scenario: one valence
electron with orbital angular momentum ``L`` and position ``r``, a vector
operator under ``L``.  The derivation is the commutator route to Delta l = +-1:
first the vector-operator rules, then the double-commutator identity for a
general vector operator, then the special case r.L = 0 of a position vector,
which turns into a polynomial condition on l and l'.  hbar = 1, Condon-Shortley
phases, design.md spherical components (see ``DEVELOPERS.md``).

Operator steps are proved in the canonical form of the operator algebra (angular
momentum to the left of vector components, which keep their written order) and
cross-checked on exact matrices on the direct sum of the l = 0, 1, 2 multiplets,
where the vector components are Wigner-Eckart matrices with symbolic reduced
elements <l'||r^(1)||l>.

Run ``amalgebra check worked_examples`` (or ``pytest worked_examples``) to re-check
every step; the named results are stored in ``deriv_dipole_selection.results.toml``.
"""

from sympy import I, factor, symbols

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.derivations import derivation
from amalgebra.tensors import VectorOperator

L = AngularMomentum("L")
r = VectorOperator("r", "L")
MULTIPLETS = [{"L": [0, 1, 2]}]


def L_dot(V):
    """L.V with L standing to the left."""
    return L.x*V.x + L.y*V.y + L.z*V.z


@derivation(title="The Velorium electron's position as a vector operator")
def vector_rules(d):
    """The commutation rules of a vector operator, $[L_a, r_b] = i\\epsilon_{abc} r_c$
    (Sakurai, Modern Quantum Mechanics, section 3.10), and what they give for
    $L^2$; proved in canonical form, checked on matrices."""
    d.step("xy", L.x*r.y - r.y*L.x, I*r.z, "$[L_x, y] = i z$", also_at=MULTIPLETS)
    raising = r.x + I*r.y
    d.step("raise", L.z*raising - raising*L.z, raising,
           "$x + i y$ raises $m$ by one", also_at=MULTIPLETS)
    d.step("lsq_z", L.squared*r.z - r.z*L.squared,
           I*(L.y*r.x + r.x*L.y - L.x*r.y - r.y*L.x),
           "$[L_x, z] = -iy$, $[L_y, z] = ix$",
           also_at=MULTIPLETS)


@derivation(title="The double commutator and the dipole selection rule for Velorium")
def double_commutator(d):
    """For any vector operator $V$ under $J$,
    $[J^2, [J^2, V]] = 2(J^2 V + V J^2) - 4 J (J\\cdot V)$ (a standard identity, e.g.
    Condon and Shortley 1935, section 3.10; from memory).  For the position of an
    electron $r\\cdot L = L\\cdot r = 0$, and matrix elements between $|l\\,m\\rangle$
    states turn the identity into $[(\\lambda' - \\lambda)^2 - 2(\\lambda' + \\lambda)]
    \\langle l' m'|z|l\\,m\\rangle = 0$ with $\\lambda = l(l+1)$."""
    inner = L.squared*r.z - r.z*L.squared
    double = L.squared*inner - inner*L.squared
    d.step("general", double, 2*(L.squared*r.z + r.z*L.squared) - 4*L.z*L_dot(r),
           "both sides in canonical form", also_at=MULTIPLETS)
    d.result("double_commutator", canonical(double))
    l, lp = symbols("l lp", nonnegative=True, integer=True)
    lam, lamp = l*(l + 1), lp*(lp + 1)
    condition = (lamp - lam)**2 - 2*(lamp + lam)
    d.step("factored", condition, ((lp + l + 1)**2 - 1)*((lp - l)**2 - 1),
           "difference of squares twice")
    d.then("roots", (lp + l)*(lp + l + 2)*(lp - l - 1)*(lp - l + 1),
           "$a^2 - 1 = (a - 1)(a + 1)$: a nonzero element needs $l' = l \\pm 1$ (or $l + l' = 0$)")
    d.result("selection_polynomial", factor(condition))
