r"""The m-shift kernel: a fast exact representation of operator polynomials.

Explanation
===========

For labels :math:`\ell_1 < \ell_2 < \cdots` (sorted), every polynomial in the
generators has a unique form

.. math::

    \sum_{(d_1, d_2, \ldots)} R_{\ell_1}^{(d_1)} R_{\ell_2}^{(d_2)} \cdots \;
    p_{d}(v_{\ell_1}, v_{\ell_2}, \ldots)

with commuting polynomials :math:`p_d` written to the *right* of the ladder
powers; for an angular momentum :math:`R^{(d)} = J_+^d` (``d > 0``) or
:math:`J_-^{|d|}` (``d < 0``) and :math:`v = (J^2, J_z)`.  An element is held
as a ``dict`` from shift tuples to nonzero ``PolyElement`` s of one
``sympy.polys`` ring whose generators are the mode variables (internal
``Dummy`` symbols, never seen by users) over an exact coefficient domain.

Multiplication uses only two rules, one per label
(see :mod:`amalgebra.algebra.modes`, which also documents the *mode protocol*
through which new generator sets plug in):

* moving a polynomial right past a ladder power shifts its argument,
  :math:`f(v)\, R^{(e)} = R^{(e)} f(v + e)`;
* opposite ladder powers meet and reduce, e.g.
  :math:`J_+^a J_-^b = J_+^{a-b} \, (J_+^b J_-^b)` for ``a >= b`` and
  :math:`J_+^a J_-^b = J_-^{b-a} \, (J_+^a J_-^a)(J_z - (b - a))` for ``a < b``.

Mode protocol (full text in :mod:`amalgebra.algebra.modes`): each label is
served by a mode object giving its commuting ``variables``, the
``shift_index`` of the variable that ladders move, the reduction polynomials
``raise_lower(k, v)`` (:math:`R^{(k)} R^{(-k)}`) and ``lower_raise(k, v)``,
the kernel image ``atom(component, v, domain)`` of each generator, and the
SymPy factors used on output.  New generator sets (two-mode bosons with
``f(N) a^dagger = a^dagger f(N+1)``) are added with
:func:`~amalgebra.algebra.modes.register_mode`, without touching this module.

So :math:`R^{(d)} p \cdot R^{(e)} q = R^{(d+e)} F_{d,e}\, p(v + e)\, q`,
with the reduction polynomial :math:`F_{d,e}` cached per label.  The cost is a
polynomial shift of the *left* factor's coefficient and one polynomial
product, so building powers by left multiplication with a small factor keeps
the cost proportional to the number of output terms.

Examples
========

>>> from sympy import QQ
>>> from amalgebra.algebra.modes import ANGULAR_MOMENTUM
>>> from amalgebra.algebra.shiftform import ShiftAlgebra
>>> A = ShiftAlgebra([("J", ANGULAR_MOMENTUM)], QQ)
>>> Jp, Jm = A.atom("J", "plus"), A.atom("J", "minus")
>>> A.to_expr(A.sub(A.mul(Jp, Jm), A.mul(Jm, Jp)))     # [J+, J-] = 2 Jz
2*J.z
"""

from functools import lru_cache
from math import comb, lcm

from sympy import Add, Basic, Dummy, I, Mul, Rational, S
from sympy.core.basic import ordering_of_classes
from sympy.polys.domains import ZZ
from sympy.polys.rings import PolyRing

from .coefficients import gaussian_terms

__all__ = ["ShiftAlgebra", "Element", "clear_caches", "compare_key"]


@lru_cache(maxsize=None)
def _dummy(label, variable):
    # One Dummy per (label, variable) for the whole session: rings are then reusable.
    return Dummy(f"{label}_{variable}")


_IOTA = Dummy("iota")  # the imaginary unit as a polynomial generator (Gaussian algebras)


@lru_cache(maxsize=256)
def _ring(symbols, domain):
    return PolyRing(symbols, domain)


def clear_caches():
    """Forget the cached polynomial rings (for cold benchmarks); results are unaffected."""
    _ring.cache_clear()


class ShiftAlgebra:
    """The kernel algebra for a fixed set of labels and one coefficient domain.

    Parameters
    ==========

    labels_modes : iterable of ``(label, mode)``
        Labels are sorted; the shift tuples follow that order.
    domain : a ``sympy.polys`` domain
        Exact coefficient domain (``ZZ``, ``QQ``, ``QQ_I``, a fraction field,
        an algebraic field or ``EX``).
    """

    def __init__(self, labels_modes, domain):
        pairs = sorted(dict(labels_modes).items())
        self.labels = tuple(label for label, _ in pairs)
        self.modes = tuple(mode for _, mode in pairs)
        self.domain = domain
        symbols = []
        self.var_index = []  # per label: tuple of ring generator indices
        for label, mode in pairs:
            start = len(symbols)
            symbols.extend(_dummy(label, name) for name in mode.variables)
            self.var_index.append(tuple(range(start, len(symbols))))
        # Gaussian coefficients: compute over ZZ with one extra generator iota (iota^2 = -1,
        # reduced after every product); ZZ ints are ~14x faster per operation than ZZ_I.
        self.gaussian = bool(domain.is_GaussianRing)
        self.ground = ZZ if self.gaussian else domain
        self.iota = None
        if self.gaussian:
            self.iota = len(symbols)
            self._gring = _ring(tuple(symbols), domain)
            symbols.append(_IOTA)
        self.ring = _ring(tuple(symbols), self.ground)
        self.shift_var = tuple(idx[mode.shift_index] for idx, mode in zip(self.var_index, self.modes))
        self.position = {label: i for i, label in enumerate(self.labels)}
        self.identity_shift = (0,) * len(self.labels)
        self.scalars = getattr(domain, "scalars", None)   # the normal-form coefficient domain, if any
        self._factor_cache = {}
        self._binomial_cache = {}
        self._dom = {}
        self._expr_cache = {}

    # ----------------------------------------------------------------- basics
    def zero(self):
        return Element()

    def one(self):
        return Element({self.identity_shift: self.ring.one})

    def lift(self, num, mon=None):
        """The polynomial ``num * monomial`` for a coefficient-domain element ``num``."""
        if mon is None:
            mon = self.ring.zero_monom
        if not self.gaussian:
            return self.ring.dtype({mon: num} if num else {})
        t = self.iota
        out = {}
        if num.x:
            out[mon] = num.x
        if num.y:
            out[mon[:t] + (1,) + mon[t + 1:]] = num.y
        return self.ring.dtype(out)

    def terms(self, poly):
        """``(monomial, coefficient)`` pairs with coefficients in :attr:`domain`.

        For Gaussian algebras the iota parts are merged (the iota slot of the
        returned monomials is 0); otherwise this is ``poly.items()``.
        """
        if not self.gaussian:
            scalars = self.scalars
            if scalars is None:
                return list(poly.items())
            if scalars.field:
                return [(m, c) for m, c in poly.items() if not scalars.is_zero(c)]
            reduce = scalars.reduce
            return [(m, r) for m, r in ((m, reduce(c)) for m, c in poly.items()) if r]
        t = self.iota
        acc = {}
        for mon, c in poly.items():
            base = mon[:t] + (0,) + mon[t + 1:] if mon[t] else mon
            pair = acc.get(base)
            if pair is None:
                pair = acc[base] = [0, 0]
            pair[1 if mon[t] else 0] += c
        new = self.domain.new
        return [(m, new(x, y)) for m, (x, y) in acc.items() if x or y]

    def _reduce(self, poly):
        """Apply iota^2 = -1 (only needed after a product)."""
        t = self.iota
        if t is None or all(mon[t] < 2 for mon in poly):
            return poly
        out = {}
        for mon, c in poly.items():
            e = mon[t]
            if e >= 2:
                if (e // 2) % 2:
                    c = -c
                mon = mon[:t] + (e % 2,) + mon[t + 1:]
            prev = out.get(mon)
            out[mon] = c if prev is None else prev + c
        return self.ring.dtype({m: c for m, c in out.items() if c})

    def _from_gaussian(self, poly):
        """Move a polynomial of the ZZ_I ring (mode variables only) into the iota ring."""
        out = {}
        for mon, c in poly.items():
            if c.x:
                out[mon + (0,)] = c.x
            if c.y:
                out[mon + (1,)] = c.y
        return self.ring.dtype(out)

    def scalar(self, num, den=1):
        """The element ``num/den * 1`` (``num`` a domain element, ``den`` a positive int)."""
        if not num:
            return Element()
        return Element({self.identity_shift: self.lift(num)}, den)

    def label_vars(self, label):
        ring = self._gring if self.gaussian else self.ring
        return tuple(ring.gens[i] for i in self.var_index[self.position[label]])

    def atom(self, label, component):
        """Kernel image of the generator ``component`` of ``label``."""
        i = self.position[label]
        mode = self.modes[i]
        pairs, den = mode.atom(component, self.label_vars(label), self.domain)
        out = Element({}, den)
        for d, poly in pairs:
            shift = self.identity_shift[:i] + (d,) + self.identity_shift[i + 1:]
            out[shift] = self._from_gaussian(poly) if self.gaussian else poly
        return out

    # ------------------------------------------------------------- arithmetic
    def add(self, *elements):
        if len(elements) == 1:
            return elements[0]
        den = 1
        for element in elements:
            if element:
                den = lcm(den, element.den)
        acc = {}
        for element in elements:
            factor = den // element.den
            scale = self._domain_int(factor) if factor != 1 else None
            for key, poly in element.items():
                bucket = acc.get(key)
                if bucket is None:
                    bucket = acc[key] = {}
                get = bucket.get
                for mon, coeff in poly.items():
                    if scale is not None:
                        coeff = coeff * scale
                    prev = get(mon)
                    bucket[mon] = coeff if prev is None else prev + coeff
        return self._finish(acc, den)

    def _finish(self, acc, den):
        dtype = self.ring.dtype
        out = Element({}, den)
        for key, bucket in acc.items():
            poly = dtype({m: x for m, x in bucket.items() if x})
            if poly:
                out[key] = poly
        if not out:
            out.den = 1
        return out

    def neg(self, a):
        return Element({k: -p for k, p in a.items()}, a.den)

    def sub(self, a, b):
        return self.add(a, self.neg(b))

    def scale(self, a, num, den=1):
        """Multiply by ``num/den`` (a domain element over a positive int)."""
        if not num or not a:
            return Element()
        if self.gaussian:
            factor = self.lift(num)
            return Element({k: self._reduce(p * factor) for k, p in a.items()}, a.den * den)
        return Element({k: p.mul_ground(num) for k, p in a.items()}, a.den * den)

    def equal(self, a, b):
        """Operator equality of two elements (denominators may differ), decided in the normal form."""
        return self.is_zero(self.sub(a, b))

    def is_zero(self, a):
        """True when ``a`` is 0 once coefficient relations (``i^2 = -1``, ...) are applied."""
        return not any(self.terms(poly) for poly in a.values())

    def _domain_int(self, n):
        value = self._dom.get(n)
        if value is None:
            value = self._dom[n] = self.ground.convert(n)
        return value

    def _shift_row(self, k, c):
        """Domain elements ``C(k, i) c**(k-i)`` for i = 0..k (cached)."""
        key = (k, c)
        row = self._binomial_cache.get(key)
        if row is None:
            row = self._binomial_cache[key] = [self._domain_int(comb(k, i) * c ** (k - i))
                                               for i in range(k + 1)]
        return row

    def shift(self, poly, shift):
        """``poly(v + shift)``: move every label's shift variable by its shift."""
        for i, c in enumerate(shift):
            if c:
                poly = self._shift_one(poly, self.shift_var[i], c)
        return poly

    def _shift_one(self, poly, v, c):
        out = {}
        get = out.get
        for mon, coeff in poly.items():
            k = mon[v]
            if not k:
                prev = get(mon)
                out[mon] = coeff if prev is None else prev + coeff
                continue
            row = self._shift_row(k, c)
            head, tail = mon[:v], mon[v + 1:]
            for i in range(k + 1):
                new = head + (i,) + tail
                term = coeff * row[i]
                prev = get(new)
                out[new] = term if prev is None else prev + term
        return self.ring.dtype({m: x for m, x in out.items() if x})

    def _factor(self, i, d, e):
        """``(new_shift, F)`` with ``R^(d) R^(e) = R^(new) F`` for label ``i``."""
        key = (i, d, e)
        hit = self._factor_cache.get(key)
        if hit is not None:
            return hit
        mode = self.modes[i]
        v = tuple(self.ring.gens[g] for g in self.var_index[i])
        s = mode.shift_index
        if d == 0 or e == 0 or (d > 0) == (e > 0):
            hit = (d + e, None)
        elif d > 0:  # R^d L^b
            b = -e
            if d >= b:
                hit = (d - b, mode.raise_lower(b, v))
            else:
                hit = (d - b, self._shift_one(mode.raise_lower(d, v), self.var_index[i][s], d - b))
        else:  # L^a R^e
            a = -d
            if a >= e:
                hit = (e - a, mode.lower_raise(e, v))
            else:
                hit = (e - a, self._shift_one(mode.lower_raise(a, v), self.var_index[i][s], e - a))
        self._factor_cache[key] = hit
        return hit

    def _combine(self, sa, sb):
        new = []
        factor = None
        for i, (d, e) in enumerate(zip(sa, sb)):
            if d and e and (d > 0) != (e > 0):
                n, f = self._factor(i, d, e)
                factor = f if factor is None else factor * f
                new.append(n)
            else:
                new.append(d + e)
        return tuple(new), factor

    def mul(self, a, b):
        """The product ``a*b`` (``a`` acts after ``b``); cheapest when ``a`` is small."""
        acc = {}
        for sb, pb in b.items():
            for sa, pa in a.items():
                key, factor = self._combine(sa, sb)
                left = self.shift(pa, sb) if any(sb) else pa
                if factor is not None:
                    left = left * factor
                term = left * pb
                if self.iota is not None:
                    term = self._reduce(term)
                bucket = acc.get(key)
                if bucket is None:
                    acc[key] = dict(term)
                else:
                    get = bucket.get
                    for mon, coeff in term.items():
                        prev = get(mon)
                        bucket[mon] = coeff if prev is None else prev + coeff
        return self._finish(acc, a.den * b.den)

    def power(self, a, n):
        """``a**n`` by repeated left multiplication (cost follows output size)."""
        if n == 0:
            return self.one()
        result = a
        for _ in range(n - 1):
            result = self.mul(a, result)
        return result

    # ---------------------------------------------------------- to SymPy
    def sorted_items(self, element):
        """Deterministic order: by shift tuple, then by descending monomial."""
        for key in sorted(element):
            for mon, coeff in sorted(self.terms(element[key]), key=lambda item: item[0], reverse=True):
                yield key, mon, coeff

    def term_factors(self, key, mon):
        """The noncommutative factors of one output term, in output convention."""
        cache = self._expr_cache
        factors = []
        for i, d in enumerate(key):
            if d:
                hit = cache.get((i, "shift", d))
                if hit is None:
                    hit = cache[(i, "shift", d)] = self.modes[i].ladder_factor(self.labels[i], d)
                factors.append(hit)
        for i, label in enumerate(self.labels):
            for j, g in enumerate(self.var_index[i]):
                e = mon[g]
                if e:
                    hit = cache.get((i, j, e))
                    if hit is None:
                        hit = cache[(i, j, e)] = self.modes[i].variable_factor(label, j, e)
                    factors.append(hit)
        return tuple(factors)

    def coefficient(self, element, coeff):
        """A kernel coefficient of ``element`` as a SymPy expression (denominator applied), in the
        normal form of :mod:`amalgebra.algebra.coefficients`."""
        if self.scalars is not None:
            return self.scalars.to_sympy(coeff, element.den)
        if self.gaussian:
            x, y = int(coeff.x), int(coeff.y)
            return Rational(x, element.den) + Rational(y, element.den) * I
        value = self.domain.to_sympy(coeff)
        return value if element.den == 1 else value / element.den

    def to_expr(self, element):
        """Convert to a SymPy expression with one ``Add(*terms)``: one term per operator
        monomial, the coefficient in the normal form of :mod:`amalgebra.algebra.coefficients`."""
        den = element.den
        terms = []
        domain = self.domain
        scalars = self.scalars
        for key, mon, coeff in self.sorted_items(element):
            factors = self.term_factors(key, mon)
            if domain.is_ZZ:
                terms.append(_term(Rational(int(coeff), den), factors))
            elif self.gaussian:
                terms.extend(gaussian_terms(int(coeff.x), int(coeff.y), den, factors, _term))
            elif scalars is not None:
                c, n, d = scalars.parts(coeff, den)
                if not factors:
                    terms.extend(Add.make_args(c * n / d))
                else:
                    terms.append(Mul(c, n, 1 / d, *factors))
            else:   # float input: SymPy's own domain, expanded into monomials
                value = domain.to_sympy(coeff)
                for part in (value.args if value.is_Add else (value,)):
                    terms.append(Mul(part if den == 1 else part / den, *factors))
        return _sum(terms)


class Element(dict):
    """A kernel element: ``{shift tuple: numerator polynomial}`` over ``den``.

    Denominators are cleared so that the common cases compute over ``ZZ``
    or ``ZZ_I`` (Python ints), which is 8-13 times faster per operation than
    ``QQ``/``QQ_I`` with SymPy's pure-Python rationals (measured).
    """

    __slots__ = ("den",)

    def __init__(self, terms=(), den=1):
        dict.__init__(self, terms)
        self.den = den


def _term(coeff, factors):
    """``Mul(coeff, *factors)`` without re-flattening.

    The factors are distinct noncommutative powers in final order and ``coeff``
    is a commutative monomial, so ``Mul.flatten`` would return exactly the
    commutative args of ``coeff`` followed by ``factors`` (a test pins this).
    """
    if not factors:
        return coeff
    if coeff is S.One:
        args = factors
    elif coeff.is_Mul:
        args = coeff.args + factors
    else:
        args = (coeff,) + factors
    if len(args) == 1:
        return args[0]
    return Mul._from_args(args, is_commutative=False)


def _sum(terms):
    """``Add(*terms)`` for distinct terms, with Add's own canonical arg order.

    ``Add.flatten`` would find nothing to collect (every term has a distinct
    monomial), put a bare number first and sort the rest with ``Basic.compare``;
    here the same order comes from a tuple key equal to ``Basic.compare``
    (:func:`compare_key`, computed once per distinct sub-expression), without
    ``Add.flatten``'s assumption queries.  Tests check ``_sum(t) == Add(*t)``
    argument for argument.
    """
    numbers = [t for t in terms if t.is_Number]
    rest = [t for t in terms if not t.is_Number]
    if len(numbers) > 1:
        return Add(*terms)
    if len(rest) > 1:
        cache = {}
        rest.sort(key=lambda t: compare_key(t, cache))
    args = numbers + rest
    if not args:
        return S.Zero
    if len(args) == 1:
        return args[0]
    return Add._from_args(args, is_commutative=all(t.is_commutative for t in args))


_CLASS_KEYS = {}


def _class_key(cls):
    hit = _CLASS_KEYS.get(cls)
    if hit is None:
        name = cls.__name__
        if name in ordering_of_classes:
            hit = (ordering_of_classes.index(name), "")
        else:
            hit = (len(ordering_of_classes) + 1, name)
        _CLASS_KEYS[cls] = hit
    return hit


def compare_key(obj, cache):
    """A tuple key ordering SymPy objects as ``Basic.compare`` does (``cache``: id -> key).

    Same rule, unrolled: class position in ``ordering_of_classes`` (then name),
    length of ``_hashable_content()``, then the contents in order.
    """
    hit = cache.get(id(obj))
    if hit is not None:
        return hit[0]
    content = obj._hashable_content()
    items = []
    for x in content:
        if isinstance(x, Basic):
            items.append(compare_key(x, cache))
        elif isinstance(x, frozenset):
            items.append(compare_key(Basic(*x), cache))
        else:
            items.append(x)
    key = (_class_key(type(obj)), len(content), tuple(items))
    cache[id(obj)] = (key, obj)   # keep obj alive so its id stays unique during the sort
    return key
