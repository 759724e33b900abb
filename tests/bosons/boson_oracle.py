"""Independent numeric oracle for the boson tests: truncated Fock-space numpy matrices.

Built only from the textbook matrix elements <n-1|a|n> = sqrt(n) (Sakurai (2.3.16)); it walks
SymPy Add/Mul/Pow trees itself and never calls amalgebra's kernel.  Products use scipy.sparse
(no BLAS threads: dense 144x144 products were 20x slower under thread oversubscription).
"""

import numpy as np
import scipy.sparse as sp
from sympy import Add, Mul, Pow

from amalgebra.bosons import BosonOperator

__all__ = ["mode_matrices", "fock_matrix", "basis_index"]


def mode_matrices(dim):
    """(a, a^dagger, N) truncated to occupations 0..dim-1."""
    a = np.diag(np.sqrt(np.arange(1, dim, dtype=float)), 1)
    return {"annihilate": a, "create": a.T.copy(), "number": np.diag(np.arange(dim, dtype=float))}


def basis_index(occupations, dim):
    """Row/column index of |n_1, n_2, ...> in the Kronecker product (first label slowest)."""
    index = 0
    for n in occupations:
        index = index * dim + n
    return index


def fock_matrix(expr, labels, dim, sparse=False):
    """Matrix of a boson polynomial on the truncated product space of ``labels`` (sorted order)."""
    single = {k: sp.csr_matrix(v) for k, v in mode_matrices(dim).items()}
    size = dim ** len(labels)
    eye = sp.identity(dim, format="csr")

    def embed(label, kind):
        out = sp.csr_matrix(np.ones((1, 1)))
        for other in labels:
            out = sp.kron(out, single[kind] if other == label else eye, format="csr")
        return out

    def walk(node):
        if node.is_number:
            return complex(node) * sp.identity(size, dtype=complex, format="csr")
        if isinstance(node, BosonOperator):
            return embed(node.label, node.kind)
        if isinstance(node, Add):
            out = walk(node.args[0])
            for arg in node.args[1:]:
                out = out + walk(arg)
            return out
        if isinstance(node, Mul):
            out = sp.identity(size, dtype=complex, format="csr")
            for arg in node.args:
                out = out @ walk(arg)
            return out
        if isinstance(node, Pow):
            base = walk(node.base)
            out = sp.identity(size, dtype=complex, format="csr")
            for _ in range(int(node.exp)):
                out = out @ base
            return out
        raise TypeError(f"oracle cannot read {node!r}")

    out = walk(expr)
    return out if sparse else out.toarray()
