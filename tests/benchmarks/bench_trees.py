"""Benchmark: coupling trees, recoupling formulas and tensor operators in any scheme (issue 13).

Prints seconds (wall and CPU) for the issue's targets, caches cleared before each:

* recoupling formula between two trees of 6 momenta (worst of 20 random pairs; target < 1 s);
* the exact LS-jj matrix for two d electrons, every J (target < 1 s);
* the hyperfine + quadrupole + fine-structure matrix of the ((l s) j, I) F manifold with l = 2,
  s = 1/2, I = 7/2, symbolic constants, in F blocks (target < 5 s).

Run: ``python3 tests/benchmarks/bench_trees.py``.
"""

import importlib.util
import pathlib
import random
import time

from sympy import symbols
from sympy.core.cache import clear_cache

from amalgebra.algebra import AngularMomentum
from amalgebra.coupling import clear_coupling_caches
from amalgebra.coupling.recoupling import recoupling_coefficient, recoupling_matrix
from amalgebra.coupling.trees import coupling_tree
from amalgebra.tensors.tree_elements import CoupledTensorOperator, scalar_coupled, tree_operator_blocks

_oracle_path = pathlib.Path(__file__).resolve().parents[1] / "coupling" / "tree_oracle.py"
_spec = importlib.util.spec_from_file_location("bench_tree_oracle", _oracle_path)
_trees = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_trees)


def _cold():
    clear_cache()
    clear_coupling_caches()


def _timed(fn):
    _cold()
    wall, cpu = time.perf_counter(), time.process_time()
    result = fn()
    return result, time.perf_counter() - wall, time.process_time() - cpu


def six_momentum_formulas(count=20):
    rng = random.Random(2026)
    shapes = list(_trees.ordered_trees("abcdef", None))
    worst = 0.0
    for _ in range(count):
        first = coupling_tree(_trees.name_nodes(rng.choice(shapes), "x"))
        second = coupling_tree(_trees.name_nodes(rng.choice(shapes), "y"))
        _, wall, _ = _timed(lambda: recoupling_coefficient(first, second))
        worst = max(worst, wall)
    return worst


def ls_jj_two_d_electrons():
    d = {"l1": 2, "l2": 2, "s1": "1/2", "s2": "1/2"}
    ls = coupling_tree("((l1 l2) L, (s1 s2) S) J", d)
    jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J", d)
    matrix, wall, cpu = _timed(lambda: recoupling_matrix(ls, jj))
    assert matrix.is_orthogonal()
    return wall, cpu


def hyperfine_quadrupole_manifold():
    zeta, A, B = symbols("zeta A B")
    L, Sp, I, j = (AngularMomentum(x) for x in ("l", "s", "I", "j"))
    operator = ([(zeta * c, op) for c, op in scalar_coupled(L, Sp)]
                + [(A * c, op) for c, op in scalar_coupled(I, j)]
                + [(B * c, op) for c, op in scalar_coupled(CoupledTensorOperator(I, I, 2),
                                                           CoupledTensorOperator(j, j, 2))])
    tree = coupling_tree("((l s) j, I) F", l=2, s="1/2", I="7/2")
    blocks, wall, cpu = _timed(lambda: tree_operator_blocks(tree, operator))
    size = sum(len(states) * (2 * F + 1) for F, (states, _) in blocks.items())
    return wall, cpu, size, len(blocks)


def main():
    print("issue 13 targets (seconds)")
    worst = six_momentum_formulas()
    print(f"  recoupling formula, 6 momenta, worst of 20 pairs: {worst:.3f} s   (target < 1 s)")
    wall, cpu = ls_jj_two_d_electrons()
    print(f"  LS-jj matrix, two d electrons, all J: {wall:.3f} s wall, {cpu:.3f} s CPU   (target < 1 s)")
    wall, cpu, size, nblocks = hyperfine_quadrupole_manifold()
    print(f"  ((l s) j, I) F manifold l=2 s=1/2 I=7/2 ({size} states, {nblocks} F blocks), "
          f"zeta L.S + A I.J + B quadrupole: {wall:.3f} s wall, {cpu:.3f} s CPU   (target < 5 s)")


if __name__ == "__main__":
    main()
