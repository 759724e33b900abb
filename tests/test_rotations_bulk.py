"""The d matrices built in bulk from the kernel's integers equal the generic SymPy construction.

Source of the reference: SymPy's own arithmetic on the same integers (Wigner's sum,
``sign * sqrt(B) * Add(*[Rational(num, den) * c**a * s**(2j - a)])``); the values of
Wigner's formula are checked against published tables and numpy in ``tests/test_rotations.py``.
"""

import pytest
from sympy import Add, Integer, Matrix, Rational, Symbol, cos, sin, sqrt, symbols

from amalgebra.rotations.wigner import _d_kernel, _representative, small_d_matrix, wigner_D_matrix


def _generic(tj, beta):
    c, s = cos(beta / 2), sin(beta / 2)
    out = []
    for tmp in range(tj, -tj - 1, -2):
        for tm in range(tj, -tj - 1, -2):
            rmp, rm, sign = _representative(tmp, tm)
            inside, terms = _d_kernel(tj, rmp, rm)
            out.append(Integer(sign) * sqrt(Integer(inside))
                       * Add(*[Rational(n, d) * c ** a * s ** (tj - a) for a, n, d in terms]))
    return Matrix(tj + 1, tj + 1, out)


@pytest.mark.parametrize("tj", list(range(0, 17)) + [25, 40])
def test_bulk_d_matrix_is_the_generic_expression(tj):
    beta = Symbol("beta", real=True)
    bulk, generic = small_d_matrix(Rational(tj, 2), beta), _generic(tj, beta)
    for x, y in zip(bulk, generic):
        assert x == y and x.args == y.args      # structurally the same SymPy object
        assert hash(x) == hash(y)


def test_bulk_elements_behave_as_ordinary_expressions():
    beta = Symbol("beta")
    d = small_d_matrix(2, beta)
    # subs, simplify and unitarity work on the bulk-built entries (d^T d = 1, common practice, no source)
    assert (d.T * d).applyfunc(lambda e: e.rewrite(cos).simplify()) == Matrix.eye(5)
    assert d[0, 0].subs(beta, 0) == 1
    alpha, gamma = symbols("alpha gamma")
    D = wigner_D_matrix(1, alpha, beta, gamma)
    assert D.subs({alpha: 0, gamma: 0}) == small_d_matrix(1, beta)


@pytest.mark.parametrize("angle", [Rational(1, 3), -Symbol("x"), 2 * Symbol("x"), Symbol("x") + 1])
def test_numeric_and_signed_angles_take_the_generic_route(angle):
    from sympy import pi

    for beta in (angle, angle * pi):
        for tj in (1, 2, 3, 4):
            bulk, generic = small_d_matrix(Rational(tj, 2), beta), _generic(tj, beta)
            assert all(x == y for x, y in zip(bulk, generic))
