"""Coupling schemes of the (fictitious) ion "Telvium III": LS against jj, and a hyperfine manifold.

Telvium III is an invented ion used only as a scenario.  Its excited configuration holds
one p and one d electron (l1 = 1, l2 = 2, s1 = s2 = 1/2), and its only stable isotope,
also invented, has nuclear spin I = 5/2.  The derivations below use coupling trees
(:mod:`amalgebra.coupling.trees`) and let the library find every recoupling formula:

* the LS to jj transformation of the p d configuration is one 9j symbol per entry
  (Edmonds 1957, eq. 6.4.2; from memory) and an orthogonal matrix in every J block;
* reduced matrix elements of L.S, I.J and the quadrupole coupling in the hyperfine scheme
  ((l s) j, I) F reduce node by node to 6j symbols (Edmonds 1957, eqs. 7.1.6-7.1.8), and
  agree with the textbook eigenvalues of L.S and I.J;
* a hyperfine ket recouples exactly into the scheme (l, (s I) G) F with the nuclear spin
  coupled to the electron spin first, and back.

All conventions are the library's: Condon-Shortley phases, Edmonds normalisation.
"""

from sympy import Integer, MatMul, Rational, eye, sqrt, symbols

from amalgebra.algebra import AngularMomentum
from amalgebra.coupling import Coupling9j
from amalgebra.coupling.recoupling import recoupling_matrix
from amalgebra.coupling.trees import coupling_tree
from amalgebra.derivations import derivation, written
from amalgebra.states.kets import inner
from amalgebra.states.tree_kets import recouple, tree_ket
from amalgebra.tensors.tree_elements import CoupledTensorOperator, scalar_coupled, tree_operator_blocks

HALF = Rational(1, 2)
PD = {"l1": 1, "l2": 2, "s1": HALF, "s2": HALF}
NUCLEAR_SPIN = 5 * HALF


@derivation(title="LS and jj coupling of the Telvium III p d configuration")
def ls_to_jj(d):
    """The transformation $\\langle ((l_1 l_2) L, (s_1 s_2) S) J | ((l_1 s_1) j_1, (l_2 s_2) j_2) J\\rangle
    = \\sqrt{(2L+1)(2S+1)(2j_1+1)(2j_2+1)}\\,\\{l_1\\,l_2\\,L; s_1\\,s_2\\,S; j_1\\,j_2\\,J\\}$
    (Edmonds 1957, eq. 6.4.2; from memory), found by the library as one 9j move between the
    two trees, is orthogonal in every $J$ block."""
    ls = coupling_tree("((l1 l2) L, (s1 s2) S) J", PD)
    jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", PD)
    matrix = recoupling_matrix(ls, jj)
    for J, (rows, cols, block) in matrix.blocks.items():
        d.step(f"orthogonal_J{int(J)}",
               written(rf"B^{{({J})}} B^{{({J})\mathsf{{T}}}}", MatMul(block, block.T, evaluate=False)),
               eye(block.shape[0]),
               f"$B^{{({J})}}$, the $J = {J}$ block of the LS-to-jj matrix, is orthogonal")
    rows, cols, block = matrix.blocks[2]
    for i, r in enumerate(rows):
        for k, c in enumerate(cols):
            by_hand = (sqrt((2 * r["L"] + 1) * (2 * r["S"] + 1) * (2 * c["j1"] + 1) * (2 * c["j2"] + 1))
                       * Coupling9j(1, 2, r["L"], HALF, HALF, r["S"], c["j1"], c["j2"], 2))
            entry = written(rf"B^{{(2)}}_{{{r['L']}{r['S']},\,{c['j1']}\,{c['j2']}}}", block[i, k])
            d.step(f"ninej_L{r['L']}_S{r['S']}_j{int(2 * c['j1'])}_{int(2 * c['j2'])}", entry, by_hand,
                   f"the entry $(L S, j_1 j_2) = ({r['L']}\\,{r['S']}, {c['j1']}\\,{c['j2']})$ of the "
                   "$J = 2$ block against the 9j formula")
    index = {(r["L"], r["S"]): i for i, r in enumerate(rows)}
    cindex = {(c["j1"], c["j2"]): k for k, c in enumerate(cols)}
    d.result("triplet_D2_in_j3half_j5half", block[index[(2, 1)], cindex[(3 * HALF, 5 * HALF)]])
    d.result("singlet_D2_in_j1half_j3half", block[index[(2, 0)], cindex[(HALF, 3 * HALF)]])


@derivation(title="Fine and hyperfine structure of a Telvium III d level in the ((l s) j, I) F scheme")
def hyperfine_manifold(d):
    """With $\\zeta\\,\\mathbf{L}\\cdot\\mathbf{S} + A\\,\\mathbf{I}\\cdot\\mathbf{J}$ in the basis
    $|((l\\,s)\\,j, I)\\,F\\,M\\rangle$ ($l = 2$, $s = 1/2$, $I = 5/2$), both scalar products reduce
    node by node to 6j symbols; the diagonal equals the textbook
    $\\zeta[j(j+1) - l(l+1) - s(s+1)]/2 + A[F(F+1) - I(I+1) - j(j+1)]/2$ and the matrix is diagonal
    in $j$ (common practice, no source).  The quadrupole coupling
    $B\\,[\\mathbf{I}\\times\\mathbf{I}]^{(2)}\\cdot[\\mathbf{J}\\times\\mathbf{J}]^{(2)}$ is diagonal in
    $j$ as well."""
    zeta, A, B = symbols("zeta A B")
    L, Sp, I, J = (AngularMomentum(x) for x in ("l", "s", "I", "j"))
    tree = coupling_tree("((l s) j, I) F", l=2, s=HALF, I=NUCLEAR_SPIN)
    operator = ([(zeta * c, op) for c, op in scalar_coupled(L, Sp)]
                + [(A * c, op) for c, op in scalar_coupled(I, J)])
    blocks = tree_operator_blocks(tree, operator)
    for F, (states, block) in blocks.items():
        for i, st in enumerate(states):
            j = st["j"]
            textbook = (zeta * (j * (j + 1) - 6 - Rational(3, 4)) / 2
                        + A * (F * (F + 1) - NUCLEAR_SPIN * (NUCLEAR_SPIN + 1) - j * (j + 1)) / 2)
            d.step(f"diagonal_F{int(F)}_j{int(2 * j)}",
                   written(rf"H^{{(F={F})}}_{{{j},\,{j}}}", block[i, i]), textbook,
                   f"$H^{{(F)}}_{{j'j}} = \\langle ((l s) j', I) F M|H|((l s) j, I) F M\\rangle$ "
                   f"at $F = {F}$, $j = {j}$: the textbook diagonal")
        off = [block[i, k] for i in range(len(states)) for k in range(len(states)) if i != k]
        d.step(f"diagonal_in_j_F{int(F)}",
               written(rf"\sum_{{j' \neq j}} \bigl(H^{{(F={F})}}_{{j'j}}\bigr)^2", sum(x**2 for x in off)),
               0, f"no $j$ mixing at $F = {F}$")
    quadrupole = scalar_coupled(CoupledTensorOperator(I, I, 2), CoupledTensorOperator(J, J, 2))
    qblocks = tree_operator_blocks(tree, [(B * c, op) for c, op in quadrupole])
    F, (states, block) = 3, qblocks[3]
    d.step("quadrupole_no_j_mixing",
           written(r"\sum_{j' \neq j} \bigl(H^{(F=3)}_{Q,\,j'j}\bigr)^2", block[0, 1] ** 2 + block[1, 0] ** 2),
           0, "the F = 3 block of the quadrupole coupling $H_Q$ is diagonal in $j$")
    d.result("quadrupole_F3_j5half", block[[s["j"] for s in states].index(5 * HALF),
                                           [s["j"] for s in states].index(5 * HALF)])


@derivation(title="Recoupling a Telvium III hyperfine ket into the scheme (l, (s I) G) F")
def nuclear_spin_first(d):
    """The ket $|((2\\,\\tfrac12)\\,\\tfrac52, \\tfrac52)\\,3, 1\\rangle$ rewritten in the scheme where the
    nuclear spin couples to the electron spin first: the library finds the path (one associativity
    move after exchanges), the image has unit norm, and recoupling back gives the ket again."""
    hyperfine = coupling_tree("((l s) j, I) F", l=2, s=HALF, j=5 * HALF, I=NUCLEAR_SPIN, F=3)
    spin_first = coupling_tree("(l, (s I) G) F", l=2, s=HALF, I=NUCLEAR_SPIN)
    ket = tree_ket(hyperfine, 1)
    image = recouple(ket, spin_first)
    d.step("unit_norm", written(r"\langle \psi | \psi' \rangle", inner(ket.dual(), image)), 1,
           "$\\psi'$, the ket $\\psi$ recoupled into $(l, (s I) G) F$, is the same state")
    d.step("round_trip", written(r"R_{(l, (s I) G) F \to ((l s) j, I) F}\, \psi' - \psi",
                                 recouple(image, hyperfine) - ket), 0,
           "recoupling $\\psi'$ back gives the ket $\\psi$")
    terms = image.as_ordered_terms()
    d.result("terms_in_spin_first_scheme", Integer(len(terms)))
