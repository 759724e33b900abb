"""Tests of the helpers in the worked examples (the level plot) and of the folder as a whole.

The derivations themselves are checked by the pytest plugin (``pytest worked_examples``)
and by ``amalgebra check``; here we test what those do not: the numeric level curves
behind the Breit-Rabi plot, the optional matplotlib gate, and that the folder check
passes with every result recorded.
"""

import importlib.util
import sys
from pathlib import Path

import numpy as np
import pytest

ROOT = Path(__file__).resolve().parents[1]
FOLDER = ROOT / "worked_examples"


def _load(name):
    path = FOLDER / f"{name}.py"
    spec = importlib.util.spec_from_file_location(f"_worked_{name}", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


@pytest.fixture(scope="module")
def zeeman():
    return _load("deriv_hyperfine_zeeman")


def _numpy_levels(zeeman, field):
    """Eigenvalues of the float Hamiltonian matrix, diagonalised by numpy (independent of
    the Breit-Rabi formula used for the curves)."""
    from amalgebra.matrices.explicit import to_matrix

    vals = zeeman.PLOT_VALUES
    subs = {zeeman.A: vals["A"], zeeman.gJ: vals["gJ"], zeeman.gI: vals["gI"], zeeman.b: field}
    h = to_matrix(zeeman.hamiltonian(), {"I": zeeman.I_SPIN, "J": zeeman.J_SPIN},
                  kind="float", subs=subs)
    return np.sort(np.linalg.eigvalsh(np.asarray(h, dtype=complex)))


@pytest.mark.parametrize("field", [0.0, 0.7, 2.804, 12.0])   # x = (gJ - gI) b / dW is 1 near b = 2.804
def test_level_curves_match_numpy_diagonalisation(zeeman, field):
    # independent check: numpy.linalg.eigvalsh of the 12 x 12 matrix
    curves = zeeman.level_curves([field])
    assert len(curves.levels) == 12
    ours = np.sort([lv.energies[0] for lv in curves.levels])
    assert np.allclose(ours, _numpy_levels(zeeman, field), atol=1e-9)


def test_level_labels_follow_the_breit_rabi_branches(zeeman):
    # Breit and Rabi, Phys. Rev. 38, 2082 (1931): the F = 3 levels lie on the upper branch,
    # F = 2 on the lower, stretched M = -3 on the upper branch with sqrt((1 - x)^2) = 1 - x.
    from sympy import lambdify

    fields = [0.1*k for k in range(61)]                 # through x = 1 near b = 2.8
    curves = zeeman.level_curves(fields)
    vals = zeeman.PLOT_VALUES
    subs = {zeeman.A: vals["A"], zeeman.gJ: vals["gJ"], zeeman.gI: vals["gI"]}
    assert sorted((int(lv.numbers["F"]), lv.numbers["M"]) for lv in curves.levels) == sorted(
        [(3, m) for m in range(-3, 4)] + [(2, m) for m in range(-2, 3)])
    for lv in curves.levels:
        F, m = int(lv.numbers["F"]), lv.numbers["M"]
        if abs(m) == 3:
            x = zeeman.X.subs(subs)
            formula = (-zeeman.DW/(2*(2*zeeman.I_SPIN + 1)) + zeeman.gI*zeeman.b*m
                       + zeeman.DW/2*(1 + (x if m > 0 else -x)))
        else:
            formula = zeeman.breit_rabi(1 if F == 3 else -1, m)
        f = lambdify(zeeman.b, formula.subs(subs).subs(zeeman.M, m), "numpy")
        expected = np.array([float(f(v)) for v in fields])
        assert np.allclose(lv.energies, expected, atol=1e-9), (F, m)


def test_level_curves_zero_field_groups(zeeman):
    # common practice, no source: 7 states at 5A/4 (F = 3), 5 at -7A/4 (F = 2)
    a = zeeman.PLOT_VALUES["A"]
    curves = zeeman.level_curves([0.0])
    upper = [lv.energies[0] for lv in curves.levels if lv.numbers["F"] == 3]
    lower = [lv.energies[0] for lv in curves.levels if lv.numbers["F"] == 2]
    assert len(upper) == 7 and len(lower) == 5
    assert np.allclose(upper, 1.25*a) and np.allclose(lower, -1.75*a)


def test_level_plot_writes_png(zeeman, tmp_path):
    pytest.importorskip("matplotlib")
    out = zeeman.write_level_plot(tmp_path / "levels.png", fields=[0.0, 1.0, 2.0])
    data = Path(out).read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) > 1000


def test_level_plot_is_drawn_by_the_library_with_labels(zeeman, tmp_path, monkeypatch):
    pytest.importorskip("matplotlib")
    import amalgebra.plotting

    drawn = []
    real = amalgebra.plotting.plot_levels
    monkeypatch.setattr(amalgebra.plotting, "plot_levels",
                        lambda *a, **k: drawn.append(real(*a, **k)) or drawn[-1])
    zeeman.write_level_plot(tmp_path / "levels.png", fields=[0.0, 1.0, 2.0])
    (ax,) = drawn
    assert len(ax.get_lines()) == 12
    assert [t.get_text() for t in ax.get_legend().get_texts()] == ["F = 3", "F = 2"]
    assert ax.get_ylabel() == "$E/h$ (GHz)" and ax.get_xlabel() == r"$\mu_B B/h$ (GHz)"
    assert sorted(t.get_text() for t in ax.texts).count("M = 2") == 2   # F = 3 and F = 2


@pytest.mark.parametrize("arg", ["--help", "-h"])
def test_script_help_writes_no_file(tmp_path, arg):
    import subprocess

    done = subprocess.run([sys.executable, str(FOLDER / "deriv_hyperfine_zeeman.py"), arg],
                          cwd=tmp_path, capture_output=True, text=True, check=False)
    assert done.returncode == 0 and "usage: deriv_hyperfine_zeeman.py" in done.stdout
    assert list(tmp_path.iterdir()) == []


def test_script_rejects_an_output_that_is_not_an_image(tmp_path):
    import subprocess

    done = subprocess.run([sys.executable, str(FOLDER / "deriv_hyperfine_zeeman.py"), "notes.txt"],
                          cwd=tmp_path, capture_output=True, text=True, check=False)
    assert done.returncode == 2 and "must end in .png, .pdf or .svg" in done.stderr
    assert list(tmp_path.iterdir()) == []


def _hide_matplotlib(monkeypatch):
    """Make every ``import matplotlib...`` fail, as if the extra were not installed."""
    for name in sorted(sys.modules):
        if name == "matplotlib" or name.startswith("matplotlib."):
            monkeypatch.setitem(sys.modules, name, None)
    monkeypatch.setitem(sys.modules, "matplotlib", None)


def test_level_plot_without_matplotlib(zeeman, tmp_path, monkeypatch):
    _hide_matplotlib(monkeypatch)
    with pytest.raises(ModuleNotFoundError, match=r"amalgebra\[plot\]"):
        zeeman.write_level_plot(tmp_path / "levels.png")
    assert not (tmp_path / "levels.png").exists()


def test_derivations_import_without_matplotlib(monkeypatch):
    _hide_matplotlib(monkeypatch)
    module = _load("deriv_hyperfine_zeeman")
    assert module.zero_field_levels.run().ok


@pytest.mark.slow
def test_whole_folder_checks_clean():
    from amalgebra.derivations import run_folder

    outcome = run_folder(FOLDER)
    assert outcome.exit_code == 0
    assert all(rec.ok for rec in outcome.records)
