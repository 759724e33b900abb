r"""Matrices on direct sums of multiplets, for angular-momentum, tensor and vector components.

Explanation
===========

The engine behind :func:`amalgebra.matrices.explicit.to_matrix` when a label is given
several j values or the expression contains spherical tensor components
:math:`T^k_q` or Cartesian vector components.  Each generator atom gets its
matrix on its label's direct sum :math:`\bigoplus_j \{|j m\rangle\}` (j in
the order given, ``m = j, ..., -j`` within each):

* angular-momentum components: block diagonal, Condon-Shortley ladder elements;
* tensor components, by the Wigner-Eckart theorem in the Edmonds
  normalisation (design.md), :math:`\langle j'm'|T^k_q|jm\rangle =
  (-1)^{j'-m'} (j'\ k\ j; -m'\ q\ m) \langle j'\|T^k\|j\rangle`;
* vector components through the rank-1 view,
  :math:`V_x = (V_{-1} - V_{+1})/\sqrt2`, :math:`V_y = i(V_{+1} + V_{-1})/\sqrt2`,
  :math:`V_z = V_0`.

The atom is embedded in the product over sorted labels (Kronecker order, the
first label outermost) and the expression is evaluated by sparse products:
exact ``{(row, col): Expr}`` dicts, numpy arrays or scipy ``csr_array``.  The
float kinds use correctly rounded 3j symbols
(:func:`~amalgebra.coupling.threej_float`) and need numeric reduced elements.

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.matrices.multiplets import multiplet_basis, multiplet_matrix
>>> from sympy import Rational
>>> multiplet_basis([0, Rational(1, 2)])
[(0, 0), (1/2, 1/2), (1/2, -1/2)]
>>> J = AngularMomentum("J")
>>> multiplet_matrix(J.plus*J.minus - J.minus*J.plus, {"J": (0, Rational(1, 2))}, "exact", None, {}) \
...     == 2*multiplet_matrix(J.z, {"J": (0, Rational(1, 2))}, "exact", None, {})      # [J+, J-] = 2 Jz
True

See Also
========

amalgebra.matrices.explicit.to_matrix
"""

from math import prod

from sympy import Add, I, Matrix, Mul, S, expand, sqrt

from .._exact import condon_shortley, ladder_float
from .._validation import as_expression
from ..algebra.convert import operator_power_base
from ..algebra.modes import mode_of
from ..algebra.operators import AngularMomentumComponent
from ..errors import NotNumericError, OperatorError, QuantumNumberError
from ..qnumbers import half_integer

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


def kernel_only(expr):
    """True when every noncommutative leaf of ``expr`` is a generator the shift-form kernel knows."""
    stack = [expr]
    while stack:
        node = stack.pop()
        if node.is_commutative:
            continue
        if node.is_Add or node.is_Mul or node.is_Pow:
            stack.extend(node.args)
        elif mode_of(node) is None:
            return False
    return True


def _tensor_classes():
    # imported late: the tensors package sits above numeric's other dependencies
    from ..tensors.spherical import SphericalTensor, TensorComponent
    from ..tensors.vectors import VectorComponent, VectorOperator
    return SphericalTensor, TensorComponent, VectorOperator, VectorComponent


def check_reduced(reduced):
    """``{family: dict with Rational-pair keys, or callable}``, validated; ``{}`` for None."""
    if reduced is None:
        return {}
    SphericalTensor, _, VectorOperator, _ = _tensor_classes()
    if not isinstance(reduced, dict):
        raise OperatorError(f"reduced={reduced!r} must be a dict tensor/vector -> {{(jp, j): value}} "
                            f"or -> callable(jp, j)")
    out = {}
    for family in sorted(reduced, key=str):
        if not isinstance(family, (SphericalTensor, VectorOperator)):
            raise OperatorError(f"reduced key={family!r} must be a SphericalTensor or a VectorOperator")
        values = reduced[family]
        if callable(values):
            out[family] = values
            continue
        if not isinstance(values, dict):
            raise OperatorError(f"reduced[{family}]={values!r} must be a dict {{(jp, j): value}} "
                                f"or a callable(jp, j)")
        table = {}
        for pair, value in values.items():
            if not (isinstance(pair, tuple) and len(pair) == 2):
                raise OperatorError(f"reduced[{family}] key={pair!r} must be a pair (jp, j)")
            key = (half_integer(pair[0], "jp", nonnegative=True), half_integer(pair[1], "j", nonnegative=True))
            table[key] = as_expression(value, f"reduced[{family}][{pair!r}]")
        out[family] = table
    return out


def multiplet_basis(js):
    """``[(j, m)]`` of the direct sum of the multiplets ``js`` (given order, m descending)."""
    return [(jv, jv - i) for jv in js for i in range(int(2 * jv) + 1)]


def _am_local(component, js):
    """``{(row, col): value}`` of an angular-momentum component on the direct sum ``js``."""
    basis = multiplet_basis(js)
    out = {}
    for c, (jv, m) in enumerate(basis):
        if component == "z":
            if m != 0:
                out[(c, c)] = m
            continue
        if component == "squared":
            if jv != 0:
                out[(c, c)] = jv * (jv + 1)
            continue
        up = condon_shortley(jv, m, 1)        # <m+1|J+|m>, row c - 1 (0 at m = j)
        down = condon_shortley(jv, m, -1)     # <m-1|J-|m>, row c + 1 (0 at m = -j)
        factor_up, factor_down = {"plus": (1, 0), "minus": (0, 1), "x": (S.Half, S.Half),
                                  "y": (-I / 2, I / 2)}[component]
        if up != 0 and factor_up != 0:
            out[(c - 1, c)] = factor_up * up
        if down != 0 and factor_down != 0:
            out[(c + 1, c)] = factor_down * down
    return out


def _tensor_local(view, q, js, reduced_of, convention="edmonds"):
    """``{(row, col): value}`` of the component ``q`` of the rank-k ``view`` by Wigner-Eckart."""
    from ..tensors.wigner_eckart import wigner_eckart_factor
    out = {}
    for r, c, jp, mp, jv, m in _component_positions(q, js):
        factor = wigner_eckart_factor(jp, mp, view.rank, q, jv, m, convention)
        if factor == 0:
            continue
        value = factor * reduced_of(jp, jv)
        if value != 0:
            out[(r, c)] = value
    return out


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


def _combine(*pairs):
    """``sum(coefficient * local)`` over ``(coefficient, local)`` pairs, expanded, zeros dropped."""
    terms = {}
    for coefficient, local in pairs:
        for key, value in local.items():
            terms.setdefault(key, []).append(coefficient * value)
    return _summed(terms)


def _summed(terms):
    """``{key: expanded sum of the list}``, zeros dropped."""
    out = {}
    for key, values in terms.items():
        value = expand(Add(*values))
        if value != 0:
            out[key] = value
    return out


class _Space:
    """The product over sorted labels of direct sums of multiplets, and atom matrices on it."""

    def __init__(self, spaces, table, convention):
        self.spaces, self.convention = spaces, convention
        self.labels = list(spaces)   # already in the package label order (numeric._check_j)
        self.dims = [sum(int(2 * jv) + 1 for jv in spaces[label]) for label in self.labels]
        self.table = table
        self.reduced_cache = {}

    def local(self, atom, ops):
        """``(label, {(row, col): value})`` of one generator atom on its label's factor (``ops`` numbers)."""
        SphericalTensor, TensorComponent, _, VectorComponent = _tensor_classes()
        if isinstance(atom, AngularMomentumComponent):
            return atom.label, ops.am(atom.component, self._js(atom.label, atom))
        if isinstance(atom, TensorComponent):
            tensor = atom.tensor
            js = self._js(tensor.label, atom)
            if tensor.kind == "racah":
                bad = [jv for jv in js if not jv.is_integer]
                if bad:
                    raise QuantumNumberError(
                        f"j[{tensor.label!r}]={bad[0]} must be an integer l: {tensor.name} is the Racah "
                        f"tensor C^{tensor.rank}, defined on orbital states")
            return tensor.label, ops.tensor(tensor, atom.q, js, self._reduced_of(tensor, tensor), self.convention)
        if isinstance(atom, VectorComponent):
            vector = atom.vector
            js = self._js(vector.label, atom)
            view = SphericalTensor(vector.name, 1, vector.label, "abstract", vector.hermitian)
            reduced_of = self._reduced_of(vector, view)
            if atom.axis == "z":
                return vector.label, ops.tensor(view, 0, js, reduced_of, self.convention)
            part = {q: ops.tensor(view, q, js, reduced_of, self.convention) for q in (1, -1)}
            root = ops.root_half
            if atom.axis == "x":         # V_x = (V_{-1} - V_{+1})/sqrt2
                return vector.label, ops.combine((root, part[-1]), (-root, part[1]))
            return vector.label, ops.combine((ops.i * root, part[1]), (ops.i * root, part[-1]))   # V_y
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

    def _reduced_of(self, family, view):
        entry = self.table.get(family)
        cache = self.reduced_cache

        def value(jp, jv):
            key = (family, jp, jv)
            if key not in cache:
                if entry is None:
                    cache[key] = view.reduced(jp, jv, self.convention)
                elif callable(entry):
                    cache[key] = as_expression(entry(jp, jv), f"reduced[{family}]({jp}, {jv})")
                else:
                    cache[key] = entry.get((jp, jv), S.Zero)
            return cache[key]
        return value


class _ExactOps:
    """Exact sparse matrices as ``{(row, col): Expr}`` (entries expanded, no zeros)."""

    root_half, i = sqrt(2) / 2, I
    am = staticmethod(_am_local)
    tensor = staticmethod(_tensor_local)
    combine = staticmethod(_combine)

    def __init__(self, n, subs):
        self.n, self.subs = n, subs

    def identity(self):
        return {(i, i): S.One for i in range(self.n)}

    def embed(self, local, position, dims):
        after = prod(dims[position + 1:])
        block = dims[position] * after
        out = {}
        for b in range(prod(dims[:position])):
            for (r, c), value in local.items():
                base_r, base_c = b * block + r * after, b * block + c * after
                for a in range(after):
                    out[(base_r + a, base_c + a)] = value
        return out

    def scale(self, mat, coefficient):
        if coefficient == 1:
            return mat
        out = {}
        for key, value in mat.items():
            value = expand(coefficient * value)
            if value != 0:
                out[key] = value
        return out

    def add(self, mats):
        return _combine(*[(S.One, mat) for mat in mats])

    def mul(self, left, right):
        by_row = {}
        for (k, c), value in right.items():
            by_row.setdefault(k, []).append((c, value))
        terms = {}
        for (r, k), value in left.items():
            for c, other in by_row.get(k, ()):
                terms.setdefault((r, c), []).append(value * other)
        return _summed(terms)

    def finish(self, mat):
        if self.subs:
            mat = {key: expand(value.subs(self.subs)) for key, value in mat.items()}
        return Matrix(self.n, self.n, lambda r, c: mat.get((r, c), S.Zero))


class _FloatOps:
    """numpy (``kind="float"``) or scipy.sparse (``kind="sparse"``) complex matrices."""

    root_half, i = 0.5 ** 0.5, 1j

    def __init__(self, n, subs, sparse):
        self.n, self.subs, self.np = n, subs, require_numpy()
        self.sparse = require_scipy_sparse() if sparse else None

    @staticmethod
    def am(component, js):
        """Float twin of :func:`_am_local` (same basis, same formulas)."""
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

    def tensor(self, view, q, js, reduced_of, convention="edmonds"):
        """Float twin of :func:`_tensor_local`: correctly rounded 3j symbols, numeric reduced elements."""
        from ..coupling import cg_float, threej_float
        numbers, out = {}, {}
        for r, c, jp, mp, jv, m in _component_positions(q, js):
            if convention == "cg":
                factor = cg_float(jv, m, view.rank, q, jp, mp)
            else:
                factor = (-1) ** int(jp - mp) * threej_float(jp, view.rank, jv, -mp, q, m)
            if factor == 0:
                continue
            if (jp, jv) not in numbers:
                numbers[(jp, jv)] = self.number(reduced_of(jp, jv))
            value = factor * numbers[(jp, jv)]
            if value:
                out[(r, c)] = value
        return out

    @staticmethod
    def combine(*pairs):
        out = {}
        for coefficient, local in pairs:
            for key, value in local.items():
                out[key] = out.get(key, 0) + coefficient * value
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
    """Matrix of ``expr`` on ``spaces`` (sorted label -> tuple of Rational j); ``table`` from :func:`check_reduced`.

    ``kind`` is ``"exact"`` (SymPy ``Matrix``, ``subs`` applied to the entries),
    ``"float"`` (numpy) or ``"sparse"`` (scipy ``csr_array``); the float kinds
    are real when no entry has an imaginary part.  ``convention`` (``"edmonds"``
    or ``"cg"``, :mod:`amalgebra.tensors.wigner_eckart`) normalises the reduced elements.  Inputs are validated by
    :func:`amalgebra.matrices.explicit.to_matrix`, the public entry point.
    """
    space = _Space(spaces, table, convention)
    n = prod(space.dims)
    ops = _ExactOps(n, subs) if kind == "exact" else _FloatOps(n, subs, kind == "sparse")
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
