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
:func:`amalgebra.numeric.to_matrix`, so tests can compare against it.

Examples
========

>>> import numpy as np
>>> from amalgebra.testing.reference import component_matrices
>>> m = component_matrices(0.5)
>>> bool(np.allclose(m["x"] @ m["y"] - m["y"] @ m["x"], 1j * m["z"]))   # [Jx, Jy] = i Jz
True
"""

import numpy as np

from ..algebra.operators import AngularMomentumComponent

__all__ = ["component_matrices", "evaluate"]


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
        if node.is_Add:
            return sum(walk(arg) for arg in node.args)
        if node.is_Mul:
            out = np.eye(total, dtype=complex)
            for arg in node.args:
                value = walk(arg)
                out = out @ value if np.ndim(value) == 2 else out * value
            return out
        if node.is_Pow and not node.is_commutative:
            return np.linalg.matrix_power(walk(node.base), int(node.exp))
        return complex(node) * np.eye(total, dtype=complex)

    return walk(expr)
