r"""Notation: how every amalgebra object is written as str, Unicode pretty and LaTeX.

Explanation
===========

This module is the single place that decides notation.  The classes keep
SymPy's printmethod hooks (``_sympystr``, ``_pretty``, ``_latex``) and each
hook is one call to a function here; every sub-expression is printed with
``printer._print(sub)``, so printer settings propagate.  No printer is
patched and no global state is kept.

The functions are grouped by object kind and named ``<kind>_str``,
``<kind>_pretty`` and ``<kind>_latex``; each takes ``(printer, obj)``.
Trailing digits of a label become a subscript in LaTeX (``S1`` prints
``{S_{1}}``, ``S1.z`` prints ``S_{1z}``), other multi-letter labels are set
upright (``\mathrm{Sb}``), one-letter labels italic.

**str is complete, pretty and LaTeX are for reading.**  The str of every object says
everything the object holds, so that :func:`amalgebra.parsing.parse` reads it back to the
same object (``parse(str(x)) == x``; tested for every class in ``tests/test_parsing.py``).
So str names what the typeset forms leave to the context: the angular momentum a vector
or tensor is under (``r[L].z``, ``T^(2)[J]_(1)``, ``[T^(2)[J] x U^(1)[S]]^(2)``; ``r.z``
alone is the component of ``AngularMomentum("r")``) with its settings when they are not the
defaults (``C^(1)[L, racah]``, ``p[L, general].x`` for non-Hermitian components), and the name of every momentum of a
tree ket (``|(1_a 1/2_b)3/2_J, 1/2>``, where the coupled ket ``|(1_a 1/2_b)3/2, 1/2>`` has no
name for its total).  Unicode pretty and LaTeX print a vector component ``r_z``, a tensor
component ``T^{(2)}_{1}`` and a coupled tensor ``[T^{(2)} \times U^{(1)}]^{(2)}`` without
the label, as papers do: the label is the algebraic setting (which momentum the operator
is a vector under), fixed for a paper, not part of the symbol; an expression in which one
name stands for two such settings (a vector ``r`` under ``L`` and under ``J``, or beside an
angular momentum ``r``) is told apart in str only.  Tree kets keep the names of their
momenta in pretty and LaTeX too (``\frac{3}{2}_{J}``), since two trees with the same
leaves differ only by them.  The printed forms of the first notation that said too little
are refused by the reader with a :class:`~amalgebra.errors.ParseError` (``T^(2)_(1)``,
``[T^(2) x U^(1)]^(2)``, a ket coupled in a non-chain tree without names), except where the
old text is a complete form of another object (``r.z``, ``|(1_a 1/2_b)3/2, 1/2>``).

The notation table (each str reads back with :func:`amalgebra.parsing.parse` to an object
that prints the LaTeX beside it; ``tests/test_katex.py`` checks both and renders the LaTeX):

.. list-table::
   :header-rows: 1

   * - object
     - str
     - LaTeX
   * - the angular momentum ``J``
     - ``AngularMomentum('J')``
     - ``\mathbf{J}``
   * - a component
     - ``J.z``
     - ``J_{z}``
   * - a ladder operator
     - ``J.plus``
     - ``J_{+}``
   * - the Casimir (no parentheses alone)
     - ``J.squared``
     - ``J^{2}``
   * - the Casimir under a power
     - ``(J.squared)**3``
     - ``\left(J^{2}\right)^{3}``
   * - ket
     - ``|1, 0>_S``
     - ``{\left|1, 0\right\rangle}_{S}``
   * - bra
     - ``<1, 0|_S``
     - ``{\left\langle 1, 0\right|}_{S}``
   * - product ket
     - ``|1, 0>_L|1/2, 1/2>_S``
     - ``{\left|1, 0\right\rangle}_{L} {\left|\frac{1}{2}, \frac{1}{2}\right\rangle}_{S}``
   * - coupled ket
     - ``|(1_A 1_B)2, 0>``
     - ``\left|\left(1_{A} 1_{B}\right) 2, 0\right\rangle``
   * - tree ket (every momentum named)
     - ``|(1_a 1_b)2_J, 0>``
     - ``\left|\left(1_{a}\, 1_{b}\right) 2_{J}, 0\right\rangle``
   * - boson creation operator
     - ``a.create``
     - ``{a^{\dagger}}``
   * - Fock ket
     - ``|2, 1>_(a,b)``
     - ``{\left|2, 1\right\rangle}_{a,b}``
   * - D-matrix element
     - ``D^{1}_{1,0}(a, b, c)``
     - ``D^{1}_{1,0}\left(a,b,c\right)``
   * - reduced matrix element
     - ``<1||T^(1)||1>``
     - ``\langle 1 \| T^{(1)} \| 1 \rangle``
   * - the same, CG normalisation
     - ``<1||T^(1)||1>_cg``
     - ``\langle 1 \| T^{(1)} \| 1 \rangle_{\mathrm{CG}}``
   * - spherical tensor
     - ``T^(1)[J]``
     - ``T^{(1)}``
   * - tensor component
     - ``T^(1)[J]_(0)``
     - ``{T^{(1)}_{0}}``
   * - Racah tensor component
     - ``C^(1)[L, racah]_(0)``
     - ``{C^{(1)}_{0}}``
   * - vector component
     - ``r[L].z``
     - ``r_{z}``
   * - non-Hermitian vector component
     - ``p[L, general].x``
     - ``p_{x}``
   * - coupled tensor operator
     - ``[T^(1)[a] x J]^(1)``
     - ``\left[T^{(1)} \times \mathbf{J}\right]^{(1)}``
   * - CG symbol
     - ``<1, 0; 1, 0|2, 0>``
     - ``\left\langle 1, 0; 1, 0 \middle| 2, 0 \right\rangle``
   * - 3j symbol
     - ``3j(1, 1, 2; 0, 0, 0)``
     - ``\begin{pmatrix} 1 & 1 & 2 \\ 0 & 0 & 0 \end{pmatrix}``
   * - 6j symbol
     - ``6j{1, 1, 1; 1, 1, 1}``
     - ``\begin{Bmatrix} 1 & 1 & 1 \\ 1 & 1 & 1 \end{Bmatrix}``
   * - 9j symbol
     - ``9j{a, b, c; d, e, f; g, h, i}``
     - ``\begin{Bmatrix} a & b & c \\ d & e & f \\ g & h & i \end{Bmatrix}``

Examples
========

>>> from sympy import latex, pretty
>>> from amalgebra.states.kets import Ket
>>> k = Ket(1, 0, "S1")
>>> str(k), latex(k)
('|1, 0>_S1', '{\\left|1, 0\\right\\rangle}_{{S_{1}}}')
>>> pretty(k, use_unicode=False)
'|1, 0>_S1'

The dagger of a ket prints as the bra with the same numbers (an identity of
notation and algebra together):

>>> from sympy import adjoint
>>> str(adjoint(k)) == "<1, 0|_S1"
True

str names the angular momentum a vector is under; LaTeX leaves it to the context:

>>> from amalgebra.parsing import parse
>>> from amalgebra.tensors.vectors import VectorOperator
>>> r = VectorOperator("r", "L")
>>> str(r.z), latex(r.z), parse(str(r.z)) == r.z
('r[L].z', 'r_{z}', True)

See Also
========

amalgebra.coupling.symbols

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957),
       ch. 3 and 6 (notation of the 3j, 6j and 9j symbols).
"""

import re

from sympy import ImmutableMatrix, Symbol
from sympy.printing.precedence import PRECEDENCE
from sympy.printing.pretty.pretty_symbology import pretty_symbol
from sympy.printing.pretty.stringpict import prettyForm, stringPict

__all__ = [
    "NotationHooks", "CodeHooks", "kernel_code",
    "coupling_matrix_latex", "element_table_latex", "decomposition_latex",
    "equation_pair_latex", "rotation_composition_latex",
    "label_latex",
    "angular_momentum_str", "angular_momentum_latex", "angular_momentum_pretty",
    "component_str", "component_latex", "component_pretty", "component_precedence",
    "state_str", "state_latex", "state_pretty",
    "product_str", "product_latex", "product_pretty",
    "coupled_str", "coupled_latex", "coupled_pretty",
    "boson_mode_str", "boson_mode_latex", "boson_mode_pretty",
    "boson_operator_str", "boson_operator_latex", "boson_operator_pretty",
    "fock_str", "fock_latex", "fock_pretty",
    "rotation_str", "rotation_latex", "rotation_pretty",
    "reduced_str", "reduced_latex", "reduced_pretty",
    "spherical_tensor_str", "spherical_tensor_latex", "spherical_tensor_pretty",
    "tensor_component_str", "tensor_component_latex", "tensor_component_pretty",
    "vector_operator_str", "vector_operator_latex", "vector_operator_pretty",
    "vector_component_str", "vector_component_latex", "vector_component_pretty",
    "tensor_components_str", "tensor_components_latex", "tensor_components_pretty",
    "cg_symbol_str", "cg_symbol_latex", "cg_symbol_pretty",
    "array_symbol_str", "array_symbol_latex", "array_symbol_pretty",
    "text_latex",
    "hamiltonian_matrix_str", "hamiltonian_matrix_latex", "hamiltonian_matrix_pretty",
    "identity_check_latex", "identity_check_pretty",
]

_COMPONENT_LATEX = {"x": "{}_{{x}}", "y": "{}_{{y}}", "z": "{}_{{z}}", "plus": "{}_{{+}}",
                    "minus": "{}_{{-}}", "squared": "{}^{{2}}"}
_COMPONENT_PRETTY = {"x": "_x", "y": "_y", "z": "_z", "plus": "_+", "minus": "_-"}
#: Unicode subscript glyphs where they exist (there are none for y and z: those keep "_y", "_z")
_SUBSCRIPT = {"x": "\N{LATIN SUBSCRIPT SMALL LETTER X}", "plus": "\N{SUBSCRIPT PLUS SIGN}",
              "minus": "\N{SUBSCRIPT MINUS}"}


# -- shared pieces -----------------------------------------------------------------------------

def _label_parts(label):
    """``(head, digits)`` of a label: ``"I1"`` -> ``("I", "1")``, ``"Sb"`` -> ``("Sb", "")``."""
    match = re.fullmatch(r"([A-Za-z]+?)(\d+)", label)
    return (match.group(1), match.group(2)) if match else (label, "")


def _head_latex(head):
    return head if len(head) == 1 else r"\mathrm{%s}" % head


def label_latex(label):
    r"""A label in LaTeX: one letter italic, longer labels upright, trailing digits a subscript.

    A label with trailing digits is braced (``{I_{1}}``), so that a caller may
    append its own subscript or superscript and stay valid TeX.

    >>> label_latex("J"), label_latex("Sb"), label_latex("I1"), label_latex("S1b")
    ('J', '\\mathrm{Sb}', '{I_{1}}', '\\mathrm{S1b}')
    """
    head, digits = _label_parts(label)
    return _head_latex(head) if not digits else r"{%s_{%s}}" % (_head_latex(head), digits)


def _unicode(printer):
    return bool(getattr(printer, "_use_unicode", False))


def _angles(printer):
    if _unicode(printer):
        return "\N{MATHEMATICAL LEFT ANGLE BRACKET}", "\N{MATHEMATICAL RIGHT ANGLE BRACKET}"
    return "<", ">"


def _join(printer, pieces):
    """A prettyForm of strings and SymPy objects side by side (objects via ``printer._print``)."""
    form = None
    for piece in pieces:
        part = prettyForm(piece) if isinstance(piece, str) else printer._print(piece)
        form = part if form is None else prettyForm(*form.right(part))
    return form


def _comma_list(items):
    """``[a, ", ", b, ", ", c]`` for :func:`_join`."""
    pieces = []
    for i, item in enumerate(items):
        if i:
            pieces.append(", ")
        pieces.append(item)
    return pieces


def _scripted(printer, head, sup, sub):
    """``head`` with ``sup`` above and ``sub`` below its right side (prettyForms or objects)."""
    sup = sup if isinstance(sup, stringPict) else printer._print(sup)
    sub = sub if isinstance(sub, stringPict) else printer._print(sub)
    width = max(sup.width(), sub.width())
    # scripts sit flush left against the head, as in TeX
    sup, sub = (stringPict(*form.right(" " * (width - form.width()))) if form.width() < width else form
                for form in (sup, sub))
    scripts = stringPict(*stringPict.stack(sup, stringPict(" "), sub))
    scripts.baseline = sup.height()
    form = prettyForm(*prettyForm(head).right(scripts))
    form.baseline = scripts.baseline
    return form


def _with_power(tex, exp):
    return tex if exp is None else r"%s^{%s}" % (tex, exp)


# -- angular momentum --------------------------------------------------------------------------

def angular_momentum_str(printer, obj):
    return f"AngularMomentum({obj.label!r})"


def _bold_latex(label):
    r"""A vector's name or an angular momentum's label in bold, trailing digits a subscript.

    ``\mathbf`` is upright already, so a longer name is not wrapped in ``\mathrm`` (which
    would undo the bold face); a label with trailing digits is braced, as in :func:`label_latex`.

    >>> _bold_latex("J"), _bold_latex("Sb"), _bold_latex("S1")
    ('\\mathbf{J}', '\\mathbf{Sb}', '{\\mathbf{S}_{1}}')
    """
    head, digits = _label_parts(label)
    return r"\mathbf{%s}" % head if not digits else r"{\mathbf{%s}_{%s}}" % (head, digits)


def angular_momentum_latex(printer, obj, exp=None):
    return _with_power(_bold_latex(obj.label), exp)


def angular_momentum_pretty(printer, obj):
    return prettyForm(obj.label)


def component_str(printer, obj):
    return f"{obj.label}.{obj.component}"


def component_latex(printer, obj, exp=None):
    r"""``J_{z}``, ``I_{1z}`` (label digits join the component subscript), ``J^{2}``.

    A lone ``J.squared`` prints ``J^{2}``; under a power SymPy parenthesizes it
    (``\left(J^{2}\right)^{3}``) because :func:`component_precedence` gives it
    the precedence of a power.

    >>> from sympy import latex
    >>> from amalgebra.algebra.operators import AngularMomentum
    >>> I1 = AngularMomentum("I1")
    >>> latex(I1.z), latex(I1.plus), latex(I1.squared), latex(I1.squared**2)
    ('I_{1z}', 'I_{1+}', 'I_{1}^{2}', '\\left(I_{1}^{2}\\right)^{2}')
    """
    head, digits = _label_parts(obj.label)
    template = _COMPONENT_LATEX[obj.component]
    if digits and obj.component != "squared":
        tex = template.replace("{{", "{{" + digits, 1).format(_head_latex(head))
    elif digits:
        tex = template.format(r"%s_{%s}" % (_head_latex(head), digits))
    else:
        tex = template.format(_head_latex(head))
    return tex if exp is None else "{%s}^{%s}" % (printer.parenthesize_super(tex), exp)


def component_precedence(obj):
    """SymPy precedence of a component: a power for ``J.squared``, an atom otherwise.

    Read by ``sympy.printing.precedence.precedence`` (the ``precedence``
    attribute), so every printer parenthesizes a power of ``J^{2}``.
    """
    return PRECEDENCE["Pow"] if obj.component == "squared" else PRECEDENCE["Atom"]


def component_pretty(printer, obj):
    if obj.component == "squared":
        return prettyForm(pretty_symbol(obj.label)) ** prettyForm("2")
    if not _unicode(printer):
        return prettyForm(obj.label + _COMPONENT_PRETTY[obj.component])
    glyph = _SUBSCRIPT.get(obj.component)
    suffix = glyph if glyph else _COMPONENT_PRETTY[obj.component]
    return prettyForm(pretty_symbol(obj.label) + suffix)


# -- single, product and coupled states -------------------------------------------------------

def state_str(printer, obj):
    """``|j, m>_L`` for a ket, ``<j, m|_L`` for a bra (a class named ``...Ket`` is a ket)."""
    body = f"{printer._print(obj.j)}, {printer._print(obj.m)}"
    return f"|{body}>_{obj.label}" if _is_ket(obj) else f"<{body}|_{obj.label}"


def state_latex(printer, obj, exp=None):
    body = f"{printer._print(obj.j)}, {printer._print(obj.m)}"
    tex = r"\left|%s\right\rangle" % body if _is_ket(obj) else r"\left\langle %s\right|" % body
    return _with_power(r"{%s}_{%s}" % (tex, label_latex(obj.label)), exp)


def state_pretty(printer, obj):
    left, right = ("|", _angles(printer)[1]) if _is_ket(obj) else (_angles(printer)[0], "|")
    return _join(printer, [left, obj.j, ", ", obj.m, right + "_" + obj.label])


def _is_ket(obj):
    return type(obj).__name__.endswith("Ket")


def product_str(printer, obj):
    return "".join(printer._print(k) for k in obj.args)


def product_latex(printer, obj, exp=None):
    tex = " ".join(printer._print(k) for k in obj.args)
    return tex if exp is None else r"\left(%s\right)^{%s}" % (tex, exp)


def product_pretty(printer, obj):
    return _join(printer, list(obj.args))


def coupled_str(printer, obj):
    labs, js = obj.labels, obj.js
    text = f"{printer._print(js[0])}_{labs[0]} {printer._print(js[1])}_{labs[1]}"
    for k in range(2, len(js)):
        text = f"({text}){printer._print(obj.intermediates[k - 2])} {printer._print(js[k])}_{labs[k]}"
    body = f"({text}){printer._print(obj.J)}, {printer._print(obj.M)}"
    return f"|{body}>" if _is_ket(obj) else f"<{body}|"


def coupled_latex(printer, obj, exp=None):
    labs = [label_latex(lab) for lab in obj.labels]
    js = obj.js
    text = r"%s_{%s} %s_{%s}" % (printer._print(js[0]), labs[0], printer._print(js[1]), labs[1])
    for k in range(2, len(js)):
        text = r"\left(%s\right) %s\, %s_{%s}" % (text, printer._print(obj.intermediates[k - 2]),
                                               printer._print(js[k]), labs[k])
    body = r"\left(%s\right) %s, %s" % (text, printer._print(obj.J), printer._print(obj.M))
    tex = r"\left|%s\right\rangle" % body if _is_ket(obj) else r"\left\langle %s\right|" % body
    return _with_power(tex, exp)


def coupled_pretty(printer, obj):
    labs, js = obj.labels, obj.js
    pieces = ["(", js[0], "_" + labs[0] + " ", js[1], "_" + labs[1]]
    for k in range(2, len(js)):
        pieces = ["("] + pieces + [")", obj.intermediates[k - 2], " ", js[k], "_" + labs[k]]
    pieces += [")", obj.J, ", ", obj.M]
    left, right = ("|", _angles(printer)[1]) if _is_ket(obj) else (_angles(printer)[0], "|")
    return _join(printer, [left] + pieces + [right])


# -- bosons -----------------------------------------------------------------------------------

def boson_mode_str(printer, obj):
    return f"BosonMode({obj.label!r})"


def boson_mode_latex(printer, obj, exp=None):
    return _with_power(label_latex(obj.label), exp)


def boson_mode_pretty(printer, obj):
    return prettyForm(obj.label)


def boson_operator_str(printer, obj):
    return f"{obj.label}.{obj.kind}"


def boson_operator_latex(printer, obj, exp=None):
    head = label_latex(obj.label)
    if obj.kind == "annihilate":
        tex = head
    elif obj.kind == "create":
        tex = r"{%s^{\dagger}}" % head  # braced: a power then reads {a^{\dagger}}^{2}
    else:
        tex = r"\hat{N}_{%s}" % head
    return tex if exp is None else "{%s}^{%s}" % (tex, exp)


def boson_operator_pretty(printer, obj):
    unicode = _unicode(printer)
    if obj.kind == "annihilate":
        return prettyForm(pretty_symbol(obj.label) if unicode else obj.label)
    if obj.kind == "create":
        return prettyForm((pretty_symbol(obj.label) + "\N{DAGGER}") if unicode else obj.label + "^+")
    return prettyForm(pretty_symbol("N_" + obj.label) if unicode else "N_" + obj.label)


def fock_str(printer, obj):
    body = ", ".join(printer._print(n) for n in obj.occupations)
    modes = ",".join(obj.modes)
    return f"|{body}>_({modes})" if _is_ket(obj) else f"<{body}|_({modes})"


def fock_latex(printer, obj, exp=None):
    body = ", ".join(printer._print(n) for n in obj.occupations)
    tex = r"\left|%s\right\rangle" % body if _is_ket(obj) else r"\left\langle %s\right|" % body
    modes = ",".join(label_latex(mode) for mode in obj.modes)
    return _with_power(r"{%s}_{%s}" % (tex, modes), exp)


def fock_pretty(printer, obj):
    left, right = ("|", _angles(printer)[1]) if _is_ket(obj) else (_angles(printer)[0], "|")
    tail = right + "_(" + ",".join(obj.modes) + ")"
    return _join(printer, [left] + _comma_list(obj.occupations) + [tail])


# -- rotations and reduced matrix elements -----------------------------------------------------

def rotation_str(printer, obj):
    j, mp, m = (printer._print(x) for x in obj.args[:3])
    angles = ", ".join(printer._print(x) for x in obj.angles)
    return f"D^{{{j}}}_{{{mp},{m}}}({angles})"


def rotation_latex(printer, obj, exp=None):
    j, mp, m = (printer._print(x) for x in obj.args[:3])
    angles = ",".join(printer._print(x) for x in obj.angles)
    tex = f"D^{{{j}}}_{{{mp},{m}}}\\left({angles}\\right)"
    return _with_power(tex, exp)


def rotation_pretty(printer, obj):
    sub = prettyForm(*printer._print(obj.mp).right(",", printer._print(obj.m)))
    name = _scripted(printer, "D", obj.j, sub)
    return prettyForm(*name.right(printer._print_seq(obj.angles, "(", ")")))


def _reduced_suffix(obj):
    return "" if obj.convention == "edmonds" else "_" + obj.convention


def reduced_str(printer, obj):
    _, k, jp, j, _c = obj.args
    return (f"<{printer._print(jp)}||{obj.name}^({printer._print(k)})||"
            f"{printer._print(j)}>{_reduced_suffix(obj)}")


def reduced_latex(printer, obj, exp=None):
    _, k, jp, j, _c = obj.args
    tex = (r"\langle %s \| %s^{(%s)} \| %s \rangle"
           % (printer._print(jp), label_latex(obj.name), printer._print(k), printer._print(j)))
    if obj.convention != "edmonds":
        tex += r"_{\mathrm{%s}}" % obj.convention.upper()
    return tex if exp is None else r"\left(%s\right)^{%s}" % (tex, exp)


def reduced_pretty(printer, obj):
    _, k, jp, j, _c = obj.args
    left, right = _angles(printer)
    bar = "\N{DOUBLE VERTICAL LINE}" if _unicode(printer) else "||"
    op = _join(printer, [obj.name + "^(", k, ")"])
    return _join(printer, [left, jp, bar, op, bar, j, right + _reduced_suffix(obj)])


# -- tensor and vector operators ---------------------------------------------------------------

def _settings_text(obj):
    """``[J]``, ``[L, racah]``, ``[J, unit, general]``: the label, then the settings that are not the
    defaults (the kind of a tensor when not ``abstract``; ``general`` for non-Hermitian components)."""
    words = [obj.label]
    kind = getattr(obj, "kind", None)  # a tensor's kind (a vector has SymPy's own .kind, not a str)
    if isinstance(kind, str) and kind != "abstract":
        words.append(kind)
    if not obj.hermitian:
        words.append("general")
    return "[" + ", ".join(words) + "]"


def spherical_tensor_str(printer, obj):
    """``T^(2)[J]``; a Racah or unit tensor, or non-Hermitian components, say so: ``C^(1)[L, racah]``."""
    return f"{obj.name}^({printer._print(obj.rank)}){_settings_text(obj)}"


def spherical_tensor_latex(printer, obj, exp=None):
    tex = r"%s^{(%s)}" % (label_latex(obj.name), printer._print(obj.rank))
    return tex if exp is None else r"\left(%s\right)^{%s}" % (tex, exp)


def spherical_tensor_pretty(printer, obj):
    return _join(printer, [obj.name + "^(", obj.rank, ")"])


def tensor_component_str(printer, obj):
    """``T^(2)[J]_(1)``: the family's text (with the label it is a tensor under) and ``q``.

    The label is written because the component's algebra depends on it; pretty
    and LaTeX leave it out (``T^{(2)}_{1}``), as papers do.
    """
    tensor, q = obj.args
    return f"{printer._print(tensor)}_({printer._print(q)})"


def tensor_component_latex(printer, obj, exp=None):
    tensor, q = obj.args
    # braces keep a later power from making a double superscript
    tex = r"{%s^{(%s)}_{%s}}" % (label_latex(tensor.name), printer._print(tensor.rank), printer._print(q))
    return tex if exp is None else r"\left(%s\right)^{%s}" % (tex, exp)


def tensor_component_pretty(printer, obj):
    tensor, q = obj.args
    sup = _join(printer, ["(", tensor.rank, ")"])
    return _scripted(printer, tensor.name, sup, q)


def vector_operator_str(printer, obj):
    """``VectorOperator('r', 'L')``; ``VectorOperator('r', 'L', 'general')`` for non-Hermitian components."""
    general = "" if obj.hermitian else ", 'general'"
    return f"VectorOperator({obj.name!r}, {obj.label!r}{general})"


def vector_operator_latex(printer, obj, exp=None):
    return _with_power(_bold_latex(obj.name), exp)


def vector_operator_pretty(printer, obj):
    return prettyForm(obj.name)


def vector_component_str(printer, obj):
    """``r[L].z``: the vector's name, the label it is a vector under, the axis.

    ``r.z`` alone would be the component of ``AngularMomentum("r")`` (the form
    ``J.z``), so str names the label; pretty and LaTeX keep ``r_z`` (see the
    module docstring).
    """
    return f"{obj.vector.name}{_settings_text(obj.vector)}.{obj.axis}"


def vector_component_latex(printer, obj, exp=None):
    tex = r"%s_{%s}" % (label_latex(obj.vector.name), obj.axis)
    return tex if exp is None else r"{%s}^{%s}" % (tex, exp)


def vector_component_pretty(printer, obj):
    if _unicode(printer):
        return prettyForm(pretty_symbol(obj.vector.name + "_" + obj.axis))
    return prettyForm(obj.vector.name + "_" + obj.axis)


def tensor_components_str(printer, obj):
    body = ", ".join(printer._print(c) for c in obj.components)
    return f"TensorComponents({printer._print(obj.rank)}, ({body}))"


def tensor_components_latex(printer, obj, exp=None):
    body = r",\ ".join(printer._print(c) for c in obj.components)
    tex = r"\left[%s\right]^{(%s)}" % (body, printer._print(obj.rank))
    return tex if exp is None else r"\left(%s\right)^{%s}" % (tex, exp)


def tensor_components_pretty(printer, obj):
    return _join(printer, ["["] + _comma_list(obj.components) + ["]^(", obj.rank, ")"])


# -- coupling symbols --------------------------------------------------------------------------

def cg_symbol_str(printer, obj):
    """``<j1, m1; j2, m2|J, M>``: the physicists' bracket, read back by :mod:`amalgebra.parsing`."""
    j1, m1, j2, m2, J, M = (printer._print(a) for a in obj.args)
    return f"<{j1}, {m1}; {j2}, {m2}|{J}, {M}>"


def cg_symbol_latex(printer, obj, exp=None):
    j1, m1, j2, m2, J, M = (printer._print(a) for a in obj.args)
    tex = r"\left\langle %s, %s; %s, %s \middle| %s, %s \right\rangle" % (j1, m1, j2, m2, J, M)
    return _with_power(tex, exp)


def cg_symbol_pretty(printer, obj):
    j1, m1, j2, m2, J, M = obj.args
    left, right = _angles(printer)
    return _join(printer, [left, j1, ", ", m1, "; ", j2, ", ", m2, " | ", J, ", ", M, right])


def _rows(obj):
    """``(prefix, opening, closing, rows)`` of a 3j, 6j or 9j symbol."""
    args = obj.args
    width = 3
    rows = [args[i:i + width] for i in range(0, len(args), width)]
    return obj._notation_prefix, obj._notation_delims, rows


def array_symbol_str(printer, obj):
    prefix, (left, right), rows = _rows(obj)
    body = "; ".join(", ".join(printer._print(a) for a in row) for row in rows)
    return f"{prefix}{left}{body}{right}"


def array_symbol_latex(printer, obj, exp=None):
    _, (left, _right), rows = _rows(obj)
    env = "pmatrix" if left == "(" else "Bmatrix"
    body = r" \\ ".join(" & ".join(printer._print(a) for a in row) for row in rows)
    return _with_power(r"\begin{%s} %s \end{%s}" % (env, body, env), exp)


def array_symbol_pretty(printer, obj):
    _, (left, right), rows = _rows(obj)
    grid = printer._print_matrix_contents(ImmutableMatrix(rows))
    return prettyForm(*grid.parens(left, right))


# -- result objects (not Basic; displayed through sympy.printing.defaults.Printable) ------------

_TEXT_ESCAPES = {"\\": r"\textbackslash{}", "{": r"\{", "}": r"\}", "#": r"\#", "$": r"\$", "%": r"\%",
                 "&": r"\&", "_": r"\_", "^": r"\textasciicircum{}", "~": r"\textasciitilde{}",
                 "<": r"\textless{}", ">": r"\textgreater{}", "|": r"\textbar{}"}


def text_latex(text):
    r"""Plain text as LaTeX ``\text{...}`` with the special characters escaped.

    >>> text_latex("a_b <x|")
    '\\text{a\\_b \\textless{}x\\textbar{}}'
    """
    return r"\text{%s}" % "".join(_TEXT_ESCAPES.get(ch, ch) for ch in text)


def hamiltonian_matrix_str(printer, obj):
    return (f"HamiltonianMatrix(size={obj.matrix.shape[0]}, conserved={obj.conserved}, "
            f"blocks={[b.size for b in obj.blocks]})")


def hamiltonian_matrix_latex(printer, obj, exp=None):
    return printer._print(obj.matrix)


def hamiltonian_matrix_pretty(printer, obj):
    return printer._print(obj.matrix)


def identity_check_latex(printer, obj, exp=None):
    return text_latex(str(obj))


def identity_check_pretty(printer, obj):
    return prettyForm(str(obj))


# -- coupling trees ----------------------------------------------------------------------------

def name_latex(name):
    r"""A momentum name in LaTeX: trailing digits become a subscript (``l1`` -> ``l_{1}``).

    >>> name_latex("l1"), name_latex("J"), name_latex("j12"), name_latex("S1b")
    ('l_{1}', 'J', 'j_{12}', '\\mathrm{S1b}')
    """
    match = re.fullmatch(r"([A-Za-z]+?)(\d+)", name)
    if match:
        return r"%s_{%s}" % (label_latex(match.group(1)), match.group(2))
    return label_latex(name)


def _tree_text(node, leaf, join):
    if isinstance(node, str):
        return leaf(node)
    return join(_tree_text(node[0], leaf, join), _tree_text(node[1], leaf, join), leaf(node[2]), node)


def _tree_values(obj):
    return [(name, value) for name, value in obj.values.items() if value != Symbol(name)]


def coupling_tree_str(printer, obj):
    def join(left, right, name, node):
        sep = ", " if not isinstance(node[0], str) or not isinstance(node[1], str) else " "
        return f"({left}{sep}{right}) {name}"

    text = _tree_text(obj.structure, str, join)
    given = _tree_values(obj)
    if given:
        text += " [" + ", ".join(f"{n}={printer._print(v)}" for n, v in given) + "]"
    return text


def coupling_tree_latex(printer, obj, exp=None):
    def join(left, right, name, node):
        sep = r",\, " if not isinstance(node[0], str) or not isinstance(node[1], str) else r"\, "
        return r"\left(%s%s%s\right) %s" % (left, sep, right, name)

    tex = _tree_text(obj.structure, name_latex, join)
    given = _tree_values(obj)
    if given:
        tex += r"\quad \left(%s\right)" % ",\\, ".join(
            "%s = %s" % (name_latex(n), printer._print(v)) for n, v in given)
    return _with_power(tex, exp)


def coupling_tree_pretty(printer, obj):
    return prettyForm(coupling_tree_str(printer, obj))


def _assignment_text(printer, values):
    return ", ".join(f"{n}={printer._print(v)}" for n, v in values.items())


def recoupling_matrix_str(printer, obj):
    printer = printer or _PlainPrinter()
    lines = [f"recoupling matrix <{obj.first} | {obj.second}> (Condon-Shortley phases)"]
    for total, (rows, cols, matrix) in obj.blocks.items():
        lines.append(f"  {obj.first.total_name}={printer._print(total)}: rows "
                     + "; ".join(_assignment_text(printer, r) for r in rows)
                     + " | columns " + "; ".join(_assignment_text(printer, c) for c in cols))
        for i in range(matrix.shape[0]):
            lines.append("    [" + ", ".join(printer._print(matrix[i, k]) for k in range(matrix.shape[1])) + "]")
    return "\n".join(lines)


def recoupling_matrix_latex(printer, obj, exp=None):
    parts = []
    for total, (rows, cols, matrix) in obj.blocks.items():
        head = " & ".join(",".join(printer._print(v) for v in c.values()) for c in cols)
        body = r" \\ ".join(
            ",".join(printer._print(v) for v in r.values()) + " & "
            + " & ".join(printer._print(matrix[i, k]) for k in range(matrix.shape[1]))
            for i, r in enumerate(rows))
        parts.append(r"%s = %s:\ \begin{array}{r|%s} & %s \\ \hline %s \end{array}" % (
            name_latex(obj.first.total_name), printer._print(total), "c" * matrix.shape[1], head, body))
    return r",\qquad ".join(parts)


def recoupling_matrix_pretty(printer, obj):
    return prettyForm(recoupling_matrix_str(printer, obj))


class _PlainPrinter:
    def _print(self, obj):
        return str(obj)


def _tensor_part_str(printer, op):
    """A part of ``[A x B]^(K)`` in str: an angular momentum by its label (``J``), any other
    part by its own complete str (``T^(2)[J]``, ``VectorOperator('r', 'L')``, ``[...]^(K)``)."""
    if type(op).__name__ == "AngularMomentum":
        return op.label
    return printer._print(op)


def coupled_tensor_operator_str(printer, obj):
    """``[T^(2)[J] x U^(1)[S]]^(2)``: each part says its label, so the text reads back."""
    return (f"[{_tensor_part_str(printer, obj.first)} x {_tensor_part_str(printer, obj.second)}]"
            f"^({printer._print(obj.rank)})")


def _tensor_head(printer, op):
    """The short head of a part for pretty printing (``T^(1)``, ``r``, ``J``): no labels."""
    if hasattr(op, "first"):
        return _coupled_tensor_short(printer, op)
    if hasattr(op, "rank") and hasattr(op, "name"):
        return f"{op.name}^({printer._print(op.rank)})"
    return op.name if hasattr(op, "name") else op.label


def _coupled_tensor_short(printer, obj):
    return (f"[{_tensor_head(printer, obj.first)} x {_tensor_head(printer, obj.second)}]"
            f"^({printer._print(obj.rank)})")


def _tensor_head_latex(printer, op):
    if hasattr(op, "first"):
        return coupled_tensor_operator_latex(printer, op)
    if hasattr(op, "rank") and hasattr(op, "name"):
        return r"%s^{(%s)}" % (label_latex(op.name), printer._print(op.rank))
    # a vector operator by its name, an angular momentum by its label (as each prints alone)
    return _bold_latex(op.name if hasattr(op, "name") else op.label)


def coupled_tensor_operator_latex(printer, obj, exp=None):
    tex = r"\left[%s \times %s\right]^{(%s)}" % (_tensor_head_latex(printer, obj.first),
                                                  _tensor_head_latex(printer, obj.second),
                                                  printer._print(obj.rank))
    return _with_power(tex, exp)


def coupled_tensor_operator_pretty(printer, obj):
    text = _coupled_tensor_short(printer, obj)
    return prettyForm(text.replace(" x ", " \N{MULTIPLICATION SIGN} ") if _unicode(printer) else text)


def _tree_state_text(obj, leaf, join, number):
    """Every momentum of the tree as ``leaf(value, name)``, the leaves' and the nodes' alike."""
    values = obj.tree.values

    def walk(node):
        if isinstance(node, str):
            return leaf(number(values[node]), node)
        return join(walk(node[0]), walk(node[1]), leaf(number(values[node[2]]), node[2]), node)

    return walk(obj.tree.structure)


def tree_state_str(printer, obj):
    """``|(1_a 1/2_b)3/2_J, 1/2>``: every momentum with its name, the intermediate and total ones too.

    The names of the nodes tell a tree ket from the coupled ket ``|(1_a 1/2_b)3/2, 1/2>``
    (whose intermediate momenta have no names) and from a tree ket of another tree.
    """
    def join(left, right, value, node):
        sep = ", " if not isinstance(node[0], str) or not isinstance(node[1], str) else " "
        return f"({left}{sep}{right}){value}"

    body = _tree_state_text(obj, lambda v, lab: f"{v}_{lab}", join, printer._print)
    body = f"{body}, {printer._print(obj.M)}"
    return f"|{body}>" if _is_ket(obj) else f"<{body}|"


def tree_state_latex(printer, obj, exp=None):
    def join(left, right, value, node):
        sep = r",\, " if not isinstance(node[0], str) or not isinstance(node[1], str) else r"\, "
        return r"\left(%s%s%s\right) %s" % (left, sep, right, value)

    body = _tree_state_text(obj, lambda v, lab: r"%s_{%s}" % (v, name_latex(lab)), join, printer._print)
    body = r"%s, %s" % (body, printer._print(obj.M))
    tex = r"\left|%s\right\rangle" % body if _is_ket(obj) else r"\left\langle %s\right|" % body
    return _with_power(tex, exp)


def tree_state_pretty(printer, obj):
    text = tree_state_str(printer, obj)
    left, right = _angles(printer)
    # the str form's ASCII angle becomes the printer's (Unicode) one, as for coupled kets
    return prettyForm(text[:-1] + right if _is_ket(obj) else left + text[1:])


def triangle_delta_str(printer, obj):
    return "TriangleDelta(%s)" % ", ".join(printer._print(a) for a in obj.args)


def triangle_delta_latex(printer, obj, exp=None):
    return _with_power(r"\Delta\left(%s\right)" % ", ".join(printer._print(a) for a in obj.args), exp)


def triangle_delta_pretty(printer, obj):
    head = "\N{GREEK CAPITAL LETTER DELTA}" if _unicode(printer) else "Delta"
    return _join(printer, [head + "(", *_comma_list(obj.args), ")"])


# -- more result objects (LaTeX for notebooks; str stays each class's own repr) -------------------

def basis_latex(printer, obj, exp=None):
    rows = r" \\ ".join(r"%d: & %s" % (i, printer._print(state)) for i, state in enumerate(obj.states))
    return r"\begin{array}{rl} %s \end{array}" % rows if rows else r"\text{empty basis}"


def eigenvalues_latex(printer, obj, exp=None):
    parts = [r"%s \ (\times %s)" % (printer._print(root), printer._print(mult)) for root, mult in obj.roots.items()]
    if obj.unsolved:
        parts.append(text_latex("unsolved: ") + ",\\ ".join(printer._print(f) for f, _ in obj.unsolved) + " = 0")
    return r"\left\{%s\right\}" % r",\ ".join(parts) if parts else text_latex("no eigenvalues")


def reduction_latex(printer, obj, exp=None):
    status = "complete" if obj.complete else "partial: " + str(obj.reason)
    return r"%s \quad %s" % (printer._print(obj.result), text_latex("(" + status + ")"))


def reduction_step_latex(printer, obj, exp=None):
    return r"%s \quad %s" % (printer._print(obj.expr), text_latex("(" + obj.rule + ")"))


def reduction_check_latex(printer, obj, exp=None):
    return text_latex(str(obj))


def total_blocks_latex(printer, obj, exp=None):
    rows = [r"%s:\ %s" % (printer._print(total), printer._print(matrix)) for total, (states, matrix) in obj.items()]
    return r",\qquad ".join(rows) if rows else r"\text{no states}"


def coupling_table_latex(printer, obj, exp=None):
    return text_latex(repr(obj))


class NotationHooks:
    """Mixin giving a class its three printing hooks from one stem of this module.

    A class listed with it sets ``_notation_key``; ``_notation_key = "component"``
    reaches ``component_str``, ``component_latex`` and ``component_pretty`` here,
    so each object's notation is decided in this module only.
    """

    __slots__ = ()
    _notation_key = None

    def _sympystr(self, printer):
        return globals()[f"{self._notation_key}_str"](printer, self)

    def _latex(self, printer, exp=None):
        return globals()[f"{self._notation_key}_latex"](printer, self, exp)

    def _pretty(self, printer):
        return globals()[f"{self._notation_key}_pretty"](printer, self)


# -- result containers (amalgebra.results) -----------------------------------------------------

def coupling_matrix_latex(printer, obj, exp=None):
    r"""``U`` as an array: coupled kets over the columns, uncoupled kets beside the rows.

    >>> from sympy import latex
    >>> from amalgebra.states.coupled import coupling_matrix
    >>> tex = latex(coupling_matrix([0, "1/2"], ("L", "S")))
    >>> tex.startswith(r"\begin{array}{r|cc}") and tex.count(r"\\") == 2
    True
    """
    U, uncoupled, coupled = obj
    head = " & ".join(printer._print(k) for k in coupled)
    rows = [" & ".join([printer._print(uncoupled[i])] + [printer._print(U[i, k]) for k in range(U.shape[1])])
            for i in range(U.shape[0])]
    return r"\begin{array}{r|%s} & %s \\ \hline %s \end{array}" % ("c" * U.shape[1], head, r" \\ ".join(rows))


def element_table_latex(printer, obj, exp=None):
    r"""Rows ``m' & q & m & <j' m'|T^k_q|j m>``, in the table's order.

    >>> from sympy import latex
    >>> from amalgebra.tensors.wigner_eckart import element_table
    >>> latex(element_table(0, 0, 0, 1))
    "\\begin{array}{rrr|l} m' & q & m & \\text{element} \\\\ \\hline 0 & 0 & 0 & 1 \\end{array}"
    """
    rows = [" & ".join(printer._print(x) for x in (*key, value)) for key, value in obj.items()]
    return r"\begin{array}{rrr|l} m' & q & m & \text{element} \\ \hline %s \end{array}" % r" \\ ".join(rows)


def decomposition_latex(printer, obj, exp=None):
    r"""One line ``X^{(k)}_{q} = ...`` per component, ranks increasing, ``q`` from ``k`` down.

    >>> from sympy import latex
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors.irreducible import decompose
    >>> latex(decompose(AngularMomentum("J").z))
    '\\begin{aligned} X^{(1)}_{1} &= 0 \\\\ X^{(1)}_{0} &= J_{z} \\\\ X^{(1)}_{-1} &= 0 \\end{aligned}'
    """
    rows = [r"X^{(%s)}_{%s} &= %s" % (printer._print(k), printer._print(q), printer._print(part))
            for k, parts in obj.items() for q, part in parts.items()]
    return r"\begin{aligned} %s \end{aligned}" % r" \\ ".join(rows) if rows else "0"


def equation_pair_latex(printer, obj, exp=None):
    r"""``lhs = rhs`` of a two-sided result (e.g. :func:`~amalgebra.rotations.harmonics.addition_theorem`).

    >>> from sympy import latex, symbols
    >>> from amalgebra.rotations.harmonics import addition_theorem
    >>> t1, p1, t2, p2 = symbols("theta1 phi1 theta2 phi2", real=True)
    >>> latex(addition_theorem(0, t1, p1, t2, p2))
    '\\frac{1}{4 \\pi} = \\frac{1}{4 \\pi}'
    """
    return "%s = %s" % (printer._print(obj.lhs), printer._print(obj.rhs))


def rotation_composition_latex(printer, obj, exp=None):
    r"""The product matrix ``D^j(R1) D^j(R2)``; for numeric angles also the Euler triple and the defect."""
    tex = printer._print(obj.matrix)
    if obj.angles is not None:
        tex += r",\quad (\alpha, \beta, \gamma) = \left(%s\right),\quad \text{defect } %s" % (
            ", ".join(printer._print(a) for a in obj.angles), printer._print(obj.defect))
    return tex


# -- code printers (lambdify) ------------------------------------------------------------------

def kernel_code(printer, obj):
    """``float_call(kernel, *args)`` for the code printers of ``lambdify``.

    ``obj._float_kernel`` is the float function; both names are registered with
    the printer's imports (``lambdify`` imports them into the generated
    function's namespace; ``pycode`` writes them fully qualified).
    """
    kernel = obj._float_kernel
    call = printer._module_format("amalgebra.lambdify_kernels.float_call")
    name = printer._module_format(f"{kernel.__module__}.{kernel.__name__}")
    return f"{call}({', '.join([name, *(printer._print(a) for a in obj.args)])})"


class CodeHooks:
    """Mixin giving numeric symbols the code-printer hooks used by ``sympy.lambdify``.

    A class listed with it sets ``_float_kernel`` to a module-level float
    function taking the same arguments as ``.args``.  The Python and SymPy code
    printers call ``_pythoncode``, the NumPy and SciPy printers ``_numpycode`` and
    the mpmath printer ``_mpmathcode`` (see :mod:`amalgebra.lambdify_kernels`).

    >>> from sympy import lambdify
    >>> from amalgebra.coupling.symbols import Coupling6j
    >>> lambdify([], Coupling6j(1, 1, 1, 1, 1, 1))() == 1 / 6     # 6j{1 1 1; 1 1 1} = 1/6
    True
    """

    __slots__ = ()
    _float_kernel = None

    def _pythoncode(self, printer):
        return kernel_code(printer, self)

    def _numpycode(self, printer):
        return kernel_code(printer, self)

    def _mpmathcode(self, printer):
        return kernel_code(printer, self)
