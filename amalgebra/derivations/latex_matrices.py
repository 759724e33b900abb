r"""Matrices in the report: row and column basis labels, and a size rule for large ones.

Explanation
===========

A matrix that carries its basis (an ``OperatorMatrix`` or ``HamiltonianMatrix`` of
:mod:`amalgebra.states.hamiltonian`) is typeset by the first of these that fits a row
of the report (widths by :func:`~amalgebra.derivations.latex_layout.visible_width`):

1. the whole matrix as an ``array`` with the basis kets, as the library prints them,
   in small type above the columns and left of the rows;
2. the whole matrix with the kets left of the rows and the row numbers above the
   columns (for kets too wide to head a column);
3. when the matrix falls into blocks (conserved ``M``, ``F``, ...): a line naming the
   blocks, then each block by rule 1 or 2 under its quantum numbers; the
   :math:`1 \times 1` blocks packed as ``ket: value`` items; a block too wide for
   both as the list of its nonzero entries;
4. otherwise the list of the nonzero entries ``M_{i,j} = x`` and a basis legend.

A plain matrix (no basis) is shown whole when it fits and as its entry list otherwise.
Only ``array``, ``\hline``, ``\scriptstyle`` and ``\text`` are used, which pdflatex
with amsmath and KaTeX both accept.

Examples
========

>>> from sympy import Rational, symbols
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.states.hamiltonian import hamiltonian_matrix
>>> from amalgebra.derivations.latex_matrices import basis_matrix_rows
>>> S, b = AngularMomentum("S"), symbols("b")
>>> hm = hamiltonian_matrix(b*S.z, {"S": Rational(1, 2)})
>>> print(basis_matrix_rows(hm.matrix, hm.basis, None, 44)[0])
\begin{array}{r|cc} & {\scriptstyle {\left|\frac{1}{2}, \frac{1}{2}\right\rangle}_{S}} & {\scriptstyle {\left|\frac{1}{2}, - \frac{1}{2}\right\rangle}_{S}} \\ \hline {\scriptstyle {\left|\frac{1}{2}, \frac{1}{2}\right\rangle}_{S}} & \frac{b}{2} & 0 \\ {\scriptstyle {\left|\frac{1}{2}, - \frac{1}{2}\right\rangle}_{S}} & 0 & - \frac{b}{2} \end{array}
"""

from sympy import latex

from .latex_layout import expression_rows, visible_width

__all__ = ["basis_matrix_rows", "labelled_array", "matrix_blocks", "LABEL_SCALE", "MAX_LABELLED"]

#: Width factor of ``\scriptstyle`` labels (TeX's script size is 7 pt of 10 pt).
LABEL_SCALE = 0.7
#: Width of a column gap of an ``array``, in characters of 10 pt math.
_GAP = 1.8
#: A labelled array is tried only up to this size (a larger matrix goes by blocks).
MAX_LABELLED = 8
_ENTRY_GAP = r",\quad "


def _small(tex):
    return r"{\scriptstyle %s}" % tex


def labelled_array(matrix, states, width, numbers=None):
    r"""The matrix as an ``array`` with row and column labels, or ``None`` when too wide.

    Column heads are the kets when they fit (rule 1 of the module), else the row
    numbers ``(1), (2), ...`` (or ``numbers``, the positions of a block's states in
    the whole basis) with the rows labelled ``(k)\ ket`` (rule 2).
    """
    n, m = matrix.shape
    if n != len(states) or n != m or n == 0 or n > MAX_LABELLED:
        return None
    entries = [[latex(matrix[i, j]) for j in range(m)] for i in range(n)]
    kets = [latex(s) for s in states]
    columns = [max(visible_width(entries[i][j]) for i in range(n)) for j in range(m)]
    ket_width = max(visible_width(k) for k in kets) * LABEL_SCALE
    spec = "r|" + "c" * m

    def table(heads, rows):
        body = ["& " + " & ".join(heads) + r" \\ \hline"]
        body += [" & ".join([label] + row) + (r" \\" if i < n - 1 else "")
                 for i, (label, row) in enumerate(zip(rows, entries))]
        return r"\begin{array}{%s} %s \end{array}" % (spec, " ".join(body))

    full = ket_width + _GAP + sum(max(c, ket_width) for c in columns) + _GAP * (m - 1) + 1
    if full <= width:
        return table([_small(k) for k in kets], [_small(k) for k in kets])
    numbers = numbers or list(range(1, n + 1))
    number = (2 + len(str(max(numbers)))) * LABEL_SCALE
    numbered = (ket_width + number + _GAP + sum(max(c, number) for c in columns)
                + _GAP * (m - 1) + 1)
    if numbered <= width:
        heads = [_small(f"({k})") for k in numbers]
        return table(heads, [_small(rf"({k})\ {ket}") for k, ket in zip(numbers, kets)])
    return None


def matrix_blocks(value):
    """``(blocks, conserved)`` of a value that has blocks (``HamiltonianMatrix``,
    ``OperatorMatrix``), or ``None``."""
    from ..states.hamiltonian import OperatorMatrix

    if not isinstance(value, OperatorMatrix):
        return None
    return value.blocks, value.conserved


def _pack(items, width):
    rows, current, used = [], [], 0.0
    for item in items:
        w = visible_width(item) + 3
        if current and used + w > width:
            rows.append(_ENTRY_GAP.join(current) + ",")
            current, used = [], 0.0
        current.append(item)
        used += w
    if current:
        rows.append(_ENTRY_GAP.join(current))
    return rows


def _entry_rows(matrix, states, width, numbers=None):
    """The nonzero entries ``M_{i,j} = x`` (1-based, or the given row numbers) and a legend."""
    n, m = matrix.shape
    numbers = numbers or list(range(1, n + 1))
    # a block's columns are its rows' states; a plain matrix may be rectangular
    columns = numbers if m == n else list(range(1, m + 1))
    rows = [rf"\text{{{n} $\times$ {m} matrix, nonzero entries (row, column):}}"]
    items = []
    for i in range(n):
        for j in range(m):
            if matrix[i, j] != 0:
                head = rf"M_{{{numbers[i]},{columns[j]}}} = "
                parts = expression_rows(matrix[i, j], width - 2, visible_width(head))
                if len(parts) == 1:
                    items.append(head + parts[0])
                else:  # a long entry: its own rows
                    rows.extend(_pack(items, width) if items else [])
                    items = []
                    rows.extend([head + parts[0]] + parts[1:])
    rows.extend(_pack(items, width) if items else [r"\text{(all entries zero)}"])
    if states is not None:
        legend = [rf"{k}\colon {latex(s)}" for k, s in zip(numbers, states)]
        rows.append(r"\text{basis (rows and columns):}")
        rows.extend(_pack(legend, width))
    return rows


def _text_rows(text, width):
    r"""``\text{...}`` rows of a sentence broken at spaces (about ``width`` letters each;
    text letters are narrower than math ones, hence the factor)."""
    rows, current = [], ""
    for word in text.split(" "):
        if current and visible_width(current + " " + word) * 0.8 > width:
            rows.append(current)
            current = word
        else:
            current = f"{current} {word}" if current else word
    rows.append(current)
    return [rf"\text{{{r}}}" for r in rows]


def _caption(quantum_numbers):
    parts = []
    for key, value in quantum_numbers.items():
        if key in ("M", "F"):
            parts.append(rf"{key} = {latex(value)}")
        elif key == "parity":
            parts.append(rf"(-1)^{{\sum l}} = {latex(value)}")
        else:  # the j of a label given several j values
            parts.append(rf"j_{{{key}}} = {latex(value)}")
    return ",\\ ".join(parts)


def _block_rows(matrix, states, blocks, conserved, width):
    n = matrix.shape[0]
    sizes = sorted({b.size for b in blocks}, reverse=True)
    what = ", ".join(conserved) if conserved else "connected components"
    rows = _text_rows(f"{n} $\\times$ {n} matrix in {len(blocks)} blocks of sizes "
                      f"{', '.join(str(s) for s in sizes)} ({_escape(what)} conserved; the elements "
                      "between blocks vanish):", width)
    singles = []
    for block in blocks:
        idx = list(block.indices)
        block_states = [states[i] for i in idx]
        caption = _caption(block.quantum_numbers)
        if block.size == 1:
            singles.append(rf"{_small(latex(block_states[0]))}\colon {latex(block.matrix[0, 0])}")
            continue
        lead = visible_width(caption) + 2
        numbers = [i + 1 for i in idx]
        array = labelled_array(block.matrix, block_states, width - lead, numbers)
        if array is not None:
            rows.append(rf"{caption}\colon\ {array}")
            continue
        array = labelled_array(block.matrix, block_states, width, numbers)
        if array is not None:
            rows.extend([rf"{caption}\colon", array])
            continue
        rows.append(rf"{caption}\colon")
        rows.extend(_entry_rows(block.matrix, block_states, width, [i + 1 for i in idx])[1:])
    if singles:
        rows.append(r"\text{$1 \times 1$ blocks (basis state: value):}")
        rows.extend(_pack(singles, width))
    return rows


def _escape(text):
    from .latex import escape_text

    return escape_text(text)


def basis_matrix_rows(matrix, states, value, width):
    """Rows of a matrix with basis ``states`` by the size rule of the module docstring.

    ``value`` is the object the matrix came from (its blocks are used when it has
    them), or ``None``.
    """
    array = labelled_array(matrix, list(states), width)
    if array is not None:
        return [array]
    found = matrix_blocks(value) if value is not None else None
    if found is not None and len(found[0]) > 1:
        return _block_rows(matrix, list(states), found[0], found[1], width)
    return _entry_rows(matrix, list(states), width)
