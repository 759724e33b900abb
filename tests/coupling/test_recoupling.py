"""Recoupling coefficients between coupling trees, against explicit coupled vectors.

Source of the expected values: numpy (``tree_oracle.py`` builds the coupled
state of any tree from the numpy Clebsch-Gordan oracle of ``spin_oracle.py``
and takes overlaps), published LS-jj coefficients (marked where recalled), and
Edmonds 1957 eq. 6.4.3 (9j as a sum of three 6j) between two of our own routes.
"""

import importlib.util
import pathlib
import random

import pytest
from sympy import Rational, S, Sum, Symbol, sqrt

from amalgebra.coupling.recoupling import (recoupling_coefficient, recoupling_matrix, recoupling_path,
                                           tree_assignments)
from amalgebra.coupling.trees import coupling_tree
from amalgebra.errors import StateError

_spec = importlib.util.spec_from_file_location("coupling_tree_oracle",
                                               pathlib.Path(__file__).with_name("tree_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

TOL = 1e-10


def _oracle_matrix(first, second, leaf_values, total):
    """{(row index, column index): overlap} with rows/columns in tree_assignments order."""
    a, b = coupling_tree(first, leaf_values), coupling_tree(second, leaf_values)
    rows, cols = tree_assignments(a, total), tree_assignments(b, total)
    doubled_leaves = {k: int(2 * Rational(v)) for k, v in leaf_values.items()}
    tm = int(2 * total)
    out = {}
    col_states = [oracle.state(second, {**doubled_leaves, **{k: int(2 * v) for k, v in c.items()}}, tm)
                  for c in cols]
    for i, r in enumerate(rows):
        u = oracle.state(first, {**doubled_leaves, **{k: int(2 * v) for k, v in r.items()}}, tm)
        for k, v in enumerate(col_states):
            out[(i, k)] = oracle.overlap(u, v)
    return out


def _check_pair(first, second, leaf_values, total):
    ours = recoupling_matrix(coupling_tree(first, leaf_values), coupling_tree(second, leaf_values), total)
    expected = _oracle_matrix(first, second, leaf_values, total)
    matrix = ours[total]
    assert ours.is_orthogonal()
    for (i, k), value in expected.items():
        assert abs(float(matrix[i, k]) - value) < TOL, (first, second, i, k)
    return matrix


def _trees(labels, prefix):
    return [oracle.name_nodes(t, prefix) for t in oracle.ordered_trees(labels, None)]


def test_the_oracle_enumerates_every_ordered_tree():
    # (2n-3)!! unordered rooted binary trees times 2^(n-1) child orders: common practice, no source
    assert len(_trees("abc", "x")) == 3 * 4
    assert len(_trees("abcd", "x")) == 15 * 8


@pytest.mark.parametrize("js", [("1/2", 1, "3/2"), (1, 1, 1)])
def test_every_pair_of_three_momentum_trees_against_explicit_vectors(js):
    leaf_values = dict(zip("abc", js))
    trees, others = _trees("abc", "x"), _trees("abc", "y")
    for total in (S.One, S(2)):
        for first in trees:            # every ordered pair of trees of three momenta
            for second in others:
                _check_pair(first, second, leaf_values, total)


def _sample_pairs(trees_a, trees_b, count, seed):
    rng = random.Random(seed)
    return [(rng.choice(trees_a), rng.choice(trees_b)) for _ in range(count)]


def test_four_momentum_trees_against_explicit_vectors():
    leaf_values = {"a": "1/2", "b": 1, "c": "1/2", "d": 1}
    trees_a, trees_b = _trees("abcd", "x"), _trees("abcd", "y")
    # every shape against a chain and a pair of pairs, plus a seeded sample of pairs
    chain, pairs = trees_b[0], (("a", "b", "y1"), ("c", "d", "y2"), "y3")
    chosen = [(t, chain) for t in trees_a[::4]] + [(t, pairs) for t in trees_a[1::4]]
    chosen += _sample_pairs(trees_a, trees_b, 20, seed=11)
    for first, second in chosen:
        _check_pair(first, second, leaf_values, S.One)


@pytest.mark.slow
def test_all_four_momentum_tree_pairs_against_explicit_vectors():
    leaf_values = {"a": "1/2", "b": 1, "c": "1/2", "d": "1/2"}
    trees_a, trees_b = _trees("abcd", "x"), _trees("abcd", "y")
    for first in trees_a:
        for second in trees_b[::7]:
            _check_pair(first, second, leaf_values, S.Half)


@pytest.mark.parametrize("n, count", [(5, 6), (6, 3)])
def test_five_and_six_momentum_trees_sampled(n, count):
    labels = "abcdef"[:n]
    leaf_values = {lab: ("1/2" if i % 2 else 1) for i, lab in enumerate(labels)}
    rng = random.Random(n)
    trees = list(oracle.ordered_trees(labels, None))
    for _ in range(count):
        first = oracle.name_nodes(rng.choice(trees), "x")
        second = oracle.name_nodes(rng.choice(trees), "y")
        total = S.One if n == 5 else S.Half
        _check_pair(first, second, leaf_values, total)


def test_nine_j_and_three_six_j_routes_agree():
    # Edmonds 1957 eq. 6.4.3 (9j as a sum over three 6j, number from memory): the 9j move
    # and the path of three associativity moves give the same matrices exactly
    d = {"l1": 2, "l2": 1, "s1": "1/2", "s2": "1/2"}
    ls = coupling_tree("((l1 l2) L, (s1 s2) S) J", d)
    jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", d)
    with_9j, with_6j = recoupling_matrix(ls, jj), recoupling_matrix(ls, jj, nine_j=False)
    assert with_9j.blocks.keys() == with_6j.blocks.keys()
    for total in with_9j.blocks:
        assert with_9j[total] == with_6j[total]
    assert recoupling_coefficient(ls, jj, nine_j=False).has(Sum)


def test_ls_jj_for_two_p_electrons_published_values():
    # pp' configuration, J = 0: 1S0 = sqrt(1/3)|1/2 1/2> + sqrt(2/3)|3/2 3/2> and
    # 3P0 = sqrt(2/3)|1/2 1/2> - sqrt(1/3)|3/2 3/2> (from memory; the usual LS-jj table of
    # atomic-structure monographs, e.g. Condon and Shortley 1935, with Condon-Shortley phases)
    p = {"l1": 1, "l2": 1, "s1": "1/2", "s2": "1/2"}
    U = recoupling_matrix(coupling_tree("((l1 l2) L, (s1 s2) S) J", p),
                          coupling_tree("((l1 s1) j1, (l2 s2) j2) J", p), total=0)
    rows, cols, matrix = U.blocks[S.Zero]
    index_r = {(r["L"], r["S"]): i for i, r in enumerate(rows)}
    index_c = {(c["j1"], c["j2"]): k for k, c in enumerate(cols)}
    h, t = S.Half, Rational(3, 2)
    assert matrix[index_r[(0, 0)], index_c[(h, h)]] == sqrt(Rational(1, 3))
    assert matrix[index_r[(0, 0)], index_c[(t, t)]] == sqrt(Rational(2, 3))
    assert matrix[index_r[(1, 1)], index_c[(h, h)]] == sqrt(Rational(2, 3))
    assert matrix[index_r[(1, 1)], index_c[(t, t)]] == -sqrt(Rational(1, 3))


def test_ls_jj_for_two_d_electrons_against_explicit_vectors():
    # dd' configuration, every J: numpy oracle overlaps (source: numpy)
    d = {"l1": 2, "l2": 2, "s1": "1/2", "s2": "1/2"}
    for total in range(0, 6):
        _check_pair((("l1", "l2", "L"), ("s1", "s2", "S"), "J"),
                    (("l1", "s1", "j1"), ("l2", "s2", "j2"), "J"), d, S(total))


def test_symbolic_formula_agrees_with_numbers():
    # the formula with symbolic momenta, evaluated at numbers, equals the numeric route
    # (and the numeric route equals the numpy oracle above)
    first = coupling_tree("(((a b) x, c) y, d) J")
    second = coupling_tree("((a c) u, (b d) v) J")
    formula = recoupling_coefficient(first, second)
    values = {"a": 1, "b": S.Half, "c": 1, "d": S.Half}
    expected = _oracle_matrix((((("a", "b", "x"), "c", "y"), "d", "J")), (("a", "c", "u"), ("b", "d", "v"), "J"),
                              values, S.One)
    rows = tree_assignments(coupling_tree(first, values), S.One)
    cols = tree_assignments(coupling_tree(second, values), S.One)
    for i, r in enumerate(rows):
        for k, c in enumerate(cols):
            point = {Symbol(n): v for n, v in {**values, **r, **c}.items()}
            assert abs(float(formula.xreplace(point).doit()) - expected[(i, k)]) < TOL


def test_paths_are_short():
    # every pair of 6-momentum trees is joined in at most 2n - 6 = 6 associativity moves
    # (rotation distance bound for rooted binary trees; common practice, no source) and the
    # pair-of-pairs exchange is one 9j
    ls = coupling_tree("((l1 l2) L, (s1 s2) S) J")
    jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J")
    assert [m.kind for m in recoupling_path(ls, jj)] == ["9j"]
    labels = "abcdef"
    rng = random.Random(3)
    trees = list(oracle.ordered_trees(labels, None))
    for _ in range(10):
        first = coupling_tree(oracle.name_nodes(rng.choice(trees), "x"))
        second = coupling_tree(oracle.name_nodes(rng.choice(trees), "y"))
        assert len(recoupling_path(first, second, nine_j=False)) <= 6


def test_a_tree_recouples_to_itself_with_deltas_only():
    first = coupling_tree("((a b) x, c) J")
    assert recoupling_coefficient(first, first) == 1
    other = coupling_tree("((a b) y, c) J")
    assert str(recoupling_coefficient(first, other)) == "KroneckerDelta(x, y)"


@pytest.mark.parametrize("first, second, message", [
    ("((a b) x, c) J", "((a b) x, d) J", "same momenta"),
    ("((a b) x, c) J", "(a, (b c) x) J", "must not name different couplings"),
])
def test_bad_pairs_are_typed_errors(first, second, message):
    with pytest.raises(StateError, match=message):
        recoupling_coefficient(coupling_tree(first), coupling_tree(second))


def test_different_leaf_values_are_refused():
    with pytest.raises(StateError, match="must equal"):
        recoupling_coefficient(coupling_tree("(a b) J", a=1), coupling_tree("(a b) J", a=2))
