r"""The symmetry classes of 3j, 6j and 9j symbols up to a jmax, as canonical keys.

Explanation
===========

A table holds one entry per class of symbols with equal (or, for 3j and 9j, opposite)
values under the full symmetry group, the classes of :mod:`amalgebra.coupling.symmetry`:
72 symmetries of the 3j (Regge square), 144 of the 6j (Regge array of the triad sums
``alpha`` and quadruple sums ``beta``), 72 of the 9j.  A class belongs to the table of
``jmax`` when one of its symbols has every :math:`j \le j_{max}`; every such symbol is then
found by its key.

The classes are found by running over the symbols with every :math:`j \le j_{max}` reduced
by cheap classical symmetries (for the 6j: the largest j first, numpy masks for the other
three triangle rules) and keeping the distinct keys, sorted.  Keys are rows of ints:

* 3j: ``(low, p, q, u, v)`` (:func:`~amalgebra.coupling.symmetry.threej_key`);
* 6j: ``(a1, a2, a3, a4, e1, e2, e3)``, the sorted triad sums and quadruple sums in units of j;
* 9j: the canonical 3 x 3 array, column by column (doubled values).

Examples
========

>>> from amalgebra.tables.enumeration import canonical_keys
>>> keys = canonical_keys("sixj", 1)
>>> keys.shape
(11, 7)
>>> [tuple(int(x) for x in k) for k in keys][:2]
[(0, 0, 0, 0, 0, 0, 0), (0, 1, 1, 1, 1, 1, 1)]
"""

import numpy as np

from ..coupling.symmetry import ninej_key, threej_key
from ..errors import LimitError, QuantumNumberError

__all__ = ["canonical_keys", "KINDS", "key_width", "MAX_TABLE_JMAX", "sixj_packed_for", "unpack_sixj", "sixj_bits"]

KINDS = ("threej", "sixj", "ninej")

#: the largest jmax each family is tabulated for (the number of classes grows like jmax^5 for
#: the 6j, jmax^5 for the 3j and about jmax^8 for the 9j)
MAX_TABLE_JMAX = {"threej": 60, "sixj": 60, "ninej": 8}

_WIDTH = {"threej": 5, "sixj": 7, "ninej": 9}


def key_width(kind):
    """The number of ints in a key of the family ``kind``."""
    return _WIDTH[_check_kind(kind)]


def _check_kind(kind):
    if kind not in KINDS:
        raise QuantumNumberError(f"kind={kind!r} must be one of {', '.join(KINDS)}")
    return kind


def _doubled_jmax(kind, jmax):
    from ..qnumbers import doubled

    tj = doubled(jmax, "jmax", nonnegative=True)
    limit = MAX_TABLE_JMAX[kind]
    if tj > 2 * limit:
        raise LimitError(f"jmax={jmax} must be at most {limit} for a {kind} table (its size grows as a high "
                         f"power of jmax); tabulate in pieces or use the functions of amalgebra.coupling")
    return tj


def canonical_keys(kind, jmax):
    """Sorted distinct canonical keys (an ``int64`` array, one row per class) of a family up to ``jmax``.

    ``jmax`` may be a half-integer (``"5/2"``); every j of some member of each class is at most jmax.
    """
    _check_kind(kind)
    tj = _doubled_jmax(kind, jmax)
    if kind == "sixj":
        return _sixj_keys(tj)
    if kind == "threej":
        return _threej_keys(tj)
    return _ninej_keys(tj)


def _triad(a, b, c):
    """Elementwise triangle rule with integer sum, doubled values (numpy arrays or ints)."""
    return ((a + b + c) % 2 == 0) & (abs(a - b) <= c) & (c <= a + b)


def _pack(rows, bits):
    """One int64 per key row (fields of ``bits`` bits, first column most significant)."""
    packed = np.zeros(rows.shape[0], dtype=np.int64)
    for column in range(rows.shape[1]):
        packed = (packed << bits) | rows[:, column]
    return packed


def _unpack(packed, width, bits):
    mask = (1 << bits) - 1
    columns = [(packed >> (bits * (width - 1 - c))) & mask for c in range(width)]
    return np.stack(columns, axis=1) if packed.size else np.zeros((0, width), dtype=np.int64)


def sixj_bits(top):
    """Bits per field of a packed 6j key for doubled jmax ``top`` (sums of four j: at most 2 top)."""
    return max(1, (2 * top).bit_length())


def _sixj_keys(top):
    found = [sixj_packed_for(t1, top) for t1 in range(top + 1)]
    return unpack_sixj(found, top)


def unpack_sixj(parts, top):
    """Sorted distinct key rows from the packed parts of :func:`sixj_packed_for`."""
    parts = [p for p in parts if p.size]
    if not parts:
        return np.zeros((0, 7), dtype=np.int64)
    return _unpack(np.unique(np.concatenate(parts)), 7, sixj_bits(top))


def sixj_packed_for(t1, top):
    """Packed distinct 6j keys of the symbols whose largest doubled j is ``t1`` (one slice of the work).

    The largest j stands first (the 24 symmetries of the tetrahedron move any edge there), and of
    the four edges meeting it, j2 is the largest (the edge's stabiliser moves any of them to j2).
    """
    bits = sixj_bits(top)
    found = []
    values = np.arange(t1 + 1, dtype=np.int64)
    for t2 in range(t1 + 1):
        small = np.arange(t2 + 1, dtype=np.int64)
        t5, t6 = np.meshgrid(small, small, indexing="ij")
        ok = _triad(t1, t5, t6)
        p5, p6 = t5[ok], t6[ok]
        t3 = small[_triad(t1, t2, small)]
        if t3.size == 0 or p5.size == 0:
            continue
        T3, T4, P = np.meshgrid(t3, values, np.arange(p5.size), indexing="ij")
        P5, P6 = p5[P], p6[P]
        mask = _triad(T4, t2, P6) & _triad(T4, P5, T3)
        a3, a4, a5, a6 = T3[mask], T4[mask], P5[mask], P6[mask]
        if a3.size == 0:
            continue
        alpha = np.stack([(t1 + t2 + a3) // 2, (t1 + a5 + a6) // 2, (a4 + t2 + a6) // 2,
                          (a4 + a5 + a3) // 2], axis=1)
        beta = np.stack([(t1 + t2 + a4 + a5) // 2, (t2 + a3 + a5 + a6) // 2,
                         (a3 + t1 + a6 + a4) // 2], axis=1)
        rows = np.concatenate([np.sort(alpha, axis=1), np.sort(beta, axis=1)], axis=1)
        found.append(np.unique(_pack(rows, bits)))
    return np.unique(np.concatenate(found)) if found else np.zeros(0, dtype=np.int64)


def _threej_keys(top):
    found = set()
    for t1 in range(top + 1):
        for t2 in range(t1 + 1):
            for t3 in range(t2 + 1):
                if not _triad(t1, t2, t3):
                    continue
                # classical symmetry m -> -m: take m1 >= 0 (the other half are equal classes)
                for tm1 in range(t1 % 2, t1 + 1, 2):
                    for tm2 in range(-t2, t2 + 1, 2):
                        tm3 = -tm1 - tm2
                        if abs(tm3) <= t3:
                            found.add(threej_key(t1, t2, t3, tm1, tm2, tm3)[0])
    return np.array(sorted(found), dtype=np.int64).reshape(-1, 5)


def _ninej_keys(top):
    found = set()
    rng = range(top + 1)
    triads = [(a, b, c) for a in rng for b in rng for c in rng if _triad(a, b, c)]
    for r1 in triads:
        for r2 in triads:
            for g in rng:
                if not (_triad(r1[0], r2[0], g)):
                    continue
                for h in rng:
                    if not _triad(r1[1], r2[1], h):
                        continue
                    for i in rng:
                        if _triad(r1[2], r2[2], i) and _triad(g, h, i):
                            key, _ = ninej_key(*r1, *r2, g, h, i)
                            found.add(tuple(x for column in key for x in column))
    return np.array(sorted(found), dtype=np.int64).reshape(-1, 9)
