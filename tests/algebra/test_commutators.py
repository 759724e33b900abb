"""Commutators, nested commutators and the adjoint action."""

import numpy as np
import pytest
from hypothesis import given, settings
from scipy.linalg import expm
from sympy import I, Rational, cos, exp, expand, factorial, series, sin, symbols

from amalgebra.algebra import (AngularMomentum, adjoint_action, canonical, commutator,
                               nested_commutator)
from amalgebra.errors import OperatorError
from amalgebra.testing.reference import evaluate
from amalgebra.testing.strategies import operator_polynomials

J, S = AngularMomentum("J"), AngularMomentum("S")
b, t = symbols("b t")


@pytest.mark.parametrize("x, y, expected", [
    (J.x, J.y, I * J.z),                 # Sakurai (3.1.20)
    (J.y, J.z, I * J.x),                 # Sakurai (3.1.20)
    (J.z, J.x, I * J.y),                 # Sakurai (3.1.20)
    (J.z, J.plus, J.plus),               # Sakurai (3.5.x) [Jz, J+] = J+
    (J.plus, J.minus, 2 * J.z),          # Sakurai (3.5.x) [J+, J-] = 2 Jz
    (J.squared, J.x * J.y, 0),           # [J^2, Ji] = 0
    (J.x, S.y, 0),                       # different labels commute, common practice
    (J.x**2, J.y, I * (J.x * J.z + J.z * J.x)),  # Leibniz rule on Sakurai (3.1.20)
])
def test_commutator_table(x, y, expected):
    assert commutator(x, y) == canonical(expected)


@settings(deadline=None)
@given(operator_polynomials(("J", "S"), 2, 3), operator_polynomials(("J", "S"), 2, 3),
       operator_polynomials(("J", "S"), 2, 3))
def test_jacobi_and_antisymmetry(x, y, z):
    # Jacobi identity and antisymmetry hold in any associative algebra, common practice
    assert commutator(x, y) == canonical(-commutator(y, x))
    total = (commutator(x, commutator(y, z)) + commutator(y, commutator(z, x))
             + commutator(z, commutator(x, y)))
    assert canonical(total) == 0


@settings(deadline=None)
@given(operator_polynomials(("J",), 2, 3), operator_polynomials(("J",), 2, 3))
def test_commutator_matches_numpy(x, y):
    # independent numpy matrices, j = 3/2
    left = evaluate(commutator(x, y), {"J": 1.5})
    mx, my = evaluate(x, {"J": 1.5}), evaluate(y, {"J": 1.5})
    assert np.allclose(left, mx @ my - my @ mx)


@pytest.mark.parametrize("n", [0, 1, 2, 5])
def test_nested_commutator_jz_plus(n):
    # ad_{Jz}^n (J+) = J+ since [Jz, J+] = J+, common practice
    assert nested_commutator(J.z, J.plus, n) == J.plus


def test_nested_commutator_rotation_generator():
    # ad_{Jy}^2 (Jz) = [Jy, i Jx] = Jz: from Sakurai (3.1.20)
    assert nested_commutator(J.y, J.z, 2) == J.z
    assert nested_commutator(J.y, J.z, 1) == canonical(I * J.x)


def test_adjoint_action_phase():
    # e^{i t Jz} J+ e^{-i t Jz} = e^{i t} J+ (common practice); compare with the Taylor series
    got = adjoint_action(I * t * J.z, J.plus, 6)
    taylor = series(exp(I * t), t, 0, 7).removeO()
    assert canonical(got - expand(taylor) * J.plus) == 0


def test_adjoint_action_rotation_matches_expm():
    # rotation of Jz about y by small beta: compare truncated series with scipy expm, j = 1
    beta = 0.01
    got = adjoint_action(-I * b * J.y, J.z, 6).subs(b, beta)
    jy = evaluate(J.y, {"J": 1})
    jz = evaluate(J.z, {"J": 1})
    ref = expm(-1j * beta * jy) @ jz @ expm(1j * beta * jy)
    assert np.allclose(evaluate(got, {"J": 1}), ref, atol=1e-12)
    # exact content: cos(b) Jz + sin(b) Jx style, from Sakurai (3.1.x) vector-operator rotation
    exact = expand(series(cos(b), b, 0, 7).removeO()) * J.z + expand(series(sin(b), b, 0, 7).removeO()) * J.x
    assert canonical(adjoint_action(-I * b * J.y, J.z, 6) - exact) == 0


def test_adjoint_action_order_zero_and_coefficients():
    assert adjoint_action(J.x, J.y, 0) == canonical(J.y)
    # order 2 by hand: Y + [X,Y] + [X,[X,Y]]/2
    manual = canonical(J.y + commutator(J.x, J.y) + Rational(1, factorial(2)) * nested_commutator(J.x, J.y, 2))
    assert adjoint_action(J.x, J.y, 2) == manual


@pytest.mark.parametrize("bad", [-1, 1.5, "2", True])
def test_bad_orders(bad):
    with pytest.raises(OperatorError, match="nonnegative int"):
        nested_commutator(J.x, J.y, bad)
    with pytest.raises(OperatorError, match="nonnegative int"):
        adjoint_action(J.x, J.y, bad)
