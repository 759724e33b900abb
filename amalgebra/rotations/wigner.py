r"""Wigner rotation matrices: exact small-d and full D functions for numeric j.

Explanation
===========

Rotations are *active* and written with z-y-z Euler angles (the fixed
convention of amalgebra, hbar = 1, Condon-Shortley phase):

.. math::

    R(\alpha, \beta, \gamma) = e^{-i \alpha J_z} e^{-i \beta J_y} e^{-i \gamma J_z},
    \qquad
    D^j_{m' m}(\alpha, \beta, \gamma) = \langle j m' | R | j m \rangle
        = e^{-i m' \alpha} \, d^j_{m' m}(\beta) \, e^{-i m \gamma}.

The small-d function is built from Wigner's formula in half-angle form,

.. math::

    d^j_{m' m}(\beta) = \sum_k (-1)^{k - m + m'}
        \frac{\sqrt{(j+m)!\,(j-m)!\,(j+m')!\,(j-m')!}}
             {(j+m-k)!\,k!\,(j-m'-k)!\,(k-m+m')!}
        \cos^{2j-2k+m-m'}\tfrac{\beta}{2} \, \sin^{2k-m+m'}\tfrac{\beta}{2},

so every element is ``sqrt(B) * (polynomial in cos(beta/2), sin(beta/2))``
with ``B`` a square-free integer (one square root per element) and rational
coefficients computed on Python ints.  Matrices are ordered with rows
``m' = j, j-1, ..., -j`` and columns ``m = j, ..., -j``.

The three symmetries ``d_{m'm} = (-1)^(m-m') d_{mm'} = d_{-m,-m'}`` are used
to build each distinct polynomial once per matrix.

Examples
========

>>> from sympy import Symbol, cos, sin, sqrt, simplify
>>> from amalgebra.rotations.wigner import small_d, wigner_D, small_d_matrix
>>> beta = Symbol("beta", real=True)
>>> small_d(1, 1, 0, beta)
-sqrt(2)*sin(beta/2)*cos(beta/2)
>>> small_d("1/2", "1/2", "-1/2", beta)
-sin(beta/2)
>>> small_d_matrix(1, beta)
Matrix([
[                 cos(beta/2)**2, -sqrt(2)*sin(beta/2)*cos(beta/2),                   sin(beta/2)**2],
[sqrt(2)*sin(beta/2)*cos(beta/2), -sin(beta/2)**2 + cos(beta/2)**2, -sqrt(2)*sin(beta/2)*cos(beta/2)],
[                 sin(beta/2)**2,  sqrt(2)*sin(beta/2)*cos(beta/2),                   cos(beta/2)**2]])

An identity: ``d^1_{00}(beta) = cos(beta)``.

>>> simplify(small_d(1, 0, 0, beta) - cos(beta))
0

References
==========

.. [1] E. P. Wigner, *Group Theory* (Academic Press, 1959), eq. (15.27).
.. [2] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (1957), eqs. (4.1.12), (4.1.15).
.. [3] D. A. Varshalovich et al., *Quantum Theory of Angular Momentum* (1988), sec. 4.3.
"""

import math
import numbers
from fractions import Fraction
from functools import lru_cache

from sympy import Add, Expr, Float, I, Integer, Matrix, Mul, Pow, Rational, S, cos, exp, sin, sqrt
from sympy.core.add import _args_sortkey
from sympy.core.basic import ordering_of_classes

from ..lambdify_kernels import wigner_D_float
from ..notation import CodeHooks, NotationHooks
from ..errors import AngleError, ConventionError, NotNumericError, ProjectionError
from ..limits import check_limit
from ..qnumbers import doubled, doubled_projection, is_numeric, quantum_number

__all__ = [
    "small_d",
    "wigner_D",
    "small_d_matrix",
    "wigner_D_matrix",
    "RotationElement",
    "inverse_euler_angles",
    "clear_rotation_caches",
]


# ---------------------------------------------------------------------------
# Integer kernel (no sympy, no validation): works on doubled quantum numbers.
# ---------------------------------------------------------------------------

_FACTORIALS = [1]


def _factorial(n):
    table = _FACTORIALS
    while len(table) <= n:
        table.append(table[-1] * len(table))
    return table[n]


@lru_cache(maxsize=64)
def _primes_upto(n):
    if n < 2:
        return ()
    sieve = bytearray([1]) * (n + 1)
    sieve[0:2] = b"\x00\x00"
    for p in range(2, int(n ** 0.5) + 1):
        if sieve[p]:
            sieve[p * p::p] = bytearray(len(range(p * p, n + 1, p)))
    return tuple(p for p in range(n + 1) if sieve[p])


def _sqrt_of_factorial_product(factors):
    """``sqrt(prod(f!)) = A * sqrt(B)`` with ``B`` square-free: return ``(A, B)``."""
    outside, inside = 1, 1
    for p in _primes_upto(max(factors)):
        exponent = 0
        for f in factors:
            q = p
            while q <= f:
                exponent += f // q
                q *= p
        outside *= p ** (exponent // 2)
        if exponent % 2:
            inside *= p
    return outside, inside


@lru_cache(maxsize=8192)
def _d_kernel(tj, tmp, tm):
    """Wigner's sum for ``d^j_{m'm}`` on doubled values.

    Returns ``(B, terms)``: the element is ``sqrt(B) * sum(num/den * c**a * s**(2j-a))``
    over ``terms = ((a, num, den), ...)`` with ``c = cos(beta/2)``, ``s = sin(beta/2)``.
    """
    jpm, jmm = (tj + tm) // 2, (tj - tm) // 2
    jpmp, jmmp = (tj + tmp) // 2, (tj - tmp) // 2
    shift = (tm - tmp) // 2  # m - m'
    outside, inside = _sqrt_of_factorial_product((jpm, jmm, jpmp, jmmp))
    terms = []
    for k in range(max(0, shift), min(jpm, jmmp) + 1):
        den = _factorial(jpm - k) * _factorial(k) * _factorial(jmmp - k) * _factorial(k - shift)
        num = -outside if (k - shift) % 2 else outside
        terms.append((tj - 2 * k + shift, num, den))
    return inside, tuple(terms)


def _representative(tmp, tm):
    """Canonical member of ``{(m',m), (m,m'), (-m,-m'), (-m',-m)}`` and the sign relating them."""
    odd = ((tm - tmp) // 2) % 2
    flip = -1 if odd else 1
    best = max((tmp, tm, 1), (tm, tmp, flip), (-tm, -tmp, 1), (-tmp, -tm, flip))
    return best[0], best[1], best[2]


def clear_rotation_caches():
    """Empty the integer caches of this module (for cold benchmarks).

    >>> clear_rotation_caches()
    """
    _d_kernel.cache_clear()
    _primes_upto.cache_clear()
    del _FACTORIALS[1:]


# ---------------------------------------------------------------------------
# Validation at the boundary
# ---------------------------------------------------------------------------

_NOT_FINITE = (S.NaN, S.Infinity, S.NegativeInfinity, S.ComplexInfinity)


def _angle(value, name):
    """An Euler angle as a SymPy expression; numbers are converted exactly; nan and infinities refused."""
    if isinstance(value, bool):
        raise NotNumericError(f"{name}={value!r} must be a SymPy expression or a number, not a bool")
    if isinstance(value, Expr):
        if value.has(*_NOT_FINITE):
            raise AngleError(f"{name}={value} must be finite (no nan, oo or zoo in an angle)")
        return value
    if isinstance(value, numbers.Integral):
        return Integer(int(value))
    if isinstance(value, Fraction):
        return Rational(value.numerator, value.denominator)
    if isinstance(value, numbers.Real):
        if not math.isfinite(float(value)):
            raise AngleError(f"{name}={value!r} must be finite (a number, not nan or an infinity)")
        return Float(float(value))
    raise NotNumericError(
        f"{name}={value!r} must be a SymPy expression or a number, got {type(value).__name__}")


def _element_args(j, mp, m):
    tj = doubled(j, "j", nonnegative=True)
    check_limit("max_j", Fraction(tj, 2), "j", "d^j elements are sums of up to 2j + 1 terms")
    return tj, doubled_projection(tj, mp, "mp", "j"), doubled_projection(tj, m, "m", "j")


def _matrix_j(j):
    """Doubled ``j`` of a whole d or D matrix, refused before any work when the matrix would be too large."""
    tj = doubled(j, "j", nonnegative=True)
    check_limit("max_j", Fraction(tj, 2), "j", "the matrix is (2j + 1) x (2j + 1)")
    check_limit("max_dense_entries", (tj + 1) ** 2, "(2j + 1)^2", f"entries of the d^j matrix, j={Fraction(tj, 2)}")
    # Wigner's sum for d_{m'm} has min(j+m, j-m, j+m', j-m') + 1 terms; summed over the matrix this is
    # (2j+1)^2 + sum_{k=1}^{j} (2j+1-2k)^2 (count the pairs whose minimum reaches k).
    terms = (tj + 1) ** 2 + sum((tj + 1 - 2 * k) ** 2 for k in range(1, tj // 2 + 1))
    check_limit("max_terms", terms, "terms", f"terms of the d^j matrix, j={Fraction(tj, 2)}")
    return tj


# ---------------------------------------------------------------------------
# Expression assembly
# ---------------------------------------------------------------------------

def _power_product(c, a, s, b):
    """``c**a * s**b`` for two distinct non-numeric function values (a, b >= 0)."""
    if a == 0 or b == 0:
        return c ** a * s ** b
    return Mul._from_args(sorted((c ** a, s ** b), key=_args_sortkey), is_commutative=True)


def _rational(num, den):
    """``Rational(num, den)`` for ``den > 0`` without SymPy's own gcd and cache (the gcd in C)."""
    g = math.gcd(num, den)
    return Rational.from_coprime_ints(num // g, den // g)


@lru_cache(maxsize=None)
def _class_key(cls):
    """The position of a class in SymPy's canonical order (``Basic.compare`` via ``_cmp_name``):
    listed classes by their index, unlisted ones after them by name."""
    name = cls.__name__
    try:
        return ordering_of_classes.index(name), ""
    except ValueError:
        return len(ordering_of_classes) + 1, name


class _TermOrder:
    """A sort key that orders the terms ``q * c^a * s^(2j-a)`` of one angle exactly as ``Add`` does.

    ``Add`` sorts its terms with ``Basic.compare`` (class, then length of the
    arguments, then the arguments in turn); a Python ``cmp_to_key`` over that
    was a third of the time of a whole d matrix.  The same order comes from
    plain tuples: a term's class, its argument count and, per argument, the
    class with the number's ``(p, q)`` or the rank of the factor among all
    factors of this angle (ranked once, by ``Basic.compare`` itself).
    ``tests/test_rotations_bulk.py`` holds the result to the generic ``Add``.
    """

    def __init__(self, monomials, factors):
        pieces = {f for fs in factors for f in fs} | {m for m in monomials if not isinstance(m, Mul)}
        ranked = sorted(pieces, key=_args_sortkey)
        self.rank = {piece: (_class_key(type(piece)), i) for i, piece in enumerate(ranked)}
        self.mul = _class_key(Mul)

    def monomial_keys(self, monomials, factors):
        """Per power ``a``: the key of the bare monomial and the key tail of its factors."""
        return [(self.key(m), tuple(self.rank[f] for f in fs)) for m, fs in zip(monomials, factors)]

    def key(self, term):
        if not isinstance(term, Mul):
            return self.rank[term]
        args = term.args
        first = args[0]
        if first.is_Number:
            head = ((_class_key(type(first)), first._hashable_content()),)
            args = args[1:]
        else:
            head = ()
        return self.mul, len(term.args), head + tuple(self.rank[f] for f in args)

    def term_key(self, coefficient, bare, tail):
        """The key of ``coefficient * monomial`` from the monomial's keys (no Mul needed)."""
        if coefficient == 1:
            return bare
        return self.mul, len(tail) + 1, ((_class_key(type(coefficient)), coefficient._hashable_content()),) + tail


class _HalfAngleBuilder:
    """Builds d-elements for one angle, sharing monomials and polynomials.

    The polynomials are assembled straight from the kernel's integers: each term is
    ``Mul._from_args((coefficient, *monomial.args))`` and the sum ``Add._from_args`` of
    the terms sorted as ``Add`` sorts them, so no SymPy arithmetic, coefficient
    collection or assumption query runs per term (the monomials ``c^a s^(2j-a)`` are
    distinct, so nothing needs collecting).  The result is the same expression that
    ``sign * sqrt(B) * Add(*[Rational(num, den) * c**a * s**(2j-a)])`` builds
    (``tests/test_rotations.py`` compares the two).
    """

    def __init__(self, tj, beta):
        self.tj = tj
        c, s = cos(beta / 2), sin(beta / 2)
        if type(c) is cos and type(s) is sin:
            # c^a s^b as Mul builds it (its two powers sorted), without Mul's flattening
            self.monomials = [_power_product(c, a, s, tj - a) for a in range(tj + 1)]
        else:  # a numeric or signed half angle: let SymPy evaluate
            self.monomials = [c ** a * s ** (tj - a) for a in range(tj + 1)]
        self.factors = [m.args if isinstance(m, Mul) else (m,) for m in self.monomials]
        # the bulk route needs monomials that are products of symbolic powers with no number in
        # them (a numeric angle, or one like -x whose sine carries a sign, takes the generic route)
        self.bulk = all(not f.is_number for m in self.factors for f in m)
        self.polys = {}
        self.roots = {}
        if self.bulk:
            order = _TermOrder(self.monomials, self.factors)
            self.term_key = order.term_key
            self.keys = order.monomial_keys(self.monomials, self.factors)

    def _term(self, coefficient, a):
        if coefficient == 1:
            return self.monomials[a]
        return Mul._from_args((coefficient, *self.factors[a]), is_commutative=True)

    def _poly(self, tmp, tm, negate):
        key = (tmp, tm, negate)
        if key not in self.polys:
            inside, terms = _d_kernel(self.tj, tmp, tm)
            sign = -1 if negate else 1
            if not self.bulk:
                poly = Add(*[Rational(sign * num, den) * self.monomials[a] for a, num, den in terms])
                self.polys[key] = (inside, poly)
                return self.polys[key]
            coefficients = [(_rational(sign * num, den), a) for a, num, den in terms]
            if len(coefficients) == 1:
                poly = self._term(*coefficients[0])
            else:
                keys, term_key = self.keys, self.term_key
                coefficients.sort(key=lambda ca: term_key(ca[0], *keys[ca[1]]))
                poly = Add._from_args([self._term(c, a) for c, a in coefficients], is_commutative=True)
            self.polys[key] = (inside, poly)
        return self.polys[key]

    def element(self, tmp, tm):
        if abs(tmp) > self.tj or abs(tm) > self.tj:
            return S.Zero
        rmp, rm, sign = _representative(tmp, tm)
        inside, _ = _d_kernel(self.tj, rmp, rm)
        if inside == 1:
            # sign * poly distributes the sign over the terms: build the signed terms directly
            return self._poly(rmp, rm, sign < 0)[1]
        poly = self._poly(rmp, rm, False)[1]
        if not self.bulk:
            return Mul(Integer(sign), sqrt(Integer(inside)), poly)
        key = (inside, sign, rmp, rm)
        if key not in self.roots:
            # inside is squarefree, so sqrt(inside) is the bare power; with a root and a sum
            # present Mul neither distributes nor collects, it only sorts its factors
            root = Pow(Integer(inside), S.Half, evaluate=False)
            if isinstance(poly, Add):
                factors = sorted((root, poly), key=_args_sortkey)
                self.roots[key] = Mul._from_args((S.NegativeOne, *factors) if sign < 0 else tuple(factors))
            else:  # a single term: Mul merges the factors, let it
                self.roots[key] = Mul(Integer(sign), root, poly)
        return self.roots[key]


def _phase(tm, angle):
    return exp(-I * Rational(tm, 2) * angle)


def _full_angle(element, beta):
    """A half-angle d-element of integer ``j`` as a polynomial in ``cos(beta)`` plus
    ``sin(beta)`` times one (``c^2 = (1 + C)/2``, ``s^2 = (1 - C)/2``, ``c s = S/2``)."""
    from sympy import Poly, expand

    c, s = cos(beta / 2), sin(beta / 2)
    C, Sb = cos(beta), sin(beta)
    out = S.Zero
    for (a, b), coeff in Poly(element, c, s).terms():
        term = coeff * ((1 + C) / 2) ** (a // 2) * ((1 - C) / 2) ** (b // 2)
        if a % 2:
            term = term * Sb / 2
        out += term
    return expand(out)


def small_d(j, mp, m, beta, form="half_angle"):
    r"""Wigner's small-d function ``d^j_{m' m}(beta)`` in half-angle form.

    Explanation
    ===========

    ``d^j_{m'm}(\beta) = <j m'| exp(-i beta J_y) |j m>`` for the active z-y-z
    convention ``R = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)``,
    Condon-Shortley phase.  The result is ``sqrt(B)`` times a polynomial in
    ``cos(beta/2)``, ``sin(beta/2)`` with exact rational coefficients.
    ``|m| > j`` or ``|m'| > j`` gives an exact zero.  ``j`` above ``max_j`` of
    :mod:`amalgebra.limits` (default 1000) raises :class:`~amalgebra.errors.LimitError`
    before any work; a nan or infinite angle raises :class:`~amalgebra.errors.AngleError`.

    Examples
    ========

    >>> from sympy import Symbol, pi
    >>> from amalgebra.rotations.wigner import small_d
    >>> b = Symbol("beta")
    >>> small_d(1, 1, 1, b)
    cos(beta/2)**2
    >>> small_d("3/2", "3/2", "1/2", b)
    -sqrt(3)*sin(beta/2)*cos(beta/2)**2
    >>> small_d(2, 0, 0, pi / 2)
    -1/2

    A symmetry, ``d_{m'm} = (-1)^(m-m') d_{mm'}``, holds term by term:

    >>> small_d(3, 2, -1, b) == -small_d(3, -1, 2, b) != 0
    True

    With ``form="cos_sin"`` (integer ``j``) the same function is a polynomial in
    ``cos(beta)`` plus ``sin(beta)`` times one; ``d^2_{00} = P_2(cos beta)``
    (Edmonds 1957, eq. 4.1.24):

    >>> from sympy import cos, legendre, simplify
    >>> small_d(2, 0, 0, b, form="cos_sin")
    3*cos(beta)**2/2 - 1/2
    >>> simplify(small_d(2, 0, 0, b, form="cos_sin") - legendre(2, cos(b)))
    0

    Parameters
    ==========

    j : int, Rational or str like ``"3/2"``; numeric, ``j >= 0``
    mp, m : projections ``m'`` (row) and ``m`` (column), same kind as ``j``
    beta : SymPy expression or number (the middle Euler angle)
    form : ``"half_angle"`` (default; ``cos(beta/2)``, ``sin(beta/2)``) or ``"cos_sin"``
        (``cos(beta)``, ``sin(beta)``; integer ``j`` only, half-integer ``j`` needs half angles)

    See Also
    ========

    wigner_D, small_d_matrix, RotationElement

    References
    ==========

    .. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (1957), eq. (4.1.15).
    .. [2] Particle Data Group, "Clebsch-Gordan coefficients, spherical harmonics, and d functions"
       (the table the tests compare with).
    """
    tj, tmp, tm = _element_args(j, mp, m)
    if form not in ("half_angle", "cos_sin"):
        raise ConventionError(f"form={form!r} must be 'half_angle' or 'cos_sin'")
    if form == "cos_sin" and tj % 2:
        raise ConventionError(f"form='cos_sin' needs an integer j, got j={Rational(tj, 2)}")
    beta = _angle(beta, "beta")
    element = _HalfAngleBuilder(tj, beta).element(tmp, tm)
    return _full_angle(element, beta) if form == "cos_sin" else element


def wigner_D(j, mp, m, alpha, beta, gamma):
    r"""The Wigner D function ``D^j_{m' m}(alpha, beta, gamma)`` as an exact expression.

    Explanation
    ===========

    Active z-y-z convention:
    ``R(alpha, beta, gamma) = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)`` and
    ``D^j_{m'm} = <j m'|R|j m> = exp(-i m' alpha) d^j_{m'm}(beta) exp(-i m gamma)``.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.rotations.wigner import wigner_D
    >>> a, b, c = symbols("alpha beta gamma")
    >>> wigner_D(1, 1, 0, a, b, c)
    -sqrt(2)*exp(-I*alpha)*sin(beta/2)*cos(beta/2)
    >>> wigner_D("1/2", "-1/2", "-1/2", a, b, c)
    exp(I*alpha/2)*exp(I*gamma/2)*cos(beta/2)

    With ``alpha = gamma = 0`` it reduces to :func:`small_d`:

    >>> from amalgebra.rotations.wigner import small_d
    >>> wigner_D(2, 1, -1, 0, b, 0) == small_d(2, 1, -1, b) != 0
    True

    Parameters
    ==========

    j, mp, m : numeric quantum numbers (``mp`` is the row index ``m'``)
    alpha, beta, gamma : Euler angles (SymPy expressions or numbers)

    See Also
    ========

    small_d, wigner_D_matrix, RotationElement

    References
    ==========

    .. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (1957), eqs. (4.1.9), (4.1.12).
    """
    tj, tmp, tm = _element_args(j, mp, m)
    alpha, beta, gamma = _angle(alpha, "alpha"), _angle(beta, "beta"), _angle(gamma, "gamma")
    d = _HalfAngleBuilder(tj, beta).element(tmp, tm)
    if d == 0:
        return d
    return _phase(tmp, alpha) * d * _phase(tm, gamma)


def small_d_matrix(j, beta):
    r"""The whole matrix ``d^j(beta)``, rows ``m' = j..-j``, columns ``m = j..-j``.

    Explanation
    ===========

    Elements as in :func:`small_d` (active z-y-z convention,
    ``d^j_{m'm}(beta) = <j m'|exp(-i beta Jy)|j m>``).  Each distinct
    polynomial is built once and reused through the symmetries
    ``d_{m'm} = (-1)^(m-m') d_{mm'} = d_{-m,-m'}``.  Refused before any work
    (:class:`~amalgebra.errors.LimitError`, :mod:`amalgebra.limits`) above ``max_j``,
    above ``max_dense_entries`` entries or ``max_terms`` terms of Wigner's sums in all.

    Examples
    ========

    >>> from sympy import Symbol, pi, eye
    >>> from amalgebra.rotations.wigner import small_d_matrix
    >>> small_d_matrix("1/2", Symbol("beta"))
    Matrix([
    [cos(beta/2), -sin(beta/2)],
    [sin(beta/2),  cos(beta/2)]])

    A rotation by ``2 pi`` is ``(-1)^(2j)``:

    >>> small_d_matrix("3/2", 2 * pi) == -eye(4)
    True

    Parameters
    ==========

    j : numeric angular momentum
    beta : SymPy expression or number

    See Also
    ========

    small_d, wigner_D_matrix
    """
    tj = _matrix_j(j)
    builder = _HalfAngleBuilder(tj, _angle(beta, "beta"))
    ms = range(tj, -tj - 1, -2)
    return Matrix(tj + 1, tj + 1, [builder.element(tmp, tm) for tmp in ms for tm in ms])


def wigner_D_matrix(j, alpha, beta, gamma):
    r"""The whole matrix ``D^j(alpha, beta, gamma)``, rows ``m' = j..-j``, columns ``m = j..-j``.

    Explanation
    ===========

    ``D^j_{m'm} = <j m'|R|j m> = exp(-i m' alpha) d^j_{m'm}(beta) exp(-i m gamma)``
    for the active rotation
    ``R(alpha, beta, gamma) = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)``.
    ``D^j(R1 R2) = D^j(R1) D^j(R2)`` (a representation), and
    ``D^j(R^-1) = D^j(-gamma, -beta, -alpha)`` is the adjoint of ``D^j(R)``.

    Examples
    ========

    >>> from sympy import symbols, pi, simplify, zeros
    >>> from amalgebra.rotations.wigner import wigner_D_matrix
    >>> a, b, c = symbols("alpha beta gamma", real=True)
    >>> wigner_D_matrix(0, a, b, c)
    Matrix([[1]])
    >>> M = wigner_D_matrix("1/2", a, b, c)
    >>> M[0, 1]
    -exp(-I*alpha/2)*exp(I*gamma/2)*sin(beta/2)

    Unitarity, checked exactly:

    >>> simplify(M * M.H - M.eye(2)) == zeros(2, 2)
    True

    Parameters
    ==========

    j : numeric angular momentum
    alpha, beta, gamma : Euler angles

    See Also
    ========

    wigner_D, small_d_matrix, inverse_euler_angles,
    amalgebra.rotations.series.compose_rotations
    """
    tj = _matrix_j(j)
    alpha, beta, gamma = _angle(alpha, "alpha"), _angle(beta, "beta"), _angle(gamma, "gamma")
    builder = _HalfAngleBuilder(tj, beta)
    ms = range(tj, -tj - 1, -2)
    left = [_phase(tm, alpha) for tm in ms]
    right = [_phase(tm, gamma) for tm in ms]
    entries = [left[r] * builder.element(tmp, tm) * right[c]
               for r, tmp in enumerate(ms) for c, tm in enumerate(ms)]
    return Matrix(tj + 1, tj + 1, entries)


def inverse_euler_angles(alpha, beta, gamma):
    r"""Euler angles of the inverse rotation: ``R(alpha, beta, gamma)^-1 = R(-gamma, -beta, -alpha)``.

    Explanation
    ===========

    With the active z-y-z convention
    ``R = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)`` the inverse
    reverses the order and the signs, so
    ``D^j(-gamma, -beta, -alpha) = D^j(alpha, beta, gamma)^dagger``.

    Examples
    ========

    >>> from sympy import symbols, simplify, zeros
    >>> from amalgebra.rotations.wigner import inverse_euler_angles, wigner_D_matrix
    >>> a, b, c = symbols("alpha beta gamma", real=True)
    >>> inverse_euler_angles(a, b, c)
    (-gamma, -beta, -alpha)
    >>> M = wigner_D_matrix(1, a, b, c)
    >>> simplify(wigner_D_matrix(1, *inverse_euler_angles(a, b, c)) - M.H) == zeros(3, 3)
    True

    Parameters
    ==========

    alpha, beta, gamma : Euler angles (SymPy expressions or numbers)

    See Also
    ========

    wigner_D_matrix, amalgebra.rotations.series.compose_euler_angles
    """
    alpha, beta, gamma = _angle(alpha, "alpha"), _angle(beta, "beta"), _angle(gamma, "gamma")
    return (-gamma, -beta, -alpha)


# ---------------------------------------------------------------------------
# Unevaluated D-matrix element
# ---------------------------------------------------------------------------

class RotationElement(CodeHooks, NotationHooks, Expr):
    r"""An unevaluated Wigner D-matrix element ``D^j_{m' m}(alpha, beta, gamma)``.

    Explanation
    ===========

    Holds ``(j, m', m, alpha, beta, gamma)`` in ``.args`` and evaluates to the
    closed form of :func:`wigner_D` on ``.doit()`` when ``j``, ``m'`` and ``m``
    are numbers; symbolic quantum numbers stay unevaluated.  Convention:
    active z-y-z rotation ``R = exp(-i alpha Jz) exp(-i beta Jy) exp(-i gamma Jz)``,
    ``D^j_{m'm} = <j m'|R|j m> = exp(-i m' alpha) d^j_{m'm}(beta) exp(-i m gamma)``.

    For real angles, ``conjugate(D^j_{m'm}) = (-1)^(m'-m) D^j_{-m',-m}``
    (Edmonds 1957, eq. 4.2.7) is applied by :func:`sympy.conjugate`.

    Examples
    ========

    >>> from sympy import symbols, latex, conjugate
    >>> from amalgebra.rotations.wigner import RotationElement, wigner_D
    >>> a, b, c = symbols("alpha beta gamma", real=True)
    >>> D = RotationElement(1, 1, 0, a, b, c)
    >>> D
    D^{1}_{1,0}(alpha, beta, gamma)
    >>> latex(D)
    'D^{1}_{1,0}\\left(\\alpha,\\beta,\\gamma\\right)'
    >>> D.doit()
    -sqrt(2)*exp(-I*alpha)*sin(beta/2)*cos(beta/2)
    >>> conjugate(D)
    -D^{1}_{-1,0}(alpha, beta, gamma)
    >>> D.func(*D.args) == D
    True

    The closed form of the conjugate agrees with the conjugate of the closed form:

    >>> conjugate(D).doit() == conjugate(D.doit()) != 0
    True

    Parameters
    ==========

    j : angular momentum (numeric, or a SymPy expression)
    mp, m : projections ``m'`` (row) and ``m`` (column)
    alpha, beta, gamma : Euler angles

    See Also
    ========

    wigner_D, amalgebra.rotations.series.clebsch_gordan_series
    """

    __slots__ = ()
    is_commutative = True

    def __new__(cls, j, mp, m, alpha, beta, gamma):
        j = quantum_number(j, "j", nonnegative=True)
        mp, m = quantum_number(mp, "mp"), quantum_number(m, "m")
        if j.is_Number:
            for name, value in (("mp", mp), ("m", m)):
                if value.is_Number:
                    doubled_projection(int(2 * j), value, name, "j")
                elif (j - value).is_integer is False:
                    raise ProjectionError(f"{name}={value} must differ from j={j} by an integer")
        angles = (_angle(alpha, "alpha"), _angle(beta, "beta"), _angle(gamma, "gamma"))
        return Expr.__new__(cls, j, mp, m, *angles)

    @property
    def j(self):
        return self.args[0]

    @property
    def mp(self):
        return self.args[1]

    @property
    def m(self):
        return self.args[2]

    @property
    def angles(self):
        """The Euler angles ``(alpha, beta, gamma)``."""
        return self.args[3:]

    def doit(self, **hints):
        args = self.args
        if hints.get("deep", True):
            args = tuple(a.doit(**hints) for a in args)
        j, mp, m = args[:3]
        if is_numeric(j) and is_numeric(mp) and is_numeric(m):
            return wigner_D(j, mp, m, *args[3:])
        return self.func(*args)

    def _eval_conjugate(self):
        if all(angle.is_extended_real for angle in self.angles):
            sign = (-1) ** (self.mp - self.m)
            return sign * self.func(self.j, -self.mp, -self.m, *self.angles)
        return None

    def _eval_transpose(self):
        return self  # a scalar

    def _eval_adjoint(self):
        return self._eval_conjugate()

    _notation_key = "rotation"
    _float_kernel = staticmethod(wigner_D_float)  # what lambdify calls
