"""Coupling coefficients against the independent numpy oracle of ``spin_oracle.py``.

Source of every expected value: numpy (explicit spin matrices, diagonalisation
of J^2, overlaps of coupling schemes), see ``spin_oracle.py``.
"""

import importlib.util
import itertools
import pathlib
import random

import numpy as np
import pytest
from sympy import Rational

from amalgebra.coupling import cg, cg_float, ninej, ninej_float, sixj, sixj_float, threej, threej_float

_spec = importlib.util.spec_from_file_location("coupling_spin_oracle", pathlib.Path(__file__).with_name("spin_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

TOL = oracle.TOL
TJMAX = oracle.TJMAX
_ms = oracle._ms
oracle_cg, oracle_threej, oracle_sixj = oracle.oracle_cg, oracle.oracle_threej, oracle.oracle_sixj
oracle_ninej_block = oracle.oracle_ninej_block


def _half(t):
    return Rational(t, 2)


# ---------------------------------------------------------------- the oracle itself


def test_oracle_reproduces_pdg_entries():
    # Particle Data Group CG table, 1 x 1/2: sqrt(2/3) and -sqrt(1/3) (sanity of the oracle itself).
    assert abs(oracle_cg(2, 0, 1, 1, 3, 1) - np.sqrt(2 / 3)) < TOL
    assert abs(oracle_cg(2, 0, 1, 1, 1, 1) + np.sqrt(1 / 3)) < TOL
    assert abs(oracle_cg(2, 2, 1, -1, 1, 1) - np.sqrt(2 / 3)) < TOL


# ---------------------------------------------------------------- sweeps, every j <= 3


def _all_threej():
    for tj1, tj2, tj3 in itertools.product(range(TJMAX + 1), repeat=3):
        for tm1 in range(-tj1, tj1 + 1, 2):
            for tm2 in range(-tj2, tj2 + 1, 2):
                for tm3 in range(-tj3, tj3 + 1, 2):
                    yield tj1, tj2, tj3, tm1, tm2, tm3


def test_threej_all_j_le_3_against_oracle():
    count = nonzero = 0
    for args in _all_threej():
        expected = oracle_threej(*args)
        got = threej_float(*map(_half, args))
        assert abs(got - expected) < TOL, args
        count += 1
        nonzero += expected != 0
    assert count == 28 ** 3  # every (j, m) with j <= 3: sum of (2j+1) is 28 per column
    assert nonzero > 1000


def test_cg_all_j_le_3_against_oracle():
    count = 0
    for tj1, tj2, tJ in itertools.product(range(TJMAX + 1), repeat=3):
        if (tj1 + tj2 + tJ) % 2:
            continue  # J - M would not be an integer for M = m1 + m2
        for tm1 in range(-tj1, tj1 + 1, 2):
            for tm2 in range(-tj2, tj2 + 1, 2):
                for tM in range(-tJ, tJ + 1, 2):
                    expected = oracle_cg(tj1, tm1, tj2, tm2, tJ, tM)
                    assert abs(cg_float(*map(_half, (tj1, tm1, tj2, tm2, tJ, tM))) - expected) < TOL
                    count += 1
    assert count > 10000


def test_exact_values_match_oracle_sample():
    # The exact SymPy values (not only the float path) agree with the oracle.
    rng = random.Random(5)
    cases = [a for a in _all_threej()]
    for args in rng.sample(cases, 400):
        assert abs(float(threej(*map(_half, args))) - oracle_threej(*args)) < TOL
    for _ in range(300):
        tj1, tj2 = rng.randint(0, TJMAX), rng.randint(0, TJMAX)
        tJ = rng.randrange((tj1 + tj2) % 2, TJMAX + 1, 2)
        tm1, tm2 = rng.choice(_ms(tj1)), rng.choice(_ms(tj2))
        args = (tj1, tm1, tj2, tm2, tJ, tm1 + tm2)
        if abs(tm1 + tm2) <= tJ:
            assert abs(float(cg(*map(_half, args))) - oracle_cg(*args)) < TOL


def test_sixj_all_j_le_3_against_oracle():
    count = valid = 0
    for args in itertools.product(range(TJMAX + 1), repeat=6):
        expected = oracle_sixj(*args)
        got = sixj_float(*map(_half, args))
        assert abs(got - expected) < TOL, args
        count += 1
        valid += expected != 0
    assert count == 7 ** 6 and valid > 3000


def test_sixj_exact_sample_against_oracle():
    rng = random.Random(6)
    for _ in range(300):
        args = tuple(rng.randint(0, TJMAX) for _ in range(6))
        assert abs(float(sixj(*map(_half, args))) - oracle_sixj(*args)) < TOL


def _check_ninej_block(t1, t2, t3, t4, exact=False):
    block = oracle_ninej_block(t1, t2, t3, t4)
    for (t12, t34, t13, t24, tJ), expected in block.items():
        args = tuple(map(_half, (t1, t2, t12, t3, t4, t34, t13, t24, tJ)))
        got = float(ninej(*args)) if exact else ninej_float(*args)
        assert abs(got - expected) < TOL, (t1, t2, t12, t3, t4, t34, t13, t24, tJ)
    return len(block)


def test_ninej_all_j_le_1_against_oracle():
    total = sum(_check_ninej_block(*q) for q in itertools.product(range(3), repeat=4))
    assert total > 300


def test_ninej_sample_j_le_3_against_oracle():
    rng = random.Random(9)
    quads = list(itertools.product(range(TJMAX + 1), repeat=4))
    total = sum(_check_ninej_block(*q, exact=True) for q in rng.sample(quads, 16))
    assert total > 100


@pytest.mark.slow
def test_ninej_all_j_le_3_against_oracle():
    total = sum(_check_ninej_block(*q) for q in itertools.product(range(TJMAX + 1), repeat=4))
    assert total > 10000
