"""Tensor, scalar and vector products; tensors built from one angular momentum."""

import pickle

import pytest
from sympy import I, Rational, S, expand, sqrt, symbols

from amalgebra.algebra import AngularMomentum, canonical, dot
from amalgebra.errors import OperatorError, QuantumNumberError, TensorOperatorError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.tensors.wigner_eckart import reduced_from_table
from amalgebra.tensors.coupled_schemes import angular_momentum_reduced, reduced_product_same_space
from amalgebra.tensors.products import (TensorComponents, angular_momentum_tensor, cartesian_to_spherical,
                                        cross_product, quadrupole_tensor, scalar_product,
                                        spherical_components, spherical_to_cartesian, stretched_tensor,
                                        tensor_product)
from amalgebra.tensors.spherical import SphericalTensor
from amalgebra.tensors.vectors import VectorOperator

J = AngularMomentum("J")


def _ms(j):
    return [j - i for i in range(int(2 * j) + 1)]


def _table(components, j):
    """{(m', q, m): <j m'|X_q|j m>} from explicit exact matrices (amalgebra.matrices.explicit)."""
    mats = {q: to_matrix(c, {"J": j}) if c != 0 else None for q, c in components.as_dict().items()}
    table = {}
    for r, mp in enumerate(_ms(j)):
        for c, m in enumerate(_ms(j)):
            q = mp - m
            if q in mats and mats[q] is not None:
                table[(mp, q, m)] = mats[q][r, c]
    return table


def test_components_container():
    a, b, c = symbols("a b c")
    v = TensorComponents(1, (a, b, c))
    assert v.func(*v.args) == v and pickle.loads(pickle.dumps(v)) == v
    assert v.as_dict() == {1: a, 0: b, -1: c}
    with pytest.raises(QuantumNumberError):
        TensorComponents(1, (a, b))
    with pytest.raises(QuantumNumberError):
        v[2]
    with pytest.raises(OperatorError):
        spherical_components("J")


def test_spherical_convention_of_design_md():
    # design.md: V_{+1} = -(Vx + i Vy)/sqrt(2), V_0 = Vz, V_{-1} = (Vx - i Vy)/sqrt(2)
    x, y, z = symbols("x y z")
    assert cartesian_to_spherical(x, y, z) == (-(x + I * y) / sqrt(2), z, (x - I * y) / sqrt(2))
    assert spherical_to_cartesian(TensorComponents(1, cartesian_to_spherical(x, y, z))) == (x, y, z)
    assert angular_momentum_tensor(J).components == (-J.plus / sqrt(2), J.z, J.minus / sqrt(2))


def test_scalar_product_conventions():
    # A.B = sum_q (-1)^q A_q B_-q = (-1)^k sqrt(2k+1) [A x B]^0_0 (Edmonds 1957 eq. 5.1.?; from memory)
    for k in (1, 2, 3):
        A, B = SphericalTensor("A", k, "L"), SphericalTensor("B", k, "S")
        lhs = scalar_product(A, B)
        rhs = (-1) ** k * sqrt(2 * k + 1) * tensor_product(A, B, 0)[0]
        assert expand(lhs - rhs) == 0 != lhs
    # for vectors it is the Cartesian dot product (common practice)
    L, Sop = AngularMomentum("L"), AngularMomentum("S")
    assert canonical(scalar_product(L, Sop) - dot(L, Sop)) == 0
    r = VectorOperator("r", "L")
    assert expand(scalar_product(r, r) - (r.x ** 2 + r.y ** 2 + r.z ** 2)) == 0
    with pytest.raises(QuantumNumberError):
        scalar_product(J, quadrupole_tensor(J))


def test_cross_product_is_cartesian():
    # (A x B)_x = Ay Bz - Az By, cyclic, factor order kept (common practice)
    A, B = VectorOperator("A", "L"), VectorOperator("B", "L")
    got = spherical_to_cartesian(cross_product(A, B))
    want = (A.y * B.z - A.z * B.y, A.z * B.x - A.x * B.z, A.x * B.y - A.y * B.x)
    for g, w in zip(got, want):
        assert expand(g - w) == 0
    # J x J = i J (Sakurai eq. 3.1.?, from [Jx, Jy] = i Jz)
    for g, w in zip(spherical_to_cartesian(cross_product(J, J)), J.vector):
        assert canonical(g - I * w) == 0
    with pytest.raises(QuantumNumberError):
        cross_product(J, quadrupole_tensor(J))


def test_tensor_product_triangle_and_order():
    A, B = SphericalTensor("A", 1, "J"), SphericalTensor("B", 1, "J")
    with pytest.raises(QuantumNumberError, match="triangle"):
        tensor_product(A, B, 3)
    top = tensor_product(A, B, 2)[2]
    assert top == A[1] * B[1] and top != B[1] * A[1]


def test_quadrupole_tensor_components():
    # [J x J]^2_0 = (3 Jz^2 - J^2)/sqrt(6), [J x J]^2_{+-2} = J+-^2/2, [J x J]^2_{+-1} = -+(Jz J+- + J+- Jz)/2
    # (common practice; from the CG table of the Particle Data Group for 1 x 1)
    Q = quadrupole_tensor(J)
    assert canonical(Q[0] - (3 * J.z ** 2 - J.squared) / sqrt(6)) == 0
    assert canonical(Q[2] - J.plus ** 2 / 2) == 0
    assert canonical(Q[-2] - J.minus ** 2 / 2) == 0
    assert canonical(Q[1] + (J.z * J.plus + J.plus * J.z) / 2) == 0
    assert canonical(Q[-1] - (J.z * J.minus + J.minus * J.z) / 2) == 0


@pytest.mark.parametrize("j", [1, Rational(3, 2), 2, Rational(5, 2)])
def test_quadrupole_reduced_element(j):
    # the explicit matrices of [J x J]^2 form one irreducible tensor; its reduced element equals
    # Edmonds (1957) eq. 7.1.1 with <j||J||j> = sqrt(j(j+1)(2j+1)), and the closed form
    # <j||[J x J]^2||j> = sqrt((2j-1) 2j (2j+1) (2j+2) (2j+3)) / (2 sqrt(6)) (from memory)
    Q = quadrupole_tensor(J)
    explicit = reduced_from_table(_table(Q, j), j, 2, j)
    red = angular_momentum_reduced(j)
    assert explicit == reduced_product_same_space(j, j, 1, 1, 2, {j: (red, red)}) != 0
    closed = sqrt((2 * j - 1) * 2 * j * (2 * j + 1) * (2 * j + 2) * (2 * j + 3)) / (2 * sqrt(6))
    assert explicit == closed


@pytest.mark.parametrize("k, j", [(3, Rational(3, 2)), (3, 2), (4, 2)])
def test_stretched_tensor_is_irreducible(k, j):
    # reduced_from_table raises unless every component obeys the Wigner-Eckart pattern
    T = stretched_tensor(J, k)
    assert T.rank == k
    assert reduced_from_table(_table(T, j), j, k, j) != 0
    with pytest.raises(TensorOperatorError):
        reduced_from_table(_table(T, j), j, k - 1, j) if k - 1 >= 0 else None
    assert stretched_tensor(J, 0).components == (S.One,)
    with pytest.raises(QuantumNumberError):
        stretched_tensor(J, Rational(1, 2))
    with pytest.raises(OperatorError):
        angular_momentum_tensor("J")
