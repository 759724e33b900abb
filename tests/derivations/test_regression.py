"""Tests of comparing new results with stored ones (amalgebra.derivations.regression)."""

from sympy import Symbol, cos, symbols

from amalgebra.derivations import derivation
from amalgebra.derivations.regression import compare_record, compare_value
from amalgebra.derivations.store import StoredEntry
from amalgebra.parsing import parse

j = Symbol("j")


def test_identical_reprinted_changed():
    assert compare_value("d", "r", "j*(j + 1)", j*(j + 1)).status == "identical"
    # expanded versus factored: equal, printed differently (common practice, no source)
    c = compare_value("d", "r", "j^2 + j", j*(j + 1))
    assert (c.status, c.passed) == ("reprinted", True)
    assert "stored: j^2 + j" in c.diff and "now:    j*(j + 1)" in c.diff
    # a trigonometric identity needs simplify, still "equal" (common practice, no source)
    assert compare_value("d", "r", "sin(j)^2", 1 - cos(j)**2).status == "reprinted"
    c = compare_value("d", "r", "j^2 + j - 1", j**2 + 2*j - 1, line=12)
    assert (c.status, c.passed, c.line) == ("changed", False, 12)
    assert c.diff.splitlines() == [
        "  stored: j^2 + j - 1",
        "  now:    j^2 + 2*j - 1",
        "  terms only in stored: j",
        "  terms only now:       2*j",
    ]


def test_symbols_are_matched_by_name_whatever_their_assumptions():
    jp = Symbol("j", positive=True)
    assert compare_value("d", "r", "sqrt(j^2)", abs(jp)).status in ("identical", "reprinted")
    assert compare_value("d", "r", "j + 1", jp + 1).status == "identical"


def test_operator_results_compare_in_the_canonical_form():
    from amalgebra.algebra import AngularMomentum

    J = AngularMomentum("J")
    # J+ J- = J^2 - Jz^2 + Jz (Sakurai 3.5.xx, from memory): equal, printed differently
    c = compare_value("d", "r", "Jplus(J)*Jminus(J)", J.squared - J.z**2 + J.z)
    assert c.status == "reprinted"
    assert compare_value("d", "r", "Jplus(J)*Jminus(J)", J.minus*J.plus).status == "changed"


def test_compare_record_unrecorded_and_stale():
    x, y = symbols("x y")

    @derivation
    def two(d):
        d.result("kept", x + 1)
        d.result("new", y)

    rec = two.run()
    assert [c.status for c in compare_record(rec, None)] == ["unrecorded", "unrecorded"]
    stored = {"kept": StoredEntry("x + 1", parse("x + 1"), 3),
              "gone": StoredEntry("2", parse("2"), 4)}
    got = [(c.result, c.status, c.line) for c in compare_record(rec, stored)]
    assert got == [("kept", "identical", 3), ("new", "unrecorded", None), ("gone", "stale", 4)]
