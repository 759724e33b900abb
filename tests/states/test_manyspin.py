"""Many spins 1/2: total-spin eigenstates, multiplet counts, singlet correlations (amalgebra.states.manyspin).

Sources: equation and section numbers of textbooks cited beside the checks (Sakurai 1994 =
J. J. Sakurai, Modern Quantum Mechanics, rev. ed.; Edmonds 1957; Foot 2005; Pauncz 1979) are
quoted from memory, not checked against the books; the formulas themselves are standard.
"""

from math import factorial

import pytest
from sympy import Rational, Symbol, adjoint, cos, expand, pi, simplify, sqrt

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import QuantumNumberError, StateError
from amalgebra.states.action import apply, expectation
from amalgebra.states.coupled import to_uncoupled
from amalgebra.states.kets import components, inner, ket, product_ket
from amalgebra.states.manyspin import (chsh, correlation, multiplet_count, singlet, spin_along, spin_labels,
                                       total_spin_squared, total_spin_states)

h = Rational(1, 2)


def pauncz(n, S):
    """(2S+1) n! / ((n/2+S+1)! (n/2-S)!): R. Pauncz, Spin Eigenfunctions (Plenum 1979), ch. 2
    (branching-diagram count; equation number from memory, not checked)."""
    return (2 * S + 1) * factorial(n) // (factorial(int(n / 2 + S + 1)) * factorial(int(n / 2 - S)))


@pytest.mark.parametrize("n", range(1, 13))
def test_multiplet_count_formula(n):
    total = 0
    for twice_s in range(n % 2, n + 1, 2):
        S = Rational(twice_s, 2)
        count = multiplet_count(n, S)
        assert count == pauncz(n, S)
        total += count * (twice_s + 1)
    assert total == 2 ** n          # dimension check: sum over S of f(n,S)(2S+1) = 2^n
    assert multiplet_count(n, Rational(n + 2, 2)) == 0
    assert multiplet_count(n, Rational(n + 1, 2)) == 0   # wrong parity


@pytest.mark.parametrize("n", [2, 3, 4, 5])
def test_total_spin_states_are_eigenstates_and_orthonormal(n):
    # S^2 eigenvalue S(S+1) and orthonormality of the genealogical basis (Pauncz 1979, ch. 2)
    labels = spin_labels(n)
    s2 = total_spin_squared(labels)
    sz = sum((AngularMomentum(lab).z for lab in labels), 0)
    states = total_spin_states(n)
    assert len(states) == 2 ** n
    expanded = [to_uncoupled(k) for k in states]
    for k, psi in zip(states, expanded):
        S = k.J
        assert expand(apply(s2, psi) - S * (S + 1) * psi) == 0
        assert expand(apply(sz, psi) - k.M * psi) == 0
    for x in range(len(states)):
        for y in range(x, len(states)):
            if states[x].M == states[y].M:
                assert inner(adjoint(expanded[x]), expanded[y]) == (1 if x == y else 0)


def test_ten_spins():
    n = 10
    singlets = total_spin_states(n, S=0)
    assert len(singlets) == pauncz(10, 0) == 42
    psi = to_uncoupled(singlets[-1])
    comp = components(psi)
    assert inner(adjoint(psi), psi) == 1
    # every component has total M = 0 and, for a singlet, the flip of all spins changes the sign by (-1)^(n/2 - S)
    assert all(sum(k.m for k in b.args) == 0 for b in comp)
    top = total_spin_states(n, S=5, M=5)
    assert to_uncoupled(top[0]) == product_ket(*[ket(h, h, lab) for lab in spin_labels(n)])
    # S^2 on one S = 1 state of 10 spins: eigenvalue 2 (Pauncz 1979, ch. 2)
    labels = spin_labels(n)
    state = to_uncoupled(total_spin_states(n, S=1, M=1)[0])
    assert expand(apply(total_spin_squared(labels), state) - 2 * state) == 0


def test_singlet():
    psi = singlet()
    up_down = product_ket(ket(h, h, "A"), ket(h, -h, "B"))
    down_up = product_ket(ket(h, -h, "A"), ket(h, h, "B"))
    assert expand(psi - (up_down - down_up) / sqrt(2)) == 0     # Sakurai (1994) eq. 3.9.1 (up to phase)
    assert expectation(total_spin_squared(("A", "B")), psi) == 0


def test_singlet_correlation_minus_cos():
    # <sigma_a sigma_b> = -cos(theta_a - theta_b) in the singlet (Sakurai 1994, eq. 3.9.10;
    # Bell, Physics 1, 195 (1964))
    a, b = Symbol("a", real=True), Symbol("b", real=True)
    value = correlation(singlet(), ("A", a), ("B", b))
    assert simplify(value + cos(a - b)) == 0
    for ta, tb in [(0, 0), (0, pi / 2), (pi / 3, pi), (pi / 4, 3 * pi / 4)]:
        assert simplify(correlation(singlet(), ("A", ta), ("B", tb)) + cos(ta - tb)) == 0
    # axes out of the xz-plane too: -n_a . n_b
    phi = Symbol("phi", real=True)
    value = correlation(singlet(), ("A", pi / 2, 0), ("B", pi / 2, phi))
    assert simplify(value + cos(phi)) == 0


def test_chsh_tsirelson():
    # |CHSH| = 2 sqrt(2): Tsirelson's bound, Cirel'son, Lett. Math. Phys. 4, 93 (1980), reached by the singlet
    value = chsh(singlet(), 0, pi / 2, pi / 4, 3 * pi / 4)
    assert simplify(value) == -2 * sqrt(2)
    assert simplify(abs(value) - 2 * sqrt(2)) == 0


def test_spin_along_and_errors():
    S = AngularMomentum("A")
    assert spin_along("A", 0) == 2 * S.z
    with pytest.raises(QuantumNumberError):
        multiplet_count(0, 0)
    with pytest.raises(QuantumNumberError):
        multiplet_count(4, "1/3")
    with pytest.raises(StateError):
        total_spin_states(1)
    with pytest.raises(StateError):
        total_spin_states(3, labels=("a", "b"))
    assert total_spin_states(3, S=h, M=Rational(5, 2)) == []


@pytest.mark.slow
def test_all_ten_spin_singlets_orthonormal():
    # the 42 singlets of 10 spins 1/2 are orthonormal and annihilated by S^2 (Pauncz 1979, ch. 2)
    labels = spin_labels(10)
    s2 = total_spin_squared(labels)
    psis = [to_uncoupled(k) for k in total_spin_states(10, S=0)]
    assert len(psis) == 42
    for x in range(len(psis)):
        for y in range(x, len(psis)):
            assert inner(adjoint(psis[x]), psis[y]) == (1 if x == y else 0)
    for psi in psis[::7]:
        assert apply(s2, psi) == 0
