"""Rewriting between Cartesian and ladder components."""

import pytest
from sympy import I, symbols

from amalgebra.algebra import AngularMomentum, canonical, to_cartesian, to_ladder
from amalgebra.errors import OperatorError

J, S = AngularMomentum("J"), AngularMomentum("S")
a = symbols("a")


def test_to_cartesian_atoms():
    # J+- = Jx +- i Jy, Sakurai (3.5.x)
    assert to_cartesian(J.plus) == J.x + I * J.y
    assert to_cartesian(J.minus) == J.x - I * J.y
    assert to_cartesian(J.squared) == J.squared
    assert to_cartesian(J.squared, casimir=True) == J.x**2 + J.y**2 + J.z**2


def test_to_ladder_atoms():
    assert to_ladder(J.x) == (J.plus + J.minus) / 2
    assert to_ladder(J.y) == (J.plus - J.minus) / (2 * I)
    assert to_ladder(J.z) == J.z


@pytest.mark.parametrize("expr", [
    J.plus * J.x * S.minus,
    a * J.y**2 * J.plus + S.x * J.squared,
    (J.x + J.plus) ** 3,
])
def test_rewrites_keep_the_operator(expr):
    c = canonical(expr)
    assert canonical(to_cartesian(expr)) == c != 0
    assert canonical(to_cartesian(expr, casimir=True)) == c
    assert canonical(to_ladder(expr)) == c
    assert not to_ladder(expr).has(J.x, J.y, S.x, S.y)
    assert not to_cartesian(expr).has(J.plus, J.minus, S.plus, S.minus)


def test_bad_input():
    with pytest.raises(OperatorError):
        to_ladder([J.x])
