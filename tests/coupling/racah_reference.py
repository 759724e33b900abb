"""An independent exact reference for tests: Racah's formulas in their classical form.

Python ``Fraction`` and ``math.factorial`` only (Edmonds 1957, eqs. 3.7.3 and
6.3.7; Racah 1942), written directly from the printed formulas and never
calling amalgebra; slow but simple.  Arguments are doubled ints.
"""

import math
from fractions import Fraction

f = math.factorial


def _tri(a, b, c):
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def _delta(a, b, c):
    return Fraction(f((a + b - c) // 2) * f((a - b + c) // 2) * f((b + c - a) // 2), f((a + b + c) // 2 + 1))


def ref_threej_sq(t1, t2, t3, m1, m2, m3):
    """Signed square of the 3j (doubled arguments), Racah's formula, Edmonds (3.7.3)."""
    if m1 + m2 + m3 or not _tri(t1, t2, t3) or abs(m1) > t1 or abs(m2) > t2 or abs(m3) > t3:
        return Fraction(0)
    total = Fraction(0)
    for k in range(0, (t1 + t2 - t3) // 2 + 1):
        parts = (k, (t3 - t2 + m1) // 2 + k, (t3 - t1 - m2) // 2 + k, (t1 + t2 - t3) // 2 - k,
                 (t1 - m1) // 2 - k, (t2 + m2) // 2 - k)
        if min(parts) < 0:
            continue
        total += Fraction((-1) ** k, math.prod(f(p) for p in parts))
    pre = _delta(t1, t2, t3) * math.prod(f((t + m) // 2) * f((t - m) // 2) for t, m in ((t1, m1), (t2, m2), (t3, m3)))
    if ((t1 - t2 - m3) // 2) % 2:
        total = -total
    return total * abs(total) * pre


def ref_sixj_parts(a, b, c, d, e, g):
    """(sum, radicand) of the 6j {a b c; d e g} (doubled), Racah's formula, Edmonds (6.3.7)."""
    if not (_tri(a, b, c) and _tri(a, e, g) and _tri(d, b, g) and _tri(d, e, c)):
        return Fraction(0), Fraction(1)
    lows = ((a + b + c) // 2, (a + e + g) // 2, (d + b + g) // 2, (d + e + c) // 2)
    highs = ((a + b + d + e) // 2, (b + c + e + g) // 2, (c + a + g + d) // 2)
    total = Fraction(0)
    for t in range(max(lows), min(highs) + 1):
        den = math.prod(f(t - x) for x in lows) * math.prod(f(y - t) for y in highs)
        total += Fraction((-1) ** t * f(t + 1), den)
    return total, _delta(a, b, c) * _delta(a, e, g) * _delta(d, b, g) * _delta(d, e, c)


def ref_sixj_sq(*tj):
    total, radicand = ref_sixj_parts(*tj)
    return total * abs(total) * radicand


def _exact_sqrt(q):
    n, d = math.isqrt(q.numerator), math.isqrt(q.denominator)
    assert n * n == q.numerator and d * d == q.denominator
    return Fraction(n, d)


def ref_ninej_sq(a, b, c, d, e, g, hh, i, k):
    """Signed square of the 9j {a b c; d e g; hh i k} (doubled), Edmonds (6.4.3):
    sum_x (-1)^(2x)(2x+1){a b c; g k x}{d e g; b x i}{hh i k; x a d}; the x-dependent
    triangle coefficients appear squared, so each term is rational times one common root."""
    for x, y, z in ((a, b, c), (d, e, g), (hh, i, k), (a, d, hh), (b, e, i), (c, g, k)):
        if not _tri(x, y, z):
            return Fraction(0)
    common = _delta(a, b, c) * _delta(d, e, g) * _delta(hh, i, k) * _delta(a, d, hh) * _delta(b, e, i) * _delta(c, g, k)
    total = Fraction(0)
    for x in range(0, 2 * max(a, b, c, d, e, g, hh, i, k) + 1):
        s1, r1 = ref_sixj_parts(a, b, c, g, k, x)
        s2, r2 = ref_sixj_parts(d, e, g, b, x, i)
        s3, r3 = ref_sixj_parts(hh, i, k, x, a, d)
        if s1 and s2 and s3:
            total += (-1) ** x * (x + 1) * s1 * s2 * s3 * _exact_sqrt(r1 * r2 * r3 / common)
    return total * abs(total) * common
