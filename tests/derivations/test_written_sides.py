"""Steps typeset as the author wrote them (issue 15): no bundled step prints as ``X = X``.

A step whose code evaluated its left side before handing it to the recorder prints as
``1/3 = 1/3``; the bundled worked examples must write the left side unevaluated
(coupling symbols, matrix elements, ``written(tex, value)``).  Also tests the pieces
that make that possible: the engine compares the values of unevaluated sides, the
report prints them as given, and the verdict says the sides were evaluated.
"""

from pathlib import Path

import pytest
from sympy import Integer, MatMul, Rational, Symbol, eye, latex, sqrt

from amalgebra.algebra import AngularMomentum
from amalgebra.coupling.symbols import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from amalgebra.derivations import derivation, derivation_latex, report_latex, run_folder, written
from amalgebra.derivations.checks import check_equality
from amalgebra.derivations.latex import _step_rows
from amalgebra.derivations.latex_layout import ROW_WIDTH
from amalgebra.derivations.written import commutator_side, side_value
from amalgebra.errors import DerivationStepError
from amalgebra.states import bra, ket

EXAMPLES = Path(__file__).resolve().parents[2] / "worked_examples"

#: Steps of the bundled examples allowed to print with identical sides: none.
ALLOWED_IDENTICAL = frozenset()


def _printed(rows):
    """One side as the report prints it, its alignment and row marks removed."""
    text = " ".join(rows).replace("&", " ").replace(r"\quad", " ")
    return " ".join(text.split())


def printed_sides(step, previous_rhs):
    """``(lhs, rhs)`` as the report typesets the step (the rows of ``_step_rows``).

    A step stated with ``d.then`` prints ``= rhs`` under the previous right side,
    which is then its left side.
    """
    rows = _step_rows(step, ROW_WIDTH)
    text = " \n".join(rows)
    left, _, right = text.partition("&= ")
    if step.continued:
        return previous_rhs, _printed([right])
    return _printed([left]), _printed([right])


def identical_sides(records):
    """``[(derivation, step, latex)]`` of the steps whose two sides print identically."""
    out = []
    for record in records:
        previous = None
        for step in record.steps:
            lhs, rhs = printed_sides(step, previous)
            if lhs == rhs:
                out.append((record.name, step.name, lhs))
            previous = rhs
    return out


@pytest.fixture(scope="module")
def bundled():
    outcome = run_folder(EXAMPLES)
    assert outcome.exit_code == 0
    return outcome


@pytest.fixture(scope="module")
def bundled_records(bundled):
    return [r for f in bundled.files for r in f.records]


def test_no_step_of_the_bundled_report_prints_as_x_equals_x(bundled, bundled_records):
    assert sum(len(r.steps) for r in bundled_records) > 200
    report = report_latex(bundled.files, title="Worked examples")
    for record in bundled_records[:3] + bundled_records[-3:]:  # the rows compared are the report's
        for step in record.steps:
            for row in _step_rows(step, ROW_WIDTH):
                assert row in report, (record.name, step.name, row)
    found = [(d, s, tex) for d, s, tex in identical_sides(bundled_records)
             if (d, s) not in ALLOWED_IDENTICAL]
    assert found == []


def test_the_detector_finds_an_evaluated_left_side():
    J = AngularMomentum("J")
    long_sum = sum(Symbol(f"a{i}") * J.z**i for i in range(1, 12))

    @derivation
    def evaluated_first(d):
        d.step("value", Coupling6j(1, 1, 1, 1, 1, 1).doit(), Rational(1, 6), "evaluated by the code")
        d.step("as_written", Coupling6j(1, 1, 1, 1, 1, 1), Rational(1, 6), "left side as written")
        d.then("chained_again", Rational(1, 6), "a chain that repeats its value")
        d.step("long", long_sum, long_sum, "a long side on several rows, twice")

    record = evaluated_first.run()
    assert record.ok
    assert len(_step_rows(record.steps[3], ROW_WIDTH)) > 2
    assert [s for _, s, _ in identical_sides([record])] == ["value", "chained_again", "long"]


@pytest.mark.parametrize("symbol, value", [
    (Coupling6j(1, 1, 1, 1, 1, 1), Rational(1, 6)),                       # from memory: {1 1 1; 1 1 1} = 1/6
    (Coupling3j(1, 1, 0, 0, 0, 0), -sqrt(3)/3),                           # DLMF 34.3.1: (-1)^(j-m)/sqrt(2j+1)
    (CouplingBracket(1, 0, Rational(1, 2), Rational(1, 2), Rational(3, 2), Rational(1, 2)),
     sqrt(6)/3),                                                          # PDG CG table 1 x 1/2
    (Coupling9j(1, 1, 0, 1, 1, 0, 0, 0, 0), Rational(1, 3)),              # Edmonds 6.4.14 then DLMF 34.5.1 (from memory)
])
def test_an_unevaluated_symbol_is_printed_as_written_and_checked_by_value(symbol, value):
    @derivation
    def one(d):
        d.step("symbol", symbol, value, "a table value")

    record = one.run()
    assert record.ok, record.error
    step = record.steps[0]
    assert step.lhs is symbol                       # the recorder keeps what it was given
    assert step.exact and "written sides evaluated" in step.status
    body = derivation_latex(record)
    assert latex(symbol) in body and latex(value) in body


def test_a_wrong_value_fails_exactly():
    with pytest.raises(DerivationStepError):
        @derivation
        def wrong(d):
            d.step("symbol", Coupling6j(1, 1, 1, 1, 1, 1), Rational(1, 5), "wrong on purpose")

        raise wrong.run().error
    checks = check_equality(Coupling6j(1, 1, 1, 1, 1, 1), Rational(1, 5))
    assert not checks[0].passed and checks[0].exact and checks[0].evaluated


def test_written_side_prints_its_tex_and_compares_its_value():
    n = written(r"\dim V_{S=0}", Integer(2))
    assert latex(n) == r"\dim V_{S=0}" and side_value(n) == 2
    assert check_equality(n, 2)[0].passed
    assert not check_equality(n, 3)[0].passed
    with pytest.raises(ValueError):
        written("", 1)


def test_matrix_written_side_and_matrix_expression():
    b = eye(2) * sqrt(2) / 2
    b = b.as_mutable()
    b[0, 1], b[1, 0] = sqrt(2) / 2, -sqrt(2) / 2                    # a rotation by 45 degrees
    product = MatMul(b.as_immutable(), b.T.as_immutable(), evaluate=False)
    assert check_equality(written("B B^T", product), eye(2))[0].passed
    assert not check_equality(written("B B^T", product), 2 * eye(2))[0].passed


def test_matrix_element_as_bra_operator_ket():
    J = AngularMomentum("J")
    element = bra(1, 1) * J.plus * ket(1, 0)
    # J+|1 0> = sqrt((1 - 0)(1 + 0 + 1)) |1 1> (Condon-Shortley; common practice, no source)
    checks = check_equality(element, sqrt(2))
    assert checks[0].passed and checks[0].evaluated
    assert not check_equality(element, 1)[0].passed
    assert r"J_{+}" in latex(element)


def test_commutator_side_prints_the_bracket():
    J = AngularMomentum("J")
    c = commutator_side(J.plus, J.minus)
    assert latex(c) == r"\left[J_{+}, J_{-}\right]"
    assert check_equality(c, 2 * J.z)[0].passed            # [J+, J-] = 2 Jz, common practice, no source
    assert not check_equality(c, J.z)[0].passed


def test_symbolic_coupling_symbols_are_not_evaluated():
    # with free symbols the side stays as written (sums over symbolic momenta go to the sampler)
    a = Symbol("a")
    s = Coupling6j(a, a, 0, a, a, 0)
    assert side_value(s) is s
