"""Input limits (amalgebra.limits): refusals before work starts, and no change of results below them.

Regression tests for issue 17, item 3 ("huge inputs hang or crash instead of refusing").  Every refusal
here is checked with the default limits or with small ones, so each test runs in milliseconds; a hang
would be a regression of the check itself.
"""

import threading
from math import comb, factorial

import pytest
from sympy import Rational, Symbol, cos, sin

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.errors import AmalgebraError, LimitError, QuantumNumberError
from amalgebra.limits import DEFAULT_LIMITS, Limits, check_limit, current_limits, input_limits, show_number
from amalgebra.matrices.explicit import to_matrix
from amalgebra.rotations.wigner import RotationElement, _d_kernel, small_d, small_d_matrix, wigner_D, wigner_D_matrix
from amalgebra.states import apply, ket
from amalgebra.states.coupled import coupling_paths
from amalgebra.states.manyspin import multiplet_count, spin_labels, total_spin_states

J = AngularMomentum("J")
S = AngularMomentum("S")
beta = Symbol("beta", real=True)
a, b, c = Symbol("alpha", real=True), beta, Symbol("gamma", real=True)
HUGE = 10**100


# ----------------------------------------------------------------------------- the module

def test_documented_defaults():
    # The defaults are this project's documented choice (amalgebra.limits docstring): no source.
    assert DEFAULT_LIMITS == Limits(max_j=1_000, max_power=1_000, max_dimension=10**6,
                                    max_dense_entries=10**7, max_terms=10**6)
    assert current_limits() == DEFAULT_LIMITS


def test_input_limits_is_local_and_restored():
    with input_limits(max_j=5) as inner:
        assert inner.max_j == 5 and current_limits().max_j == 5
        with input_limits(max_j=None, max_terms=7):
            assert current_limits().max_j is None and current_limits().max_terms == 7
        assert current_limits() == Limits(max_j=5)
    assert current_limits() == DEFAULT_LIMITS
    with pytest.raises(RuntimeError):
        with input_limits(max_power=2):
            raise RuntimeError("leaving the block by an exception restores the limits too")
    assert current_limits() == DEFAULT_LIMITS


def test_input_limits_do_not_leak_into_other_threads():
    seen = []
    with input_limits(max_j=3):
        worker = threading.Thread(target=lambda: seen.append(current_limits().max_j))
        worker.start()
        worker.join()
    assert seen == [DEFAULT_LIMITS.max_j]


@pytest.mark.parametrize("changes", [{"max_spins": 3}, {"max_j": 0}, {"max_j": -1}, {"max_j": True},
                                     {"max_j": 1.5}, {"max_power": "10"}])
def test_input_limits_refuses_unknown_fields_and_bad_values(changes):
    with pytest.raises(LimitError):
        with input_limits(**changes):
            pass


def test_limit_error_is_typed_and_says_how_to_raise_it():
    assert issubclass(LimitError, ValueError) and issubclass(LimitError, AmalgebraError)
    with pytest.raises(LimitError) as info:
        check_limit("max_power", 1001, "exponent", "a reason")
    text = str(info.value)
    assert text.startswith("exponent=1001 must be at most max_power=1000 (a reason)")
    assert "amalgebra.limits.input_limits(max_power=...)" in text


def test_huge_numbers_are_shown_by_their_size():
    # Python refuses str() of ints above 4300 digits; the message must still be built.
    with pytest.raises(LimitError, match=r"j=<5001-digit number> must be at most max_j"):
        check_limit("max_j", 10**5000, "j")
    assert show_number(10**29) == str(10**29)
    assert show_number(-(10**40)) == "<-41-digit number>"
    assert show_number(Rational(10**40 + 1, 2)) == "<41-digit number/2>"


# ----------------------------------------------------------------------------- operator powers

@pytest.mark.parametrize("expr", [J.x**HUGE, J.plus**HUGE, (J.x + J.y)**HUGE, J.z**1001,
                                  J.x * (S.z + 1)**HUGE])
def test_canonical_refuses_huge_powers(expr):
    with pytest.raises(LimitError, match="max_power=1000"):
        canonical(expr)


def test_other_routes_refuse_huge_powers():
    with pytest.raises(LimitError, match="max_power"):
        apply(J.x**HUGE, ket(1, 0))
    with pytest.raises(LimitError, match="max_power"):
        to_matrix(J.x**HUGE, {"J": 1})
    with pytest.raises(LimitError, match="max_power"):
        to_matrix(J.x**HUGE, {"J": [0, 1]})       # the direct-sum route
    from amalgebra.tensors import SphericalTensor

    T = SphericalTensor("T", 1, "J")
    with pytest.raises(LimitError, match="max_power"):
        canonical(T[0]**HUGE * J.z)


def test_power_limit_changes_no_result():
    # Below the limit the answer is the one computed without limits.
    reference = canonical(J.x**3)
    with input_limits(max_power=3):
        assert canonical(J.x**3) == reference
        with pytest.raises(LimitError, match="exponent=4 must be at most max_power=3"):
            canonical(J.x**4)
    with input_limits(max_power=2000):
        assert canonical(J.z**1001) == J.z**1001     # a single term: cheap once allowed


# ----------------------------------------------------------------------------- matrix sizes

@pytest.mark.parametrize("kind", ["exact", "float", "sparse"])
def test_to_matrix_refuses_huge_dimensions(kind):
    with pytest.raises(LimitError, match="dimension=2000001 must be at most max_dimension"):
        to_matrix(J.z, {"J": 10**6}, kind=kind)
    with pytest.raises(LimitError, match="max_dimension"):
        to_matrix(J.z, {"J": HUGE}, kind=kind)
    with pytest.raises(LimitError, match="max_dimension"):
        to_matrix(J.z, {"J": 1e300}, kind=kind)


def test_dense_kinds_have_an_entry_limit_and_sparse_does_not():
    with pytest.raises(LimitError, match="dimension\\^2=16008001 must be at most max_dense_entries"):
        to_matrix(J.z, {"J": 2000}, kind="float")
    with input_limits(max_dense_entries=100):
        with pytest.raises(LimitError, match="max_dense_entries=100"):
            to_matrix(J.z, {"J": 5})                 # 11 x 11 = 121 entries
        sparse = to_matrix(J.z, {"J": 5}, kind="sparse")
    # Jz|j m> = m|j m>, rows m = j..-j (README conventions): common practice, no source.
    assert sparse.shape == (11, 11) and sparse[0, 0] == 5 and sparse[10, 10] == -5


def test_dimension_counts_every_label_and_direct_sums():
    with input_limits(max_dimension=5):
        assert to_matrix(J.z, {"J": 1}).shape == (3, 3)
        with pytest.raises(LimitError, match="dimension=6"):
            to_matrix(J.z, {"J": 1, "S": "1/2"})       # 3 x 2
        with pytest.raises(LimitError, match="dimension=6"):
            to_matrix(J.z, {"J": ["1/2", 1, 0]})        # 2 + 3 + 1


# ----------------------------------------------------------------------------- rotations

@pytest.mark.parametrize("call", [
    lambda: small_d(HUGE, 0, 0, beta),
    lambda: small_d(1e300, 0, 0, beta),
    lambda: small_d(1001, 0, 0, beta),
    lambda: wigner_D(HUGE, 0, 0, a, b, c),
    lambda: small_d_matrix(HUGE, beta),
    lambda: wigner_D_matrix(HUGE, a, b, c),
    lambda: RotationElement(HUGE, 0, 0, a, b, c).doit(),
])
def test_rotations_refuse_huge_j(call):
    with pytest.raises(LimitError, match="max_j=1000"):
        call()


def test_spherical_harmonic_refuses_huge_l():
    from amalgebra.rotations.harmonics import spherical_harmonic

    with pytest.raises(LimitError, match="l=<101-digit number> must be at most max_j"):
        spherical_harmonic(HUGE, 0, beta, a)


def test_max_j_changes_no_result():
    with input_limits(max_j=2):
        # d^j_{jj}(beta) = cos(beta/2)^(2j), d^j_{j,-j}(beta) = sin(beta/2)^(2j)
        # (Edmonds 1957, eq. 4.1.15, one term each).
        assert small_d(2, 2, 2, beta) == cos(beta / 2)**4
        assert small_d(2, 2, -2, beta) == sin(beta / 2)**4
        with pytest.raises(LimitError, match="j=5/2 must be at most max_j=2"):
            small_d("5/2", "1/2", "1/2", beta)
    with input_limits(max_j=1001):
        # raised above the default: n = 2002 spins are counted again (Pauncz 1979, ch. 2, closed form)
        n, S = 2002, 1
        assert multiplet_count(n, S) == (2 * S + 1) * factorial(n) // (
            factorial(n // 2 + S + 1) * factorial(n // 2 - S))


def _kernel_terms(tj):
    """Terms of Wigner's sum over the whole d^j matrix, counted from the kernel itself."""
    ms = range(tj, -tj - 1, -2)
    return sum(len(_d_kernel(tj, tmp, tm)[1]) for tmp in ms for tm in ms)


@pytest.mark.parametrize("tj", [1, 2, 3, 4, 7, 10])
def test_matrix_term_estimate_is_exact(tj):
    # The estimate refused at max_terms is the kernel's own count: the matrix is built at that limit
    # and refused one below it.
    terms = _kernel_terms(tj)
    j = Rational(tj, 2)
    with input_limits(max_terms=terms):
        assert small_d_matrix(j, beta).shape == (tj + 1, tj + 1)
    with input_limits(max_terms=terms - 1):
        with pytest.raises(LimitError, match=f"terms={terms} must be at most max_terms"):
            small_d_matrix(j, beta)
        with pytest.raises(LimitError, match="max_terms"):
            wigner_D_matrix(j, a, b, c)


def test_matrix_entry_limit():
    with input_limits(max_dense_entries=9):
        assert small_d_matrix(1, beta).shape == (3, 3)
    with input_limits(max_dense_entries=8):
        with pytest.raises(LimitError, match=r"\(2j \+ 1\)\^2=9 must be at most max_dense_entries=8"):
            small_d_matrix(1, beta)


# ----------------------------------------------------------------------------- many spins

def _walk_count(n, S):
    """The branching-diagram walk (Pauncz 1979, ch. 2): an independent count of the multiplets."""
    counts = {1: 1}
    for _ in range(n - 1):
        nxt = {}
        for t, k in counts.items():
            for t2 in (t - 1, t + 1):
                if t2 >= 0:
                    nxt[t2] = nxt.get(t2, 0) + k
        counts = nxt
    return counts.get(int(2 * S), 0)


@pytest.mark.parametrize("n", [1, 2, 3, 7, 12, 31, 40])
def test_multiplet_count_matches_the_walk(n):
    for t in range(0, n + 3):
        S = Rational(t, 2)
        assert multiplet_count(n, S) == _walk_count(n, S)


def test_multiplet_count_is_instant_at_the_limit_and_refused_beyond():
    # f(n, S) = (2S + 1) n! / ((n/2 + S + 1)! (n/2 - S)!) (Pauncz 1979, eq. 2.1.12 form; from memory).
    n, S = 2000, 10
    assert multiplet_count(n, S) == (2 * S + 1) * factorial(n) // (factorial(n // 2 + S + 1) * factorial(n // 2 - S))
    with pytest.raises(LimitError, match="max_j=1000"):
        multiplet_count(2001, "1/2")
    with pytest.raises(LimitError, match="max_j"):
        multiplet_count(HUGE, 0)
    with pytest.raises(LimitError, match="max_j"):
        spin_labels(HUGE)


def _old_total_spin_states(n, S, M):
    """The former route: every coupling path of coupled.coupling_paths, filtered (the oracle)."""
    out = []
    for inter, Jt in coupling_paths([Rational(1, 2)] * n, S):
        tj = int(2 * Jt)
        if M is None:
            ms = [Rational(t, 2) for t in range(tj, -tj - 1, -2)]
        else:
            tm = int(2 * Rational(M))
            if abs(tm) > tj or (tj - tm) % 2:
                continue
            ms = [Rational(tm, 2)]
        out.extend((tuple(inter), Jt, m) for m in ms)
    return out


@pytest.mark.parametrize("n", [2, 3, 4, 5, 6, 7])
def test_total_spin_states_match_the_enumerating_route(n):
    for S in [None] + [Rational(t, 2) for t in range(0, n + 2)]:
        for M in [None] + [Rational(t, 2) for t in range(-n - 1, n + 2)]:
            got = [(k.intermediates, k.J, k.M) for k in total_spin_states(n, S=S, M=M)]
            assert got == _old_total_spin_states(n, S, M), (n, S, M)


def test_total_spin_states_builds_only_the_kets_asked_for():
    # Regression: all 2^(n-1) paths were built before filtering (out of memory at n = 200).
    (top,) = total_spin_states(200, S=100, M=100)
    assert top.J == 100 and top.M == 100
    assert top.intermediates == tuple(Rational(k, 2) for k in range(2, 200))   # stretched path
    # f(60, 29) = C(60, 1) - C(60, 0) = 59 paths (reflection principle; common practice)
    near = total_spin_states(60, S=29, M=-29)
    assert len(near) == comb(60, 1) - 1 and len(set(near)) == 59
    assert total_spin_states(200, S=101) == [] and total_spin_states(200, S="99/2") == []


def test_total_spin_states_refuses_astronomical_lists():
    with pytest.raises(LimitError, match="n/2=500000 must be at most max_j"):
        total_spin_states(10**6)
    with pytest.raises(LimitError, match="kets=1152921504606846976 must be at most max_terms"):
        total_spin_states(60)                       # 2^60 kets
    with pytest.raises(LimitError, match="max_terms"):
        total_spin_states(200, S=0)
    with input_limits(max_terms=5):
        assert len(total_spin_states(4, S=0)) == 2
        with pytest.raises(LimitError, match="kets=6 must be at most max_terms=5"):
            total_spin_states(4, M=0)               # 2 singlets + 3 triplets + 1 quintet at M = 0


# ----------------------------------------------------------------------------- no Overflow/MemoryError

@pytest.mark.parametrize("call", [
    lambda: small_d(1e300, 0, 0, beta),
    lambda: small_d(float("inf"), 0, 0, beta),
    lambda: small_d_matrix(1e300, beta),
    lambda: wigner_D_matrix(10**400, a, b, c),
    lambda: to_matrix(J.z, {"J": 10**400}),
    lambda: to_matrix(J.z, {"J": float("inf")}),
    lambda: multiplet_count(HUGE, HUGE),
    lambda: total_spin_states(HUGE),
    lambda: spin_labels(10**400),
    lambda: canonical(J.z**(10**400)),
    lambda: ket(10**400, 0) and small_d(10**400, 10**400, 0, beta),
])
def test_argument_handling_never_leaks_overflow_or_memory_errors(call):
    with pytest.raises(AmalgebraError) as info:
        call()
    assert not isinstance(info.value, (OverflowError, MemoryError))
    assert isinstance(info.value, (LimitError, QuantumNumberError))


def test_huge_quantum_numbers_stay_legal_where_nothing_grows():
    # A ket is a symbol-like object: j = 10^100 costs nothing and is not refused.
    k = ket(HUGE, HUGE - 1)
    assert k.j == HUGE and k.m == HUGE - 1
    assert total_spin_states(4, S=HUGE) == [] and multiplet_count(4, HUGE) == 0
