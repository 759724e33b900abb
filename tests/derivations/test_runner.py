"""Tests of running, checking and recording folders (amalgebra.derivations.runner)."""

import os
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

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
    store = folder / "deriv_good.results.toml"
    store.write_text('format = "amalgebra-results-1"\n[x]\ny = "os.system(1)"\n')
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (good,) = [f for f in out.files if f.name == "deriv_good.py"]
    assert [c.status for c in good.comparisons if c.derivation == "x"] == ["stale"]


def test_one_unreadable_entry_is_reported_counted_and_fails(make_folder, good_source):
    # issue 15: a hand-typed decimal no longer spoils the file; a broken entry is one error
    folder = make_folder({"deriv_good.py": good_source})
    record_folder(folder)
    store = folder / "deriv_good.results.toml"
    text = store.read_text()
    store.write_text(text.replace('at_half = "9/4"', 'at_half = "2.25"')
                     .replace('one = "sin(theta)^2 + cos(theta)^2"', 'one = "1 +* 1"'))
    out = run_folder(folder)
    statuses = {(c.derivation, c.result): c.status for c in out.comparisons}
    # 2.25 = 9/4 exactly (arithmetic, common practice, no source)
    assert statuses == {("binomial", "square"): "identical", ("binomial", "at_half"): "reprinted",
                        ("pythagoras", "one"): "unreadable"}
    assert out.exit_code == EXIT_FAILED
    (bad,) = [c for c in out.comparisons if c.status == "unreadable"]
    line = text.splitlines().index('one = "sin(theta)^2 + cos(theta)^2"') + 1
    assert bad.line == line and f"{store}:{line}:" in bad.diff

    from amalgebra.cli import main

    import contextlib
    import io

    buffer = io.StringIO()
    with contextlib.redirect_stdout(buffer):
        code = main(["check", str(folder), "-q"])
    printed = buffer.getvalue()
    assert code == EXIT_FAILED
    assert "pythagoras.one UNREADABLE" in printed and "1 unreadable" in printed
    assert "0 changed" in printed      # and the other results were still compared
    assert "1 identical, 1 reprinted" in printed


def test_a_results_file_that_cannot_be_read_counts_every_result(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    (folder / "deriv_good.results.toml").mkdir()
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    assert [c.status for c in out.comparisons] == ["unreadable"] * 3
    assert "is a directory" in str(out.files[0].store_error)
    assert record_folder(folder).exit_code == EXIT_FAILED   # and record does not write there
    assert (folder / "deriv_good.results.toml").is_dir()


def test_problems_outside_entries_fail_the_run(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    record_folder(folder)
    store = folder / "deriv_good.results.toml"
    store.write_text(store.read_text() + "stray words\n")
    out = run_folder(folder)
    assert out.exit_code == EXIT_FAILED
    (problem,) = out.files[0].store_problems
    assert "expected a comment, a [section] or an entry" in problem and "stray" not in problem


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="needs symbolic links")
def test_record_never_writes_through_a_link(make_folder, good_source, tmp_path_factory):
    folder = make_folder({"deriv_good.py": good_source})
    victim = tmp_path_factory.mktemp("outside") / "victim.txt"
    victim.write_text("precious\n")
    (folder / "deriv_good.results.toml").symlink_to(victim)
    out = record_folder(folder)
    assert out.exit_code == EXIT_FAILED and not out.files[0].recorded
    assert "is a symbolic link" in str(out.files[0].store_error)
    assert victim.read_text() == "precious\n"
    assert run_folder(folder).exit_code == EXIT_FAILED       # check refuses to read it too


STRUCTURED_SOURCE = textwrap.dedent('''
    """Structured results of an invented two-level system (common practice, no source)."""
    from sympy import Matrix, Rational, sqrt, symbols
    from amalgebra.derivations import derivation

    @derivation
    def two_level(d):
        A, b = symbols("A b")
        H = Matrix([[A, b], [b, -A]])
        d.step("trace", H.trace(), 0, "diagonal entries cancel")
        d.result("H", H)
        d.result("levels", (sqrt(A**2 + b**2), -sqrt(A**2 + b**2)))
        d.result("named", {"upper": sqrt(A**2 + b**2), "lower": -sqrt(A**2 + b**2)})
        d.result("by_m", {Rational(1, 2): A, Rational(-1, 2): -A})
        d.result("mhz", Rational(854335326363, 125000000))
''')


def test_structured_results_record_and_check(make_folder):
    folder = make_folder({"deriv_two.py": STRUCTURED_SOURCE})
    assert record_folder(folder).exit_code == EXIT_OK
    text = (folder / "deriv_two.results.toml").read_text()
    assert 'mhz = "6834.682610904"' in text and "H = { matrix = [" in text
    out = run_folder(folder)
    assert out.exit_code == EXIT_OK
    assert {c.status for c in out.comparisons} == {"identical"}
    store = folder / "deriv_two.results.toml"
    store.write_text(text.replace('"6834.682610904"', "6834.682610905"))
    out = run_folder(folder)
    assert [c.result for c in out.comparisons if c.status == "changed"] == ["mhz"]


def test_exact_mode_fails_results_equal_only_numerically(make_folder):
    source = textwrap.dedent('''
        from sympy import symbols
        from amalgebra.derivations import derivation

        @derivation
        def root(d):
            x = symbols("x", positive=True)
            d.result("r", x + 1)
    ''')
    folder = make_folder({"deriv_root.py": source})
    (folder / "deriv_root.results.toml").write_text(
        'format = "amalgebra-results-2"\n[root]\nr = "sqrt(x^2 + 2*x + 1)"\n')
    out = run_folder(folder)
    assert out.exit_code == EXIT_OK and out.comparisons[0].method == "numeric"
    assert run_folder(folder, exact=True).exit_code == EXIT_FAILED


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


@pytest.mark.skipif(not hasattr(os, "symlink"), reason="needs symbolic links")
def test_the_record_command_reports_a_refused_link(make_folder, good_source, tmp_path_factory,
                                                   capsys):
    from amalgebra.cli import main

    folder = make_folder({"deriv_good.py": good_source})
    victim = tmp_path_factory.mktemp("outside") / "passwd"
    victim.write_text("root:x:0:0\n")
    (folder / "deriv_good.results.toml").symlink_to(victim)
    assert main(["record", str(folder), "-q"]) == EXIT_FAILED
    out = capsys.readouterr().out
    assert "NOT recorded deriv_good.py" in out and "is a symbolic link" in out
    assert "root:x" not in out and victim.read_text() == "root:x:0:0\n"
    assert main(["check", str(folder), "-q"]) == EXIT_FAILED
    out = capsys.readouterr().out
    assert "root:x" not in out and "3 unreadable" in out


def test_check_with_a_tampered_huge_value_fails_fast(make_folder, good_source):
    # issue 17: (a + b + c + d + e)^40 - 1 in a results file ran `check` for over 120 s
    import time

    folder = make_folder({"deriv_good.py": good_source})
    record_folder(folder)
    store = folder / "deriv_good.results.toml"
    store.write_text(store.read_text().replace('"(x + 1)^2"', '"(a + b + c + d + e)^40 - 1"'))
    start = time.monotonic()
    out = run_folder(folder)
    assert time.monotonic() - start < 60              # a hang guard, not a speed test
    assert out.exit_code == EXIT_FAILED
    (changed,) = [c for c in out.comparisons if c.status == "changed"]
    assert changed.result == "square" and changed.method == "numeric"
