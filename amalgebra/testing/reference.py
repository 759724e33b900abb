r"""Independent numpy reference matrices for testing (no use of the amalgebra kernel).

Explanation
===========

Builds :math:`J_x, J_y, J_z, J_\pm, J^2` directly from the textbook matrix
elements (Condon-Shortley phase, basis ``m = j, j-1, ..., -j``,
:math:`\langle j, m+1|J_+|j m\rangle = \sqrt{(j-m)(j+m+1)}`; Sakurai, *Modern
Quantum Mechanics*, eq. (3.5.41) from memory) and evaluates a SymPy operator
expression by walking it and multiplying matrices.  Several labels form a
Kronecker product in sorted label order (first label outermost).  Nothing
here calls :func:`amalgebra.algebra.canonical` or
:func:`amalgebra.matrices.explicit.to_matrix`, so tests can compare against it.

Examples
========

>>> import numpy as np
>>> from amalgebra.testing.reference import component_matrices
>>> m = component_matrices(0.5)
>>> bool(np.allclose(m["x"] @ m["y"] - m["y"] @ m["x"], 1j * m["z"]))   # [Jx, Jy] = i Jz
True
"""

from math import factorial, sqrt

import numpy as np

from ..algebra.operators import AngularMomentumComponent
from ..bosons.operators import BosonOperator

__all__ = ["component_matrices", "evaluate", "threej_float", "direct_sum_states", "space_states",
           "evaluate_on_space"]


def component_matrices(j):
    """Dense complex matrices of all components for one (float) ``j``."""
    j = float(j)
    ms = [j - k for k in range(int(round(2 * j)) + 1)]
    n = len(ms)
    jp = np.zeros((n, n), dtype=complex)
    for col, m in enumerate(ms):
        if col > 0:
            jp[col - 1, col] = np.sqrt((j - m) * (j + m + 1))
    jm = jp.conj().T
    jz = np.diag(np.array(ms, dtype=complex))
    return {"plus": jp, "minus": jm, "z": jz, "x": (jp + jm) / 2, "y": (jp - jm) / 2j,
            "squared": j * (j + 1) * np.eye(n, dtype=complex)}


def evaluate(expr, js):
    """Matrix of ``expr`` for ``js`` = {label: j}, by direct matrix products."""
    labels = sorted(js)
    mats = {label: component_matrices(js[label]) for label in labels}
    dims = [mats[label]["z"].shape[0] for label in labels]
    total = int(np.prod(dims))

    def embed(label, component):
        out = np.eye(1, dtype=complex)
        for other, dim in zip(labels, dims):
            block = mats[other][component] if other == label else np.eye(dim, dtype=complex)
            out = np.kron(out, block)
        return out

    def walk(node):
        if isinstance(node, AngularMomentumComponent):
            if node.label not in mats:
                raise KeyError(node.label)
            return embed(node.label, node.component)
        return _fold(node, walk, total)

    return walk(expr)


def threej_float(j1, j2, j3, m1, m2, m3):
    """The 3j symbol by Racah's single-sum formula in floats (Edmonds 1957, eq. 3.7.3, from memory).

    Independent of :mod:`amalgebra.coupling` (plain ``math.factorial``), for the oracle only.

    >>> round(threej_float(1, 1, 0, 0, 0, 0) ** 2, 12)     # 1/3
    0.333333333333
    """
    vals = [float(v) for v in (j1, j2, j3, m1, m2, m3)]
    j1, j2, j3, m1, m2, m3 = vals
    if abs(m1 + m2 + m3) > 1e-9 or any(abs(m) > j + 1e-9 for m, j in ((m1, j1), (m2, j2), (m3, j3))):
        return 0.0
    if j3 > j1 + j2 + 1e-9 or j3 < abs(j1 - j2) - 1e-9:
        return 0.0

    def f(x):
        n = int(round(x))
        return factorial(n)

    delta = f(j1 + j2 - j3) * f(j1 - j2 + j3) * f(-j1 + j2 + j3) / f(j1 + j2 + j3 + 1)
    pre = sqrt(delta * f(j1 + m1) * f(j1 - m1) * f(j2 + m2) * f(j2 - m2) * f(j3 + m3) * f(j3 - m3))
    total = 0.0
    kmin = int(round(max(0, j2 - j3 - m1, j1 - j3 + m2)))
    kmax = int(round(min(j1 + j2 - j3, j1 - m1, j2 + m2)))
    for k in range(kmin, kmax + 1):
        total += (-1) ** k / (f(k) * f(j1 + j2 - j3 - k) * f(j1 - m1 - k) * f(j2 + m2 - k)
                              * f(j3 - j2 + m1 + k) * f(j3 - j1 - m2 + k))
    phase = (-1) ** int(round(j1 - j2 - m3))
    return phase * pre * total


def direct_sum_states(js):
    """``[(j, m)]`` of the direct sum of multiplets ``js`` (given order, m descending)."""
    out = []
    for j in js:
        j = float(j)
        out.extend((j, j - k) for k in range(int(round(2 * j)) + 1))
    return out


def space_states(space):
    """``(labels, [tuple of (j, m) per label])`` of ``{label: [j values]}``: Kronecker order, labels sorted
    (natural order: 'S2' before 'S10'), the first outermost."""
    import re

    def key(label):
        stem, digits = re.match(r"^(.*?)(\d*)$", label).groups()
        return (stem, int(digits) if digits else -1, label)

    labels = sorted(space, key=key)
    states = [()]
    for label in labels:
        js = space[label] if isinstance(space[label], (list, tuple)) else [space[label]]
        states = [s + (pair,) for s in states for pair in direct_sum_states(js)]
    return labels, states


def evaluate_on_space(expr, space, reduced=None, convention="edmonds", modes=None, extra=8):
    """Matrix of ``expr`` on ``space`` = {label: [j values]} by products of textbook atom matrices.

    ``modes`` = {mode: n_max} adds truncated Fock spaces after the angular
    momenta (sorted, the first outermost, ``n`` ascending): boson atoms
    (:class:`~amalgebra.bosons.BosonOperator`: annihilate, create, number) are
    ``a = sum sqrt(n) |n-1><n|`` on the larger space ``n <= n_max + extra``, the
    products are taken there and only the result is cut to ``n <= n_max``, so
    the matrix is ``P O P`` whenever no word of ``expr`` creates more than
    ``extra`` quanta (Sakurai, *Modern Quantum Mechanics*, eqs. (2.3.16)-(2.3.17)).

    Angular-momentum atoms from the ladder formula above; a tensor component
    ``T^k_q`` (duck-typed: ``.tensor.rank``, ``.tensor.label``, ``.q``) and a
    vector component (``.vector``, ``.axis``; ``V_{+-1} = -+(Vx +- i Vy)/sqrt2``)
    by the Wigner-Eckart theorem with :func:`threej_float`:
    ``<j'm'|T_q|jm> = (-1)^(j'-m') (j' k j; -m' q m) R(j', j)`` (Edmonds 1957, eq. 5.4.1) or
    ``<j m k q|j' m'> R(j', j)`` for ``convention="cg"``.  ``reduced`` maps a family to a
    callable ``R(j', j)`` of floats (default 1 for every pair).  Products are products of
    matrices on the space (the truncation ``P T P``).
    """
    labels, states = space_states(space) if space else ([], [()])
    bosons = sorted(modes or {})
    for mode in bosons:
        states = [s + ((0.0, float(k)),) for s in states for k in range(int(modes[mode]) + extra + 1)]
    n = len(states)
    index = {s: i for i, s in enumerate(states)}
    reduced = reduced or {}

    def boson(label, kind):
        i = len(labels) + bosons.index(label)
        out = np.zeros((n, n), dtype=complex)
        for c, s in enumerate(states):
            occ = s[i][1]
            if kind == "number":
                out[c, c] = occ
                continue
            step = -1.0 if kind == "annihilate" else 1.0
            t = s[:i] + ((0.0, occ + step),) + s[i + 1:]
            if t in index:
                out[index[t], c] = sqrt(occ if step < 0 else occ + 1)
        return out

    def am(label, comp):
        i = labels.index(label)
        out = np.zeros((n, n), dtype=complex)
        for c, s in enumerate(states):
            j, m = s[i]
            if comp == "z":
                out[c, c] = m
                continue
            if comp == "squared":
                out[c, c] = j * (j + 1)
                continue
            up = s[:i] + ((j, m + 1),) + s[i + 1:]
            dn = s[:i] + ((j, m - 1),) + s[i + 1:]
            a_up = sqrt(max((j - m) * (j + m + 1), 0.0))
            a_dn = sqrt(max((j + m) * (j - m + 1), 0.0))
            w_up, w_dn = {"plus": (1, 0), "minus": (0, 1), "x": (0.5, 0.5), "y": (-0.5j, 0.5j)}[comp]
            if up in index and w_up:
                out[index[up], c] += w_up * a_up
            if dn in index and w_dn:
                out[index[dn], c] += w_dn * a_dn
        return out

    def tensor(label, k, q, red):
        i = labels.index(label)
        out = np.zeros((n, n), dtype=complex)
        for c, s in enumerate(states):
            j, m = s[i]
            for r, t in enumerate(states):
                if t[:i] + t[i + 1:] != s[:i] + s[i + 1:]:
                    continue
                jp, mp = t[i]
                if abs(mp - m - q) > 1e-9:
                    continue
                if convention == "cg":
                    geo = (-1) ** int(round(j - k + mp)) * sqrt(2 * jp + 1) * threej_float(j, k, jp, m, q, -mp)
                else:
                    geo = (-1) ** int(round(jp - mp)) * threej_float(jp, k, j, -mp, q, m)
                out[r, c] = geo * red(jp, j)
        return out

    def walk(node):
        if isinstance(node, AngularMomentumComponent):
            return am(node.label, node.component)
        if isinstance(node, BosonOperator):
            return boson(node.args[0].name, node.kind)
        if hasattr(node, "tensor") and hasattr(node, "q"):
            fam = node.tensor
            red = reduced.get(fam, lambda jp, j: 1.0)
            return tensor(fam.label, float(fam.rank), float(node.q), red)
        if hasattr(node, "vector") and hasattr(node, "axis"):
            fam = node.vector
            red = reduced.get(fam, lambda jp, j: 1.0)
            sph = {q: tensor(fam.label, 1.0, float(q), red) for q in (1, 0, -1)}
            if node.axis == "z":
                return sph[0]
            if node.axis == "x":
                return (sph[-1] - sph[1]) / sqrt(2)
            return 1j * (sph[1] + sph[-1]) / sqrt(2)
        return _fold(node, walk, n)

    out = walk(expr)
    if bosons:
        keep = [i for i, s in enumerate(states)
                if all(s[len(labels) + k][1] <= modes[mode] for k, mode in enumerate(bosons))]
        out = out[np.ix_(keep, keep)]
    return out


def _fold(node, walk, size):
    """Sums, products and operator powers of the matrices ``walk`` gives, a scalar times the identity."""
    if node.is_Add:
        return sum(walk(arg) for arg in node.args)
    if node.is_Mul:
        out = np.eye(size, dtype=complex)
        for arg in node.args:
            value = walk(arg)
            out = out @ value if np.ndim(value) == 2 else out * value
        return out
    if node.is_Pow and not node.is_commutative:
        return np.linalg.matrix_power(walk(node.base), int(node.exp))
    return complex(node) * np.eye(size, dtype=complex)
