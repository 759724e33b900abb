"""The integer kernels: packed prime-exponent vectors, canonical triples, small helpers.

These tests exercise the pure-Python kernels (their tables and internals), so the
compiled kernels are switched off here; ``test_compiled_kernel.py`` compares the two.
"""

import math
from fractions import Fraction

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import factorint

from amalgebra.coupling import kernels


pytestmark = pytest.mark.usefixtures("python_kernels_only")   # tests/coupling/conftest.py


def unpacked_factorial(n):
    kernels._grow(n)
    length = kernels._nprimes(max(n, 1))
    return dict(zip(kernels._primes[:length], kernels._unpack(kernels._fact_pack[n], length))) if length else {}


@given(st.integers(0, 600))
def test_factorial_vectors_follow_legendre(n):
    # Legendre's formula (common practice, no source), checked against sympy.factorint of n!
    expected = factorint(math.factorial(n)) if n > 1 else {}
    got = {p: e for p, e in unpacked_factorial(n).items() if e}
    assert got == expected


def test_tables_clear_and_regrow():
    kernels._grow(300)
    assert kernels._primes[-1] >= 293
    kernels.clear_tables()
    assert kernels._primes == [] and len(kernels._fact_pack) == 2
    assert kernels.threej_kernel(2, 2, 0, 2, -2, 0) == (1, 3, 3)   # (1 1 0; 1 -1 0) = 1/sqrt(3), DLMF 34.3.1
    assert kernels._primes[:4] == [2, 3, 5, 7]


def test_signed_exponents_survive_packing():
    # Packed vectors with negative digits add and subtract exactly (common practice, no source).
    kernels._grow(50)
    fp = kernels._fact_pack
    packed = fp[10] - 2 * fp[12] + fp[7]
    length = kernels._nprimes(12)
    value = Fraction(1)
    for p, e in zip(kernels._primes, kernels._unpack(packed, length)):
        value *= Fraction(p) ** e
    assert value == Fraction(math.factorial(10) * math.factorial(7), math.factorial(12) ** 2)


@given(st.integers(1, 10 ** 6), st.integers(1, 5000))
def test_multiply_sqrt_is_canonical(a, k):
    # sqrt(a) * sqrt(k) = u sqrt(v) with v squarefree (common practice, no source).
    n, d, s = kernels.multiply_sqrt(kernels.sqrt_triple(a % 5000 + 1), k)
    assert d == 1
    assert n * n * s == (a % 5000 + 1) * k
    assert all(e == 1 for e in factorint(s).values())


def _sq(triple):
    n, d, s = triple
    return Fraction(n * n * s, d * d) * (1 if n >= 0 else -1)


@given(st.integers(0, 120), st.integers(0, 120), st.data())
def test_threej_kernel_triples_are_reduced(t1, t2, data):
    # gcd(n, d) = 1, d > 0, s squarefree (checked by sympy.factorint).
    t3 = data.draw(st.sampled_from(range(abs(t1 - t2), t1 + t2 + 1, 2)))
    m1 = data.draw(st.sampled_from(range(-t1, t1 + 1, 2)))
    m2s = [m for m in range(-t2, t2 + 1, 2) if abs(m1 + m) <= t3]
    if not m2s:
        return
    m2 = data.draw(st.sampled_from(m2s))
    n, d, s = kernels.threej_kernel(t1, t2, t3, m1, m2, -m1 - m2)
    assert d > 0 and math.gcd(n, d) == 1
    assert all(e == 1 for e in factorint(s).values())


def test_ninej_kernel_vanishing_case():
    # {1 1 1; 1 1 1; 1 1 1} = 0 (odd sum of the nine j with a symmetric array; Edmonds 6.4.? from memory:
    # an odd permutation of equal rows gives (-1)^9 times itself).
    assert kernels.ninej_kernel(*(2,) * 9) == (0, 1, 1)


def test_sixj_racah_sum_value():
    # {1 1 1; 1 1 1} = 1/6 (Edmonds 1957 Table 5 / common value, from memory).
    alpha, beta = (3, 3, 3, 3), (4, 4, 4)
    assert _sq(kernels.sixj_kernel(alpha, beta)) == Fraction(1, 36)


def test_sparse_factorial_vectors_agree_with_dense(monkeypatch):
    # Above DENSE_LIMIT the packed vectors come from Legendre's formula on demand; both routes
    # must give the same triples (common practice, no source).
    cases3 = [(40, 38, 30, 4, -10, 6), (60, 61, 59, 2, -1, -1), (100, 100, 100, 0, 0, 0)]
    cases6 = [((30, 31, 29, 30), (45, 44, 46)), ((70, 70, 70, 70), (100, 100, 100))]
    dense3 = [kernels.threej_kernel(*c) for c in cases3]
    dense6 = [kernels.sixj_kernel(*c) for c in cases6]
    dense9 = kernels.ninej_kernel(8, 6, 4, 6, 8, 6, 4, 6, 8)
    kernels.clear_tables()
    monkeypatch.setattr(kernels, "DENSE_LIMIT", 10)
    assert [kernels.threej_kernel(*c) for c in cases3] == dense3
    assert [kernels.sixj_kernel(*c) for c in cases6] == dense6
    assert kernels.ninej_kernel(8, 6, 4, 6, 8, 6, 4, 6, 8) == dense9 != (0, 1, 1)
    assert len(kernels._fact_pack) <= 64
    kernels.clear_tables()


def test_very_large_j_uses_bounded_tables():
    # j = 2500: the dense table stays below DENSE_LIMIT entries; the value is a proper triple.
    kernels.clear_tables()
    n, d, s = kernels.threej_kernel(5000, 5000, 5000, 2, -2, 0)
    assert n != 0 and d > 0 and math.gcd(n, d) == 1
    assert len(kernels._fact_pack) <= kernels.DENSE_LIMIT
    assert Fraction(n * n * s, d * d) <= Fraction(1, 5001)  # (2j3+1) 3j^2 <= 1 by DLMF 34.3.16


def test_threads_growing_tables_agree_with_sequential():
    # common practice, no source: concurrent table growth gives the same triples as one thread.
    import threading
    cases = [(2 * j, 2 * j, 2 * k, 2, -2, 0) for j, k in ((5, 3), (40, 20), (150, 100), (300, 1), (90, 90))]
    expected = [kernels.threej_kernel(*c) for c in cases]
    results = {}

    def work(index):
        results[index] = [kernels.threej_kernel(*c) for c in reversed(cases)][::-1]

    for _ in range(3):
        kernels.clear_tables()
        threads = [threading.Thread(target=work, args=(i,)) for i in range(4)]
        for t in threads:
            t.start()
        for t in threads:
            t.join()
        assert all(results[i] == expected for i in range(4))


def _split_by_factorint(numerator, denominator):
    """``(u, w, s)`` with ``numerator / denominator = (u / w)^2 * s``, s squarefree, from sympy.factorint."""
    u = w = s = 1
    exponents = dict(factorint(numerator))
    for p, e in factorint(denominator).items():
        exponents[p] = exponents.get(p, 0) - e
    for p, e in exponents.items():
        if e & 1:
            s *= p
        if e >> 1 > 0:
            u *= p ** (e >> 1)
        elif e >> 1 < 0:
            w *= p ** -(e >> 1)
    return u, w, s


@given(st.lists(st.tuples(st.integers(0, 160), st.integers(-3, 3)), min_size=1, max_size=12),
       st.integers(-10 ** 30, 10 ** 30).filter(bool))
def test_split_square_matches_direct_factorisation(terms, factor):
    # factor * sqrt(prod (n!)^c) split into n/d * sqrt(s); the reference factorises the rational
    # directly with sympy.factorint (an independent route; common practice, no source).
    limit = max(n for n, _ in terms)
    fp = kernels._packs(limit)
    packed = sum(c * fp[n] for n, c in terms)
    numerator = math.prod(math.factorial(n) ** c for n, c in terms if c > 0)
    denominator = math.prod(math.factorial(n) ** -c for n, c in terms if c < 0)
    u, w, s = _split_by_factorint(numerator, denominator)
    g = math.gcd(factor * u, w)
    assert kernels._split_square(packed, max(limit, 1), factor) == (factor * u // g, w // g, s)


def test_split_square_zero_and_trivial_vectors():
    # common practice, no source: 0 stays (0, 1, 1); an empty vector leaves the factor alone.
    kernels._grow(20)
    assert kernels._split_square(kernels._fact_pack[7], 7, 0) == (0, 1, 1)
    assert kernels._split_square(0, 1, -5) == (-5, 1, 1)
    assert kernels._split_square(0, 20, 6) == (6, 1, 1)
    # 4!/7! = 1/210 = (1/210)^2 * 210: odd exponents for 2, 3, 5, 7 (2*3*5*7 = 210)
    assert kernels._split_square(kernels._fact_pack[4] - kernels._fact_pack[7], 7, 1) == (1, 210, 210)


@given(st.integers(0, 60), st.integers(0, 60), st.integers(0, 60), st.data())
def test_sorted_sixj_kernel_agrees_with_racah_sum_route(t1, t2, t4, data):
    # The direct-multiplicity radicand of sixj_kernel_sorted against the generic Racah sum plus the
    # four triangle coefficients assembled separately (Edmonds 1957 eq. 6.3.7; common practice).
    t3 = data.draw(st.sampled_from(range(abs(t1 - t2), t1 + t2 + 1, 2)))
    t5 = data.draw(st.sampled_from(range(abs(t4 - t3), t4 + t3 + 1, 2)))
    lo, hi = max(abs(t1 - t5), abs(t4 - t2)), min(t1 + t5, t4 + t2)
    t6s = [t for t in range(lo, hi + 1) if (t1 + t5 + t) % 2 == 0 and (t4 + t2 + t) % 2 == 0]
    if not t6s:
        return
    t6 = data.draw(st.sampled_from(t6s))
    alpha, beta = kernels._sixj_sums(t1, t2, t3, t4, t5, t6)
    top = max(beta) + 1
    fp = kernels._packs(top)
    p, packed = kernels.sixj_racah_sum(alpha, beta, fp)
    deltas = sum(kernels._delta_pack(fp, *triad) for triad in
                 ((t1, t2, t3), (t1, t5, t6), (t4, t2, t6), (t4, t5, t3)))
    expected = kernels._split_square(2 * packed + deltas, top, p)
    assert kernels.sixj_kernel_sorted(*sorted(alpha), *sorted(beta)) == expected
    assert kernels.sixj_kernel(alpha, beta) == expected
