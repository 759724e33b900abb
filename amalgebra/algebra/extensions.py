r"""Hooks by which other subpackages extend the canonical-form engine with new atoms.

Explanation
===========

The shift-form kernel (:mod:`amalgebra.algebra.shiftform`) knows only the
generators served by a *mode* (angular momenta, bosons).  Operators that are
not generators of a mode of their own, but live *inside* the algebra of an
existing label (the components :math:`T^k_q` of a spherical tensor under
:math:`\mathbf{J}`, the components of a vector operator), are served by an
*extension*: an object registered here by the subpackage that defines those
atoms.  :mod:`amalgebra.algebra` never imports such a subpackage; a tensor
atom can only exist after its subpackage was imported, and that import
registers the extension, so the lookup below is always complete.

An extension is any object with

``name``
    a short identifier (``"tensors"``), used in messages;
``claims(atom)``
    True when the noncommutative SymPy atom ``atom`` is one of its operators;
``kernel(*exprs)``
    ``(algebra, elements)`` for the expressions converted together, where
    ``algebra`` offers the same arithmetic as
    :class:`~amalgebra.algebra.shiftform.ShiftAlgebra` that
    :func:`~amalgebra.algebra.canonical` and the commutator functions use:
    ``add(*elements)``, ``sub(a, b)``, ``mul(a, b)``, ``scale(a, num, den)``,
    ``to_expr(a)`` and ``domain`` (with ``domain.one``); elements are falsy
    when zero.

:func:`kernel_for` is the single entry point: it tries the plain kernel first
(so pure angular-momentum input pays nothing: the extension lookup runs only
after the plain conversion has refused an atom) and then hands the
expressions to the first registered extension that claims one of their atoms.

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.algebra.extensions import kernel_for
>>> J = AngularMomentum("J")
>>> algebra, (x,) = kernel_for(J.plus*J.minus)
>>> algebra.to_expr(x)                  # J+ J- = J^2 - Jz^2 + Jz, plain kernel
J.squared + J.z - J.z**2
"""

from sympy import Basic

from ..errors import OperatorError
from .convert import kernel_of
from .modes import mode_of

__all__ = ["register_extension", "registered_extensions", "claiming_extension", "kernel_for"]

_EXTENSIONS = []


def register_extension(extension):
    """Register ``extension`` (see the module docstring); registering it twice is a no-op.

    Returns the extension.  A missing protocol member raises
    :class:`~amalgebra.errors.OperatorError` naming it.

    >>> from amalgebra.algebra.extensions import register_extension
    >>> register_extension(object())  # doctest: +ELLIPSIS
    Traceback (most recent call last):
    ...
    amalgebra.errors.OperatorError: extension=<object ...> must define 'name' (see amalgebra.algebra.extensions)
    """
    for member in ("name", "claims", "kernel"):
        if not hasattr(extension, member):
            raise OperatorError(f"extension={extension!r} must define {member!r} "
                                f"(see amalgebra.algebra.extensions)")
    if extension not in _EXTENSIONS:
        _EXTENSIONS.append(extension)
    return extension


def registered_extensions():
    """The registered extensions, in registration order (a tuple)."""
    return tuple(_EXTENSIONS)


def claiming_extension(*exprs):
    """The first registered extension that claims an atom of ``exprs``, or ``None``.

    Only noncommutative atoms that no kernel mode knows are offered to the
    extensions; anything that is not a SymPy object is skipped (the plain
    conversion reports it).
    """
    if not _EXTENSIONS:
        return None
    stack = [e for e in exprs if isinstance(e, Basic)]
    seen = set()
    while stack:
        node = stack.pop()
        if node in seen or node.is_commutative:
            continue
        seen.add(node)
        if node.is_Add or node.is_Mul or node.is_Pow:
            stack.extend(node.args)
            continue
        if mode_of(node) is not None:
            continue
        for extension in _EXTENSIONS:
            if extension.claims(node):
                return extension
    return None


def kernel_for(*exprs):
    """``(algebra, elements)`` for ``exprs``: the plain kernel, or a claiming extension's.

    Raises the plain kernel's :class:`~amalgebra.errors.OperatorError` when
    no extension claims the atoms it refused.
    """
    try:
        return kernel_of(*exprs)
    except OperatorError:
        extension = claiming_extension(*exprs)
        if extension is None:
            raise
    return extension.kernel(*exprs)
