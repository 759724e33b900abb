"""Fixtures for the derivation tests: small derivation files written into a temporary folder."""

import textwrap

import pytest

GOOD_SOURCE = textwrap.dedent('''
    """Two small derivations about an invented rotor (common practice, no source)."""
    from sympy import Rational, cos, sin, symbols
    from amalgebra.derivations import derivation

    @derivation(title="Binomial square")
    def binomial(d):
        """Square of a sum, then a value at x = 1/2."""
        x = symbols("x")
        d.step("expand", (x + 1)**2, x**2 + 2*x + 1, "binomial theorem")
        d.then("factor_back", (x + 1)*(x + 1), "read backwards")
        d.result("square", (x + 1)**2)
        d.result("at_half", ((x + 1)**2).subs(x, Rational(1, 2)))

    @derivation
    def pythagoras(d):
        t = symbols("theta")
        d.step("unit", sin(t)**2 + cos(t)**2, 1, "Pythagoras with 100% & $\\\\theta$")
        d.result("one", sin(t)**2 + cos(t)**2)
''')

BROKEN_SOURCE = textwrap.dedent('''
    from sympy import symbols
    from amalgebra.derivations import derivation

    @derivation
    def sign_slip(d):
        x = symbols("x")
        d.step("good", x*(x - 1), x**2 - x, "distribute")
        d.step("bad_square", (x - 1)**2, x**2 + 2*x + 1, "a deliberate sign slip")
''')


@pytest.fixture
def make_folder(tmp_path):
    """make_folder({"deriv_a.py": source, ...}) -> folder path."""

    def make(files):
        for name, text in files.items():
            (tmp_path / name).write_text(text, encoding="utf-8")
        return tmp_path

    return make


@pytest.fixture
def good_source():
    return GOOD_SOURCE


@pytest.fixture
def broken_source():
    return BROKEN_SOURCE
