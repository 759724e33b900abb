r"""Products of rotations: composition of Euler triples and the Clebsch-Gordan series.

Explanation
===========

Convention (as in :mod:`amalgebra.rotations.wigner`): active z-y-z rotations
``R(alpha, beta, gamma) = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)`` and
``D^j_{m'm} = <j m'|R|j m> = exp(-i m' alpha) d^j_{m'm}(beta) exp(-i m gamma)``.

* Composition: ``D^j(R1 R2) = D^j(R1) D^j(R2)``.  For numeric angles the Euler
  triple of ``R1 R2`` is found on SU(2) (the ``j = 1/2`` matrices), so it is
  right for half-integer ``j`` too, where ``R`` and ``R`` times a ``2 pi``
  turn differ by a sign.
* Clebsch-Gordan series (Edmonds 1957, eq. 4.3.1; Varshalovich 1988, sec. 4.6):

  .. math::

      D^{j_1}_{m_1' m_1} D^{j_2}_{m_2' m_2}
        = \sum_J \langle j_1 m_1' j_2 m_2' | J M' \rangle
                 \langle j_1 m_1 j_2 m_2 | J M \rangle D^J_{M' M},
      \qquad M' = m_1' + m_2',\ M = m_1 + m_2.

Examples
========

>>> from sympy import symbols, expand, simplify
>>> from amalgebra.rotations.wigner import wigner_D
>>> from amalgebra.rotations.series import clebsch_gordan_series
>>> a, b, c = symbols("alpha beta gamma", real=True)
>>> series = clebsch_gordan_series("1/2", "1/2", "-1/2", 1, 0, 1, a, b, c)
>>> series
-sqrt(2)*D^{1/2}_{1/2,1/2}(alpha, beta, gamma)/3 + sqrt(2)*D^{3/2}_{1/2,1/2}(alpha, beta, gamma)/3

The series equals the product of the two closed forms:

>>> lhs = wigner_D("1/2", "1/2", "-1/2", a, b, c) * wigner_D(1, 0, 1, a, b, c)
>>> simplify(expand(series.doit() - lhs))
0
"""

import cmath
import math
from collections import namedtuple

from sympy import Add, Rational

from ..errors import NotNumericError
from ..qnumbers import doubled, doubled_projection, half_integer
from ..results import LatexDisplay
from .wigner import RotationElement, _angle, wigner_D, wigner_D_matrix

__all__ = [
    "compose_euler_angles",
    "compose_rotations",
    "RotationComposition",
    "clebsch_gordan_series",
]


class RotationComposition(namedtuple("RotationComposition", ["matrix", "angles", "defect"]), LatexDisplay):
    """Result of :func:`compose_rotations`.

    ``matrix`` is the exact product ``D^j(R1) D^j(R2)``; for numeric angles
    ``angles`` is the Euler triple of ``R1 R2`` (floats) and ``defect`` the largest
    absolute difference between ``matrix`` and ``D^j(angles)``; both are ``None``
    for symbolic angles.  Displays (LaTeX) as the matrix, with the angles when known."""

    __slots__ = ()
    _notation_key = "rotation_composition"


def _float_angle(value, name):
    angle = _angle(value, name)
    if not angle.is_number:
        raise NotNumericError(f"{name}={angle} must be a number here, not a symbolic expression")
    number = complex(angle.evalf(30))
    if abs(number.imag) > 1e-12 * max(1.0, abs(number.real)):
        raise NotNumericError(f"{name}={angle} must be a real angle")
    return number.real


def _su2(alpha, beta, gamma):
    # D^{1/2}(alpha, beta, gamma), rows/columns m = 1/2, -1/2
    c, s = math.cos(beta / 2), math.sin(beta / 2)
    return ((cmath.exp(-0.5j * (alpha + gamma)) * c, -cmath.exp(-0.5j * (alpha - gamma)) * s),
            (cmath.exp(0.5j * (alpha - gamma)) * s, cmath.exp(0.5j * (alpha + gamma)) * c))


def _matmul2(x, y):
    return tuple(tuple(sum(x[r][k] * y[k][c] for k in range(2)) for c in range(2)) for r in range(2))


def compose_euler_angles(first, second):
    r"""Euler angles of the product ``R(first) R(second)`` (numeric, floats).

    Explanation
    ===========

    Active z-y-z convention,
    ``R(alpha, beta, gamma) = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)``.
    The product is formed on SU(2), ``U = D^{1/2}(first) D^{1/2}(second)``,
    and read back as ``U = D^{1/2}(alpha, beta, gamma)`` with
    ``0 <= beta <= pi``, so that ``D^j(first) D^j(second) = D^j(alpha, beta, gamma)``
    holds for every ``j``, integer or half-integer.  When ``beta`` is 0
    (resp. ``pi``) only ``alpha + gamma`` (resp. ``alpha - gamma``) is
    defined; the other combination is then set to 0.

    Examples
    ========

    >>> from sympy import pi
    >>> from amalgebra.rotations.series import compose_euler_angles
    >>> a, b, c = compose_euler_angles((0, pi / 2, 0), (0, pi / 4, 0))
    >>> round(a, 12) + 0.0, round(b / float(pi), 12), round(c, 12) + 0.0
    (0.0, 0.75, 0.0)

    Parameters
    ==========

    first, second : triples ``(alpha, beta, gamma)`` of real numbers or numeric
        SymPy expressions

    See Also
    ========

    compose_rotations, amalgebra.rotations.wigner.inverse_euler_angles
    """
    names = ("alpha", "beta", "gamma")
    one = [_float_angle(x, n) for x, n in zip(first, names, strict=True)]
    two = [_float_angle(x, n) for x, n in zip(second, names, strict=True)]
    u = _matmul2(_su2(*one), _su2(*two))
    cb, sb = abs(u[0][0]), abs(u[1][0])
    beta = 2 * math.atan2(sb, cb)
    half_sum = -cmath.phase(u[0][0]) if cb > 1e-14 else 0.0   # (alpha + gamma) / 2
    half_diff = cmath.phase(u[1][0]) if sb > 1e-14 else 0.0   # (alpha - gamma) / 2
    return (half_sum + half_diff, beta, half_sum - half_diff)


def compose_rotations(j, first, second):
    r"""The product ``D^j(R1) D^j(R2) = D^j(R1 R2)`` of two rotations given as Euler triples.

    Explanation
    ===========

    Active z-y-z convention
    (``R = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)``,
    ``D^j_{m'm} = <j m'|R|j m>``).  Returns a :class:`RotationComposition`:
    the exact matrix product and, when all six angles are numeric, the Euler
    triple of ``R1 R2`` from :func:`compose_euler_angles` together with the
    numerical deviation ``max |D^j(R1) D^j(R2) - D^j(R1 R2)|`` as a check.

    Examples
    ========

    >>> from sympy import Rational, pi, symbols, simplify, expand_trig
    >>> from amalgebra.rotations.wigner import small_d_matrix
    >>> from amalgebra.rotations.series import compose_rotations
    >>> result = compose_rotations(1, (pi / 3, pi / 4, 0), (0, pi / 2, Rational(1, 5)))
    >>> result.defect < 1e-12
    True

    Two turns about y add their angles, exactly:

    >>> b1, b2 = symbols("b1 b2", real=True)
    >>> M = compose_rotations("1/2", (0, b1, 0), (0, b2, 0)).matrix
    >>> simplify(M - expand_trig(small_d_matrix("1/2", b1 + b2))).is_zero_matrix
    True

    Parameters
    ==========

    j : numeric angular momentum
    first, second : Euler triples ``(alpha, beta, gamma)``

    See Also
    ========

    compose_euler_angles, amalgebra.rotations.wigner.wigner_D_matrix
    """
    tj = doubled(j, "j", nonnegative=True)
    first = tuple(first)
    second = tuple(second)
    product = wigner_D_matrix(j, *first) * wigner_D_matrix(j, *second)
    angles = [_angle(x, n) for x, n in zip(first + second, ("alpha", "beta", "gamma") * 2, strict=True)]
    if not all(a.is_number for a in angles):
        return RotationComposition(product, None, None)
    composed = compose_euler_angles(first, second)
    target = wigner_D_matrix(j, *composed)
    size = tj + 1
    defect = max(abs(complex(product[r, c].evalf(20)) - complex(target[r, c].evalf(20)))
                 for r in range(size) for c in range(size))
    return RotationComposition(product, composed, defect)


def clebsch_gordan_series(j1, m1p, m1, j2, m2p, m2, alpha, beta, gamma, *, evaluate=False):
    r"""Expand ``D^{j1}_{m1' m1} D^{j2}_{m2' m2}`` as a sum over ``D^J_{M' M}``.

    Explanation
    ===========

    .. math::

        D^{j_1}_{m_1' m_1} D^{j_2}_{m_2' m_2}
          = \sum_{J=|j_1-j_2|}^{j_1+j_2}
            \langle j_1 m_1' j_2 m_2' | J M' \rangle
            \langle j_1 m_1 j_2 m_2 | J M \rangle D^J_{M' M}

    with ``M' = m1' + m2'`` and ``M = m1 + m2`` (Edmonds 1957, eq. 4.3.1), for
    the active z-y-z convention of :mod:`amalgebra.rotations.wigner`.  Clebsch-Gordan
    coefficients come from :func:`amalgebra.coupling.cg`.  Terms are ordered by
    ``J`` and vanishing terms are dropped.  With ``evaluate=False`` (default)
    the D functions stay as :class:`~amalgebra.rotations.wigner.RotationElement`
    objects, so a derivation shows the structure; ``.doit()`` gives the closed
    form.  With ``evaluate=True`` the closed forms are used directly.

    Examples
    ========

    >>> from sympy import symbols, expand, simplify
    >>> from amalgebra.rotations.wigner import wigner_D
    >>> from amalgebra.rotations.series import clebsch_gordan_series
    >>> a, b, c = symbols("alpha beta gamma", real=True)
    >>> clebsch_gordan_series(1, 0, 0, 1, 0, 0, a, b, c)
    D^{0}_{0,0}(alpha, beta, gamma)/3 + 2*D^{2}_{0,0}(alpha, beta, gamma)/3

    That is ``P_1(x)^2 = 1/3 + (2/3) P_2(x)``, checked on the closed forms:

    >>> rhs = clebsch_gordan_series(1, 0, 0, 1, 0, 0, a, b, c, evaluate=True)
    >>> simplify(expand(rhs - wigner_D(1, 0, 0, a, b, c) ** 2))
    0

    Parameters
    ==========

    j1, m1p, m1, j2, m2p, m2 : numeric quantum numbers (``m1p`` is ``m1'``)
    alpha, beta, gamma : Euler angles
    evaluate : bool, keyword-only

    See Also
    ========

    amalgebra.rotations.wigner.RotationElement, amalgebra.rotations.wigner.wigner_D
    """
    from ..coupling import cg  # lazy: coupling is a sibling layer

    tj1 = doubled(j1, "j1", nonnegative=True)
    tj2 = doubled(j2, "j2", nonnegative=True)
    doubled_projection(tj1, m1p, "m1p", "j1")
    doubled_projection(tj1, m1, "m1", "j1")
    doubled_projection(tj2, m2p, "m2p", "j2")
    doubled_projection(tj2, m2, "m2", "j2")
    angles = (_angle(alpha, "alpha"), _angle(beta, "beta"), _angle(gamma, "gamma"))
    j1, j2 = half_integer(j1, "j1"), half_integer(j2, "j2")
    m1p, m1 = half_integer(m1p, "m1p"), half_integer(m1, "m1")
    m2p, m2 = half_integer(m2p, "m2p"), half_integer(m2, "m2")
    big_mp, big_m = m1p + m2p, m1 + m2
    terms = []
    for tJ in range(abs(tj1 - tj2), tj1 + tj2 + 1, 2):
        J = Rational(tJ, 2)
        if abs(big_mp) > J or abs(big_m) > J:
            continue
        coefficient = cg(j1, m1p, j2, m2p, J, big_mp) * cg(j1, m1, j2, m2, J, big_m)
        if coefficient == 0:
            continue
        if evaluate:
            element = wigner_D(J, big_mp, big_m, *angles)
        else:
            element = RotationElement(J, big_mp, big_m, *angles)
        terms.append(coefficient * element)
    return Add(*terms)
