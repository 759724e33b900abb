"""Boson operators: construction contract, printing, adjoints, normal ordering in the shared kernel."""

import importlib.util
import pathlib
import pickle

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import Basic, I, Integer, Mul, Rational, Symbol, adjoint, latex, pretty, sstr

from amalgebra.algebra import AngularMomentum, canonical, commutator
from amalgebra.algebra.modes import mode_of
from amalgebra.bosons import BOSON, BosonMode, BosonOperator, boson_modes
from amalgebra.errors import OperatorError

_spec = importlib.util.spec_from_file_location("boson_oracle", pathlib.Path(__file__).with_name("boson_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)
fock_matrix = oracle.fock_matrix

a, b = boson_modes("a", "b")
A, Ad, Na = a.annihilate, a.create, a.number
B, Bd, Nb = b.annihilate, b.create, b.number


# ---------------------------------------------------------------- contract
@pytest.mark.parametrize("obj", [a, BosonMode("c1"), A, Ad, Na, BosonOperator("q", "create")])
def test_args_contract(obj):
    assert obj.func(*obj.args) == obj
    assert all(isinstance(arg, Basic) for arg in obj.args)
    assert pickle.loads(pickle.dumps(obj)) == obj
    assert not hasattr(obj, "__dict__")


def test_attributes():
    assert (A.label, A.kind, A.mode) == ("a", "annihilate", a)
    assert a.label == "a" and BosonMode("a") == a and a != b
    assert not A.is_commutative
    assert mode_of(Ad) == (BOSON, "a", "create")


@pytest.mark.parametrize("bad, error", [
    (("a", "dagger"), OperatorError),
    (("1a", "create"), OperatorError),
    ((3, "number"), OperatorError),
])
def test_bad_operator(bad, error):
    with pytest.raises(error):
        BosonOperator(*bad)


@pytest.mark.parametrize("thunk", [
    lambda: Ad ** -1,
    lambda: Ad ** Rational(1, 2),
    lambda: 1 / A,
    lambda: A + [1],
    lambda: BosonMode(""),
])
def test_bad_arithmetic(thunk):
    with pytest.raises(OperatorError):
        thunk()


# ---------------------------------------------------------------- adjoints
def test_adjoint_and_hermiticity():
    assert adjoint(A) == Ad and adjoint(Ad) == A and adjoint(Na) == Na
    assert Na.is_hermitian is True and A.is_hermitian is False
    assert adjoint(Ad ** 2 * B * Na) == Na * Bd * A ** 2


# ---------------------------------------------------------------- printing (exact strings)
@pytest.mark.parametrize("expr, text, tex", [
    (A, "a.annihilate", "a"),
    (Ad, "a.create", "{a^{\\dagger}}"),
    (Na, "a.number", "\\hat{N}_{a}"),
    (Ad ** 2, "a.create**2", "{a^{\\dagger}}^{2}"),
    (Ad ** 2 * B * Na ** 3, "a.create**2*b.annihilate*a.number**3",
     "{a^{\\dagger}}^{2} b \\hat{N}_{a}^{3}"),
    (BosonMode("c1").create, "c1.create", "{{c_{1}}^{\\dagger}}"),  # issue 15: digits subscripted
    (a, "BosonMode('a')", "a"),
])
def test_printing(expr, text, tex):
    assert sstr(expr) == text
    assert latex(expr) == tex


def test_pretty():
    assert pretty(Ad ** 2 * Na, use_unicode=True) == "  2   \na† ⋅Nₐ"
    assert pretty(Ad * Na, use_unicode=False) == "a^+*N_a"


# ---------------------------------------------------------------- normal ordering laws
def test_canonical_commutation_relation():
    # common practice, no source: [a, a^dagger] = 1, modes commute
    assert commutator(A, Ad) == 1
    assert commutator(A, Bd) == 0 and commutator(Na, B) == 0
    assert commutator(Na, Ad) == Ad and commutator(Na, A) == -A   # Sakurai (2.3.10)-(2.3.11)


@pytest.mark.parametrize("k", [1, 2, 3, 4])
def test_ladder_products(k):
    # Sakurai section 2.3 (from memory): a^dagger^k a^k = N(N-1)...(N-k+1),
    # a^k a^dagger^k = (N+1)...(N+k)
    falling = Mul(*[Na - i for i in range(k)])
    rising = Mul(*[Na + i for i in range(1, k + 1)])
    assert canonical(Ad ** k * A ** k) == canonical(falling) != 0
    assert canonical(A ** k * Ad ** k) == canonical(rising) != 0


def test_shift_rule_and_output_shape():
    # common practice, no source: f(N) a^dagger = a^dagger f(N + 1), f(N) a = a f(N - 1)
    assert canonical(Na ** 2 * Ad) == canonical(Ad * (Na + 1) ** 2) == Ad * Na ** 2 + 2 * Ad * Na + Ad
    assert canonical(Na * A) == A * Na - A
    assert canonical(A * Ad * Ad) == canonical(Ad * (Na + 2))


def test_mixed_with_angular_momentum():
    J = AngularMomentum("J")
    x = Symbol("x")
    e = J.plus * A * Ad * x + I * J.z * Na
    assert canonical(e) == x * J.plus * Na + x * J.plus + I * J.z * Na
    assert commutator(J.plus, Ad) == 0


def test_label_used_twice():
    with pytest.raises(OperatorError):
        canonical(AngularMomentum("a").plus * Ad)


LETTERS = [A, Ad, Na, B, Bd, Nb]
word = st.lists(st.sampled_from(range(len(LETTERS))), min_size=1, max_size=4)
poly = st.lists(st.tuples(st.integers(-3, 3), word), min_size=1, max_size=3)


def _build(terms):
    return sum((Integer(c) * Mul(*[LETTERS[i] for i in w]) for c, w in terms), Integer(0))


@given(poly)
@example([(1, [0, 1])])
def test_canonical_idempotent(terms):
    expr = _build(terms)
    once = canonical(expr)
    assert canonical(once) == once


@given(poly)
@example([(1, [0, 0, 1, 1]), (-2, [4, 3, 5])])
def test_canonical_agrees_with_truncated_matrices(terms):
    # numpy oracle (boson_oracle, Sakurai (2.3.16)): truncation at dim 8 is exact on columns
    # with every occupation <= 7 - 4 (a word of length <= 4 raises an occupation by at most 4)
    expr = _build(terms)
    dim, safe = 8, 4
    lhs = fock_matrix(expr, ["a", "b"], dim)
    rhs = fock_matrix(canonical(expr), ["a", "b"], dim)
    cols = [na * dim + nb for na in range(safe) for nb in range(safe)]
    assert np.allclose(lhs[:, cols], rhs[:, cols], atol=1e-9)


@given(poly, poly)
def test_commutator_is_antisymmetric_and_matches_matrices(t1, t2):
    x, y = _build(t1), _build(t2)
    c = commutator(x, y)
    assert canonical(c + commutator(y, x)) == 0
    dim, safe = 12, 4
    mx, my = (fock_matrix(e, ["a", "b"], dim, sparse=True) for e in (x, y))
    mc = fock_matrix(c, ["a", "b"], dim)
    cols = [na * dim + nb for na in range(safe) for nb in range(safe)]
    assert np.allclose((mx @ my - my @ mx).toarray()[:, cols], mc[:, cols], atol=1e-8)


def test_every_basic_class_has_an_args_test():
    # style rule 2: a walker that fails when a Basic subclass of amalgebra.bosons has no contract test
    import inspect

    import amalgebra.bosons.fock as fock
    import amalgebra.bosons.operators as operators
    import amalgebra.bosons.schwinger as schwinger
    from amalgebra.bosons import fock_bra, fock_ket

    samples = [a, A, fock_ket(1, 2), fock_bra(0, 1)]
    covered = {type(s) for s in samples}
    for module in (operators, fock, schwinger):
        for _, cls in inspect.getmembers(module, inspect.isclass):
            if issubclass(cls, Basic) and cls.__module__ == module.__name__:
                assert cls in covered, f"{cls.__name__} has no contract sample"
    for obj in samples:
        assert obj.func(*obj.args) == obj
        assert all(isinstance(arg, Basic) for arg in obj.args)
        assert pickle.loads(pickle.dumps(obj)) == obj
