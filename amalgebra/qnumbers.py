r"""Angular-momentum quantum numbers: the one place that reads and validates them.

Every public function of amalgebra that takes a ``j`` or an ``m`` passes it
through here, so the rules are the same everywhere:

* accepted exactly: Python ``int``, ``fractions.Fraction``, SymPy ``Integer`` and
  ``Rational``, and strings holding a plain exact number such as ``"3/2"``,
  ``"-1/2"`` or ``"2"`` (read by a small grammar of our own, never by ``eval``
  or ``sympify``);
* floats only when they are exactly an integer or a half-integer (``1.5`` yes,
  ``0.3`` no);
* ``bool`` is refused (it is an ``int`` in Python, but never a quantum number);
* text holds ASCII digits only: other scripts' digits (``"\u0663"``, Arabic-Indic three,
  which Python's ``int`` would read as 3), full-width digits and non-ASCII spaces are refused.

Errors (see :mod:`amalgebra.errors`): a value that is not a multiple of 1/2 or
a negative ``j`` raises :class:`~amalgebra.errors.QuantumNumberError`; an ``m``
whose ``j - m`` is not an integer raises :class:`~amalgebra.errors.ProjectionError`;
anything that is not a number where a number is needed raises
:class:`~amalgebra.errors.NotNumericError`.  Selection-rule violations (triangle
rule, ``|m| > j``, ``m1 + m2 != M``) are *not* errors: the coefficient functions
return an exact zero for them.

Kernels work on *doubled* values (``2j``, ``2m``) held as Python ints, so that
half-integers stay exact and cheap.

Examples
========

>>> from amalgebra.qnumbers import half_integer, doubled, triangle
>>> half_integer("3/2", "j")
3/2
>>> doubled(1.5, "j")
3
>>> triangle(1, "1/2", "1/2")
True
>>> triangle(2, "1/2", "1/2")
False
"""

import numbers
import re
from fractions import Fraction

from sympy import Basic, Expr, Integer, Rational, S

from .errors import NotNumericError, ProjectionError, QuantumNumberError

__all__ = [
    "half_integer",
    "doubled",
    "projection",
    "doubled_projection",
    "is_numeric",
    "quantum_number",
    "triangle",
    "triangle_doubled",
]

# A plain exact number: optional sign, digits, optionally "/digits" or ".digits".  ASCII only
# (re.ASCII): Python's \d and int() also read other scripts' digits ("\u0663" is 3), and a
# quantum number that reads differently from what it looks like is refused, not guessed.
_NUMBER_TEXT = re.compile(r"\A\s*([+-]?)([0-9]{1,60})(?:/([0-9]{1,60})|\.([0-9]{1,60}))?\s*\Z",
                          re.ASCII)


def _fraction_from_text(text, name):
    match = _NUMBER_TEXT.match(text)
    if match is None:
        raise NotNumericError(f"{name}={text!r} must be a number such as 2, '3/2' or '-1/2'")
    sign, whole, denominator, decimals = match.groups()
    if denominator is not None:
        if int(denominator) == 0:
            raise QuantumNumberError(f"{name}={text!r} must not have a zero denominator")
        value = Fraction(int(whole), int(denominator))
    elif decimals is not None:
        value = Fraction(int(whole + decimals), 10 ** len(decimals))
    else:
        value = Fraction(int(whole))
    return -value if sign == "-" else value


def _as_fraction(value, name):
    """Exact Fraction for a numeric quantum number, or raise NotNumericError."""
    if isinstance(value, bool):
        raise NotNumericError(f"{name}={value!r} must be a number, not a bool")
    if isinstance(value, numbers.Integral):
        return Fraction(int(value))
    if isinstance(value, Fraction):
        return value
    if isinstance(value, str):
        return _fraction_from_text(value, name)
    if isinstance(value, Basic):
        if value.is_Integer or value.is_Rational:
            return Fraction(int(value.p), int(value.q))
        if value.is_Float:
            return _fraction_from_float(float(value), name)
        raise NotNumericError(f"{name}={value} must be a number here, not a symbolic expression")
    if isinstance(value, float):
        return _fraction_from_float(value, name)
    if isinstance(value, numbers.Rational):
        return Fraction(int(value.numerator), int(value.denominator))
    if isinstance(value, numbers.Real):  # e.g. numpy floating types
        return _fraction_from_float(float(value), name)
    raise NotNumericError(f"{name}={value!r} must be a number (int, Rational, '3/2'), got {type(value).__name__}")


def _fraction_from_float(value, name):
    if value != value or value in (float("inf"), float("-inf")):
        raise QuantumNumberError(f"{name}={value!r} must be finite")
    twice = 2 * value
    if twice != int(twice):
        raise QuantumNumberError(f"{name}={value!r} must be exactly an integer or half-integer")
    return Fraction(int(twice), 2)


def _doubled_from_fraction(value, name, nonnegative):
    twice = 2 * value
    if twice.denominator != 1:
        raise QuantumNumberError(f"{name}={value} must be an integer or half-integer")
    if nonnegative and twice < 0:
        raise QuantumNumberError(f"{name}={value} must be >= 0")
    return int(twice)


def doubled(value, name="j", *, nonnegative=False):
    """Return ``2*value`` as a Python int, validating that value is a half-integer.

    >>> doubled("5/2", "j1")
    5
    >>> doubled(-1, "m")
    -2
    """
    return _doubled_from_fraction(_as_fraction(value, name), name, nonnegative)


def half_integer(value, name="j", *, nonnegative=False):
    """Return a numeric quantum number as an exact SymPy ``Integer``/``Rational``.

    Examples
    ========

    >>> half_integer(0.5, "s")
    1/2
    >>> half_integer(2, "l", nonnegative=True)
    2
    """
    return Rational(doubled(value, name, nonnegative=nonnegative), 2)


def doubled_projection(j2, value, name="m", jname="j"):
    """Validate a projection against a doubled ``j`` and return ``2*m``.

    ``|m| > j`` is allowed here (it is a selection-rule zero, not an error);
    only ``j - m`` not an integer is refused.

    >>> doubled_projection(3, "1/2")
    1
    """
    tm = doubled(value, name)
    if (j2 - tm) % 2:
        raise ProjectionError(f"{name}={Rational(tm, 2)} must differ from {jname}={Rational(j2, 2)} by an integer")
    return tm


def projection(j, m, name="m", jname="j"):
    """Validate ``m`` against a numeric ``j``; return ``m`` as an exact number.

    >>> projection("3/2", "-1/2")
    -1/2
    """
    return Rational(doubled_projection(doubled(j, jname), m, name, jname), 2)


def is_numeric(value):
    """True when ``value`` is something :func:`half_integer` can read as a number.

    This says nothing about whether it is a valid half-integer.

    >>> from sympy import Symbol
    >>> is_numeric("3/2"), is_numeric(Symbol("j")), is_numeric(0.25)
    (True, False, True)
    """
    if isinstance(value, bool):
        return False
    if isinstance(value, (numbers.Number, Fraction)):
        return True
    if isinstance(value, str):
        return _NUMBER_TEXT.match(value) is not None
    if isinstance(value, Basic):
        return bool(value.is_Number)
    return False


def quantum_number(value, name="j", *, nonnegative=False):
    """Return a quantum number as a SymPy expression, numeric or symbolic.

    Numbers are validated as in :func:`half_integer`.  A symbolic SymPy
    expression is passed through, but refused if SymPy can already tell that it
    breaks the rules (e.g. a symbol declared negative for a ``j``).  Strings
    are read only as plain numbers: ``"j"`` is refused, never turned into a
    symbol.

    >>> from sympy import Symbol
    >>> quantum_number(Symbol("j", nonnegative=True), "j1", nonnegative=True)
    j
    >>> quantum_number("7/2")
    7/2
    """
    if is_numeric(value):
        return half_integer(value, name, nonnegative=nonnegative)
    if isinstance(value, Expr):
        if nonnegative and value.is_negative:
            raise QuantumNumberError(f"{name}={value} must be >= 0")
        if (2 * value).is_integer is False:
            raise QuantumNumberError(f"{name}={value} must be an integer or half-integer")
        return value
    return Rational(doubled(value, name, nonnegative=nonnegative), 2)  # raises the right error


def triangle_doubled(ta, tb, tc):
    """Triangle rule on doubled values: ``|a-b| <= c <= a+b`` and ``a+b+c`` integer."""
    return (ta + tb + tc) % 2 == 0 and abs(ta - tb) <= tc <= ta + tb


def triangle(a, b, c):
    """True when ``a``, ``b``, ``c`` can couple: the triangle rule with integer perimeter.

    Examples
    ========

    >>> triangle(1, 1, 2), triangle(1, 1, 3), triangle("1/2", 1, 1)
    (True, False, False)
    """
    return triangle_doubled(doubled(a, "a", nonnegative=True), doubled(b, "b", nonnegative=True),
                            doubled(c, "c", nonnegative=True))


# Re-exported for kernels that want the canonical zero/one without importing sympy.S
ZERO = S.Zero
ONE = Integer(1)
