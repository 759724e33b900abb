r"""Operators acting on kets, and matrix elements in closed form.

Explanation
===========

:func:`apply` applies any operator that :func:`~amalgebra.algebra.canonical`
accepts (angular-momentum components of any number of labels, spherical
tensor and vector operator components, products, sums, integer powers,
symbolic coefficients) to a ket, a product ket, a coupled ket or a linear
combination of them, and a boson polynomial to Fock kets;
:func:`matrix_element` returns :math:`\langle\phi|O|\psi\rangle`,
:func:`expectation` the normalised expectation value.  All go through the one
engine, :mod:`amalgebra.states.engine` (normal form once per operator and label
set; tensor components by the Wigner-Eckart theorem, Edmonds normalisation by
default, ``convention="cg"`` for the Clebsch-Gordan form; ``reduced=`` gives
reduced elements), so the result for symbolic :math:`j, m` of an
angular-momentum polynomial is a polynomial times the Condon-Shortley square
roots

.. math::

    \langle j, m+d|O|j\,m\rangle = c_d(j, m) \prod_{k=0}^{d-1}\sqrt{(j-m-k)(j+m+k+1)}

(for :math:`d < 0` the factors of :math:`J_-`).  Convention: :math:`\hbar = 1`,
:math:`J_\pm|j m\rangle = \sqrt{(j\mp m)(j\pm m+1)}\,|j, m\pm 1\rangle`.

Range of validity.  For numeric :math:`j` the result is exact, and an
amplitude into a state with :math:`|m| > j` is an exact zero (the ket is never
built).  For symbolic :math:`j` or :math:`m` the closed form holds for valid
kets, :math:`-j \le m \le j` and :math:`-j \le m' \le j`;
:func:`matrix_element` therefore returns
``Piecewise((closed_form, conditions), (0, True))`` with the conditions that
SymPy cannot decide from the symbols' assumptions (pass ``conditions=False``
for the bare closed form).  Different bra and ket projections or :math:`j`
values stay visible as ``KroneckerDelta``.

Examples
========

>>> from sympy import Symbol, sqrt
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.states.kets import ket, bra
>>> from amalgebra.states.action import apply, matrix_element
>>> J = AngularMomentum("J")
>>> apply(J.plus, ket(1, 0))
sqrt(2)*|1, 1>_J
>>> apply(J.plus, ket(1, 1))
0
>>> j, m = Symbol("j", nonnegative=True), Symbol("m")
>>> apply(J.minus, ket(j, m))
sqrt(j + m)*sqrt(j - m + 1)*|j, m - 1>_J
>>> matrix_element(bra(j, m + 1), J.x, ket(j, m), conditions=False)
sqrt(j - m)*sqrt(j + m + 1)/2

A Stark-type element by the Wigner-Eckart theorem, :math:`\langle 1 0|C^1_0|0 0\rangle = 1/\sqrt 3`
(Racah tensor, Edmonds normalisation):

>>> from amalgebra.tensors import racah_tensor
>>> C1 = racah_tensor(1)
>>> matrix_element(bra(1, 0, "L"), C1[0], ket(0, 0, "L"))
sqrt(3)/3

Identity check, :math:`J^2 = J_z^2 + (J_+J_- + J_-J_+)/2`:

>>> lhs = apply(J.squared, ket(j, m))
>>> rhs = apply(J.z**2 + (J.plus*J.minus + J.minus*J.plus)/2, ket(j, m))
>>> (lhs - rhs).expand() == 0 != lhs
True

Parameters
==========

op : SymPy expression in angular-momentum, tensor and vector components (or boson operators) and scalars
state : a ket, product ket, coupled ket, Fock ket or linear combination of them
reduced : dict, optional
    ``{family: {(j', j): value}}`` or ``{family: callable(j', j)}`` for tensor
    or vector families (as in :func:`amalgebra.matrices.explicit.to_matrix`)
convention : {"edmonds", "cg"}
    normalisation of the reduced elements

See Also
========

amalgebra.states.kets, amalgebra.states.hamiltonian.hamiltonian_matrix

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 2.
.. [2] J. J. Sakurai, *Modern Quantum Mechanics* (rev. ed., 1994), sec. 3.5.
"""

from sympy import Add, And, KroneckerDelta, Mul, Piecewise, S, adjoint

from .._exact import exact_sum
from ..errors import StateError
from .engine import compile_operator
from .actionform import slots
from .kets import _MODE_STATES, Ket, _factor_map, _mode_map, _product_state, components

__all__ = ["apply", "matrix_element", "expectation"]


def _basis_values(basis):
    """``(labels, modes, values)`` of a basis ket or bra: its ``|j m>`` labels, its boson modes, and the
    engine's values, ``(j, m)`` per label then ``(0, n)`` per mode (the order of ``slots``)."""
    fm, nm = _factor_map(basis), _mode_map(basis)
    if not nm:      # |j m> factors only: already in label order (product kets sort their factors)
        return tuple(fm), (), tuple(fm.values())
    names, where = slots(fm, nm)
    values = tuple(fm[name] if i not in where else (S.Zero, nm[name]) for i, name in enumerate(names))
    return tuple(fm), tuple(nm), values


def _target(labels, modes, values):
    """The basis ket of engine ``values`` (``|j m>`` factors, then one Fock factor)."""
    names, where = slots(labels, modes)
    kets = [Ket._unchecked(j, m, lab) for i, (lab, (j, m)) in enumerate(zip(names, values)) if i not in where]
    fock = None
    if where:   # a mode value exists only once a Fock ket did, so the Fock class is declared
        fock = _MODE_STATES[Ket]._unchecked(tuple(names[i] for i in where), tuple(values[i][1] for i in where))
    return _product_state(kets, fock)


def apply(op, state, *, reduced=None, convention="edmonds"):
    r"""Apply the operator ``op`` to a ket or a linear combination of kets.

    Explanation
    ===========

    Each basis ket contributes the targets of :mod:`amalgebra.states.engine`;
    kets outside the range of a numeric ``j`` are never produced (their
    amplitude is an exact zero).  Coupled kets enter through their product-ket
    expansion, so the result is in the product basis.  The operator must act
    only on labels the ket carries, otherwise
    :class:`~amalgebra.errors.OperatorError`; a tensor component acts on the
    ket factor of its label.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states.kets import ket, product_ket
    >>> L, S = AngularMomentum("L"), AngularMomentum("S")
    >>> k = product_ket(ket(1, 0, "L"), ket("1/2", "1/2", "S"))
    >>> apply(L.minus * S.plus, k)
    0
    >>> apply(L.plus * S.minus, k)
    sqrt(2)*|1, 1>_L|1/2, -1/2>_S
    >>> from amalgebra.tensors import SphericalTensor
    >>> T = SphericalTensor("T", 1, "S")
    >>> apply(T[1], ket("1/2", "-1/2", "S"), reduced={T: {("1/2", "1/2"): 1}})   # only j' = 1/2 given
    -sqrt(3)*|1/2, 1/2>_S/3
    """
    table = _reduced_table(reduced)
    parts = {}
    for basis, coeff in components(state).items():
        labels, modes, start = _basis_values(basis)
        compiled = compile_operator(op, labels, modes)
        for target, amp in compiled.act({start: S.One}, table, convention).items():
            parts.setdefault(_target(labels, modes, target), []).append(coeff * amp)
    terms = []
    for basis, cs in parts.items():
        c = Add(*cs)
        if c != 0:
            terms.append(c * basis)
    return Add(*terms)


def _reduced_table(reduced):
    if reduced is None:
        return None
    from .engine import check_reduced

    return check_reduced(reduced)


def _range_conditions(values):
    """``-j <= m <= j`` per |j m> value that SymPy cannot decide; None when one is false."""
    conds = []
    for j, m in values:
        for rel in (-j <= m, m <= j):
            if rel is S.false:
                return None
            if rel is not S.true:
                conds.append(rel)
    return conds


def _element(b, op, k, conditions, table, convention):
    bl, bm, goal = _basis_values(b)
    kl, km, start = _basis_values(k)
    if (bl, bm) != (kl, km):
        raise StateError(f"bra={b} and ket={k} must carry the same labels, got {list(bl) + list(bm)} and "
                         f"{list(kl) + list(km)}")
    compiled = compile_operator(op, kl, km)
    numeric = all(v.is_Rational for pair in start + goal for v in pair)
    if numeric:
        return compiled.element(goal, start, table, convention)
    terms = []
    for target, amp in compiled.act({start: S.One}, table, convention).items():
        deltas = [KroneckerDelta(g[0], t[0]) * KroneckerDelta(g[1], t[1]) for g, t in zip(goal, target)]
        terms.append(Mul(amp, *deltas))
    value = Add(*terms)
    if not conditions or value == 0:
        return value
    am = [i for i in range(len(start)) if i not in compiled.modes]
    conds = _range_conditions([start[i] for i in am] + [goal[i] for i in am])
    if conds is None:
        return S.Zero
    if not conds:
        return value
    return Piecewise((value, And(*conds)), (S.Zero, True))


def matrix_element(bra_state, op, ket_state, *, conditions=True, reduced=None, convention="edmonds"):
    r"""The matrix element :math:`\langle\phi|O|\psi\rangle` in closed form.

    Explanation
    ===========

    ``bra_state`` is a bra or combination of bras (``sympy.adjoint`` of a ket
    combination; a ket given here is turned into its bra).  For numeric quantum
    numbers the value is exact.  For symbolic ones it is a sum over the targets
    of the operator of ``KroneckerDelta(j', j_target) KroneckerDelta(m', m_target)``
    times the closed form, wrapped in
    ``Piecewise((..., -j <= m <= j & -j <= m' <= j), (0, True))``
    unless the range is decided by assumptions or ``conditions=False``.
    Tensor components: see :func:`apply` (``reduced``, ``convention``).

    Examples
    ========

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states.kets import ket, bra
    >>> J = AngularMomentum("J")
    >>> matrix_element(bra(2, 1), J.plus, ket(2, 0))
    sqrt(6)
    >>> j, m, n = Symbol("j"), Symbol("m"), Symbol("n")
    >>> matrix_element(bra(j, n), J.z, ket(j, m))
    Piecewise((m*KroneckerDelta(m, n), (j >= m) & (j >= n) & (j >= -m) & (j >= -n)), (0, True))

    See Also
    ========

    apply, expectation
    """
    if not _bra_like(bra_state):
        bra_state = adjoint(bra_state)
    table = _reduced_table(reduced)
    bras = components(bra_state, "bra", "bra")
    kets = components(ket_state)
    terms = [cb * ck * _element(b, op, k, conditions, table, convention)
             for b, cb in bras.items() for k, ck in kets.items()]
    return exact_sum(terms)


def _bra_like(state):
    try:
        components(state, "bra", "bra")
    except StateError:
        return False
    return True


def expectation(op, state, *, reduced=None, convention="edmonds"):
    r"""The expectation value :math:`\langle\psi|O|\psi\rangle / \langle\psi|\psi\rangle`.

    Examples
    ========

    >>> from sympy import sqrt
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.states.kets import ket
    >>> J = AngularMomentum("J")
    >>> expectation(J.x, (ket("1/2", "1/2") + ket("1/2", "-1/2")) / sqrt(2))
    1/2
    """
    from .kets import inner

    num = matrix_element(adjoint(state), op, state, conditions=False, reduced=reduced, convention=convention)
    den = inner(adjoint(state), state)
    if den == 0:
        raise StateError(f"state={state} must be nonzero")
    return (num / den).expand() if den != 1 else num.expand()
