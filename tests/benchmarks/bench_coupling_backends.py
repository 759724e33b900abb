#!/usr/bin/env python3
"""Which route makes the coupling kernels fast on every install: the compiled C kernel, or the
pure-Python kernel with gmpy2's ``mpz`` (a library that ships wheels for Linux, macOS and Windows)?

Prints microseconds per symbol (kernel only: doubled ints in, canonical triple out, no SymPy, tables
warm) for the same seeded symbol sets, three ways side by side in one process:

* ``python``: :func:`amalgebra.coupling.kernels.sixj_kernel_sorted_python` and friends (Python ints);
* ``gmpy2``: the same Horner recurrences with ``gmpy2.mpz`` accumulators (converted back with ``int()``
  before anything else sees them, the rule of ecosystem.md section 3.1), when gmpy2 is importable;
* ``compiled``: the C extension ``amalgebra.coupling._racah6j``, when built.

Every gmpy2 result is checked equal to the Python kernel's triple.  Run
``python tests/benchmarks/bench_coupling_backends.py`` (about 30 s); with gmpy2 installed elsewhere,
``PYTHONPATH=/path/to/gmpy2 python ...`` (installing gmpy2 into the environment switches SymPy's
ground types to gmpy for every session, so the measurement does not require it).
"""

import importlib.util
import pathlib
import sys
import time

from amalgebra.coupling import kernels
from amalgebra.coupling.kernels import _packs, _split_square

NAIVE_PATH = pathlib.Path("/work/shared/bench/naive_racah.py")

try:
    import gmpy2
except ImportError:  # the route is measured only where gmpy2 is present
    gmpy2 = None


def load_naive():
    spec = importlib.util.spec_from_file_location("naive_racah", NAIVE_PATH)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def sixj_gmpy(a1, a2, a3, a4, e1, e2, e3):
    """sixj_kernel_sorted_python with mpz accumulators."""
    mpz = gmpy2.mpz
    top = e3 + 1
    fp = _packs(top)
    f1, f2, f3 = e1 + 1, e2 + 1, e3 + 1
    p = q = mpz(1)
    for u in range(e1, a4, -1):
        q *= (u - a1) * (u - a2) * (u - a3) * (u - a4)
        p = q - (u + 1) * (f1 - u) * (f2 - u) * (f3 - u) * p
    p = int(p)
    if p == 0:
        return 0, 1, 1
    if a4 & 1:
        p = -p
    packed = (fp[a4 + 1] - fp[a1 + 1] - fp[a2 + 1] - fp[a3 + 1]
              - fp[e1 - a1] - fp[e1 - a2] - fp[e1 - a3] - 3 * fp[e1 - a4]
              + fp[e2 - a1] + fp[e2 - a2] + fp[e2 - a3] - fp[e2 - a4]
              + fp[e3 - a1] + fp[e3 - a2] + fp[e3 - a3] - fp[e3 - a4])
    return _split_square(packed, top, p)


def threej_gmpy(tj1, tj2, tj3, tm1, tm2, tm3):
    """threej_kernel_python with mpz accumulators."""
    mpz = gmpy2.mpz
    big = (tj1 + tj2 + tj3) // 2 + 1
    fp = _packs(big)
    b1, b2, b3 = (tj1 + tj2 - tj3) // 2, (tj1 - tm1) // 2, (tj2 + tm2) // 2
    c1, c2 = (tj3 - tj2 + tm1) // 2, (tj3 - tj1 - tm2) // 2
    kmin, kmax = max(0, -c1, -c2), min(b1, b2, b3)
    if kmin > kmax:
        return 0, 1, 1
    p = q = mpz(1)
    for k in range(kmax - 1, kmin - 1, -1):
        q *= (k + 1) * (c1 + k + 1) * (c2 + k + 1)
        p = q - (b1 - k) * (b2 - k) * (b3 - k) * p
    p = int(p)
    if p == 0:
        return 0, 1, 1
    packed = (fp[b1] + fp[(tj1 - tj2 + tj3) // 2] + fp[(tj2 + tj3 - tj1) // 2] - fp[big]
              + fp[b2] + fp[(tj1 + tm1) // 2] + fp[(tj2 - tm2) // 2] + fp[b3]
              + fp[(tj3 - tm3) // 2] + fp[(tj3 + tm3) // 2]
              - 2 * (fp[kmax] + fp[c1 + kmax] + fp[c2 + kmax]
                     + fp[b1 - kmin] + fp[b2 - kmin] + fp[b3 - kmin]))
    if ((tj1 - tj2 - tm3) // 2 + kmin) & 1:
        p = -p
    return _split_square(packed, big, p)


def best_time(func, calls, repeat=5):
    best = float("inf")
    for _ in range(repeat):
        start = time.process_time()
        for args in calls:
            func(*args)
        best = min(best, (time.process_time() - start) / len(calls))
    return best


def main():
    naive = load_naive()
    compiled = kernels._compiled
    print(f"# kernel only, CPU us per symbol, min of 5 passes; gmpy2 {gmpy2.version() if gmpy2 else 'absent'}, "
          f"compiled {'present' if compiled else 'absent'}")
    cases = []
    for jmin, jmax, n in ((0, 10, 300), (25, 50, 60), (200, 400, 10)):
        syms = naive.random_symbols("6j", jmax, n, 5, jmin=jmin)
        keys = [kernels.sixj_key_plain(*s) for s in syms]
        cases.append((f"6j j in [{jmin}, {jmax}]", keys, kernels.sixj_kernel_sorted_python, sixj_gmpy,
                      compiled.sixj_sorted if compiled else None))
    for jmin, jmax, n in ((0, 10, 300), (25, 50, 60), (480, 500, 10)):
        syms = naive.random_symbols("3j", jmax, n, 5, jmin=jmin)
        cases.append((f"3j j in [{jmin}, {jmax}]", syms, kernels.threej_kernel_python, threej_gmpy,
                      compiled.threej if compiled else None))
    syms = naive.random_symbols("9j", 50, 6, 5, jmin=25)
    cases.append(("9j j in [25, 50]", syms, kernels.ninej_kernel_python, None,
                  compiled.ninej if compiled else None))
    for name, calls, py, gm, c in cases:
        expected = [py(*a) for a in calls]   # also warms the tables
        t_py = best_time(py, calls)
        line = f"{name} n={len(calls)}: python {t_py * 1e6:9.1f}"
        if gm is not None and gmpy2 is not None:
            assert [gm(*a) for a in calls] == expected
            t = best_time(gm, calls)
            line += f" | gmpy2 {t * 1e6:9.1f} (x{t_py / t:.2f} vs python)"
        if c is not None:
            assert [c(*a) for a in calls] == expected
            t = best_time(c, calls)
            line += f" | compiled {t * 1e6:9.1f} (x{t_py / t:.1f} vs python)"
        print(line, flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
