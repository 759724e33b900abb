r"""Numeric (numpy, scipy.sparse) matrices on direct sums of multiplets, with tensor and vector components.

Explanation
===========

The numeric layer behind :func:`amalgebra.matrices.explicit.to_matrix` with
``kind="float"`` or ``"sparse"`` when a label is given several j values or
the expression contains spherical tensor components :math:`T^k_q` or
Cartesian vector components.  (Exact matrices never come from here: they are
built by the one engine, :mod:`amalgebra.states.engine`.)  Each generator atom
gets its float matrix on its label's direct sum
:math:`\bigoplus_j \{|j m\rangle\}` (j in the order given, ``m = j, ..., -j``
within each), from the same helpers as the exact route:

* angular-momentum components: block diagonal, the Condon-Shortley ladder
  factor :func:`amalgebra._exact.ladder_float`;
* tensor components, by the Wigner-Eckart theorem in the Edmonds
  normalisation (design.md), :math:`\langle j'm'|T^k_q|jm\rangle =
  (-1)^{j'-m'} (j'\ k\ j; -m'\ q\ m) \langle j'\|T^k\|j\rangle`, the factor
  from :func:`amalgebra.tensors.wigner_eckart.wigner_eckart_factor_float`
  (correctly rounded 3j symbols) and the reduced elements from
  :func:`amalgebra.states.engine.reduced_lookup`;
* vector components through the rank-1 view,
  :math:`V_x = (V_{-1} - V_{+1})/\sqrt2`, :math:`V_y = i(V_{+1} + V_{-1})/\sqrt2`,
  :math:`V_z = V_0`.

The atom is embedded in the product over sorted labels (Kronecker order, the
first label outermost) and the expression is evaluated by products of numpy
arrays or scipy ``csr_array`` matrices; reduced elements must be numeric (or
made numeric by ``subs``).

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.matrices.multiplets import multiplet_basis, multiplet_matrix
>>> from sympy import Rational
>>> multiplet_basis([0, Rational(1, 2)])
[(0, 0), (1/2, 1/2), (1/2, -1/2)]
>>> J = AngularMomentum("J")
>>> m = multiplet_matrix(J.plus*J.minus - J.minus*J.plus, {"J": (0, Rational(1, 2))}, "float", None, {})
>>> bool(abs(m - 2*multiplet_matrix(J.z, {"J": (0, Rational(1, 2))}, "float", None, {})).max() < 1e-15)
True

See Also
========

amalgebra.matrices.explicit.to_matrix, amalgebra.states.engine
"""

from math import prod

from sympy import Mul, S

from .._exact import ladder_float
from ..algebra.convert import operator_power_base
from ..algebra.modes import mode_of
from ..algebra.operators import AngularMomentumComponent
from ..errors import ConventionError, NotNumericError, OperatorError
from ..states.engine import (_check_orbital, _spherical_parts, atom_family, check_reduced, kernel_only,
                             reduced_lookup)

__all__ = ["multiplet_matrix", "multiplet_basis", "check_reduced", "kernel_only",
           "require_numpy", "require_scipy_sparse"]


def require_numpy():
    """The numpy module, or an ImportError naming the extra to install."""
    try:
        import numpy
    except ImportError as exc:  # pragma: no cover - depends on the environment
        raise ImportError("to_matrix(kind='float'/'sparse') needs numpy: "
                          "pip install 'amalgebra[numeric]'") from exc
    return numpy


def require_scipy_sparse():
    """The scipy.sparse module, or an ImportError naming the extra to install."""
    try:
        import scipy.sparse
    except ImportError as exc:  # pragma: no cover - depends on the environment
        raise ImportError("to_matrix(kind='sparse') needs scipy: pip install 'amalgebra[numeric]'") from exc
    return scipy.sparse


def multiplet_basis(js):
    """``[(j, m)]`` of the direct sum of the multiplets ``js`` (given order, m descending)."""
    return [(jv, jv - i) for jv in js for i in range(int(2 * jv) + 1)]


def _component_positions(q, js):
    """``(row, col, j', m', j, m)`` for every pair of basis states a weight-``q`` component can join."""
    basis = multiplet_basis(js)
    index = {state: i for i, state in enumerate(basis)}
    for c, (jv, m) in enumerate(basis):
        mp = m + q
        for jp in js:
            r = index.get((jp, mp))
            if r is not None:
                yield r, c, jp, mp, jv, m


class _Space:
    """The product over sorted labels of direct sums of multiplets, and atom matrices on it."""

    def __init__(self, spaces, table, convention):
        self.spaces, self.convention = spaces, convention
        self.labels = list(spaces)   # already in the package label order (states.basis.read_space)
        self.dims = [sum(int(2 * jv) + 1 for jv in spaces[label]) for label in self.labels]
        self.lookup = reduced_lookup(table, convention)

    def local(self, atom, ops):
        """``(label, {(row, col): value})`` of one generator atom on its label's factor."""
        if isinstance(atom, AngularMomentumComponent):
            return atom.label, ops.am(atom.component, self._js(atom.label, atom))
        if hasattr(atom, "tensor") or hasattr(atom, "vector"):
            family = atom_family(atom)
            js = self._js(family.label, atom)
            _check_orbital((family,), {family.label: js})
            view, parts = _spherical_parts(atom)
            pairs = [(weight, ops.tensor(view, q, js, family, self.lookup, self.convention)) for q, weight in parts]
            return family.label, pairs[0][1] if len(pairs) == 1 and pairs[0][0] is S.One else ops.combine(*pairs)
        found = mode_of(atom)
        if found is not None:
            raise OperatorError(f"label={found[1]!r} must be an angular momentum for to_matrix "
                                f"(it is a {found[0].kind} mode)")
        raise OperatorError(f"expr={atom} must be built from angular-momentum, tensor and vector "
                            f"components; {type(atom).__name__} is not a known operator")

    def _js(self, label, atom):
        js = self.spaces.get(label)
        if js is None:
            raise OperatorError(f"label={label!r} of {atom} must be given a j value (j has {self.labels})")
        return js


class _FloatOps:
    """numpy (``kind="float"``) or scipy.sparse (``kind="sparse"``) complex matrices."""

    def __init__(self, n, subs, sparse):
        self.n, self.subs, self.np = n, subs, require_numpy()
        self.sparse = require_scipy_sparse() if sparse else None

    @staticmethod
    def am(component, js):
        """``{(row, col): float}`` of an angular-momentum component (ladder factor from :mod:`amalgebra._exact`)."""
        weights = {"plus": (1.0, 0.0), "minus": (0.0, 1.0), "x": (0.5, 0.5), "y": (-0.5j, 0.5j)}
        out = {}
        at = 0
        for jv in js:
            jf, dim = float(jv), int(2 * jv) + 1
            for i in range(dim):
                m, c = jf - i, at + i
                if component == "z":
                    if m:
                        out[(c, c)] = m
                elif component == "squared":
                    if jf:
                        out[(c, c)] = jf * (jf + 1)
                else:
                    w_up, w_down = weights[component]
                    if i > 0 and w_up:
                        out[(c - 1, c)] = w_up * ladder_float(jv, jv - i, 1)
                    if i < dim - 1 and w_down:
                        out[(c + 1, c)] = w_down * ladder_float(jv, jv - i, -1)
            at += dim
        return out

    def tensor(self, view, q, js, family, lookup, convention="edmonds"):
        """``{(row, col): complex}`` of the component ``q`` of the rank-k ``view`` by Wigner-Eckart."""
        from ..tensors.wigner_eckart import wigner_eckart_factor_float

        numbers, out = {}, {}
        for r, c, jp, mp, jv, m in _component_positions(q, js):
            factor = wigner_eckart_factor_float(jp, mp, view.rank, q, jv, m, convention)
            if factor == 0:
                continue
            if (jp, jv) not in numbers:
                numbers[(jp, jv)] = self.number(lookup(family, view, jp, jv))
            value = factor * numbers[(jp, jv)]
            if value:
                out[(r, c)] = value
        return out

    def combine(self, *pairs):
        out = {}
        for coefficient, local in pairs:
            weight = self.number(coefficient)
            for key, value in local.items():
                out[key] = out.get(key, 0) + weight * value
        return out

    def number(self, value):
        value = S(value)
        if self.subs:
            value = value.subs(self.subs)
        if not value.is_number:
            names = ", ".join(sorted(str(s) for s in value.free_symbols)) or str(value)
            raise NotNumericError(f"value={value} must be numeric for a float matrix: give `reduced` values "
                                  f"or subs for {names}, or use kind='exact'")
        return complex(value)

    def _array(self, entries, n):
        if self.sparse is None:
            out = self.np.zeros((n, n), dtype=complex)
            for (r, c), value in entries.items():
                out[r, c] = value
            return out
        keys = list(entries)
        return self.sparse.csr_array(([entries[k] for k in keys], ([k[0] for k in keys], [k[1] for k in keys])),
                                     shape=(n, n), dtype=complex)

    def _eye(self, n):
        if self.sparse is None:
            return self.np.eye(n, dtype=complex)
        return self.sparse.eye_array(n, dtype=complex, format="csr")

    def _kron(self, a, b):
        if self.sparse is None:
            return self.np.kron(a, b)
        return self.sparse.kron(a, b, format="csr")

    def identity(self):
        return self._eye(self.n)

    def embed(self, local, position, dims):
        mat = self._array(local, dims[position])
        before, after = prod(dims[:position]), prod(dims[position + 1:])
        if before > 1:
            mat = self._kron(self._eye(before), mat)
        if after > 1:
            mat = self._kron(mat, self._eye(after))
        return mat

    def scale(self, mat, coefficient):
        return mat if coefficient == 1 else self.number(coefficient) * mat

    def add(self, mats):
        total = mats[0]
        for mat in mats[1:]:
            total = total + mat
        return total

    def mul(self, left, right):
        return left @ right

    def finish(self, mat):
        np = self.np
        if self.sparse is None:
            return np.ascontiguousarray(mat.real) if not np.any(mat.imag) else mat
        mat = self.sparse.csr_array(mat)
        mat.eliminate_zeros()
        return self.sparse.csr_array(mat.real) if not np.any(mat.data.imag) else mat


def multiplet_matrix(expr, spaces, kind, subs, table, convention="edmonds"):
    """Numeric matrix of ``expr`` on ``spaces`` (sorted label -> tuple of Rational j); ``table`` from :func:`check_reduced`.

    ``kind`` is ``"float"`` (numpy) or ``"sparse"`` (scipy ``csr_array``),
    real when no entry has an imaginary part; ``"exact"`` is the engine's
    (:func:`amalgebra.matrices.explicit.to_matrix`).  ``convention``
    (``"edmonds"`` or ``"cg"``, :mod:`amalgebra.tensors.wigner_eckart`)
    normalises the reduced elements.  Inputs are validated by
    :func:`amalgebra.matrices.explicit.to_matrix`, the public entry point.
    """
    if kind == "exact":
        from .explicit import _exact

        return _exact(expr, spaces, subs, table, convention)
    if kind not in ("float", "sparse"):
        raise ConventionError(f"kind={kind!r} must be one of exact, float, sparse")
    space = _Space(spaces, table, convention)
    n = prod(space.dims)
    ops = _FloatOps(n, subs, kind == "sparse")
    memo = {}

    def walk(node):
        hit = memo.get(node)
        if hit is not None:
            return hit
        if node.is_commutative:
            result = ops.scale(ops.identity(), node)
        elif node.is_Add:
            result = ops.add([walk(arg) for arg in node.args])
        elif node.is_Mul:
            factors = [arg for arg in node.args if not arg.is_commutative]
            result = walk(factors[0])
            for factor in factors[1:]:
                result = ops.mul(result, walk(factor))
            result = ops.scale(result, Mul(*[arg for arg in node.args if arg.is_commutative]))
        elif node.is_Pow:
            base, exp = operator_power_base(node), node.exp  # the shared check, with its limit
            result = ops.identity()
            for _ in range(int(exp)):
                result = ops.mul(result, walk(base))
        else:
            label, local = space.local(node, ops)
            result = ops.embed(local, space.labels.index(label), space.dims)
        memo[node] = result
        return result

    return ops.finish(walk(expr))
