"""Tests of derivation records and of how steps are checked (amalgebra.derivations.record/checks)."""

import pytest
from sympy import I, Matrix, Rational, atan, cos, pi, sin, symbols

from amalgebra.derivations import check_equality, derivation
from amalgebra.errors import DerivationStepError

x = symbols("x")
p = symbols("p", positive=True)


def test_steps_results_and_chain():
    @derivation(title="Chain")
    def chain(d):
        "A short chain."
        d.step("first", (x + 1)**2 - 1, x**2 + 2*x, "expand")  # common practice, no source
        d.then("second", x*(x + 2), "factor")
        d.result("value", x*(x + 2))

    rec = chain.run()
    assert rec.ok and rec.error is None
    assert [s.name for s in rec.steps] == ["first", "second"]
    assert [s.continued for s in rec.steps] == [False, True]
    assert rec.steps[1].lhs == x**2 + 2*x
    assert rec.title == "Chain" and rec.description == "A short chain."
    assert list(rec.results) == ["value"]
    assert all(s.exact for s in rec.steps) and rec.numeric_steps == []


def test_broken_step_is_caught_with_its_name_and_both_sides():
    @derivation
    def broken(d):
        d.step("fine", sin(x)**2 + cos(x)**2, 1, "Pythagoras")  # common practice, no source
        d.step("wrong_sign", (x - 1)**2, x**2 + 2*x + 1, "deliberately wrong")
        d.step("never_reached", x, x, "not run after a failure")

    rec = broken.run()
    assert not rec.ok
    assert isinstance(rec.error, DerivationStepError)
    message = str(rec.error)
    assert "'wrong_sign'" in message and "'broken'" in message
    assert "lhs = (x - 1)**2" in message and "rhs = x**2 + 2*x + 1" in message
    assert [s.name for s in rec.steps] == ["fine", "wrong_sign"]
    assert isinstance(rec.error, AssertionError)  # DerivationStepError is an AssertionError


def test_numeric_fallback_is_never_reported_exact():
    # atan(p) + atan(1/p) = pi/2 for p > 0 (common practice, no source); simplify cannot
    # prove it in sympy 1.14, so the step must say "checked numerically".
    checks = check_equality(atan(p) + atan(1/p), pi/2, seed="s")
    assert [c.method for c in checks] == ["numeric"]
    assert checks[0].passed and not checks[0].exact
    assert checks[0].summary().startswith("checked numerically (6 random points, tolerance")

    @derivation
    def arctan(d):
        d.step("complement", atan(p) + atan(1/p), pi/2, "right triangle")

    rec = arctan.run()
    assert rec.ok and rec.numeric_steps == ["complement"]
    assert not rec.steps[0].exact

    @derivation
    def arctan_exact(d):
        d.step("complement", atan(p) + atan(1/p), pi/2, "right triangle", exact=True)

    rec = arctan_exact.run()
    assert isinstance(rec.error, DerivationStepError)


def test_numeric_fallback_rejects_a_false_statement():
    # atan(x) + atan(1/x) = pi/2 is false for x < 0 (common practice, no source)
    q = symbols("q", negative=True)
    (check,) = check_equality(atan(q) + atan(1/q), pi/2, seed="neg")
    assert not check.passed and check.method == "numeric"


def test_operator_steps_use_the_canonical_form():
    from amalgebra.algebra import AngularMomentum

    J = AngularMomentum("J")
    (check,) = check_equality(J.x*J.y - J.y*J.x, I*J.z)  # Sakurai (3.1.20), [Jx, Jy] = i Jz
    assert (check.method, check.passed, check.exact) == ("canonical", True, True)
    (check,) = check_equality(J.x*J.y, J.y*J.x)
    assert not check.passed
    checks = check_equality(J.plus*J.minus, J.squared - J.z**2 + J.z,
                            also_at=[{"J": Rational(1, 2)}, {"J": 2}])
    assert [c.summary() for c in checks] == [
        "exact (canonical form)", "exact (matrices at J=1/2)", "exact (matrices at J=2)"]
    with pytest.raises(TypeError, match="also_at"):
        check_equality(x, x, also_at=[{"J": 1}])


def test_representation_steps_use_exact_matrices():
    from amalgebra.algebra import AngularMomentum

    J = AngularMomentum("J")
    # spin 1/2: Jz^2 = 1/4 (common practice, no source); false for spin 1
    (check,) = check_equality(J.z**2, Rational(1, 4), j={"J": Rational(1, 2)})
    assert (check.method, check.passed, check.exact) == ("matrices", True, True)
    assert check.summary() == "exact (matrices at J=1/2)"
    (check,) = check_equality(J.z**2, Rational(1, 4), j={"J": 1})
    assert not check.passed


def test_matrix_statements():
    # a 2x2 rotation composed with its inverse (common practice, no source)
    R = Matrix([[cos(x), -sin(x)], [sin(x), cos(x)]])
    (check,) = check_equality(R*R.T, Matrix.eye(2))
    assert check.passed and check.exact
    (check,) = check_equality(R*R, Matrix.eye(2))
    assert not check.passed


@pytest.mark.parametrize("bad_name", ["has space", "1st", "", "a-b", None])
def test_names_must_be_identifiers(bad_name):
    @derivation
    def named(d):
        d.step(bad_name, x, x, "trivial")

    assert isinstance(named.run().error, ValueError)


def test_duplicate_names_and_multiline_justification_are_refused():
    @derivation
    def dup(d):
        d.step("a", x, x, "trivial")
        d.step("a", x, x, "again")

    assert "unique" in str(dup.run().error)

    @derivation
    def multiline(d):
        d.step("a", x, x, "two\nlines")

    assert "one-line" in str(multiline.run().error)

    @derivation
    def dup_result(d):
        d.result("r", x)
        d.result("r", x)

    assert "unique" in str(dup_result.run().error)

    @derivation
    def then_first(d):
        d.then("a", x, "no previous step")

    assert "previous step" in str(then_first.run().error)


def test_wrong_types_are_refused():
    with pytest.raises(TypeError, match="lhs='x' must be a SymPy expression"):
        check_equality("x", x)

    @derivation
    def text_result(d):
        d.result("r", "x + 1")

    assert isinstance(text_result.run().error, TypeError)


def test_results_the_store_cannot_hold_are_refused_at_once():
    from sympy import Float

    from amalgebra.errors import ParseError

    @derivation
    def floating(d):
        d.result("approx", Float("0.5")*x)

    error = floating.run().error
    assert isinstance(error, ParseError)
    assert str(error).startswith("result 'approx' cannot be stored: expr=0.5")


def test_matrix_tuple_and_dict_results_are_accepted_and_frozen():
    from sympy import ImmutableMatrix

    @derivation
    def kinds(d):
        d.result("H", Matrix([[x, 1], [1, -x]]))
        d.result("pair", [x, Matrix([[1]])])
        d.result("table", {"upper": x, "lower": (x, 2)})

    rec = kinds.run()
    assert rec.ok, rec.error
    assert isinstance(rec.results["H"], ImmutableMatrix) and rec.results["H"] == Matrix([[x, 1], [1, -x]])
    assert rec.results["pair"] == (x, ImmutableMatrix([[1]])) and isinstance(rec.results["pair"], tuple)
    assert rec.results["table"] == {"upper": x, "lower": (x, 2)}

    @derivation
    def text(d):
        d.result("r", {"a": "x + 1"})

    assert "cannot be stored" in str(text.run().error)
