"""Tests of the ``amalgebra`` command (amalgebra.cli): subcommands, exit codes, --help.

Also, in subprocesses: ``python -m amalgebra``, a bare ``amalgebra check`` running the
shipped worked examples, a closed output pipe, Ctrl-C (SIGINT, and the interrupt key
typed into a pseudo-terminal), and the progress display on pseudo-terminals of a given
width with ``TERM=xterm`` and ``TERM=dumb``.
"""

import os
import shutil
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest

import amalgebra
from amalgebra.cli import (EXIT_BROKEN_PIPE, EXIT_FAILED, EXIT_INTERRUPTED, EXIT_OK, EXIT_UNRECORDED,
                           EXIT_USAGE, main, shipped_examples)

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


def test_a_derivation_file_calling_sys_exit_is_reported_not_obeyed(tmp_path, capsys):
    (tmp_path / "deriv_script.py").write_text("import sys\nsys.exit('usage: deriv_script.py DATA')\n")
    assert main(["check", str(tmp_path), "-q"]) == EXIT_FAILED
    assert "called sys.exit('usage: deriv_script.py DATA')" in capsys.readouterr().err


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
    assert capsys.readouterr().out == "3/2 + J.plus*J.minus\n"     # the printed form (issue 15)
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


def test_report_to_a_pdf_name_writes_the_tex_beside_it(folder, tmp_path, capsys):
    main(["record", str(folder), "-q"])
    pdf = tmp_path / "notes.pdf"
    assert main(["report", str(folder), "-q", "-o", str(pdf), "--no-pdf"]) == EXIT_USAGE
    assert "--no-pdf" in capsys.readouterr().err and not pdf.exists()
    code = main(["report", str(folder), "-q", "-o", str(pdf)])
    tex = pdf.with_suffix(".tex")
    assert tex.read_text().startswith("\\documentclass{article}")
    if shutil.which("pdflatex") or shutil.which("latexmk"):
        assert code == EXIT_OK and pdf.read_bytes().startswith(b"%PDF")


def _command(*args, cwd=None, **kwargs):
    """``python -m amalgebra ARGS`` in ``cwd``, importing the amalgebra under test."""
    env = dict(os.environ)
    env["PYTHONPATH"] = os.pathsep.join([str(Path(amalgebra.__file__).resolve().parents[1]),
                                         *filter(None, [env.get("PYTHONPATH")])])
    env.update(kwargs.pop("env", {}))
    return [sys.executable, "-m", "amalgebra", *args], dict(cwd=cwd, env=env, **kwargs)


def test_bare_check_runs_the_shipped_worked_examples(tmp_path):
    # from a folder without ./worked_examples, as after `pip install amalgebra`
    cmd, kw = _command("check", "-q", cwd=tmp_path)
    done = subprocess.run(cmd, capture_output=True, text=True, check=False, **kw)
    assert done.returncode == EXIT_OK, done.stdout + done.stderr
    assert "0 failed" in done.stdout and "0 changed, 0 unrecorded, 0 stale" in done.stdout
    files = sorted(shipped_examples().glob("deriv_*.py"))
    assert len(files) >= 10 and all(p.with_name(p.stem + ".results.toml").is_file() for p in files)
    assert sorted(p.name for p in files) == sorted(p.name for p in EXAMPLES.glob("deriv_*.py"))


def test_examples_prints_the_folder_and_copies_it(tmp_path, capsys):
    assert main(["examples"]) == EXIT_OK
    assert Path(capsys.readouterr().out.strip()) == shipped_examples()
    dest = tmp_path / "mine"
    assert main(["examples", str(dest)]) == EXIT_OK
    assert f"run: amalgebra check {dest}" in capsys.readouterr().out
    names = sorted(p.name for p in dest.iterdir())
    assert "README.md" in names and "deriv_spin_one_rotor.results.toml" in names
    assert main(["check", str(dest / "deriv_spin_one_rotor.py"), "-q"]) == EXIT_OK
    capsys.readouterr()
    assert main(["examples", str(dest)]) == EXIT_USAGE      # never overwrites
    assert "already holds" in capsys.readouterr().err
    (tmp_path / "file").write_text("x")
    assert main(["examples", str(tmp_path / "file")]) == EXIT_USAGE
    assert "must be a folder" in capsys.readouterr().err


def test_version(capsys):
    assert main(["--version"]) == EXIT_OK
    out = capsys.readouterr().out
    assert out.startswith(f"amalgebra {amalgebra.__version__} (sympy ")
    assert "coupling kernel: " in out


def test_python_dash_m_is_the_command(tmp_path):
    cmd, kw = _command("--version", cwd=tmp_path)
    done = subprocess.run(cmd, capture_output=True, text=True, check=False, **kw)
    assert done.returncode == 0 and done.stdout.startswith("amalgebra ")
    cmd, kw = _command("frobnicate", cwd=tmp_path)
    done = subprocess.run(cmd, capture_output=True, text=True, check=False, **kw)
    assert done.returncode == EXIT_USAGE and "usage: amalgebra" in done.stderr


def test_bad_output_paths_are_usage_errors(folder, tmp_path, capsys):
    main(["record", str(folder), "-q"])
    capsys.readouterr()
    (tmp_path / "plain_file").write_text("x")
    cases = [(tmp_path / "missing" / "r.tex", "folder"),
             (tmp_path / "plain_file" / "r.tex", "folder"),
             (tmp_path, "it is a folder"),
             (tmp_path / ("x" * 300 + ".tex"), "File name too long")]
    for path, reason in cases:
        assert main(["report", str(folder), "-q", "--no-pdf", "-o", str(path)]) == EXIT_USAGE
        err = capsys.readouterr().err
        assert err.startswith(f"amalgebra: error: output={str(path)!r} cannot be written") and reason in err
        assert "Traceback" not in err


def test_closed_output_pipe_exits_quietly(tmp_path):
    # like `amalgebra table cg 10 10 | head -c 100`: far more output than a pipe buffer holds
    cmd, kw = _command("table", "cg", "10", "10", cwd=tmp_path)
    with subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, **kw) as proc:
        first = proc.stdout.read(100)
        proc.stdout.close()
        err = proc.stderr.read().decode()
        assert proc.wait(timeout=120) == EXIT_BROKEN_PIPE
    assert first.startswith(b"<j1 m1 j2 m2|J M>") and err == ""


SLOW = textwrap.dedent('''
    import pathlib, time
    from amalgebra.derivations import derivation

    @derivation
    def waits(d):
        pathlib.Path("started").write_text("yes")
        time.sleep(60)
''')


def _wait_for(path, seconds=60):
    import time

    end = time.monotonic() + seconds
    while not path.exists():
        assert time.monotonic() < end, "the command never started its derivation"
        time.sleep(0.05)


def test_sigint_exits_130_without_traceback(tmp_path):
    import signal

    (tmp_path / "deriv_slow.py").write_text(SLOW)
    cmd, kw = _command("check", ".", cwd=tmp_path)
    # a parent that ignores SIGINT (some test runners' workers) would pass that on: reset it
    proc = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
                            preexec_fn=lambda: signal.signal(signal.SIGINT, signal.SIG_DFL), **kw)
    _wait_for(tmp_path / "started")
    proc.send_signal(signal.SIGINT)
    out, err = proc.communicate(timeout=60)
    assert proc.returncode == EXIT_INTERRUPTED
    assert err.strip().endswith("amalgebra: interrupted") and "Traceback" not in err


def _on_pty(cmd, kw, columns, send=None, wait_for=None):
    """Run ``cmd`` as the foreground job of a new pseudo-terminal ``columns`` wide; return
    (exit code, everything written to the terminal)."""
    import fcntl
    import pty
    import struct
    import termios

    pid, fd = pty.fork()
    if pid == 0:  # the child: size the terminal, then become the command
        try:
            import signal

            signal.signal(signal.SIGINT, signal.SIG_DFL)   # not inherited as ignored
            fcntl.ioctl(0, termios.TIOCSWINSZ, struct.pack("HHHH", 24, columns, 0, 0))
            os.chdir(kw["cwd"])
            os.execve(cmd[0], cmd, kw["env"])
        finally:
            os._exit(127)
    if wait_for is not None:
        _wait_for(wait_for)
        os.write(fd, send)
    chunks = []
    while True:
        try:
            data = os.read(fd, 4096)
        except OSError:          # EIO: the child closed the terminal
            break
        if not data:
            break
        chunks.append(data)
    _, status = os.waitpid(pid, 0)
    return os.waitstatus_to_exitcode(status), b"".join(chunks).decode()


LONG_NAMES = textwrap.dedent('''
    from sympy import symbols
    from amalgebra.derivations import derivation

    @derivation
    def a_derivation_with_a_rather_long_name_that_would_wrap_a_narrow_terminal(d):
        x = symbols("x")
        d.step("expand", (x + 1)**2, x**2 + 2*x + 1, "binomial")

    @derivation
    def another_derivation_with_an_equally_long_and_descriptive_name(d):
        x = symbols("x")
        d.step("expand", (x - 1)**2, x**2 - 2*x + 1, "binomial")
''')  # (x +- 1)^2 = x^2 +- 2x + 1: common practice, no source


@pytest.mark.parametrize("columns", [40, 100])
def test_progress_bar_fits_the_terminal(tmp_path, columns):
    (tmp_path / "deriv_long.py").write_text(LONG_NAMES)
    cmd, kw = _command("check", ".", cwd=tmp_path, env={"TERM": "xterm"})
    code, screen = _on_pty(cmd, kw, columns)
    assert code == EXIT_OK, screen
    assert "\r\x1b[K" in screen                       # redrawn in place
    segments = screen.replace("\x1b[K", "").replace("\r\n", "\n").replace("\r", "\n").split("\n")
    bars = [seg for seg in segments if seg.startswith("[")]     # the summary on stdout is not a bar
    assert len(bars) == 2
    for segment in bars:
        assert len(segment) <= columns - 1, segment   # never wraps
    assert "2/2" in screen and "..." in screen        # the long labels were elided


def test_dumb_terminal_gets_plain_lines(tmp_path):
    (tmp_path / "deriv_long.py").write_text(LONG_NAMES)
    cmd, kw = _command("check", ".", cwd=tmp_path, env={"TERM": "dumb"})
    code, screen = _on_pty(cmd, kw, 40)
    assert code == EXIT_OK, screen
    assert "\x1b" not in screen
    assert "\r" not in screen.replace("\r\n", "")          # the terminal's own CR LF only
    assert "[1/2] long.py::a_derivation_with_a_rather_long_name" in screen.replace("deriv_long", "long")


def test_interrupt_key_on_a_terminal(tmp_path):
    (tmp_path / "deriv_slow.py").write_text(SLOW)
    cmd, kw = _command("check", ".", cwd=tmp_path, env={"TERM": "xterm"})
    code, screen = _on_pty(cmd, kw, 80, send=b"\x03", wait_for=tmp_path / "started")
    assert code == EXIT_INTERRUPTED, screen
    assert "amalgebra: interrupted" in screen and "Traceback" not in screen


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
    report = _progress(False, term, {"TERM": "xterm", "COLUMNS": "100"})
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

    dumb = _FakeTerminal()                   # a terminal, but TERM=dumb: plain lines too
    _progress(False, dumb, {"TERM": "dumb"})(1, 1, "c.py::x", _Record(True))
    assert "".join(dumb.chunks) == "[1/1] c.py::x ok (0.01 s)\n"


def test_progress_line_is_fitted_to_narrow_widths():
    from amalgebra.cli import _progress

    for columns in (12, 20, 33, 60):
        term = _FakeTerminal()
        _progress(False, term, {"TERM": "xterm", "COLUMNS": str(columns)})(
            3, 12, "deriv_some_topic.py::a_long_derivation_name", _Record(True))
        line = "".join(term.chunks).replace("\r\x1b[K", "")
        assert len(line) <= columns - 1, (columns, line)
        assert "3/12" in line
