r"""Correctly rounded floats of coupling coefficients, computed from the exact values.

Explanation
===========

Each function evaluates the exact canonical value ``n/d*sqrt(s)`` (the same
kernels and caches as :mod:`amalgebra.coupling.coefficients`) and rounds it to
the nearest double: with ``A/B = n^2 s / d^2`` it takes
``r = isqrt(floor(A 4^k / B))`` with ``k`` chosen so that ``r`` has at least 60
bits, appends a sticky bit when the square root is inexact, and lets Python's
correctly rounded integer division produce the double.  The result is the
double nearest to the exact value (round half to even), for every ``j``, with
no error growth; the conventions are those of the exact functions.

Examples
========

>>> from amalgebra.coupling import threej_float, sixj_float, ninej_float, cg_float
>>> threej_float(1, 1, 0, 1, -1, 0)    # 1/sqrt(3) = 0.57735026918962576450...
0.5773502691896257
>>> 1 / 3 ** 0.5                          # two roundings land on the wrong neighbour
0.5773502691896258
>>> sixj_float(1, 1, 1, 1, 1, 1)
0.16666666666666666
>>> cg_float("1/2", "1/2", "1/2", "-1/2", 1, 0) == 0.5 ** 0.5     # sqrt(1/2) correctly rounded
True
>>> ninej_float(1, 1, 0, 1, 1, 0, 0, 0, 0)
0.3333333333333333

References
==========

.. [1] IEEE 754-2008, section 4.3 (round to nearest, ties to even).
"""

from math import isqrt

from .coefficients import (cg_doubled, ninej_doubled, read_cg, read_js, read_ninej, read_threej,
                           sixj_doubled, threej_doubled)

__all__ = ["triple_to_float", "cg_float", "threej_float", "sixj_float", "ninej_float"]


def triple_to_float(n, d, s):
    """The double nearest to ``n/d*sqrt(s)`` (ints, ``d, s > 0``).

    >>> triple_to_float(1, 1, 2) == 2 ** 0.5
    True
    >>> triple_to_float(-3, 7, 1) == -3 / 7
    True
    """
    if n == 0:
        return 0.0
    a, b = n * n * s, d * d
    k = max(0, 61 - (a.bit_length() - b.bit_length()) // 2)
    num = a << (2 * k)
    q, rem = divmod(num, b)
    r = isqrt(q)
    if rem or r * r != q:
        r, k = 2 * r + 1, k + 1          # sticky bit: strictly between r and r + 1
    value = r / (1 << k)                  # int / int is correctly rounded in CPython
    return -value if n < 0 else value


def cg_float(j1, m1, j2, m2, J, M):
    """Correctly rounded float of the Clebsch-Gordan coefficient <j1 m1 j2 m2|J M>.

    Examples
    ========

    >>> from sympy import sqrt
    >>> cg_float(1, 0, "1/2", "1/2", "3/2", "1/2") == float(sqrt(2) / sqrt(3))   # PDG table 1 x 1/2
    True

    See Also
    ========

    amalgebra.coupling.coefficients.cg
    """
    return triple_to_float(*cg_doubled(*read_cg(j1, m1, j2, m2, J, M)))


def threej_float(j1, j2, j3, m1, m2, m3):
    """Correctly rounded float of the 3j symbol (j1 j2 j3; m1 m2 m3).

    Examples
    ========

    >>> threej_float(1, 1, 0, 0, 0, 0) == -(3 ** -0.5)   # (-1)^(j-m)/sqrt(2j+1), DLMF 34.3.1
    True

    See Also
    ========

    amalgebra.coupling.coefficients.threej
    """
    return triple_to_float(*threej_doubled(*read_threej(j1, j2, j3, m1, m2, m3)))


def sixj_float(j1, j2, j3, j4, j5, j6):
    """Correctly rounded float of the 6j symbol {j1 j2 j3; j4 j5 j6}.

    Examples
    ========

    >>> sixj_float(1, 1, 1, 1, 1, 1) == 1 / 6
    True

    See Also
    ========

    amalgebra.coupling.coefficients.sixj
    """
    return triple_to_float(*sixj_doubled(*read_js((j1, j2, j3, j4, j5, j6))))


def ninej_float(j11, j12, j13, j21, j22, j23, j31, j32, j33):
    """Correctly rounded float of the 9j symbol, arguments row by row.

    Examples
    ========

    >>> ninej_float(1, 1, 0, 1, 1, 0, 0, 0, 0) == 1 / 3    # a zero row reduces it to a 6j
    True

    See Also
    ========

    amalgebra.coupling.coefficients.ninej
    """
    return triple_to_float(*ninej_doubled(*read_ninej((j11, j12, j13, j21, j22, j23, j31, j32, j33))))
