r"""Tensor operators on part of a system, in any coupling tree: reduced and ordinary matrix elements.

Explanation
===========

A spherical tensor that acts on one momentum of a coupled system, or a
coupled product :math:`[A^{k_1} \times B^{k_2}]^K` of tensors acting on
different parts, has reduced matrix elements between the states of any
coupling tree (:mod:`amalgebra.coupling.trees`) that reduce, node by node from
the root, to 6j and 9j symbols times the reduced elements of the constituents
(Edmonds 1957 normalisation, eq. 5.4.1; :mod:`amalgebra.tensors.wigner_eckart`).  At a node
:math:`(j_1 j_2) J` (Edmonds eqs. 7.1.7, 7.1.8, 7.1.5; numbers from memory,
each formula checked against explicit matrices of the full product space in
``tests/tensors/test_tree_elements.py``):

* operator inside part 1, :math:`\delta` over part 2:
  :math:`(-1)^{j_1'+j_2+J+k}\sqrt{(2J+1)(2J'+1)}\{j_1' J' j_2; J j_1 k\}\langle j_1'\|T^k\|j_1\rangle`;
* operator inside part 2, :math:`\delta` over part 1:
  :math:`(-1)^{j_1+j_2+J'+k}\sqrt{(2J+1)(2J'+1)}\{j_2' J' j_1; J j_2 k\}\langle j_2'\|T^k\|j_2\rangle`;
* :math:`[A(1)\times B(2)]^K`:
  :math:`\sqrt{(2J+1)(2J'+1)(2K+1)}\{j_1' j_1 k_1; j_2' j_2 k_2; J' J K\}\langle j_1'\|A\|j_1\rangle\langle j_2'\|B\|j_2\rangle`,
  and :math:`[A(2)\times B(1)]^K = (-1)^{k_1+k_2-K}[B(1)\times A(2)]^K` (the factors commute).

The operators are described by the library's objects: a
:class:`~amalgebra.tensors.spherical.SphericalTensor` acting on a leaf (its
``label``), an :class:`~amalgebra.algebra.AngularMomentum` of a leaf or of an
intermediate momentum (its label names the node: the angular momentum of a
coupled part, :math:`\langle j\|J\|j\rangle = \sqrt{j(j+1)(2j+1)}`, diagonal in
everything inside), a :class:`~amalgebra.tensors.vectors.VectorOperator` of a
leaf (rank 1, reduced element a symbol), and :class:`CoupledTensorOperator`
for :math:`[A \times B]^K`; :func:`scalar_coupled` gives the scalar product
:math:`A\cdot B = \sum_q (-1)^q A_q B_{-q} = (-1)^k\sqrt{2k+1}\,[A\times B]^0`.
Linear combinations are given as a list of ``(coefficient, operator)`` pairs of
one rank.

Symbolic momenta give unevaluated 6j/9j symbols; numeric momenta give exact
numbers.

Examples
========

Fine structure: :math:`\mathbf{L}\cdot\mathbf{S}` in :math:`|(l s) j\rangle` is
:math:`[j(j+1) - l(l+1) - s(s+1)]/2`:

>>> from sympy import S
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.coupling.trees import coupling_tree
>>> from amalgebra.tensors.tree_elements import scalar_coupled, tree_matrix_element
>>> L, Sp = AngularMomentum("l"), AngularMomentum("s")
>>> t = coupling_tree("(l s) j", l=1, s="1/2", j="3/2")
>>> [tree_matrix_element(t.with_values(j=j), M, scalar_coupled(L, Sp), 0, t.with_values(j=j), M)
...  for j, M in ((S(3)/2, S(1)/2), (S(1)/2, S(1)/2))]
[1/2, -1]

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), section 7.1.
"""

from sympy import Basic, ImmutableMatrix, KroneckerDelta, Mul, Rational, S, sqrt

from ..algebra.operators import AngularMomentum
from ..coupling import ninej, sixj
from ..coupling.symbols import Coupling6j, Coupling9j
from ..coupling.trees import CouplingTree, leaf_names
from ..errors import TensorOperatorError
from ..notation import NotationHooks
from ..qnumbers import half_integer
from .wigner_eckart import wigner_eckart_factor
from .spherical import SphericalTensor
from .vectors import VectorOperator

__all__ = ["CoupledTensorOperator", "scalar_coupled", "tree_reduced_element", "tree_matrix_element",
           "tree_operator_blocks", "part_one_factor", "part_two_factor", "product_factor"]


class CoupledTensorOperator(NotationHooks, Basic):
    r"""The coupled tensor operator :math:`[A^{k_1} \times B^{k_2}]^K_Q = \sum \langle k_1 q_1 k_2 q_2|K Q\rangle A_{q_1} B_{q_2}`.

    Args ``(A, B, K)``; ``A`` and ``B`` are tensors of this module's kinds
    (see the module docstring).  A description for the tree reductions of
    :func:`tree_reduced_element`, not itself an operator expression.

    Examples
    ========

    >>> from amalgebra.tensors.spherical import SphericalTensor
    >>> from amalgebra.tensors.tree_elements import CoupledTensorOperator
    >>> X = CoupledTensorOperator(SphericalTensor("T", 1, "a"), SphericalTensor("U", 1, "b"), 2)
    >>> X, X.rank
    ([T^(1)[a] x U^(1)[b]]^(2), 2)
    """

    __slots__ = ()
    _notation_key = "coupled_tensor_operator"

    def __new__(cls, first, second, K):
        for part, name in ((first, "first"), (second, "second")):
            _rank(part, name)
        K = half_integer(K, "K", nonnegative=True)
        k1, k2 = _rank(first, "first"), _rank(second, "second")
        if not (abs(k1 - k2) <= K <= k1 + k2 and (k1 + k2 + K).is_integer):
            raise TensorOperatorError(f"K={K} must satisfy the triangle rule with the ranks {k1} and {k2}")
        return Basic.__new__(cls, first, second, K)

    first = property(lambda self: self.args[0])
    second = property(lambda self: self.args[1])
    rank = property(lambda self: self.args[2])


def _rank(op, name="operator"):
    if isinstance(op, SphericalTensor):
        return op.rank
    if isinstance(op, (AngularMomentum, VectorOperator)):
        return S.One
    if isinstance(op, CoupledTensorOperator):
        return op.rank
    raise TensorOperatorError(
        f"{name}={op!r} must be a SphericalTensor, AngularMomentum, VectorOperator or CoupledTensorOperator")


def scalar_coupled(first, second):
    r"""The scalar product :math:`A\cdot B = (-1)^k\sqrt{2k+1}\,[A\times B]^0` as ``[(coefficient, operator)]``.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors.tree_elements import scalar_coupled
    >>> scalar_coupled(AngularMomentum("I"), AngularMomentum("j"))
    [(-sqrt(3), [I x j]^(0))]
    """
    k1, k2 = _rank(first, "first"), _rank(second, "second")
    if k1 != k2:
        raise TensorOperatorError(f"ranks {k1} and {k2} must be equal for a scalar product")
    return [((-1) ** k1 * sqrt(2 * k1 + 1), CoupledTensorOperator(first, second, 0))]


def _label_of(op):
    return op.label


class _Scheme:
    """The bra and ket trees of one scheme, their values, and node lookups."""

    def __init__(self, bra, ket):
        for tree, name in ((bra, "bra"), (ket, "ket")):
            if not isinstance(tree, CouplingTree):
                raise TensorOperatorError(f"{name}={tree!r} must be a CouplingTree")
        if bra.structure != ket.structure:
            raise TensorOperatorError(f"bra {bra} and ket {ket} must be states of the same coupling scheme")
        self.structure = bra.structure
        self.vb, self.vk = bra.values, ket.values
        self.leaves = {}

        def walk(node):
            if isinstance(node, str):
                self.leaves[node] = frozenset((node,))
                return self.leaves[node]
            here = walk(node[0]) | walk(node[1])
            self.leaves[node[2]] = here
            return here

        walk(self.structure)

    def acts(self, op):
        if isinstance(op, CoupledTensorOperator):
            return self.acts(op.first) | self.acts(op.second)
        label = _label_of(op)
        if label not in self.leaves:
            raise TensorOperatorError(f"operator {op} acts on {label!r}, which must name a momentum of the "
                                      f"tree ({sorted(self.leaves)})")
        if len(self.leaves[label]) > 1 and not isinstance(op, AngularMomentum):
            raise TensorOperatorError(
                f"operator {op} acts on the coupled momentum {label!r}: only its angular momentum is diagonal "
                "inside; write the operator on the leaves it acts on")
        return self.leaves[label]

    def same_inside(self, node):
        """The Kronecker deltas making every value of a subtree equal in bra and ket."""
        deltas = []
        for name in _all_names(node):
            a, b = self.vb[name], self.vk[name]
            if a != b:
                deltas.append(KroneckerDelta(a, b))
        return Mul(*deltas)


def _all_names(node):
    if isinstance(node, str):
        return [node]
    return _all_names(node[0]) + _all_names(node[1]) + [node[2]]


def _name(node):
    return node if isinstance(node, str) else node[2]


def _numeric(*values):
    return all(S(v).is_number for v in values)


def _six(*args):
    return sixj(*args) if _numeric(*args) else Coupling6j(*args)


def _nine(*args):
    return ninej(*args) if _numeric(*args) else Coupling9j(*args)


def _phase(exponent):
    exponent = S(exponent)
    if exponent.is_Integer:
        return S.NegativeOne if int(exponent) % 2 else S.One
    return S.NegativeOne ** exponent


def _momentum_reduced(jp, j):
    return KroneckerDelta(jp, j) * sqrt(j * (j + 1) * (2 * j + 1))


def part_one_factor(j1p, j2, Jp, j1, J, k):
    r"""Edmonds eq. 7.1.7: :math:`(-1)^{j_1'+j_2+J+k}\sqrt{(2J+1)(2J'+1)}\{j_1' J' j_2; J j_1 k\}`.

    The factor of :math:`\langle j_1'\|T^k\|j_1\rangle` in
    :math:`\langle (j_1' j_2) J'\|T^k(1)\|(j_1 j_2) J\rangle`; numbers give an
    exact value, symbols an unevaluated 6j symbol.

    A scalar on part 1 is diagonal in :math:`J`, with the Edmonds factor
    :math:`\sqrt{(2J+1)/(2j_1+1)}`:

    >>> from sympy import sqrt
    >>> from amalgebra.tensors.tree_elements import part_one_factor
    >>> part_one_factor(1, "1/2", "3/2", 1, "3/2", 0) == sqrt(4) / sqrt(3) != 0
    True
    >>> part_one_factor(1, "1/2", "3/2", 1, "1/2", 0)
    0
    """
    j1p, j2, Jp, j1, J, k = (S(x) if not isinstance(x, str) else Rational(x) for x in (j1p, j2, Jp, j1, J, k))
    return _phase(j1p + j2 + J + k) * sqrt((2 * J + 1) * (2 * Jp + 1)) * _six(j1p, Jp, j2, J, j1, k)


def part_two_factor(j1, j2p, Jp, j2, J, k):
    r"""Edmonds eq. 7.1.8: :math:`(-1)^{j_1+j_2+J'+k}\sqrt{(2J+1)(2J'+1)}\{j_2' J' j_1; J j_2 k\}`.

    >>> from sympy import sqrt
    >>> from amalgebra.tensors.tree_elements import part_two_factor
    >>> part_two_factor(1, "1/2", "3/2", "1/2", "3/2", 0) == sqrt(4) / sqrt(2) != 0
    True
    """
    j1, j2p, Jp, j2, J, k = (S(x) if not isinstance(x, str) else Rational(x) for x in (j1, j2p, Jp, j2, J, k))
    return _phase(j1 + j2 + Jp + k) * sqrt((2 * J + 1) * (2 * Jp + 1)) * _six(j2p, Jp, j1, J, j2, k)


def product_factor(j1p, j1, k1, j2p, j2, k2, Jp, J, k):
    r"""Edmonds eq. 7.1.5: :math:`\sqrt{(2J+1)(2J'+1)(2k+1)}` times the 9j symbol of the arguments.

    >>> from amalgebra.tensors.tree_elements import product_factor
    >>> product_factor(1, 1, 0, 1, 1, 0, 0, 0, 0)   # two scalars: 1/3 from the 9j with a zero row
    1/3
    """
    args = [S(x) if not isinstance(x, str) else Rational(x) for x in (j1p, j1, k1, j2p, j2, k2, Jp, J, k)]
    return sqrt((2 * args[7] + 1) * (2 * args[6] + 1) * (2 * args[8] + 1)) * _nine(*args)


def _reduced(scheme, node, op):
    """:math:`\\langle node'\\|op\\|node\\rangle` (Edmonds normalisation)."""
    name = _name(node)
    zb, zk = scheme.vb[name], scheme.vk[name]
    if not isinstance(op, CoupledTensorOperator) and _label_of(op) == name:
        if isinstance(op, AngularMomentum):
            inside = scheme.same_inside(node[0]) * scheme.same_inside(node[1]) if not isinstance(node, str) else 1
            return inside * _momentum_reduced(zb, zk)
        if isinstance(op, VectorOperator):
            from .wigner_eckart import ReducedMatrixElement

            return ReducedMatrixElement(op.name, 1, zb, zk)
        return op.reduced(zb, zk)
    if isinstance(op, CoupledTensorOperator) and _same_space(op) == name:
        return _same_space_product(scheme, node, op, zb, zk)
    if isinstance(node, str):
        raise TensorOperatorError(f"operator {op} does not act on {name!r}")  # pragma: no cover - guarded
    left, right = node[0], node[1]
    a_b, a_k = scheme.vb[_name(left)], scheme.vk[_name(left)]
    b_b, b_k = scheme.vb[_name(right)], scheme.vk[_name(right)]
    where = scheme.acts(op)
    in_left, in_right = scheme.leaves[_name(left)], scheme.leaves[_name(right)]
    k = _rank(op)
    if where <= in_left:
        factor = part_one_factor(a_b, b_k, zb, a_k, zk, k)
        return scheme.same_inside(right) * factor * _reduced(scheme, left, op)
    if where <= in_right:
        factor = part_two_factor(a_k, b_b, zb, b_k, zk, k)
        return scheme.same_inside(left) * factor * _reduced(scheme, right, op)
    if isinstance(op, CoupledTensorOperator):
        first, second, sign = op.first, op.second, S.One
        if scheme.acts(first) <= in_right and scheme.acts(second) <= in_left:
            k1, k2 = _rank(first), _rank(second)
            first, second, sign = second, first, _phase(k1 + k2 - op.rank)
        if scheme.acts(first) <= in_left and scheme.acts(second) <= in_right:
            k1, k2, K = _rank(first), _rank(second), op.rank
            factor = product_factor(a_b, a_k, k1, b_b, b_k, k2, zb, zk, K)
            return sign * factor * _reduced(scheme, left, first) * _reduced(scheme, right, second)
    raise TensorOperatorError(
        f"operator {op} cannot be reduced in this tree: at the coupling {name!r} it acts on both parts "
        "without being a product of one operator on each part")


def _same_space(op):
    """The label both factors of a product of angular momenta act on, or None."""
    a, b = op.first, op.second
    if isinstance(a, AngularMomentum) and isinstance(b, AngularMomentum) and a.label == b.label:
        return a.label
    return None


def _same_space_product(scheme, node, op, zb, zk):
    # [J x J]^K of one angular momentum: Edmonds eq. 7.1.1 (from memory) with the only
    # intermediate state the ket itself, since J is diagonal in everything
    K = op.rank
    inside = scheme.same_inside(node[0]) * scheme.same_inside(node[1]) if not isinstance(node, str) else 1
    red = _momentum_reduced(zk, zk)
    return (inside * KroneckerDelta(zb, zk) * _phase(zb + K + zk) * sqrt(2 * K + 1)
            * _six(1, 1, K, zk, zb, zk) * red * red)


def _terms(operator):
    if isinstance(operator, (list, tuple)):
        terms = [(S(c), op) for c, op in operator]
    else:
        terms = [(S.One, operator)]
    ranks = {_rank(op) for _, op in terms}
    if len(ranks) != 1:
        raise TensorOperatorError(f"operator terms must share one rank, not {sorted(ranks)}")
    return terms, ranks.pop()


def tree_reduced_element(bra, operator, ket):
    r"""The reduced matrix element :math:`\langle T'\|X^k\|T\rangle` between two states of one coupling tree.

    Explanation
    ===========

    ``bra`` and ``ket`` are :class:`~amalgebra.coupling.trees.CouplingTree`
    objects of the same scheme (their values may differ); ``operator`` is one
    tensor of the kinds in the module docstring or a list of
    ``(coefficient, operator)`` pairs of one rank.  Edmonds normalisation:
    :math:`\langle j' m'|X^k_q|j m\rangle = (-1)^{j'-m'}(j' k j; -m' q m)\langle j'\|X^k\|j\rangle`.

    Examples
    ========

    A dipole operator on electron 1 of a jj-coupled pair (symbolic reduced element):

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.tensors.spherical import SphericalTensor
    >>> from amalgebra.tensors.tree_elements import tree_reduced_element
    >>> jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", l1=1, s1="1/2", j1="1/2", l2=0, s2="1/2",
    ...                    j2="1/2", J=1)
    >>> r = tree_reduced_element(jj.with_values(l1=2, j1="3/2", J=2), SphericalTensor("d", 1, "l1"), jj)
    >>> r
    sqrt(30)*<2||d^(1)||1>/6
    """
    scheme = _Scheme(bra, ket)
    terms, _ = _terms(operator)
    return sum((c * _reduced(scheme, scheme.structure, op) for c, op in terms), S.Zero)


def tree_matrix_element(bra, mp, operator, q, ket, m):
    r"""The matrix element :math:`\langle T' M'|X^k_q|T M\rangle` by the Wigner-Eckart theorem at the root.

    Edmonds normalisation (see :func:`tree_reduced_element`); ``mp``, ``q`` and
    ``m`` are the projections of the bra, the operator and the ket.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.tensors.tree_elements import scalar_coupled, tree_matrix_element
    >>> t = coupling_tree("((l s) j, I) F", l=0, s="1/2", j="1/2", I="1/2", F=1)
    >>> tree_matrix_element(t, 0, scalar_coupled(AngularMomentum("I"), AngularMomentum("j")), 0, t, 0)
    1/4
    """
    terms, k = _terms(operator)
    factor = wigner_eckart_factor(bra.total, mp, k, q, ket.total, m)
    if factor == 0:
        return S.Zero
    return factor * tree_reduced_element(bra, operator, ket)


def tree_operator_blocks(tree, operator):
    r"""The matrix of a scalar operator on every state of a coupling scheme, in blocks of the total.

    Explanation
    ===========

    ``tree`` fixes the scheme and the leaf values (numbers); every admissible
    set of intermediate values (:func:`~amalgebra.coupling.recoupling.tree_assignments`)
    is a basis state.  A scalar operator is diagonal in the total :math:`F` and
    :math:`M` and independent of :math:`M`, so the result maps each total to
    ``(states, matrix)``: the states as dicts of intermediate values (the
    total included), in the order of ``tree_assignments``, and the exact
    matrix :math:`\langle T'|X|T\rangle` (the same for every :math:`M`, which
    takes :math:`2F+1` values).

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.tensors.tree_elements import scalar_coupled, tree_operator_blocks
    >>> A = symbols("A")
    >>> t = coupling_tree("((l s) j, I) F", l=0, s="1/2", I="1/2")
    >>> blocks = tree_operator_blocks(t, [(A * c, op) for c, op in
    ...                                   scalar_coupled(AngularMomentum("I"), AngularMomentum("j"))])
    >>> {F: m for F, (states, m) in blocks.items()}
    {0: Matrix([[-3*A/4]]), 1: Matrix([[A/4]])}
    >>> type(blocks).__name__          # a dict that shows LaTeX in notebooks
    'TotalBlocks'
    """
    from ..coupling.recoupling import tree_assignments

    terms, k = _terms(operator)
    if k != 0:
        raise TensorOperatorError(f"operator of rank {k} must be a scalar (rank 0) for tree_operator_blocks")
    from ..results import TotalBlocks

    states = tree_assignments(tree)
    total = tree.total_name
    blocks = TotalBlocks()
    for F in sorted({d[total] for d in states}):
        members = [d for d in states if d[total] == F]
        trees = [tree.with_values(d) for d in members]
        root = sqrt(2 * F + 1)
        entries = [tree_reduced_element(b, operator, t) / root for b in trees for t in trees]
        blocks[F] = (members, ImmutableMatrix(len(members), len(members), entries))
    return blocks
