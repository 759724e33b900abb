"""Spherical tensor families: components, errors, commutation rules, C^k against Gaunt integrals."""

import pickle

import numpy as np
import pytest
import scipy.special
from sympy import Matrix, Rational, S, Symbol, adjoint, latex, sqrt, zeros

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import (ConventionError, OperatorError, ProjectionError, QuantumNumberError,
                              TensorOperatorError)
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
from amalgebra.tensors.spherical import (SphericalTensor, TensorComponent, racah_tensor,
                                         tensor_matrix, unit_tensor)

HALF = Rational(1, 2)


def test_family_args_pickle_printing():
    T = SphericalTensor("T", 2, "J")
    assert T.func(*T.args) == T and pickle.loads(pickle.dumps(T)) == T
    c = T[-1]
    assert c.func(*c.args) == c and pickle.loads(pickle.dumps(c)) == c
    assert str(c) == "T^(2)[J]_(-1)" and latex(c) == "{T^{(2)}_{-1}}"
    assert str(T) == "T^(2)[J]"
    assert T.components == (T[2], T[1], T[0], T[-1], T[-2])
    assert not c.is_commutative
    assert T[1] * T[0] != T[0] * T[1]
    half = SphericalTensor("a", HALF, "J", hermitian=False)
    assert half.components == (half[HALF], half[-HALF])
    assert adjoint(half[HALF]) != half[-HALF]       # no rule for a non-Hermitian family


def test_hermitian_adjoint_rule():
    # (T^k_q)^dagger = (-1)^q T^k_{-q} for a Hermitian tensor (Edmonds 1957, eq. 5.5.? ; from memory)
    T = SphericalTensor("T", 2, "J")
    assert adjoint(T[1]) == -T[-1]
    assert adjoint(T[2]) == T[-2]
    assert adjoint(T[1] * T[2]) == T[-2] * (-T[-1])


def test_bad_input():
    T = SphericalTensor("T", 2, "J")
    with pytest.raises(QuantumNumberError, match="q=3"):
        T[3]
    with pytest.raises(ProjectionError):
        T[HALF]
    with pytest.raises(QuantumNumberError):
        SphericalTensor("T", -1, "J")
    with pytest.raises(OperatorError, match="kind="):
        SphericalTensor("T", 1, "J", kind="fancy")
    with pytest.raises(QuantumNumberError):
        racah_tensor(HALF)
    with pytest.raises(OperatorError):
        SphericalTensor("T", 1, "not a label")
    L = AngularMomentum("L")
    with pytest.raises(TensorOperatorError, match="declared a tensor under 'J'"):
        T.commutator_with(L.z, 0)
    with pytest.raises(TensorOperatorError, match="must be exactly"):
        tensor_matrix(T, 0, {"L": [1]})
    with pytest.raises(ConventionError):
        T.reduced(1, 1, "bogus")
    with pytest.raises(QuantumNumberError):
        racah_tensor(1).reduced(HALF, HALF)


def _direct_sum_J(js):
    J = AngularMomentum("J")
    from amalgebra.matrices.explicit import to_matrix
    blocks = {c: [to_matrix(J.component(c), {"J": j}) for j in js] for c in ("z", "plus", "minus")}
    out = {}
    for c, mats in blocks.items():
        n = sum(m.shape[0] for m in mats)
        big = zeros(n, n)
        pos = 0
        for m in mats:
            big[pos:pos + m.shape[0], pos:pos + m.shape[0]] = m
            pos += m.shape[0]
        out[c] = big
    return out


@pytest.mark.parametrize("k, js", [(1, [HALF, Rational(3, 2)]), (2, [1, 2]), (Rational(3, 2), [HALF, 1, 2])])
def test_commutation_rules_against_explicit_matrices(k, js):
    # Racah (1942): [Jz, T_q] = q T_q, [J+-, T_q] = sqrt(k(k+1) - q(q+-1)) T_{q+-1}
    T = SphericalTensor("T", k, "J")
    red = {}
    for a in js:
        for b in js:
            red[(a, b)] = Rational(len(red) + 2, 3)    # arbitrary distinct values
    mats = {q: tensor_matrix(T, q, js, reduced=red) for q in [c.q for c in T.components]}
    Jm = _direct_sum_J(js)
    J = AngularMomentum("J")
    for q, M in mats.items():
        for comp, gen in (("z", J.z), ("plus", J.plus), ("minus", J.minus)):
            lhs = Jm[comp] * M - M * Jm[comp]
            rule = T.commutator_with(gen, q)
            rhs = zeros(*M.shape)
            for atom in rule.atoms(TensorComponent):
                rhs += rule.coeff(atom) * mats[atom.q]
            assert (lhs - rhs).expand() == zeros(*M.shape)
        assert any(x != 0 for x in M) or abs(q) > 0


def test_commutator_with_cartesian_and_casimir():
    T = SphericalTensor("T", 1, "J")
    J = AngularMomentum("J")
    assert T.commutator_with(J.x, 0) == (sqrt(2) * T[1] + sqrt(2) * T[-1]) / 2
    assert T.commutator_with(J.z, 1) == T[1]
    assert T.commutator_with(J.plus, 1) == 0
    js = [1]
    red = {(1, 1): S(1)}
    mats = {q: tensor_matrix(T, q, js, reduced=red) for q in (1, 0, -1)}
    Jm = _direct_sum_J(js)
    # J^2 on j = 1 is 2 * identity, so [J^2, T_q] vanishes inside a single multiplet
    jsq = Jm["z"] ** 2 + (Jm["plus"] * Jm["minus"] + Jm["minus"] * Jm["plus"]) / 2
    for q in (1, 0, -1):
        rule = T.commutator_with(J.squared, q)
        value = _evaluate(rule, {J.z: Jm["z"], J.plus: Jm["plus"], J.minus: Jm["minus"],
                                 T[1]: mats[1], T[0]: mats[0], T[-1]: mats[-1]})
        assert (value - (jsq * mats[q] - mats[q] * jsq)).expand() == zeros(3, 3)
    # on two multiplets [J^2, T] no longer vanishes: check the rule there too
    js = [1, 2]
    red = {(1, 1): S(1), (2, 1): S(3), (1, 2): S(-3), (2, 2): S(2)}
    mats = {q: tensor_matrix(T, q, js, reduced=red) for q in (1, 0, -1)}
    Jm = _direct_sum_J(js)
    jsq = Jm["z"] ** 2 + (Jm["plus"] * Jm["minus"] + Jm["minus"] * Jm["plus"]) / 2
    rule = T.commutator_with(J.squared, 1)
    value = _evaluate(rule, {J.z: Jm["z"], J.plus: Jm["plus"], J.minus: Jm["minus"],
                             T[1]: mats[1], T[0]: mats[0], T[-1]: mats[-1]})
    expected = jsq * mats[1] - mats[1] * jsq
    assert (value - expected).expand() == zeros(8, 8) and expected != zeros(8, 8)


def _evaluate(expr, table):
    """Matrix of a polynomial in noncommutative atoms, by substitution of matrices."""
    from sympy import Add, Mul, Pow, expand
    n = next(iter(table.values())).shape[0]
    total = zeros(n, n)
    for term in Add.make_args(expand(expr)):
        coeff, factors = term.args_cnc()
        mat = Mul(*coeff) * Matrix.eye(n)
        for f in factors:
            if isinstance(f, Pow):
                mat = mat * table[f.base] ** int(f.exp)
            else:
                mat = mat * table[f]
        total += mat
    return total


def _gaunt_numeric(lp, mp, k, q, l, m, n=40):
    # <l' m'|C^k_q|l m> = sqrt(4 pi/(2k+1)) int conj(Y_l'm') Y_kq Y_lm dOmega, by Gauss-Legendre x
    # uniform phi quadrature (exact for these polynomials); scipy.special.sph_harm_y (independent)
    x, w = np.polynomial.legendre.leggauss(n)
    theta = np.arccos(x)
    phi = np.linspace(0, 2 * np.pi, 2 * n, endpoint=False)
    th, ph = np.meshgrid(theta, phi, indexing="ij")
    f = (np.conj(scipy.special.sph_harm_y(lp, mp, th, ph)) * scipy.special.sph_harm_y(k, q, th, ph)
         * scipy.special.sph_harm_y(l, m, th, ph))
    integral = np.sum(w[:, None] * f) * (2 * np.pi / (2 * n))
    return np.sqrt(4 * np.pi / (2 * k + 1)) * integral


def test_scipy_harmonics_have_condon_shortley_phase():
    # Y_11 = -sqrt(3/(8 pi)) sin(theta) e^{i phi} (Condon-Shortley; DLMF 14.30.1 and Sakurai table)
    val = scipy.special.sph_harm_y(1, 1, 0.7, 0.3)
    assert val == pytest.approx(-np.sqrt(3 / (8 * np.pi)) * np.sin(0.7) * np.exp(0.3j))


@pytest.mark.parametrize("lp, k, l", [(1, 1, 0), (2, 2, 0), (2, 1, 1), (3, 2, 1), (2, 2, 2), (3, 3, 2), (1, 2, 1)])
def test_racah_tensor_against_gaunt_integrals(lp, k, l):
    # <l'||C^k||l> = (-1)^l' sqrt((2l+1)(2l'+1)) (l' k l; 0 0 0) (Edmonds 1957 eq. 5.4.5, from memory),
    # checked entry by entry against quadrature of spherical harmonics
    C = racah_tensor(k)
    for mp in range(-lp, lp + 1):
        for m in range(-l, l + 1):
            q = mp - m
            if abs(q) > k:
                continue
            exact = complex(C.matrix_element(lp, mp, q, l, m))
            assert exact == pytest.approx(_gaunt_numeric(lp, mp, k, q, l, m), abs=1e-12)
    assert C.reduced(lp, l, "cg") == C.reduced(lp, l) / sqrt(2 * lp + 1)


def test_racah_tensor_parity_zero():
    # (l' k l; 0 0 0) = 0 when l' + k + l is odd (DLMF 34.3.5)
    assert racah_tensor(1).reduced(1, 1) == 0
    assert racah_tensor(2).reduced(2, 1) == 0


def test_unit_tensor_and_abstract_reduced():
    u = unit_tensor(1)
    assert u.reduced(1, 1) == 1 and u.reduced(2, 1) == 0 and u.reduced(0, 0) == 0
    T = SphericalTensor("T", 1, "J")
    assert T.reduced(1, 1) == ReducedMatrixElement("T", 1, 1, 1)
    assert T.reduced(1, 1, "cg") == ReducedMatrixElement("T", 1, 1, 1, "cg")
    j = Symbol("j", nonnegative=True)
    assert T.reduced(j, j).free_symbols == {j}
    m = tensor_matrix(u, 0, [1])
    # <1 m|u_0|1 m> = (-1)^(1-m) (1 1 1; -m 0 m) = m/sqrt(6), from
    # (j 1 j; -m 0 m) = (-1)^(j-m) m / sqrt(j(j+1)(2j+1)) (Edmonds 1957, table 2)
    assert m == Matrix.diag(1, 0, -1) / sqrt(6)
