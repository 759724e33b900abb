"""Benchmark of input-limit refusals and of the many-spin routes that stopped enumerating (a script, not a test).

Run:  python tests/benchmarks/bench_limits.py [--repeat N]

Prints CPU seconds (best of N, SymPy's cache cleared before each run) for

* refusals by amalgebra.limits (each must be microseconds: the check runs before any work);
* ``total_spin_states(n, S=n/2, M=n/2)`` (one ket) against the former route, which enumerated every
  coupling path with ``coupling_paths`` and filtered (kept here as the baseline), and the ratio;
* ``multiplet_count(n, S)`` (reflection principle) against the branching-diagram walk it replaced.
"""

import argparse
import time

from sympy import Rational, Symbol
from sympy.core.cache import clear_cache

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.errors import LimitError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.rotations.wigner import small_d, small_d_matrix
from amalgebra.states.coupled import CoupledKet, coupling_paths
from amalgebra.states.manyspin import multiplet_count, spin_labels, total_spin_states


def cold(fn, repeat):
    best = float("inf")
    for _ in range(repeat):
        clear_cache()
        start = time.process_time()
        fn()
        best = min(best, time.process_time() - start)
    return best


def refused(fn):
    def run():
        try:
            fn()
        except LimitError:
            return
        raise AssertionError("expected a LimitError")
    return run


def old_total_spin_states(n, S, M):
    """The former algorithm: all 2^(n-1) paths of coupling_paths, then the filter."""
    js = [Rational(1, 2)] * n
    labels = spin_labels(n)
    out = []
    for inter, J in coupling_paths(js, S):
        if abs(2 * M) <= 2 * J:
            out.append(CoupledKet(js, inter, J, M, labels))
    return out


def walk_count(n, S):
    counts = {1: 1}
    for _ in range(n - 1):
        nxt = {}
        for t, c in counts.items():
            for t2 in (t - 1, t + 1):
                if t2 >= 0:
                    nxt[t2] = nxt.get(t2, 0) + c
        counts = nxt
    return counts.get(int(2 * S), 0)


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    J = AngularMomentum("J")
    beta = Symbol("beta")
    huge = 10**100
    print("refusals (CPU s, best of %d)" % args.repeat)
    for name, fn in [
        ("canonical(J.x**(10**100))", lambda: canonical(J.x**huge)),
        ("to_matrix(J.z, {'J': 10**6})", lambda: to_matrix(J.z, {"J": 10**6})),
        ("small_d(10**100, 0, 0, beta)", lambda: small_d(huge, 0, 0, beta)),
        ("small_d_matrix(10**100, beta)", lambda: small_d_matrix(huge, beta)),
        ("multiplet_count(10**100, 0)", lambda: multiplet_count(huge, 0)),
        ("total_spin_states(10**6)", lambda: total_spin_states(10**6)),
        ("total_spin_states(60)", lambda: total_spin_states(60)),
    ]:
        print(f"  {name:34s} {cold(refused(fn), args.repeat):.2e}")
    print("total_spin_states(n, S=n/2, M=n/2): new vs former enumerate-and-filter (CPU s)")
    for n in (10, 14, 18):
        S = Rational(n, 2)
        new = cold(lambda: total_spin_states(n, S=S, M=S), args.repeat)
        old = cold(lambda: old_total_spin_states(n, S, S), 1)
        print(f"  n={n:3d}  new {new:.4f}  former {old:.4f}  ratio {old / new:.0f}x")
    new = cold(lambda: total_spin_states(200, S=100, M=100), args.repeat)
    print(f"  n=200  new {new:.4f}  former: 2^199 paths, not run (out of memory)")
    print("multiplet_count(n, S): reflection principle vs branching-diagram walk (CPU s)")
    for n in (200, 1000, 2000):
        new = cold(lambda: multiplet_count(n, 0), args.repeat)
        old = cold(lambda: walk_count(n, 0), 1)
        print(f"  n={n:5d}  new {new:.2e}  walk {old:.4f}  ratio {old / new:.0f}x")


if __name__ == "__main__":
    main()
