"""Benchmark of exact Wigner d/D matrices and spherical harmonics (a script, not a test).

Run:  python tests/benchmarks/bench_rotations.py [--repeat N]

Every figure is a cold measurement: SymPy's cache and amalgebra's rotation caches
are cleared before each run; the best of N runs is printed.  Targets (from the
project issues): the whole exact d^j(beta) for j = 20 in under 0.15 s and for j = 40
in under 1 s (built in bulk from the kernel's integers; the kernel's own time for every
element is printed beside it), one element for j = 100 in under 0.5 s.  CPU seconds.
"""

import argparse
import time

from sympy import Symbol, symbols
from sympy.core.cache import clear_cache

from amalgebra.rotations.harmonics import spherical_harmonic
from amalgebra.rotations.wigner import _d_kernel, clear_rotation_caches, small_d, small_d_matrix, wigner_D_matrix


def _kernel_only(tj):
    for tmp in range(tj, -tj - 1, -2):
        for tm in range(tj, -tj - 1, -2):
            _d_kernel(tj, tmp, tm)


def cold(fn, repeat):
    best = float("inf")
    for _ in range(repeat):
        clear_cache()
        clear_rotation_caches()
        start = time.process_time()
        fn()
        best = min(best, time.process_time() - start)
    return best


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    beta = Symbol("beta", real=True)
    alpha, gamma = symbols("alpha gamma", real=True)

    print(f"{'case':44s} {'seconds':>10s} {'target':>8s} {'ratio':>7s}")
    rows = [
        ("small_d_matrix j=5", lambda: small_d_matrix(5, beta), None),
        ("small_d_matrix j=10", lambda: small_d_matrix(10, beta), None),
        ("small_d_matrix j=39/2", lambda: small_d_matrix("39/2", beta), None),
        ("small_d_matrix j=20", lambda: small_d_matrix(20, beta), 0.15),
        ("small_d_matrix j=30", lambda: small_d_matrix(30, beta), None),
        ("small_d_matrix j=40", lambda: small_d_matrix(40, beta), 1.0),
        ("integer kernel alone, every element, j=20", lambda: _kernel_only(40), None),
        ("integer kernel alone, every element, j=40", lambda: _kernel_only(80), None),
        ("wigner_D_matrix j=10 (symbolic alpha, gamma)", lambda: wigner_D_matrix(10, alpha, beta, gamma), None),
        ("small_d element j=50 (m'=0, m=0)", lambda: small_d(50, 0, 0, beta), None),
        ("small_d element j=100 (m'=0, m=0)", lambda: small_d(100, 0, 0, beta), 0.5),
        ("small_d element j=100 (m'=37, m=-5)", lambda: small_d(100, 37, -5, beta), 0.5),
        ("small_d element j=201/2 (m'=1/2, m=-1/2)", lambda: small_d("201/2", "1/2", "-1/2", beta), None),
        ("small_d element j=200 (m'=0, m=0)", lambda: small_d(200, 0, 0, beta), None),
        ("spherical_harmonic l=20 m=7", lambda: spherical_harmonic(20, 7, beta, alpha), None),
        ("spherical_harmonic l=60 m=-13", lambda: spherical_harmonic(60, -13, beta, alpha), None),
    ]
    measured = {}
    for name, fn, target in rows:
        seconds = measured[name] = cold(fn, args.repeat)
        if target is None:
            print(f"{name:44s} {seconds:10.4f} {'-':>8s} {'-':>7s}")
        else:
            print(f"{name:44s} {seconds:10.4f} {target:8.2f} {seconds / target:7.3f}")
    # issue 16: the whole symbolic matrix within 3x of the integer kernel's own time for every element
    for j in (20, 40):
        ratio = measured[f"small_d_matrix j={j}"] / measured[f"integer kernel alone, every element, j={j}"]
        print(f"d^{j} matrix / integer kernel alone: {ratio:.2f}x (target <= 3x) {'PASS' if ratio <= 3 else 'MISS'}")


if __name__ == "__main__":
    main()
