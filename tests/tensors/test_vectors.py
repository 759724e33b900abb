"""Vector operators: commutation rules against explicit matrices, spherical components, errors."""

import pickle

import pytest
from sympy import I, Rational, adjoint, expand, sqrt, zeros

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import OperatorError, TensorOperatorError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.tensors.products import spherical_components
from amalgebra.tensors.spherical import SphericalTensor, tensor_matrix
from amalgebra.tensors.vectors import VectorComponent, VectorOperator, vector_commutator

J = AngularMomentum("J")


def test_args_pickle_printing():
    V = VectorOperator("d", "J")
    assert V.func(*V.args) == V and pickle.loads(pickle.dumps(V)) == V
    assert V.x.func(*V.x.args) == V.x and pickle.loads(pickle.dumps(V.x)) == V.x
    assert str(V.x) == "d[J].x" and str(V) == "VectorOperator('d', 'J')"
    assert adjoint(V.y) == V.y
    W = VectorOperator("a", "J", hermitian=False)
    assert adjoint(W.x) != W.x
    with pytest.raises(OperatorError):
        VectorComponent(V, "w")
    with pytest.raises(OperatorError):
        VectorOperator("d", "J", hermitian="maybe")


def _cartesian_matrices(js, red):
    """Cartesian matrices of a rank-1 tensor with reduced elements red (Edmonds 5.4.1 via tensor_matrix)."""
    T = SphericalTensor("V", 1, "J")
    sph = {q: tensor_matrix(T, q, js, reduced=red) for q in (1, 0, -1)}
    return {"x": (sph[-1] - sph[1]) / sqrt(2), "y": I * (sph[-1] + sph[1]) / sqrt(2), "z": sph[0]}


def _direct_sum(js, comp):
    mats = [to_matrix(J.component(comp), {"J": j}) for j in js]
    n = sum(m.shape[0] for m in mats)
    big, pos = zeros(n, n), 0
    for m in mats:
        big[pos:pos + m.shape[0], pos:pos + m.shape[0]] = m
        pos += m.shape[0]
    return big


@pytest.mark.parametrize("js", [[1], [Rational(1, 2), Rational(3, 2)], [0, 1, 2]])
def test_commutation_rules_against_explicit_matrices(js):
    # [J_a, V_b] = i eps_abc V_c (Sakurai, Modern Quantum Mechanics, eq. 3.10.?; from memory)
    red = {(a, b): Rational(2 + n, 3) for n, (a, b) in enumerate((a, b) for a in js for b in js)}
    Vm = _cartesian_matrices(js, red)
    V = VectorOperator("V", "J")
    table = {V.x: Vm["x"], V.y: Vm["y"], V.z: Vm["z"]}
    gens = {"z": _direct_sum(js, "z"), "plus": _direct_sum(js, "plus"), "minus": _direct_sum(js, "minus")}
    gens["x"] = (gens["plus"] + gens["minus"]) / 2
    gens["y"] = (gens["plus"] - gens["minus"]) / (2 * I)
    for comp, G in gens.items():
        for b in ("x", "y", "z"):
            rule = expand(vector_commutator(J.component(comp), V.component(b)))
            value = zeros(*G.shape)
            for atom in (V.x, V.y, V.z):
                value += rule.coeff(atom) * table[atom]
            assert (G * Vm[b] - Vm[b] * G - value).expand() == zeros(*G.shape)
            assert rule != 0 or comp == b


def test_spherical_components_obey_ladder_rule():
    # [J+-, V_q] = sqrt(2 - q(q+-1)) V_{q+-1}, [Jz, V_q] = q V_q (Racah 1942)
    V = VectorOperator("V", "J")
    sph = V.spherical
    assert expand(vector_commutator(J.plus, sph[0]) - sqrt(2) * sph[1]) == 0
    assert expand(vector_commutator(J.minus, sph[0]) - sqrt(2) * sph[-1]) == 0
    assert expand(vector_commutator(J.plus, sph[1])) == 0
    assert expand(vector_commutator(J.z, sph[-1]) + sph[-1]) == 0
    assert spherical_components(V).components == (sph[1], sph[0], sph[-1])


def test_casimir_commutator_and_errors():
    V = VectorOperator("V", "J")
    rule = vector_commutator(J.squared, V.z)
    # [J^2, Vz] = -i(Jx Vy + Vy Jx) + i(Jy Vx + Vx Jy) (from [J_a, V_b] = i eps_abc V_c)
    want = -I * (J.x * V.y + V.y * J.x) + I * (J.y * V.x + V.x * J.y)
    assert expand(rule - want) == 0
    L = AngularMomentum("L")
    with pytest.raises(TensorOperatorError, match="declared a vector under 'J'"):
        vector_commutator(L.z, V.x)
    with pytest.raises(OperatorError):
        vector_commutator(V.x, V.y)
    with pytest.raises(OperatorError):
        vector_commutator(J.z, V.x * V.y)
