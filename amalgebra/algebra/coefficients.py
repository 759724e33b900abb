r"""The coefficient domain of canonical forms, and its one normal form.

Explanation
===========

**Domain.**  Coefficients of canonical forms are elements of the field of
rational functions

.. math::

    \mathbb{K}(x_1, \ldots, x_n), \qquad
    \mathbb{K} = \mathbb{Q}(i, p_1^{1/L_1}, p_2^{1/L_2}, \ldots),

in the user's symbols and *opaque atoms* :math:`x_k`, over the rationals
extended by :math:`i` and the real radicals :math:`p^{1/L}` of the primes
that occur (``sqrt(6)`` is ``sqrt(2)*sqrt(3)``), together with these
*transcendental generators*, each a Laurent variable (its inverse is a
monomial):

* :math:`E_t = e^{i t / L}` for every exponent term :math:`t` met in
  ``exp``, ``sin``, ``cos``, ``tan``, ``cot``, ``sec``, ``csc``
  (``sin(u) = (E - 1/E)/(2i)``, ``cos(u) = (E + 1/E)/2``, so
  ``sin(u)**2 + cos(u)**2 - 1`` is exactly 0);
* :math:`F_t = e^{t / L}` for real exponents (``exp(x)``, ``sinh``, ``cosh``,
  ``tanh``) and :math:`b^{t/L}` for powers with a symbolic exponent;
* :math:`s^{1/L}` for a symbol :math:`s` met with fractional powers
  (then :math:`s` itself is :math:`(s^{1/L})^L`).

An exponent ``exp(c1*t1 + c2*t2 + ...)`` with Gaussian-rational ``c`` splits
into generator powers; ``L`` is the least common denominator of the ``c``
seen for ``t`` (so ``exp(2*I*x)`` is :math:`E_x^2` and ``exp(I*x/2)`` is a
power of :math:`E_{x/2}`).  Multiples of :math:`i\pi` are evaluated by SymPy
(roots of unity such as ``exp(I*pi/4)`` become radicals).

**Opaque atoms** (the documented rule for everything else): any other
commutative atom or function application (``f(t)``, ``log(x)``, ``Abs(x)``,
``pi``, ``E``...) is an independent variable: no relation between such atoms
is used.  A fractional power of a composite expression ``b**(p/q)``
(``sqrt(j*(j + 1))``) is an opaque atom :math:`g = b^{1/q}` with the one
relation :math:`g^q = b` applied to numerators.  Floats are refused by the
symbolic domain: canonical forms are exact (:func:`~amalgebra.algebra.canonical`
keeps SymPy's float domain for float input).  Unsupported input raises
:class:`~amalgebra.errors.OperatorError`, never a raw SymPy error.

**Normal form.**  A coefficient :math:`v` is written once and only once as

.. math::

    v = c \cdot \frac{N}{D}

where :math:`D` is the least common denominator, a polynomial in the
symbols and atoms only (no :math:`i`, no square roots, no factor of a Laurent
generator), primitive with positive leading coefficient; :math:`N` is the
numerator with integer, mutually coprime coefficients on the basis
:math:`i^{0,1} \prod p^{k/L}` (:math:`k < L`), transcendental generators in
Fourier form, angle by angle (a pair :math:`E^{n}, E^{-n}` with equal other
factors becomes :math:`\cos(n t)`, :math:`\sin(n t)`; an unpaired power stays
:math:`e^{i n t}`), its leading
term positive, a monomial common to all its terms (symbols, or one phase
:math:`e^{i n t}`) written once in front; :math:`c` is rational.  "Leading" means: the highest monomial
in the symbols (lexicographic in SymPy's sort order of the atoms), and within
it the lowest constant basis element (1 before i).  The SymPy expression is
``Mul(c, N, 1/D)``; in an operator term ``Mul(c, N, 1/D, *operators)`` is not
distributed, so a coefficient shows as ``b*(1 - I)*J.plus/2``.  Denominators
with a radical of degree above 2 (cube roots, composite radicals) are not
rationalised: that is the one case where two equal values may print
differently.

Examples
========

>>> from sympy import I, cos, exp, sin, symbols
>>> from amalgebra.algebra.coefficients import normal_scalar
>>> th, b = symbols("theta b")
>>> normal_scalar(sin(th)**2 + cos(th)**2 - 1)
0
>>> normal_scalar(b*(1 + I)/2) == normal_scalar(b/2 + I*b/2)
True
>>> normal_scalar(exp(I*th)**2 + exp(-2*I*th))       # the pair E^2, E^-2 is 2 cos(2 theta)
2*cos(2*theta)
>>> normal_scalar(2*sin(th)*cos(th))
sin(2*theta)
"""

from functools import reduce
from math import gcd, lcm

from sympy import (Add, Dummy, E, Float, I, Integer, Mul, Pow, Rational, S, Symbol, cos, cosh, cot, csc,
                   default_sort_key, exp, expand, factorint, pi, sec, sin, sinh, tan, tanh)
from sympy.polys.domains import QQ, ZZ
from sympy.polys.domains.fractionfield import FractionField
from sympy.polys.domains.polynomialring import PolynomialRing
from sympy.polys.fields import FracField
from sympy.polys.polyerrors import CoercionFailed
from sympy.polys.rings import PolyRing

from ..errors import OperatorError

__all__ = ["ScalarDomain", "scalar_domain", "normal_scalar", "scalar_is_zero", "coefficient_factors",
           "scalar_terms", "gaussian_terms", "normal_or_expanded"]

_TRIG = (sin, cos, tan, cot, sec, csc)
_HYPERBOLIC = (sinh, cosh, tanh)


def _gaussian_coeff(term):
    """``(c, t)`` with ``term = c*t``, ``c`` a Gaussian rational (``t`` may be 1)."""
    c, rest = S.One, []
    for f in Mul.make_args(term):
        if f.is_Rational or f is I:
            c = c * f
        else:
            rest.append(f)
    return c, Mul(*rest)


class _Gen:
    """One ring generator (or a Laurent pair); ``rank`` orders generators across calls."""

    __slots__ = ("kind", "key", "L", "extra", "pos", "neg", "rank")

    def __init__(self, kind, key, extra=None):
        self.kind, self.key, self.L, self.extra = kind, key, 1, extra
        self.pos = self.neg = None
        order = {"atom": 0, "root": 0, "laurent": 1, "radical": 2, "prime": 3, "iota": 4}[kind]
        ident = key if kind != "laurent" else key[1]
        self.rank = (order, default_sort_key(ident), str(key[0]) if kind == "laurent" else "")


class ScalarDomain:
    """The coefficient domain of one computation (see the module docstring).

    Built from the SymPy scalars that will be converted; :attr:`domain` is the
    ``sympy.polys`` domain the kernel computes in (integers polynomials, or
    their fraction field when a denominator is not a monomial), with
    ``from_sympy``/``to_sympy`` going through this normal form.
    """

    def __init__(self, values):
        self.gens = {}        # identity -> _Gen
        self.field = False
        self._scan_memo = set()
        for value in values:
            self._scan(value)
        for kind, key in list(self.gens):   # a symbol with a root generator is that root's power
            if kind == "root":
                self.gens.pop(("atom", key), None)
        if any(g.kind == "laurent" and g.key[1].has(I) for g in self.gens.values()):
            self._gen("iota", S.ImaginaryUnit)   # the Fourier form (sin) needs i
        gens = sorted(self.gens.values(), key=lambda g: g.rank)
        symbols = []
        for g in gens:
            g.pos = len(symbols)
            symbols.append(Dummy(f"g{len(symbols)}"))
            if g.kind == "laurent":
                g.neg = len(symbols)
                symbols.append(Dummy(f"g{len(symbols)}"))
        self.order = gens
        if not symbols:
            symbols.append(Dummy("unit"))
        self.symbols = tuple(symbols)
        self.qring = PolyRing(self.symbols, QQ) if not self.field else FracField(self.symbols, QQ)
        self.zring = PolyRing(self.symbols, ZZ)
        self.domain = (_NormalField if self.field else _NormalRing)(self)
        self.laurent = [g for g in gens if g.kind == "laurent"]
        self._memo = {}
        for g in gens:
            if g.kind == "radical":   # g^q = b, b an integer polynomial of the other generators
                b = self._qvalue(g.key[0])
                if self.field:
                    if b.denom != 1:
                        raise OperatorError(f"coefficient={g.key[0]}**(1/{g.key[1]}) must have a "
                                            f"polynomial radicand")
                    b = b.numer
                cb, pb = b.clear_denoms()
                if cb != 1:
                    raise OperatorError(f"coefficient={g.key[0]}**(1/{g.key[1]}) must have a radicand "
                                        f"with integer coefficients")
                g.extra = pb.set_ring(self.zring)

    # ------------------------------------------------------------ scanning
    def _gen(self, kind, key, extra=None):
        g = self.gens.get((kind, key))
        if g is None:
            g = self.gens[(kind, key)] = _Gen(kind, key, extra)
        return g

    def _scan(self, node):
        if node in self._scan_memo:
            return
        self._scan_memo.add(node)
        if isinstance(node, Float) or node.is_Float:
            raise OperatorError(f"coefficient={node} must be exact: floats have no normal form here")
        if node.is_Rational:
            return
        if node is I:
            self._gen("iota", S.ImaginaryUnit)
            return
        if node.is_Add or node.is_Mul:
            for arg in node.args:
                self._scan(arg)
            return
        if node.is_Pow:
            base, e = node.args
            if e.is_Integer:
                if e < 0 and not base.is_Rational:
                    self.field = True
                self._scan(base)
                return
            if e.is_Rational:
                self._scan_radical(base, e)
                return
            self._scan_exponent(node.base, node.exp, "pow")
            return
        if isinstance(node, exp):
            self._scan_exponent(E, node.args[0], "exp")
            return
        if node is E:
            self._scan_exponent(E, S.One, "exp")
            return
        if isinstance(node, _TRIG + _HYPERBOLIC):
            if isinstance(node, (tan, cot, sec, csc, tanh)):
                self.field = True
            if isinstance(node, _TRIG):
                self._gen("iota", S.ImaginaryUnit)
            arg = node.args[0] * (I if isinstance(node, _TRIG) else 1)
            self._scan_exponent(E, arg, "exp")
            return
        if node.is_commutative is not True:
            raise OperatorError(f"coefficient={node} must be commutative")
        self._gen("atom", node)

    def _scan_radical(self, base, e):
        if base.is_Integer and base > 0:
            for p, k in factorint(int(base)).items():
                frac = Rational(k) * e
                g = self._gen("prime", Integer(p))
                g.L = lcm(g.L, int(frac.q))
                if frac < 0:
                    self.field = True
            return
        if base.is_Rational and base > 0:
            self._scan_radical(Integer(base.p), e)
            self._scan_radical(Integer(base.q), -e)
            return
        if base.is_Symbol:
            g = self._gen("root", base)
            g.L = lcm(g.L, int(e.q))
            if e < 0:
                self.field = True
            return
        self._scan(base)
        self._gen("radical", (base, int(e.q)))
        if e < 0:
            self.field = True

    def _scan_exponent(self, base, arg, how):
        for term in Add.make_args(expand(arg)):
            c, t = _gaussian_coeff(term)
            if t is S.One and how == "pow":
                self._scan(base**c)
                continue
            if t.has(pi) and how == "exp":
                value = _root_of_unity(c * t)
                if value is not None:
                    self._scan(value)
                    continue
            if how == "pow" and not c.is_Rational:
                raise OperatorError(f"coefficient {base}**({arg}) must have a real rational multiple "
                                    f"of each exponent term (complex powers are not supported)")
            parts = [(c, t)] if how == "pow" else []
            if how == "exp":
                re, im = c.as_real_imag()
                if re:
                    parts.append((re, t))
                if im:
                    parts.append((im, I * t))
            for r, tt in parts:
                if not r.is_Rational:   # e.g. a complex exponent of a power: keep it whole
                    raise OperatorError(f"coefficient exponent={arg} must have Gaussian-rational "
                                        f"multiples of its terms")
                g = self._gen("laurent", (base, tt))
                g.L = lcm(g.L, int(r.q))

    # ------------------------------------------------------------ conversion
    def _qvalue(self, node):
        """``node`` as an element of the QQ ring/field over the generators."""
        hit = self._memo.get(node)
        if hit is not None:
            return hit
        R = self.qring
        if node.is_Rational:
            value = R(node)
        elif node is I:
            value = R.gens[self.gens[("iota", S.ImaginaryUnit)].pos]
        elif node.is_Add:
            value = R.zero
            for arg in node.args:
                value += self._qvalue(arg)
        elif node.is_Mul:
            value = R.one
            for arg in node.args:
                value *= self._qvalue(arg)
        elif node.is_Pow and node.exp.is_Integer:
            base = self._qvalue(node.base)
            n = int(node.exp)
            value = base**n if n >= 0 else (1 / base) ** (-n)
        elif node.is_Pow and node.exp.is_Rational:
            value = self._radical_value(node.base, node.exp)
        elif node.is_Pow:
            value = self._exponent_value(node.base, node.exp, "pow")
        elif isinstance(node, exp):
            value = self._exponent_value(E, node.args[0], "exp")
        elif node is E:
            value = self._exponent_value(E, S.One, "exp")
        elif isinstance(node, _TRIG):
            value = self._trig_value(node)
        elif isinstance(node, _HYPERBOLIC):
            value = self._trig_value(node)
        else:
            root = self.gens.get(("root", node))
            value = R.gens[root.pos] ** root.L if root is not None else R.gens[self.gens[("atom", node)].pos]
        self._memo[node] = value
        return value

    def _gen_power(self, g, k):
        R = self.qring
        if g.kind == "laurent":
            return R.gens[g.pos] ** k if k >= 0 else R.gens[g.neg] ** (-k)
        if k >= 0:
            return R.gens[g.pos] ** k
        return 1 / R.gens[g.pos] ** (-k)

    def _radical_value(self, base, e):
        R = self.qring
        if base.is_Integer and base > 0:
            value = R.one
            for p, k in factorint(int(base)).items():
                frac = Rational(k) * e
                whole = frac.p // frac.q
                rest = frac - whole
                g = self.gens[("prime", Integer(p))]
                value *= (R(Integer(p) ** whole) if whole >= 0 else 1 / R(Integer(p) ** (-whole)))
                if rest:
                    value *= self._gen_power(g, int(rest * g.L))
            return value
        if base.is_Rational and base > 0:
            return self._radical_value(Integer(base.p), e) * self._radical_value(Integer(base.q), -e)
        if base.is_Symbol:
            g = self.gens[("root", base)]
            return self._gen_power(g, int(e * g.L))
        q = int(e.q)
        g = self.gens[("radical", (base, q))]
        return self._gen_power(g, int(e.p))

    def _exponent_value(self, base, arg, how):
        R = self.qring
        value = R.one
        for term in Add.make_args(expand(arg)):
            c, t = _gaussian_coeff(term)
            if t is S.One and how == "pow":
                value *= self._qvalue(base**c)
                continue
            if t.has(pi) and how == "exp":
                root = _root_of_unity(c * t)
                if root is not None:
                    value *= self._qvalue(root)
                    continue
            re, im = c.as_real_imag()
            parts = [(re, t)] if how == "pow" else [(re, t), (im, I * t)]
            for r, tt in parts:
                if r:
                    g = self.gens[("laurent", (base, tt))]
                    value *= self._gen_power(g, int(r * g.L))
        return value

    def _trig_value(self, node):
        u = node.args[0]
        half = self.qring(Rational(1, 2))
        if isinstance(node, _TRIG):
            e = self._exponent_value(E, I * u, "exp")
            inv = self._exponent_value(E, -I * u, "exp")
            s = (inv - e) * self._qvalue(I) * half     # (e - 1/e)/(2i)
        else:
            e = self._exponent_value(E, u, "exp")
            inv = self._exponent_value(E, -u, "exp")
            s = (e - inv) * half
        c = (e + inv) * half
        if isinstance(node, (sin, sinh)):
            return s
        if isinstance(node, (cos, cosh)):
            return c
        if isinstance(node, (tan, tanh)):
            return s / c
        if isinstance(node, cot):
            return c / s
        if isinstance(node, sec):
            return 1 / c
        return 1 / s

    def convert(self, value):
        """``(numerator, den)``: ``value`` as a kernel domain element over a positive int."""
        q = self._qvalue(value)
        if self.field:
            num, den = q.numer, q.denom
            cn, pn = num.clear_denoms()
            cd, pd = den.clear_denoms()
            zn = pn.set_ring(self.zring) * int(cd)
            zd = pd.set_ring(self.zring) * int(cn)
            return self.domain.field.new(zn, zd), 1
        c, p = q.clear_denoms()
        return p.set_ring(self.zring), int(c)

    def decides_nonzero(self):
        """True when a nonzero normal form proves the value nonzero: no opaque atom other than
        symbols, no composite radical, no exponential of a pi multiple or of a number."""
        for g in self.order:
            if g.kind == "atom" and not g.key.is_Symbol:
                return False
            if g.kind == "radical":
                return False
            if g.kind == "laurent" and (g.key[1].has(pi) or not g.key[1].free_symbols):
                return False
        return True

    def generator_names(self):
        """Readable names of the ring generators, in ring order (``exp(I*x)``, its inverse, ``I``...)."""
        names = []
        for g in self.order:
            if g.kind == "laurent":
                names.append(str(self._gen_expr(g, 1)))
                names.append(str(self._gen_expr(g, -1)))
            elif g.kind == "iota":
                names.append("I")
            elif g.kind == "prime":
                names.append(str(Pow(g.key, Rational(1, g.L), evaluate=False)))
            else:
                names.append(str(self._gen_expr(g, 1)))
        return names or ["1"]

    # ------------------------------------------------------------ normal form
    def reduce(self, poly):
        """The unique representative of an integer polynomial (relations applied)."""
        if not poly:
            return poly
        ring = self.zring
        radicals = [g for g in self.order if g.kind == "radical"]
        if radicals:
            poly = self._reduce_radicals(poly, radicals)
        simple = [g for g in self.order if g.kind in ("iota", "prime", "laurent")]
        if not simple:
            return poly
        out = {}
        for mon, c in poly.items():
            mon = list(mon)
            for g in simple:
                if g.kind == "laurent":
                    d = mon[g.pos] - mon[g.neg]
                    mon[g.pos], mon[g.neg] = max(d, 0), max(-d, 0)
                elif g.kind == "iota":
                    e = mon[g.pos]
                    if e >= 2:
                        if (e // 2) % 2:
                            c = -c
                        mon[g.pos] = e % 2
                else:
                    e = mon[g.pos]
                    if e >= g.L:
                        c = c * int(g.key) ** (e // g.L)
                        mon[g.pos] = e % g.L
            key = tuple(mon)
            out[key] = out.get(key, 0) + c
        return ring.from_dict({m: c for m, c in out.items() if c})

    def _reduce_radicals(self, poly, radicals):
        ring = self.zring
        for _ in range(64):
            changed = False
            for g in radicals:
                q = g.key[1]
                if any(mon[g.pos] >= q for mon in poly.itermonoms()):
                    changed = True
                    pb = g.extra
                    new = ring.zero
                    for mon, c in poly.items():
                        e = mon[g.pos]
                        mon2 = mon[:g.pos] + (e % q,) + mon[g.pos + 1:]
                        new += ring.from_dict({mon2: c}) * pb ** (e // q)
                    poly = new
            if not changed:
                return poly
        return poly  # pragma: no cover - relations always lower the degree

    def is_zero(self, element):
        if self.field or hasattr(element, "numer"):
            return not self.reduce(element.numer)
        return not self.reduce(element)

    # ------------------------------------------------------------ output
    def parts(self, element, den=1):
        """``(c, N, D)``: the normal form ``c*N/D`` (module docstring) as SymPy objects.

        ``c`` is a Rational (0 for a zero value), ``N`` an expression (1 when the
        value is a rational number), ``D`` an expression free of i (1 for
        polynomials).
        """
        shift = None
        if self.field or hasattr(element, "numer"):   # the fraction field (also a ring's get_field())
            num, dpoly, shift = self._fraction(element)
        else:
            num, dpoly = self.reduce(element), None
        if not num:
            return S.Zero, S.One, S.One
        terms = self._fourier(num, shift=shift)
        content = reduce(gcd, (abs(c) for _, const in terms for c in const.values()))
        dcontent = 1
        dexpr = S.One
        if dpoly is not None:
            dcontent = reduce(gcd, (abs(int(c)) for c in dpoly.coeffs()))
            lead = dpoly.LC
            if lead < 0:
                dcontent = -dcontent
            dexpr = self._poly_expr(dpoly, dcontent)
        lead_const = terms[0][1]
        sign = 1 if lead_const[min(lead_const)] > 0 else -1
        c = Rational(sign * content, den * dcontent)
        common = None
        if len(terms) > 1:   # a monomial common to every term is written once, outside
            rests = [key[0] for key, _ in terms]
            low = tuple(min(col) for col in zip(*rests))
            trig = []
            for k in range(len(terms[0][0][1])):
                column = {key[1][k] for key, _ in terms}
                only = next(iter(column))
                trig.append(only if len(column) == 1 and only[1] == 0 else (0, 0))
            trig = tuple(trig)
            if any(low) or any(n for n, _ in trig):
                common = self._term_expr((low, trig), {(): 1}, 1) if not self._const_gens() else \
                    self._term_expr((low, trig), {(0,) * len(self._const_gens()): 1}, 1)
                terms = [((tuple(e - l for e, l in zip(key[0], low)),
                           tuple((n - t[0], kind) if t[0] else (n, kind) for (n, kind), t in zip(key[1], trig))),
                          const) for key, const in terms]
        nexpr = Add(*[self._term_expr(key, const, sign * content) for key, const in terms])
        if common is not None:
            nexpr = Mul(common, nexpr)
        return c, nexpr, dexpr

    def _const_gens(self):
        return [g for g in self.order if g.kind in ("iota", "prime")]

    def to_sympy(self, element, den=1):
        """The SymPy expression of ``element/den`` in normal form."""
        c, n, d = self.parts(element, den)
        if not c:
            return S.Zero
        return c * n / d

    def _fraction(self, element):
        """Reduced numerator and denominator (the denominator free of i, radicals, Laurent units)."""
        ring = self.zring
        num, den = self.reduce(element.numer), self.reduce(element.denom)
        # clear the inverse Laurent generators: multiply both by a monomial
        shift = [0] * ring.ngens
        for g in self.laurent:
            shift[g.pos] = max([m[g.neg] for m in num.itermonoms()] + [m[g.neg] for m in den.itermonoms()] + [0])
        if any(shift):
            mono = ring.from_dict({tuple(shift): 1})
            num, den = self.reduce(num * mono), self.reduce(den * mono)
        for g in self.order:   # rationalise i and square roots in the denominator
            if g.kind in ("iota", "prime") and (g.kind == "iota" or g.L == 2):
                if any(m[g.pos] for m in den.itermonoms()):
                    conj = ring.from_dict({m: (-c if m[g.pos] % 2 else c) for m, c in den.items()})
                    num, den = self.reduce(num * conj), self.reduce(den * conj)
        const = [g.pos for g in self.order if g.kind in ("iota", "prime")]
        if const:
            pieces = {}
            for m, c in num.items():
                key = tuple(m[p] for p in const)
                rest = list(m)
                for p in const:
                    rest[p] = 0
                pieces.setdefault(key, {})[tuple(rest)] = c
            g = den
            for piece in pieces.values():
                g = g.gcd(ring.from_dict(piece))
        else:
            g = den.gcd(num)
        if g != 1 and g != -1:
            num, den = num.exquo(g), den.exquo(g)
        # strip Laurent monomial factors of the denominator into signed numerator exponents
        den_shift = {}
        for gg in self.laurent:
            k = min(m[gg.pos] for m in den.itermonoms())
            if k:
                den_shift[gg.pos] = k
        if den_shift:
            den = ring.from_dict({tuple(e - den_shift.get(i, 0) for i, e in enumerate(m)): c
                                  for m, c in den.items()})
        if den == ring.one or den == -ring.one:
            den = None if den == ring.one else den
        return num, den, den_shift

    def _split(self, mon, shift=None):
        """(rest key, E vector, const key) of a monomial: signed exponents in generator order."""
        rest, evec, const = [], [], []
        for g in self.order:
            if g.kind == "laurent":
                e = mon[g.pos] - mon[g.neg] - (shift.get(g.pos, 0) if shift else 0)
                (evec if g.key[1].has(I) else rest).append(e)
            elif g.kind in ("iota", "prime"):
                const.append(mon[g.pos])
            else:
                rest.append(mon[g.pos])
        return tuple(rest), tuple(evec), tuple(const)

    def _fourier(self, num, shift=None):
        r"""Terms ``((rest, trig), {const: int})`` in output order (leading term first).

        ``trig`` holds one ``(n, kind)`` per angle generator: ``kind`` 0 for
        :math:`e^{i n t}`, 1 for :math:`\sin(n t)`, 2 for :math:`\cos(n t)` (``n > 0``
        for the last two).  Angle by angle, a pair :math:`E^{n}, E^{-n}` with equal
        remaining parts becomes :math:`\cos, \sin` (a deterministic function of the value).
        """
        terms = {}
        for mon, c in num.items():
            rest, evec, const = self._split(mon, shift)
            key = (rest, tuple((e, 0) for e in evec))
            bucket = terms.setdefault(key, {})
            bucket[const] = bucket.get(const, 0) + int(c)
        iota = [i for i, g in enumerate(g for g in self.order if g.kind in ("iota", "prime")) if g.kind == "iota"]
        nangles = sum(1 for g in self.order if g.kind == "laurent" and g.key[1].has(I))
        for k in range(nangles):
            new = {}
            for (rest, trig), const in terms.items():
                n, kind = trig[k]
                if kind or not n:
                    new[(rest, trig)] = const
                    continue
                partner = (rest, trig[:k] + ((-n, 0),) + trig[k + 1:])
                if partner not in terms:
                    new[(rest, trig)] = const
                    continue
                if n < 0:
                    continue
                other = terms[partner]
                cos_part = _const_add(const, other, 1)
                sin_part = _times_i(_const_add(const, other, -1), iota)
                if cos_part:
                    new[(rest, trig[:k] + ((n, 2),) + trig[k + 1:])] = cos_part
                if sin_part:
                    new[(rest, trig[:k] + ((n, 1),) + trig[k + 1:])] = sin_part
            terms = new
        order = sorted(terms, reverse=True)
        return [(k, {m: v for m, v in sorted(terms[k].items())}) for k in order]

    def _term_expr(self, key, const, divisor):
        rest, trig = key
        factors = [self._const_expr(const, divisor)]
        angles = [g for g in self.order if g.kind == "laurent" and g.key[1].has(I)]
        others = [g for g in self.order if g.kind not in ("iota", "prime") and not
                  (g.kind == "laurent" and g.key[1].has(I))]
        for g, e in zip(others, rest):
            if e:
                factors.append(self._gen_expr(g, e))
        phase = []
        for g, (n, kind) in zip(angles, trig):
            if not n:
                continue
            arg = Rational(n, g.L) * (g.key[1] / I)
            if kind == 0:
                phase.append(arg)
            else:
                factors.append((sin if kind == 1 else cos)(arg))
        if phase:
            factors.append(exp(I * Add(*phase)))
        return Mul(*factors)

    def _const_expr(self, const, divisor):
        consts = [g for g in self.order if g.kind in ("iota", "prime")]
        out = []
        for key, c in const.items():
            if not c:
                continue
            value = Rational(c, divisor)
            for g, e in zip(consts, key):
                if e:
                    value = value * (I if g.kind == "iota" else Pow(g.key, Rational(e, g.L)))
            out.append(value)
        return Add(*out)

    def _gen_expr(self, g, e):
        if g.kind == "atom":
            return g.key ** e
        if g.kind == "root":
            return g.key ** Rational(e, g.L)
        if g.kind == "radical":
            base, q = g.key
            return Pow(base, Rational(e, q))
        base, t = g.key
        if base is E:
            return exp(Rational(e, g.L) * t)
        return Pow(base, Rational(e, g.L) * t)

    def _poly_expr(self, poly, divisor):
        terms = []
        for mon, c in poly.items():
            rest, evec, const = self._split(mon)
            key = (rest, tuple((e, 0) for e in evec))
            terms.append((key, {const: int(c)}))
        return Add(*[self._term_expr(k, const, divisor) for k, const in terms])


def _const_add(a, b, sign):
    out = dict(a)
    for k, v in b.items():
        out[k] = out.get(k, 0) + sign * v
    return {k: v for k, v in out.items() if v}


def _times_i(const, iota):
    """Multiply a constant (dict over i^e * radicals) by i."""
    if not iota:  # pragma: no cover - sin terms only arise with i present
        raise OperatorError("internal: Fourier form without i")
    t = iota[0]
    out = {}
    for k, v in const.items():
        e = k[t]
        k2 = k[:t] + ((e + 1) % 2,) + k[t + 1:]
        out[k2] = out.get(k2, 0) + (-v if e == 1 else v)
    return {k: v for k, v in out.items() if v}


def _root_of_unity(arg):
    """``exp(arg)`` evaluated when ``arg`` is a rational multiple of i*pi, else None."""
    ratio = arg / (I * pi)
    if not ratio.is_Rational:
        return None
    value = expand(cos(pi * ratio) + I * sin(pi * ratio))
    if value.has(cos, sin):
        raise OperatorError(f"coefficient exp({arg}) must be a root of unity of degree SymPy can "
                            f"write in radicals")
    return value


class _NormalRing(PolynomialRing):
    """``ZZ[generators]`` whose SymPy conversions go through :class:`ScalarDomain`."""

    def __init__(self, scalars):
        super().__init__(scalars.zring)
        self.scalars = scalars

    def from_sympy(self, expr):
        num, den = self.scalars.convert(expr)
        if den != 1:
            raise CoercionFailed(f"{expr} is not integral")
        return num

    def to_sympy(self, element):
        return self.scalars.to_sympy(element)

    def from__NormalRing(self, element, base):
        if base is self:
            return element
        return self.from_sympy(base.to_sympy(element))

    def __eq__(self, other):
        return self is other

    def __hash__(self):
        return id(self)

    def get_field(self):
        field = getattr(self, "_field", None)
        if field is None:
            field = self._field = _NormalField(self.scalars)
        return field

    def __str__(self):
        return f"ZZ[{', '.join(self.scalars.generator_names())}]"

    __repr__ = __str__


class _NormalField(FractionField):
    """``ZZ(generators)`` whose SymPy conversions go through :class:`ScalarDomain`."""

    def __init__(self, scalars):
        super().__init__(FracField(scalars.symbols, ZZ))
        self.scalars = scalars

    def from_sympy(self, expr):
        num, den = self.scalars.convert(expr)
        if not hasattr(num, "numer"):   # a ring element over an integer denominator
            num = self.field.field_new(num)
        return num / den if den != 1 else num

    def to_sympy(self, element):
        return self.scalars.to_sympy(element)

    def from__NormalField(self, element, base):
        if base is self:
            return element
        return self.from_sympy(base.to_sympy(element))

    def from__NormalRing(self, element, base):
        if base.scalars is self.scalars:
            return self.field.field_new(element)
        return self.from_sympy(base.to_sympy(element))

    def __str__(self):
        return f"ZZ({', '.join(self.scalars.generator_names())})"

    __repr__ = __str__

    def __eq__(self, other):
        return self is other

    def __hash__(self):
        return id(self)


def scalar_domain(values):
    """A :class:`ScalarDomain` for the given SymPy scalars (typed error when unsupported)."""
    try:
        return ScalarDomain(values)
    except OperatorError:
        raise
    except (CoercionFailed, ValueError, TypeError, ZeroDivisionError) as exc:
        raise OperatorError(f"coefficients={list(values)} must be in the supported coefficient domain "
                            f"(see amalgebra.algebra.coefficients): {exc}") from exc


def _check_scalar(value):
    from sympy import sympify
    value = sympify(value, strict=True)  # safe: strict conversion of numbers only, strings raise
    if not value.is_commutative:
        raise OperatorError(f"value={value} must be a commutative scalar")
    return value


def normal_scalar(value):
    """The normal form (module docstring) of one commutative SymPy scalar.

    Examples
    ========

    >>> from sympy import sqrt, symbols
    >>> from amalgebra.algebra.coefficients import normal_scalar
    >>> a = symbols("a")
    >>> normal_scalar(sqrt(6)/sqrt(3) - sqrt(2))
    0
    >>> normal_scalar((a**2 - 1)/(a - 1))
    a + 1
    """
    value = _check_scalar(value)
    domain = scalar_domain([value])
    num, den = _convert_checked(domain, value)
    return domain.to_sympy(num, den)


def coefficient_factors(value):
    """``(c, N, D)`` of the normal form ``c*N/D`` of one scalar (module docstring)."""
    value = _check_scalar(value)
    domain = scalar_domain([value])
    num, den = _convert_checked(domain, value)
    return domain.parts(num, den)


def scalar_is_zero(value):
    """True when the scalar is 0 in the coefficient domain (decided exactly).

    Examples
    ========

    >>> from sympy import cos, sin, symbols
    >>> from amalgebra.algebra.coefficients import scalar_is_zero
    >>> t = symbols("t")
    >>> scalar_is_zero(cos(2*t) - cos(t)**2 + sin(t)**2), scalar_is_zero(t)
    (True, False)
    """
    value = _check_scalar(value)
    domain = scalar_domain([value])
    num, _ = _convert_checked(domain, value)
    return domain.is_zero(num)


def _convert_checked(domain, value):
    try:
        return domain.convert(value)
    except OperatorError:
        raise
    except (CoercionFailed, ValueError, TypeError, ZeroDivisionError, KeyError) as exc:
        raise OperatorError(f"coefficient={value} must be in the supported coefficient domain "
                            f"(see amalgebra.algebra.coefficients): {exc}") from exc


def gaussian_terms(x, y, den, factors, term):
    """Output terms of ``(x + i y)/den * factors`` for ints ``x, y`` (the normal form).

    One term ``c*(x' + y' i)*factors`` when both parts are nonzero and there are
    operator factors (``c`` rational, ``x' > 0``, ``gcd(x', y') = 1``), else the
    SymPy-evaluated parts.  ``term(coeff, factors)`` builds one product.
    """
    if not y:
        return [term(Rational(x, den), factors)]
    if not x:
        return [term(Mul(Rational(y, den), I), factors)]
    if not factors:
        return [Rational(x, den), Mul(Rational(y, den), I)]
    g = gcd(x, y) * (1 if x > 0 else -1)
    return [Mul(Rational(g, den), Add(Integer(x // g), Mul(Integer(y // g), I)), *factors)]


def scalar_terms(value, factors):
    """Output terms of a commutative SymPy ``value`` times the operator ``factors``
    (a tuple), in the normal form of the module docstring (one term when
    ``factors`` is nonempty; none for a zero value)."""
    parts = _gaussian_parts(value)
    if parts is not None:
        x, y = parts
        den = lcm(int(x.q), int(y.q))
        if not x and not y:
            return []
        return gaussian_terms(int(x * den), int(y * den), den, factors, lambda c, f: Mul(c, *f))
    c, n, d = coefficient_factors(value)
    if not c:
        return []
    if not factors:
        return list(Add.make_args(c * n / d))
    return [Mul(c, n, 1 / d, *factors)]


def _gaussian_parts(value):
    """``(re, im)`` Rationals of a sum of Rationals and Rational*I, else None (no simplification)."""
    re, im = S.Zero, S.Zero
    for arg in Add.make_args(value):
        if arg.is_Rational:
            re += arg
        elif arg is I:
            im += 1
        elif arg.is_Mul and len(arg.args) == 2 and arg.args[0].is_Rational and arg.args[1] is I:
            im += arg.args[0]
        else:
            return None
    return re, im


def normal_or_expanded(value):
    """``(normal_scalar(value), True)`` when ``value`` is in the coefficient domain, else
    ``(expand(value), False)`` (floats): the flag says whether 0 was decided exactly."""
    try:
        return normal_scalar(value), True
    except OperatorError:
        return expand(value), False
