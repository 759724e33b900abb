"""State-level results across coupled kets come out in one normal form (issue 11: results that compose).

A value gathered over product-ket pairs used to keep powers of sums of radicals: the norm of a
normalised superposition of coupled kets printed as (-sqrt(6)/6 + sqrt(3)/3)**2 + (sqrt(6)/6 + sqrt(3)/3)**2,
and <a|L.S + T_1 S_-|a> as -2/3 - sqrt(2)*(-2*sqrt(6)/3 + sqrt(2)/2)/3.
"""

import numpy as np
from sympy import Rational, adjoint, sqrt

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.states import coupled_ket, expectation, inner, matrix_element
from amalgebra.tensors import SphericalTensor
from amalgebra.testing.reference import evaluate_on_space, space_states

h = Rational(1, 2)
L, S = AngularMomentum("L"), AngularMomentum("S")
T = SphericalTensor("T", 1, "L")


def red_t(jp, j):
    """An invented reduced-element table (any numbers do)."""
    return 1 + jp + 2 * j


def _printed_expanded(value):
    return value == value.expand() and str(value) == str(value.expand())


def test_norm_of_a_superposition_of_coupled_kets_is_one():
    a = coupled_ket(1, h, h, h, labels=("L", "S"))
    b = coupled_ket(1, h, 3 * h, h, labels=("L", "S"))
    psi = (a + b) / sqrt(2)
    assert str(inner(adjoint(psi), psi)) == "1"          # orthonormal coupled kets (common practice, no source)
    assert inner(adjoint(a), b) == 0


def test_matrix_element_between_coupled_kets_is_expanded_and_right():
    a = coupled_ket(1, h, h, h, labels=("L", "S"))
    op = dot(L, S) + T[1] * S.minus
    value = matrix_element(adjoint(a), op, a, reduced={T: red_t})
    assert _printed_expanded(value) and value.free_symbols == set()
    # |(1 1/2) 1/2, 1/2> = sqrt(2/3)|1 1>|1/2 -1/2> - sqrt(1/3)|1 0>|1/2 1/2> (PDG table of CG coefficients,
    # 1 x 1/2); the operator matrix from the numpy oracle on L = 0+1+2 (x) S = 1/2
    space = {"L": [0, 1, 2], "S": [h]}
    _, states = space_states(space)
    vec = np.zeros(len(states))
    vec[states.index(((1.0, 1.0), (0.5, -0.5)))] = np.sqrt(2 / 3)
    vec[states.index(((1.0, 0.0), (0.5, 0.5)))] = -np.sqrt(1 / 3)
    want = vec @ evaluate_on_space(op, space, {T: red_t}) @ vec
    assert abs(complex(value) - want) < 1e-12


def test_superposition_matrix_element_matches_expectation():
    a = coupled_ket(1, h, h, h, labels=("L", "S"))
    psi = (a + coupled_ket(1, h, 3 * h, h, labels=("L", "S"))) / sqrt(2)
    z = matrix_element(adjoint(psi), L.z, psi)
    assert _printed_expanded(z) and z == expectation(L.z, psi)
