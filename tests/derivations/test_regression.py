"""Tests of comparing new results with stored ones (amalgebra.derivations.regression) and of
the budget every equality decision runs under (amalgebra.derivations.budget)."""

import time

import pytest
from sympy import ImmutableMatrix, Matrix, Rational, Symbol, atan, cos, pi, sin, sqrt, symbols

from amalgebra.derivations import derivation
from amalgebra.derivations.budget import Budget, decide_equal
from amalgebra.derivations.regression import compare_entry, compare_record, compare_value
from amalgebra.derivations.store import StoredEntry, load_results, write_results
from amalgebra.parsing import parse

j = Symbol("j")
a, b, c, d, e = symbols("a b c d e")


def test_identical_reprinted_changed():
    c1 = compare_value("d", "r", "j*(j + 1)", j*(j + 1))
    assert (c1.status, c1.method) == ("identical", "text")
    # expanded versus factored: equal, printed differently (common practice, no source)
    c2 = compare_value("d", "r", "j^2 + j", j*(j + 1))
    assert (c2.status, c2.passed, c2.method, c2.exact) == ("reprinted", True, "normal form", True)
    assert "stored: j^2 + j" in c2.diff and "now:    j*(j + 1)" in c2.diff
    # a trigonometric identity: exact through the exponential form (common practice, no source)
    c3 = compare_value("d", "r", "sin(j)^2", 1 - cos(j)**2)
    assert (c3.status, c3.method) == ("reprinted", "normal form")
    c4 = compare_value("d", "r", "j^2 + j - 1", j**2 + 2*j - 1, line=12)
    assert (c4.status, c4.passed, c4.line) == ("changed", False, 12)
    assert c4.diff.splitlines() == [
        "  stored: j^2 + j - 1",
        "  now:    j^2 + 2*j - 1",
        "  terms only in stored: j",
        "  terms only now:       2*j",
        "  decided by normal form: expand(a - b) is a nonzero polynomial",
    ]


def test_an_equality_only_the_numeric_test_finds_is_reported_as_such():
    # sqrt(x^2 + 2x + 1) = x + 1 for x > 0 (common practice, no source): no exact route here
    x = Symbol("x", positive=True)
    comparison = compare_value("d", "r", "sqrt(x^2 + 2*x + 1)", x + 1)
    assert (comparison.status, comparison.method, comparison.exact) == ("reprinted", "numeric", False)
    assert "evidence, not a proof" in comparison.diff
    y = Symbol("x", negative=True)   # false for x < -1: |x + 1| (common practice, no source)
    assert compare_value("d", "r", "sqrt(x^2 + 2*x + 1)", y + 1).status == "changed"


def test_symbols_are_matched_by_name_whatever_their_assumptions():
    jp = Symbol("j", positive=True)
    assert compare_value("d", "r", "sqrt(j^2)", abs(jp)).status in ("identical", "reprinted")
    assert compare_value("d", "r", "j + 1", jp + 1).status == "identical"


def test_operator_results_compare_in_the_canonical_form():
    from amalgebra.algebra import AngularMomentum

    J = AngularMomentum("J")
    # J+ J- = J^2 - Jz^2 + Jz (Sakurai 3.5.xx, from memory): equal, printed differently
    c1 = compare_value("d", "r", "Jplus(J)*Jminus(J)", J.squared - J.z**2 + J.z)
    assert (c1.status, c1.method) == ("reprinted", "normal form")
    assert compare_value("d", "r", "Jplus(J)*Jminus(J)", J.minus*J.plus).status == "changed"


def test_kets_compare_by_their_coefficients():
    from amalgebra.states import Ket

    up, zero = Ket(1, 1, "J"), Ket(1, 0, "J")
    # sqrt(3 + 2 sqrt 2) = 1 + sqrt 2 (denesting, common practice, no source)
    c1 = compare_value("d", "r", "sqrt(3 + 2*sqrt(2))*ket(1, 0, J)", (1 + sqrt(2))*zero)
    assert c1.status == "reprinted"
    assert compare_value("d", "r", "ket(1, 0, J)", zero + up).status == "changed"


# --------------------------------------------------------------- the budget (issue 17, item 2)

def test_a_tampered_stored_value_cannot_make_check_hang():
    # (a+b+c+d+e)^40 has C(44, 4) = 135751 terms (binomial count, common practice): never expanded
    start = time.monotonic()
    comparison = compare_value("d", "r", "(a + b + c + d + e)^40 - 1", a)
    assert time.monotonic() - start < 60          # a hang guard; the budget is 5 s
    assert (comparison.status, comparison.method) == ("changed", "numeric")
    assert "exact expansion not attempted" in comparison.diff
    # the same tampering against a value it happens to equal is found equal, numerically
    honest = ((a + b + c + d + e)**40 - 1)
    assert compare_value("d", "r", "(a + b + c + d + e)^40 - 1", honest).status == "identical"
    twin = compare_value("d", "r", "(e + d + c + b + a)^40 - 1 + 0*a", honest.expand(deep=False))
    assert twin.passed


def test_a_budget_overrun_is_a_failure_with_a_clear_message():
    from amalgebra.algebra import AngularMomentum

    J = AngularMomentum("J")
    start = time.monotonic()
    comparison = compare_value("d", "r", "(Jx(J) + Jy(J) + Jz(J))^40", J.z,
                               budget=Budget(seconds=0.5))
    assert time.monotonic() - start < 30
    assert (comparison.status, comparison.passed, comparison.method) == ("undecided", False, "budget")
    assert "within the time budget of 0.5 s" in comparison.diff
    small = Budget(max_nodes=10)
    big = compare_value("d", "r", "sin(a + b + c + d + e + j)", sin(a + b + c + d + e) + j,
                        budget=small)
    assert big.status == "undecided" and "max_nodes=10" in big.diff
    degree = compare_value("d", "r", "Jz(J)^50", J.z, budget=Budget(max_operator_degree=8))
    assert degree.status == "undecided" and "operator degree above" in degree.diff


def test_decide_equal_verdicts_and_methods():
    x = Symbol("x")
    assert decide_equal(x, x).method == "structure"
    assert decide_equal(1/(x + 1) + 1, (x + 2)/(x + 1)).detail.startswith("numerator")
    # (x - 1)^40 expanded equals itself: exact, binomial theorem (common practice, no source)
    assert decide_equal((x - 1)**40, ((x - 1)**40).expand()).exact
    assert decide_equal(sqrt(2), Rational(141421356237, 10**11)).equal is False
    verdict = decide_equal(sin(pi*j), 0)    # not zero for real j: numeric, false
    assert verdict.equal is False and verdict.method == "numeric"
    # seeded: the same call gives the same verdict text
    assert decide_equal(sin(j)/j, 1 - j**2/6, seed="s") == decide_equal(sin(j)/j, 1 - j**2/6, seed="s")


# --------------------------------------------------------------- structured results (issue 15)

def _entry(tmp_path, value):
    path = tmp_path / "deriv_s.results.toml"
    write_results(path, {"d": {"r": value}})
    return load_results(path)["d"]["r"]


def test_structured_results_identical_reprinted_changed(tmp_path):
    H = Matrix([[a, sqrt(2)*j], [sqrt(2)*j, -a]])
    entry = _entry(tmp_path, H)
    assert compare_entry("d", "r", entry, ImmutableMatrix(H)).status == "identical"
    factored = Matrix([[a, sqrt(2)*j], [sqrt(2)*j, -a*(j + 1) + a*j]])   # -a again
    assert compare_entry("d", "r", entry, factored).status == "reprinted"
    changed = compare_entry("d", "r", entry, Matrix([[a, sqrt(2)*j], [sqrt(2)*j, a]]))
    assert changed.status == "changed" and "[1, 1]" in changed.diff
    shape = compare_entry("d", "r", entry, Matrix([[a, 0]]))
    assert shape.status == "changed" and "stored a 2x2 matrix, now a 1x2 matrix" in shape.diff

    entry = _entry(tmp_path, (j, {"upper": a, "lower": -a}, {Rational(3, 2): a}))
    same = (j, {"lower": -a, "upper": a}, {Rational(3, 2): a})
    assert compare_entry("d", "r", entry, same).status == "identical"
    assert compare_entry("d", "r", entry, (j, {"upper": a, "lower": a},
                                            {Rational(3, 2): a})).status == "changed"
    wrong_key = compare_entry("d", "r", entry, (j, {"upper": a, "lower": -a}, {2: a}))
    assert wrong_key.status == "changed" and "key 3/2 is stored" in wrong_key.diff
    assert compare_entry("d", "r", entry, (j,)).status == "changed"


def test_a_hand_typed_decimal_equals_its_rational(tmp_path):
    path = tmp_path / "deriv_h.results.toml"
    path.write_text('format = "amalgebra-results-2"\n[d]\nnu = 72.222\nmu = "0.5*a"\n')
    stored = load_results(path)["d"]
    # 72.222 = 36111/500 exactly (arithmetic, common practice, no source)
    nu = compare_entry("d", "nu", stored["nu"], Rational(36111, 500))
    assert (nu.status, nu.method) in (("identical", "text"), ("reprinted", "structure"))
    assert compare_entry("d", "mu", stored["mu"], a/2).status == "reprinted"
    assert compare_entry("d", "nu", stored["nu"], Rational(72222, 1001)).status == "changed"


def test_an_unreadable_entry_is_its_own_status(tmp_path):
    path = tmp_path / "deriv_u.results.toml"
    path.write_text('format = "amalgebra-results-2"\n[d]\nok = "j"\nbad = "j +* 1"\n'
                    'worse = { tuple = ["1", "eval(j)"] }\n')
    stored = load_results(path)

    @derivation
    def d(steps):
        steps.result("ok", j)
        steps.result("bad", j + 1)
        steps.result("worse", (1, j))

    got = [(x.result, x.status, x.line) for x in compare_record(d.run(), stored["d"])]
    assert got == [("ok", "identical", 3), ("bad", "unreadable", 4), ("worse", "unreadable", 5)]
    messages = [x.diff for x in compare_record(d.run(), stored["d"]) if x.status == "unreadable"]
    assert messages[0].strip().startswith(f"{path}:4:")
    assert messages[1].strip().startswith(f"{path}:5:")


def test_compare_record_unrecorded_and_stale():
    x, y = symbols("x y")

    @derivation
    def two(steps):
        steps.result("kept", x + 1)
        steps.result("new", y)

    rec = two.run()
    assert [c.status for c in compare_record(rec, None)] == ["unrecorded", "unrecorded"]
    stored = {"kept": StoredEntry("x + 1", parse("x + 1"), 3),
              "gone": StoredEntry("2", parse("2"), 4)}
    got = [(c.result, c.status, c.line) for c in compare_record(rec, stored)]
    assert got == [("kept", "identical", 3), ("new", "unrecorded", None), ("gone", "stale", 4)]


@pytest.mark.parametrize("seconds", [0.2])
def test_the_timer_restores_an_outer_alarm(seconds):
    import signal

    if not hasattr(signal, "setitimer"):
        pytest.skip("needs setitimer")
    fired = []
    previous = signal.signal(signal.SIGALRM, lambda *args: fired.append(1))
    try:
        signal.setitimer(signal.ITIMER_REAL, 30)
        decide_equal(sin(j)**2, 1 - cos(j)**2, budget=Budget(seconds=seconds))
        left = signal.getitimer(signal.ITIMER_REAL)[0]
        assert 0 < left <= 30 and not fired     # the outer timer runs on, with its time
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, previous)
