r"""Kets coupled in any coupling tree, their expansion into product kets and into other trees.

Explanation
===========

A :class:`TreeKet` is the state :math:`|T; M\rangle` of a
:class:`~amalgebra.coupling.trees.CouplingTree` ``T`` whose values are all
numbers, with total projection :math:`M`.  Every node couples its children
with Clebsch-Gordan coefficients (Condon-Shortley phases, real,
:math:`\langle j_1 j_1; j_2 (J-j_1)|J J\rangle > 0`):

.. math::

    |(A B) C, M\rangle = \sum_{m_A m_B} \langle A\, m_A\, B\, m_B|C\, M\rangle\, |A, m_A\rangle |B, m_B\rangle ,

recursively down to the leaves, whose labels are the labels of the product
kets (:mod:`amalgebra.states.kets`).  Tree kets enter every state-level
function through their product-ket expansion (``.doit()`` shows it):
:func:`~amalgebra.states.kets.inner`, :func:`~amalgebra.states.kets.tensor`
(products of kets and of linear combinations), operator action and matrix
elements.  :func:`recouple` rewrites any combination of kets in the basis of
another tree (exactly; the coefficients are the recoupling coefficients of
:mod:`amalgebra.coupling.recoupling`, or Clebsch-Gordan products for
product kets).  The chain kets of :mod:`amalgebra.states.coupled` are the
special case of a chain tree and share this expansion.

Examples
========

>>> from amalgebra.coupling.trees import coupling_tree
>>> from amalgebra.states.tree_kets import tree_ket, recouple
>>> from amalgebra.states.kets import inner
>>> p = dict(l1=1, l2=1, s1="1/2", s2="1/2")
>>> singlet_s = tree_ket(coupling_tree("((l1 l2) L, (s1 s2) S) J", p, L=0, S=0, J=0), 0)
>>> singlet_s
|((1_l1 1_l2)0_L, (1/2_s1 1/2_s2)0_S)0_J, 0>
>>> jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", p)
>>> recouple(singlet_s, jj)
sqrt(3)*|((1_l1 1/2_s1)1/2_j1, (1_l2 1/2_s2)1/2_j2)0_J, 0>/3 + sqrt(6)*|((1_l1 1/2_s1)3/2_j1, (1_l2 1/2_s2)3/2_j2)0_J, 0>/3
>>> inner(singlet_s.dual(), recouple(singlet_s, jj))
1

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 3 and 6.
"""

from functools import lru_cache

from sympy import Add, Expr, Rational, S

from ..coupling.recoupling import recoupling_coefficient, tree_assignments, _evaluate
from ..coupling.trees import CouplingTree, leaf_names
from ..errors import QuantumNumberError, StateError
from ..qnumbers import doubled, doubled_projection, quantum_number
from .kets import Ket, ProductKet, _DualState, _dual_pair, components, from_components

__all__ = ["TreeKet", "TreeBra", "tree_ket", "recouple", "tree_basis", "expand_doubled_tree"]


def _doubled_structure(structure, values):
    """The structure with every name replaced by (name, doubled value), for the cached expansion."""
    if isinstance(structure, str):
        return (structure, int(2 * values[structure]))
    return (_doubled_structure(structure[0], values), _doubled_structure(structure[1], values),
            int(2 * values[structure[2]]))


def _top(node):
    return node[1] if isinstance(node[0], str) else node[2]


@lru_cache(maxsize=4096)
def expand_doubled_tree(node, tm):
    """``{((label, tm), ...) sorted by leaf order: coefficient}`` of a coupled state (doubled inputs).

    ``node`` nests ``(left, right, 2C)`` with leaves ``(label, 2j)``; the keys
    list the leaves' doubled projections left to right.
    """
    from ..coupling import cg

    if isinstance(node[0], str):
        return {((node[0], tm),): S.One}
    left, right, tc = node
    ta, tb = _top(left), _top(right)
    out = {}
    for tma in range(-ta, ta + 1, 2):
        tmb = tm - tma
        if abs(tmb) > tb:
            continue
        c = cg(Rational(ta, 2), Rational(tma, 2), Rational(tb, 2), Rational(tmb, 2), Rational(tc, 2),
               Rational(tm, 2))
        if c == 0:
            continue
        for ka, ca in expand_doubled_tree(left, tma).items():
            for kb, cb in expand_doubled_tree(right, tmb).items():
                key = ka + kb
                out[key] = out.get(key, S.Zero) + c * ca * cb
    return {k: v for k, v in out.items() if v != 0}


class _TreeStateBase(_DualState, Expr):
    __slots__ = ()
    is_commutative = False
    _notation_key = "tree_state"

    def __new__(cls, tree, M):
        if not isinstance(tree, CouplingTree):
            raise StateError(f"tree={tree!r} must be a CouplingTree (see coupling_tree)")
        if not tree.is_numeric():
            symbolic = [n for n, v in tree.values.items() if not v.is_number]
            raise StateError(f"tree values {symbolic} must be numbers for a tree ket")
        M = quantum_number(M, "M")
        tj = doubled(tree.total, "total")
        tm = doubled_projection(tj, M, "M", "total")
        if abs(tm) > tj:
            raise QuantumNumberError(f"M={M} must be one of -{tree.total}..{tree.total}")
        return Expr.__new__(cls, tree, M)

    @property
    def tree(self):
        return self.args[0]

    @property
    def M(self):
        return self.args[1]

    @property
    def labels(self):
        """The leaf labels, in sorted order (the labels of the product kets)."""
        return tuple(sorted(self.tree.leaves))

    def _expansion(self):
        tree = self.tree
        values = tree.values
        raw = expand_doubled_tree(_doubled_structure(tree.structure, values), int(2 * self.M))
        out = {}
        for key, c in raw.items():
            kets = [Ket(values[lab], Rational(tm, 2), lab) for lab, tm in sorted(key)]
            out[ProductKet(*kets)] = c
        return out


class TreeKet(_TreeStateBase):
    r"""The ket :math:`|T; M\rangle` of a coupling tree with numeric values (see the module docstring).

    Args: ``(tree, M)``.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.states.tree_kets import TreeKet
    >>> k = TreeKet(coupling_tree("(a b) J", a="1/2", b="1/2", J=0), 0)
    >>> k.doit()
    -sqrt(2)*|1/2, -1/2>_a|1/2, 1/2>_b/2 + sqrt(2)*|1/2, 1/2>_a|1/2, -1/2>_b/2
    >>> k.func(*k.args) == k
    True
    """

    __slots__ = ()

    def doit(self, **hints):
        return from_components(self._expansion())

    def _as_product_kets(self):
        return self._expansion()


class TreeBra(_TreeStateBase):
    r"""The bra of a :class:`TreeKet` (the coefficients are real).

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.states.tree_kets import TreeBra
    >>> adjoint(TreeBra(coupling_tree("(a b) J", a=1, b=1, J=2), 1))
    |(1_a 1_b)2_J, 1>
    """

    __slots__ = ()

    def doit(self, **hints):
        return from_components({k.dual(): c for k, c in self._expansion().items()})

    def _as_product_bras(self):
        return {k.dual(): c for k, c in self._expansion().items()}


_dual_pair(TreeKet, TreeBra)


def tree_ket(tree, M):
    """The :class:`TreeKet` of a coupling tree with numeric values and projection ``M``.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.states.tree_kets import tree_ket
    >>> tree_ket(coupling_tree("((l s) j, I) F", l=1, s="1/2", j="3/2", I="1/2", F=2), 2).doit()
    |1/2, 1/2>_I|1, 1>_l|1/2, 1/2>_s
    """
    return TreeKet(tree, M)


def tree_basis(tree):
    """Every ket of a coupling scheme with numeric leaves: for each set of intermediate values
    (in the order of :func:`~amalgebra.coupling.recoupling.tree_assignments`), ``M`` from the
    total down.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.states.tree_kets import tree_basis
    >>> [str(k) for k in tree_basis(coupling_tree("(a b) J", a="1/2", b="1/2"))]
    ['|(1/2_a 1/2_b)0_J, 0>', '|(1/2_a 1/2_b)1_J, 1>', '|(1/2_a 1/2_b)1_J, 0>', '|(1/2_a 1/2_b)1_J, -1>']
    """
    out = []
    for values in tree_assignments(tree):
        t = tree.with_values(values)
        tj = int(2 * t.total)
        out += [TreeKet(t, Rational(tm, 2)) for tm in range(tj, -tj - 1, -2)]
    return out


def recouple(state, tree):
    r"""Rewrite a combination of kets in the basis of the coupling scheme ``tree``.

    Explanation
    ===========

    ``tree`` gives the scheme and the leaf values (its intermediate values are
    ignored).  Tree kets of another scheme go over with the exact recoupling
    coefficients (6j/9j formulas of :mod:`amalgebra.coupling.recoupling`);
    any other ket (product kets, chain kets) through its product-ket
    expansion and Clebsch-Gordan overlaps.  The result is exact.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.states.kets import ket, product_ket
    >>> from amalgebra.states.tree_kets import recouple
    >>> up_down = product_ket(ket("1/2", "1/2", "a"), ket("1/2", "-1/2", "b"))
    >>> recouple(up_down, coupling_tree("(a b) J", a="1/2", b="1/2"))
    sqrt(2)*|(1/2_a 1/2_b)0_J, 0>/2 + sqrt(2)*|(1/2_a 1/2_b)1_J, 0>/2
    """
    if not isinstance(tree, CouplingTree):
        raise StateError(f"tree={tree!r} must be a CouplingTree (see coupling_tree)")
    parts = {}
    for piece, coeff in _pieces(state):
        if isinstance(piece, TreeKet) and sorted(piece.tree.leaves) == sorted(tree.leaves):
            _from_tree(piece, coeff, tree, parts)
        else:
            _from_products(piece, coeff, tree, parts)
    return from_components({k: Add(*cs) for k, cs in parts.items() if Add(*cs) != 0})


def _pieces(state):
    """The terms of a combination, keeping tree kets whole."""
    terms = Add.make_args(state) if isinstance(state, Expr) else (state,)
    out = []
    for term in terms:
        if isinstance(term, TreeKet):
            out.append((term, S.One))
            continue
        if term.is_Mul:
            c, nc = term.args_cnc()
            if len(nc) == 1 and isinstance(nc[0], TreeKet):
                out.append((nc[0], term.func(*c)))
                continue
        out.append((term, None))
    return out


def _from_tree(source, coeff, tree, parts):
    for label in tree.leaves:
        if tree.value(label) != source.tree.value(label):
            raise StateError(f"{label}={source.tree.value(label)} in {source} must equal "
                             f"{label}={tree.value(label)} of the target scheme")
    for values in tree_assignments(tree, source.tree.total):
        target = tree.with_values(values)
        c = _evaluate(recoupling_coefficient(target, source.tree))
        if c != 0:
            parts.setdefault(TreeKet(target, source.M), []).append(coeff * c)


def _from_products(piece, coeff, tree, parts):
    expansion = components(piece)
    for product, c in expansion.items():
        factors = product.args if isinstance(product, ProductKet) else (product,)
        by_label = {f.label: f for f in factors}
        if sorted(by_label) != sorted(tree.leaves):
            raise StateError(f"state={product} must have the labels {sorted(tree.leaves)} of the scheme")
        for label, f in by_label.items():
            if f.j != tree.value(label):
                raise StateError(f"{label}: j={f.j} of the state must equal {tree.value(label)} of the scheme")
        if not all(f.m.is_number for f in factors):
            raise StateError(f"state={product} must have numeric m to be recoupled")
        tms = {lab: int(2 * f.m) for lab, f in by_label.items()}
        total_tm = sum(tms.values())
        key = tuple((lab, tms[lab]) for lab in leaf_names(tree.structure))
        for values in tree_assignments(tree):
            target = tree.with_values(values)
            if abs(total_tm) > 2 * target.total:
                continue
            raw = expand_doubled_tree(_doubled_structure(target.structure, target.values), total_tm)
            overlap = raw.get(key, S.Zero)
            if overlap != 0:
                parts.setdefault(TreeKet(target, Rational(total_tm, 2)), []).append(
                    (S.One if coeff is None else coeff) * c * overlap)
