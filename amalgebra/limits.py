r"""Input limits: the largest j, powers and sizes amalgebra works on, checked before work starts.

Explanation
===========

Some inputs are legal but would make the work or the output astronomically large:
``canonical(J.x**(10**100))``, ``small_d(10**100, 0, 0, beta)``, the matrix of ``J.z``
for ``j = 10**6``.  Such inputs are refused at once with a
:class:`~amalgebra.errors.LimitError` (a ``ValueError``) whose message names the limit
and how to raise it, instead of hanging or running out of memory.  A limit never changes
a result: below it the answer is the same as without it, above it there is no answer.

The limits and their defaults (:class:`Limits`):

===================== =========== ================================================================
field                 default     what it bounds
===================== =========== ================================================================
``max_j``             1_000       a numeric j where the work grows with j: Wigner d and D elements
                                  and matrices (at j = 1000 an element has 1001 terms with
                                  coefficients of hundreds of digits), the l of spherical
                                  harmonics, many spins 1/2 (``n <= 2*max_j``: total spin n/2)
``max_power``         1_000       the exponent of an operator power that is expanded
                                  (``canonical``, ``apply``, ``to_matrix``); ``canonical(J.x**n)``
                                  has of the order of n^3 terms
``max_dimension``     1_000_000   the dimension of an explicit matrix (``to_matrix``, any kind)
``max_dense_entries`` 10_000_000  the number of entries of a dense matrix (exact ``Matrix`` or
                                  numpy array; d and D matrices)
``max_terms``         1_000_000   the number of terms (or items) one exact output would hold,
                                  counted before the work (a d matrix, a list of coupled kets)
``max_coupling_j``    10_000      the j of a CG, 3j or 6j that is not zero by a selection rule
                                  (a 6j with all j = 10^4 takes about 3 s; see
                                  :mod:`amalgebra.coupling.coefficients`)
``max_ninej_j``       1_000       the j of a 9j (a sum of products of three 6j)
===================== =========== ================================================================

Raising a limit is explicit and local: :func:`input_limits` is a context manager that
changes the limits for the code inside the ``with`` block only (per thread and per
asyncio task, through :mod:`contextvars`), and restores them on exit.  ``None`` removes
a limit.  Smaller values work the same way (tests use them to keep refusals cheap).
The text grammar has its own per-call bounds, :class:`amalgebra.parsing.ParseLimits`.

Examples
========

>>> from amalgebra.limits import current_limits, input_limits, check_limit
>>> current_limits().max_j
1000
>>> check_limit("max_j", 10**100, "j", "small_d has 2j + 1 terms")
Traceback (most recent call last):
...
amalgebra.errors.LimitError: j=<101-digit number> must be at most max_j=1000 (small_d has 2j + 1 terms); raise the limit with amalgebra.limits.input_limits(max_j=...)
>>> with input_limits(max_j=10**200):
...     check_limit("max_j", 10**100, "j", "small_d has 2j + 1 terms")
>>> current_limits().max_j          # restored on leaving the block
1000

See Also
========

amalgebra.errors.LimitError, amalgebra.parsing.ParseLimits
"""

import contextvars
from contextlib import contextmanager
from dataclasses import dataclass, fields, replace

from .errors import LimitError

__all__ = ["Limits", "DEFAULT_LIMITS", "current_limits", "input_limits", "check_limit", "show_number"]


@dataclass(frozen=True)
class Limits:
    """The input limits in force (see the module docstring for each field).

    Every field is a positive ``int`` or ``None`` (no limit).

    Examples
    ========

    >>> from amalgebra.limits import Limits
    >>> Limits().max_power, Limits(max_power=None).max_power
    (1000, None)
    """

    max_j: int | None = 1_000
    max_power: int | None = 1_000
    max_dimension: int | None = 1_000_000
    max_dense_entries: int | None = 10_000_000
    max_terms: int | None = 1_000_000
    max_coupling_j: int | None = 10_000
    max_ninej_j: int | None = 1_000

    def __post_init__(self):
        for f in fields(self):
            value = getattr(self, f.name)
            if value is None:
                continue
            if isinstance(value, bool) or not isinstance(value, int) or value < 1:
                raise LimitError(f"{f.name}={value!r} must be a positive int or None (no limit)")


#: The documented defaults.
DEFAULT_LIMITS = Limits()

_CURRENT = contextvars.ContextVar("amalgebra_input_limits", default=DEFAULT_LIMITS)


def current_limits():
    """The :class:`Limits` in force here (the defaults outside any :func:`input_limits` block).

    Examples
    ========

    >>> from amalgebra.limits import current_limits, DEFAULT_LIMITS
    >>> current_limits() == DEFAULT_LIMITS
    True
    """
    return _CURRENT.get()


@contextmanager
def input_limits(**changes):
    """Change some limits inside a ``with`` block; the previous limits come back on exit.

    Keywords are fields of :class:`Limits`; a value is a positive ``int`` or ``None``
    (no limit).  Blocks nest; the change is seen by the current thread (or asyncio
    task) only.

    Examples
    ========

    >>> from amalgebra.limits import current_limits, input_limits
    >>> with input_limits(max_power=5000, max_terms=None):
    ...     current_limits().max_power, current_limits().max_terms
    (5000, None)
    >>> with input_limits(max_spins=3):
    ...     pass
    Traceback (most recent call last):
    ...
    amalgebra.errors.LimitError: max_spins=3 must be one of the limits max_j, max_power, max_dimension, max_dense_entries, max_terms, max_coupling_j, max_ninej_j
    """
    names = [f.name for f in fields(Limits)]
    for key in changes:
        if key not in names:
            raise LimitError(f"{key}={changes[key]!r} must be one of the limits {', '.join(names)}")
    token = _CURRENT.set(replace(_CURRENT.get(), **changes))
    try:
        yield _CURRENT.get()
    finally:
        _CURRENT.reset(token)


def show_number(value):
    """A short text for a possibly huge number (error messages never print 10**100 in full).

    Python refuses to write ints of more than 4300 digits as text, and a message should stay
    short anyway: numbers of more than 30 digits are shown by their digit count.

    >>> from amalgebra.limits import show_number
    >>> show_number(12), show_number(10**40), show_number(-10**40)
    ('12', '<41-digit number>', '<-41-digit number>')
    """
    numerator = getattr(value, "numerator", None)
    denominator = getattr(value, "denominator", 1)
    if isinstance(numerator, int) and isinstance(denominator, int) and \
            max(abs(numerator).bit_length(), denominator.bit_length()) > 99:  # about 30 digits
        bits = abs(numerator).bit_length()
        # exact digit count when cheap; Python will not write ints of more than 4300 digits
        digits = len(str(abs(numerator))) if bits < 14000 else int(bits * 0.30103) + 1
        sign = "-" if numerator < 0 else ""
        over = "" if denominator == 1 else f"/{show_number(denominator)}"
        return f"<{sign}{digits}-digit number{over}>"
    return str(value)


def check_limit(field, value, name, why=""):
    """Refuse ``value`` (an int or a rational) above the limit ``field`` in force.

    ``name`` is the argument named in the message, ``why`` a short reason (what grows with
    the value).  Returns ``None``; raises :class:`~amalgebra.errors.LimitError` naming the
    limit and how to raise it.

    >>> from amalgebra.limits import check_limit, input_limits
    >>> with input_limits(max_dimension=10):
    ...     check_limit("max_dimension", 11, "dimension", "the matrix is 11 x 11")
    Traceback (most recent call last):
    ...
    amalgebra.errors.LimitError: dimension=11 must be at most max_dimension=10 (the matrix is 11 x 11); raise the limit with amalgebra.limits.input_limits(max_dimension=...)
    """
    limit = getattr(_CURRENT.get(), field)
    if limit is None or value <= limit:
        return
    reason = f" ({why})" if why else ""
    raise LimitError(f"{name}={show_number(value)} must be at most {field}={limit}{reason}; raise the "
                     f"limit with amalgebra.limits.input_limits({field}=...)")
