r"""Derivation records that check themselves, render as LaTeX and guard their results.

A group's derivations become a test suite that typesets itself:

* :mod:`~amalgebra.derivations.record` -- ``@derivation`` functions with named,
  justified, engine-checked steps and named results;
* :mod:`~amalgebra.derivations.written` -- step sides as the author writes them
  (unevaluated symbols, ``written(tex, value)``) and the values the engine compares;
* :mod:`~amalgebra.derivations.checks` -- how a step is checked (canonical operator
  form, exact matrices, ``simplify``, and a clearly labelled numerical fallback);
* :mod:`~amalgebra.derivations.store` -- the stored-results text format (data, never
  code);
* :mod:`~amalgebra.derivations.regression` -- identical / reprinted / changed /
  unrecorded / stale / undecided / unreadable;
* :mod:`~amalgebra.derivations.budget` -- every equality decision on a stored value
  within a time and size budget (exact normal form, then a seeded numeric test);
* :mod:`~amalgebra.derivations.latex` -- ``align`` environments and a standalone report;
* :mod:`~amalgebra.derivations.runner` -- running, checking and re-recording a folder.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.derivations import derivation
>>> @derivation
... def difference_of_squares(d):
...     a, b = symbols("a b")
...     d.step("factor", a**2 - b**2, (a - b)*(a + b), "multiply out the right side")
>>> difference_of_squares.run().ok
True
"""

from .budget import Budget, Decision, decide_equal
from .checks import Check, check_equality
from .latex import derivation_latex, report_latex
from .record import Derivation, DerivationRecord, StepRecord, Steps, derivation
from .regression import Comparison, compare_entry, compare_record, compare_value
from .runner import FileOutcome, RunOutcome, discover, record_folder, run_folder
from .store import StoredEntry, StoredResults, load_results, results_path, write_results
from .written import Written, written

__all__ = [
    "derivation", "Derivation", "Steps", "StepRecord", "DerivationRecord", "written", "Written",
    "Check", "check_equality",
    "derivation_latex", "report_latex",
    "Comparison", "compare_value", "compare_entry", "compare_record",
    "Budget", "Decision", "decide_equal",
    "FileOutcome", "RunOutcome", "discover", "run_folder", "record_folder",
    "load_results", "write_results", "results_path", "StoredEntry", "StoredResults",
]
