"""Boundary conversion of user values to SymPy objects, and the one label rule, in one place.

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

import re
from functools import lru_cache

from sympy.core.symbol import Str
from sympy.core.sympify import SympifyError, _sympify

from .errors import NotNumericError, OperatorError

__all__ = ["as_expression", "check_label", "label_key"]


def as_expression(value, name="value"):
    """``value`` as a SymPy object; ``str`` and unconvertible objects raise NotNumericError."""
    if isinstance(value, str):
        raise NotNumericError(f"{name}={value!r} must be a SymPy expression or a number, not text "
                              "(use amalgebra.parsing.parse for text)")
    try:
        return _sympify(value)  # safe: strict conversion, strings are refused above
    except SympifyError as exc:
        raise NotNumericError(f"{name}={value!r} must be a SymPy expression or a number") from exc


def check_label(label, name="label", error=OperatorError):
    """The one rule for labels of angular momenta, kets, tensors and boson modes; returns the str.

    A label is an ASCII identifier that starts with a letter (``"J"``, ``"L1"``,
    ``"S_core"``): so neither ``"_x"`` nor dunder names such as ``"__class__"``,
    nor text with spaces or non-ASCII letters.  A ``sympy.Str`` is read as its
    name.  ``error`` is the typed error to raise (``OperatorError`` for
    operators, ``StateError`` for kets), so each family keeps its error class.

    >>> from amalgebra._validation import check_label
    >>> check_label("S_core")
    'S_core'
    >>> check_label("_x")
    Traceback (most recent call last):
    ...
    amalgebra.errors.OperatorError: label='_x' must be an identifier that starts with an ASCII letter, such as 'J', 'L1' or 'S_core'
    """
    if isinstance(label, Str):
        label = label.name
    if not isinstance(label, str):
        raise error(f"{name}={label!r} must be a str such as 'J', 'L', 'S' or 'I'")
    if not (label.isascii() and label.isidentifier() and label[0].isalpha()):
        raise error(f"{name}={label!r} must be an identifier that starts with an ASCII letter, "
                    f"such as 'J', 'L1' or 'S_core'")
    return label


@lru_cache(maxsize=4096)
def label_key(label):
    """The one label order: natural order of a str label, ``'S2'`` before ``'S10'``, then by the str.

    >>> sorted(["S10", "S2", "L", "I"], key=label_key)
    ['I', 'L', 'S2', 'S10']
    """
    match = re.match(r"^(.*?)(\d*)$", label)
    stem, digits = match.groups()
    return (stem, int(digits) if digits else -1, label)
