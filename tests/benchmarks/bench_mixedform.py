#!/usr/bin/env python3
"""Benchmark of the mixed (angular momentum + tensor/vector) normal form.

Two parts:

* overhead of the extension hook on PURE angular-momentum input: ``canonical`` (which now goes
  through ``amalgebra.algebra.extensions.kernel_for``) against the plain kernel call it wraps
  (``kernel_of`` + ``to_expr``), interleaved in one process so that machine load hits both
  alike; the ratio should be 1.00 within noise;
* cold timings of mixed expressions (tensor and vector components with angular momenta).

Every run is cold: sympy's cache and the kernel's ring cache are cleared before it.

    python tests/benchmarks/bench_mixedform.py [--repeat 7]
"""

import argparse
import time

from sympy import Rational, Symbol
from sympy.core.cache import clear_cache

from amalgebra.algebra import AngularMomentum, canonical, commutator
from amalgebra.algebra.convert import kernel_of
from amalgebra.algebra.shiftform import clear_caches as clear_kernel_caches
from amalgebra.tensors import SphericalTensor, VectorOperator


def plain(expr):
    algebra, (element,) = kernel_of(expr)
    return algebra.to_expr(element)


def cold_cpu(fn):
    clear_cache()
    clear_kernel_caches()
    start = time.process_time()
    result = fn()
    return time.process_time() - start, result


def main():
    parser = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("--repeat", type=int, default=7)
    args = parser.parse_args()

    J, S = AngularMomentum("J"), AngularMomentum("S")
    a = Symbol("a")
    pure = [
        ("(J+ + J- + Jz)^10", (J.plus + J.minus + J.z) ** 10),
        ("(J+ + J- + Jz)^20", (J.plus + J.minus + J.z) ** 20),
        ("(Jx + Jy + Jz)^8, ZZ_I", (J.x + J.y + J.z) ** 8),
        ("(a J+ + S- + Jz)^8, ZZ[a]", (a * J.plus + S.minus + J.z) ** 8),
        ("J+ J- (small input)", J.plus * J.minus),
    ]
    print("hook overhead on pure angular-momentum input (min CPU over interleaved cold runs)")
    for name, expr in pure:
        hook, base = [], []
        for _ in range(args.repeat):
            t, r1 = cold_cpu(lambda: canonical(expr))
            hook.append(t)
            t, r2 = cold_cpu(lambda: plain(expr))
            base.append(t)
            assert r1 == r2
        print(f"  {name:<34s} canonical {min(hook) * 1000:9.3f} ms   plain kernel {min(base) * 1000:9.3f} ms"
              f"   ratio {min(hook) / min(base):5.2f}")

    T = SphericalTensor("T", 2, "J")
    U = SphericalTensor("U", Rational(3, 2), "J")
    r = VectorOperator("r", "J")
    mixed = [
        ("canonical(T1 J^2)", lambda: canonical(T[1] * J.squared)),
        ("canonical(r.z J+^3 J^2)", lambda: canonical(r.z * J.plus ** 3 * J.squared)),
        ("canonical((Jx + r.z + T0)^4)", lambda: canonical((J.x + r.z + T[0]) ** 4)),
        ("canonical((a J+ + U1/2 + S.z)^4 J^2)", lambda: canonical((a * J.plus + U[Rational(1, 2)] + S.z) ** 4
                                                                    * J.squared)),
        ("canonical(T0 T1 (J^2)^3)", lambda: canonical(T[0] * T[1] * J.squared ** 3)),
        ("commutator(J^2, r.x r.y r.z)", lambda: commutator(J.squared, r.x * r.y * r.z)),
    ]
    print("mixed expressions (min CPU over cold runs)")
    for name, fn in mixed:
        times = []
        result = None
        for _ in range(args.repeat):
            t, result = cold_cpu(fn)
            times.append(t)
        print(f"  {name:<40s} {min(times) * 1000:9.2f} ms   {len(result.args)} terms")


if __name__ == "__main__":
    main()
