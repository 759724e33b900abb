r"""The one route from an operator to its action on basis states: angular momenta, tensors, vectors.

Explanation
===========

:func:`compile_operator` takes any operator that
:func:`~amalgebra.algebra.canonical` accepts on angular-momentum labels:
components of any number of angular momenta, spherical tensor components
:math:`T^k_q` and Cartesian vector components (:mod:`amalgebra.tensors`),
products, sums, powers and symbolic coefficients.  The kernel gives its
normal form (:mod:`amalgebra.tensors.mixedform`)

.. math::

    O = \sum_W A_W\, X_1 X_2 \cdots X_n ,

angular-momentum polynomials :math:`A_W` to the left of words of tensor
components in the order written.  On a basis state (a :math:`(j, m)` pair per
label, numeric or symbolic) the word acts right to left, each component by
the Wigner-Eckart theorem,

.. math::

    T^k_q |j m\rangle = \sum_{j'} |j', m+q\rangle\,
    (-1)^{j'-m-q} \begin{pmatrix} j' & k & j\\ -m-q & q & m\end{pmatrix}
    \langle j'\|T^k\|j\rangle

(Edmonds normalisation by default, design.md; ``convention="cg"`` for
:math:`\langle j m\,k q|j' m'\rangle \langle j'\|T^k\|j\rangle_{\mathrm{cg}}`),
:math:`j'` running over :math:`|j-k|, \dots, j+k` (for symbolic :math:`j`:
:math:`j + k, \dots, j - k`), and a vector through its rank-1 view,
:math:`V_x = (V_{-1} - V_{+1})/\sqrt2`, :math:`V_y = i(V_{+1} + V_{-1})/\sqrt2`,
:math:`V_z = V_0`.  Then :math:`A_W` acts through its
:class:`~amalgebra.states.actionform.ActionForm` (Condon-Shortley ladder
factors).  Reduced elements are the family's own (a symbol
:math:`\langle j'\|T^k\|j\rangle` for abstract tensors, the known values for
unit and Racah tensors) unless ``reduced`` gives them.

``allowed`` restricts the :math:`j` values a tensor component may reach
(``{label: j values}``): explicit matrices on a space of multiplets use it,
so a product of components is the product of their matrices on that space.
Without it (kets) nothing is truncated.

Examples
========

>>> from amalgebra.tensors import racah_tensor
>>> from amalgebra.states.engine import compile_operator
>>> C = racah_tensor(1)
>>> compiled = compile_operator(C[0], ("L",))
>>> compiled.act({((0, 0),): 1})               # C^1_0 |0 0> = |1 0>/sqrt(3)
{((1, 0),): sqrt(3)/3}

See Also
========

amalgebra.states.action.apply, amalgebra.matrices.explicit.to_matrix, amalgebra.tensors.wigner_eckart.wigner_eckart

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), eq. (5.4.1).
"""

from functools import lru_cache

from sympy import Add, Expr, I, S, sqrt

from .._validation import as_expression, label_key
from ..algebra.convert import kernel_of
from ..algebra.extensions import claiming_extension
from ..errors import OperatorError, QuantumNumberError
from ..tensors.wigner_eckart import check_convention, wigner_eckart_factor
from .actionform import check_labels, form_of_element

__all__ = ["CompiledOperator", "compile_operator", "matrix_entries", "reduced_lookup", "atom_family", "clear_caches"]


class CompiledOperator:
    """An operator prepared for acting on basis states (see the module docstring).

    ``labels`` are the state's labels (package label order); ``terms`` a list
    of ``(coefficient, ActionForm, atoms)`` meaning ``coefficient * A * atoms``.
    Not a SymPy object: a computation cache.
    """

    __slots__ = ("labels", "terms", "families")

    def __init__(self, labels, terms, families):
        self.labels = labels
        self.terms = terms
        self.families = families

    def __repr__(self):
        return f"CompiledOperator(labels={self.labels}, terms={len(self.terms)})"

    def act(self, state, reduced=None, convention="edmonds", allowed=None):
        """``{values: amplitude}`` of the operator applied to ``state`` = ``{values: amplitude}``.

        ``values`` is a tuple of ``(j, m)`` pairs, one per label of :attr:`labels`.
        """
        convention = check_convention(convention)
        lookup = reduced_lookup(reduced or {}, convention)
        state = {tuple((S(j), S(m)) for j, m in values): amp for values, amp in state.items()}
        return self.act_with(state, lookup, convention, allowed)

    def act_with(self, state, lookup, convention, allowed):
        """Internal :meth:`act` with a prepared reduced-element ``lookup`` and SymPy ``(j, m)`` values."""
        out = {}
        for coefficient, form, atoms in self.terms:
            current = state
            for atom in reversed(atoms):
                current = self._atom(atom, current, lookup, convention, allowed)
                if not current:
                    break
            if not current:
                continue
            for values, amp in current.items():
                prepared = form.prepare(values)
                for shift in form.terms:
                    a = form.shift_amplitude(shift, prepared)
                    if a == 0:
                        continue
                    target = tuple((j, m + d) if d else (j, m) for (j, m), d in zip(values, shift))
                    out.setdefault(target, []).append(coefficient * amp * a)
        return _collect(out)

    def element(self, goal, start, reduced=None, convention="edmonds"):
        """``<goal|op|start>`` for numeric basis states (tuples of ``(j, m)`` pairs), exact.

        Terms without tensor components need only the one shift ``m' - m``;
        the others act and pick the goal's amplitude.
        """
        total = []
        lookup = None
        for coefficient, form, atoms in self.terms:
            if not atoms:
                if any(g[0] != s[0] for g, s in zip(goal, start)):
                    continue
                shift = tuple(g[1] - s[1] for g, s in zip(goal, start))
                if not all(d.is_Integer for d in shift):
                    continue
                shift = tuple(int(d) for d in shift)
                if shift in form.terms:
                    a = form.shift_amplitude(shift, form.prepare(start))
                    if a != 0:
                        total.append(coefficient * a)
                continue
            if lookup is None:
                convention = check_convention(convention)
                lookup = reduced_lookup(reduced or {}, convention)
            current = {start: S.One}
            for n, atom in enumerate(reversed(atoms)):
                # A_W keeps every j: the last component acting on a label must land on the goal's j
                label = atom_family(atom).label
                last = all(atom_family(other).label != label for other in atoms[:len(atoms) - 1 - n])
                allowed = {label: (goal[self.labels.index(label)][0],)} if last else None
                current = self._atom(atom, current, lookup, convention, allowed)
                if not current:
                    break
            for values, amp in current.items():
                if any(g[0] != v[0] for g, v in zip(goal, values)):
                    continue
                shift = tuple(int(g[1] - v[1]) for g, v in zip(goal, values))
                if shift in form.terms:
                    a = form.shift_amplitude(shift, form.prepare(values))
                    if a != 0:
                        total.append(coefficient * amp * a)
        return Add(*total).expand() if len(total) != 1 else total[0]

    def _atom(self, atom, state, lookup, convention, allowed):
        tensor, parts = _spherical_parts(atom)
        label = tensor.label
        i = self.labels.index(label)
        out = {}
        for values, amp in state.items():
            j, m = values[i]
            for q, weight in parts:
                mp = m + q
                for jp in _targets(j, tensor.rank, None if allowed is None else allowed.get(label)):
                    if jp.is_Rational and mp.is_Rational and abs(mp) > jp:
                        continue
                    factor = wigner_eckart_factor(jp, mp, tensor.rank, q, j, m, convention)
                    if factor == 0:
                        continue
                    red = lookup(atom_family(atom), tensor, jp, j)
                    if red == 0:
                        continue
                    value = factor * red
                    if weight is not S.One:
                        value = weight * value
                    if amp is not S.One:
                        value = amp * value
                    target = values[:i] + ((jp, mp),) + values[i + 1:]
                    out.setdefault(target, []).append(value)
        return _collect(out)


def matrix_entries(compiled, states, reduced=None, convention="edmonds", allowed=None, subs=None):
    """``{(row, col): value}`` of ``compiled`` on the basis ``states`` (tuples of ``(j, m)`` pairs), exact.

    Column ``c`` is the action on ``states[c]``; targets outside ``states``
    are dropped (the matrix is the operator on that space: for angular
    momenta nothing is lost, tensor components are projected, and with
    ``allowed`` a product of components is the product of their matrices).
    """
    convention = check_convention(convention)
    lookup = reduced_lookup(reduced or {}, convention)
    index = {values: i for i, values in enumerate(states)}
    out = {}
    for col, values in enumerate(states):
        for target, amp in compiled.act_with({values: S.One}, lookup, convention, allowed).items():
            row = index.get(target)
            if row is None:
                continue
            if subs:
                amp = amp.subs(subs).expand()
                if amp == 0:
                    continue
            out[(row, col)] = amp
    return out


def _collect(parts):
    out = {}
    for key, values in parts.items():
        value = values[0] if len(values) == 1 else Add(*values).expand()
        if value != 0:
            out[key] = value
    return out


def _targets(j, k, allowed):
    """The j' a rank-k component can reach from j (within ``allowed`` when given)."""
    if j.is_Rational:
        lo, hi = abs(j - k), j + k
        out = [hi - n for n in range(int(hi - lo) + 1)]
    else:
        out = [j + k - n for n in range(int(2 * k) + 1)]
    if allowed is not None:
        out = [jp for jp in out if jp in allowed]
    return out


def atom_family(atom):
    """The family object (SphericalTensor or VectorOperator) of a tensor or vector component."""
    return getattr(atom, "tensor", None) or atom.vector


def _spherical_parts(atom):
    """``(rank-k tensor view, [(q, weight)])`` of a tensor or vector component."""
    from ..tensors.spherical import SphericalTensor, TensorComponent

    if isinstance(atom, TensorComponent):
        return atom.tensor, [(atom.q, S.One)]
    vector = atom.vector
    view = SphericalTensor(vector.name, 1, vector.label, "abstract", vector.hermitian)
    root = sqrt(2) / 2
    if atom.axis == "z":
        return view, [(S.Zero, S.One)]
    if atom.axis == "x":          # V_x = (V_{-1} - V_{+1})/sqrt2
        return view, [(S.One, -root), (S.NegativeOne, root)]
    return view, [(S.One, I * root), (S.NegativeOne, I * root)]   # V_y = i(V_{+1} + V_{-1})/sqrt2


def reduced_lookup(table, convention):
    """A function ``(family, view, j', j) -> reduced element`` over a validated ``reduced`` table.

    ``table`` maps a family to a dict ``{(j', j): value}`` (missing pairs are
    zero) or to a callable ``value(j', j)``; a family not in it uses its own
    ``view.reduced(j', j, convention)``.
    """
    cache = {}

    def value(family, view, jp, j):
        key = (family, jp, j)
        hit = cache.get(key)
        if hit is None:
            entry = table.get(family)
            if entry is None:
                if view.kind == "racah" and not (jp.is_integer and j.is_integer):
                    raise QuantumNumberError(
                        f"j[{view.label!r}]={j if not j.is_integer else jp} must be an integer l: {view.name} is "
                        f"the Racah tensor C^{view.rank}, defined on orbital states")
                hit = _own_reduced(view, jp, j, convention)
            elif callable(entry):
                hit = as_expression(entry(jp, j), f"reduced[{family}]({jp}, {j})")
            else:
                hit = entry.get((jp, j), S.Zero)
            cache[key] = hit
        return hit

    return value


@lru_cache(maxsize=4096)
def _own_reduced(view, jp, j, convention):
    """The family's own reduced element (kept across calls: unit and Racah values cost a 3j each)."""
    return view.reduced(jp, j, convention)


_COMPILED = {}
_COMPILED_MAX = 256


def compile_operator(op, labels):
    """The :class:`CompiledOperator` of ``op`` acting on states with ``labels`` (cached).

    Raises :class:`~amalgebra.errors.OperatorError` when ``op`` is not an
    operator polynomial, has a factor of a label the state does not carry
    (a tensor component whose label is not a label of the state, an angular
    momentum of another label), or contains boson operators (those act on
    Fock kets).
    """
    labels = tuple(sorted(labels, key=label_key))
    if not isinstance(op, Expr):
        raise OperatorError(f"op={op!r} must be a SymPy expression")
    key = (op, labels)
    hit = _COMPILED.get(key)
    if hit is not None:
        return hit
    extension = claiming_extension(op)
    if extension is None:
        algebra, (element,) = kernel_of(op)
        check_labels(algebra, labels, op)
        terms = [(S.One, form_of_element(algebra, element, labels), ())]
        families = ()
    else:
        mixed, (element,) = extension.kernel(op)
        kernel = mixed.kernel
        check_labels(kernel, labels, op)
        families = tuple(f.obj for f in mixed.families)
        for family in families:
            if family.label not in labels:
                raise OperatorError(f"{family} is a tensor under label={family.label!r}, which the state "
                                    f"must carry to declare the space it acts on; the state carries "
                                    f"{list(labels)}")
        terms = []
        for m, word in sorted(element, key=lambda k: (len(k[1]), k)):
            form = form_of_element(kernel, element[(m, word)], labels)
            for factor, atoms in mixed._word_out(m, word):
                terms.append((factor, form, tuple(atoms)))
    compiled = CompiledOperator(labels, terms, families)
    if len(_COMPILED) >= _COMPILED_MAX:
        _COMPILED.pop(next(iter(_COMPILED)))
    _COMPILED[key] = compiled
    return compiled


def clear_caches():
    """Empty the cache of compiled operators.

    >>> clear_caches()
    """
    _COMPILED.clear()
    _own_reduced.cache_clear()
