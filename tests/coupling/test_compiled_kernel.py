"""The optional compiled 3j/6j kernels (C + GMP) against the pure-Python kernels and an independent reference.

The compiled kernels must give the *identical* canonical triples as
``kernels.threej_kernel_python`` and ``kernels.sixj_kernel_sorted_python`` for every
input, and agree with ``racah_reference`` (Racah's formulas in Fractions, Edmonds
1957 eqs. 3.7.3 and 6.3.7).
Locally the tests skip when the extension was not built; under ``CI=true`` its
absence is a failure (``.ci/run`` installs GMP's headers so that it builds).
"""

import importlib.util
import itertools
import math
import pathlib
from fractions import Fraction
from importlib import import_module

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from amalgebra.coupling import kernels, sixj
from amalgebra.testing.external import require_tool

_spec = importlib.util.spec_from_file_location("coupling_racah_reference_c",
                                               pathlib.Path(__file__).with_name("racah_reference.py"))
_reference = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_reference)
ref_sixj_sq = _reference.ref_sixj_sq
ref_threej_sq = _reference.ref_threej_sq


def compiled():
    module = kernels._compiled
    require_tool(module is not None, "the compiled 6j kernel (a C compiler and libgmp-dev at install time)")
    return module


def valid_sixj(t1, t2, t4, data):
    """Draw a 6j (doubled) obeying every triangle rule, or None."""
    t3 = data.draw(st.sampled_from(range(abs(t1 - t2), t1 + t2 + 1, 2)))
    t5 = data.draw(st.sampled_from(range(abs(t4 - t3), t4 + t3 + 1, 2)))
    lo, hi = max(abs(t1 - t5), abs(t4 - t2)), min(t1 + t5, t4 + t2)
    t6s = [t for t in range(lo, hi + 1) if (t1 + t5 + t) % 2 == 0 and (t4 + t2 + t) % 2 == 0]
    if not t6s:
        return None
    return t1, t2, t3, t4, t5, data.draw(st.sampled_from(t6s))


def sorted_key(tj):
    alpha, beta = kernels._sixj_sums(*tj)
    return (*sorted(alpha), *sorted(beta))


def signed_square(triple):
    n, d, s = triple
    return Fraction(n * abs(n) * s, d * d)


def test_backend_is_reported(monkeypatch):
    if kernels._compiled is not None:
        assert kernels.kernel_backend() == "compiled (GMP)"
    else:
        # a fallback says so; an explicit AMALGEBRA_PURE_PYTHON=1 is plain "python"
        monkeypatch.delenv("AMALGEBRA_PURE_PYTHON", raising=False)
        assert kernels.kernel_backend() == "python (compiled kernel not built)"
        monkeypatch.setenv("AMALGEBRA_PURE_PYTHON", "1")
        assert kernels.kernel_backend() == "python"


def test_compiled_kernel_is_built():
    compiled()


@settings(deadline=None)
@given(st.integers(0, 160), st.integers(0, 160), st.integers(0, 160), st.data())
def test_compiled_equals_python_kernel(t1, t2, t4, data):
    module = compiled()
    tj = valid_sixj(t1, t2, t4, data)
    if tj is None:
        return
    key = sorted_key(tj)
    got = module.sixj_sorted(*key)
    assert got == kernels.sixj_kernel_sorted_python(*key)
    n, d, s = got
    assert d > 0 and math.gcd(n, d) == 1  # canonical form (design.md)


@settings(deadline=None)
@given(st.integers(0, 24), st.integers(0, 24), st.integers(0, 24), st.data())
def test_compiled_kernel_against_racah_formula(t1, t2, t4, data):
    # Racah's single sum in Fractions, Edmonds (1957) eq. 6.3.7 (racah_reference.py, independent of amalgebra).
    module = compiled()
    tj = valid_sixj(t1, t2, t4, data)
    if tj is None:
        return
    got = module.sixj_sorted(*sorted_key(tj))
    assert signed_square(got) == ref_sixj_sq(*tj)
    n, d, s = got
    assert all(s % (p * p) for p in range(2, math.isqrt(s) + 1))  # s squarefree


@pytest.mark.parametrize("a, b, c", [(1, 1, 2), (3, 2, 3), (40, 38, 30), (99, 100, 101)])
def test_published_values_through_the_compiled_route(a, b, c):
    # {a b c; 0 c b} = (-1)^(a+b+c) / sqrt((2b+1)(2c+1)), Edmonds (1957) eq. 6.3.2 (number from memory);
    # a, b, c doubled here.
    module = compiled()
    got = module.sixj_sorted(*sorted_key((a, b, c, 0, c, b)))
    sign = -1 if (a + b + c) // 2 % 2 else 1
    assert signed_square(got) == Fraction(sign, (b + 1) * (c + 1))


def valid_threej(t1, t2, data):
    """Draw a 3j (doubled) obeying every selection rule."""
    t3 = data.draw(st.sampled_from(range(abs(t1 - t2), t1 + t2 + 1, 2)))
    m1 = data.draw(st.sampled_from(range(-t1, t1 + 1, 2)))
    lo = max(-t2, -t3 - m1)
    hi = min(t2, t3 - m1)
    m2s = [m for m in range(lo, hi + 1) if (m + t2) % 2 == 0]
    m2 = data.draw(st.sampled_from(m2s))
    return t1, t2, t3, m1, m2, -m1 - m2


@settings(deadline=None)
@given(st.integers(0, 200), st.integers(0, 200), st.data())
def test_compiled_threej_equals_python_kernel(t1, t2, data):
    module = compiled()
    args = valid_threej(t1, t2, data)
    got = module.threej(*args)
    assert got == kernels.threej_kernel_python(*args)
    n, d, s = got
    assert d > 0 and math.gcd(n, d) == 1


@settings(deadline=None)
@given(st.integers(0, 20), st.integers(0, 20), st.data())
def test_compiled_threej_against_racah_formula(t1, t2, data):
    # Racah's 3j formula in Fractions, Edmonds (1957) eq. 3.7.3 (racah_reference.py, independent of amalgebra).
    module = compiled()
    args = valid_threej(t1, t2, data)
    assert signed_square(module.threej(*args)) == ref_threej_sq(*args)


def test_threej_argument_checks():
    module = compiled()
    for bad in ((2, 2, 2, 1, -1, 0), (2, 2, 2, 2, 2, -4), (2, 2, 6, 0, 0, 0), (2, 2, 2, 2, 0, 0)):
        with pytest.raises(ValueError, match="selection rule"):
            module.threej(*bad)
    with pytest.raises(OverflowError):
        module.threej(4096, 4096, 4096, 0, 0, 0)


def test_argument_checks():
    module = compiled()
    with pytest.raises(ValueError, match="a1<=a2<=a3<=a4"):
        module.sixj_sorted(3, 2, 3, 3, 4, 4, 4)
    with pytest.raises(OverflowError):
        module.sixj_sorted(0, 0, 0, 0, module.TOP_LIMIT, module.TOP_LIMIT, module.TOP_LIMIT)


def test_beyond_the_table_falls_back_to_python(monkeypatch):
    # Above the compiled table the dispatchers must take the Python kernels; force that with tiny limits.
    compiled()
    key = sorted_key((40, 38, 30, 36, 34, 28))
    args3 = (40, 38, 30, 4, -10, 6)
    expected = kernels.sixj_kernel_sorted_python(*key), kernels.threej_kernel_python(*args3)
    monkeypatch.setattr(kernels, "_COMPILED_TOP", 10)
    monkeypatch.setattr(kernels, "_COMPILED_TOP_DOUBLED", 10)
    monkeypatch.setattr(kernels, "_compiled", None)  # would raise AttributeError if still called
    assert (kernels.sixj_kernel_sorted(*key), kernels.threej_kernel(*args3)) == expected


def test_clear_and_regrow_tables():
    module = compiled()
    key = sorted_key((100, 100, 100, 100, 100, 100))
    first = module.sixj_sorted(*key)
    kernels.clear_tables()
    assert module.sixj_sorted(*key) == first == kernels.sixj_kernel_sorted_python(*key)


def test_pure_python_switch_is_honoured(monkeypatch):
    # AMALGEBRA_PURE_PYTHON=1 at import time disables the compiled kernel (documented in kernels.py).
    monkeypatch.setenv("AMALGEBRA_PURE_PYTHON", "1")
    assert kernels._load_compiled() is None
    monkeypatch.setenv("AMALGEBRA_PURE_PYTHON", "0")
    built = importlib.util.find_spec("amalgebra.coupling._racah6j") is not None
    assert kernels._load_compiled() is (import_module("amalgebra.coupling._racah6j") if built else None)


@pytest.mark.slow
def test_exhaustive_small_and_large_sweeps():
    module = compiled()
    # every 6j with all j <= 6 (doubled <= 12)
    for tj in itertools.product(range(13), repeat=6):
        if not all(kernels_triangle(*t) for t in ((tj[0], tj[1], tj[2]), (tj[0], tj[4], tj[5]),
                                                    (tj[3], tj[1], tj[5]), (tj[3], tj[4], tj[2]))):
            continue
        key = sorted_key(tj)
        assert module.sixj_sorted(*key) == kernels.sixj_kernel_sorted_python(*key)
    # every 3j with all j <= 5
    for t1, t2, t3 in itertools.product(range(11), repeat=3):
        if not kernels_triangle(t1, t2, t3):
            continue
        for m1 in range(-t1, t1 + 1, 2):
            for m2 in range(-t2, t2 + 1, 2):
                m3 = -m1 - m2
                if abs(m3) <= t3:
                    assert module.threej(t1, t2, t3, m1, m2, m3) == kernels.threej_kernel_python(
                        t1, t2, t3, m1, m2, m3)
    assert module.threej(2730, 2730, 2730, 2, -2, 0) == kernels.threej_kernel_python(2730, 2730, 2730, 2, -2, 0)
    # j up to about 1000 (factorial arguments near the table limit)
    for tj in ((2000, 2000, 2000, 2000, 2000, 2000), (1999, 1001, 1000, 1500, 1200, 1701),
               (1800, 1700, 300, 1750, 1650, 200)):
        assert all(kernels_triangle(*t) for t in ((tj[0], tj[1], tj[2]), (tj[0], tj[4], tj[5]),
                                                    (tj[3], tj[1], tj[5]), (tj[3], tj[4], tj[2])))
        key = sorted_key(tj)
        assert module.sixj_sorted(*key) == kernels.sixj_kernel_sorted_python(*key)


def kernels_triangle(a, b, c):
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def valid_ninej(data, top):
    """Draw a 9j (doubled, row by row) whose rows and columns obey the triangle rule, or None."""
    a, b, d, e = (data.draw(st.integers(0, top)) for _ in range(4))
    c = data.draw(st.sampled_from(range(abs(a - b), a + b + 1, 2)))
    f = data.draw(st.sampled_from(range(abs(d - e), d + e + 1, 2)))
    g = data.draw(st.sampled_from(range(abs(a - d), a + d + 1, 2)))
    h = data.draw(st.sampled_from(range(abs(b - e), b + e + 1, 2)))
    lo, hi = max(abs(g - h), abs(c - f)), min(g + h, c + f)
    choices = [i for i in range(lo, hi + 1) if (g + h + i) % 2 == 0 and (c + f + i) % 2 == 0]
    if not choices:
        return None
    return a, b, c, d, e, f, g, h, data.draw(st.sampled_from(choices))


@given(st.data())
def test_compiled_ninej_equals_python_kernel(data):
    # issue 16: the 9j on the compiled path gives the identical triple (j up to 30 here)
    module = compiled()
    args = valid_ninej(data, 60)
    if args is None:
        return
    got = module.ninej(*args)
    assert got == kernels.ninej_kernel_python(*args)
    n, d, s = got
    assert d > 0 and math.gcd(n, d) == 1


@given(st.data())
def test_compiled_ninej_against_racah_formula(data):
    # Edmonds (1957) eq. 6.4.3 summed in Fractions (racah_reference.py, independent of amalgebra)
    module = compiled()
    args = valid_ninej(data, 8)
    if args is None:
        return
    assert signed_square(module.ninej(*args)) == _reference.ref_ninej_sq(*args)


def test_ninej_argument_checks_and_dispatch(monkeypatch):
    module = compiled()
    with pytest.raises(ValueError, match="triangle rule"):
        module.ninej(2, 2, 6, 2, 2, 2, 2, 2, 2)
    with pytest.raises(OverflowError):
        module.ninej(*(3000,) * 9)
    # the dispatcher takes the Python kernel beyond the table (forced with a tiny limit)
    args = (8, 6, 4, 6, 8, 6, 4, 6, 8)
    expected = module.ninej(*args)
    monkeypatch.setattr(kernels, "_COMPILED_TOP", 5)
    monkeypatch.setattr(kernels, "_compiled", None)  # would raise AttributeError if still called
    assert kernels.ninej_kernel(*args) == expected == kernels.ninej_kernel_python(*args)


def test_sixj_from_key_falls_back_beyond_the_table():
    # the cache wraps the compiled function; beyond its table it calls the Python kernel
    module = compiled()
    key = (4500, 4500, 4500, 4500, 6000, 6000, 6000)   # {j ...} with all j = 1500
    assert module.sixj_from_key(key) == kernels.sixj_kernel_sorted_python(*key)
    small = (3, 3, 3, 3, 4, 4, 4)
    assert module.sixj_from_key(small) == module.sixj_sorted(*small) == (1, 6, 1)  # {1 1 1; 1 1 1} = 1/6
    with pytest.raises(TypeError):
        module.sixj_from_key((1, 2, 3))


@pytest.mark.slow
def test_exhaustive_small_ninej_sweep():
    # every 9j with all j <= 2 (doubled <= 4): compiled == Python, and == Edmonds 6.4.3 in Fractions
    module = compiled()
    for a, b, d, e in itertools.product(range(5), repeat=4):
        for c, f, g, h in itertools.product(range(abs(a - b), a + b + 1, 2), range(abs(d - e), d + e + 1, 2),
                                            range(abs(a - d), a + d + 1, 2), range(abs(b - e), b + e + 1, 2)):
            for i in range(max(abs(g - h), abs(c - f)), min(g + h, c + f) + 1, 2):
                if (g + h + i) % 2 or (c + f + i) % 2:
                    continue
                got = module.ninej(a, b, c, d, e, f, g, h, i)
                assert got == kernels.ninej_kernel_python(a, b, c, d, e, f, g, h, i)
                assert signed_square(got) == _reference.ref_ninej_sq(a, b, c, d, e, f, g, h, i)
