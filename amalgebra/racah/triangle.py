r"""The triangle condition :math:`\Delta(a, b, c)` as a SymPy function.

Explanation
===========

:math:`\Delta(a,b,c)` is 1 when :math:`a, b, c` can couple
(:math:`|a-b| \le c \le a+b` and :math:`a+b+c` an integer) and 0 otherwise.
Orthogonality of 3j symbols leaves such a factor behind
(:math:`\sum_{m_1 m_2} (\ldots)(\ldots) = \delta_{j j'}\delta_{m m'}\Delta(j_1 j_2 j)/(2j+1)`);
the reducer drops it when a 3j, 6j or 9j symbol of the result already vanishes
outside the triangle, and keeps it otherwise, so no condition is lost.

It evaluates only on numbers (``eval`` decides *when*, style habit 3) and is
symmetric, so its arguments are sorted at construction.

Examples
========

>>> from sympy import S, symbols
>>> from amalgebra.racah.triangle import TriangleDelta
>>> TriangleDelta(1, 1, 2), TriangleDelta(1, 1, 3), TriangleDelta(S(1)/2, 1, 1)
(1, 0, 0)
>>> a, b, c = symbols("a b c")
>>> TriangleDelta(c, a, b)
TriangleDelta(a, b, c)
"""

from sympy import Expr, Integer, default_sort_key
from sympy.core.sympify import _sympify

from ..notation import NotationHooks
from ..qnumbers import is_numeric, triangle

__all__ = ["TriangleDelta"]


class TriangleDelta(NotationHooks, Expr):
    r""":math:`\Delta(a,b,c)`: 1 when :math:`(a, b, c)` satisfy the triangle rule, else 0.

    Explanation
    ===========

    Evaluates to ``1`` or ``0`` as soon as all three arguments are numbers
    (substitution included); otherwise it stays, with its arguments in sort order
    (it is symmetric).  Printed ``TriangleDelta(a, b, c)`` (str) and as the textbooks' :math:`\Delta(a, b, c)`
    (pretty and LaTeX).

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.racah.triangle import TriangleDelta
    >>> j = symbols("j")
    >>> TriangleDelta(j, j, 0).subs(j, 3)
    1
    """

    __slots__ = ()
    _notation_key = "triangle_delta"
    is_commutative = True

    def __new__(cls, a, b, c):
        args = [_sympify(v) for v in (a, b, c)]   # safe: strict conversion of numbers and SymPy objects, never text
        if all(is_numeric(v) for v in args):
            return Integer(1 if triangle(*args) else 0)
        return Expr.__new__(cls, *sorted(args, key=default_sort_key))

    def doit(self, **hints):
        args = self.args
        if hints.get("deep", True):
            args = [a.doit(**hints) for a in args]
        return self.func(*args)

    def _eval_is_integer(self):
        return True

    def _eval_is_nonnegative(self):
        return True
