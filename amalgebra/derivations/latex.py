r"""LaTeX rendering of derivation records: one ``align`` per derivation, one document per folder.

Explanation
===========

A derivation renders as an amsmath ``align`` environment, one tagged row per
step as the author wrote it, and under it, in small type, the justification and
the engine's verdict of each tagged step::

    lhs &= rhs \tag{a} \\
        &= rhs' \tag{b}

    (a) justification -- exact (normal form)

(a step stated with ``d.then`` continues the previous line's chain).  Long
equations are broken across rows by :mod:`amalgebra.derivations.latex_layout`
(a long left side on its own row, a sum at its terms, ``c \Bigl(...\Bigr)``);
a matrix wider than a row is shown as the list of its nonzero entries; a matrix
that carries its basis (an ``OperatorMatrix``) is set with the basis kets as row
and column labels, by blocks when it is large, or as an entry list with a basis
legend (the size rule of :mod:`amalgebra.derivations.latex_matrices`).
Regression statuses of stored results are gathered in a summary table at the
end of the report.  Expressions are printed by ``sympy.latex`` (operators print
through their own ``_latex`` hooks).  Justifications and descriptions are plain
text, escaped for LaTeX, except that balanced ``$...$`` segments pass through as
math.  Only amsmath constructs that KaTeX also accepts are used (``\tag``,
``\notag``, ``\Bigl``), and the output is the same under any ``PYTHONHASHSEED``.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.derivations import derivation
>>> from amalgebra.derivations.latex import derivation_latex
>>> @derivation
... def square(d):
...     x = symbols("x")
...     d.step("expand", (x + 1)**2, x**2 + 2*x + 1, "binomial theorem, 100% sure")
>>> print(derivation_latex(square.run()))
\begin{align}
\left(x + 1\right)^{2} &= x^{2} + 2 x + 1 \tag{a}
\end{align}
\begin{flushleft}\small
\hangindent=2em\hangafter=1 (a)~binomial theorem, 100\% sure --- \textit{exact (normal form)}\par
\end{flushleft}
"""

__all__ = ["escape_text", "text_with_math", "justification_latex", "derivation_latex", "report_latex",
           "value_rows", "step_tag", "prose_latex", "summary_latex"]

_ESCAPES = {
    "\\": r"\textbackslash{}", "{": r"\{", "}": r"\}", "#": r"\#", "$": r"\$", "%": r"\%",
    "&": r"\&", "_": r"\_", "^": r"\textasciicircum{}", "~": r"\textasciitilde{}",
    # in the default OT1 text font "<" and ">" print as inverted marks
    "<": r"\textless{}", ">": r"\textgreater{}",
}


def escape_text(text):
    r"""Escape ``text`` for LaTeX text mode.

    >>> from amalgebra.derivations.latex import escape_text
    >>> escape_text("a_b & 50% {x}")
    'a\\_b \\& 50\\% \\{x\\}'
    >>> escape_text("J -> J'")
    "J -\\textgreater{} J'"
    """
    return "".join(_ESCAPES.get(ch, ch) for ch in str(text))


def justification_latex(because):
    r"""``\text{...}`` for a justification; ``$...$`` segments stay math.

    >>> from amalgebra.derivations.latex import justification_latex
    >>> justification_latex("use $[J_z, J_+] = J_+$ twice")
    '\\text{use $[J_z, J_+] = J_+$ twice}'
    """
    return rf"\text{{{text_with_math(because)}}}"


def text_with_math(text):
    r"""Escape ``text`` for text mode, keeping balanced ``$...$`` segments as math.

    >>> from amalgebra.derivations.latex import text_with_math
    >>> text_with_math("50% of $x_1$")
    '50\\% of $x_1$'
    """
    pieces = text.split("$")
    if len(pieces) % 2 == 0:  # unbalanced dollars: all text
        return escape_text(text)
    return "".join(escape_text(p) if i % 2 == 0 else f"${p}$" for i, p in enumerate(pieces))


from sympy import latex
from sympy.matrices import MatrixBase

from .latex_layout import ROW_WIDTH, expression_rows, visible_width
from .latex_matrices import _entry_rows as entry_rows, basis_matrix_rows

#: A left side wider than this goes on its own row (the ``align`` column it sits in
#: widens every row of the environment).
LEFT_WIDTH = 16


def _tex(expr):
    return latex(expr)


def step_tag(k):
    """The tag of the ``k``-th step (0-based): ``a`` ... ``z``, then ``aa``, ``ab`` ...

    >>> from amalgebra.derivations.latex import step_tag
    >>> step_tag(0), step_tag(25), step_tag(26)
    ('a', 'z', 'aa')
    """
    letters = "abcdefghijklmnopqrstuvwxyz"
    return letters[k] if k < 26 else step_tag(k // 26 - 1) + letters[k % 26]


def _matrix_parts(value):
    """``(matrix, basis)`` of a matrix-like value (``basis`` may be ``None``), else ``None``.

    A value with ``.matrix`` and ``.basis`` (``OperatorMatrix``, ``HamiltonianMatrix``
    of :mod:`amalgebra.states.hamiltonian`) gives its basis for the legend.
    """
    if isinstance(value, MatrixBase):
        return value, None
    matrix = getattr(value, "matrix", None)
    if isinstance(matrix, MatrixBase):
        return matrix, getattr(value, "basis", None)
    return None


def _matrix_rows(matrix, width):
    """Rows of a plain matrix: whole when it fits, else its nonzero entries ``M_{i,j} = x``."""
    tex = _tex(matrix)
    if visible_width(tex) <= width:
        return [tex]
    return entry_rows(matrix, None, width)


def value_rows(value, width=ROW_WIDTH, lead_width=0.0):
    r"""Rows of the LaTeX of ``value`` (an expression or a matrix), each about ``width`` wide.

    >>> from sympy import Matrix, symbols
    >>> from amalgebra.derivations.latex import value_rows
    >>> value_rows(Matrix([[1, 0], [0, symbols("a")]]))
    ['\\left[\\begin{matrix}1 & 0\\\\0 & a\\end{matrix}\\right]']
    >>> rows = value_rows(Matrix.diag(*symbols("a0:30")), 40)
    >>> rows[0], rows[1]
    ('\\text{30 $\\times$ 30 matrix, nonzero entries (row, column):}', 'M_{1,1} = a_{0},\\quad M_{2,2} = a_{1},\\quad M_{3,3} = a_{2},\\quad M_{4,4} = a_{3},')
    """
    parts = _matrix_parts(value)
    if parts is not None and parts[1] is not None:
        return basis_matrix_rows(parts[0], parts[1], value, width)
    if parts is not None:
        return _matrix_rows(parts[0], width)
    return expression_rows(value, width, lead_width)


def _step_rows(step, width):
    """``align`` rows (without tags) of one step; a left side wider than ``LEFT_WIDTH`` gets its own rows."""
    rhs_lead = 2.0  # "= "
    if step.continued:
        rhs = value_rows(step.rhs, width, rhs_lead)
        return [f"&= {rhs[0]}"] + [f"&{r}" for r in rhs[1:]]
    lhs_tex = _tex(step.lhs)
    if visible_width(lhs_tex) > LEFT_WIDTH or _matrix_parts(step.lhs) is not None:
        lhs = value_rows(step.lhs, width)
        rhs = value_rows(step.rhs, width, rhs_lead)
        return ([f"&{r}" for r in lhs] + [f"&= {rhs[0]}"] + [f"&{r}" for r in rhs[1:]])
    rhs = value_rows(step.rhs, width - visible_width(lhs_tex), rhs_lead)
    return [f"{lhs_tex} &= {rhs[0]}"] + [f"&{r}" for r in rhs[1:]]


def _align(groups):
    """An ``align`` of row groups ``[(rows, tag), ...]``: the tag on a group's last row."""
    lines, previous = [], 1
    for rows, tag in groups:
        if lines and max(previous, len(rows)) > 1:
            lines[-1] += r" \\[0.6ex]"  # a gap around a step set on several rows
        else:
            lines[-1:] = [line + r" \\" for line in lines[-1:]]
        for k, row in enumerate(rows):
            last = k == len(rows) - 1
            line = row + (rf" \tag{{{tag}}}" if last and tag else r" \notag")
            lines.append(line if last else line + r" \\")
        previous = len(rows)
    return "\\begin{align}\n" + "\n".join(lines) + "\n\\end{align}"


def _notes(items):
    """Small-type paragraphs ``(a) text`` with a hanging indent (``items``: ``(tag, latex)``)."""
    lines = [r"\begin{flushleft}\small"]
    lines += [rf"\hangindent=2em\hangafter=1 ({tag})~{text}\par" for tag, text in items]
    lines.append(r"\end{flushleft}")
    return "\n".join(lines)


def derivation_latex(record):
    """The ``align`` of one derivation record (its steps so far), then the justifications."""
    if not record.steps:
        return ""
    groups, notes = [], []
    width = ROW_WIDTH
    for k, step in enumerate(record.steps):
        tag = step_tag(k)
        groups.append((_step_rows(step, width), tag))
        notes.append((tag, rf"{text_with_math(step.because)} --- \textit{{{escape_text(step.status)}}}"))
    return _align(groups) + "\n" + _notes(notes)


def _results_block(record):
    groups = []
    for name, value in record.results.items():
        label = rf"\text{{{escape_text(name)}}}"
        parts = _matrix_parts(value)
        beside = value_rows(value, ROW_WIDTH - visible_width(label) - 1)
        if visible_width(label) > LEFT_WIDTH or (parts is not None and parts[1] is not None
                                                 and len(beside) > 1):
            # a long name, or a matrix with its basis that needs more than one row: the
            # whole width under the name (blocks and labelled arrays fit more often)
            rows = [f"&{label}:"] + [rf"&\quad {r}" for r in value_rows(value, ROW_WIDTH - 2)]
        else:
            rows = [rf"{label} &: {beside[0]}"] + [f"&{r}" for r in beside[1:]]
        groups.append((rows, None))
    return _align(groups).replace("{align}", "{align*}").replace(r" \notag", "")


#: Inline math (of a description) wider than this is set as a display.
INLINE_WIDTH = 30


def _top_level_tokens(tex):
    """Math ``tex`` cut at its top-level spaces (outside braces and environments)."""
    tokens, depth, start = [], 0, 0
    for i, ch in enumerate(tex):
        if ch in "{}" and tex[i - 1:i] == "\\":
            continue
        depth += {"{": 1, "}": -1}.get(ch, 0)
        if ch == " " and depth == 0 and tex.count(r"\begin", 0, i) == tex.count(r"\end", 0, i):
            tokens.append(tex[start:i])
            start = i + 1
    tokens.append(tex[start:])
    return [t for t in tokens if t]


def _display(tex):
    r"""A display of math ``tex``; wider than a row, it breaks at top-level spaces.

    An operator (``+``, ``-``, ``=``) stays with what follows it; continuation
    rows start ``\quad`` (``=`` rows align on the sign).
    """
    if visible_width(tex) <= ROW_WIDTH:
        return "\n\\[ %s \\]\n" % tex
    pieces = []
    for token in _top_level_tokens(tex):
        if pieces and pieces[-1] in ("+", "-", "=", r"\pm", r"\leq", r"\geq"):
            pieces[-1] += " " + token
        else:
            pieces.append(token)
    rows, current = [], ""
    for piece in pieces:
        if current and visible_width(current + " " + piece) > ROW_WIDTH - 2:
            rows.append(current)
            current = piece
        else:
            current = f"{current} {piece}" if current else piece
    rows.append(current)
    out = [f"&{rows[0]}"] + [f"&{r}" if r.startswith("=") else rf"&\quad {r}" for r in rows[1:]]
    return "\n\\begin{align*}\n" + " \\\\\n".join(out) + "\n\\end{align*}\n"


def prose_latex(text):
    r"""Text with ``$...$`` math for a description: wide math becomes a display.

    >>> from amalgebra.derivations.latex import prose_latex
    >>> prose_latex("so $x = 1$ holds")
    'so $x = 1$ holds'
    >>> tex = prose_latex("so $" + " + ".join("x_{%d}" % i for i in range(40)) + "$ holds")
    >>> tex.startswith("so \n\\begin{align*}\n&x_{0} + x_{1}") and tex.endswith("\\end{align*}\n holds")
    True
    """
    pieces = text.split("$")
    if len(pieces) % 2 == 0:  # unbalanced dollars: all text
        return escape_text(text)
    out = []
    for i, piece in enumerate(pieces):
        if i % 2 == 0:
            out.append(escape_text(piece))
        elif visible_width(piece) > INLINE_WIDTH:
            out.append(_display(piece))
        else:
            out.append(f"${piece}$")
    return "".join(out)


def _record_block(record, comparisons=()):
    lines = [rf"\subsection{{{text_with_math(record.title)}}}",
             rf"\label{{deriv:{record.name}}}"]
    if record.description:
        lines.append(prose_latex(record.description))
    lines.append("")
    body = derivation_latex(record)
    if body:
        lines.append(body)
    if record.error is not None:
        lines.append(r"\paragraph{Failed.} " + escape_text(str(record.error).splitlines()[0]))
    if record.results:
        lines.append(r"\paragraph{Results.}")
        lines.append(_results_block(record))
    return "\n".join(lines)


def _breakable_tt(name):
    r"""``\texttt`` of a name that may break after underscores (long names in table cells)."""
    return r"\texttt{%s}" % escape_text(name).replace(r"\_", r"\_\allowbreak{}")


def summary_latex(files):
    r"""The regression summary: the count of each status, then one table row per stored
    result (derivation, result, status), a ``longtable`` that continues across pages.

    >>> class C:
    ...     derivation, result, status = "pair", "energy", "identical"
    >>> class F:
    ...     comparisons, load_error = [C()], None
    >>> print(summary_latex([F()]).splitlines()[1])
    1 stored result compared: 1 identical.
    """
    rows = [(c.derivation, c.result, c.status) for f in files for c in f.comparisons]
    lines = [r"\section*{Regression summary}"]
    unloaded = [f.name for f in files if getattr(f, "load_error", None) is not None]
    if not rows:
        lines.append("No stored results were compared.")
    else:
        counts = {}
        for _, _, status in rows:  # in order of first appearance: deterministic
            counts[status] = counts.get(status, 0) + 1
        tally = ", ".join(f"{n} {escape_text(status)}" for status, n in counts.items())
        noun = "result" if len(rows) == 1 else "results"
        lines.append(f"{len(rows)} stored {noun} compared: {tally}.")
    if unloaded:
        lines.append(r"\par Files that could not be loaded (counted as errors): "
                     + ", ".join(_breakable_tt(name) for name in unloaded) + ".")
    if not rows:
        return "\n".join(lines)
    # widths plus six \tabcolsep (6 pt each) stay inside \textwidth
    lines.append(r"\begin{longtable}{p{0.38\textwidth}p{0.34\textwidth}p{0.15\textwidth}}")
    head = r"\textbf{derivation} & \textbf{result} & \textbf{status}\tabularnewline\hline"
    lines += [head, r"\endhead"]
    for derivation_name, result, status in rows:
        lines.append(rf"\raggedright {_breakable_tt(derivation_name)} & \raggedright "
                     rf"{_breakable_tt(result)} & {escape_text(status)}\tabularnewline")
    lines.append(r"\end{longtable}")
    return "\n".join(lines)


#: article's \subsection with ragged-right titles: a long title in bold 12 pt does not
#: stick out into the margin when TeX finds no good hyphenation
_RAGGED_TITLES = (r"\makeatletter\renewcommand\subsection{\@startsection{subsection}{2}{\z@}"
                  r"{-3.25ex\@plus -1ex \@minus -.2ex}{1.5ex \@plus .2ex}"
                  r"{\normalfont\large\bfseries\raggedright}}\makeatother")


def report_latex(files, title="Derivations"):
    """A standalone LaTeX document for the outcomes of a folder run.

    ``files`` is a sequence of :class:`~amalgebra.derivations.runner.FileOutcome`
    (anything with ``name``, ``records``, ``comparisons`` and ``load_error``).
    Compiles with ``pdflatex`` using only ``amsmath``, ``amssymb`` (the
    ``\\mathbb{I}`` of an identity matrix) and ``longtable`` (the summary), all in
    TeX Live's base set; the regression statuses of stored results are in a summary
    section at the end.
    """
    parts = [r"\documentclass{article}", r"\usepackage{amsmath}",
             r"\usepackage{amssymb}",
             r"\usepackage{longtable}", r"\allowdisplaybreaks", _RAGGED_TITLES,
             # rows of fractions in the 3j/6j/9j arrays and labelled matrices do not touch
             r"\renewcommand{\arraystretch}{1.3}", r"\begin{document}",
             rf"\section*{{{escape_text(title)}}}"]
    for f in files:
        parts.append(rf"\section{{{_breakable_tt(f.name)}}}")
        if f.load_error is not None:
            parts.append(r"\paragraph{Could not be loaded.} "
                         + escape_text(str(f.load_error).splitlines()[0]))
        for record in f.records:
            parts.append(_record_block(record, f.comparisons))
    parts.append(summary_latex(files))
    parts.append(r"\end{document}")
    return "\n".join(parts) + "\n"
