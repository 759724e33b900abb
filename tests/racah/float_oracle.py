"""An independent float evaluator of sums of coupling coefficients, for cross-checks.

Racah's closed formulas for the 3j and 6j symbols written out here from the printed
formulas (Edmonds 1957, eqs. 3.7.3 and 6.3.7; from memory) with ``math.factorial`` and
floats, the 9j by Edmonds (6.4.3) as a sum over products of these 6j, and a walker that
evaluates a SymPy expression built of ``Sum``, products, powers, the coupling symbols,
``KroneckerDelta`` and ``TriangleDelta`` as a complex float.  Nothing from amalgebra's
kernels is used, so agreement with the reducer is a check independent of the library's
coefficients.
"""

import cmath
import math
from functools import lru_cache

from sympy import Abs, Add, KroneckerDelta, Mul, Pow, Sum

from amalgebra.coupling import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from amalgebra.racah import TriangleDelta

f = math.factorial


def _tri(a, b, c):
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def _delta(a, b, c):
    return f((a + b - c) // 2) * f((a - b + c) // 2) * f((b + c - a) // 2) / f((a + b + c) // 2 + 1)


@lru_cache(maxsize=None)
def threej2(t1, t2, t3, m1, m2, m3):
    """3j from doubled arguments."""
    if m1 + m2 + m3 or not _tri(t1, t2, t3) or abs(m1) > t1 or abs(m2) > t2 or abs(m3) > t3:
        return 0.0
    if (t1 - m1) % 2 or (t2 - m2) % 2 or (t3 - m3) % 2:
        return 0.0
    total = 0.0
    for k in range(0, (t1 + t2 - t3) // 2 + 1):
        parts = (k, (t3 - t2 + m1) // 2 + k, (t3 - t1 - m2) // 2 + k, (t1 + t2 - t3) // 2 - k,
                 (t1 - m1) // 2 - k, (t2 + m2) // 2 - k)
        if min(parts) < 0:
            continue
        total += (-1) ** k / math.prod(f(p) for p in parts)
    pre = _delta(t1, t2, t3) * math.prod(f((t + m) // 2) * f((t - m) // 2)
                                         for t, m in ((t1, m1), (t2, m2), (t3, m3)))
    sign = -1 if ((t1 - t2 - m3) // 2) % 2 else 1
    return sign * math.sqrt(pre) * total


@lru_cache(maxsize=None)
def sixj2(a, b, c, d, e, g):
    if not (_tri(a, b, c) and _tri(a, e, g) and _tri(d, b, g) and _tri(d, e, c)):
        return 0.0
    lows = ((a + b + c) // 2, (a + e + g) // 2, (d + b + g) // 2, (d + e + c) // 2)
    highs = ((a + b + d + e) // 2, (b + c + e + g) // 2, (c + a + g + d) // 2)
    total = 0.0
    for t in range(max(lows), min(highs) + 1):
        den = math.prod(f(t - x) for x in lows) * math.prod(f(y - t) for y in highs)
        total += (-1) ** t * f(t + 1) / den
    return total * math.sqrt(_delta(a, b, c) * _delta(a, e, g) * _delta(d, b, g) * _delta(d, e, c))


@lru_cache(maxsize=None)
def ninej2(a, b, c, d, e, g, h, i, k):
    # Edmonds (6.4.3) for {a b c; d e g; h i k}: sum_x (-1)^(2x) (2x+1) {a b c; g k x}{d e g; b x i}{h i k; x a d}
    lo = max(abs(a - k), abs(d - i), abs(b - g))
    hi = min(a + k, d + i, b + g)
    total = 0.0
    for x in range(lo, hi + 1, 2):
        total += (-1) ** x * (x + 1) * sixj2(a, b, c, g, k, x) * sixj2(d, e, g, b, x, i) * sixj2(h, i, k, x, a, d)
    return total


def _d(v):
    twice = 2 * v
    n = int(round(float(twice)))
    assert abs(float(twice) - n) < 1e-12, v
    return n


def value(expr, env=None):
    """Complex float of ``expr`` with the symbols in ``env`` given numbers."""
    env = env or {}
    if isinstance(expr, Sum):
        return _sum(expr.function, list(reversed(expr.limits)), env)
    if isinstance(expr, Add):
        return sum(value(a, env) for a in expr.args)
    if isinstance(expr, Mul):
        out = 1.0
        for a in expr.args:
            out *= value(a, env)
            if out == 0:
                return 0.0
        return out
    if isinstance(expr, Pow):
        base, exp = expr.args
        if base == -1:
            return cmath.exp(1j * math.pi * value(exp, env).real)
        return complex(value(base, env)) ** value(exp, env)
    if isinstance(expr, Coupling3j):
        a = [_d(value(x, env).real) for x in expr.args]
        return threej2(*a)
    if isinstance(expr, CouplingBracket):
        j1, m1, j2, m2, J, M = (value(x, env).real for x in expr.args)
        t = threej2(_d(j1), _d(j2), _d(J), _d(m1), _d(m2), -_d(M))
        return cmath.exp(1j * math.pi * (j1 - j2 + M)) * math.sqrt(2 * J + 1) * t
    if isinstance(expr, Coupling6j):
        return sixj2(*[_d(value(x, env).real) for x in expr.args])
    if isinstance(expr, Coupling9j):
        return ninej2(*[_d(value(x, env).real) for x in expr.args])
    if isinstance(expr, KroneckerDelta):
        a, b = (value(x, env) for x in expr.args)
        return 1.0 if abs(a - b) < 1e-12 else 0.0
    if isinstance(expr, TriangleDelta):
        a, b, c = (_d(value(x, env).real) for x in expr.args)
        return 1.0 if _tri(a, b, c) else 0.0
    if isinstance(expr, Abs):
        return abs(value(expr.args[0], env))
    if expr.is_Symbol:
        return complex(env[expr])
    if expr.is_number:
        return complex(expr)
    raise TypeError(f"the oracle cannot evaluate {expr!r}")


def _sum(term, limits, env):
    if not limits:
        return value(term, env)
    (var, lo, hi), rest = limits[0], limits[1:]
    lo_v, hi_v = value(lo, env).real, value(hi, env).real
    total = 0.0
    v = lo_v
    while v <= hi_v + 1e-9:
        inner = dict(env)
        inner[var] = v
        total += _sum(term, rest, inner)
        v += 1
    return total
