r"""Recoupling coefficients between any two coupling trees, as explicit 6j/9j formulas.

Explanation
===========

The overlap :math:`\langle T_1 | T_2\rangle` of the states of the same
momenta coupled by two trees (:mod:`amalgebra.coupling.trees`) does not
depend on the projection :math:`M`.  It is found as a path of elementary
moves from :math:`T_1` to :math:`T_2`, each with a known coefficient
(Condon-Shortley Clebsch-Gordan coefficients; Edmonds 1957, eqs. 6.1.5 and
6.4.2, numbers from memory, every formula checked against explicit coupled
vectors in ``tests/coupling/test_recoupling.py``):

* exchange of the two children of a node,
  :math:`\langle (a b) c | (b a) c\rangle = (-1)^{a+b-c}`;
* associativity (one 6j symbol and, when the new intermediate momentum is not
  one of the target's, one summation),

  .. math::

      \langle ((a b) e, c) f | (a, (b c) g) f\rangle
        = (-1)^{a+b+c+f} \sqrt{(2e+1)(2g+1)}
          \begin{Bmatrix} a & b & e \\ c & f & g \end{Bmatrix} ;

* the exchange of partners between two pairs (one 9j symbol),

  .. math::

      \langle ((a b) e, (c d) f) j | ((a c) g, (b d) h) j\rangle
        = \sqrt{(2e+1)(2f+1)(2g+1)(2h+1)}
          \begin{Bmatrix} a & b & e \\ c & d & f \\ g & h & j \end{Bmatrix} .

The path is the cheapest one in (number of summations, number of symbols),
found by a shortest-path search over the unordered trees (a tree is its set
of coupled subsets; a move replaces one or two subsets), in the spirit of the
rotation-distance method of Fack, Lievens and Van der Jeugt (Comput. Phys.
Commun. 119 (1999) 99) with the 9j move added.  Intermediate momenta that the
path creates and later removes are summed over, ``x1, x2, ...`` (names not
used by either tree).  Phases are kept exactly: exponents are reduced with
:math:`(-1)^{4j} = 1` (every momentum is a half-integer).

Values may be symbolic; the coefficient is then an unevaluated formula in the
library's :class:`~amalgebra.coupling.symbols.Coupling6j` and
:class:`~amalgebra.coupling.symbols.Coupling9j`, with ``Sum`` over the
summation momenta and ``KroneckerDelta`` where a subset is coupled in both
trees under different names.  ``.doit()`` evaluates it exactly when the values
are numbers.

Examples
========

>>> from amalgebra.coupling.trees import coupling_tree
>>> from amalgebra.coupling.recoupling import recoupling_coefficient
>>> left = coupling_tree("((a b) e, c) f")
>>> right = coupling_tree("(a, (b c) g) f")
>>> recoupling_coefficient(left, right)
(-1)**(a + b + c + f)*sqrt(2*e + 1)*sqrt(2*g + 1)*6j{a, b, e; c, f, g}

LS to jj for two p electrons is one 9j symbol:

>>> ls = coupling_tree("((l1 l2) L, (s1 s2) S) J", l1=1, l2=1, s1="1/2", s2="1/2", L=0, S=0, J=0)
>>> jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", l1=1, l2=1, s1="1/2", s2="1/2",
...                    j1="1/2", j2="1/2", J=0)
>>> c = recoupling_coefficient(ls, jj)
>>> c
2*9j{1, 1, 0; 1/2, 1/2, 0; 1/2, 1/2, 0}
>>> c.doit()
sqrt(3)/3

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 6.
.. [2] V. Fack, S. Lievens and J. Van der Jeugt, Comput. Phys. Commun. 119 (1999) 99.
"""

import heapq
import itertools
from collections import Counter

from sympy import Abs, Add, ImmutableMatrix, KroneckerDelta, Mul, Rational, S, Sum, Symbol, eye, sqrt
from sympy.printing.defaults import Printable

from ..errors import StateError
from .symbols import Coupling6j, Coupling9j
from ..notation import NotationHooks
from .trees import CouplingTree, leaf_names

__all__ = ["recoupling_coefficient", "recoupling_path", "RecouplingMove", "recoupling_matrix",
           "RecouplingMatrix", "tree_assignments"]

#: the most momenta for which the path search runs (the number of trees grows as (2n-3)!!)
MAX_SEARCH_LEAVES = 9


class RecouplingMove:
    """One elementary move of a recoupling path: ``kind`` is ``"6j"`` or ``"9j"``.

    ``removed`` and ``added`` are the coupled subsets (tuples of leaf labels)
    that the move takes away and puts in.
    """

    __slots__ = ("kind", "removed", "added")

    def __init__(self, kind, removed, added):
        self.kind, self.removed, self.added = kind, removed, added

    def __repr__(self):
        return f"RecouplingMove({self.kind!r}, removed={self.removed}, added={self.added})"


# -- the search over unordered trees ----------------------------------------------------------

def _clusters(node, index, out):
    if isinstance(node, str):
        return frozenset((index[node],))
    here = _clusters(node[0], index, out) | _clusters(node[1], index, out)
    out.add(here)
    return here


def _key(cluster):
    return (len(cluster), tuple(sorted(cluster)))


def _children(clusters, n):
    """``{cluster: (child, child)}``; a child is a cluster or a one-leaf set."""
    ordered = sorted(clusters, key=_key)
    out = {}
    for c in ordered:
        inside = [d for d in ordered if d < c]
        maximal = [d for d in inside if not any(d < e for e in inside)]
        covered = frozenset().union(*maximal) if maximal else frozenset()
        parts = maximal + [frozenset((i,)) for i in sorted(c - covered)]
        assert len(parts) == 2, (c, parts)
        out[c] = tuple(sorted(parts, key=_key))
    return out


def _moves(state, root, n, nine_j):
    kids = _children(state, n)
    parent = {}
    for c, (a, b) in kids.items():
        parent[a] = c
        parent[b] = c
    out = []
    for x in sorted(state, key=_key):
        if x == root:
            continue
        p = parent[x]
        y = p - x
        for part in kids[x]:
            new = part | y
            out.append(("6j", (x,), (new,)))
    if nine_j:
        for p in sorted(state, key=_key):
            x, y = kids[p]
            if len(x) > 1 and len(y) > 1:
                a, b = kids[x]
                c, d = kids[y]
                out.append(("9j", (x, y), (a | c, b | d)))
                out.append(("9j", (x, y), (a | d, b | c)))
    return out


def _search(start, goal, root, n, nine_j):
    """Cheapest path (sums, symbols) from ``start`` to ``goal`` (frozensets of clusters)."""
    if start == goal:
        return []
    counter = itertools.count()
    best = {start: (0, 0)}
    heap = [((0, 0), next(counter), start)]
    back = {}
    while heap:
        cost, _, state = heapq.heappop(heap)
        if state == goal:
            break
        if cost > best.get(state, cost):
            continue
        for kind, removed, added in _moves(state, root, n, nine_j):
            new_state = (state - frozenset(removed)) | frozenset(added)
            sums = sum(1 for c in added if c not in goal)
            new_cost = (cost[0] + sums, cost[1] + 1)
            if new_cost < best.get(new_state, (float("inf"), 0)):
                best[new_state] = new_cost
                back[new_state] = (state, (kind, removed, added))
                heapq.heappush(heap, (new_cost, next(counter), new_state))
    path = []
    state = goal
    while state != start:
        state, move = back[state]
        path.append(move)
    return path[::-1]


# -- ordered trees with values ----------------------------------------------------------------

class _Node:
    __slots__ = ("left", "right", "value", "cluster")

    def __init__(self, left, right, value, cluster):
        self.left, self.right, self.value, self.cluster = left, right, value, cluster


def _ordered(node, index, values):
    if isinstance(node, str):
        return _Node(None, None, values[node], frozenset((index[node],)))
    left, right = _ordered(node[0], index, values), _ordered(node[1], index, values)
    return _Node(left, right, values[node[2]], left.cluster | right.cluster)


def _find(node, cluster):
    if node.cluster == cluster:
        return node
    if node.left is None or not cluster <= node.cluster:
        return None
    return _find(node.left, cluster) or _find(node.right, cluster)


class _Builder:
    """Accumulates the factors of a recoupling coefficient along a path."""

    def __init__(self, reserved):
        self.phase = S.Zero
        self.dims = []
        self.symbols = []
        self.created = []           # (symbol, child value, child value) in creation order
        self.reserved = set(reserved)
        self.counter = 0

    def fresh(self):
        while True:
            self.counter += 1
            name = f"x{self.counter}"
            if name not in self.reserved:
                return Symbol(name)

    def orient(self, node, left_cluster):
        """Make the child with ``left_cluster`` the left one (an exchange costs a phase)."""
        if node.left.cluster != left_cluster:
            self.phase += node.left.value + node.right.value - node.value
            node.left, node.right = node.right, node.left

    def rotate(self, tree, x_cluster, new_cluster):
        """``((A B) X, Y) P -> (A, (B Y) G) P`` where ``new_cluster`` is ``B | Y``."""
        p = _parent(tree, x_cluster)
        y_cluster = p.cluster - x_cluster
        b_cluster = new_cluster - y_cluster
        self.orient(p, x_cluster)
        x = p.left
        self.orient(x, x_cluster - b_cluster)
        a, b, y = x.left, x.right, p.right
        g = self.fresh()
        self.phase += a.value + b.value + y.value + p.value
        self.dims += [x.value, g]
        self.symbols.append(Coupling6j(a.value, b.value, x.value, y.value, p.value, g))
        self.created.append((g, b.value, y.value))
        p.left, p.right = a, _Node(b, y, g, b.cluster | y.cluster)

    def ninej(self, tree, pair, new_pair):
        x_cluster, y_cluster = pair
        p = _parent(tree, x_cluster)
        first, second = new_pair
        self.orient(p, x_cluster)
        x, y = p.left, p.right
        a_cluster = first & x_cluster
        c_cluster = first & y_cluster
        self.orient(x, a_cluster)
        self.orient(y, c_cluster)
        a, b, c, d = x.left, x.right, y.left, y.right
        g, h = self.fresh(), self.fresh()
        self.dims += [x.value, y.value, g, h]
        self.symbols.append(Coupling9j(a.value, b.value, x.value, c.value, d.value, y.value,
                                        g, h, p.value))
        self.created += [(g, a.value, c.value), (h, b.value, d.value)]
        p.left = _Node(a, c, g, a.cluster | c.cluster)
        p.right = _Node(b, d, h, b.cluster | d.cluster)


def _parent(node, cluster):
    if node.left is None:
        return None
    if cluster in (node.left.cluster, node.right.cluster):
        return node
    return _parent(node.left, cluster) or _parent(node.right, cluster)


def _align(builder, node, target):
    """Exchange children so that ``node`` has the child order of ``target`` everywhere."""
    if node.left is None:
        return
    builder.orient(node, target.left.cluster)
    _align(builder, node.left, target.left)
    _align(builder, node.right, target.right)


def _values_by_cluster(node, out):
    out[node.cluster] = node.value
    if node.left is not None:
        _values_by_cluster(node.left, out)
        _values_by_cluster(node.right, out)
    return out


def _reduce_phase(exponent):
    """``(-1)**exponent`` with symbol coefficients reduced mod 4 and the constant mod 2."""
    exponent = exponent.expand()
    terms = exponent.as_coefficients_dict()
    out = []
    for base, coeff in sorted(terms.items(), key=lambda kv: str(kv[0])):
        if base == 1:
            c = Rational(coeff) % 2
        else:
            c = Rational(coeff) % 4
            if c == 3:
                c = Rational(-1)
        if c:
            out.append(c * base)
    total = Add(*out)
    return S.NegativeOne ** total if total != 0 else S.One


def _check_same_momenta(first, second):
    if sorted(first.leaves) != sorted(second.leaves):
        raise StateError(f"trees {first} and {second} must couple the same momenta "
                         f"({sorted(first.leaves)} against {sorted(second.leaves)})")
    for label in first.leaves:
        if first.value(label) != second.value(label):
            raise StateError(f"{label}={first.value(label)} in {first} must equal "
                             f"{label}={second.value(label)} in {second}")


def _check_names(first, second, index):
    """A symbol may name the same subset in both trees, never two different subsets."""
    def symbols(tree):
        out = {}
        clusters = {}
        _values_by_cluster(_ordered(tree.structure, index, tree.values), clusters)
        for cluster, value in clusters.items():
            for s in value.free_symbols:
                out.setdefault(s, set()).add(cluster)
        return out

    a, b = symbols(first), symbols(second)
    for s in sorted(set(a) & set(b), key=str):
        if a[s] != b[s] and len(a[s] | b[s]) > 1:
            raise StateError(f"symbol {s} must not name different couplings in the two trees: "
                             "give the momenta of the second tree other names")


def recoupling_path(first, second, *, nine_j=True):
    """The elementary moves (6j and 9j) of the cheapest path from ``first`` to ``second``.

    Exchanges of children are not listed (they cost a phase only).

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.coupling.recoupling import recoupling_path
    >>> ls = coupling_tree("((l1 l2) L, (s1 s2) S) J")
    >>> jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J")
    >>> recoupling_path(ls, jj)
    [RecouplingMove('9j', removed=(('l1', 'l2'), ('s1', 's2')), added=(('l1', 's1'), ('l2', 's2')))]
    >>> len(recoupling_path(ls, jj, nine_j=False))
    3
    """
    moves, labels = _path(first, second, nine_j)
    def named(cluster):
        return tuple(lab for lab in labels if labels.index(lab) in cluster)
    return [RecouplingMove(kind, tuple(named(c) for c in removed), tuple(named(c) for c in added))
            for kind, removed, added in moves]


def _path(first, second, nine_j):
    for tree, name in ((first, "first"), (second, "second")):
        if not isinstance(tree, CouplingTree):
            raise StateError(f"{name}={tree!r} must be a CouplingTree (see coupling_tree)")
    _check_same_momenta(first, second)
    labels = list(first.leaves)
    n = len(labels)
    if n > MAX_SEARCH_LEAVES:
        raise StateError(f"recoupling trees of {n} momenta: at most {MAX_SEARCH_LEAVES} are searched")
    index = {lab: i for i, lab in enumerate(labels)}
    start, goal = set(), set()
    _clusters(first.structure, index, start)
    _clusters(second.structure, index, goal)
    root = frozenset(range(n))
    return _search(frozenset(start), frozenset(goal), root, n, nine_j), labels


def recoupling_coefficient(first, second, *, nine_j=True):
    r"""The recoupling coefficient :math:`\langle T_1 | T_2\rangle` as a formula in 6j and 9j symbols.

    Explanation
    ===========

    See the module docstring for the moves and their coefficients (Condon-Shortley
    phases).  ``nine_j=False`` writes every exchange of partners as three 6j
    symbols and a sum.  Both trees must couple the same labelled momenta with
    the same values.  For numeric values ``.doit()`` gives the exact number.

    Examples
    ========

    Reversing a pair costs a phase only:

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.coupling.recoupling import recoupling_coefficient
    >>> recoupling_coefficient(coupling_tree("(a b) c"), coupling_tree("(b a) c"))
    (-1)**(a + b - c)

    Moving one momentum across a chain takes one 6j per step:

    >>> t1 = coupling_tree("(((a b) x, c) y, d) J")
    >>> t2 = coupling_tree("((a, (c d) u) v, b) J")
    >>> from sympy import symbols
    >>> a, b, c, d, x, y, u, v, J = symbols("a b c d x y u v J")
    >>> recoupling_coefficient(t1, t2).atoms(Coupling6j) == {Coupling6j(b, a, x, u, J, v),
    ...                                                      Coupling6j(x, c, y, d, J, u)}
    True
    """
    moves, labels = _path(first, second, nine_j)
    index = {lab: i for i, lab in enumerate(labels)}
    _check_names(first, second, index)
    reserved = {s.name for t in (first, second) for v in t.values.values() for s in v.free_symbols}
    reserved |= set(first.names) | set(second.names)
    builder = _Builder(reserved)
    tree = _ordered(first.structure, index, first.values)
    for kind, removed, added in moves:
        if kind == "6j":
            builder.rotate(tree, removed[0], added[0])
        else:
            builder.ninej(tree, removed, added)
    target = _ordered(second.structure, index, second.values)
    _align(builder, tree, target)
    current = _values_by_cluster(tree, {})
    wanted = _values_by_cluster(target, {})
    created = {g for g, _, _ in builder.created}
    substitution, deltas = {}, []
    for cluster in sorted(wanted, key=_key):
        have, want = current[cluster], wanted[cluster]
        if have in created:
            substitution[have] = want
        elif have != want:
            deltas.append(KroneckerDelta(have, want))
    summed = [(g, u, v) for g, u, v in builder.created if g not in substitution]
    return _assemble(builder, substitution, deltas, summed)


def _assemble(builder, substitution, deltas, summed):
    sub = substitution
    phase = builder.phase.xreplace(sub)
    dims = [d.xreplace(sub) for d in builder.dims]
    symbols = [s.xreplace(sub) for s in builder.symbols]
    sum_vars = {g for g, _, _ in summed}
    outer, inner = [], []
    for d in dims:
        (inner if d.free_symbols & sum_vars else outer).append(sqrt(2 * d + 1))
    inner_symbols, outer_symbols = [], []
    for s in symbols:
        (inner_symbols if s.free_symbols & sum_vars else outer_symbols).append(s)
    # the phase splits into a part with the summed momenta and one without
    exponent = phase.expand()
    inner_exp = Add(*[t for t in Add.make_args(exponent) if t.free_symbols & sum_vars])
    outer_exp = exponent - inner_exp
    body = _reduce_phase(inner_exp) * Mul(*inner) * Mul(*inner_symbols)
    if summed:
        limits = []
        for g, u, v in reversed(summed):
            u, v = u.xreplace(sub), v.xreplace(sub)
            limits.append((g, Abs(u - v), u + v))
        body = Sum(body, *limits)
    return _reduce_phase(outer_exp) * Mul(*deltas) * Mul(*outer) * Mul(*outer_symbols) * body


# -- transformation matrices for numeric momenta ------------------------------------------------

def tree_assignments(tree, total=None):
    """Every admissible set of intermediate values of a tree with numeric leaves, in a fixed order.

    Returns a list of ``{name: value}`` over the internal nodes (the total
    included), sorted by total and then by the intermediate values in the
    order of :attr:`CouplingTree.names`; with ``total`` given, only that total.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.coupling.recoupling import tree_assignments
    >>> t = coupling_tree("((a b) x, c) J", a="1/2", b="1/2", c="1/2")
    >>> [(d["x"], d["J"]) for d in tree_assignments(t)]
    [(1, 1/2), (0, 1/2), (1, 3/2)]
    """
    values = tree.values
    for label in tree.leaves:
        if not values[label].is_number:
            raise StateError(f"{label}={values[label]} must be a number to enumerate the couplings")

    def walk(node):
        if isinstance(node, str):
            return [({}, values[node])]
        out = []
        for left, a in walk(node[0]):
            for right, b in walk(node[1]):
                low, high = abs(a - b), a + b
                for k in range(int(high - low) + 1):
                    c = low + k
                    out.append(({**left, **right, node[2]: c}, c))
        return out

    names = [n for n in tree.names if n not in set(tree.leaves)]
    found = [d for d, top in walk(tree.structure) if total is None or top == total]
    return sorted(found, key=lambda d: (d[names[-1]], [-d[n] for n in names[:-1]]))


class RecouplingMatrix(NotationHooks, Printable):
    r"""The exact orthogonal matrix between two coupling schemes of numeric momenta, block by total.

    ``blocks`` maps each total momentum to ``(rows, columns, matrix)``: the
    rows are the intermediate values of the first tree, the columns those of
    the second (dicts, in the order of :func:`tree_assignments`), and
    ``matrix[r, c]`` is the recoupling coefficient :math:`\langle T_1, r | T_2, c\rangle`
    (independent of :math:`M`).  :meth:`is_orthogonal` checks
    :math:`U U^T = 1` exactly for every block.

    Examples
    ========

    Three spins 1/2, coupled as :math:`((a b) e, c) f` and as :math:`(a, (b c) g) f`:

    >>> from sympy import Rational, eye
    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.coupling.recoupling import recoupling_matrix
    >>> half = dict(a="1/2", b="1/2", c="1/2")
    >>> U = recoupling_matrix(coupling_tree("((a b) e, c) f", **half), coupling_tree("(a, (b c) g) f", **half))
    >>> list(U.blocks)
    [1/2, 3/2]
    >>> rows, columns, block = U.blocks[Rational(1, 2)]
    >>> rows
    [{'e': 1, 'f': 1/2}, {'e': 0, 'f': 1/2}]
    >>> block
    Matrix([
    [      1/2, sqrt(3)/2],
    [sqrt(3)/2,      -1/2]])

    Identity check: each block is orthogonal, :math:`U U^T = 1`:

    >>> U[Rational(1, 2)] * U[Rational(1, 2)].T == eye(2), U.is_orthogonal()
    (True, True)
    """

    _notation_key = "recoupling_matrix"

    def __init__(self, first, second, blocks):
        self.first, self.second, self.blocks = first, second, blocks

    def __getitem__(self, total):
        key = Rational(total)
        if key not in self.blocks:
            raise StateError(f"total={total} must be one of {list(self.blocks)}: no such states")
        return self.blocks[key][2]

    def is_orthogonal(self):
        return all(m * m.T == eye(m.shape[0]) for _, _, m in self.blocks.values())

    def __repr__(self):
        return self._sympystr(None)


def _evaluate(expr):
    """Exact value of a recoupling formula whose momenta are all numbers.

    Sums are unrolled here, summand by summand with numbers in place, so no
    coupling symbol is ever asked for a closed form in a summation variable
    (``Sum.doit`` would first try the summand symbolically).
    """
    if isinstance(expr, Sum):
        *inner, (var, low, high) = expr.limits
        body = Sum(expr.function, *inner) if inner else expr.function
        low, high = _evaluate(low), _evaluate(high)
        steps = high - low
        if not (steps.is_Integer and steps >= 0):
            return S.Zero if steps.is_negative else expr.doit()
        return Add(*[_evaluate(body.xreplace({var: low + k})) for k in range(int(steps) + 1)])
    if isinstance(expr, (Coupling6j, Coupling9j)):
        return expr.doit()
    if expr.args and not expr.is_Atom:
        return expr.func(*[_evaluate(a) for a in expr.args])
    return expr


def _generic(tree, tag):
    values = {n: (tree.value(n) if n in set(tree.leaves) else Symbol(f"{n}__{tag}")) for n in tree.names}
    return tree.with_values(values)


def recoupling_matrix(first, second, total=None, *, nine_j=True):
    r"""The transformation matrix between two coupling trees of numeric momenta, in total-momentum blocks.

    Explanation
    ===========

    Entries are :func:`recoupling_coefficient` evaluated at every admissible
    pair of intermediate values (:func:`tree_assignments`); the intermediate
    values given in the trees are ignored.  With ``total`` only that block is
    built.

    Examples
    ========

    LS to jj coupling of two p electrons, J = 1 (Condon-Shortley phases):

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.coupling.recoupling import recoupling_matrix
    >>> p = dict(l1=1, l2=1, s1="1/2", s2="1/2")
    >>> ls = coupling_tree("((l1 l2) L, (s1 s2) S) J", **p)
    >>> jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", **p)
    >>> U = recoupling_matrix(ls, jj, total=1)
    >>> U.is_orthogonal(), U[1].shape
    (True, (4, 4))
    """
    for tree in (first, second):
        if not isinstance(tree, CouplingTree):
            raise StateError(f"tree={tree!r} must be a CouplingTree (see coupling_tree)")
    generic_first, generic_second = _generic(first, 1), _generic(second, 2)
    formula = recoupling_coefficient(generic_first, generic_second, nine_j=nine_j)
    rows_all, cols_all = tree_assignments(first, total), tree_assignments(second, total)
    totals = sorted({d[first.total_name] for d in rows_all} | {d[second.total_name] for d in cols_all})
    blocks = {}
    for J in totals:
        rows = [d for d in rows_all if d[first.total_name] == J]
        cols = [d for d in cols_all if d[second.total_name] == J]
        entries = []
        for r in rows:
            row_values = {Symbol(f"{n}__1"): v for n, v in r.items()}
            partial = formula.xreplace(row_values)
            for c in cols:
                col_values = {Symbol(f"{n}__2"): v for n, v in c.items()}
                entries.append(_evaluate(partial.xreplace(col_values)))
        blocks[J] = (rows, cols, ImmutableMatrix(len(rows), len(cols), entries))
    return RecouplingMatrix(first, second, blocks)
