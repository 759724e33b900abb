"""Irreducible decomposition: sums reproduce the operator, parts have the stated rank and weight.

Rank and weight are checked on explicit float matrices (amalgebra.numeric.to_matrix, whose
matrices are independent of the decomposition code): for a part X of rank k and weight q,
sum_a [J_a, [J_a, X]] = k(k+1) X and [J_z, X] = q X (Racah 1942, definition of tensors).
"""

import numpy as np
import pytest
from hypothesis import given, settings
from sympy import I, Matrix, Rational, Symbol, expand, sqrt, symbols

from amalgebra.algebra import AngularMomentum, canonical, dot
from amalgebra.errors import OperatorError, TensorOperatorError
from amalgebra.numeric import to_matrix
from amalgebra.testing.strategies import operator_polynomials
from amalgebra.tensors.irreducible import decompose, recombine, rotation_commutator
from amalgebra.tensors.products import scalar_product, tensor_product
from amalgebra.tensors.spherical import SphericalTensor
from amalgebra.tensors.vectors import VectorOperator

J, S, Iop = AngularMomentum("J"), AngularMomentum("S"), AngularMomentum("I")


def _check_parts(parts, js, subs=None):
    """Casimir and weight of every part, on float matrices of the total angular momentum."""
    labels = sorted(js)
    total = {axis: sum(to_matrix(AngularMomentum(lab).component(axis), js, kind="float").astype(complex)
                       for lab in labels) for axis in ("x", "y", "z")}
    for k, comps in parts.items():
        assert sorted(comps) == [k - n for n in range(int(2 * k), -1, -1)]
        for q, X in comps.items():
            if X == 0:
                continue
            M = np.asarray(to_matrix(X, js, kind="float", subs=subs), dtype=complex)
            cas = sum(total[a] @ (total[a] @ M - M @ total[a]) - (total[a] @ M - M @ total[a]) @ total[a]
                      for a in "xyz")
            assert np.allclose(cas, float(k * (k + 1)) * M, atol=1e-9)
            assert np.allclose(total["z"] @ M - M @ total["z"], float(q) * M, atol=1e-9)


def test_jx_jy_symmetrised_is_pure_rank_two():
    # Jx Jy + Jy Jx = (J+^2 - J-^2)/(2i), the q = +-2 parts of a rank-2 tensor (common practice)
    parts = decompose(J.x * J.y + J.y * J.x)
    assert sorted(parts) == [2]
    assert parts[2][2] == canonical(J.plus ** 2 / (2 * I)) != 0
    assert parts[2][-2] == canonical(-J.minus ** 2 / (2 * I))
    assert parts[2][1] == parts[2][0] == parts[2][-1] == 0
    _check_parts(parts, {"J": 2})


def test_jx_jy_unsymmetrised_has_rank_one():
    # Jx Jy = (JxJy + JyJx)/2 + i Jz/2 ([Jx, Jy] = i Jz, Sakurai 3.1)
    parts = decompose(J.x * J.y)
    assert sorted(parts) == [1, 2]
    assert parts[1][0] == I * J.z / 2 and parts[1][1] == parts[1][-1] == 0
    assert canonical(recombine(parts)) == canonical(J.x * J.y)


def test_spin_hamiltonian_symmetric_D():
    # S.D.S with symmetric D: rank 0 = Tr(D)/3 S^2, no rank 1, rank 2 the traceless part
    # (Abragam and Bleaney 1970, ch. 3; common practice)
    d = symbols("dxx dxy dxz dyy dyz dzz")
    D = Matrix([[d[0], d[1], d[2]], [d[1], d[3], d[4]], [d[2], d[4], d[5]]])
    Sv = S.vector
    H = sum((Sv[a] * D[a, b] * Sv[b] for a in range(3) for b in range(3)), start=0 * S.x)
    parts = decompose(H)
    assert sorted(parts) == [0, 2]
    assert expand(parts[0][0] - (d[0] + d[3] + d[5]) / 3 * S.squared) == 0
    assert canonical(recombine(parts)) == canonical(H)
    values = dict(zip(d, [0.3, -1.1, 0.7, 2.0, 0.4, -0.5]))
    _check_parts(parts, {"S": Rational(3, 2)}, subs=values)


def test_quadrupole_coupling_I_Q_J():
    # I.Q.J with a general Q: rank 0 = Tr(Q)/3 I.J, rank 1 = antisymmetric part, rank 2 = rest
    # (common practice: Cartesian decomposition of a second-rank tensor)
    Q = Matrix(3, 3, lambda a, b: Symbol(f"Q{a}{b}"))
    Iv, Jv = Iop.vector, J.vector
    H = sum((Iv[a] * Q[a, b] * Jv[b] for a in range(3) for b in range(3)), start=0 * J.x)
    parts = decompose(H)
    assert sorted(parts) == [0, 1, 2]
    assert canonical(parts[0][0] - Q.trace() / 3 * dot(Iop, J)) == 0
    antisym = sum((Iv[a] * (Q[a, b] - Q[b, a]) / 2 * Jv[b] for a in range(3) for b in range(3)), start=0 * J.x)
    assert canonical(sum(parts[1].values()) - antisym) == 0
    assert canonical(recombine(parts)) == canonical(H)
    values = {Q[a, b]: 0.1 * (3 * a + b + 1) * (-1) ** b for a in range(3) for b in range(3)}
    _check_parts(parts, {"I": 1, "J": Rational(1, 2)}, subs=values)


def test_classical_vector_rotates_along():
    # S.g.B with B a classical vector rotated along: ranks 0, 1, 2; without it: rank 1 only
    g = Matrix(3, 3, lambda a, b: Symbol(f"g{a}{b}"))
    B = symbols("Bx By Bz")
    Sv = S.vector
    H = sum((Sv[a] * g[a, b] * B[b] for a in range(3) for b in range(3)), start=0 * S.x)
    parts = decompose(H, vectors=[B])
    assert sorted(parts) == [0, 1, 2]
    assert canonical(parts[0][0] - g.trace() / 3 * (Sv[0] * B[0] + Sv[1] * B[1] + Sv[2] * B[2])) == 0
    assert canonical(recombine(parts)) == canonical(H)
    only_spin = decompose(H)
    assert sorted(only_spin) == [1]
    assert canonical(recombine(only_spin)) == canonical(H)
    with pytest.raises(OperatorError):
        decompose(H, vectors=[(B[0], B[1])])


def test_labels_select_the_rotation():
    # I.J is a scalar under I + J but rank 1 under I alone
    parts_total = decompose(dot(Iop, J))
    assert sorted(parts_total) == [0]
    parts_I = decompose(dot(Iop, J), labels=("I",))
    assert sorted(parts_I) == [1]
    _check_parts(parts_total, {"I": 1, "J": 1})


def test_tensor_atoms_products_have_the_coupled_rank():
    T, U = SphericalTensor("T", 1, "L"), SphericalTensor("U", 2, "S")
    for k in (1, 2, 3):
        parts = decompose(tensor_product(T, U, k)[k - 1])
        assert sorted(parts) == [k]
        assert expand(parts[k][k - 1] - tensor_product(T, U, k)[k - 1]) == 0
    V = VectorOperator("r", "L")
    assert sorted(decompose(scalar_product(V, T))) == [0]
    # x y + y x is symmetric and traceless: rank 2 only (common practice)
    assert sorted(decompose(V.x * V.y + V.y * V.x)) == [2]
    assert sorted(decompose(V.x * V.x + V.y * V.y + V.z * V.z)) == [0]        # r.r is a scalar


@settings(max_examples=25, database=None, deadline=None)
@given(operator_polynomials(labels=("J",), max_terms=3, max_weight=3))
def test_random_polynomials(poly):
    parts = decompose(poly)
    assert canonical(recombine(parts)) == canonical(poly)
    _check_parts(parts, {"J": Rational(3, 2)})


@settings(max_examples=10, database=None, deadline=None)
@given(operator_polynomials(labels=("I", "S"), max_terms=2, max_weight=3))
def test_random_two_label_polynomials(poly):
    parts = decompose(poly)
    assert canonical(recombine(parts)) == canonical(poly)
    _check_parts(parts, {"I": 1, "S": Rational(1, 2)})


def test_rotation_commutator():
    T = SphericalTensor("T", 2, "J")
    for gen in (J.z, J.plus, J.minus, J.x, J.y):
        for q in (2, 0, -1):
            assert expand(rotation_commutator(gen, T[q]) - T.commutator_with(gen, q)) == 0
    # Leibniz rule on a product with an angular-momentum factor
    expr = T[1] * J.z
    got = rotation_commutator(J.plus, expr)
    # [J+, T_1 Jz] = [J+, T_1] Jz + T_1 [J+, Jz] = 2 T_2 Jz - T_1 J+  ([J+, Jz] = -J+, Sakurai 3.5)
    assert expand(got - (2 * T[2] * J.z - T[1] * J.plus)) == 0 != got
    # ... and on pure angular-momentum polynomials it agrees with the kernel's commutator
    X = J.x * J.z ** 2 + J.plus
    assert canonical(rotation_commutator(J.minus, X) - (J.minus * X - X * J.minus)) == 0
    with pytest.raises(TensorOperatorError):
        rotation_commutator(S.z, T[0], labels=("J",))
    with pytest.raises(OperatorError):
        rotation_commutator(J.squared, T[0])


def test_bad_factors():
    with pytest.raises(OperatorError):
        decompose(Symbol("x", commutative=False) * J.z)
    with pytest.raises(OperatorError):
        decompose(sqrt(J.z))
