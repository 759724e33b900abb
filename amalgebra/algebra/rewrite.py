r"""Rewriting between Cartesian and ladder components (structure kept, no reordering).

Explanation
===========

:func:`to_ladder` replaces :math:`J_x = (J_+ + J_-)/2` and
:math:`J_y = (J_+ - J_-)/(2i)`; :func:`to_cartesian` replaces
:math:`J_\pm = J_x \pm i J_y` (and, with ``casimir=True``,
:math:`J^2 = J_x^2 + J_y^2 + J_z^2`).  Both substitute atoms only: the result
is the same operator, not normal ordered; apply
:func:`~amalgebra.algebra.canonical` for the unique form.  The same rewrites
are available as ``expr.rewrite("ladder")`` and ``expr.rewrite("cartesian")``.

Examples
========

>>> from amalgebra.algebra import AngularMomentum, canonical, to_cartesian, to_ladder
>>> J = AngularMomentum("J")
>>> to_cartesian(J.plus*J.z)
(J.x + I*J.y)*J.z
>>> to_ladder(J.x)
(J.minus + J.plus)/2
>>> e = J.x*J.plus*J.y
>>> canonical(to_cartesian(e)) == canonical(e) == canonical(to_ladder(e)) != 0
True
"""

from sympy import I

from .convert import _check_expr
from .operators import AngularMomentumComponent

__all__ = ["to_cartesian", "to_ladder"]


def _components(expr):
    return sorted(expr.atoms(AngularMomentumComponent), key=lambda c: (c.label, c.component))


def to_ladder(expr):
    """Replace every ``x`` and ``y`` component by ladder operators (see module).

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> to_ladder(J.x)
    (J.minus + J.plus)/2
    >>> to_cartesian(to_ladder(J.x * J.y)).expand() == (J.x * J.y).expand() != 0
    True
    """
    expr = _check_expr(expr)
    mapping = {}
    for c in _components(expr):
        J = c.parent
        if c.component == "x":
            mapping[c] = (J.plus + J.minus) / 2
        elif c.component == "y":
            mapping[c] = (J.plus - J.minus) / (2 * I)
    return expr.xreplace(mapping)


def to_cartesian(expr, casimir=False):
    """Replace every ladder component by ``x +- i y`` (and ``J^2`` if ``casimir``).

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> to_cartesian(J.plus)
    J.x + I*J.y
    >>> to_cartesian(J.squared, casimir=True)
    J.x**2 + J.y**2 + J.z**2
    """
    expr = _check_expr(expr)
    mapping = {}
    for c in _components(expr):
        J = c.parent
        if c.component == "plus":
            mapping[c] = J.x + I * J.y
        elif c.component == "minus":
            mapping[c] = J.x - I * J.y
        elif c.component == "squared" and casimir:
            mapping[c] = J.x**2 + J.y**2 + J.z**2
    return expr.xreplace(mapping)
