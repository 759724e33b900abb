"""The one documented order of hamiltonian_matrix(..., basis="coupled") and its entries (issue 11, basis order).

README "Conventions": the labels are coupled in the order the dict gives them, ((j1 j2) J12 j3) F; for each
choice of one j per label (direct sums in the order given, the first label's j outermost) the intermediate
momenta and then F ascend, M descends within each F.  Entries are checked against the numpy oracle:
textbook matrices on the product space (amalgebra.testing.reference) between Clebsch-Gordan vectors from
Racah's 3j formula, <j1 m1 j2 m2|J M> = (-1)^(j1-j2+M) sqrt(2J+1) (j1 j2 J; m1 m2 -M) (DLMF 34.3.1, from memory).
"""

import itertools

import numpy as np
from sympy import Rational

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.states import hamiltonian_matrix, matrix_element
from amalgebra.tensors import SphericalTensor
from amalgebra.testing.reference import evaluate_on_space, space_states, threej_float

h = Rational(1, 2)
L, S, I = AngularMomentum("L"), AngularMomentum("S"), AngularMomentum("I")
T = SphericalTensor("T", 1, "L")


def red_t(jp, j):
    """An invented reduced-element table (any numbers do)."""
    return 1 + jp + 2 * j


def _cg(j1, m1, j2, m2, jj, mm):
    if abs(m1 + m2 - mm) > 1e-9 or not abs(j1 - j2) <= jj <= j1 + j2:
        return 0.0
    return (-1) ** int(round(j1 - j2 + mm)) * np.sqrt(2 * jj + 1) * threej_float(j1, j2, jj, m1, m2, -mm)


def _coupled_vector(state, labels, product_states):
    """The coupled ket as a vector on the product space, coupled left to right: ((j1 j2) J12 j3) F."""
    js = [float(j) for j in state.js]
    inter = [float(x) for x in state.intermediates]
    total, mm = float(state.J), float(state.M)
    vec = np.zeros(len(product_states))
    for index, product in enumerate(product_states):
        if [j for j, _ in product] != js:
            continue
        ms = [m for _, m in product]
        amp, jc, mc = 1.0, js[0], ms[0]
        chain = inter + [total]
        for step, (jn, mn) in enumerate(zip(js[1:], ms[1:])):
            target = chain[step]
            mt = mc + mn
            amp *= _cg(jc, mc, jn, mn, target, mt)
            jc, mc = target, mt
        if abs(mc - mm) < 1e-9:
            vec[index] = amp
    return vec


def _check_against_oracle(op, js, reduced=None):
    hm = hamiltonian_matrix(op, js, basis="coupled", reduced=reduced)
    labels = list(js)                     # the coupling order (dict order)
    space = {lab: js[lab] if isinstance(js[lab], list) else [js[lab]] for lab in labels}
    _, product_states = space_states(space)
    # space_states orders labels in the package's label order: put the tuples into the coupling order
    order = sorted(labels, key=lambda lab: sorted(labels).index(lab))
    if order != labels:
        perm = [order.index(lab) for lab in labels]
        product_states = [tuple(s[i] for i in perm) for s in product_states]
    ref = evaluate_on_space(op, space, {T: red_t} if reduced else None)
    vectors = np.array([_coupled_vector(k, labels, product_states) for k in hm.basis])
    assert np.allclose(vectors @ vectors.T, np.eye(len(vectors)), atol=1e-12)     # an orthonormal basis
    want = vectors @ ref @ vectors.T
    got = np.array(hm.matrix.evalf(), dtype=complex)
    assert np.allclose(got, want, atol=1e-10)
    return hm


def test_two_labels_order_and_entries():
    hm = _check_against_oracle(dot(L, S) + 3 * L.z - S.x, {"L": 1, "S": h})
    assert [str(k) for k in hm.basis] == [
        "|(1_L 1/2_S)1/2, 1/2>", "|(1_L 1/2_S)1/2, -1/2>", "|(1_L 1/2_S)3/2, 3/2>",
        "|(1_L 1/2_S)3/2, 1/2>", "|(1_L 1/2_S)3/2, -1/2>", "|(1_L 1/2_S)3/2, -3/2>"]


def test_three_labels_intermediates_then_total_ascending():
    hm = _check_against_oracle(dot(L, S) + 2 * dot(S, I) + I.z, {"L": 1, "S": h, "I": h})
    keys = [(k.intermediates, k.J, -k.M) for k in hm.basis]
    assert keys == sorted(keys) and len(keys) == 12


def test_dict_order_is_the_coupling_order_and_direct_sums_follow_the_order_given():
    hm = _check_against_oracle(dot(L, S) + L.z, {"S": h, "L": [2, 0]})
    assert [str(k) for k in hm.basis][0] == "|(1/2_S 2_L)3/2, 3/2>"
    assert [str(k) for k in hm.basis][-1] == "|(1/2_S 0_L)1/2, -1/2>"
    js_order = [tuple(k.js) for k in hm.basis]
    assert js_order == [(h, 2)] * 10 + [(h, 0)] * 2


def test_tensor_between_multiplets_in_the_coupled_basis():
    _check_against_oracle(T[0] + dot(L, S), {"L": [0, 1, 2], "S": h}, reduced={T: red_t})


def test_every_entry_is_the_state_level_matrix_element():
    # the same operator through matrix_element between the basis kets (one engine, one order)
    op = dot(L, S) + T[1] * S.minus
    hm = hamiltonian_matrix(op, {"L": [0, 1], "S": h}, basis="coupled", reduced={T: red_t})
    for r, c in itertools.product(range(len(hm.basis)), repeat=2):
        value = matrix_element(hm.basis[r].adjoint(), op, hm.basis[c], reduced={T: red_t})
        assert (value - hm.matrix[r, c]).expand() == 0, (r, c)
