r"""Spherical harmonics from the Wigner D functions, the addition theorem and Gaunt integrals.

Explanation
===========

With the active z-y-z rotation ``R(alpha, beta, gamma) = exp(-i alpha Jz)
exp(-i beta Jy) exp(-i gamma Jz)`` and ``D^l_{m'm} = <l m'|R|l m>``
(see :mod:`amalgebra.rotations.wigner`), the spherical harmonics with the
Condon-Shortley phase are

.. math::

    Y_l^m(\theta, \phi) = \sqrt{\frac{2l+1}{4\pi}}\,
        \overline{D^l_{m 0}(\phi, \theta, 0)}
      = \sqrt{\frac{2l+1}{4\pi}}\, e^{i m \phi}\, d^l_{m 0}(\theta)

for real angles (Edmonds 1957, eq. 4.1.25; Varshalovich 1988, sec. 4.17).
Derivation: ``|theta phi> = R(phi, theta, 0)|z>`` is the direction state and
``Y_lm(theta, phi) = <theta phi|l m>`` up to the normalisation
``sqrt((2l+1)/(4 pi))``; ``<l 0|R^dagger|l m>`` is the conjugate of
``D^l_{m0}``.  The Racah-normalised harmonics are
``C^k_q = sqrt(4 pi/(2k+1)) Y_kq = conj(D^k_{q0}(phi, theta, 0))``.

The returned closed form is ``K * exp(i m phi) * sin(theta)^|m| * P(cos theta)``
with ``P`` a polynomial with coprime integer coefficients and positive leading
coefficient, and ``K`` exact (a rational times one square root, over
``sqrt(pi)`` for ``Y``).  It is obtained from the half-angle form of
``d^l_{m0}`` through ``cos^2(theta/2) = (1 + cos theta)/2``,
``sin^2(theta/2) = (1 - cos theta)/2`` and
``sin(theta/2) cos(theta/2) = sin(theta)/2``; no symbolic simplification is
involved.  For symbolic angles not declared real the same expression is used
(the analytic continuation).

Examples
========

>>> from sympy import symbols, integrate, sin, pi, conjugate, simplify
>>> from amalgebra.rotations.harmonics import spherical_harmonic, racah_harmonic
>>> theta, phi = symbols("theta phi", real=True)
>>> spherical_harmonic(1, 1, theta, phi)
-sqrt(6)*exp(I*phi)*sin(theta)/(4*sqrt(pi))
>>> spherical_harmonic(2, 0, theta, phi)
sqrt(5)*(3*cos(theta)**2 - 1)/(4*sqrt(pi))
>>> racah_harmonic(1, 0, theta, phi)
cos(theta)

Normalisation, checked by integration over the sphere:

>>> Y = spherical_harmonic(2, 1, theta, phi)
>>> integrate(simplify(Y * conjugate(Y)) * sin(theta), (theta, 0, pi), (phi, 0, 2 * pi))
1

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (1957), eqs. (4.1.25), (4.6.3).
.. [2] NIST DLMF, eq. 34.3.22 (integral of three spherical harmonics).
"""

from collections import namedtuple
from fractions import Fraction
from math import gcd

from sympy import Add, Integer, Mul, Rational, conjugate, cos, exp, I, legendre, pi, sin, sqrt

from ..errors import QuantumNumberError
from ..qnumbers import doubled, doubled_projection
from .wigner import _angle, _d_kernel
from ..limits import check_limit
from ..results import LatexDisplay

__all__ = [
    "spherical_harmonic",
    "racah_harmonic",
    "addition_theorem",
    "AdditionTheorem",
    "check_addition_theorem",
    "harmonic_triple_integral",
]


def _integer_l(value, name):
    twice = doubled(value, name, nonnegative=True)
    if twice % 2:
        raise QuantumNumberError(f"{name}={Rational(twice, 2)} must be an integer")
    return twice // 2


def _binomial_row(n):
    row = [1]
    for k in range(n):
        row.append(row[-1] * (n - k) // (k + 1))
    return row


def _harmonic_parts(l, m):
    """``d^l_{m0}(theta) = sqrt(B) * F * sin(theta)^|m| * sum(c_k cos(theta)^k)``.

    Returns ``(B, F, coeffs)`` with ``F`` a Fraction and ``coeffs`` coprime ints,
    leading one positive.
    """
    inside, terms = _d_kernel(2 * l, 2 * m, 0)
    am = abs(m)
    top = l - am
    poly = [Fraction(0)] * (top + 1)
    for a, num, den in terms:
        p = (a - am) // 2   # power of (1 + x)
        q = top - p         # power of (1 - x)
        plus, minus = _binomial_row(p), _binomial_row(q)
        weight = Fraction(num, den)
        for i, bp in enumerate(plus):
            for k, bq in enumerate(minus):
                poly[i + k] += weight * bp * (bq if k % 2 == 0 else -bq)
    # c^a s^b = (sin/2)^|m| ((1+x)/2)^p ((1-x)/2)^q, and |m| + p + q = l
    scale = Fraction(1, 2 ** l)
    while len(poly) > 1 and poly[-1] == 0:
        poly.pop()
    lcm_den = 1
    for c in poly:
        lcm_den = lcm_den * c.denominator // gcd(lcm_den, c.denominator)
    ints = [int(c * lcm_den) for c in poly]
    content = 0
    for c in ints:
        content = gcd(content, c)
    if ints[-1] < 0:
        content = -content
    coeffs = [c // content for c in ints]
    return inside, scale * Fraction(content, lcm_den), coeffs


def _assemble(constant, m, coeffs, theta, phi):
    x = cos(theta)
    poly = Add(*[Integer(c) * x ** k for k, c in enumerate(coeffs) if c])
    factors = [constant, poly]
    if m:
        factors += [exp(I * m * phi), sin(theta) ** abs(m)]
    return Mul(*factors)


def _lm(l, m):
    ll = _integer_l(l, "l")
    check_limit("max_j", ll, "l", "Y_lm is a sum of up to l + 1 terms")  # amalgebra.limits
    tm = doubled_projection(2 * ll, m, "m", "l")
    return ll, tm // 2


def spherical_harmonic(l, m, theta, phi):
    r"""The spherical harmonic ``Y_l^m(theta, phi)`` (Condon-Shortley phase) as an exact expression.

    Explanation
    ===========

    ``Y_l^m(theta, phi) = sqrt((2l+1)/(4 pi)) conj(D^l_{m0}(phi, theta, 0))
    = sqrt((2l+1)/(4 pi)) exp(i m phi) d^l_{m0}(theta)`` for the active z-y-z
    convention ``D^l_{m'm} = <l m'|exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)|l m>``.
    ``theta`` is the polar angle, ``phi`` the azimuth.  ``|m| > l`` gives 0.

    Examples
    ========

    >>> from sympy import symbols, conjugate, simplify
    >>> from amalgebra.rotations.harmonics import spherical_harmonic
    >>> t, p = symbols("theta phi", real=True)
    >>> spherical_harmonic(0, 0, t, p)
    1/(2*sqrt(pi))
    >>> spherical_harmonic(3, -2, t, p)
    sqrt(210)*exp(-2*I*phi)*sin(theta)**2*cos(theta)/(8*sqrt(pi))

    ``conj(Y_lm) = (-1)^m Y_{l,-m}`` for real angles:

    >>> conjugate(spherical_harmonic(3, 2, t, p)) == spherical_harmonic(3, -2, t, p) != 0
    True

    Parameters
    ==========

    l : non-negative integer (int, Integer, or a string such as ``"2"``)
    m : integer projection
    theta, phi : SymPy expressions or numbers

    See Also
    ========

    racah_harmonic, amalgebra.rotations.wigner.wigner_D, harmonic_triple_integral
    """
    ll, mm = _lm(l, m)
    theta, phi = _angle(theta, "theta"), _angle(phi, "phi")
    if abs(mm) > ll:
        return Integer(0)
    inside, factor, coeffs = _harmonic_parts(ll, mm)
    constant = Rational(factor.numerator, factor.denominator) * sqrt(Rational((2 * ll + 1) * inside, 4)) / sqrt(pi)
    return _assemble(constant, mm, coeffs, theta, phi)


def racah_harmonic(k, q, theta, phi):
    r"""Racah's normalised harmonic ``C^k_q(theta, phi) = sqrt(4 pi/(2k+1)) Y_kq(theta, phi)``.

    Explanation
    ===========

    ``C^k_q(theta, phi) = conj(D^k_{q0}(phi, theta, 0)) = exp(i q phi) d^k_{q0}(theta)``
    (active z-y-z convention, Condon-Shortley phase); ``C^k_0 = P_k(cos theta)``.

    Examples
    ========

    >>> from sympy import symbols, legendre, cos, expand
    >>> from amalgebra.rotations.harmonics import racah_harmonic
    >>> t, p = symbols("theta phi", real=True)
    >>> racah_harmonic(2, 2, t, p)
    sqrt(6)*exp(2*I*phi)*sin(theta)**2/4
    >>> expand(racah_harmonic(4, 0, t, p)) == expand(legendre(4, cos(t))) != 0
    True

    Parameters
    ==========

    k : non-negative integer rank
    q : integer component
    theta, phi : SymPy expressions or numbers

    See Also
    ========

    spherical_harmonic
    """
    kk, qq = _lm(k, q)
    theta, phi = _angle(theta, "theta"), _angle(phi, "phi")
    if abs(qq) > kk:
        return Integer(0)
    inside, factor, coeffs = _harmonic_parts(kk, qq)
    constant = Rational(factor.numerator, factor.denominator) * sqrt(Integer(inside))
    return _assemble(constant, qq, coeffs, theta, phi)


class AdditionTheorem(namedtuple("AdditionTheorem", ["lhs", "rhs"]), LatexDisplay):
    """The two sides of the addition theorem (see :func:`addition_theorem`); displays as ``lhs = rhs``."""

    __slots__ = ()
    _notation_key = "equation_pair"


def addition_theorem(l, theta1, phi1, theta2, phi2):
    r"""Both sides of the addition theorem for spherical harmonics.

    Explanation
    ===========

    .. math::

        \sum_{m=-l}^{l} \overline{Y_l^m(\theta_1, \phi_1)}\, Y_l^m(\theta_2, \phi_2)
          = \frac{2l+1}{4\pi} P_l(\cos\gamma_{12}),
        \quad \cos\gamma_{12} = \cos\theta_1\cos\theta_2
              + \sin\theta_1\sin\theta_2\cos(\phi_1 - \phi_2)

    (Edmonds 1957, eq. 4.6.6), with the harmonics of :func:`spherical_harmonic`.
    Returns ``AdditionTheorem(lhs, rhs)``; ``lhs`` uses :func:`sympy.conjugate`,
    which stays visible unless the angles are known to be real.

    Examples
    ========

    >>> from sympy import Rational, pi, simplify
    >>> from amalgebra.rotations.harmonics import addition_theorem
    >>> sides = addition_theorem(2, pi / 3, pi / 4, pi / 6, Rational(1, 2))
    >>> abs((sides.lhs - sides.rhs).evalf(30)) < 1e-25
    True

    Parameters
    ==========

    l : non-negative integer
    theta1, phi1, theta2, phi2 : polar and azimuthal angles of the two directions

    See Also
    ========

    check_addition_theorem, spherical_harmonic
    """
    ll = _integer_l(l, "l")
    theta1, phi1 = _angle(theta1, "theta1"), _angle(phi1, "phi1")
    theta2, phi2 = _angle(theta2, "theta2"), _angle(phi2, "phi2")
    lhs = Add(*[conjugate(spherical_harmonic(ll, m, theta1, phi1)) * spherical_harmonic(ll, m, theta2, phi2)
                for m in range(-ll, ll + 1)])
    cos_gamma = cos(theta1) * cos(theta2) + sin(theta1) * sin(theta2) * cos(phi1 - phi2)
    rhs = Rational(2 * ll + 1, 4) / pi * legendre(ll, cos_gamma)
    return AdditionTheorem(lhs, rhs)


def check_addition_theorem(l):
    r"""Exact check of the addition theorem for one ``l`` as a polynomial identity.

    Explanation
    ===========

    Writes ``x_i = cos(theta_i)``, ``y_i = sin(theta_i)`` and
    ``w = exp(i (phi_2 - phi_1))``.  The left side of :func:`addition_theorem`
    is ``sum_m K_m^2 (y_1 y_2)^|m| P_m(x_1) P_m(x_2) w^m`` (the parts of
    :func:`spherical_harmonic`, ``K_m`` real), the right side
    ``(2l+1)/(4 pi) P_l(x_1 x_2 + y_1 y_2 (w + 1/w)/2)``.  Both are multiplied
    by ``w^l`` and reduced modulo ``y_i^2 = 1 - x_i^2``; the result is ``True``
    when the difference is exactly zero.  Being an identity in free symbols,
    it proves the theorem for all angles at this ``l``.

    Examples
    ========

    >>> from amalgebra.rotations.harmonics import check_addition_theorem
    >>> all(check_addition_theorem(l) for l in range(4))
    True

    Parameters
    ==========

    l : non-negative integer

    See Also
    ========

    addition_theorem
    """
    from sympy import Dummy, expand, reduced

    ll = _integer_l(l, "l")
    x1, x2, y1, y2, w = (Dummy(n) for n in ("x1", "x2", "y1", "y2", "w"))
    lhs_terms = []
    for m in range(-ll, ll + 1):
        inside, factor, coeffs = _harmonic_parts(ll, m)
        k2 = Rational(factor.numerator ** 2 * inside * (2 * ll + 1), factor.denominator ** 2)
        p1 = Add(*[c * x1 ** k for k, c in enumerate(coeffs)])
        p2 = Add(*[c * x2 ** k for k, c in enumerate(coeffs)])
        lhs_terms.append(k2 * (y1 * y2) ** abs(m) * p1 * p2 * w ** (m + ll))
    lhs = Add(*lhs_terms)
    rhs = (2 * ll + 1) * w ** ll * legendre(ll, x1 * x2 + y1 * y2 * (w + 1 / w) / 2)
    # leading terms y1**2, y2**2 are coprime: the two relations are a Groebner basis
    relations = [y1 ** 2 + x1 ** 2 - 1, y2 ** 2 + x2 ** 2 - 1]
    _, remainder = reduced(expand(lhs - rhs), relations, y1, y2, x1, x2, w, order="lex")
    return remainder == 0


def harmonic_triple_integral(l1, m1, l2, m2, l3, m3, *, conjugate_first=False):
    r"""The integral of three spherical harmonics over the sphere (Gaunt coefficient), exact.

    Explanation
    ===========

    .. math::

        \int Y_{l_1}^{m_1} Y_{l_2}^{m_2} Y_{l_3}^{m_3}\, d\Omega
          = \sqrt{\frac{(2l_1+1)(2l_2+1)(2l_3+1)}{4\pi}}
            \begin{pmatrix} l_1 & l_2 & l_3 \\ 0 & 0 & 0 \end{pmatrix}
            \begin{pmatrix} l_1 & l_2 & l_3 \\ m_1 & m_2 & m_3 \end{pmatrix}

    (NIST DLMF eq. 34.3.22; Edmonds 1957, eq. 4.6.3), harmonics with the
    Condon-Shortley phase, 3j symbols from :func:`amalgebra.coupling.threej`.
    With ``conjugate_first=True`` the first harmonic is conjugated:
    ``conj(Y_{l1 m1}) = (-1)^m1 Y_{l1,-m1}``.

    Examples
    ========

    >>> from sympy import pi, sqrt
    >>> from amalgebra.rotations.harmonics import harmonic_triple_integral
    >>> harmonic_triple_integral(1, 0, 1, 0, 2, 0)
    sqrt(5)/(5*sqrt(pi))
    >>> harmonic_triple_integral(0, 0, 3, 1, 3, -1) == -1 / (2 * sqrt(pi)) != 0
    True

    Parameters
    ==========

    l1, m1, l2, m2, l3, m3 : integers, ``l_i >= 0``
    conjugate_first : bool, keyword-only

    See Also
    ========

    spherical_harmonic
    """
    from ..coupling import threej  # lazy: coupling is a sibling layer

    (a, ma), (b, mb), (c, mc) = _lm(l1, m1), _lm(l2, m2), _lm(l3, m3)
    if conjugate_first:
        sign = -1 if ma % 2 else 1
        ma = -ma
    else:
        sign = 1
    if ma + mb + mc != 0 or abs(ma) > a or abs(mb) > b or abs(mc) > c:
        return Integer(0)
    if (a + b + c) % 2 or not abs(a - b) <= c <= a + b:
        return Integer(0)
    prefactor = sqrt(Integer((2 * a + 1) * (2 * b + 1) * (2 * c + 1))) / (2 * sqrt(pi))
    return sign * prefactor * threej(a, b, c, 0, 0, 0) * threej(a, b, c, ma, mb, mc)
