r"""Many spin-1/2: total-spin eigenstates by successive coupling, multiplet counts, correlations.

Explanation
===========

:math:`n` spins 1/2 with labels ``s1, ..., sn`` are coupled in order,
:math:`(((s_1 s_2) S_{12}\, s_3) S_{123} \dots) S M`, with Condon-Shortley
Clebsch-Gordan coefficients (the Yamanouchi-Kotani genealogical basis).  Each
sequence of intermediate spins is a path in the branching diagram; the number
of paths ending at total spin :math:`S` is the number of multiplets
:math:`f(n, S)`, counted here by the reflection principle,
:math:`\binom{n}{n/2-S} - \binom{n}{n/2-S-1}` (the closed formula
:math:`(2S+1)\, n! / ((n/2+S+1)!\,(n/2-S)!)` and a walk over the diagram are what the
tests compare with).  Only the paths asked for are walked.

Spin operators along an axis use Pauli matrices :math:`\sigma = 2 S`:
:math:`\sigma_{\hat n} = 2(\sin\theta\cos\phi\, S_x + \sin\theta\sin\phi\, S_y + \cos\theta\, S_z)`.

Examples
========

>>> from sympy import Symbol, simplify, cos
>>> from amalgebra.states.manyspin import multiplet_count, singlet, correlation
>>> [multiplet_count(4, S) for S in (0, 1, 2)]
[2, 3, 1]
>>> a, b = Symbol("a", real=True), Symbol("b", real=True)
>>> simplify(correlation(singlet(), ("A", a), ("B", b)) + cos(a - b))   # <sigma_a sigma_b> = -cos(a - b)
0

Parameters
==========

n : number of spins 1/2
S, M : total spin and its projection

See Also
========

amalgebra.states.coupled.coupled_chain

References
==========

.. [1] R. Pauncz, *Spin Eigenfunctions: Construction and Use* (Plenum, 1979), ch. 2 (branching diagram).
.. [2] J. S. Bell, Physics 1, 195 (1964); J. F. Clauser, M. A. Horne, A. Shimony, R. A. Holt,
   Phys. Rev. Lett. 23, 880 (1969).
"""

from fractions import Fraction
from math import comb

from sympy import Add, Rational, cos, sin

from ..errors import QuantumNumberError, StateError
from ..limits import check_limit, show_number
from ..qnumbers import doubled
from .action import expectation
from .coupled import CoupledKet, coupling_paths, coupled_ket, to_uncoupled

__all__ = [
    "spin_labels",
    "multiplet_count",
    "total_spin_states",
    "singlet",
    "spin_along",
    "correlation",
    "chsh",
    "total_spin_squared",
]

_HALF = Rational(1, 2)


def spin_labels(n, stem="s"):
    """The labels ``(stem1, ..., stemn)``.

    >>> spin_labels(3)
    ('s1', 's2', 's3')
    """
    _check_n(n)
    return tuple(f"{stem}{k}" for k in range(1, n + 1))


def _check_n(n):
    if isinstance(n, bool) or not isinstance(n, int) or n < 1:
        raise QuantumNumberError(f"n={n!r} must be a positive int")
    # before any work: n spins reach total spin n/2, and the states number 2^n
    check_limit("max_j", Fraction(n, 2), "n/2", f"n={show_number(n)} spins 1/2 reach total spin n/2")


def _count(n, target):
    """Branching-diagram paths of ``n`` spins 1/2 to doubled total spin ``target`` (reflection principle)."""
    if target < 0 or target > n or (n - target) % 2:
        return 0
    down = (n - target) // 2
    # walks of n steps +-1 from 0 to target that never go below 0: C(n, down) - C(n, down - 1)
    return comb(n, down) - (comb(n, down - 1) if down else 0)


def multiplet_count(n, S):
    r"""Number of multiplets of total spin ``S`` among ``n`` spins 1/2 (branching-diagram paths).

    Zero when ``S`` cannot be reached (wrong parity or ``S > n/2``).  The paths are counted
    by the reflection principle, :math:`\binom{n}{n/2-S} - \binom{n}{n/2-S-1}`, not walked,
    so the count is instant; ``n`` is limited by ``max_j`` of :mod:`amalgebra.limits`
    (``n/2 <= max_j``).

    Examples
    ========

    >>> [multiplet_count(6, S) for S in range(4)]
    [5, 9, 5, 1]
    """
    _check_n(n)
    return _count(n, doubled(S, "S", nonnegative=True))


def _branching_paths(n, target=None, lowest=0):
    """Doubled spins ``(t_2, ..., t_n)`` after each coupling step, in lexicographic order.

    Only paths that end at ``target`` (when given) or at ``>= lowest`` are walked: a partial
    path is extended only while its end can still be reached, so the work follows the
    number of paths returned, never the 2^(n-1) paths of the whole diagram.
    """

    def candidates(t, left):
        # next values after t with `left` steps remaining after that one
        for u in (t - 1, t + 1):
            if u < 0:
                continue
            if (abs(u - target) <= left) if target is not None else (u + left >= lowest):
                yield u

    out = []
    path = [1]
    pending = [candidates(1, n - 2)]
    while pending:
        u = next(pending[-1], None)
        if u is None:
            pending.pop()
            path.pop()
            continue
        path.append(u)
        if len(path) == n:
            out.append(tuple(path[1:]))
            path.pop()
            continue
        pending.append(candidates(u, n - len(path) - 1))
    return out


def total_spin_states(n, S=None, M=None, labels=None):
    r"""Coupled kets of ``n`` spins 1/2 (eigenstates of total :math:`S^2` and :math:`S_z`).

    One :class:`~amalgebra.states.coupled.CoupledKet` per branching-diagram
    path, sorted by path, for the given total ``S`` (all when ``None``) and
    projection ``M`` (all :math:`M = S..-S` when ``None``).  ``.doit()`` expands
    one into product kets.

    Only the kets asked for are built: the paths are walked towards the requested
    ``S`` (or towards ``S >= |M|``), so ``total_spin_states(200, S=100, M=100)`` is one
    ket at once.  Their number is computed first and refused above ``max_terms`` of
    :mod:`amalgebra.limits`; ``n/2`` is limited by ``max_j``.

    Examples
    ========

    >>> [str(k) for k in total_spin_states(3, S="1/2", M="1/2")]
    ['|((1/2_s1 1/2_s2)0 1/2_s3)1/2, 1/2>', '|((1/2_s1 1/2_s2)1 1/2_s3)1/2, 1/2>']
    >>> len(total_spin_states(40, S=20, M=-20))
    1
    """
    _check_n(n)
    if n < 2:
        raise StateError(f"n={n} must be >= 2 to couple spins")
    labels = spin_labels(n) if labels is None else tuple(labels)
    if len(labels) != n:
        raise StateError(f"labels={list(labels)} must hold n={n} names")
    target = None if S is None else doubled(S, "S", nonnegative=True)
    tm = None if M is None else doubled(M, "M")
    lowest = 0 if tm is None else abs(tm)

    def kets_of(t):  # kets with doubled total spin t: one per path and per M asked for
        if tm is None:
            return _count(n, t) * (t + 1)
        return _count(n, t) if t >= lowest and (t - tm) % 2 == 0 else 0

    number = sum(kets_of(t) for t in (range(n % 2, n + 1, 2) if target is None else (target,)))
    check_limit("max_terms", number, "kets", f"total_spin_states(n={n}, S={S}, M={M}) has that many kets")
    if number == 0:
        return []
    js = [_HALF] * n
    out = []
    for path in _branching_paths(n, target, lowest):
        tj = path[-1]
        inter = [Rational(t, 2) for t in path[:-1]]
        if tm is None:
            ms = [Rational(t, 2) for t in range(tj, -tj - 1, -2)]
        elif abs(tm) > tj or (tj - tm) % 2:
            continue
        else:
            ms = [Rational(tm, 2)]
        J = Rational(tj, 2)
        out.extend(CoupledKet(js, inter, J, m, labels) for m in ms)
    return out


def singlet(labels=("A", "B")):
    r"""The two-spin singlet :math:`(|\uparrow\downarrow\rangle - |\downarrow\uparrow\rangle)/\sqrt 2`.

    Examples
    ========

    >>> singlet()
    -sqrt(2)*|1/2, -1/2>_A|1/2, 1/2>_B/2 + sqrt(2)*|1/2, 1/2>_A|1/2, -1/2>_B/2
    """
    return to_uncoupled(coupled_ket(_HALF, _HALF, 0, 0, labels=tuple(labels)))


def spin_along(label, theta, phi=0):
    r"""The Pauli operator :math:`\sigma_{\hat n}` of spin ``label`` along the axis (theta, phi).

    >>> from sympy import pi
    >>> spin_along("A", pi / 2)
    2*A.x
    """
    from ..algebra import AngularMomentum

    s = AngularMomentum(label)
    return 2 * (sin(theta) * cos(phi) * s.x + sin(theta) * sin(phi) * s.y + cos(theta) * s.z)


def correlation(state, axis_a, axis_b):
    r"""The correlation :math:`\langle\sigma^{(A)}_{\hat a}\, \sigma^{(B)}_{\hat b}\rangle` in ``state``.

    ``axis_a`` and ``axis_b`` are ``(label, theta)`` or ``(label, theta, phi)``.

    Examples
    ========

    >>> from sympy import pi
    >>> correlation(singlet(), ("A", 0), ("B", pi))
    1
    """
    op = spin_along(*axis_a) * spin_along(*axis_b)
    return expectation(op, state)


def chsh(state, a, a2, b, b2, labels=("A", "B")):
    r"""The CHSH combination :math:`E(a,b) - E(a,b') + E(a',b) + E(a',b')` for polar angles.

    Examples
    ========

    >>> from sympy import pi, sqrt
    >>> chsh(singlet(), 0, pi / 2, pi / 4, 3 * pi / 4) == -2 * sqrt(2)
    True
    """
    la, lb = labels

    def corr(x, y):
        return correlation(state, (la, x), (lb, y))

    return (corr(a, b) - corr(a, b2) + corr(a2, b) + corr(a2, b2)).expand()


def total_spin_squared(labels):
    r"""The operator :math:`(\sum_k \mathbf S_k)^2 = \sum_k S_k^2 + 2\sum_{k<l} \mathbf S_k\cdot\mathbf S_l`.

    >>> from amalgebra.states.action import apply
    >>> from amalgebra.states.kets import ket, product_ket
    >>> up_up = product_ket(ket("1/2", "1/2", "a"), ket("1/2", "1/2", "b"))
    >>> apply(total_spin_squared(("a", "b")), up_up) == 2 * up_up
    True
    """
    from ..algebra import AngularMomentum, dot

    moms = [AngularMomentum(lab) for lab in labels]
    terms = [m.squared for m in moms]
    terms += [2 * dot(moms[k], moms[l]) for k in range(len(moms)) for l in range(k + 1, len(moms))]
    return Add(*terms)

