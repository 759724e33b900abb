"""Benchmark: the safe parser, the printer, and the ``amalgebra`` command's start-up.

Run ``python tests/benchmarks/bench_parsing.py``.  Prints best-of-N wall times; the
SymPy cache is cleared before each cold measurement.
"""

import subprocess
import sys
import time
from pathlib import Path

from sympy.core.cache import clear_cache

from amalgebra.parsing import parse, to_text

ROOT = Path(__file__).resolve().parents[2]
TYPICAL = "2/27*D^3 - 2/3*D*E^2 + lambda^3 + lambda*(-1/3*D^2 - E^2)"
OPERATORS = "-2/3*D + D*Jz(S)^2 + 1/2*E*Jminus(S)^2 + 1/2*E*Jplus(S)^2"
HOSTILE = ["2^2^2^5", "().__class__", "__import__('os')", "1" * 101, "(" * 101 + "x" + ")" * 101]


def best(fn, repeat=7, number=20, cold=False):
    times = []
    for _ in range(repeat):
        if cold:
            clear_cache()
        t0 = time.perf_counter()
        for _ in range(number):
            fn()
        times.append((time.perf_counter() - t0) / number)
    return min(times)


def main():
    parse("x")  # build the lark parser once (cached for the process)
    t = best(lambda: parse(TYPICAL), cold=True)
    print(f"parse typical polynomial ({len(TYPICAL)} chars): {t*1e6:9.0f} us")
    t = best(lambda: parse(OPERATORS), cold=True)
    print(f"parse operator expression ({len(OPERATORS)} chars): {t*1e6:9.0f} us")
    e = parse(OPERATORS)
    t = best(lambda: to_text(e))
    print(f"to_text operator expression: {t*1e6:9.0f} us")
    for text in HOSTILE:
        def reject(text=text):
            try:
                parse(text)
            except Exception:  # noqa: BLE001 - every one of these must be refused
                return
            raise AssertionError(text)
        t = best(reject)
        print(f"reject {text[:24]!r:28}: {t*1e6:9.0f} us")
    long_sum = "+".join(f"x{i}" for i in range(2000))
    t = best(lambda: parse(long_sum), repeat=3, number=1, cold=True)
    print(f"parse a 2000-term sum ({len(long_sum)} chars): {t*1e3:9.1f} ms")
    for args in (["--help"], ["check", str(ROOT / "worked_examples"), "-q"]):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "amalgebra.cli", *args], capture_output=True,
                       check=False)
        print(f"amalgebra {' '.join(args[:1])}: {time.perf_counter() - t0:6.2f} s wall")


if __name__ == "__main__":
    main()
