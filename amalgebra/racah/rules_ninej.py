r"""The 72 arrangements of a 9j symbol and the phase each one costs.

Explanation
===========

A 9j symbol keeps its value under transposition and under even permutations of
its rows or of its columns; an odd permutation of the rows (or of the columns)
multiplies it by :math:`(-1)^{S}`, :math:`S` the sum of its nine momenta
(Edmonds 1957, eq. 6.4.5, from memory; it follows from the
definition as a sum of six 3j symbols, DLMF 34.6.1, and the column rule of the 3j
symbol).

Examples
========

>>> from amalgebra.racah.rules_ninej import ninej_arrangements
>>> len(ninej_arrangements(tuple("abcdefghi")))
72
"""

from itertools import permutations

from .matching import permutation_is_odd

__all__ = ["ninej_arrangements"]


def ninej_arrangements(t):
    """``[(grid, odd)]``: the 3 x 3 grids (tuples of rows) of the 9j ``t`` (given row by row),
    ``odd`` True when that arrangement equals :math:`(-1)^S` times the symbol."""
    rows = [tuple(t[0:3]), tuple(t[3:6]), tuple(t[6:9])]
    out = []
    seen = set()
    for rp in permutations(range(3)):
        for cp in permutations(range(3)):
            odd = permutation_is_odd(rp) != permutation_is_odd(cp)
            grid = tuple(tuple(rows[r][c] for c in cp) for r in rp)
            for g in (grid, tuple(zip(*grid))):
                if g not in seen:
                    seen.add(g)
                    out.append((g, odd))
    return out
