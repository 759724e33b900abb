"""Coupled kets, recoupling and change-of-basis matrices (amalgebra.states.coupled).

Sources: equation and section numbers of textbooks cited beside the checks (Sakurai 1994 =
J. J. Sakurai, Modern Quantum Mechanics, rev. ed.; Edmonds 1957; Foot 2005; Pauncz 1979) are
quoted from memory, not checked against the books; the formulas themselves are standard.
"""

import pickle

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from sympy import Rational, adjoint, eye, expand, latex, sqrt, sstr

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.errors import QuantumNumberError, StateError
from amalgebra.states.action import apply
from amalgebra.states.coupled import (CoupledBra, CoupledKet, coupled_basis, coupled_chain, coupled_ket,
                                      coupling_matrix, coupling_paths, to_uncoupled, uncoupled_basis,
                                      uncoupled_to_coupled)
from amalgebra.states.kets import inner, ket, product_ket

h = Rational(1, 2)


def pk(*pairs):
    """Product ket from (j, m, label) triples."""
    return product_ket(*[ket(j, m, lab) for j, m, lab in pairs])


# PDG "Clebsch-Gordan coefficients" table (Particle Data Group, Review of Particle Physics,
# section 45 in recent editions), 1/2 x 1/2, 1 x 1/2 and 1 x 1 blocks; entries typed from memory
# of the table (sqrt signs taken over the whole entry, as the table prints them).
PDG = [
    (h, h, 1, 0, {(h, -h): sqrt(h), (-h, h): sqrt(h)}),
    (h, h, 0, 0, {(h, -h): sqrt(h), (-h, h): -sqrt(h)}),
    (1, h, Rational(3, 2), h, {(1, -h): sqrt(Rational(1, 3)), (0, h): sqrt(Rational(2, 3))}),
    (1, h, h, h, {(1, -h): sqrt(Rational(2, 3)), (0, h): -sqrt(Rational(1, 3))}),
    (1, h, h, -h, {(0, -h): sqrt(Rational(1, 3)), (-1, h): -sqrt(Rational(2, 3))}),
    (1, 1, 0, 0, {(1, -1): sqrt(Rational(1, 3)), (0, 0): -sqrt(Rational(1, 3)), (-1, 1): sqrt(Rational(1, 3))}),
]


@pytest.mark.parametrize("j1, j2, J, M, table", PDG)
def test_pdg_expansions(j1, j2, J, M, table):
    got = to_uncoupled(coupled_ket(j1, j2, J, M, labels=("A", "B")))
    expected = sum((c * pk((j1, m1, "A"), (j2, m2, "B")) for (m1, m2), c in table.items()), 0 * ket(0, 0))
    assert expand(got - expected) == 0


@pytest.mark.parametrize("js", [(h, h), (1, h), (1, 1), (Rational(3, 2), 1), (2, Rational(3, 2)),
                                (h, h, h), (1, h, h), (1, 1, 1), (h, h, h, h)])
def test_change_of_basis_is_orthogonal(js):
    # common practice, no source: the CG transformation is real orthogonal (Edmonds 1957, eq. 3.5.5)
    labels = tuple(f"a{k}" for k in range(len(js)))
    U, unc, cpl = coupling_matrix(js, labels)
    dim = 1
    for x in js:
        dim *= int(2 * x + 1)
    assert U.shape == (dim, dim) == (len(unc), len(cpl))
    assert U.T * U == eye(dim)
    assert U * U.T == eye(dim)


@pytest.mark.parametrize("js", [(1, h), (Rational(3, 2), 1), (h, 1, h), (1, 1, 1)])
def test_coupled_kets_are_eigenstates(js):
    # (J1 + J2 + ...)^2 |... J M> = J(J+1)|...>, Jz total = M; and (J1+J2)^2 = J12(J12+1) for chains
    # Edmonds (1957), eq. 3.1.5 and ch. 6
    labels = tuple(f"a{k}" for k in range(len(js)))
    moms = [AngularMomentum(lab) for lab in labels]

    def total_sq(ms):
        return sum((x.squared for x in ms), 0) + 2 * sum(
            (dot(ms[a], ms[b]) for a in range(len(ms)) for b in range(a + 1, len(ms))), 0)

    jz = sum((x.z for x in moms), 0)
    for k in coupled_basis(js, labels):
        state = to_uncoupled(k)
        J = k.J
        assert expand(apply(total_sq(moms), state) - J * (J + 1) * state) == 0
        assert expand(apply(jz, state) - k.M * state) == 0
        if len(js) == 3:
            J12 = k.intermediates[0]
            assert expand(apply(total_sq(moms[:2]), state) - J12 * (J12 + 1) * state) == 0


def test_order_of_coupling_phase():
    # |(j2 j1) J M> = (-1)^(j1 + j2 - J) |(j1 j2) J M>   (Edmonds 1957, eq. 3.5.14)
    for j1, j2, J in [(1, h, h), (1, 1, 1), (Rational(3, 2), 1, Rational(3, 2)), (2, 1, 2)]:
        for M in (J, J - 1):
            a = to_uncoupled(coupled_ket(j1, j2, J, M, labels=("A", "B")))
            b = to_uncoupled(coupled_ket(j2, j1, J, M, labels=("B", "A")))
            assert expand(b - (-1) ** (j1 + j2 - J) * a) == 0 != a


def test_chain_stretched_and_counts():
    # the stretched state is the product of top states (common practice, no source)
    k = coupled_chain([h, 1, h], [Rational(3, 2)], 2, 2, ("p", "q", "r"))
    assert to_uncoupled(k) == pk((h, h, "p"), (1, 1, "q"), (h, h, "r"))
    # 1/2 x 1/2 x 1/2 = 1/2 + 1/2 + 3/2: two doublets and a quartet
    assert coupling_paths([h, h, h]) == [((0,), h), ((1,), h), ((1,), Rational(3, 2))]
    assert len(coupled_basis([1, 1, 1], ("a", "b", "c"))) == 27


@given(st.integers(0, 4), st.integers(0, 3), st.data())
def test_uncoupled_coupled_round_trip(t1, t2, data):
    # |m1>|m2> -> sum_J <..|J M> |J M> -> back: identity (orthogonality of CG coefficients)
    j1, j2 = Rational(t1, 2), Rational(t2, 2)
    m1 = j1 - data.draw(st.integers(0, t1))
    m2 = j2 - data.draw(st.integers(0, t2))
    state = pk((j1, m1, "A"), (j2, m2, "B"))
    coupled = uncoupled_to_coupled(state, ("A", "B"))
    assert expand(to_uncoupled(coupled) - state) == 0
    assert inner(adjoint(coupled), coupled) == 1


def test_inner_products_of_coupled_kets():
    a = coupled_ket(1, 1, 2, 0, labels=("A", "B"))
    b = coupled_ket(1, 1, 0, 0, labels=("A", "B"))
    assert inner(a.dual(), a) == 1
    assert inner(a.dual(), b) == 0
    assert adjoint(a) == CoupledBra(*a.args)
    assert inner(adjoint(a), pk((1, 1, "A"), (1, -1, "B"))) == sqrt(6) / 6   # PDG 1x1 table


def test_bad_couplings():
    with pytest.raises(QuantumNumberError, match="triangle"):
        coupled_ket(1, h, Rational(5, 2), h)
    with pytest.raises(QuantumNumberError, match="triangle"):
        coupled_ket(1, 1, h, h)                       # 1 + 1 + 1/2 not an integer
    with pytest.raises(QuantumNumberError, match="M="):
        coupled_ket(1, 1, 1, 2)
    with pytest.raises(QuantumNumberError):
        coupled_chain([h, h, h], [2], h, h, ("a", "b", "c"))
    with pytest.raises(StateError):
        coupled_chain([h, h, h], [], h, h, ("a", "b", "c"))
    with pytest.raises(StateError):
        coupled_ket(1, 1, 1, 0, labels=("A", "A"))
    with pytest.raises(StateError):
        uncoupled_to_coupled(pk((1, 0, "A"), (1, 0, "B")), ("A", "C"))
    with pytest.raises(StateError):
        uncoupled_basis([1, 1], ("A",))


def test_args_printing_pickle():
    k = coupled_chain([h, 1, h], [h], 1, 0, ("p", "q", "r"))
    assert k.func(*k.args) == k
    assert pickle.loads(pickle.dumps(k)) == k
    assert sstr(k) == "|((1/2_p 1_q)1/2 1/2_r)1, 0>"
    assert sstr(k.dual()) == "<((1/2_p 1_q)1/2 1/2_r)1, 0|"
    assert latex(coupled_ket(1, 1, 2, 0, labels=("A", "B"))) == r"\left|\left(1_{A} 1_{B}\right) 2, 0\right\rangle"
    assert isinstance(k, CoupledKet) and not k.is_commutative
