r"""pytest plugin: every derivation in a ``deriv_*.py`` file becomes a test item.

Explanation
===========

Registered through the ``pytest11`` entry point ``amalgebra``, so that a research group
runs ``pytest worked_examples`` (also with ``-n 2`` under pytest-xdist) in its own CI.
For each derivation file the plugin yields

* one item per derivation, ``deriv_x.py::<derivation>``: it runs every step (a failing
  step fails the item, naming the step and both sides) and compares the named results
  with ``deriv_x.results.toml``; a changed, stale or *not yet recorded* result fails
  the item (recording is the explicit command ``amalgebra record``, never pytest);
* one item ``deriv_x.py::[stored results]`` that fails when the stored file is
  malformed or holds sections for derivations that no longer exist.

Steps that could only be checked numerically pass but are listed in the terminal
summary; ``--amalgebra-exact`` makes them fail.  The module imports nothing but pytest
at import time (an entry-point plugin loads in every pytest session of the
environment); SymPy and amalgebra load only when a derivation file is collected.
Opt out with ``-p no:amalgebra``.

Examples
========

>>> from amalgebra.pytest_plugin import is_derivation_file
>>> from pathlib import Path
>>> is_derivation_file(Path("worked_examples/deriv_spin_one.py")), is_derivation_file(Path("test_x.py"))
(True, False)
"""

import pytest

__all__ = ["is_derivation_file", "DerivationFile", "DerivationItem", "StoredResultsItem"]


def is_derivation_file(path):
    """True for ``deriv_*.py`` files, the naming convention of derivation files."""
    return path.suffix == ".py" and path.name.startswith("deriv_")


class DerivationFailure(Exception):
    """A derivation item failed; the message is the whole report."""


def pytest_addoption(parser):
    group = parser.getgroup("amalgebra", "amalgebra derivation files")
    group.addoption("--amalgebra-exact", action="store_true", default=False,
                    help="fail derivations whose steps could only be checked numerically")


def pytest_collect_file(file_path, parent):
    if is_derivation_file(file_path):
        return DerivationFile.from_parent(parent, path=file_path)
    return None


class DerivationFile(pytest.File):
    """A ``deriv_*.py`` file: its derivations plus its stored-results check."""

    _stored = None

    def collect(self):
        from amalgebra.derivations.runner import load_derivations

        derivations = load_derivations(self.path)
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
