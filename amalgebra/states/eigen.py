r"""Exact eigenvalues of a block that never vanish silently.

Explanation
===========

:func:`block_eigenvalues` computes the characteristic polynomial
:math:`\det(\lambda - H)` (Berkowitz, exact), factors it over the rational
functions of the block's symbols, and solves every factor: degree 1 and 2 at
once, degree 3 and 4 by the cubic and quartic formulas
(``sympy.roots(cubics=True, quartics=True)``) while the time budget lasts.
The result is always an :class:`Eigenvalues` object:

* ``roots``: ``{eigenvalue: multiplicity}`` of the solved factors (the object is
  also a read-only mapping over them: ``items()``, ``values()``, ``[value]``);
* ``unsolved``: ``[(factor, multiplicity)]`` of the factors left (degree 5 and
  more without rational roots, or not solved when the budget ran out), with
  ``reason``;
* ``charpoly`` (factored, in ``variable``; ``None`` when the budget ran out
  before it was computed), ``degree``, ``symbols``;
* ``interrupted``: ``None``, or the step the budget stopped:
  ``"characteristic polynomial"``, ``"factoring"`` or
  ``"roots of a degree-d factor"`` (also named in ``reason``);
* ``complete``: True when the solved multiplicities add up to ``degree``;
* :meth:`Eigenvalues.numeric` gives all eigenvalues as floats for given
  values of the symbols (numpy on the block), whatever was solved.

**Time budget.** ``time_budget`` is in seconds of wall time, default
:data:`DEFAULT_TIME_BUDGET` (10 s); ``None`` means no limit.  The whole
pipeline (characteristic polynomial, factoring, every ``roots`` call) runs
under :mod:`amalgebra._deadline`: on the main thread of a POSIX process an
interrupting timer stops whichever step is running when the time is up;
elsewhere (another thread, Windows) the clock is checked only between the
steps, and ``reason`` says so.  Blocks of size 1 and 2 are always solved
(a handful of operations; no budget applies).

Examples
========

>>> from sympy import Matrix, symbols
>>> from amalgebra.states.eigen import block_eigenvalues
>>> D, E = symbols("D E", real=True)
>>> spin1 = Matrix([[D, 0, E], [0, 0, 0], [E, 0, D]])    # D Sz^2 + E (Sx^2 - Sy^2) on |1,1>,|1,0>,|1,-1>
>>> result = block_eigenvalues(spin1)
>>> result.complete, sorted(result, key=str)
(True, [0, D + E, D - E])
"""

from sympy import Dummy, ImmutableMatrix, Mul, Poly, default_sort_key, factor_list, roots
from sympy.polys.polyerrors import PolynomialError
from sympy.printing.defaults import Printable

from .. import notation
from .._deadline import Deadline, DeadlineExpired, armed

__all__ = ["Eigenvalues", "block_eigenvalues", "DEFAULT_TIME_BUDGET"]

#: seconds of wall time for one block (``None``: no limit); see the module docstring
DEFAULT_TIME_BUDGET = 10.0

_STEP_CHARPOLY, _STEP_FACTOR = "characteristic polynomial", "factoring"


class Eigenvalues(Printable):
    """The eigenvalues of one block: solved ``roots`` and, explicitly, what was not solved.

    A read-only mapping eigenvalue -> multiplicity over the solved roots
    (``items()``, ``keys()``, ``values()``, ``[value]``, ``len``, iteration);
    ``complete`` is True when the multiplicities add up to the block size.  Never ``None``: an unsolved factor is listed in
    ``unsolved`` with the ``reason``; a step stopped by the time budget is named in
    ``interrupted`` (and ``reason``), and ``charpoly`` is ``None`` if it was not reached.

    Examples
    ========

    >>> from sympy import Matrix
    >>> ev = block_eigenvalues(Matrix([[1, 1, 0], [1, 1, 0], [0, 0, 2]]))
    >>> ev
    Eigenvalues({0: 1, 2: 2})
    >>> ev[2], ev.complete, ev.unsolved
    (2, True, [])

    The multiplicities add up to the size of the block:

    >>> sum(ev.values()) == ev.degree == 3
    True
    """

    __slots__ = ("roots", "unsolved", "charpoly", "variable", "degree", "symbols", "reason", "interrupted",
                 "_matrix")

    def __init__(self, values, unsolved, charpoly, variable, degree, symbols, reason, matrix, interrupted=None):
        self.roots = dict(values)
        self.unsolved = list(unsolved)
        self.charpoly = charpoly
        self.variable = variable
        self.degree = degree
        self.symbols = tuple(symbols)
        self.reason = reason
        self.interrupted = interrupted
        self._matrix = matrix

    @property
    def complete(self):
        """True when every eigenvalue is in :attr:`roots` (the multiplicities add up to :attr:`degree`)."""
        return sum(self.roots.values()) == self.degree

    def items(self):
        return self.roots.items()

    def keys(self):
        return self.roots.keys()

    def values(self):
        return self.roots.values()

    def __getitem__(self, value):
        return self.roots[value]

    def __iter__(self):
        return iter(self.roots)

    def __len__(self):
        return len(self.roots)

    def __contains__(self, value):
        return value in self.roots

    def numeric(self, values=None):
        """All eigenvalues (solved or not) as complex floats, sorted, for ``values`` of the symbols.

        >>> from sympy import Matrix, Symbol
        >>> a = Symbol("a")
        >>> [round(z.real, 12) for z in block_eigenvalues(Matrix([[a, 1], [1, -a]])).numeric({a: 0})]
        [-1.0, 1.0]
        """
        import numpy as np

        mat = self._matrix.subs(values or {})
        if mat.free_symbols:
            names = ", ".join(sorted(str(s) for s in mat.free_symbols))
            from ..errors import NotNumericError
            raise NotNumericError(f"values must give numbers for {names}")
        arr = np.array(mat.evalf(), dtype=complex)
        return sorted((complex(v) for v in np.linalg.eigvals(arr)), key=lambda z: (z.real, z.imag))

    def __repr__(self):
        if self.complete:
            return f"Eigenvalues({self.roots})"
        if self.charpoly is None:
            return f"Eigenvalues(solved={self.roots}, degree {self.degree}: {self.reason})"
        degrees = [Poly(f, self.variable).degree() for f, _ in self.unsolved]
        return (f"Eigenvalues(solved={self.roots}, unsolved factors of degree {degrees} in "
                f"{self.variable}: {self.reason})")

    __str__ = __repr__

    def _latex(self, printer, exp=None):
        if self.charpoly is None:       # nothing factored to show: say why
            return notation.text_latex(f"degree {self.degree}, not solved: {self.reason}")
        return notation.eigenvalues_latex(printer, self, exp)

    def _sympystr(self, printer):
        return repr(self)


def block_eigenvalues(matrix, time_budget=DEFAULT_TIME_BUDGET):
    """The :class:`Eigenvalues` of a square SymPy matrix (see the module docstring).

    Parameters
    ==========

    matrix : square SymPy matrix (exact entries, any symbols)
    time_budget : float or None
        Seconds of wall time for the whole computation (default
        :data:`DEFAULT_TIME_BUDGET` = 10); ``None``: no limit.  When it runs out the
        running step is stopped and the result says which (``interrupted``,
        ``reason``) and keeps what was found.

    Examples
    ========

    >>> from sympy import Matrix, symbols
    >>> block_eigenvalues(Matrix([[2]])).roots
    {2: 1}
    >>> a, c = symbols("a c", real=True)
    >>> h = Matrix([[a, c], [c, -a]])
    >>> ev = block_eigenvalues(h, time_budget=None)
    >>> sorted(ev, key=str)
    [-sqrt(a**2 + c**2), sqrt(a**2 + c**2)]

    Identity check: the eigenvalues, counted with multiplicity, add up to the trace:

    >>> sum(value * k for value, k in ev.items()) == h.trace()
    True

    A budget of 0 s stops a 3 x 3 block at once; the result says where, and still
    gives numbers:

    >>> stopped = block_eigenvalues(Matrix([[1, 1, 0], [1, 2, 1], [0, 1, a]]), time_budget=0)
    >>> stopped.complete, stopped.interrupted, stopped.charpoly
    (False, 'characteristic polynomial', None)
    >>> import numpy as np                      # independent: numpy.linalg.eigvalsh
    >>> want = np.linalg.eigvalsh(np.array([[1, 1, 0], [1, 2, 1], [0, 1, 4]], dtype=float))
    >>> np.allclose([z.real for z in stopped.numeric({a: 4})], want)
    True
    """
    matrix = ImmutableMatrix(matrix)
    n = matrix.shape[0]
    lam = Dummy("lambda")
    symbols = sorted(matrix.free_symbols, key=default_sort_key)
    if n == 1:
        return Eigenvalues({matrix[0, 0]: 1}, [], lam - matrix[0, 0], lam, 1, symbols, "", matrix)
    limit = Deadline(time_budget, "time_budget")      # validated even where it is not needed
    if n <= 2:
        limit = Deadline(None)
    work = {"step": _STEP_CHARPOLY, "charpoly": None, "factors": [], "done": 0}
    values, unsolved, reasons = {}, [], []
    try:
        with armed(limit):
            work["mode"] = "" if limit.hard else f" ({limit.mode})"
            _solve(matrix, lam, symbols, limit, work, values, unsolved, reasons)
    except DeadlineExpired as exc:
        if exc.deadline is not limit:       # an enclosing deadline: its owner handles it
            raise
        step = work["step"]
        left = work["factors"][work["done"]:]
        unsolved.extend(left)
        reasons.append(f"time budget {limit.seconds:g} s spent during the {step}"
                       + (" (stopped by the timer)" if exc.by_timer else work.get("mode", ""))
                       + (f"; {len(left) - 1} later factor(s) not attempted" if len(left) > 1 else ""))
        return Eigenvalues(values, unsolved, work["charpoly"], lam, n, symbols, "; ".join(reasons), matrix,
                           interrupted=step)
    return Eigenvalues(values, unsolved, work["charpoly"], lam, n, symbols, "; ".join(reasons), matrix)


def _solve(matrix, lam, symbols, limit, work, values, unsolved, reasons):
    """The pipeline; ``work`` records the running step and what is known, for an interruption."""
    limit.check()
    poly = matrix.charpoly(lam, simplify=lambda e: e.expand())
    expr = poly.as_expr(lam)   # a PurePoly prints its own generator: put ours back
    work.update(step=_STEP_FACTOR, charpoly=expr, factors=[(expr, 1)])
    limit.check()
    try:
        coeff, factors = factor_list(expr, lam, *symbols) if symbols else factor_list(expr, lam)
    except (PolynomialError, NotImplementedError):
        coeff, factors = 1, [(expr, 1)]
    graded = sorted(((Poly(f, lam).degree(), default_sort_key(f), f, e) for f, e in factors), key=lambda g: g[:2])
    graded = [(d, f, e) for d, _, f, e in graded if d > 0]
    factors = [(f, e) for _, f, e in graded]
    charpoly = Mul(coeff, *[f ** e for f, e in factors], evaluate=False) if factors else expr
    work.update(charpoly=charpoly, factors=factors)
    for k, (degree, factor, mult) in enumerate(graded):
        work.update(step=f"roots of a degree-{degree} factor", done=k)
        if degree > 2:
            limit.check()
        try:
            found = roots(factor, lam, cubics=True, quartics=True, quintics=False)
        except (PolynomialError, NotImplementedError):
            found = {}
        if sum(found.values()) != degree:
            unsolved.append((factor, mult))
            reasons.append(f"no closed form for a degree-{degree} factor")
        else:
            for value, m in found.items():
                values[value] = values.get(value, 0) + m * mult
    work["done"] = len(factors)
