"""Coupling caches under threads, the input limit of the coupling functions, the fallback notice,
and the direct construction of SymPy results from kernel triples (issues 16 and 17).

Values are checked against ``racah_reference.py`` (Racah's formulas in Fractions, Edmonds 1957
eqs. 3.7.3, 6.3.7, 6.4.3; independent of amalgebra) or named identities.
"""

import importlib.util
import math
import pathlib
import sys
import threading
import time
import warnings
from fractions import Fraction

import pytest
from hypothesis import given
from hypothesis import strategies as st
from sympy import Integer, Mul, Pow, Rational, S, sqrt, srepr

from amalgebra.coupling import (cg, cg_float, clear_coupling_caches, coefficients, kernels, ninej, ninej_float,
                                racah_w, sixj, sixj_float, threej, threej_float)
from amalgebra.errors import LimitError
from amalgebra.limits import input_limits

_spec = importlib.util.spec_from_file_location("coupling_racah_reference_t",
                                               pathlib.Path(__file__).with_name("racah_reference.py"))
_reference = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_reference)


def signed_square(value):
    """Signed square of a SymPy value r*sqrt(s), as a Fraction."""
    q = Fraction(int((value ** 2).p), int((value ** 2).q))
    return q if value >= 0 else -q


def triple_square(triple):
    n, d, s = triple
    return Fraction(n * abs(n) * s, d * d)


SIXJ_CASES = [(2, 2, 2, 2, 2, 2), (4, 6, 4, 2, 4, 6), (20, 18, 14, 16, 12, 10), (61, 59, 40, 57, 37, 44),
              (100, 98, 90, 94, 92, 88), (7, 5, 4, 5, 7, 6)]
THREEJ_CASES = [(2, 2, 2, 2, -2, 0), (40, 38, 30, 4, -10, 6), (61, 59, 40, 1, -3, 2), (90, 90, 90, 0, 0, 0)]
NINEJ_CASES = [(2, 2, 2, 2, 2, 2, 2, 2, 2), (1, 1, 2, 1, 1, 2, 2, 2, 4), (4, 2, 4, 2, 4, 4, 4, 4, 6),
               (6, 4, 4, 4, 6, 4, 4, 4, 6)]


def _expected():
    # Edmonds (1957) eqs. 6.3.7, 3.7.3, 6.4.3 in Fractions (racah_reference.py)
    return ([_reference.ref_sixj_sq(*c) for c in SIXJ_CASES], [_reference.ref_threej_sq(*c) for c in THREEJ_CASES],
            [_reference.ref_ninej_sq(*c) for c in NINEJ_CASES])


@pytest.fixture
def fast_switching():
    old = sys.getswitchinterval()
    sys.setswitchinterval(1e-6)  # interleave the threads as finely as the interpreter allows
    yield
    sys.setswitchinterval(old)


def _run_threads(work, clearer, n_threads=4, rounds=40):
    errors, results = [], []

    def runner():
        try:
            for _ in range(rounds):
                results.append(work())
        except Exception as exc:  # collected and re-raised in the main thread
            errors.append(exc)

    threads = [threading.Thread(target=runner) for _ in range(n_threads)]
    for t in threads:
        t.start()
    while any(t.is_alive() for t in threads):
        clearer()
    for t in threads:
        t.join()
    assert not errors, errors[:3]
    return results


def test_clearing_caches_while_threads_evaluate_public_functions(fast_switching):
    # issue 17: clear_coupling_caches() during evaluation raised IndexError or gave a 6j off by its
    # rational factor; every value must equal the Fraction reference (Edmonds 6.3.7, 3.7.3, 6.4.3).
    six, three, nine = _expected()

    def work():
        return ([signed_square(sixj(*[Rational(t, 2) for t in c])) for c in SIXJ_CASES],
                [signed_square(threej(*[Rational(t, 2) for t in c])) for c in THREEJ_CASES],
                [signed_square(ninej(*[Rational(t, 2) for t in c])) for c in NINEJ_CASES])

    def clearer():
        clear_coupling_caches()
        kernels.clear_tables()   # the heavier release must be just as safe

    for got in _run_threads(work, clearer):
        assert got == (six, three, nine)


def test_clearing_tables_while_threads_run_the_python_kernels(fast_switching):
    # The pure-Python kernels directly (the route that returned wrong values), tables released
    # and regrown under them; reference: Edmonds 6.3.7 / 3.7.3 / 6.4.3 in Fractions.
    six, three, nine = _expected()
    keys = [kernels.sixj_key_plain(*c) for c in SIXJ_CASES]

    def work():
        return ([triple_square(kernels.sixj_kernel_sorted_python(*k)) for k in keys],
                [triple_square(kernels.threej_kernel_python(*c)) for c in THREEJ_CASES],
                [triple_square(kernels.ninej_kernel_python(*c)) for c in NINEJ_CASES])

    for got in _run_threads(work, kernels.clear_tables):
        assert got == (six, three, nine)


def test_value_caches_clear_but_tables_stay():
    # issue 16: the prime/factorial tables are kept across clear_coupling_caches()
    sixj(30, 30, 30, 30, 30, 30)
    kernels.threej_kernel_python(200, 200, 200, 0, 0, 0)
    size = len(kernels._fact_pack)
    clear_coupling_caches()
    assert len(kernels._fact_pack) == size >= 200
    assert coefficients._sixj_canonical.cache_info().currsize == 0


# ---- limits (issue 17): typed errors, correct trivial answers, refusal before any work ----

HUGE = [10 ** 100, 10 ** 300, Integer(10) ** 100, 1e300]


@pytest.mark.parametrize("j", HUGE)
def test_huge_j_gives_a_typed_error_not_overflow(j):
    # every call is nonzero by the selection rules, so there is no trivial answer: LimitError
    # (a ValueError), never OverflowError / MemoryError
    calls = [(cg, (j, 0, j, 0, 2 * j, 0)), (cg_float, (j, 0, j, 0, 2 * j, 0)),
             (threej, (j, j, 2 * j, 0, 0, 0)), (threej_float, (j, j, 2 * j, 0, 0, 0)),
             (sixj, (j,) * 6), (sixj_float, (j,) * 6), (racah_w, (j,) * 6),
             (ninej, (j, j, 0, j, j, 0, 0, 0, 0)), (ninej_float, (j, j, 0, j, j, 0, 0, 0, 0))]
    for func, args in calls:
        start = time.perf_counter()
        with pytest.raises(LimitError, match=r"must be at most max_(coupling|ninej)_j=\d+.*input_limits"):
            func(*args)
        assert time.perf_counter() - start < 1.0, func  # refused before any work (common practice)
    assert issubclass(LimitError, ValueError)


@pytest.mark.parametrize("j", [10 ** 8, 10 ** 100, 10 ** 300])
def test_huge_j_with_trivial_answers(j):
    # <j1 m1 0 0|j1 m1> = 1, <0 0 j2 m2|j2 m2> = 1, stretched <j j j j|2j 2j> = 1 (Condon-Shortley,
    # Edmonds 1957 eq. 3.5.15 and the phase convention; from memory), returned at once for any size
    assert cg(j, j, 0, 0, j, j) == 1 == cg(0, 0, j, -j, j, -j) == cg(j, j, j, j, 2 * j, 2 * j)
    assert cg(j, -j, j, -j, 2 * j, -2 * j) == 1 and cg_float(j, j, 0, 0, j, j) == 1.0
    # selection-rule zeros (DLMF 34.2: m1 + m2 = M, triangle rule, parity of the all-zero-m 3j)
    assert cg(j, 0, 1, 0, j, 1) == 0                     # m1 + m2 != M
    assert threej(j, j, 1, 0, 0, 0) == 0                 # j1 + j2 + j3 odd with all m = 0
    assert sixj(j, j, 3 * j, j, j, j) == 0               # triangle rule broken
    assert ninej(j, j, 3 * j, j, j, j, j, j, j) == 0     # row triangle broken
    assert threej_float(j, j, 1, 0, 0, 0) == 0.0


def test_cg_of_ten_to_the_eight_is_immediate():
    # issue 17: cg(10**8, 10**8, 0, 0, 10**8, 10**8) took 8 GB; it is exactly 1 (j2 = 0)
    start = time.perf_counter()
    assert cg(10 ** 8, 10 ** 8, 0, 0, 10 ** 8, 10 ** 8) == 1
    with pytest.raises(LimitError, match="j1=100000000 must be at most max_coupling_j"):
        cg(10 ** 8, 1, 1, -1, 10 ** 8, 0)
    assert time.perf_counter() - start < 1.0


def test_limit_can_be_raised_and_lowered_locally():
    # {1 1 1; 1 1 1} = 1/6 (Edmonds 1957, table 5; from memory)
    with input_limits(max_coupling_j=1):
        assert sixj(1, 1, 1, 1, 1, 1) == Rational(1, 6)
        with pytest.raises(LimitError, match="j1=2 must be at most max_coupling_j=1"):
            sixj(2, 2, 2, 2, 2, 2)
        with pytest.raises(LimitError, match="j3=2 must be at most max_coupling_j=1"):
            threej(1, 1, 2, 0, 0, 0)
        with pytest.raises(LimitError):
            cg_float(1, 0, 1, 0, 2, 0)
    with input_limits(max_ninej_j=1):
        with pytest.raises(LimitError, match="max_ninej_j=1"):
            ninej(2, 2, 2, 2, 2, 2, 2, 2, 2)
    with input_limits(max_coupling_j=None):   # no limit: a value beyond the default
        value = cg(10001, 10001, 1, -1, 10001, 10000)
    # <j j 1 -1|j j-1> = +sqrt((j1+M+1)(j1-M)/(2 j1 (j1+1))) = +sqrt(1/(j+1)) (Condon-Shortley table for
    # j2 = 1, Edmonds 1957 table 2; from memory), its square also against Racah's 3j formula in Fractions
    assert signed_square(value) == Fraction(1, 10002)
    assert abs(_reference.ref_threej_sq(20002, 2, 20002, 20002, -2, -20000)) * 20003 == Fraction(1, 10002)


def test_table_cg_refuses_quickly():
    # issue 17: `amalgebra table cg 99999999 1` ran for ever; it is refused before any work
    from amalgebra.cli import EXIT_USAGE, main
    start = time.perf_counter()
    assert main(["table", "cg", "99999999", "1"]) == EXIT_USAGE
    assert main(["table", "sixj", "100000", "1", "100000", "1", "100000", "1"]) == EXIT_USAGE
    assert time.perf_counter() - start < 2.0


# ---- the fallback notice (issue 16 item 3) ----

def test_fallback_is_announced_once(monkeypatch):
    monkeypatch.setattr(kernels, "_fallback_pending", True)
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        kernels.warn_fallback_once()
        kernels.warn_fallback_once()
    notices = [w for w in caught if issubclass(w.category, kernels.KernelFallbackWarning)]
    assert len(notices) == 1
    assert "pure-Python kernel runs" in str(notices[0].message)
    assert "AMALGEBRA_PURE_PYTHON=1" in str(notices[0].message)
    assert kernels._fallback_pending is False


def test_fallback_notice_fires_on_first_evaluation(monkeypatch):
    # the cache-miss paths call the notice (the Python routes of 3j and 9j; 6j when not compiled)
    monkeypatch.setattr(kernels, "_fallback_pending", True)
    clear_coupling_caches()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        threej(3, 3, 3, 1, -1, 0)
        ninej(1, 1, 1, 1, 1, 1, 1, 1, 2)
    assert sum(issubclass(w.category, kernels.KernelFallbackWarning) for w in caught) == 1


# ---- SymPy results built directly from the kernel triple equal the generic construction ----

def _squarefree(n):
    return all(n % (p * p) for p in range(2, math.isqrt(n) + 1))


@given(st.integers(-10 ** 40, 10 ** 40), st.integers(1, 10 ** 30),
       st.integers(1, 10 ** 6).filter(_squarefree))
def test_direct_construction_equals_generic(n, d, s):
    # common practice, no source: the direct slot-by-slot construction must give SymPy's own
    # canonical objects: same type, args, hash, srepr, printing, and arithmetic
    g = math.gcd(n, d)
    n, d = n // g, d // g
    fast = coefficients._to_sympy((n, d, s))
    generic = Rational(n, d) * sqrt(Integer(s))
    assert type(fast) is type(generic)
    assert fast == generic and hash(fast) == hash(generic)
    assert fast.args == generic.args and srepr(fast) == srepr(generic) and str(fast) == str(generic)
    assert fast ** 2 == Rational(n * n * s, d * d)
    assert (fast - generic) == 0 and fast.is_positive == generic.is_positive


def test_direct_construction_special_parts():
    # the singletons come back as themselves (common practice, no source)
    assert coefficients._to_sympy((0, 1, 1)) is S.Zero
    assert coefficients._to_sympy((1, 1, 1)) is S.One
    assert coefficients._to_sympy((-1, 1, 1)) is S.NegativeOne
    assert coefficients._to_sympy((1, 2, 1)) is S.Half
    root = coefficients._to_sympy((1, 1, 6))
    assert type(root) is Pow and root == sqrt(6) and root.args == (Integer(6), S.Half)
    assert type(coefficients._to_sympy((-1, 1, 6))) is Mul
    assert coefficients._to_sympy is coefficients._fast_value   # the import-time check passed here


# ---- the one-step 6j route: compiled and Python twins agree ----

_values = st.one_of(st.integers(-3, 12), st.integers(0, 24).map(lambda t: Rational(t, 2)),
                    st.sampled_from([True, 0.5, "1/2", Rational(1, 3), 10 ** 30, Integer(2) ** 70]))


@given(st.lists(_values, min_size=6, max_size=6))
def test_one_step_sixj_key_twins_agree(values):
    if kernels._compiled is None:
        pytest.skip("compiled sixj_key not built")
    assert kernels._compiled.sixj_key(*values) == coefficients._sixj_key_python(*values)


@given(st.lists(st.integers(0, 14), min_size=6, max_size=6))
def test_one_step_sixj_route_against_reference(tj):
    # Racah's formula in Fractions (Edmonds 1957 eq. 6.3.7, racah_reference.py); triangle zeros included
    expected = _reference.ref_sixj_sq(*tj)
    assert signed_square(sixj(*[Rational(t, 2) for t in tj])) == expected
    assert signed_square(sixj(*[t // 2 if t % 2 == 0 else Rational(t, 2) for t in tj])) == expected


def test_missing_extension_is_announced_in_a_fresh_process():
    # a fresh interpreter where the extension cannot be imported (as after a build without GMP):
    # kernel_backend() says so, the first evaluation warns once, values are unchanged
    # ({1 1 1; 1 1 1} = 1/6, Edmonds 1957 table 5; from memory)
    import os
    import subprocess
    code = (
        "import sys, warnings\n"
        "sys.modules['amalgebra.coupling._racah6j'] = None\n"
        "warnings.simplefilter('always')\n"
        "with warnings.catch_warnings(record=True) as caught:\n"
        "    from amalgebra.coupling import kernel_backend, sixj, threej, KernelFallbackWarning\n"
        "    values = [sixj(1, 1, 1, 1, 1, 1), sixj(2, 2, 2, 2, 2, 2), threej(1, 1, 0, 1, -1, 0)]\n"
        "print(kernel_backend())\n"
        "print(sum(issubclass(w.category, KernelFallbackWarning) for w in caught))\n"
        "print(values[0])\n")
    env = {k: v for k, v in os.environ.items() if k != "AMALGEBRA_PURE_PYTHON"}
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env, timeout=120)
    assert done.returncode == 0, done.stderr
    assert done.stdout.split("\n")[:3] == ["python (compiled kernel not built)", "1", "1/6"]


_signed_values = st.one_of(st.integers(-8, 8), st.integers(-16, 16).map(lambda t: Rational(t, 2)),
                           st.sampled_from([True, -0.5, "1/2", Rational(1, 3), 10 ** 30, -Integer(2) ** 70]))


def _outcome(func, *args):
    try:
        return func(*args)
    except (ValueError, TypeError) as exc:
        return type(exc)


@given(st.lists(_signed_values, min_size=6, max_size=6))
def test_one_step_threej_and_cg_routes_agree_with_validating_route(values):
    # the compiled one-step readers (threej_key, cg_key) against the validating Python route, for
    # plain numbers, half-integers, bad projections and non-numbers alike (common practice, no source)
    three = _outcome(threej, *values)
    assert three == _outcome(lambda *a: coefficients._to_sympy(coefficients.threej_doubled(
        *coefficients.read_threej(*a))), *values)
    clebsch = _outcome(cg, *values)
    assert clebsch == _outcome(lambda *a: coefficients._to_sympy(coefficients.cg_doubled(
        *coefficients.read_cg(*a))), *values)


@given(st.integers(0, 16), st.integers(0, 16), st.data())
def test_one_step_cg_against_racah_formula(t1, t2, data):
    # <j1 m1 j2 m2|J M>^2 = (2J+1) (j1 j2 J; m1 m2 -M)^2, the 3j from Racah's formula in Fractions
    # (Edmonds 1957 eqs. 3.7.3 and 3.7.7; racah_reference.py)
    tJ = data.draw(st.sampled_from(range(abs(t1 - t2), t1 + t2 + 1, 2)))
    m1 = data.draw(st.sampled_from(range(-t1, t1 + 1, 2)))
    m2 = data.draw(st.sampled_from(range(-t2, t2 + 1, 2)))
    value = cg(Rational(t1, 2), Rational(m1, 2), Rational(t2, 2), Rational(m2, 2), Rational(tJ, 2),
               Rational(m1 + m2, 2))
    expected = abs(_reference.ref_threej_sq(t1, t2, tJ, m1, m2, -m1 - m2)) * (tJ + 1)
    assert abs(signed_square(value)) == expected


def test_fallback_notice_points_at_the_callers_line(monkeypatch):
    # the warning names the user's file (this test), not a module inside amalgebra/coupling
    monkeypatch.setattr(kernels, "_fallback_pending", True)
    clear_coupling_caches()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        threej(5, 4, 3, 1, -1, 0)
    notices = [w for w in caught if issubclass(w.category, kernels.KernelFallbackWarning)]
    assert len(notices) == 1
    assert notices[0].filename == __file__
