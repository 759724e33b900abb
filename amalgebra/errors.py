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
    "LimitError",
    "AngleError",
    "RacahSumError",
]


class AmalgebraError(Exception):
    """Base class of every error raised by amalgebra on bad input.

    Examples
    ========

    >>> from amalgebra import AmalgebraError, ket
    >>> try:
    ...     ket(-1, 0)
    ... except AmalgebraError as exc:
    ...     print(type(exc).__name__, isinstance(exc, ValueError))
    QuantumNumberError True
    """


class QuantumNumberError(AmalgebraError, ValueError):
    """A quantum number has a value no angular momentum can take.

    Raised for a negative j, a value that is not an integer or half-integer,
    or a float that is not exactly a half-integer.

    Examples
    ========

    >>> from amalgebra import QuantumNumberError, half_integer
    >>> try:
    ...     half_integer("1/3")
    ... except QuantumNumberError as exc:
    ...     print(exc)
    j=1/3 must be an integer or half-integer
    """


class ProjectionError(QuantumNumberError):
    """A projection m is incompatible with its j (j - m is not an integer).

    Examples
    ========

    >>> from amalgebra import ProjectionError, ket
    >>> try:
    ...     ket(1, "1/2")
    ... except ProjectionError as exc:
    ...     print(exc)
    m=1/2 must differ from j=1 by an integer
    """


class NotNumericError(AmalgebraError, TypeError):
    """A number was needed and something else (a symbol, a string that is not
    a plain exact number, an object of the wrong type) was given.

    Examples
    ========

    >>> from sympy import Symbol
    >>> from amalgebra import NotNumericError, threej_float
    >>> try:
    ...     threej_float(Symbol("j"), 1, 1, 0, 0, 0)
    ... except NotNumericError as exc:
    ...     print(exc)
    j1=j must be a number here, not a symbolic expression
    """


class OperatorError(AmalgebraError, TypeError):
    """An operator expression cannot be built or used as asked (unknown label,
    adding an operator to an object that is not an expression, ...).

    Examples
    ========

    >>> from amalgebra import AngularMomentum, OperatorError
    >>> try:
    ...     AngularMomentum("")
    ... except OperatorError as exc:
    ...     print(type(exc).__name__, isinstance(exc, TypeError))
    OperatorError True
    """


class ConventionError(AmalgebraError, ValueError):
    """An unknown convention or normalisation name was requested.

    Examples
    ========

    >>> from amalgebra import ConventionError, convert_reduced
    >>> try:
    ...     convert_reduced(1, 1, 1, "edmonds", "bogus")
    ... except ConventionError as exc:
    ...     print(exc)
    to_convention='bogus' must be one of 'edmonds', 'cg'
    """


class ParseError(AmalgebraError, ValueError):
    """Text given to amalgebra's own expression grammar was rejected.

    Examples
    ========

    >>> from amalgebra import ParseError, parse
    >>> try:
    ...     parse("().__class__")          # never evaluated: the grammar has no attribute access
    ... except ParseError as exc:
    ...     print(type(exc).__name__)
    ParseError
    """


class StoredResultError(AmalgebraError, ValueError):
    """A stored result file is malformed or was tampered with.

    Examples
    ========

    >>> import pathlib, tempfile
    >>> from amalgebra import StoredResultError
    >>> from amalgebra.derivations.store import load_results
    >>> path = pathlib.Path(tempfile.mkdtemp()) / "broken.results.toml"
    >>> _ = path.write_text("[[[ not a results file", encoding="utf-8")
    >>> try:
    ...     load_results(path)
    ... except StoredResultError as exc:
    ...     print(type(exc).__name__)
    StoredResultError
    """


class DerivationStepError(AmalgebraError, AssertionError):
    """A step of a derivation record does not hold.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra import DerivationStepError, derivation
    >>> @derivation
    ... def wrong(d):
    ...     x = symbols("x")
    ...     d.step("square", (x + 1)**2, x**2 + 1, "forgot the cross term")
    >>> isinstance(wrong.run().error, DerivationStepError)
    True
    """


class StateError(AmalgebraError, ValueError):
    """A state or a basis cannot be built or used as asked: a product ket with
    a repeated label, a basis that is not orthonormal, a bra and a ket over
    different labels, an object that is not a combination of kets.

    Examples
    ========

    >>> from amalgebra import StateError, ket, product_ket
    >>> try:
    ...     product_ket(ket(1, 0, "A"), ket(1, 0, "A"))
    ... except StateError as exc:
    ...     print(exc)
    labels=['A', 'A'] must be distinct in a product state
    """


class TensorOperatorError(AmalgebraError, ValueError):
    """A spherical tensor operator cannot be used as asked: a table of matrix
    elements that is not that of an irreducible tensor of the stated rank, or a
    tensor declared under one angular momentum used with another.

    Examples
    ========

    >>> from sympy import eye
    >>> from amalgebra import AngularMomentum, TensorOperatorError, bilinear_tensor_form
    >>> S = AngularMomentum("S")
    >>> try:
    ...     bilinear_tensor_form(S, eye(2), S)
    ... except TensorOperatorError as exc:
    ...     print(exc)
    M.shape=(2, 2) must be (3, 3)
    """


class NotInImageError(AmalgebraError, ValueError):
    """An operator or a state is outside the image of a map it was given to:
    e.g. a boson expression that does not commute with ``N_a + N_b`` (or whose
    coefficients depend on ``j = (N_a + N_b)/2`` other than through ``j(j + 1)``)
    given to the inverse Schwinger map.

    Examples
    ========

    >>> from amalgebra import BosonMode, NotInImageError, from_bosons
    >>> a = BosonMode("a")
    >>> try:
    ...     from_bosons(a.create)          # changes the boson number
    ... except NotInImageError as exc:
    ...     print(type(exc).__name__)
    NotInImageError
    """


class LimitError(AmalgebraError, ValueError):
    """An input is beyond a documented size limit (a j, a power, a dimension, a count
    of terms) past which the work or the output would be astronomically large.  The
    message names the limit and how to raise it (:mod:`amalgebra.limits`).

    Examples
    ========

    >>> from amalgebra import LimitError, cg
    >>> try:
    ...     cg(10**9, 0, 10**9, 0, 0, 0)
    ... except LimitError as exc:
    ...     print(type(exc).__name__, isinstance(exc, ValueError))
    LimitError True
    """


class RacahSumError(AmalgebraError, ValueError):
    """A sum over projections or momenta cannot be read as a Racah sum: limits that are not
    the full range of the summed variable, a projection that is not linear, a summed
    variable that occurs in no coupling symbol (:mod:`amalgebra.racah`).

    Examples
    ========

    >>> from sympy import Sum, symbols
    >>> from amalgebra import RacahSumError, Coupling3j, reduce_racah_sum
    >>> m = symbols("m")
    >>> try:
    ...     reduce_racah_sum(Sum(Coupling3j(1, 1, 0, m, -m, 0), (m, 0, 1)))   # not the full range -1..1
    ... except RacahSumError as exc:
    ...     print(type(exc).__name__, isinstance(exc, ValueError))
    RacahSumError True
    """


class AngleError(AmalgebraError, ValueError):
    """An angle (an Euler angle, a polar or azimuthal angle) is not finite: ``nan``,
    an infinity or a complex infinity, where a rotation needs a finite angle.

    Examples
    ========

    >>> from amalgebra import AngleError, small_d
    >>> try:
    ...     small_d(1, 0, 0, float("nan"))
    ... except AngleError as exc:
    ...     print(type(exc).__name__, isinstance(exc, ValueError))
    AngleError True
    """
