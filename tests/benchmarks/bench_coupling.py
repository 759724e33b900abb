#!/usr/bin/env python3
"""Benchmark of the exact coupling-coefficient engine (amalgebra.coupling).

Prints, one line per configuration:

* seconds per symbol for seeded random 3j / 6j / 9j sets (every j <= jmax, or
  jmin <= j <= jmax), first evaluation with every cache cleared (ours, SymPy's
  and the baseline's factorial cache) before each timed pass, next to the naive
  Racah baseline ``/work/shared/bench/naive_racah.py`` run side by side (its
  ``sympy`` and ``int`` backends), and the ratios; then the same with every cache warm
  (each timed pass after an untimed one that fills ours and the baselines' caches);
* sixj of a new small symbol (every distinct canonical 6j with j <= 6, each call a cache miss);
* 3j symbols with all j near 500 (ms each);
* float accuracy for j up to 200: our float path and the baseline's float
  (``sqrt`` of a float ratio) against mpmath at 320 bits, in units in the last place;
* cache behaviour: hits and warm time for symmetric variants of evaluated symbols.

Run ``python tests/benchmarks/bench_coupling.py`` (about 3-6 minutes) or with
``--quick`` (about 20 s).  Times are CPU seconds of this process (``time.process_time``), so that
other load on a shared box inflates them less; figures on a shared 2-core box still vary by +-30 %.
The first line names the 6j kernel in use (compiled GMP kernel or pure
Python); ``AMALGEBRA_PURE_PYTHON=1 python tests/benchmarks/bench_coupling.py``
measures the pure-Python fallback.
"""

import argparse
import importlib.util
import itertools
import math
import pathlib
import statistics
import sys
import time
from fractions import Fraction

from sympy import Rational
from sympy.core.cache import clear_cache

from amalgebra.coupling import (clear_coupling_caches, coupling_cache_info, ninej, sixj, sixj_float, threej,
                                threej_float)
from amalgebra.coupling.kernels import kernel_backend

NAIVE_PATH = pathlib.Path("/work/shared/bench/naive_racah.py")
# CPU time of this (single-threaded) process: on a shared, loaded box wall time mostly measures the
# other processes; ours and the baselines are timed with the same clock, so the ratios compare alike.
_clock = time.process_time
OURS = {"3j": threej, "6j": sixj, "9j": ninej}


def load_naive():
    if not NAIVE_PATH.exists():
        return None
    spec = importlib.util.spec_from_file_location("naive_racah", NAIVE_PATH)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def symbols(naive, kind, jmax, n, seed, jmin=0):
    if naive is not None:
        return naive.random_symbols(kind, jmax, n, seed, jmin=jmin)
    raise SystemExit("naive_racah.py not found: the random symbol sets come from it")


def time_ours(kind, syms, repeat, warm=False):
    """Seconds per symbol (min, median over ``repeat`` passes) with every cache cleared first;
    ``warm``: after an untimed pass that fills the value caches."""
    args = [[Rational(t, 2) for t in s] for s in syms]
    func = OURS[kind]
    times = []
    for _ in range(repeat):
        clear_coupling_caches()
        clear_cache()
        if warm:
            for a in args:
                func(*a)
        start = _clock()
        for a in args:
            func(*a)
        times.append((_clock() - start) / len(syms))
    return min(times), statistics.median(times)


def time_naive(naive, kind, backend, syms, repeat, warm=False):
    """As :func:`time_ours` for the baseline (its factorial cache and SymPy's cache)."""
    func = naive.FUNCS[(kind, backend)]
    times = []
    for _ in range(repeat):
        naive._fact_cache.clear()
        clear_cache()
        if warm:
            for s in syms:
                func(*s)
        start = _clock()
        for s in syms:
            func(*s)
        times.append((_clock() - start) / len(syms))
    return min(times), statistics.median(times)


def _interleaved(naive, kind, syms, repeat, with_sympy, warm):
    """Passes of the three routes interleaved; the order rotates from pass to pass, so that no route
    always runs straight after another (a pass right after a SymPy pass runs measurably slower: the
    allocator and CPU caches it leaves behind cost our 6j about 2 us a symbol)."""
    ours_t, int_t, sympy_t = [], [], []
    for k in range(repeat):
        runs = [lambda: ours_t.append(time_ours(kind, syms, 1, warm)[0]),
                lambda: int_t.append(time_naive(naive, kind, "int", syms, 1, warm)[0])]
        if with_sympy and k < max(1, repeat - 2):
            runs.append(lambda: sympy_t.append(time_naive(naive, kind, "sympy", syms, 1, warm)[0]))
        for run in runs[k % len(runs):] + runs[:k % len(runs)]:
            run()
    return ours_t, int_t, sympy_t


def run_speed(naive, configs, repeat):
    print("# speed: seconds per symbol, cold caches; min (median) over passes, the passes of ours and of the")
    print("# baseline interleaved so that both see the same machine load; ratio = naive min / ours min;")
    print("# warm (after ||): the same passes run again after an untimed pass that fills every cache")
    print("# (ours: the value caches; the baselines: their factorial cache and SymPy's cache)")
    for kind, jmin, jmax, n, with_sympy in configs:
        syms = symbols(naive, kind, jmax, n, 12345, jmin=jmin)
        parts = []
        for warm in (False, True):
            ours_t, int_t, sympy_t = _interleaved(naive, kind, syms, repeat, with_sympy, warm)
            ours = min(ours_t)
            line = (f"ours {ours:.3e} ({statistics.median(ours_t):.3e})"
                    f" | naive-int {min(int_t):.3e} ratio {min(int_t) / ours:.1f}x")
            if sympy_t:
                line += f" | naive-sympy {min(sympy_t):.3e} ratio {min(sympy_t) / ours:.0f}x"
            else:
                line += " | naive-sympy skipped"
            parts.append(line)
        print(f"{kind} j in [{jmin}, {jmax}] n={n}: {parts[0]} || warm: {parts[1]}", flush=True)


def small_sixj_set(jmax2=12):
    """Every 6j (doubled arguments <= jmax2) with a distinct canonical key, one representative each."""
    from amalgebra.coupling.symmetry import sixj_key
    seen, out = set(), []
    for tj in itertools.product(range(jmax2 + 1), repeat=6):
        t1, t2, t3, t4, t5, t6 = tj
        if all((a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b
               for a, b, c in ((t1, t2, t3), (t1, t5, t6), (t4, t2, t6), (t4, t5, t3))):
            key = sixj_key(*tj)
            if key not in seen:
                seen.add(key)
                out.append(tj)
    return out


def run_new_small_sixj(naive, repeat):
    """sixj of a *new* small symbol: every distinct canonical 6j with j <= 6, caches cleared before
    each pass (so every call is a miss), int arguments where integral, Rational otherwise."""
    syms = small_sixj_set()
    mixed = [[t // 2 if t % 2 == 0 else Rational(t, 2) for t in s] for s in syms]
    rational = [[Rational(t, 2) for t in s] for s in syms]
    figures = {}
    for name, args in (("int/Rational args", mixed), ("Rational args", rational)):
        new, warm = [], []
        for _ in range(repeat):
            clear_coupling_caches()
            clear_cache()
            start = _clock()
            for a in args:
                sixj(*a)
            new.append((_clock() - start) / len(args))
            start = _clock()
            for a in args:
                sixj(*a)
            warm.append((_clock() - start) / len(args))
        figures[name] = (min(new), min(warm))
    naive_t = time_naive(naive, "6j", "int", syms, repeat)[0]
    text = "; ".join(f"{name}: new {n * 1e6:.2f} us, warm {w * 1e6:.2f} us" for name, (n, w) in figures.items())
    print(f"6j new small symbol (all {len(syms)} canonical 6j with j <= 6, every call a cache miss): {text} | "
          f"naive-int {naive_t * 1e6:.2f} us (ratio {naive_t / figures['Rational args'][0]:.1f}x)", flush=True)


def run_large_threej(naive, n):
    syms = symbols(naive, "3j", 500, n, 500, jmin=480)
    # plus hard cases: all j = 500 or 499 with small m (several hundred terms in the Racah sum)
    syms += [(1000, 1000, 1000, 2, -2, 0), (1000, 998, 1000, 6, -4, -2), (999, 1000, 999, 1, -2, 1)]
    args = [[Rational(t, 2) for t in s] for s in syms]
    clear_coupling_caches()
    clear_cache()
    per = []
    for a in args:
        start = _clock()
        threej(*a)
        per.append(_clock() - start)
    naive._fact_cache.clear()
    start = _clock()
    for s in syms:
        naive.w3j_int(*s)
    naive_per = (_clock() - start) / len(syms)
    print(f"3j all j in [480, 500] n={len(syms)} (incl. 3 all-j-near-500 small-m cases): ours cold max "
          f"{max(per) * 1e3:.2f} ms, median {statistics.median(per) * 1e3:.2f} ms, hard cases "
          f"{', '.join(f'{t * 1e3:.2f}' for t in per[-3:])} ms | naive-int mean {naive_per * 1e3:.2f} ms", flush=True)


def mpmath_double(signed_square):
    import mpmath
    from mpmath import libmp
    if signed_square == 0:
        return 0.0
    q = abs(signed_square)
    with mpmath.workprec(320):
        x = mpmath.sqrt(mpmath.mpf(q.numerator) / q.denominator)
    value = libmp.to_float(libmp.mpf_pos(x._mpf_, 53, "n"))
    return value if signed_square > 0 else -value


def ulps(a, b):
    if a == b:
        return 0
    return abs(a - b) / math.ulp(max(abs(a), abs(b)))


def run_float_accuracy(naive, n):
    print("# float accuracy vs mpmath (320 bits, one rounding): max ulp error and number correctly rounded")
    for kind, jmax in (("3j", 200), ("6j", 200)):
        syms = symbols(naive, kind, jmax, n, 77, jmin=0)
        ours_err = naive_err = 0.0
        ours_ok = naive_ok = 0
        ours_float = threej_float if kind == "3j" else sixj_float
        for s in syms:
            exact = naive.FUNCS[(kind, "int")](*s)       # signed square (Fraction), the yardstick's exact value
            ref = mpmath_double(Fraction(exact))
            mine = ours_float(*[Rational(t, 2) for t in s])
            theirs = naive.to_float(exact, "int")
            ours_err, naive_err = max(ours_err, ulps(mine, ref)), max(naive_err, ulps(theirs, ref))
            ours_ok += mine == ref
            naive_ok += theirs == ref
        print(f"{kind} j <= {jmax} n={n}: ours max {ours_err:.0f} ulp, {ours_ok}/{n} correctly rounded | "
              f"naive float max {naive_err:.0f} ulp, {naive_ok}/{n} correctly rounded", flush=True)


def run_cache(naive, n):
    syms = symbols(naive, "3j", 20, n, 4, jmin=0)
    clear_coupling_caches()
    for s in syms:
        threej(*[Rational(t, 2) for t in s])
    before = coupling_cache_info()["3j"]
    # symmetric variants: cyclic column shift, and m -> -m (two classical symmetries)
    variants = [(s[1], s[2], s[0], s[4], s[5], s[3]) for s in syms] + \
               [(s[0], s[1], s[2], -s[3], -s[4], -s[5]) for s in syms]
    args = [[Rational(t, 2) for t in v] for v in variants]
    start = _clock()
    for a in args:
        threej(*a)
    warm = (_clock() - start) / len(args)
    after = coupling_cache_info()["3j"]
    print(f"cache: {len(variants)} symmetric variants of {n} evaluated 3j (j <= 20): hits +{after.hits - before.hits}, "
          f"misses +{after.misses - before.misses}, warm {warm * 1e6:.1f} us/symbol; "
          f"currsize {after.currsize} of maxsize {after.maxsize}", flush=True)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--quick", action="store_true", help="small sets, one pass, no slow baselines")
    options = parser.parse_args(argv)
    naive = load_naive()
    if naive is None:
        print("naive_racah.py not found at", NAIVE_PATH, "- nothing to compare against")
        return 1
    import sympy
    print(f"# python {sys.version.split()[0]}, sympy {sympy.__version__}, "
          f"ground types {sympy.external.gmpy.GROUND_TYPES}, 6j kernel: {kernel_backend()}")
    if options.quick:
        configs = [("3j", 0, 10, 100, True), ("3j", 0, 50, 50, True), ("6j", 0, 10, 100, True),
                   ("6j", 25, 50, 20, True), ("9j", 0, 10, 10, True), ("9j", 25, 50, 3, False)]
        run_speed(naive, configs, repeat=3)
        run_new_small_sixj(naive, 3)
        run_large_threej(naive, 5)
        run_float_accuracy(naive, 20)
        run_cache(naive, 50)
        return 0
    configs = []
    for kind in ("3j", "6j"):
        configs += [(kind, 0, 10, 200, True), (kind, 0, 20, 200, True), (kind, 0, 50, 100, True),
                    (kind, 25, 50, 50, True)]
    configs += [("9j", 0, 10, 50, True), ("9j", 0, 20, 20, True), ("9j", 25, 50, 10, True)]
    run_speed(naive, configs, repeat=5)
    run_new_small_sixj(naive, 5)
    run_large_threej(naive, 20)
    run_float_accuracy(naive, 100)
    run_cache(naive, 200)
    return 0


if __name__ == "__main__":
    sys.exit(main())
