r"""The ``amalgebra`` command: check, record and typeset a folder of derivations.

Explanation
===========

Subcommands (``amalgebra <subcommand> --help`` for each)::

    amalgebra check  [FOLDER] [--only NAME] [--exact] [-q]
    amalgebra record [FOLDER] [--only NAME] [-q]
    amalgebra report [FOLDER] [-o report.tex] [--title TEXT] [--no-pdf] [-q]
    amalgebra parse  EXPRESSION [--latex]
    amalgebra table  {cg,sixj} ...

``FOLDER`` defaults to ``./worked_examples`` when it exists, otherwise to the
``worked_examples/`` folder shipped beside the package.  Derivation files are
``deriv_*.py``; their stored results are ``deriv_*.results.toml`` beside them.
``check`` never writes anything; ``record`` is the only command that (re)writes stored
results.  Progress goes to stderr (one line per derivation), results to stdout.
Expression text given on the command line is data: it is read by
:func:`amalgebra.parsing.parse`, never evaluated.

Exit codes (for CI):

* ``0`` -- every step holds and every stored result is identical or equal;
* ``1`` -- a step failed, a derivation or file raised, a stored file is malformed, a
  result changed or went stale (with ``--exact``: a step was checked only numerically);
* ``2`` -- usage error (unknown option, missing folder, no derivation files, bad
  expression text);
* ``3`` -- nothing failed but some results are not recorded yet (run ``record``).

Examples
========

>>> from amalgebra.cli import main
>>> main(["parse", "j*(j + 1) - m^2 - m"])
j*(j + 1) - m^2 - m
0
>>> main(["parse", "__import__('os')"])     # the message goes to stderr
2
"""

import argparse
import shutil
import subprocess
import sys
from pathlib import Path

__all__ = ["main", "build_parser", "EXIT_OK", "EXIT_FAILED", "EXIT_USAGE", "EXIT_UNRECORDED"]

EXIT_OK, EXIT_FAILED, EXIT_USAGE, EXIT_UNRECORDED = 0, 1, 2, 3


class _UsageError(Exception):
    pass


def _default_folder():
    here = Path("worked_examples")
    if here.is_dir():
        return here
    return Path(__file__).resolve().parent.parent / "worked_examples"


def _folder(args):
    folder = Path(args.folder) if args.folder else _default_folder()
    if not folder.exists():
        raise _UsageError(f"folder={str(folder)!r} does not exist")
    from amalgebra.derivations.runner import discover

    if not discover(folder):
        raise _UsageError(f"folder={str(folder)!r} holds no deriv_*.py files")
    return folder


def _progress(quiet, stream=None):
    """Progress reporter for long runs: a bar redrawn in place on a terminal, one
    line per derivation otherwise (logs of CI stay readable)."""
    if quiet:
        return None
    stream = sys.stderr if stream is None else stream
    on_terminal = hasattr(stream, "isatty") and stream.isatty()

    def report(done, total, label, record):
        state = "ok" if record.ok else "FAILED"
        if record.ok and record.numeric_steps:
            state = "ok (numeric steps: " + ", ".join(record.numeric_steps) + ")"
        if on_terminal:
            width = 30
            filled = width * done // max(total, 1)
            bar = "#" * filled + "-" * (width - filled)
            line = f"[{bar}] {done}/{total} {label} {state}"
            end = "\n" if done == total or not record.ok else ""
            print("\r\033[K" + line, end=end, file=stream, flush=True)
        else:
            print(f"[{done}/{total}] {label} {state} ({record.seconds:.2f} s)", file=stream, flush=True)

    return report


def _summary(outcome, out):
    """Print failures, changes and a one-line count; return nothing."""
    for f in outcome.files:
        if f.load_error is not None:
            print(f"{f.name}: could not be loaded: {type(f.load_error).__name__}: "
                  f"{f.load_error}", file=out)
        if f.store_error is not None:
            print(f"{f.name}: stored results unreadable: {f.store_error}", file=out)
        for r in f.records:
            if not r.ok:
                print(f"{f.name}::{r.name} FAILED: {type(r.error).__name__}: {r.error}", file=out)
        for c in f.comparisons:
            where = f" (line {c.line})" if c.line else ""
            if c.status == "changed":
                print(f"{f.name}::{c.derivation}.{c.result} CHANGED{where}\n{c.diff}", file=out)
            elif c.status == "stale":
                print(f"{f.name}::{c.derivation}.{c.result} STALE{where}: stored but no longer "
                      "produced", file=out)
            elif c.status == "unrecorded":
                print(f"{f.name}::{c.derivation}.{c.result} not recorded yet "
                      "(run `amalgebra record`)", file=out)
            elif c.status == "reprinted":
                print(f"{f.name}::{c.derivation}.{c.result} equal but printed differently"
                      f"{where}\n{c.diff}", file=out)
    records = outcome.records
    steps = [s for r in records for s in r.steps]
    counts = {s: sum(c.status == s for c in outcome.comparisons)
              for s in ("identical", "reprinted", "changed", "unrecorded", "stale")}
    print(f"{len(records)} derivations ({sum(not r.ok for r in records)} failed), "
          f"{len(steps)} steps ({sum(s.exact for s in steps)} exact, "
          f"{sum(s.passed and not s.exact for s in steps)} numerical only); results: "
          + ", ".join(f"{n} {s}" for s, n in counts.items()), file=out)


def _check_only(args, outcome):
    missing = sorted(set(args.only or ()) - {r.name for r in outcome.records})
    if missing:
        raise _UsageError(f"--only {', '.join(missing)} matches no derivation")


def _cmd_check(args):
    from amalgebra.derivations.runner import run_folder

    outcome = run_folder(_folder(args), only=args.only, exact=args.exact,
                         progress=_progress(args.quiet))
    _check_only(args, outcome)
    _summary(outcome, sys.stdout)
    return outcome.exit_code


def _cmd_record(args):
    from amalgebra.derivations.runner import record_folder

    outcome = record_folder(_folder(args), only=args.only, progress=_progress(args.quiet))
    _check_only(args, outcome)
    for f in outcome.files:
        if f.recorded:
            print(f"recorded {f.name.removesuffix('.py')}.results.toml")
        elif f.load_error is not None or any(not r.ok for r in f.records):
            print(f"NOT recorded {f.name}: a derivation failed or the file could not be loaded")
    _summary(outcome, sys.stdout)
    return outcome.exit_code


def _build_pdf(tex_path):
    """Compile with latexmk or pdflatex when present; return the PDF path or None."""
    tex_path = Path(tex_path).resolve()
    if shutil.which("latexmk"):
        cmd = ["latexmk", "-pdf", "-interaction=nonstopmode", "-halt-on-error", tex_path.name]
    elif shutil.which("pdflatex"):
        cmd = ["pdflatex", "-interaction=nonstopmode", "-halt-on-error", tex_path.name]
    else:
        return None
    done = subprocess.run(cmd, cwd=tex_path.parent, capture_output=True, text=True, check=False)
    if done.returncode != 0:
        tail = "\n".join(done.stdout.splitlines()[-15:])
        raise RuntimeError(f"{cmd[0]} failed on {tex_path.name}:\n{tail}")
    return tex_path.with_suffix(".pdf")


def _cmd_report(args):
    from amalgebra.derivations.latex import report_latex
    from amalgebra.derivations.runner import run_folder

    outcome = run_folder(_folder(args), progress=_progress(args.quiet))
    text = report_latex(outcome.files, title=args.title)
    if args.output in (None, "-"):
        sys.stdout.write(text)
    else:
        Path(args.output).write_text(text, encoding="utf-8")
        print(f"wrote {args.output}", file=sys.stderr)
        if not args.no_pdf:
            try:
                pdf = _build_pdf(args.output)
            except RuntimeError as exc:
                print(f"amalgebra: PDF not built: {exc}", file=sys.stderr)
                return EXIT_FAILED
            if pdf is not None:
                print(f"wrote {pdf}", file=sys.stderr)
    if outcome.exit_code != EXIT_OK:
        _summary(outcome, sys.stderr)
    return outcome.exit_code


def _cmd_parse(args):
    from amalgebra.errors import ParseError
    from amalgebra.parsing import parse, to_text

    try:
        expr = parse(args.expression)
    except ParseError as exc:
        raise _UsageError(str(exc)) from None
    if args.latex:
        from sympy import latex

        print(latex(expr))
    else:
        print(to_text(expr))
    return EXIT_OK


def _quantum_numbers(values):
    from amalgebra.errors import ParseError, QuantumNumberError
    from amalgebra.qnumbers import half_integer

    try:
        return [half_integer(v, f"j{i + 1}", nonnegative=True) for i, v in enumerate(values)]
    except (QuantumNumberError, ParseError, TypeError, ValueError) as exc:
        raise _UsageError(str(exc)) from None


def _cmd_table(args):
    try:
        from amalgebra.coupling import cg, sixj
    except ImportError as exc:
        raise _UsageError(f"amalgebra.coupling is not available: {exc}") from None

    if args.kind == "cg":
        j1, j2 = _quantum_numbers(args.j)
        print(f"<j1 m1 j2 m2|J M> for j1={j1}, j2={j2} (Condon-Shortley)")
        J = abs(j1 - j2)
        while J <= j1 + j2:
            M = J
            while M >= -J:
                m1 = j1
                while m1 >= -j1:
                    m2 = M - m1
                    if abs(m2) <= j2:
                        value = cg(j1, m1, j2, m2, J, M)
                        if value != 0:
                            print(f"  J={J} M={M} m1={m1} m2={m2}: {value}")
                    m1 -= 1
                M -= 1
            J += 1
        return EXIT_OK
    if len(args.j) != 6:
        raise _UsageError("table sixj needs six values j1 j2 j3 j4 j5 j6")
    js = _quantum_numbers(args.j)
    print("{" + " ".join(map(str, js[:3])) + "; " + " ".join(map(str, js[3:])) + "} = "
          + str(sixj(*js)))
    return EXIT_OK


def build_parser():
    """The argparse parser of the ``amalgebra`` command."""
    top = argparse.ArgumentParser(
        prog="amalgebra",
        description="Check, record and typeset derivations (deriv_*.py files).",
        epilog="exit codes: 0 ok; 1 failed step, changed or stale result, broken file; "
               "2 usage error; 3 results not recorded yet.")
    sub = top.add_subparsers(dest="command", metavar="COMMAND")

    def folder_args(p, only=True):
        p.add_argument("folder", nargs="?", metavar="FOLDER",
                       help="folder of deriv_*.py files, or one file (default: worked_examples)")
        if only:
            p.add_argument("--only", action="append", metavar="NAME",
                           help="only the derivation NAME (repeatable)")
        p.add_argument("-q", "--quiet", action="store_true", help="no progress lines on stderr")

    p = sub.add_parser("check", help="run every derivation and compare stored results",
                       description="Run every derivation, check each step, and compare the "
                                   "named results with the stored ones. Writes nothing.")
    folder_args(p)
    p.add_argument("--exact", action="store_true",
                   help="fail when a step could only be checked numerically")
    p.set_defaults(handler=_cmd_check)

    p = sub.add_parser("record", help="re-record stored results (explicit, never automatic)",
                       description="Run the derivations and rewrite their stored results "
                                   "(deriv_*.results.toml). Files with a failing derivation "
                                   "are not written.")
    folder_args(p)
    p.set_defaults(handler=_cmd_record)

    p = sub.add_parser("report", help="write a LaTeX report (and a PDF when TeX is present)",
                       description="Run the derivations and write a standalone LaTeX "
                                   "document; with -o FILE.tex also build a PDF when latexmk "
                                   "or pdflatex is on PATH.")
    folder_args(p, only=False)
    p.add_argument("-o", "--output", metavar="FILE.tex", help="output file (default: stdout)")
    p.add_argument("--title", default="Derivations", help="document heading")
    p.add_argument("--no-pdf", action="store_true", help="do not run pdflatex/latexmk")
    p.set_defaults(handler=_cmd_report)

    p = sub.add_parser("parse", help="read expression text safely and print it back",
                       description="Parse EXPRESSION with amalgebra's own grammar (never "
                                   "eval) and print it in canonical text or LaTeX.")
    p.add_argument("expression", metavar="EXPRESSION")
    p.add_argument("--latex", action="store_true", help="print LaTeX instead of text")
    p.set_defaults(handler=_cmd_parse)

    p = sub.add_parser("table", help="print coupling coefficients",
                       description="table cg J1 J2: all nonzero Clebsch-Gordan coefficients; "
                                   "table sixj J1 ... J6: one 6j symbol. Values like 3/2.")
    p.add_argument("kind", choices=["cg", "sixj"])
    p.add_argument("j", nargs="+", metavar="J")
    p.set_defaults(handler=_cmd_table)
    return top


def main(argv=None):
    """Run the command; return the exit code (never raises SystemExit itself)."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # argparse: --help (0) or a usage error (2)
        return int(exc.code or 0)
    if args.command is None:
        parser.print_help(sys.stderr)
        return EXIT_USAGE
    try:
        return args.handler(args)
    except _UsageError as exc:
        print(f"amalgebra: error: {exc}", file=sys.stderr)
        return EXIT_USAGE


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
