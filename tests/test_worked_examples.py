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
    from amalgebra.numeric import to_matrix

    vals = zeeman.PLOT_VALUES
    subs = {zeeman.A: vals["A"], zeeman.gJ: vals["gJ"], zeeman.gI: vals["gI"], zeeman.b: field}
    h = to_matrix(zeeman.hamiltonian(), {"I": zeeman.I_SPIN, "J": zeeman.J_SPIN},
                  kind="float", subs=subs)
    return np.sort(np.linalg.eigvalsh(np.asarray(h, dtype=complex)))


@pytest.mark.parametrize("field", [0.0, 0.7, 2.804, 12.0])   # x = (gJ - gI) b / dW is 1 near b = 2.804
def test_level_curves_match_numpy_diagonalisation(zeeman, field):
    # independent check: numpy.linalg.eigvalsh of the 12 x 12 matrix
    curves = zeeman.level_curves([field])
    assert len(curves) == 12
    ours = np.sort([row[0] for row in curves.values()])
    assert np.allclose(ours, _numpy_levels(zeeman, field), atol=1e-9)


def test_level_curves_zero_field_groups(zeeman):
    # common practice, no source: 7 states at 5A/4 (F = 3), 5 at -7A/4 (F = 2)
    a = zeeman.PLOT_VALUES["A"]
    curves = zeeman.level_curves([0.0])
    upper = [row[0] for (F, _), row in curves.items() if F == 3]
    lower = [row[0] for (F, _), row in curves.items() if F == 2]
    assert len(upper) == 7 and len(lower) == 5
    assert np.allclose(upper, 1.25*a) and np.allclose(lower, -1.75*a)


def test_level_plot_writes_png(zeeman, tmp_path):
    pytest.importorskip("matplotlib")
    out = zeeman.write_level_plot(tmp_path / "levels.png", fields=[0.0, 1.0, 2.0])
    data = Path(out).read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) > 1000


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
