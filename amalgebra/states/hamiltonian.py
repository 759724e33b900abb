r"""Exact Hamiltonian matrices in a chosen basis, their conserved-M (and F) blocks and eigenvalues.

Explanation
===========

:func:`hamiltonian_matrix` takes an operator over several labels, a numeric
:math:`j` per label and a basis:

* ``"uncoupled"``: product kets in the package's one order
  (:mod:`amalgebra.states.basis`: labels in label order, the first outermost,
  :math:`m = j, \dots, -j`; a label may be given a list of j values, a direct
  sum of multiplets, j in the order given), the basis of
  :func:`~amalgebra.matrices.explicit.to_matrix` too;
* ``"coupled"``: coupled kets :math:`|((j_1 j_2) J_{12} \dots) F M\rangle` in
  the order of the labels, see :func:`~amalgebra.states.coupled.coupled_basis`;
  with direct sums, each choice of one j per label is coupled in turn (the first
  label's j outermost, each label's j in the order given);
* a list of states (kets, coupled kets or combinations), which must be
  orthonormal (checked exactly; :class:`~amalgebra.errors.StateError` otherwise).

The operator may contain anything :func:`~amalgebra.algebra.canonical`
accepts on these labels, tensor and vector components included (by the
Wigner-Eckart theorem, ``reduced``/``convention`` as in
:func:`~amalgebra.matrices.explicit.to_matrix`).  It returns a :class:`HamiltonianMatrix`
holding the exact immutable SymPy matrix
:math:`H_{ik} = \langle b_i|H|b_k\rangle` (``.matrix``, an
``ImmutableMatrix``; ``sympify(result)`` gives it too, so it enters Matrix
arithmetic), the :class:`~amalgebra.states.basis.Basis` (``.basis``), and the
blocks: basis states are grouped by total :math:`M` (when each basis state
has one); if the matrix has no element between different groups, :math:`M`
is reported as conserved.  In a coupled basis the groups are refined by the
total angular momentum :math:`F`; in any basis whose states have one j per
label (product, coupled, or such user states) by the :math:`j` of each label
given a list of j values, and by the **parity** :math:`(-1)^{\sum l}`, when
those are conserved too.  Parity here is the sign of the orbital states under
inversion, :math:`\prod (-1)^{l}`, summed over the labels taken as orbital:
those given *several integer* j (a direct sum such as ``{"L": [0, 1, 2]}``).  A
half-integer label is a spin (no orbital parity); a label with one j adds the
same sign to every state, so it cannot split a block; an integer j that is a
spin in your model (``{"S": [0, 1]}``) is counted too, and the "parity" reported
is then :math:`(-1)^{\sum j}` over those labels.  Like the other quantum numbers
it is reported only when the matrix has no element between different values
(an odd tensor such as :math:`C^{(1)}` on ``L`` breaks it), and only when it
splits a block that :math:`M`, :math:`F` and the j did not.  Within the
groups, blocks are the connected components of the nonzero pattern.
:meth:`HamiltonianMatrix.eigenvalues` returns the exact eigenvalues block by
block as :class:`~amalgebra.states.eigen.Eigenvalues` objects, never ``None``:
a factor of the characteristic polynomial that has no closed form (or that
the time budget did not reach) is listed, with the factored characteristic
polynomial and ``.numeric(values)``.

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
js : dict label -> numeric j or list of j values (the dict order is the coupling order of ``basis="coupled"``),
     or a list of (label, j) pairs
basis : ``"uncoupled"``, ``"coupled"`` or a list of states

See Also
========

amalgebra.states.action.apply, amalgebra.states.coupled.coupling_matrix

References
==========

.. [1] G. Breit and I. I. Rabi, Phys. Rev. 38, 2082 (1931).
"""

from itertools import product

from sympy import Add, ImmutableMatrix, S, conjugate, expand_mul, eye, zeros
from sympy.printing.defaults import Printable

from .._deadline import Deadline
from ..notation import NotationHooks
from ..errors import StateError
from ..qnumbers import half_integer
from .basis import Basis, boson_labels, product_basis, read_spaces
from .coupled import CoupledKet, coupled_basis
from .eigen import DEFAULT_TIME_BUDGET, block_eigenvalues
from .engine import compile_operator
from .kets import _factor_map, _label_key, _mode_map, components

__all__ = ["hamiltonian_matrix", "HamiltonianMatrix", "OperatorMatrix", "Block", "operator_matrix"]


class Block:
    """One diagonal block: ``indices`` into the basis, ``quantum_numbers`` (dict), ``matrix`` (immutable)."""

    __slots__ = ("indices", "quantum_numbers", "matrix")

    def __init__(self, indices, quantum_numbers, matrix):
        self.indices = tuple(indices)
        self.quantum_numbers = dict(quantum_numbers)
        self.matrix = ImmutableMatrix(matrix)

    @property
    def size(self):
        return len(self.indices)

    def eigenvalues(self, time_budget=DEFAULT_TIME_BUDGET):
        """The :class:`~amalgebra.states.eigen.Eigenvalues` of the block (never ``None``).

        Factors of the characteristic polynomial are solved exactly (cubic
        and quartic formulas included) while ``time_budget`` seconds of wall
        time last (default 10 s; ``None``: no limit).  The budget interrupts
        whichever step is running (see :func:`~amalgebra.states.eigen.block_eigenvalues`);
        what is left is listed in ``.unsolved`` and the step in ``.interrupted``, with the reason.
        """
        return block_eigenvalues(self.matrix, time_budget)

    def __repr__(self):
        qn = ", ".join(f"{k}={v}" for k, v in self.quantum_numbers.items())
        return f"Block({qn}, size={self.size})"


class OperatorMatrix(Printable):
    """An exact matrix with its basis: ``matrix`` (``ImmutableMatrix``) and ``basis`` (:class:`Basis`).

    ``sympify(obj)`` and ``obj._sympy_()`` give the matrix, so it enters SymPy
    Matrix arithmetic (``hm.matrix * v``, ``sympify(hm) * v``); :meth:`index`
    and :meth:`select` pass through to the basis; :attr:`blocks` splits by
    conserved quantum numbers.

    Examples
    ========

    >>> from sympy import Rational, eye, sympify
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.matrices.explicit import to_matrix
    >>> J = AngularMomentum("J")
    >>> om = to_matrix(J.x, {"J": "1/2"}, with_basis=True)
    >>> om.shape, [str(state) for state in om.basis]
    ((2, 2), ['|1/2, 1/2>_J', '|1/2, -1/2>_J'])
    >>> om.matrix
    Matrix([
    [  0, 1/2],
    [1/2,   0]])
    >>> om.select(M=Rational(-1, 2)), om.index(om.basis[1])
    ((1,), 1)

    For spin 1/2, :math:`J_x^2 = 1/4` (common practice):

    >>> sympify(om) ** 2 == eye(2) / 4
    True
    """

    __slots__ = ("matrix", "basis", "_blocks", "_conserved")

    def __init__(self, matrix, basis):
        self.matrix = ImmutableMatrix(matrix)
        self.basis = basis if isinstance(basis, Basis) else Basis(basis, ())
        self._blocks = self._conserved = None

    def _sympy_(self):
        return self.matrix

    @property
    def shape(self):
        return self.matrix.shape

    def index(self, state):
        """Row/column of ``state`` (see :meth:`Basis.index`)."""
        return self.basis.index(state)

    def select(self, **wanted):
        """Indices of the basis states with the given quantum numbers (see :meth:`Basis.select`)."""
        return self.basis.select(**wanted)

    def submatrix(self, indices):
        """The immutable submatrix on ``indices`` (rows and columns)."""
        return self.matrix.extract(list(indices), list(indices))

    @property
    def blocks(self):
        """The diagonal blocks by conserved quantum numbers (a list of :class:`Block`; module docstring).

        Found on first use; :attr:`conserved` names the quantum numbers they are labelled by.
        """
        self._find()
        return self._blocks

    @property
    def conserved(self):
        """The conserved quantum numbers that label :attr:`blocks` (``("M",)``, ``("M", "parity")``, ...)."""
        self._find()
        return self._conserved

    def _find(self):
        if self._blocks is None:
            blocks, conserved = _find_blocks(self.matrix, self.basis)
            self._blocks, self._conserved = list(blocks), tuple(conserved)

    def __repr__(self):
        return f"OperatorMatrix(size={self.matrix.shape[0]}, basis={self.basis!r})"

    def _sympystr(self, printer):
        return repr(self)

    def _latex(self, printer, exp=None):
        return printer._print(self.matrix)

    def _pretty(self, printer):
        return printer._print(self.matrix)


class HamiltonianMatrix(NotationHooks, OperatorMatrix):
    """The result of :func:`hamiltonian_matrix`: ``matrix``, ``basis``, ``blocks``, ``conserved``.

    Printable: ``str``/``repr`` give a summary; LaTeX and pretty give the matrix (Jupyter shows it).

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states.hamiltonian import hamiltonian_matrix
    >>> b = symbols("b", positive=True)
    >>> S = AngularMomentum("S")
    >>> hm = hamiltonian_matrix(b * S.z, {"S": 1})
    >>> hm
    HamiltonianMatrix(size=3, conserved=('M',), blocks=[1, 1, 1])
    >>> [(blk.quantum_numbers["M"], blk.matrix[0, 0]) for blk in hm.blocks]
    [(1, b), (0, 0), (-1, -b)]

    Identity check: the block eigenvalues together are those of the whole matrix:

    >>> sorted((v for _, ev in hm.eigenvalues() for v in ev), key=str) == sorted(hm.matrix.eigenvals(), key=str)
    True
    """

    __slots__ = ()
    _notation_key = "hamiltonian_matrix"

    def __init__(self, matrix, basis, blocks, conserved):
        OperatorMatrix.__init__(self, matrix, basis)
        self._blocks = list(blocks)
        self._conserved = tuple(conserved)

    def __repr__(self):
        return str(self)    # the summary of the notation hook, not OperatorMatrix's

    def eigenvalues(self, time_budget=DEFAULT_TIME_BUDGET):
        """``[(block, Eigenvalues), ...]`` in block order (see :meth:`Block.eigenvalues`).

        ``time_budget`` (seconds of wall time, default 10; ``None``: no limit) is
        shared by all blocks: each block gets what the blocks before it left.
        Once it is spent, blocks of size 1 and 2 are still solved (they need no
        budget); larger ones are returned at once, ``interrupted`` at their first step.
        """
        if time_budget is None:
            return [(blk, blk.eigenvalues(None)) for blk in self.blocks]
        shared = Deadline(time_budget, "time_budget")      # validates it
        return [(blk, blk.eigenvalues(shared.remaining())) for blk in self.blocks]


def _read_js(js):
    pairs = list(js.items()) if isinstance(js, dict) else [tuple(p) for p in js]
    if not pairs:
        raise StateError("js must name at least one label")
    labels = [str(lab) for lab, _ in pairs]
    if len(set(labels)) != len(labels):
        raise StateError(f"labels={labels} must be distinct")
    return labels, dict(pairs)


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
    """``{(row, col): value}`` of the nonzero entries of ``op`` on product kets (through the engine)."""
    from .action import _basis_values, _target

    index = {k: i for i, k in enumerate(kets)}
    entries = {}
    for col, k in enumerate(kets):
        labels, modes, start = _basis_values(k)
        compiled = compile_operator(op, labels, modes)
        for target, amp in compiled.act({start: S.One}).items():
            state = _target(labels, modes, target)
            row = index.get(state)
            if row is None:
                raise StateError(f"kets must span a space closed under op: {state} is missing")
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


def hamiltonian_matrix(op, js, basis="uncoupled", *, reduced=None, convention="edmonds"):
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

    A direct sum of multiplets, the same basis as :func:`~amalgebra.matrices.explicit.to_matrix`:

    >>> from amalgebra.matrices.explicit import to_matrix
    >>> L = AngularMomentum("L")
    >>> hs = hamiltonian_matrix(A * L.squared + L.z, {"L": [0, 1]})
    >>> hs.matrix == to_matrix(A * L.squared + L.z, {"L": [0, 1]}), hs.conserved
    (True, ('M', 'j_L'))
    >>> hs.select(M=0)
    (0, 2)
    """
    from ..matrices.explicit import to_matrix

    labels, given = _read_js(js)
    bosons = boson_labels(op)
    spaces, occupations = read_spaces(given, bosons, "js")
    unc = product_basis(given, bosons)
    if isinstance(basis, str):
        if basis == "uncoupled":
            mat = to_matrix(op, given, reduced=reduced, convention=convention)
            return HamiltonianMatrix(mat, unc, *_find_blocks(mat, unc))
        if basis != "coupled":
            raise StateError(f"basis={basis!r} must be 'uncoupled', 'coupled' or a list of states")
        if occupations:
            raise StateError(f"basis='coupled' couples angular momenta only; with the boson modes "
                             f"{list(occupations)} use basis='uncoupled' or give a list of states")
        if len(labels) < 2:
            raise StateError("basis='coupled' needs at least two labels")
        # a direct sum couples each choice of j (first label outermost, j in the order given)
        states = [k for choice in product(*(spaces[label] for label in labels))
                  for k in coupled_basis(list(choice), labels)]
        checked = True
    else:
        states = list(basis)
        if not states:
            raise StateError("basis must hold at least one state")
        checked = False
    comps = [components(s, name=f"basis[{i}]") for i, s in enumerate(states)]
    for i, comp in enumerate(comps):
        for b in comp:
            if sorted(_factor_map(b)) + sorted(_mode_map(b)) != sorted(spaces) + sorted(occupations):
                raise StateError(f"basis[{i}]={states[i]} must carry the labels {sorted(spaces)}"
                                 + (f" and the modes {sorted(occupations)}" if occupations else ""))
    index = {k: i for i, k in enumerate(unc.states)}
    cols = []
    for i, comp in enumerate(comps):
        try:
            cols.append({index[b]: c for b, c in comp.items()})
        except KeyError as exc:
            raise StateError(f"basis[{i}]={states[i]} must lie in the space js={given}: "
                             f"{exc.args[0]} is outside") from None
    if not checked:
        identity = {(i, i): S.One for i in range(len(unc))}
        if _sandwich(cols, identity, cols, len(unc)) != eye(len(states)):
            raise StateError("basis must be orthonormal (its Gram matrix is not the identity)")
    full = to_matrix(op, given, reduced=reduced, convention=convention)
    entries = {(r, c): full[r, c] for r in range(full.rows) for c in range(full.cols) if full[r, c] != 0}
    mat = _sandwich(cols, entries, cols, len(unc))
    target = Basis(states, tuple(spaces), modes=tuple(occupations))
    return HamiltonianMatrix(mat, target, *_find_blocks(mat, target))


def _blocks_by(groups, nonzero):
    """True when no nonzero entry ``(r, c)`` joins different groups (keys -> index lists)."""
    owner = {}
    for key, idx in groups.items():
        for i in idx:
            owner[i] = key
    return all(owner[r] == owner[c] for r, c in nonzero)


def _components(nonzero, indices):
    """Connected components of the nonzero pattern restricted to ``indices`` (sorted lists)."""
    parent = {i: i for i in indices}

    def find(a):
        while parent[a] != a:
            parent[a] = parent[parent[a]]
            a = parent[a]
        return a

    for r, c in nonzero:
        if r in parent and c in parent:
            parent[find(r)] = find(c)
    groups = {}
    for i in indices:
        groups.setdefault(find(i), []).append(i)
    return sorted(groups.values())


def _label_js(basis, qns):
    """Per state ``{label: j}`` when every state has a definite j for every label, else ``None``."""
    if basis.values is not None:
        return [{label: qn[label][0] for label in basis.labels} for qn in qns]
    out = []
    for state in basis.states:
        if isinstance(state, CoupledKet):
            out.append(dict(zip(state.labels, state.js)))
            continue
        seen = {}
        for b in components(state):
            for label, (j, _) in _factor_map(b).items():
                if seen.setdefault(label, j) != j:
                    return None
        out.append(seen)
    return out


def _candidates(basis):
    """``[(name, per-state value or None)]``: the quantum numbers a block may be labelled by."""
    n = len(basis)
    qns = [basis.quantum_numbers(i) for i in range(n)]
    out = []
    ms = [qn.get("M") for qn in qns]
    if all(m is not None for m in ms):
        out.append(("M", ms))
    if basis.modes:
        ns = [qn.get("N") for qn in qns]
        if all(x is not None for x in ns):
            out.append(("N", ns))
            if all(m is not None for m in ms):
                # excitation number: a spin flip paid by one quantum (J+ a + J- a+) keeps M + N
                out.append(("M+N", [m + x for m, x in zip(ms, ns)]))
    fs = [qn.get("F") for qn in qns]
    if all(f is not None for f in fs) and all(isinstance(s, CoupledKet) for s in basis.states):
        out.append(("F", fs))
    jmaps = _label_js(basis, qns)
    if jmaps is not None and n:
        orbital = []
        for label in sorted(jmaps[0], key=_label_key):
            js = [jm.get(label) for jm in jmaps]
            if None in js or len(set(js)) < 2:
                continue
            out.append((f"j_{label}", js))
            if all(j.is_integer for j in js):
                orbital.append(label)
        if orbital:
            # parity (-1)^(sum of l) over the orbital labels: those given several integer j (see hamiltonian_matrix)
            out.append(("parity", [(-1) ** int(sum(jm[label] for label in orbital)) for jm in jmaps]))
    return out


def _find_blocks(mat, basis):
    n = mat.shape[0]
    nonzero = [key for key, value in mat.todok().items() if value != 0]
    conserved, keys = [], [() for _ in range(n)]
    for name, values in _candidates(basis):
        groups = {}
        for i in range(n):
            groups.setdefault(keys[i] + (values[i],), []).append(i)
        if _blocks_by(groups, nonzero):
            refined = len(groups) > len(set(keys))
            if name not in ("parity", "M+N") or refined:     # reported only when they split something new
                conserved.append(name)
                keys = [keys[i] + (values[i],) for i in range(n)]
    groups = {}
    for i in range(n):
        groups.setdefault(keys[i], []).append(i)
    # order: by the conserved values, M and F descending, then first index
    order = sorted(groups, key=lambda key: tuple(-v for v in key))
    blocks = []
    for key in order:
        for idx in _components(nonzero, groups[key]):
            qn = dict(zip(conserved, key))
            if "M" not in qn:
                ms = {basis.quantum_numbers(i).get("M") for i in idx}
                if len(ms) == 1 and None not in ms:
                    qn["M"] = ms.pop()
            blocks.append(Block(idx, qn, mat.extract(idx, idx)))
    return blocks, conserved
