"""Hamiltonian matrices, blocks and eigenvalues (amalgebra.states.hamiltonian).

Sources: equation and section numbers of textbooks cited beside the checks (Sakurai 1994 =
J. J. Sakurai, Modern Quantum Mechanics, rev. ed.; Edmonds 1957; Foot 2005; Pauncz 1979) are
quoted from memory, not checked against the books; the formulas themselves are standard.
"""

import numpy as np
import pytest
from sympy import N, Rational, cancel, expand, im, simplify, sqrt, symbols

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.errors import StateError
from amalgebra.states.action import matrix_element
from amalgebra.states.coupled import coupled_basis, to_uncoupled
from amalgebra.states.hamiltonian import hamiltonian_matrix, operator_matrix
from amalgebra.states.kets import ket, product_ket

A, gJ, gI, muB, B = symbols("A g_J g_I mu_B B", real=True)
Iop, Jop = AngularMomentum("I"), AngularMomentum("J")
Lop, Sop = AngularMomentum("L"), AngularMomentum("S")
h = Rational(1, 2)

BREIT_RABI_H = A * dot(Iop, Jop) + (gJ * muB * Jop.z + gI * muB * Iop.z) * B


def breit_rabi(I, M, sign):
    """Breit and Rabi, Phys. Rev. 38, 2082 (1931), for J = 1/2 and H = A I.J + (gJ Jz + gI Iz) muB B:
    E = -dE/(2(2I+1)) + gI muB B M + sign (dE/2) sqrt(1 + 4 M x/(2I+1) + x^2),
    dE = A (I + 1/2), x = (gJ - gI) muB B / dE."""
    dE = A * (I + h)
    x = (gJ - gI) * muB * B / dE
    return -dE / (2 * (2 * I + 1)) + gI * muB * B * M + sign * dE / 2 * sqrt(1 + 4 * M * x / (2 * I + 1) + x ** 2)


@pytest.mark.parametrize("I", [h, 1, Rational(3, 2), Rational(5, 2), 4])
def test_breit_rabi(I):
    hm = hamiltonian_matrix(BREIT_RABI_H, {"I": I, "J": h})
    assert hm.conserved == ("M",)
    assert [b.quantum_numbers["M"] for b in hm.blocks] == [I + h - k for k in range(int(2 * I) + 2)]
    point = {A: Rational(3, 2), gJ: Rational(2), gI: Rational(-1, 1000), muB: 1, B: Rational(1, 5)}
    for blk in hm.blocks:
        M = blk.quantum_numbers["M"]
        values = blk.eigenvalues()
        assert values is not None
        if abs(M) == I + h:
            assert blk.size == 1
            (value,) = values
            # stretched states: the + branch of the formula (x < 1 at this point)
            assert simplify((value - breit_rabi(I, M, +1)).subs(point)) == 0
            continue
        assert blk.size == 2
        plus, minus = breit_rabi(I, M, +1), breit_rabi(I, M, -1)
        # Vieta: trace and determinant of the block against the formula, exactly
        assert expand(blk.matrix.trace() - (plus + minus)) == 0
        assert cancel(blk.matrix.det() - expand(plus * minus)) == 0
        got = sorted(complex(N(v.subs(point), 30)).real for v in values)
        want = sorted(float(N(e.subs(point), 30)) for e in (plus, minus))
        assert np.allclose(got, want, rtol=1e-12, atol=1e-12)


@pytest.mark.parametrize("I, J", [(Rational(3, 2), h), (Rational(5, 2), Rational(3, 2)), (1, 1), (Rational(7, 2), 2)])
def test_lande_interval_rule(I, J):
    # E(F) = A/2 [F(F+1) - I(I+1) - J(J+1)], hence E(F) - E(F-1) = A F
    # (Lande interval rule; e.g. C. J. Foot, Atomic Physics (OUP 2005), sec. 6.1; from memory)
    hm = hamiltonian_matrix(A * dot(Iop, Jop), {"I": I, "J": J}, basis="coupled")
    assert hm.conserved == ("M", "F")
    energies = {}
    for blk in hm.blocks:
        F = blk.quantum_numbers["F"]
        assert blk.size == 1
        energies.setdefault(F, set()).add(blk.matrix[0, 0])
    assert all(len(v) == 1 for v in energies.values())            # independent of M
    energies = {F: v.pop() for F, v in energies.items()}
    Fs = sorted(energies)
    assert Fs == [abs(I - J) + k for k in range(int(I + J - abs(I - J)) + 1)]
    for F in Fs[1:]:
        assert expand(energies[F] - energies[F - 1] - A * F) == 0
    for F in Fs:
        assert expand(energies[F] - A / 2 * (F * (F + 1) - I * (I + 1) - J * (J + 1))) == 0


@pytest.mark.parametrize("Lv, Sv", [(1, h), (2, h), (1, 1), (3, Rational(3, 2)), (0, 1)])
def test_lande_g_factor(Lv, Sv):
    # g_J = 1 + [J(J+1) + S(S+1) - L(L+1)] / (2 J(J+1)) with g_s = 2
    # (Lande formula; Sakurai 1994, problem 3.? / Foot (2005) eq. 5.? -- textbook formula, from memory)
    op = Lop.z + 2 * Sop.z
    for k in coupled_basis([Lv, Sv], ("L", "S")):
        J, M = k.J, k.M
        value = matrix_element(k.dual(), op, k)
        if J == 0:
            assert value == 0
            continue
        gj = 1 + (J * (J + 1) + Sv * (Sv + 1) - Lv * (Lv + 1)) / (2 * J * (J + 1))
        assert value == gj * M


def _float_eigs(mat, point):
    return np.linalg.eigvalsh(np.array(mat.subs(point).evalf(30).tolist(), dtype=complex))


@pytest.mark.parametrize("I, J, basis", [(Rational(3, 2), h, "uncoupled"), (1, 1, "uncoupled"),
                                         (1, 1, "coupled"), (Rational(3, 2), 1, "coupled")])
def test_block_eigenvalues_against_numpy(I, J, basis):
    # independent: numpy.linalg.eigvalsh on the float matrix
    point = {A: Rational(7, 10), gJ: Rational(4, 3), gI: Rational(1, 7), muB: 1, B: Rational(3, 11)}
    op = BREIT_RABI_H.subs(point)
    hm = hamiltonian_matrix(op, {"I": I, "J": J}, basis=basis)
    exact = []
    for blk, values in hm.eigenvalues():
        assert values is not None
        for v, mult in values.items():
            z = complex(N(v, 40))
            assert abs(z.imag) < 1e-20 or abs(im(N(v, 40))) < 1e-20
            exact.extend([z.real] * mult)
    assert np.allclose(sorted(exact), _float_eigs(hm.matrix, {}), atol=1e-10)


def test_coupled_and_uncoupled_are_similar():
    # the spectrum does not depend on the basis (common practice, no source)
    point = {A: 1, gJ: 2, gI: 0, muB: 1, B: Rational(1, 3)}
    op = BREIT_RABI_H.subs(point)
    h1 = hamiltonian_matrix(op, {"I": 1, "J": h})
    h2 = hamiltonian_matrix(op, {"I": 1, "J": h}, basis="coupled")
    assert np.allclose(_float_eigs(h1.matrix, {}), _float_eigs(h2.matrix, {}))
    assert h2.conserved == ("M",)               # Zeeman term breaks F
    assert h1.matrix.trace() == h2.matrix.trace()


def test_user_basis_and_errors():
    cpl = coupled_basis([1, h], ("I", "J"))
    user = [to_uncoupled(k) for k in cpl]
    h1 = hamiltonian_matrix(A * dot(Iop, Jop), {"I": 1, "J": h}, basis=user)
    h2 = hamiltonian_matrix(A * dot(Iop, Jop), {"I": 1, "J": h}, basis="coupled")
    assert h1.matrix == h2.matrix
    assert h1.conserved == ("M",)                # F is only read from CoupledKet objects
    bad = [ket(1, 1, "I") * 0 + product_ket(ket(1, 1, "I"), ket(h, h, "J"))] * 2
    with pytest.raises(StateError, match="orthonormal"):
        hamiltonian_matrix(A * dot(Iop, Jop), {"I": 1, "J": h}, basis=bad)
    with pytest.raises(StateError, match="labels"):
        hamiltonian_matrix(A * dot(Iop, Jop), {"I": 1, "J": h}, basis=[ket(1, 1, "I")])
    with pytest.raises(StateError):
        hamiltonian_matrix(A * Iop.z, {"I": 1}, basis="nonsense")
    with pytest.raises(StateError):
        hamiltonian_matrix(A * Iop.z, {"I": 1}, basis="coupled")


def test_blocks_when_m_not_conserved():
    hm = hamiltonian_matrix(B * Jop.x + A * Iop.z, {"I": 1, "J": h})
    assert hm.conserved == ()
    assert [b.size for b in hm.blocks] == [2, 2, 2]   # I_z is conserved, J_x mixes m_J only
    assert all("M" not in b.quantum_numbers for b in hm.blocks)


def test_operator_matrix_not_closed():
    with pytest.raises(StateError, match="closed"):
        operator_matrix(Jop.plus, [ket(1, 0, "J")])


def test_eigenvalue_policy_and_js_forms():
    # issue 11: never None; with no time budget a 3 x 3 block is stopped, explicitly, before its
    # characteristic polynomial; blocks of size <= 2 need no budget and are solved
    hm = hamiltonian_matrix(BREIT_RABI_H, [("I", 1), ("J", Rational(3, 2))])
    sizes = {blk.size: values for blk, values in hm.eigenvalues(time_budget=0)}
    assert sizes[3] is not None and not sizes[3].complete and sizes[3].unsolved == []
    assert sizes[3].degree == 3 and "budget" in sizes[3].reason
    assert sizes[3].interrupted == "characteristic polynomial" and sizes[3].charpoly is None
    assert sizes[2].complete and sum(sizes[2].values()) == 2 and sizes[2].interrupted is None
    # with one symbol the characteristic polynomial is factored: A I.J has E(F) (interval rule above)
    hm = hamiltonian_matrix(A * dot(Iop, Jop), {"J": Rational(3, 2), "I": 1})
    for blk, values in hm.eigenvalues():
        assert values is not None and sum(values.values()) == blk.size
        for value in values:
            # E(F) = A/2 [F(F+1) - I(I+1) - J(J+1)] for F = 1/2, 3/2, 5/2 (Lande interval rule, from memory)
            assert value in {A / 2 * (F * (F + 1) - 2 - Rational(15, 4)) for F in (h, 3 * h, 5 * h)}
    # the one basis order (README): labels sorted, the first (I) outermost, whatever the order of js
    assert str(hm.basis[0]) == "|1, 1>_I|3/2, 3/2>_J" and str(hm.basis[1]) == "|1, 1>_I|3/2, 1/2>_J"


# --- parity blocks (issue 11, item 2) -------------------------------------------------------------

PARITY_JS = {"L": [0, 1, 2], "S": h}


def _l(state):
    """l of a basis state, read from the state itself (CoupledKet.js or the L factor)."""
    if hasattr(state, "js"):
        return dict(zip(state.labels, state.js))["L"]
    return next(k.j for k in state.args if k.label == "L")


def _orbital_sign(state):
    return (-1) ** int(_l(state))


def _float_spectrum(hm, point):
    # independent: numpy.linalg.eigvalsh
    return np.linalg.eigvalsh(np.array(hm.matrix.subs(point).evalf(), dtype=float))


def test_coupled_basis_of_a_direct_sum():
    hm = hamiltonian_matrix(A * dot(Lop, Sop), PARITY_JS, basis="coupled")
    assert hm.matrix.shape == (18, 18) and len(hm.basis) == 18
    # spin-orbit: E = A/2 [J(J+1) - l(l+1) - 3/4] (Lande interval rule, from memory), diagonal here
    for i, state in enumerate(hm.basis):
        l = _l(state)
        assert hm.matrix[i, i] == A / 2 * (state.J * (state.J + 1) - l * (l + 1) - Rational(3, 4))
    assert hm.conserved == ("M", "F", "j_L")
    # first choice of j outermost: the L = 0 states come first
    assert [dict(zip(s.labels, s.js))["L"] for s in hm.basis][:2] == [0, 0]


@pytest.mark.parametrize("basis", ["uncoupled", "coupled"])
def test_parity_blocks_for_a_parity_conserving_tensor(basis):
    from amalgebra.tensors import racah_tensor

    C2 = racah_tensor(2)            # even rank: joins l = 0 and l = 2, never l of other parity
    hm = hamiltonian_matrix(A * dot(Lop, Sop) + B * C2[0], PARITY_JS, basis=basis)
    assert hm.conserved == ("M", "parity")            # j_L broken (0 <-> 2), parity kept
    assert any({_l(hm.basis[i]) for i in blk.indices} == {0, 2} for blk in hm.blocks)   # l = 0 and 2 mixed
    for blk in hm.blocks:
        signs = {_orbital_sign(hm.basis[i]) for i in blk.indices}
        assert signs == {blk.quantum_numbers["parity"]}
    # no matrix element between states of different (-1)^l (read from the states, not from the blocks)
    n = hm.matrix.shape[0]
    assert all(hm.matrix[r, k] == 0 for r in range(n) for k in range(n)
               if _orbital_sign(hm.basis[r]) != _orbital_sign(hm.basis[k]))
    assert any(hm.matrix[r, k] != 0 for r in range(n) for k in range(n)
               if r != k and _orbital_sign(hm.basis[r]) == _orbital_sign(hm.basis[k]))
    point = {A: Rational(2, 3), B: Rational(-5, 7)}
    unc = hamiltonian_matrix(A * dot(Lop, Sop) + B * C2[0], PARITY_JS)
    assert np.allclose(_float_spectrum(hm, point), _float_spectrum(unc, point))


@pytest.mark.parametrize("basis", ["uncoupled", "coupled"])
def test_a_parity_odd_tensor_merges_the_parity_blocks(basis):
    from amalgebra.tensors import racah_tensor

    C1 = racah_tensor(1)            # odd rank: joins l = 0 <-> 1 and 1 <-> 2
    hm = hamiltonian_matrix(A * dot(Lop, Sop) + B * C1[0], PARITY_JS, basis=basis)
    assert "parity" not in hm.conserved and "j_L" not in hm.conserved
    assert all("parity" not in blk.quantum_numbers for blk in hm.blocks)
    assert any(len({_orbital_sign(hm.basis[i]) for i in blk.indices}) == 2 for blk in hm.blocks)


def test_parity_is_not_offered_for_spins_or_single_j():
    from amalgebra.tensors import racah_tensor

    C2 = racah_tensor(2)
    # one j for L: (-1)^l is the same for every state, so it cannot split anything
    hm = hamiltonian_matrix(A * dot(Lop, Sop) + B * C2[0], {"L": 2, "S": h}, basis="coupled")
    assert "parity" not in hm.conserved
    # half-integer direct sum on S: a spin, no orbital parity
    hs = hamiltonian_matrix(A * Sop.z, {"S": [h, Rational(3, 2)]})
    assert hs.conserved == ("M", "j_S")


def test_operator_matrix_and_hamiltonian_matrix_share_the_blocks_api():
    # one API (issue 11): blocks is a list of Block and conserved a tuple on both result types
    from amalgebra.matrices.explicit import to_matrix

    Lop, Sop = AngularMomentum("L"), AngularMomentum("S")
    op = dot(Lop, Sop) + 3 * Lop.z
    js = {"L": 1, "S": Rational(1, 2)}
    om = to_matrix(op, js, with_basis=True)
    hm = hamiltonian_matrix(op, js)
    assert isinstance(om.blocks, list) and isinstance(om.conserved, tuple)
    assert om.conserved == hm.conserved == ("M",)
    assert [(b.indices, b.quantum_numbers, b.matrix) for b in om.blocks] == \
        [(b.indices, b.quantum_numbers, b.matrix) for b in hm.blocks]
    # M = m_L + m_S = 3/2, 1/2, -1/2, -3/2: block sizes 1, 2, 2, 1 (common practice, no source)
    assert [b.size for b in om.blocks] == [1, 2, 2, 1]
