"""The shift-form kernel: reduction formulas checked against repeated single products."""

import pytest
from sympy import QQ, ZZ

from amalgebra.algebra import AngularMomentum
from amalgebra.algebra.modes import ANGULAR_MOMENTUM
from amalgebra.algebra.shiftform import ShiftAlgebra

J = AngularMomentum("J")


def _algebra(domain=ZZ):
    return ShiftAlgebra([("J", ANGULAR_MOMENTUM)], domain)


def _word(A, letters):
    element = A.one()
    for letter in reversed(letters):          # one generator at a time: only F_{+-1} used
        element = A.mul(A.atom("J", letter), element)
    return element


@pytest.mark.parametrize("p, q", [(1, 1), (2, 1), (1, 3), (3, 3), (4, 2), (2, 5)])
def test_closed_products_match_letter_by_letter(p, q):
    # J+^p J-^q through the cached closed formula vs one letter at a time:
    # the letter-by-letter product only uses J+J- = J^2 - Jz^2 + Jz (Sakurai 3.5.x)
    A = _algebra()
    closed = A.mul(A.power(A.atom("J", "plus"), p), A.power(A.atom("J", "minus"), q))
    stepwise = _word(A, ["plus"] * p + ["minus"] * q)
    assert A.equal(closed, stepwise) and closed
    closed = A.mul(A.power(A.atom("J", "minus"), p), A.power(A.atom("J", "plus"), q))
    stepwise = _word(A, ["minus"] * p + ["plus"] * q)
    assert A.equal(closed, stepwise) and closed


def test_right_and_left_multiplication_agree():
    A = _algebra(QQ)
    x = A.add(A.atom("J", "plus"), A.atom("J", "z"), A.atom("J", "minus"))
    left = A.power(x, 5)
    right = x
    for _ in range(4):
        right = A.mul(right, x)
    assert A.equal(left, right) and left


def test_to_expr_deterministic_and_zero():
    A = _algebra()
    assert A.to_expr(A.zero()) == 0
    assert A.to_expr(A.one()) == 1
    assert A.to_expr(A.sub(A.atom("J", "z"), A.atom("J", "z"))) == 0


def test_register_mode_checks_protocol():
    from amalgebra.algebra.modes import register_mode
    with pytest.raises(TypeError, match="must define"):
        register_mode(object())
    assert register_mode(ANGULAR_MOMENTUM) is ANGULAR_MOMENTUM   # idempotent
