"""Explicit matrices and identity verification (amalgebra.matrices.explicit)."""

import numpy as np
import pytest
import scipy.sparse
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import I, Matrix, Rational, sqrt, symbols

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import ConventionError, NotNumericError, OperatorError, QuantumNumberError
from amalgebra.matrices.explicit import IdentityCheck, assert_identity, to_matrix, verify_identity
from amalgebra.testing.reference import evaluate
from amalgebra.testing.strategies import operator_polynomials

J, S, L = AngularMomentum("J"), AngularMomentum("S"), AngularMomentum("L")
a = symbols("a")


def test_spin_half_exact():
    # Pauli matrices / 2 in the basis (m = 1/2, -1/2): Sakurai (3.2.x), common practice
    assert to_matrix(J.x, {"J": "1/2"}) == Matrix([[0, Rational(1, 2)], [Rational(1, 2), 0]])
    assert to_matrix(J.y, {"J": "1/2"}) == Matrix([[0, -I / 2], [I / 2, 0]])
    assert to_matrix(J.z, {"J": "1/2"}) == Matrix([[Rational(1, 2), 0], [0, -Rational(1, 2)]])


def test_spin_one_plus_exact():
    # <1, 1|J+|1, 0> = <1, 0|J+|1, -1> = sqrt(2): Condon-Shortley, Sakurai (3.5.41)
    assert to_matrix(J.plus, {"J": 1}) == Matrix([[0, sqrt(2), 0], [0, 0, sqrt(2)], [0, 0, 0]])


@pytest.mark.parametrize("j", [0, "1/2", 1, "3/2", 2, "5/2", 3])
@pytest.mark.parametrize("kind", ["exact", "float", "sparse"])
def test_kinds_match_independent_numpy(j, kind):
    expr = (J.x**2 - J.y**2 + J.z * J.x) ** 2 + I * J.plus * J.squared
    jf = float(Rational(j))
    out = to_matrix(expr, {"J": j}, kind=kind)
    if kind == "exact":
        out = np.array(out.evalf(), dtype=complex)
    elif kind == "sparse":
        assert isinstance(out, scipy.sparse.csr_array)
        out = out.toarray()
    else:
        assert isinstance(out, np.ndarray)
    assert np.allclose(out, evaluate(expr, {"J": jf}))


def test_float_is_real_when_possible():
    assert to_matrix(J.x**2, {"J": 1}, kind="float").dtype == np.float64
    assert to_matrix(J.y, {"J": 1}, kind="float").dtype == np.complex128


def test_kronecker_order_is_sorted_labels():
    # documented: sorted labels, first label outermost: kron(A_J, B_S); numpy.kron reference
    m = to_matrix(S.z * J.plus, {"S": "1/2", "J": 1}, kind="float")
    ref = np.kron(to_matrix(J.plus, {"J": 1}, kind="float"), to_matrix(S.z, {"S": "1/2"}, kind="float"))
    assert np.allclose(m, ref)
    assert m.shape == (6, 6)


def test_extra_label_gives_identity_factor():
    m = to_matrix(J.z, {"J": "1/2", "S": 1}, kind="float")
    assert np.allclose(m, np.kron(np.diag([0.5, -0.5]), np.eye(3)))


@settings(deadline=None)
@given(operator_polynomials(("J", "S"), 3, 3), st.sampled_from([0.5, 1, 1.5]), st.sampled_from([0.5, 1]))
def test_float_matches_numpy_property(expr, jj, js):
    assert np.allclose(to_matrix(expr, {"J": jj, "S": js}, kind="float"),
                       evaluate(expr, {"J": jj, "S": js}))


def test_exact_keeps_symbols_and_float_refuses():
    m = to_matrix(a * J.z, {"J": "1/2"})
    assert m == Matrix([[a / 2, 0], [0, -a / 2]])
    with pytest.raises(NotNumericError, match="subs"):
        to_matrix(a * J.z, {"J": "1/2"}, kind="float")
    assert np.allclose(to_matrix(a * J.z, {"J": "1/2"}, kind="float", subs={a: 4}), np.diag([2, -2]))


def test_large_sparse():
    # <j, m+1|J+|j m> = sqrt((j - m)(j + m + 1)), Sakurai (3.5.41), vectorised independently
    j = 1000
    m = to_matrix(J.plus + 2 * J.z, {"J": j}, kind="sparse")
    assert m.shape == (2001, 2001) and m.nnz == 2000 + 2000    # m = 0 diagonal entry is zero
    ms = j - np.arange(2001)
    assert np.allclose(m.diagonal(), 2 * ms)
    assert np.allclose(m.diagonal(1), np.sqrt((j - ms[1:]) * (j + ms[1:] + 1)))


@pytest.mark.parametrize("j, error", [
    ({"J": "1/3"}, QuantumNumberError),
    ({"J": -1}, QuantumNumberError),
    ({"J": 0.3}, QuantumNumberError),
    ({"J": "x"}, NotNumericError),
    ({"S": 1}, OperatorError),           # label J missing
    ({}, OperatorError),
    ([("J", 1)], OperatorError),
])
def test_bad_j(j, error):
    with pytest.raises(error):
        to_matrix(J.z, j)


def test_bad_kind_and_power():
    from sympy import Pow
    with pytest.raises(ConventionError, match="kind="):
        to_matrix(J.z, {"J": 1}, kind="dense")
    with pytest.raises(OperatorError, match="nonnegative integer"):
        to_matrix(Pow(J.z, -1), {"J": 1})


def test_verify_identity_holds_and_fails():
    # J+ J- = J^2 - Jz^2 + Jz, Sakurai (3.5.x)
    ok = verify_identity(J.plus * J.minus, J.squared - J.z**2 + J.z, {"J": [0, "1/2", 1, "3/2", 2]})
    assert isinstance(ok, IdentityCheck) and ok.holds and bool(ok) and ok.first_mismatch is None
    assert len(ok.checked) == 5
    bad = verify_identity(J.plus * J.minus, J.squared - J.z**2 - J.z, {"J": ["1/2", 1]})
    assert not bad.holds
    mm = bad.first_mismatch
    assert mm["j"] == {"J": Rational(1, 2)} and (mm["row"], mm["col"]) == (0, 0)
    assert mm["lhs"] == 1 and mm["rhs"] == 0       # <1/2,1/2|J+J-|1/2,1/2> = 1, Sakurai (3.5.41)
    assert "identity fails at J=1/2" in str(bad)


def test_verify_identity_several_labels_and_list_form():
    lhs = (J.x * S.x + J.y * S.y + J.z * S.z)
    rhs = J.z * S.z + (J.plus * S.minus + J.minus * S.plus) / 2
    assert verify_identity(lhs, rhs, {"J": [1, 2], "S": ["1/2"]}).holds
    assert verify_identity(lhs, rhs, [{"J": 1, "S": 1}, {"J": "3/2", "S": "1/2"}]).holds


def test_assert_identity():
    assert_identity(J.x**2 + J.y**2 + J.z**2, J.squared, {"J": [0, "1/2", 1]})
    with pytest.raises(AssertionError, match="identity fails"):
        assert_identity(J.x * J.y - J.y * J.x, J.z, {"J": [1]})


def test_verify_identity_symbolic_entries():
    assert verify_identity(a * (J.x + J.y), a * J.x + a * J.y, {"J": [1]}).holds
    with pytest.raises(OperatorError):
        verify_identity(J.x, J.x, "J=1")


# ------------------------------------------------------------- direct sums of multiplets

def _block_diag(blocks):
    n = sum(b.rows for b in blocks)
    out = Matrix.zeros(n, n)
    at = 0
    for b in blocks:
        out[at:at + b.rows, at:at + b.rows] = b
        at += b.rows
    return out


@pytest.mark.parametrize("js", [[0, 1, 2], ["1/2", "3/2"], ("3/2", "1/2", "5/2"), [1]])
def test_direct_sum_is_block_diagonal(js):
    # documented basis order: j as given, m descending; angular momentum is block diagonal
    expr = J.plus * J.z ** 2 - I * J.x * J.y + J.squared
    want = _block_diag([to_matrix(expr, {"J": jv}) for jv in js])
    assert to_matrix(expr, {"J": js}) == want != Matrix.zeros(want.rows, want.rows)
    assert np.allclose(to_matrix(expr, {"J": js}, kind="float"), np.array(want.evalf(), dtype=complex))
    assert np.allclose(to_matrix(expr, {"J": js}, kind="sparse").toarray(), np.array(want.evalf(), dtype=complex))


def test_direct_sum_matches_independent_numpy():
    # testing.reference.evaluate builds spin matrices independently per (j_J, j_S); the product of
    # two direct sums is assembled here in the documented order (sorted labels, kron, j as given)
    expr = (J.x * S.y - J.y * S.x) ** 2 + J.plus * S.minus
    space = {"J": ["1/2", 1], "S": [0, "1/2"]}
    j_blocks = [(0.5, 0, 2), (1.0, 2, 3)]          # (j, offset, dimension) inside the J direct sum
    s_blocks = [(0.0, 0, 1), (0.5, 1, 2)]
    want = np.zeros((15, 15), complex)
    for jj, oj, dj in j_blocks:
        for js, os_, ds in s_blocks:
            block = evaluate(expr, {"J": jj, "S": js})
            index = [(oj + a) * 3 + os_ + b for a in range(dj) for b in range(ds)]
            want[np.ix_(index, index)] = block
    assert np.allclose(to_matrix(expr, space, kind="float"), want) and np.abs(want).max() > 0.1
    assert np.allclose(np.array(to_matrix(expr, space).evalf(), dtype=complex), want)


def test_direct_sum_j_validation():
    from sympy import Tuple
    assert to_matrix(J.z, {"J": Tuple(0, 1)}) == Matrix.diag(0, 1, 0, -1)
    with pytest.raises(QuantumNumberError, match="repeat"):
        to_matrix(J.z, {"J": ["1/2", Rational(1, 2)]})
    with pytest.raises(QuantumNumberError, match="at least one"):
        to_matrix(J.z, {"J": ()})
    with pytest.raises(QuantumNumberError):
        to_matrix(J.z, {"J": [1, -1]})
    with pytest.raises(OperatorError):
        to_matrix(J.z, {"S": [1, 2]})            # label J missing on the product route too


def test_direct_sum_symbols_and_subs():
    m = to_matrix(a * J.z, {"J": [0, "1/2"]})
    assert m == Matrix.diag(0, a / 2, -a / 2)
    with pytest.raises(NotNumericError):
        to_matrix(a * J.z, {"J": [0, "1/2"]}, kind="float")
    assert np.allclose(to_matrix(a * J.z + 1, {"J": [0, "1/2"]}, kind="float", subs={a: 4}), np.diag([1, 3, -1]))
    assert to_matrix(a * J.z, {"J": [0, "1/2"]}, subs={a: 4}) == Matrix.diag(0, 2, -2)


def test_direct_sum_scalars_and_dtype():
    assert to_matrix(Rational(3), {"J": [0, 1]}) == 3 * Matrix.eye(4)
    assert to_matrix(J.x ** 2, {"J": [0, 1]}, kind="float").dtype == np.float64
    assert to_matrix(J.y, {"J": [0, 1]}, kind="float").dtype == np.complex128


def test_verify_identity_direct_sum_mismatch_report():
    # J+ J- = J^2 - Jz^2 + Jz (Sakurai 3.5); the wrong sign fails at <1/2, 1/2| . |1/2, 1/2>
    bad = verify_identity(J.plus * J.minus, J.squared - J.z ** 2 - J.z, [{"J": [0, "1/2"], "S": 1}])
    assert not bad.holds
    mm = bad.first_mismatch
    assert mm["j"] == {"J": (0, Rational(1, 2)), "S": 1}
    assert mm["m_row"] == ((Rational(1, 2), Rational(1, 2)), 1) and mm["lhs"] == 1 and mm["rhs"] == 0
    assert verify_identity(J.plus * J.minus, J.squared - J.z ** 2 + J.z, [{"J": [0, "1/2", 1]}]).holds
