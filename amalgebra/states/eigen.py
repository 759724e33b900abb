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
  more without rational roots, or reached after the budget ran out), with
  ``reason``;
* ``charpoly`` (factored, in ``variable``), ``degree``, ``symbols``;
* :meth:`Eigenvalues.numeric` gives all eigenvalues as floats for given
  values of the symbols (numpy on the block).

The budget (``time_budget`` seconds, default 10) is checked between factors:
a factor whose formula has started is finished.

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

import time

from sympy import Dummy, ImmutableMatrix, Mul, Poly, default_sort_key, factor_list, roots
from sympy.polys.polyerrors import PolynomialError
from sympy.printing.defaults import Printable

from .. import notation

__all__ = ["Eigenvalues", "block_eigenvalues", "DEFAULT_TIME_BUDGET"]

#: seconds; checked between factors of the characteristic polynomial
DEFAULT_TIME_BUDGET = 10.0


class Eigenvalues(Printable):
    """The eigenvalues of one block: solved ``roots`` and, explicitly, what was not solved.

    A read-only mapping eigenvalue -> multiplicity over the solved roots
    (``items()``, ``keys()``, ``values()``, ``[value]``, ``len``, iteration);
    ``complete`` is True when the multiplicities add up to the block size.  Never ``None``: an unsolved factor is listed in
    ``unsolved`` with the ``reason``.

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

    __slots__ = ("roots", "unsolved", "charpoly", "variable", "degree", "symbols", "reason", "_matrix")

    def __init__(self, values, unsolved, charpoly, variable, degree, symbols, reason, matrix):
        self.roots = dict(values)
        self.unsolved = list(unsolved)
        self.charpoly = charpoly
        self.variable = variable
        self.degree = degree
        self.symbols = tuple(symbols)
        self.reason = reason
        self._matrix = matrix

    @property
    def complete(self):
        """True when every eigenvalue is in :attr:`values`."""
        return not self.unsolved

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
        degrees = [Poly(f, self.variable).degree() for f, _ in self.unsolved]
        return (f"Eigenvalues(solved={self.roots}, unsolved factors of degree {degrees} in "
                f"{self.variable}: {self.reason})")

    __str__ = __repr__

    def _latex(self, printer, exp=None):
        return notation.eigenvalues_latex(printer, self, exp)

    def _sympystr(self, printer):
        return repr(self)


def block_eigenvalues(matrix, time_budget=DEFAULT_TIME_BUDGET):
    """The :class:`Eigenvalues` of a square SymPy matrix (see the module docstring).

    Examples
    ========

    >>> from sympy import Matrix, symbols
    >>> block_eigenvalues(Matrix([[2]])).roots
    {2: 1}
    >>> a, c = symbols("a c", real=True)
    >>> h = Matrix([[a, c], [c, -a]])
    >>> ev = block_eigenvalues(h)
    >>> sorted(ev, key=str)
    [-sqrt(a**2 + c**2), sqrt(a**2 + c**2)]

    Identity check: the eigenvalues, counted with multiplicity, add up to the trace:

    >>> sum(value * k for value, k in ev.items()) == h.trace()
    True
    """
    matrix = ImmutableMatrix(matrix)
    n = matrix.shape[0]
    lam = Dummy("lambda")
    symbols = sorted(matrix.free_symbols, key=default_sort_key)
    if n == 1:
        return Eigenvalues({matrix[0, 0]: 1}, [], lam - matrix[0, 0], lam, 1, symbols, "", matrix)
    start = time.perf_counter()
    poly = matrix.charpoly(lam, simplify=lambda e: e.expand())
    expr = poly.as_expr(lam)   # a PurePoly prints its own generator: put ours back
    try:
        coeff, factors = factor_list(expr, lam, *symbols) if symbols else factor_list(expr, lam)
    except (PolynomialError, NotImplementedError):
        coeff, factors = 1, [(expr, 1)]
    charpoly = Mul(coeff, *[f ** e for f, e in factors], evaluate=False) if factors else expr
    values, unsolved, reasons = {}, [], []
    for factor, mult in sorted(factors, key=lambda fe: (Poly(fe[0], lam).degree(), default_sort_key(fe[0]))):
        degree = Poly(factor, lam).degree()
        if degree == 0:
            continue
        if degree > 2 and time.perf_counter() - start > time_budget:
            unsolved.append((factor, mult))
            reasons.append(f"time budget {time_budget} s spent before a degree-{degree} factor")
            continue
        try:
            found = roots(factor, lam, cubics=True, quartics=True, quintics=False)
        except (PolynomialError, NotImplementedError):
            found = {}
        if sum(found.values()) != degree:
            unsolved.append((factor, mult))
            reasons.append(f"no closed form for a degree-{degree} factor")
            continue
        for value, k in found.items():
            values[value] = values.get(value, 0) + k * mult
    return Eigenvalues(values, unsolved, charpoly, lam, n, symbols, "; ".join(reasons), matrix)
