"""Tests of running, checking and recording folders (amalgebra.derivations.runner)."""

import os
import subprocess
import sys
import textwrap
from pathlib import Path

from amalgebra.derivations.runner import (
    EXIT_FAILED, EXIT_OK, EXIT_UNRECORDED, discover, record_folder, run_folder,
)
from amalgebra.derivations.store import load_results


def test_discover_sorted_and_recursive(make_folder):
    folder = make_folder({"deriv_b.py": "", "deriv_a.py": "", "other.py": "", "test_x.py": ""})
    (folder / "sub").mkdir()
    (folder / "sub" / "deriv_c.py").write_text("")
    assert [p.relative_to(folder).as_posix() for p in discover(folder)] == [
        "deriv_a.py", "deriv_b.py", "sub/deriv_c.py"]
    assert discover(folder / "deriv_a.py") == [folder / "deriv_a.py"]


def test_unrecorded_then_recorded_then_changed(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    first = run_folder(folder)
    assert first.exit_code == EXIT_UNRECORDED
    assert {c.status for c in first.comparisons} == {"unrecorded"}
    assert not (folder / "deriv_good.results.toml").exists()  # check never writes

    assert record_folder(folder).exit_code == EXIT_OK
    stored = load_results(folder / "deriv_good.results.toml")
    assert {k: e.text for k, e in stored["binomial"].items()} == {
        "square": "(x + 1)^2", "at_half": "9/4"}   # (3/2)^2 = 9/4, common practice
    assert run_folder(folder).exit_code == EXIT_OK

    # a reviewer's hand edit that changes a value is reported, with file line
    path = folder / "deriv_good.results.toml"
    path.write_text(path.read_text().replace('"9/4"', '"5/2"'))
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (changed,) = [c for c in out.comparisons if c.status == "changed"]
    assert (changed.derivation, changed.result, changed.stored_text) == ("binomial", "at_half", "5/2")
    assert changed.line == 7


def test_failing_step_fails_the_run_and_is_not_recorded(make_folder, good_source, broken_source):
    folder = make_folder({"deriv_good.py": good_source, "deriv_broken.py": broken_source})
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (bad,) = [r for r in out.records if not r.ok]
    assert bad.name == "sign_slip" and "'bad_square'" in str(bad.error)
    rec = record_folder(folder)
    assert rec.exit_code == EXIT_FAILED
    assert not (folder / "deriv_broken.results.toml").exists()
    assert (folder / "deriv_good.results.toml").exists()


def test_record_only_keeps_other_entries_and_full_record_drops_stale(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    record_folder(folder)
    path = folder / "deriv_good.results.toml"
    path.write_text(path.read_text().replace('"9/4"', '"5/2"') + '\n[removed]\nold = "1"\n')
    out = run_folder(folder)
    assert sorted(c.status for c in out.comparisons if not c.passed) == ["changed", "stale"]
    record_folder(folder, only=["pythagoras"])
    text = path.read_text()
    assert '"5/2"' in text and "[removed]" in text  # untouched: not selected
    record_folder(folder)
    text = path.read_text()
    assert '"9/4"' in text and "[removed]" not in text
    assert run_folder(folder).exit_code == EXIT_OK


def test_load_error_and_malformed_store_fail(make_folder, good_source):
    folder = make_folder({"deriv_syntax.py": "def broken(:\n"})
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED and isinstance(out.files[0].load_error, SyntaxError)
    folder = make_folder({"deriv_good.py": good_source})
    (folder / "deriv_good.results.toml").write_text('format = "amalgebra-results-1"\n[x]\ny = "os.system(1)"\n')
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (good,) = [f for f in out.files if f.name == "deriv_good.py"]
    assert str(good.store_error).startswith(f"{folder / 'deriv_good.results.toml'}:3: ")


def test_exact_mode_fails_numeric_only_steps(make_folder):
    source = textwrap.dedent('''
        from sympy import atan, pi, symbols
        from amalgebra.derivations import derivation

        @derivation
        def arctangents(d):
            p = symbols("p", positive=True)
            d.step("complement", atan(p) + atan(1/p), pi/2, "right triangle")
    ''')
    folder = make_folder({"deriv_num.py": source})
    assert run_folder(folder).exit_code == EXIT_OK
    assert run_folder(folder, exact=True).exit_code == EXIT_FAILED


def test_progress_callback(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    seen = []
    run_folder(folder, progress=lambda done, total, label, rec: seen.append((done, total, label)))
    assert seen == [(1, 2, "deriv_good.py::binomial"), (2, 2, "deriv_good.py::pythagoras")]


def test_report_is_byte_identical_under_different_hash_seeds(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    examples = Path(__file__).resolve().parents[2] / "worked_examples"
    script = ("import sys; from amalgebra.derivations import run_folder, report_latex; "
              "[sys.stdout.write(report_latex(run_folder(f).files)) for f in sys.argv[1:]]")
    outputs = set()
    for seed in ("0", "1", "12345"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        done = subprocess.run([sys.executable, "-c", script, str(folder), str(examples)],
                              env=env, capture_output=True, check=False)
        assert done.returncode == 0, done.stderr.decode()[-3000:]
        outputs.add(done.stdout)
    assert len(outputs) == 1
    assert b"\\begin{align}" in outputs.pop()
