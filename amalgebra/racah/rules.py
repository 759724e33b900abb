r"""The graphical rules, each one exact rewrite of a :class:`~amalgebra.racah.network.Network`.

Explanation
===========

Rules on the projections (Yutsis, Levinson and Vanagas 1962; the order of
Fack, Pitre and Van der Jeugt 1994: smallest cycle first):

``delta``
    :math:`\sum_m \delta_{m,m'} f(m) = f(m')` and :math:`\delta_{j j'} f(j') = \delta_{j j'} f(j)`;
``zero line``
    :math:`(a\ b\ 0; \alpha\ \beta\ \gamma) = \delta_{\gamma 0}\delta_{ab}\delta_{\alpha,-\beta}
    (-1)^{a-\alpha}/\sqrt{2a+1}` (DLMF 34.3.1);
``free line``
    :math:`\sum_{m=-j}^{j} (-1)^{cm}` is :math:`(2j+1)(-1)^{cj}` for even :math:`c` and
    :math:`(-1)^{-cj}(1+(-1)^{2j})/2` for odd :math:`c`;
``loop``, ``bubble``, ``triangle``, ``ninej``
    the identities of :mod:`amalgebra.racah.matching` (a 3j joined to itself; two 3j
    joined by two lines: orthogonality; a cycle of three: a 6j; the graph
    :math:`K_{3,3}`: a 9j);
``interchange``
    a cycle of four or more lines is shortened by one: completeness inserted on two
    lines of the cycle, :math:`\delta_{\alpha\alpha'}\delta_{\gamma\gamma'} =
    \sum_{x\xi}(2x+1)(a\ c\ x;\alpha\ \gamma\ \xi)(a\ c\ x;\alpha'\ \gamma'\ \xi)`, then the
    triangle rule -- a sum over a new momentum :math:`x` of a 6j times a graph with
    one vertex fewer.

Rules removing a summed intermediate momentum :math:`x` (read backwards, the
same identities):

``absorb``
    a 6j symbol containing :math:`x` times a vertex whose momenta are one of its
    triads becomes three vertices (the triangle rule from right to left);
``expand``
    a 6j with no such vertex first gets one: :math:`\sum_{\nu}(a\ b\ c;\nu_1\nu_2\nu_3)^2 =
    \Delta(abc)`, already implied by the 6j; a 9j is replaced by its six 3j symbols;
``completeness``
    :math:`\sum_{x\xi}(2x+1)(a\ b\ x;\alpha\ \beta\ \xi)(a\ b\ x;\alpha'\ \beta'\ \xi)
    = \delta_{\alpha\alpha'}\delta_{\beta\beta'}` removes :math:`x`.

Every function returns a short description of what it did (for the derivation
steps) or ``None`` when it does not apply; the network is changed only when it
applies.
"""

from fractions import Fraction
from itertools import permutations

from sympy import Abs, Pow, S, Symbol, default_sort_key

from .linear import (ONE, add_forms, is_single, linear_form, negate_form, scale_form,
                     substitute_form)
from .matching import (BUBBLE, COMPLETENESS, LOOP, NINEJ, TRIANGLE, match, permutation_is_odd,
                       vertex_momentum_form)

__all__ = ["RuleContext", "resolve_deltas", "zero_lines", "free_lines", "loop_rule", "bubble_rule",
           "triangle_rule", "ninej_rule", "interchange_rule", "eliminate_momentum",
           "SIXJ_TRIADS", "sixj_forms"]

SIXJ_TRIADS = ((0, 1, 2), (0, 4, 5), (3, 1, 5), (3, 4, 2))
NINEJ_TRIADS = ((0, 1, 2), (3, 4, 5), (6, 7, 8), (0, 3, 6), (1, 4, 7), (2, 5, 8))


class RuleContext:
    """Pending deltas and the zero flag shared by the rules of one reduction."""

    def __init__(self):
        self.mdeltas = []     # (form, form) still to resolve
        self.jdeltas = []     # (expr, expr) still to resolve
        self.zero = False


# ---------------------------------------------------------------------------------------
# deltas and substitutions
# ---------------------------------------------------------------------------------------

def substitute_label(net, symbol, value):
    """Replace the momentum ``symbol`` by ``value`` everywhere in ``net`` (under a delta)."""
    rep = {symbol: value}
    vform = linear_form(value)
    net.verts = [[(label.xreplace(rep), form) for label, form in vert] for vert in net.verts]
    net.mvars = {m: label.xreplace(rep) for m, label in net.mvars.items()}
    net.xvars = {x: (lo.xreplace(rep), hi.xreplace(rep), kind) for x, (lo, hi, kind) in net.xvars.items()}
    net.six = [tuple(a.xreplace(rep) for a in t) for t in net.six]
    net.nine = [tuple(a.xreplace(rep) for a in t) for t in net.nine]
    dims = {}
    for label, p in net.dims.items():
        new = label.xreplace(rep)
        dims[new] = dims.get(new, 0) + p
    net.dims = {k: v for k, v in dims.items() if v}
    net.triads = [tuple(a.xreplace(rep) for a in t) for t in net.triads]
    net.other = [e.xreplace(rep) for e in net.other]
    net.phase = substitute_form(net.phase, symbol, vform)
    if isinstance(value, Symbol) and symbol in net.half_atoms:
        net.half_atoms.add(value)


def _resolve_jdelta(net, ctx, a, b):
    if a == b or (a - b).expand() == 0:
        return True
    if a.is_number and b.is_number:
        ctx.zero = True
        return True
    for x, other in ((a, b), (b, a)):
        if x in net.xvars:
            net.xvars.pop(x)
            substitute_label(net, x, other)
            return True
    syms = [s for s in (a, b) if isinstance(s, Symbol)]
    if syms:
        target = sorted(syms, key=default_sort_key)[-1]
        value = b if target == a else a
        net.jdeltas.append((a, b))
        substitute_label(net, target, value)
        return True
    net.jdeltas.append((a, b))
    return True


def _resolve_mdelta(net, ctx, f, g):
    diff = add_forms(f, negate_form(g))
    if not diff:
        return
    if all(k is ONE for k in diff):
        ctx.zero = True
        return
    summed = [k for k in diff if k is not ONE and k in net.mvars]
    for var in sorted(summed, key=default_sort_key):
        coeff = diff[var]
        rest = {k: v for k, v in diff.items() if k != var}
        if abs(coeff) == 1:
            value = scale_form(rest, -1 / coeff)
            single = is_single(value)
            label = net.mvars[var]
            if single and single[0] in net.mvars and net.mvars[single[0]] == label:
                _substitute_projection(net, var, value)
                return
            if not value:
                _fix_zero(net, var)
                return
            if net.occurrences(var) and _line_label_ok(net, var, label):
                _substitute_projection(net, var, value)
                return
        elif abs(coeff) == 2 and not rest:
            _fix_zero(net, var)
            return
    net.mdeltas.append((f, g))


def _line_label_ok(net, var, label):
    return all(net.verts[vi][si][0] == label for vi, si, _ in net.occurrences(var))


def _fix_zero(net, var):
    """``var := 0`` in its sum: allowed only for an integer momentum, hence the factor."""
    label = net.mvars.pop(var)
    _replace_everywhere(net, var, {})
    if label.is_number:
        if (2 * label) % 2:
            net.other.append(S.Zero)
    else:
        net.other.append((1 + Pow(S.NegativeOne, 2 * label)) / 2)


def _substitute_projection(net, var, value):
    net.mvars.pop(var)
    _replace_everywhere(net, var, value)


def _replace_everywhere(net, var, value):
    net.verts = [[(label, substitute_form(form, var, value)) for label, form in vert]
                 for vert in net.verts]
    net.phase = substitute_form(net.phase, var, value)
    net.mdeltas = [(substitute_form(f, var, value), substitute_form(g, var, value))
                   for f, g in net.mdeltas]


def resolve_deltas(net, ctx):
    """Apply every pending delta; return True when something was pending."""
    done = False
    while ctx.jdeltas or ctx.mdeltas:
        done = True
        while ctx.jdeltas:
            a, b = ctx.jdeltas.pop(0)
            _resolve_jdelta(net, ctx, a, b)
        if ctx.mdeltas:
            f, g = ctx.mdeltas.pop(0)
            _resolve_mdelta(net, ctx, f, g)
    if net.mdeltas:
        kept, net.mdeltas = net.mdeltas, []
        for f, g in kept:
            _resolve_mdelta_final(net, ctx, f, g)
    return done


def _resolve_mdelta_final(net, ctx, f, g):
    diff = add_forms(f, negate_form(g))
    if not diff:
        return
    if all(k is ONE for k in diff):
        ctx.zero = True
        return
    net.mdeltas.append((f, g))


# ---------------------------------------------------------------------------------------
# lines with momentum zero, free lines
# ---------------------------------------------------------------------------------------

def zero_lines(net, ctx):
    """Remove one 3j symbol with a zero momentum; description or ``None``."""
    for vi, vert in enumerate(net.verts):
        for k, (label, form) in enumerate(vert):
            if label == 0:
                (a, fa), (b, fb) = vert[(k + 1) % 3], vert[(k + 2) % 3]
                net.verts.pop(vi)
                ctx.mdeltas.append((form, {}))
                ctx.mdeltas.append((fa, negate_form(fb)))
                ctx.jdeltas.append((a, b))
                net.add_phase(add_forms(linear_form(a), negate_form(fa)))
                net.add_dim(a, Fraction(-1, 2))
                return "a 3j symbol with a zero momentum: (a a 0; m -m 0) = (-1)^(a-m)/sqrt(2a+1)"
    return None


def free_lines(net, ctx):
    """Sum a projection that no 3j symbol holds any more; description or ``None``."""
    for var, label in list(net.mvars.items()):
        if net.occurrences(var) or any(var in f or var in g for f, g in net.mdeltas):
            continue
        if any(var in e.free_symbols for e in net.other):
            continue
        c = net.phase.get(var, Fraction(0))
        if c.denominator != 1:
            continue
        net.mvars.pop(var)
        net.phase = {k: v for k, v in net.phase.items() if k != var}
        if c.numerator % 2 == 0:
            net.add_phase(scale_form(linear_form(label), c))
            net.add_dim(label, 1)
            return f"free line: sum over {var} of a constant gives (2j+1)"
        net.add_phase(scale_form(linear_form(label), -c))
        if label.is_number:
            if (2 * label) % 2:
                ctx.zero = True
        else:
            net.other.append((1 + Pow(S.NegativeOne, 2 * label)) / 2)
        return f"free line: alternating sum over {var}"
    return None


# ---------------------------------------------------------------------------------------
# the rules on the projections
# ---------------------------------------------------------------------------------------

def _shared(net, vi, vk):
    a = {v for _, f in net.verts[vi] for v in f if v in net.mvars}
    b = {v for _, f in net.verts[vk] for v in f if v in net.mvars}
    return sorted(a & b, key=default_sort_key)


def _slot_of(vert, var, skip=()):
    for k, (_, form) in enumerate(vert):
        if k not in skip and form.get(var) and len(form) == 1:
            return k
    return None


def _replace_vertices(net, indices, new):
    for vi in sorted(indices, reverse=True):
        net.verts.pop(vi)
    net.verts.extend(new)


def _drop_internals(net, m):
    for var in m.internals.values():
        net.mvars.pop(var, None)


def loop_rule(net, ctx):
    for vi, vert in enumerate(net.verts):
        for var in sorted({v for _, f in vert for v in f if v in net.mvars}, key=default_sort_key):
            k1 = _slot_of(vert, var)
            k2 = _slot_of(vert, var, skip=(k1,)) if k1 is not None else None
            if k1 is None or k2 is None:
                continue
            k3 = 3 - k1 - k2
            for perm in ((k1, k2, k3), (k2, k1, k3)):
                m = match(net, LOOP, [(vi, perm)])
                if m is None:
                    continue
                _drop_internals(net, m)
                net.phase = m.rest
                net.add_dim(m.labels["a"], Fraction(1, 2))
                ctx.jdeltas.append((m.labels["c"], S.Zero))
                ctx.mdeltas.append((m.externals["mu"], {}))
                _replace_vertices(net, [vi], [])
                return f"loop on line {var}: " + LOOP.source
    return None


def bubble_rule(net, ctx):
    n = len(net.verts)
    for vi in range(n):
        for vk in range(vi + 1, n):
            shared = _shared(net, vi, vk)
            if len(shared) < 2:
                continue
            for e1, e2 in ((shared[0], shared[1]), (shared[1], shared[0])):
                a1, a2 = _slot_of(net.verts[vi], e1), _slot_of(net.verts[vi], e2)
                b1, b2 = _slot_of(net.verts[vk], e1), _slot_of(net.verts[vk], e2)
                if None in (a1, a2, b1, b2):
                    continue
                m = match(net, BUBBLE, [(vi, (a1, a2, 3 - a1 - a2)), (vk, (b1, b2, 3 - b1 - b2))])
                if m is None:
                    continue
                _drop_internals(net, m)
                net.phase = m.rest
                L = m.labels
                net.add_dim(L["j3"], -1)
                net.triads.append((L["j1"], L["j2"], L["j3"]))
                ctx.jdeltas.append((L["j3"], L["j3p"]))
                ctx.mdeltas.append((m.externals["al"], m.externals["be"]))
                _replace_vertices(net, [vi, vk], [])
                return f"bubble on lines {e1}, {e2}: " + BUBBLE.source
    return None


def _triangles(net):
    n = len(net.verts)
    adj = {}
    for vi in range(n):
        for vk in range(vi + 1, n):
            sh = _shared(net, vi, vk)
            if len(sh) == 1:
                adj[(vi, vk)] = adj[(vk, vi)] = sh[0]
    for u in range(n):
        for v in range(u + 1, n):
            if (u, v) not in adj:
                continue
            for w in range(v + 1, n):
                if (u, w) in adj and (v, w) in adj:
                    yield u, v, w, adj


def _apply_triangle(net, ctx, u, v, w, adj):
    for p0, p1, p2 in permutations((u, v, w)):
        e3, e2, e1 = adj[(p0, p1)], adj[(p0, p2)], adj[(p1, p2)]
        V0, V1, V2 = net.verts[p0], net.verts[p1], net.verts[p2]
        s3, s2 = _slot_of(V0, e3), _slot_of(V0, e2)
        t1, t3 = _slot_of(V1, e1), _slot_of(V1, e3)
        r1, r2 = _slot_of(V2, e1), _slot_of(V2, e2)
        if None in (s3, s2, t1, t3, r1, r2):
            return None
        if len({e1, e2, e3}) != 3:
            return None
        perm0 = (3 - s2 - s3, s2, s3)
        perm1 = (t1, 3 - t1 - t3, t3)
        perm2 = (r1, r2, 3 - r1 - r2)
        m = match(net, TRIANGLE, [(p0, perm0), (p1, perm1), (p2, perm2)])
        if m is None:
            continue
        _drop_internals(net, m)
        net.phase = m.rest
        L, X = m.labels, m.externals
        new = [(L["j1"], X["m1"]), (L["j2"], X["m2"]), (L["j3"], X["m3"])]
        net.six.append((L["j1"], L["j2"], L["j3"], L["l1"], L["l2"], L["l3"]))
        _replace_vertices(net, [p0, p1, p2], [new])
        return True
    return None


def triangle_rule(net, ctx):
    for u, v, w, adj in _triangles(net):
        if _apply_triangle(net, ctx, u, v, w, adj):
            return "triangle: " + TRIANGLE.source
    return None


def _components(net):
    n = len(net.verts)
    seen, comps = set(), []
    for s in range(n):
        if s in seen:
            continue
        stack, comp = [s], []
        seen.add(s)
        while stack:
            a = stack.pop()
            comp.append(a)
            for b in range(n):
                if b not in seen and _shared(net, a, b):
                    seen.add(b)
                    stack.append(b)
        comps.append(sorted(comp))
    return comps


def _closed(net, comp):
    for vi in comp:
        for _, form in net.verts[vi]:
            s = is_single(form)
            if s is None or s[0] not in net.mvars:
                return False
    return True


def ninej_rule(net, ctx):
    for comp in _components(net):
        if len(comp) != 6 or not _closed(net, comp):
            continue
        adj = {(a, b): _shared(net, a, b) for a in comp for b in comp if a != b}
        first = comp[0]
        side = [b for b in comp if b != first and adj[(first, b)]]
        if len(side) != 3 or any(len(adj[(first, b)]) != 1 for b in side):
            continue
        rows = [b for b in comp if b not in side]
        if any(len(adj.get((r, c), [])) != 1 for r in rows for c in side):
            continue
        for rs, cs in ((rows, side), (side, rows)):
            for rp in permutations(rs):
                for cp in permutations(cs):
                    assign = []
                    for r in rp:
                        assign.append((r, tuple(_slot_of(net.verts[r], adj[(r, c)][0]) for c in cp)))
                    for c in cp:
                        assign.append((c, tuple(_slot_of(net.verts[c], adj[(c, r)][0]) for r in rp)))
                    m = match(net, NINEJ, assign)
                    if m is None:
                        continue
                    _drop_internals(net, m)
                    net.phase = m.rest
                    L = m.labels
                    net.nine.append(tuple(L[f"j{i}{k}"] for i in (1, 2, 3) for k in (1, 2, 3)))
                    _replace_vertices(net, [vi for vi, _ in assign], [])
                    return "the graph K(3,3): " + NINEJ.source
    return None


def _shortest_cycle(net):
    """Vertices of a shortest cycle (length >= 4 expected here), or ``None``."""
    n = len(net.verts)
    nbrs = {a: [b for b in range(n) if b != a and _shared(net, a, b)] for a in range(n)}
    best = None
    for s in range(n):
        parent = {s: None}
        depth = {s: 0}
        queue = [s]
        for a in queue:
            for b in nbrs[a]:
                if b not in depth:
                    depth[b] = depth[a] + 1
                    parent[b] = a
                    queue.append(b)
                elif parent[a] != b and depth[b] >= depth[a]:
                    # cycle through s: path s..a, edge a-b, path b..s
                    pa, pb = [], []
                    x = a
                    while x is not None:
                        pa.append(x)
                        x = parent[x]
                    x = b
                    while x is not None:
                        pb.append(x)
                        x = parent[x]
                    if set(pa[:-1]) & set(pb[:-1]):
                        continue
                    cycle = list(reversed(pa)) + pb[:-1]
                    if best is None or len(cycle) < len(best):
                        best = cycle
    return best


def interchange_rule(net, ctx):
    cycle = _shortest_cycle(net)
    if cycle is None or len(cycle) < 4:
        return None
    L = len(cycle)
    u, v = cycle[0], cycle[1]
    prev, nxt = cycle[-1], cycle[2]
    e = _shared(net, u, v)[0]
    va = _shared(net, prev, u)[0]
    vc = _shared(net, v, nxt)[0]
    trial = net.copy()
    taken = set()
    x = trial.fresh("x")
    taken.add(str(x))
    xi = trial.fresh("mu", taken)
    taken.add(str(xi))
    va2 = trial.fresh("mu", taken)
    taken.add(str(va2))
    vc2 = trial.fresh("mu", taken)
    la, lc = trial.mvars[va], trial.mvars[vc]
    # the triangle needs an odd coefficient of the line e (parity of the cycle)
    c_e = trial.phase.get(e, Fraction(0))
    if c_e.denominator != 1:
        return None
    if c_e.numerator % 2 == 0:
        trial.add_phase(add_forms(*(f for _, f in trial.verts[u])))
    ku = _slot_of(trial.verts[u], va)
    kv = _slot_of(trial.verts[v], vc)
    lu, fu = trial.verts[u][ku]
    trial.verts[u][ku] = (lu, substitute_form(fu, va, {va2: Fraction(1)}))
    lv, fv = trial.verts[v][kv]
    trial.verts[v][kv] = (lv, substitute_form(fv, vc, {vc2: Fraction(1)}))
    # completeness holds with (t va, t vc') on both sides for t = +-1; choose the signs so
    # that the triangle (u, v, new vertex) has an even number of lines whose two ends carry
    # the same sign (else no flips of its vertices give the triangle rule's signs)
    s_u, s_v = int(fu[va]), int(fv[vc])
    eu = next(int(f[e]) for _, f in trial.verts[u] if e in f)
    ev = next(int(f[e]) for _, f in trial.verts[v] if e in f)
    t_a = -s_u
    t_c = -s_v if eu * ev < 0 else s_v
    trial.mvars[va2], trial.mvars[vc2], trial.mvars[xi] = la, lc, x
    trial.xvars[x] = (Abs(la - lc), la + lc, "new")
    trial.half_atoms |= {x, xi, va2, vc2}
    trial.add_dim(x, 1)
    one = {va: Fraction(t_a)}, {vc: Fraction(t_c)}, {xi: Fraction(1)}
    two = {va2: Fraction(t_a)}, {vc2: Fraction(t_c)}, {xi: Fraction(1)}
    trial.verts.append([(la, one[0]), (lc, one[1]), (x, one[2])])
    trial.verts.append([(la, two[0]), (lc, two[1]), (x, two[2])])
    w = len(trial.verts) - 1
    adj = {}
    for a, b in ((u, v), (u, w), (v, w)):
        sh = _shared(trial, a, b)
        if len(sh) != 1:
            return None
        adj[(a, b)] = adj[(b, a)] = sh[0]
    if not _apply_triangle(trial, ctx, u, v, w, adj):
        return None
    _adopt(net, trial)
    return (f"interchange on a cycle of {L}: completeness (Edmonds 1957, eq. 3.7.7, from memory) "
            f"on lines {va}, {vc}, then the triangle rule; new sum over {x}")


def _adopt(net, other):
    for name in net.__slots__:
        setattr(net, name, getattr(other, name))


# ---------------------------------------------------------------------------------------
# removing a summed intermediate momentum
# ---------------------------------------------------------------------------------------

def sixj_forms(t):
    """The 24 arrangements of a 6j symbol with the same value (column permutations,
    upper and lower entries exchanged in two columns; Edmonds 1957, sec. 6.3, from memory)."""
    cols = [(t[0], t[3]), (t[1], t[4]), (t[2], t[5])]
    out = []
    for perm in permutations(range(3)):
        c = [cols[i] for i in perm]
        for swap in ((0, 0, 0), (1, 1, 0), (1, 0, 1), (0, 1, 1)):
            cc = [(lo, up) if s else (up, lo) for (up, lo), s in zip(c, swap)]
            form = (cc[0][0], cc[1][0], cc[2][0], cc[0][1], cc[1][1], cc[2][1])
            if form not in out:
                out.append(form)
    return out


def _absorb(net, t, vi):
    """6j ``t`` times vertex ``vi`` (momenta a triad of ``t``) -> three vertices."""
    vert = net.verts[vi]
    labels = [s[0] for s in vert]
    for form in sixj_forms(t):
        top = form[:3]
        for perm in permutations(range(3)):
            if all(labels[perm[k]] == top[k] for k in range(3)):
                j1, j2, j3, l1, l2, l3 = form
                m1, m2, m3 = (vert[perm[k]][1] for k in range(3))
                if permutation_is_odd(perm):
                    net.add_phase(vertex_momentum_form(vert))
                taken = set()
                mus = []
                for label in (l1, l2, l3):
                    mu = net.fresh("mu", taken)
                    taken.add(str(mu))
                    mus.append(mu)
                u1, u2, u3 = ({mu: Fraction(1)} for mu in mus)
                new = [[(j1, m1), (l2, u2), (l3, negate_form(u3))],
                       [(l1, negate_form(u1)), (j2, m2), (l3, u3)],
                       [(l1, u1), (l2, negate_form(u2)), (j3, m3)]]
                for mu, label in zip(mus, (l1, l2, l3)):
                    net.mvars[mu] = label
                    net.half_atoms.add(mu)
                net.add_phase(add_forms(linear_form(l1), linear_form(l2), linear_form(l3),
                                        *({mu: Fraction(1)} for mu in mus)))
                net.six.remove(t)
                _replace_vertices(net, [vi], new)
                return True
    return False


def _insert_theta(net, triad):
    taken = set()
    nus = []
    for label in triad:
        nu = net.fresh("mu", taken)
        taken.add(str(nu))
        nus.append(nu)
        net.mvars[nu] = label
        net.half_atoms.add(nu)
    vert = [(label, {nu: Fraction(1)}) for label, nu in zip(triad, nus)]
    net.verts.append(list(vert))
    net.verts.append(list(vert))
    return len(net.verts) - 2


def _expand_ninej(net, t):
    taken = set()
    e = {}
    for i in range(3):
        for k in range(3):
            mu = net.fresh("mu", taken)
            taken.add(str(mu))
            e[(i, k)] = mu
            net.mvars[mu] = t[3 * i + k]
            net.half_atoms.add(mu)
    for i in range(3):
        net.verts.append([(t[3 * i + k], {e[(i, k)]: Fraction(1)}) for k in range(3)])
    for k in range(3):
        net.verts.append([(t[3 * i + k], {e[(i, k)]: Fraction(1)}) for i in range(3)])
    net.nine.remove(t)


def _absorb_ninej(net, t, vi):
    """9j ``t`` times vertex ``vi`` whose momenta are a row or column of ``t`` (in some order)
    -> the other five 3j symbols of the 9j graph.

    The five vertices summed over their six inner projections form a graph with three
    open lines; by the theorem on graphs with three open lines (Yutsis, Levinson and
    Vanagas 1962) it is a multiple of the 3j symbol of the missing vertex, and closing it
    with that vertex gives the 9j (DLMF 34.6.1), so the multiple is the 9j itself:
    (row 1 3j) * 9j = sum of (rows 2, 3)(columns 1, 2, 3), all projections with + sign.
    """
    from .rules_ninej import ninej_arrangements

    vert = net.verts[vi]
    labels = [s[0] for s in vert]
    for grid, odd in ninej_arrangements(t):
        top = grid[0]
        for perm in permutations(range(3)):
            if not all(labels[perm[k]] == top[k] for k in range(3)):
                continue
            forms = [vert[perm[k]][1] for k in range(3)]
            if permutation_is_odd(perm):
                net.add_phase(vertex_momentum_form(vert))
            if odd:
                net.add_phase(add_forms(*(linear_form(a) for row in grid for a in row)))
            taken = set()
            e = {}
            for i in (1, 2):
                for k in range(3):
                    mu = net.fresh("mu", taken)
                    taken.add(str(mu))
                    e[(i, k)] = mu
                    net.mvars[mu] = grid[i][k]
                    net.half_atoms.add(mu)
            new = [[(grid[i][k], {e[(i, k)]: Fraction(1)}) for k in range(3)] for i in (1, 2)]
            for k in range(3):
                new.append([(grid[0][k], forms[k])]
                           + [(grid[i][k], {e[(i, k)]: Fraction(1)}) for i in (1, 2)])
            net.nine.remove(t)
            _replace_vertices(net, [vi], new)
            return True
    return False


def _x_vertices(net, x):
    return [vi for vi, vert in enumerate(net.verts) if any(label == x for label, _ in vert)]


def _mentions(expr, x):
    return x in expr.free_symbols


def eliminate_momentum(net, ctx, x, log):
    """Remove the summed momentum ``x``; True when it is gone (steps go to ``log``)."""
    for t in [t for t in net.nine if any(_mentions(a, x) for a in t)]:
        if x not in t:
            return False
        done = False
        for vi in _x_vertices(net, x):
            if _absorb_ninej(net, t, vi):
                log("absorb", f"9j symbol containing {x} into a 3j symbol of one of its rows: "
                              "the 9j graph read backwards")
                done = True
                break
        if not done:
            _expand_ninej(net, t)
            log("expand", f"the 9j symbol containing {x} as its six 3j symbols: " + NINEJ.source)
    sixes = [t for t in net.six if x in t]
    if any(_mentions(a, x) and a != x for t in net.six for a in t):
        return False
    if not _x_vertices(net, x):
        if not sixes:
            return False
        t = sixes[0]
        triad = next(tuple(t[i] for i in tri) for tri in SIXJ_TRIADS if x in [t[i] for i in tri])
        vi = _insert_theta(net, triad)
        log("expand", f"insert sum over projections of (3j)^2 = Delta{triad}, implied by the 6j")
        _absorb(net, t, vi)
        log("absorb", f"6j symbol containing {x} into a 3j symbol: triangle rule read backwards")
    progress = True
    while progress:
        progress = False
        for t in [t for t in net.six if x in t]:
            for vi in _x_vertices(net, x):
                labels = sorted((s[0] for s in net.verts[vi]), key=default_sort_key)
                if any(sorted((t[i] for i in tri), key=default_sort_key) == labels
                       for tri in SIXJ_TRIADS):
                    if _absorb(net, t, vi):
                        log("absorb", f"6j symbol containing {x} into a 3j symbol: "
                                      "triangle rule read backwards")
                        progress = True
                        break
            if progress:
                break
    if any(x in t for t in net.six):
        return False
    return _completeness(net, ctx, x, log)


def _completeness(net, ctx, x, log):
    xv = _x_vertices(net, x)
    if len(xv) != 2 or net.dims.get(x) != 1:
        return False
    p, q = xv
    if any(_mentions(e, x) for e in net.other) or any(x in (a, b) for a, b in net.jdeltas):
        return False
    implied = sorted((s[0] for s in net.verts[p]), key=default_sort_key)
    net.triads = [t for t in net.triads
                  if not (x in t and sorted(t, key=default_sort_key) == implied)]
    if any(_mentions(a, x) for t in net.triads for a in t):
        return False
    kp = [k for k, (label, _) in enumerate(net.verts[p]) if label == x]
    kq = [k for k, (label, _) in enumerate(net.verts[q]) if label == x]
    if len(kp) != 1 or len(kq) != 1:
        return False
    kp, kq = kp[0], kq[0]
    others_p = [k for k in range(3) if k != kp]
    others_q = [k for k in range(3) if k != kq]
    for oq in (others_q, others_q[::-1]):
        m = match(net, COMPLETENESS, [(p, (others_p[0], others_p[1], kp)), (q, (oq[0], oq[1], kq))])
        if m is None or m.labels["x"] != x:
            continue
        rest = dict(m.rest)
        c = rest.pop(x, Fraction(0))
        if c.denominator != 1 or c.numerator % 2:
            continue
        # (-1)^(2n x) = (-1)^(-2n(a+b)): a + b + x is an integer
        rest = add_forms(rest, scale_form(add_forms(linear_form(m.labels["a"]), linear_form(m.labels["b"])),
                                          -c))
        if any(_mentions(label, x) for vi, vert in enumerate(net.verts) if vi not in (p, q)
               for label, _ in vert):
            return False
        _drop_internals(net, m)
        net.phase = rest
        net.dims.pop(x)
        net.xvars.pop(x)
        ctx.mdeltas.append((m.externals["al"], m.externals["alp"]))
        ctx.mdeltas.append((m.externals["be"], m.externals["bep"]))
        _replace_vertices(net, [p, q], [])
        log("completeness", f"sum over {x}: " + COMPLETENESS.source)
        return True
    return False
