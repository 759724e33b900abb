"""An independent float oracle for coupling coefficients, built with numpy (used by the tests).

The oracle never calls amalgebra: it builds spin matrices (Condon-Shortley
ladder elements), diagonalises J^2 inside each Jz eigenspace of a product of two
spins, fixes the phase by <j1 j1; j2 J-j1|J J> > 0, lowers with J- to read the
Clebsch-Gordan coefficients, and obtains 6j and 9j symbols as overlaps between
coupling schemes of three and four angular momenta.

Sources of the relations used to read 6j and 9j off the overlaps:
Edmonds 1957, eqs. (6.1.5)/(6.2.?) and (6.4.2) (from memory; the test fails
loudly if a phase were misremembered, as every symbol is compared).
"""

import itertools
from functools import lru_cache

import numpy as np

TOL = 1e-12
TJMAX = 6  # every j <= 3


def _ms(tj):
    """Doubled m values of spin tj/2, from +j down to -j."""
    return list(range(tj, -tj - 1, -2))


@lru_cache(maxsize=None)
def _spin(tj):
    """(Jz, J+) of spin tj/2 in the basis m = j, j-1, ..., -j (Condon-Shortley)."""
    ms = np.array(_ms(tj), dtype=float) / 2
    j = tj / 2
    jz = np.diag(ms)
    jp = np.zeros((tj + 1, tj + 1))
    for k in range(1, tj + 1):
        m = ms[k]
        jp[k - 1, k] = np.sqrt((j - m) * (j + m + 1))
    return jz, jp


@lru_cache(maxsize=None)
def cg_table(tj1, tj2):
    """{(tJ, tm1, tm2): <j1 m1 j2 m2|J m1+m2>} from diagonalising J^2 of two spins."""
    jz1, jp1 = _spin(tj1)
    jz2, jp2 = _spin(tj2)
    i1, i2 = np.eye(tj1 + 1), np.eye(tj2 + 1)
    jz = np.kron(jz1, i2) + np.kron(i1, jz2)
    jp = np.kron(jp1, i2) + np.kron(i1, jp2)
    jm = jp.T
    j2 = jz @ jz + 0.5 * (jp @ jm + jm @ jp)
    mtot = np.array([a + b for a in _ms(tj1) for b in _ms(tj2)])
    table = {}
    for tJ in range(abs(tj1 - tj2), tj1 + tj2 + 1, 2):
        sub = np.flatnonzero(mtot == tJ)
        values, vectors = np.linalg.eigh(j2[np.ix_(sub, sub)])
        J = tJ / 2
        pick = np.argmin(abs(values - J * (J + 1)))
        assert abs(values[pick] - J * (J + 1)) < 1e-9
        state = np.zeros(len(mtot))
        state[sub] = vectors[:, pick]
        # Condon-Shortley: <j1 j1; j2 (J-j1)|J J> > 0 (the m1 = j1 product state is index 0 of the block).
        anchor = 0 * (tj2 + 1) + (tj2 - (tJ - tj1)) // 2
        if state[anchor] < 0:
            state = -state
        tM = tJ
        while tM >= -tJ:
            for k, (a, b) in enumerate(itertools.product(_ms(tj1), _ms(tj2))):
                if a + b == tM:
                    table[(tJ, a, b)] = state[k]
            M = tM / 2
            if tM > -tJ:
                state = jm @ state / np.sqrt((J + M) * (J - M + 1))
            tM -= 2
    return table


def oracle_cg(tj1, tm1, tj2, tm2, tJ, tM):
    if tm1 + tm2 != tM:
        return 0.0
    return cg_table(tj1, tj2).get((tJ, tm1, tm2), 0.0)


def oracle_threej(tj1, tj2, tj3, tm1, tm2, tm3):
    # The 3j definition of design.md: (-1)^(j1-j2-m3)/sqrt(2j3+1) <j1 m1 j2 m2|j3,-m3>.
    phase = -1.0 if ((tj1 - tj2 - tm3) // 2) % 2 else 1.0
    return phase * oracle_cg(tj1, tm1, tj2, tm2, tj3, -tm3) / np.sqrt(tj3 + 1)


def _tri(a, b, c):
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def oracle_sixj(a, b, c, d, e, f):
    """{a b c; d e f} (doubled) from <(ab)c, d; e | a, (bd)f; e>, Edmonds (6.1.5) with (6.2.?)."""
    if not (_tri(a, b, c) and _tri(a, e, f) and _tri(d, b, f) and _tri(d, e, c)):
        return 0.0
    total = 0.0
    tM = e
    for ma in _ms(a):
        for mb in _ms(b):
            md = tM - ma - mb
            if abs(md) > d:
                continue
            total += (oracle_cg(a, ma, b, mb, c, ma + mb) * oracle_cg(c, ma + mb, d, md, e, tM)
                      * oracle_cg(b, mb, d, md, f, mb + md) * oracle_cg(a, ma, f, mb + md, e, tM))
    phase = -1.0 if ((a + b + d + e) // 2) % 2 else 1.0
    return phase * total / np.sqrt((c + 1) * (f + 1))


def _coupled(ta, tb, tab):
    """Array over (ma, mb) of <a ma b mb|ab ma+mb> and the array of 2(ma+mb)."""
    out = np.zeros((ta + 1, tb + 1))
    msum = np.zeros((ta + 1, tb + 1), dtype=int)
    for i, ma in enumerate(_ms(ta)):
        for k, mb in enumerate(_ms(tb)):
            msum[i, k] = ma + mb
            out[i, k] = oracle_cg(ta, ma, tb, mb, tab, ma + mb) if abs(ma + mb) <= tab else 0.0
    return out, msum


def _final(tx, ty, tJ, tM, mx, my):
    """<x mx y my|J M> evaluated elementwise on integer arrays mx, my (doubled)."""
    table = np.vectorize(lambda u, v: oracle_cg(tx, u, ty, v, tJ, tM) if abs(u) <= tx and abs(v) <= ty else 0.0)
    return table(mx, my)


@lru_cache(maxsize=None)
def oracle_ninej_block(t1, t2, t3, t4):
    """{(t12, t34, t13, t24, tJ): 9j} for four spins, from the overlap
    <(j1 j2)j12,(j3 j4)j34; J | (j1 j3)j13,(j2 j4)j24; J>
    = sqrt((2j12+1)(2j34+1)(2j13+1)(2j24+1)) {j1 j2 j12; j3 j4 j34; j13 j24 J}  (Edmonds 6.4.2)."""
    tM = (t1 + t2 + t3 + t4) % 2

    def scheme(ta, tb, tc, td, axes):
        states = {}
        for tab in range(abs(ta - tb), min(ta + tb, TJMAX) + 1, 2):
            A, mab = _coupled(ta, tb, tab)
            for tcd in range(abs(tc - td), min(tc + td, TJMAX) + 1, 2):
                C, mcd = _coupled(tc, td, tcd)
                for tJ in range(max(abs(tab - tcd), tM), min(tab + tcd, TJMAX) + 1, 2):
                    mx = mab[:, :, None, None]
                    my = mcd[None, None, :, :]
                    G = _final(tab, tcd, tJ, tM, np.broadcast_to(mx, mab.shape + mcd.shape),
                               np.broadcast_to(my, mab.shape + mcd.shape))
                    T = A[:, :, None, None] * C[None, None, :, :] * G
                    states[(tab, tcd, tJ)] = np.transpose(T, axes).ravel()
        return states

    first = scheme(t1, t2, t3, t4, (0, 1, 2, 3))       # axes (1, 2, 3, 4)
    second = scheme(t1, t3, t2, t4, (0, 2, 1, 3))      # built as (1, 3, 2, 4), moved to (1, 2, 3, 4)
    out = {}
    for (t12, t34, tJ), u in first.items():
        for (t13, t24, tJ2), v in second.items():
            if tJ2 == tJ:
                out[(t12, t34, t13, t24, tJ)] = float(u @ v) / np.sqrt((t12 + 1) * (t34 + 1) * (t13 + 1) * (t24 + 1))
    return out
