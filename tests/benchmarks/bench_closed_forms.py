"""Benchmark: cold and warm time to build closed forms for symbolic j.

Run: ``python tests/benchmarks/bench_closed_forms.py``.  Prints one line per
family (median of cold builds, SymPy cache cleared before each) and the time to
substitute one numeric point into a built form.
"""

import statistics
import time

from sympy import Rational, S, symbols
from sympy.core.cache import clear_cache

from amalgebra.coupling.closed_forms import cg_closed_form, sixj_closed_form, threej_closed_form

j, m, a, b, c = symbols("j m a b c")


def _cg_cases(j2):
    steps = range(int(2 * j2) + 1)
    return [(j, m - (j2 - k), j2, j2 - k, j + j2 - n, m) for n in steps for k in steps]


def _sixj_cases(d):
    steps = [d - k for k in range(int(2 * d) + 1)]
    return [(a, b, c, d, c + x, b + y) for x in steps for y in steps]


def _time(func, cases, repeat=3):
    """(median cold, max cold, median warm, number of cases); cold = SymPy cache cleared."""
    cold, warm = [], []
    for args in cases:
        runs = []
        for _ in range(repeat):
            clear_cache()
            start = time.perf_counter()
            func(*args)
            runs.append(time.perf_counter() - start)
        cold.append(min(runs))
        start = time.perf_counter()
        func(*args)
        warm.append(time.perf_counter() - start)
    return statistics.median(cold), max(cold), statistics.median(warm), len(cases)


def main():
    print(f"{'family':32s} {'cases':>5s} {'cold med ms':>11s} {'cold max':>8s} {'warm med':>8s}")
    for j2 in (S.Half, 1, Rational(3, 2), 2):
        med, worst, hot, n = _time(cg_closed_form, _cg_cases(j2))
        print(f"{'cg, j2 = ' + str(j2):32s} {n:5d} {med * 1e3:11.1f} {worst * 1e3:8.1f} {hot * 1e3:8.1f}")
    for j2 in (S.Half, 1, 2):
        cases = [(j1, j2, J, m1, m2, -M) for j1, m1, _, m2, J, M in _cg_cases(j2)]
        med, worst, hot, n = _time(threej_closed_form, cases)
        print(f"{'threej, j2 = ' + str(j2):32s} {n:5d} {med * 1e3:11.1f} {worst * 1e3:8.1f} {hot * 1e3:8.1f}")
    for d in (S.Half, 1, Rational(3, 2), 2):
        med, worst, hot, n = _time(sixj_closed_form, _sixj_cases(d))
        print(f"{'sixj {a b c; d c+x b+y}, d = ' + str(d):32s} {n:5d} {med * 1e3:11.1f} {worst * 1e3:8.1f} {hot * 1e3:8.1f}")
    form = cg_closed_form(j, m - 1, 2, 1, j - 1, m)
    start = time.perf_counter()
    for twice in range(4, 64):
        form.xreplace({j: Rational(twice, 2), m: Rational(twice, 2) - 2})
    per_point = (time.perf_counter() - start) / 60
    print(f"substitute one point into <j m-1 2 1|j-1 m>: {per_point * 1e3:.2f} ms")


if __name__ == "__main__":
    main()
