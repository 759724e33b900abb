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
``m = j, j-1, ..., -j`` (row/column 0 is ``m = j``).  For several labels the
space is the Kronecker product over the labels **in sorted order** (Python
string order, e.g. ``"I" < "J" < "L" < "S"``), the first sorted label being
the outermost (slowest-varying) factor, as in ``numpy.kron(A_I, A_J)``.
Labels in ``j`` that do not appear in the expression contribute an identity
factor.

``kind="exact"`` returns a SymPy ``Matrix`` (free symbols in coefficients are
kept); ``kind="float"`` a ``numpy.ndarray`` (complex only when needed);
``kind="sparse"`` a ``scipy.sparse.csr_array``.  The float kinds refuse free
symbols unless ``subs`` gives them numeric values.  numpy and scipy are
optional: install ``amalgebra[numeric]``.

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.numeric import to_matrix, verify_identity
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

from fractions import Fraction
from itertools import product
from math import prod

from sympy import Add, Matrix, Rational, S, expand, simplify, sqrt
from sympy.printing.defaults import Printable

from . import notation
from .algebra.convert import kernel_of
from .algebra.modes import ANGULAR_MOMENTUM
from .errors import ConventionError, NotNumericError, OperatorError
from .qnumbers import half_integer

__all__ = ["to_matrix", "verify_identity", "assert_identity", "IdentityCheck"]

_KINDS = ("exact", "float", "sparse")


def _numpy():
    try:
        import numpy
    except ImportError as exc:  # pragma: no cover - depends on the environment
        raise ImportError("to_matrix(kind='float'/'sparse') needs numpy: "
                          "pip install 'amalgebra[numeric]'") from exc
    return numpy


def _scipy_sparse():
    try:
        import scipy.sparse
    except ImportError as exc:  # pragma: no cover - depends on the environment
        raise ImportError("to_matrix(kind='sparse') needs scipy: pip install 'amalgebra[numeric]'") from exc
    return scipy.sparse


def _check_j(j):
    if not isinstance(j, dict) or not j:
        raise OperatorError(f"j={j!r} must be a non-empty dict label -> j value, e.g. {{'J': '3/2'}}")
    out = {}
    for label in sorted(j, key=str):
        if not isinstance(label, str):
            raise OperatorError(f"j key {label!r} must be a label str such as 'J'")
        out[label] = half_integer(j[label], f"j[{label!r}]", nonnegative=True)
    return out


def _plan(expr, j):
    """Validate, convert to the kernel, and return what the builders need."""
    jvals = _check_j(j)
    labels = sorted(jvals)
    algebra, (element,) = kernel_of(expr, extra_labels=labels)
    unknown = [label for label in algebra.labels if label not in jvals]
    if unknown:
        raise OperatorError(f"label={unknown[0]!r} of the expression must be given a j value "
                            f"(j has {labels})")
    for label, mode in zip(algebra.labels, algebra.modes):
        if mode is not ANGULAR_MOMENTUM:
            raise OperatorError(f"label={label!r} must be an angular momentum for to_matrix "
                                f"(it is a {mode.kind} mode)")
    dims = [int(2 * jvals[label]) + 1 for label in labels]
    return algebra, element, labels, jvals, dims


def _ladder_fraction(jv, m, d):
    """Product under the square root for <m+d|R^(d)|m>, as a Fraction (0 if out of range)."""
    value = Fraction(1)
    if d > 0:
        for k in range(d):
            value *= (jv - m - k) * (jv + m + k + 1)
    else:
        for k in range(-d):
            value *= (jv + m - k) * (jv - m + k + 1)
    return value


def to_matrix(expr, j, kind="exact", subs=None):
    """Matrix of ``expr`` in the :math:`|j m\\rangle` basis (see the module docstring).

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.numeric import to_matrix
    >>> J, S = AngularMomentum("J"), AngularMomentum("S")
    >>> to_matrix(J.z, {"J": 1})
    Matrix([
    [1, 0,  0],
    [0, 0,  0],
    [0, 0, -1]])
    >>> to_matrix(2*S.z, {"J": 0, "S": "1/2"}, kind="float")
    array([[ 1.,  0.],
           [ 0., -1.]])

    Parameters
    ==========

    expr : Expr
        Operator polynomial in angular-momentum components.
    j : dict
        label -> j (int, Rational, ``"3/2"``, ...), validated by
        :mod:`amalgebra.qnumbers`; must cover every label of ``expr``.
    kind : {"exact", "float", "sparse"}
    subs : dict, optional
        Values for free symbols of the coefficients (float kinds only).

    Raises
    ======

    QuantumNumberError
        A j value is not a nonnegative integer or half-integer.
    OperatorError
        A label of ``expr`` has no j value, or ``expr`` is not an operator polynomial.
    NotNumericError
        Free symbols remain for a float kind.
    """
    if kind not in _KINDS:
        raise ConventionError(f"kind={kind!r} must be one of {', '.join(_KINDS)}")
    algebra, element, labels, jvals, dims = _plan(expr, j)
    if kind == "exact":
        return _exact(algebra, element, labels, jvals, dims, subs)
    return _floating(algebra, element, labels, jvals, dims, kind, subs)


def _exact(algebra, element, labels, jvals, dims, subs):
    strides = [prod(dims[i + 1:]) for i in range(len(dims))]
    fr = {label: Fraction(int(jvals[label].p), int(jvals[label].q)) for label in labels}
    ms = [[fr[label] - c for c in range(dim)] for label, dim in zip(labels, dims)]
    entries = {}
    for key in sorted(element):
        poly = element[key]
        coeffs = [(mon, algebra.coefficient(element, c))
                  for mon, c in sorted(algebra.terms(poly), key=lambda item: item[0])]
        if subs:
            coeffs = [(mon, c.subs(subs)) for mon, c in coeffs]
        for cols in product(*[range(dim) for dim in dims]):
            rows = [c - d for c, d in zip(cols, key)]
            if any(r < 0 or r >= dim for r, dim in zip(rows, dims)):
                continue
            under = Fraction(1)
            point = []
            for i, label in enumerate(labels):
                m = ms[i][cols[i]]
                under *= _ladder_fraction(fr[label], m, key[i])
                point.append((fr[label] * (fr[label] + 1), m))
            if under == 0:
                continue
            value = Add(*[c * Rational(_monomial(algebra, mon, point)) for mon, c in coeffs])
            if value == 0:
                continue
            row = sum(r * s for r, s in zip(rows, strides))
            col = sum(c * s for c, s in zip(cols, strides))
            entries[(row, col)] = expand(value * sqrt(Rational(under.numerator, under.denominator)))
    n = prod(dims)
    return Matrix(n, n, lambda r, c: entries.get((r, c), S.Zero))


def _monomial(algebra, mon, point):
    value = Fraction(1)
    for i, (q, m) in enumerate(point):
        gq, gm = algebra.var_index[i]
        if mon[gq]:
            value *= q ** mon[gq]
        if mon[gm]:
            value *= m ** mon[gm]
    return value


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
    np = _numpy()
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
            lad = np.ones(len(c))
            for k in range(abs(d)):
                if d > 0:
                    lad = lad * (js[i] - m - k) * (js[i] + m + k + 1)
                else:
                    lad = lad * (js[i] + m - k) * (js[i] - m + k + 1)
            if len(c) == 0:
                empty = True
                break
            cols_1d.append(c)
            rows_1d.append(r)
            lad_1d.append(np.sqrt(lad))
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
        sparse = _scipy_sparse()
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
    states, one per label in sorted label order), ``lhs`` and ``rhs`` (the
    two entries).  ``bool(result)`` is ``result.holds``.
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
        labels = sorted(j_values)
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


def verify_identity(lhs, rhs, j_values, subs=None):
    """Compare the exact matrices of ``lhs`` and ``rhs`` for several sets of j.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.numeric import verify_identity
    >>> J = AngularMomentum("J")
    >>> result = verify_identity(J.x*J.y - J.y*J.x, J.z, {"J": [1]})   # wrong: lacks the i
    >>> result.holds
    False
    >>> print(result)
    identity fails at J=1: entry (row 0, col 0), <m=(1,)| . |m=(1,)>: lhs = I, rhs = 1

    Parameters
    ==========

    lhs, rhs : Expr
        Operator polynomials (or commutative expressions, meaning multiples of 1).
    j_values : dict or list of dict
        ``{"J": [j1, j2, ...], "S": [...]}`` (all combinations are checked) or
        an explicit list of ``{label: j}`` dicts.
    subs : dict, optional
        Substitution applied to the matrix entries before comparing.

    Returns
    =======

    IdentityCheck
    """
    checked = []
    for js in _j_sets(j_values):
        left = to_matrix(lhs, js)
        right = to_matrix(rhs, js)
        labels = sorted(js)
        jv = {label: half_integer(js[label], f"j[{label!r}]", nonnegative=True) for label in labels}
        checked.append(jv)
        for r in range(left.rows):
            for c in range(left.cols):
                a, b = left[r, c], right[r, c]
                if subs:
                    a, b = a.subs(subs), b.subs(subs)
                if not _same(a, b):
                    mm = {"j": jv, "row": r, "col": c, "m_row": _ms(jv, labels, r),
                          "m_col": _ms(jv, labels, c), "lhs": a, "rhs": b}
                    return IdentityCheck(False, mm, checked)
    return IdentityCheck(True, None, checked)


def _ms(jv, labels, index):
    dims = [int(2 * jv[label]) + 1 for label in labels]
    out = []
    for i in reversed(range(len(labels))):
        index, c = divmod(index, dims[i])
        out.append(jv[labels[i]] - c)
    return tuple(reversed(out))


def assert_identity(lhs, rhs, j_values, subs=None):
    """Like :func:`verify_identity` but raise ``AssertionError`` (with the report) on failure.

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.numeric import assert_identity
    >>> J = AngularMomentum("J")
    >>> assert_identity(J.minus*J.plus, J.squared - J.z**2 - J.z, {"J": [0, "1/2", 1, 2]})
    """
    result = verify_identity(lhs, rhs, j_values, subs=subs)
    if not result.holds:
        raise AssertionError(str(result))

