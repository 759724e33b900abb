"""Reductions written as derivation steps: one step per rule, checked, rendered as LaTeX."""

from sympy import symbols

from amalgebra.coupling import Coupling6j as SJ
from amalgebra.coupling import Coupling3j as TJ
from amalgebra.derivations import derivation, derivation_latex
from amalgebra.derivations.checks import check_equality
from amalgebra.racah import momentum_sum, projection_sum, reduce_racah_sum, reduction_steps
from amalgebra.racah.steps import register_step_check

a, b, c, d, p, q, x = symbols("a b c d p q x")
m1, m2, m3 = symbols("m1 m2 m3")


def test_each_rule_is_one_checked_step_and_renders():
    # Racah's sum rule (Edmonds 1957, eq. 6.2.11; from memory)
    s = momentum_sum((-1) ** (p + q + x) * (2 * x + 1) * SJ(a, b, x, c, d, p) * SJ(a, b, x, d, c, q), x)
    red = reduce_racah_sum(s)

    @derivation(title="Racah")
    def racah(dd):
        reduction_steps(dd, red, "r")

    rec = racah.run()
    assert rec.ok, rec.error
    assert [st.name.split("_", 2)[2] for st in rec.steps] == [st.rule.replace(" ", "_") for st in red.steps]
    assert rec.steps[0].lhs == s and rec.steps[-1].rhs == red.result
    assert all(st.passed and not st.exact for st in rec.steps if st.checks[0].method == "numeric")
    assert "direct summation" in rec.steps[0].status
    tex = derivation_latex(rec)
    assert "\\begin{Bmatrix}" in tex and "completeness" in tex


def test_the_step_check_refuses_a_wrong_step():
    register_step_check()
    s = projection_sum(TJ(a, b, c, m1, m2, m3) ** 2, m1, m2, m3)
    wrong = check_equality(s, 2 * reduce_racah_sum(s).result, seed="w")
    assert not wrong[0].passed and wrong[0].method == "numeric"
    right = check_equality(s, reduce_racah_sum(s).result, seed="r")
    assert right[0].passed and not right[0].exact
