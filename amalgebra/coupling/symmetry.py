r"""Canonical forms of 3j, 6j and 9j symbols under their symmetry groups, and the result caches.

Explanation
===========

Each symbol is reduced to a canonical key plus a phase, and only canonical
values are computed and cached, so every symmetric variant of a symbol that was
evaluated once is a cache hit.

* 3j (72 symmetries): the Regge square
  ``R = [[-j1+j2+j3, j1-j2+j3, j1+j2-j3], [j1-m1, j2-m2, j3-m3], [j1+m1, j2+m2, j3+m3]]``
  is invariant under transposition and picks up ``(-1)^(j1+j2+j3)`` under an
  odd permutation of its rows or of its columns (Regge 1958; DLMF §34.3(ii)).
* 6j (144 symmetries): the value depends only on the multiset of the four
  triad sums ``alpha`` and the multiset of the three sums ``beta`` of four j's
  (the Regge 4x3 array ``beta_j - alpha_i`` under row and column permutations,
  no phase), so the key is the two sorted tuples.
* 9j (72 symmetries): the 3x3 array is invariant under transposition and picks
  up ``(-1)^S`` (``S`` the sum of the nine j) under odd row or column permutations.

For the 3j the key is the smallest entry of the Regge square and the smallest
image of the 2x2 block left by its row and column (see :func:`threej_key`);
for the 9j it is the smallest column-major tuple over the group, found by
trying only the orientations and row orders that put the smallest entry in the
first row (at most 12, usually 4).

Caches are bounded LRU caches (``functools.lru_cache``) of canonical
triples ``(n, d, s)`` (meaning ``n/d*sqrt(s)``): 3j and 6j hold at most
:data:`CACHE_SIZE` entries each, 9j at most :data:`NINEJ_CACHE_SIZE`.
The 6j cache is keyed by the flat sorted 7-tuple ``(a1, a2, a3, a4, e1, e2, e3)``.

Thread safety: the caches are ``functools.lru_cache`` objects (safe to read, fill
and clear from several threads); the kernels' prime and factorial tables are
kept across :func:`clear_coupling_caches` and grow under a lock
(:mod:`amalgebra.coupling.kernels`), so clearing while other threads evaluate
never changes a value.

Examples
========

>>> from amalgebra.coupling.symmetry import threej_key, sixj_key
>>> key, odd = threej_key(2, 2, 2, 2, -2, 0)          # (1 1 1; 1 -1 0), doubled
>>> flipped, odd_flipped = threej_key(2, 2, 2, -2, 2, 0)   # all m -> -m: one row swap
>>> key == flipped, odd != odd_flipped
(True, True)
>>> sixj_key(2, 2, 2, 2, 2, 2)
((3, 3, 3, 3), (4, 4, 4))

References
==========

.. [1] T. Regge, Nuovo Cimento 10, 544 (1958) and 11, 116 (1959).
.. [2] NIST DLMF, sections 34.3(ii), 34.4, 34.6 (symmetries of 3j, 6j, 9j).
"""

from functools import lru_cache

from . import kernels
from .kernels import ninej_kernel, threej_kernel

__all__ = [
    "CACHE_SIZE",
    "NINEJ_CACHE_SIZE",
    "threej_key",
    "sixj_key",
    "ninej_key",
    "threej_triple",
    "sixj_triple",
    "ninej_triple",
    "clear_coupling_caches",
    "coupling_cache_info",
]

CACHE_SIZE = 1 << 15
NINEJ_CACHE_SIZE = 1 << 12

# Row orders with their parity (True = odd permutation).
_ORDERS = (((0, 1, 2), False), ((0, 2, 1), True), ((1, 0, 2), True),
           ((1, 2, 0), False), ((2, 0, 1), False), ((2, 1, 0), True))


def _canonical_square(rows):
    """Smallest column-major form of a 3x3 array under row/column permutations and
    transposition; returns ``(key, odd)`` with ``odd`` the parity of the permutations used."""
    low = min(min(rows[0]), min(rows[1]), min(rows[2]))
    best = best_rows = None
    best_odd = False
    for mat in (rows, tuple(zip(*rows))):
        for (i0, i1, i2), odd in _ORDERS:
            first = mat[i0]
            if low not in first:
                continue
            ordered = (first, mat[i1], mat[i2])
            key = tuple(sorted(zip(*ordered)))
            if best is None or key < best:
                best, best_rows, best_odd = key, ordered, odd
    columns = tuple(zip(*best_rows))
    c0, c1, c2 = (columns.index(col) for col in best)
    if c0 == c1 or c1 == c2 or c0 == c2:
        # Equal columns: the value is symmetric or zero under the swap, parity irrelevant.
        return best, best_odd
    column_odd = (c0 > c1) + (c0 > c2) + (c1 > c2)
    return best, best_odd ^ bool(column_odd & 1)


_OTHERS = ((1, 2), (0, 2), (0, 1))


def threej_key(tj1, tj2, tj3, tm1, tm2, tm3):
    """``(key, odd)`` for a 3j with doubled arguments that obeys the selection rules.

    The symbol equals ``(-1)^(j1+j2+j3)`` (when ``odd``) times the canonical one.
    Because every row and column of the Regge square sums to ``J = j1+j2+j3``,
    the square is fixed by its smallest entry ``low`` and the 2x2 block left
    when the row and column of ``low`` are struck out.  The group elements that
    move a given position of ``low`` to the corner are the 8 symmetries of that
    block (swap its rows, swap its columns, transpose), so the key is the
    smallest ``(low, block)`` over those (only one position of ``low`` is
    usually present).
    """
    square = ((tj2 + tj3 - tj1) >> 1, (tj1 - tj2 + tj3) >> 1, (tj1 + tj2 - tj3) >> 1,
              (tj1 - tm1) >> 1, (tj2 - tm2) >> 1, (tj3 - tm3) >> 1,
              (tj1 + tm1) >> 1, (tj2 + tm2) >> 1, (tj3 + tm3) >> 1)
    low = min(square)
    candidates = []
    position = -1
    for _ in range(square.count(low)):
        position = square.index(low, position + 1)
        r, c = divmod(position, 3)
        r1, r2 = _OTHERS[r]
        c1, c2 = _OTHERS[c]
        p, q = square[3 * r1 + c1], square[3 * r1 + c2]
        u, v = square[3 * r2 + c1], square[3 * r2 + c2]
        even, odd = (r + c) & 1, (r + c + 1) & 1
        # the 8 images of the block under row swap, column swap and transpose, with parity
        candidates += ((p, q, u, v, even), (u, v, p, q, odd), (q, p, v, u, odd), (v, u, q, p, even),
                       (p, u, q, v, even), (u, p, v, q, odd), (q, v, p, u, odd), (v, q, u, p, even))
    p, q, u, v, parity = min(candidates)
    return (low, p, q, u, v), bool(parity)


def sixj_key(tj1, tj2, tj3, tj4, tj5, tj6):
    """Canonical key ``(sorted alpha, sorted beta)`` of the 6j {j1 j2 j3; j4 j5 j6} (doubled)."""
    alpha = sorted(((tj1 + tj2 + tj3) // 2, (tj1 + tj5 + tj6) // 2,
                    (tj4 + tj2 + tj6) // 2, (tj4 + tj5 + tj3) // 2))
    beta = sorted(((tj1 + tj2 + tj4 + tj5) // 2, (tj2 + tj3 + tj5 + tj6) // 2,
                   (tj3 + tj1 + tj6 + tj4) // 2))
    return tuple(alpha), tuple(beta)


def ninej_key(*tj):
    """``(key, odd)`` for a 9j given row by row (doubled values)."""
    return _canonical_square((tj[0:3], tj[3:6], tj[6:9]))


@lru_cache(maxsize=CACHE_SIZE)
def _threej_canonical(key):
    if kernels._fallback_pending:
        kernels.warn_fallback_once()
    low, p, q, u, v = key
    big = p + q + u + v - low
    # Regge square [[low, J-p-u, J-q-v], [J-p-q, p, q], [J-u-v, u, v]]; a column is
    # (excess, j - m, j + m), so 2j = (j - m) + (j + m) and 2m = (j + m) - (j - m).
    return threej_kernel(2 * big - p - q - u - v, p + u, q + v, p + q - u - v, u - p, v - q)


def _sixj_python(key):
    # only without the compiled module (see below), so straight to the pure-Python kernel
    if kernels._fallback_pending:
        kernels.warn_fallback_once()
    return kernels.sixj_from_key_python(key)


if kernels._compiled is not None:
    # the cache wraps the compiled function directly (no Python frame on a miss); it calls the
    # pure-Python kernel itself beyond its table
    kernels._compiled.register_python_sixj(kernels.sixj_kernel_sorted_python)
    _sixj_canonical = lru_cache(maxsize=CACHE_SIZE)(kernels._compiled.sixj_from_key)
elif kernels._fallback_pending:
    _sixj_canonical = lru_cache(maxsize=CACHE_SIZE)(_sixj_python)
else:
    # the pure-Python kernel by request (AMALGEBRA_PURE_PYTHON=1): no warning to give, no extra frame
    _sixj_canonical = lru_cache(maxsize=CACHE_SIZE)(kernels.sixj_from_key_python)


@lru_cache(maxsize=NINEJ_CACHE_SIZE)
def _ninej_canonical(key):
    if kernels._fallback_pending:
        kernels.warn_fallback_once()
    (a, d, g), (b, e, h), (c, f, i) = key
    return ninej_kernel(a, b, c, d, e, f, g, h, i)


def _negate(triple, odd):
    return (-triple[0], triple[1], triple[2]) if odd else triple


def threej_triple(tj1, tj2, tj3, tm1, tm2, tm3):
    """Canonical triple of a 3j (doubled arguments, selection rules already checked)."""
    key, odd = threej_key(tj1, tj2, tj3, tm1, tm2, tm3)
    return _negate(_threej_canonical(key), odd and (tj1 + tj2 + tj3) // 2 & 1)


def sixj_triple(tj1, tj2, tj3, tj4, tj5, tj6):
    """Canonical triple of a 6j (doubled arguments, triangle rules already checked)."""
    alpha, beta = sixj_key(tj1, tj2, tj3, tj4, tj5, tj6)
    return _sixj_canonical(alpha + beta)


def ninej_triple(*tj):
    """Canonical triple of a 9j given row by row (doubled, triangle rules already checked)."""
    key, odd = ninej_key(*tj)
    return _negate(_ninej_canonical(key), odd and sum(tj) // 2 & 1)


def clear_coupling_caches():
    """Empty the 3j, 6j and 9j result caches.

    The kernels' prime and factorial tables are pure functions of their size and
    are kept (``kernels.clear_tables()`` releases them).  Safe to call while other
    threads evaluate symbols: they get the same values, computed again on a miss.

    Examples
    ========

    >>> from amalgebra.coupling import sixj, clear_coupling_caches, coupling_cache_info
    >>> _ = sixj(1, 1, 1, 1, 1, 1)
    >>> clear_coupling_caches()
    >>> coupling_cache_info()["6j"].currsize
    0
    """
    _threej_canonical.cache_clear()
    _sixj_canonical.cache_clear()
    _ninej_canonical.cache_clear()


def coupling_cache_info():
    """Cache statistics: a dict ``{"3j", "6j", "9j"}`` of ``functools`` ``CacheInfo``
    (hits, misses, maxsize, currsize).

    Examples
    ========

    >>> from amalgebra.coupling import threej, clear_coupling_caches, coupling_cache_info
    >>> clear_coupling_caches()
    >>> _ = threej(1, 1, 1, 1, -1, 0); _ = threej(1, 1, 1, -1, 0, 1)   # a symmetric variant
    >>> info = coupling_cache_info()["3j"]
    >>> (info.hits, info.misses, info.maxsize)
    (1, 1, 32768)
    """
    return {"3j": _threej_canonical.cache_info(), "6j": _sixj_canonical.cache_info(),
            "9j": _ninej_canonical.cache_info()}
