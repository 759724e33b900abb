r"""The ``amalgebra`` command: check, record and typeset a folder of derivations.

Explanation
===========

Subcommands (``amalgebra <subcommand> --help`` for each; ``python -m amalgebra`` is the
same command; ``amalgebra --version`` prints the versions and which coupling kernel runs)::

    amalgebra check    [FOLDER] [--only NAME] [--exact] [-q]
    amalgebra record   [FOLDER] [--only NAME] [-q]
    amalgebra report   [FOLDER] [-o report.tex] [--title TEXT] [--no-pdf] [-q]
    amalgebra examples [DEST]
    amalgebra parse    EXPRESSION [--latex]
    amalgebra table    {cg,threej,sixj,ninej,recoupling} ... [--latex] [--total J]
    amalgebra table    {threej,sixj,ninej} --jmax J -o FILE.npz [--workers N] [--scheduler ADDRESS]

``FOLDER`` defaults to ``./worked_examples`` when it exists, otherwise to the worked
examples installed with the package (package data ``amalgebra/worked_examples``; in a
source checkout, the repository's ``worked_examples/``), so a bare ``amalgebra check``
works right after ``pip install amalgebra``.  ``amalgebra examples`` prints where those
are; ``amalgebra examples DEST`` copies them into the folder ``DEST`` to edit and
re-record.  Derivation files are ``deriv_*.py``; their stored results are
``deriv_*.results.toml`` beside them.  ``check`` never writes anything; ``record`` is the
only command that (re)writes stored results.  Progress goes to stderr (a bar redrawn in
place on a capable terminal, fitted to its width; one line per derivation on a pipe, in a
log or with ``TERM=dumb``: see :mod:`amalgebra.derivations.progress`), results to stdout.
Expression text given on the command line is data: it is read by
:func:`amalgebra.parsing.parse`, never evaluated.

Exit codes (for CI):

* ``0`` -- every step holds and every stored result is identical or equal;
* ``1`` -- a step failed, a derivation or file raised, a stored file or entry is
  unreadable, a result changed, went stale or could not be compared within its budget
  (with ``--exact``: a step or a stored result was checked only numerically);
* ``2`` -- usage error (unknown option, missing folder, no derivation files, bad
  expression text, an output path that cannot be written);
* ``3`` -- nothing failed but some results are not recorded yet (run ``record``);
* ``130`` -- interrupted (Ctrl-C): one line ``amalgebra: interrupted`` on stderr, no traceback;
* ``141`` -- the reader of stdout went away (``amalgebra table cg 5 5 | head``): the output
  stops quietly, as the shell reports for a program ended by SIGPIPE (128 + 13).

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
import os
import shutil
import subprocess
import sys
from pathlib import Path

__all__ = ["main", "build_parser", "shipped_examples", "version_text", "EXIT_OK", "EXIT_FAILED",
           "EXIT_USAGE", "EXIT_UNRECORDED", "EXIT_INTERRUPTED", "EXIT_BROKEN_PIPE"]

EXIT_OK, EXIT_FAILED, EXIT_USAGE, EXIT_UNRECORDED = 0, 1, 2, 3
EXIT_INTERRUPTED, EXIT_BROKEN_PIPE = 130, 141   # 128 + SIGINT, 128 + SIGPIPE (shell convention)


class _UsageError(Exception):
    pass


def shipped_examples():
    """The folder of worked examples that came with the package.

    In an installed wheel or sdist they are package data, ``amalgebra/worked_examples``;
    in a source checkout (also an editable install) the repository's ``worked_examples/``.

    >>> sorted(p.name for p in shipped_examples().glob("deriv_spin_one_rotor*"))
    ['deriv_spin_one_rotor.py', 'deriv_spin_one_rotor.results.toml']
    """
    package = Path(__file__).resolve().parent
    installed = package / "worked_examples"
    if installed.is_dir():
        return installed
    return package.parent / "worked_examples"


def _default_folder():
    here = Path("worked_examples")
    if here.is_dir():
        return here
    return shipped_examples()


def _folder(args):
    folder = Path(args.folder) if args.folder else _default_folder()
    if not folder.exists():
        raise _UsageError(f"folder={str(folder)!r} does not exist")
    from amalgebra.derivations.runner import discover

    if not discover(folder):
        raise _UsageError(f"folder={str(folder)!r} holds no deriv_*.py files")
    return folder


def _progress(quiet, stream=None, environ=None):
    """Progress reporter for long runs (:mod:`amalgebra.derivations.progress`); ``None`` with -q."""
    if quiet:
        return None
    from amalgebra.derivations.progress import progress_reporter

    return progress_reporter(sys.stderr if stream is None else stream, environ)


def _summary(outcome, out):
    """Print failures, changes and a one-line count; return nothing."""
    for f in outcome.files:
        if f.load_error is not None:
            print(f"{f.name}: could not be loaded: {type(f.load_error).__name__}: "
                  f"{f.load_error}", file=out)
        if f.store_error is not None:
            print(f"{f.name}: stored results unreadable: {f.store_error}", file=out)
        for problem in getattr(f, "store_problems", ()):
            print(f"{f.name}: stored results: {problem}", file=out)
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
            elif c.status in ("unreadable", "undecided"):
                print(f"{f.name}::{c.derivation}.{c.result} {c.status.upper()}{where}\n{c.diff}",
                      file=out)
    from amalgebra.derivations.regression import STATUSES

    records = outcome.records
    steps = [s for r in records for s in r.steps]
    counts = {s: sum(c.status == s for c in outcome.comparisons) for s in STATUSES}
    # problems of a stored file outside any entry count as unreadable too
    counts["unreadable"] += sum(len(getattr(f, "store_problems", ())) for f in outcome.files)
    numeric = sum(c.status == "reprinted" and c.method == "numeric" for c in outcome.comparisons)
    print(f"{len(records)} derivations ({sum(not r.ok for r in records)} failed), "
          f"{len(steps)} steps ({sum(s.exact for s in steps)} exact, "
          f"{sum(s.passed and not s.exact for s in steps)} numerical only); results: "
          + ", ".join(f"{n} {s}" + (f" ({numeric} numerically only)" if s == "reprinted"
                                   and numeric else "") for s, n in counts.items()), file=out)


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
        elif f.store_error is not None:
            print(f"NOT recorded {f.name}: {f.store_error}")
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
    # latexmk reruns by itself; pdflatex reruns until the log stops asking ("Rerun to get
    # cross-references right", longtable's "Rerun LaTeX"), at most 4 runs in all
    for _run in range(1 if cmd[0] == "latexmk" else 4):
        done = subprocess.run(cmd, cwd=tex_path.parent, capture_output=True, text=True, check=False)
        if done.returncode != 0:
            tail = "\n".join(done.stdout.splitlines()[-15:])
            raise RuntimeError(f"{cmd[0]} failed on {tex_path.name}:\n{tail}")
        if "Rerun" not in _read_log(tex_path.with_suffix(".log")):
            break
    return tex_path.with_suffix(".pdf")


def _read_log(log_path):
    """The TeX log as text ('' when absent); TeX logs are not always valid UTF-8."""
    try:
        return Path(log_path).read_text(encoding="latin-1")
    except OSError:
        return ""


def _cmd_report(args):
    from amalgebra.derivations.latex import report_latex
    from amalgebra.derivations.runner import run_folder

    if args.output not in (None, "-") and Path(args.output).suffix.lower() == ".pdf":
        # -o report.pdf: the LaTeX source goes beside it, under the same name
        if args.no_pdf:
            raise _UsageError(f"output={args.output!r} is a PDF, but --no-pdf was given: "
                              "name the LaTeX file instead (e.g. report.tex)")
        args.output = str(Path(args.output).with_suffix(".tex"))
    if args.output not in (None, "-"):
        # fail before the (long) run when the output file cannot be placed at all
        parent = Path(args.output).parent
        try:
            if not parent.is_dir():
                raise _UsageError(f"output={args.output!r} cannot be written: folder "
                                  f"{str(parent)!r} does not exist")
            if Path(args.output).is_dir():
                raise _UsageError(f"output={args.output!r} cannot be written: it is a folder")
        except OSError as exc:  # e.g. a name too long for the file system
            raise _UsageError(f"output={args.output!r} cannot be written: "
                              f"{exc.strerror or type(exc).__name__}") from None
    outcome = run_folder(_folder(args), progress=_progress(args.quiet))
    text = report_latex(outcome.files, title=args.title)
    if args.output in (None, "-"):
        sys.stdout.write(text)
    else:
        _write_output(args.output, text)
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


def _write_output(path, text):
    """Write ``text`` to the file ``path``; a path that cannot be written is a usage error."""
    try:
        Path(path).write_text(text, encoding="utf-8")
    except OSError as exc:
        reason = exc.strerror or type(exc).__name__
        raise _UsageError(f"output={str(path)!r} cannot be written: {reason}") from None


def _cmd_examples(args):
    source = shipped_examples()
    files = sorted(p for p in source.iterdir()
                   if p.name.startswith("deriv_") and p.suffix in (".py", ".toml")
                   or p.name == "README.md")
    if args.dest is None:
        print(source)
        return EXIT_OK
    dest = Path(args.dest)
    if dest.exists() and not dest.is_dir():
        raise _UsageError(f"dest={str(dest)!r} must be a folder")
    clashes = [p.name for p in files if (dest / p.name).exists()]
    if clashes:
        raise _UsageError(f"dest={str(dest)!r} already holds {', '.join(clashes[:3])}"
                          + (" ..." if len(clashes) > 3 else "") + "; nothing copied")
    try:
        dest.mkdir(parents=True, exist_ok=True)
        for p in files:
            shutil.copyfile(p, dest / p.name)
    except OSError as exc:
        raise _UsageError(f"dest={str(dest)!r} cannot be written: "
                          f"{exc.strerror or type(exc).__name__}") from None
    print(f"copied {len(files)} files into {dest}; run: amalgebra check {dest}")
    return EXIT_OK


def version_text():
    """``amalgebra X (sympy Y, Python Z); coupling kernel: ...`` for ``--version``.

    Says which 3j/6j kernel runs, and why not the compiled one when it is absent, so a
    fallback at install time never goes unnoticed.
    """
    import platform

    import sympy

    import amalgebra

    try:
        from amalgebra.coupling import kernel_backend

        backend = kernel_backend()
    except ImportError as exc:  # pragma: no cover - a broken install
        backend = f"unavailable ({exc})"
    line = (f"amalgebra {amalgebra.__version__} (sympy {sympy.__version__}, "
            f"Python {platform.python_version()}); coupling kernel: {backend}")
    if "not built" in backend:
        line += ("; the pure-Python kernel gives the same exact results, more slowly: reinstall "
                 "with a C compiler and GMP's headers (Debian: libgmp-dev) for the fast one")
    return line


class _VersionAction(argparse.Action):
    """``--version``: computed only when asked (it imports SymPy)."""

    def __init__(self, option_strings, dest=argparse.SUPPRESS, default=argparse.SUPPRESS,
                 help="print the versions and the coupling kernel in use, then exit"):
        super().__init__(option_strings, dest=dest, default=default, nargs=0, help=help)

    def __call__(self, parser, namespace, values, option_string=None):
        print(version_text())
        parser.exit()


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

    from amalgebra.errors import LimitError
    from amalgebra.limits import check_limit

    if args.kind == "cg":
        if len(args.j) != 2:
            raise _UsageError("table cg needs two values j1 j2")
        j1, j2 = _quantum_numbers(args.j)
        try:  # (2 j1 + 1)(2 j2 + 1) coefficients, refused before any is computed
            check_limit("max_terms", (2 * j1 + 1) * (2 * j2 + 1), "entries",
                        f"table cg {j1} {j2} has (2 j1 + 1)(2 j2 + 1) coefficients")
        except LimitError as exc:
            raise _UsageError(str(exc)) from None
        print(f"<j1 m1 j2 m2|J M> for j1={j1}, j2={j2} (Condon-Shortley)")
        J = abs(j1 - j2)
        while J <= j1 + j2:
            M = J
            while M >= -J:
                m1 = min(j1, M + j2)  # only the m1 with |M - m1| <= j2
                while m1 >= max(-j1, M - j2):
                    value = cg(j1, m1, j2, M - m1, J, M)
                    if value != 0:
                        print(f"  J={J} M={M} m1={m1} m2={M - m1}: {value}")
                    m1 -= 1
                M -= 1
            J += 1
        return EXIT_OK
    if args.jmax is not None or args.output is not None:
        return _table_file(args)
    if not args.j:
        raise _UsageError(f"table {args.kind} needs values (or --jmax J -o FILE.npz for a whole table)")
    if args.kind == "recoupling":
        return _table_recoupling(args)
    if args.kind == "threej":
        return _table_threej(args)
    if args.kind == "ninej":
        if len(args.j) != 9:
            raise _UsageError("table ninej needs nine values, row by row")
        js = _quantum_numbers(args.j)
        try:
            from amalgebra.coupling import ninej

            value = ninej(*js)
        except LimitError as exc:
            raise _UsageError(str(exc)) from None
        rows = [" ".join(map(str, js[k:k + 3])) for k in (0, 3, 6)]
        _print_value(args, "{" + "; ".join(rows) + "} = ", value,
                     _symbol_latex("Coupling9j", js))
        return EXIT_OK
    if len(args.j) != 6:
        raise _UsageError("table sixj needs six values j1 j2 j3 j4 j5 j6")
    js = _quantum_numbers(args.j)
    try:
        value = sixj(*js)
    except LimitError as exc:
        raise _UsageError(str(exc)) from None
    _print_value(args, "{" + " ".join(map(str, js[:3])) + "; " + " ".join(map(str, js[3:])) + "} = ", value,
                 _symbol_latex("Coupling6j", js))
    return EXIT_OK


def _table_file(args):
    """``table sixj --jmax 20 -o sixj.npz``: every symbol up to jmax into a file (resumable, parallel)."""
    if args.kind not in ("threej", "sixj", "ninej"):
        raise _UsageError(f"--jmax and -o tabulate threej, sixj or ninej, not {args.kind}")
    if args.jmax is None or args.output is None:
        raise _UsageError("a whole table needs both --jmax J and -o FILE.npz")
    if args.j:
        raise _UsageError("give either values or --jmax, not both")
    try:
        from amalgebra.tables import tabulate
    except ImportError as exc:
        raise _UsageError(f"tables need numpy (python3 -m pip install 'amalgebra[numeric]'): {exc}") from None
    from amalgebra.errors import AmalgebraError
    from amalgebra.qnumbers import half_integer

    try:
        jmax = half_integer(args.jmax, "jmax", nonnegative=True)
        table = tabulate(args.kind, jmax, args.output, floats=not args.no_floats, workers=args.workers,
                         scheduler=args.scheduler, progress=None if args.quiet else "stderr")
    except AmalgebraError as exc:
        raise _UsageError(str(exc)) from None
    print(f"{args.output}: {len(table)} {args.kind} classes up to j = {jmax} (exact"
          f"{'' if args.no_floats else ' and float'}; Condon-Shortley phases)")
    return EXIT_OK


def _symbol_latex(cls_name, js):
    from amalgebra.coupling import symbols

    return getattr(symbols, cls_name)(*js)


def _print_value(args, text, value, symbol):
    if getattr(args, "latex", False):
        from sympy import latex

        print(f"{latex(symbol)} = {latex(value)}")
    else:
        print(text + str(value))


def _table_threej(args):
    """``table threej j1 j2 j3``: every nonzero 3j over the projections; with m1 m2 m3: one value."""
    from amalgebra.coupling import threej
    from amalgebra.errors import LimitError, ProjectionError, QuantumNumberError
    from amalgebra.limits import check_limit
    from amalgebra.qnumbers import half_integer

    if len(args.j) not in (3, 6):
        raise _UsageError("table threej needs j1 j2 j3 (all projections) or j1 j2 j3 m1 m2 m3")
    js = _quantum_numbers(args.j[:3])
    if len(args.j) == 6:
        try:
            ms = [half_integer(v, f"m{i + 1}") for i, v in enumerate(args.j[3:])]
            value = threej(*js, *ms)
        except (QuantumNumberError, ProjectionError, LimitError, ValueError) as exc:
            raise _UsageError(str(exc)) from None
        _print_value(args, f"(j1 j2 j3; m1 m2 m3) = ({' '.join(map(str, js))}; {' '.join(map(str, ms))}) = ",
                     value, _symbol_latex("Coupling3j", [*js, *ms]))
        return EXIT_OK
    j1, j2, j3 = js
    try:
        check_limit("max_terms", (2 * j1 + 1) * (2 * j2 + 1), "entries",
                    f"table threej {j1} {j2} {j3} has up to (2 j1 + 1)(2 j2 + 1) symbols")
    except LimitError as exc:
        raise _UsageError(str(exc)) from None
    # with --latex, the heading (which names the phase convention) is a TeX comment line
    print(f"{'% ' if args.latex else ''}(j1 j2 j3; m1 m2 m3) for j1={j1}, j2={j2}, j3={j3}, m3 = -m1 - m2 "
          "(Condon-Shortley)")
    m1 = j1
    while m1 >= -j1:
        m2 = j2
        while m2 >= -j2:
            m3 = -m1 - m2
            if abs(m3) <= j3 and (j3 - m3).is_integer:
                value = threej(j1, j2, j3, m1, m2, m3)
                if value != 0:
                    _print_value(args, f"  m1={m1} m2={m2} m3={m3}: ", value,
                                 _symbol_latex("Coupling3j", [j1, j2, j3, m1, m2, m3]))
            m2 -= 1
        m1 -= 1
    return EXIT_OK


def _table_recoupling(args):
    """``table recoupling TREE1 TREE2 name=value ...``: the transformation matrix, in total blocks."""
    from amalgebra.coupling.recoupling import recoupling_matrix
    from amalgebra.coupling.trees import coupling_tree
    from amalgebra.errors import AmalgebraError
    from amalgebra.qnumbers import half_integer

    if len(args.j) < 3:
        raise _UsageError('table recoupling needs two trees and leaf values, e.g. '
                          '"((l1 l2) L, (s1 s2) S) J" "((l1 s1) j1, (l2 s2) j2) J" l1=1 l2=1 s1=1/2 s2=1/2')
    first, second, *assignments = args.j
    values = {}
    for item in assignments:
        name, sep, text = item.partition("=")
        if not sep or not name:
            raise _UsageError(f"value {item!r} must read name=value, e.g. l1=1 or s1=1/2")
        try:
            values[name] = half_integer(text, name, nonnegative=True)
        except (AmalgebraError, ValueError, TypeError) as exc:
            raise _UsageError(str(exc)) from None
    try:
        a, b = coupling_tree(first), coupling_tree(second)
        leaves = {k: v for k, v in values.items() if k in a.leaves}
        unknown = sorted(set(values) - set(a.leaves))
        if unknown:
            raise _UsageError(f"values for {unknown} must name leaves of the trees ({list(a.leaves)})")
        total = None
        if args.total is not None:
            total = half_integer(args.total, "total", nonnegative=True)
        matrix = recoupling_matrix(a.with_values(leaves), b.with_values(leaves), total)
    except AmalgebraError as exc:
        raise _UsageError(str(exc)) from None
    if getattr(args, "latex", False):
        from sympy import latex

        print(latex(matrix))
    else:
        print(matrix)
    return EXIT_OK


def build_parser():
    """The argparse parser of the ``amalgebra`` command."""
    top = argparse.ArgumentParser(
        prog="amalgebra",
        description="Check, record and typeset derivations (deriv_*.py files).",
        epilog="exit codes: 0 ok; 1 failed step, changed or stale result, broken file; "
               "2 usage error; 3 results not recorded yet; 130 interrupted; "
               "141 output pipe closed.")
    top.add_argument("--version", action=_VersionAction)
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
    p.add_argument("-o", "--output", metavar="FILE.tex",
                   help="output file (default: stdout); FILE.pdf writes FILE.tex beside it and builds the PDF")
    p.add_argument("--title", default="Derivations", help="document heading")
    p.add_argument("--no-pdf", action="store_true", help="do not run pdflatex/latexmk")
    p.set_defaults(handler=_cmd_report)

    p = sub.add_parser("examples", help="show or copy the worked examples shipped with the package",
                       description="Without DEST, print the folder of the worked examples that "
                                   "came with the package (what a bare `amalgebra check` runs). "
                                   "With DEST, copy them (deriv_*.py, their stored results, "
                                   "README.md) into the folder DEST; existing files are never "
                                   "overwritten.")
    p.add_argument("dest", nargs="?", metavar="DEST", help="folder to copy the examples into")
    p.set_defaults(handler=_cmd_examples)

    p = sub.add_parser("parse", help="read expression text safely and print it back",
                       description="Parse EXPRESSION with amalgebra's own grammar (never "
                                   "eval) and print it in canonical text or LaTeX.")
    p.add_argument("expression", metavar="EXPRESSION")
    p.add_argument("--latex", action="store_true", help="print LaTeX instead of text")
    p.set_defaults(handler=_cmd_parse)

    p = sub.add_parser("table", help="print coupling coefficients and recoupling matrices",
                       description="table cg J1 J2: all nonzero Clebsch-Gordan coefficients; "
                                   "table threej J1 J2 J3 [M1 M2 M3]: 3j symbols (all projections, "
                                   "or one); table sixj J1 ... J6: one 6j symbol; table ninej "
                                   "J1 ... J9: one 9j symbol (row by row); table recoupling TREE1 "
                                   "TREE2 name=value ...: the exact matrix between two coupling "
                                   "schemes, e.g. \"((l1 l2) L, (s1 s2) S) J\" \"((l1 s1) j1, "
                                   "(l2 s2) j2) J\" l1=1 l2=1 s1=1/2 s2=1/2; table sixj --jmax 20 "
                                   "-o sixj.npz: every symbol up to jmax, one per symmetry class, into "
                                   "a file (exact and float; parallel, resumable). Values like 3/2; "
                                   "Condon-Shortley phases.")
    p.add_argument("kind", choices=["cg", "threej", "sixj", "ninej", "recoupling"])
    p.add_argument("j", nargs="*", metavar="ARG")
    p.add_argument("--total", metavar="J", help="recoupling: only the block of this total momentum")
    p.add_argument("--latex", action="store_true", help="print LaTeX (threej, sixj, ninej, recoupling)")
    p.add_argument("--jmax", metavar="J", help="threej/sixj/ninej: tabulate every symbol up to J (with -o)")
    p.add_argument("-o", "--output", metavar="FILE.npz", help="table file to write (numpy .npz; resumable)")
    p.add_argument("--workers", type=int, default=None, help="local worker processes (default: one per core)")
    p.add_argument("--scheduler", metavar="ADDRESS",
                   help="a dask.distributed scheduler, e.g. tcp://10.0.0.5:8786 (the dask extra)")
    p.add_argument("--no-floats", action="store_true", help="exact values only")
    p.add_argument("-q", "--quiet", action="store_true", help="no progress lines on stderr")
    p.set_defaults(handler=_cmd_table)
    return top


def _silence_stdout():
    """After a broken pipe: point stdout at /dev/null so the final flush at exit is quiet."""
    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (AttributeError, OSError, ValueError):  # not a real file (tests capture it)
        pass


def main(argv=None):
    """Run the command; return the exit code (never raises SystemExit itself).

    Ctrl-C gives exit code 130 and a closed output pipe 141, each without a traceback.
    """
    try:
        parser = build_parser()
        try:
            args = parser.parse_args(argv)
        except SystemExit as exc:  # argparse: --help, --version (0) or a usage error (2)
            return int(exc.code or 0)
        if args.command is None:
            parser.print_help(sys.stderr)
            return EXIT_USAGE
        try:
            return args.handler(args)
        except _UsageError as exc:
            print(f"amalgebra: error: {exc}", file=sys.stderr)
            return EXIT_USAGE
        except SystemExit as exc:  # from a derivation file's own code (a script's sys.exit at import)
            print(f"amalgebra: error: a derivation file called sys.exit({exc.code!r}); "
                  "derivation files must not exit", file=sys.stderr)
            return EXIT_FAILED
    except BrokenPipeError:
        _silence_stdout()
        return EXIT_BROKEN_PIPE
    except KeyboardInterrupt:
        try:
            # start on a fresh line: a progress bar may be half drawn
            print("\namalgebra: interrupted", file=sys.stderr, flush=True)
        except (BrokenPipeError, ValueError):
            pass
        return EXIT_INTERRUPTED


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
