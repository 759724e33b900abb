#!/usr/bin/env python3
"""Benchmark of the Racah-sum reducer (amalgebra.racah).

Prints, per sum: the time to reduce it (cold: SymPy's cache and ours cleared before each
run; the best of three cold runs and the median), the target from issue 14, the ratio
target / time, and the time of the built-in check (direct summation at random admissible
points, exact) for comparison -- the naive route a user would otherwise take, at
numeric j only.

* four 3j symbols summed over six projections -> one 6j (target 0.5 s);
* six 3j symbols summed over nine projections -> one 9j (target 2 s);
* the Biedenharn-Elliott left side, a sum over x of three 6j -> two 6j (target 5 s);
* for scale: Racah's sum rule, the 9j from three 6j (Edmonds 6.4.3), the cube graph, the
  LS-jj overlap written with six Clebsch-Gordan coefficients.

Run ``python tests/benchmarks/bench_racah.py`` (about a minute; ``--quick`` skips the
checks).  Figures on a shared 2-core box vary by +-30 %.
"""

import argparse
import statistics
import sys
import time

from sympy import Mul, Rational, Sum, Symbol, symbols
from sympy.core.cache import clear_cache

from amalgebra.coupling import Coupling6j as SJ
from amalgebra.coupling import Coupling3j as TJ
from amalgebra.coupling import clear_coupling_caches
from amalgebra.racah import momentum_sum, projection_sum, reduce_racah_sum

a, b, c, d, e, f, g, h, i, p, q, r, x = symbols("a b c d e f g h i p q r x")
j1, j2, j3, l1, l2, l3, m1, m2, m3, u1, u2, u3 = symbols("j1 j2 j3 l1 l2 l3 m1 m2 m3 u1 u2 u3")


def four_3j():
    return projection_sum((-1)**(l1 + l2 + l3 + u1 + u2 + u3) * TJ(j1, j2, j3, m1, m2, m3)
                          * TJ(j1, l2, l3, m1, u2, -u3) * TJ(l1, j2, l3, -u1, m2, u3)
                          * TJ(l1, l2, j3, u1, -u2, m3), m1, m2, m3, u1, u2, u3)


def six_3j():
    n = [[Symbol(f"n{r_}{k}") for k in range(3)] for r_ in range(3)]
    grid = [[a, b, c], [d, e, f], [g, h, i]]
    term = 1
    for row in range(3):
        term *= TJ(*grid[row], *n[row])
    for k in range(3):
        term *= TJ(grid[0][k], grid[1][k], grid[2][k], n[0][k], n[1][k], n[2][k])
    return projection_sum(term, *[n[row][k] for row in range(3) for k in range(3)])


def biedenharn_elliott():
    return momentum_sum((-1)**(a + b + c + d + e + f + p + q + r + x) * (2*x + 1) * SJ(a, b, x, c, d, p)
                        * SJ(c, d, x, e, f, q) * SJ(e, f, x, b, a, r), x)


def racah_rule():
    return momentum_sum((-1)**(p + q + x) * (2*x + 1) * SJ(a, b, x, c, d, p) * SJ(a, b, x, d, c, q), x)


def ninej_from_6j():
    return momentum_sum((-1)**(2*x) * (2*x + 1) * SJ(a, b, c, f, i, x) * SJ(d, e, f, b, x, h)
                        * SJ(g, h, i, x, a, d), x)


def cube():
    labels = (a, b, b)
    edges = {}
    for v in range(8):
        for bit in range(3):
            w = v ^ (1 << bit)
            if v < w:
                edges[(v, w)] = (Symbol(f"k{v}{w}"), labels[bit])
    factors = [(-1)**(j - mm) for mm, j in edges.values()]
    for v in range(8):
        slots = []
        for bit in range(3):
            w = v ^ (1 << bit)
            mm, j = edges[(min(v, w), max(v, w))]
            slots.append((j, mm if v < w else -mm))
        factors.append(TJ(*(j for j, _ in slots), *(s for _, s in slots)))
    return Sum(Mul(*factors), *[(mm, -j, j) for mm, j in edges.values()])


def ls_jj_overlap():
    from amalgebra.coupling import CouplingBracket as CG

    M = Symbol("M")
    ms = symbols("ma mb mc md me mf mg mh")
    ma, mb, mc, md, me, mf, mg, mh = ms
    return Sum(CG(a, ma, b, mb, e, me) * CG(c, mc, d, md, f, mf) * CG(e, me, f, mf, r, M)
               * CG(a, ma, c, mc, g, mg) * CG(b, mb, d, md, h, mh) * CG(g, mg, h, mh, r, M),
               *[(m_, -lab, lab) for m_, lab in zip(ms, (a, b, c, d, e, f, g, h))])


CASES = [
    ("four 3j over six m -> 6j", four_3j, 0.5, 1),
    ("six 3j over nine m -> 9j", six_3j, 2.0, 1),
    ("Biedenharn-Elliott left side -> 6j 6j", biedenharn_elliott, 5.0, 1),
    ("Racah sum rule -> 6j", racah_rule, None, Rational(3, 2)),
    ("9j from three 6j (Edmonds 6.4.3)", ninej_from_6j, None, 1),
    ("cube graph (12j-like), symbolic", cube, None, Rational(1, 2)),
    ("LS-jj overlap of six CG -> 9j", ls_jj_overlap, None, 1),
]


def cold(func, repeat=3):
    times = []
    for _ in range(repeat):
        expr = func()
        clear_cache()
        clear_coupling_caches()
        start = time.process_time()
        red = reduce_racah_sum(expr)
        times.append(time.process_time() - start)
    return red, min(times), statistics.median(times)


def main(argv=None):
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="skip the direct-summation checks")
    args = parser.parse_args(argv)
    print("Racah-sum reducer, CPU seconds (cold: SymPy and coupling caches cleared)")
    print(f"{'sum':40s} {'best':>7s} {'median':>7s} {'target':>7s} {'ratio':>6s} {'check s':>8s}  result")
    failed = False
    for name, func, target, jmax in CASES:
        red, best, med = cold(func)
        ratio = f"{target / best:6.1f}" if target else "     -"
        tgt = f"{target:7.2f}" if target else "      -"
        check_s = "-"
        if not args.quick:
            start = time.process_time()
            rep = red.check(points=2, jmax=jmax, attempts=200)
            check_s = f"{time.process_time() - start:8.2f}" + ("" if rep.passed else " FAILED")
            failed |= not rep.passed
        if target and best > target:
            failed = True
        status = "complete" if red.complete else "PARTIAL"
        print(f"{name:40s} {best:7.3f} {med:7.3f} {tgt} {ratio} {check_s:>8s}  {status}: "
              f"{str(red.result)[:60]}")
    print("all targets met" if not failed else "SOME TARGET MISSED OR CHECK FAILED")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
