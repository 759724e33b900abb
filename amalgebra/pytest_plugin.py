r"""pytest plugin: derivation files (``deriv_*.py``) become test items, where a project opts in.

Explanation
===========

Registered through the ``pytest11`` entry point ``amalgebra``, so that a research group
runs ``pytest worked_examples`` (also with ``-n 2`` under pytest-xdist) in its own CI.
The plugin loads in every pytest session of the environment, but it collects a
``deriv_*.py`` file only when the project asks for it, in one of three ways:

* the ini option ``amalgebra_derivations = true`` (``[tool.pytest.ini_options]`` in
  ``pyproject.toml``, or ``pytest.ini``/``tox.ini``/``setup.cfg``): every ``deriv_*.py``
  under the collected paths is a derivation file;
* the command-line flag ``--amalgebra-derivations`` (the same, for one run);
* a stored-results file ``deriv_x.results.toml`` beside ``deriv_x.py`` (written by
  ``amalgebra record``): that one file is a derivation file.

Anywhere else a file named ``deriv_*.py`` (a helper module, a script) is left alone:
not imported, no extra item.  For each derivation file the plugin yields

* one item per derivation, ``deriv_x.py::<derivation>``: it runs every step (a failing
  step fails the item, naming the step and both sides) and compares the named results
  with ``deriv_x.results.toml``; a changed, stale or *not yet recorded* result fails
  the item (recording is the explicit command ``amalgebra record``, never pytest);
* one item ``deriv_x.py::[stored results]`` that fails when the stored file is
  malformed or holds sections for derivations that no longer exist.

Steps that could only be checked numerically pass but are listed in the terminal
summary; ``--amalgebra-exact`` makes them fail.  The module imports nothing but pytest
at import time; SymPy and amalgebra load only when a derivation file is collected.
``-p no:amalgebra`` switches the plugin off altogether.

Examples
========

>>> from amalgebra.pytest_plugin import is_derivation_file, stored_results_beside
>>> from pathlib import Path
>>> is_derivation_file(Path("worked_examples/deriv_spin_one.py")), is_derivation_file(Path("test_x.py"))
(True, False)
>>> stored_results_beside(Path("notes/deriv_rotor.py")).as_posix()
'notes/deriv_rotor.results.toml'
"""

import pytest

__all__ = ["is_derivation_file", "stored_results_beside", "collects_derivations", "INI_OPTION",
           "DerivationFile", "DerivationItem", "StoredResultsItem"]

#: The ini option through which a project opts in to derivation files.
INI_OPTION = "amalgebra_derivations"


def is_derivation_file(path):
    """True for ``deriv_*.py`` files, the naming convention of derivation files."""
    return path.suffix == ".py" and path.name.startswith("deriv_")


def stored_results_beside(path):
    """The stored-results file ``deriv_x.results.toml`` beside ``deriv_x.py``.

    The same rule as :func:`amalgebra.derivations.store.results_path`, repeated here
    so that deciding what to collect imports nothing but pytest.
    """
    return path.with_name(path.stem + ".results.toml")


def collects_derivations(config, path):
    """True when ``path`` is a derivation file this project opted in to (module docstring)."""
    if not is_derivation_file(path):
        return False
    if config.getini(INI_OPTION) or config.getoption("amalgebra_derivations"):
        return True
    return stored_results_beside(path).is_file()


class DerivationFailure(Exception):
    """A derivation item failed; the message is the whole report."""


def pytest_addoption(parser):
    parser.addini(INI_OPTION, type="bool", default=False,
                  help="collect every deriv_*.py file as an amalgebra derivation file "
                       "(otherwise only those with a deriv_*.results.toml beside them)")
    group = parser.getgroup("amalgebra", "amalgebra derivation files")
    group.addoption("--amalgebra-derivations", action="store_true", default=False,
                    help="collect every deriv_*.py file as a derivation file in this run "
                         f"(as the ini option {INI_OPTION} = true does)")
    group.addoption("--amalgebra-exact", action="store_true", default=False,
                    help="fail derivations whose steps could only be checked numerically")


def pytest_collect_file(file_path, parent):
    if collects_derivations(parent.config, file_path):
        return DerivationFile.from_parent(parent, path=file_path)
    return None


class DerivationFile(pytest.File):
    """A ``deriv_*.py`` file: its derivations plus its stored-results check."""

    _stored = None

    def collect(self):
        from amalgebra.derivations.runner import load_derivations

        try:
            derivations = load_derivations(self.path)
        except SystemExit as exc:
            # a script's sys.exit() at import would otherwise stop the whole session
            raise self.CollectError(f"{self.path.name} called sys.exit({exc.code!r}) while "
                                    "being imported as a derivation file") from None
        for deriv in derivations:
            yield DerivationItem.from_parent(self, name=deriv.name, derivation=deriv)
        yield StoredResultsItem.from_parent(self, name="[stored results]",
                                            known=[d.name for d in derivations])

    def stored(self):
        """The parsed stored results (``None`` when not recorded); raises when malformed."""
        from amalgebra.derivations.store import load_results, results_path

        if self._stored is None:
            self._stored = (load_results(results_path(self.path)),)
        return self._stored[0]


class DerivationItem(pytest.Item):
    """One derivation: its steps and its named results."""

    def __init__(self, *, derivation, **kwargs):
        super().__init__(**kwargs)
        self.derivation = derivation

    def runtest(self):
        from amalgebra.derivations.regression import compare_record

        record = self.derivation.run()
        if record.numeric_steps:
            self.user_properties.append(("amalgebra_numeric_steps",
                                         ", ".join(record.numeric_steps)))
        if record.error is not None:
            raise DerivationFailure(f"{type(record.error).__name__}: {record.error}")
        stored = self.parent.stored()
        comparisons = compare_record(record, None if stored is None else stored.get(record.name))
        problems = []
        for c in comparisons:
            where = f" (line {c.line})" if c.line else ""
            if c.status == "changed":
                problems.append(f"result {c.result!r} CHANGED{where}:\n{c.diff}")
            elif c.status == "stale":
                problems.append(f"result {c.result!r} is stored{where} but no longer produced")
            elif c.status == "unrecorded":
                problems.append(f"result {c.result!r} is not recorded yet: run "
                                f"`amalgebra record {self.path.parent}` and review the diff")
            elif not c.passed:  # unreadable, undecided (and any later failing status)
                problems.append(f"result {c.result!r} {c.status.upper()}{where}:\n{c.diff}")
        if self.config.getoption("amalgebra_exact") and record.numeric_steps:
            problems.append("steps checked only numerically (--amalgebra-exact): "
                            + ", ".join(record.numeric_steps))
        if problems:
            raise DerivationFailure("\n".join(problems))

    def repr_failure(self, excinfo, style=None):
        if isinstance(excinfo.value, DerivationFailure):
            return f"derivation {self.name!r} in {self.path.name}:\n{excinfo.value}"
        return super().repr_failure(excinfo, style=style)

    def reportinfo(self):
        return self.path, None, f"derivation {self.name}"


class StoredResultsItem(pytest.Item):
    """The stored-results file of one derivation file: readable, and nothing stale."""

    def __init__(self, *, known, **kwargs):
        super().__init__(**kwargs)
        self.known = known

    def runtest(self):
        stored = self.parent.stored()
        if stored is None:
            return
        if getattr(stored, "problems", None):
            raise DerivationFailure("\n".join(stored.problems))
        stale = [s for s in stored if s not in self.known]
        if stale:
            raise DerivationFailure("stored results for derivations that no longer exist: "
                                    + ", ".join(stale))

    def repr_failure(self, excinfo, style=None):
        from amalgebra.errors import StoredResultError

        if isinstance(excinfo.value, (DerivationFailure, StoredResultError)):
            return f"stored results of {self.path.name}:\n{excinfo.value}"
        return super().repr_failure(excinfo, style=style)

    def reportinfo(self):
        return self.path, None, "stored results"


class _NumericSummary:
    """Collects numeric-only steps from reports (also those sent back by xdist workers)."""

    def __init__(self):
        self.lines = []

    def pytest_runtest_logreport(self, report):
        if report.when == "call":
            for key, value in getattr(report, "user_properties", ()):
                if key == "amalgebra_numeric_steps":
                    self.lines.append(f"{report.nodeid}: {value}")

    def pytest_terminal_summary(self, terminalreporter):
        if self.lines:
            terminalreporter.section("amalgebra: steps checked only numerically (not proofs)")
            for line in sorted(self.lines):
                terminalreporter.line(line)


def pytest_configure(config):
    config.pluginmanager.register(_NumericSummary(), "amalgebra-numeric-summary")
