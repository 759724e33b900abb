#!/usr/bin/env python3
"""The "fast on every install" decision, all candidate routes side by side in one process: the
pure-Python kernel on Python ints, the same kernel on gmpy2's ``mpz`` and on python-flint's ``fmpz``
(both libraries ship wheels for Linux, macOS and Windows, so either would need no compiler), and the
compiled C kernel on GMP (what amalgebra's binary wheels carry).

Prints CPU microseconds per symbol (kernel only: doubled ints in, canonical triple out, no SymPy,
tables warm, min of 5 passes) for the seeded symbol sets of ``bench_coupling_backends.py``, whose
gmpy2 variants of the kernels are reused as they are, with ``fmpz`` in place of ``mpz`` for
python-flint.  Every result is checked equal to the Python kernel's triple.  Neither library is a
dependency; install them aside and put them on the path for this run only, e.g.::

    pip install --target /tmp/routes gmpy2 python-flint
    PYTHONPATH=/tmp/routes python tests/benchmarks/bench_install_routes.py

(about a minute; a library that is absent is reported so and left out).
"""

import importlib.util
import pathlib
import sys
import types

HERE = pathlib.Path(__file__).resolve().parent


def load(name):
    spec = importlib.util.spec_from_file_location(name, HERE / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def integer_types():
    """``{route: big-integer constructor}`` for the libraries importable here."""
    found = {}
    try:
        import gmpy2
        found[f"gmpy2 {gmpy2.version()}"] = gmpy2.mpz
    except ImportError:
        print("# gmpy2 absent")
    try:
        import flint
        found[f"python-flint {flint.__version__}"] = flint.fmpz
    except ImportError:
        print("# python-flint absent")
    return found


def main():
    backends = load("bench_coupling_backends")
    naive = backends.load_naive()
    kernels = backends.kernels
    compiled = kernels._compiled
    routes = integer_types()
    print(f"# kernel only, CPU us per symbol, min of 5 passes; compiled {'present' if compiled else 'absent'}")
    cases = []
    for jmin, jmax, n in ((0, 10, 300), (25, 50, 60), (200, 400, 10)):
        keys = [kernels.sixj_key_plain(*s) for s in naive.random_symbols("6j", jmax, n, 5, jmin=jmin)]
        cases.append((f"6j j in [{jmin}, {jmax}]", keys, kernels.sixj_kernel_sorted_python, backends.sixj_gmpy,
                      compiled.sixj_sorted if compiled else None))
    for jmin, jmax, n in ((25, 50, 60),):
        syms = naive.random_symbols("3j", jmax, n, 5, jmin=jmin)
        cases.append((f"3j j in [{jmin}, {jmax}]", syms, kernels.threej_kernel_python, backends.threej_gmpy,
                      compiled.threej if compiled else None))
    for name, calls, python_kernel, bigint_kernel, compiled_kernel in cases:
        expected = [python_kernel(*a) for a in calls]  # also warms the tables
        t_python = backends.best_time(python_kernel, calls)
        line = f"{name} n={len(calls)}: python ints {t_python * 1e6:7.1f}"
        for route, constructor in routes.items():
            # the gmpy2 variants read their integer type from the module's ``gmpy2`` name
            backends.gmpy2 = types.SimpleNamespace(mpz=constructor)
            assert [bigint_kernel(*a) for a in calls] == expected, route
            t = backends.best_time(bigint_kernel, calls)
            line += f" | {route} {t * 1e6:7.1f} (x{t_python / t:.2f})"
        if compiled_kernel is not None:
            assert [compiled_kernel(*a) for a in calls] == expected
            t = backends.best_time(compiled_kernel, calls)
            line += f" | compiled GMP {t * 1e6:7.1f} (x{t_python / t:.1f})"
        print(line, flush=True)
    return 0


if __name__ == "__main__":
    sys.exit(main())
