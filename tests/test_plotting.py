"""Tests of amalgebra.plotting: numeric level curves, their quantum-number labels, the drawn figure.

Values are checked against an independent route (numpy.linalg.eigvalsh of the float
matrix from amalgebra.matrices.explicit.to_matrix in the product basis) and against published
closed forms; the figure is checked through its artists (lines, legend, labels, texts).
Under CI=true a missing matplotlib is a failure, not a skip.
"""

import sys

import numpy as np
import pytest
from sympy import Rational, Symbol, sqrt

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.errors import NotNumericError, StateError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.plotting import energy_levels, level_diagram, plot_levels
from amalgebra.states import hamiltonian_matrix
from amalgebra.testing.external import require_tool

I_, J_ = AngularMomentum("I"), AngularMomentum("J")
A, b, gJ = Symbol("A", positive=True), Symbol("b", real=True), Symbol("g_J")


def _matplotlib():
    try:
        import matplotlib  # noqa: F401
    except ModuleNotFoundError:
        matplotlib = None
    require_tool(matplotlib is not None, "matplotlib (pip install 'amalgebra[plot]')")


def _hyperfine(basis="coupled", i="3/2"):
    """A I.J + b gJ Jz for an invented atom with J = 1/2 (a Breit-Rabi system)."""
    op = A*dot(I_, J_) + b*gJ*J_.z
    return op, {"I": i, "J": "1/2"}, hamiltonian_matrix(op, {"I": i, "J": "1/2"}, basis=basis)


FIELDS = np.linspace(0.0, 3.0, 31)
PARAMS = {A: 0.8, gJ: 2.0}


@pytest.mark.parametrize("basis", ["coupled", "uncoupled"])
def test_levels_equal_numpy_eigenvalues_of_the_product_basis_matrix(basis):
    op, js, hm = _hyperfine(basis)
    curves = energy_levels(hm, b, FIELDS, parameters=PARAMS)
    assert len(curves.levels) == 8
    for k, value in enumerate(FIELDS):
        # independent route: float matrix in the product basis, numpy's Hermitian eigensolver
        mat = to_matrix(op, js, kind="float", subs={**PARAMS, b: value})
        expected = np.linalg.eigvalsh(np.asarray(mat, dtype=complex))
        ours = np.sort([lv.energies[k] for lv in curves.levels])
        assert np.allclose(ours, expected, atol=1e-10)


def test_labels_follow_the_breit_rabi_formula():
    # Breit and Rabi, Phys. Rev. 38, 2082 (1931), with gI = 0:
    # E(F = I +- 1/2, M) = -dW/(2(2I+1)) +- (dW/2) sqrt(1 + 4 M x/(2I+1) + x^2), x = gJ b/dW
    _, _, hm = _hyperfine("coupled")
    curves = energy_levels(hm, b, FIELDS, parameters=PARAMS)
    i = Rational(3, 2)
    dw = PARAMS[A]*(2*i + 1)/2
    seen = set()
    for lv in curves.levels:
        F, M = lv.numbers["F"], lv.numbers["M"]
        seen.add((F, M))
        sign = 1 if F == i + Rational(1, 2) else -1
        for value, energy in zip(FIELDS, lv.energies):
            x = PARAMS[gJ]*value/dw
            if abs(M) == i + Rational(1, 2):            # stretched: sqrt((1 +- x)^2) = 1 +- x
                root = 1 + (x if M > 0 else -x)
            else:
                root = sqrt(1 + 4*M*x/(2*i + 1) + x**2)
            expected = -dw/(2*(2*i + 1)) + sign*dw/2*root
            assert abs(float(expected) - energy) < 1e-9, (F, M, value)
    assert seen == {(2, m) for m in range(-2, 3)} | {(1, m) for m in range(-1, 2)}


def test_labels_are_read_where_asked_and_conserved_numbers_come_from_blocks():
    # strong field, uncoupled basis: the eigenvectors tend to |m_I>|m_J> (Paschen-Back regime;
    # common practice, no source), so m_I + m_J = M and the upper half has m_J = +1/2
    _, _, hm = _hyperfine("uncoupled")
    curves = energy_levels(hm, b, np.linspace(0.0, 200.0, 11), parameters=PARAMS, label_at=200.0)
    for lv in curves.levels:
        assert lv.numbers["m_I"] + lv.numbers["m_J"] == lv.numbers["M"]
        assert (lv.energies[-1] > 0) == (lv.numbers["m_J"] > 0)
    assert "F" not in curves.names


def test_a_crossing_keeps_each_label_on_its_curve():
    # two uncoupled levels +b and -b cross at b = 0 (common practice, no source): sorting by
    # energy would swap them there, following the eigenvectors does not
    fields = np.linspace(-1.0, 1.0, 21)
    curves = energy_levels(lambda v: np.diag([v, -v]), b, fields, label_at=-1.0,
                           basis_numbers=[{"s": "up"}, {"s": "down"}])
    by_label = {lv.numbers["s"]: lv.energies for lv in curves.levels}
    assert np.allclose(by_label["up"], fields) and np.allclose(by_label["down"], -fields)


def test_a_plain_sympy_matrix_is_accepted():
    from sympy import Matrix

    mat = Matrix([[b, 1], [1, -b]])                 # eigenvalues +-sqrt(b^2 + 1): common practice
    curves = energy_levels(mat, b, [0.0, 2.0])
    top = max(curves.levels, key=lambda lv: lv.energies[1])
    assert np.allclose(top.energies, [1.0, np.sqrt(5.0)])


def test_errors():
    _, _, hm = _hyperfine("coupled", i="1/2")
    with pytest.raises(NotNumericError, match="give values for A, g_J"):
        energy_levels(hm, b, [0.0])
    with pytest.raises(StateError, match="must be a non-empty sequence"):
        energy_levels(hm, b, [], parameters=PARAMS)
    with pytest.raises(NotNumericError, match="must be the SymPy symbol of the field"):
        energy_levels(hm, "b", [0.0], parameters=PARAMS)
    with pytest.raises(StateError, match="must be Hermitian"):
        energy_levels(lambda v: np.array([[0.0, 1.0], [0.0, v]]), b, [0.0])
    with pytest.raises(StateError, match="one dict per basis state"):
        energy_levels(lambda v: np.eye(2), b, [0.0], basis_numbers=[{}])


def test_plot_artists_labels_and_legend():
    _matplotlib()
    _, _, hm = _hyperfine("coupled")
    ax, curves = level_diagram(hm, b, FIELDS, parameters=PARAMS, field_label=r"$\mu_B B/h$",
                               energy_unit="MHz", title="an invented atom")
    lines = ax.get_lines()
    assert len(lines) == 8 == len(curves.levels)
    for line, lv in zip(lines, curves.levels):
        assert np.array_equal(line.get_xdata(), FIELDS) and np.array_equal(line.get_ydata(), lv.energies)
    legend = [t.get_text() for t in ax.get_legend().get_texts()]
    assert legend == ["F = 2", "F = 1"]
    # one colour per F
    colours = {}
    for line, lv in zip(lines, curves.levels):
        colours.setdefault(lv.numbers["F"], set()).add(line.get_color())
    assert all(len(c) == 1 for c in colours.values()) and colours[2] != colours[1]
    assert ax.get_xlabel() == r"$\mu_B B/h$ (MHz)" and ax.get_ylabel() == "$E/h$ (MHz)"
    assert ax.get_title() == "an invented atom"
    texts = sorted(t.get_text() for t in ax.texts)
    assert texts == sorted(f"M = {lv.numbers['M']}" for lv in curves.levels)
    assert texts.count("M = -1") == 2 and texts.count("M = -2") == 1   # F = 2, 1 and F = 2


def test_plot_options_and_a_given_axes(tmp_path):
    _matplotlib()
    from matplotlib.figure import Figure

    _, _, hm = _hyperfine("coupled", i="1/2")
    ax = Figure().subplots()
    out, _ = level_diagram(hm, b, [0.0, 1.0], parameters=PARAMS, ax=ax, color_by=None,
                           annotate=("F", "M"), field_unit="T", energy_unit="GHz")
    assert out is ax and ax.get_legend() is None
    assert ax.get_xlabel() == "$b$ (T)"
    assert sorted(t.get_text() for t in ax.texts)[0] == "F = 0, M = 0"
    path = tmp_path / "levels.png"
    ax.figure.savefig(path)
    assert path.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_missing_matplotlib_is_a_clear_error(monkeypatch):
    for name in sorted(sys.modules):
        if name == "matplotlib" or name.startswith("matplotlib."):
            monkeypatch.setitem(sys.modules, name, None)
    monkeypatch.setitem(sys.modules, "matplotlib", None)
    _, _, hm = _hyperfine("coupled", i="1/2")
    curves = energy_levels(hm, b, [0.0, 1.0], parameters=PARAMS)   # numbers need no matplotlib
    with pytest.raises(ModuleNotFoundError, match=r"pip install 'amalgebra\[plot\]'"):
        plot_levels(curves)
