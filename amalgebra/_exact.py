r"""Exact radicals and the Condon-Shortley ladder factor, written once for the whole package.

Explanation
===========

The ladder factor :math:`N_d(j, m)` is the amplitude of :math:`J_\pm^{|d|}`
between :math:`|j m\rangle` and :math:`|j, m+d\rangle` (Condon-Shortley phase,
:math:`\hbar = 1`):

.. math::

    N_d(j, m) = \prod_{k=0}^{d-1} \sqrt{(j-m-k)(j+m+k+1)} \ (d \ge 0), \qquad
    N_{-d}(j, m) = \prod_{k=0}^{d-1} \sqrt{(j+m-k)(j-m+k+1)} .

:func:`ladder_radicand` gives the product under the root as a ``Fraction``
(0 when :math:`m + d` leaves :math:`[-j, j]`), :func:`condon_shortley` the
exact SymPy value (also for symbolic :math:`j, m`), :func:`ladder_float`
the float and :func:`ladder_float_array` the floats for a numpy array of
:math:`m` (the vectorised read-off of :mod:`amalgebra.matrices.explicit`).  :func:`sqrt_of_product` takes the square root of a product of
small nonnegative integers by factorising each factor separately, so the
square part is pulled out without factorising the product.

Every route of the package that needs the ladder factor (operator action on
kets, explicit matrices) calls this module; the numpy reference matrices of
:mod:`amalgebra.testing.reference` deliberately write it again, as an
independent oracle.

Examples
========

>>> from amalgebra._exact import condon_shortley, ladder_radicand, sqrt_of_product
>>> condon_shortley(1, -1, 2)          # <1 1|J+^2|1 -1> = sqrt(2) sqrt(2)
2
>>> ladder_radicand(1, 1, 1)           # J+ kills |1 1>
Fraction(0, 1)
>>> sqrt_of_product([2, 3, 4])
2*sqrt(6)
"""

from fractions import Fraction
from functools import lru_cache

from sympy import Add, Expr, Integer, Mul, Pow, S, sqrt

from .errors import OperatorError

__all__ = ["sqrt_of_product", "exact_sum", "condon_shortley", "boson_ladder", "ladder_radicand", "ladder_float",
           "ladder_float_array", "clear_caches"]


@lru_cache(maxsize=8192)
def _factor_cached(n):
    """Prime factorisation of a positive int as a tuple of (p, e) (trial division; n is ~2j)."""
    out = []
    p = 2
    while p * p <= n:
        e = 0
        while n % p == 0:
            n //= p
            e += 1
        if e:
            out.append((p, e))
        p += 1 if p == 2 else 2
    if n > 1:
        out.append((n, 1))
    return tuple(out)


def sqrt_of_product(factors):
    """Exact ``sqrt(prod(factors))`` for nonnegative Python ints, as a SymPy number.

    >>> sqrt_of_product([6, 10, 15])
    30
    >>> sqrt_of_product([0, 7])
    0
    """
    exps = {}
    for n in factors:
        if n == 0:
            return S.Zero
        if n < 0:
            raise OperatorError(f"factor={n} must be >= 0 under a Condon-Shortley square root")
        for p, e in _factor_cached(n):
            exps[p] = exps.get(p, 0) + e
    outer, inner = 1, 1
    for p, e in exps.items():
        outer *= p ** (e // 2)
        if e % 2:
            inner *= p
    if inner == 1:
        return Integer(outer)
    return Integer(outer) * Pow(Integer(inner), S.Half, evaluate=False)


def _ladder_ints(tj, tm, d):
    """The integer factors under the root of N_d for doubled ``tj``, ``tm``; None when m + d leaves the range."""
    ints = []
    if d > 0:
        for k in range(d):
            ints.append((tj - tm - 2 * k) // 2)
            ints.append((tj + tm + 2 * k + 2) // 2)
    else:
        for k in range(-d):
            ints.append((tj + tm - 2 * k) // 2)
            ints.append((tj - tm + 2 * k + 2) // 2)
    if any(n <= 0 for n in ints):
        return None
    return ints


def ladder_radicand(j, m, d):
    """The product under the square root of :math:`N_d(j, m)` as a ``Fraction`` (numeric j, m).

    >>> ladder_radicand("3/2", "-3/2", 3)     # (3*1)(2*2)(1*3)
    Fraction(36, 1)
    """
    tj, tm = int(2 * Fraction(j)), int(2 * Fraction(m))
    ints = _ladder_ints(tj, tm, d)
    if ints is None:
        return Fraction(0)
    value = 1
    for n in ints:
        value *= n
    return Fraction(value)


def ladder_float(j, m, d):
    """:math:`N_d(j, m)` as a float (numeric j, m).

    >>> ladder_float(1, 0, 1) == 2 ** 0.5
    True
    """
    return float(ladder_radicand(j, m, d)) ** 0.5


def ladder_float_array(j, m, d):
    """:math:`N_d(j, m)` as floats for a float ``j`` and a numpy array ``m`` (0 where ``m + d`` leaves the range).

    The same product as :func:`ladder_radicand`, in numpy (imported here, on first use only).

    >>> import numpy as np
    >>> ladder_float_array(1.0, np.array([1.0, 0.0, -1.0]), 1).tolist() == [0.0, 2 ** 0.5, 2 ** 0.5]
    True
    """
    import numpy as np

    radicand = np.ones(np.shape(m))
    for k in range(abs(d)):
        if d > 0:
            radicand = radicand * (j - m - k) * (j + m + k + 1)
        else:
            radicand = radicand * (j + m - k) * (j - m + k + 1)
    # a factor is exactly 0 where m + d leaves [-j, j]; later ones may be negative, the product stays 0
    return np.sqrt(np.maximum(radicand, 0.0))


def _pair(j, m):
    return (S(j) if not isinstance(j, Expr) else j), (S(m) if not isinstance(m, Expr) else m)


def condon_shortley(j, m, d):
    r"""The factor :math:`N_d(j, m)`: ``<j, m+d| J_+^d |j m>`` for ``d >= 0``, ``<j, m+d| J_-^{|d|} |j m>`` else.

    Exact for numeric ``j``, ``m`` (0 when ``m + d`` leaves the range), a
    product of square roots otherwise (valid for kets with ``|m| <= j`` and
    ``|m + d| <= j``).

    >>> from sympy import Symbol
    >>> condon_shortley(Symbol("j"), Symbol("m"), -1)
    sqrt(j + m)*sqrt(j - m + 1)
    """
    if d == 0:
        return S.One
    j, m = _pair(j, m)
    if j.is_Rational and m.is_Rational:
        ints = _ladder_ints(int(2 * j), int(2 * m), d)
        return S.Zero if ints is None else sqrt_of_product(ints)
    if d > 0:
        return Mul(*[sqrt(j - m - k) * sqrt(j + m + k + 1) for k in range(d)])
    return Mul(*[sqrt(j + m - k) * sqrt(j - m + k + 1) for k in range(-d)])


def boson_ladder(n, d):
    r"""The boson ladder factor: ``<n+d| a^dagger^d |n>`` for ``d >= 0``, ``<n+d| a^|d| |n>`` for ``d < 0``.

    :math:`\sqrt{(n+1)\cdots(n+d)}` and :math:`\sqrt{n(n-1)\cdots(n-|d|+1)}`
    (:math:`a^\dagger|n\rangle = \sqrt{n+1}\,|n+1\rangle`,
    :math:`a|n\rangle = \sqrt{n}\,|n-1\rangle`).  Exact for a numeric
    occupation (0 below the vacuum), a product of square roots otherwise (valid
    for :math:`n + d \ge 0`).  The one boson ladder factor of the package.

    >>> from sympy import Symbol
    >>> boson_ladder(2, 2), boson_ladder(1, -2), boson_ladder(Symbol("n"), -1)
    (2*sqrt(3), 0, sqrt(n))
    """
    if d == 0:
        return S.One
    n = S(n)
    if n.is_Integer:
        if n + d < 0:
            return S.Zero
        lo, hi = (int(n) + 1, int(n) + d) if d > 0 else (int(n) + d + 1, int(n))
        return sqrt_of_product(range(lo, hi + 1))
    if d > 0:
        return Mul(*[sqrt(n + k) for k in range(1, d + 1)])
    return Mul(*[sqrt(n - k) for k in range(-d)])


def exact_sum(terms):
    """``Add(*terms)`` in one normal form: several terms, or a product or power of a sum, multiplied out.

    A state-level result gathered over basis pairs (a coupled ket expands into
    product kets, each overlap a product of coefficients) would otherwise keep
    products and powers of sums of radicals, so that the same value printed in
    different shapes; multiplied out, SymPy collects equal radicals and a
    normalised superposition gives 1.

    >>> from sympy import sqrt
    >>> exact_sum([(sqrt(6)/6 + sqrt(3)/3)**2, (sqrt(3)/3 - sqrt(6)/6)**2])
    1
    """
    total = Add(*terms)
    if len(terms) > 1 or (total.is_Mul or total.is_Pow) and any(arg.is_Add for arg in total.args):
        return total.expand()
    return total


def clear_caches():
    """Empty the factorisation cache.

    >>> clear_caches()
    """
    _factor_cached.cache_clear()
