"""Spin-1 operator identities for the (fictitious) triplet radical "Quillon-5".

Quillon-5 is an invented molecule used only as a scenario: its ground state is an
electron-spin triplet, spin label ``S`` (j = 1), with a zero-field splitting
Hamiltonian ``H = D (Sz^2 - S^2/3) + E (Sx^2 - Sy^2)``.  hbar = 1, Condon-Shortley
phases (see ``DEVELOPERS.md``).

Run ``amalgebra check worked_examples`` (or ``pytest worked_examples``) to re-check
every step; the named results are stored in ``deriv_spin_one_rotor.results.toml``.
"""

from sympy import I, Rational, Symbol, symbols

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.derivations import derivation
from amalgebra.matrices.explicit import to_matrix

S = AngularMomentum("S")


@derivation(title="Commutators and ladder products of the Quillon-5 spin")
def commutation_relations(d):
    """Identities valid for every spin, proved in the canonical (m-shift) form of the
    operator algebra; the ladder product is the standard
    $J_+J_- = J^2 - J_z^2 + J_z$ (common practice; from memory)."""
    d.step("xy", S.x*S.y - S.y*S.x, I*S.z, "angular-momentum commutation relation",
           also_at=[{"S": Rational(1, 2)}, {"S": 1}, {"S": Rational(3, 2)}])
    d.step("ladder", S.plus*S.minus, S.squared - S.z**2 + S.z,
           "$S_\\pm = S_x \\pm i S_y$ multiplied out")
    d.then("reordered", S.minus*S.plus + 2*S.z, "$[S_+, S_-] = 2 S_z$")
    d.result("ladder_product", canonical(S.plus*S.minus))


@derivation(title="Spin-1 relations and the zero-field splitting of Quillon-5")
def triplet_zero_field(d):
    """On the j = 1 representation only: $S_z^3 = S_z$, $S_+^3 = 0$, and the
    zero-field splitting levels D/3 + E, D/3 - E, -2D/3 (the usual triplet result,
    e.g. Abragam and Bleaney 1970; from memory).  Checked on exact 3x3 matrices."""
    D, E = symbols("D E")
    lam = Symbol("lambda")
    spin1 = {"S": 1}
    d.step("cube", S.z**3, S.z, "eigenvalues of $S_z$ are $-1, 0, 1$", j=spin1)
    d.step("ladder_cube", S.plus**3, 0, "three raisings leave the multiplet", j=spin1)
    d.step("casimir", S.squared, 2, "$j(j+1) = 2$", j=spin1)
    H = D*(S.z**2 - Rational(2, 3)) + E*(S.x**2 - S.y**2)
    d.step("levels", (H - D/3 - E)*(H - D/3 + E)*(H + 2*D/3), 0,
           "Cayley-Hamilton with the three levels", j=spin1)
    polynomial = to_matrix(H, j=spin1, kind="exact").charpoly(lam).as_expr()
    d.step("charpoly", polynomial, (lam - D/3 - E)*(lam - D/3 + E)*(lam + 2*D/3),
           "characteristic polynomial of the exact matrix")
    d.result("characteristic_polynomial", polynomial)
    d.result("hamiltonian_canonical", canonical(H))
