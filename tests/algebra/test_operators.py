"""Operators: construction, identity, SymPy protocol, adjoint, bad input."""

import pickle

import pytest
from sympy import (Add, Function, I, ImmutableMatrix, Integer, Matrix, Mul, Pow, Rational,
                   Symbol, adjoint, sqrt, symbols)
from sympy.core.symbol import Str

from amalgebra.algebra import AngularMomentum, AngularMomentumComponent, canonical, dot
from amalgebra.errors import OperatorError

J, S = AngularMomentum("J"), AngularMomentum("S")
a, t = symbols("a t")
f = Function("f")
ALL = [J.x, J.y, J.z, J.plus, J.minus, J.squared]


def test_equality_and_labels():
    assert AngularMomentum("J") == J
    assert AngularMomentum("J") != AngularMomentum("L")
    assert J.x == AngularMomentumComponent("J", "x")
    assert J.x != S.x
    assert J.label == "J" and J.plus.label == "J" and J.plus.component == "plus"
    assert J.plus.parent == J
    assert J.vector == (J.x, J.y, J.z)


@pytest.mark.parametrize("op", ALL + [J])
def test_args_are_basic_and_rebuild(op):
    assert all(isinstance(arg, Str) for arg in op.args)
    assert op.func(*op.args) == op
    assert not hasattr(op, "__dict__")
    assert pickle.loads(pickle.dumps(op)) == op


@pytest.mark.parametrize("op", ALL)
def test_noncommutative_expr(op):
    assert op.is_commutative is False
    assert op * J.z != J.z * op or op == J.z
    assert op.free_symbols == set()


def test_arithmetic_with_symbolic_coefficients():
    e = a * J.x + f(t) * J.y**2 + I * J.z + sqrt(2) * J.plus * J.minus
    assert isinstance(e, Add)
    assert e.subs(a, 3) == 3 * J.x + f(t) * J.y**2 + I * J.z + sqrt(2) * J.plus * J.minus
    assert pickle.loads(pickle.dumps(e)) == e
    assert e.func(*e.args) == e
    assert (J.x * J.y).args == (J.x, J.y)            # Mul keeps noncommutative order
    assert J.x * J.x == J.x**2


def test_adjoint():
    # J+^dagger = J-, Cartesian components Hermitian: Sakurai (3.5.x) from memory
    assert adjoint(J.plus) == J.minus and adjoint(J.minus) == J.plus
    for op in (J.x, J.y, J.z, J.squared):
        assert adjoint(op) == op and op.is_hermitian
    assert adjoint(I * a * J.plus * J.z) == -I * adjoint(a) * J.z * J.minus
    e = (J.x + I * J.plus) * J.minus**2
    assert adjoint(adjoint(e)) == e


def test_adjoint_agrees_with_canonical_form():
    # (J+ Jz)^dagger = Jz J- ; the canonical forms of both sides agree, common practice
    assert canonical(adjoint(J.plus * J.z)) == canonical(J.z * J.minus) != 0


def test_dot_and_spherical():
    assert dot(J, S) == J.x * S.x + J.y * S.y + J.z * S.z
    assert canonical(dot(J, S)) == canonical(dot(S, J))
    # I.J = Iz Jz + (I+ J- + I- J+)/2, common practice (hyperfine Hamiltonians)
    assert canonical(dot(J, S)) == canonical(J.z * S.z + (J.plus * S.minus + J.minus * S.plus) / 2)
    assert canonical(dot(J, J)) == J.squared
    assert dot((J.x, J.y, J.z), S) == dot(J, S)
    # V_{+1} = -(Vx + i Vy)/sqrt(2): design.md fixed convention
    sph = J.spherical
    assert canonical(sph[1] + (J.x + I * J.y) / sqrt(2)) == 0
    assert canonical(sph[-1] - (J.x - I * J.y) / sqrt(2)) == 0


@pytest.mark.parametrize("label", ["1J", "J K", "", "J-", "é"])
def test_bad_label_value(label):
    with pytest.raises(OperatorError, match="label="):
        AngularMomentum(label)


@pytest.mark.parametrize("label", [1, None, Symbol("J"), b"J"])
def test_bad_label_type(label):
    with pytest.raises(OperatorError, match="must be a str"):
        AngularMomentum(label)


def test_bad_component():
    with pytest.raises(OperatorError, match="component="):
        AngularMomentumComponent("J", "w")


@pytest.mark.parametrize("other", [[1, 2], "a", Matrix([[1]]), ImmutableMatrix([[1]]), {1: 2}, True, J])
def test_adding_non_expressions(other):
    with pytest.raises(OperatorError, match="must be a SymPy expression or a number"):
        J.x + other
    with pytest.raises(OperatorError):
        J.x * other
    with pytest.raises(OperatorError):
        J.x - other


@pytest.mark.parametrize("exponent", [-1, Rational(1, 2), 0.5, -2, Integer(-3)])
def test_bad_powers(exponent):
    with pytest.raises(OperatorError, match="nonnegative integer"):
        J.z ** exponent


def test_division():
    assert J.x / 2 == Rational(1, 2) * J.x
    with pytest.raises(OperatorError, match="cannot be inverted"):
        2 / J.x
    with pytest.raises(OperatorError, match="cannot be inverted"):
        J.x / J.y


def test_powers_and_symbolic_exponent():
    n = Symbol("n", integer=True, nonnegative=True)
    assert (J.x**3).exp == 3
    assert isinstance(J.x**n, Pow)      # allowed at construction ...
    with pytest.raises(OperatorError, match="nonnegative integer"):
        canonical(J.x**n)               # ... but canonical needs a number
    assert J.x**0 == 1


def test_rewrite_hooks():
    assert J.x.rewrite("ladder") == (J.plus + J.minus) / 2
    assert J.plus.rewrite("cartesian") == J.x + I * J.y
    assert canonical((J.y * J.plus).rewrite("ladder")) == canonical(J.y * J.plus)


def test_mul_builds_ordinary_sympy_objects():
    e = 2 * a * J.plus * S.z
    assert isinstance(e, Mul)
    assert e.args_cnc() == [[2, a], [J.plus, S.z]]


SAMPLES = {AngularMomentum: AngularMomentum("L1"), AngularMomentumComponent: AngularMomentumComponent("S", "minus")}


def test_every_basic_subclass_has_an_args_sample():
    # style habit 2: a walker that fails when a Basic subclass of the package has no args test
    import inspect

    import amalgebra.algebra as package
    from sympy import Basic
    found = set()
    for name in dir(package):
        module = getattr(package, name)
        if inspect.ismodule(module):
            for _, obj in inspect.getmembers(module, inspect.isclass):
                if issubclass(obj, Basic) and obj.__module__.startswith("amalgebra."):
                    found.add(obj)
    assert found and found <= set(SAMPLES)
    for cls, sample in SAMPLES.items():
        assert type(sample) is cls
        assert sample.func(*sample.args) == sample
        assert all(isinstance(arg, Basic) for arg in sample.args)


from hypothesis import given, settings  # noqa: E402

from amalgebra.testing.strategies import operator_polynomials  # noqa: E402


@settings(deadline=None)
@given(operator_polynomials(("J", "S"), 3, 4))
def test_adjoint_involution_and_matrices(p):
    import numpy as np

    from amalgebra.testing.reference import evaluate
    assert adjoint(adjoint(p)) == p
    # <a|X^dagger|b> = conj(<b|X|a>): definition of the adjoint, common practice
    js = {"J": 1, "S": 0.5}
    assert np.allclose(evaluate(canonical(adjoint(p)), js), evaluate(p, js).conj().T)
