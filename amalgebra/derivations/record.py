r"""Derivation records: named, checked steps and named results, written as plain Python.

Explanation
===========

A derivation file is a Python module named ``deriv_<topic>.py`` (the ``deriv_`` prefix
is how :mod:`amalgebra.derivations.runner`, the ``amalgebra`` command and the pytest
plugin find it).  Each derivation is a function decorated with :func:`derivation`; it
receives a :class:`Steps` object and states its steps in order:

* ``d.step(name, lhs, rhs, because)`` states ``lhs = rhs`` with a one-line
  justification; the engine checks it at once (see :mod:`amalgebra.derivations.checks`)
  and a failing step stops the derivation with
  :class:`~amalgebra.errors.DerivationStepError` naming the step and both sides.
  The sides are printed as given: pass the left side as the author writes it (an
  unevaluated ``Coupling6j(...)``, ``bra * op * ket``, or ``written(tex, value)``,
  see :mod:`amalgebra.derivations.written`), not its value, and the result as the right
  side; the engine compares their values;
* ``d.then(name, rhs, because)`` continues a chain ``... = rhs`` from the previous
  right-hand side (rendered as a continued line of the same ``align``);
* ``d.result(name, expr)`` names a result that is stored beside the file and compared
  on every later run (see :mod:`amalgebra.derivations.store`).

Step and result names are identifiers (``[A-Za-z_][A-Za-z0-9_]*``), unique within their
derivation.  The function's docstring becomes the description in the LaTeX report.

Examples
========

>>> from sympy import cos, sin, symbols
>>> from amalgebra.derivations import derivation
>>> @derivation(title="Double angle")
... def double_angle(d):
...     "The double-angle formula, from the product rule for sin."
...     x = symbols("x")
...     d.step("expand", sin(2*x), 2*sin(x)*cos(x), "sine of a sum")
...     d.then("square", sin(x)*cos(x)*2, "reorder the factors")
...     d.result("doubled", sin(2*x))
>>> rec = double_angle.run()
>>> rec.ok, [s.name for s in rec.steps], list(rec.results)
(True, ['expand', 'square'], ['doubled'])
>>> rec.steps[0].exact                     # proved, not only sampled
True

See Also
========

amalgebra.derivations.latex : rendering records.
amalgebra.derivations.runner : running a folder of derivation files.
"""

import re
import time
from dataclasses import dataclass, field

from ..errors import DerivationStepError
from .checks import DEFAULT_POINTS, DEFAULT_TOLERANCE, check_equality

__all__ = ["derivation", "Derivation", "Steps", "StepRecord", "DerivationRecord", "IDENTIFIER"]

#: Names of derivations, steps and results.
IDENTIFIER = re.compile(r"[A-Za-z_][A-Za-z0-9_]*\Z")


def _check_identifier(value, name):
    if not isinstance(value, str) or not IDENTIFIER.match(value):
        raise ValueError(f"{name}={value!r} must be an identifier [A-Za-z_][A-Za-z0-9_]*")
    return value


@dataclass(frozen=True)
class StepRecord:
    """One checked step ``lhs = rhs`` with its justification and checks."""

    name: str
    lhs: object
    rhs: object
    because: str
    checks: tuple
    continued: bool = False

    @property
    def passed(self):
        return all(c.passed for c in self.checks)

    @property
    def exact(self):
        """True when the step is proved (or checked on exact matrices), not only sampled."""
        return self.passed and all(c.exact for c in self.checks)

    @property
    def status(self):
        return "; ".join(c.summary() for c in self.checks)


@dataclass
class DerivationRecord:
    """What running one derivation produced: its steps, results, and any error."""

    name: str
    title: str
    description: str
    steps: list = field(default_factory=list)
    results: dict = field(default_factory=dict)
    error: BaseException | None = None
    seconds: float = 0.0

    @property
    def ok(self):
        return self.error is None

    @property
    def numeric_steps(self):
        """Names of steps checked numerically only (evidence, not proof)."""
        return [s.name for s in self.steps if s.passed and not s.exact]


class Steps:
    """The object a derivation function receives (conventionally named ``d``)."""

    def __init__(self, record, *, tolerance=DEFAULT_TOLERANCE, points=DEFAULT_POINTS):
        self._record = record
        self._tolerance = tolerance
        self._points = points
        self._names = set()

    def _add(self, name, lhs, rhs, because, j, exact, continued, also_at=()):
        _check_identifier(name, "step name")
        if name in self._names:
            raise ValueError(f"step name={name!r} must be unique within derivation "
                             f"{self._record.name!r}")
        if not isinstance(because, str) or "\n" in because:
            raise ValueError(f"because={because!r} must be a one-line str")
        self._names.add(name)
        checks = check_equality(lhs, rhs, j=j, also_at=also_at, exact=exact,
                                seed=f"{self._record.name}.{name}",
                                points=self._points, tolerance=self._tolerance)
        step = StepRecord(name, lhs, rhs, because, checks, continued)
        self._record.steps.append(step)
        if not step.passed:
            raise DerivationStepError(
                f"step {name!r} of derivation {self._record.name!r} does not hold "
                f"({step.status}):\n  lhs = {lhs}\n  rhs = {rhs}")
        return rhs

    def step(self, name, lhs, rhs, because, *, j=None, also_at=(), exact=False):
        """State and check ``lhs = rhs``; return ``rhs`` (to continue a chain).

        Parameters
        ==========

        name : identifier of the step, unique in the derivation.
        lhs, rhs : SymPy expressions (or matrices), as the author writes them
            (unevaluated symbols and :func:`~amalgebra.derivations.written.written`
            sides are evaluated for the check only).
        because : one-line justification, rendered as ``\\text{...}``; ``$...$`` inside
            it is passed to LaTeX as math.
        j : dict, optional
            ``{label: j}``: the statement holds on these representations only; it is
            checked on exact matrices there.
        also_at : sequence of dict
            For a general operator identity: also check it on the exact matrices of
            these representations, e.g. ``[{"J": 1}, {"J": "3/2"}]``.
        exact : bool
            Refuse the numerical fallback for this step.
        """
        return self._add(name, lhs, rhs, because, j, exact, False, also_at)

    def then(self, name, rhs, because, *, j=None, also_at=(), exact=False):
        """Continue the chain: state ``(previous rhs) = rhs`` and check it."""
        if not self._record.steps:
            raise ValueError(f"then({name!r}) needs a previous step in derivation "
                             f"{self._record.name!r}")
        return self._add(name, self._record.steps[-1].rhs, rhs, because, j, exact, True,
                         also_at)

    def result(self, name, expr):
        """Name a result to be stored beside the file and compared on later runs.

        ``expr`` is a SymPy expression, a matrix (kept as an ``ImmutableMatrix``), an
        ``OperatorMatrix``/``HamiltonianMatrix`` (stored with its basis), a tuple or
        list (kept as a tuple), or a dict, nested freely (see
        :func:`amalgebra.derivations.store.encode_value`).  What the stored-results
        format cannot hold is refused at once.
        """
        from sympy import Basic, Dict, ImmutableMatrix, MatrixBase, Tuple

        from ..errors import ParseError, StoredResultError
        from .store import encode_value

        _check_identifier(name, "result name")
        if name in self._record.results:
            raise ValueError(f"result name={name!r} must be unique within derivation "
                             f"{self._record.name!r}")
        from ..states.hamiltonian import OperatorMatrix

        storable = (Basic, MatrixBase, tuple, list, dict, Tuple, Dict, OperatorMatrix)
        if not isinstance(expr, storable) or isinstance(expr, str):
            raise TypeError(f"result {name}={expr!r} must be a SymPy expression, matrix, "
                            "operator matrix with its basis, tuple or dict")
        try:
            encode_value(expr, allow_text=False)  # refuse what the format cannot hold
        except StoredResultError as exc:
            raise ParseError(f"result {name!r} cannot be stored: {exc}") from None
        value = _frozen(expr, ImmutableMatrix, MatrixBase)
        self._record.results[name] = value
        return value


def _frozen(value, immutable, matrix_base):
    """Matrices as immutable matrices and lists as tuples, through tuples and dicts."""
    if isinstance(value, matrix_base):
        return value if isinstance(value, immutable) else immutable(value)
    if isinstance(value, (tuple, list)):
        return tuple(_frozen(v, immutable, matrix_base) for v in value)
    if isinstance(value, dict):
        return {k: _frozen(v, immutable, matrix_base) for k, v in value.items()}
    return value


class Derivation:
    """A derivation declared with :func:`derivation`; call :meth:`run` to check it.

    Parameters
    ==========

    func : callable taking a :class:`Steps`.
    name : identifier (defaults to the function name).
    title : heading in reports (defaults to the name).
    """

    def __init__(self, func, name=None, title=None, tolerance=DEFAULT_TOLERANCE,
                 points=DEFAULT_POINTS):
        self.func = func
        self.name = _check_identifier(name or func.__name__, "derivation name")
        self.title = title or self.name.replace("_", " ")
        self.description = " ".join((func.__doc__ or "").split())
        self.tolerance = tolerance
        self.points = points

    def __repr__(self):
        return f"Derivation({self.name!r})"

    def run(self):
        """Run every step; return a :class:`DerivationRecord` (errors are recorded, not raised)."""
        record = DerivationRecord(self.name, self.title, self.description)
        start = time.perf_counter()
        try:
            self.func(Steps(record, tolerance=self.tolerance, points=self.points))
        except Exception as exc:  # noqa: BLE001 - user code: any failure is reported per derivation
            record.error = exc
        record.seconds = time.perf_counter() - start
        return record


def derivation(func=None, *, name=None, title=None, tolerance=DEFAULT_TOLERANCE,
               points=DEFAULT_POINTS):
    """Decorator declaring a derivation function (see the module docstring).

    Use as ``@derivation`` or ``@derivation(title="...", tolerance=1e-10)``.

    Examples
    ========

    >>> from sympy import symbols
    >>> @derivation(title="A binomial square")
    ... def binomial(d):
    ...     x = symbols("x")
    ...     d.step("square", (x + 1)**2, x**2 + 2*x + 1, "expand the product")
    ...     d.result("square", x**2 + 2*x + 1)
    >>> record = binomial.run()
    >>> record.ok, record.steps[0].name
    (True, 'square')
    """
    if func is not None:
        return Derivation(func, name, title, tolerance, points)
    return lambda f: Derivation(f, name, title, tolerance, points)
