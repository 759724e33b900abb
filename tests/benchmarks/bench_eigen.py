#!/usr/bin/env python3
"""Benchmark of exact block eigenvalues (issue 11, item 3): CPU time, before / after.

Run: ``python tests/benchmarks/bench_eigen.py [--old TREE] [--repeat N]``

1. The 40 x 40 hyperfine + Zeeman Hamiltonian A I.J + B (2 J_z - I_z / 1000) for I = 9/2, J = 3/2
   (uncoupled basis, two symbols): matrix, 13 M blocks and all eigenvalues with the default budget;
   CPU time (``time.process_time``, minimum over the runs, SymPy cache cleared before each) and how
   many blocks were solved exactly.  Target < 3 s.
2. A dense 8 x 8 block with three symbols and surds whose characteristic polynomial does not finish
   in a minute, under a 0.5 s budget: the wall time until the result comes back and the step named.

``--old TREE`` runs case 1 also in a subprocess with ``PYTHONPATH=TREE`` (the tree before the change),
interleaved with this checkout, and prints before / after and the ratio; and case 2 with the old tree
(killed after 20 s if it has not returned).
"""

import argparse
import json
import os
import subprocess
import sys
import tempfile
import time

CASE_40 = r"""
import json, time
from sympy import Rational, symbols
from sympy.core.cache import clear_cache
from amalgebra.algebra import AngularMomentum, dot
from amalgebra.states.hamiltonian import hamiltonian_matrix
A, B = symbols("A B", real=True)
I, J = AngularMomentum("I"), AngularMomentum("J")
H = A * dot(I, J) + B * (2 * J.z - Rational(1, 1000) * I.z)
clear_cache()
t0 = time.process_time()
hm = hamiltonian_matrix(H, {"I": Rational(9, 2), "J": Rational(3, 2)})
ev = hm.eigenvalues()
t = time.process_time() - t0
import amalgebra
print(json.dumps({"cpu": t, "solved": sum(v.complete for _, v in ev), "blocks": len(ev),
                  "from": amalgebra.__file__}))
"""


def run_case(code, tree=None):
    env = dict(os.environ)
    if tree:
        env["PYTHONPATH"] = tree
    else:
        env.pop("PYTHONPATH", None)
    # cwd outside any checkout: with ``-c`` the working directory comes before PYTHONPATH on sys.path
    out = subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True, check=True,
                         cwd=tempfile.gettempdir())
    return json.loads(out.stdout.strip().splitlines()[-1])


SLOW_OLD = r"""
import sys
sys.argv = ["x"]
from sympy import Matrix, sqrt, symbols
from amalgebra.states.eigen import block_eigenvalues
a, b, c = symbols("a b c")
def entry(i, k):
    i, k = min(i, k), max(i, k)
    base = ((i * 7 + k * 3) % 5 - 2) * a + ((i * 5 + k * 11) % 7 - 3) * b + ((i + 2 * k) % 3 - 1) * c + (i * k) % 4 - 1
    return base * sqrt(i + k + 2) if (i + k) % 2 else base
block_eigenvalues(Matrix(8, 8, entry), 0.5)
import amalgebra
print("returned", amalgebra.__file__)
"""


def slow_block_before(tree, limit=20):
    env = dict(os.environ, PYTHONPATH=tree)
    t0 = time.monotonic()
    try:
        out = subprocess.run([sys.executable, "-c", SLOW_OLD], env=env, capture_output=True, text=True,
                             timeout=limit, cwd=tempfile.gettempdir())
        print(f"  before ({tree}): returned after {time.monotonic() - t0:.1f} s wall: {out.stdout.strip()}"
              f"{out.stderr.strip()[-200:]}")
    except subprocess.TimeoutExpired:
        print(f"  before ({tree}): budget 0.5 s not honoured, still running after {limit} s (killed)")


def slow_block_figure():
    from sympy import Matrix, sqrt, symbols

    from amalgebra.states.eigen import block_eigenvalues

    a, b, c = symbols("a b c")

    def entry(i, k):
        i, k = min(i, k), max(i, k)
        base = ((i * 7 + k * 3) % 5 - 2) * a + ((i * 5 + k * 11) % 7 - 3) * b + ((i + 2 * k) % 3 - 1) * c \
            + (i * k) % 4 - 1
        return base * sqrt(i + k + 2) if (i + k) % 2 else base

    mat = Matrix(8, 8, entry)
    t0 = time.monotonic()
    res = block_eigenvalues(mat, time_budget=0.5)
    wall = time.monotonic() - t0
    print(f"dense 8x8 block, 3 symbols + surds, budget 0.5 s: back after {wall:.2f} s wall; "
          f"interrupted={res.interrupted!r}; reason: {res.reason}")


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--old", help="tree before the change (PYTHONPATH for a subprocess)")
    parser.add_argument("--repeat", type=int, default=3)
    args = parser.parse_args()
    new, old = [], []
    for _ in range(args.repeat):
        new.append(run_case(CASE_40))
        if args.old:
            old.append(run_case(CASE_40, args.old))
    best = min(new, key=lambda r: r["cpu"])
    print(f"40x40 I=9/2, J=3/2, two symbols: matrix, {best['blocks']} blocks, all eigenvalues: "
          f"{best['cpu']:.2f} s CPU (min of {len(new)}; target < 3 s); "
          f"solved exactly {best['solved']} of {best['blocks']} [{best['from']}]")
    if old:
        ob = min(old, key=lambda r: r["cpu"])
        print(f"  before ({ob['from']}): {ob['cpu']:.2f} s CPU, solved {ob['solved']} of {ob['blocks']}; "
              f"after / before = {best['cpu'] / ob['cpu']:.2f}")
    slow_block_figure()
    if args.old:
        slow_block_before(args.old)


if __name__ == "__main__":
    main()
