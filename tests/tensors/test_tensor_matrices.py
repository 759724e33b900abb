"""Matrices of tensor and vector operator components on direct sums of multiplets (amalgebra.matrices.explicit).

Oracles: ``tensor_oracle.py`` (numpy only: Racah-formula Clebsch-Gordan coefficients, DLMF 34.3.7,
and the Edmonds 1957 eq. 5.4.1 definition of the reduced element), numpy's Kronecker product, and
scipy's spherical harmonics with Gauss-Legendre quadrature for the Racah tensor C^1.
"""

import importlib.util
import os
import pathlib
import subprocess
import sys

import numpy as np
import pytest
import scipy.sparse
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import Add, I, Matrix, Mul, Rational, S, expand, kronecker_product, sqrt, symbols, zeros

from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import boson_modes
from amalgebra.errors import NotNumericError, OperatorError, QuantumNumberError
from amalgebra.matrices.explicit import to_matrix, verify_identity
from amalgebra.tensors import SphericalTensor, VectorOperator, racah_tensor, unit_tensor

_spec = importlib.util.spec_from_file_location(
    "tensor_oracle_matrices", pathlib.Path(__file__).with_name("tensor_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

J, L, S_ = AngularMomentum("J"), AngularMomentum("L"), AngularMomentum("S")


def _floats(matrix):
    return np.array(matrix.evalf(), dtype=complex)


def _random_reduced(rng, jlist, k):
    """Random rational reduced elements for every triangle-allowed pair (exact and float forms)."""
    exact, floats = {}, {}
    for jp in jlist:
        for j in jlist:
            a, b = Rational(jp), Rational(j)
            if abs(a - b) <= k <= a + b and (a + b + k).is_integer:
                value = Rational(int(rng.integers(-40, 41)), int(rng.integers(1, 13)))
                exact[(jp, j)] = value
                floats[(float(a), float(b))] = float(value)
    return exact, floats


def _spin_blocks(jlist):
    """Block-diagonal (Jz, J+, J-) on a direct sum, from the oracle's single-j matrices."""
    parts = [oracle.spin(float(Rational(j))) for j in jlist]
    n = sum(p[0].shape[0] for p in parts)
    out = []
    for which in range(3):
        mat = np.zeros((n, n), complex)
        at = 0
        for p in parts:
            d = p[which].shape[0]
            mat[at:at + d, at:at + d] = p[which]
            at += d
        out.append(mat)
    return out


# ------------------------------------------------------------- against the independent oracle

SPACES = [
    (["1/2", "3/2"], 1),
    ([0, 1, 2], 1),
    ([0, 1, 2], 2),
    ([1, 2, 3], 2),
    (["1/2", "3/2", "5/2"], 2),
    ([0, "1/2", 1], "1/2"),      # half-integer rank connects integer and half-integer j
    ([2], 2),                    # one multiplet: only <2||T||2>
    (["3/2", "1/2"], 1),         # j order as given
]


@pytest.mark.parametrize("jlist, k", SPACES)
def test_components_match_oracle(jlist, k):
    # Wigner-Eckart (Edmonds 1957 eq. 5.4.1) with Racah-formula CGs (DLMF 34.3.7): tensor_oracle
    rng = np.random.default_rng(10 * len(jlist) + int(2 * Rational(k)))
    T = SphericalTensor("T", k, "J")
    exact, floats = _random_reduced(rng, jlist, Rational(k))
    ref = oracle.tensor_on_sum([float(Rational(j)) for j in jlist], float(Rational(k)), floats)
    for component in T.components:
        q = float(component.q)
        got = to_matrix(component, {"J": jlist}, reduced={T: exact}, kind="float")
        assert np.allclose(got, ref[q], atol=1e-12)
        assert np.allclose(_floats(to_matrix(component, {"J": jlist}, reduced={T: exact})), ref[q], atol=1e-12)
    assert any(np.abs(m).max() > 0.1 for m in ref.values())


@settings(deadline=None)
@given(st.sampled_from([([0, 1, 2], 1), (["1/2", "3/2"], 2), ([1, 2], 3), (["1/2", "3/2"], "1/2")]),
       st.integers(0, 2**32 - 1))
def test_random_reduced_match_oracle(space, seed):
    # tensor_oracle.tensor_on_sum: Edmonds 1957 eq. 5.4.1, Racah-formula CGs (DLMF 34.3.7)
    jlist, k = space
    T = SphericalTensor("Q", k, "L")
    exact, floats = _random_reduced(np.random.default_rng(seed), jlist, Rational(k))
    ref = oracle.tensor_on_sum([float(Rational(j)) for j in jlist], float(Rational(k)), floats)
    for component in T.components:
        got = to_matrix(component, {"L": jlist}, reduced={T: exact}, kind="sparse")
        assert isinstance(got, scipy.sparse.csr_array)
        assert np.allclose(got.toarray(), ref[float(component.q)], atol=1e-12)


def test_callable_reduced_and_unit_tensor():
    # <j'||u^k||j> = delta_{j'j} (Racah's unit tensor, Edmonds normalisation); oracle: tensor_oracle
    jlist = [1, 2]
    u = unit_tensor(2, "J")
    ref = oracle.tensor_on_sum([1.0, 2.0], 2.0, {(1.0, 1.0): 1.0, (2.0, 2.0): 1.0})
    assert np.allclose(to_matrix(u[1], {"J": jlist}, kind="float"), ref[1.0])
    T = SphericalTensor("T", 2, "J")
    got = to_matrix(T[1], {"J": jlist}, reduced={T: lambda jp, j: S.One if jp == j else S.Zero}, kind="float")
    assert np.allclose(got, ref[1.0])


def test_vector_components_match_oracle():
    # V_{+1} = -(Vx + iVy)/sqrt2, V_{-1} = (Vx - iVy)/sqrt2 (design.md) inverted by hand:
    # Vx = (V_{-1} - V_{+1})/sqrt2, Vy = i(V_{+1} + V_{-1})/sqrt2; spherical parts from tensor_oracle
    r = VectorOperator("r", "L")
    exact = {(1, 0): Rational(3, 2), (0, 1): Rational(-3, 2), (1, 1): Rational(1, 3), (2, 1): Rational(5, 7),
             (1, 2): Rational(-5, 7), (2, 2): Rational(2)}
    floats = {(float(a), float(b)): float(v) for (a, b), v in exact.items()}
    sph = oracle.tensor_on_sum([0.0, 1.0, 2.0], 1.0, floats)
    want = {"x": (sph[-1.0] - sph[1.0]) / np.sqrt(2), "y": 1j * (sph[1.0] + sph[-1.0]) / np.sqrt(2), "z": sph[0.0]}
    for axis, component in zip("xyz", r.vector):
        got = to_matrix(component, {"L": [0, 1, 2]}, reduced={r: exact}, kind="float")
        assert np.allclose(got, want[axis])
    # the design.md spherical combination rebuilds the oracle's V_{+1}
    vp = to_matrix(-(r.x + I * r.y) / sqrt(2), {"L": [0, 1, 2]}, reduced={r: exact}, kind="float")
    assert np.allclose(vp, sph[1.0]) and np.abs(sph[1.0]).max() > 0.5


def test_products_with_angular_momentum_and_labels():
    # same-label products are matrix products; other labels are Kronecker factors in sorted label
    # order (numpy.kron), spin matrices from the ladder formula (Sakurai 3.5.41) in tensor_oracle
    T = SphericalTensor("T", 1, "L")
    red = {(0, 1): Rational(2), (1, 0): Rational(-1, 3), (1, 1): Rational(5, 4), (2, 1): Rational(3)}
    fl = {(float(a), float(b)): float(v) for (a, b), v in red.items()}
    sph = oracle.tensor_on_sum([0.0, 1.0, 2.0], 1.0, fl)
    lz, lp, lm = _spin_blocks([0, 1, 2])
    sz, sp, _ = oracle.spin(0.5)
    space = {"S": "1/2", "L": [0, 1, 2]}
    got = to_matrix(L.plus * T[0] * S_.plus + 3 * T[-1] * L.z * S_.z, space, reduced={T: red}, kind="float")
    want = np.kron(lp @ sph[0.0], sp) + 3 * np.kron(sph[-1.0] @ lz, sz)
    assert np.allclose(got, want) and np.abs(want).max() > 0.5
    exact = to_matrix(L.plus * T[0] * S_.plus + 3 * T[-1] * L.z * S_.z, space, reduced={T: red})
    assert np.allclose(_floats(exact), want)


def test_two_tensor_families_on_two_labels():
    # kron(T on L, U on S) (numpy.kron; tensor_oracle for each factor), and (T_1)^2 a matrix square
    T, U = SphericalTensor("T", 1, "L"), SphericalTensor("U", "1/2", "S")
    rt = {(0, 1): Rational(1), (1, 0): Rational(2), (1, 1): Rational(-1), (2, 1): Rational(3, 2)}
    ru = {("1/2", 0): Rational(3), (0, "1/2"): Rational(1, 2), (1, "1/2"): Rational(-2), ("1/2", 1): Rational(5)}
    f = lambda red: {(float(Rational(a)), float(Rational(b))): float(v) for (a, b), v in red.items()}  # noqa: E731
    ot = oracle.tensor_on_sum([0.0, 1.0, 2.0], 1.0, f(rt))
    ou = oracle.tensor_on_sum([0.0, 0.5, 1.0], 0.5, f(ru))
    space = {"L": [0, 1, 2], "S": [0, "1/2", 1]}
    got = to_matrix(U[Rational(-1, 2)] * T[1] ** 2 - T[0] * U[S.Half], space, reduced={T: rt, U: ru}, kind="float")
    want = np.kron(ot[1.0] @ ot[1.0], ou[-0.5]) - np.kron(ot[0.0], ou[0.5])
    assert np.allclose(got, want) and np.abs(want).max() > 0.1
    assert np.abs(ot[1.0] @ ot[1.0]).max() > 0.1          # T_1^2: |0 0> -> |2 2> through |1 1>


def test_single_multiplet_is_the_diagonal_block():
    # documented: a single j is the one-multiplet space, the (j, j) block of any direct sum
    T = SphericalTensor("T", 2, "J")
    big = to_matrix(T[1], {"J": [0, 1, 2]})
    small = to_matrix(T[1], {"J": 1})
    assert big[1:4, 1:4] == small != zeros(3)
    assert to_matrix(T[1], {"J": [1]}) == small


# ------------------------------------------------------------- commutation relations, exact

def _commutator(a, b, space):
    return to_matrix(a * b - b * a, space)


@pytest.mark.parametrize("k, space", [
    (1, {"L": [0, 1, 2]}),
    (2, {"L": [0, 1, 2]}),
    ("1/2", {"L": ["1/2", 1, "3/2"]}),
    ("3/2", {"L": ["1/2", "3/2", 2]}),
])
def test_tensor_commutators_symbolic(k, space):
    # [Jz, T_q] = q T_q, [J+-, T_q] = sqrt(k(k+1) - q(q+-1)) T_{q+-1}: Racah (1942), Sakurai
    # section 3.10 (equation numbers from memory); symbolic reduced elements throughout
    T = SphericalTensor("T", k, "L")
    kk = Rational(k)
    for component in T.components:
        q = component.q
        mat = to_matrix(component, space)
        assert mat != zeros(*mat.shape)
        assert _commutator(L.z, component, space) == expand(q * mat)
        for gen, sign in ((L.plus, 1), (L.minus, -1)):
            target = q + sign
            rhs = (sqrt(kk * (kk + 1) - q * (q + sign)) * to_matrix(T[target], space)
                   if abs(target) <= kk else zeros(*mat.shape))
            assert _commutator(gen, component, space) == rhs.applyfunc(expand)


def test_vector_commutators_symbolic():
    # [J_i, V_j] = i eps_ijk V_k (Sakurai section 3.10, vector operator; from memory)
    V = VectorOperator("V", "J")
    space = {"J": ["1/2", "3/2", "5/2"]}
    gens = {"x": J.x, "y": J.y, "z": J.z}
    eps = {("x", "y"): ("z", 1), ("y", "z"): ("x", 1), ("z", "x"): ("y", 1),
           ("y", "x"): ("z", -1), ("z", "y"): ("x", -1), ("x", "z"): ("y", -1)}
    for a in "xyz":
        for b in "xyz":
            got = _commutator(gens[a], V.component(b), space)
            if a == b:
                assert got == zeros(*got.shape)
            else:
                c, sign = eps[(a, b)]
                want = to_matrix(sign * I * V.component(c), space)
                assert got == want != zeros(*got.shape)


def test_squared_and_scalar_products():
    # J^2 = j(j+1) on each block (Sakurai 3.5); T.T-like scalar sum_q (-1)^q T_q T_-q commutes
    # with J (a rank-0 product, Edmonds 1957 ch. 5; from memory)
    T = SphericalTensor("T", 1, "J")
    space = {"J": ["1/2", "3/2"]}
    scalar = Add(*[S.NegativeOne ** q * T[q] * T[-q] for q in (1, 0, -1)])
    for gen in (J.z, J.plus, J.minus):
        assert _commutator(gen, scalar, space) == zeros(6)
    assert to_matrix(scalar, space) != zeros(6)
    assert to_matrix(J.squared, space) == Matrix.diag(*([Rational(3, 4)] * 2 + [Rational(15, 4)] * 4))


# ------------------------------------------------------------- Racah tensor C^1

def _legendre_zero(lp, l):
    """<l' 0|cos theta|l 0> by Gauss-Legendre quadrature of normalised Legendre polynomials (numpy)."""
    x, w = np.polynomial.legendre.leggauss(40)
    pl = np.polynomial.legendre.legval(x, [0] * l + [1]) * np.sqrt((2 * l + 1) / 2)
    plp = np.polynomial.legendre.legval(x, [0] * lp + [1]) * np.sqrt((2 * lp + 1) / 2)
    return float(np.sum(w * plp * x * pl))


@pytest.mark.parametrize("l", [0, 1, 2, 3, 4])
def test_racah_c1_closed_form(l):
    # <l+1||C^1||l> = sqrt(l+1), <l-1||C^1||l> = -sqrt(l) (Edmonds normalisation; from memory),
    # checked through Wigner-Eckart (oracle 3j) and C^1_0 = cos(theta) by numpy quadrature
    C = racah_tensor(1)
    ls = [x for x in (l - 1, l, l + 1) if x >= 0]
    mat = to_matrix(C[0], {"L": ls})
    index = {}
    at = 0
    for x in ls:
        index[x] = at + x        # m = 0 sits x rows below the top of block x
        at += 2 * x + 1
    assert C.reduced(l + 1, l) == sqrt(l + 1)
    up = float(mat[index[l + 1], index[l]])
    assert abs(up - (-1) ** (l + 1) * oracle.threej(l + 1, 1, l, 0, 0, 0) * np.sqrt(l + 1)) < 1e-12
    assert abs(up - _legendre_zero(l + 1, l)) < 1e-12
    assert mat[index[l], index[l]] == 0       # parity: (l 1 l; 0 0 0) = 0
    if l > 0:
        assert C.reduced(l - 1, l) == -sqrt(l)
        down = float(mat[index[l - 1], index[l]])
        assert abs(down - (-1) ** (l - 1) * oracle.threej(l - 1, 1, l, 0, 0, 0) * (-np.sqrt(l))) < 1e-12
        assert abs(down - _legendre_zero(l - 1, l)) < 1e-12


def test_racah_c1_all_components_against_quadrature():
    # <l' m'|C^1_q|l m> = sqrt(4 pi/3) int conj(Y_l'm') Y_1q Y_lm dOmega, scipy.special.sph_harm_y
    # (Condon-Shortley) on a Gauss-Legendre x uniform-phi grid; C^k_q = sqrt(4pi/(2k+1)) Y_kq (design.md)
    from scipy.special import sph_harm_y
    ls = [0, 1, 2, 3]
    x, w = np.polynomial.legendre.leggauss(24)
    theta = np.arccos(x)
    phi = np.linspace(0, 2 * np.pi, 24, endpoint=False)
    th, ph = np.meshgrid(theta, phi, indexing="ij")
    weight = np.outer(w, np.full(len(phi), 2 * np.pi / len(phi)))
    basis = [(l, m) for l in ls for m in range(l, -l - 1, -1)]
    C = racah_tensor(1)
    for q in (1, 0, -1):
        got = to_matrix(C[q], {"L": ls}, kind="float")
        y1q = np.sqrt(4 * np.pi / 3) * sph_harm_y(1, q, th, ph)
        want = np.zeros((len(basis), len(basis)), complex)
        for r, (lp, mp) in enumerate(basis):
            left = np.conj(sph_harm_y(lp, mp, th, ph)) * y1q
            for c, (l, m) in enumerate(basis):
                want[r, c] = np.sum(weight * left * sph_harm_y(l, m, th, ph))
        assert np.allclose(got, want, atol=1e-12)


# ------------------------------------------------------------- kinds, symbols, errors

def test_float_and_sparse_agree_with_exact():
    # the three kinds of one matrix; the exact one evaluated by SymPy evalf (common practice)
    T, r = SphericalTensor("T", 2, "J"), VectorOperator("r", "J")
    a = symbols("a")
    rt = {(j1, j2): Rational(j1 * 3 + 1, j2 + 2) for j1 in (0, 1, 2) for j2 in (0, 1, 2)}
    red = {T: rt, r: lambda jp, j: jp - 2 * j + Rational(1, 3)}
    expr = a * T[1] * r.y + J.x * T[-2] - r.z ** 2
    space = {"J": [0, 1, 2]}
    exact = to_matrix(expr, space, reduced=red, subs={a: Rational(1, 2)})
    dense = to_matrix(expr, space, reduced=red, kind="float", subs={a: 0.5})
    sparse = to_matrix(expr, space, reduced=red, kind="sparse", subs={a: 0.5})
    assert dense.dtype == np.complex128
    assert np.allclose(_floats(exact), dense) and np.allclose(sparse.toarray(), dense)
    assert np.abs(dense).max() > 0.1


def test_symbolic_reduced_refused_by_float_unless_subs():
    T = SphericalTensor("T", 1, "J")
    space = {"J": ["1/2", "3/2"]}
    with pytest.raises(NotNumericError, match="reduced"):
        to_matrix(T[0], space, kind="float")
    with pytest.raises(NotNumericError):
        to_matrix(T[0], space, kind="sparse")
    values = {T.reduced(a, b): Rational(2) for a in ("1/2", "3/2") for b in ("1/2", "3/2")}
    exact = to_matrix(T[0], space, reduced={T: {(a, b): 2 for a in ("1/2", "3/2") for b in ("1/2", "3/2")}})
    assert np.allclose(to_matrix(T[0], space, kind="float", subs=values), _floats(exact))
    assert to_matrix(T[0], space, subs=values) == exact


def test_real_matrices_are_real():
    # documented: complex dtype only when an entry is complex on the product route
    r = VectorOperator("r", "L")
    red = {r: {(0, 1): 1, (1, 0): -1, (1, 1): 2}}
    assert to_matrix(r.x, {"L": [0, 1]}, reduced=red, kind="float").dtype == np.float64
    assert to_matrix(r.y, {"L": [0, 1]}, reduced=red, kind="float").dtype == np.complex128
    assert to_matrix(r.x, {"L": [0, 1]}, reduced=red, kind="sparse").dtype == np.float64


def test_errors():
    T = SphericalTensor("T", 1, "L")
    with pytest.raises(OperatorError, match="label='L'"):
        to_matrix(T[0], {"J": [0, 1]})                           # tensor label missing
    with pytest.raises(OperatorError, match="label='L'"):
        to_matrix(VectorOperator("r", "L").x * J.z, {"J": 1})
    with pytest.raises(QuantumNumberError, match="integer l"):
        to_matrix(racah_tensor(1)[0], {"L": ["1/2", "3/2"]})     # C^k on half-integer l
    with pytest.raises(QuantumNumberError, match="integer l"):
        to_matrix(racah_tensor(2)[0], {"L": "1/2"})
    with pytest.raises(QuantumNumberError, match="repeat"):
        to_matrix(T[0], {"L": [1, 1]})
    with pytest.raises(QuantumNumberError, match="at least one"):
        to_matrix(T[0], {"L": []})
    with pytest.raises(QuantumNumberError):
        to_matrix(T[0], {"L": [0, "1/3"]})
    with pytest.raises(OperatorError, match="reduced key"):
        to_matrix(T[0], {"L": [0, 1]}, reduced={"T": {(0, 1): 1}})
    with pytest.raises(OperatorError, match="pair"):
        to_matrix(T[0], {"L": [0, 1]}, reduced={T: {0: 1}})
    with pytest.raises(OperatorError, match="must be a dict"):
        to_matrix(T[0], {"L": [0, 1]}, reduced={T: 3})
    with pytest.raises(NotNumericError):
        to_matrix(T[0], {"L": [0, 1]}, reduced={T: {(0, 1): "1/2"}})
    with pytest.raises(OperatorError, match="nonnegative integer"):
        to_matrix(T[0] ** -1, {"L": [0, 1]})
    from sympy import Symbol
    with pytest.raises(OperatorError, match="not a known operator"):
        to_matrix(T[0] * Symbol("X", commutative=False), {"L": [0, 1]})
    (B,) = boson_modes("B")
    with pytest.raises(OperatorError, match="mode='B'.*occupation cutoff"):
        to_matrix(T[0] * B.create, {"L": [0, 1]})
    with pytest.raises(OperatorError, match="tensor under label='B'"):
        to_matrix(SphericalTensor("W", 1, "B")[0] * B.create, {"B": 1})


def test_tensor_times_boson_is_the_kronecker_product():
    # common practice, no source: operators of different spaces act on different Kronecker factors
    # (angular momenta outermost, the mode last); a^dagger on n = 0, 1 is [[0, 0], [1, 0]] (cut at n = 1)
    (B,) = boson_modes("B")
    T = SphericalTensor("T", 1, "L")
    space = {"L": [0, 1], "B": 1}
    expected = kronecker_product(to_matrix(T[0], {"L": [0, 1]}), Matrix([[0, 0], [1, 0]]))
    assert to_matrix(T[0] * B.create, space) == expected != zeros(8, 8)


def test_symbolic_reduced_stay_visible():
    # abstract reduced elements are kept as symbols <j'||T^(k)||j> (Edmonds 5.4.1 factor in front)
    T = SphericalTensor("T", 1, "J")
    m = to_matrix(T[0], {"J": [0, 1]})
    assert m[2, 0] == T.reduced(1, 0) * oracle_factor(1, 0, 1, 0, 0, 0)
    assert m[0, 2] == T.reduced(0, 1) * oracle_factor(0, 0, 1, 0, 1, 0)


def oracle_factor(jp, mp, k, q, j, m):
    """(-1)^(j'-m') (j' k j; -m' q m) from the oracle, as an exact square root (it is +-1/sqrt(3) here)."""
    value = (-1) ** int(round(jp - mp)) * oracle.threej(jp, k, j, -mp, q, m)
    assert abs(abs(value) - 1 / np.sqrt(3)) < 1e-12
    return int(np.sign(value)) * sqrt(3) / 3


def test_verify_identity_on_direct_sums():
    T = SphericalTensor("T", 2, "J")
    space = [{"J": [0, 1, 2]}]
    # [J-, T_0] = sqrt(6) T_-1 (k = 2: sqrt(k(k+1) - 0)), Sakurai section 3.10 (from memory)
    assert verify_identity(J.minus * T[0] - T[0] * J.minus, sqrt(6) * T[-1], space).holds
    bad = verify_identity(J.minus * T[0] - T[0] * J.minus, sqrt(5) * T[-1], space)
    assert not bad.holds
    mm = bad.first_mismatch
    assert mm["j"] == {"J": (0, 1, 2)}
    assert len(mm["m_row"]) == 1 and len(mm["m_row"][0]) == 2          # a (j, m) pair
    red = {T: {(a, b): 1 for a in (0, 1, 2) for b in (0, 1, 2)}}
    assert verify_identity(J.z * T[2] - T[2] * J.z, 2 * T[2], space, reduced=red).holds


_DETERMINISM = """
from amalgebra.algebra import AngularMomentum
from amalgebra.matrices.explicit import to_matrix
from amalgebra.tensors import SphericalTensor, VectorOperator
J = AngularMomentum("J")
T, U, V = SphericalTensor("T", 1, "J"), SphericalTensor("U", 2, "J"), VectorOperator("V", "J")
print(to_matrix(T[1] * U[-1] + V.y * J.plus - U[0] * V.x, {"J": ["1/2", "3/2"]}))
"""


def test_deterministic_under_hash_seed():
    outputs = set()
    for seed in ("0", "4242"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        run = subprocess.run([sys.executable, "-c", _DETERMINISM], env=env, capture_output=True, text=True,
                             check=True)
        outputs.add(run.stdout)
    assert len(outputs) == 1 and "<3/2||U^(2)||1/2>" in outputs.pop()


def test_canonical_form_has_the_same_matrix():
    # cross-check of two independent routes: the mixed normal form (amalgebra.tensors.mixedform,
    # through canonical) and the product of Wigner-Eckart matrices; symbolic reduced elements
    from amalgebra.algebra import canonical
    T, Q, r = SphericalTensor("T", 1, "L"), SphericalTensor("Q", 2, "L"), VectorOperator("r", "L")
    space = {"L": [0, 1, 2], "S": "1/2"}
    for expr in (T[0] * L.plus, r.z * L.plus * L.z, T[-1] * L.squared * L.minus + r.x * S_.plus * L.z,
                 Q[1] * L.minus ** 2 * T[0], r.y * L.x * r.x):
        direct = to_matrix(expr, space)
        assert (to_matrix(canonical(expr), space) - direct).applyfunc(expand) == zeros(*direct.shape)
        assert direct != zeros(*direct.shape)


_T1 = SphericalTensor("T", 1, "L")
_R = VectorOperator("r", "L")
_RED_T = {(0, 1): Rational(2), (1, 0): Rational(-1, 2), (1, 1): Rational(3, 4), (1, 2): Rational(5, 3),
          (2, 1): Rational(-2), (2, 2): Rational(1, 5)}
_RED_R = {(0, 1): Rational(1), (1, 0): Rational(-1), (1, 1): Rational(1, 2), (2, 1): Rational(3, 2),
          (1, 2): Rational(-3, 2), (2, 2): Rational(-1, 3)}


def _oracle_atoms():
    """Independent numpy matrices of the atom pool on L = 0+1+2 (x) S = 1/2, kron order (L, S)."""
    fl = lambda red: {(float(a), float(b)): float(v) for (a, b), v in red.items()}  # noqa: E731
    t = oracle.tensor_on_sum([0.0, 1.0, 2.0], 1.0, fl(_RED_T))
    v = oracle.tensor_on_sum([0.0, 1.0, 2.0], 1.0, fl(_RED_R))
    lz, lp, lm = _spin_blocks([0, 1, 2])
    sz, _, _ = oracle.spin(0.5)
    e2, e9 = np.eye(2), np.eye(9)
    on_l = lambda m: np.kron(m, e2)  # noqa: E731
    return {
        L.plus: on_l(lp), L.minus: on_l(lm), L.z: on_l(lz), L.x: on_l((lp + lm) / 2),
        _T1[1]: on_l(t[1.0]), _T1[0]: on_l(t[0.0]), _T1[-1]: on_l(t[-1.0]),
        # Vx = (V_{-1} - V_{+1})/sqrt2, Vy = i(V_{+1} + V_{-1})/sqrt2 (design.md, inverted by hand)
        _R.x: on_l((v[-1.0] - v[1.0]) / np.sqrt(2)), _R.y: on_l(1j * (v[1.0] + v[-1.0]) / np.sqrt(2)),
        _R.z: on_l(v[0.0]), S_.z: np.kron(e9, sz),
    }


_ATOMS = _oracle_atoms()
_POOL = list(_ATOMS)


@settings(deadline=None)
@given(st.lists(st.tuples(st.integers(-3, 3), st.lists(st.integers(0, len(_POOL) - 1), min_size=1, max_size=4)),
                min_size=1, max_size=4))
def test_random_words_match_numpy_products(terms):
    # independent route: oracle matrices of each atom multiplied by numpy (tensor_oracle, numpy.kron)
    parts = []
    want = np.zeros((18, 18), complex)
    for coefficient, word in terms:
        product = np.eye(18, dtype=complex)
        for index in word:
            product = product @ _ATOMS[_POOL[index]]
        want = want + coefficient * product
        parts.append(coefficient * Mul(*[_POOL[index] for index in word]))
    expr = Add(*parts)
    space = {"L": [0, 1, 2], "S": "1/2"}
    red = {_T1: _RED_T, _R: _RED_R}
    dense = to_matrix(expr, space, reduced=red, kind="float")
    assert np.allclose(dense, want, atol=1e-10)
    assert np.allclose(to_matrix(expr, space, reduced=red, kind="sparse").toarray(), want, atol=1e-10)
    assert np.allclose(_floats(to_matrix(expr, space, reduced=red)), want, atol=1e-10)


def test_hermitian_families_give_hermitian_matrices():
    # (T_q)^dagger = (-1)^q T_-q (design.md, Hermitian family) holds for the matrices when
    # <j'||T||j>* = (-1)^(j'-j) <j||T||j'> (Edmonds 1957 ch. 5, from memory); _RED_R obeys it, and
    # so does C^1 (<l+1||C^1||l> = sqrt(l+1) = -<l||C^1||l+1>, checked above)
    space = {"L": [0, 1, 2]}
    for component in _R.vector:
        m = to_matrix(component, space, reduced={_R: _RED_R})
        assert m == m.H != zeros(9)
    C = racah_tensor(1)
    for q in (1, 0, -1):
        assert to_matrix(C[q], space).H == S.NegativeOne ** q * to_matrix(C[-q], space) != zeros(9)


def test_cg_convention():
    # <j'||T||j>_edmonds = sqrt(2j'+1) <j'||T||j>_cg (design.md; amalgebra.tensors.wigner_eckart docs, Edmonds 1957
    # eq. 5.4.1 vs the Clebsch-Gordan form): CG-form values give the oracle's Edmonds matrices
    jlist, k = ["1/2", "3/2"], 1
    T = SphericalTensor("T", k, "J")
    edmonds, floats = _random_reduced(np.random.default_rng(3), jlist, Rational(k))
    cg_form = {pair: value / sqrt(2 * Rational(pair[0]) + 1) for pair, value in edmonds.items()}
    ref = oracle.tensor_on_sum([0.5, 1.5], 1.0, floats)
    for component in T.components:
        q = float(component.q)
        for kind in ("float", "exact"):
            got = to_matrix(component, {"J": jlist}, reduced={T: cg_form}, convention="cg", kind=kind)
            assert np.allclose(got if kind == "float" else _floats(got), ref[q], atol=1e-12)
    symbolic = to_matrix(T[0], {"J": jlist}, convention="cg")
    assert symbolic[0, 0] == sqrt(3) / 3 * T.reduced("1/2", "1/2", "cg")  # <1/2 1/2 1 0|1/2 1/2>, oracle below
    assert abs(oracle.cg(0.5, 0.5, 1, 0, 0.5, 0.5) - float(sqrt(3) / 3)) < 1e-12
    from amalgebra.errors import ConventionError
    with pytest.raises(ConventionError):
        to_matrix(T[0], {"J": jlist}, convention="racah")
