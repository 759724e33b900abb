r"""The action of an operator on a generic ket, read off its canonical m-shift form.

Explanation
===========

Any polynomial operator :math:`O` in the angular momenta of labels
:math:`L_1, \dots, L_n` has the canonical form
:math:`\sum_d R^{(d)} p_d(J^2, J_z)` (:func:`amalgebra.algebra.canonical`), so
it acts on a product ket as

.. math::

    O \prod_L |j_L m_L\rangle = \sum_{d} c_d(j, m) \prod_L N_{d_L}(j_L, m_L)
    |j_L, m_L + d_L\rangle, \qquad c_d(j, m) = p_d(j(j+1), m),

with :math:`N_d` the Condon-Shortley ladder factor of :mod:`amalgebra._exact`.
This module composes the kernel's polynomials :math:`p_d` with
:math:`J^2 \to j(j+1)`, :math:`J_z \to m` inside one ``sympy.polys`` ring over
:math:`(j_L, m_L)`, so the closed form for symbolic :math:`j, m` and the exact
value at numeric points both come from the same data, computed once per
operator and label set.  It is the only operator-on-ket engine of the package:
:mod:`amalgebra.states.engine` builds on it (tensor components included), and
:mod:`amalgebra.testing.action_oracle` keeps an independent word-by-word walk
as the cross-check.

The phase convention is Condon-Shortley, :math:`\hbar = 1`:
:math:`J_\pm|j m\rangle = \sqrt{(j\mp m)(j\pm m+1)}\,|j, m\pm1\rangle`.

Examples
========

>>> from sympy import Symbol
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.states.actionform import action_form
>>> J = AngularMomentum("J")
>>> form = action_form(J.plus * J.minus, ("J",))
>>> j, m = Symbol("j"), Symbol("m")
>>> form.closed_form({"J": (j, m)})          # J+ J- |j m> = (j+m)(j-m+1) |j m>
{(0,): j**2 + j - m**2 + m}
>>> form.amplitude((0,), {"J": (2, -2)}) == 0   # J- kills |2, -2>
True

Parameters
==========

op : SymPy expression in angular-momentum operators and scalars
labels : tuple of str, the labels of the space the operator acts on

See Also
========

amalgebra.states.engine, amalgebra.states.action.apply

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 2.
"""

from fractions import Fraction
from math import gcd

from sympy import Add, Dummy, Expr, I, Mul, Rational, S, default_sort_key
from sympy.polys.constructor import construct_domain
from sympy.polys.domains import QQ, ZZ
from sympy.polys.rings import PolyRing

from .._exact import clear_caches as _clear_exact
from .._exact import boson_ladder, condon_shortley, sqrt_of_product
from .._validation import label_key
from ..algebra.convert import kernel_of
from ..algebra.modes import ANGULAR_MOMENTUM
from ..errors import OperatorError

__all__ = ["ActionForm", "action_form", "slots", "form_of_element", "check_labels", "condon_shortley", "sqrt_of_product",
           "clear_caches"]


class ActionForm:
    """The action of an angular-momentum polynomial on a generic product ket (see the module docstring).

    Attributes: ``labels`` (tuple of str, the ket's labels in the package's
    label order), ``ring`` (the polynomial ring over ``j_L, m_L``), ``jvars``
    and ``mvars`` (its generators per label) and ``terms`` (a dict shift tuple
    -> ring element, sorted by shift).  Not a SymPy object: it is a
    computation cache; :meth:`closed_form` converts.
    """

    __slots__ = ("labels", "modes", "ring", "domain", "jvars", "mvars", "terms", "_symbols", "_conv", "_ints")

    def __init__(self, labels, ring, terms, modes=()):
        self.labels = tuple(labels)
        self.modes = frozenset(modes)
        self.ring = ring
        self.domain = ring.domain
        self._symbols = ring.symbols
        self._conv = {}
        self._ints = {}
        n = len(labels)
        self.jvars = ring.gens[:n]
        self.mvars = ring.gens[n:2 * n]
        self.terms = dict(sorted((k, v) for k, v in terms.items() if v))

    def __repr__(self):
        return f"ActionForm(labels={self.labels}, shifts={list(self.terms)})"

    def _values(self, values):
        try:
            return [values[lab] for lab in self.labels]
        except KeyError as exc:
            raise OperatorError(f"values must give (j, m) for every label in {list(self.labels)}, "
                                f"missing {exc.args[0]!r}") from None

    def _convert(self, value):
        cache = self._conv
        out = cache.get(value)
        if out is None:
            out = cache[value] = self.domain.convert(value)
        return out

    def prepare(self, pairs):
        """Internal: per-label ``(j, m)`` SymPy pairs (label order) plus a numeric point or a symbol map."""
        vals = [_pair(v) for v in pairs]
        if all(j.is_Rational and m.is_Rational for j, m in vals):
            point = [self._convert(j) for j, _ in vals] + [self._convert(m) for _, m in vals]
            return vals, point, None
        nsym = len(self.labels)
        mapping = {}
        for index, (j, m) in enumerate(vals):
            mapping[self._symbols[index]] = j
            mapping[self._symbols[nsym + index]] = m
        return vals, None, mapping

    def _value(self, poly, prepared):
        vals, point, mapping = prepared
        if point is not None:
            if self.domain.is_QQ or self.domain.is_GaussianField:
                return self._integer_value(poly, vals)
            return self._grouped_value(poly, vals)
        return poly.as_expr().xreplace(mapping).expand()

    def _grouped_value(self, poly, vals):
        """Exact value at numeric (j, m) for symbolic coefficients: monomials grouped by coefficient.

        Each distinct coefficient (a SymPy expression in the user's symbols)
        multiplies one rational number, the sum of its monomials at the point.
        """
        key = ("grouped", id(poly))
        form = self._ints.get(key)
        if form is None:
            groups = {}
            for monom, c in poly.items():
                groups.setdefault(c, []).append(monom)
            items = [(self.domain.to_sympy(c), monoms) for c, monoms in groups.items()]
            # products of a rational and a monomial coefficient are already expanded: expand only sums
            form = self._ints[key] = (poly, items, any(c.is_Add for c, _ in items))
        point = [j for j, _ in vals] + [m for _, m in vals]
        terms = []
        for coeff, monoms in form[1]:
            total = S.Zero
            for monom in monoms:
                value = S.One
                for i, e in enumerate(monom):
                    if e:
                        value *= point[i] ** e
                total += value
            if total != 0:
                terms.append(coeff * total)
        if not terms:
            return S.Zero
        value = Add(*terms) if len(terms) > 1 else terms[0]
        return value.expand() if form[2] else value

    def _integer_value(self, poly, vals):
        """Exact value at half-integer (j, m) by Python-int arithmetic on doubled values.

        The polynomial is stored once as integer (real, imaginary) coefficients over one
        denominator; each monomial ``j^a m^b`` is ``(2j)^a (2m)^b / 2^(a+b)``, so the sum
        is one integer over ``den * 2^degree``.
        """
        key = id(poly)
        form = self._ints.get(key)
        if form is None:
            form = self._ints[key] = (poly, _integer_form(poly, self.domain.is_GaussianField))
        items, den, degree = form[1]
        doubled = [int(2 * j) for j, _ in vals] + [int(2 * m) for _, m in vals]
        re_total = im_total = 0
        powers = {}
        for monom, re_c, im_c in items:
            value = 1 << (degree - sum(monom))
            for i, e in enumerate(monom):
                if e:
                    p = powers.get((i, e))
                    if p is None:
                        p = powers[(i, e)] = doubled[i] ** e
                    value *= p
            re_total += re_c * value
            im_total += im_c * value
        scale = den << degree
        out = Rational(re_total, scale)
        if im_total:
            out = out + I * Rational(im_total, scale)
        return out

    def shift_amplitude(self, shift, prepared):
        """Internal: ``c_shift * prod N_d`` at prepared values."""
        c = self._value(self.terms[shift], prepared)
        if c == 0:
            return S.Zero
        factors = [c]
        for slot, ((j, m), d) in enumerate(zip(prepared[0], shift)):
            if d:
                n = boson_ladder(m, d) if slot in self.modes else condon_shortley(j, m, d)
                if n == 0:
                    return S.Zero
                factors.append(n)
        return Mul(*factors)

    def polynomial(self, shift, values):
        """``c_shift(j, m)`` at the given ``{label: (j, m)}`` as a SymPy expression."""
        poly = self.terms.get(tuple(shift))
        if poly is None:
            return S.Zero
        return self._value(poly, self.prepare(self._values(values)))

    def amplitude(self, shift, values):
        """``c_shift * prod_L N_{d_L}(j_L, m_L)``: the coefficient of ``|j, m + shift>``."""
        shift = tuple(shift)
        if shift not in self.terms:
            return S.Zero
        return self.shift_amplitude(shift, self.prepare(self._values(values)))

    def closed_form(self, values):
        """``{shift: amplitude}`` for every shift, at (possibly symbolic) ``{label: (j, m)}``."""
        prepared = self.prepare(self._values(values))
        out = {}
        for shift in self.terms:
            amp = self.shift_amplitude(shift, prepared)
            if amp != 0:
                out[shift] = amp
        return out


def _integer_form(poly, gaussian):
    """``([(monom, re, im)], den, degree)``: the coefficients of ``poly`` as ints over one denominator."""
    den = 1
    coeffs = []
    for monom, c in poly.items():
        parts = (c.x, c.y) if gaussian else (c, 0)
        parts = [Fraction(int(p.numerator), int(p.denominator)) if p else Fraction(0) for p in parts]
        coeffs.append((monom, parts))
        for p in parts:
            den = den * p.denominator // gcd(den, p.denominator)
    items = [(monom, int(re * den), int(im * den)) for monom, (re, im) in coeffs]
    degree = max((sum(monom) for monom, _, _ in items), default=0)
    return items, den, degree


def _evaluate(poly, point, domain):
    """Value of a ring element at a point (all generators), with 0**0 = 1."""
    powers = [{} for _ in point]
    total = domain.zero
    for monom, coeff in poly.items():
        value = coeff
        for i, e in enumerate(monom):
            if e:
                cache = powers[i]
                p = cache.get(e)
                if p is None:
                    p = cache[e] = point[i] ** e
                value = value * p
        total = total + value
    return total


def _pair(value):
    j, m = value
    return S(j) if not isinstance(j, Expr) else j, S(m) if not isinstance(m, Expr) else m


def _field(domain):
    if domain.is_EX or domain.is_Field:
        return domain
    return domain.get_field()


_RINGS = {}


def _ring_for(n, domain):
    key = (n, domain)
    ring = _RINGS.get(key)
    if ring is None:
        symbols = tuple(Dummy(f"j{i}") for i in range(n)) + tuple(Dummy(f"m{i}") for i in range(n))
        ring = _RINGS[key] = PolyRing(symbols, domain)
    return ring


def _generators(index):
    """``(J^2 generator or None, shift-variable generator)`` of one kernel label's ``var_index``.

    An angular momentum has ``(J^2, J_z)``, a boson mode ``(N,)``: in an action
    form a mode's slot is ``(0, n)``, its ``m`` variable standing for ``n``.
    """
    return (index[0], index[1]) if len(index) == 2 else (None, index[0])


def form_of_element(algebra, element, labels, modes=()):
    """The :class:`ActionForm` over ``labels`` of a kernel ``element`` of ``algebra`` (a ShiftAlgebra).

    ``modes`` are the slot indices of boson modes among ``labels`` (values
    ``(0, n)``).  Every kernel label must be among ``labels``, an angular
    momentum on an angular-momentum slot or a boson on a mode slot (checked
    by the callers through :func:`check_labels`, which words the error).
    """
    labels = tuple(labels)
    n = len(labels)
    source = algebra.domain
    if source.is_ZZ or source.is_QQ or source.is_GaussianRing or source.is_GaussianField:
        domain = _field(source)

        def convert(coeff, source):
            return domain.convert_from(coeff, source)
    else:
        # symbolic coefficients: the field SymPy constructs for their values (the kernel's own
        # domain may use internal generators), so the closed form is in the user's symbols
        values = {c: source.to_sympy(c) for key in element for _, c in algebra.terms(element[key])}
        domain, _ = construct_domain(sorted(set(values.values()), key=default_sort_key) or [S.One], field=True)

        def convert(coeff, source):
            return domain.from_sympy(values[coeff])
    ring = _ring_for(n, domain)
    where = [labels.index(label) for label in algebra.labels]
    jv, mv = ring.gens[:n], ring.gens[n:]
    casimir = {}
    powers = {}

    def power(kind, i, e):
        key = (kind, i, e)
        hit = powers.get(key)
        if hit is None:
            if kind == "q":
                base = casimir.get(i)
                if base is None:
                    base = casimir[i] = jv[i] * (jv[i] + 1)
            else:
                base = mv[i]
            hit = powers[key] = base ** e
        return hit

    den = domain.convert(element.den) if element.den != 1 else None
    integer = source.is_ZZ or source.is_GaussianRing
    if integer:
        # compose over ZZ (real and imaginary parts apart): Python ints are far cheaper than QQ_I
        zring = _ring_for(n, ZZ)
        jv, mv = zring.gens[:n], zring.gens[n:]
        powers.clear()
        casimir.clear()
    terms = {}
    for key in sorted(element):
        if integer:
            acc = _compose_integer(algebra, element[key], where, power, zring, ring, domain, source, element.den)
        else:
            acc = ring.zero
            for mon, coeff in algebra.terms(element[key]):
                term = ring.ground_new(convert(coeff, source))
                for k, i in enumerate(where):
                    gq, gm = _generators(algebra.var_index[k])
                    if gq is not None and mon[gq]:
                        term = term * power("q", i, mon[gq])
                    if mon[gm]:
                        term = term * power("m", i, mon[gm])
                acc = acc + term
        if den is not None and not integer:
            acc = acc.quo_ground(den)
        if acc:
            shift = [0] * n
            for k, i in enumerate(where):
                shift[i] = key[k]
            terms[tuple(shift)] = acc
    return ActionForm(labels, ring, terms, modes)


def _compose_integer(algebra, poly, where, power, zring, ring, domain, source, den):
    """``poly(J^2 -> j(j+1), Jz -> m) / den`` for integer (or Gaussian-integer) coefficients, into ``ring``."""
    parts = [zring.zero, zring.zero]
    gaussian = source.is_GaussianRing
    for mon, coeff in algebra.terms(poly):
        values = (int(coeff.x), int(coeff.y)) if gaussian else (int(coeff), 0)
        factor = zring.one
        for k, i in enumerate(where):
            gq, gm = _generators(algebra.var_index[k])
            if gq is not None and mon[gq]:
                factor = factor * power("q", i, mon[gq])
            if mon[gm]:
                factor = factor * power("m", i, mon[gm])
        for slot, value in enumerate(values):
            if value:
                parts[slot] = parts[slot] + factor * value
    pairs = {}
    for slot, part in enumerate(parts):
        for monom, c in part.items():
            pairs.setdefault(monom, [0, 0])[slot] = int(c)
    out = {}
    for monom, (x, y) in pairs.items():
        if gaussian:
            out[monom] = domain.new(QQ(x, den), QQ(y, den))
        else:
            out[monom] = QQ(x, den)
    return ring.from_dict(out)


_FORMS = {}
_FORMS_MAX = 256


def slots(labels, modes=()):
    """``(slot names, mode slot indices)``: the angular-momentum labels in the package's label order,
    then the boson modes in that order (the one order of a state's values).

    >>> slots(("S", "J"), ("b", "a"))
    (('J', 'S', 'a', 'b'), (2, 3))
    """
    am = tuple(sorted(labels, key=label_key))
    bosons = tuple(sorted(modes, key=label_key))
    return am + bosons, tuple(range(len(am), len(am) + len(bosons)))


def action_form(op, labels, modes=()):
    """The :class:`ActionForm` of the polynomial ``op`` over ``labels`` and boson ``modes`` (cached).

    The slots are ``labels`` then ``modes``, each in the package's label order
    (:func:`slots`).  Raises :class:`~amalgebra.errors.OperatorError` when
    ``op`` contains a noncommutative factor that is not a component of the
    angular momentum of one of ``labels`` or a boson operator of one of
    ``modes`` (e.g. an operator of another label than the ket's).
    Tensor components go through :func:`amalgebra.states.engine.compile_operator`.

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> list(action_form(J.x**2, ("J",)).terms)
    [(-2,), (0,), (2,)]
    """
    names, where = slots(labels, modes)
    if not isinstance(op, Expr):
        raise OperatorError(f"op={op!r} must be a SymPy expression")
    key = (op, names, where)
    form = _FORMS.get(key)
    if form is not None:
        return form
    algebra, (element,) = kernel_of(op)
    check_labels(algebra, names, op, where)
    form = form_of_element(algebra, element, names, where)
    if len(_FORMS) >= _FORMS_MAX:
        _FORMS.pop(next(iter(_FORMS)))
    _FORMS[key] = form
    return form


def check_labels(algebra, labels, op, modes=()):
    """Every label of the kernel ``algebra`` must be a slot of ``labels`` of its kind.

    An angular momentum must act on an angular-momentum slot, a boson operator
    on a mode slot (``modes``: slot indices); anything else raises
    :class:`~amalgebra.errors.OperatorError` naming the label.
    """
    boson_slots = [labels[i] for i in modes]
    am_slots = [lab for i, lab in enumerate(labels) if i not in modes]
    for label, mode in zip(algebra.labels, algebra.modes):
        if mode is ANGULAR_MOMENTUM:
            if label in boson_slots:
                raise OperatorError(f"operator factor of label={label!r} in op={op} is an angular momentum, "
                                    f"but {label!r} is a boson mode of the state (a Fock factor)")
            if label not in am_slots:
                raise OperatorError(f"operator factor of label={label!r} in op={op} must act on one of the "
                                    f"labels of the state; the state carries {list(labels)}")
        elif mode.kind == "boson":
            if label in am_slots:
                raise OperatorError(f"operator factor of label={label!r} in op={op} is a boson operator, "
                                    f"but {label!r} is an angular momentum of the state (a |j m> factor); "
                                    f"boson operators act on Fock kets and Fock factors of product kets")
            if label not in boson_slots:
                raise OperatorError(f"boson operator of mode={label!r} in op={op} must act on one of the "
                                    f"modes of the state; the state carries modes {boson_slots}"
                                    + ("" if boson_slots else " (none: give a Fock ket factor for the mode)"))
        else:
            raise OperatorError(f"label={label!r} of op={op} is a {mode.kind} mode, which no state of the "
                                f"package carries")


def clear_caches():
    """Empty the caches of action forms and factorisations.

    >>> clear_caches()
    """
    _FORMS.clear()
    _clear_exact()
