"""Tensor operators on part of a system in coupling trees, against explicit product-space matrices.

Source of the expected values: numpy.  Coupled states of any tree come from
``tests/coupling/tree_oracle.py`` (the numpy Clebsch-Gordan oracle of ``spin_oracle.py``:
diagonalisation of J^2, Condon-Shortley phase); the oracle below builds tensor components on each leaf
from the Wigner-Eckart theorem with the numpy 3j values and chosen reduced
elements, angular momenta of coupled parts as sums of the leaves' spin matrices,
and coupled products from the Clebsch-Gordan series of components.  The library
computes the same elements by 6j/9j reduction node by node.
"""

import importlib.util
import math
import pathlib
import random

import pytest
from sympy import Rational, S, Symbol, symbols

from amalgebra.algebra import AngularMomentum
from amalgebra.coupling.trees import coupling_tree
from amalgebra.coupling.recoupling import tree_assignments
from amalgebra.errors import TensorOperatorError
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
from amalgebra.tensors.spherical import SphericalTensor
from amalgebra.tensors.tree_elements import (CoupledTensorOperator, scalar_coupled, tree_matrix_element,
                                             tree_operator_blocks, tree_reduced_element)

_path = pathlib.Path(__file__).resolve().parents[1] / "coupling" / "tree_oracle.py"
_spec = importlib.util.spec_from_file_location("tensor_tree_oracle", _path)
tree_oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(tree_oracle)
spin = tree_oracle.spin_oracle
tree_state = tree_oracle.state

TOL = 1e-10


# -- the oracle: states are {((label, tj, tm), ...): amplitude} ---------------------------------

def _ms(t):
    return range(t, -t - 1, -2)


def leaf_tensor(label, tk, tq, reduced):
    """The component T^k_q on leaf ``label``; reduced(tjp, tj) in Edmonds normalisation."""
    def act(state):
        out = {}
        for key, amp in state.items():
            for pos, (lab, tj, tm) in enumerate(key):
                if lab != label:
                    continue
                for tjp in range(abs(tj - tk), tj + tk + 1, 2):
                    red = reduced(tjp, tj)
                    if red == 0:
                        continue
                    tmp = tm + tq
                    if abs(tmp) > tjp:
                        continue
                    # <j' m'|T_q|j m> = (-1)^(j'-m') (j' k j; -m' q m) <j'||T||j>  (Edmonds 5.4.1)
                    sign = -1.0 if ((tjp - tmp) // 2) % 2 else 1.0
                    value = sign * spin.oracle_threej(tjp, tk, tj, -tmp, tq, tm) * red
                    if value:
                        new = tuple(sorted(key[:pos] + ((lab, tjp, tmp),) + key[pos + 1:]))
                        out[new] = out.get(new, 0.0) + value * amp
        return out
    return act


def momentum_component(labels, tq):
    """The spherical component J_q (q = +1, 0, -1) of the sum of the leaves' angular momenta."""
    def act(state):
        out = {}
        for key, amp in state.items():
            for pos, (lab, tj, tm) in enumerate(key):
                if lab not in labels:
                    continue
                j, m = tj / 2, tm / 2
                if tq == 0:
                    value, tmp = m, tm
                elif tq == 2:   # J_{+1} = -J_+/sqrt(2)
                    value, tmp = -math.sqrt(max((j - m) * (j + m + 1), 0.0)) / math.sqrt(2), tm + 2
                else:           # J_{-1} = J_-/sqrt(2)
                    value, tmp = math.sqrt(max((j + m) * (j - m + 1), 0.0)) / math.sqrt(2), tm - 2
                if value and abs(tmp) <= tj:
                    new = tuple(sorted(key[:pos] + ((lab, tj, tmp),) + key[pos + 1:]))
                    out[new] = out.get(new, 0.0) + value * amp
        return out
    return act


def coupled(a, ka, b, kb, tK, tQ):
    """[A x B]^K_Q = sum <ka qa kb qb|K Q> A_qa B_qb, with a(tq), b(tq) returning actions."""
    def act(state):
        out = {}
        for tqa in _ms(ka):
            tqb = tQ - tqa
            if abs(tqb) > kb:
                continue
            c = spin.oracle_cg(ka, tqa, kb, tqb, tK, tQ)
            if c == 0.0:
                continue
            for key, amp in a(tqa)(b(tqb)(state)).items():
                out[key] = out.get(key, 0.0) + c * amp
        return out
    return act


def inner(u, v):
    return sum(a * v.get(k, 0.0) for k, a in u.items())


def _doubled(tree_values):
    return {k: int(2 * v) for k, v in tree_values.items()}


def _element(bra, mp, action, ket, m):
    return inner(tree_state(bra.structure, _doubled(bra.values), int(2 * mp)),
                 action(tree_state(ket.structure, _doubled(ket.values), int(2 * m))))


def _states(tree):
    return [tree.with_values(d) for d in tree_assignments(tree)]


def _numbers(expr, table):
    """Replace reduced-element symbols by the numbers of ``table`` {(name, jp, j): value}."""
    subs = {r: table[(r.args[0].name, r.args[2], r.args[3])] for r in expr.atoms(ReducedMatrixElement)}
    return float(expr.xreplace(subs))


# -- tests --------------------------------------------------------------------------------------

def test_hyperfine_and_fine_structure_scalars_in_a_three_level_tree():
    tree = coupling_tree("((l s) j, I) F", l=1, s="1/2", I="3/2")
    I, j, L, Sp = (AngularMomentum(x) for x in ("I", "j", "l", "s"))
    cases = [
        (scalar_coupled(I, j), lambda tq: momentum_component({"I"}, tq), lambda tq: momentum_component({"l", "s"}, tq)),
        (scalar_coupled(L, Sp), lambda tq: momentum_component({"l"}, tq), lambda tq: momentum_component({"s"}, tq)),
    ]
    states = _states(tree)
    nonzero = 0
    for ours, a, b in cases:
        # A.B = sum_q (-1)^q A_q B_-q, written out (common practice, no source)
        def action(state, a=a, b=b):
            out = {}
            for tq in (2, 0, -2):
                sign = -1.0 if (tq // 2) % 2 else 1.0
                for k, v in a(tq)(b(-tq)(state)).items():
                    out[k] = out.get(k, 0.0) + sign * v
            return out
        for bra in states:
            for ket in states:
                for M in (S.Zero, S.One):
                    if abs(M) > bra.total or abs(M) > ket.total:
                        continue
                    expected = _element(bra, M, action, ket, M)
                    got = tree_matrix_element(bra, M, ours, 0, ket, M)
                    assert abs(float(got) - expected) < TOL, (bra, ket)
                    nonzero += abs(expected) > 1e-8
    assert nonzero >= 20


def test_quadrupole_coupling_of_two_momenta():
    # [I x I]^2 . [j x j]^2 against component products of explicit spin matrices (numpy)
    tree = coupling_tree("((l s) j, I) F", l=1, s="1/2", I="3/2")
    I, j = AngularMomentum("I"), AngularMomentum("j")
    ours = scalar_coupled(CoupledTensorOperator(I, I, 2), CoupledTensorOperator(j, j, 2))
    qI = lambda tq: coupled(lambda a: momentum_component({"I"}, a), 2, lambda b: momentum_component({"I"}, b), 2, 4, tq)
    qj = lambda tq: coupled(lambda a: momentum_component({"l", "s"}, a), 2,
                            lambda b: momentum_component({"l", "s"}, b), 2, 4, tq)

    def action(state):
        out = {}
        for tq in (4, 2, 0, -2, -4):
            sign = -1.0 if (tq // 2) % 2 else 1.0
            for k, v in qI(tq)(qj(-tq)(state)).items():
                out[k] = out.get(k, 0.0) + sign * v
        return out

    nonzero = 0
    for bra in _states(tree):
        for ket in _states(tree):
            if bra.total != ket.total:
                continue
            expected = _element(bra, S.Zero, action, ket, S.Zero)
            got = tree_matrix_element(bra, S.Zero, ours, 0, ket, S.Zero)
            assert abs(float(got) - expected) < TOL, (bra, ket)
            nonzero += abs(expected) > 1e-8
    assert nonzero >= 4   # one j = 3/2 state per F = 0..3


def test_dipole_on_one_electron_in_jj_coupling_between_configurations():
    # <(l1' s1) j1', (l2 s2) j2; J' M'| d_q(l1) |(l1 s1) j1, (l2 s2) j2; J M>, reduced elements chosen
    rng = random.Random(5)
    table = {("d", Rational(a), Rational(b)): rng.uniform(-1, 1) for a in range(3) for b in range(3)}
    d = SphericalTensor("d", 1, "l1")
    base = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", s1="1/2", l2=1, s2="1/2")
    kets = [t for l1 in (0, 1) for t in _states(base.with_values(l1=l1))]
    bras = [t for l1 in (1, 2) for t in _states(base.with_values(l1=l1))]
    nonzero = 0
    for tq in (2, 0, -2):
        action = leaf_tensor("l1", 2, tq, lambda tjp, tj: table[("d", Rational(tjp, 2), Rational(tj, 2))])
        for bra in bras[::2]:
            for ket in kets:
                for M in (S.Zero, S.One):
                    Mp = M + Rational(tq, 2)
                    if abs(M) > ket.total or abs(Mp) > bra.total:
                        continue
                    got = tree_matrix_element(bra, Mp, d, Rational(tq, 2), ket, M)
                    expected = _element(bra, Mp, action, ket, M)
                    assert abs(_numbers(got, table) - expected) < TOL
                    nonzero += abs(expected) > 1e-8
    assert nonzero >= 30


@pytest.mark.parametrize("K", [0, 1, 2])
def test_coupled_product_across_a_pair_of_pairs(K):
    # [T^1(a) x U^1(c)]^K in ((a b) x, (c d) y) J: a 9j at the root, 6j below
    rng = random.Random(K)
    table = {(n, Rational(p, 2), Rational(q, 2)): rng.uniform(-1, 1)
             for n in "TU" for p in range(0, 5) for q in range(0, 5)}
    T, U = SphericalTensor("T", 1, "a"), SphericalTensor("U", 1, "c")
    ours = CoupledTensorOperator(T, U, K)
    tree = coupling_tree("((a b) x, (c d) y) J", a=1, b="1/2", c=1, d="1/2")
    states = _states(tree)
    red = lambda name: (lambda tjp, tj: table[(name, Rational(tjp, 2), Rational(tj, 2))])
    nonzero = 0
    for tQ in range(-2 * K, 2 * K + 1, 2):
        action = coupled(lambda tq: leaf_tensor("a", 2, tq, red("T")), 2,
                         lambda tq: leaf_tensor("c", 2, tq, red("U")), 2, 2 * K, tQ)
        for bra in states[::3]:
            for ket in states:
                M = S.Zero
                Mp = M + Rational(tQ, 2)
                if abs(M) > ket.total or abs(Mp) > bra.total:
                    continue
                got = tree_matrix_element(bra, Mp, ours, Rational(tQ, 2), ket, M)
                expected = _element(bra, Mp, action, ket, M)
                assert abs(_numbers(got, table) - expected) < TOL
                nonzero += abs(expected) > 1e-8
    assert nonzero >= 10


def test_order_of_the_factors_costs_the_coupling_phase():
    # [A x B]^K = (-1)^(ka+kb-K) [B x A]^K for commuting factors (common practice, no source)
    T, U = SphericalTensor("T", 1, "a"), SphericalTensor("U", 2, "c")
    tree = coupling_tree("((a b) x, (c d) y) J", a=1, b="1/2", c=1, d="1/2", x="3/2", y="1/2", J=1)
    other = tree.with_values(x="1/2", y="3/2", J=2)
    for K in (1, 2, 3):
        ab = tree_reduced_element(other, CoupledTensorOperator(T, U, K), tree)
        ba = tree_reduced_element(other, CoupledTensorOperator(U, T, K), tree)
        assert ab == (-1) ** (3 - K) * ba


def test_symbolic_momenta_give_unevaluated_symbols_equal_to_the_numbers():
    j1, j2, J = symbols("j1 j2 J")
    tree = coupling_tree("(a b) J", a=j1, b=j2, J=J)
    T = SphericalTensor("T", 2, "a")
    formula = tree_reduced_element(tree, T, tree)
    for values in ({j1: 2, j2: Rational(1, 2), J: Rational(3, 2)}, {j1: 3, j2: 1, J: 3}):
        numeric = tree_reduced_element(tree.xreplace(values), T, tree.xreplace(values))
        assert formula.xreplace(values).doit() == numeric != 0


def test_hyperfine_blocks_are_symmetric_and_scalar():
    A, B = symbols("A B")
    I, j = AngularMomentum("I"), AngularMomentum("j")
    tree = coupling_tree("((l s) j, I) F", l=2, s="1/2", I="3/2")
    operator = [(A * c, op) for c, op in scalar_coupled(I, j)]
    blocks = tree_operator_blocks(tree, operator)
    for F, (states, matrix) in blocks.items():
        assert matrix == matrix.T
        assert all(matrix[i, k] == 0 for i in range(len(states)) for k in range(len(states))
                   if states[i]["j"] != states[k]["j"])   # I.J is diagonal in j (common practice, no source)
    # I.J = [F(F+1) - I(I+1) - j(j+1)]/2 on the diagonal (common practice, no source)
    for F, (states, matrix) in blocks.items():
        for i, st in enumerate(states):
            jj = st["j"]
            assert matrix[i, i] == A * (F * (F + 1) - Rational(15, 4) - jj * (jj + 1)) / 2


@pytest.mark.parametrize("operator, message", [
    (SphericalTensor("T", 1, "z"), "must name a momentum"),
    (SphericalTensor("T", 1, "j"), "only its angular momentum is diagonal"),
    (CoupledTensorOperator(CoupledTensorOperator(SphericalTensor("T", 1, "l"), SphericalTensor("U", 1, "I"), 1),
                           SphericalTensor("V", 1, "s"), 1), "cannot be reduced in this tree"),
])
def test_bad_operators_are_typed_errors(operator, message):
    tree = coupling_tree("((l s) j, I) F", l=1, s="1/2", j="3/2", I="1/2", F=1)
    with pytest.raises(TensorOperatorError, match=message):
        tree_reduced_element(tree, operator, tree)


def test_bra_and_ket_of_different_schemes_are_refused():
    with pytest.raises(TensorOperatorError, match="same coupling scheme"):
        tree_reduced_element(coupling_tree("(a b) J"), SphericalTensor("T", 1, "a"), coupling_tree("(b a) J"))


def test_scalar_blocks_need_rank_zero():
    with pytest.raises(TensorOperatorError, match="rank 0"):
        tree_operator_blocks(coupling_tree("(a b) J", a=1, b=1), SphericalTensor("T", 1, "a"))
