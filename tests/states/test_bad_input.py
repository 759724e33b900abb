"""Bad input to the state-level entry points: a typed error that names the problem (issue 11, "Bad input").

The entry points are apply, matrix_element, expectation, inner, to_matrix (exact, float and sparse) and
hamiltonian_matrix.  Each case below gives the error class (amalgebra.errors) and a fragment of the message;
the routes share one space reader and one label rule, so the same mistake gets the same class everywhere.
"""

import pytest
from sympy import Rational, Symbol

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import (ConventionError, NotNumericError, OperatorError, QuantumNumberError,
                              StateError)
from amalgebra.matrices.explicit import to_matrix
from amalgebra.states import apply, bra, expectation, hamiltonian_matrix, inner, ket, matrix_element
from amalgebra.tensors import SphericalTensor

L, S = AngularMomentum("L"), AngularMomentum("S")
T = SphericalTensor("T", 1, "L")
a = Symbol("a")

CASES = [
    # expectation
    ("expectation: operator of another label", lambda: expectation(S.z, ket(1, 0, "L")), OperatorError,
     "label='S'"),
    ("expectation: not a state", lambda: expectation(L.z, 3), StateError, "linear combination"),
    ("expectation: the zero state", lambda: expectation(L.z, 0 * ket(1, 0, "L")), StateError, "nonzero"),
    ("expectation: tensor without its space", lambda: expectation(T[0], ket(1, 0, "S")), OperatorError,
     "label='L'"),
    # inner
    ("inner: different labels", lambda: inner(bra(1, 0, "L"), ket(1, 0, "S")), StateError, "same labels"),
    ("inner: an operator for a ket", lambda: inner(bra(1, 0, "L"), L.z), StateError, "linear combination"),
    # hamiltonian_matrix
    ("hamiltonian_matrix: label without a j", lambda: hamiltonian_matrix(S.z, {"L": 1}), OperatorError,
     "label='S'"),
    ("hamiltonian_matrix: j = 1/3", lambda: hamiltonian_matrix(L.z, {"L": Rational(1, 3)}), QuantumNumberError,
     "half-integer"),
    ("hamiltonian_matrix: tensor without its space", lambda: hamiltonian_matrix(T[0], {"S": 1}),
     OperatorError, "label='L'"),
    ("hamiltonian_matrix: text for an operator", lambda: hamiltonian_matrix("L.z", {"L": 1}), OperatorError,
     "SymPy expression"),
    # to_matrix, every kind
    ("to_matrix float: symbolic coefficient", lambda: to_matrix(a * L.z, {"L": 1}, kind="float"),
     NotNumericError, "coefficient=a"),
    ("to_matrix sparse: symbolic coefficient", lambda: to_matrix(a * L.z, {"L": 1}, kind="sparse"),
     NotNumericError, "coefficient=a"),
    ("to_matrix float: symbolic reduced element", lambda: to_matrix(T[0], {"L": [0, 1]}, kind="float"),
     NotNumericError, "reduced"),
    ("to_matrix: unknown kind", lambda: to_matrix(L.z, {"L": 1}, kind="dense"), ConventionError, "kind='dense'"),
    ("to_matrix float: label without a j", lambda: to_matrix(S.z, {"L": 1}, kind="float"), OperatorError,
     "label='S'"),
    ("to_matrix: unknown convention", lambda: to_matrix(T[0], {"L": [0, 1]}, convention="racah"),
     ConventionError, "convention='racah'"),
    # apply, matrix_element
    ("apply: unknown convention", lambda: apply(T[0], ket(1, 0, "L"), convention="x"), ConventionError,
     "convention='x'"),
    ("apply: a number for a state", lambda: apply(L.z, 5), StateError, "state=5"),
    ("matrix_element: reduced element neither table nor callable",
     lambda: matrix_element(bra(1, 0, "L"), T[0], ket(1, 0, "L"), reduced={T: 3}), OperatorError,
     "callable"),
    ("ket: |m| > j", lambda: ket(1, 2, "L"), QuantumNumberError, "m=2"),
]


@pytest.mark.parametrize("name, call, error, fragment", CASES, ids=[c[0] for c in CASES])
def test_bad_input_gives_a_typed_error(name, call, error, fragment):
    with pytest.raises(error) as info:
        call()
    assert fragment in str(info.value)
    # every typed error is also a ValueError or TypeError, so generic handlers keep working
    assert isinstance(info.value, (ValueError, TypeError))
