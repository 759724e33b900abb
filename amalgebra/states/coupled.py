r"""Coupled kets :math:`|((j_1 j_2) J_{12}\, j_3) J_{123} \dots J M\rangle` and changes of basis.

Explanation
===========

A :class:`CoupledKet` is a basis ket of the coupled scheme for numeric
:math:`j`: angular momenta with labels :math:`L_1, L_2, \dots` are coupled
*in the order given*, :math:`((j_1 j_2) J_{12}\, j_3) J_{123} \dots`, with
Clebsch-Gordan coefficients of :mod:`amalgebra.coupling` (Condon-Shortley:
real, :math:`\langle j_1 j_1; j_2 (J-j_1)|J J\rangle > 0`):

.. math::

    |(j_1 j_2) J M\rangle = \sum_{m_1 m_2} \langle j_1 m_1 j_2 m_2|J M\rangle
    |j_1 m_1\rangle_{L_1} |j_2 m_2\rangle_{L_2},

and recursively for more momenta.  The coupling order matters (swapping
:math:`j_1, j_2` costs :math:`(-1)^{j_1+j_2-J}`), so it is part of the object.
``.doit()`` (or :func:`to_uncoupled`) expands into product kets;
:func:`uncoupled_to_coupled` goes back; :func:`coupling_matrix` gives the
exact orthogonal change-of-basis matrix.

Kets, bras and inner products of :mod:`amalgebra.states.kets` and the
operator action of :mod:`amalgebra.states.action` accept coupled kets: they
are expanded on the way in.

A coupling that breaks the triangle rule, or :math:`|M| > J`, raises
:class:`~amalgebra.errors.QuantumNumberError`: there is no such state.

Examples
========

>>> from sympy import adjoint
>>> from amalgebra.states.coupled import coupled_ket, to_uncoupled, uncoupled_to_coupled
>>> from amalgebra.states.kets import ket, product_ket, inner
>>> singlet = coupled_ket("1/2", "1/2", 0, 0, labels=("A", "B"))
>>> singlet.doit()
-sqrt(2)*|1/2, -1/2>_A|1/2, 1/2>_B/2 + sqrt(2)*|1/2, 1/2>_A|1/2, -1/2>_B/2
>>> up_down = product_ket(ket("1/2", "1/2", "A"), ket("1/2", "-1/2", "B"))
>>> to_uncoupled(uncoupled_to_coupled(up_down, ("A", "B"))) == up_down
True
>>> inner(adjoint(singlet), singlet)
1

Parameters
==========

js : numeric angular momenta, in coupling order
intermediates : the intermediate couplings J12, J123, ... (n - 2 of them)
J, M : total angular momentum and projection
labels : the labels, in coupling order

See Also
========

amalgebra.coupling.cg, amalgebra.states.manyspin

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 3 (two momenta) and ch. 6 (three and more).
"""

from sympy import Add, Expr, Rational, S, Tuple, zeros

from ..errors import QuantumNumberError, StateError
from ..qnumbers import doubled, half_integer, triangle_doubled
from ..results import CouplingMatrix
from .kets import Ket, ProductKet, _DualState, _dual_pair, _label, components, from_components

__all__ = [
    "CoupledKet",
    "CoupledBra",
    "coupled_ket",
    "coupled_chain",
    "to_uncoupled",
    "uncoupled_to_coupled",
    "coupled_basis",
    "uncoupled_basis",
    "coupling_matrix",
    "coupling_paths",
    "clear_caches",
]


def _check_coupling(js2, inter2, tj, tm):
    chain = [js2[0], *inter2, tj]
    for k in range(1, len(js2)):
        a, b, c = chain[k - 1], js2[k], chain[k]
        if not triangle_doubled(a, b, c):
            raise QuantumNumberError(
                f"J={Rational(c, 2)} must satisfy the triangle rule with {Rational(a, 2)} and {Rational(b, 2)} "
                f"(|a-b| <= J <= a+b, a+b+J integer)")
    if abs(tm) > tj or (tj - tm) % 2:
        raise QuantumNumberError(f"M={Rational(tm, 2)} must be one of -J..J for J={Rational(tj, 2)}")


def _read(js, intermediates, J, M, labels):
    if len(js) < 2:
        raise StateError(f"js={list(js)} must hold at least two angular momenta to couple")
    if len(labels) != len(js):
        raise StateError(f"labels={list(labels)} must give one label per angular momentum in js={list(js)}")
    if len(intermediates) != len(js) - 2:
        raise StateError(f"intermediates={list(intermediates)} must hold {len(js) - 2} values for {len(js)} momenta")
    js2 = [doubled(j, f"j{i + 1}", nonnegative=True) for i, j in enumerate(js)]
    inter2 = [doubled(x, f"J{i + 1}", nonnegative=True) for i, x in enumerate(intermediates)]
    tj = doubled(J, "J", nonnegative=True)
    tm = doubled(M, "M")
    _check_coupling(js2, inter2, tj, tm)
    labs = [_label(lab) for lab in labels]
    if len({lab.name for lab in labs}) != len(labs):
        raise StateError(f"labels={list(labels)} must be distinct")
    return js2, inter2, tj, tm, labs


class _CoupledBase(_DualState, Expr):
    __slots__ = ()
    is_commutative = False
    _notation_key = "coupled"

    def __new__(cls, js, intermediates, J, M, labels):
        js2, inter2, tj, tm, labs = _read(tuple(js), tuple(intermediates), J, M, tuple(labels))
        return Expr.__new__(cls, Tuple(*[Rational(t, 2) for t in js2]),
                            Tuple(*[Rational(t, 2) for t in inter2]),
                            Rational(tj, 2), Rational(tm, 2), Tuple(*labs))

    @property
    def js(self):
        return tuple(self.args[0])

    @property
    def intermediates(self):
        return tuple(self.args[1])

    @property
    def J(self):
        return self.args[2]

    @property
    def M(self):
        return self.args[3]

    @property
    def labels(self):
        return tuple(lab.name for lab in self.args[4])



class CoupledKet(_CoupledBase):
    r"""The coupled basis ket :math:`|((j_1 j_2) J_{12}\, j_3) \dots J M\rangle` (numeric j).

    Args: ``(Tuple(js), Tuple(intermediates), J, M, Tuple(Str labels))``.

    Examples
    ========

    >>> k = CoupledKet((1, "1/2"), (), "3/2", "1/2", ("L", "S"))
    >>> k, k.func(*k.args) == k
    (|(1_L 1/2_S)3/2, 1/2>, True)
    """

    __slots__ = ()

    def doit(self, **hints):
        return to_uncoupled(self)

    def _as_product_kets(self):
        return _expansion(self)


class CoupledBra(_CoupledBase):
    r"""The bra of a :class:`CoupledKet` (CG coefficients are real, so the expansion is the same).

    >>> from sympy import adjoint
    >>> adjoint(CoupledBra((1, 1), (), 2, 0, ("A", "B")))
    |(1_A 1_B)2, 0>
    """

    __slots__ = ()

    def doit(self, **hints):
        return from_components({k.dual(): c for k, c in _expansion(self).items()})

    def _as_product_bras(self):
        return {k.dual(): c for k, c in _expansion(self).items()}


_dual_pair(CoupledKet, CoupledBra)


def coupled_ket(j1, j2, J, M, labels=("J", "S")):
    r"""The coupled ket :math:`|(j_1 j_2) J M\rangle` over two labels (numeric j).

    Examples
    ========

    >>> from amalgebra.states.kets import inner, ket, product_ket
    >>> k = coupled_ket(1, 1, 1, 0, labels=("A", "B"))
    >>> k.doit()
    -sqrt(2)*|1, -1>_A|1, 1>_B/2 + sqrt(2)*|1, 1>_A|1, -1>_B/2
    >>> inner(k.dual(), coupled_ket(1, 1, 2, 0, labels=("A", "B")))   # orthogonal
    0
    """
    return CoupledKet((j1, j2), (), J, M, labels)


def coupled_chain(js, intermediates, J, M, labels):
    """The ket coupled in the order ``(((j1 j2) J12 j3) J123 ...) J M``.

    Examples
    ========

    >>> k = coupled_chain(["1/2"] * 3, ["1"], "3/2", "3/2", ("a", "b", "c"))
    >>> k.doit()
    |1/2, 1/2>_a|1/2, 1/2>_b|1/2, 1/2>_c
    """
    return CoupledKet(js, intermediates, J, M, labels)


def _expand_doubled(js2, inter2, tj, tm):
    """{tuple of doubled m's: coefficient} of the coupled ket (doubled inputs).

    The chain is the coupling tree ``(((1 2) J12, 3) J123 ...) J``: the expansion
    is the one of :func:`amalgebra.states.tree_kets.expand_doubled_tree`.
    """
    from .tree_kets import expand_doubled_tree

    tops = [*inter2, tj]
    node = ("0", js2[0])
    for k in range(1, len(js2)):
        node = (node, (str(k), js2[k]), tops[k - 1])
    if len(js2) == 1:
        return {(tm,): S.One}
    return {tuple(t for _, t in key): c for key, c in expand_doubled_tree(node, tm).items()}


def _expansion(coupled):
    js2 = tuple(int(2 * j) for j in coupled.js)
    inter2 = tuple(int(2 * j) for j in coupled.intermediates)
    raw = _expand_doubled(js2, inter2, int(2 * coupled.J), int(2 * coupled.M))
    labels = coupled.labels
    out = {}
    for ms, c in raw.items():
        kets = [Ket(Rational(t, 2), Rational(m, 2), lab) for t, m, lab in zip(js2, ms, labels)]
        out[ProductKet(*kets)] = c
    return out


def to_uncoupled(state):
    """Expand every coupled ket of a state into product kets.

    Examples
    ========

    >>> to_uncoupled(coupled_ket("1/2", "1/2", 1, 1, labels=("A", "B")))
    |1/2, 1/2>_A|1/2, 1/2>_B
    """
    return from_components(components(state))


def coupling_paths(js, J=None):
    """All intermediate couplings ``(J12, J123, ...)`` with their final J, in a fixed order.

    Returns a list of ``(intermediates, J)`` tuples, sorted; with ``J`` given
    only that total.

    >>> coupling_paths(["1/2", "1/2", "1/2"])
    [((0,), 1/2), ((1,), 1/2), ((1,), 3/2)]
    """
    js2 = [doubled(j, f"j{i + 1}", nonnegative=True) for i, j in enumerate(js)]
    paths = [((), js2[0])]
    for t in js2[1:]:
        nxt = []
        for inter, cur in paths:
            for tn in range(abs(cur - t), cur + t + 1, 2):
                nxt.append((inter + (cur,), tn))
        paths = nxt
    out = []
    for inter, tj in paths:
        inter = inter[1:]  # the first entry is j1 itself
        if J is None or tj == doubled(J, "J", nonnegative=True):
            out.append((tuple(Rational(x, 2) for x in inter), Rational(tj, 2)))
    return sorted(out)


def coupled_basis(js, labels):
    """The coupled basis in the order of ``labels``: for each coupling path
    (sorted), ``M = J, J-1, ..., -J``.

    >>> [str(k) for k in coupled_basis(["1/2", "1/2"], ("A", "B"))]
    ['|(1/2_A 1/2_B)0, 0>', '|(1/2_A 1/2_B)1, 1>', '|(1/2_A 1/2_B)1, 0>', '|(1/2_A 1/2_B)1, -1>']
    """
    out = []
    for inter, J in coupling_paths(js):
        tj = int(2 * J)
        for tm in range(tj, -tj - 1, -2):
            out.append(CoupledKet(js, inter, J, Rational(tm, 2), labels))
    return out


def uncoupled_basis(js, labels):
    """Product kets in Kronecker order: the first label is the slowest index, m from j down to -j.

    >>> [str(k) for k in uncoupled_basis([1, "1/2"], ("L", "S"))][:2]
    ['|1, 1>_L|1/2, 1/2>_S', '|1, 1>_L|1/2, -1/2>_S']
    """
    if len(js) != len(labels):
        raise StateError(f"labels={list(labels)} must give one label per angular momentum in js={list(js)}")
    js = [half_integer(j, f"j{i + 1}", nonnegative=True) for i, j in enumerate(js)]
    states = [()]
    for j, lab in zip(js, labels):
        tj = int(2 * j)
        states = [s + (Ket(j, Rational(tm, 2), lab),) for s in states for tm in range(tj, -tj - 1, -2)]
    return [ProductKet(*s) for s in states]


def coupling_matrix(js, labels):
    r"""The exact change of basis ``U[i, k] = <uncoupled_i | coupled_k>``.

    Returns ``(U, uncoupled, coupled)`` with the bases of :func:`uncoupled_basis`
    and :func:`coupled_basis`.  ``U`` is real orthogonal.

    Examples
    ========

    >>> from sympy import eye
    >>> U, unc, cpl = coupling_matrix([1, "1/2"], ("L", "S"))
    >>> U.T * U == eye(6) != U
    True
    """
    unc = uncoupled_basis(js, labels)
    cpl = coupled_basis(js, labels)
    index = {k: i for i, k in enumerate(unc)}
    U = zeros(len(unc), len(cpl))
    for col, k in enumerate(cpl):
        for basis, c in k._as_product_kets().items():
            U[index[basis], col] = c
    return CouplingMatrix((U, unc, cpl))  # a tuple that displays as LaTeX in notebooks


def uncoupled_to_coupled(state, labels=None):
    r"""Rewrite a combination of product kets in the coupled basis of the order ``labels``.

    Explanation
    ===========

    Uses :math:`|m_1\rangle|m_2\rangle\cdots = \sum \prod \langle \dots|J_{12} M_{12}\rangle
    \cdots |(\dots) J M\rangle`, the transpose of the (real orthogonal)
    expansion.  ``labels`` defaults to the (sorted) labels of the product kets.

    Examples
    ========

    >>> from amalgebra.states.kets import ket, product_ket
    >>> uncoupled_to_coupled(product_ket(ket("1/2", "1/2", "A"), ket("1/2", "-1/2", "B")))
    sqrt(2)*|(1/2_A 1/2_B)0, 0>/2 + sqrt(2)*|(1/2_A 1/2_B)1, 0>/2
    """
    parts = {}
    for basis, coeff in components(state).items():
        factors = basis.args if isinstance(basis, ProductKet) else (basis,)
        fm = {f.label: f for f in factors}
        order = tuple(labels) if labels is not None else tuple(f.label for f in factors)
        if sorted(order) != sorted(fm):
            raise StateError(f"labels={list(order)} must be the labels {sorted(fm)} of the state")
        js = [fm[lab].j for lab in order]
        ms = [fm[lab].m for lab in order]
        if not all(x.is_Rational for x in js + ms):
            raise StateError(f"state={basis} must have numeric j and m to be recoupled")
        key = tuple(int(2 * m) for m in ms)
        tm_total = sum(key)
        for inter, J in coupling_paths(js):
            if abs(tm_total) > 2 * J:
                continue
            ck = CoupledKet(js, inter, J, Rational(tm_total, 2), order)
            c = _expansion_doubled(ck).get(key, S.Zero)
            if c != 0:
                parts.setdefault(ck, []).append(coeff * c)
    return Add(*[Add(*cs) * k for k, cs in parts.items() if Add(*cs) != 0])


def _expansion_doubled(ck):
    js2 = tuple(int(2 * j) for j in ck.js)
    inter2 = tuple(int(2 * j) for j in ck.intermediates)
    return _expand_doubled(js2, inter2, int(2 * ck.J), int(2 * ck.M))


def clear_caches():
    """Empty the CG and expansion caches of this module.

    >>> clear_caches()
    """
    from .tree_kets import expand_doubled_tree

    expand_doubled_tree.cache_clear()
