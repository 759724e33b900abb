"""The exception hierarchy of amalgebra.

Every error the library raises on bad input derives from :class:`AmalgebraError`
and from the builtin that fits it (``ValueError`` for a bad value, ``TypeError``
for a wrong kind of object), so callers may catch either.  Messages read
``name=value must ...``.

Examples
========

>>> from amalgebra.errors import QuantumNumberError
>>> from amalgebra.qnumbers import half_integer
>>> try:
...     half_integer(-1, "j", nonnegative=True)
... except QuantumNumberError as exc:
...     print(exc)
j=-1 must be >= 0
>>> issubclass(QuantumNumberError, ValueError)
True
"""

__all__ = [
    "AmalgebraError",
    "QuantumNumberError",
    "ProjectionError",
    "NotNumericError",
    "OperatorError",
    "ConventionError",
    "ParseError",
    "StoredResultError",
    "DerivationStepError",
    "StateError",
    "TensorOperatorError",
    "NotInImageError",
]


class AmalgebraError(Exception):
    """Base class of every error raised by amalgebra on bad input."""


class QuantumNumberError(AmalgebraError, ValueError):
    """A quantum number has a value no angular momentum can take.

    Raised for a negative j, a value that is not an integer or half-integer,
    or a float that is not exactly a half-integer.
    """


class ProjectionError(QuantumNumberError):
    """A projection m is incompatible with its j (j - m is not an integer)."""


class NotNumericError(AmalgebraError, TypeError):
    """A number was needed and something else (a symbol, a string that is not
    a plain exact number, an object of the wrong type) was given."""


class OperatorError(AmalgebraError, TypeError):
    """An operator expression cannot be built or used as asked (unknown label,
    adding an operator to an object that is not an expression, ...)."""


class ConventionError(AmalgebraError, ValueError):
    """An unknown convention or normalisation name was requested."""


class ParseError(AmalgebraError, ValueError):
    """Text given to amalgebra's own expression grammar was rejected."""


class StoredResultError(AmalgebraError, ValueError):
    """A stored result file is malformed or was tampered with."""


class DerivationStepError(AmalgebraError, AssertionError):
    """A step of a derivation record does not hold."""


class StateError(AmalgebraError, ValueError):
    """A state or a basis cannot be built or used as asked: a product ket with
    a repeated label, a basis that is not orthonormal, a bra and a ket over
    different labels, an object that is not a combination of kets."""


class TensorOperatorError(AmalgebraError, ValueError):
    """A spherical tensor operator cannot be used as asked: a table of matrix
    elements that is not that of an irreducible tensor of the stated rank, or a
    tensor declared under one angular momentum used with another."""


class NotInImageError(AmalgebraError, ValueError):
    """An operator or a state is outside the image of a map it was given to:
    e.g. a boson expression that does not commute with ``N_a + N_b`` (or whose
    coefficients depend on ``j = (N_a + N_b)/2`` other than through ``j(j + 1)``)
    given to the inverse Schwinger map."""
