r"""The coupling network of a Racah sum: 3j vertices joined by summed projections.

Explanation
===========

A sum over projections of a product of 3j symbols is a graph (Yutsis, Levinson
and Vanagas 1962): each 3j symbol is a vertex with three lines; a projection
:math:`m` summed over :math:`-j..j` that occurs in two 3j symbols is a line
joining them; a projection that is not summed is an open (external) line.
:class:`Network` keeps that graph together with everything else in the summand:

``verts``
    the 3j symbols, each a list of three slots ``(j, form)``: the momentum
    (a SymPy expression) and the projection as a linear form
    (:mod:`amalgebra.racah.linear`), e.g. ``{m1: -1}`` for :math:`-m_1`;
``mvars``
    the summed projections and the momentum of their line;
``xvars``
    summed intermediate momenta (``"input"``: the user's sums over
    :math:`x` with :math:`(2x+1)` weights, to be removed; ``"new"``: those
    introduced by an interchange, kept in the result);
``phase``
    the exponent of :math:`(-1)` as a linear form;
``dims``
    powers :math:`(2j+1)^p` (``p`` a Fraction);
``six``, ``nine``, ``jdeltas``, ``mdeltas``, ``triads``, ``other``
    6j and 9j symbols, Kronecker deltas of momenta and of projections,
    triangle conditions, and any other factor (constants included).

:meth:`Network.to_expr` turns the network back into an ordinary SymPy
expression (a ``Sum`` over the remaining projections, innermost, and
momenta), so every intermediate stage of a reduction is a SymPy object equal
to the input.

Clebsch-Gordan coefficients enter as 3j symbols by the fixed convention of
the library (DEVELOPERS.md):
:math:`\langle j_1 m_1 j_2 m_2|J M\rangle = (-1)^{j_1-j_2+M}\sqrt{2J+1}
\begin{pmatrix} j_1 & j_2 & J\\ m_1 & m_2 & -M\end{pmatrix}`.

Examples
========

>>> from sympy import Sum, symbols
>>> from amalgebra.coupling import Coupling3j
>>> from amalgebra.racah.network import network_from_expr
>>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
>>> s = Sum(Coupling3j(a, b, c, m1, m2, m3)**2, (m1, -a, a), (m2, -b, b), (m3, -c, c))
>>> net = network_from_expr(s)
>>> len(net.verts), sorted(map(str, net.mvars))
(2, ['m1', 'm2', 'm3'])
>>> net.to_expr() == s
True
"""

from fractions import Fraction

from sympy import (Abs, Add, KroneckerDelta, Mul, Pow, Rational, S, Sum, Symbol,
                   default_sort_key, expand_power_base)

from ..coupling import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from ..errors import RacahSumError
from .linear import (ONE, NotLinearError, add_forms, form_expr, form_symbols, linear_form,
                     negate_form)
from .triangle import TriangleDelta

__all__ = ["Network", "network_from_expr", "phase_expr"]


def _fr(value):
    return Fraction(int(value.p), int(value.q))


def phase_expr(form, half_atoms=()):
    r"""SymPy :math:`(-1)^E` of the exponent form ``E``.

    The constant is reduced modulo 2; the coefficient of a symbol listed in
    ``half_atoms`` (momenta and projections: twice them is an integer, so
    :math:`(-1)^{4j} = 1`) is reduced into :math:`(-2, 2]`.
    """
    reduced = {}
    for k, v in form.items():
        if k is ONE:
            v = v % 2
        elif k in half_atoms:
            v = v % 4
            if v > 2:
                v -= 4
        if v:
            reduced[k] = v
    if not reduced:
        return S.One
    return Pow(S.NegativeOne, form_expr(reduced))


class Network:
    """A Racah sum as a graph of 3j vertices plus the factors beside them (see module doc)."""

    __slots__ = ("verts", "mvars", "xvars", "phase", "dims", "six", "nine", "jdeltas",
                 "mdeltas", "triads", "other", "half_atoms", "ext_lines")

    def __init__(self):
        self.verts = []
        self.mvars = {}
        self.xvars = {}
        self.phase = {}
        self.dims = {}
        self.six = []
        self.nine = []
        self.jdeltas = []
        self.mdeltas = []
        self.triads = []
        self.other = []
        self.half_atoms = set()
        self.ext_lines = {}

    def copy(self):
        new = Network()
        new.verts = [list(v) for v in self.verts]
        new.mvars = dict(self.mvars)
        new.xvars = dict(self.xvars)
        new.phase = dict(self.phase)
        new.dims = dict(self.dims)
        new.six = list(self.six)
        new.nine = list(self.nine)
        new.jdeltas = list(self.jdeltas)
        new.mdeltas = list(self.mdeltas)
        new.triads = list(self.triads)
        new.other = list(self.other)
        new.half_atoms = set(self.half_atoms)
        new.ext_lines = dict(self.ext_lines)
        return new

    # -- queries -------------------------------------------------------------------------
    def occurrences(self, var):
        """``[(vertex, slot, sign)]`` of a summed projection ``var``."""
        out = []
        for vi, vert in enumerate(self.verts):
            for si, (_, form) in enumerate(vert):
                c = form.get(var)
                if c:
                    out.append((vi, si, int(c)))
        return out

    def add_dim(self, label, power):
        p = self.dims.get(label, 0) + Fraction(power)
        if p:
            self.dims[label] = p
        else:
            self.dims.pop(label, None)

    def add_phase(self, form):
        self.phase = add_forms(self.phase, form)

    def fresh(self, stem, taken=None):
        """A new Symbol named ``stem<k>`` not used anywhere in the network."""
        names = {str(s) for s in self.all_symbols()} | (taken or set())
        k = 1
        while f"{stem}{k}" in names:
            k += 1
        return Symbol(f"{stem}{k}")

    def all_symbols(self):
        syms = set(self.mvars) | set(self.xvars)
        for vert in self.verts:
            for label, form in vert:
                syms |= label.free_symbols
                syms |= set(form_symbols(form))
        for t in self.six + self.nine:
            for a in t:
                syms |= a.free_symbols
        syms |= set(form_symbols(self.phase))
        for e in self.other:
            syms |= e.free_symbols
        return syms

    # -- output --------------------------------------------------------------------------
    def factors(self):
        """The summand as a list of SymPy factors (deterministic order)."""
        out = [Coupling3j(*(s[0] for s in v), *(form_expr(s[1]) for s in v)) for v in self.verts]
        out.append(phase_expr(self.phase, self.half_atoms))
        for label in sorted(self.dims, key=default_sort_key):
            p = self.dims[label]
            out.append(Pow(2 * label + 1, Rational(p.numerator, p.denominator)))
        out += [Coupling6j(*t) for t in self.six]
        out += [Coupling9j(*t) for t in self.nine]
        out += [KroneckerDelta(a, b) for a, b in self.jdeltas]
        out += [_projection_delta(f, g) for f, g in self.mdeltas]
        out += [TriangleDelta(*t) for t in self.triads]
        out += self.other
        return out

    def limits(self):
        lims = [(m, -label, label) for m, label in self.mvars.items()]
        for x, (lo, hi, _) in self.xvars.items():
            lims.append((x, lo, hi))
        return lims

    def to_expr(self, pending=((), ())):
        """The network as a SymPy expression (``Sum`` over what is still summed).

        ``pending``: ``(projection deltas, momentum deltas)`` not yet summed, as factors.
        """
        mdel, jdel = pending
        term = Mul(*self.factors(), *[_projection_delta(f, g) for f, g in mdel],
                   *[KroneckerDelta(x, y) for x, y in jdel])
        lims = self.limits()
        if not lims or term == 0:
            return term
        return Sum(term, *lims)


def _projection_delta(f, g):
    """``KroneckerDelta`` of two projection forms, signs chosen so the first term is positive."""
    diff = add_forms(f, negate_form(g))
    keys = sorted((k for k in diff if k is not ONE), key=default_sort_key)
    if keys and all(v < 0 for k, v in f.items() if k is not ONE) and all(
            v < 0 for k, v in g.items() if k is not ONE):
        f, g = negate_form(f), negate_form(g)
    return KroneckerDelta(form_expr(f), form_expr(g))


# ---------------------------------------------------------------------------------------
# Reading a SymPy expression
# ---------------------------------------------------------------------------------------

def _peel(expr):
    """``(summand, limits)`` of nested ``Sum`` objects (innermost limits first)."""
    limits = []
    while isinstance(expr, Sum):
        limits = limits + list(expr.limits)
        expr = expr.function
    if isinstance(expr, Mul):
        inner = [f for f in expr.args if isinstance(f, Sum)]
        if len(inner) == 1:
            rest = [f for f in expr.args if f is not inner[0]]
            summand, more = _peel(inner[0])
            return Mul(*rest, summand), more + limits
    return expr, limits


def _dimension_label(base):
    """``j`` when ``base`` is ``2*j + 1`` (linear), else ``None``."""
    try:
        form = linear_form(base)
    except NotLinearError:
        return None
    if form.get(ONE) != 1:
        return None
    rest = {k: v / 2 for k, v in form.items() if k is not ONE}
    if not rest:
        return None
    return form_expr(rest)


def _slot_form(value, what):
    try:
        return linear_form(value)
    except NotLinearError:
        raise RacahSumError(f"{what}={value} must be linear in the projections") from None


def network_from_expr(expr, summed_m=(), summed_j=()):
    r"""Read a product (or ``Sum`` of a product) of coupling symbols into a :class:`Network`.

    ``expr`` may be a ``sympy.Sum`` (nested or with several limits) of a
    product of :class:`~amalgebra.coupling.Coupling3j`,
    :class:`~amalgebra.coupling.CouplingBracket`,
    :class:`~amalgebra.coupling.Coupling6j`, :class:`~amalgebra.coupling.Coupling9j`,
    ``KroneckerDelta``, phases ``(-1)**(linear)``, powers of ``(2j+1)`` and
    constants.  ``summed_m`` and ``summed_j`` add variables summed over their
    full ranges (projections over :math:`-j..j`, momenta over every value the
    triangle rules allow) without writing the ``Sum``.

    A summed projection must run over :math:`-j..j` of its line; a summed
    momentum from :math:`|a-b|` to :math:`a+b` (or ``oo``) of one of its
    triads; other limits raise :class:`~amalgebra.errors.RacahSumError`, since a
    partial range has no closed form.
    """
    summand, limits = _peel(expr)
    net = Network()
    given = [(v, None, None) for v in summed_m] + [(v, None, None) for v in summed_j]
    all_limits = list(limits) + given
    bound = [lim[0] for lim in all_limits]
    if len(set(bound)) != len(bound):
        raise RacahSumError(f"limits={all_limits} must name each summed variable once")
    m_slots = {}
    j_atoms = set()
    for factor in Mul.make_args(summand):
        _read_factor(net, factor, set(bound))
    for vert in net.verts:
        for label, form in vert:
            j_atoms |= label.free_symbols
            for s in form_symbols(form):
                m_slots.setdefault(s, label)
    for t in net.six + net.nine:
        for a in t:
            j_atoms |= a.free_symbols
    for var, lo, hi in all_limits:
        if var in m_slots and var not in j_atoms:
            label = m_slots[var]
            if lo is not None and (lo - (-label)).expand() != 0 or hi is not None and (hi - label).expand() != 0:
                raise RacahSumError(f"limits of {var}=({lo}, {hi}) must be (-{label}, {label}), "
                                    "the full range of its line")
            net.mvars[var] = label
        elif var in j_atoms:
            if lo is None:
                net.xvars[var] = (None, None, "input")
            else:
                net.xvars[var] = (lo, hi, "input")
        else:
            raise RacahSumError(f"summed variable {var} must occur in a coupling symbol")
    _name_dependent_projections(net)
    _sort_deltas(net, m_slots)
    for sym, label in m_slots.items():
        if sym not in net.mvars and sym not in j_atoms:
            net.ext_lines[sym] = label
    _check_momentum_limits(net)
    net.half_atoms = _half_atoms(net)
    return net


def _name_dependent_projections(net):
    """A slot whose projection is a combination ``L`` of summed projections fixed by its
    3j symbol (``L`` = minus the other two slots) gets a new summed projection ``mu``:
    the symbol vanishes unless ``mu = L``, so summing ``mu`` over its line changes nothing;
    other slots holding ``+-L`` get ``+-mu`` (equal wherever the symbol is nonzero)."""
    from .linear import is_single

    for vi in range(len(net.verts)):
        for k in range(3):
            label, form = net.verts[vi][k]
            if is_single(form) or not any(v in net.mvars for v in form):
                continue
            others = add_forms(net.verts[vi][(k + 1) % 3][1], net.verts[vi][(k + 2) % 3][1])
            if add_forms(form, others):
                continue
            mu = net.fresh("mu")
            net.mvars[mu] = label
            neg = negate_form(form)
            for vk, vert in enumerate(net.verts):
                for kk, (lab, f) in enumerate(vert):
                    if f == form:
                        vert[kk] = (lab, {mu: Fraction(1)})
                    elif f == neg:
                        vert[kk] = (lab, {mu: Fraction(-1)})


def _half_atoms(net):
    atoms = set(net.mvars) | set(net.xvars)
    for vert in net.verts:
        for label, form in vert:
            if isinstance(label, Symbol):
                atoms.add(label)
            for s in form_symbols(form):
                if abs(form[s]) == 1 and len(form) == 1:
                    atoms.add(s)
    for t in net.six + net.nine:
        atoms |= {a for a in t if isinstance(a, Symbol)}
    return atoms


def _triads_with(net, x):
    """Triads (as pairs of the two other momenta) that contain the momentum ``x``."""
    out = []
    for vert in net.verts:
        labels = [s[0] for s in vert]
        if x in labels:
            rest = list(labels)
            rest.remove(x)
            out.append(tuple(rest))
    for t in net.six:
        for tri in ((0, 1, 2), (0, 4, 5), (3, 1, 5), (3, 4, 2)):
            labels = [t[i] for i in tri]
            if x in labels:
                rest = list(labels)
                rest.remove(x)
                out.append(tuple(rest))
    for t in net.nine:
        for tri in ((0, 1, 2), (3, 4, 5), (6, 7, 8), (0, 3, 6), (1, 4, 7), (2, 5, 8)):
            labels = [t[i] for i in tri]
            if x in labels:
                rest = list(labels)
                rest.remove(x)
                out.append(tuple(rest))
    return out


def momentum_limits(net, x):
    """``(lo, hi)`` of the full range of ``x``: ``|a-b|..a+b`` of its first triad."""
    triads = _triads_with(net, x)
    if not triads:
        raise RacahSumError(f"summed momentum {x} must occur in a triad of a coupling symbol")
    a, b = triads[0]
    return Abs(a - b), a + b


def _check_momentum_limits(net):
    for x, (lo, hi, kind) in list(net.xvars.items()):
        triads = _triads_with(net, x)
        if not triads:
            raise RacahSumError(f"summed momentum {x} must occur in a triad of a coupling symbol")
        if lo is None:
            net.xvars[x] = (*momentum_limits(net, x), kind)
            continue
        lows = [Abs(a - b) for a, b in triads]
        highs = [a + b for a, b in triads]
        if lo not in lows or not (hi in highs or hi is S.Infinity):
            raise RacahSumError(f"limits of {x}=({lo}, {hi}) must be (|a-b|, a+b) of a triad "
                                f"(a b {x}) of the summand, the full range")


def _read_factor(net, factor, bound):
    if isinstance(factor, Coupling3j):
        j1, j2, j3, m1, m2, m3 = factor.args
        net.verts.append([(j1, _slot_form(m1, "m1")), (j2, _slot_form(m2, "m2")),
                          (j3, _slot_form(m3, "m3"))])
        return
    if isinstance(factor, CouplingBracket):
        # <j1 m1 j2 m2|J M> = (-1)^(j1-j2+M) sqrt(2J+1) (j1 j2 J; m1 m2 -M)  (DEVELOPERS.md)
        j1, m1, j2, m2, J, M = factor.args
        net.verts.append([(j1, _slot_form(m1, "m1")), (j2, _slot_form(m2, "m2")),
                          (J, negate_form(_slot_form(M, "M")))])
        net.add_phase(add_forms(linear_form(j1), negate_form(linear_form(j2)), _slot_form(M, "M")))
        net.add_dim(J, Fraction(1, 2))
        return
    if isinstance(factor, Coupling6j):
        net.six.append(tuple(factor.args))
        return
    if isinstance(factor, Coupling9j):
        net.nine.append(tuple(factor.args))
        return
    if isinstance(factor, Pow):
        base, exp = factor.args
        if exp.is_Integer and exp > 0 and isinstance(base, (Coupling3j, CouplingBracket, Coupling6j,
                                                             Coupling9j)):
            for _ in range(int(exp)):
                _read_factor(net, base, bound)
            return
        if base == -1:
            try:
                net.add_phase(linear_form(exp))
                return
            except NotLinearError:
                pass
        elif isinstance(base, Pow) and base.args[0] == -1:
            _read_factor(net, Pow(S.NegativeOne, base.args[1] * exp, evaluate=False), bound)
            return
        elif exp.is_Rational:
            parts = Mul.make_args(expand_power_base(base, force=True)) if isinstance(base, Mul) else (base,)
            if len(parts) > 1:
                for part in parts:
                    _read_factor(net, Pow(part, exp), bound)
                return
            label = _dimension_label(base)
            if label is not None:
                net.add_dim(label, _fr(exp))
                return
    if isinstance(factor, Add):
        label = _dimension_label(factor)
        if label is not None:
            net.add_dim(label, 1)
            return
    if isinstance(factor, KroneckerDelta):
        net.jdeltas.append(tuple(factor.args))   # sorted into projections later
        return
    if isinstance(factor, TriangleDelta):
        net.triads.append(tuple(factor.args))
        return
    if factor == -1:
        net.add_phase({ONE: Fraction(1)})
        return
    net.other.append(factor)


def _sort_deltas(net, m_slots):
    """Deltas whose arguments hold a projection go to ``mdeltas``, the rest stay momenta."""
    keep = []
    for a, b in net.jdeltas:
        syms = a.free_symbols | b.free_symbols
        if syms & (set(m_slots) | set(net.mvars)):
            net.mdeltas.append((_slot_form(a, "delta argument"), _slot_form(b, "delta argument")))
        else:
            keep.append((a, b))
    net.jdeltas = keep
