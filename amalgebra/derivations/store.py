r"""Stored results: a small, reviewable text format, read without running any code.

Explanation
===========

The named results of ``deriv_<topic>.py`` are stored beside it in
``deriv_<topic>.results.toml``.  The file is valid TOML (the stdlib ``tomllib`` reads
it), restricted to a subset that a reviewer reads at a glance::

    # comment lines and blank lines are free
    format = "amalgebra-results-2"

    [derivation_name]
    energy = "5/4*A + 6834.682610904*b"            # an expression (trailing comments allowed)
    typed = 72.222                                 # a bare number: the exact rational 36111/500
    levels = { tuple = ["5/4*A", "-7/4*A"] }       # a tuple (items: any stored value)
    H = { matrix = [                               # an immutable matrix, one row per line
        ["A", "0"],
        ["0", "-A"],
    ] }
    named = { dict = { upper = "3/2*A", lower = "-A" } }   # a dict with identifier keys
    by_F = { dict = [["3", "5/4*A"], ["2", "-7/4*A"]] }    # a dict with expression keys
    Hz = { basis_matrix = [                        # a matrix in a basis of states
        ["|1/2, 1/2>_S", "|1/2, -1/2>_S"],  # basis: rows and columns
        ["b/2", "0"],
        ["0", "-b/2"],
    ] }

* the ``format`` line comes before any section (``amalgebra-results-1`` files, which
  hold expressions only, are read too; files are written as ``amalgebra-results-2``);
* one ``[section]`` per derivation and one ``name = value`` entry per result; section
  and result names are identifiers, never repeated; an entry starts on its own line and
  only arrays may continue on the following lines;
* a ``basis_matrix`` (an :class:`~amalgebra.states.hamiltonian.OperatorMatrix` or
  ``HamiltonianMatrix``: a square matrix with the states of its rows and columns) is
  the list of the basis states, kets as the library prints them, then one row per
  state; it is read back as an ``OperatorMatrix`` whose ``Basis`` takes its labels
  (and, for product kets, the ``(j, m)`` per label) from the kets;
* a leaf is a double-quoted string without ``"``, ``\\`` or control characters holding
  an expression in the grammar of :mod:`amalgebra.parsing` (what
  :func:`~amalgebra.parsing.to_text` writes; exact decimals included), or a bare
  decimal number, which is read as the same exact rational.

**Reading** (:func:`load_results`) never follows a symbolic link and opens only a
regular file (a directory, FIFO, device or link is a :class:`~amalgebra.errors.StoredResultError`
at once, never a blocking or unbounded read); at most :data:`MAX_BYTES` bytes are read,
the text must be UTF-8.  The structure of the whole file is checked at load; expression
text is parsed with :func:`amalgebra.parsing.parse` (never ``eval``, ``sympify`` or
pickle) when a value is first needed -- a result whose stored text equals the new
result's text never needs parsing, which is what makes ``amalgebra check`` cheap on
large files.  ``load_results(path, strict=True)`` parses everything at once.

**Errors** name the file, the line and the column and say what was expected; they
never quote the file's content.  A problem confined to one entry (a value outside the
grammar, a malformed value, a repeated name) marks only that entry
(:attr:`StoredEntry.error`; the runner reports it as ``unreadable`` and counts it);
problems outside entries are collected in :attr:`StoredResults.problems`.  Only a file
that cannot be read at all (not a regular file, too large, not UTF-8, no format line)
raises.

**Writing** (:func:`write_results`, called only by an explicit ``record``) goes to a
temporary file in the same folder that then replaces the target with ``os.replace``:
nothing is ever written through a link, and a reader never sees a half-written file.
A target that is a symbolic link, or exists and is not a regular file, is refused.

Limits: :data:`MAX_BYTES` per file, :data:`MAX_DEPTH` levels of nested tuples and
dicts, and the expression limits of :class:`amalgebra.parsing.ParseLimits` per leaf.

Examples
========

>>> import tempfile, pathlib
>>> from sympy import Matrix, Rational, Symbol
>>> from amalgebra.derivations.store import load_results, write_results
>>> path = pathlib.Path(tempfile.mkdtemp()) / "deriv_demo.results.toml"
>>> j = Symbol("j")
>>> write_results(path, {"demo": {"half": Rational(1, 2)*j, "mhz": Rational(36111, 500),
...                               "pair": (j, 2*j), "M": Matrix([[j, 0], [0, -j]])}})
>>> print("\n".join(path.read_text().splitlines()[-7:]))
half = "1/2*j"
mhz = "72.222"
pair = { tuple = ["j", "2*j"] }
M = { matrix = [
    ["j", "0"],
    ["0", "-j"],
] }
>>> stored = load_results(path)
>>> stored["demo"]["half"].value == j/2, stored["demo"]["half"].line
(True, 6)
>>> stored["demo"]["M"].value == Matrix([[j, 0], [0, -j]]), stored["demo"]["pair"].value
(True, (j, 2*j))
"""

import bisect
import errno
import functools
import os
import re
import stat
import tempfile
from pathlib import Path

from ..errors import StoredResultError

__all__ = ["FORMAT", "READ_FORMATS", "MAX_BYTES", "MAX_DEPTH", "StoredEntry", "StoredResults",
           "results_path", "load_results", "write_results", "render_results", "encode_value",
           "node_text"]

FORMAT = "amalgebra-results-2"
#: Format lines this version reads (the first holds expressions only).
READ_FORMATS = ("amalgebra-results-1", FORMAT)
#: Largest stored-results file read, in bytes (a 60,000-entry file is about 1.4 MB).
MAX_BYTES = 10_000_000
#: Deepest nesting of tuples and dicts inside one stored value.
MAX_DEPTH = 16

_KEY = r"[A-Za-z_][A-Za-z0-9_]*"
_LEAF_CHARS = r'[^"\\\x00-\x1f\x7f]*'
_NUMBER = r"-?(?:0|[1-9][0-9]*)(?:\.[0-9]+)?"
_TAIL = r"[ \t]*(?:#[^\n]*)?\Z"
_SECTION_RE = re.compile(rf"[ \t]*\[[ \t]*({_KEY})[ \t]*\]{_TAIL}")
# The one-line "name = leaf" entry: nearly every line of a file, matched in one call.
_SIMPLE_RE = re.compile(rf'[ \t]*({_KEY})[ \t]*=[ \t]*(?:"({_LEAF_CHARS})"|({_NUMBER})){_TAIL}')
_ENTRY_START_RE = re.compile(rf"[ \t]*({_KEY})[ \t]*=[ \t]*")
_BLANK_RE = re.compile(r"[ \t]*(?:#[^\n]*)?\Z")
_TOKEN_RE = re.compile(rf'(?P<ws>[ \t]+|#[^\n]*)|(?P<nl>\n)|"(?P<str>{_LEAF_CHARS})"'
                       rf"|(?P<num>{_NUMBER})(?![0-9A-Za-z_.])|(?P<key>{_KEY})|(?P<punct>[\[\]{{}},=])")
_LINE_END_RE = re.compile(r"[ \t]*(?:#[^\n]*)?(?:\r?\n|\Z)")
_TAGS = ("tuple", "matrix", "dict", "basis_matrix")

# A node of a stored value: ("expr", text, offset) | ("tuple", [node]) |
# ("matrix", [[node]]) | ("table", [(str, node)]) | ("dict", [(node, node)])
# | ("basis_matrix", [state node], [[node]]).
# ``offset`` is the position of the leaf in the file (-1 for values not read from one).


class StoredEntry:
    """One stored result: its text, its line, and its value parsed on first use.

    Attributes
    ==========

    text : str
        The stored value as one line: the expression text for an expression,
        ``(a, b)``, ``Matrix([[a, b], [c, d]])`` or ``{key: value}`` for the others.
    line : int or None
        Line of the entry in its file.
    error : str or None
        Why the entry cannot be read (``file:line:column: ...``), or ``None``.
    """

    __slots__ = ("text", "line", "node", "error", "_source", "_value")

    def __init__(self, text, value=None, line=None, *, node=None, error=None, source=None):
        self.text, self.line, self.error, self._source = text, line, error, source
        self.node = ("expr", text, -1) if node is None and error is None else node
        self._value = value

    def __repr__(self):
        state = f", error={self.error!r}" if self.error else ""
        return f"StoredEntry({self.text!r}, line={self.line}{state})"

    @property
    def value(self):
        """The stored value (expression, tuple, dict or immutable matrix), parsed once.

        Raises :class:`~amalgebra.errors.StoredResultError` when it cannot be read.
        """
        if self.error is not None:
            raise StoredResultError(self.error)
        if self._value is None:
            self._value = decode_node(self.node, self._source)
        return self._value

    expr = value  # the name of the attribute before structured values existed


class StoredResults(dict):
    """``{derivation: {result: StoredEntry}}`` in file order, plus the file's problems.

    ``problems`` lists ``file:line:column: ...`` messages about lines that belong to no
    entry (a malformed section header, a line that is neither a comment, a section nor
    an entry, a repeated section); entries keep their own :attr:`StoredEntry.error`.
    """

    def __init__(self, path):
        super().__init__()
        self.path = path
        self.problems = []

    @property
    def entry_errors(self):
        """``(derivation, result, message)`` for every unreadable entry, in file order."""
        return [(d, k, e.error) for d, entries in self.items() for k, e in entries.items()
                if e.error is not None]


def results_path(derivation_file):
    """The stored-results file beside ``deriv_<topic>.py``: ``deriv_<topic>.results.toml``."""
    p = Path(derivation_file)
    return p.with_name(p.stem + ".results.toml")


# ----------------------------------------------------------------------------- reading files

def _kind_of(mode):
    for test, name in ((stat.S_ISDIR, "a directory"), (stat.S_ISFIFO, "a FIFO"),
                       (stat.S_ISCHR, "a character device"), (stat.S_ISBLK, "a block device"),
                       (stat.S_ISSOCK, "a socket"), (stat.S_ISLNK, "a symbolic link")):
        if test(mode):
            return name
    return "not a regular file"


def _read_bytes(path, max_bytes):
    """The bytes of a regular file (None when absent), never following a link or blocking."""
    nofollow = getattr(os, "O_NOFOLLOW", 0)
    flags = (os.O_RDONLY | nofollow | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_CLOEXEC", 0)
             | getattr(os, "O_NOCTTY", 0) | getattr(os, "O_BINARY", 0))
    if not nofollow:  # no O_NOFOLLOW (Windows): check first, accepting the small race
        try:
            if stat.S_ISLNK(os.lstat(path).st_mode):
                raise StoredResultError(f"{path}: is a symbolic link; stored results must be "
                                        "a regular file (links are not followed)")
        except FileNotFoundError:
            return None
    try:
        fd = os.open(path, flags)
    except FileNotFoundError:
        return None
    except OSError as exc:
        if exc.errno == errno.ELOOP or (exc.errno == errno.EMLINK and nofollow):
            raise StoredResultError(f"{path}: is a symbolic link; stored results must be a "
                                    "regular file (links are not followed)") from None
        if exc.errno == errno.EISDIR:
            raise StoredResultError(f"{path}: is a directory; stored results must be a "
                                    "regular file") from None
        raise StoredResultError(f"{path}: cannot be opened ({exc.strerror})") from None
    try:
        info = os.fstat(fd)
        if not stat.S_ISREG(info.st_mode):
            raise StoredResultError(f"{path}: is {_kind_of(info.st_mode)}; stored results "
                                    "must be a regular file")
        if info.st_size > max_bytes:
            raise StoredResultError(f"{path}: file of {info.st_size} bytes must be at most "
                                    f"MAX_BYTES={max_bytes} bytes")
        chunks, size = [], 0
        while size <= max_bytes:  # the cap holds even if the file grows while read
            chunk = os.read(fd, min(1 << 20, max_bytes + 1 - size))
            if not chunk:
                break
            chunks.append(chunk)
            size += len(chunk)
        if size > max_bytes:
            raise StoredResultError(f"{path}: file of more than {max_bytes} bytes must be at "
                                    f"most MAX_BYTES={max_bytes} bytes")
        return b"".join(chunks)
    except OSError as exc:
        raise StoredResultError(f"{path}: cannot be read ({exc.strerror})") from None
    finally:
        os.close(fd)


def load_results(path, *, strict=False, max_bytes=MAX_BYTES):
    """Read a stored-results file; ``None`` when it does not exist.

    Returns a :class:`StoredResults` (``{derivation: {result: StoredEntry}}`` in file
    order).  The structure is checked at once; expression text is parsed when a
    value is first used (``entry.value``), or at once with ``strict=True``.

    Raises
    ======

    StoredResultError
        ``<file>: ...`` when the file cannot be read at all: a symbolic link, a
        directory, FIFO or device, more than ``max_bytes`` bytes, not UTF-8, no or an
        unknown format line.  With ``strict=True``, also the first problem of the file
        or of any entry.  The message never quotes the file's content.
    """
    path = Path(path)
    raw = _read_bytes(path, max_bytes)
    if raw is None:
        return None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw.count(b"\n", 0, exc.start) + 1
        raise StoredResultError(f"{path}:{line}: must be UTF-8 text (invalid byte at offset "
                                f"{exc.start})") from None
    results = _Reader(path, text).read()
    if strict:
        if results.problems:
            raise StoredResultError(results.problems[0])
        for entries in results.values():
            for entry in entries.values():
                entry.value  # noqa: B018 - parse now; raises StoredResultError
    return results


class _Source:
    """Maps offsets of one file to ``file:line:column`` (for messages about leaves)."""

    __slots__ = ("path", "starts")

    def __init__(self, path, starts):
        self.path, self.starts = path, starts

    def where(self, offset):
        if offset < 0:
            return f"{self.path}"
        line = bisect.bisect_right(self.starts, offset)
        return f"{self.path}:{line}:{offset - self.starts[line - 1] + 1}"


class _Bad(Exception):
    """A malformed value at ``offset``; ``expected`` says what should have been there."""

    def __init__(self, offset, expected):
        super().__init__(expected)
        self.offset, self.expected = offset, expected


class _Reader:
    def __init__(self, path, text):
        self.path, self.text = path, text
        starts, i = [0], text.find("\n")
        while i >= 0:
            starts.append(i + 1)
            i = text.find("\n", i + 1)
        self.starts = starts
        self.source = _Source(path, starts)

    def where(self, offset):
        return self.source.where(offset)

    def _line(self, number):
        """Text of line ``number`` (0-based), without its newline or a final CR."""
        start = self.starts[number]
        end = self.starts[number + 1] - 1 if number + 1 < len(self.starts) else len(self.text)
        line = self.text[start:end]
        return line[:-1] if line.endswith("\r") else line

    def read(self):
        results = StoredResults(self.path)
        section, entries, seen_format, number, count = None, None, False, 0, len(self.starts)
        simple, section_re, blank = _SIMPLE_RE.match, _SECTION_RE.match, _BLANK_RE.match
        while number < count:
            line = self._line(number)
            start = self.starts[number]
            m = simple(line)
            if m is not None and section is not None:
                key, leaf, num = m.groups()
                where_key = start + m.start(1)
                value_at = start + (m.start(2) - 1 if leaf is not None else m.start(3))
                self._add(entries, section, key, number + 1, where_key,
                          ("expr", leaf if leaf is not None else num,
                           value_at + (leaf is not None)))
                number += 1
                continue
            if blank(line):
                number += 1
                continue
            m = section_re(line)
            if m is not None:
                if not seen_format:
                    raise StoredResultError(f"{self.where(start)}: the format line "
                                            f'format = "{FORMAT}" must come before any section')
                name = m.group(1)
                if name in results:
                    results.problems.append(f"{self.where(start + m.start(1))}: section "
                                            f"[{name}] must appear only once (its entries "
                                            "are not read)")
                    section, entries = name, {}
                    number += 1
                    continue
                results[name] = entries = {}
                section = name
                number += 1
                continue
            m = _ENTRY_START_RE.match(line)
            if m is None:
                if not seen_format:
                    raise StoredResultError(f"{self.where(start)}: the file must begin with "
                                            f'format = "{FORMAT}" (after comments)')
                col = len(line) - len(line.lstrip(" \t"))
                results.problems.append(f"{self.where(start + col)}: expected a comment, a "
                                        "[section] or an entry name = value")
                number = self._resync(number + 1)
                continue
            key = m.group(1)
            try:
                node, end = self._value(start + m.end(), 0)
                end = self._line_end(end)
            except _Bad as bad:
                message = f"{self.where(bad.offset)}: expected {bad.expected}"
                if section is None:
                    raise StoredResultError(f"{message} in the format line") from None
                self._add(entries, section, key, number + 1, start + m.start(1), None, message)
                number = self._resync(number + 1)
                continue
            if section is None:
                if seen_format or key != "format":
                    raise StoredResultError(f"{self.where(start)}: only the format line may "
                                            "precede the first section")
                if node[0] != "expr" or node[2] < 0 or self.text[node[2] - 1] != '"' \
                        or node[1] not in READ_FORMATS:
                    raise StoredResultError(f"{self.where(start + m.end())}: format must be "
                                            f"one of {', '.join(map(repr, READ_FORMATS))}")
                seen_format = True
            else:
                self._add(entries, section, key, number + 1, start + m.start(1), node)
            number = bisect.bisect_right(self.starts, end)
        if not seen_format:
            raise StoredResultError(f"{self.path}:1: the file must declare "
                                    f'format = "{FORMAT}"')
        return results

    def _add(self, entries, section, key, line, key_offset, node, error=None):
        if key in entries:
            first = entries[key].line
            message = (f"{self.where(key_offset)}: result {section}.{key} must appear only "
                       f"once (also on line {first})")
            entries[key] = StoredEntry(entries[key].text, line=first, error=message,
                                       source=self.source)
            return
        text = node_text(node) if node is not None else ""
        entries[key] = StoredEntry(text, line=line, node=node, error=error, source=self.source)

    def _resync(self, number):
        """The next line that starts an entry or a section (after a malformed one)."""
        while number < len(self.starts):
            line = self._line(number)
            if _ENTRY_START_RE.match(line) or _SECTION_RE.match(line):
                return number
            number += 1
        return number

    def _line_end(self, pos):
        """After a value: only spaces and a comment may follow on its line."""
        m = _LINE_END_RE.match(self.text, pos)
        if m is None:
            while self.text[pos] in " \t":
                pos += 1
            raise _Bad(pos, "the end of the line (or a comment) after the value")
        return max(pos, m.end() - 1)

    # -- values: leaves, tagged inline tables and arrays (TOML subset)
    def _token(self, pos, newlines):
        """(kind, text, start, end) of the next token, skipping spaces/comments (and
        newlines inside arrays)."""
        text = self.text
        while True:
            m = _TOKEN_RE.match(text, pos)
            if m is None:
                if pos >= len(text):
                    return ("end", "", pos, pos)
                if text[pos] == "\r" and text.startswith("\r\n", pos) and newlines:
                    pos += 1
                    continue
                if text[pos] == '"':
                    bad = re.compile(_LEAF_CHARS).match(text, pos + 1).end()
                    if bad < len(text) and text[bad] != "\n":
                        raise _Bad(bad, 'the closing " of the string (a stored string holds '
                                        'no \\, " or control characters)')
                    raise _Bad(bad, 'the closing " of the string on the same line')
                raise _Bad(pos, "a value, a bracket or a comma here (unexpected character)")
            kind = m.lastgroup
            if kind == "ws" or (kind == "nl" and newlines):
                pos = m.end()
                continue
            return (kind, m.group(kind), m.start(), m.end())

    def _value(self, pos, depth):
        if depth > MAX_DEPTH:
            raise _Bad(pos, f"at most MAX_DEPTH={MAX_DEPTH} levels of nested values")
        kind, text, start, end = self._token(pos, False)
        if kind == "str":
            return ("expr", text, start + 1), end
        if kind == "num":
            return ("expr", text, start), end
        if kind == "punct" and text == "{":
            return self._tagged(end, depth)
        if kind == "punct" and text == "[":
            raise _Bad(start, 'a tagged value: { tuple = [...] }, { matrix = [[...]] }, '
                              "{ basis_matrix = [...] } or { dict = ... } (a bare array has no kind)")
        raise _Bad(start, 'a value: "expression", a number or { tuple|matrix|basis_matrix|dict = ... }')

    def _tagged(self, pos, depth):
        kind, tag, start, end = self._token(pos, False)
        if kind != "key" or tag not in _TAGS:
            raise _Bad(start, "one of the tags tuple, matrix, basis_matrix, dict")
        kind, text, start, end = self._token(end, False)
        if text != "=":
            raise _Bad(start, "= after the tag")
        if tag == "dict":
            kind, text, start, after = self._token(end, False)
            if text == "{":
                node, end = self._table(after, depth + 1)
            elif text == "[":
                items, end = self._array(after, depth + 1)
                node = ("dict", [self._pair(item, at) for item, at in items])
            else:
                raise _Bad(start, "{ name = value, ... } or [[key, value], ...] for a dict")
        else:
            kind, text, start, after = self._token(end, False)
            if text != "[":
                raise _Bad(start, f"[ to begin the {tag}")
            items, end = self._array(after, depth + 1)
            if tag == "tuple":
                for item, where in items:
                    if item[0] == "array":
                        raise _Bad(where, "a stored value as tuple item (a bare array has "
                                          "no kind)")
                node = ("tuple", [item for item, _ in items])
            elif tag == "basis_matrix":
                node = self._basis_matrix(items, start)
            else:
                node = ("matrix", self._rows(items, start))
        kind, text, start, end = self._token(end, False)
        if text != "}":
            raise _Bad(start, f"}} to close {{ {tag} = ... }}")
        return node, end

    def _array(self, pos, depth):
        """Items ``[(node, offset)]`` of an array whose ``[`` ends before ``pos``."""
        if depth > MAX_DEPTH:
            raise _Bad(pos - 1, f"at most MAX_DEPTH={MAX_DEPTH} levels of nested values")
        items = []
        while True:
            kind, text, start, end = self._token(pos, True)
            if text == "]":
                return items, end
            if kind == "punct" and text == "[":
                node, end = self._array(end, depth + 1)
                node = ("array", node)
            else:
                node, end = self._value(start, depth)
            items.append((node, start))
            kind, text, start, end = self._token(end, True)
            if text == "]":
                return items, end
            if text != ",":
                raise _Bad(start, ", or ] in the array")
            pos = end

    def _table(self, pos, depth):
        pairs, names = [], set()
        kind, text, start, end = self._token(pos, False)
        if text == "}":
            return ("table", pairs), end
        while True:
            if kind != "key":
                raise _Bad(start, "a key name of the dict (an identifier)")
            if text in names:
                raise _Bad(start, "each key of the dict only once")
            names.add(text)
            name = text
            kind, text, start, end = self._token(end, False)
            if text != "=":
                raise _Bad(start, "= after the dict key")
            node, end = self._value(end, depth)
            pairs.append((name, node))
            kind, text, start, end = self._token(end, False)
            if text == "}":
                return ("table", pairs), end
            if text != ",":
                raise _Bad(start, ", or } in the dict")
            kind, text, start, end = self._token(end, False)

    @staticmethod
    def _pair(item, at):
        if item[0] != "array" or len(item[1]) != 2 or any(n[0] == "array" for n, _ in item[1]):
            raise _Bad(at, "a [key, value] pair in the dict")
        return (item[1][0][0], item[1][1][0])

    @classmethod
    def _basis_matrix(cls, items, at):
        """``[[state, ...], [row], ...]``: the basis (rows and columns), then the square matrix."""
        if not items:
            raise _Bad(at, "[basis states], then one row per state in the basis_matrix")
        basis = cls._rows(items[:1], at)[0]
        expected = (f"{len(basis)} rows of {len(basis)} entries (one per basis state) "
                    "in the basis_matrix")
        try:
            rows = cls._rows(items[1:], at)
        except _Bad as exc:  # rows of unequal length: say what a basis_matrix needs
            if exc.offset != at:  # a row that is not a row of expressions: as it is
                raise
            raise _Bad(at, expected) from None
        if len(rows) != len(basis) or any(len(r) != len(basis) for r in rows):
            raise _Bad(at, expected)
        return ("basis_matrix", basis, rows)

    @staticmethod
    def _rows(items, at):
        rows = []
        for item, where in items:
            if item[0] != "array" or any(n[0] != "expr" for n, _ in item[1]):
                raise _Bad(where, "a row [entry, ...] of expressions in the matrix")
            rows.append([n for n, _ in item[1]])
        if rows and (not rows[0] or any(len(r) != len(rows[0]) for r in rows)):
            raise _Bad(at, "rows of equal, nonzero length in the matrix")
        return rows


# ----------------------------------------------------------------------------- nodes <-> values

_QUOTED_RE = re.compile(r"\[(?:'[A-Za-z_][A-Za-z0-9_]*'(?:, )?)*\]"  # an allow-list: kept
                        r"|'(?:[^'\\\n]|\\.)*'|\"(?:[^\"\\\n]|\\.)*\"")
_WORD_RE = re.compile(r"[^\W\d]\w*|\d+", re.UNICODE)


def _sanitised(message, text):
    """A grammar message without pieces of the input ``text`` (the file's content).

    Quoted pieces go, and so does every word or number of the message that also occurs
    in ``text`` (``argument x of Jz ...`` would otherwise echo ``x``), except the
    grammar's own function names; allow-lists of names (``['cos', 'sin']``) are kept.
    The position is given separately (file:line:column), so ``at column N`` goes too.
    """
    from ..parsing import CONSTRUCTORS, FUNCTIONS

    message = re.sub(r"^text=(?:'(?:[^'\\]|\\.)*'|\"(?:[^\"\\]|\\.)*\") ", "", str(message))
    message = re.sub(r",? at (?:line \d+, )?column \d+", "", message)
    kept = []
    for piece in re.split(f"({_QUOTED_RE.pattern})", message):
        if not piece:
            continue
        if piece.startswith("["):
            kept.append(piece)
        elif piece[0] in "'\"":
            kept.append("…")
        else:
            content = set(_WORD_RE.findall(text)) - set(FUNCTIONS) - set(CONSTRUCTORS)
            kept.append(_WORD_RE.sub(lambda m: "…" if m.group(0) in content else m.group(0),
                                     piece))
    message = "".join(kept)
    return message if len(message) <= 300 else message[:297] + "..."


@functools.lru_cache(maxsize=8192)
def _parse_leaf(text):
    # Stored values repeat ("0" in a matrix, "1/2", ...); parsed SymPy objects are immutable,
    # so one parse per distinct text is enough (failures are not cached: they raise).
    from ..parsing import parse

    return parse(text)


def _leaf_value(node, source):
    from ..errors import ParseError

    from ..parsing import parse

    text, offset = node[1], node[2]
    try:
        return _parse_leaf(text) if len(text) <= 256 else parse(text)
    except (ParseError, RecursionError, ValueError, TypeError, ArithmeticError) as exc:
        column = re.search(r"at (?:line \d+, )?column (\d+)", str(exc))  # a leaf is one line
        at = offset + int(column.group(1)) - 1 if column and offset >= 0 else offset
        where = source.where(at) if source is not None else "stored value"
        raise StoredResultError(f"{where}: expected an expression of amalgebra's grammar "
                                f"({_sanitised(exc, text)})") from None


def decode_node(node, source=None):
    """The value a node stands for (expressions parsed by amalgebra.parsing)."""
    kind = node[0]
    if kind == "expr":
        return _leaf_value(node, source)
    if kind == "tuple":
        return tuple(decode_node(n, source) for n in node[1])
    if kind == "matrix":
        from sympy import ImmutableMatrix

        rows = [[_leaf_value(n, source) for n in row] for row in node[1]]
        return ImmutableMatrix(rows) if rows else ImmutableMatrix(0, 0, [])
    if kind == "basis_matrix":
        from sympy import ImmutableMatrix

        from ..states.hamiltonian import OperatorMatrix

        states = [_leaf_value(n, source) for n in node[1]]
        rows = [[_leaf_value(n, source) for n in row] for row in node[2]]
        return OperatorMatrix(ImmutableMatrix(rows), _basis_of(states))
    if kind == "table":
        return {name: decode_node(n, source) for name, n in node[1]}
    if kind == "dict":
        out = {}
        for key_node, value_node in node[1]:
            key = decode_node(key_node, source)
            if isinstance(key, dict):
                where = source.where(_first_offset(key_node)) if source else "stored value"
                raise StoredResultError(f"{where}: expected a dict key that is not a dict")
            if key in out:
                where = source.where(_first_offset(key_node)) if source else "stored value"
                raise StoredResultError(f"{where}: expected each key of the dict only once")
            out[key] = decode_node(value_node, source)
        return out
    raise StoredResultError(f"stored value: unknown node kind {kind!r}")


def _basis_of(states):
    """The :class:`~amalgebra.states.basis.Basis` of stored states: labels (and ``(j, m)``
    per label for product kets) read off the kets themselves."""
    from ..states.basis import Basis
    from ..states.kets import _factor_map, _mode_map

    try:
        maps = [_factor_map(state) for state in states]
        occupations = [_mode_map(state) for state in states]
    except (AttributeError, TypeError, ValueError, IndexError):
        maps = None
    if maps and all(list(m) == list(maps[0]) for m in maps) \
            and all(list(n) == list(occupations[0]) for n in occupations):
        labels, modes = tuple(maps[0]), tuple(occupations[0])
        values = [tuple(m[label] for label in labels) + tuple(n[mode] for mode in modes)
                  for m, n in zip(maps, occupations)]
        return Basis(states, labels, values, modes)
    labels = getattr(states[0], "labels", ()) if states else ()
    if not all(getattr(state, "labels", ()) == labels for state in states):
        labels = ()
    return Basis(states, tuple(str(label) for label in labels))


def _first_offset(node):
    """Offset of the first leaf of a node (-1 when it has none)."""
    kind = node[0]
    if kind == "expr":
        return node[2]
    children = {"tuple": lambda: node[1], "matrix": lambda: [n for r in node[1] for n in r],
                "basis_matrix": lambda: node[1],
                "table": lambda: [n for _, n in node[1]],
                "dict": lambda: [n for pair in node[1] for n in pair]}[kind]()
    return _first_offset(children[0]) if children else -1


def node_text(node):
    """One-line text of a node: ``j + 1``, ``(a, b)``, ``Matrix([[a, b]])``, ``{k: v}``."""
    kind = node[0]
    if kind == "expr":
        return node[1]
    if kind == "tuple":
        items = [node_text(n) for n in node[1]]
        return "(" + ", ".join(items) + ("," if len(items) == 1 else "") + ")"
    if kind == "matrix":
        return "Matrix([" + ", ".join("[" + ", ".join(node_text(n) for n in row) + "]"
                                      for row in node[1]) + "])"
    if kind == "basis_matrix":
        return ("OperatorMatrix(basis=[" + ", ".join(node_text(n) for n in node[1]) + "], matrix=["
                + ", ".join("[" + ", ".join(node_text(n) for n in row) + "]" for row in node[2])
                + "])")
    if kind == "table":
        return "{" + ", ".join(f"{name}: {node_text(n)}" for name, n in node[1]) + "}"
    return "{" + ", ".join(f"{node_text(k)}: {node_text(v)}" for k, v in node[1]) + "}"


def _leaf_text(text):
    if not isinstance(text, str) or re.fullmatch(_LEAF_CHARS, text) is None or not text.strip():
        raise StoredResultError(f"stored text of {len(text) if isinstance(text, str) else 0} "
                                'characters must be non-empty, without ", \\ or control '
                                "characters")
    return text


def encode_value(value, _depth=0, *, allow_text=True):
    """The node of a result: how :func:`write_results` stores it.

    Expressions (any ``sympy.Basic`` :func:`~amalgebra.parsing.to_text` can write,
    exact decimals written as such), matrices (stored immutable), tuples and lists
    (stored as tuples), dicts (identifier ``str`` keys, or keys that are themselves
    storable values), :class:`StoredEntry` (kept as stored) and ``str`` (expression
    text, kept as it is; refused with ``allow_text=False``, as for a new result).
    Anything else raises :class:`~amalgebra.errors.StoredResultError`.
    """
    from sympy import Basic, Dict, Integer, MatrixBase, Tuple

    from ..errors import ParseError
    from ..parsing import to_text

    if _depth > MAX_DEPTH:
        raise StoredResultError(f"value nested more than MAX_DEPTH={MAX_DEPTH} levels deep "
                                "cannot be stored")
    if isinstance(value, StoredEntry):
        if value.error is not None:
            raise StoredResultError(value.error)
        return value.node
    if isinstance(value, str):
        if not allow_text:
            raise StoredResultError(f"value={value!r} is a str; a result must be a SymPy "
                                    "expression, matrix, tuple or dict")
        return ("expr", _leaf_text(value), -1)
    if isinstance(value, bool):
        raise StoredResultError(f"value={value!r} must be a SymPy expression, matrix, tuple "
                                "or dict (a bool has no stored form)")
    if isinstance(value, int):
        value = Integer(value)
    if isinstance(value, MatrixBase):
        rows, cols = value.shape
        if rows == 0 or cols == 0:
            if rows or cols:
                raise StoredResultError(f"matrix of shape {value.shape} cannot be stored "
                                        "(only 0x0 among empty matrices)")
            return ("matrix", [])
        rows_out = []
        for r in range(rows):
            row = [encode_value(value[r, c], _depth + 1, allow_text=allow_text)
                   for c in range(cols)]
            if any(leaf[0] != "expr" for leaf in row):
                raise StoredResultError("matrix entries must be expressions to be stored")
            rows_out.append(row)
        return ("matrix", rows_out)
    if _is_operator_matrix(value):
        matrix, states = value.matrix, list(value.basis)
        if matrix.shape != (len(states), len(states)) or not states:
            raise StoredResultError(f"an operator matrix of shape {matrix.shape} with "
                                    f"{len(states)} basis states cannot be stored (square, one "
                                    "row and column per basis state)")
        basis = [encode_value(state, _depth + 1, allow_text=allow_text) for state in states]
        rows = encode_value(matrix, _depth + 1, allow_text=allow_text)[1]
        if any(leaf[0] != "expr" for leaf in basis):
            raise StoredResultError("basis states must be expressions to be stored")
        return ("basis_matrix", basis, rows)
    if isinstance(value, (tuple, list, Tuple)):
        return ("tuple", [encode_value(v, _depth + 1, allow_text=allow_text) for v in value])
    if isinstance(value, (dict, Dict)):
        items = list(value.items())
        if items and all(isinstance(k, str) and re.fullmatch(_KEY, k) and k not in _TAGS
                         for k, _ in items):
            return ("table", [(k, encode_value(v, _depth + 1, allow_text=allow_text))
                              for k, v in items])
        if any(isinstance(k, str) for k, _ in items):
            raise StoredResultError("dict keys must all be identifiers (str) or all be "
                                    "storable values, not a mixture or other strings")
        pairs = [(encode_value(k, _depth + 1, allow_text=allow_text),
                  encode_value(v, _depth + 1, allow_text=allow_text)) for k, v in items]
        try:
            from sympy import default_sort_key

            order = sorted(range(len(items)), key=lambda i: default_sort_key(items[i][0]))
        except TypeError:
            order = range(len(items))
        return ("dict", [pairs[i] for i in order])
    if isinstance(value, Basic):
        try:
            return ("expr", to_text(value, decimals=True), -1)
        except ParseError as exc:
            raise StoredResultError(str(exc)) from None
    raise StoredResultError(f"value of type {type(value).__name__} must be a SymPy "
                            "expression, matrix, tuple or dict")


def _is_operator_matrix(value):
    """An :class:`~amalgebra.states.hamiltonian.OperatorMatrix` (or ``HamiltonianMatrix``)."""
    from ..states.hamiltonian import OperatorMatrix

    return isinstance(value, OperatorMatrix)


# ----------------------------------------------------------------------------- writing files

_WIDTH = 100


def _inline(node):
    kind = node[0]
    if kind == "expr":
        return f'"{_leaf_text(node[1])}"'
    if kind == "tuple":
        return "{ tuple = [" + ", ".join(_inline(n) for n in node[1]) + "] }"
    if kind == "matrix":
        return "{ matrix = [" + ", ".join("[" + ", ".join(_inline(n) for n in row) + "]"
                                          for row in node[1]) + "] }"
    if kind == "basis_matrix":
        return ("{ basis_matrix = [[" + ", ".join(_inline(n) for n in node[1]) + "], "
                + ", ".join("[" + ", ".join(_inline(n) for n in row) + "]" for row in node[2])
                + "] }")
    if kind == "table":
        return "{ dict = { " + ", ".join(f"{k} = {_inline(n)}" for k, n in node[1]) + " } }"
    return "{ dict = [" + ", ".join(f"[{_inline(k)}, {_inline(v)}]" for k, v in node[1]) + "] }"


def _entry_lines(name, node):
    one = f"{name} = {_inline(node)}"
    kind = node[0]
    if kind == "matrix" and node[1]:
        rows = ["    [" + ", ".join(_inline(n) for n in row) + "]," for row in node[1]]
        return [f"{name} = {{ matrix = ["] + rows + ["] }"]
    if kind == "basis_matrix":
        basis = ["    [" + ", ".join(_inline(n) for n in node[1]) + "],  # basis: rows and columns"]
        if len(basis[0]) > _WIDTH:  # one state per line
            basis = (["    [  # basis: rows and columns"] + [f"        {_inline(n)}," for n in node[1]]
                     + ["    ],"])
        rows = ["    [" + ", ".join(_inline(n) for n in row) + "]," for row in node[2]]
        return [f"{name} = {{ basis_matrix = ["] + basis + rows + ["] }"]
    if len(one) <= _WIDTH or kind in ("expr", "table"):
        return [one]
    if kind == "tuple":
        return [f"{name} = {{ tuple = ["] + [f"    {_inline(n)}," for n in node[1]] + ["] }"]
    return ([f"{name} = {{ dict = ["] + [f"    [{_inline(k)}, {_inline(v)}]," for k, v in node[1]]
            + ["] }"])


def render_results(results, source_name=""):
    """The text of a stored-results file for ``{derivation: {result: value}}``.

    Values are anything :func:`encode_value` accepts; the output is deterministic.
    """
    lines = [f"# Stored results{' of ' + source_name if source_name else ''}, written by "
             "`amalgebra record`.",
             "# Data, not code: each value is an expression in amalgebra's grammar "
             "(amalgebra.parsing).",
             f'format = "{FORMAT}"']
    for deriv, entries in results.items():
        if not entries:
            continue
        if not re.fullmatch(_KEY, deriv):
            raise StoredResultError(f"derivation name={deriv!r} must be an identifier")
        lines += ["", f"[{deriv}]"]
        for name, value in entries.items():
            if not re.fullmatch(_KEY, name):
                raise StoredResultError(f"result name={name!r} must be an identifier")
            lines += _entry_lines(name, encode_value(value))
    return "\n".join(lines) + "\n"


def write_results(path, results, source_name=""):
    """Write ``{derivation: {result: value}}`` to ``path``, atomically and deterministically.

    Values that are ``str`` or :class:`StoredEntry` are written as stored, so that
    entries not being re-recorded keep their reviewed text.  The text goes to a
    temporary file in the same folder, which then replaces ``path`` (``os.replace``):
    a link is never written through.

    Raises
    ======

    StoredResultError
        ``path`` is a symbolic link or exists and is not a regular file, a value cannot
        be stored, or the file cannot be written.
    """
    path = Path(path)
    data = render_results(results, source_name).encode("utf-8")
    mode = 0o644
    try:
        info = os.lstat(path)
    except FileNotFoundError:
        info = None
    except OSError as exc:
        raise StoredResultError(f"{path}: cannot be inspected ({exc.strerror})") from None
    if info is not None:
        if stat.S_ISLNK(info.st_mode):
            raise StoredResultError(f"{path}: is a symbolic link; not written (stored results "
                                    "are written only to a regular file, never through a link)")
        if not stat.S_ISREG(info.st_mode):
            raise StoredResultError(f"{path}: is {_kind_of(info.st_mode)}; not written (stored "
                                    "results must be a regular file)")
        mode = stat.S_IMODE(info.st_mode)
    try:
        fd, tmp = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".tmp")
    except OSError as exc:
        raise StoredResultError(f"{path}: cannot be written ({exc.strerror})") from None
    try:
        with os.fdopen(fd, "wb") as out:
            out.write(data)
            out.flush()
            if hasattr(os, "fchmod"):
                os.fchmod(out.fileno(), mode)
            os.fsync(out.fileno())
        os.replace(tmp, path)  # renames the entry itself: a link there is replaced, not followed
    except OSError as exc:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise StoredResultError(f"{path}: cannot be written ({exc.strerror})") from None
