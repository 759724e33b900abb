r"""Stored results: a small, reviewable text format read without running any code.

Explanation
===========

The named results of ``deriv_<topic>.py`` are stored beside it in
``deriv_<topic>.results.toml``.  The file is valid TOML, restricted to a subset that a
reviewer reads at a glance and that :func:`load_results` checks line by line::

    # comment lines and blank lines are free
    format = "amalgebra-results-1"

    [derivation_name]
    result_name = "expression in amalgebra's grammar"

* the ``format`` line comes before any section;
* one ``[section]`` per derivation and one ``key = "value"`` line per result, section
  and key names are identifiers, never repeated;
* a value is a double-quoted string without ``"``, ``\\`` or control characters,
  holding an expression in the grammar of :mod:`amalgebra.parsing`, which is what
  :func:`~amalgebra.parsing.to_text` writes.

Loading parses every value with :func:`amalgebra.parsing.parse` (never ``eval``,
``sympify`` or pickle).  Anything else -- a bad line, a duplicate, an expression
outside the grammar -- raises :class:`~amalgebra.errors.StoredResultError` naming the
file and the line.  A missing file means "not recorded yet".  Files are written only by
:func:`write_results`, which the runner calls only on an explicit ``record``.

Examples
========

>>> import tempfile, pathlib
>>> from sympy import Rational, Symbol
>>> from amalgebra.derivations.store import load_results, write_results
>>> path = pathlib.Path(tempfile.mkdtemp()) / "deriv_demo.results.toml"
>>> write_results(path, {"demo": {"half": Rational(1, 2)*Symbol("j")}})
>>> print(path.read_text().splitlines()[-1])
half = "1/2*j"
>>> stored = load_results(path)
>>> stored["demo"]["half"].expr == Rational(1, 2)*Symbol("j"), stored["demo"]["half"].line
(True, 6)
"""

import re
from dataclasses import dataclass
from pathlib import Path

from ..errors import ParseError, StoredResultError

__all__ = ["FORMAT", "StoredEntry", "results_path", "load_results", "write_results", "render_results"]

FORMAT = "amalgebra-results-1"
_MAX_BYTES = 10_000_000

_KEY = r"[A-Za-z_][A-Za-z0-9_]*"
_SECTION_RE = re.compile(rf"\[({_KEY})\]\Z")
_ENTRY_RE = re.compile(rf"({_KEY}) = \"([^\"\\\x00-\x1f\x7f]*)\"\Z")


@dataclass(frozen=True)
class StoredEntry:
    """One stored result: its text, the expression it parses to, and its line."""

    text: str
    expr: object
    line: int


def results_path(derivation_file):
    """The stored-results file beside ``deriv_<topic>.py``: ``deriv_<topic>.results.toml``."""
    p = Path(derivation_file)
    return p.with_name(p.stem + ".results.toml")


def load_results(path):
    """Read a stored-results file; ``None`` when it does not exist.

    Returns ``{derivation: {result: StoredEntry}}`` in file order.

    Raises
    ======

    StoredResultError
        ``<file>:<line>: ...`` for any malformed line, duplicate, or expression outside
        the grammar.
    """
    from ..parsing import parse

    path = Path(path)
    if not path.exists():
        return None
    raw = path.read_bytes()
    if len(raw) > _MAX_BYTES:
        raise StoredResultError(f"{path}: file of {len(raw)} bytes must be at most {_MAX_BYTES}")
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        raise StoredResultError(f"{path}: must be UTF-8 text ({exc})") from None
    data, section, seen_format = {}, None, False
    for number, line in enumerate(text.splitlines(), start=1):
        where = f"{path}:{number}"
        stripped = line.strip()
        if not stripped or stripped.startswith("#"):
            continue
        m = _SECTION_RE.match(stripped)
        if m:
            if not seen_format:
                raise StoredResultError(f"{where}: the format line must come before any section")
            section = m.group(1)
            if section in data:
                raise StoredResultError(f"{where}: section [{section}] must appear only once")
            data[section] = {}
            continue
        m = _ENTRY_RE.match(stripped)
        if not m:
            raise StoredResultError(f"{where}: line {stripped[:60]!r} must be a comment, "
                                    '[section] or key = "expression"')
        key, value = m.groups()
        if section is None:
            if key != "format" or seen_format:
                raise StoredResultError(f"{where}: only one format line may precede the sections")
            if value != FORMAT:
                raise StoredResultError(f"{where}: format={value!r} must be {FORMAT!r}")
            seen_format = True
            continue
        if key in data[section]:
            raise StoredResultError(f"{where}: result {section}.{key} must appear only once")
        try:
            expr = parse(value)
        except ParseError as exc:
            raise StoredResultError(f"{where}: result {section}.{key} is not a valid "
                                    f"expression: {exc}") from None
        data[section][key] = StoredEntry(value, expr, number)
    if not seen_format:
        raise StoredResultError(f"{path}:1: the file must declare format = \"{FORMAT}\"")
    return data


def render_results(results, source_name=""):
    """The text of a stored-results file for ``{derivation: {result: expr}}``."""
    from ..parsing import to_text

    lines = [f"# Stored results{' of ' + source_name if source_name else ''}, written by "
             "`amalgebra record`.",
             "# Data, not code: each value is an expression in amalgebra's grammar "
             "(amalgebra.parsing).",
             f'format = "{FORMAT}"']
    for deriv, entries in results.items():
        if not entries:
            continue
        lines += ["", f"[{deriv}]"]
        for name, expr in entries.items():
            text = expr if isinstance(expr, str) else to_text(expr)
            lines.append(f'{name} = "{text}"')
    return "\n".join(lines) + "\n"


def write_results(path, results, source_name=""):
    """Write ``{derivation: {result: expr or stored text}}`` to ``path`` (deterministic).

    Values that are ``str`` are written as they are (already in the grammar), so that
    entries not being re-recorded keep their reviewed text.
    """
    Path(path).write_text(render_results(results, source_name), encoding="utf-8")
