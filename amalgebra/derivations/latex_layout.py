r"""Line breaking for report equations: a width estimate on LaTeX and the rows of a long expression.

Explanation
===========

TeX does not break display math, so the report breaks long equations itself
before they reach an ``align``.  The width of a LaTeX string is estimated by
:func:`visible_width`, a heuristic on the source: a character that prints
counts 1, a control word that prints a glyph (``\alpha``, ``\langle``) counts
1, layout commands (``\left``, ``\mathrm``, ``\quad`` ...) count 0 or their
space, braces, ``^`` and ``_`` count 0, a sub- or superscript counts 0.7 per
character, a binary operator or relation (``+``, ``=``, ``\leq``) counts 2 (with its
spacing), a matrix counts the sum of its column widths plus 1.8 per column gap, ``\substack`` its
widest line, and ``\frac{a}{b}`` counts the wider of ``a`` and ``b``.  It is
an estimate in "characters of 10 pt math", so limits are chosen with margin:
:data:`ROW_WIDTH` (44) fits the 345 pt text width of the
``article`` class beside an equation tag.

:func:`expression_rows` splits an expression into rows no wider than the limit
where the structure allows: a sum at its top-level terms (each continuation
row starts ``\quad +``), and a factor times a long sum as
``c \Bigl( ... \Bigr)`` across rows (``\Bigl``/``\Bigr`` are fixed-size
delimiters, so unlike ``\left``/``\right`` they may sit on different rows).
An expression with no such structure stays on one row.

Examples
========

>>> from sympy import symbols, Add
>>> from amalgebra.derivations.latex_layout import expression_rows, visible_width
>>> visible_width(r"\frac{x^{2}}{3} + \left(y\right)")
6.7
>>> a, xs = symbols("a"), symbols("x0:12")
>>> rows = expression_rows(a * Add(*[x**3 for x in xs]), 30)
>>> rows[0]
'a \\Bigl(x_{0}^{3} + x_{1}^{3} + x_{10}^{3} + x_{11}^{3} + x_{2}^{3}'
>>> rows[-1].endswith(r"\Bigr)") and all(visible_width(r) <= 30 for r in rows)
True
"""

import re

from sympy import Add, Mul, latex

__all__ = ["ROW_WIDTH", "visible_width", "expression_rows"]

#: Width limit of one equation row, in the units of :func:`visible_width`.
ROW_WIDTH = 44

_SILENT = {"left", "right", "Bigl", "Bigr", "bigl", "bigr", "middle", "mathrm", "mathbf",
           "mathit", "text", "operatorname", "displaystyle", "begin", "end", "limits",
           "notag", "nonumber", "mathtt", "boldsymbol", "tag", "phantom"}
_SPACES = {"quad": 2.0, "qquad": 4.0, ",": 0.3, ";": 0.5, ":": 0.4, "!": 0.0, " ": 0.3}
_OPERATORS = set("+-=<>")
_OPERATOR_WORDS = {"leq", "geq", "times", "cdot", "neq", "pm", "mp", "otimes", "oplus", "to"}
_TOKEN = re.compile(r"\\([A-Za-z]+|.)|([{}])|([\^_])|(\s+)|(.)", re.S)


def _group(tex, start):
    """The end index (just past the closing brace) of the group opening at ``tex[start]``."""
    depth = 0
    for i in range(start, len(tex)):
        if tex[i] == "\\":
            continue
        if tex[i] == "{" and (i == 0 or tex[i - 1] != "\\"):
            depth += 1
        elif tex[i] == "}" and tex[i - 1] != "\\":
            depth -= 1
            if depth == 0:
                return i + 1
    return len(tex)


def _table_width(body, scale):
    """Width of rows separated by ``\\\\`` and cells by ``&``: the sum of the widest cells."""
    rows = [[_width(c, scale) for c in r.split("&")] for r in body.split("\\\\")]
    columns = max(len(r) for r in rows)
    widest = [max((r[k] for r in rows if k < len(r)), default=0.0) for k in range(columns)]
    # a column gap of an array or matrix is about two letters
    return sum(widest) + 1.8 * scale * (columns - 1)


def visible_width(tex):
    r"""Estimated printed width of math LaTeX ``tex``, in characters (see the module docstring).

    >>> from amalgebra.derivations.latex_layout import visible_width
    >>> visible_width(r"\left\langle 1, 0 \middle| 2, 0 \right\rangle")
    9.0
    >>> visible_width(r"\mathrm{abc}_{12}")
    4.4
    """
    return round(_width(tex), 6)


def _width(tex, scale=1.0):
    total, i, n = 0.0, 0, len(tex)
    while i < n:
        match = _TOKEN.match(tex, i)
        word, brace, script, space, char = match.groups()
        i = match.end()
        if word is not None:
            if word == "frac" and i < n and tex[i] == "{":
                mid = _group(tex, i)
                end = _group(tex, mid) if mid < n and tex[mid] == "{" else mid
                total += max(_width(tex[i + 1:mid - 1], scale), _width(tex[mid + 1:end - 1], scale))
                i = end
            elif word == "begin" and i < n and tex[i] == "{":
                env_end = _group(tex, i)
                env = tex[i + 1:env_end - 1]
                close = tex.find(r"\end{%s}" % env, env_end)
                close = n if close < 0 else close
                total += _table_width(tex[env_end:close], scale) + (2 * scale if "matrix" in env else 0)
                i = min(n, close + len(r"\end{%s}" % env))
            elif word == "substack" and i < n and tex[i] == "{":
                end = _group(tex, i)
                total += _table_width(tex[i + 1:end - 1], scale)
                i = end
            elif word in _SPACES:
                total += _SPACES[word] * scale
            elif word in _OPERATOR_WORDS:
                total += 2.0 * scale
            elif word not in _SILENT and word not in "{}":
                total += scale
            elif word in "{}":
                total += scale
        elif script is not None:
            if i < n and tex[i] == "{":
                end = _group(tex, i)
                total += _width(tex[i + 1:end - 1], 0.7 * scale)
                i = end
            elif i < n:
                total += 0.7 * scale
                i += 1
        elif char is not None and char != "&":
            # a binary operator or relation carries its spacing: about two letters
            total += (2.0 if char in _OPERATORS else 1.0) * scale
    return total


def _printer():
    from sympy.printing.latex import LatexPrinter

    return LatexPrinter()


def _signed_terms(expr):
    """The terms of a sum in the printer's order, as ``(negative, term without its sign)``."""
    out = []
    for term in _printer()._as_ordered_terms(expr, order=None):
        negative = term.could_extract_minus_sign()
        out.append((negative, -term if negative else term))
    return out


def _wrap(chunks, opening, closing):
    chunks = list(chunks)
    chunks[0] = (opening + chunks[0][0], chunks[0][1])
    chunks[-1] = (chunks[-1][0] + closing, chunks[-1][1])
    return chunks


def _add_chunks(expr, width):
    out = []
    for k, (negative, term) in enumerate(_signed_terms(expr)):
        sub = _chunks(term, width)
        sign = ("- " if negative else "") if k == 0 else ("- " if negative else "+ ")
        out += [(sign + sub[0][0], "")] + sub[1:]
    return out


def _factor_chunks(factor, width, first):
    r"""Chunks of one factor of a product: a long sum between ``\Bigl(`` and ``\Bigr)``."""
    from sympy.printing.precedence import PRECEDENCE

    tex = _printer().parenthesize(factor, PRECEDENCE["Mul"])
    lead = "" if first else r"\times "
    if visible_width(tex) <= width:
        return [(tex, lead)]
    if isinstance(factor, Add):
        sub = _wrap(_add_chunks(factor, width - 2), r"\Bigl(", r"\Bigr)")
    else:
        sub = _chunks(factor, width)
    return [(sub[0][0], lead)] + sub[1:]


def _mul_chunks(expr, width):
    coefficient, factors = expr.as_coeff_mul()
    numerators, denominators = [], []
    for f in factors:
        if f.is_commutative and f.is_Pow and f.exp.is_Rational and f.exp.is_negative:
            denominators.append(1 / f)
        else:
            numerators.append(f)
    if not numerators:
        return [(latex(expr), "")]
    sign = "- " if coefficient.is_negative else ""
    coefficient = abs(coefficient)
    p, q = coefficient.as_numer_denom() if coefficient.is_Rational else (coefficient, 1)
    denominator = Mul(q, *denominators)
    if denominator != 1:
        head = r"\frac{%s}{%s}" % (latex(p), latex(denominator))
    else:
        head = "" if p == 1 else latex(p)
    out = [(sign + head, "")] if sign or head else []
    for k, f in enumerate(numerators):
        out += _factor_chunks(f, width, first=(k == 0))
    if len(out) > 1 and out[0][0] in ("", "- "):
        out = [(out[0][0] + out[1][0], "")] + out[2:]
    return out


def _sum_chunks(expr, width):
    from sympy import Dummy, Sum

    mark = Dummy("SUMMAND")
    head = latex(Sum(mark, *expr.limits)).replace(latex(mark), "").rstrip()
    body = expr.function
    if isinstance(body, Add):
        sub = _wrap(_add_chunks(body, width - 2), r"\Bigl(", r"\Bigr)")
    else:
        sub = _chunks(body, width)
    if visible_width(head + " " + sub[0][0]) > width:  # e.g. many limits and a long phase
        return [(head, "")] + sub
    return [(head + " " + sub[0][0], "")] + sub[1:]


def _chunks(expr, width):
    r"""Pieces ``(latex, lead)`` of ``expr`` that each fit ``width`` where the structure allows.

    ``lead`` is written before a piece only when the piece starts a row (``\times``
    before a factor of a product).
    """
    from sympy import Sum

    tex = latex(expr)
    if visible_width(tex) <= width:
        return [(tex, "")]
    if isinstance(expr, Add):
        return _add_chunks(expr, width)
    if isinstance(expr, Mul):
        return _mul_chunks(expr, width)
    if isinstance(expr, Sum):
        return _sum_chunks(expr, width)
    return [(tex, "")]


def _pack(chunks, width, lead_width):
    rows, current, used = [], "", lead_width
    for text, lead in chunks:
        w = visible_width(text) + 1
        if current and used + w > width:
            rows.append(current)
            current = r"\quad " + lead + text
            used = 2 + visible_width(lead + text)
        else:
            current = f"{current} {text}" if current else text
            used += w
    rows.append(current)
    return rows


def expression_rows(expr, width=ROW_WIDTH, lead_width=0.0):
    r"""Rows (LaTeX strings) of ``expr`` each estimated no wider than ``width``.

    The first row is to follow ``&=`` (``lead_width`` says how much of it the
    left side uses); later rows start with ``\quad``.  A sum breaks at its
    terms, a product at its factors (a continuation row starts ``\times``), a
    long sum factor as ``\Bigl( ... \Bigr)``, a fraction with a long numerator
    as ``\frac{1}{d}`` times the numerator, a ``Sum`` after its limits.
    Pieces with no such structure stay whole (and may be wider).

    >>> from sympy import symbols
    >>> from amalgebra.derivations.latex_layout import expression_rows
    >>> a, b = symbols("a b")
    >>> expression_rows(a + b)
    ['a + b']
    """
    tex = latex(expr)
    if visible_width(tex) + lead_width <= width:
        return [tex]
    return _pack(_chunks(expr, width - 2), width, lead_width)
