"""Exact printed strings of operators (str, LaTeX, pretty)."""

import pytest
from sympy import Symbol, latex, pretty, sstr

from amalgebra.algebra import AngularMomentum, canonical

J, L1 = AngularMomentum("J"), AngularMomentum("L1")
a = Symbol("a")


@pytest.mark.parametrize("expr, text", [
    (J.x,                          "J.x"),
    (J.plus * J.minus,             "J.plus*J.minus"),
    (J.squared**2,                 "(J.squared)**2"),  # issue 15: J.squared has a power's precedence
    (a * J.z**3,                   "a*J.z**3"),
    (J,                            "AngularMomentum('J')"),
    (canonical(J.plus * J.minus),  "J.squared + J.z - J.z**2"),
])
def test_str(expr, text):
    assert sstr(expr) == text


@pytest.mark.parametrize("expr, tex", [
    (J.x,                    r"J_{x}"),
    (J.plus**2,              r"J_{+}^{2}"),
    (J.minus,                r"J_{-}"),
    (J.squared,              r"J^{2}"),  # issue 15: a lone Casimir has no parentheses
    (J.squared**3,           r"\left(J^{2}\right)^{3}"),
    (L1.z,                   r"L_{1z}"),
    (a * J.y * J.z,          r"a J_{y} J_{z}"),
    (J,                      r"\mathbf{J}"),
])
def test_latex(expr, tex):
    assert latex(expr) == tex


def test_latex_superscripts_protected_without_parentheses_setting():
    # issue 15: J.squared has the precedence of a power, so SymPy's Pow printer
    # parenthesizes it under any setting (never the double superscript J^{2}^{2})
    assert latex(J.squared**2, parenthesize_super=False) == r"\left(J^{2}\right)^{2}"


@pytest.mark.parametrize("expr, tex", [
    (L1.plus,                r"L_{1+}"),
    (L1.squared,             r"L_{1}^{2}"),
    (L1.squared**3,          r"\left(L_{1}^{2}\right)^{3}"),
    (L1.z**2,                r"L_{1z}^{2}"),
    (2*J.squared*J.z,        r"2 J^{2} J_{z}"),
])
def test_latex_label_digits_are_subscripts(expr, tex):
    # issue 15: I1 prints I_{1}; the component joins the digit's subscript
    assert latex(expr) == tex


@pytest.mark.parametrize("expr, text", [
    (J.x,            "J_x"),
    (J.plus,         "J_+"),
    (J.squared,      " 2\nJ "),
])
def test_pretty_ascii(expr, text):
    assert pretty(expr, use_unicode=False) == text


def test_pretty_unicode():
    assert pretty(J.x, use_unicode=True) == "Jₓ"
    assert pretty(J.minus, use_unicode=True) == "J₋"
