"""Kets of any coupling tree: expansion, recoupling into other trees, products, combinations.

Source of the expected values: numpy (the coupled vectors of ``tests/coupling/tree_oracle.py``,
built from the numpy Clebsch-Gordan oracle of ``tests/coupling/spin_oracle.py``), and
orthonormality / completeness, which hold for any orthonormal basis (common practice, no source).
"""

import importlib.util
import pathlib
import random

import pytest
from sympy import Rational, S, adjoint, simplify, sqrt

from amalgebra.algebra import AngularMomentum
from amalgebra.coupling.recoupling import tree_assignments
from amalgebra.coupling.trees import chain_tree, coupling_tree
from amalgebra.errors import QuantumNumberError, StateError
from amalgebra.states import apply
from amalgebra.states.coupled import coupled_chain
from amalgebra.states.kets import components, inner, ket, product_ket, tensor
from amalgebra.states.tree_kets import TreeKet, recouple, tree_basis, tree_ket

_path = pathlib.Path(__file__).resolve().parents[1] / "coupling" / "tree_oracle.py"
_spec = importlib.util.spec_from_file_location("states_tree_oracle", _path)
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

TOL = 1e-10


def _as_oracle_dict(state):
    """{((label, 2j, 2m), ...) sorted: float} of a ket combination."""
    out = {}
    for product, c in components(state).items():
        key = tuple(sorted((f.label, int(2 * f.j), int(2 * f.m)) for f in product.args))
        out[key] = out.get(key, 0.0) + float(c)
    return out


def _doubled(tree):
    return {k: int(2 * v) for k, v in tree.values.items()}


def test_expansion_matches_the_numpy_coupled_vectors():
    rng = random.Random(1)
    leaf_values = {"a": "1/2", "b": 1, "c": "1/2", "d": 1}
    shapes = list(oracle.ordered_trees("abcd", None))
    for _ in range(12):
        base = coupling_tree(oracle.name_nodes(rng.choice(shapes), "x"), leaf_values)
        for values in tree_assignments(base)[:6]:
            tree = base.with_values(values)
            M = tree.total - rng.randrange(int(2 * tree.total) + 1)
            ours = _as_oracle_dict(tree_ket(tree, M).doit())
            expected = oracle.state(tree.structure, _doubled(tree), int(2 * M))
            keys = set(ours) | {k for k, v in expected.items() if abs(v) > TOL}
            assert keys
            for key in keys:
                assert abs(ours.get(key, 0.0) - expected.get(key, 0.0)) < TOL


def test_tree_basis_is_orthonormal_and_complete():
    tree = coupling_tree("((l s) j, I) F", l=1, s="1/2", I="3/2")
    basis = tree_basis(tree)
    assert len(basis) == 3 * 2 * 4   # the dimension of the product space (common practice, no source)
    for i, u in enumerate(basis[::3]):
        for k, v in enumerate(basis[::3]):
            assert inner(u.dual(), v) == (1 if i == k else 0)


def test_recoupling_between_trees_matches_overlaps_and_round_trips():
    p = {"l1": 1, "l2": 2, "s1": "1/2", "s2": "1/2"}
    ls = coupling_tree("((l1 l2) L, (s1 s2) S) J", p)
    jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", p)
    for values in tree_assignments(ls)[::3]:
        source = tree_ket(ls.with_values(values), ls.with_values(values).total)
        image = recouple(source, jj)
        # the coefficients are overlaps of numpy vectors
        for target, c in components_by_tree(image).items():
            u = oracle.state(target.tree.structure, _doubled(target.tree), int(2 * target.M))
            v = oracle.state(source.tree.structure, _doubled(source.tree), int(2 * source.M))
            assert abs(float(c) - oracle.overlap(u, v)) < TOL
        back = recouple(image, ls)
        assert back == source
        assert simplify(inner(source.dual(), image) - 1) == 0


def components_by_tree(state):
    out = {}
    for term in S(state).as_ordered_terms() if not isinstance(state, TreeKet) else [state]:
        c, nc = term.args_cnc()
        out[nc[0]] = term.func(*c) if c else S.One
    return out


def test_product_kets_recouple_into_any_tree():
    tree = coupling_tree("((a b) x, c) J", a="1/2", b="1/2", c=1)
    state = product_ket(ket("1/2", "1/2", "a"), ket("1/2", "-1/2", "b"), ket(1, 0, "c"))
    image = recouple(state, tree)
    # the expansion of the image is the state again (exact)
    assert components(image) == components(state)


def test_chain_kets_and_chain_trees_expand_alike():
    js = ["1/2", 1, "1/2"]
    chain = coupled_chain(js, ["1/2"], 1, 0, ("a", "b", "c"))
    tree = chain_tree(["a", "b", "c"], ["x"], "J", a="1/2", b=1, c="1/2", x="1/2", J=1)
    assert components(chain) == components(tree_ket(tree, 0))


def test_products_and_combinations_of_tree_kets():
    up = tree_ket(coupling_tree("(a b) s", a="1/2", b="1/2", s=1), 1)
    singlet = tree_ket(coupling_tree("(a b) s", a="1/2", b="1/2", s=0), 0)
    combination = (up + singlet) / sqrt(2)
    product = tensor(combination, tree_ket(coupling_tree("(c d) t", c=1, d=1, t=0), 0))
    assert inner(adjoint(product), product) == 1
    # operators act through the expansion: J_z of leaf a on the stretched triplet gives 1/2 of it
    A = AngularMomentum("a")
    assert components(apply(A.z, up)) == components(up.doit() / 2)


def test_errors_are_typed():
    with pytest.raises(StateError, match="must be numbers"):
        tree_ket(coupling_tree("(a b) J", a=1), 0)
    with pytest.raises(QuantumNumberError):
        tree_ket(coupling_tree("(a b) J", a=1, b=1, J=1), 2)
    with pytest.raises(StateError, match="labels"):
        recouple(ket(1, 0, "z"), coupling_tree("(a b) J", a=1, b=1))
    with pytest.raises(StateError, match="must be a CouplingTree"):
        TreeKet("((a b) x, c) J", 0)
