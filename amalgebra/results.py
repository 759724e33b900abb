r"""Result containers that display as LaTeX in notebooks, with or without ``init_printing()``.

Explanation
===========

Some functions return plain Python containers of SymPy objects: the change of
basis of :func:`~amalgebra.states.coupled.coupling_matrix` (a tuple), the
table of :func:`~amalgebra.tensors.wigner_eckart.element_table` (a dict) and the parts of
:func:`~amalgebra.tensors.irreducible.decompose` (a dict of dicts).  Jupyter
shows a tuple or dict as plain text unless ``sympy.init_printing()`` has
registered its container formatters.  The classes here are those containers
(``tuple`` / ``dict`` subclasses: unpacking, indexing, ``==`` and ``repr`` are
unchanged) that are also :class:`sympy.printing.defaults.Printable`, whose
``_repr_latex_`` Jupyter calls; ``init_printing()`` still governs its settings
(it replaces ``Printable._repr_latex_``).  The LaTeX is decided in
:mod:`amalgebra.notation` (``*_latex`` functions of the same stem) and uses
only MathJax/KaTeX primitives (``array``, ``aligned``, ``\hline``).

Examples
========

>>> from amalgebra.tensors.wigner_eckart import element_table
>>> table = element_table("1/2", 1, "1/2", 1)
>>> isinstance(table, dict), len(table)
(True, 4)
>>> table._repr_latex_()[:40]
"$\\displaystyle \\begin{array}{rrr|l} m' &"
"""

from sympy.printing.defaults import Printable

from . import notation

__all__ = ["CouplingMatrix", "ElementTable", "Decomposition", "TotalBlocks", "LatexDisplay"]


class LatexDisplay(Printable):
    """Mixin: ``_latex`` through ``notation.<_notation_key>_latex``; the container keeps its repr.

    List it after the container type (``class T(tuple, LatexDisplay)``) so that
    the container's ``__repr__`` stays the one shown as text.
    """

    __slots__ = ()
    _notation_key = None

    def _latex(self, printer, exp=None):
        return getattr(notation, f"{self._notation_key}_latex")(printer, self, exp)


class CouplingMatrix(tuple, LatexDisplay):
    r"""``(U, uncoupled, coupled)`` with ``U[i, k] = <uncoupled_i | coupled_k>`` (Condon-Shortley).

    Displays as the matrix with the coupled kets over its columns and the
    uncoupled kets beside its rows.

    >>> from amalgebra.states.coupled import coupling_matrix
    >>> result = coupling_matrix(["1/2", "1/2"], ("A", "B"))
    >>> U, unc, cpl = result
    >>> U.shape, type(result).__name__
    ((4, 4), 'CouplingMatrix')
    """

    __slots__ = ()
    _notation_key = "coupling_matrix"


class ElementTable(dict, LatexDisplay):
    r"""``{(m', q, m): <j' m'|T^k_q|j m>}``; displays as a four-column array.

    >>> from amalgebra.tensors.wigner_eckart import element_table
    >>> t = element_table(1, 1, 1, 1)
    >>> t[(1, 0, 1)] == -t[(-1, 0, -1)] != 0    # like <1 1|Jz|1 1> = -<1 -1|Jz|1 -1>, Edmonds (5.4.1)
    True
    """

    __slots__ = ()
    _notation_key = "element_table"


class Decomposition(dict, LatexDisplay):
    r"""``{k: {q: X^(k)_q}}``, the irreducible parts; displays one ``X^{(k)}_{q} = ...`` per line.

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors.irreducible import decompose
    >>> J = AngularMomentum("J")
    >>> parts = decompose(J.z)
    >>> sorted(parts), type(parts).__name__
    ([1], 'Decomposition')
    """

    __slots__ = ()
    _notation_key = "decomposition"


class TotalBlocks(dict, LatexDisplay):
    r"""``{total: (states, matrix)}``: a scalar operator in the blocks of a coupling scheme's total momentum.

    Displays one ``F = ...: matrix`` per block.

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.coupling.trees import coupling_tree
    >>> from amalgebra.tensors.tree_elements import scalar_coupled, tree_operator_blocks
    >>> blocks = tree_operator_blocks(coupling_tree("(a b) J", a="1/2", b="1/2"),
    ...                               scalar_coupled(AngularMomentum("a"), AngularMomentum("b")))
    >>> type(blocks).__name__, {J: m[0, 0] for J, (states, m) in blocks.items()}   # a.b = -3/4, 1/4
    ('TotalBlocks', {0: -3/4, 1: 1/4})
    """

    __slots__ = ()
    _notation_key = "total_blocks"
