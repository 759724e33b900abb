r"""Building Racah sums as ordinary SymPy ``Sum`` objects with their full ranges.

Explanation
===========

A projection :math:`m` of a line :math:`j` runs over :math:`-j, -j+1, \ldots, j`;
an intermediate momentum :math:`x` of a triad :math:`(a\,b\,x)` over
:math:`|a-b|, \ldots, a+b`.  :func:`projection_sum` and :func:`momentum_sum`
find the line or triad in the summand and write the ``Sum`` with those limits,
so the user does not have to; the result is a plain ``sympy.Sum`` (it prints,
substitutes and evaluates with ``doit()`` at numeric values).

Examples
========

>>> from sympy import symbols
>>> from amalgebra.coupling import Coupling6j, Coupling3j
>>> from amalgebra.racah import momentum_sum, projection_sum
>>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
>>> projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2)
Sum(3j(a, b, c; m1, m2, m3)**2, (m1, -a, a), (m2, -b, b))
>>> d, e, x = symbols("d e x")
>>> momentum_sum((2*x + 1) * Coupling6j(a, b, x, c, d, e)**2, x)
Sum((2*x + 1)*6j{a, b, x; c, d, e}**2, (x, Abs(a - b), a + b))
"""

from sympy import Sum, preorder_traversal

from ..coupling import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from ..errors import RacahSumError

__all__ = ["projection_sum", "momentum_sum"]


def _line_of(expr, m):
    for node in preorder_traversal(expr):
        if isinstance(node, Coupling3j):
            for k in range(3):
                if node.args[3 + k] == m or node.args[3 + k] == -m:
                    return node.args[k]
        elif isinstance(node, CouplingBracket):
            for jpos, mpos in ((0, 1), (2, 3), (4, 5)):
                if node.args[mpos] == m or node.args[mpos] == -m:
                    return node.args[jpos]
    raise RacahSumError(f"m={m} must be a projection (alone, up to sign) of a 3j or CG symbol "
                        "of the summand")


def projection_sum(term, *ms):
    """``Sum(term, (m, -j, j), ...)`` with ``j`` the line of each projection ``m``.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> s = projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2)
    >>> s.limits
    ((m1, -a, a), (m2, -b, b))

    At numbers it is an ordinary sum: :math:`1/(2c+1)` (Edmonds 1957, eq. 3.7.8; from memory):

    >>> s.subs({a: 1, b: 1, c: 1, m3: 0}).doit()
    1/3
    """
    return Sum(term, *[(m, -_line_of(term, m), _line_of(term, m)) for m in ms])


def _triad_of(expr, x):
    for node in preorder_traversal(expr):
        triads = ()
        if isinstance(node, Coupling3j):
            triads = ((node.args[0], node.args[1], node.args[2]),)
        elif isinstance(node, CouplingBracket):
            triads = ((node.args[0], node.args[2], node.args[4]),)
        elif isinstance(node, Coupling6j):
            t = node.args
            triads = tuple(tuple(t[i] for i in tri) for tri in ((0, 1, 2), (0, 4, 5), (3, 1, 5), (3, 4, 2)))
        elif isinstance(node, Coupling9j):
            t = node.args
            triads = tuple(tuple(t[i] for i in tri) for tri in
                           ((0, 1, 2), (3, 4, 5), (6, 7, 8), (0, 3, 6), (1, 4, 7), (2, 5, 8)))
        for tri in triads:
            if x in tri:
                rest = list(tri)
                rest.remove(x)
                return rest
    raise RacahSumError(f"x={x} must be a momentum of a coupling symbol of the summand")


def momentum_sum(term, *xs):
    """``Sum(term, (x, |a-b|, a+b), ...)`` with ``(a b x)`` the first triad holding ``x``.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling6j
    >>> a, b, c, d, e, x = symbols("a b c d e x")
    >>> s = momentum_sum((2*x + 1) * Coupling6j(a, b, x, c, d, e)**2, x)
    >>> s.limits
    ((x, Abs(a - b), a + b),)

    Orthogonality of 6j symbols gives :math:`1/(2e+1)` (Edmonds 1957, eq. 6.2.9; from memory):

    >>> s.subs({a: 1, b: 1, c: 1, d: 1, e: 1}).doit()
    1/3
    """
    from sympy import Abs

    limits = []
    for x in xs:
        a, b = _triad_of(term, x)
        limits.append((x, Abs(a - b), a + b))
    return Sum(term, *limits)
