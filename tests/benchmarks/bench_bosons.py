#!/usr/bin/env python3
"""Benchmark of the boson layer: normal ordering, Fock action, Schwinger map, boson d-matrices.

Every measurement is cold: sympy's cache, the kernel's ring cache and our own caches are cleared
before each run; the figure is the minimum wall time over ``--repeat`` runs (CPU time in brackets).
The shared baseline /work/shared/bench/bench_normal_order.py (naive expand+subs loop and a
dict-of-words rewriter for the Weyl algebra [a, a^dagger] = 1) is imported by path and run side by
side on the same input; its result is mapped onto our operators and checked equal to ours.

    python tests/benchmarks/bench_bosons.py [--quick] [--repeat 3]
"""

import argparse
import importlib.util
import os
import sys
import time

from sympy import Add, Symbol, expand
from sympy.core.cache import clear_cache

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.algebra.shiftform import clear_caches as clear_kernel_caches
from amalgebra.bosons import (apply_bosons, boson_modes, clear_schwinger_caches, fock_ket, from_bosons,
                              schwinger_small_d_matrix, to_bosons)
from amalgebra.rotations.wigner import clear_rotation_caches, small_d_matrix

BASELINE = "/work/shared/bench/bench_normal_order.py"


def _clear():
    clear_cache()
    clear_kernel_caches()
    clear_schwinger_caches()
    clear_rotation_caches()


def cold(fn, repeat):
    walls, cpus, result = [], [], None
    for _ in range(repeat):
        _clear()
        w0, c0 = time.perf_counter(), time.process_time()
        result = fn()
        walls.append(time.perf_counter() - w0)
        cpus.append(time.process_time() - c0)
    return min(walls), min(cpus), result


def ms(seconds):
    return f"{1000 * seconds:9.2f} ms"


def load_baseline():
    if not os.path.exists(BASELINE):
        return None
    spec = importlib.util.spec_from_file_location("shared_bench_normal_order", BASELINE)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--quick", action="store_true", help="skip the naive expand+subs baseline")
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    a, = boson_modes("a")
    base = load_baseline()

    print("1) (a + a^dagger)^n normal ordered: amalgebra.canonical vs shared baselines")
    for n in (4, 6, 8, 10, 16, 24):
        expr = (a.annihilate + a.create) ** n
        t, c, ours = cold(lambda: canonical(expr), args.repeat)
        line = f"  n={n:2d}  canonical {ms(t)} [cpu {ms(c)}]  terms={len(Add.make_args(ours)):3d}"
        if base is not None and n <= 16:
            def words():
                base.normal_word.cache_clear()
                return base.from_words(base.power(base.to_words(base.a + base.ad), n, 1, lambda cs: Add(*cs)))
            tw, _, theirs = cold(words, args.repeat)
            mapped = canonical(expand(theirs).xreplace({base.ad: a.create, base.a: a.annihilate}))
            assert mapped == ours, f"baseline disagrees at n={n}"
            line += f" | dict-of-words {ms(tw)} (ratio {tw / t:6.1f}x)"
            if not args.quick and n <= 8:
                tn, _, _ = cold(lambda: base.naive((base.a + base.ad) ** n), 1)
                line += f" | expand+subs {ms(tn)} (ratio {tn / t:7.1f}x)"
        print(line)

    print("2) (alpha a + beta a^dagger)^n, symbolic coefficients")
    al, be = Symbol("alpha"), Symbol("beta")
    for n in (6, 10, 14):
        t, c, ours = cold(lambda: canonical((al * a.annihilate + be * a.create) ** n), args.repeat)
        print(f"  n={n:2d}  canonical {ms(t)} [cpu {ms(c)}]  terms={len(Add.make_args(ours))}")

    print("3) apply_bosons((a + a^dagger)^8, |n>) for n = 0..5 (one call per ket)")
    op = (a.annihilate + a.create) ** 8
    t, c, _ = cold(lambda: [apply_bosons(op, fock_ket(n, modes=("a",))) for n in range(6)], args.repeat)
    print(f"  total {ms(t)} [cpu {ms(c)}]")

    print("4) Schwinger map round trip of (Jx + Jy + Jz)^k")
    J = AngularMomentum("J")
    for k in (3, 5, 6):
        e = (J.x + J.y + J.z) ** k
        t1, _, image = cold(lambda: to_bosons(e), args.repeat)
        t2, _, back = cold(lambda: from_bosons(image), args.repeat)
        assert back == canonical(e)
        print(f"  k={k}  to_bosons {ms(t1)}  from_bosons {ms(t2)}  boson terms={len(Add.make_args(image))}")

    print("5) full d^j(beta) matrix: boson picture vs Wigner formula (amalgebra.rotations.wigner)")
    beta = Symbol("beta")
    for j in (1, 2, 3, 5):
        tb, _, mb = cold(lambda: schwinger_small_d_matrix(j, beta), args.repeat)
        tw, _, mw = cold(lambda: small_d_matrix(j, beta), args.repeat)
        assert (mb - mw).applyfunc(expand).is_zero_matrix
        print(f"  j={j}  bosons {ms(tb)}  Wigner formula {ms(tw)}  ratio bosons/Wigner {tb / tw:6.1f}x")
    return 0


if __name__ == "__main__":
    sys.exit(main())
