"""Tests for amalgebra.qnumbers: reading and validating quantum numbers."""

from fractions import Fraction

import pytest
from sympy import Rational, Symbol

from amalgebra.errors import NotNumericError, ProjectionError, QuantumNumberError
from amalgebra.qnumbers import (
    doubled,
    doubled_projection,
    half_integer,
    is_numeric,
    projection,
    quantum_number,
    triangle,
)

# Expected values below are plain arithmetic (2 * value), common practice, no source.


@pytest.mark.parametrize(
    "value,           expected",
    [
        (0,               0),
        (3,               6),
        ("3/2",           3),
        ("-1/2",          -1),
        (" 5/2 ",         5),
        ("2.5",           5),
        (1.5,             3),
        (-0.5,            -1),
        (Rational(7, 2),  7),
        (Fraction(9, 2),  9),
        ("4/2",           4),
    ],
)
def test_doubled_accepts_exact_half_integers(value, expected):
    assert doubled(value, "j") == expected


@pytest.mark.parametrize("value", [0.3, "1/3", Rational(1, 3), 1.25, "0.75", float("nan"), float("inf")])
def test_not_a_half_integer_is_a_value_error_naming_the_argument(value):
    with pytest.raises(QuantumNumberError, match=r"^j1=") as info:
        doubled(value, "j1")
    assert isinstance(info.value, ValueError)


@pytest.mark.parametrize("value", [Symbol("j"), "j", "3/2j", "__import__('os')", None, True, [1], 1j])
def test_non_numeric_is_a_type_error(value):
    with pytest.raises(NotNumericError) as info:
        half_integer(value, "j2")
    assert isinstance(info.value, TypeError)
    assert "j2=" in str(info.value)


def test_negative_j_refused_only_when_asked():
    assert half_integer(-1, "m") == -1
    with pytest.raises(QuantumNumberError, match="j=-3/2 must be >= 0"):
        half_integer("-3/2", "j", nonnegative=True)


def test_zero_denominator_is_a_value_error():
    with pytest.raises(QuantumNumberError):
        doubled("1/0", "j")


def test_projection_must_differ_from_j_by_an_integer():
    assert projection("3/2", "-3/2") == Rational(-3, 2)
    assert doubled_projection(2, 2) == 4  # j=1, m=2: |m| > j is a selection-rule zero, not an error
    with pytest.raises(ProjectionError, match=r"m=1/2 must differ from j=1 by an integer"):
        projection(1, "1/2")
    assert issubclass(ProjectionError, ValueError)


def test_is_numeric():
    assert is_numeric(2) and is_numeric("3/2") and is_numeric(Rational(1, 2)) and is_numeric(0.25)
    assert not is_numeric(Symbol("x")) and not is_numeric("x") and not is_numeric(True)


def test_quantum_number_passes_symbols_but_checks_what_sympy_knows():
    j = Symbol("j", nonnegative=True)
    assert quantum_number(j, "j") is j
    assert quantum_number("5/2") == Rational(5, 2)
    with pytest.raises(QuantumNumberError):
        quantum_number(Symbol("n", negative=True), "j", nonnegative=True)
    with pytest.raises(NotNumericError):
        quantum_number("j", "j")


@pytest.mark.parametrize(
    "a,     b,     c,     ok",
    [
        (1,     1,     0,     True),
        (1,     1,     2,     True),
        (1,     1,     3,     False),
        ("1/2", "1/2", 1,     True),
        ("1/2", 1,     1,     False),   # half-integer perimeter
        (2,     "1/2", "3/2", True),
        (0,     3,     3,     True),
        (0,     3,     2,     False),
    ],
)
def test_triangle_rule(a, b, c, ok):
    # triangle rule |a-b| <= c <= a+b with integer a+b+c: common practice, no source
    assert triangle(a, b, c) is ok


# Issue 17 (type discipline): quantum-number text holds ASCII digits only.  Python's int() and the
# regex class \d read other scripts' digits; code points from the Unicode character database.
NON_ASCII_NUMBERS = [
    "\u0663",           # ARABIC-INDIC DIGIT THREE, int() reads 3
    "\u06f3/2",         # EXTENDED ARABIC-INDIC DIGIT THREE
    "\u0969",           # DEVANAGARI DIGIT THREE
    "\uff13",           # FULLWIDTH DIGIT THREE
    "1/\u0662",         # ARABIC-INDIC DIGIT TWO as a denominator
    "1\u0665",          # a mixed string of ASCII and Arabic-Indic digits
    "\U0001d7d1",       # MATHEMATICAL BOLD DIGIT THREE
    "3\u00a0",          # a no-break space after the number
    "\u20073",          # FIGURE SPACE before it
    "\u2212" + "1/2",   # MINUS SIGN instead of the ASCII hyphen-minus
]


@pytest.mark.parametrize("text", NON_ASCII_NUMBERS)
def test_quantum_number_text_is_ascii_only(text):
    with pytest.raises(NotNumericError, match="must be a number"):
        doubled(text, "j")
    assert not is_numeric(text)
    from amalgebra.states import ket

    with pytest.raises(NotNumericError):
        ket(text, 0)


def test_ascii_text_with_ascii_whitespace_still_reads():
    assert [doubled(t) for t in ("3/2", " 3/2", "3/2\n", "\t-1/2 ", "+2")] == [3, 3, 3, -1, 4]
