r"""The action form of an operator: its action on a generic ket as polynomials in (j, m).

Explanation
===========

Any polynomial operator :math:`O` in the angular momenta of labels
:math:`L_1, \dots, L_n` acts on a product ket as

.. math::

    O \prod_L |j_L m_L\rangle = \sum_{d} c_d(j, m) \prod_L N_{d_L}(j_L, m_L)
    |j_L, m_L + d_L\rangle,

with :math:`c_d` *polynomials* in all :math:`j_L, m_L` and the Condon-Shortley
factors

.. math::

    N_d(j, m) = \prod_{k=0}^{d-1} \sqrt{(j-m-k)(j+m+k+1)} \ (d \ge 0), \qquad
    N_{-d}(j, m) = \prod_{k=1}^{d} \sqrt{(j+m-k+1)(j-m+k)}.

This module computes the :math:`c_d` by applying the operator, factor by factor
from the right, to a generic ket: :math:`J_\pm` move :math:`d` by one and
multiply by :math:`f(x) = (j-x)(j+x+1)` only when the step goes back over an
edge already counted in :math:`N_d`; :math:`J_z` multiplies by :math:`m+d`,
:math:`J^2` by :math:`j(j+1)`, and :math:`J_x = (J_+ + J_-)/2`,
:math:`J_y = (J_+ - J_-)/(2i)`.  Nothing is expanded into words, so
``(Jx**2 - Jy**2 + Jz*Jx)**4`` costs a few polynomial products per factor.
Coefficients live in a ``sympy.polys`` ring over the domain SymPy constructs
for the operator's scalar coefficients (``QQ_I``, ``QQ_I[A, B]``, ... or ``EX``).

The phase convention is Condon-Shortley, :math:`\hbar = 1`:
:math:`J_\pm|j m\rangle = \sqrt{(j\mp m)(j\pm m+1)}\,|j, m\pm1\rangle`.

Operators are recognised by comparing the noncommutative atoms of the
expression with the components of ``AngularMomentum(label)`` of
:mod:`amalgebra.algebra` for the labels of the ket.

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

amalgebra.states.action.apply, amalgebra.states.action.matrix_element

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 2.
"""

from collections import OrderedDict
from functools import lru_cache
from math import gcd

from sympy import QQ_I, ZZ, Add, Dummy, Expr, I, Integer, Mul, Pow, Rational, S, default_sort_key, sqrt
from sympy.polys.constructor import construct_domain
from sympy.polys.rings import PolyRing

from ..errors import ConventionError, OperatorError

__all__ = ["ActionForm", "action_form", "generator_table", "sqrt_of_product", "condon_shortley", "clear_caches"]

_KINDS = ("plus", "minus", "z", "x", "y", "squared")


@lru_cache(maxsize=64)
def _table(labels):
    from ..algebra import AngularMomentum

    table = {}
    for index, label in enumerate(labels):
        mom = AngularMomentum(label)
        for kind in _KINDS:
            comp = getattr(mom, kind)
            if not isinstance(comp, (Add, Mul, Pow)):
                table[comp] = (index, kind)
    return table


def generator_table(labels):
    """Map each atomic operator of ``AngularMomentum(label)`` to ``(label index, kind)``.

    ``kind`` is one of ``"plus", "minus", "z", "x", "y", "squared"``.

    >>> from amalgebra.algebra import AngularMomentum
    >>> generator_table(("S",))[AngularMomentum("S").z]
    (0, 'z')
    """
    return dict(_table(tuple(labels)))


def _collect_scalars(expr, table, labels, out):
    """Collect the commutative coefficients of ``expr`` and check its nc atoms."""
    if expr.is_commutative:
        out.append(expr)
    elif isinstance(expr, Add):
        for arg in expr.args:
            _collect_scalars(arg, table, labels, out)
    elif isinstance(expr, Mul):
        c, nc = expr.args_cnc()
        out.append(Mul(*c))
        for f in nc:
            _collect_scalars(f, table, labels, out)
    elif isinstance(expr, Pow):
        if not (expr.exp.is_Integer and expr.exp > 0):
            raise OperatorError(f"operator={expr} must have positive integer powers only")
        _collect_scalars(expr.base, table, labels, out)
    elif expr not in table:
        raise OperatorError(
            f"operator factor {expr} must be a component of AngularMomentum(label) for a label in "
            f"{list(labels)} (the labels of the state it acts on)")


class ActionForm:
    """The action of an operator on a generic product ket (see the module docstring).

    Attributes: ``labels`` (tuple of str), ``ring`` (the polynomial ring),
    ``jvars`` and ``mvars`` (its generators per label, as ring elements) and
    ``terms`` (an ordered dict shift tuple -> ring element, sorted by shift).
    Not a SymPy object: it is a computation cache; :meth:`closed_form` converts.
    """

    __slots__ = ("labels", "ring", "domain", "jvars", "mvars", "terms", "_symbols", "_conv")

    def __init__(self, labels, ring, domain, symbols, terms):
        self.labels = tuple(labels)
        self.ring = ring
        self.domain = domain
        self._symbols = symbols
        self._conv = {}
        n = len(labels)
        self.jvars = ring.gens[:n]
        self.mvars = ring.gens[n:2 * n]
        self.terms = OrderedDict(sorted((k, v) for k, v in terms.items() if v))

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

    def _prepare(self, values):
        """Per-label (j, m) pairs plus either a numeric point or a symbol mapping."""
        vals = [_pair(v) for v in self._values(values)]
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
        _, point, mapping = prepared
        if point is not None:
            return self.domain.to_sympy(_evaluate(poly, point, self.domain))
        return poly.as_expr().xreplace(mapping).expand()

    def _amplitude(self, shift, prepared):
        c = self._value(self.terms[shift], prepared)
        if c == 0:
            return S.Zero
        factors = [c]
        for (j, m), d in zip(prepared[0], shift):
            if d:
                factors.append(condon_shortley(j, m, d))
        return Mul(*factors)

    def polynomial(self, shift, values):
        """``c_shift(j, m)`` at the given ``{label: (j, m)}`` as a SymPy expression."""
        poly = self.terms.get(tuple(shift))
        if poly is None:
            return S.Zero
        return self._value(poly, self._prepare(values))

    def amplitude(self, shift, values):
        """``c_shift * prod_L N_{d_L}(j_L, m_L)``: the coefficient of ``|j, m + shift>``."""
        shift = tuple(shift)
        if shift not in self.terms:
            return S.Zero
        return self._amplitude(shift, self._prepare(values))

    def closed_form(self, values):
        """``{shift: amplitude}`` for every shift, at (possibly symbolic) ``{label: (j, m)}``."""
        prepared = self._prepare(values)
        out = {}
        for shift in self.terms:
            amp = self._amplitude(shift, prepared)
            if amp != 0:
                out[shift] = amp
        return out


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


def _small_factor(n):
    """Prime factorisation of a positive int as {p: e} (trial division; n is ~2j)."""
    return dict(_factor_cached(n))


@lru_cache(maxsize=8192)
def _factor_cached(n):
    out = []
    p = 2
    while p * p <= n:
        e = 0
        while n % p == 0:
            n //= p
            e += 1
        if e:
            out.append((p, e))
        p += 1 if p == 2 else 2
    if n > 1:
        out.append((n, 1))
    return tuple(out)


def sqrt_of_product(factors):
    """Exact ``sqrt(prod(factors))`` for nonnegative Python ints, as a SymPy number.

    Each factor is factorised separately (they are small, ~2j), so the square
    part is pulled out without factorising the product.

    >>> sqrt_of_product([6, 10, 15])
    30
    >>> sqrt_of_product([2, 3, 4])
    2*sqrt(6)
    """
    exps = {}
    for n in factors:
        if n == 0:
            return S.Zero
        if n < 0:
            raise OperatorError(f"factor={n} must be >= 0 under a Condon-Shortley square root")
        for p, e in _factor_cached(n):
            exps[p] = exps.get(p, 0) + e
    outer, inner = 1, 1
    for p, e in exps.items():
        outer *= p ** (e // 2)
        if e % 2:
            inner *= p
    if inner == 1:
        return Integer(outer)
    return Integer(outer) * Pow(Integer(inner), S.Half, evaluate=False)


def condon_shortley(j, m, d):
    r"""The factor :math:`N_d(j, m)`: ``<j, m+d| J_+^d |j m>`` for ``d >= 0``, ``<j, m+d| J_-^{|d|} |j m>`` else.

    Exact for numeric ``j``, ``m`` (0 when ``m + d`` leaves the range), a product
    of square roots otherwise.

    >>> from sympy import Symbol
    >>> condon_shortley(1, -1, 2)
    2
    >>> condon_shortley(Symbol("j"), Symbol("m"), -1)
    sqrt(j + m)*sqrt(j - m + 1)
    """
    if d == 0:
        return S.One
    j, m = _pair((j, m))
    if j.is_Rational and m.is_Rational:
        tj, tm = int(2 * j), int(2 * m)
        ints = []
        if d > 0:
            for k in range(d):
                ints.append((tj - tm - 2 * k) // 2)
                ints.append((tj + tm + 2 * k + 2) // 2)
        else:
            for k in range(1, -d + 1):
                ints.append((tj + tm - 2 * k + 2) // 2)
                ints.append((tj - tm + 2 * k) // 2)
        if any(n < 0 for n in ints):
            return S.Zero
        return sqrt_of_product(ints)
    if d > 0:
        return Mul(*[sqrt(j - m - k) * sqrt(j + m + k + 1) for k in range(d)])
    return Mul(*[sqrt(j + m - k + 1) * sqrt(j - m + k) for k in range(1, -d + 1)])


class _Builder:
    """Applies an operator expression to the generic ket, right to left (field coefficients).

    A state is ``(terms, den)``: ``{shift: coefficient} / den``; here ``den``
    stays 1 and coefficients are ring elements over the field ``domain``.
    :class:`_GaussBuilder` specialises the common Gaussian-rational case.
    """

    def __init__(self, labels, table, symbols, domain):
        self.labels, self.table, self.domain = labels, table, domain
        self.ring = PolyRing(symbols, self.work_domain(domain))
        n = len(labels)
        self.j = self.ring.gens[:n]
        self.m = self.ring.gens[n:2 * n]
        self._edges = {}
        self.setup()

    # -- hooks a subclass replaces ------------------------------------------------------
    def work_domain(self, domain):
        return domain

    def setup(self):
        half = self.domain.convert(Rational(1, 2))
        self.x_up = self.x_down = half
        self.y_up, self.y_down = self.domain.from_sympy(-I / 2), self.domain.from_sympy(I / 2)

    def start(self):
        return {(0,) * len(self.labels): self.ring.one}, 1

    def scale(self, terms, expr):
        c = self.domain.from_sympy(expr)
        return {k: v.mul_ground(c) for k, v in terms.items()}, 1

    def mul_poly(self, c, poly):
        return c * poly

    def mul_ground(self, c, ground):
        return c.mul_ground(ground)

    def add(self, a, b):
        return a + b

    def is_zero(self, c):
        return not c

    def times_int(self, c, k):
        return c * k

    def result(self, state):
        return dict(state[0])

    # -- the walk -----------------------------------------------------------------------
    def edge(self, index, x):
        """f(m + x) = (j - m - x)(j + m + x + 1) for label ``index``."""
        key = (index, x)
        if key not in self._edges:
            j, m = self.j[index], self.m[index]
            self._edges[key] = (j - m - x) * (j + m + x + 1)
        return self._edges[key]

    def apply(self, expr, state):
        terms, den = state
        if not terms:
            return state
        if expr.is_commutative:
            if expr == 0:
                return {}, 1
            scaled, d = self.scale(terms, expr)
            return scaled, den * d
        if isinstance(expr, Add):
            return self.sum([self.apply(arg, state) for arg in expr.args])
        if isinstance(expr, Mul):
            c, nc = expr.args_cnc()
            for f in reversed(nc):
                state = self.apply(f, state)
            coeff = Mul(*c)
            return state if coeff == 1 else self.apply(coeff, state)
        if isinstance(expr, Pow):
            for _ in range(int(expr.exp)):
                state = self.apply(expr.base, state)
            return state
        index, kind = self.table[expr]
        return getattr(self, "_" + kind)(index, state)

    def sum(self, states):
        """Sum of ``(terms, den)`` states over their least common denominator."""
        den = 1
        for _, d in states:
            den = _lcm(den, d)
        out = {}
        for terms, d in states:
            factor = den // d
            for k, v in terms.items():
                if factor != 1:
                    v = self.times_int(v, factor)
                out[k] = self.add(out[k], v) if k in out else v
        return {k: v for k, v in out.items() if not self.is_zero(v)}, den

    def _shifted(self, index, terms, step, ground=None, out=None):
        """Move shift ``index`` by ``step``, times the ground factor ``ground``."""
        out = {} if out is None else out
        for shift, c in terms.items():
            d = shift[index]
            if step > 0 and d < 0:
                c = self.mul_poly(c, self.edge(index, d))
            elif step < 0 and d > 0:
                c = self.mul_poly(c, self.edge(index, d - 1))
            if ground is not None:
                c = self.mul_ground(c, ground)
            new = shift[:index] + (d + step,) + shift[index + 1:]
            if new in out:
                c = self.add(out[new], c)
                if self.is_zero(c):
                    del out[new]
                    continue
            out[new] = c
        return out

    def _plus(self, index, state):
        return self._shifted(index, state[0], 1), state[1]

    def _minus(self, index, state):
        return self._shifted(index, state[0], -1), state[1]

    def _z(self, index, state):
        m = self.m[index]
        return {k: self.mul_poly(v, m + k[index]) for k, v in state[0].items()}, state[1]

    def _squared(self, index, state):
        j = self.j[index]
        cas = j * (j + 1)
        return {k: self.mul_poly(v, cas) for k, v in state[0].items()}, state[1]

    def _x(self, index, state):
        out = self._shifted(index, state[0], 1, self.x_up)
        return self._shifted(index, state[0], -1, self.x_down, out), state[1] * self.x_den

    def _y(self, index, state):
        out = self._shifted(index, state[0], 1, self.y_up)
        return self._shifted(index, state[0], -1, self.y_down, out), state[1] * self.x_den

    x_den = 1


class _GaussBuilder(_Builder):
    """The Gaussian-rational case: coefficients are pairs (real, imaginary) of ``ZZ[j, m]``
    polynomials over a common integer denominator.

    Python-int polynomial arithmetic is several times cheaper than Gaussian
    rationals; ``Jx = (J+ + J-)/2`` only doubles the denominator and the
    ``-i/2`` of ``Jy`` becomes a swap of the two parts.
    """

    x_den = 2

    def work_domain(self, domain):
        return ZZ

    def setup(self):
        self.x_up = self.x_down = None
        self.y_up, self.y_down = "-i", "+i"

    def start(self):
        return {(0,) * len(self.labels): (self.ring.one, self.ring.zero)}, 1

    def scale(self, terms, expr):
        value = self.domain.from_sympy(expr)
        den = _lcm(value.x.denominator, value.y.denominator)
        a, b = int(value.x * den), int(value.y * den)
        out = {}
        for k, (re_, im_) in terms.items():
            out[k] = (re_ * a - im_ * b, re_ * b + im_ * a)
        return out, den

    def mul_poly(self, c, poly):
        re_, im_ = c
        return (re_ * poly if re_ else re_, im_ * poly if im_ else im_)

    def mul_ground(self, c, ground):
        re_, im_ = c
        if ground == "-i":
            return (im_, -re_)
        return (-im_, re_)

    def add(self, a, b):
        return (a[0] + b[0], a[1] + b[1])

    def is_zero(self, c):
        return not c[0] and not c[1]

    def times_int(self, c, k):
        return (c[0] * k, c[1] * k)

    def result(self, state):
        terms, den = state
        field_ring = PolyRing(self.ring.symbols, self.domain)
        inv = self.domain.convert(Rational(1, den))
        unit = self.domain.from_sympy(I) * inv
        return {k: re_.set_ring(field_ring).mul_ground(inv) + im_.set_ring(field_ring).mul_ground(unit)
                for k, (re_, im_) in terms.items()}


def _lcm(a, b):
    return a * b // gcd(a, b)


_FORMS = {}
_FORMS_MAX = 256


def action_form(op, labels, method="action"):
    """The :class:`ActionForm` of ``op`` over ``labels`` (cached).

    ``method="action"`` (default) applies the operator to a generic ket factor
    by factor (this module); ``method="ladder"`` takes the polynomials from the
    canonical form of :func:`amalgebra.algebra.ladder_terms`.  Both give the
    same form; the tests compare them.

    Raises :class:`~amalgebra.errors.OperatorError` when ``op`` contains a
    noncommutative factor that is not a component of the angular momentum of
    one of ``labels`` (e.g. an operator of another label than the ket's).

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> list(action_form(J.x**2, ("J",)).terms)
    [(-2,), (0,), (2,)]
    """
    labels = tuple(labels)
    if not isinstance(op, Expr):
        raise OperatorError(f"op={op!r} must be a SymPy expression")
    key = (op, labels, method)
    form = _FORMS.get(key)
    if form is not None:
        return form
    table = _table(labels)
    scalars = []
    _collect_scalars(op, table, labels, scalars)
    consts = sorted({s for s in scalars if s != 0} | {-I / 2, I / 2, Rational(1, 2)}, key=default_sort_key)
    domain, _ = construct_domain(consts)
    n = len(labels)
    symbols = tuple(Dummy(f"j{i}") for i in range(n)) + tuple(Dummy(f"m{i}") for i in range(n))
    ring = PolyRing(symbols, domain)
    if method == "action":
        builder = (_GaussBuilder if domain == QQ_I else _Builder)(labels, table, symbols, domain)
        terms = builder.result(builder.apply(op, builder.start()))
    elif method == "ladder":
        terms = _ladder_route(op, labels, symbols, ring)
    else:
        raise ConventionError(f"method={method!r} must be 'action' or 'ladder'")
    form = ActionForm(labels, ring, domain, symbols, terms)
    if len(_FORMS) >= _FORMS_MAX:
        _FORMS.pop(next(iter(_FORMS)))
    _FORMS[key] = form
    return form


def _ladder_route(op, labels, symbols, ring):
    from ..algebra import ladder_terms

    n = len(labels)
    jsq = {lab: symbols[i] * (symbols[i] + 1) for i, lab in enumerate(labels)}
    mz = {lab: symbols[n + i] for i, lab in enumerate(labels)}
    terms = {}
    for key, value in ladder_terms(op, jsq, mz).items():
        shifts = dict(key)
        terms[tuple(shifts.get(lab, 0) for lab in labels)] = ring.from_expr(value)
    return terms


def clear_caches():
    """Empty the caches of action forms, generator tables and factorisations.

    >>> clear_caches()
    """
    _FORMS.clear()
    _table.cache_clear()
    _factor_cached.cache_clear()
