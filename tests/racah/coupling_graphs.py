"""Random coupling graphs with small numeric momenta, written as sums of 3j symbols.

Two binary coupling trees over the same leaves (random shapes, random admissible
intermediate momenta, the same total) give a closed cubic graph (the graph of a
recoupling coefficient): a 3j vertex per coupling, a summed projection per line.  Each
line gets the metric phase (-1)^(j - m) at one end and -m at the other; then every
vertex is rewritten by exact 3j symmetries (random column permutation, random reversal
of all projections, each with its phase (-1)^(j1+j2+j3)), so the sum keeps its value
while its form is scrambled.  ``broken=True`` drops the phase of one line, which gives a
different (still well-defined) sum that need not reduce.  ``open_root=True`` cuts the line
of the total momentum, leaving two external projections.
"""

from hypothesis import strategies as st
from sympy import Integer, Mul, Rational, Sum, Symbol

from amalgebra.coupling import Coupling3j

HALVES = (Rational(1, 2), Integer(1), Rational(3, 2))


def _tree(draw, leaves):
    """A random binary tree as nested tuples over leaf indices."""
    nodes = list(range(len(leaves)))
    while len(nodes) > 1:
        k = draw(st.integers(0, len(nodes) - 2))
        nodes[k:k + 2] = [(nodes[k], nodes[k + 1])]
        perm = draw(st.permutations(list(range(len(nodes)))))
        nodes = [nodes[p] for p in perm]
    return nodes[0]


def _label(draw, node, leaves, labels):
    if isinstance(node, int):
        return leaves[node]
    a = _label(draw, node[0], leaves, labels)
    b = _label(draw, node[1], leaves, labels)
    choices = [abs(a - b) + k for k in range(int(a + b - abs(a - b)) + 1)]
    value = draw(st.sampled_from(choices))
    labels[node] = value
    return value


def _symbolic_labels(node, leaves, labels, stem, counter):
    if isinstance(node, int):
        return leaves[node]
    _symbolic_labels(node[0], leaves, labels, stem, counter)
    _symbolic_labels(node[1], leaves, labels, stem, counter)
    counter[0] += 1
    labels[node] = Symbol(f"{stem}{counter[0]}")
    return labels[node]


@st.composite
def coupling_sums(draw, max_leaves=4, broken=False, open_root=False, symbolic=False):
    """``(expr, externals)``: a sum over all its projections of 3j symbols (numeric j, or
    with ``symbolic=True`` a symbol for every momentum, the two totals the same ``J``)."""
    n = draw(st.integers(2, max_leaves))
    if symbolic:
        leaves = [Symbol(f"j{k + 1}") for k in range(n)]
    else:
        leaves = [draw(st.sampled_from(HALVES[:2] if n > 3 else HALVES)) for _ in range(n)]
    t1, t2 = _tree(draw, leaves), _tree(draw, leaves)
    lab1, lab2 = {}, {}
    if symbolic:
        _symbolic_labels(t1, leaves, lab1, "k", [0])
        _symbolic_labels(t2, leaves, lab2, "l", [0])
        lab1[t1] = lab2[t2] = Symbol("J")
    else:
        total1 = _label(draw, t1, leaves, lab1)
        total2 = _label(draw, t2, leaves, lab2)
        if total1 != total2:
            from hypothesis import assume

            assume(False)
    counter = [0]

    def new_m():
        counter[0] += 1
        return Symbol(f"m{counter[0]}")

    vertices = []          # each: list of (j, sign, m) ; sign of the projection
    phases = []
    lines = []             # (m, j) summed
    leaf_m = {k: new_m() for k in range(n)}
    for k in range(n):
        lines.append((leaf_m[k], leaves[k]))

    def build(node, labels, side):
        if isinstance(node, int):
            return leaf_m[node], leaves[node], (1 if side == 0 else -1)
        ma, ja, sa = build(node[0], labels, side)
        mb, jb, sb = build(node[1], labels, side)
        mc = new_m()
        jc = labels[node]
        lines.append((mc, jc))
        vertices.append([(ja, sa, ma), (jb, sb, mb), (jc, 1, mc)])
        return mc, jc, -1

    root1, jr, _ = build(t1, lab1, 0)
    root2, _, _ = build(t2, lab2, 1)
    # every line: +m at one end, -m at the other, metric phase (-1)^(j - m)
    # leaves: +m in tree 1, -m in tree 2 (set above); inner lines: +m below, -m above
    # the two roots: both carry +m; make tree 2's root -m and join them
    for vert in vertices:
        for k, (j, s, mm) in enumerate(vert):
            if mm == root2:
                vert[k] = (j, -1, root1)
    lines = [(mm, j) for mm, j in lines if mm != root2]
    ext = []
    if open_root:
        top = Symbol("M"), Symbol("Mp")
        for vert in vertices:
            for k, (j, s, mm) in enumerate(vert):
                if mm == root1:
                    vert[k] = (j, s, top[0] if s == 1 else top[1])
        lines = [(mm, j) for mm, j in lines if mm != root1]
        ext = list(top)
    drop = draw(st.integers(0, len(lines) - 1)) if broken else None
    for idx, (mm, j) in enumerate(lines):
        if idx != drop:
            phases.append((-1) ** (j - mm))
    factors = []
    for vert in vertices:
        perm = draw(st.permutations([0, 1, 2]))
        flip = draw(st.booleans())
        jsum = sum(j for j, _, _ in vert)
        odd = sum(1 for a in range(3) for b in range(a + 1, 3) if perm[a] > perm[b]) % 2
        phase = 1
        if odd:
            phase *= (-1) ** jsum
        if flip:
            phase *= (-1) ** jsum
        slots = [vert[p] for p in perm]
        sgn = -1 if flip else 1
        factors.append(phase * Coupling3j(*(j for j, _, _ in slots), *(sgn * s * mm for _, s, mm in slots)))
    term = Mul(*factors, *phases)
    expr = Sum(term, *[(mm, -j, j) for mm, j in lines])
    return expr, ext
