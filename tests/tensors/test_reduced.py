"""The Wigner-Eckart engine (amalgebra.tensors.wigner_eckart) against explicit matrices and an independent oracle."""

import importlib.util
import pathlib
import pickle
import random

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import (And, Rational, S, Symbol, conjugate, latex, pretty, simplify, sqrt, symbols,
                   true, false)

from amalgebra.algebra import AngularMomentum
from amalgebra.errors import (ConventionError, ProjectionError, QuantumNumberError,
                              TensorOperatorError)
from amalgebra.matrices.explicit import to_matrix
from amalgebra.tensors.wigner_eckart import (ReducedMatrixElement, convert_reduced, element_table,
                               hermitian_conjugate_reduced, reduced_from_element,
                               reduced_from_table, selection_rules, wigner_eckart,
                               wigner_eckart_factor)

_spec = importlib.util.spec_from_file_location(
    "tensor_oracle_reduced", pathlib.Path(__file__).with_name("tensor_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

HALF = Rational(1, 2)
JS = [S(n) / 2 for n in range(0, 7)]


def _ms(j):
    return [j - i for i in range(int(2 * j) + 1)]


# ---------------------------------------------------------------- the symbol

def test_reduced_symbol_args_pickle_printing():
    r = ReducedMatrixElement("T", 2, Rational(5, 2), HALF)
    assert r.func(*r.args) == r
    assert pickle.loads(pickle.dumps(r)) == r
    assert str(r) == "<5/2||T^(2)||1/2>"
    assert latex(r) == r"\langle \frac{5}{2} \| T^{(2)} \| \frac{1}{2} \rangle"
    assert pretty(r, use_unicode=True) == "⟨5/2‖T^(2)‖1/2⟩"
    rc = ReducedMatrixElement("T", 2, Rational(5, 2), HALF, "cg")
    assert rc != r and str(rc) == "<5/2||T^(2)||1/2>_cg"
    assert latex(rc).endswith(r"_{\mathrm{CG}}")
    j = Symbol("j", nonnegative=True)
    rs = ReducedMatrixElement("V", 1, j, j)
    assert str(rs) == "<j||V^(1)||j>" and rs.free_symbols == {j}


def test_reduced_symbol_bad_input():
    with pytest.raises(ConventionError, match="convention='racah'"):
        ReducedMatrixElement("T", 1, 1, 1, "racah")
    with pytest.raises(QuantumNumberError):
        ReducedMatrixElement("T", -1, 1, 1)
    with pytest.raises(QuantumNumberError):
        ReducedMatrixElement("T", Rational(1, 3), 1, 1)


# ---------------------------------------------- the factor against the oracle

@pytest.mark.parametrize("convention", ["edmonds", "cg"])
def test_factor_against_independent_racah_formula(convention):
    # oracle: Racah-formula Clebsch-Gordan coefficients (DLMF 34.3.7), Edmonds 5.4.1 definition
    for jp in JS[:5]:
        for j in JS[:5]:
            if (jp - j).is_integer is False:
                continue   # an integer rank connects j' and j only when j' - j is an integer
            for k in (0, 1, 2, 3):
                for mp in _ms(jp):
                    for m in _ms(j):
                        q = mp - m
                        if abs(q) > k:
                            continue
                        got = float(wigner_eckart_factor(jp, mp, k, q, j, m, convention))
                        if convention == "edmonds":
                            want = (-1) ** int(jp - mp) * oracle.threej(float(jp), k, float(j),
                                                                       -float(mp), float(q), float(m))
                        else:
                            want = oracle.cg(float(j), float(m), k, float(q), float(jp), float(mp))
                        assert got == pytest.approx(want, abs=1e-12)


@pytest.mark.parametrize("j", [HALF, 1, Rational(3, 2), 2, Rational(5, 2), 3])
def test_reduced_element_of_J(j):
    # design.md fixed convention: <j||J||j> = sqrt(j(j+1)(2j+1)) (Edmonds 1957, eq. 5.4.3)
    J = AngularMomentum("J")
    mats = {q: to_matrix(c, {"J": j}) for q, c in J.spherical.items()}
    table = {}
    for r, mp in enumerate(_ms(j)):
        for c, m in enumerate(_ms(j)):
            if abs(mp - m) <= 1:
                table[(mp, mp - m, m)] = mats[mp - m][r, c]
    expected = sqrt(j * (j + 1) * (2 * j + 1))
    assert reduced_from_table(table, j, 1, j) == expected != 0
    # Clebsch-Gordan form: sqrt(j(j+1)), i.e. divided by sqrt(2j'+1) (from the 3j definition)
    assert reduced_from_table(table, j, 1, j, convention="cg") == sqrt(j * (j + 1))
    assert convert_reduced(expected, j, j, "edmonds", "cg") == sqrt(j * (j + 1))


def test_reduced_from_table_refuses_non_tensor():
    J = AngularMomentum("J")
    jz2 = to_matrix(J.z ** 2, {"J": 1})   # Jz^2 mixes rank 0 and rank 2
    table = {(m, 0, m): jz2[i, i] for i, m in enumerate(_ms(S(1)))}
    with pytest.raises(TensorOperatorError, match="must equal"):
        reduced_from_table(table, 1, 2, 1)
    with pytest.raises(TensorOperatorError, match="must vanish"):
        reduced_from_table({(1, 1, 1): 1}, 1, 1, 1)
    assert reduced_from_table({}, 1, 1, 1) == 0


def test_callable_table_and_element_table_round_trip():
    R = Symbol("R")
    table = element_table(Rational(3, 2), 2, HALF, R)
    assert len(table) == 8     # every (m', m) pair has |m' - m| <= 2 here
    assert reduced_from_table(lambda mp, q, m: table.get((mp, q, m), 0), Rational(3, 2), 2, HALF) == R
    default = element_table(1, 1, 1)
    assert default[(1, 1, 0)] == -sqrt(6) / 6 * ReducedMatrixElement("T", 1, 1, 1)


@pytest.mark.parametrize("jp, k, j", [(1, 1, 1), (Rational(3, 2), 2, HALF), (2, 3, 1), (HALF, 1, HALF)])
def test_convention_conversion_gives_same_matrix(jp, k, j):
    # both normalisations must describe one and the same operator
    R = Symbol("R")
    edm = element_table(jp, k, j, R)
    cg_form = element_table(jp, k, j, convert_reduced(R, jp, j, "edmonds", "cg"), convention="cg")
    assert edm.keys() == cg_form.keys()
    for key in edm:
        assert simplify(edm[key] - cg_form[key]) == 0
    assert convert_reduced(convert_reduced(R, jp, j, "edmonds", "cg"), jp, j, "cg", "edmonds") == R
    sym = ReducedMatrixElement("T", k, jp, j)
    assert convert_reduced(sym, jp, j, "edmonds", "cg").convention == "cg"


valid_triples = st.tuples(st.integers(0, 8), st.integers(0, 4), st.integers(0, 8)).filter(
    lambda t: (t[0] + 2 * t[1] + t[2]) % 2 == 0 and abs(t[0] - t[2]) <= 2 * t[1] <= t[0] + t[2])


@settings(database=None)
@given(valid_triples, st.data(), st.sampled_from(["edmonds", "cg"]))
@example((3, 1, 1), None, "edmonds")
def test_wigner_eckart_round_trip(triple, data, convention):
    jp, k, j = Rational(triple[0], 2), triple[1], Rational(triple[2], 2)
    R = Symbol("R")
    mp = _ms(jp)[0] if data is None else data.draw(st.sampled_from(_ms(jp)))
    m = _ms(j)[0] if data is None else data.draw(st.sampled_from(_ms(j)))
    q = mp - m
    element = wigner_eckart(jp, mp, k, q, j, m, R, convention=convention)
    if abs(q) > k or element == 0:
        with pytest.raises(QuantumNumberError):
            reduced_from_element(element, jp, mp, k, q, j, m, convention)
    else:
        assert reduced_from_element(element, jp, mp, k, q, j, m, convention) == R


@settings(database=None)
@given(st.integers(0, 6), st.integers(0, 3), st.integers(0, 6), st.data())
def test_selection_rules_agree_with_zeros(tjp, k, tj, data):
    jp, j = Rational(tjp, 2), Rational(tj, 2)
    if (tjp + tj) % 2:
        return   # j' - j must be an integer for an integer rank
    mp = data.draw(st.sampled_from(_ms(jp)))
    m = data.draw(st.sampled_from(_ms(j)))
    q = data.draw(st.integers(-k, k))
    allowed = selection_rules(jp, mp, k, q, j, m)
    assert allowed in (true, false)
    if allowed is false:
        assert wigner_eckart_factor(jp, mp, k, q, j, m) == 0


def test_selection_rules_symbolic_and_parity():
    jp, j, mp, m, q = symbols("jp j mp m q")
    rules = selection_rules(jp, mp, 1, q, j, m)
    assert isinstance(rules, And) and rules.free_symbols == {jp, j, mp, m, q}
    assert selection_rules(1, 0, 1, 0, 0, 0, parity=(-1, -1, 1)) is true    # E1 changes parity
    assert selection_rules(1, 0, 1, 0, 0, 0, parity=(1, -1, 1)) is false
    assert selection_rules(2, 0, 2, 0, 0, 0, parity=(1, 1, 1)) is true      # E2 keeps it
    p = Symbol("p")
    assert selection_rules(1, 0, 1, 0, 0, 0, parity=(p, -1, 1)).has(p)
    with pytest.raises(QuantumNumberError):
        selection_rules(1, 0, 1, 0, 0, 0, parity=(2, 1, 1))
    with pytest.raises(TypeError):
        selection_rules(1, 0, 1, 0, 0, 0, parity=1)


def test_bad_input_errors():
    with pytest.raises(ConventionError, match="convention='rose'"):
        wigner_eckart(1, 0, 1, 0, 1, 0, convention="rose")
    with pytest.raises(ConventionError, match="to_convention"):
        convert_reduced(1, 1, 1, "cg", "brink")
    with pytest.raises(ConventionError, match="must match"):
        convert_reduced(ReducedMatrixElement("T", 1, 1, 1, "cg"), 1, 1, "edmonds", "cg")
    with pytest.raises(ProjectionError):
        wigner_eckart_factor(1, 0, 1, HALF, 1, 0)       # q not compatible with k
    with pytest.raises(QuantumNumberError):
        wigner_eckart_factor(-1, 0, 1, 0, 1, 0)
    with pytest.raises(QuantumNumberError, match="nonzero"):
        reduced_from_element(1, 1, 0, 1, 0, 1, 0)        # (1 1 1; 0 0 0) = 0


def _hermitian_tensor(jlist, k, rng):
    """T_q = A_q + (-1)^q (A_{-q})^dagger from a random complex tensor A (oracle definition)."""
    red = {(a, b): complex(rng.uniform(-1, 1), rng.uniform(-1, 1))
           for a in jlist for b in jlist if abs(a - b) <= k <= a + b}
    A = oracle.tensor_on_sum(jlist, k, red)
    return {q: A[q] + (-1) ** int(q) * A[-q].conj().T for q in A}


@pytest.mark.parametrize("jlist, k", [([0.5, 1.5], 1), ([1.0, 2.0], 2), ([0.5, 1.5, 2.5], 2), ([1.0, 3.0], 2)])
def test_hermitian_reduced_phase(jlist, k):
    # <j'||T||j>* = (-1)^(j'-j) <j||T||j'> for Hermitian T (derived from Edmonds 5.4.1; verified here)
    rng = random.Random(7)
    T = _hermitian_tensor(jlist, k, rng)
    for q in T:
        assert np.allclose(T[q].conj().T, (-1) ** int(q) * T[-q])
    basis = oracle.block_basis(jlist)

    def family(j):
        return j, lambda m: np.array([1.0 if b == (j, m) else 0.0 for b in basis])

    for a in jlist:
        for b in jlist:
            if not abs(a - b) <= k <= a + b:
                continue
            rab, res1 = oracle.reduced_from_matrix(T, k, family(a), family(b))
            rba, res2 = oracle.reduced_from_matrix(T, k, family(b), family(a))
            assert res1 < 1e-10 and res2 < 1e-10
            sym = ReducedMatrixElement("T", k, Rational(int(2 * a), 2), Rational(int(2 * b), 2))
            rel = hermitian_conjugate_reduced(sym)
            coeff = complex(rel.subs(rel.atoms(ReducedMatrixElement).pop(), 1))
            assert np.conj(rab) == pytest.approx(coeff * rba)
            # Clebsch-Gordan form: extra sqrt((2j+1)/(2j'+1))
            symc = ReducedMatrixElement("T", k, Rational(int(2 * a), 2), Rational(int(2 * b), 2), "cg")
            relc = hermitian_conjugate_reduced(symc)
            coeffc = complex(relc.subs(relc.atoms(ReducedMatrixElement).pop(), 1))
            rab_cg, rba_cg = rab / np.sqrt(2 * a + 1), rba / np.sqrt(2 * b + 1)
            assert np.conj(rab_cg) == pytest.approx(coeffc * rba_cg)


def test_symbolic_j_stays_symbolic():
    j = Symbol("j", positive=True)
    value = wigner_eckart(j, j, 1, 0, j, j, Symbol("R"))
    assert value.has(Symbol("R")) and value.has(j)
    # check the closed form at j = 3/2 against the numeric route (same formula, two code paths)
    assert simplify(value.subs(j, Rational(3, 2)) - wigner_eckart(Rational(3, 2), Rational(3, 2), 1, 0,
                                                                   Rational(3, 2), Rational(3, 2),
                                                                   Symbol("R"))) == 0
    # the conjugate of a reduced element is not known in general: it stays unevaluated
    assert isinstance(conjugate(ReducedMatrixElement("T", 1, 2, 1)), conjugate)


def test_text_is_never_parsed_as_a_reduced_element(tmp_path, monkeypatch):
    # Safety rule: strings are data, never code; text is refused with a typed error.
    from amalgebra.errors import NotNumericError
    from amalgebra.tensors.wigner_eckart import wigner_eckart

    marker = tmp_path / "ran"
    with pytest.raises(NotNumericError, match="not text"):
        wigner_eckart(1, 0, 1, 0, 1, 0, f"__import__('pathlib').Path({str(marker)!r}).touch()")
    assert not marker.exists()
