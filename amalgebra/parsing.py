r"""amalgebra's own expression grammar: safe parsing and exact printing of expression text.

Text that reaches amalgebra from a file (stored results) or from the command line is
*data*.  It is read here by a small LALR grammar (``lark``) whose transformer builds
SymPy objects directly from an allow-list; nothing is ever handed to ``eval``,
``exec``, ``sympify``, ``parse_expr`` or ``S(str)``.

Explanation
===========

The grammar, in order of increasing binding strength::

    expr    := term (("+" | "-") term)*
    term    := "-" term | "+" term | product
    product := power (("*" | "/") power)*
    power   := atom | atom ("^" | "**") signed   (right associative)
    signed  := "-" signed | "+" signed | power    (exponents only)
    atom    := INTEGER | DECIMAL | NAME | NAME "(" expr ("," expr)* ")" | "(" expr ")"
             | a printed form of the library (below)

A leading minus sign applies to the whole product after it (``-(x + y)*z`` is
``Mul(-1, x + y, z)``, which SymPy keeps undistributed, as it does for the same
expression typed in Python).

A chain of terms becomes one ``Add(*terms)`` and a chain of factors one
``Mul(*factors)`` (``a/b`` is ``a*b^(-1)``), exactly as SymPy builds them, so that
noncommutative order and SymPy's automatic evaluation are reproduced faithfully.

* ``INTEGER`` is a string of decimal digits; ``3/2`` is an exact rational.  A decimal
  literal ``72.222`` (digits, a point, digits) is the exact rational ``72222/1000``.  There are
  no floats, no string literals, no attribute access and no indexing.
* ``NAME`` is ``[A-Za-z_][A-Za-z0-9_]*``, or allow-listed Greek letters
  (:data:`GREEK_LETTERS`) with digits and ``_``; names beginning with ``__`` are refused.
  Confusable names are refused (the confusable rule): each name is written in one script
  (``"οmega"`` with a Greek omicron is refused), a name must not read like a reserved
  name through a Greek look-alike (``"ρι"``, rho iota, reads like ``pi``), and two distinct
  names of one text must not share a :func:`skeleton` (``o`` beside Greek ``ο``, ``k1``
  beside ``κ1``); :data:`LOOKALIKES` is the skeleton map.  Characters outside the grammar
  are named by code point in the error (``'а' is U+0430 CYRILLIC SMALL LETTER A``).  The names
  ``I`` (imaginary unit) and ``pi`` are constants (Euler's number is written
  ``exp(1)``); every other name is a commutative :class:`~sympy.core.symbol.Symbol`
  without assumptions (callers that need assumptions rebind symbols by name).
* Calls are allowed only to the functions of :data:`FUNCTIONS` (``sqrt``, ``exp``,
  ``sin``, ``cos``, ``sinh``, ``cosh`` -- SymPy turns ``cos(I)`` into ``cosh(1)`` --
  and ``KroneckerDelta``) and to the constructors of :data:`CONSTRUCTORS`, imported
  lazily on first use.
* The library's printed forms (the ``str`` of its objects, see :mod:`amalgebra.notation`)
  are atoms of the grammar, and each says everything its object holds, so
  ``parse(str(x)) == x``:

  - ``J.x``, ``J.plus``, ``J.squared``: components of ``AngularMomentum("J")``;
    ``a.create``, ``a.annihilate``, ``a.number``: the operators of ``BosonMode("a")``;
  - ``AngularMomentum('J')``, ``BosonMode('a')``, ``VectorOperator('r', 'L')``: the objects;
  - ``r[L].z``: a component of ``VectorOperator("r", "L")`` (``r.z`` is a component of
    ``AngularMomentum("r")``);
  - ``T^(2)[J]`` and ``T^(2)[J]_(1)``: ``SphericalTensor("T", 2, label="J")`` and a component
    (the former printed form ``T^(2)_(1)`` is refused: it does not say the label);
  - settings that are not the defaults follow the label: the kind of a tensor
    (``C^(1)[L, racah]``, ``u^(2)[J, unit]``) and ``general`` for non-Hermitian components
    (``T^(1)[J, general]``, ``p[L, general].x``, ``VectorOperator('p', 'L', 'general')``);
  - ``|j, m>_J``, ``<j, m|_J``: ket and bra of label ``J``; ``|1, 0>_L|1/2, 1/2>_S``: a
    product ket (bras likewise); ``|(1_L 1/2_S)3/2, 1/2>``: a coupled ket
    (``|((1_L 1/2_S)3/2 1_I)5/2, 1/2>`` for three momenta); ``|2, 1>_(a,b)``: a Fock ket;
    ``|1, 0>_S|2>_(a)``: a spin-boson product ket (the Fock factor last);
  - ``|(1_a 1/2_b)3/2_J, 1/2>``, ``|((1_a 1_b)2_j, (1_c 1_d)2_k)0_J, 0>``: the ket of a coupling
    tree (:class:`~amalgebra.states.tree_kets.TreeKet`; bras likewise): every momentum, the
    intermediate and total ones too, with its name, which is what tells it from a coupled
    ket.  A ket whose inner momenta are only partly named, or a non-chain tree or a comma
    without names (the former printed form of tree kets), is refused;
  - ``<jp||T^(2)||j>``, ``<1||T^(2)||1>_cg``: reduced matrix elements (Edmonds
    normalisation, or the convention named after ``_``);
  - ``D^{j}_{m',m}(alpha, beta, gamma)``: a Wigner D element;
  - ``<j1, m1; j2, m2|J, M>``, ``3j(j1, j2, j3; m1, m2, m3)``, ``6j{a, b, c; d, e, f}``,
    ``9j{a, b, c; d, e, f; g, h, i}``: the unevaluated coupling symbols
    (:class:`~amalgebra.coupling.symbols.CouplingBracket`, ``Coupling3j``, ``Coupling6j``,
    ``Coupling9j``);
  - ``((l s) j, I) F [l=2, s=1/2]``: a coupling tree with its given values;
    ``[T^(2)[J] x U^(1)[S]]^(2)``, ``[I x J]^(0)``: a coupled tensor operator (an angular
    momentum part by its bare label; the former ``[T^(2) x U^(1)]^(2)`` is refused);
  - ``TensorComponents(2, (a, b, ...))``, ``TriangleDelta(a, b, c)``: calls; ``TreeKet(tree, M)``
    and ``TreeBra(tree, M)`` (written by :func:`to_text` before the tree ket had a complete
    printed form) are still read.

  A momentum inside a coupled ket is a number (``3/2``; a name ``j`` or a parenthesised
  expression ``(2*j)`` is read too) joined to its label by ``_``; labels are ASCII
  identifiers.  The spellings of the first grammar (``Jz(J)``, ``Jplus(J)``,
  ``Vx(r, L)``, ``create(a)``, ``ket(j, m, J)``: :data:`LEGACY_SPELLINGS`) are still
  read, never written.
* Messages of :class:`~amalgebra.errors.ParseError` name the line and column and the kind
  of the offending piece (a character by its code point), never the text itself.
* :class:`ParseLimits` bounds the input length, integer digits, numeric exponents,
  the size of numbers built while parsing, and the nesting depth, so that inputs such
  as ``2^2^2^5`` are refused in microseconds instead of being computed.

:func:`to_text` writes an expression in exactly this grammar, so that
``parse(to_text(e)) == e`` for every expression the grammar can express (a property
tested with hypothesis).

Examples
========

>>> from sympy import Rational, Symbol, sqrt
>>> from amalgebra.parsing import parse, to_text
>>> e = parse("3/2*j*(j + 1) - sqrt(2)")
>>> e == Rational(3, 2)*Symbol("j")*(Symbol("j") + 1) - sqrt(2)
True
>>> parse(to_text(e)) == e
True
>>> parse("2^2^2^5")
Traceback (most recent call last):
...
amalgebra.errors.ParseError: exponent=4294967296 must have absolute value <= 1000

Parameters
==========

See :func:`parse` and :class:`ParseLimits`.

See Also
========

amalgebra.derivations.store : stored results, written with :func:`to_text`.

References
==========

.. [1] lark documentation, "LALR(1) parser", https://lark-parser.readthedocs.io
.. [2] SymPy issue #10805, "Safety" (why ``sympify`` must not see untrusted text).
"""

import contextvars
import importlib
import itertools
import re
from dataclasses import dataclass, field
from functools import lru_cache

from .errors import ParseError

__all__ = [
    "ParseLimits",
    "Constructor",
    "CONSTRUCTORS",
    "FUNCTIONS",
    "GREEK_LETTERS",
    "LOOKALIKES",
    "LEGACY_SPELLINGS",
    "skeleton",
    "parse",
    "to_text",
    "is_valid_name",
]

#: Lower- and upper-case Greek letters allowed to begin a name (``pi``'s letter is
#: excluded so that ``π`` cannot be mistaken for the constant).
GREEK_LETTERS = "αβγδεζηθικλμνξορστυφχψωΓΔΘΛΞΣΦΨΩ"

_NAME_RE = re.compile(r"[A-Za-z_" + GREEK_LETTERS + r"][A-Za-z0-9_" + GREEK_LETTERS + r"]*\Z")
_RESERVED = frozenset({"I", "pi"})

#: The skeleton map of the confusable rule: each admitted Greek letter whose lower-case
#: glyph reads as a Latin letter in common fonts, and that letter (after the idea of the
#: "skeleton" of Unicode Technical Standard #39, restricted to the letters the grammar
#: admits; the choice of letters is ours, from memory).  Letters that merely resemble one
#: (chi, tau, omega, eta, mu, epsilon: a descender or a different shape tells them apart)
#: are left out, so that ``eta*n`` or ``chi*x`` stay legal.
LOOKALIKES = {"α": "a", "γ": "y", "ι": "i", "κ": "k", "ν": "v", "ο": "o", "ρ": "p", "υ": "u"}
_SKELETON = str.maketrans(LOOKALIKES)


def skeleton(name):
    """``name`` with every Greek look-alike replaced by the Latin letter it reads as.

    Two names with the same skeleton read alike (``"ο"``, Greek omicron, and ``"o"``).

    >>> from amalgebra.parsing import skeleton
    >>> skeleton("ρι"), skeleton("θ1"), skeleton("x")
    ('pi', 'θ1', 'x')
    """
    return name.translate(_SKELETON)


def _scripts(name):
    """The scripts of the letters of ``name``: a subset of {"Latin", "Greek"}; digits and ``_`` have none."""
    found = set()
    for ch in name:
        if ch.isascii():
            if ch.isalpha():
                found.add("Latin")
        elif ch in GREEK_LETTERS:
            found.add("Greek")
    return found


def _reserved_words():
    return _RESERVED | set(FUNCTIONS) | set(CONSTRUCTORS)


def _name_problem(name):
    """Why ``name`` is not a grammar name (single script, not a look-alike of a reserved word), or None."""
    if name.isascii():
        return None  # ASCII is one script, and an ASCII name is its own skeleton
    return _name_problem_among(name, tuple(sorted(_reserved_words())))


@lru_cache(maxsize=4096)
def _name_problem_among(name, words):
    for word in words:
        if name != word and skeleton(name) == skeleton(word):
            return (f"name={name!r} must not read like the reserved name {word!r} "
                    f"({_spelled_name(name)}): a Greek letter that looks like a Latin one is refused")
    if len(_scripts(name)) > 1:
        return (f"name={name!r} must be written in one script, Latin or Greek ({_spelled_name(name)}); "
                "digits and '_' may join either")
    return None


def _spelled_name(name):
    """The non-ASCII characters of ``name`` by code point and Unicode name."""
    import unicodedata

    parts = [f"{ch!r} is U+{ord(ch):04X} {unicodedata.name(ch, '?')}" for ch in dict.fromkeys(name)
             if not ch.isascii()]
    return "; ".join(parts) if parts else "all ASCII"


def _spelled(ch):
    """One character by code point and Unicode name (``U+0430 CYRILLIC SMALL LETTER A``)."""
    import unicodedata

    return f"U+{ord(ch):04X} {unicodedata.name(ch, 'unnamed')}"


def _confusable_pair(names):
    """The first two distinct names (sorted) of ``names`` that share a skeleton, or None."""
    by_skeleton = {}
    for name in sorted(set(names)):
        other = by_skeleton.setdefault(skeleton(name), name)
        if other != name:
            return other, name
    return None


def _confusable_message(pair, where=""):
    a, b = pair
    return (f"names {a!r} and {b!r}{where} must not read alike ({_spelled_name(a + b)}): names that differ "
            "only by a Greek letter looking like a Latin one are refused in one text")

#: Functions callable from the grammar: name -> number of arguments.
FUNCTIONS = {"sqrt": 1, "exp": 1, "sin": 1, "cos": 1, "sinh": 1, "cosh": 1, "KroneckerDelta": 2}


@dataclass(frozen=True)
class ParseLimits:
    """Bounds that keep parsing cheap whatever the input.

    Parameters
    ==========

    max_length : maximum number of characters of the input text.
    max_digits : maximum number of digits of one integer literal.
    max_exponent : maximum absolute value of a numeric exponent.
    max_bits : maximum bit length of a numerator or denominator built while parsing.
    max_depth : maximum nesting depth of the parse tree.
    max_name_length : maximum length of a name.
    """

    max_length: int = 20_000
    max_digits: int = 100
    max_exponent: int = 1000
    max_bits: int = 4000
    max_depth: int = 100
    max_name_length: int = 64


@dataclass(frozen=True)
class Constructor:
    """One allow-listed operator constructor of the grammar.

    ``name(arg, ...)`` in text builds ``getattr(import_module(module), factory)(*args)``,
    then takes ``attribute`` of the result when one is given.  ``kinds`` says how each
    argument is read: ``"label"`` (a bare name or a quoted label ``'J'``, passed as a
    ``str``), ``"expr"`` (any expression of the grammar) or ``"tuple"`` (a parenthesised
    list ``(a, b, ...)`` of expressions, passed as a ``tuple``).  A new call-shaped class
    joins the grammar by one more ``Constructor`` in :data:`CONSTRUCTORS` (its module is
    imported only when the name is used), and :func:`to_text` writes it when its class
    name is ``factory`` (or when rebuilding from its labels gives it back).

    Parameters
    ==========

    name : the name used in text.
    module : dotted module path, imported lazily.
    factory : attribute of that module to call.
    kinds : tuple of ``"label"`` / ``"expr"`` / ``"tuple"`` / ``"setting"``, one per argument
        (``"setting"``: ``'hermitian'`` or ``'general'``, passed as ``True`` / ``False``).
    attribute : optional attribute of the built object (``"z"`` for ``.z``).
    required : how many leading arguments must be given (default: all).
    """

    name: str
    module: str
    factory: str
    kinds: tuple = field(default=("label",))
    attribute: str | None = None
    required: int | None = None

    def build(self, args):
        obj = getattr(importlib.import_module(self.module), self.factory)(*args)
        return getattr(obj, self.attribute) if self.attribute else obj


#: The calls the grammar knows, by name (printed forms that are not calls have grammar rules).
CONSTRUCTORS = {
    c.name: c
    for c in (
        Constructor("Jx", "amalgebra.algebra", "AngularMomentum", ("label",), "x"),
        Constructor("Jy", "amalgebra.algebra", "AngularMomentum", ("label",), "y"),
        Constructor("Jz", "amalgebra.algebra", "AngularMomentum", ("label",), "z"),
        Constructor("Jplus", "amalgebra.algebra", "AngularMomentum", ("label",), "plus"),
        Constructor("Jminus", "amalgebra.algebra", "AngularMomentum", ("label",), "minus"),
        Constructor("Jsq", "amalgebra.algebra", "AngularMomentum", ("label",), "squared"),
        Constructor("Vx", "amalgebra.tensors", "VectorOperator", ("label", "label"), "x"),
        Constructor("Vy", "amalgebra.tensors", "VectorOperator", ("label", "label"), "y"),
        Constructor("Vz", "amalgebra.tensors", "VectorOperator", ("label", "label"), "z"),
        Constructor("create", "amalgebra.bosons", "BosonMode", ("label",), "create"),
        Constructor("annihilate", "amalgebra.bosons", "BosonMode", ("label",), "annihilate"),
        Constructor("number", "amalgebra.bosons", "BosonMode", ("label",), "number"),
        Constructor("ket", "amalgebra.states", "Ket", ("expr", "expr", "label")),
        Constructor("bra", "amalgebra.states", "Bra", ("expr", "expr", "label")),
        # the calls the library itself prints (str of these objects)
        Constructor("AngularMomentum", "amalgebra.algebra", "AngularMomentum", ("label",)),
        Constructor("BosonMode", "amalgebra.bosons", "BosonMode", ("label",)),
        Constructor("VectorOperator", "amalgebra.tensors", "VectorOperator", ("label", "label", "setting"),
                    required=2),
        Constructor("TensorComponents", "amalgebra.tensors.products", "TensorComponents",
                    ("expr", "tuple")),
        Constructor("TriangleDelta", "amalgebra.racah.triangle", "TriangleDelta",
                    ("expr", "expr", "expr")),
        Constructor("TreeKet", "amalgebra.states.tree_kets", "TreeKet", ("expr", "expr")),
        Constructor("TreeBra", "amalgebra.states.tree_kets", "TreeBra", ("expr", "expr")),
    )
}

#: Spellings of the first version of the grammar, still read (stored results written before
#: 0.2.0 use them) but never written: :func:`to_text` writes the library's printed forms.
LEGACY_SPELLINGS = ("Jx", "Jy", "Jz", "Jplus", "Jminus", "Jsq", "Vx", "Vy", "Vz", "create",
                    "annihilate", "number", "ket", "bra")

#: ``label.component`` in text: the family that owns each component name.
_COMPONENTS = {
    **{c: ("amalgebra.algebra", "AngularMomentum") for c in ("x", "y", "z", "plus", "minus", "squared")},
    **{c: ("amalgebra.bosons", "BosonMode") for c in ("create", "annihilate", "number")},
}

#: Printed forms read by dedicated grammar rules: rule -> (module, class).
_PRINTED = {
    "ket": ("amalgebra.states.kets", "Ket"),
    "bra": ("amalgebra.states.kets", "Bra"),
    "kets": ("amalgebra.states.kets", "ProductKet"),
    "bras": ("amalgebra.states.kets", "ProductBra"),
    "coupled_ket": ("amalgebra.states.coupled", "CoupledKet"),
    "coupled_bra": ("amalgebra.states.coupled", "CoupledBra"),
    "fock_ket": ("amalgebra.bosons.fock", "FockKet"),
    "fock_bra": ("amalgebra.bosons.fock", "FockBra"),
    "reduced": ("amalgebra.tensors.wigner_eckart", "ReducedMatrixElement"),
    "rotation": ("amalgebra.rotations.wigner", "RotationElement"),
    "tensor": ("amalgebra.tensors", "SphericalTensor"),
    "vector": ("amalgebra.tensors", "VectorOperator"),
    "cg_bracket": ("amalgebra.coupling.symbols", "CouplingBracket"),
    "threej": ("amalgebra.coupling.symbols", "Coupling3j"),
    "sixj": ("amalgebra.coupling.symbols", "Coupling6j"),
    "ninej": ("amalgebra.coupling.symbols", "Coupling9j"),
    "tree": ("amalgebra.coupling.trees", "coupling_tree"),
    "coupled_tensor": ("amalgebra.tensors.tree_elements", "CoupledTensorOperator"),
}


def _printed_class(rule):
    module, name = _PRINTED[rule]
    try:
        return getattr(importlib.import_module(module), name)
    except ImportError as exc:  # pragma: no cover - every module ships with the package
        raise ParseError(f"{name} needs {module}, which cannot be imported: {exc}") from None


class _Label:
    """A quoted label ``'J'`` of a printed call such as ``AngularMomentum('J')``."""

    __slots__ = ("name",)

    def __init__(self, name):
        self.name = name


_GRAMMAR = r"""
?start: sum
?sum: term (ADDOP term)*
?term: product
    | "-" term -> neg
    | "+" term -> pos
?product: power (MULOP power)*
?signed: power
    | "-" signed -> neg
    | "+" signed -> pos
?power: atom
    | atom POW signed   -> pow
    | headed
    | headed POW signed -> pow
?headed: atom POW "(" sum ")" "[" NAME ("," NAME)* "]" -> tensor
    | atom POW "(" sum ")" "[" NAME ("," NAME)* "]" SUBPAREN sum ")" -> tensor_component
    | atom POW "(" sum ")" SUBPAREN sum ")" -> unlabelled_component
    | atom POW "{" sum "}" SUBBRACE sum "," sum "}" "(" sum "," sum "," sum ")" -> rotation
?atom: INT              -> integer
    | DECIMAL           -> decimal
    | NAME              -> name
    | NAME "(" arg ("," arg)* ")" -> call
    | NAME "." NAME     -> component
    | NAME "[" NAME ("," NAME)* "]" "." NAME -> vector_component
    | "(" sum ")"
    | ket+ fock_ket?    -> kets
    | bra+ fock_bra?    -> bras
    | "<" sum "," sum ";" sum "," sum "|" sum "," sum ">" -> cg_bracket
    | "<" sum DBAR NAME POW "(" sum ")" DBAR sum (">" | KETEND) -> reduced
    | THREEJ sum "," sum "," sum ";" sum "," sum "," sum ")" -> threej
    | SIXJ sum "," sum "," sum ";" sum "," sum "," sum "}" -> sixj
    | NINEJ sum "," sum "," sum ";" sum "," sum "," sum ";" sum "," sum "," sum "}" -> ninej
    | "|" "(" node COMMA? node ")" value "," sum ">" -> coupled_ket
    | "<" "(" node COMMA? node ")" value "," sum "|" -> coupled_bra
    | fock_ket
    | fock_bra
    | TREE ("[" assignment ("," assignment)* "]")? -> tree
    | "[" power NAME power "]" POW "(" sum ")" -> coupled_tensor
assignment: NAME "=" sum
ket: "|" sum "," sum KETEND
fock_ket: "|" sum ("," sum)* FOCKKET NAME ("," NAME)* ")"
fock_bra: "<" sum ("," sum)* FOCKBRA NAME ("," NAME)* ")"
bra: "<" sum "," sum BRAEND
?node: part
    | "(" node COMMA? node ")" value -> node
value: part -> named_value
    | sum -> unnamed_value
part: LABELLED
    | "(" sum ")" LABELSUFFIX
COMMA: ","
?arg: sum
    | QLABEL -> qlabel
    | "(" sum ("," sum)+ ")" -> tuple
POW: "^" | "**"
ADDOP: "+" | "-"
MULOP: "*" | "/"
DBAR: "||"
INT: /[0-9]+/
DECIMAL.2: /[0-9]+\.[0-9]+/
NAME: /[A-Za-z_""" + GREEK_LETTERS + r"""][A-Za-z0-9_""" + GREEK_LETTERS + r"""]*/
QLABEL: /'[A-Za-z][A-Za-z0-9_]*'/
KETEND.3: />_[A-Za-z][A-Za-z0-9_]*/
BRAEND.3: /\|_[A-Za-z][A-Za-z0-9_]*/
FOCKKET.4: />_\(/
FOCKBRA.4: /\|_\(/
SUBPAREN.3: "_("
SUBBRACE.3: "_{"
THREEJ.3: "3j("
SIXJ.3: "6j{"
NINEJ.3: "9j{"
TREE.5: /\([A-Za-z0-9_ ,()]*[A-Za-z0-9_][ ,]+[A-Za-z(][A-Za-z0-9_ ,()]*\)[ ]*[A-Za-z][A-Za-z0-9_]*/
LABELSUFFIX.3: /_[A-Za-z][A-Za-z0-9_]*/
LABELLED.3: /(?:[0-9]+(?:\/[0-9]+)?|[A-Za-z][A-Za-z0-9]*(?:_[0-9][A-Za-z0-9]*)*)_[A-Za-z][A-Za-z0-9_]*/
%ignore /[ \t\r\n]+/
"""


def is_valid_name(name):
    """True when ``name`` can be written as a symbol name in the grammar.

    Examples
    ========

    A name is ASCII letters, digits and ``_``, or allow-listed Greek letters
    (:data:`GREEK_LETTERS`), digits and ``_``: one script per name.  It does not begin
    with a digit or ``__``, is not ``I`` or ``pi``, and does not read like a reserved name
    (a function or constructor of the grammar, ``I``, ``pi``) through a Greek look-alike
    (:data:`LOOKALIKES`): ``"ρι"`` reads like ``pi``.

    >>> from amalgebra.parsing import is_valid_name
    >>> is_valid_name("j1"), is_valid_name("α"), is_valid_name("__class__"), is_valid_name("I")
    (True, True, False, False)
    >>> is_valid_name("θ_2"), is_valid_name("ρi"), is_valid_name("ρι"), is_valid_name("οmega")
    (True, False, False, False)
    """
    return (isinstance(name, str) and bool(_NAME_RE.match(name)) and not name.startswith("__")
            and name not in _RESERVED and len(name) <= ParseLimits.max_name_length
            and _name_problem(name) is None)


@lru_cache(maxsize=1)
def _lark():
    """The lark module, imported once: the parser, its trees, tokens and exceptions and the
    transformer must come from one module object even if ``sys.modules`` is later purged
    (pytest's in-process runs restore a snapshot of it)."""
    import lark
    import lark.exceptions

    return lark


@lru_cache(maxsize=1)
def _parser():
    Lark = _lark().Lark

    return Lark(_GRAMMAR, parser="lalr", start="start")


def _depth(tree):
    """Nesting depth of a lark tree, computed without recursion."""
    Tree = _lark().Tree

    deepest, stack = 0, [(tree, 1)]
    while stack:
        node, d = stack.pop()
        deepest = max(deepest, d)
        stack.extend((c, d + 1) for c in node.children if isinstance(c, Tree))
    return deepest


def _power_weights(expr):
    """``(largest effective exponent, largest effective bit size)`` inside ``expr``.

    A power's numeric exponent scales everything under its base: the exponent weight is the
    largest product of nested numeric exponents (at least 1), the bit weight the largest bit
    length of a number times the exponents above it (exponents themselves are not counted).
    """
    from sympy import Rational

    exp_weight, bit_weight = 1, 1
    stack = [(expr, 1)]
    while stack:
        node, scale = stack.pop()
        if isinstance(node, Rational):
            bit_weight = max(bit_weight, max(abs(node.p).bit_length(), node.q.bit_length()) * scale)
        elif node.is_Pow and isinstance(node.exp, Rational):
            inner = scale * abs(node.exp)
            exp_weight = max(exp_weight, inner)
            stack.append((node.base, inner))
        else:
            stack.extend((arg, scale) for arg in node.args)
    return exp_weight, bit_weight


def _transformer(limits, names):
    # sympy is imported here, not at module import, to keep ``amalgebra.cli`` start-up light.
    Transformer = _lark().Transformer
    from sympy import (
        Add, I, Integer, KroneckerDelta, Mul, Pow, Rational, Symbol, cos, cosh, exp, pi, sin,
        sinh, sqrt,
    )

    functions = {"sqrt": sqrt, "exp": exp, "sin": sin, "cos": cos, "sinh": sinh, "cosh": cosh,
                 "KroneckerDelta": KroneckerDelta}

    def bounded(value):
        # the node itself and its direct arguments: SymPy's automatic evaluation puts the
        # numbers it builds there (2^499*sqrt(2) holds the Integer 2^499 as an argument)
        for number in (value, *getattr(value, "args", ())):
            if isinstance(number, Rational) and max(abs(number.p).bit_length(),
                                                    number.q.bit_length()) > limits.max_bits:
                raise ParseError(f"number of {max(abs(number.p).bit_length(), number.q.bit_length())} "
                                 f"bits must have at most max_bits={limits.max_bits} bits")
        return value

    class Build(Transformer):
        def integer(self, children):
            digits = str(children[0])
            if len(digits) > limits.max_digits:
                raise ParseError(f"integer literal of {len(digits)} digits must have at most "
                                 f"max_digits={limits.max_digits} digits")
            return Integer(int(digits))

        def decimal(self, children):
            # An exact decimal (never a float): 72.222 is 72222/1000.
            whole, fraction = str(children[0]).split(".")
            if len(whole) + len(fraction) > limits.max_digits:
                raise ParseError(f"decimal literal of {len(whole) + len(fraction)} digits must "
                                 f"have at most max_digits={limits.max_digits} digits")
            return Rational(int(whole + fraction), 10 ** len(fraction))

        def name(self, children):
            text = str(children[0])
            if text == "I":
                return I
            if text == "pi":
                return pi
            if text.startswith("__"):
                raise ParseError(f"name={text!r} must not begin with '__'")
            if len(text) > limits.max_name_length:
                raise ParseError(f"name of {len(text)} characters must have at most "
                                 f"max_name_length={limits.max_name_length} characters")
            if names is not None and text not in names:
                raise ParseError(f"name={text!r} must be one of the allowed names "
                                 f"{sorted(names)}")
            return Symbol(text)

        def call(self, children):
            head, args = str(children[0]), children[1:]
            if head in functions:
                if any(isinstance(a, (_Label, tuple)) for a in args):
                    raise ParseError(f"the arguments of {head} must be expressions")
                if len(args) != FUNCTIONS[head]:
                    raise ParseError(f"{head} takes {FUNCTIONS[head]} argument(s), "
                                     f"got {len(args)}")
                return bounded(functions[head](*args))
            if head in CONSTRUCTORS:
                spec = CONSTRUCTORS[head]
                least = len(spec.kinds) if spec.required is None else spec.required
                if not least <= len(args) <= len(spec.kinds):
                    counts = f"{least} to {len(spec.kinds)}" if least < len(spec.kinds) else f"{least}"
                    raise ParseError(f"{head} takes {counts} argument(s), got {len(args)}")
                built = []
                for kind, arg in zip(spec.kinds, args):
                    if kind == "setting":
                        word = arg.name if isinstance(arg, (_Label, Symbol)) else None
                        if word not in ("hermitian", "general"):
                            raise ParseError(f"argument {_piece(arg)} of {head} must be 'hermitian' or 'general'")
                        built.append(word == "hermitian")
                        continue
                    if kind == "label":
                        if isinstance(arg, _Label):
                            built.append(arg.name)
                            continue
                        if not isinstance(arg, Symbol):
                            raise ParseError(f"argument {_piece(arg)} of {head} must be a bare label name")
                        built.append(arg.name)
                    elif kind == "tuple":
                        if not isinstance(arg, tuple):
                            raise ParseError(f"argument {_piece(arg)} of {head} must be a "
                                             "parenthesised list (a, b, ...)")
                        built.append(arg)
                    else:
                        if isinstance(arg, (_Label, tuple)):
                            raise ParseError(f"argument {_piece(arg)} of {head} must be an expression")
                        built.append(arg)
                try:
                    return spec.build(built)
                except ImportError as exc:
                    raise ParseError(f"{head} needs {spec.module}, which cannot be "
                                     f"imported: {exc}") from exc
            raise ParseError(f"function name={head!r} must be one of "
                             f"{sorted(FUNCTIONS) + sorted(CONSTRUCTORS)}")

        # -- the library's printed forms ------------------------------------------------

        def qlabel(self, c):
            return _Label(str(c[0])[1:-1])

        def tuple(self, c):
            return tuple(c)

        def component(self, c):
            label, part = str(c[0]), str(c[1])
            if part not in _COMPONENTS:
                raise ParseError(f"component={part!r} must be one of {sorted(_COMPONENTS)}")
            module, factory = _COMPONENTS[part]
            return getattr(getattr(importlib.import_module(module), factory)(label), part)

        def vector_component(self, c):
            name, label, *settings, axis = (str(t) for t in c)
            if axis not in ("x", "y", "z"):
                raise ParseError(f"axis={axis!r} of a vector operator must be x, y or z")
            _kind, hermitian = _settings(settings, kinds=())
            return getattr(_printed_class("vector")(name, label, hermitian), axis)

        def _tensor(self, head, rank, label, settings):
            if not isinstance(head, Symbol):
                raise ParseError("a spherical tensor must be written name^(k)[label]")
            kind, hermitian = _settings([str(t) for t in settings], kinds=_TENSOR_KINDS)
            return _printed_class("tensor")(head.name, rank, str(label), kind, hermitian)

        def tensor(self, c):
            head, _pow, rank, label, *settings = c
            return self._tensor(head, rank, label, settings)

        def tensor_component(self, c):
            head, _pow, rank, label, *settings, _sub, q = c
            return self._tensor(head, rank, label, settings)[q]

        def unlabelled_component(self, c):
            raise ParseError("a tensor component must name the label of its tensor: "
                             "T^(k)[label]_(q) (the printed T^(k)_(q) does not say it)")

        def rotation(self, c):
            head, _pow, j, _sub, mp, m, alpha, beta, gamma = c
            if head != Symbol("D"):
                raise ParseError("a rotation matrix element must be written D^{j}_{m',m}(alpha, beta, gamma)")
            return _printed_class("rotation")(j, mp, m, alpha, beta, gamma)

        def ket(self, c):
            return _printed_class("ket")(c[0], c[1], str(c[2])[2:])

        def bra(self, c):
            return _printed_class("bra")(c[0], c[1], str(c[2])[2:])

        def kets(self, c):
            return c[0] if len(c) == 1 else _printed_class("kets")(*c)

        def bras(self, c):
            return c[0] if len(c) == 1 else _printed_class("bras")(*c)

        def part(self, c):
            if len(c) == 1:
                return _labelled(c[0], limits)
            return c[0], str(c[1])[1:]

        def node(self, c):
            return _Node(c)

        def named_value(self, c):
            return c[0]

        def unnamed_value(self, c):
            return c[0], None

        def coupled_ket(self, c):
            return _coupled_state("ket", _Node(c[:-1]), c[-1])

        def coupled_bra(self, c):
            return _coupled_state("bra", _Node(c[:-1]), c[-1])

        def _fock(self, rule, c):
            from sympy import Tuple
            from sympy.core.symbol import Str

            cut = next(i for i, t in enumerate(c) if getattr(t, "type", None) in ("FOCKKET", "FOCKBRA"))
            occupations, modes = c[:cut], [str(t) for t in c[cut + 1:]]
            if len(modes) != len(occupations):
                raise ParseError(f"{len(occupations)} occupation(s) must come with as many modes, "
                                 f"got {len(modes)}")
            return _printed_class(rule)(Tuple(*[Str(mode) for mode in modes]), Tuple(*occupations))

        def fock_ket(self, c):
            return self._fock("fock_ket", c)

        def fock_bra(self, c):
            return self._fock("fock_bra", c)

        def reduced(self, c):
            jp, _bar, name, _pow, k, _bar2, j, *end = c
            convention = str(end[0])[2:] if end else "edmonds"
            return _printed_class("reduced")(str(name), k, jp, j, convention)

        def cg_bracket(self, c):
            return _printed_class("cg_bracket")(*c)

        def threej(self, c):
            return _printed_class("threej")(*c[1:])

        def sixj(self, c):
            return _printed_class("sixj")(*c[1:])

        def ninej(self, c):
            return _printed_class("ninej")(*c[1:])

        def assignment(self, c):
            return str(c[0]), c[1]

        def tree(self, c):
            values = dict(c[1:])
            if len(values) != len(c) - 1:
                raise ParseError("each momentum of a coupling tree must be given one value")
            return _printed_class("tree")(str(c[0]), values)

        def coupled_tensor(self, c):
            first, cross, second, _pow, rank = c
            if str(cross) != "x":
                raise ParseError("a coupled tensor operator must be written [A x B]^(K)")
            parts = []
            for part in (first, second):
                # a bare name is an angular momentum by its label ([I x J]^(0)); I and pi were read
                # as constants by the name rule
                label = {I: "I", pi: "pi"}.get(part, part.name if isinstance(part, Symbol) else None)
                if label is not None:
                    part = getattr(importlib.import_module("amalgebra.algebra"), "AngularMomentum")(label)
                elif part.is_Pow:
                    raise ParseError("the parts of a coupled tensor operator must name their labels: "
                                     "[T^(k)[J] x U^(q)[S]]^(K) (the printed [T^(k) x U^(q)]^(K) does not say them)")
                parts.append(part)
            return _printed_class("coupled_tensor")(*parts, rank)

        def sum(self, c):
            # One flat Add (and one flat Mul below), as SymPy builds them: binary
            # construction could distribute 2*(x + y) where the flat Mul keeps it.
            terms = [c[0]] + [t if op == "+" else Mul(Integer(-1), t)
                              for op, t in zip(c[1::2], c[2::2], strict=True)]
            return bounded(Add(*terms))

        def product(self, c):
            factors = [c[0]]
            for op, f in zip(c[1::2], c[2::2], strict=True):
                if op == "/":
                    if f == 0:
                        raise ParseError("division by zero")
                    f = Pow(f, Integer(-1))
                factors.append(f)
            return bounded(Mul(*factors))

        def neg(self, c):
            return bounded(Mul(Integer(-1), c[0]))

        def pos(self, c):
            return c[0]

        def pow(self, c):
            base, exponent = c[0], c[2]
            if exponent.is_Number:
                if not exponent.is_Rational:
                    raise ParseError(f"exponent={exponent} must be exact")
                if abs(exponent) > limits.max_exponent:
                    raise ParseError(f"exponent={exponent} must have absolute value <= "
                                     f"{limits.max_exponent}")
                # Before SymPy evaluates anything: exponents of powers inside the base multiply
                # ((a^1000)^1000 is a^1000000), and numbers inside it grow by the exponent
                # ((sqrt(2)^999)^999 is 2^(999*999/2)).
                exp_weight, bit_weight = _power_weights(base)
                if abs(exponent) * exp_weight > limits.max_exponent:
                    raise ParseError(f"exponent={exponent} times the exponent {exp_weight} inside its base "
                                     f"must have absolute value <= {limits.max_exponent}")
                if abs(exponent) * bit_weight > limits.max_bits:
                    raise ParseError(f"power with exponent={exponent} of a base holding a number of "
                                     f"{bit_weight} bits must have at most max_bits={limits.max_bits} bits")
                if base == 0 and exponent < 0:
                    raise ParseError("division by zero")
            return bounded(Pow(base, exponent))

    return Build()


class _Node:
    """An inner node ``(left right)value`` of a coupled or tree ket as read: children, whether a
    comma stood between them, and ``(value, name)`` of its momentum (name None when unnamed)."""

    __slots__ = ("left", "right", "comma", "value", "name")

    def __init__(self, children):
        children = list(children)
        self.comma = len(children) == 4
        self.left, self.right = children[0], children[-2]
        self.value, self.name = children[-1]


def _coupled_state(side, root, M):
    """A ket (``side="ket"``) or bra read as ``|(...)J, M>``: a coupled ket when no inner
    momentum has a name and the tree is a chain written without commas, a tree ket when every
    inner momentum has a name; anything between is refused (it would say too little)."""
    inner, stack = [], [root]
    while stack:
        node = stack.pop()
        if isinstance(node, _Node):
            inner.append(node)
            stack.extend((node.left, node.right))
    named = [node.name is not None for node in inner]
    if all(named):
        return _tree_state(side, root, M)
    if any(named):
        raise ParseError("the momenta of a tree ket must all be named (|(1_a 1_b)2_J, 0>), or none of "
                         "the inner ones (a coupled ket |(1_a 1_b)2, 0>)")
    js, labels, intermediates, node = [], [], [], root
    while isinstance(node, _Node):
        if node.comma or isinstance(node.right, _Node):
            raise ParseError("a ket coupled in a tree other than a chain, or written with commas, must "
                             "name its inner momenta: |((1_a 1_b)2_j, 1_c)1_J, 0> (the form of a tree ket)")
        js.append(node.right[0])
        labels.append(node.right[1])
        intermediates.append(node.value)
        node = node.left
    js.append(node[0])
    labels.append(node[1])
    from sympy import Tuple
    from sympy.core.symbol import Str

    J, intermediates = intermediates[0], intermediates[1:][::-1]
    return _printed_class("coupled_" + side)(Tuple(*js[::-1]), Tuple(*intermediates), J, M,
                                            Tuple(*[Str(label) for label in labels[::-1]]))


def _tree_state(side, root, M):
    """The tree ket (or bra) of ``|(1_a 1/2_b)3/2_J, 1/2>``: the tree from the names, its values."""
    values = {}

    def walk(node):
        if not isinstance(node, _Node):
            value, name = node
        else:
            left, right = walk(node.left), walk(node.right)
            sep = ", " if isinstance(node.left, _Node) or isinstance(node.right, _Node) else " "
            value, name = node.value, node.name
        if name in values:
            raise ParseError(f"momentum name={name!r} must be given once in a tree ket")
        values[name] = value
        return name if not isinstance(node, _Node) else f"({left}{sep}{right}) {name}"

    text = walk(root)
    tree = _printed_class("tree")(text, values)
    module = importlib.import_module("amalgebra.states.tree_kets")
    return getattr(module, "TreeKet" if side == "ket" else "TreeBra")(tree, M)


_TENSOR_KINDS = ("abstract", "unit", "racah")


def _settings(words, *, kinds):
    """``(kind, hermitian)`` from the words after the label in ``[L, racah, general]``: at most one
    kind (of ``kinds``) and at most one of ``hermitian`` / ``general``, defaults ``abstract``, True."""
    kind, hermitian, seen = "abstract", True, set()
    for word in words:
        group = "kind" if word in kinds else "hermitian" if word in ("hermitian", "general") else None
        if group is None:
            allowed = [*kinds, "hermitian", "general"]
            raise ParseError(f"setting={word!r} after the label must be one of {allowed}")
        if group in seen:
            raise ParseError(f"the {group} setting must be given at most once")
        seen.add(group)
        if group == "kind":
            kind = word
        else:
            hermitian = word == "hermitian"
    return kind, hermitian


def _labelled(token, limits):
    """``(value, label)`` of a labelled momentum ``1_L``, ``3/2_S`` or ``j_1_A`` of a coupled ket."""
    from sympy import Integer, Rational, Symbol

    text = str(token)
    match = re.fullmatch(r"([0-9]+(?:/[0-9]+)?|[A-Za-z][A-Za-z0-9]*(?:_[0-9][A-Za-z0-9]*)*)_(.+)", text)
    value, label = match.group(1), match.group(2)
    if value[0].isdigit():
        if len(value) > limits.max_digits:
            raise ParseError(f"number of {len(value)} characters in a coupled ket must have at most "
                             f"max_digits={limits.max_digits} digits")
        p, _, q = value.partition("/")
        number = Rational(int(p), int(q)) if q else Integer(int(p))
        if q and int(q) == 0:
            raise ParseError("division by zero")
        return number, label
    if value in _RESERVED:
        raise ParseError(f"name={value!r} is a constant, not a momentum")
    return Symbol(value), label


def _piece(arg):
    """How an argument is named in a message: its kind, never the text it came from."""
    if isinstance(arg, _Label):
        return "(a quoted label)"
    if isinstance(arg, tuple):
        return "(a parenthesised list)"
    return "(an expression)"


def parse(text, *, names=None, limits=None):
    """Read ``text`` in amalgebra's grammar and build the SymPy expression it denotes.

    Explanation
    ===========

    Safe for untrusted text: only the grammar of the module docstring is accepted,
    objects are built directly from an allow-list, and :class:`ParseLimits` bounds
    the work.  Arithmetic is SymPy's usual automatic evaluation (``2*x + x`` becomes
    ``3*x``).

    Examples
    ========

    >>> from amalgebra.parsing import parse
    >>> parse("KroneckerDelta(m, n)*exp(I*pi) + sin(pi/6)")
    1/2 - KroneckerDelta(m, n)
    >>> parse("().__class__")
    Traceback (most recent call last):
    ...
    amalgebra.errors.ParseError: text is not in the grammar: unexpected character U+0029 RIGHT PARENTHESIS at line 1, column 2
    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> parse("J.x*J.y") == J.x*J.y != J.y*J.x     # the library's printed forms read back
    True

    Parameters
    ==========

    text : str
        The expression text.
    names : collection of str, optional
        When given, the only symbol names allowed (an unknown name is an error).
    limits : ParseLimits, optional
        Bounds on the work; defaults to ``ParseLimits()``.

    Raises
    ======

    ParseError
        For anything outside the grammar or beyond a limit.  The message names the
        offending piece and, for syntax errors, its line and column.

    See Also
    ========

    to_text : the inverse printer.
    """
    errors = _lark().exceptions
    UnexpectedCharacters, UnexpectedEOF = errors.UnexpectedCharacters, errors.UnexpectedEOF
    UnexpectedInput, VisitError = errors.UnexpectedInput, errors.VisitError

    limits = ParseLimits() if limits is None else limits
    if not isinstance(text, str):
        raise ParseError(f"text={text!r} must be a str")
    if len(text) > limits.max_length:
        raise ParseError(f"text of {len(text)} characters must have at most "
                         f"max_length={limits.max_length} characters")
    if not text.strip():
        raise ParseError("text='' must contain an expression")
    # A cheap bracket scan first, so that absurd nesting never reaches the parser.
    level = 0
    for ch in text:
        level += (ch in "([{") - (ch in ")]}")
        if level > limits.max_depth:
            raise ParseError(f"nesting depth must be at most max_depth={limits.max_depth}")
    # Messages say where (line and column) and what kind of piece, never the text itself:
    # stored results and command lines may hold anything.
    try:
        tree = _parser().parse(text)
    except UnexpectedCharacters as exc:
        ch = text[exc.pos_in_stream]
        raise ParseError(f"text is not in the grammar: unexpected character {_spelled(ch)} "
                         f"at line {exc.line}, column {exc.column}") from None
    except UnexpectedEOF:
        raise ParseError("text is not in the grammar: it ends too early") from None
    except UnexpectedInput as exc:
        token = getattr(exc, "token", None)
        if getattr(token, "type", None) == "$END":
            raise ParseError("text is not in the grammar: it ends too early") from None
        raise ParseError(f"text is not in the grammar: unexpected {_token_kind(token)} "
                         f"at line {exc.line}, column {exc.column}") from None
    if _depth(tree) > 3 * limits.max_depth:
        raise ParseError(f"nesting depth must be at most max_depth={limits.max_depth}")
    _check_names(tree)
    try:
        return _transformer(limits, None if names is None else frozenset(names)).transform(tree)
    except VisitError as exc:
        inner = exc.orig_exc
        if isinstance(inner, ParseError):
            raise inner from None
        raise ParseError(f"text cannot be built: {type(inner).__name__}: {inner}") from None


def _check_names(tree):
    """The confusable rule on every name of the text, before anything is built.

    Each name is single-script and does not read like a reserved name; no two distinct
    names of one text share a skeleton (``o`` beside Greek ``ο``, ``p`` beside ``ρ``).
    """
    Token = _lark().Token

    tokens = list(tree.scan_values(lambda v: isinstance(v, Token) and v.type == "NAME"))
    for token in tokens:
        if token.startswith("__"):  # before anything is looked up by that name
            raise ParseError(f"text is not in the grammar: a name must not begin with '__', at line "
                             f"{token.line}, column {token.column}")
    words = [str(t) for t in tokens]
    for word in dict.fromkeys(words):
        if word.isascii():
            continue  # ASCII names are single-script and their own skeleton
        problem = _name_problem(word)
        if problem is not None:
            raise ParseError(problem)
    pair = _confusable_pair(words)
    if pair is not None:
        raise ParseError(_confusable_message(pair))


#: Terminals whose text comes from the input: named by kind in messages, never quoted.
_TOKEN_KINDS = {"NAME": "name", "INT": "integer", "DECIMAL": "decimal", "LABELLED": "labelled momentum",
                "QLABEL": "quoted label", "KETEND": "ket label '>_...'", "BRAEND": "bra label '|_...'"}


def _token_kind(token):
    """A token in a message: punctuation of the grammar quoted, input text only by its kind."""
    kind = getattr(token, "type", None)
    if kind in _TOKEN_KINDS:
        return _TOKEN_KINDS[kind]
    if token is None:
        return "input"
    return f"character {_spelled(str(token))}" if len(str(token)) == 1 else repr(str(token))


# ----------------------------------------------------------------------------- printing

_ADD, _MUL, _NEG, _POW, _ATOM = 1, 2, 2, 3, 4


def to_text(expr, *, decimals=False):
    """Write ``expr`` in exactly the grammar that :func:`parse` reads.

    Explanation
    ===========

    Terms of a sum follow SymPy's printing order, commutative factors come before
    noncommutative ones (whose order is kept), and the output is the same under any
    ``PYTHONHASHSEED``.  Objects the grammar cannot name (floats, infinities, unknown
    classes, symbols whose name is not a valid grammar name) raise
    :class:`~amalgebra.errors.ParseError` rather than being written ambiguously.

    Examples
    ========

    >>> from sympy import Rational, sqrt, symbols, I
    >>> from amalgebra.parsing import parse, to_text
    >>> j, m = symbols("j m")
    >>> to_text(sqrt(j*(j + 1) - m*(m + 1)) / 2 - Rational(3, 2)*I)
    '1/2*sqrt(j*(j + 1) - m*(m + 1)) - 3/2*I'
    >>> e = (j - m)**Rational(-3, 2) * 7
    >>> parse(to_text(e)) == e
    True

    Parameters
    ==========

    expr : sympy.Expr
    decimals : bool
        Write a rational whose denominator is ``2^a 5^b`` (at least 100) as an exact
        decimal when that is not longer than ``p/q`` (``854335326363/125000000`` as
        ``6834.682610904``); :func:`parse` reads it back as the same rational.  The
        stored-results writer uses it.

    See Also
    ========

    parse
    """
    token = _DECIMALS.set(bool(decimals))
    try:
        text = _write(expr)[0]
    finally:
        _DECIMALS.reset(token)
    _check_written_names(expr)
    return text


def _check_written_names(expr):
    """Refuse to write text that :func:`parse` would refuse for two names reading alike."""
    from sympy import Basic, Symbol
    from sympy.core.symbol import Str

    if not isinstance(expr, Basic):
        return
    names = [a.name for a in expr.atoms(Symbol, Str)]
    if all(name.isascii() for name in names):
        return
    pair = _confusable_pair(names)
    if pair is not None:
        raise ParseError(_confusable_message(pair, " of expr"))


_DECIMALS = contextvars.ContextVar("amalgebra_to_text_decimals", default=False)


def _decimal_text(p, q):
    """``p/q`` (q > 1) as an exact decimal string when q = 2^a 5^b >= 100 and it is not
    longer than the fraction; otherwise None."""
    twos = (q & -q).bit_length() - 1
    rest, fives = q >> twos, 0
    while rest % 5 == 0:
        rest, fives = rest // 5, fives + 1
    if rest != 1 or q < 100:
        return None
    places = max(twos, fives)
    scaled = abs(p) * 10 ** places // q
    digits = str(scaled).rjust(places + 1, "0")
    text = f"{digits[:-places]}.{digits[-places:]}"
    return text if len(text) <= len(f"{abs(p)}/{q}") else None


def _wrap(piece, minimum):
    text, prec = piece
    return text if prec >= minimum else f"({text})"


def _write(e):
    from sympy import (
        E, Add, Basic, Float, I, Integer, KroneckerDelta, Mul, Pow, Rational, Symbol, cos, cosh,
        exp, pi, sin, sinh,
    )

    if not isinstance(e, Basic):
        if isinstance(e, int) and not isinstance(e, bool):
            e = Integer(e)
        else:
            raise ParseError(f"expr={e!r} must be a SymPy expression")
    if isinstance(e, Float):
        raise ParseError(f"expr={e} is a float; the grammar holds exact numbers only")
    if e.is_Integer:
        return (str(e.p), _NEG) if e.p < 0 else (str(e.p), _ATOM)
    if e.is_Rational:
        text = (_DECIMALS.get() and _decimal_text(e.p, e.q)) or f"{abs(e.p)}/{e.q}"
        if "." in text:
            return (f"-{text}", _NEG) if e.p < 0 else (text, _ATOM)
        return (f"-{text}", _NEG) if e.p < 0 else (text, _MUL)
    if e == I:
        return "I", _ATOM
    if e == pi:
        return "pi", _ATOM
    if e == E:
        return "exp(1)", _ATOM
    if isinstance(e, Symbol):
        if e.is_commutative is not True or type(e) is not Symbol or not is_valid_name(e.name):
            raise ParseError(f"symbol name={e.name!r} must be a plain commutative symbol with a "
                             "grammar name ([A-Za-z_][A-Za-z0-9_]* or Greek letters, digits and _, "
                             "one script; not I or pi or a look-alike of them; not __...)")
        return e.name, _ATOM
    if isinstance(e, Add):
        terms = e.as_ordered_terms()
        parts = [_write(terms[0])[0]]
        for t in terms[1:]:
            coeff, rest = t.as_coeff_Mul()
            if coeff.is_negative:
                parts.append(" - " + _wrap(_write(Mul(-coeff, rest)), _MUL))
            else:
                parts.append(" + " + _wrap(_write(t), _MUL))
        return "".join(parts), _ADD
    if isinstance(e, Mul):
        return _write_mul(e)
    if isinstance(e, Pow):
        base, ex = e.args
        if ex == Rational(1, 2):
            return f"sqrt({_write(base)[0]})", _ATOM
        if ex == Rational(-1, 2):
            return f"1/sqrt({_write(base)[0]})", _MUL
        b = _wrap(_write(base), _ATOM)
        x = _write(ex)
        x = x[0] if x[1] == _ATOM and not x[0].startswith("-") else f"({x[0]})"
        return f"{b}^{x}", _POW
    if isinstance(e, exp):
        return f"exp({_write(e.args[0])[0]})", _ATOM
    for cls, name in ((sin, "sin"), (cos, "cos"), (sinh, "sinh"), (cosh, "cosh"),
                      (KroneckerDelta, "KroneckerDelta")):
        if isinstance(e, cls):
            return f"{name}({', '.join(_write(a)[0] for a in e.args)})", _ATOM
    text = _write_printed(e)
    if text is None:
        text = _write_constructed(e)
    if text is not None:
        return text, _ATOM
    raise ParseError(f"expr={e} contains {type(e).__name__}, which the amalgebra grammar "
                     "has no name for")


def _write_mul(e):
    from sympy import Mul, Pow

    coeff, rest = e.as_coeff_Mul()
    if coeff.is_negative:
        inner = _write(Mul(-coeff, rest)) if coeff != -1 else _write(rest)
        return "-" + _wrap(inner, _MUL), _NEG
    c_part, nc_part = rest.args_cnc() if isinstance(rest, Mul) else (
        ([rest], []) if rest.is_commutative else ([], [rest]))
    numer, denom = [], []
    for f in c_part:
        if isinstance(f, Pow) and f.exp.is_Integer and f.exp.is_negative:
            denom.append(Pow(f.base, -f.exp))
        else:
            numer.append(f)
    numer.extend(nc_part)
    pieces = [] if coeff == 1 else [_write(coeff)]
    pieces += [_write(f) for f in numer]
    if not pieces:
        pieces = [("1", _ATOM)]
    text = "*".join(_wrap(p, _MUL) if i == 0 else _wrap(p, _NEG + 1) for i, p in enumerate(pieces))
    for d in denom:
        text += "/" + _wrap(_write(d), _POW)
    return text, _MUL


def _write_constructed(e):
    """Name an object built by a registered constructor, or return None.

    Label-only constructors with an ``attribute`` (``Jz(J)``) are recognised by
    rebuilding them from the labels found in ``e``; a constructor without
    ``attribute`` whose class name is its ``factory`` is written from ``e.args``.
    Either way the text is used only if rebuilding from it gives ``e`` back.
    """
    from sympy import preorder_traversal
    from sympy.core.symbol import Str

    labels = sorted({node.name for node in preorder_traversal(e) if isinstance(node, Str)})
    for spec in CONSTRUCTORS.values():
        if spec.attribute is None:
            if (type(e).__name__ != spec.factory or len(e.args) != len(spec.kinds)
                    or "setting" in spec.kinds):  # such classes have printed writers
                continue
            args, parts = [], []
            for kind, arg in zip(spec.kinds, e.args, strict=True):
                if kind == "label":
                    if not (isinstance(arg, Str) and is_valid_name(arg.name)):
                        break
                    args.append(arg.name)
                    parts.append(arg.name)
                else:
                    args.append(arg)
                    parts.append(_write(arg)[0])
            else:
                try:
                    if spec.build(args) == e:
                        return f"{spec.name}({', '.join(parts)})"
                except (ImportError, AttributeError, TypeError, ValueError):
                    pass
            continue
        if all(kind == "label" for kind in spec.kinds):
            valid = [label for label in labels if is_valid_name(label)]
            for chosen in itertools.permutations(valid, len(spec.kinds)):
                try:
                    if spec.build(list(chosen)) == e:
                        return f"{spec.name}({', '.join(chosen)})"
                except (ImportError, AttributeError, TypeError, ValueError):
                    continue
    return None


def _text(e):
    return _write(e)[0]


def _label_text(label):
    """A label as the grammar reads it after ``>_``, ``.``, ``[``: an ASCII identifier."""
    if not re.fullmatch(r"[A-Za-z][A-Za-z0-9_]*", label):
        raise ParseError(f"label={label!r} must be an ASCII identifier starting with a letter")
    return label


def _name_text(name):
    if not re.fullmatch(r"[A-Za-z][A-Za-z0-9_]*", name) or not is_valid_name(name):
        raise ParseError(f"name={name!r} must be a grammar name to be written")
    return name


def _labelled_text(value, label):
    """``value_label`` inside a coupled ket: the grammar's labelled momentum, or a refusal."""
    from sympy import Integer, Rational, Symbol

    if isinstance(value, Integer) and value >= 0:
        text = str(value.p)
    elif isinstance(value, Rational) and value > 0:
        text = f"{value.p}/{value.q}"
    elif (type(value) is Symbol and value.name not in _RESERVED
          and re.fullmatch(r"[A-Za-z][A-Za-z0-9]*(?:_[0-9][A-Za-z0-9]*)*", value.name)):
        text = value.name
    else:
        text = f"({_text(value)})"  # read back by the rule "(" sum ")" LABELSUFFIX
    return f"{text}_{_label_text(label)}"


def _write_printed(e):
    """The library's own printed form of ``e`` (the text of its ``str``), or None.

    Sub-expressions are written by :func:`to_text` (``1/2*x^2`` where str has ``x**2/2``).
    Objects whose settings the text cannot state (a non-Hermitian vector operator, a tensor
    of another kind) are refused by the rebuild check.
    """
    name = type(e).__name__
    writer = _PRINTED_WRITERS.get(name)
    if writer is None or not type(e).__module__.startswith("amalgebra."):
        return None
    text = writer(e)
    return text


def _checked(e, text, rebuilt):
    if rebuilt != e:
        raise ParseError(f"expr={type(e).__name__} has settings its text form cannot state")
    return text


def _w_component(e):
    return f"{_label_text(e.label)}.{e.component}"


def _w_boson(e):
    return f"{_label_text(e.label)}.{e.kind}"


def _w_angular_momentum(e):
    return f"AngularMomentum('{_label_text(e.label)}')"


def _w_boson_mode(e):
    return f"BosonMode('{_label_text(e.label)}')"


def _w_settings(e):
    """``[L]``, ``[L, racah, general]``: the label and the settings that are not the defaults."""
    words = [_label_text(e.label)]
    kind = getattr(e, "kind", None)  # a tensor's kind (a vector has SymPy's own .kind, not a str)
    if isinstance(kind, str) and kind != "abstract":
        words.append(kind)
    if not e.hermitian:
        words.append("general")
    return "[" + ", ".join(words) + "]"


def _w_vector(e):
    general = "" if e.hermitian else ", 'general'"
    text = f"VectorOperator('{_label_text(e.name)}', '{_label_text(e.label)}'{general})"
    return _checked(e, text, type(e)(e.name, e.label, e.hermitian))


def _w_vector_component(e):
    v = e.vector
    _w_vector(v)
    return f"{_name_text(v.name)}{_w_settings(v)}.{e.axis}"


def _w_tensor(e):
    text = f"{_name_text(e.name)}^({_text(e.rank)}){_w_settings(e)}"
    return _checked(e, text, type(e)(e.name, e.rank, e.label, e.kind, e.hermitian))


def _w_tensor_component(e):
    tensor, q = e.args
    return f"{_w_tensor(tensor)}_({_text(q)})"


def _w_tensor_components(e):
    return f"TensorComponents({_text(e.rank)}, ({', '.join(_text(c) for c in e.components)}))"


def _w_state(e):
    return f"{_text(e.j)}, {_text(e.m)}"


def _w_ket(e):
    return f"|{_w_state(e)}>_{_label_text(e.label)}"


def _w_bra(e):
    return f"<{_w_state(e)}|_{_label_text(e.label)}"


def _w_product(e):
    return "".join(_write_printed(part) or _text(part) for part in e.args)


def _w_coupled_body(e):
    labels, js = e.labels, e.js
    text = f"{_labelled_text(js[0], labels[0])} {_labelled_text(js[1], labels[1])}"
    for k in range(2, len(js)):
        text = f"({text}){_text(e.intermediates[k - 2])} {_labelled_text(js[k], labels[k])}"
    return f"({text}){_text(e.J)}, {_text(e.M)}"


def _w_coupled_ket(e):
    return f"|{_w_coupled_body(e)}>"


def _w_coupled_bra(e):
    return f"<{_w_coupled_body(e)}|"


def _w_fock(e, left, right):
    body = ", ".join(_text(n) for n in e.occupations)
    return f"{left}{body}{right}_({','.join(_label_text(mode) for mode in e.modes)})"


def _w_reduced(e):
    _, k, jp, j, _c = e.args
    suffix = "" if e.convention == "edmonds" else f"_{_label_text(e.convention)}"
    return f"<{_text(jp)}||{_name_text(e.name)}^({_text(k)})||{_text(j)}>{suffix}"


def _w_rotation(e):
    j, mp, m = (_text(a) for a in e.args[:3])
    return f"D^{{{j}}}_{{{mp},{m}}}({', '.join(_text(a) for a in e.angles)})"


def _w_cg(e):
    j1, m1, j2, m2, J, M = (_text(a) for a in e.args)
    return f"<{j1}, {m1}; {j2}, {m2}|{J}, {M}>"


def _w_array(prefix, left, right):
    def write(e):
        rows = [e.args[i:i + 3] for i in range(0, len(e.args), 3)]
        body = "; ".join(", ".join(_text(a) for a in row) for row in rows)
        return f"{prefix}{left}{body}{right}"
    return write


def _w_triangle(e):
    return f"TriangleDelta({', '.join(_text(a) for a in e.args)})"


#: class name (of a class defined in amalgebra) -> writer of its printed form
_PRINTED_WRITERS = {
    "AngularMomentumComponent": _w_component,
    "AngularMomentum": _w_angular_momentum,
    "BosonOperator": _w_boson,
    "BosonMode": _w_boson_mode,
    "VectorOperator": _w_vector,
    "VectorComponent": _w_vector_component,
    "SphericalTensor": _w_tensor,
    "TensorComponent": _w_tensor_component,
    "TensorComponents": _w_tensor_components,
    "Ket": _w_ket,
    "Bra": _w_bra,
    "ProductKet": _w_product,
    "ProductBra": _w_product,
    "CoupledKet": _w_coupled_ket,
    "CoupledBra": _w_coupled_bra,
    "FockKet": lambda e: _w_fock(e, "|", ">"),
    "FockBra": lambda e: _w_fock(e, "<", "|"),
    "ReducedMatrixElement": _w_reduced,
    "RotationElement": _w_rotation,
    "CouplingBracket": _w_cg,
    "Coupling3j": _w_array("3j", "(", ")"),
    "Coupling6j": _w_array("6j", "{", "}"),
    "Coupling9j": _w_array("9j", "{", "}"),
    "TriangleDelta": _w_triangle,
    "CouplingTree": lambda e: _w_tree(e),
    "TreeKet": lambda e: f"|{_w_tree_state_body(e)}>",
    "TreeBra": lambda e: f"<{_w_tree_state_body(e)}|",
    "CoupledTensorOperator": lambda e: _w_coupled_tensor(e),
}


def _w_tree(e):
    """``((l s) j, I) F [l=2, s=1/2]``: the tree's bracket text and the values that are not its names."""
    from sympy import Symbol

    def walk(node):
        if isinstance(node, str):
            return _label_text(node)
        left, right = walk(node[0]), walk(node[1])
        sep = ", " if not isinstance(node[0], str) or not isinstance(node[1], str) else " "
        return f"({left}{sep}{right}) {_label_text(node[2])}"

    text = walk(e.structure)
    given = [(name, value) for name, value in e.values.items() if value != Symbol(name)]
    if given:
        text += " [" + ", ".join(f"{name}={_text(value)}" for name, value in given) + "]"
    return text


def _w_tree_state_body(e):
    """``(1_a 1/2_b)3/2_J, 1/2``: every momentum of the tree with its name, then ``M``."""
    values = e.tree.values

    def walk(node):
        if isinstance(node, str):
            return _labelled_text(values[node], node)
        sep = ", " if not isinstance(node[0], str) or not isinstance(node[1], str) else " "
        return f"({walk(node[0])}{sep}{walk(node[1])}){_labelled_text(values[node[2]], node[2])}"

    return f"{walk(e.tree.structure)}, {_text(e.M)}"


def _w_coupled_tensor(e):
    first, second, rank = e.args
    return f"[{_w_part(first)} x {_w_part(second)}]^({_text(rank)})"


def _w_part(part):
    """A part of ``[A x B]^(K)``: an angular momentum by its bare label, as printed."""
    if type(part).__name__ == "AngularMomentum":
        return _label_text(part.label)
    return _write_printed(part) or _text(part)
