r"""Many spin-1/2: total-spin eigenstates by successive coupling, multiplet counts, correlations.

Explanation
===========

:math:`n` spins 1/2 with labels ``s1, ..., sn`` are coupled in order,
:math:`(((s_1 s_2) S_{12}\, s_3) S_{123} \dots) S M`, with Condon-Shortley
Clebsch-Gordan coefficients (the Yamanouchi-Kotani genealogical basis).  Each
sequence of intermediate spins is a path in the branching diagram; the number
of paths ending at total spin :math:`S` is the number of multiplets
:math:`f(n, S)`, counted here by walking the diagram (the closed formula
:math:`(2S+1)\, n! / ((n/2+S+1)!\,(n/2-S)!)` is what the tests compare with).

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

from sympy import Add, Rational, cos, sin

from ..errors import QuantumNumberError, StateError
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


def multiplet_count(n, S):
    """Number of multiplets of total spin ``S`` among ``n`` spins 1/2 (branching-diagram paths).

    Zero when ``S`` cannot be reached (wrong parity or ``S > n/2``).

    >>> [multiplet_count(6, S) for S in range(4)]
    [5, 9, 5, 1]
    """
    _check_n(n)
    target = doubled(S, "S", nonnegative=True)
    counts = {1: 1}
    for _ in range(n - 1):
        nxt = {}
        for t, c in counts.items():
            for t2 in (t - 1, t + 1):
                if t2 >= 0:
                    nxt[t2] = nxt.get(t2, 0) + c
        counts = nxt
    return counts.get(target, 0)


def total_spin_states(n, S=None, M=None, labels=None):
    r"""Coupled kets of ``n`` spins 1/2 (eigenstates of total :math:`S^2` and :math:`S_z`).

    One :class:`~amalgebra.states.coupled.CoupledKet` per branching-diagram
    path, sorted by path, for the given total ``S`` (all when ``None``) and
    projection ``M`` (all :math:`M = S..-S` when ``None``).  ``.doit()`` expands
    one into product kets.

    Examples
    ========

    >>> [str(k) for k in total_spin_states(3, S="1/2", M="1/2")]
    ['|((1/2_s1 1/2_s2)0 1/2_s3)1/2, 1/2>', '|((1/2_s1 1/2_s2)1 1/2_s3)1/2, 1/2>']
    """
    _check_n(n)
    if n < 2:
        raise StateError(f"n={n} must be >= 2 to couple spins")
    labels = spin_labels(n) if labels is None else tuple(labels)
    if len(labels) != n:
        raise StateError(f"labels={list(labels)} must hold n={n} names")
    js = [_HALF] * n
    out = []
    for inter, J in coupling_paths(js, S):
        tj = int(2 * J)
        if M is None:
            ms = [Rational(t, 2) for t in range(tj, -tj - 1, -2)]
        else:
            tm = doubled(M, "M")
            if abs(tm) > tj or (tj - tm) % 2:
                continue
            ms = [Rational(tm, 2)]
        out.extend(CoupledKet(js, inter, J, m, labels) for m in ms)
    return out


def singlet(labels=("A", "B")):
    r"""The two-spin singlet :math:`(|\uparrow\downarrow\rangle - |\downarrow\uparrow\rangle)/\sqrt 2`.

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

    >>> from sympy import pi
    >>> correlation(singlet(), ("A", 0), ("B", pi))
    1
    """
    op = spin_along(*axis_a) * spin_along(*axis_b)
    return expectation(op, state)


def chsh(state, a, a2, b, b2, labels=("A", "B")):
    r"""The CHSH combination :math:`E(a,b) - E(a,b') + E(a',b) + E(a',b')` for polar angles.

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

