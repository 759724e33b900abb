"""Tests of the pytest plugin (amalgebra.pytest_plugin) with pytester, also under xdist."""

import subprocess
import sys
import textwrap
from importlib.metadata import entry_points
from pathlib import Path

import pytest

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


def test_collects_each_derivation_and_passes(pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    record_folder(pytester.path)
    result = _run(pytester, "-v")
    result.assert_outcomes(passed=3)
    result.stdout.fnmatch_lines(["*deriv_notes.py::binomial PASSED*",
                                 "*deriv_notes.py::pythagoras PASSED*",
                                 "*deriv_notes.py::[[]stored results[]] PASSED*"])


def test_unrecorded_results_fail(pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    result = _run(pytester)
    result.assert_outcomes(failed=2, passed=1)
    result.stdout.fnmatch_lines(["*result 'square' is not recorded yet*amalgebra record*"])


def test_broken_step_fails_with_its_name(pytester, broken_source):
    pytester.makefile(".py", deriv_broken=broken_source)
    result = _run(pytester)
    result.assert_outcomes(failed=1, passed=1)
    result.stdout.fnmatch_lines(["*step 'bad_square' of derivation 'sign_slip' does not hold*",
                                 "*lhs = (x - 1)**2*", "*rhs = x**2 + 2*x + 1*"])


def test_tampered_store_fails_naming_file_and_line(pytester, good_source):
    pytester.makefile(".py", deriv_notes=good_source)
    record_folder(pytester.path)
    store = pytester.path / "deriv_notes.results.toml"
    store.write_text(store.read_text().replace('"9/4"', '"__import__(1)"'))
    result = _run(pytester)
    result.assert_outcomes(failed=3)
    result.stdout.fnmatch_lines([f"*{store}:7: result binomial.at_half is not a valid "
                                 "expression*"])


def test_changed_result_shows_a_diff(pytester, good_source):
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


def test_numeric_steps_are_listed_and_fail_with_exact_option(pytester):
    pytester.makefile(".py", deriv_num=NUMERIC)
    result = _run(pytester)
    result.assert_outcomes(passed=2)
    result.stdout.fnmatch_lines(["*steps checked only numerically (not proofs)*",
                                 "deriv_num.py::arctangents: complement"])
    result = _run(pytester, "--amalgebra-exact")
    result.assert_outcomes(passed=1, failed=1)


def test_runs_under_xdist(pytester, good_source, broken_source):
    pytester.makefile(".py", deriv_notes=good_source, deriv_broken=broken_source)
    record_folder(pytester.path)
    result = pytester.runpytest_subprocess(*QUIET, *_plugin_args(), "-n", "2")
    result.assert_outcomes(passed=4, failed=1)
    result.stdout.fnmatch_lines(["*2 workers*"])


def test_other_python_files_are_not_collected(pytester):
    pytester.makefile(".py", notes="raise RuntimeError('must not be imported')")
    result = _run(pytester)
    assert result.ret == pytest.ExitCode.NO_TESTS_COLLECTED


def test_plugin_module_imports_no_sympy():
    # Load the module file on its own (the package __init__ is not this module's doing)
    # and check that importing it pulls in neither sympy nor amalgebra's heavy modules.
    path = Path(__file__).resolve().parents[2] / "amalgebra" / "pytest_plugin.py"
    code = ("import importlib.util, sys\n"
            f"spec = importlib.util.spec_from_file_location('probe_plugin', {str(path)!r})\n"
            "mod = importlib.util.module_from_spec(spec); spec.loader.exec_module(mod)\n"
            "print(sorted(m for m in sys.modules if m.split('.')[0] in ('sympy', 'lark', "
            "'amalgebra')))\n")
    done = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                          check=True)
    assert done.stdout.strip() == "[]"
