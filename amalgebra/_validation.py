"""Boundary conversion of user values to SymPy objects, in one place.

Text is never parsed here: a ``str`` is refused with a typed error (text goes
through :mod:`amalgebra.parsing`), and everything else uses SymPy's strict
conversion, which never calls ``eval``.

>>> from amalgebra._validation import as_expression
>>> as_expression(3, "reduced")
3
>>> as_expression("x", "reduced")
Traceback (most recent call last):
...
amalgebra.errors.NotNumericError: reduced='x' must be a SymPy expression or a number, not text (use amalgebra.parsing.parse for text)
"""

from sympy.core.sympify import SympifyError, _sympify

from .errors import NotNumericError

__all__ = ["as_expression"]


def as_expression(value, name="value"):
    """``value`` as a SymPy object; ``str`` and unconvertible objects raise NotNumericError."""
    if isinstance(value, str):
        raise NotNumericError(f"{name}={value!r} must be a SymPy expression or a number, not text "
                              "(use amalgebra.parsing.parse for text)")
    try:
        return _sympify(value)  # safe: strict conversion, strings are refused above
    except SympifyError as exc:
        raise NotNumericError(f"{name}={value!r} must be a SymPy expression or a number") from exc
