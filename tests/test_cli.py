"""Tests of the ``amalgebra`` command (amalgebra.cli): subcommands, exit codes, --help."""

import os
import shutil
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

from amalgebra.cli import EXIT_FAILED, EXIT_OK, EXIT_UNRECORDED, EXIT_USAGE, main

EXAMPLES = Path(__file__).resolve().parents[1] / "worked_examples"

GOOD = textwrap.dedent('''
    from sympy import symbols
    from amalgebra.derivations import derivation

    @derivation
    def product(d):
        a, b = symbols("a b")
        d.step("expand", (a + b)*(a - b), a**2 - b**2, "difference of squares")
        d.result("difference", a**2 - b**2)
''')  # (a+b)(a-b) = a^2 - b^2: common practice, no source

BROKEN = GOOD.replace("a**2 - b**2, \"difference", "a**2 + b**2, \"difference")


@pytest.fixture
def folder(tmp_path):
    (tmp_path / "deriv_product.py").write_text(GOOD)
    return tmp_path


def test_exit_codes_through_a_record_cycle(folder, capsys):
    assert main(["check", str(folder)]) == EXIT_UNRECORDED
    out, err = capsys.readouterr()
    assert "product.difference not recorded yet" in out
    assert "[1/1] deriv_product.py::product ok" in err
    assert main(["record", str(folder), "-q"]) == EXIT_OK
    assert "recorded deriv_product.results.toml" in capsys.readouterr().out
    assert main(["check", str(folder), "-q"]) == EXIT_OK
    assert capsys.readouterr().err == ""  # -q: no progress lines
    store = folder / "deriv_product.results.toml"
    store.write_text(store.read_text().replace("a^2 - b^2", "a^2 - 2*b^2"))
    assert main(["check", str(folder), "-q"]) == EXIT_FAILED
    out = capsys.readouterr().out
    assert "product.difference CHANGED (line 6)" in out and "stored: a^2 - 2*b^2" in out


def test_failed_step_exit_code(folder, capsys):
    (folder / "deriv_product.py").write_text(BROKEN)
    assert main(["check", str(folder), "-q"]) == EXIT_FAILED
    assert "step 'expand' of derivation 'product' does not hold" in capsys.readouterr().out
    assert main(["record", str(folder), "-q"]) == EXIT_FAILED
    assert not (folder / "deriv_product.results.toml").exists()


def test_usage_errors(tmp_path, capsys):
    assert main(["check", str(tmp_path / "missing")]) == EXIT_USAGE
    assert "does not exist" in capsys.readouterr().err
    assert main(["check", str(tmp_path)]) == EXIT_USAGE  # no deriv_*.py
    assert "holds no deriv_*.py" in capsys.readouterr().err
    assert main(["frobnicate"]) == EXIT_USAGE
    assert main([]) == EXIT_USAGE
    assert main(["parse", "().__class__"]) == EXIT_USAGE
    assert "not in the grammar" in capsys.readouterr().err
    assert main(["table", "cg", "1", "0.3"]) == EXIT_USAGE


def test_only_must_name_a_derivation(folder, capsys):
    assert main(["check", str(folder), "--only", "nosuch", "-q"]) == EXIT_USAGE
    assert "--only nosuch matches no derivation" in capsys.readouterr().err
    assert main(["check", str(folder), "--only", "product", "-q"]) == EXIT_UNRECORDED


@pytest.mark.parametrize("sub", ["check", "record", "report", "parse", "table"])
def test_help_for_each_subcommand(sub, capsys):
    assert main([sub, "--help"]) == EXIT_OK
    out = capsys.readouterr().out
    assert out.startswith(f"usage: amalgebra {sub}")


def test_top_level_help_documents_exit_codes(capsys):
    assert main(["--help"]) == EXIT_OK
    out = capsys.readouterr().out
    assert "exit codes: 0 ok; 1 failed step" in out and "3 results not recorded yet" in out


def test_parse_prints_text_and_latex(capsys):
    assert main(["parse", "Jplus(J)*Jminus(J) + 3/2"]) == EXIT_OK
    assert capsys.readouterr().out == "3/2 + Jplus(J)*Jminus(J)\n"
    assert main(["parse", "--latex", "sqrt(j*(j + 1))"]) == EXIT_OK
    assert capsys.readouterr().out == "\\sqrt{j \\left(j + 1\\right)}\n"


def test_table(capsys):
    assert main(["table", "sixj", "1", "1", "1", "1", "1", "1"]) == EXIT_OK
    # {1 1 1; 1 1 1} = 1/6 (Edmonds 1957 Table 5 closed forms; from memory)
    assert capsys.readouterr().out == "{1 1 1; 1 1 1} = 1/6\n"
    assert main(["table", "cg", "1/2", "1/2"]) == EXIT_OK
    out = capsys.readouterr().out
    # <1/2 1/2 1/2 -1/2|1 0> = 1/sqrt(2), <1/2 1/2 1/2 -1/2|0 0> = 1/sqrt(2) (PDG CG table)
    assert "J=1 M=0 m1=1/2 m2=-1/2: sqrt(2)/2" in out
    assert "J=0 M=0 m1=1/2 m2=-1/2: sqrt(2)/2" in out
    assert "J=0 M=0 m1=-1/2 m2=1/2: -sqrt(2)/2" in out


def test_report_writes_tex_and_pdf(folder, tmp_path, capsys):
    main(["record", str(folder), "-q"])
    out = tmp_path / "out" / "report.tex"
    out.parent.mkdir()
    args = ["report", str(folder), "-q", "-o", str(out), "--title", "My notes"]
    if not shutil.which("pdflatex"):
        args.append("--no-pdf")
    assert main(args) == EXIT_OK
    text = out.read_text()
    assert "\\section*{My notes}" in text and "\\begin{align}" in text
    if shutil.which("pdflatex") or shutil.which("latexmk"):
        assert out.with_suffix(".pdf").exists()
    capsys.readouterr()
    assert main(["report", str(folder), "-q"]) == EXIT_OK
    assert capsys.readouterr().out.startswith("\\documentclass{article}")


def test_bundled_worked_examples_pass():
    env = dict(os.environ)
    done = subprocess.run([sys.executable, "-m", "amalgebra.cli", "check", str(EXAMPLES), "-q"],
                          capture_output=True, text=True, env=env, check=False)
    assert done.returncode == EXIT_OK, done.stdout + done.stderr
    assert "0 failed" in done.stdout and "0 changed, 0 unrecorded, 0 stale" in done.stdout


def test_console_script_is_installed():
    exe = shutil.which("amalgebra")
    if exe is None:
        pytest.skip("the amalgebra console script is not on PATH (package not installed)")
    done = subprocess.run([exe, "--help"], capture_output=True, text=True, check=False)
    assert done.returncode == 0 and "usage: amalgebra" in done.stdout


class _FakeTerminal:
    """A text stream that says it is a terminal."""

    def __init__(self):
        self.chunks = []

    def write(self, text):
        self.chunks.append(text)

    def flush(self):
        pass

    def isatty(self):
        return True


class _Record:
    def __init__(self, ok):
        self.ok, self.numeric_steps, self.seconds = ok, (), 0.01


def test_progress_is_a_bar_on_a_terminal_and_lines_in_logs():
    import io

    from amalgebra.cli import _progress

    term = _FakeTerminal()
    report = _progress(False, term)
    report(1, 4, "a.py::first", _Record(True))
    report(4, 4, "a.py::last", _Record(True))
    text = "".join(term.chunks)
    assert "[#######-----------------------] 1/4 a.py::first ok" in text
    assert "[##############################] 4/4 a.py::last ok\n" in text
    assert "\r" in text  # redrawn in place

    log = io.StringIO()
    _progress(False, log)(2, 4, "b.py::step", _Record(False))
    assert log.getvalue() == "[2/4] b.py::step FAILED (0.01 s)\n"
    assert _progress(True) is None
