"""Tests of the pytest plugin (amalgebra.pytest_plugin) with pytester, also under xdist.

Most tests opt in through the ini option ``amalgebra_derivations = true`` (the
``opted_in`` fixture); the opt-in rules themselves are tested at the end, including a
pytest run in an unrelated project (a subprocess) whose ``deriv_*.py`` files are a
helper module and a script, which must see no difference with the plugin loaded.
"""

import os
import subprocess
import sys
import textwrap
from importlib.metadata import entry_points
from pathlib import Path

import pytest

import amalgebra
import amalgebra.pytest_plugin as plugin_module

from amalgebra.derivations.runner import record_folder

pytest_plugins = ["pytester"]

PLUGIN = "amalgebra.pytest_plugin"


def _plugin_args():
    # Once the pytest11 entry point is installed the plugin loads by itself, and a
    # second "-p" would register it twice.
    installed = any(ep.value == PLUGIN for ep in entry_points(group="pytest11"))
    return [] if installed else ["-p", PLUGIN]


# pytest-benchmark (if installed) warns under xdist, and warnings are errors here.
QUIET = ("-p", "no:cacheprovider", "-p", "no:benchmark")


def _run(pytester, *args):
    return pytester.runpytest(*QUIET, *_plugin_args(), *args)


@pytest.fixture
def opted_in(pytester):
    """A pytester project whose ini file opts in to derivation files."""
    pytester.makeini("[pytest]\namalgebra_derivations = true\n")
    return pytester


def test_collects_each_derivation_and_passes(opted_in, pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    record_folder(pytester.path)
    result = _run(pytester, "-v")
    result.assert_outcomes(passed=3)
    result.stdout.fnmatch_lines(["*deriv_notes.py::binomial PASSED*",
                                 "*deriv_notes.py::pythagoras PASSED*",
                                 "*deriv_notes.py::[[]stored results[]] PASSED*"])


def test_unrecorded_results_fail(opted_in, pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    result = _run(pytester)
    result.assert_outcomes(failed=2, passed=1)
    result.stdout.fnmatch_lines(["*result 'square' is not recorded yet*amalgebra record*"])


def test_broken_step_fails_with_its_name(opted_in, pytester, broken_source):
    pytester.makefile(".py", deriv_broken=broken_source)
    result = _run(pytester)
    result.assert_outcomes(failed=1, passed=1)
    result.stdout.fnmatch_lines(["*step 'bad_square' of derivation 'sign_slip' does not hold*",
                                 "*lhs = (x - 1)**2*", "*rhs = x**2 + 2*x + 1*"])


def test_tampered_store_fails_naming_file_and_line(opted_in, pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    record_folder(pytester.path)
    store = pytester.path / "deriv_notes.results.toml"
    store.write_text(store.read_text().replace('"9/4"', '"__import__(1)"'))
    result = _run(pytester)
    # one unreadable entry fails its own derivation only (issue 15), naming file:line:column
    result.assert_outcomes(failed=1, passed=2)
    result.stdout.fnmatch_lines(["*result 'at_half' UNREADABLE (line 7)*",
                                 f"*{store}:7:*expected an expression of amalgebra's grammar*"])


def test_changed_result_shows_a_diff(opted_in, pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    record_folder(pytester.path)
    store = pytester.path / "deriv_notes.results.toml"
    store.write_text(store.read_text().replace('"9/4"', '"11/4"'))
    result = _run(pytester)
    result.assert_outcomes(failed=1, passed=2)
    result.stdout.fnmatch_lines(["*result 'at_half' CHANGED (line 7)*", "*stored: 11/4*",
                                 "*now:    9/4*"])


NUMERIC = textwrap.dedent('''
    from sympy import atan, pi, symbols
    from amalgebra.derivations import derivation

    @derivation
    def arctangents(d):
        p = symbols("p", positive=True)
        d.step("complement", atan(p) + atan(1/p), pi/2, "right triangle")
''')  # atan(p) + atan(1/p) = pi/2 for p > 0: common practice, no source


def test_numeric_steps_are_listed_and_fail_with_exact_option(opted_in, pytester):
    pytester.makefile(".py", deriv_num=NUMERIC)
    result = _run(pytester)
    result.assert_outcomes(passed=2)
    result.stdout.fnmatch_lines(["*steps checked only numerically (not proofs)*",
                                 "deriv_num.py::arctangents: complement"])
    result = _run(pytester, "--amalgebra-exact")
    result.assert_outcomes(passed=1, failed=1)


def test_runs_under_xdist(opted_in, pytester, good_source, broken_source):
    pytester.makefile(".py", deriv_notes=good_source, deriv_broken=broken_source)
    record_folder(pytester.path)
    result = pytester.runpytest_subprocess(*QUIET, *_plugin_args(), "-n", "2")
    result.assert_outcomes(passed=4, failed=1)
    result.stdout.fnmatch_lines(["*2 workers*"])


def test_other_python_files_are_not_collected(opted_in, pytester):
    pytester.makefile(".py", notes="raise RuntimeError('must not be imported')")
    result = _run(pytester)
    assert result.ret == pytest.ExitCode.NO_TESTS_COLLECTED


def test_plugin_module_imports_no_sympy():
    # Load the module file on its own (the package __init__ is not this module's doing)
    # and check that importing it pulls in neither sympy nor amalgebra's heavy modules.
    path = Path(plugin_module.__file__).resolve()   # the copy under test (source or installed)
    code = ("import importlib.util, sys\n"
            f"spec = importlib.util.spec_from_file_location('probe_plugin', {str(path)!r})\n"
            "mod = importlib.util.module_from_spec(spec); spec.loader.exec_module(mod)\n"
            "print(sorted(m for m in sys.modules if m.split('.')[0] in ('sympy', 'lark', "
            "'amalgebra')))\n")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          check=True)
    assert done.stdout.strip() == "[]"


# --- opt-in rules -------------------------------------------------------------------------

def test_without_opt_in_a_deriv_file_is_not_collected(pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    result = _run(pytester)
    assert result.ret == pytest.ExitCode.NO_TESTS_COLLECTED
    result = _run(pytester, "--amalgebra-derivations")   # the flag opts in for one run
    result.assert_outcomes(failed=2, passed=1)           # collected: results not recorded yet


def test_a_stored_results_file_opts_in_that_file_only(pytester, good_source, broken_source):
    pytester.makefile(".py", deriv_notes=good_source, deriv_broken=broken_source)
    record_folder(pytester.path)           # records deriv_notes only (deriv_broken fails a step)
    assert (pytester.path / "deriv_notes.results.toml").is_file()
    assert not (pytester.path / "deriv_broken.results.toml").exists()
    result = _run(pytester, "-v")
    result.assert_outcomes(passed=3)      # binomial, pythagoras, [stored results]; not deriv_broken
    assert "deriv_broken" not in result.stdout.str()


def test_ini_option_false_is_the_default(pytester, good_source):
    pytester.makeini("[pytest]\namalgebra_derivations = false\n")
    pytester.makefile(".py", deriv_notes=good_source)
    assert _run(pytester).ret == pytest.ExitCode.NO_TESTS_COLLECTED


HELPER_MODULE = textwrap.dedent("""
    # helpers of an unrelated project that happen to be called deriv_*
    def derivative(f, x, h=1e-6):
        return (f(x + h) - f(x - h)) / (2*h)
""")

SCRIPT_READING_ARGV = textwrap.dedent("""
    # a command-line script of an unrelated project: it reads sys.argv when imported
    import sys

    if len(sys.argv) != 2 or not sys.argv[1].endswith(".csv"):
        sys.exit("usage: python deriv_fit.py DATA.csv")
""")

PROJECT_TEST = textwrap.dedent("""
    from deriv_helpers import derivative

    def test_derivative_of_square():
        assert abs(derivative(lambda x: x*x, 3.0) - 6.0) < 1e-6
""")  # d(x^2)/dx = 2x: common practice, no source


def _pytest_in(project, *args):
    """Run pytest in a subprocess in ``project``, with amalgebra importable and its plugin on."""
    env = {k: v for k, v in os.environ.items() if not k.startswith("PYTEST_")}
    parent = str(Path(amalgebra.__file__).resolve().parents[1])
    env["PYTHONPATH"] = os.pathsep.join([parent, *filter(None, [env.get("PYTHONPATH")])])
    done = subprocess.run([sys.executable, "-m", "pytest", "-p", "no:cacheprovider",
                           *_plugin_args(), *args], cwd=project, env=env, capture_output=True,
                          text=True, check=False)
    return done.returncode, done.stdout + done.stderr


def _outcome(out):
    return [line.split(" in ")[0] for line in out.splitlines() if " passed" in line]


@pytest.mark.parametrize("config", ["none", "pytest.ini", "pyproject.toml"])
def test_unrelated_project_sees_no_change(tmp_path, config):
    project = tmp_path / "other_project"
    project.mkdir()
    (project / "deriv_helpers.py").write_text(HELPER_MODULE)
    (project / "deriv_fit.py").write_text(SCRIPT_READING_ARGV)
    (project / "test_helpers.py").write_text(PROJECT_TEST)
    if config == "pytest.ini":
        (project / "pytest.ini").write_text("[pytest]\naddopts = -ra\n")
    elif config == "pyproject.toml":
        (project / "pyproject.toml").write_text('[project]\nname = "other"\nversion = "1"\n\n'
                                                '[tool.pytest.ini_options]\nxfail_strict = true\n')
    with_plugin = _pytest_in(project, "-q")
    without_plugin = _pytest_in(project, "-q", "-p", "no:amalgebra")
    for code, out in (with_plugin, without_plugin):
        assert code == 0, out
        assert "1 passed" in out and "error" not in out.lower() and "stored results" not in out
    assert _outcome(with_plugin[1]) == _outcome(without_plugin[1])   # timings apart
    # not vacuous: the plugin is active in that run, and opting in would collect both files
    code, out = _pytest_in(project, "-q", "--amalgebra-derivations")
    assert code == pytest.ExitCode.INTERRUPTED, out
    assert "1 error" in out and "INTERNALERROR" not in out
    assert "deriv_fit.py called sys.exit('usage: python deriv_fit.py DATA.csv')" in out
