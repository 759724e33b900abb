r"""LaTeX rendering of derivation records: one ``align`` per derivation, one document per folder.

Explanation
===========

A derivation renders as an amsmath ``align`` environment, one line per step::

    lhs &= rhs && \text{justification} \\
        &= rhs' && \text{next justification}

(a step stated with ``d.then`` continues the previous line's chain).  Expressions are
printed by ``sympy.latex`` (so operators print through their own ``_latex`` hooks).
Justifications and descriptions (the derivation's docstring) are plain text, escaped
for LaTeX, except that balanced ``$...$`` segments pass through as math.  Only amsmath constructs that KaTeX also accepts are used, and the
output is the same under any ``PYTHONHASHSEED`` (no dates, no set iteration).

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
\left(x + 1\right)^{2} &= x^{2} + 2 x + 1 && \text{binomial theorem, 100\% sure}
\end{align}
"""

__all__ = ["escape_text", "text_with_math", "justification_latex", "derivation_latex", "report_latex"]

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


def _tex(expr):
    from sympy import latex

    return latex(expr)


def derivation_latex(record):
    """The ``align`` environment of one derivation record (its steps so far)."""
    rows = []
    for step in record.steps:
        lhs = "" if step.continued else _tex(step.lhs) + " "
        rows.append(f"{lhs}&= {_tex(step.rhs)} && {justification_latex(step.because)}")
    if not rows:
        return ""
    return "\\begin{align}\n" + " \\\\\n".join(rows) + "\n\\end{align}"


def _record_block(record, comparisons):
    lines = [rf"\subsection{{{text_with_math(record.title)}}}",
             rf"\label{{deriv:{record.name}}}"]
    if record.description:
        lines.append(text_with_math(record.description))
    lines.append("")
    body = derivation_latex(record)
    if body:
        lines.append(body)
    if record.steps:
        lines.append(r"\begin{itemize}")
        for step in record.steps:
            lines.append(rf"\item \texttt{{{escape_text(step.name)}}}: {escape_text(step.status)}")
        lines.append(r"\end{itemize}")
    if record.error is not None:
        lines.append(r"\paragraph{Failed.} " + escape_text(str(record.error).splitlines()[0]))
    if record.results:
        lines.append(r"\paragraph{Results.}")
        status = {c.result: c.status for c in comparisons if c.derivation == record.name}
        rows = []
        for name, expr in record.results.items():
            tag = f" ({status[name]})" if name in status else ""
            rows.append(rf"\text{{{escape_text(name + tag)}:}} &\quad {_tex(expr)}")
        lines.append("\\begin{align*}\n" + " \\\\\n".join(rows) + "\n\\end{align*}")
    return "\n".join(lines)


def report_latex(files, title="Derivations"):
    """A standalone LaTeX document for the outcomes of a folder run.

    ``files`` is a sequence of :class:`~amalgebra.derivations.runner.FileOutcome`
    (anything with ``name``, ``records``, ``comparisons`` and ``load_error``).
    Compiles with ``pdflatex`` using only ``amsmath``.
    """
    parts = [r"\documentclass{article}", r"\usepackage{amsmath}",
             r"\allowdisplaybreaks", r"\begin{document}",
             rf"\section*{{{escape_text(title)}}}"]
    for f in files:
        parts.append(rf"\section{{\texttt{{{escape_text(f.name)}}}}}")
        if f.load_error is not None:
            parts.append(r"\paragraph{Could not be loaded.} "
                         + escape_text(str(f.load_error).splitlines()[0]))
        for record in f.records:
            parts.append(_record_block(record, f.comparisons))
    parts.append(r"\end{document}")
    return "\n".join(parts) + "\n"
