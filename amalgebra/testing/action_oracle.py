r"""Cross-check oracle: the action of an angular-momentum polynomial on a generic ket, word by word.

Explanation
===========

Test-only.  :func:`walk_action` applies an operator expression factor by
factor from the right to a generic product ket :math:`\prod_L |j_L m_L\rangle`
and returns the polynomials :math:`c_d(j, m)` of

.. math::

    O \prod_L |j_L m_L\rangle = \sum_d c_d(j, m) \prod_L N_{d_L}(j_L, m_L) |j_L, m_L + d_L\rangle

(:math:`N_d` the Condon-Shortley ladder factor): :math:`J_\pm` move :math:`d`
by one and multiply by :math:`(j-x)(j+x+1)` when the step goes back over an
edge already counted in :math:`N_d`; :math:`J_z` multiplies by :math:`m+d`,
:math:`J^2` by :math:`j(j+1)`.  It never calls the m-shift kernel, so the
library's one route (:func:`amalgebra.states.actionform.action_form`, read
off the canonical form) is tested against it.  It used to be a second public
engine; it lives here as an oracle only.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.testing.action_oracle import walk_action
>>> J = AngularMomentum("J")
>>> j, m = symbols("j m")
>>> walk_action(J.plus * J.minus, ("J",), (j,), (m,))   # (j+m)(j-m+1)
{(0,): j**2 + j - m**2 + m}
"""

from functools import lru_cache
from math import gcd

from sympy import QQ_I, ZZ, Add, Dummy, I, Mul, Pow, Rational, default_sort_key
from sympy.polys.constructor import construct_domain
from sympy.polys.rings import PolyRing

from ..errors import OperatorError

__all__ = ["walk_action", "generator_table"]

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


def walk_action(op, labels, js, ms):
    """``{shift: c_shift}`` of ``op`` on the generic ket, with ``c`` in the symbols ``js``, ``ms`` (one per label)."""
    labels = tuple(labels)
    table = _table(labels)
    scalars = []
    _collect_scalars(op, table, labels, scalars)
    consts = sorted({s for s in scalars if s != 0} | {-I / 2, I / 2, Rational(1, 2)}, key=default_sort_key)
    domain, _ = construct_domain(consts)
    symbols = tuple(Dummy(f"j{i}") for i in range(len(labels))) + tuple(Dummy(f"m{i}") for i in range(len(labels)))
    builder = (_GaussBuilder if domain == QQ_I else _Builder)(labels, table, symbols, domain)
    terms = builder.result(builder.apply(op, builder.start()))
    mapping = dict(zip(symbols, tuple(js) + tuple(ms)))
    return {k: v.as_expr().xreplace(mapping).expand() for k, v in sorted(terms.items()) if v}
