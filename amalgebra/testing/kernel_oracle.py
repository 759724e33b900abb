"""The plain power route of the m-shift kernel, kept as the oracle of the packed-integer route.

:meth:`~amalgebra.algebra.shiftform.ShiftAlgebra.power` takes the packed route
(:mod:`amalgebra.algebra.packed`) where it pays and the ``sympy.polys`` loop
elsewhere; users never choose.  Tests compare the two: :func:`repeated_product`
is the loop itself, and :func:`plain_power_route` switches the packed route off
for a block of code, so whole :func:`~amalgebra.algebra.canonical` results can
be compared.

Examples
========

>>> from amalgebra.algebra import AngularMomentum, canonical
>>> from amalgebra.algebra.convert import kernel_of
>>> J = AngularMomentum("J")
>>> algebra, (x,) = kernel_of(J.plus + J.z)
>>> algebra.power(x, 5) == repeated_product(algebra, x, 5)
True
>>> with plain_power_route():
...     slow = canonical((J.plus + J.z)**5)
>>> slow == canonical((J.plus + J.z)**5)
True
"""

from contextlib import contextmanager

from ..algebra import packed as _packed

__all__ = ["repeated_product", "plain_power_route"]


def repeated_product(algebra, a, n):
    """``a**n`` as ``n - 1`` left multiplications over ``sympy.polys`` (``algebra.one()`` for ``n = 0``)."""
    if n == 0:
        return algebra.one()
    result = a
    for _ in range(n - 1):
        result = algebra.mul(a, result)
    return result


@contextmanager
def plain_power_route():
    """Inside the block, ``ShiftAlgebra.power`` never takes the packed route (restored on exit)."""
    previous = _packed._ENABLED
    _packed._ENABLED = False
    try:
        yield
    finally:
        _packed._ENABLED = previous
