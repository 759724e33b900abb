r"""Explicit matrices of operator expressions, and identity checks on them.

Explanation
===========

:func:`to_matrix` puts an operator polynomial into its canonical m-shift form
(:func:`amalgebra.algebra.canonical`) and reads the matrix off term by term:
a term :math:`J_+^d\, p(J^2, J_z)` is a shifted diagonal,

.. math::

    \langle j, m + d | J_+^d\, p(J^2, J_z) | j m \rangle
      = p(j(j+1), m) \prod_{k=0}^{d-1} \sqrt{(j - m - k)(j + m + k + 1)}

(Condon-Shortley phase; :math:`J_-^{d}` likewise with
:math:`\prod_{k<d} \sqrt{(j + m - k)(j - m + k + 1)}`).

Basis and order (fixed): for one label the basis is :math:`|j m\rangle` with
``m = j, j-1, ..., -j`` (row/column 0 is ``m = j``).  A label given a list of
j values, e.g. ``{"L": [0, 1, 2]}``, has the direct sum of those multiplets:
the j values in the order given, ``m`` descending within each (the order of
:func:`~amalgebra.tensors.spherical.tensor_matrix`).  For several labels the
space is the Kronecker product over the labels **in sorted order** (the
package's one label order, :func:`amalgebra._validation.label_key`:
alphabetical with ``"S2"`` before ``"S10"``), the first sorted label being
the outermost (slowest-varying) factor, as in ``numpy.kron(A_I, A_J)``.
``with_basis=True`` returns an
:class:`~amalgebra.states.hamiltonian.OperatorMatrix`: the immutable matrix
and its :class:`~amalgebra.states.basis.Basis` (the same order as
:func:`~amalgebra.states.hamiltonian.hamiltonian_matrix`).
Labels in ``j`` that do not appear in the expression contribute an identity
factor.

Expressions may also contain spherical tensor components :math:`T^k_q` and
Cartesian vector components (:mod:`amalgebra.tensors`): their matrices come
from the Wigner-Eckart theorem (Edmonds normalisation, design.md) with
symbolic or given reduced elements; see :func:`to_matrix`.  Every exact
matrix comes from the one engine, :mod:`amalgebra.states.engine`, column by
column (the action on each basis state; angular-momentum polynomials through
their canonical form as above, tensor components by Wigner-Eckart, words of a
sum sharing the action of their common right-hand parts), so a product of
tensor components is the product of their matrices on the given space.  The
float kinds are the numeric layer: the vectorised read-off above for
angular-momentum polynomials on single multiplets, products of numpy/scipy
matrices of the atoms (:mod:`amalgebra.matrices.multiplets`) otherwise, with
the ladder factor of :mod:`amalgebra._exact` and the Wigner-Eckart factor of
:mod:`amalgebra.tensors.wigner_eckart` in both.

``kind="exact"`` returns a SymPy ``Matrix`` (free symbols in coefficients are
kept); ``kind="float"`` a ``numpy.ndarray`` (complex only when needed: on the
canonical-form route when a coefficient is complex, on the product route when
an entry has a nonzero imaginary part);
``kind="sparse"`` a ``scipy.sparse.csr_array``.  The float kinds refuse free
symbols unless ``subs`` gives them numeric values.  numpy and scipy are
optional: install ``amalgebra[numeric]``.

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.matrices.explicit import to_matrix, verify_identity
>>> J = AngularMomentum("J")
>>> to_matrix(J.plus, {"J": "1/2"})
Matrix([
[0, 1],
[0, 0]])
>>> to_matrix(J.x**2 + J.y**2 + J.z**2, {"J": 1}) == 2*to_matrix(J.z**0, {"J": 1})   # j(j+1) = 2
True
>>> verify_identity(J.plus*J.minus, J.squared - J.z**2 + J.z, {"J": [0, "1/2", 1, "3/2"]}).holds
True

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (1957), eq. (2.3.5)
       style ladder matrix elements with the Condon-Shortley phase.
"""

from itertools import product
from math import prod

from sympy import Matrix, S, Tuple, expand, simplify, zeros
from sympy.printing.defaults import Printable

from .. import notation
from ..algebra.convert import _check_expr, angular_momentum_kernel
from .._exact import ladder_float_array
from .._validation import label_key
from ..errors import ConventionError, NotNumericError, OperatorError
from ..limits import check_limit
from ..states.engine import check_reduced, kernel_only
from ..tensors.wigner_eckart import check_convention
from .multiplets import _FloatOps, multiplet_basis, multiplet_matrix, require_numpy, require_scipy_sparse

__all__ = ["to_matrix", "verify_identity", "assert_identity", "IdentityCheck"]

_KINDS = ("exact", "float", "sparse")


_LISTS = (list, tuple, Tuple)


def _check_j(j, bosons=()):
    """``(spaces, occupations, listed)``: label -> tuple of j values, mode -> tuple of occupations (both in
    package label order), and whether a list of j values was given.

    The space is read by the one reader, :func:`amalgebra.states.basis.read_spaces`
    (``OperatorError`` for a malformed dict or label, as everywhere in ``to_matrix``);
    ``bosons`` are the modes of the operator, each of which needs a cutoff.
    """
    from ..states.basis import read_spaces

    spaces, occupations = read_spaces(j, bosons, "j", OperatorError)
    for mode in bosons:
        if mode not in occupations:
            raise OperatorError(f"mode={mode!r} of the operator must have an occupation cutoff in j: give "
                                f"j[{mode!r}] = n_max (occupations 0..n_max) or a range of occupations")
    return spaces, occupations, any(isinstance(v, _LISTS) for v in j.values())


def _check_size(spaces, kind, occupations=None):
    """Refuse, before any work, a space beyond the limits of :mod:`amalgebra.limits`."""
    dim = prod(sum(int(2 * jv) + 1 for jv in js) for js in spaces.values())
    dim *= prod(len(ns) for ns in (occupations or {}).values())
    check_limit("max_dimension", dim, "dimension", "the product over labels of the sums of 2j + 1 in j")
    if kind != "sparse":
        check_limit("max_dense_entries", dim * dim, "dimension^2", f"entries of a dense {kind} matrix; "
                    "kind='sparse' stores only the nonzero ones")


def _plan(expr, jvals):
    """Convert to the kernel (one j per label) and return what the builders need."""
    labels = sorted(jvals, key=label_key)
    algebra, element = angular_momentum_kernel(expr, labels, "to_matrix", "a j value")
    dims = [int(2 * jvals[label]) + 1 for label in labels]
    return algebra, element, labels, jvals, dims


def to_matrix(expr, j, kind="exact", subs=None, reduced=None, convention="edmonds", with_basis=False):
    r"""Matrix of ``expr`` on a space of :math:`|j m\rangle` multiplets (see the module docstring).

    Explanation
    ===========

    ``j`` maps each label to one j (the single multiplet ``m = j, ..., -j``)
    or to a sequence of j values, meaning the direct sum of those multiplets
    in the order given, ``m`` descending inside each.  Angular-momentum
    components are block diagonal there.  A tensor component
    :math:`T^k_q` (:class:`~amalgebra.tensors.spherical.TensorComponent`) or a
    vector component (:class:`~amalgebra.tensors.vectors.VectorComponent`)
    acts on the space of its family's label, by the Wigner-Eckart theorem,
    by default in the Edmonds normalisation (design.md; ``convention="cg"``
    for the Clebsch-Gordan form):

    .. math::

        \langle j' m'|T^k_q|j m\rangle = (-1)^{j'-m'}
        \begin{pmatrix} j' & k & j\\ -m' & q & m\end{pmatrix} \langle j'\|T^k\|j\rangle,

    for every pair of multiplets of the label, including :math:`j' = j`
    (a single j value is the one-multiplet space: only
    :math:`\langle j\|T^k\|j\rangle` enters).  A vector ``V`` is its rank-1
    view with :math:`V_{\pm1} = \mp(V_x \pm iV_y)/\sqrt2`, :math:`V_0 = V_z`,
    so :math:`V_x = (V_{-1} - V_{+1})/\sqrt2`,
    :math:`V_y = i(V_{+1} + V_{-1})/\sqrt2`; its reduced elements are
    :math:`\langle j'\|V^{(1)}\|j\rangle` under the vector's name.  Operators
    of different labels act on different factors of the product space, so
    their matrices commute.

    Boson modes (:class:`~amalgebra.bosons.BosonMode`) of ``expr`` take an
    occupation cutoff in ``j``: ``{"S": "1/2", "a": 4}`` is the spin times
    :math:`n_a = 0, \dots, 4`; a ``range`` gives the occupations explicitly and
    marks a mode that ``expr`` does not act on (a plain number there would be
    read as a j).  The modes follow the angular momenta in the basis (label
    order, the first outermost, ``n`` ascending) and the matrix is
    :math:`P\,O\,P` for the projector :math:`P` on the kept occupations: the
    operator acts exactly on each basis state and the image is cut, so
    ``a*a.create`` gives ``N + 1`` up to the top occupation (not the product of
    two cut ladder matrices).  The float kinds are converted from the exact
    matrix there.

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.bosons import BosonMode
    >>> spin, a = AngularMomentum("S"), BosonMode("a")
    >>> to_matrix(spin.plus * a.annihilate + spin.minus * a.create, {"S": "1/2", "a": 1})   # |up 0>, |up 1>, |down 0>, |down 1>
    Matrix([
    [0, 0, 0, 1],
    [0, 0, 0, 0],
    [0, 0, 0, 0],
    [1, 0, 0, 0]])
    >>> to_matrix(a.annihilate * a.create, {"a": 2})
    Matrix([
    [1, 0, 0],
    [0, 2, 0],
    [0, 0, 3]])

    Reduced elements: by default the family's own ``reduced(j', j)`` (a
    symbol :math:`\langle j'\|T^k\|j\rangle` for ``kind="abstract"``, the
    known values for ``"unit"`` and ``"racah"``; the Racah tensor
    :math:`C^k` needs integer j values, orbital ``l``).  ``reduced`` overrides
    them per family.  They are used as given: hermiticity relations between
    :math:`\langle j'\|T\|j\rangle` and :math:`\langle j\|T\|j'\rangle` are not
    imposed.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.matrices.explicit import to_matrix
    >>> J, S = AngularMomentum("J"), AngularMomentum("S")
    >>> to_matrix(J.z, {"J": 1})
    Matrix([
    [1, 0,  0],
    [0, 0,  0],
    [0, 0, -1]])
    >>> to_matrix(2*S.z, {"J": 0, "S": "1/2"}, kind="float")
    array([[ 1.,  0.],
           [ 0., -1.]])

    A tensor component on the direct sum :math:`l = 0 \oplus 1` (basis
    :math:`|0 0\rangle, |1 1\rangle, |1 0\rangle, |1 {-1}\rangle`):

    >>> from amalgebra.tensors import SphericalTensor, racah_tensor
    >>> L = AngularMomentum("L")
    >>> T = SphericalTensor("T", 1, "L")
    >>> to_matrix(T[1], {"L": [0, 1]})
    Matrix([
    [                      0, 0,                        0,  sqrt(3)*<0||T^(1)||1>/3],
    [sqrt(3)*<1||T^(1)||0>/3, 0, -sqrt(6)*<1||T^(1)||1>/6,                        0],
    [                      0, 0,                        0, -sqrt(6)*<1||T^(1)||1>/6],
    [                      0, 0,                        0,                        0]])
    >>> to_matrix(T[1], {"L": [0, 1]}, reduced={T: {(1, 0): 3}})[1, 0]     # sqrt(3)/3 * 3
    sqrt(3)

    An identity, :math:`[L_z, T^1_q] = q\,T^1_q`, and the dipole element
    :math:`\langle 1 0|C^1_0|0 0\rangle = 1/\sqrt3`:

    >>> M = {"L": [0, 1, 2]}
    >>> to_matrix(L.z*T[-1] - T[-1]*L.z, M) == -to_matrix(T[-1], M) != to_matrix(0, M)
    True
    >>> to_matrix(racah_tensor(1)[0], {"L": [0, 1]})[2, 0]
    sqrt(3)/3

    Parameters
    ==========

    expr : Expr
        Operator polynomial in angular-momentum, tensor and vector components.
    j : dict
        label -> j (int, Rational, ``"3/2"``, ...) or a list/tuple of distinct
        j values (a direct sum), validated by :mod:`amalgebra.qnumbers`; mode ->
        occupation cutoff ``n_max`` or a ``range`` of occupations; must cover
        every label and mode of ``expr``.
    kind : {"exact", "float", "sparse"}
    subs : dict, optional
        Values for free symbols of the coefficients and for symbolic reduced
        elements (applied to the exact entries too).
    reduced : dict, optional
        ``{family: values}`` with ``family`` a
        :class:`~amalgebra.tensors.spherical.SphericalTensor` or a
        :class:`~amalgebra.tensors.vectors.VectorOperator`, and ``values``
        either a dict ``{(j', j): value}`` (missing pairs are zero, as in
        :func:`~amalgebra.tensors.spherical.tensor_matrix`) or a callable
        ``values(j', j)`` (Rationals in, a number or expression out).
    convention : {"edmonds", "cg"}
        Normalisation of the reduced elements (given or symbolic):
        ``"edmonds"`` (design.md, the default) or the Clebsch-Gordan form
        :math:`\langle j'm'|T^k_q|jm\rangle = \langle j m\, k q|j'm'\rangle
        \langle j'\|T^k\|j\rangle_{\mathrm{cg}}`
        (:func:`~amalgebra.tensors.wigner_eckart.convert_reduced` converts).
    with_basis : bool
        Return an :class:`~amalgebra.states.hamiltonian.OperatorMatrix`
        (``.matrix`` immutable, ``.basis`` the ordered kets, ``index``,
        ``select(M=0)``, ``blocks()``) instead of the bare matrix.

    Raises
    ======

    QuantumNumberError
        A j value is not a nonnegative integer or half-integer, a list is
        empty or repeats a j, or a Racah tensor meets a half-integer j.
    ConventionError
        ``kind`` or ``convention`` is unknown.
    OperatorError
        A label of ``expr`` (or of a tensor or vector in it) has no j value,
        ``expr`` is not an operator polynomial, or ``reduced`` is malformed.
    NotNumericError
        Free symbols (or symbolic reduced elements) remain for a float kind.
    LimitError
        The dimension exceeds ``max_dimension`` (default 10^6), or its square
        ``max_dense_entries`` (default 10^7) for the dense kinds ``"exact"`` and
        ``"float"``, or an operator power exceeds ``max_power``; checked before
        any work (:mod:`amalgebra.limits` says how to raise them).

    See Also
    ========

    amalgebra.tensors.spherical.tensor_matrix, amalgebra.tensors.wigner_eckart.wigner_eckart
    """
    if kind not in _KINDS:
        raise ConventionError(f"kind={kind!r} must be one of {', '.join(_KINDS)}")
    convention = check_convention(convention)
    from ..states.basis import boson_labels

    bosons = boson_labels(expr)
    spaces, occupations, listed = _check_j(j, bosons)
    _check_size(spaces, kind, occupations)
    table = check_reduced(reduced)
    expr = _check_expr(expr)
    if subs is not None and not isinstance(subs, dict):
        raise NotNumericError(f"subs={subs!r} must be a dict symbol -> value (or None)")
    if kind == "exact" or occupations:
        # boson modes: the float kinds are the exact P O P in numbers (one route, no float ladder of its own)
        matrix = _exact(expr, spaces, subs, table, convention, occupations)
        if kind != "exact":
            matrix = _numeric_from_exact(matrix, kind)
    elif listed or not kernel_only(expr) or list(spaces) != sorted(spaces):
        # (the vectorised read-off below follows the kernel's plain string order of labels; when the
        # package's label order differs, e.g. S2 < S10, the product route keeps the one order)
        matrix = multiplet_matrix(expr, spaces, kind, subs, table, convention)
    else:
        algebra, element, labels, jvals, dims = _plan(expr, {label: js[0] for label, js in spaces.items()})
        matrix = _floating(algebra, element, labels, jvals, dims, kind, subs)
    if with_basis:
        from ..states.basis import product_basis
        from ..states.hamiltonian import OperatorMatrix

        return OperatorMatrix(matrix, product_basis(j, bosons))
    return matrix


def _exact(expr, spaces, subs, table, convention, occupations=None):
    """The exact matrix through the one engine (:mod:`amalgebra.states.engine`), on the product basis.

    Boson modes (``occupations``: mode -> occupations kept) come after the
    angular momenta; the operator acts on each column state exactly and the
    image is cut to the kept occupations, so the matrix is ``P O P`` with
    ``P`` the projector on the truncated space (not a product of truncated
    ladder matrices: ``P a P a^dagger P`` differs from ``P a a^dagger P`` at
    the cutoff).
    """
    from ..states.engine import compile_operator, matrix_entries

    labels = list(spaces)
    modes = list(occupations or {})
    per_label = [multiplet_basis(spaces[label]) for label in labels]
    per_label += [[(S.Zero, n) for n in occupations[mode]] for mode in modes]
    states = [tuple(v) for v in product(*per_label)]
    try:
        compiled = compile_operator(expr, labels, modes)
    except OperatorError as exc:
        raise OperatorError(str(exc).replace("of the state", "given a j value").replace(
            "the state carries", "j has").replace("which the state must carry", "which j must give")) from None
    entries = matrix_entries(compiled, states, table, convention, spaces, subs)
    n = len(states)
    out = zeros(n, n)
    for (r, c), value in entries.items():
        out[r, c] = value
    return out


def _numeric_from_exact(matrix, kind):
    """The float (numpy) or sparse (scipy) array of an exact matrix of numbers (the numeric layer's own
    conversion, :class:`~amalgebra.matrices.multiplets._FloatOps`: free symbols refused, real when it can be)."""
    ops = _FloatOps(matrix.rows, None, kind == "sparse")
    entries = {key: ops.number(value) for key, value in matrix.todok().items()}
    return ops.finish(ops._array(entries, matrix.rows))


def _complex_coefficients(algebra, element, subs):
    table = {}
    complex_needed = False
    for key in sorted(element):
        rows = []
        for mon, c in sorted(algebra.terms(element[key]), key=lambda item: item[0]):
            number = None if subs else _fast_complex(algebra.domain, c)
            if number is not None:
                number = number / element.den
                complex_needed = complex_needed or number.imag != 0
                rows.append((mon, number))
                continue
            value = algebra.coefficient(element, c)
            if subs:
                value = value.subs(subs)
            if value.free_symbols:
                names = ", ".join(sorted(str(s) for s in value.free_symbols))
                raise NotNumericError(f"coefficient={value} must be numeric for a float matrix: "
                                      f"give subs for {names} or use kind='exact'")
            number = complex(value)
            if number.imag != 0:
                complex_needed = True
            rows.append((mon, number))
        table[key] = rows
    if not complex_needed:
        table = {key: [(mon, number.real) for mon, number in rows] for key, rows in table.items()}
    return table, complex_needed


def _fast_complex(domain, c):
    """complex(c) for the plain numeric domains, without going through SymPy."""
    if domain.is_ZZ:
        return complex(int(c))
    if domain.is_QQ:
        return complex(int(c.numerator) / int(c.denominator))
    if domain.is_GaussianRing or domain.is_GaussianField:
        return complex(int(c.x), int(c.y)) if domain.is_GaussianRing else complex(float(c.x), float(c.y))
    return None


def _floating(algebra, element, labels, jvals, dims, kind, subs):
    np = require_numpy()
    table, complex_needed = _complex_coefficients(algebra, element, subs)
    dtype = complex if complex_needed else float
    js = [float(jvals[label]) for label in labels]
    ms = [js[i] - np.arange(dim, dtype=float) for i, dim in enumerate(dims)]
    n = prod(dims)
    all_rows, all_cols, all_data = [], [], []
    for key, monomials in table.items():
        # per label: valid columns, their target rows, and the ladder factor
        cols_1d, rows_1d, lad_1d = [], [], []
        empty = False
        for i, d in enumerate(key):
            c = np.arange(dims[i])
            r = c - d
            ok = (r >= 0) & (r < dims[i])
            c, r, m = c[ok], r[ok], ms[i][ok]
            if len(c) == 0:
                empty = True
                break
            cols_1d.append(c)
            rows_1d.append(r)
            lad_1d.append(ladder_float_array(js[i], m, d))    # row r = c - d holds m + d (row 0 is m = j)
        if empty:
            continue
        data = np.zeros(prod(len(c) for c in cols_1d), dtype=dtype)
        for mon, coeff in monomials:
            factors = []
            for i in range(len(labels)):
                gq, gm = algebra.var_index[i]
                q = js[i] * (js[i] + 1)
                m = ms[i][cols_1d[i]]
                factors.append((q ** mon[gq]) * m ** mon[gm] if mon[gm] else
                               np.full(len(cols_1d[i]), q ** mon[gq]))
            data = data + coeff * _outer(np, factors)
        data = data * _outer(np, lad_1d)
        strides = [prod(dims[i + 1:]) for i in range(len(dims))]
        all_cols.append(_outer_index(np, cols_1d, strides))
        all_rows.append(_outer_index(np, rows_1d, strides))
        all_data.append(data)
    if all_data:
        rows = np.concatenate(all_rows)
        cols = np.concatenate(all_cols)
        data = np.concatenate(all_data)
    else:
        rows = cols = np.zeros(0, dtype=int)
        data = np.zeros(0, dtype=dtype)
    if kind == "sparse":
        keep = data != 0
        rows, cols, data = rows[keep], cols[keep], data[keep]
        sparse = require_scipy_sparse()
        return sparse.csr_array((data, (rows, cols)), shape=(n, n))
    out = np.zeros((n, n), dtype=dtype)
    out[rows, cols] = data  # (row, col) pairs are distinct: a column fixes the row per shift key
    return out


def _outer(np, vectors):
    if len(vectors) == 1:
        return vectors[0]
    result = vectors[0]
    for v in vectors[1:]:
        result = np.multiply.outer(result, v)
    return np.ravel(result)


def _outer_index(np, indices, strides):
    if len(indices) == 1:
        return indices[0]
    result = indices[0] * strides[0]
    for idx, s in zip(indices[1:], strides[1:]):
        result = np.add.outer(result, idx * s)
    return np.ravel(result)


class IdentityCheck(Printable):
    """Result of :func:`verify_identity`: ``.holds``, ``.first_mismatch``, ``.checked``.

    ``first_mismatch`` is ``None`` or a dict with keys ``j`` (the j values),
    ``row``, ``col``, ``m_row``, ``m_col`` (the m values of those basis
    states, one per label in sorted label order; ``(j, m)`` pairs for a label
    given a list of j), ``lhs`` and ``rhs`` (the two entries).  ``bool(result)`` is ``result.holds``.
    """

    __slots__ = ("holds", "first_mismatch", "checked")

    def __init__(self, holds, first_mismatch, checked):
        self.holds = holds
        self.first_mismatch = first_mismatch
        self.checked = checked

    def __bool__(self):
        return self.holds

    def _latex(self, printer, exp=None):
        return notation.identity_check_latex(printer, self, exp)

    def _pretty(self, printer):
        return notation.identity_check_pretty(printer, self)

    def __repr__(self):
        return f"IdentityCheck(holds={self.holds}, checked={len(self.checked)} j sets)"

    def __str__(self):
        sets = "; ".join(", ".join(f"{k}={v}" for k, v in js.items()) for js in self.checked)
        if self.holds:
            return f"identity holds for {len(self.checked)} j set(s): {sets}"
        mm = self.first_mismatch
        js = ", ".join(f"{k}={v}" for k, v in mm["j"].items())
        return (f"identity fails at {js}: entry (row {mm['row']}, col {mm['col']}), "
                f"<m={mm['m_row']}| . |m={mm['m_col']}>: lhs = {mm['lhs']}, rhs = {mm['rhs']}")


def _j_sets(j_values):
    if isinstance(j_values, dict):
        labels = sorted(j_values, key=label_key)
        lists = []
        for label in labels:
            values = j_values[label]
            if isinstance(values, (list, tuple)):
                lists.append(list(values))
            else:
                lists.append([values])
        return [dict(zip(labels, combo)) for combo in product(*lists)]
    if isinstance(j_values, (list, tuple)) and all(isinstance(d, dict) for d in j_values):
        return [dict(d) for d in j_values]
    raise OperatorError(f"j_values={j_values!r} must be a dict label -> list of j, or a list of dicts")


def _same(a, b):
    if a == b:
        return True
    difference = expand(a - b)
    if difference == 0:
        return True
    return simplify(difference) == 0


def verify_identity(lhs, rhs, j_values, subs=None, reduced=None):
    r"""Compare the exact matrices of ``lhs`` and ``rhs`` for several sets of j.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.matrices.explicit import verify_identity
    >>> J = AngularMomentum("J")
    >>> result = verify_identity(J.x*J.y - J.y*J.x, J.z, {"J": [1]})   # wrong: lacks the i
    >>> result.holds
    False
    >>> print(result)
    identity fails at J=1: entry (row 0, col 0), <m=(1,)| . |m=(1,)>: lhs = I, rhs = 1

    On a direct sum of multiplets, :math:`[J_+, T^1_0] = \sqrt2\, T^1_1`
    with symbolic reduced elements:

    >>> from sympy import sqrt
    >>> from amalgebra.tensors import SphericalTensor
    >>> T = SphericalTensor("T", 1, "J")
    >>> verify_identity(J.plus*T[0] - T[0]*J.plus, sqrt(2)*T[1], [{"J": ["1/2", "3/2"]}]).holds
    True

    Parameters
    ==========

    lhs, rhs : Expr
        Operator polynomials (or commutative expressions, meaning multiples of 1).
    j_values : dict or list of dict
        ``{"J": [j1, j2, ...], "S": [...]}`` (all combinations are checked) or
        an explicit list of ``{label: j}`` dicts, each one space for
        :func:`to_matrix` (a value may be a list of j: a direct sum, which
        expressions with tensor components need to connect different j).
    subs : dict, optional
        Substitution applied to the matrix entries before comparing.
    reduced : dict, optional
        Reduced matrix elements, passed to :func:`to_matrix`.

    Returns
    =======

    IdentityCheck
    """
    from ..states.basis import boson_labels

    bosons = tuple(sorted(set(boson_labels(lhs)) | set(boson_labels(rhs)), key=label_key))
    checked = []
    for js in _j_sets(j_values):
        spaces, occupations, _ = _check_j(js, bosons)
        # a mode's cutoff as a range, so that a side without that mode (a scalar) still reads it as a mode
        js = {label: (range(int(occupations[label][-1]) + 1) if label in occupations and not isinstance(value, range)
                      else value) for label, value in js.items()}
        left = to_matrix(lhs, js, reduced=reduced)
        right = to_matrix(rhs, js, reduced=reduced)
        labels = list(spaces)
        jv = {label: spaces[label] if isinstance(js[label], _LISTS) else spaces[label][0] for label in labels}
        jv.update({mode: js[mode] for mode in occupations})
        checked.append(jv)
        for r in range(left.rows):
            for c in range(left.cols):
                a, b = left[r, c], right[r, c]
                if subs:
                    a, b = a.subs(subs), b.subs(subs)
                if not _same(a, b):
                    mm = {"j": jv, "row": r, "col": c, "m_row": _ms(jv, labels + list(occupations), r),
                          "m_col": _ms(jv, labels + list(occupations), c), "lhs": a, "rhs": b}
                    return IdentityCheck(False, mm, checked)
    return IdentityCheck(True, None, checked)


def _ms(jv, labels, index):
    """The basis state of ``index``: per label ``m``, or ``(j, m)`` for a direct sum; ``n`` for a mode."""
    bases = [list(jv[label]) if isinstance(jv[label], range) else
             multiplet_basis(jv[label] if isinstance(jv[label], tuple) else (jv[label],)) for label in labels]
    out = []
    for i in reversed(range(len(labels))):
        index, c = divmod(index, len(bases[i]))
        value = jv[labels[i]]
        out.append(bases[i][c] if isinstance(value, (tuple, range)) else bases[i][c][1])
    return tuple(reversed(out))


def assert_identity(lhs, rhs, j_values, subs=None, reduced=None):
    """Like :func:`verify_identity` but raise ``AssertionError`` (with the report) on failure.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.matrices.explicit import assert_identity
    >>> J = AngularMomentum("J")
    >>> assert_identity(J.minus*J.plus, J.squared - J.z**2 - J.z, {"J": [0, "1/2", 1, 2]})
    """
    result = verify_identity(lhs, rhs, j_values, subs=subs, reduced=reduced)
    if not result.holds:
        raise AssertionError(str(result))

