r"""Unevaluated coupling symbols: Clebsch-Gordan, 3j, 6j and 9j as SymPy expressions.

Explanation
===========

:func:`~amalgebra.coupling.cg`, :func:`~amalgebra.coupling.threej`,
:func:`~amalgebra.coupling.sixj` and :func:`~amalgebra.coupling.ninej` return
numbers.  The classes here keep the symbol itself, as written by the user, so
that it can be printed in the standard notation (see :mod:`amalgebra.notation`)
and evaluated later with ``.doit()``:

* :class:`CouplingBracket` ``(j1, m1, j2, m2, J, M)`` is
  :math:`\langle j_1 m_1; j_2 m_2 | J M\rangle` (Condon-Shortley phase);
* :class:`Coupling3j` ``(j1, j2, j3, m1, m2, m3)`` is
  :math:`\begin{pmatrix} j_1 & j_2 & j_3 \\ m_1 & m_2 & m_3\end{pmatrix}`;
* :class:`Coupling6j` ``(j1, ..., j6)`` is
  :math:`\begin{Bmatrix} j_1 & j_2 & j_3 \\ j_4 & j_5 & j_6\end{Bmatrix}`;
* :class:`Coupling9j` ``(j11, ..., j33)`` row by row is the 3 x 3 braced array.

No symmetry is applied at construction (the symbol stays as written) and
nothing is evaluated until ``doit()``; ``doit()`` calls the numeric function,
or its closed form for symbolic arguments, and leaves the symbol unevaluated
when no closed form applies (the functions raise
:class:`~amalgebra.errors.NotNumericError` then).  The arguments are validated
at construction as quantum numbers (half-integers or SymPy expressions), and
each projection must differ from its angular momentum by an integer
(:class:`~amalgebra.errors.ProjectionError` otherwise); the selection rules
(triangle, :math:`|m| \le j`, :math:`\sum m = 0`) are the business of
``doit()``, where a violation evaluates to 0.
The values are real, so ``conjugate`` returns the symbol itself.

Examples
========

>>> from sympy import S, latex
>>> from amalgebra.coupling import cg, threej
>>> from amalgebra.coupling.symbols import CouplingBracket, Coupling3j
>>> c = CouplingBracket(1, 0, S(1)/2, S(1)/2, S(3)/2, S(1)/2)
>>> c
<1, 0; 1/2, 1/2|3/2, 1/2>
>>> c.doit()                      # PDG table 1 x 1/2
sqrt(6)/3
>>> latex(Coupling3j(1, 1, 0, 0, 0, 0))
'\\begin{pmatrix} 1 & 1 & 0 \\\\ 0 & 0 & 0 \\end{pmatrix}'

An identity: a CG coefficient is :math:`(-1)^{j_1-j_2+M}\sqrt{2J+1}` times a 3j symbol.

>>> t = Coupling3j(1, S(1)/2, S(3)/2, 0, S(1)/2, -S(1)/2)
>>> c.doit() == ((-1)**(1 - S(1)/2 + S(1)/2) * 2 * t).doit() != 0
True

See Also
========

amalgebra.coupling.coefficients, amalgebra.notation

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), eqs. (3.7.3),
       ch. 6.
.. [2] NIST DLMF, ch. 34 (3j, 6j, 9j symbols).
"""

from sympy import Expr

from ..notation import CodeHooks, NotationHooks
from ..errors import NotNumericError, ProjectionError
from ..qnumbers import quantum_number
from .coefficients import cg, ninej, sixj, threej
from .floats import cg_float, ninej_float, sixj_float, threej_float

__all__ = ["CouplingBracket", "Coupling3j", "Coupling6j", "Coupling9j"]


class _CouplingSymbol(CodeHooks, Expr):
    """Shared behaviour: validated args, deferred evaluation, real value, lambdify via ``_float``."""

    __slots__ = ()
    is_commutative = True

    #: ``True`` for the arguments that are angular momenta (nonnegative), ``False`` for projections
    _kinds = ()
    _names = ()
    #: (j position, m position) of each angular momentum and its projection
    _pairs = ()

    def __new__(cls, *args):
        if len(args) != len(cls._kinds):
            raise TypeError(f"args={args!r} must be {len(cls._kinds)} quantum numbers "
                            f"({', '.join(cls._names)})")
        checked = [quantum_number(value, name, nonnegative=kind)
                   for value, name, kind in zip(args, cls._names, cls._kinds)]
        for jpos, mpos in cls._pairs:
            if (checked[jpos] - checked[mpos]).is_integer is False:
                raise ProjectionError(f"{cls._names[mpos]}={checked[mpos]} must differ from "
                                      f"{cls._names[jpos]}={checked[jpos]} by an integer")
        return Expr.__new__(cls, *checked)

    def doit(self, **hints):
        args = self.args
        if hints.get("deep", True):
            args = tuple(a.doit(**hints) for a in args)
        try:
            return self._evaluate(*args)
        except NotNumericError:
            return self.func(*args)

    def _eval_is_extended_real(self):
        return True

    def _eval_is_finite(self):
        return True  # every coupling coefficient lies in [-1, 1]

    def _eval_conjugate(self):
        return self

    def _eval_adjoint(self):
        return self

    def _eval_transpose(self):
        return self


class CouplingBracket(NotationHooks, _CouplingSymbol):
    r"""The unevaluated Clebsch-Gordan coefficient :math:`\langle j_1 m_1; j_2 m_2 | J M\rangle`.

    Explanation
    ===========

    Condon-Shortley phase convention, as :func:`~amalgebra.coupling.cg`,
    which ``doit()`` calls.  Printed ``<j1, m1; j2, m2|J, M>`` (str) and
    :math:`\left\langle j_1, m_1; j_2, m_2 \middle| J, M \right\rangle` (LaTeX).

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.coupling.symbols import CouplingBracket
    >>> j, m = symbols("j m")
    >>> s = CouplingBracket(j, m, 0, 0, j, m)
    >>> s, s.func(*s.args) == s
    (<j, m; 0, 0|j, m>, True)
    >>> s.doit()               # coupling to j2 = 0 is the identity
    1

    Parameters
    ==========

    j1, m1, j2, m2, J, M : numbers, strings such as ``"3/2"``, or SymPy expressions

    See Also
    ========

    amalgebra.coupling.cg, Coupling3j
    """

    __slots__ = ()
    _names = ("j1", "m1", "j2", "m2", "J", "M")
    _kinds = (True, False, True, False, True, False)
    _pairs = ((0, 1), (2, 3), (4, 5))
    _evaluate = staticmethod(cg)
    _float_kernel = staticmethod(cg_float)

    _notation_key = "cg_symbol"


class _ArraySymbol(NotationHooks, _CouplingSymbol):
    __slots__ = ()

    _notation_key = "array_symbol"


class Coupling3j(_ArraySymbol):
    r"""The unevaluated Wigner 3j symbol :math:`\begin{pmatrix} j_1 & j_2 & j_3 \\ m_1 & m_2 & m_3\end{pmatrix}`.

    Explanation
    ===========

    ``doit()`` calls :func:`~amalgebra.coupling.threej`.  Printed
    ``3j(j1, j2, j3; m1, m2, m3)`` (str), a parenthesised 2 x 3 array (pretty
    and LaTeX ``pmatrix``).

    Examples
    ========

    >>> from amalgebra.coupling.symbols import Coupling3j
    >>> t = Coupling3j(1, 1, 0, 0, 0, 0)
    >>> t, t.doit()            # (-1)^(j-m)/sqrt(2j+1), DLMF 34.3.1
    (3j(1, 1, 0; 0, 0, 0), -sqrt(3)/3)

    Parameters
    ==========

    j1, j2, j3, m1, m2, m3 : numbers, strings such as ``"3/2"``, or SymPy expressions

    See Also
    ========

    amalgebra.coupling.threej, CouplingBracket
    """

    __slots__ = ()
    _names = ("j1", "j2", "j3", "m1", "m2", "m3")
    _kinds = (True, True, True, False, False, False)
    _pairs = ((0, 3), (1, 4), (2, 5))
    _evaluate = staticmethod(threej)
    _float_kernel = staticmethod(threej_float)
    _notation_prefix = "3j"
    _notation_delims = ("(", ")")


class Coupling6j(_ArraySymbol):
    r"""The unevaluated Wigner 6j symbol :math:`\begin{Bmatrix} j_1 & j_2 & j_3 \\ j_4 & j_5 & j_6\end{Bmatrix}`.

    Explanation
    ===========

    ``doit()`` calls :func:`~amalgebra.coupling.sixj`.  Printed
    ``6j{j1, j2, j3; j4, j5, j6}`` (str), a braced 2 x 3 array (pretty and
    LaTeX ``Bmatrix``).

    Examples
    ========

    >>> from amalgebra.coupling.symbols import Coupling6j
    >>> s = Coupling6j(1, 1, 1, 1, 1, 1)
    >>> s, s.doit()            # 1/6, from memory
    (6j{1, 1, 1; 1, 1, 1}, 1/6)

    Parameters
    ==========

    j1, j2, j3, j4, j5, j6 : numbers, strings such as ``"3/2"``, or SymPy expressions

    See Also
    ========

    amalgebra.coupling.sixj, Coupling9j
    """

    __slots__ = ()
    _names = ("j1", "j2", "j3", "j4", "j5", "j6")
    _kinds = (True,) * 6
    _evaluate = staticmethod(sixj)
    _float_kernel = staticmethod(sixj_float)
    _notation_prefix = "6j"
    _notation_delims = ("{", "}")


class Coupling9j(_ArraySymbol):
    r"""The unevaluated Wigner 9j symbol, arguments row by row, a braced 3 x 3 array.

    Explanation
    ===========

    ``doit()`` calls :func:`~amalgebra.coupling.ninej`.  Printed
    ``9j{j11, j12, j13; j21, j22, j23; j31, j32, j33}`` (str), a braced
    3 x 3 array (pretty and LaTeX ``Bmatrix``).

    Examples
    ========

    >>> from amalgebra.coupling.symbols import Coupling9j
    >>> n = Coupling9j(1, 1, 0, 1, 1, 0, 0, 0, 0)
    >>> n, n.doit()            # 9j with a zero row reduces to a 6j: 1/3
    (9j{1, 1, 0; 1, 1, 0; 0, 0, 0}, 1/3)

    Parameters
    ==========

    j11, j12, j13, j21, j22, j23, j31, j32, j33 : numbers, strings, or SymPy expressions

    See Also
    ========

    amalgebra.coupling.ninej, Coupling6j
    """

    __slots__ = ()
    _names = ("j11", "j12", "j13", "j21", "j22", "j23", "j31", "j32", "j33")
    _kinds = (True,) * 9
    _evaluate = staticmethod(ninej)
    _float_kernel = staticmethod(ninej_float)
    _notation_prefix = "9j"
    _notation_delims = ("{", "}")


#: The former class names (deprecated in amalgebra 0.2.0: they coincided with another
#: system's built-in function names) and their replacements; old pickles load through them.
_RENAMED = {"ClebschGordanSymbol": "CouplingBracket", "ThreeJSymbol": "Coupling3j",
           "SixJSymbol": "Coupling6j", "NineJSymbol": "Coupling9j"}


def _renamed_class(name, stacklevel=3):
    """The class behind a former name, with a ``DeprecationWarning`` naming the replacement."""
    import warnings

    new = _RENAMED[name]
    warnings.warn(f"{name} is deprecated since amalgebra 0.2.0; use {new} (the same class)",
                  DeprecationWarning, stacklevel=stacklevel)
    return globals()[new]


def __getattr__(name):
    if name in _RENAMED:
        return _renamed_class(name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
