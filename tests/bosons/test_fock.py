"""Fock kets: validation, printing, exact action of boson operators, inner products."""

import importlib.util
import pathlib
import pickle
from fractions import Fraction

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import Basic, I, Integer, KroneckerDelta, Mul, Rational, Symbol, adjoint, latex, pretty, sqrt, sstr

from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import (BosonMode, FockKet, apply_bosons, boson_modes, fock_bra,
                              fock_components, fock_inner, fock_ket, fock_matrix_element, occupation, vacuum)
from amalgebra.errors import NotNumericError, OperatorError, QuantumNumberError, StateError

_spec = importlib.util.spec_from_file_location("boson_oracle_fock",
                                               pathlib.Path(__file__).with_name("boson_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

a, b = boson_modes("a", "b")
A, Ad, Na = a.annihilate, a.create, a.number
B, Bd, Nb = b.annihilate, b.create, b.number
n = Symbol("n", integer=True, nonnegative=True)


# ---------------------------------------------------------------- construction
@pytest.mark.parametrize("obj", [fock_ket(1, 2), fock_bra(0, 3), fock_ket(n, 2), vacuum(("c",))])
def test_args_contract(obj):
    assert obj.func(*obj.args) == obj
    assert all(isinstance(arg, Basic) for arg in obj.args)
    assert pickle.loads(pickle.dumps(obj)) == obj


def test_labels_are_sorted():
    assert FockKet(("b", "a"), (1, 2)) == fock_ket(2, 1)
    assert fock_ket(2, 1).as_dict() == {"a": 2, "b": 1}
    assert FockKet((b, a), (1, 2)).modes == ("a", "b")


@pytest.mark.parametrize("value, expected", [
    (3, 3), ("4", 4), (Fraction(6, 2), 3), (2.0, 2), (Integer(0), 0), (Rational(10, 5), 2),
])
def test_occupation_accepts(value, expected):
    assert occupation(value) == expected


@pytest.mark.parametrize("value, error", [
    (-1, QuantumNumberError),
    (Rational(1, 2), QuantumNumberError),
    ("3/2", QuantumNumberError),
    (0.5, QuantumNumberError),
    (0.3, QuantumNumberError),
    (Symbol("x", negative=True), QuantumNumberError),
    (Symbol("y", integer=False), QuantumNumberError),
    (True, NotNumericError),
    ("n", NotNumericError),
    ([1], NotNumericError),
    (Ad, NotNumericError),
])
def test_occupation_rejects(value, error):
    with pytest.raises(error):
        fock_ket(value, 0)


@pytest.mark.parametrize("thunk", [
    lambda: FockKet(("a", "a"), (1, 1)),
    lambda: FockKet(("a", "b"), (1,)),
    lambda: FockKet((), ()),
    lambda: FockKet(("1a",), (0,)),
])
def test_bad_kets(thunk):
    with pytest.raises(StateError):
        thunk()


def test_error_message_names_value():
    with pytest.raises(QuantumNumberError, match=r"n_a=-2 must be a nonnegative integer"):
        fock_ket(-2, 0)


# ---------------------------------------------------------------- printing
@pytest.mark.parametrize("obj, text, tex, ascii_pretty", [
    (fock_ket(2, 1), "|2, 1>_(a,b)", r"{\left|2, 1\right\rangle}_{a,b}", "|2, 1>_(a,b)"),
    (fock_bra(0, 3), "<0, 3|_(a,b)", r"{\left\langle 0, 3\right|}_{a,b}", "<0, 3|_(a,b)"),
    (fock_ket(n, modes="c"), "|n>_(c)", r"{\left|n\right\rangle}_{c}", "|n>_(c)"),
])
def test_printing(obj, text, tex, ascii_pretty):
    assert sstr(obj) == text
    assert latex(obj) == tex
    assert pretty(obj, use_unicode=False) == ascii_pretty


def test_adjoint():
    psi = I * fock_ket(1, 0) + 2 * fock_ket(0, 1)
    assert adjoint(psi) == -I * fock_bra(1, 0) + 2 * fock_bra(0, 1)
    assert adjoint(adjoint(fock_ket(3, 4))) == fock_ket(3, 4)


# ---------------------------------------------------------------- exact action
@pytest.mark.parametrize("op, ket, expected", [
    # Sakurai (2.3.16)-(2.3.17): a|n> = sqrt(n)|n-1>, a^dagger|n> = sqrt(n+1)|n+1>, N|n> = n|n>
    (A, fock_ket(3, 1), sqrt(3) * fock_ket(2, 1)),
    (Ad, fock_ket(3, 1), 2 * fock_ket(4, 1)),
    (Na, fock_ket(3, 1), 3 * fock_ket(3, 1)),
    (B, fock_ket(3, 0), 0),
    (A ** 2, fock_ket(1, 5), 0),
    (Bd ** 2, fock_ket(0, 1), sqrt(6) * fock_ket(0, 3)),
    (Ad * B, fock_ket(0, 2), sqrt(2) * fock_ket(1, 1)),
    (A, fock_ket(n, 0), sqrt(n) * fock_ket(n - 1, 0)),
    (Ad ** 2, fock_ket(n, 0), sqrt(n + 1) * sqrt(n + 2) * fock_ket(n + 2, 0)),
    (Na ** 2 - 1, fock_ket(n, 0), (n ** 2 - 1) * fock_ket(n, 0)),
])
def test_action_table(op, ket, expected):
    assert apply_bosons(op, ket) == expected


def test_action_leaves_other_modes():
    c = BosonMode("c")
    ket = FockKet(("a", "b", "c"), (1, 2, 3))
    assert apply_bosons(c.annihilate, ket) == sqrt(3) * FockKet(("a", "b", "c"), (1, 2, 2))


def test_vacuum_is_annihilated():
    # common practice, no source: a|0> = 0
    assert apply_bosons(A + B, vacuum()) == 0
    assert apply_bosons(Ad ** 3, vacuum(("a",))) == sqrt(6) * fock_ket(3, modes=("a",))


@pytest.mark.parametrize("op, state, error", [
    (AngularMomentum("J").plus, fock_ket(1, 1), OperatorError),
    (BosonMode("c").create, fock_ket(1, 1), OperatorError),     # a mode the state lacks, as for a label
    (Ad, AngularMomentum("J").plus, StateError),
    (Ad, fock_bra(1, 0), StateError),
    (Ad, "ket", StateError),
])
def test_bad_action(op, state, error):
    with pytest.raises(error):
        apply_bosons(op, state)


def test_inner_products():
    x = Symbol("x")
    psi = fock_ket(1, 0) + I * x * fock_ket(0, 1)
    assert fock_inner(adjoint(psi), psi) == 1 + x * x.conjugate()
    assert fock_inner(fock_bra(1, 0), fock_ket(0, 1)) == 0
    assert fock_inner(fock_ket(2, 2), fock_ket(2, 2)) == 1     # a ket given first is dualised
    assert fock_inner(fock_bra(n, 0), fock_ket(2, 0)) == KroneckerDelta(n, 2)
    with pytest.raises(StateError):
        fock_inner(fock_bra(1, modes="a"), fock_ket(1, modes="b"))


def test_components():
    x = Symbol("x")
    state = x * fock_ket(1, 0) + fock_ket(0, 1) - x * fock_ket(1, 0)
    assert fock_components(state) == {fock_ket(0, 1): 1}
    assert fock_components(0) == {}


def test_matrix_element():
    # Sakurai (2.3.16): <n+2|a^dagger^2|n> = sqrt((n+1)(n+2))
    assert fock_matrix_element(fock_bra(4, 0), Ad ** 2, fock_ket(2, 0)) == sqrt(12)


LETTERS = [A, Ad, Na, B, Bd, Nb]
word = st.lists(st.sampled_from(range(len(LETTERS))), min_size=1, max_size=4)
poly = st.lists(st.tuples(st.integers(-3, 3), word), min_size=1, max_size=3)


@given(poly, st.integers(0, 3), st.integers(0, 3))
@example([(1, [0, 1, 1])], 0, 2)
def test_action_agrees_with_truncated_matrices(terms, na, nb):
    # numpy oracle (boson_oracle.py, built from Sakurai (2.3.16)); exact for occupations <= 3 at dim 8
    expr = sum((Integer(c) * Mul(*[LETTERS[i] for i in w]) for c, w in terms), Integer(0))
    dim = 8
    matrix = oracle.fock_matrix(expr, ["a", "b"], dim)
    column = matrix[:, oracle.basis_index((na, nb), dim)]
    result = fock_components(apply_bosons(expr, fock_ket(na, nb)))
    vector = np.zeros(dim * dim, dtype=complex)
    for ket, coeff in result.items():
        vector[oracle.basis_index(ket.occupations, dim)] = complex(coeff)
    assert np.allclose(vector, column, atol=1e-9)
