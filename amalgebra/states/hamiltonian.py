r"""Exact Hamiltonian matrices in a chosen basis, their conserved-M (and F) blocks and eigenvalues.

Explanation
===========

:func:`hamiltonian_matrix` takes an operator over several labels, a numeric
:math:`j` per label and a basis:

* ``"uncoupled"``: product kets in Kronecker order (first label slowest,
  :math:`m = j, \dots, -j`), see :func:`~amalgebra.states.coupled.uncoupled_basis`;
* ``"coupled"``: coupled kets :math:`|((j_1 j_2) J_{12} \dots) F M\rangle` in
  the order of the labels, see :func:`~amalgebra.states.coupled.coupled_basis`;
* a list of states (kets, coupled kets or combinations), which must be
  orthonormal (checked exactly; :class:`~amalgebra.errors.StateError` otherwise).

It returns a :class:`HamiltonianMatrix` holding the exact SymPy matrix
:math:`H_{ik} = \langle b_i|H|b_k\rangle`, the basis, and the blocks: basis
states are grouped by total :math:`M` (when each basis state has one); if the
matrix has no element between different groups, :math:`M` is reported as
conserved.  In a coupled basis the groups are refined by the total angular
momentum :math:`F` when that is conserved too (a scalar operator).  When
neither holds, blocks are the connected components of the nonzero pattern.
:meth:`HamiltonianMatrix.eigenvalues` returns the exact eigenvalues block by
block (``None`` for a block SymPy cannot solve).

Examples
========

Hyperfine structure plus Zeeman effect for :math:`J = 1/2` (Breit-Rabi):

>>> from sympy import symbols, sqrt, expand
>>> from amalgebra.algebra import AngularMomentum, dot
>>> from amalgebra.states.hamiltonian import hamiltonian_matrix
>>> A, B = symbols("A B", positive=True)
>>> I, J = AngularMomentum("I"), AngularMomentum("J")
>>> hm = hamiltonian_matrix(A * dot(I, J) + B * J.z, {"I": "1/2", "J": "1/2"})
>>> hm.conserved
('M',)
>>> [(blk.quantum_numbers["M"], blk.size) for blk in hm.blocks]
[(1, 1), (0, 2), (-1, 1)]
>>> hm.blocks[1].matrix
Matrix([
[-A/4 - B/2,        A/2],
[       A/2, -A/4 + B/2]])

Identity check: the trace is basis independent (``A I.J`` is traceless):

>>> hc = hamiltonian_matrix(A * dot(I, J) + B * J.z, {"I": "1/2", "J": "1/2"}, basis="coupled")
>>> hc.matrix.trace() == hm.matrix.trace() == 0
True

Parameters
==========

op : operator expression over the labels of ``js``
js : dict label -> numeric j (the dict order is the coupling order), or a list of (label, j) pairs
basis : ``"uncoupled"``, ``"coupled"`` or a list of states

See Also
========

amalgebra.states.action.apply, amalgebra.states.coupled.coupling_matrix

References
==========

.. [1] G. Breit and I. I. Rabi, Phys. Rev. 38, 2082 (1931).
"""

from sympy import Add, Dummy, S, conjugate, expand_mul, eye, roots, sqrt, zeros
from sympy.polys.polyerrors import PolynomialError
from sympy.printing.defaults import Printable

from ..notation import NotationHooks
from ..errors import StateError
from ..qnumbers import half_integer
from .coupled import CoupledKet, coupled_basis, uncoupled_basis
from .action import _target
from .kets import _factor_map, _label_key, components
from .actionform import action_form

__all__ = ["hamiltonian_matrix", "HamiltonianMatrix", "Block", "operator_matrix"]


class Block:
    """One diagonal block: ``indices`` into the basis, ``quantum_numbers`` (dict), ``matrix``."""

    __slots__ = ("indices", "quantum_numbers", "matrix")

    def __init__(self, indices, quantum_numbers, matrix):
        self.indices = tuple(indices)
        self.quantum_numbers = dict(quantum_numbers)
        self.matrix = matrix

    @property
    def size(self):
        return len(self.indices)

    def eigenvalues(self, general=False):
        """``{eigenvalue: multiplicity}``, or ``None`` when SymPy cannot solve the block.

        Blocks with one or two symbols are solved when the characteristic
        polynomial factors into pieces of degree <= 2 (2 x 2 blocks always,
        by the quadratic formula).  Numeric blocks go through
        ``Matrix.eigenvals`` (cubic and quartic formulas included), 2 x 2
        blocks with more symbols through the quadratic formula.  Larger blocks
        with more than two symbols are not attempted (multivariate
        factorisation can take minutes): ``None`` is returned unless
        ``general=True``, which tries ``Matrix.eigenvals`` whatever the cost.
        """
        mat = self.matrix
        if self.size == 1:
            return {mat[0, 0]: 1}
        nsym = len(mat.free_symbols)
        try:
            if general or nsym == 0 and self.size > 2:
                values = mat.eigenvals()
            elif 0 < nsym <= 2:
                # few symbols: factor the characteristic polynomial (cheap, and it gives clean roots)
                lam = Dummy("lambda")
                poly = mat.charpoly(lam, simplify=lambda e: e.expand())
                values = roots(poly, cubics=False, quartics=False, quintics=False)
                if sum(values.values()) != self.size and self.size == 2:
                    values = _quadratic(mat)
            elif self.size == 2:
                values = _quadratic(mat)
            else:
                return None
        except (NotImplementedError, PolynomialError, ValueError):
            return None
        if sum(values.values()) != self.size:
            return None
        return dict(values)

    def __repr__(self):
        qn = ", ".join(f"{k}={v}" for k, v in self.quantum_numbers.items())
        return f"Block({qn}, size={self.size})"


def _quadratic(mat):
    """Eigenvalues of a 2 x 2 matrix by the quadratic formula."""
    half_trace = ((mat[0, 0] + mat[1, 1]) / 2).expand()
    disc = (((mat[0, 0] - mat[1, 1]) / 2) ** 2 + mat[0, 1] * mat[1, 0]).expand()
    if disc == 0:
        return {half_trace: 2}
    root = sqrt(disc)
    return {half_trace + root: 1, half_trace - root: 1}


class HamiltonianMatrix(NotationHooks, Printable):
    """The result of :func:`hamiltonian_matrix`: ``matrix``, ``basis``, ``blocks``, ``conserved``.

    Printable: ``str``/``repr`` give a summary; LaTeX and pretty give the matrix (Jupyter shows it).
    """

    __slots__ = ("matrix", "basis", "blocks", "conserved")

    def __init__(self, matrix, basis, blocks, conserved):
        self.matrix = matrix
        self.basis = list(basis)
        self.blocks = list(blocks)
        self.conserved = tuple(conserved)

    def eigenvalues(self, general=False):
        """``[(block, {eigenvalue: multiplicity} or None), ...]`` in block order (see :meth:`Block.eigenvalues`)."""
        return [(blk, blk.eigenvalues(general)) for blk in self.blocks]

    _notation_key = "hamiltonian_matrix"


def _read_js(js):
    pairs = list(js.items()) if isinstance(js, dict) else [tuple(p) for p in js]
    if not pairs:
        raise StateError("js must name at least one label")
    labels = [str(lab) for lab, _ in pairs]
    if len(set(labels)) != len(labels):
        raise StateError(f"labels={labels} must be distinct")
    values = [half_integer(j, f"j[{lab}]", nonnegative=True) for lab, j in pairs]
    return labels, values


def operator_matrix(op, kets):
    """Exact matrix of ``op`` on a list of product kets (all with the same labels).

    Entries whose target falls outside the list raise
    :class:`~amalgebra.errors.StateError` (the list is not closed under ``op``).

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states.kets import ket
    >>> J = AngularMomentum("J")
    >>> operator_matrix(J.plus, [ket(1, 1), ket(1, 0), ket(1, -1)])
    Matrix([
    [0, sqrt(2),       0],
    [0,       0, sqrt(2)],
    [0,       0,       0]])
    """
    n = len(kets)
    mat = zeros(n, n)
    for (r, c), v in _operator_entries(op, kets).items():
        mat[r, c] = v
    return mat


def _operator_entries(op, kets):
    """``{(row, col): value}`` of the nonzero entries of ``op`` on product kets."""
    index = {k: i for i, k in enumerate(kets)}
    entries = {}
    for col, k in enumerate(kets):
        fm = _factor_map(k)
        labels = tuple(sorted(fm, key=_label_key))
        form = action_form(op, labels)
        for shift, amp in form.closed_form(fm).items():
            target = _target(labels, fm, shift)
            row = index.get(target)
            if row is None:
                raise StateError(f"kets must span a space closed under op: {target} is missing")
            entries[(row, col)] = amp
    return entries


def _sandwich(left, entries, right, size):
    """Dense ``left^H * E * right`` for sparse columns ``left``/``right`` ({row: c}) and entries E."""
    by_col = {}
    for (r, c), v in entries.items():
        by_col.setdefault(c, []).append((r, v))
    mat = zeros(len(left), len(right))
    for k, col in enumerate(right):
        image = {}
        for q, cq in col.items():
            for p, v in by_col.get(q, ()):
                image.setdefault(p, []).append(v * cq)
        image = {p: Add(*ts) for p, ts in image.items()}
        for i, row in enumerate(left):
            terms = [conjugate(c) * image[p] for p, c in row.items() if p in image]
            if terms:
                mat[i, k] = expand_mul(Add(*terms))
    return mat


def _total_m(state_components):
    ms = set()
    for basis in state_components:
        ms.add(sum((m for _, m in _factor_map(basis).values()), S.Zero))
    return ms.pop() if len(ms) == 1 else None


def _blocks_by(groups, mat):
    """True when ``mat`` has no element between different groups (keys -> index lists)."""
    owner = {}
    for key, idx in groups.items():
        for i in idx:
            owner[i] = key
    n = mat.shape[0]
    for r in range(n):
        for c in range(n):
            if owner[r] != owner[c] and mat[r, c] != 0:
                return False
    return True


def _components_blocks(mat):
    n = mat.shape[0]
    parent = list(range(n))

    def find(a):
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for r in range(n):
        for c in range(n):
            if mat[r, c] != 0:
                parent[find(r)] = find(c)
    groups = {}
    for i in range(n):
        groups.setdefault(find(i), []).append(i)
    return sorted(groups.values())


def hamiltonian_matrix(op, js, basis="uncoupled"):
    """The exact matrix of ``op`` in a basis, with its blocks (see the module docstring).

    Examples
    ========

    Lande interval rule, ``E(F) - E(F-1) = A F`` for ``A I.J``:

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum, dot
    >>> A = Symbol("A")
    >>> I, J = AngularMomentum("I"), AngularMomentum("J")
    >>> hm = hamiltonian_matrix(A * dot(I, J), {"I": "3/2", "J": 1}, basis="coupled")
    >>> hm.conserved
    ('M', 'F')
    >>> sorted({b.quantum_numbers["F"]: b.matrix[0, 0] for b in hm.blocks}.items())
    [(1/2, -5*A/2), (3/2, -A), (5/2, 3*A/2)]
    """
    labels, values = _read_js(js)
    if isinstance(basis, str):
        if basis == "uncoupled":
            states = uncoupled_basis(values, labels)
        elif basis == "coupled":
            if len(labels) < 2:
                raise StateError("basis='coupled' needs at least two labels")
            states = coupled_basis(values, labels)
        else:
            raise StateError(f"basis={basis!r} must be 'uncoupled', 'coupled' or a list of states")
    else:
        states = list(basis)
        if not states:
            raise StateError("basis must hold at least one state")
    comps = [components(s, name=f"basis[{i}]") for i, s in enumerate(states)]
    unc = uncoupled_basis(values, labels)
    for i, comp in enumerate(comps):
        for b in comp:
            fm = _factor_map(b)
            if sorted(fm) != sorted(labels):
                raise StateError(f"basis[{i}]={states[i]} must carry the labels {sorted(labels)}")
    index = {k: i for i, k in enumerate(unc)}
    cols = [{index[b]: c for b, c in comp.items()} for comp in comps]
    uncoupled = isinstance(basis, str) and basis == "uncoupled"
    if not uncoupled:
        identity = {(i, i): S.One for i in range(len(unc))}
        if _sandwich(cols, identity, cols, len(unc)) != eye(len(states)):
            raise StateError("basis must be orthonormal (its Gram matrix is not the identity)")
    entries = _operator_entries(op, unc)
    if uncoupled:
        mat = zeros(len(unc), len(unc))
        for (r, c), v in entries.items():
            mat[r, c] = v
    else:
        mat = _sandwich(cols, entries, cols, len(unc))
    return HamiltonianMatrix(mat, states, *_find_blocks(mat, states, comps))


def _find_blocks(mat, states, comps):
    ms = [_total_m(c) for c in comps]
    conserved = []
    if all(m is not None for m in ms):
        groups = {}
        for i, m in enumerate(ms):
            groups.setdefault(m, []).append(i)
        if _blocks_by(groups, mat):
            conserved.append("M")
            if all(isinstance(s, CoupledKet) for s in states):
                fgroups = {}
                for i, s in enumerate(states):
                    fgroups.setdefault((s.intermediates, s.J, s.M), []).append(i)
                if _blocks_by(_merge_paths(fgroups, states), mat):
                    conserved.append("F")
                    keys = sorted(_merge_paths(fgroups, states).items(),
                                  key=lambda kv: (-kv[0][1], -kv[0][0]))
                    return [Block(idx, {"M": M, "F": F}, mat.extract(idx, idx))
                            for (M, F), idx in keys], conserved
            keys = sorted(groups.items(), key=lambda kv: -kv[0])
            return [Block(idx, {"M": M}, mat.extract(idx, idx)) for M, idx in keys], conserved
    blocks = _components_blocks(mat)
    out = []
    for idx in blocks:
        qn = {}
        mset = {ms[i] for i in idx}
        if len(mset) == 1 and None not in mset:
            qn["M"] = mset.pop()
        out.append(Block(idx, qn, mat.extract(idx, idx)))
    return out, conserved


def _merge_paths(fgroups, states):
    """Group coupled states by (M, F) only (different intermediate paths share a block)."""
    out = {}
    for (inter, F, M), idx in fgroups.items():
        out.setdefault((M, F), []).extend(idx)
    return {k: sorted(v) for k, v in out.items()}

