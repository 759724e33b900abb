#!/usr/bin/env python3
"""Benchmark of the canonical-form engine and of explicit matrices.

Prints one line per figure with its target and PASS/MISS.  Every measurement is
cold: sympy's cache and the kernel's ring cache are cleared before each run (all other
kernel caches live for one call only).
The naive baseline (/work/shared/bench/naive_normal_order.py, expand+subs to a
fixed point) is imported by path and run once at n = 7 (about 30 s); ``--quick``
skips it.

    python tests/benchmarks/bench_canonical.py [--quick] [--repeat 5]

Each line shows the minimum wall time over cold runs (the figure the targets
refer to) and, in brackets, the minimum CPU time of the process, which is the
more stable figure on a shared, loaded machine.
"""

import argparse
import importlib.util
import os
import statistics
import sys
import time

from sympy import Add
from sympy.core.cache import clear_cache

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.algebra.shiftform import clear_caches as clear_kernel_caches
from amalgebra.matrices.explicit import to_matrix

NAIVE = "/work/shared/bench/naive_normal_order.py"


_CPU = {}


def cold(fn, repeat):
    """Cold runs; returns (min wall, median wall, result) and records the min CPU time."""
    times, cpu = [], []
    result = None
    for _ in range(repeat):
        clear_cache()
        clear_kernel_caches()
        start, start_cpu = time.perf_counter(), time.process_time()
        result = fn()
        times.append(time.perf_counter() - start)
        cpu.append(time.process_time() - start_cpu)
    _CPU["last"] = min(cpu)
    return min(times), statistics.median(times), result


def report(name, seconds, target=None, extra=""):
    """One line: wall time (min of cold runs), CPU time, target status on wall time."""
    status = "" if target is None else ("PASS" if seconds < target else "MISS")
    limit = "" if target is None else f" (target < {target:g} s) {status}"
    cpu = _CPU.pop("last", None)
    cpu_text = "" if cpu is None else f" [cpu {cpu * 1000:.2f} ms]"
    print(f"{name:<58s} {seconds * 1000:10.2f} ms{cpu_text}{limit} {extra}".rstrip())
    return target is None or seconds < target


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--quick", action="store_true", help="skip the ~30 s naive baseline")
    parser.add_argument("--repeat", type=int, default=5, help="cold runs per figure; the minimum is reported")
    args = parser.parse_args(argv)
    J, L, S, I_ = (AngularMomentum(x) for x in "JLSI")
    base = J.plus + J.minus + J.z
    ok = True
    results = {}

    for n, target in [(7, None), (8, 0.020), (10, None), (20, 0.5), (30, 0.12), (40, 0.35)]:
        expr = base**n
        best, med, out = cold(lambda: canonical(expr), args.repeat if n < 30 else max(1, args.repeat - 1))
        terms = len(Add.make_args(out))
        results[n] = (best, terms)
        ok &= report(f"canonical((J+ + J- + Jz)^{n})", best, target,
                     f"median {med * 1000:.1f} ms, {terms} terms, 3^n = {3**n} words")
    for n in (10, 20, 30, 40):
        best, terms = results[n]
        print(f"{'  time per output term, n = %d' % n:<58s} {best / terms * 1e6:10.2f} us/term")
    grow = (results[40][0] / results[40][1]) / (results[10][0] / results[10][1])
    print(f"{'  per-term cost ratio n=40 / n=10':<58s} {grow:10.2f}   (3^40/3^10 = {3**30:.2e})")

    three = (J.plus * S.minus + L.z * S.z + I_.x) ** 8
    best, _, out = cold(lambda: canonical(three), args.repeat)
    ok &= report("canonical((J+ S- + Lz Sz + Ix)^8), three+ labels", best, 2.0,
                 f"{len(Add.make_args(out))} terms")

    # several labels on packed integers (ladders that move together), and a long one-label power
    together = (J.plus * S.minus + J.minus * S.plus + 2 * J.z * S.z) ** 12
    best, _, out = cold(lambda: canonical(together), args.repeat)
    report("canonical((J+ S- + J- S+ + 2 Jz Sz)^12), two labels", best, None,
           f"{len(Add.make_args(out))} terms")
    if not args.quick:
        best, _, out = cold(lambda: canonical(J.x ** 100), 1)
        report("canonical(Jx^100)", best, None, f"{len(Add.make_args(out))} terms")

    from sympy import I, Function, sqrt, symbols as _symbols
    a, b, t = _symbols("a b t")
    f = Function("f")
    for label, expr in [("coefficient domain ZZ: (J+/2 + 3 J- + Jz)^8", (J.plus / 2 + 3 * J.minus + J.z) ** 8),
                        ("ZZ_I: (Jx + Jy + Jz)^8", (J.x + J.y + J.z) ** 8),
                        ("ZZ[a, b]: (a J+ + b J- + Jz)^8", (a * J.plus + b * J.minus + J.z) ** 8),
                        ("ZZ_I[f(t)]: (f(t) Jx + i Jy)^6", (f(t) * J.x + I * J.y) ** 6),
                        ("QQ<sqrt(2)>: (sqrt(2) Jx + Jz)^8", (sqrt(2) * J.x + J.z) ** 8),
                        ("QQ<sqrt(2)>[a]: (sqrt(2) a Jx + Jz)^6", (sqrt(2) * a * J.x + J.z) ** 6)]:
        best, _, out = cold(lambda: canonical(expr), args.repeat)
        report("canonical, " + label, best, None, f"{len(Add.make_args(out))} terms")

    # issue 12: a degree-6 polynomial in two labels, three symbols, trig/exp coefficients
    from sympy import cos, exp, sin
    th, ph = _symbols("theta phi")
    trig = (sin(th) * J.x + a * cos(th) * S.plus + exp(I * ph) * J.z * S.minus) ** 6
    best, _, out = cold(lambda: canonical(trig), args.repeat)
    ok &= report("canonical, trig: (sin(th) Jx + a cos(th) S+ + e^(i ph) Jz S-)^6", best, 0.5,
                 f"{len(Add.make_args(out))} terms")

    c8 = canonical(base**8)
    import numpy  # noqa: F401  (import cost is not part of the figure)
    import scipy.sparse  # noqa: F401
    best, _, _ = cold(lambda: to_matrix(c8, {"J": 50}, kind="float"), args.repeat)
    ok &= report("to_matrix(canonical(...^8), j=50, float)", best, 0.010)
    best, _, _ = cold(lambda: to_matrix(c8, {"J": 1000}, kind="sparse"), args.repeat)
    ok &= report("to_matrix(canonical(...^8), j=1000, sparse)", best, 1.0)

    from sympy import symbols
    from amalgebra.algebra import ladder_terms
    j, m = symbols("j m")
    closed = (J.x**2 - J.y**2 + J.z * J.x) ** 4
    best, _, _ = cold(lambda: ladder_terms(closed, {"J": j * (j + 1)}, {"J": m}), args.repeat)
    ok &= report("ladder_terms((Jx^2 - Jy^2 + Jz Jx)^4), symbolic j, m", best, 0.050)

    if args.quick or not os.path.exists(NAIVE):
        print("naive baseline: skipped" + (" (--quick)" if args.quick else f" ({NAIVE} not found)"))
    else:
        spec = importlib.util.spec_from_file_location("naive_normal_order", NAIVE)
        naive = importlib.util.module_from_spec(spec)
        spec.loader.exec_module(naive)
        expr = (naive.JP + naive.JM + naive.JZ) ** 7
        clear_cache()
        start = time.perf_counter()
        naive.normal_order(expr)  # run side by side as a yardstick only
        t_naive = time.perf_counter() - start
        t_ours = results[7][0]
        ratio = t_naive / t_ours
        report("naive expand+subs normal_order, n = 7", t_naive)
        print(f"{'  speed-up at n = 7 (target >= 1000x)':<58s} {ratio:10.0f} x {'PASS' if ratio >= 1000 else 'MISS'}")
        ok &= ratio >= 1000
    print("all targets met" if ok else "SOME TARGETS MISSED")
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
