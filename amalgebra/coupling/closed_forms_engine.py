r"""Exact evaluation of a Racah-type single sum whose factorials carry symbols.

This is the engine behind :mod:`amalgebra.coupling.closed_forms`.  It knows
nothing about angular momentum: it evaluates

.. math::

    (-1)^{\phi}\,\Big[\prod_a (A_a)!^{\,2 h_a}\Big]^{1/2}
    \sum_k (-1)^k \prod_b (B_b + s_b k)!^{\,e_b}

where every argument is a polynomial (in practice affine) in a few symbols
with rational coefficients, ``h_a`` are integers (doubled exponents of the
prefactor), ``s_b`` is ``+1``, ``-1`` or ``0`` and ``e_b`` is ``+1``
(numerator) or ``-1`` (denominator).

Method
======

1. The sum runs over the ``k`` for which every denominator factorial has a
   nonnegative argument.  Each such factorial gives a bound (``k >= -B`` or
   ``k <= B``); the engine looks for one lower and one upper bound whose
   difference is a *number* ``N`` and sums over ``k = l, l+1, ..., l+N``.
   Terms of that window outside the true range carry ``1/(negative)! = 0``
   and vanish in the polynomial form below, so the window may be wider
   than the true range.
2. Every factorial argument is split as ``Y + c`` (``Y`` its symbolic part,
   ``c`` a number).  For every part ``Y`` a base ``(Y + b)!`` is chosen with
   ``b`` the smallest offset of a *numerator* factorial; then
   ``(Y + c)! = (Y + b)! (Y+b+1)(Y+b+2)...(Y+c)`` (or the reciprocal
   product when ``c < b``).  The powers of ``(Y + b)!`` must cancel between
   prefactor and summand ("balanced" part), otherwise the sum is no rational
   function of the symbols and :class:`~amalgebra.errors.NotNumericError` is
   raised.
3. What is left is ``sqrt(R) * S`` with ``R`` a product of linear factors
   ``Y + i`` (each strictly positive wherever all prefactor factorials have
   nonnegative integer arguments) and ``S`` a rational function summed in a
   ``sympy.polys`` field.  Factors of ``S`` that divide exactly by a factor
   of ``R`` are moved under or out of the square root (valid because these
   factors are positive), the rest of ``S`` is factored.

Validity: the value equals the sum wherever every prefactor factorial has a
nonnegative integer argument and every summand factorial argument is an
integer; numerator factorials of the summand are assumed nonnegative on the
window (true for the Racah formulas).

Examples
========

``sum_k (-1)**k (x+2)! / (k! (2-k)! (x+k)!)`` for symbolic ``x``: the window
is ``k = 0, 1, 2`` and the ``x!`` cancel.

>>> from sympy import Symbol, factorial, combsimp, Add
>>> from sympy.polys.rings import ring
>>> from sympy.polys.domains import QQ
>>> from amalgebra.coupling.closed_forms_engine import factorial_sum
>>> x = Symbol("x")
>>> R, X = ring([x], QQ)
>>> value = factorial_sum(R, [(X + 2, 2)], [(R(0), 1, -1), (R(2), -1, -1), (X, 1, -1)])
>>> value
x**2/2 + x/2 - 1/2
>>> direct = Add(*[(-1)**k * factorial(x + 2) / (factorial(k) * factorial(2 - k) * factorial(x + k))
...                for k in range(3)])
>>> combsimp(direct - value)
0

Without the ``(x+2)!`` the factorials of ``x`` do not cancel and the sum is refused:

>>> factorial_sum(R, [], [(R(0), 1, -1), (R(2), -1, -1), (X, 1, -1)])
Traceback (most recent call last):
...
amalgebra.errors.NotNumericError: the sum: the factorials of x + (number) do not cancel between the prefactor and the sum, so the result is no algebraic function of the symbols; the differences between the symbolic arguments must be numbers
"""

from fractions import Fraction
from math import factorial, floor

from sympy import Integer, Mul, Pow, Rational, S, factor, factorint, sqrt

from ..errors import NotNumericError

__all__ = ["factorial_sum", "to_poly", "poly_constant"]


def poly_constant(poly):
    """The constant term of a ``PolyElement`` as a ``Fraction``."""
    c = poly.coeff(1)
    return Fraction(int(c.numerator), int(c.denominator))


def to_poly(ring, value, name):
    """Convert a SymPy expression to an element of ``ring`` or raise NotNumericError."""
    try:
        return ring.from_expr(value)
    except (ValueError, TypeError, AttributeError) as exc:
        raise NotNumericError(
            f"{name}={value} must be a polynomial with rational coefficients in the symbols "
            f"(a number plus a symbolic expression such as 2*j + 1)") from exc


def _split(poly):
    """``(part, offset)``: ``poly = part + offset`` with a numeric offset."""
    c = poly.coeff(1)
    return poly - c, Fraction(int(c.numerator), int(c.denominator))


def _ground(ring, value):
    return ring.ground_new(ring.domain(value.numerator, value.denominator))


def _window(ring, summand):
    """The numeric-length window ``(l, N)`` of the summation, or None."""
    lowers = [-arg for arg, s, e in summand if e < 0 and s > 0]
    uppers = [arg for arg, s, e in summand if e < 0 and s < 0]
    best = None
    for low in lowers:
        for up in uppers:
            diff = up - low
            if diff.is_ground:
                length = poly_constant(diff)
                if best is None or length < best[1]:
                    best = (low, length)
    return best


def factorial_sum(ring, prefactor, summand, phase=None, what="the sum", half_integers=()):
    r"""Evaluate the Racah-type sum described in the module docstring.

    Parameters
    ==========

    ring : sympy.polys.rings.PolyRing
        Polynomial ring over ``QQ`` in the symbols of the arguments.
    prefactor : list of (PolyElement, int)
        Factorials ``A!`` with *doubled* exponents (``1`` is ``sqrt(A!)``).
    summand : list of (PolyElement, int, int)
        ``(B, s, e)`` for the factor ``(B + s k)!**e`` of the summand, which
        also carries ``(-1)**k``.
    phase : PolyElement or None
        Overall phase ``(-1)**phase``.
    what : str
        Description of the coefficient for error messages.
    half_integers : sequence of int
        Indices of ring generators known to take half-integer values only
        (``4 x`` is then even and the coefficients of ``x`` in the phase are
        reduced modulo 4).

    Returns
    =======

    A SymPy expression, or ``S.Zero`` when the sum vanishes for every value
    of the symbols (empty window, a numeric prefactor factorial of a
    negative or non-integer argument, or a sum that cancels identically).
    """
    sq_const = Fraction(1)
    # part -> list of [offset, doubled exponent, term index or None (prefactor)]
    parts = {}
    for arg, h in prefactor:
        part, c = _split(arg)
        if not part:
            if c.denominator != 1 or c < 0:
                return S.Zero
            sq_const *= Fraction(factorial(int(c))) ** h
        else:
            parts.setdefault(part, []).append((c, h, None))

    window = _window(ring, summand)
    if window is None:
        raise NotNumericError(
            f"{what}: the range of the Racah sum has no numeric length; every argument must be a "
            f"number or a symbolic expression plus a number such that the summation range is finite "
            f"and numeric (e.g. J - j1 and the small j2 numeric)")
    low, length = window
    if length.denominator != 1 or length < 0:
        return S.Zero
    length = int(length)

    terms = []  # (Fraction coefficient, list of (part, offset, e))
    for t in range(length + 1):
        coeff = Fraction((-1) ** t)
        symbolic = []
        for arg, s, e in summand:
            part, c = _split(arg + s * low)
            c += s * t
            if not part:
                if c.denominator != 1:
                    return S.Zero
                if c < 0:
                    if e < 0:
                        coeff = Fraction(0)
                        break
                    raise AssertionError(f"numerator factorial of negative argument {c} in {what}")
                coeff *= Fraction(factorial(int(c))) ** e
            else:
                symbolic.append((part, c, e))
        if coeff:
            terms.append((coeff, symbolic))
            for part, c, e in symbolic:
                parts.setdefault(part, []).append((c, 2 * e, t))
    if not terms:
        return S.Zero

    base = {}
    first = terms[0][1]
    for part, occurrences in parts.items():
        balance = sum(h for c, h, t in occurrences if t is None)
        balance += sum(2 * e for p, c, e in first if p == part)
        if balance:
            raise NotNumericError(
                f"{what}: the factorials of {part.as_expr()} + (number) do not cancel between the "
                f"prefactor and the sum, so the result is no algebraic function of the symbols; "
                f"the differences between the symbolic arguments must be numbers")
        base[part] = min(c for c, h, t in occurrences if h > 0)

    # R: linear factor -> doubled exponent, in first-seen order (deterministic).
    rad = {}
    for arg, h in prefactor:
        part, c = _split(arg)
        if part:
            b = base[part]
            if c >= b:
                for i in range(int(c - b)):
                    g = part + _ground(ring, b + 1 + i)
                    rad[g] = rad.get(g, 0) + h
            else:
                for i in range(int(b - c)):
                    g = part + _ground(ring, c + 1 + i)
                    rad[g] = rad.get(g, 0) - h

    field = ring.to_field()
    total = []
    for coeff, symbolic in terms:
        num = _ground(ring, coeff)
        den = ring(1)
        for part, c, e in symbolic:
            b = base[part]
            prod = ring(1)
            if c >= b:
                for i in range(int(c - b)):
                    prod *= part + _ground(ring, b + 1 + i)
                up = e > 0
            else:
                for i in range(int(b - c)):
                    prod *= part + _ground(ring, c + 1 + i)
                up = e < 0
            if up:
                num *= prod
            else:
                den *= prod
        total.append(field(num) / field(den))
    value = field(0)
    for term in total:  # field elements: cancellation happens as we go
        value = value + term
    if not value:
        return S.Zero
    return _assemble(ring, value, rad, sq_const, low, phase, half_integers)


def _phase_factor(ring, exponent, half_integers=()):
    """``(sign, (-1)**rest)`` for ``(-1)**exponent`` with the numeric part reduced into ``sign``.

    The exponent is an integer wherever the coefficient is defined, so
    ``(-1)**E == (-1)**(-E)``; for a generator ``x`` that only takes
    half-integer values ``(-1)**(4 x) == 1``.
    """
    if exponent is None or not exponent:
        return 1, S.One
    reduced = {}
    for monom, coeff in exponent.terms():
        index = [i for i, power in enumerate(monom) if power]
        if len(index) == 1 and monom[index[0]] == 1 and index[0] in half_integers and coeff.denominator == 1:
            value = int(coeff.numerator) % 4
            coeff = ring.domain(value - 4 if value > 2 else value)
        if coeff:
            reduced[monom] = coeff
    exponent = ring.from_dict(reduced) if reduced else ring(0)
    part, c = _split(exponent)
    if part and part.LC < 0:
        part, c = -part, -c
    sign = -1 if floor(c) % 2 else 1
    frac = c - floor(c)
    if not part:
        if frac:
            raise AssertionError(f"non-integer phase exponent {c}")
        return sign, S.One
    return sign, Pow(S.NegativeOne, part.as_expr() + Rational(frac.numerator, frac.denominator))


def _normalise(g):
    """``(content, h)`` with ``g = content * h``; integer content is pulled out of ``h``.

    ``2*j + 2`` becomes ``(2, j + 1)``; ``j + m + 1/2`` and ``2*j + 1`` stay as they are.
    """
    content, primitive = g.primitive()
    content = Fraction(int(content.numerator), int(content.denominator))
    if content.denominator == 1 and content > 1:
        return content, primitive
    return Fraction(1), g


def _square_free(value):
    """``(s, r)`` with ``value = s**2 * r`` for a positive int, ``r`` square-free."""
    outer, rest = 1, value
    for prime, power in factorint(value).items():
        outer *= prime ** (power // 2)
        rest //= prime ** (2 * (power // 2))
    return outer, rest


def _absorb(number, factors):
    """Multiply ``number`` into the first binomial factor of leading coefficient 1 (else
    the first binomial); return what is left of ``number``."""
    if number == 1:
        return number
    binomials = [i for i, g in enumerate(factors) if len(g.terms()) > 1]
    if not binomials:
        return number
    monic = [i for i in binomials if factors[i].LC == 1]
    index = (monic or binomials)[0]
    factors[index] = factors[index] * number
    return 1


def _assemble(ring, value, rad, sq_const, low, phase, half_integers):
    num, den = value.numer, value.denom
    outside = []
    inside_up, inside_down = [], []
    for g, h in rad.items():
        e = 0
        while True:
            q, r = divmod(num, g)
            if r:
                break
            num, e = q, e + 1
        while True:
            q, r = divmod(den, g)
            if r:
                break
            den, e = q, e - 1
        combined = 2 * e + h
        content, g = _normalise(g)
        sq_const *= content ** combined
        n = combined // 2 if combined >= 0 else -((-combined) // 2)
        if n:
            outside.append(Pow(g.as_expr(), n))
        if combined - 2 * n > 0:
            inside_up.append(g)
        elif combined - 2 * n < 0:
            inside_down.append(g)
    # The rational content of the sum goes under the root too, so that the
    # numeric factor is simplified once.
    c_num, num = num.primitive()
    c_den, den = den.primitive()
    content = Fraction(int(c_num.numerator), int(c_num.denominator)) / Fraction(
        int(c_den.numerator), int(c_den.denominator))
    sq_const *= content ** 2
    s_num, r_num = _square_free(sq_const.numerator)
    s_den, r_den = _square_free(sq_const.denominator)
    # Absorb a leftover integer into a linear factor under the root, as tables print
    # (2*j + 2 rather than sqrt(2)*...(j + 1)).
    r_num = _absorb(r_num, inside_up)
    r_den = _absorb(r_den, inside_down)
    root_up = Mul(Integer(r_num), *[g.as_expr() for g in inside_up])
    root_down = Mul(Integer(r_den), *[g.as_expr() for g in inside_down])
    root = sqrt(root_up / root_down) if root_up != 1 else 1 / sqrt(root_down)
    phase_poly = low if phase is None else low + phase
    sign, phase_factor = _phase_factor(ring, phase_poly, half_integers)
    rest = factor(sign * num.as_expr() / den.as_expr())
    return Mul(phase_factor, Rational(s_num, s_den), rest, Mul(*outside), root)
