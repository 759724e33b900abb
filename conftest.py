"""Repository-wide pytest configuration: the slow-check flag and hypothesis profiles."""

import os

import pytest

try:
    from hypothesis import HealthCheck, settings

    # The profiles alone set the number of examples (no test sets max_examples itself):
    # default and ci keep the default suite quick, fuzz is the long run.
    settings.register_profile("default", deadline=None, max_examples=25)
    settings.register_profile(
        "ci", deadline=None, max_examples=25, derandomize=True, suppress_health_check=[HealthCheck.too_slow]
    )
    settings.register_profile("fuzz", deadline=None, max_examples=2000,
                              suppress_health_check=[HealthCheck.too_slow])
    settings.load_profile(os.environ.get("HYPOTHESIS_PROFILE", "ci" if os.environ.get("CI") else "default"))
except ImportError:  # hypothesis is a test extra
    pass


def pytest_addoption(parser):
    parser.addoption("--run-slow", action="store_true", default=False,
                     help="also run checks marked slow (large-j sweeps, long fuzzing)")


def pytest_collection_modifyitems(config, items):
    if config.getoption("--run-slow"):
        return
    skip = pytest.mark.skip(reason="slow check: run with --run-slow")
    for item in items:
        if "slow" in item.keywords:
            item.add_marker(skip)


def pytest_report_header(config):
    import sympy
    from sympy.external.gmpy import GROUND_TYPES

    import amalgebra

    return (f"amalgebra {amalgebra.__version__}, sympy {sympy.__version__} "
            f"(ground types {GROUND_TYPES}), PYTHONHASHSEED={os.environ.get('PYTHONHASHSEED', 'unset')}")


# deprecated shims of moved modules warn on import (tests/test_moved_modules.py checks them): not
# collected for doctests, in the checkout or in an installed package (`--pyargs amalgebra`)
_SHIMS = {"rotations_series.py", "rotations_actions.py", "harmonics.py", "numeric.py",
          "multiplet_matrices.py", "reduced.py"}


class _SkipShims:
    """Registered as a plugin (not a conftest hook), so it also covers an installed package's files,
    which lie outside this folder (a conftest hook only sees paths below its own folder)."""

    @staticmethod
    def pytest_ignore_collect(collection_path, config):
        if collection_path.name in _SHIMS and collection_path.parent.name == "amalgebra":
            return True
        return None


class _ImportPackageModulesFirst:
    """Import a package module by its dotted name before its doctests are collected.

    Under ``--import-mode=importlib`` pytest imports ``amalgebra/states/basis.py`` by first importing the
    parent package (whose ``__init__`` already imports ``basis``) and then executing the file a second
    time under the same name, so ``amalgebra.states.Basis`` and ``amalgebra.states.basis.Basis`` became
    two classes.  A module already in ``sys.modules`` is taken as it is, so importing it normally here
    leaves one module object.  ``__main__`` is never imported (it runs the command line)."""

    @staticmethod
    def pytest_collect_file(file_path, parent):
        if file_path.suffix != ".py" or file_path.name == "__main__.py":
            return None
        import importlib
        import importlib.util
        import pathlib

        spec = importlib.util.find_spec("amalgebra")
        if spec is None or not spec.origin:
            return None
        root = pathlib.Path(spec.origin).resolve().parent
        try:
            relative = file_path.resolve().relative_to(root)
        except ValueError:
            return None
        parts = ("amalgebra",) + relative.with_suffix("").parts
        if parts[-1] == "__init__":
            parts = parts[:-1]
        try:
            importlib.import_module(".".join(parts))
        except Exception:      # noqa: BLE001 - pytest reports the import error of the module itself
            pass
        return None


def pytest_configure(config):
    if not config.pluginmanager.has_plugin("amalgebra-skip-shims"):
        config.pluginmanager.register(_SkipShims(), "amalgebra-skip-shims")
    if not config.pluginmanager.has_plugin("amalgebra-import-once"):
        config.pluginmanager.register(_ImportPackageModulesFirst(), "amalgebra-import-once")


@pytest.fixture(autouse=True)
def _no_deadline_left_armed():
    """Every test leaves the interrupting timer (amalgebra._deadline) as it found it.

    A guard left on the stack would keep SIGALRM firing into later tests, which would then fail
    at random places; this makes such a leak fail the test that caused it.
    """
    yield
    import sys
    deadline = sys.modules.get("amalgebra._deadline")
    if deadline is not None and deadline._stack:
        left = list(deadline._stack)
        deadline._stack.clear()
        import signal
        signal.setitimer(signal.ITIMER_REAL, 0)
        pytest.fail(f"a deadline guard was left armed: {left}", pytrace=False)
