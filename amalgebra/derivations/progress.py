r"""Progress display of the derivation runner: a bar on a capable terminal, plain lines elsewhere.

Explanation
===========

:func:`progress_reporter` returns the ``progress(done, total, label, record)``
callable that :func:`amalgebra.derivations.runner.run_folder` calls after each
derivation.  What it writes depends on where the stream goes:

* a terminal that understands cursor control (``TERM`` set and not ``dumb``): one
  line redrawn in place (``\r`` and the erase-line code ``ESC [ K``), fitted into the
  terminal's width so it never wraps (the bar shrinks first, then the middle of the
  label is elided); a failed derivation keeps its line;
* a dumb terminal (``TERM=dumb`` or unset), a pipe or a file (a CI log): one plain
  line per derivation with its time, no escape codes, nothing redrawn.

The width is asked of the stream's own terminal (``os.get_terminal_size`` on its file
descriptor), then of ``COLUMNS``, else 80.

Examples
========

>>> import io
>>> class Record:
...     ok, numeric_steps, seconds = True, (), 0.25
>>> log = io.StringIO()
>>> progress_reporter(log)(1, 3, "deriv_a.py::first", Record())
>>> log.getvalue()
'[1/3] deriv_a.py::first ok (0.25 s)\n'
>>> fit_line("[####] 1/3", "deriv_a_very_long_name.py::derivation", "ok", 30)
'[####] 1/3 deriv_...vation ok'
"""

import os

__all__ = ["progress_reporter", "fit_line", "terminal_width", "supports_redraw"]

_MIN_BAR, _MAX_BAR = 10, 30


def supports_redraw(stream, environ=None):
    """True when ``stream`` is a terminal that understands ``\\r`` and ``ESC [ K``."""
    environ = os.environ if environ is None else environ
    isatty = getattr(stream, "isatty", None)
    if isatty is None or not isatty():
        return False
    return environ.get("TERM", "dumb") not in ("", "dumb")


def terminal_width(stream, environ=None):
    """Columns of the terminal behind ``stream``; else ``COLUMNS``; else 80.

    >>> import io
    >>> terminal_width(io.StringIO(), {"COLUMNS": "42"})
    42
    """
    environ = os.environ if environ is None else environ
    try:
        columns = os.get_terminal_size(stream.fileno()).columns
        if columns > 0:
            return columns
    except (AttributeError, OSError, ValueError):
        pass
    try:
        columns = int(environ.get("COLUMNS", ""))
    except ValueError:
        columns = 0
    return columns if columns > 0 else 80


def fit_line(head, label, state, width):
    """``head label state`` in at most ``width - 1`` characters (the last column stays free,
    so that no terminal wraps): the middle of ``label`` is elided with ``...``, then the tail
    of ``state``."""
    room = width - 1
    line = f"{head} {label} {state}"
    if len(line) <= room:
        return line
    keep = room - len(head) - len(state) - 2 - 3
    if keep >= 4:
        front = (keep + 1) // 2
        return f"{head} {label[:front]}...{label[len(label) - (keep - front):]} {state}"
    return line[:max(room, 0)]


def _state(record):
    if not record.ok:
        return "FAILED"
    if record.numeric_steps:
        return "ok (numeric steps: " + ", ".join(record.numeric_steps) + ")"
    return "ok"


def progress_reporter(stream, environ=None):
    """The ``progress(done, total, label, record)`` callable writing to ``stream`` (module docstring)."""
    redraw = supports_redraw(stream, environ)

    def report(done, total, label, record):
        state = _state(record)
        if not redraw:
            print(f"[{done}/{total}] {label} {state} ({record.seconds:.2f} s)", file=stream,
                  flush=True)
            return
        width = terminal_width(stream, environ)
        count = f"{done}/{total}"
        bar_width = max(_MIN_BAR, min(_MAX_BAR, width - len(count) - len(state) - 30))
        filled = bar_width * done // max(total, 1)
        head = f"[{'#' * filled}{'-' * (bar_width - filled)}] {count}"
        if len(head) + 2 > width - 1:          # too narrow even for the bar: the count alone
            head = count
        end = "\n" if done == total or not record.ok else ""
        print("\r\033[K" + fit_line(head, label, state, width), end=end, file=stream, flush=True)

    return report
