"""Coupled-scheme reduced matrix elements (6j, 9j formulas) against explicit matrices.

The explicit route (``tensor_oracle.py``, numpy only) builds tensor operators on direct sums
of |j m> spaces from the definition of the reduced element (Edmonds 1957, eq. 5.4.1), takes
Kronecker products, couples with Racah-formula Clebsch-Gordan coefficients and reads the
reduced elements back by least squares.  The formulas under test are quoted as Edmonds (1957)
eqs. 7.1.1, 7.1.5-7.1.8 from memory; these tests are what verifies them.
"""

import importlib.util
import pathlib
import random
from itertools import product

import numpy as np
import pytest
from sympy import Rational, S, sqrt

from amalgebra.coupling import sixj
from amalgebra.errors import ConventionError, QuantumNumberError
from amalgebra.tensors.wigner_eckart import convert_reduced
from amalgebra.tensors.coupled_schemes import (angular_momentum_reduced, projected_reduced,
                                               projection_theorem, reduced_part1, reduced_part2,
                                               reduced_product_same_space, reduced_tensor_product,
                                               scalar_product_element, tensor_product_table)

_spec = importlib.util.spec_from_file_location(
    "tensor_oracle_coupled", pathlib.Path(__file__).with_name("tensor_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

HALF = Rational(1, 2)


def _r(x):
    return Rational(int(round(2 * x)), 2)


def _tri(a, b, c):
    return abs(a - b) <= c <= a + b and abs((a + b + c) - round(a + b + c)) < 1e-9


def _random_reduced(jlist, k, rng):
    return {(a, b): Rational(rng.randint(-9, 9), rng.randint(1, 4))
            for a in jlist for b in jlist if _tri(a, k, b)}


def _Js(j1, j2):
    return [abs(j1 - j2) + n for n in range(int(round(j1 + j2 - abs(j1 - j2))) + 1)]


class _Coupled:
    """Operators on (direct sum 1) x (direct sum 2) and the coupled-ket families."""

    def __init__(self, j1s, j2s):
        self.j1s, self.j2s = j1s, j2s
        self.n1, self.n2 = len(oracle.block_basis(j1s)), len(oracle.block_basis(j2s))

    def on1(self, ops):
        return {q: np.kron(m, np.eye(self.n2)) for q, m in ops.items()}

    def on2(self, ops):
        return {q: np.kron(np.eye(self.n1), m) for q, m in ops.items()}

    def family(self, j1, j2, J):
        return J, lambda M: oracle.coupled_vector(self.j1s, self.j2s, j1, j2, J, M)

    def states(self):
        for j1 in self.j1s:
            for j2 in self.j2s:
                for J in _Js(j1, j2):
                    yield j1, j2, J


def _float_sym(dict_exact):
    return {key: float(v) for key, v in dict_exact.items()}


@pytest.mark.parametrize("j1s, j2s, k", [
    ([0.5, 1.5], [1.0], 1),
    ([1.0, 2.0], [0.5, 1.5], 2),
    ([0.5, 1.5], [0.5], 2),
])
def test_part1_and_part2_against_explicit_matrices(j1s, j2s, k):
    # Edmonds (1957) eqs. 7.1.7 and 7.1.8 (from memory), verified by the explicit route
    rng = random.Random(11 + k)
    red1, red2 = _random_reduced(j1s, k, rng), _random_reduced(j2s, k, rng)
    space = _Coupled(j1s, j2s)
    T = space.on1(oracle.tensor_on_sum(j1s, k, _float_sym(red1)))
    U = space.on2(oracle.tensor_on_sum(j2s, k, _float_sym(red2)))
    checked = 0
    for (a1, a2, Jp), (b1, b2, J) in product(list(space.states()), repeat=2):
        if not _tri(Jp, k, J):
            continue
        bra, ket = space.family(a1, a2, Jp), space.family(b1, b2, J)
        explicit_T, res_T = oracle.reduced_from_matrix(T, k, bra, ket)
        explicit_U, res_U = oracle.reduced_from_matrix(U, k, bra, ket)
        assert res_T < 1e-9 and res_U < 1e-9
        got_T = reduced_part1(_r(a1), _r(a2), _r(Jp), _r(b1), _r(b2), _r(J), k,
                              red1.get((a1, b1), 0))
        got_U = reduced_part2(_r(a1), _r(a2), _r(Jp), _r(b1), _r(b2), _r(J), k,
                              red2.get((a2, b2), 0))
        assert complex(got_T) == pytest.approx(explicit_T, abs=1e-9)
        assert complex(got_U) == pytest.approx(explicit_U, abs=1e-9)
        checked += abs(explicit_T) > 1e-6
    assert checked > 3


@pytest.mark.parametrize("j1s, j2s, k1, k2", [
    ([0.5, 1.5], [1.0, 2.0], 1, 2),
    ([1.0], [0.5, 1.5], 2, 1),
    ([0.5, 1.5], [0.5, 1.5], 1, 1),
])
def test_tensor_product_against_explicit_matrices(j1s, j2s, k1, k2):
    # Edmonds (1957) eq. 7.1.5 (from memory), verified by the explicit route
    rng = random.Random(5 * k1 + k2)
    red1, red2 = _random_reduced(j1s, k1, rng), _random_reduced(j2s, k2, rng)
    space = _Coupled(j1s, j2s)
    T = space.on1(oracle.tensor_on_sum(j1s, k1, _float_sym(red1)))
    U = space.on2(oracle.tensor_on_sum(j2s, k2, _float_sym(red2)))
    checked = 0
    for k in range(abs(k1 - k2), k1 + k2 + 1):
        X = {q: sum(oracle.cg(k1, q1, k2, q - q1, k, q) * T[q1] @ U[q - q1]
                    for q1 in oracle.ms(k1) if abs(q - q1) <= k2)
             for q in oracle.ms(k)}
        for (a1, a2, Jp), (b1, b2, J) in product(list(space.states()), repeat=2):
            if not _tri(Jp, k, J):
                continue
            explicit, residual = oracle.reduced_from_matrix(X, k, space.family(a1, a2, Jp),
                                                            space.family(b1, b2, J))
            assert residual < 1e-9
            got = reduced_tensor_product(_r(a1), _r(a2), _r(Jp), _r(b1), _r(b2), _r(J), k1, k2, k,
                                         red1.get((a1, b1), 0), red2.get((a2, b2), 0))
            assert complex(got) == pytest.approx(explicit, abs=1e-9)
            checked += abs(explicit) > 1e-6
    assert checked > 5


@pytest.mark.parametrize("j1s, j2s, k", [([0.5, 1.5], [1.0, 2.0], 1), ([1.0, 2.0], [1.0], 2)])
def test_scalar_product_against_explicit_matrices(j1s, j2s, k):
    # Edmonds (1957) eq. 7.1.6 (from memory); scalar product sum_q (-1)^q T_q U_-q
    rng = random.Random(3 + k)
    red1, red2 = _random_reduced(j1s, k, rng), _random_reduced(j2s, k, rng)
    space = _Coupled(j1s, j2s)
    T = space.on1(oracle.tensor_on_sum(j1s, k, _float_sym(red1)))
    U = space.on2(oracle.tensor_on_sum(j2s, k, _float_sym(red2)))
    X = sum((-1) ** int(q) * T[q] @ U[-q] for q in oracle.ms(k))
    for (a1, a2, Jp), (b1, b2, J) in product(list(space.states()), repeat=2):
        got = scalar_product_element(_r(a1), _r(a2), _r(Jp), _r(b1), _r(b2), _r(J), k,
                                     red1.get((a1, b1), 0), red2.get((a2, b2), 0))
        for M in oracle.ms(min(J, Jp)):
            explicit = space.family(a1, a2, Jp)[1](M).conj() @ X @ space.family(b1, b2, J)[1](M)
            assert complex(got) == pytest.approx(explicit, abs=1e-9)


@pytest.mark.parametrize("jlist, k1, k2", [([0.5, 1.5], 1, 1), ([1.0, 2.0], 1, 2), ([0.5, 1.5, 2.5], 2, 2)])
def test_same_space_product_against_explicit_matrices(jlist, k1, k2):
    # Edmonds (1957) eq. 7.1.1 (from memory), verified by the explicit route
    rng = random.Random(k1 * 7 + k2)
    red1, red2 = _random_reduced(jlist, k1, rng), _random_reduced(jlist, k2, rng)
    T = oracle.tensor_on_sum(jlist, k1, _float_sym(red1))
    U = oracle.tensor_on_sum(jlist, k2, _float_sym(red2))
    basis = oracle.block_basis(jlist)

    def family(j):
        return j, lambda m: np.array([1.0 if b == (j, m) else 0.0 for b in basis])

    for k in range(abs(k1 - k2), k1 + k2 + 1):
        X = {q: sum(oracle.cg(k1, q1, k2, q - q1, k, q) * T[q1] @ U[q - q1]
                    for q1 in oracle.ms(k1) if abs(q - q1) <= k2) for q in oracle.ms(k)}
        for jp, j in product(jlist, repeat=2):
            if not _tri(jp, k, j):
                continue
            explicit, residual = oracle.reduced_from_matrix(X, k, family(jp), family(j))
            assert residual < 1e-9
            inter = {_r(x): (red1.get((jp, x), 0), red2.get((x, j), 0)) for x in jlist}
            got = reduced_product_same_space(_r(jp), _r(j), k1, k2, k, inter)
            assert complex(got) == pytest.approx(explicit, abs=1e-9)


def test_cg_convention_is_consistent():
    # the CG-form result must be the conversion of the Edmonds one (sqrt(2j'+1), design.md)
    r1, r2 = Rational(3, 7), Rational(-2, 5)
    args = (1, HALF, Rational(3, 2), 2, HALF, Rational(3, 2))
    edm = reduced_part1(*args, 1, convert_reduced(r1, 1, 2, "cg", "edmonds"))
    assert reduced_part1(*args, 1, r1, convention="cg") == convert_reduced(edm, Rational(3, 2), Rational(3, 2),
                                                                           "edmonds", "cg")
    args = (1, Rational(3, 2), Rational(5, 2), 1, HALF, Rational(3, 2))
    edm = reduced_tensor_product(*args, 0, 1, 1, r1 * sqrt(3), convert_reduced(r2, Rational(3, 2), HALF,
                                                                                 "cg", "edmonds"))
    cgf = reduced_tensor_product(*args, 0, 1, 1, r1, r2, convention="cg")
    assert cgf == convert_reduced(edm, Rational(5, 2), Rational(3, 2), "edmonds", "cg") != 0
    with pytest.raises(ConventionError):
        reduced_part2(*args, 1, convention="wigner")


def test_bad_couplings_raise():
    with pytest.raises(QuantumNumberError, match="triangle"):
        reduced_part1(1, 1, 3, 1, 1, 2, 1)
    with pytest.raises(QuantumNumberError):
        projected_reduced(0, 1)


@pytest.mark.parametrize("L, Sv", [(1, HALF), (2, HALF), (1, 1), (2, Rational(3, 2)), (3, 1)])
def test_lande_g_by_projection_theorem(L, Sv):
    L, Sv = S(L), S(Sv)
    # Lande formula g_J = 1 + [J(J+1) + S(S+1) - L(L+1)] / [2J(J+1)] with g_L = 1, g_S = 2
    # (Sakurai, Modern Quantum Mechanics, Zeeman effect; common practice)
    Lz, _, _ = oracle.spin(float(L))
    Sz, Sp, Sm = oracle.spin(float(Sv))
    _, Lp, Lm = oracle.spin(float(L))
    nL, nS = Lz.shape[0], Sz.shape[0]
    mu = {0: np.kron(Lz, np.eye(nS)) + 2 * np.kron(np.eye(nL), Sz),
          1: -(np.kron(Lp, np.eye(nS)) + 2 * np.kron(np.eye(nL), Sp)) / np.sqrt(2),
          -1: (np.kron(Lm, np.eye(nS)) + 2 * np.kron(np.eye(nL), Sm)) / np.sqrt(2)}
    for J in _Js(L, Sv):
        if J == 0:
            continue
        jdotv = J * (J + 1) + (J * (J + 1) + Sv * (Sv + 1) - L * (L + 1)) / 2   # J.(L+2S) = J^2 + J.S
        lande = 1 + (J * (J + 1) + Sv * (Sv + 1) - L * (L + 1)) / (2 * J * (J + 1))
        assert projection_theorem(J, J, 0, J, jdotv) == lande * J
        for Mp in oracle.ms(float(J)):
            for M in oracle.ms(float(J)):
                if abs(Mp - M) > 1:
                    continue
                bra = oracle.coupled_vector([float(L)], [float(Sv)], float(L), float(Sv), float(J), Mp)
                ket = oracle.coupled_vector([float(L)], [float(Sv)], float(L), float(Sv), float(J), M)
                explicit = bra.conj() @ mu[int(Mp - M)] @ ket
                got = projection_theorem(J, _r(Mp), _r(Mp - M), _r(M), jdotv)
                assert complex(got) == pytest.approx(explicit, abs=1e-10)


def test_projection_reduced_of_J_itself():
    # <j||J||j> = sqrt(j(j+1)(2j+1)) (design.md; Edmonds 1957 eq. 5.4.3); CG form sqrt(j(j+1))
    for j in (HALF, 1, Rational(7, 2)):
        assert projected_reduced(j, j * (j + 1)) == angular_momentum_reduced(j) == sqrt(j * (j + 1) * (2 * j + 1))
        assert projected_reduced(j, j * (j + 1), "cg") == sqrt(j * (j + 1))


@pytest.mark.parametrize("I, J", [(Rational(3, 2), Rational(3, 2)), (Rational(7, 2), Rational(3, 2)),
                                  (1, 1), (Rational(5, 2), 2), (3, Rational(5, 2))])
def test_casimir_quadrupole_hyperfine_energies(I, J):
    # Casimir formula: E_Q = B [3K(K+1)/4 - I(I+1)J(J+1)] / [2I(2I-1)J(2J-1)],
    # K = F(F+1) - I(I+1) - J(J+1) (Kopfermann, Nuclear Moments; Arimondo et al. RMP 49, 31 (1977))
    # H_Q = 3B/[2I(2I-1)J(2J-1)] [I x I]^2 . [J x J]^2 (the scalar product reproduces
    # 3(I.J)^2 + 3/2 I.J - I^2 J^2, common practice)
    B = S(1)
    rI, rJ = angular_momentum_reduced(I), angular_momentum_reduced(J)
    qI = reduced_product_same_space(I, I, 1, 1, 2, {I: (rI, rI)})
    qJ = reduced_product_same_space(J, J, 1, 1, 2, {J: (rJ, rJ)})
    scale = 3 * B / (2 * I * (2 * I - 1) * J * (2 * J - 1))
    for F in _Js(I, J):
        K = F * (F + 1) - I * (I + 1) - J * (J + 1)
        casimir = B * (Rational(3, 4) * K * (K + 1) - I * (I + 1) * J * (J + 1)) / (
            2 * I * (2 * I - 1) * J * (2 * J - 1))
        got = scale * scalar_product_element(I, J, F, I, J, F, 2, qI, qJ)
        assert (got - casimir).expand() == 0


@pytest.mark.parametrize("J, Jp, I", [(HALF, Rational(3, 2), Rational(3, 2)), (HALF, HALF, Rational(7, 2)),
                                      (1, 2, Rational(5, 2)), (Rational(3, 2), Rational(5, 2), 1)])
def test_hyperfine_line_strengths(J, Jp, I):
    # relative strength (2F'+1)(2J+1){J J' 1; F' F I}^2 summing to 1 over F' for each F
    # (Sobelman, Atomic Spectra and Radiative Transitions; from memory in the brief)
    red = S(1)
    for F in _Js(J, I):
        total = S(0)
        for Fp in _Js(Jp, I):
            if not _tri(F, 1, Fp):
                continue
            element = reduced_part1(Jp, I, Fp, J, I, F, 1, red)
            strength = element ** 2 * (2 * J + 1) / ((2 * F + 1) * red ** 2)
            assert strength == (2 * Fp + 1) * (2 * J + 1) * sixj(J, Jp, 1, Fp, F, I) ** 2
            total += strength
        assert total == 1


def _explicit_tensor_product_entry(j1p, j2p, Jp, j1, j2, J, k1, k2, k):
    """Reduced element of [T^k1(1) x U^k2(2)]^k with <j1'||T||j1> = <j2'||U||j2> = 1, explicitly."""
    j1s, j2s = sorted({float(j1), float(j1p)}), sorted({float(j2), float(j2p)})
    space = _Coupled(j1s, j2s)
    T = space.on1(oracle.tensor_on_sum(j1s, k1, {(float(j1p), float(j1)): 1.0}))
    U = space.on2(oracle.tensor_on_sum(j2s, k2, {(float(j2p), float(j2)): 1.0}))
    X = {q: sum(oracle.cg(k1, q1, k2, q - q1, k, q) * T[q1] @ U[q - q1]
                for q1 in oracle.ms(k1) if abs(q - q1) <= k2) for q in oracle.ms(k)}
    value, residual = oracle.reduced_from_matrix(X, k, space.family(float(j1p), float(j2p), float(Jp)),
                                                 space.family(float(j1), float(j2), float(J)))
    assert residual < 1e-9
    return value


def _sample_table(js, count, seed):
    table = tensor_product_table(js, js, 2, 2, range(5))
    rng = random.Random(seed)
    keys = sorted(table, key=lambda key: tuple(float(x) for x in key))
    for key in rng.sample(keys, count):
        explicit = _explicit_tensor_product_entry(*key[:6], 2, 2, int(key[6]))
        assert complex(table[key]) == pytest.approx(explicit, abs=1e-9)


def test_benchmark_table_sample_small():
    # the benchmark's table (Edmonds eq. 7.1.5) on j <= 3/2, a random sample vs the explicit route
    _sample_table([Rational(n, 2) for n in range(4)], 12, 1)


@pytest.mark.slow
def test_benchmark_table_sample_full():
    # the complete benchmark table (j <= 3), a larger random sample vs the explicit route
    _sample_table([Rational(n, 2) for n in range(7)], 40, 2)


@pytest.mark.parametrize("l, s", [(1, HALF), (2, 1)])
def test_part_formulas_against_coupled_kets_of_the_states_layer(l, s):
    # a second, exact and independent route: coupled kets and matrix elements of amalgebra.states
    # (L and S as rank-1 tensors: <l||L||l> = sqrt(l(l+1)(2l+1)), design.md)
    from amalgebra.algebra import AngularMomentum
    from amalgebra.tensors.wigner_eckart import wigner_eckart
    from amalgebra.states.action import matrix_element
    from amalgebra.states.coupled import coupled_ket

    L, Sop = AngularMomentum("L"), AngularMomentum("S")
    l, s = S(l), S(s)
    red_L, red_S = angular_momentum_reduced(l), angular_momentum_reduced(s)
    for J in _Js(l, s):
        for Jp in _Js(l, s):
            if not _tri(Jp, 1, J):
                continue
            rL = reduced_part1(l, s, Jp, l, s, J, 1, red_L)
            rS = reduced_part2(l, s, Jp, l, s, J, 1, red_S)
            for M in [J - n for n in range(int(2 * J) + 1)]:
                for q in (1, 0, -1):
                    Mp = M + q
                    if abs(Mp) > Jp:
                        continue
                    bra = coupled_ket(l, s, Jp, Mp, labels=("L", "S"))
                    ket = coupled_ket(l, s, J, M, labels=("L", "S"))
                    got_L = matrix_element(bra, L.spherical[q], ket)
                    got_S = matrix_element(bra, Sop.spherical[q], ket)
                    assert (got_L - wigner_eckart(Jp, Mp, 1, q, J, M, rL)).expand() == 0
                    assert (got_S - wigner_eckart(Jp, Mp, 1, q, J, M, rS)).expand() == 0


def test_symbolic_j_goes_through_closed_forms():
    # with a symbolic j the 6j comes from amalgebra.coupling's closed forms; at numeric j the
    # result must agree with the numeric route (two code paths for one formula)
    from sympy import Symbol
    j = Symbol("j", positive=True)
    sym = reduced_part1(j, HALF, j + HALF, j, HALF, j + HALF, 1, S(1))
    assert sym.has(j)
    for value in (1, Rational(3, 2), 2, Rational(7, 2)):
        numeric = reduced_part1(value, HALF, value + HALF, value, HALF, value + HALF, 1, S(1))
        assert (sym.subs(j, value) - numeric).simplify() == 0 != numeric
