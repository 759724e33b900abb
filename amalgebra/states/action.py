r"""Operators acting on kets, and matrix elements in closed form.

Explanation
===========

:func:`apply` applies any polynomial in the angular-momentum components
(canonical or not; sums, products, integer powers, scalar coefficients) to a
ket or a linear combination of kets; :func:`matrix_element` returns
:math:`\langle\phi|O|\psi\rangle`.  Both go through the action form of the
operator (:mod:`amalgebra.states.actionform`), computed once per operator and
label set, so the result for symbolic :math:`j, m` is a polynomial times the
Condon-Shortley square roots

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

Identity check, :math:`J^2 = J_z^2 + (J_+J_- + J_-J_+)/2`:

>>> lhs = apply(J.squared, ket(j, m))
>>> rhs = apply(J.z**2 + (J.plus*J.minus + J.minus*J.plus)/2, ket(j, m))
>>> (lhs - rhs).expand() == 0 != lhs
True

Parameters
==========

op : SymPy expression built from ``AngularMomentum(label)`` components and scalars
state : a ket, product ket or linear combination of them

See Also
========

amalgebra.states.kets, amalgebra.states.hamiltonian.hamiltonian_matrix

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 2.
.. [2] J. J. Sakurai, *Modern Quantum Mechanics* (rev. ed., 1994), sec. 3.5.
"""

from sympy import Add, And, KroneckerDelta, Mul, Piecewise, S, adjoint

from ..errors import StateError
from .kets import Bra, Ket, ProductBra, ProductKet, _factor_map, _label_key, components
from .actionform import action_form

__all__ = ["apply", "matrix_element", "expectation"]


def _basis_values(basis):
    """Sorted labels and ``{label: (j, m)}`` of a basis ket or bra."""
    fm = _factor_map(basis)
    return tuple(sorted(fm, key=_label_key)), fm


def _target(labels, values, shift):
    kets = [Ket(values[lab][0], values[lab][1] + d, lab) if d else Ket._unchecked(*values[lab], lab)
            for lab, d in zip(labels, shift)]
    if len(kets) == 1:
        return kets[0]
    return ProductKet._unchecked(kets)


def apply(op, state):
    r"""Apply the operator ``op`` to a ket or a linear combination of kets.

    Explanation
    ===========

    Each basis ket contributes :math:`\sum_d c_d N_d |j, m+d\rangle` (see the
    module docstring); kets outside the range of a numeric ``j`` are never
    produced (their amplitude is an exact zero).  The operator must act only
    on labels the ket carries, otherwise :class:`~amalgebra.errors.OperatorError`.

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
    """
    parts = {}
    for basis, coeff in components(state).items():
        labels, values = _basis_values(basis)
        form = action_form(op, labels)
        for shift, amp in form.closed_form(values).items():
            parts.setdefault(_target(labels, values, shift), []).append(coeff * amp)
    terms = []
    for basis, cs in parts.items():
        c = Add(*cs)
        if c != 0:
            terms.append(c * basis)
    return Add(*terms)


def _range_conditions(values):
    conds = []
    for j, m in values:
        for rel in (-j <= m, m <= j):
            if rel is S.false:
                return None
            if rel is not S.true:
                conds.append(rel)
    return conds


def _element(b, op, k, conditions):
    bl, bv = _basis_values(b)
    kl, kv = _basis_values(k)
    if bl != kl:
        raise StateError(f"bra={b} and ket={k} must carry the same labels, got {list(bl)} and {list(kl)}")
    form = action_form(op, kl)
    numeric = all(v.is_Rational for lab in kl for v in (*bv[lab], *kv[lab]))
    if numeric:
        if any(bv[lab][0] != kv[lab][0] for lab in kl):
            return S.Zero
        shift = tuple(bv[lab][1] - kv[lab][1] for lab in kl)
        if not all(d.is_Integer for d in shift):
            return S.Zero
        return form.amplitude(tuple(int(d) for d in shift), kv)
    terms = []
    for shift, amp in form.closed_form(kv).items():
        deltas = [KroneckerDelta(bv[lab][0], kv[lab][0]) * KroneckerDelta(bv[lab][1], kv[lab][1] + d)
                  for lab, d in zip(kl, shift)]
        terms.append(Mul(amp, *deltas))
    value = Add(*terms)
    if not conditions or value == 0:
        return value
    conds = _range_conditions([kv[lab] for lab in kl] + [bv[lab] for lab in kl])
    if conds is None:
        return S.Zero
    if not conds:
        return value
    return Piecewise((value, And(*conds)), (S.Zero, True))


def matrix_element(bra_state, op, ket_state, *, conditions=True):
    r"""The matrix element :math:`\langle\phi|O|\psi\rangle` in closed form.

    Explanation
    ===========

    ``bra_state`` is a bra or combination of bras (``sympy.adjoint`` of a ket
    combination; a ket given here is turned into its bra).  For numeric quantum
    numbers the value is exact.  For symbolic ones it is a sum over the shifts
    ``d`` of the operator of ``KroneckerDelta(m', m + d)`` times the closed
    form, wrapped in ``Piecewise((..., -j <= m <= j & -j <= m' <= j), (0, True))``
    unless the range is decided by assumptions or ``conditions=False``.

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
    if isinstance(bra_state, (Ket, ProductKet)) or not _bra_like(bra_state):
        bra_state = adjoint(bra_state)
    bras = components(bra_state, (Bra, ProductBra), "bra")
    kets = components(ket_state)
    terms = [cb * ck * _element(b, op, k, conditions)
             for b, cb in bras.items() for k, ck in kets.items()]
    return Add(*terms)


def _bra_like(state):
    try:
        components(state, (Bra, ProductBra), "bra")
    except StateError:
        return False
    return True


def expectation(op, state):
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

    num = matrix_element(adjoint(state), op, state, conditions=False)
    den = inner(adjoint(state), state)
    if den == 0:
        raise StateError(f"state={state} must be nonzero")
    return (num / den).expand() if den != 1 else num.expand()
