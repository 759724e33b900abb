"""Coupling trees: reading, printing, values and errors (notation: common practice, no source)."""

import pickle

import pytest
from sympy import Rational, Symbol, latex

from amalgebra.coupling.trees import CouplingTree, chain_tree, coupling_tree
from amalgebra.errors import QuantumNumberError, StateError


@pytest.mark.parametrize("text", [
    "((l1 s1) j1, (l2 s2) j2) J",
    "((l1 l2) L, (s1 s2) S) J",
    "((l s) j, I) F",
    "(((a b) x, c) y, d) J",
    "(a b) c",
])
def test_text_round_trip(text):
    tree = coupling_tree(text)
    assert str(tree) == text
    assert coupling_tree(str(tree)) == tree
    assert tree.func(*tree.args) == tree
    assert pickle.loads(pickle.dumps(tree)) == tree


def test_separators_and_spacing_are_free():
    assert coupling_tree("((a,b)x,c)J") == coupling_tree("( ( a  b ) x   c ) J")


def test_structure_and_values():
    tree = coupling_tree("((l s) j, I) F", l=2, s="1/2", j="5/2", I="7/2")
    assert tree.leaves == ("l", "s", "I")
    assert tree.intermediates == ("j",)
    assert tree.total_name == "F"
    assert tree.total == Symbol("F")
    assert tree.value("s") == Rational(1, 2)
    assert tree.nodes() == [("j", ("l", "s"), "l", "s"), ("F", ("l", "s", "I"), "j", "I")]
    assert not tree.is_numeric()
    assert tree.with_values(F=3).is_numeric()
    assert str(tree) == "((l s) j, I) F [l=2, s=1/2, j=5/2, I=7/2]"


def test_latex_subscripts_digits():
    tex = latex(coupling_tree("((l1 s1) j1, (l2 s2) j2) J"))
    assert tex == r"\left(\left(l_{1}\, s_{1}\right) j_{1},\, \left(l_{2}\, s_{2}\right) j_{2}\right) J"


def test_chain_tree_matches_text():
    assert chain_tree(["a", "b", "c"], ["x"], "J") == coupling_tree("((a b) x, c) J")


@pytest.mark.parametrize("text, message", [
    ("((a b) c", "column end must have a momentum name"),
    ("((a b) c d", r"must have '\)'"),
    ("(a b)", "momentum name"),
    ("a", r"must start with '\('"),
    ("((a b) x, a) J", "appear once"),
    ("((a b) x, c) J extra", "must end"),
    ("((a b) x, c) J; import os", "column"),
    ("((a b) x, c) \N{GREEK SMALL LETTER ALPHA}", "column"),
])
def test_bad_text_is_a_typed_error(text, message):
    with pytest.raises(StateError, match=message):
        coupling_tree(text)


def test_triangle_rule_is_checked_for_numeric_values():
    with pytest.raises(QuantumNumberError, match="triangle"):
        coupling_tree("(a b) J", a=1, b=1, J=3)


def test_long_text_is_refused_before_reading():
    with pytest.raises(StateError, match="at most"):
        coupling_tree("(" * 5000)


def test_unknown_value_names_are_refused():
    with pytest.raises(StateError, match="must name momenta"):
        coupling_tree("(a b) J", c=1)


def test_nested_tuples_are_accepted():
    assert isinstance(coupling_tree((("a", "b", "x"), "c", "J")), CouplingTree)
    with pytest.raises(StateError, match="must be tree text"):
        coupling_tree((("a", "b"), "c", "J"))
