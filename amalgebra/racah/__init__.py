r"""Racah algebra: sums over projections of coupling coefficients reduced to 6j and 9j symbols.

Public map
==========

Building sums (ordinary ``sympy.Sum`` objects with full ranges)
    :func:`projection_sum`, :func:`momentum_sum` (:mod:`amalgebra.racah.sums`)
Reducing them by the graphical method
    :func:`reduce_racah_sum` -> :class:`Reduction` (:mod:`amalgebra.racah.reduce`;
    graph in :mod:`~amalgebra.racah.network`, identities and exact phases in
    :mod:`~amalgebra.racah.matching`, rules in :mod:`~amalgebra.racah.rules`)
Checking a reduction by direct summation at random admissible values (and the exact value of a sum)
    :func:`check_reduction` -> :class:`ReductionCheck`, :func:`direct_value` (:mod:`amalgebra.racah.check`)
Derivation steps for the LaTeX report
    :func:`reduction_steps` (:mod:`amalgebra.racah.steps`)
The triangle condition as a SymPy function
    :class:`TriangleDelta`

Examples
========

Racah's sum rule (Edmonds 1957, eq. 6.2.11; from memory), derived:

>>> from sympy import symbols
>>> from amalgebra.coupling import Coupling6j as SJ
>>> from amalgebra.racah import momentum_sum, reduce_racah_sum
>>> a, b, c, d, p, q, x = symbols("a b c d p q x")
>>> s = momentum_sum((-1)**(p + q + x) * (2*x + 1) * SJ(a, b, x, c, d, p) * SJ(a, b, x, d, c, q), x)
>>> r = reduce_racah_sum(s)
>>> r.complete, r.check(points=2).passed
(True, True)
"""

from .check import ReductionCheck, check_reduction, direct_value
from .reduce import Reduction, ReductionStep, reduce_racah_sum
from .steps import reduction_steps
from .sums import momentum_sum, projection_sum
from .triangle import TriangleDelta

__all__ = ["projection_sum", "momentum_sum", "reduce_racah_sum", "Reduction", "ReductionStep",
           "check_reduction", "ReductionCheck", "direct_value", "reduction_steps", "TriangleDelta"]
