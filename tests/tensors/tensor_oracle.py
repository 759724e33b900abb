"""An independent float oracle for tensor-operator tests (numpy only, no amalgebra).

Clebsch-Gordan coefficients from the Racah formula (DLMF 34.3.7 form, Condon-Shortley
phase), spin matrices from the ladder formula, tensor operators on direct sums of
|j m> spaces from the Edmonds (1957) eq. 5.4.1 definition of the reduced element,
coupled kets by Clebsch-Gordan coupling of product kets.  Loaded by the tests with
``importlib`` (no package).
"""

from functools import lru_cache
from math import factorial, sqrt

import numpy as np


def _f(x):
    return factorial(int(round(x)))


@lru_cache(maxsize=None)
def cg(j1, m1, j2, m2, J, M):
    """<j1 m1 j2 m2|J M> by the Racah formula (DLMF 34.3.7 with 34.3.1), floats."""
    if abs(m1 + m2 - M) > 1e-9 or abs(m1) > j1 + 1e-9 or abs(m2) > j2 + 1e-9 or abs(M) > J + 1e-9:
        return 0.0
    if not (abs(j1 - j2) - 1e-9 <= J <= j1 + j2 + 1e-9) or abs((j1 + j2 + J) - round(j1 + j2 + J)) > 1e-9:
        return 0.0
    pre = sqrt((2 * J + 1) * _f(J + j1 - j2) * _f(J - j1 + j2) * _f(j1 + j2 - J) / _f(j1 + j2 + J + 1))
    pre *= sqrt(_f(J + M) * _f(J - M) * _f(j1 - m1) * _f(j1 + m1) * _f(j2 - m2) * _f(j2 + m2))
    total = 0.0
    for k in range(0, int(round(j1 + j2 - J)) + 1):
        args = (j1 + j2 - J - k, j1 - m1 - k, j2 + m2 - k, J - j2 + m1 + k, J - j1 - m2 + k)
        if min(args) < -1e-9:
            continue
        total += (-1) ** k / (_f(k) * np.prod([_f(a) for a in args]))
    return pre * total


@lru_cache(maxsize=None)
def threej(j1, j2, j3, m1, m2, m3):
    """3j symbol from the Clebsch-Gordan coefficient (design.md / Edmonds 3.7.3)."""
    return (-1) ** int(round(j1 - j2 - m3)) / sqrt(2 * j3 + 1) * cg(j1, m1, j2, m2, j3, -m3)


def ms(j):
    return [j - i for i in range(int(round(2 * j)) + 1)]


def spin(j):
    """(Jz, J+, J-) for one j, basis m = j..-j, Condon-Shortley phase."""
    m = ms(j)
    n = len(m)
    jz = np.diag(m).astype(complex)
    jp = np.zeros((n, n), complex)
    for c in range(1, n):
        jp[c - 1, c] = sqrt((j - m[c]) * (j + m[c] + 1))
    return jz, jp, jp.conj().T


def block_basis(jlist):
    """The basis of a direct sum of |j m> spaces: list of (j, m)."""
    return [(j, m) for j in jlist for m in ms(j)]


def tensor_on_sum(jlist, k, reduced):
    """{q: matrix} of a rank-k tensor on the direct sum over jlist, by Edmonds 5.4.1.

    ``reduced[(jp, j)]`` gives <jp||T^k||j> (missing pairs are zero).
    """
    basis = block_basis(jlist)
    out = {}
    for q in ms(k):
        mat = np.zeros((len(basis), len(basis)), complex)
        for r, (jp, mp) in enumerate(basis):
            for c, (j, m) in enumerate(basis):
                red = reduced.get((jp, j), 0.0)
                if red:
                    mat[r, c] = (-1) ** int(round(jp - mp)) * threej(jp, k, j, -mp, q, m) * red
        out[q] = mat
    return out


def coupled_vector(jlist1, jlist2, j1, j2, J, M):
    """|(j1 j2) J M> as a vector in the product of the two direct-sum spaces."""
    b1, b2 = block_basis(jlist1), block_basis(jlist2)
    vec = np.zeros(len(b1) * len(b2), complex)
    for a, (ja, ma) in enumerate(b1):
        if ja != j1:
            continue
        for b, (jb, mb) in enumerate(b2):
            if jb != j2:
                continue
            vec[a * len(b2) + b] = cg(j1, ma, j2, mb, J, M)
    return vec


def reduced_from_matrix(op_q, k, bra, ket):
    """Least-squares reduced element (Edmonds) of {q: matrix} between two families of kets.

    ``bra(Mp)`` and ``ket(M)`` return vectors; jp, j are read from the families' j values.
    Also returns the largest residual, so a test sees whether the operator really is a tensor.
    """
    (jp, bra_vec), (j, ket_vec) = bra, ket
    factors, values = [], []
    for mp in ms(jp):
        for m in ms(j):
            q = mp - m
            if abs(q) > k + 1e-9:
                continue
            factor = (-1) ** int(round(jp - mp)) * threej(jp, k, j, -mp, q, m)
            value = bra_vec(mp).conj() @ op_q[q] @ ket_vec(m)
            factors.append(factor)
            values.append(value)
    factors, values = np.array(factors), np.array(values)
    if not np.any(np.abs(factors) > 1e-12):
        return 0.0, float(np.max(np.abs(values), initial=0.0))
    red = (factors @ values) / (factors @ factors)
    return red, float(np.max(np.abs(values - factors * red)))
