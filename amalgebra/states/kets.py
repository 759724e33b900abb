r"""Kets and bras :math:`|j\,m\rangle`, products over labels, linear combinations, inner products.

Explanation
===========

A ket :math:`|j\,m\rangle_J` is a noncommutative SymPy ``Expr`` whose args are
``(j, m, Str(label))``.  The label names the angular momentum the ket belongs to
(``"J"``, ``"S"``, ``"I"``, ...); kets of different labels live in different
spaces and are combined with :class:`ProductKet`, whose factors are sorted by
label so that ``|a>_J |b>_S`` and ``|b>_S |a>_J`` are the same object.

Linear combinations are ordinary SymPy sums, ``a*ket(1, 0) + b*ket(1, 1)``, so
they print, substitute, differentiate and pickle like any SymPy expression.  The
bra of a state is ``sympy.adjoint(state)`` (coefficients are conjugated, kets
become :class:`Bra`); :meth:`Ket.dual` does the same for a single ket.

Conventions: kets are orthonormal, :math:`\langle j' m'|j m\rangle =
\delta_{j'j}\delta_{m'm}`.  For symbolic quantum numbers the deltas stay
visible as ``KroneckerDelta``.

Validation goes through :mod:`amalgebra.qnumbers`: ``j`` must be a nonnegative
half-integer (or a symbolic expression not known to break that), ``j - m`` must
be an integer (:class:`~amalgebra.errors.ProjectionError` otherwise) and, for
numeric ``j`` and ``m``, ``|m| <= j`` is enforced at construction
(:class:`~amalgebra.errors.QuantumNumberError`): a ket with ``|m| > j`` does not
exist.  Operators that push ``m`` out of range give an exact zero instead (see
:mod:`amalgebra.states.action`).

Examples
========

>>> from sympy import Symbol, adjoint, sqrt
>>> from amalgebra.states.kets import ket, inner, norm, product_ket
>>> psi = (ket(1, 1) + ket(1, -1)) / sqrt(2)
>>> inner(adjoint(psi), psi)
1
>>> j, m = Symbol("j"), Symbol("m")
>>> inner(ket(j, m).dual(), ket(j, m - 1))
0
>>> inner(ket(j, Symbol("n")).dual(), ket(j, m))
KroneckerDelta(m, n)
>>> product_ket(ket("1/2", "1/2", "S"), ket(1, 0, "L"))
|1, 0>_L|1/2, 1/2>_S
>>> norm(3 * ket(2, 0) + 4 * ket(2, 1))
5

Parameters
==========

j, m : int, Rational, str such as ``"3/2"``, or a SymPy expression
label : str, default ``"J"``

See Also
========

amalgebra.states.action.apply, amalgebra.states.coupled.coupled_ket

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 2.
"""

from fractions import Fraction

from sympy import Add, Basic, Expr, KroneckerDelta, Mul, S, adjoint, sqrt
from sympy.core.symbol import Str

from .._exact import exact_sum
from .._validation import check_label, label_key
from ..notation import NotationHooks
from ..errors import NotNumericError, OperatorError, QuantumNumberError, ProjectionError, StateError
from ..qnumbers import doubled, doubled_projection, is_numeric, quantum_number

__all__ = [
    "Ket",
    "Bra",
    "ProductKet",
    "ProductBra",
    "ket",
    "bra",
    "product_ket",
    "tensor",
    "components",
    "from_components",
    "inner",
    "norm",
    "normalize",
]

def _label(label):
    return Str(check_label(label, "label", StateError))


_label_key = label_key  # the package's one label order (amalgebra._validation)


def _validated(j, m, label):
    """Validated (j, m, Str(label)) for a ket or bra."""
    jj = quantum_number(j, "j", nonnegative=True)
    if is_numeric(m):
        mm = quantum_number(m, "m")
    elif isinstance(m, Expr):
        mm = m
    else:
        raise NotNumericError(f"m={m!r} must be a number or a SymPy expression")
    if jj.is_Number and mm.is_Number:
        tm = doubled_projection(doubled(jj, "j"), mm, "m", "j")
        if abs(tm) > doubled(jj, "j"):
            raise QuantumNumberError(f"m={mm} must satisfy |m| <= j={jj}")
    elif (jj - mm).is_integer is False:
        raise ProjectionError(f"m={mm} must differ from j={jj} by an integer")
    return jj, mm, _label(label)


class _DualState(NotationHooks):
    """Shared behaviour of every ket or bra family: dual, adjoint and printing, written once.

    A member supplies metadata: ``_notation_key``, the stem of its printing
    hooks in :mod:`amalgebra.notation` (``"state"`` reaches ``state_str``,
    ``state_latex``, ``state_pretty``), and its dual class, which
    :func:`_dual_pair` records for both classes once both exist (in a table
    rather than a class attribute, so that doctest does not collect the dual
    class's examples twice).  ``dual`` builds the dual class from
    :meth:`_dual_args` (the args themselves unless the member says
    otherwise).  Listed before ``Expr``, so that these hooks win.
    """

    __slots__ = ()
    # Above Expr's 10.0, so that ``J.z + ket`` and ``(2*J.z) * ket`` reach the checks below
    # (SymPy hands a binary operation to the operand of higher priority); below matrices' 10.01.
    _op_priority = 10.005

    def __add__(self, other):
        _check_sum(self, other)
        return super().__add__(other)

    def __radd__(self, other):
        _check_sum(self, other)
        return super().__radd__(other)

    def __sub__(self, other):
        _check_sum(self, other)
        return super().__sub__(other)

    def __rsub__(self, other):
        _check_sum(self, other)
        return super().__rsub__(other)

    def __mul__(self, other):
        _check_product(self, other)
        joined = _join_states(self, other)
        return super().__mul__(other) if joined is None else joined

    def __rmul__(self, other):
        _check_product(other, self)
        joined = _join_states(other, self)
        return super().__rmul__(other) if joined is None else joined

    def dual(self):
        """The dual state (ket to bra, bra to ket) with the same quantum numbers."""
        return _DUALS[type(self)](*self._dual_args())

    def _dual_args(self):
        return self.args

    def _eval_adjoint(self):
        return self.dual()


_DUALS = {}


def _dual_pair(ket_class, bra_class):
    """Declare two :class:`_DualState` classes each other's dual."""
    _DUALS[ket_class] = bra_class
    _DUALS[bra_class] = ket_class
    _KET_SIDE.add(ket_class)


_KET_SIDE = set()


# --------------------------------------------------------------------------- type discipline
# ``+`` and ``*`` with a state on one side check what they are asked to build (issue 17):
# an operator plus a state, a ket plus a bra, states of different spaces (label sets) added,
# and a bra of one space times a ket of another are refused with a typed error.

def _side(obj):
    """``"ket"`` or ``"bra"`` for a state object, ``None`` for anything else."""
    cls = type(obj)
    if cls not in _DUALS:
        return None
    return "ket" if cls in _KET_SIDE else "bra"


def _labels(state):
    """The labels of the space of a state (its ``label``, ``labels`` and Fock ``modes``), sorted."""
    found = [*(getattr(state, "labels", None) or ()), *(getattr(state, "modes", None) or ())]
    if found:
        return sorted(found)
    label = getattr(state, "label", None)
    return None if label is None else [label]  # None: a family that names no labels is not compared


def _nc_factors(expr):
    """The noncommutative factors of a product, in order (a power stands for its base)."""
    factors = expr.args_cnc()[1] if expr.is_Mul else [expr]
    return [f.base if f.is_Pow else f for f in factors]


def _kind(term):
    """``(kind, labels)`` of one term of a sum: kind is scalar, operator, ket, bra or other."""
    if term.is_commutative:
        return "scalar", None
    factors = _nc_factors(term)
    sides = [_side(f) for f in factors]
    if sides[-1] == "ket" and "bra" not in sides:
        return "ket", _labels(factors[-1])
    if sides[0] == "bra" and "ket" not in sides:
        return "bra", _labels(factors[0])
    if not any(sides) and not any(f.has(*_DUALS) for f in factors):
        return "operator", None
    return "other", None


def _check_sum(state, other):
    if not isinstance(other, Basic):
        return  # numbers: SymPy's own conversion decides
    side, labels = _side(state), _labels(state)
    for term in Add.make_args(other):
        kind, term_labels = _kind(term)
        if kind == "operator":
            raise OperatorError(f"other={term} must not be an operator: an operator and a {side} cannot "
                                f"be added (apply the operator to the state: apply(op, state))")
        if kind in ("ket", "bra") and kind != side:
            raise StateError(f"other={term} must be a {side} too: a ket and a bra cannot be added")
        if kind == side and None not in (term_labels, labels) and term_labels != labels:
            raise StateError(f"other={term} must be a {side} of the same space as {state}: labels "
                             f"{term_labels} and {labels} differ")


def _check_product(left, right):
    """Refuse a bra of one space times a ket of another (also around operators: <a|_J X |b>_L)."""
    if not (isinstance(left, Basic) and isinstance(right, Basic)):
        return
    if left.is_commutative or right.is_commutative:
        return
    lf, rf = _nc_factors(left), _nc_factors(right)
    for bra_, ket_ in ((lf[-1], rf[0]), (lf[0], rf[-1])):
        if _side(bra_) == "bra" and _side(ket_) == "ket" and None not in (_labels(bra_), _labels(ket_)) \
                and _labels(bra_) != _labels(ket_):
            raise StateError(f"bra={bra_} and ket={ket_} must carry the same labels, got "
                             f"{_labels(bra_)} and {_labels(ket_)}: a bra of one space times a ket of "
                             f"another is not an inner product")


def _join_states(left, right):
    """``|a>_J * |n>_b`` as the product ket (bras likewise), a coefficient kept in front; else None.

    Only products of basis states (|j m>, product or Fock) of one side are joined; anything else
    (a bra times a ket, an operator, a combination) is left to SymPy.
    """
    if not isinstance(left, Basic) or not isinstance(right, Basic):
        return None
    coeff = S.One
    if isinstance(left, Mul):
        c, nc = left.args_cnc()
        if len(nc) != 1:
            return None
        coeff, left = Mul(*c), nc[0]
    sides = {_side(left), _side(right)}
    if len(sides) != 1 or None in sides or not _is_factor(left) or not _is_factor(right):
        return None
    if set(_labels(left)) & set(_labels(right)):
        return None     # not a product state (components refuses it with the reason)
    product = (ProductKet if sides == {"ket"} else ProductBra)(left, right)
    return product if coeff is S.One else coeff * product


def _is_factor(state):
    """A |j m> state, a product of them or a Fock state: what a product state is made of."""
    return isinstance(state, (_StateMixin, _ProductMixin)) or state.func in _MODE_STATES.values()


class _StateMixin(_DualState):
    """Shared behaviour of single kets and bras."""

    __slots__ = ()
    is_commutative = False
    _notation_key = "state"

    def __new__(cls, j, m, label="J"):
        return Expr.__new__(cls, *_validated(j, m, label))

    @property
    def j(self):
        return self.args[0]

    @property
    def m(self):
        return self.args[1]

    @property
    def label(self):
        """The label as a Python str."""
        return self.args[2].name


class Ket(_StateMixin, Expr):
    r"""The ket :math:`|j\,m\rangle_{\mathrm{label}}`, an eigenstate of :math:`J^2` and :math:`J_z`.

    Explanation
    ===========

    Args are ``(j, m, Str(label))``.  See the module docstring for validation
    rules.  ``sympy.adjoint(ket)`` and :meth:`dual` give the :class:`Bra`.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.states.kets import Ket
    >>> k = Ket("3/2", "-1/2", "S")
    >>> k, adjoint(k), k.func(*k.args) == k
    (|3/2, -1/2>_S, <3/2, -1/2|_S, True)
    """

    __slots__ = ()

    @classmethod
    def _unchecked(cls, j, m, label):
        """Internal: build from already validated SymPy numbers and a label str."""
        return Expr.__new__(cls, j, m, Str(label))


class Bra(_StateMixin, Expr):
    r"""The bra :math:`\langle j\,m|_{\mathrm{label}}`, the dual of :class:`Ket`.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.states.kets import Bra
    >>> b = Bra(1, 0, "L")
    >>> adjoint(b), adjoint(adjoint(b)) == b
    (|1, 0>_L, True)
    """

    __slots__ = ()


_dual_pair(Ket, Bra)


# Fock kets and bras (amalgebra.bosons.fock) declare themselves here when that module is imported, so a
# product state may hold one Fock factor after its |j m> factors (no Fock ket exists before the import)
_MODE_STATES = {}


def _declare_mode_states(ket_class, bra_class):
    """Internal: the Fock ket and bra classes, the boson-mode factors of product states."""
    _MODE_STATES[Ket] = ket_class
    _MODE_STATES[Bra] = bra_class


def _factors(items, kind, name):
    """The factors of a product state: ``kind`` factors sorted by label, then one merged Fock factor."""
    fock = _MODE_STATES.get(kind)
    flat, occupations = [], {}
    for item in items:
        parts = item.args if isinstance(item, (ProductKet, ProductBra)) else (item,)
        for part in parts:
            if isinstance(part, kind):
                flat.append(part)
            elif fock is not None and isinstance(part, fock):
                for mode, n in part.as_dict().items():
                    if mode in occupations:
                        raise StateError(f"modes must be distinct in a product state: {mode!r} is repeated")
                    occupations[mode] = n
            else:
                allowed = kind.__name__ + (f", {fock.__name__}" if fock is not None else "")
                raise StateError(f"{name}={item} must be a {allowed} or a product of them")
    flat.sort(key=lambda k: _label_key(k.label))
    labels = [k.label for k in flat]
    if len(set(labels)) != len(labels):
        raise StateError(f"labels={labels} must be distinct in a product state")
    shared = sorted(set(labels) & set(occupations))
    if shared:
        raise StateError(f"label={shared[0]!r} must not be both an angular momentum and a boson mode of a "
                         f"product state")
    if occupations:
        flat.append(fock(tuple(occupations), tuple(occupations.values())))
    return flat


class _ProductMixin(_DualState):
    """Shared behaviour of product kets and bras: factors are duals one by one."""

    __slots__ = ()
    _notation_key = "product"
    _factor_class = None

    def __new__(cls, *factors):
        flat = _factors(factors, cls._factor_class, cls._factor_class.__name__.lower())
        if len(flat) == 1:
            return flat[0]
        return Expr.__new__(cls, *flat)

    @property
    def labels(self):
        """The angular-momentum labels (of the ``|j m>`` factors), in label order."""
        return tuple(f.label for f in self.args if isinstance(f, _StateMixin))

    @property
    def modes(self):
        """The boson modes of the Fock factor, sorted (``()`` without one)."""
        last = self.args[-1]
        return () if isinstance(last, _StateMixin) else last.modes

    def _dual_args(self):
        return [f.dual() for f in self.args]


class ProductKet(_ProductMixin, Expr):
    r"""The product :math:`|j_1 m_1\rangle_{L_1} |j_2 m_2\rangle_{L_2} \cdots` over distinct labels.

    Explanation
    ===========

    Args are the :class:`Ket` factors sorted by label, so the product is
    canonical: the order of construction does not matter.  A product of one
    factor is that ket itself.  A spin-boson state has one Fock factor
    (:class:`~amalgebra.bosons.FockKet`) after them: Fock kets given as
    factors are merged into it (``labels`` names the ``|j m>`` factors, ``modes``
    the boson modes).

    Examples
    ========

    >>> from amalgebra.states.kets import ProductKet, Ket
    >>> a, b = Ket(1, 0, "S"), Ket(2, 1, "L")
    >>> ProductKet(a, b) == ProductKet(b, a)
    True
    >>> ProductKet(a)
    |1, 0>_S
    >>> from amalgebra.bosons import fock_ket
    >>> k = ProductKet(fock_ket(1, modes="c"), a, fock_ket(0, modes="b"))
    >>> k, k.labels, k.modes
    (|1, 0>_S|0, 1>_(b,c), ('S',), ('b', 'c'))
    """

    __slots__ = ()
    is_commutative = False
    _factor_class = Ket

    @classmethod
    def _unchecked(cls, kets, fock=None):
        """Internal: product of validated kets with distinct labels (sorted here), then a Fock factor."""
        args = sorted(kets, key=lambda k: _label_key(k.label))
        if fock is not None:
            args.append(fock)
        return Expr.__new__(cls, *args)


class ProductBra(_ProductMixin, Expr):
    r"""The product of bras over distinct labels, the dual of :class:`ProductKet`.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.states.kets import ProductKet, Ket
    >>> adjoint(ProductKet(Ket(1, 0, "S"), Ket(0, 0, "L")))
    <0, 0|_L<1, 0|_S
    """

    __slots__ = ()
    is_commutative = False
    _factor_class = Bra


_dual_pair(ProductKet, ProductBra)


_KETS = (Ket, ProductKet)
_BRAS = (Bra, ProductBra)


def _product_state(kets, fock=None):
    """The basis ket of validated ``|j m>`` factors (label order) and an optional Fock factor: the one
    factor itself, else the product ket."""
    if fock is None:
        return kets[0] if len(kets) == 1 else ProductKet._unchecked(kets)
    return ProductKet._unchecked(kets, fock) if kets else fock


def _kinds(side):
    """The basis classes of one side (``Ket`` or ``Bra``): |j m>, products, and Fock states once declared."""
    base = _KETS if side is Ket else _BRAS
    fock = _MODE_STATES.get(side)
    return base if fock is None else base + (fock,)


def ket(j, m, label="J"):
    """The ket ``|j m>_label`` (see :class:`Ket`).

    Examples
    ========

    >>> ket("1/2", "-1/2", "S")
    |1/2, -1/2>_S
    """
    return Ket(j, m, label)


def bra(j, m, label="J"):
    """The bra ``<j m|_label`` (see :class:`Bra`).

    Examples
    ========

    >>> bra(1, 1)
    <1, 1|_J
    """
    return Bra(j, m, label)


def product_ket(*kets):
    """The product of kets over distinct labels (see :class:`ProductKet`).

    Examples
    ========

    >>> product_ket(ket(1, 0, "L"), ket("1/2", "1/2", "S")).labels
    ('L', 'S')
    """
    return ProductKet(*kets)


def components(state, kinds=None, name="state"):
    """Return a linear combination of kets (or bras) as a dict ``{basis: coefficient}``.

    The walk is linear: sums, commutative factors and the basis objects (kets,
    product kets, Fock kets; coupled kets through their product expansion);
    a product ``|a>_J |n>_b`` of kets of distinct spaces is read as the
    product ket.  ``kinds`` is ``None`` (kets), ``"bra"`` (bras) or a tuple of
    basis classes.  Keys keep first-appearance order and coefficients that
    vanish identically are dropped.  Anything else raises
    :class:`~amalgebra.errors.StateError`.

    >>> from sympy import Symbol
    >>> a = Symbol("a")
    >>> components(a * (ket(1, 0) + ket(1, 1)) - a * ket(1, 1))
    {|1, 0>_J: a}
    >>> components(2 * ket(0, 0, "L") * ket("1/2", "1/2", "S"))
    {|0, 0>_L|1/2, 1/2>_S: 2}
    """
    if kinds is None or kinds == _KETS:
        kinds = _kinds(Ket)
    elif kinds == "bra" or kinds == _BRAS:
        kinds = _kinds(Bra)
    parts = {}
    _walk(state, S.One, parts, kinds, name)
    out = {}
    for basis, terms in parts.items():
        coeff = Add(*terms)
        if coeff != 0:
            out[basis] = coeff
    return out


def _walk(expr, coeff, parts, kinds, name):
    if isinstance(expr, kinds):
        parts.setdefault(expr, []).append(coeff)
    elif hasattr(expr, "_as_product_kets") and Ket in kinds or hasattr(expr, "_as_product_bras") and Bra in kinds:
        # coupled kets and bras enter through their product-ket expansion
        expansion = expr._as_product_kets() if Ket in kinds else expr._as_product_bras()
        for basis, c in expansion.items():
            parts.setdefault(basis, []).append(coeff * c)
    elif isinstance(expr, Add):
        for arg in expr.args:
            _walk(arg, coeff, parts, kinds, name)
    elif isinstance(expr, Mul):
        c, nc = expr.args_cnc()
        expand_name = "_as_product_kets" if Ket in kinds else "_as_product_bras" if Bra in kinds else None
        if len(nc) > 1 and expand_name and all(isinstance(f, kinds) or hasattr(f, expand_name) for f in nc):
            # |a>_J |n>_b (or a coupled ket times a Fock ket) written as a product: the product state over
            # distinct spaces, a coupled factor through its product expansion
            product_class = ProductKet if Ket in kinds else ProductBra
            acc = {(): coeff * Mul(*c)}
            for f in nc:
                expansion = getattr(f, expand_name)() if hasattr(f, expand_name) else {f: S.One}
                acc = {key + (b,): v * cb for key, v in acc.items() for b, cb in expansion.items()}
            for key, v in acc.items():
                parts.setdefault(product_class(*key), []).append(v)
            return
        if len(nc) != 1:
            raise StateError(f"{name}={expr} must be a linear combination of "
                             f"{' or '.join(k.__name__ for k in kinds)} objects")
        _walk(nc[0], coeff * Mul(*c), parts, kinds, name)
    elif isinstance(expr, Basic) and expr.is_commutative and expr == 0:
        return
    elif isinstance(expr, (int, Fraction)) and not isinstance(expr, bool) and expr == 0:
        return
    else:
        raise StateError(f"{name}={expr} must be a linear combination of "
                         f"{' or '.join(k.__name__ for k in kinds)} objects")


def from_components(parts):
    """Rebuild ``sum(coefficient * basis)`` from a components dict, in its order.

    >>> from_components({ket(1, 0): 2, ket(1, 1): 3}) == 2 * ket(1, 0) + 3 * ket(1, 1)
    True
    """
    return Add(*[c * b for b, c in parts.items()])


def tensor(*states):
    """Tensor product of states over disjoint labels, distributed over sums.

    >>> tensor(ket("1/2", "1/2", "A") + ket("1/2", "-1/2", "A"), ket(0, 0, "B"))
    |1/2, -1/2>_A|0, 0>_B + |1/2, 1/2>_A|0, 0>_B
    """
    acc = {(): S.One}
    for index, state in enumerate(states):
        comp = components(state, name=f"states[{index}]")
        nxt = {}
        for basis, c in acc.items():
            for b2, c2 in comp.items():
                nxt[basis + (b2,)] = c * c2
        acc = nxt
    return Add(*[c * ProductKet(*basis) for basis, c in acc.items()])


def _factor_map(basis):
    """{label: (j, m)} of the ``|j m>`` factors of a basis ket or bra (a Fock factor has none)."""
    factors = basis.args if isinstance(basis, (ProductKet, ProductBra)) else (basis,)
    return {f.label: (f.j, f.m) for f in factors if isinstance(f, _StateMixin)}


def _mode_map(basis):
    """{mode: n} of the Fock factor of a basis ket or bra ({} without one)."""
    last = basis.args[-1] if isinstance(basis, (ProductKet, ProductBra)) else basis
    return {} if isinstance(last, _StateMixin) else last.as_dict()


def _basis_overlap(b, k):
    fb, fk = _factor_map(b), _factor_map(k)
    nb, nk = _mode_map(b), _mode_map(k)
    if sorted(fb) != sorted(fk) or sorted(nb) != sorted(nk):
        raise StateError(f"bra={b} and ket={k} must carry the same labels, got {sorted(fb) + sorted(nb)} "
                         f"and {sorted(fk) + sorted(nk)}")
    return Mul(*[KroneckerDelta(fb[lab][0], fk[lab][0]) * KroneckerDelta(fb[lab][1], fk[lab][1])
                 for lab in sorted(fb)], *[KroneckerDelta(nb[mode], nk[mode]) for mode in sorted(nb)])


def _register_state_family(kets, bras, apply_fn, inner_fn):
    """The former hook for state families outside this package; now without effect (see ``__getattr__``)."""


def __getattr__(name):
    # deprecated since 0.2.0: Fock kets and spin-boson product kets go through the one engine, so there is
    # no second dispatch to register into; the name stays importable and does nothing
    if name == "register_state_family":
        import warnings

        warnings.warn("register_state_family is deprecated since amalgebra 0.2.0 and does nothing: Fock kets "
                      "and spin-boson product kets act through amalgebra.states.apply directly",
                      DeprecationWarning, stacklevel=2)
        return _register_state_family
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def inner(bra_state, ket_state):
    r"""The inner product :math:`\langle\phi|\psi\rangle` of a bra combination and a ket combination.

    Explanation
    ===========

    Bilinear in its arguments; the bra already carries conjugated coefficients
    (use ``sympy.adjoint(phi)``).  Basis overlaps are products of
    ``KroneckerDelta(j', j) * KroneckerDelta(m', m)`` per label, which SymPy
    evaluates to 0 or 1 when it can decide and keeps otherwise.  A ket given as
    first argument is turned into its bra for convenience.

    Examples
    ========

    >>> from sympy import Symbol, adjoint, I
    >>> a = Symbol("a")
    >>> psi = ket(1, 0) + I * a * ket(1, 1)
    >>> inner(adjoint(psi), psi)
    a*conjugate(a) + 1
    >>> inner(bra(1, 0), ket(1, 1))
    0

    See Also
    ========

    norm
    """
    if not _is_bra_like(bra_state):
        bra_state = adjoint(bra_state)
    bras = components(bra_state, "bra", "bra")
    kets = components(ket_state, None, "ket")
    numeric = {k: c for k, c in kets.items() if _is_numeric_basis(k)}
    symbolic = [(k, c) for k, c in kets.items() if k not in numeric]
    terms = []
    for b, cb in bras.items():
        if _is_numeric_basis(b):
            # numeric bases are orthonormal: only the identical ket overlaps (labels checked below)
            k = b.dual()
            if k in numeric:
                terms.append(cb * numeric[k])
            elif numeric:
                _basis_overlap(b, next(iter(numeric)))
            pairs = symbolic
        else:
            pairs = list(kets.items())
        terms.extend(cb * ck * _basis_overlap(b, k) for k, ck in pairs)
    return exact_sum(terms)


def _is_numeric_basis(basis):
    return (all(x.is_Rational for jm in _factor_map(basis).values() for x in jm)
            and all(n.is_Integer for n in _mode_map(basis).values()))


def _is_bra_like(state):
    try:
        components(state, "bra", "bra")
    except StateError:
        return False
    return True


def norm(state):
    """The norm ``sqrt(<psi|psi>)`` of a ket combination.

    Examples
    ========

    >>> from sympy import sqrt
    >>> norm(ket(1, 0) - ket(1, 1)) == sqrt(2)
    True
    """
    value = inner(adjoint(state), state)
    return sqrt(value)


def normalize(state):
    """The state divided by its norm; refuses the zero state.

    Examples
    ========

    >>> normalize(ket(0, 0) + ket(1, 0))
    sqrt(2)*|0, 0>_J/2 + sqrt(2)*|1, 0>_J/2
    """
    n = norm(state)
    if n == 0:
        raise StateError(f"state={state} must be nonzero to be normalised")
    return from_components({b: c / n for b, c in components(state).items()})
