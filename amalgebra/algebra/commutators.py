r"""Commutators, nested commutators and the adjoint action, in canonical form.

Explanation
===========

All three work inside the shift-form kernel and convert back once.
:math:`[A, B] = AB - BA`; :math:`\mathrm{ad}_X^n(Y) = [X, [X, \ldots [X, Y]]]`
(``n`` brackets, :math:`\mathrm{ad}_X^0(Y) = Y`); the adjoint action is the
Hadamard series

.. math::

    e^{X} Y e^{-X} = \sum_{n=0}^{\infty} \frac{1}{n!} \mathrm{ad}_X^n(Y),

truncated after the term ``n = order`` (exact when the series terminates, e.g.
for nilpotent :math:`\mathrm{ad}_X`).

Components of spherical tensors and vector operators are accepted as well
(once :mod:`amalgebra.tensors` is imported); results are then in the mixed
normal form of :mod:`amalgebra.tensors.mixedform`: angular-momentum factors
to the left of tensor components, tensor components in the order written.

Examples
========

>>> from sympy import I, symbols
>>> from amalgebra.algebra import AngularMomentum, commutator, adjoint_action
>>> J = AngularMomentum("J")
>>> commutator(J.x, J.y)                 # Sakurai (3.1.20): [Jx, Jy] = i Jz
I*J.z
>>> commutator(J.z, J.plus**3)           # [Jz, J+^n] = n J+^n
3*J.plus**3
>>> t = symbols("t")
>>> adjoint_action(I*t*J.z, J.plus, 3)   # e^{i t Jz} J+ e^{-i t Jz} = e^{i t} J+, to order 3
-(I*t**3 + 3*t**2 - 6*I*t - 6)*J.plus/6

With a vector operator (Sakurai (3.10.1)): :math:`[J_x, V_y] = i V_z`, and
rotating :math:`V_x` about :math:`z` by angle :math:`t` gives
:math:`V_x \cos t + V_y \sin t` (to third order here):

>>> from amalgebra.algebra import canonical
>>> from amalgebra.tensors import VectorOperator
>>> V = VectorOperator("V", "J")
>>> commutator(J.x, V.y)
I*V[J].z
>>> adjoint_action(-I*t*J.z, V.x, 3) == canonical((1 - t**2/2)*V.x + (t - t**3/6)*V.y)
True

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics*, eqs. (3.1.20) and (2.3.47).
"""

from math import factorial
from numbers import Integral

from ..errors import OperatorError
from .extensions import kernel_for

__all__ = ["commutator", "nested_commutator", "adjoint_action"]


def _count(value, name):
    if isinstance(value, bool) or not isinstance(value, Integral) or value < 0:
        raise OperatorError(f"{name}={value!r} must be a nonnegative int")
    return int(value)


def commutator(a, b):
    """Return ``[a, b] = a*b - b*a`` in canonical form.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum, commutator
    >>> J, S = AngularMomentum("J"), AngularMomentum("S")
    >>> commutator(J.squared, J.x), commutator(J.x, S.y)   # Casimir; different labels
    (0, 0)
    >>> commutator(J.plus, J.minus)
    2*J.z
    >>> from amalgebra.tensors import SphericalTensor
    >>> T = SphericalTensor("T", 2, "J")
    >>> commutator(J.plus, T[1])             # sqrt((k - q)(k + q + 1)) T_{q+1}, Sakurai (3.11.x)
    2*T^(2)[J]_(2)

    Parameters
    ==========

    a, b : Expr
        Operator polynomials.

    See Also
    ========

    nested_commutator, adjoint_action, amalgebra.algebra.canonical
    """
    algebra, (x, y) = kernel_for(a, b)
    return algebra.to_expr(algebra.sub(algebra.mul(x, y), algebra.mul(y, x)))


def nested_commutator(x, y, n):
    """Return ``[x, [x, ... [x, y]]]`` with ``n`` brackets (``n = 0`` gives ``y``).

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum, nested_commutator
    >>> J = AngularMomentum("J")
    >>> nested_commutator(J.z, J.minus, 4)      # ad_{Jz}^n J- = (-1)^n J-
    J.minus
    >>> from amalgebra.tensors import SphericalTensor
    >>> T = SphericalTensor("T", 2, "J")
    >>> nested_commutator(J.z, T[-2], 3)        # ad_{Jz}^n T_q = q^n T_q
    -8*T^(2)[J]_(-2)
    """
    n = _count(n, "n")
    algebra, (ex, ey) = kernel_for(x, y)
    for _ in range(n):
        ey = algebra.sub(algebra.mul(ex, ey), algebra.mul(ey, ex))
    return algebra.to_expr(ey)


def adjoint_action(x, y, order):
    r"""Return :math:`\sum_{n=0}^{\mathrm{order}} \mathrm{ad}_x^n(y)/n!`, the
    truncation of :math:`e^{x} y e^{-x}` after the term ``n = order``.

    Examples
    ========

    >>> from sympy import symbols, I
    >>> from amalgebra.algebra import AngularMomentum, adjoint_action
    >>> J = AngularMomentum("J")
    >>> b = symbols("b")
    >>> adjoint_action(-I*b*J.y, J.z, 2)   # rotation about y, to second order in b
    b*J.minus/2 + b*J.plus/2 - (b**2 - 2)*J.z/2

    Tensor components rotate as well (:math:`e^{-i b J_z} T_q e^{i b J_z} = e^{-i q b} T_q`):

    >>> from amalgebra.tensors import SphericalTensor
    >>> T = SphericalTensor("T", 2, "J")
    >>> adjoint_action(-I*b*J.z, T[2], 2)
    -(2*b**2 + 2*I*b - 1)*T^(2)[J]_(2)

    Parameters
    ==========

    x, y : Expr
    order : int
        Highest power of ``ad_x`` kept (``order = 0`` returns ``canonical(y)``).
    """
    order = _count(order, "order")
    algebra, (ex, ey) = kernel_for(x, y)
    terms = [ey]
    current = ey
    for n in range(1, order + 1):
        current = algebra.sub(algebra.mul(ex, current), algebra.mul(current, ex))
        if not current:
            break
        terms.append(algebra.scale(current, algebra.domain.one, factorial(n)))
    return algebra.to_expr(algebra.add(*terms))
