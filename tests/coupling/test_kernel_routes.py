"""The pure-Python kernels' fast routes (issue 16) against independent references.

* the 9j by the three-term recurrence in x (``ninej_kernel_python``) against Edmonds (6.4.3)
  summed in Fractions (``racah_reference.py``, never calling amalgebra), for short and long
  x-ranges and j up to 60;
* the byte route of ``_split_square`` against plain exponent arithmetic and against the
  digit-mask route (``_split_square_wide``), on both sides of its 127 bound;
* ``sixj_key_plain`` (triangle rules as ``min(beta) >= max(alpha)``) against the rules written out.

The compiled kernels are switched off here, so the Python kernels run whatever is built.
"""

import importlib.util
import math
import pathlib
import random
from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st
from sympy import factorint

from amalgebra.coupling import kernels

_spec = importlib.util.spec_from_file_location("coupling_racah_reference_routes",
                                               pathlib.Path(__file__).with_name("racah_reference.py"))
_reference = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_reference)


pytestmark = pytest.mark.usefixtures("python_kernels_only")   # tests/coupling/conftest.py


def signed_square(triple):
    n, d, s = triple
    return Fraction(n * abs(n) * s, d * d)


def assert_canonical(triple):
    n, d, s = triple
    assert d > 0 and s >= 1 and math.gcd(n, d) == 1
    assert all(e == 1 for e in factorint(s).values())
    if n == 0:
        assert triple == (0, 1, 1)


def _tri(a, b, c):
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def random_ninej(rng, tmin, tmax):
    """A seeded 9j (doubled, row by row) whose rows and columns obey the triangle rule."""
    while True:
        a, b, d, e = (rng.randint(tmin, tmax) for _ in range(4))
        c = rng.choice(range(abs(a - b), a + b + 1, 2))
        f = rng.choice(range(abs(d - e), d + e + 1, 2))
        g = rng.choice(range(abs(a - d), a + d + 1, 2))
        h = rng.choice(range(abs(b - e), b + e + 1, 2))
        choices = [i for i in range(max(abs(g - h), abs(c - f)), min(g + h, c + f) + 1, 2)
                   if (g + h + i) % 2 == 0 and max(a, b, c, d, e, f, g, h, i) <= max(tmax, 2 * tmax - 2)]
        if choices:
            return a, b, c, d, e, f, g, h, rng.choice(choices)


def x_range(a, b, c, d, e, f, g, h, i):
    """Number of x values of Edmonds (6.4.3) for the 9j {a b c; d e f; g h i} (doubled)."""
    lo = max(abs(a - i), abs(b - f), abs(d - h))
    hi = min(a + i, b + f, d + h)
    return (hi - lo) // 2 + 1 if hi >= lo else 0


@given(st.data())
def test_ninej_recurrence_kernel_against_edmonds_6_4_3(data):
    # independent: Edmonds (1957) eq. 6.4.3 summed in Fractions (racah_reference.ref_ninej_sq)
    rng = random.Random(data.draw(st.integers(0, 2 ** 32)))
    args = random_ninej(rng, 0, 14)
    got = kernels.ninej_kernel_python(*args)
    assert_canonical(got)
    assert signed_square(got) == _reference.ref_ninej_sq(*args)


def test_ninej_recurrence_kernel_short_and_long_x_ranges():
    # independent: Edmonds (1957) eq. 6.4.3 in Fractions.  Every length of the x-range from 1
    # (no recurrence step) to 4 appears, half-integer x too, plus ranges starting at x = 0.
    rng = random.Random(20261204)
    seen = {}
    while len(seen) < 4 or min(len(v) for v in seen.values()) < 6:
        args = random_ninej(rng, 0, 12)
        m = x_range(*args)
        if 1 <= m <= 4 and len(seen.setdefault(m, [])) < 6:
            seen[m].append(args)
    cases = [args for group in seen.values() for args in group]
    cases += [(2, 2, 0, 2, 2, 0, 0, 0, 0), (4, 4, 8, 4, 4, 8, 8, 8, 16), (1, 1, 2, 1, 1, 2, 2, 2, 4),
              (3, 3, 0, 3, 3, 0, 0, 0, 0), (6, 4, 2, 6, 4, 2, 0, 0, 0)]
    odd_start = [args for args in cases if max(abs(args[0] - args[8]), abs(args[1] - args[5]),
                                               abs(args[3] - args[7])) % 2]
    assert odd_start, "no half-integer x in the sample"
    for args in cases:
        got = kernels.ninej_kernel_python(*args)
        assert_canonical(got)
        assert signed_square(got) == _reference.ref_ninej_sq(*args), args


def test_ninej_recurrence_kernel_large_j_seeded():
    # independent: Edmonds (1957) eq. 6.4.3 in Fractions, j up to 60 (long recurrences, x-ranges
    # of up to ~100 values; a few cases because the Fraction reference is slow)
    rng = random.Random(16)
    cases = [random_ninej(rng, 80, 120) for _ in range(2)] + [random_ninej(rng, 40, 100) for _ in range(3)]
    assert max(x_range(*args) for args in cases) >= 30
    for args in cases:
        got = kernels.ninej_kernel_python(*args)
        assert_canonical(got)
        assert signed_square(got) == _reference.ref_ninej_sq(*args), args


def _pack(exponents):
    """Packed vector sum_i e_i 2^(32 i) (signed digits), the kernels' layout."""
    return sum(e << (32 * i) for i, e in enumerate(exponents))


def _split_by_exponents(exponents, primes, factor):
    """factor * sqrt(prod p^e) as (n, d, s) by plain exponent arithmetic (common practice, no source)."""
    n, d, s = factor, 1, 1
    for p, e in zip(primes, exponents):
        half, odd = divmod(e, 2)
        s *= p ** odd
        if half > 0:
            n *= p ** half
        else:
            d *= p ** -half
    g = math.gcd(n, d)
    return n // g, d // g, s


@pytest.mark.parametrize("bound", [1, 127, 128, 129, 300])
def test_split_square_byte_route_and_wide_route(monkeypatch, bound):
    # common practice, no source: exponents up to +-bound on the odd primes (the byte route takes
    # -128 <= e <= 127, the digit-mask route the rest) and large ones on 2; both routes give the
    # triple of plain exponent arithmetic, and the route taken is the one the exponents ask for
    kernels._grow(400)
    primes = kernels._primes
    rng = random.Random(bound)
    wide_calls = []
    wide = kernels._split_square_wide
    monkeypatch.setattr(kernels, "_split_square_wide", lambda *a: wide_calls.append(a) or wide(*a))
    for length in (2, 3, 17, 78):
        limit = primes[length - 1]
        for _ in range(30):
            exponents = [rng.randint(-3000, 3000)] + [rng.randint(-bound, bound) for _ in range(length - 1)]
            exponents[rng.randrange(1, length)] = rng.choice((bound, -bound))
            factor = rng.choice((1, -1, 6, 35 * 2 ** 40 + 1, -(3 ** 50)))
            packed = _pack(exponents)
            expected = _split_by_exponents(exponents, primes, factor)
            before = len(wide_calls)
            assert kernels._split_square(packed, limit, factor) == expected
            assert (len(wide_calls) > before) == any(not -128 <= e <= 127 for e in exponents[1:])
            assert wide(packed, length, factor, kernels._tables) == expected
            assert_canonical(expected)


def test_split_square_byte_route_negative_top_digit():
    # common practice, no source: a negative exponent below -128 on the last prime makes the whole
    # biased vector negative; the route check must send it to the wide route, not misread bytes
    kernels._grow(100)
    primes = kernels._primes
    exponents = [4, 1, 0, -1, -200]
    limit = primes[len(exponents) - 1]
    assert kernels._split_square(_pack(exponents), limit, 1) == _split_by_exponents(exponents, primes, 1)


def _key_by_the_rules(t1, t2, t3, t4, t5, t6):
    # independent: the four triangle rules of a 6j {t1 t2 t3; t4 t5 t6} written out (Edmonds 6.2)
    if not (_tri(t1, t2, t3) and _tri(t1, t5, t6) and _tri(t4, t2, t6) and _tri(t4, t5, t3)):
        return 0
    alpha = sorted(((t1 + t2 + t3) // 2, (t1 + t5 + t6) // 2, (t4 + t2 + t6) // 2, (t4 + t5 + t3) // 2))
    beta = sorted(((t1 + t2 + t4 + t5) // 2, (t2 + t3 + t5 + t6) // 2, (t3 + t1 + t6 + t4) // 2))
    return tuple(alpha + beta)


@given(st.lists(st.integers(0, 14), min_size=6, max_size=6))
def test_sixj_key_plain_is_the_triangle_rules(tj):
    assert kernels.sixj_key_plain(*tj) == _key_by_the_rules(*tj)


def test_sixj_key_plain_exhaustive_small():
    # every doubled argument tuple up to 4 (the rules written out as the reference)
    import itertools
    zeros = 0
    for tj in itertools.product(range(5), repeat=6):
        expected = _key_by_the_rules(*tj)
        zeros += expected == 0
        assert kernels.sixj_key_plain(*tj) == expected, tj
    assert 0 < zeros < 5 ** 6
