"""Type discipline at the boundary (issue 17, item 4): what ``+`` and ``*`` refuse, nan/inf angles,
and labels that are not identifiers.

The rules are the library's own (README, Safety and conventions): an operator and a state cannot be
added, a ket and a bra cannot be added, states of different spaces (label sets) cannot be added, and a
bra of one space times a ket of another is not an inner product.  Common practice, no source.
"""

import math

import pytest
from sympy import Symbol, adjoint, cos, nan, oo, simplify, sqrt, zoo

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import AngleError, OperatorError, StateError
from amalgebra.states import apply, bra, coupled_ket, inner, ket, product_ket

J, L, S = AngularMomentum("J"), AngularMomentum("L"), AngularMomentum("S")
x = Symbol("x")


def _boson_pieces():
    from amalgebra.bosons import BosonMode, fock_ket

    a = BosonMode("a")
    return a, fock_ket(1, modes=("a",))


def _tensor_component():
    from amalgebra.tensors import SphericalTensor

    return SphericalTensor("T", 1, "J")[0]


SUMS_OF_OPERATOR_AND_STATE = [
    lambda: J.z + ket(1, 0),
    lambda: ket(1, 0) + J.z,
    lambda: ket(1, 0) - J.z,
    lambda: J.z - ket(1, 0),
    lambda: 2 * J.z + ket(1, 0),
    lambda: ket(1, 0) + J.plus * J.minus,
    lambda: ket(1, 0) + (J.z + 1),
    lambda: J.z**2 + ket(1, 0),
    lambda: bra(1, 0) + J.z,
    lambda: product_ket(ket(1, 0, "L"), ket(0, 0, "S")) + L.z,
    lambda: coupled_ket(1, 1, 2, 0, ("L", "S")) + S.z,
    lambda: _tensor_component() + ket(1, 0),
    lambda: _boson_pieces()[1] + _boson_pieces()[0].create,
    lambda: _boson_pieces()[0].number + _boson_pieces()[1],
]


@pytest.mark.parametrize("build", SUMS_OF_OPERATOR_AND_STATE)
def test_an_operator_and_a_state_cannot_be_added(build):
    with pytest.raises(OperatorError, match="must not be an operator") as info:
        build()
    assert isinstance(info.value, TypeError)


MISMATCHED = [
    (lambda: ket(1, 0) + bra(1, 0),                          "a ket and a bra cannot be added"),
    (lambda: bra(1, 0) - ket(1, 1),                          "a ket and a bra cannot be added"),
    (lambda: ket(1, 0) + ket(1, 0, "L"),                     "labels"),
    (lambda: ket(1, 0, "L") + 2 * product_ket(ket(1, 0, "L"), ket(0, 0, "S")), "labels"),
    (lambda: bra(1, 0, "J") * ket(1, 0, "L"),                "not an inner product"),
    (lambda: bra(1, 0, "J") * J.z * ket(1, 0, "L"),          "not an inner product"),
    (lambda: bra(1, 0, "J") * (J.z * ket(1, 0, "L")),        "not an inner product"),
    (lambda: adjoint(product_ket(ket(1, 0, "J"), ket(0, 0, "S"))) * ket(1, 0, "J"), "not an inner product"),
    (lambda: (x * bra(1, 0, "J")) * ket(1, 0, "L"),          "not an inner product"),
]


@pytest.mark.parametrize(("build", "message"), MISMATCHED)
def test_states_of_other_spaces_are_refused(build, message):
    with pytest.raises(StateError, match=message):
        build()


def test_legitimate_combinations_still_build():
    psi = ket(1, 0) + 2 * ket(1, 1)
    assert psi - ket(1, 0) == 2 * ket(1, 1)
    assert sum([ket(1, 0), ket(1, 1)]) == ket(1, 0) + ket(1, 1)     # sum() starts from 0
    assert (ket(1, 0) + J.z * ket(1, 1)).has(J.z)                     # an unapplied action is a ket
    assert apply(J.z, ket(1, 1) + ket(1, 0)) == ket(1, 1)               # Jz|1 m> = m|1 m>
    prod_ = bra(1, 0) * ket(1, 0)
    assert prod_.args == (bra(1, 0), ket(1, 0))
    sandwich = bra(1, 1) * S.z * ket(1, 1)                            # other labels in between
    assert sandwich.args == (bra(1, 1), S.z, ket(1, 1))
    outer = ket(1, 0, "L") * bra(1, 0, "J")                           # an operator from J to L
    assert outer.args == (ket(1, 0, "L"), bra(1, 0, "J"))
    from amalgebra.coupling.trees import coupling_tree
    from amalgebra.states.tree_kets import tree_ket

    # a tree ket names its intermediate momenta too (L here); its space is that of its leaves
    tree = tree_ket(coupling_tree("(l1 l2) L", {"l1": 1, "l2": 1}, L=0), 0)
    leaves = product_ket(ket(1, 0, "l1"), ket(1, 0, "l2"))
    assert (tree + leaves).has(tree) and (tree.dual() * leaves).args == (tree.dual(), leaves)
    with pytest.raises(StateError, match="labels"):
        tree + ket(1, 0, "l1")
    ls = coupled_ket(1, 1, 2, 0, ("L", "S"))
    assert (ls + product_ket(ket(1, 0, "L"), ket(1, 0, "S"))).has(ls)  # same space, two bases


def test_inner_of_different_labels_is_refused_too():
    # The function form agrees with the product form.
    with pytest.raises(StateError, match="same labels"):
        inner(bra(1, 0, "J"), ket(1, 0, "L"))
    # and the same labels give the orthonormality of kets: <1 0|1 0> = 1, <1 0|1 1> = 0
    # (kets are orthonormal, README conventions: common practice, no source).
    assert inner(bra(1, 0, "J"), ket(1, 0, "J")) == 1
    assert inner(bra(1, 0, "J"), ket(1, 1, "J")) == 0


def test_matrices_keep_their_own_arithmetic():
    # States sit below SymPy matrices in operation priority: a Matrix times a ket is the Matrix's.
    from sympy import Matrix

    M = Matrix([[1, 0], [0, 2]])
    assert (M * ket(1, 0))[1, 1] == 2 * ket(1, 0)


# ----------------------------------------------------------------------------- angles

NOT_FINITE = [nan, oo, -oo, zoo, float("nan"), float("inf"), -math.inf, x + oo]


@pytest.mark.parametrize("angle", NOT_FINITE)
def test_rotations_refuse_non_finite_angles(angle):
    from amalgebra.rotations.wigner import RotationElement, small_d, small_d_matrix, wigner_D, wigner_D_matrix

    for call in (lambda: small_d(1, 0, 0, angle), lambda: small_d_matrix(1, angle),
                 lambda: wigner_D(1, 0, 0, angle, 0, 0), lambda: wigner_D(1, 0, 0, 0, 0, angle),
                 lambda: wigner_D_matrix("1/2", 0, angle, 0), lambda: RotationElement(1, 0, 0, 0, angle, 0)):
        with pytest.raises(AngleError, match="must be finite") as info:
            call()
        assert isinstance(info.value, ValueError)


def test_numpy_nan_is_refused():
    numpy = pytest.importorskip("numpy")
    from amalgebra.rotations.wigner import small_d

    with pytest.raises(AngleError):
        small_d(1, 0, 0, numpy.float64("nan"))
    with pytest.raises(AngleError):
        small_d(1, 0, 0, numpy.inf)


def test_other_angle_consumers_refuse_nan():
    from amalgebra.rotations.harmonics import spherical_harmonic
    from amalgebra.rotations.actions import rotate_ket

    with pytest.raises(AngleError):
        spherical_harmonic(1, 0, nan, 0)
    with pytest.raises(AngleError):
        spherical_harmonic(1, 0, 0, float("inf"))
    with pytest.raises(AngleError):
        rotate_ket(ket(1, 0), 0, nan, 0)


def test_finite_angles_are_unchanged():
    from amalgebra.rotations.wigner import small_d

    # d^j(0) is the identity; d^1_00(beta) = cos(beta) (Edmonds 1957, eq. 4.1.15; PDG d-function table).
    assert small_d(1, 0, 0, 0) == 1 and small_d(1, 1, 0, 0.0) == 0
    b = Symbol("beta", real=True)
    assert simplify(small_d(1, 0, 0, b) - cos(b)) == 0
    # d^1_11(beta) = (1 + cos beta)/2 (same table), at a finite irrational angle
    assert simplify(small_d(1, 1, 1, sqrt(2)) - (1 + cos(sqrt(2))) / 2) == 0


# ----------------------------------------------------------------------------- labels

BAD_LABELS = ["__class__", "__init__", "__dict__", "_x", "1J", "J x", "Jé", "", "J.z"]


@pytest.mark.parametrize("label", BAD_LABELS)
def test_labels_are_identifiers_that_are_not_dunder_names(label):
    from amalgebra.bosons import BosonMode
    from amalgebra.tensors import SphericalTensor, VectorOperator

    with pytest.raises(OperatorError):
        AngularMomentum(label)
    with pytest.raises(OperatorError):
        BosonMode(label)
    with pytest.raises(StateError):
        ket(1, 0, label)
    with pytest.raises(StateError):
        coupled_ket(1, 1, 2, 0, (label, "S"))
    with pytest.raises((OperatorError, StateError, ValueError)):
        SphericalTensor("T", 1, label)
    with pytest.raises((OperatorError, StateError, ValueError)):
        VectorOperator(label, "L")


def test_dunder_labels_are_refused_in_text_too():
    from amalgebra.errors import ParseError
    from amalgebra.parsing import parse

    with pytest.raises(ParseError, match="must not begin with '__'"):
        parse("Jz(__class__)")
