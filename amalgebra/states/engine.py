r"""The one route from an operator to its action on basis states: angular momenta, tensors, vectors.

Explanation
===========

:func:`compile_operator` takes any operator that
:func:`~amalgebra.algebra.canonical` accepts on angular-momentum labels:
components of any number of angular momenta, spherical tensor components
:math:`T^k_q` and Cartesian vector components (:mod:`amalgebra.tensors`),
products, sums, powers and symbolic coefficients.  Every tensor or vector
component acts by the Wigner-Eckart theorem,

.. math::

    T^k_q |j m\rangle = \sum_{j'} |j', m+q\rangle\,
    (-1)^{j'-m-q} \begin{pmatrix} j' & k & j\\ -m-q & q & m\end{pmatrix}
    \langle j'\|T^k\|j\rangle

(Edmonds normalisation by default, design.md; ``convention="cg"`` for
:math:`\langle j m\,k q|j' m'\rangle \langle j'\|T^k\|j\rangle_{\mathrm{cg}}`),
:math:`j'` running over :math:`|j-k|, \dots, j+k` (for symbolic :math:`j`:
:math:`j + k, \dots, j - k`), and a vector through its rank-1 view,
:math:`V_x = (V_{-1} - V_{+1})/\sqrt2`, :math:`V_y = i(V_{+1} + V_{-1})/\sqrt2`,
:math:`V_z = V_0`.  Every angular-momentum polynomial acts through its
:class:`~amalgebra.states.actionform.ActionForm` (the m-shift normal form
composed with :math:`J^2 \to j(j+1)`, :math:`J_z \to m`, times the
Condon-Shortley ladder factors of :mod:`amalgebra._exact`).

Two ways of reading an operator that contains tensor components share
these two actions, and each is used where it pays:

* on numeric basis states, the expression tree acts right to left (sums,
  products, powers), the maximal angular-momentum-only subexpressions
  through their action forms and the components by Wigner-Eckart, with the
  action of every node (and every suffix of a product) on every basis state
  memoised within one call, so shared suffixes of the words of a sum are
  acted once;
* on symbolic :math:`j, m`, the kernel's mixed normal form
  (:mod:`amalgebra.tensors.mixedform`)
  :math:`O = \sum_W A_W\, X_1 \cdots X_n` (angular-momentum polynomials to
  the left of words of components in the order written) gives closed forms:
  each word acts by Wigner-Eckart, then :math:`A_W` through its action form.

Operators without tensor components always use their action form (one normal
form, evaluated per state).  Both readings are the same operator algebra, so
they agree wherever both apply (``tests/states/test_one_engine.py``).
Reduced elements are the family's own (a symbol
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

from sympy import Add, Expr, I, Mul, S, expand, sqrt

from .._validation import as_expression
from ..algebra.convert import kernel_of, operator_power_base
from ..algebra.extensions import claiming_extension
from ..algebra.modes import mode_of
from ..errors import OperatorError, QuantumNumberError
from ..qnumbers import half_integer
from ..tensors.wigner_eckart import check_convention, wigner_eckart_factor
from .actionform import action_form, check_labels, form_of_element, slots

__all__ = ["CompiledOperator", "compile_operator", "matrix_entries", "reduced_lookup", "check_reduced",
           "kernel_only", "atom_family", "clear_caches"]


class CompiledOperator:
    """An operator prepared for acting on basis states (see the module docstring).

    ``labels`` are the state's slots: its angular-momentum labels, then its
    boson modes, each in the package label order; ``modes`` are the slot
    indices of the modes (their values are ``(0, n)``).  ``plan`` is
    ``None`` for an angular-momentum polynomial, else the expression tree read
    for acting on numeric states (node -> how it acts); :attr:`terms` is the
    normal form as ``(coefficient, ActionForm, atoms)`` meaning
    ``coefficient * A * atoms`` (for a tree, built on first use: only symbolic
    states need it).  Not a SymPy object: a computation cache.
    """

    __slots__ = ("op", "labels", "modes", "families", "plan", "_terms")

    def __init__(self, op, labels, families, plan, terms=None, modes=()):
        self.op = op
        self.labels = labels
        self.modes = modes
        self.families = families
        self.plan = plan
        self._terms = terms

    def __repr__(self):
        shape = "normal form" if self.plan is None else f"tree of {len(self.plan)} nodes"
        return f"CompiledOperator(labels={self.labels}, {shape})"

    @property
    def terms(self):
        """The normal form, ``[(coefficient, ActionForm, tensor atoms)]`` (mixed form for tensors)."""
        if self._terms is None:
            self._terms = _normal_terms(self.op, self.labels, self.modes)
        return self._terms

    def act(self, state, reduced=None, convention="edmonds", allowed=None):
        """``{values: amplitude}`` of the operator applied to ``state`` = ``{values: amplitude}``.

        ``values`` is a tuple of ``(j, m)`` pairs, one per label of :attr:`labels`.
        """
        convention = check_convention(convention)
        lookup = reduced_lookup(reduced or {}, convention)
        state = {tuple((S(j), S(m)) for j, m in values): as_expression(amp, "amplitude")
                 for values, amp in state.items()}
        return self.act_with(state, lookup, convention, allowed)

    def act_with(self, state, lookup, convention, allowed, walker=None):
        """Internal :meth:`act` with a prepared reduced-element ``lookup`` and SymPy ``(j, m)`` values.

        ``walker`` (a :class:`_Walker` of this operator) carries the memo of
        node actions between calls on the same space.
        """
        if self.plan is not None and _numeric(state):
            if walker is None:
                walker = _Walker(self, lookup, convention, allowed)
            return walker.act(self.op, state)
        return self._act_normal(state, lookup, convention, allowed)

    def _act_normal(self, state, lookup, convention, allowed):
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
                for target, a in _form_action(form, values).items():
                    out.setdefault(target, []).append(coefficient * amp * a)
        return _collect(out, expand=True)

    def element(self, goal, start, reduced=None, convention="edmonds"):
        """``<goal|op|start>`` for numeric basis states (tuples of ``(j, m)`` pairs), exact.

        Angular-momentum polynomials need only the one shift ``m' - m``; an
        operator with tensor components acts on ``start`` and the goal's
        amplitude is read off.
        """
        if self.plan is not None:
            convention = check_convention(convention)
            lookup = reduced_lookup(reduced or {}, convention)
            allowed = None
            top = self.plan[self.op]
            if top[0] == "atom":    # one component: only the goal's j' is needed (one 3j, not 2k + 1)
                allowed = {top[1].label: (goal[top[4]][0],)}
            return self.act_with({start: S.One}, lookup, convention, allowed).get(goal, S.Zero)
        total = []
        for coefficient, form, _ in self.terms:
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
        return Add(*total).expand() if len(total) != 1 else total[0]

    def _atom(self, atom, state, lookup, convention, allowed):
        view, parts = _spherical_parts(atom)
        i = self.labels.index(view.label)
        allowed_js = None if allowed is None else allowed.get(view.label)
        out = {}
        for values, amp in state.items():
            for target, value in _component_action(view, parts, atom_family(atom), i, values, lookup,
                                                   convention, allowed_js).items():
                out.setdefault(target, []).append(amp * value)
        return _collect(out, expand=True)


class _Walker:
    """Acts the expression tree of a :class:`CompiledOperator` on numeric states, memoising per basis state.

    ``single(node, values)`` (the action of a node on one basis state) and the
    action of every suffix of a product are kept for the walker's life (one
    explicit matrix, one ``apply``), so words sharing a right-hand part act it once.
    """

    __slots__ = ("plan", "labels", "lookup", "convention", "allowed", "memo")

    def __init__(self, compiled, lookup, convention, allowed):
        self.plan = compiled.plan
        self.labels = compiled.labels
        self.lookup = lookup
        self.convention = convention
        self.allowed = allowed
        self.memo = {}

    def act(self, node, state):
        """``node`` applied to the state ``{values: amplitude}``."""
        if len(state) == 1:
            ((values, amp),) = state.items()
            image = self.single(node, values)
            return image if amp is S.One else _scaled(image, amp)
        parts = {}
        for values, amp in state.items():
            for target, a in self.single(node, values).items():
                parts.setdefault(target, []).append(_times(amp, a))
        return _collect(parts)

    def single(self, node, values):
        """``node |values>`` as ``{values: amplitude}`` (memoised; never mutate the result)."""
        key = (node, values)
        hit = self.memo.get(key)
        if hit is None:
            hit = self.memo[key] = self._single(node, values)
        return hit

    def _single(self, node, values):
        entry = self.plan[node]
        kind = entry[0]
        if kind == "form":
            return _form_action(entry[1], values)
        if kind == "atom":
            _, view, parts, family, i = entry
            allowed_js = None if self.allowed is None else self.allowed.get(view.label)
            return _component_action(view, parts, family, i, values, self.lookup, self.convention, allowed_js)
        if kind == "add":
            _, children, scalar = entry
            parts = {values: [scalar]} if scalar != 0 else {}
            for child in children:
                for target, a in self.single(child, values).items():
                    parts.setdefault(target, []).append(a)
            return _collect(parts)
        if kind == "mul":
            _, coefficient, factors = entry
            image = self._suffix(factors, values)
            return image if coefficient is S.One else _scaled(image, coefficient)
        _, base, n = entry          # "pow"
        state = {values: S.One}
        for _ in range(n):
            state = self.act(base, state)
            if not state:
                break
        return state

    def _suffix(self, factors, values):
        """``factors[0] * factors[1] * ... |values>``, every suffix memoised."""
        if len(factors) == 1:
            return self.single(factors[0], values)
        key = (factors, values)
        hit = self.memo.get(key)
        if hit is None:
            inner = self._suffix(factors[1:], values)
            hit = self.memo[key] = self.act(factors[0], inner) if inner else {}
        return hit


def _numeric(state):
    return all(j.is_Rational and m.is_Rational for values in state for j, m in values)


def _form_action(form, values):
    """``{target: amplitude}`` of an :class:`~amalgebra.states.actionform.ActionForm` on one basis state."""
    prepared = form.prepare(values)
    out = {}
    for shift in form.terms:
        a = form.shift_amplitude(shift, prepared)
        if a == 0:
            continue
        if a.is_Mul and any(arg.is_Add for arg in a.args):     # c(j, m) * radicals, with c a sum
            a = a.expand()
        out[tuple((j, m + d) if d else (j, m) for (j, m), d in zip(values, shift))] = a
    return out


def _component_action(view, parts, family, i, values, lookup, convention, allowed_js):
    """``{target: amplitude}`` of a tensor or vector component (rank-k ``view``, ``[(q, weight)]``) by Wigner-Eckart."""
    j, m = values[i]
    out = {}
    for q, weight in parts:
        mp = m + q
        for jp in _targets(j, view.rank, allowed_js):
            if jp.is_Rational and mp.is_Rational and abs(mp) > jp:
                continue
            factor = _geometric(jp, mp, view.rank, q, j, m, convention)
            if factor == 0:
                continue
            red = lookup(family, view, jp, j)
            if red == 0:
                continue
            value = _times(factor, red)
            if weight is not S.One:
                value = _times(weight, value)
            target = values[:i] + ((jp, mp),) + values[i + 1:]
            out.setdefault(target, []).append(value)
    return _collect(out)


@lru_cache(maxsize=65536)
def _geometric(jp, mp, k, q, j, m, convention):
    """:func:`~amalgebra.tensors.wigner_eckart.wigner_eckart_factor`, kept across calls (hashable SymPy numbers)."""
    return wigner_eckart_factor(jp, mp, k, q, j, m, convention)


def _times(x, y):
    """``x * y`` for expanded ``x``, ``y``, expanded (sums distributed term by term; no ``expand`` call).

    Amplitudes are kept expanded (sums of monomials in radicals, ``i`` and
    symbols); a product of two monomials is one by SymPy's own ``Mul``.
    """
    if x is S.One:
        return y
    if y is S.One:
        return x
    if x.is_Add or y.is_Add:
        return Add(*[a * b for a in Add.make_args(x) for b in Add.make_args(y)])
    return x * y


def _scaled(state, c):
    out = {}
    for target, a in state.items():
        value = _times(c, a)
        if value != 0:
            out[target] = value
    return out


def matrix_entries(compiled, states, reduced=None, convention="edmonds", allowed=None, subs=None):
    """``{(row, col): value}`` of ``compiled`` on the basis ``states`` (tuples of ``(j, m)`` pairs), exact.

    Column ``c`` is the action on ``states[c]``; targets outside ``states``
    are dropped (the matrix is the operator on that space: for angular
    momenta nothing is lost, tensor components are projected, and with
    ``allowed`` a product of components is the product of their matrices).
    One memo of node actions serves all columns.
    """
    convention = check_convention(convention)
    lookup = reduced_lookup(reduced or {}, convention)
    if allowed:
        _check_orbital(compiled.families, allowed)
    walker = _Walker(compiled, lookup, convention, allowed) if compiled.plan is not None else None
    index = {values: i for i, values in enumerate(states)}
    out = {}
    for col, values in enumerate(states):
        for target, amp in compiled.act_with({values: S.One}, lookup, convention, allowed, walker).items():
            row = index.get(target)
            if row is None:
                continue
            if subs:
                amp = amp.subs(subs).expand()
                if amp == 0:
                    continue
            out[(row, col)] = amp
    return out


def _check_orbital(families, allowed):
    """A Racah tensor needs integer j on its label (refused before any work, whatever the operator reaches)."""
    for family in families:
        if getattr(family, "kind", None) != "racah":
            continue
        for jv in allowed.get(family.label, ()):
            if not jv.is_integer:
                _refuse_racah(family, jv)


def _refuse_racah(view, j):
    raise QuantumNumberError(f"j[{view.label!r}]={j} must be an integer l: {view.name} is the Racah tensor "
                             f"C^{view.rank}, defined on orbital states")


def _collect(parts, expand=False):
    """``{key: sum of the list}``, zeros dropped.

    The walker keeps every amplitude expanded, so a sum of them is (``Add``
    flattens); the normal-form route multiplies unexpanded factors and asks
    for ``expand``.
    """
    out = {}
    for key, values in parts.items():
        value = values[0] if len(values) == 1 else Add(*values)
        if expand and len(values) > 1:
            value = value.expand()
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
    """``(rank-k tensor view, ((q, weight), ...))`` of a tensor or vector component."""
    from ..tensors.spherical import SphericalTensor, TensorComponent

    if isinstance(atom, TensorComponent):
        return atom.tensor, ((atom.q, S.One),)
    vector = atom.vector
    view = SphericalTensor(vector.name, 1, vector.label, "abstract", vector.hermitian)
    root = sqrt(2) / 2
    if atom.axis == "z":
        return view, ((S.Zero, S.One),)
    if atom.axis == "x":          # V_x = (V_{-1} - V_{+1})/sqrt2
        return view, ((S.One, -root), (S.NegativeOne, root))
    return view, ((S.One, I * root), (S.NegativeOne, I * root))   # V_y = i(V_{+1} + V_{-1})/sqrt2


def kernel_only(expr):
    """True when every noncommutative leaf of ``expr`` is a generator the shift-form kernel knows.

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors import racah_tensor
    >>> L = AngularMomentum("L")
    >>> kernel_only(L.x * L.z + 2), kernel_only(L.z * racah_tensor(1)[0])
    (True, False)
    """
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
    # imported late: the tensors package imports this package's kets
    from ..tensors.spherical import SphericalTensor, TensorComponent
    from ..tensors.vectors import VectorComponent, VectorOperator
    return SphericalTensor, TensorComponent, VectorOperator, VectorComponent


def check_reduced(reduced):
    """``{family: dict with Rational-pair keys, or callable}``, validated; ``{}`` for None.

    The one reader of the ``reduced=`` argument of ``apply``, ``matrix_element``,
    ``to_matrix`` and ``hamiltonian_matrix``.

    >>> from amalgebra.tensors import SphericalTensor
    >>> T = SphericalTensor("T", 1, "L")
    >>> check_reduced({T: {(1, 0): 2}})
    {T^(1)[L]: {(1, 0): 2}}
    """
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
                    _refuse_racah(view, j if not j.is_integer else jp)
                hit = _own_reduced(view, jp, j, convention)
            else:
                if callable(entry):
                    hit = as_expression(entry(jp, j), f"reduced[{family}]({jp}, {j})")
                else:
                    hit = entry.get((jp, j), S.Zero)
                if not hit.is_Atom:
                    hit = hit.expand()      # amplitudes are kept expanded (the walker relies on it)
            cache[key] = hit
        return hit

    return value


@lru_cache(maxsize=4096)
def _own_reduced(view, jp, j, convention):
    """The family's own reduced element (kept across calls: unit and Racah values cost a 3j each)."""
    return view.reduced(jp, j, convention)


_COMPILED = {}
_COMPILED_MAX = 256


def compile_operator(op, labels, modes=()):
    """The :class:`CompiledOperator` of ``op`` acting on states with ``labels`` and boson ``modes`` (cached).

    The state's values are ``(j, m)`` per angular-momentum label, then
    ``(0, n)`` per mode, in the order of
    :func:`~amalgebra.states.actionform.slots`.  Raises
    :class:`~amalgebra.errors.OperatorError` when ``op`` is not an operator
    polynomial or has a factor of a label the state does not carry (a tensor
    component whose label is not an angular-momentum label of the state, an
    angular momentum of another label, a boson operator of a mode the state
    lacks, an angular momentum on a mode or a boson operator on a ``|j m>`` label).
    """
    names, where = slots(labels, modes)
    if not isinstance(op, Expr):
        raise OperatorError(f"op={op!r} must be a SymPy expression")
    key = (op, names, where)
    hit = _COMPILED.get(key)
    if hit is not None:
        return hit
    if claiming_extension(op) is None:
        algebra, (element,) = kernel_of(op)
        check_labels(algebra, names, op, where)
        form = form_of_element(algebra, element, names, where)
        compiled = CompiledOperator(op, names, (), None, [(S.One, form, ())], where)
    else:
        plan, families = _read_tree(op, names, where)
        compiled = CompiledOperator(op, names, families, plan, modes=where)
    if len(_COMPILED) >= _COMPILED_MAX:
        _COMPILED.pop(next(iter(_COMPILED)))
    _COMPILED[key] = compiled
    return compiled


def _read_tree(op, labels, modes=()):
    """``(plan, families)``: every noncommutative node of ``op`` -> how it acts; validates labels and atoms.

    Plan entries: ``("form", ActionForm)`` for an angular-momentum-only node
    (consecutive such factors of a product are merged into one),
    ``("atom", view, parts, family, label index)``, ``("add", children,
    scalar)``, ``("mul", coefficient, factors)``, ``("pow", base, n)``.
    """
    _, TensorComponent, _, VectorComponent = _tensor_classes()
    am_labels = [lab for i, lab in enumerate(labels) if i not in modes]
    bosons = [labels[i] for i in modes]
    plan, families = {}, {}
    stack = [op]
    while stack:
        node = stack.pop()
        if node in plan:
            continue
        if kernel_only(node):
            plan[node] = ("form", action_form(node, am_labels, bosons))
        elif isinstance(node, (TensorComponent, VectorComponent)):
            family = atom_family(node)
            if family.label not in am_labels:
                where = "a boson mode of the state" if family.label in bosons else "not a label of the state"
                raise OperatorError(f"{family} is a tensor under label={family.label!r}, which the state "
                                    f"must carry as an angular momentum to declare the space it acts on; "
                                    f"{family.label!r} is {where} (labels {am_labels}, modes {bosons})")
            view, parts = _spherical_parts(node)
            families[family] = None
            plan[node] = ("atom", view, parts, family, labels.index(family.label))
        elif node.is_Add:
            children = tuple(arg for arg in node.args if not arg.is_commutative)
            plan[node] = ("add", children, expand(Add(*[arg for arg in node.args if arg.is_commutative])))
            stack.extend(children)
        elif node.is_Mul:
            factors, group = [], []
            for arg in node.args:
                if arg.is_commutative:
                    continue
                if kernel_only(arg):
                    group.append(arg)
                    continue
                if group:
                    factors.append(Mul(*group))
                    group = []
                factors.append(arg)
            if group:
                factors.append(Mul(*group))
            plan[node] = ("mul", expand(Mul(*[arg for arg in node.args if arg.is_commutative])), tuple(factors))
            stack.extend(factors)
        elif node.is_Pow:
            base = operator_power_base(node)      # the shared check of exponents, with its limit
            plan[node] = ("pow", base, int(node.exp))
            stack.append(base)
        else:
            raise OperatorError(f"expr={node} must be built from angular-momentum, tensor and vector "
                                f"components; {type(node).__name__} is not a known operator")
    return plan, tuple(families)


def _normal_terms(op, labels, modes=()):
    """The mixed normal form of ``op`` as ``[(coefficient, ActionForm of A_W, tensor atoms of W)]``."""
    mixed, (element,) = claiming_extension(op).kernel(op)
    kernel = mixed.kernel
    check_labels(kernel, labels, op, modes)
    terms = []
    for m, word in sorted(element, key=lambda k: (len(k[1]), k)):
        form = form_of_element(kernel, element[(m, word)], labels, modes)
        for factor, atoms in mixed._word_out(m, word):
            terms.append((factor, form, tuple(atoms)))
    return terms


def clear_caches():
    """Empty the caches of compiled operators, reduced elements and Wigner-Eckart factors.

    >>> clear_caches()
    """
    _COMPILED.clear()
    _own_reduced.cache_clear()
    _geometric.cache_clear()
