#!/usr/bin/env python3
"""Would a GMP-free build of the compiled coupling kernel do (the question for Windows wheels, where GMP
does not come with the compiler)?  Compares, in one process on the same seeded symbols, CPU us per symbol
(kernel only: doubled ints in, canonical triple out, tables warm, min of 5 passes):

* ``python``: the pure-Python kernels (``kernels.*_python``);
* ``gmp``: the installed extension ``amalgebra.coupling._racah6j`` (C with GMP);
* ``pylong``: the same C source compiled here with ``#include <gmp.h>`` replaced by ``bigint_pylong.h``
  (beside this file: GMP's calls on CPython's own integers), built into a temporary folder with
  setuptools and the C compiler Python was built with.

Every result is checked equal to the pure-Python kernel's triple.  Needs a C compiler and Python's
headers; the installed extension must have been built (``pip install -e .`` with GMP's headers).
Run ``python tests/benchmarks/bench_kernel_builds.py`` (about 40 s).
"""

import contextlib
import importlib.machinery
import importlib.util
import io
import pathlib
import random
import sys
import tempfile
import time

HERE = pathlib.Path(__file__).resolve().parent
SOURCE = HERE.parents[1] / "amalgebra" / "coupling" / "_racah6j.c"


def build_pylong_variant(folder):
    """Compile the kernel's C source against bigint_pylong.h in ``folder``; return the loaded module."""
    from setuptools import Distribution, Extension
    from setuptools.command.build_ext import build_ext

    text = SOURCE.read_text(encoding="utf-8")
    if "#include <gmp.h>" not in text:
        raise SystemExit(f"{SOURCE} no longer includes <gmp.h>: update this benchmark")
    source = folder / "_racah6j.c"
    source.write_text(text.replace("#include <gmp.h>", '#include "bigint_pylong.h"'), encoding="utf-8")
    dist = Distribution({"ext_modules": [Extension("_racah6j", [str(source)], include_dirs=[str(HERE)])]})
    dist.verbose = 0
    command = build_ext(dist)
    command.build_lib = command.build_temp = str(folder)
    command.ensure_finalized()
    with contextlib.redirect_stdout(io.StringIO()):  # setuptools' progress lines
        command.run()
    path = command.get_ext_fullpath("_racah6j")
    loader = importlib.machinery.ExtensionFileLoader("_racah6j", path)
    spec = importlib.util.spec_from_file_location("_racah6j", path, loader=loader)
    module = importlib.util.module_from_spec(spec)
    loader.exec_module(module)
    return module


def random_sixj_keys(rng, jmin, jmax, count):
    """Sorted 6j keys (kernels.sixj_key_plain) of random admissible symbols, j integer or half-integer
    in [jmin, jmax] (drawn doubled)."""
    from amalgebra.coupling import kernels

    keys = []
    while len(keys) < count:
        t1, t2, t4, t5 = (rng.randint(2 * jmin, 2 * jmax) for _ in range(4))
        t3 = rng.randrange(abs(t1 - t2), t1 + t2 + 1, 2)
        t6 = rng.randrange(abs(t4 - t2), t4 + t2 + 1, 2)
        key = kernels.sixj_key_plain(t1, t2, t3, t4, t5, t6)
        if key:
            keys.append(key)
    return keys


def random_threej(rng, jmin, jmax, count):
    """Doubled arguments of random admissible 3j symbols with integer j in range."""
    calls = []
    while len(calls) < count:
        j1, j2 = rng.randint(jmin, jmax), rng.randint(jmin, jmax)
        j3 = rng.randint(abs(j1 - j2), j1 + j2)
        m1, m2 = rng.randint(-j1, j1), rng.randint(-j2, j2)
        if abs(m1 + m2) <= j3:
            calls.append((2 * j1, 2 * j2, 2 * j3, 2 * m1, 2 * m2, -2 * (m1 + m2)))
    return calls


def best_time(func, calls, repeat=5):
    best = float("inf")
    for _ in range(repeat):
        start = time.process_time()
        for args in calls:
            func(*args)
        best = min(best, (time.process_time() - start) / len(calls))
    return best


def main():
    from amalgebra.coupling import kernels

    gmp = kernels._compiled
    if gmp is None:
        raise SystemExit("the GMP extension is not built: pip install -e . with GMP's headers")
    rng = random.Random(20261203)
    with tempfile.TemporaryDirectory() as tmp:
        pylong = build_pylong_variant(pathlib.Path(tmp))
        cases = [(f"6j j in [{lo}, {hi}]", random_sixj_keys(rng, lo, hi, n), kernels.sixj_kernel_sorted_python,
                  gmp.sixj_sorted, pylong.sixj_sorted) for lo, hi, n in ((0, 10, 300), (25, 50, 60), (200, 400, 10))]
        cases += [(f"3j j in [{lo}, {hi}]", random_threej(rng, lo, hi, n), kernels.threej_kernel_python,
                   gmp.threej, pylong.threej) for lo, hi, n in ((0, 10, 300), (25, 50, 60), (480, 500, 10))]
        print("# kernel only, CPU us per symbol, min of 5 passes")
        for name, calls, python, compiled, variant in cases:
            expected = [python(*args) for args in calls]  # also warms the tables
            assert [compiled(*args) for args in calls] == expected, name
            assert [variant(*args) for args in calls] == expected, name
            t_py, t_gmp, t_pl = (best_time(f, calls) for f in (python, compiled, variant))
            print(f"{name:18s} n={len(calls):3d}: python {t_py * 1e6:8.1f} | gmp {t_gmp * 1e6:7.1f} "
                  f"| pylong {t_pl * 1e6:7.1f}  (pylong: x{t_pl / t_gmp:.1f} the GMP time, "
                  f"x{t_py / t_pl:.1f} faster than python)", flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
