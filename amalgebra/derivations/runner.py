r"""Finding, running, checking and re-recording the derivation files of a folder.

Explanation
===========

A derivation file is ``deriv_<topic>.py`` (searched recursively, in sorted path order);
its stored results live beside it in ``deriv_<topic>.results.toml``.  Derivation files
are code the user chose to run, exactly like test files, so they are imported; stored
results are data and are only ever parsed (see :mod:`amalgebra.derivations.store`).

:func:`run_folder` returns a :class:`RunOutcome` whose :attr:`~RunOutcome.exit_code`
is what the ``amalgebra`` command returns:

* ``0``: every step holds and every stored result is identical or equal;
* ``1``: a step failed, a derivation raised, a file could not be loaded, a stored
  file or entry is unreadable, a result changed, went stale or could not be compared
  within the budget (and, with ``exact=True``, a step was only checked numerically
  or a stored result was found equal only by the numeric test);
* ``3``: nothing failed, but some results are not recorded yet.

Examples
========

>>> import pathlib, tempfile
>>> from amalgebra.derivations.runner import run_folder, record_folder
>>> folder = pathlib.Path(tempfile.mkdtemp())
>>> _ = (folder / "deriv_demo.py").write_text('''
... from sympy import symbols
... from amalgebra.derivations import derivation
... @derivation
... def telescoping(d):
...     n = symbols("n")
...     d.step("sum", n*(n + 1) - (n - 1)*n, 2*n, "expand both products")
...     d.result("step_size", 2*n)
... ''')
>>> run_folder(folder).exit_code        # results not recorded yet
3
>>> record_folder(folder).exit_code
0
>>> run_folder(folder).exit_code
0
"""

import importlib.util
import os
import re
import sys
from dataclasses import dataclass, field
from pathlib import Path

from .record import Derivation
from ..errors import StoredResultError
from .regression import FAILING, Comparison, compare_record
from .store import load_results, results_path, write_results

__all__ = ["FileOutcome", "RunOutcome", "discover", "load_derivations", "run_file",
           "run_folder", "record_folder", "EXIT_OK", "EXIT_FAILED", "EXIT_USAGE",
           "EXIT_UNRECORDED"]

EXIT_OK, EXIT_FAILED, EXIT_USAGE, EXIT_UNRECORDED = 0, 1, 2, 3
PATTERN = "deriv_*.py"


@dataclass
class FileOutcome:
    """What one derivation file produced."""

    path: Path
    name: str
    records: list = field(default_factory=list)
    comparisons: list = field(default_factory=list)
    load_error: BaseException | None = None
    store_error: BaseException | None = None
    recorded: bool = False
    derivation_names: list = field(default_factory=list)
    #: ``file:line:column: ...`` problems of the stored file outside any entry.
    store_problems: list = field(default_factory=list)

    @property
    def failed(self):
        return (self.load_error is not None or self.store_error is not None
                or bool(self.store_problems)
                or any(not r.ok for r in self.records)
                or any(c.status in FAILING for c in self.comparisons))


@dataclass
class RunOutcome:
    """The outcomes of every file of a run, and the exit code they imply."""

    files: list
    exact: bool = False

    @property
    def records(self):
        return [r for f in self.files for r in f.records]

    @property
    def comparisons(self):
        return [c for f in self.files for c in f.comparisons]

    @property
    def exit_code(self):
        if any(f.failed for f in self.files):
            return EXIT_FAILED
        if self.exact and (any(r.numeric_steps for r in self.records)
                           or any(c.passed and not c.exact for c in self.comparisons)):
            return EXIT_FAILED
        if any(c.status == "unrecorded" for c in self.comparisons):
            return EXIT_UNRECORDED
        return EXIT_OK


def discover(folder):
    """Derivation files under ``folder`` (or ``folder`` itself if it is one), sorted."""
    folder = Path(folder)
    if folder.is_file():
        return [folder]
    return sorted(folder.rglob(PATTERN), key=lambda p: p.relative_to(folder).as_posix())


def load_derivations(path):
    """Import a derivation file and return its :class:`Derivation` objects in order."""
    path = Path(path).resolve()
    modname = "amalgebra_derivation_" + re.sub(r"\W", "_", path.as_posix())
    spec = importlib.util.spec_from_file_location(modname, path)
    module = importlib.util.module_from_spec(spec)
    sys.modules[modname] = module
    try:
        spec.loader.exec_module(module)
    except BaseException:
        sys.modules.pop(modname, None)
        raise
    found, names = [], set()
    for value in vars(module).values():
        if isinstance(value, Derivation) and value not in found:
            if value.name in names:
                raise ValueError(f"derivation name={value.name!r} must be unique in {path.name}")
            names.add(value.name)
            found.append(value)
    return found


def _label(path, root):
    try:
        return path.resolve().relative_to(Path(root).resolve()).as_posix()
    except ValueError:
        return path.name


def _selected(derivations, only):
    return [d for d in derivations if not only or d.name in only]


def _unreadable(record, error):
    """One ``unreadable`` comparison per result when the stored file cannot be read."""
    return [Comparison(record.name, name, "unreadable", None, None, None,
                       f"  the stored results file cannot be read: {error}")
            for name in record.results]


def run_file(path, *, only=None, root=None, progress=None, counter=None, derivations=None,
             budget=None):
    """Run the derivations of one file and compare their results with the stored ones.

    ``derivations`` (already loaded) avoids importing the file twice; ``budget`` (a
    :class:`~amalgebra.derivations.budget.Budget`) bounds each comparison.
    """
    path = Path(path)
    outcome = FileOutcome(path, _label(path, root or path.parent))
    try:
        if derivations is None:
            derivations = load_derivations(path)
    except Exception as exc:  # noqa: BLE001 - a broken user file is a reported failure
        outcome.load_error = exc
        return outcome
    outcome.derivation_names = [d.name for d in derivations]
    try:
        stored = load_results(results_path(path))
    except StoredResultError as exc:
        outcome.store_error, stored = exc, None
    if stored is not None:
        outcome.store_problems = list(stored.problems)
    for deriv in _selected(derivations, only):
        record = deriv.run()
        outcome.records.append(record)
        if record.ok and outcome.store_error is not None:
            outcome.comparisons.extend(_unreadable(record, outcome.store_error))
        elif record.ok:
            outcome.comparisons.extend(compare_record(
                record, None if stored is None else stored.get(deriv.name), budget=budget))
        if progress is not None:
            counter[0] += 1
            progress(counter[0], counter[1], f"{outcome.name}::{deriv.name}", record)
    if stored is not None and not only:
        known = {d.name for d in derivations}
        for section, entries in stored.items():
            if section not in known:
                outcome.comparisons.extend(Comparison(section, name, "stale", e.text, None, e.line)
                                           for name, e in entries.items())
    return outcome


def _run_all(folder, only, progress, budget=None):
    paths = discover(folder)
    root = folder if Path(folder).is_dir() else Path(folder).parent
    loaded = []
    for p in paths:
        try:
            loaded.append((p, load_derivations(p), None))
        except Exception as exc:  # noqa: BLE001
            loaded.append((p, None, exc))
    total = sum(len(_selected(d, only)) for _, d, _ in loaded if d is not None)
    counter = [0, total]
    files = []
    for p, derivs, error in loaded:
        if error is not None:
            files.append(FileOutcome(p, _label(p, root), load_error=error))
        else:
            files.append(run_file(p, only=only, root=root, progress=progress,
                                  counter=counter, derivations=derivs, budget=budget))
    return files


def run_folder(folder, *, only=None, exact=False, progress=None, budget=None):
    """Run every derivation file under ``folder``; see the module docstring.

    Parameters
    ==========

    folder : path of a folder (searched recursively) or of one derivation file.
    only : collection of derivation names to run (all when empty).
    exact : count steps checked only numerically, and stored results found equal
        only by the numeric test, as failures.
    progress : optional ``callable(done, total, label, record)`` called after each
        derivation.
    budget : :class:`~amalgebra.derivations.budget.Budget` bounding each comparison
        of a stored result (default: ``Budget()``).
    """
    return RunOutcome(_run_all(folder, set(only or ()), progress, budget), exact)


def record_folder(folder, *, only=None, progress=None, budget=None):
    """Run the derivations and (re)write their stored results: the explicit re-record.

    A file is written only when every selected derivation in it succeeded.  With
    ``only``, stored entries of the other derivations are kept as they are (so a file
    with an unreadable entry is not merged into: a full record is needed); without it,
    the file is rewritten from scratch (stale and unreadable entries disappear).  A
    results path that is a symbolic link or not a regular file is never written
    (:func:`~amalgebra.derivations.store.write_results`); that file's outcome then
    carries the error.
    """
    only = set(only or ())
    files = _run_all(folder, only, progress, budget)
    for f in files:
        if f.load_error is not None or not f.records or any(not r.ok for r in f.records):
            continue
        target = results_path(f.path)
        if only:
            if f.store_error is not None:
                continue  # cannot merge into an unreadable file: a full re-record is needed
            old = load_results(target) or {}
            if f.store_problems or any(e.error for v in old.values() for e in v.values()):
                f.store_error = StoredResultError(
                    f"{target}: not recorded with --only: it has unreadable entries (a "
                    "record without --only rewrites the whole file)")
                continue
        else:
            old = {}
        new = {r.name: dict(r.results) for r in f.records}
        merged = {}
        for name in f.derivation_names:
            if name in new:
                merged[name] = new[name]
            elif name in old:
                merged[name] = dict(old[name])
        for section, entries in old.items():
            merged.setdefault(section, dict(entries))
        if not any(merged.values()) and not os.path.lexists(target):
            continue  # nothing to store: no empty file beside a derivation without results
        try:
            write_results(target, merged, f.path.name)
            # Read back what was written: the comparison then also proves the round trip.
            stored = load_results(target)
        except StoredResultError as exc:
            f.store_error = exc
            continue
        f.recorded, f.store_error, f.store_problems = True, None, list(stored.problems)
        f.comparisons = [c for r in f.records
                         for c in compare_record(r, stored.get(r.name), budget=budget)]
    return RunOutcome(files)
