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

A leading minus sign applies to the whole product after it (``-(x + y)*z`` is
``Mul(-1, x + y, z)``, which SymPy keeps undistributed, as it does for the same
expression typed in Python).
    atom    := INTEGER | NAME | NAME "(" expr ("," expr)* ")" | "(" expr ")"

A chain of terms becomes one ``Add(*terms)`` and a chain of factors one
``Mul(*factors)`` (``a/b`` is ``a*b^(-1)``), exactly as SymPy builds them, so that
noncommutative order and SymPy's automatic evaluation are reproduced faithfully.

* ``INTEGER`` is a string of decimal digits; ``3/2`` is an exact rational.  There are
  no floats, no string literals, no attribute access and no indexing.
* ``NAME`` is ``[A-Za-z_][A-Za-z0-9_]*`` (or begins with an allow-listed Greek letter,
  see :data:`GREEK_LETTERS`); names beginning with ``__`` are refused.  The names
  ``I`` (imaginary unit) and ``pi`` are constants (Euler's number is written
  ``exp(1)``); every other name is a commutative :class:`~sympy.core.symbol.Symbol`
  without assumptions (callers that need assumptions rebind symbols by name).
* Calls are allowed only to the functions of :data:`FUNCTIONS` (``sqrt``, ``exp``,
  ``sin``, ``cos``, ``sinh``, ``cosh`` -- SymPy turns ``cos(I)`` into ``cosh(1)`` --
  and ``KroneckerDelta``) and to the operator constructors of
  :data:`CONSTRUCTORS` (``Jx(J)``, ``Jy(J)``, ``Jz(J)``, ``Jplus(J)``, ``Jminus(J)``,
  ``Jsq(J)`` for the components of the angular momentum labelled ``J``;
  ``Vx(r, L)``, ``Vy(r, L)``, ``Vz(r, L)`` for the Cartesian components of the
  (Hermitian) vector operator ``r`` under ``L``; ``ket(j, m, J)`` and
  ``bra(j, m, J)`` for the states of that label), which are imported lazily on
  first use.
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
    "parse",
    "to_text",
    "is_valid_name",
]

#: Lower- and upper-case Greek letters allowed to begin a name (``pi``'s letter is
#: excluded so that ``π`` cannot be mistaken for the constant).
GREEK_LETTERS = "αβγδεζηθικλμνξορστυφχψωΓΔΘΛΞΣΦΨΩ"

_NAME_RE = re.compile(r"(?:[A-Za-z_]|[" + GREEK_LETTERS + r"])[A-Za-z0-9_]*\Z")
_RESERVED = frozenset({"I", "pi"})

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
    argument is read: ``"label"`` (a bare name, passed as a ``str``) or ``"expr"`` (any
    expression of the grammar).  Other engineers' classes (kets, D-matrix elements,
    coupling symbols) are added by listing one more ``Constructor`` in
    :data:`CONSTRUCTORS`; the module is imported only when the name is used.

    Parameters
    ==========

    name : the name used in text.
    module : dotted module path, imported lazily.
    factory : attribute of that module to call.
    kinds : tuple of ``"label"`` / ``"expr"``, one per argument.
    attribute : optional attribute of the built object (``"z"`` for ``.z``).
    """

    name: str
    module: str
    factory: str
    kinds: tuple = field(default=("label",))
    attribute: str | None = None

    def build(self, args):
        obj = getattr(importlib.import_module(self.module), self.factory)(*args)
        return getattr(obj, self.attribute) if self.attribute else obj


#: The operator constructors the grammar knows, by name.
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
    )
}

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
?atom: INT              -> integer
    | NAME              -> name
    | NAME "(" sum ("," sum)* ")" -> call
    | "(" sum ")"
POW: "^" | "**"
ADDOP: "+" | "-"
MULOP: "*" | "/"
INT: /[0-9]+/
NAME: /[A-Za-z_""" + GREEK_LETTERS + r"""][A-Za-z0-9_]*/
%ignore /[ \t\r\n]+/
"""


def is_valid_name(name):
    """True when ``name`` can be written as a symbol name in the grammar.

    Examples
    ========

    >>> from amalgebra.parsing import is_valid_name
    >>> is_valid_name("j1"), is_valid_name("α"), is_valid_name("__class__"), is_valid_name("I")
    (True, True, False, False)
    """
    return (isinstance(name, str) and bool(_NAME_RE.match(name)) and not name.startswith("__")
            and name not in _RESERVED and len(name) <= ParseLimits.max_name_length)


@lru_cache(maxsize=1)
def _parser():
    from lark import Lark

    return Lark(_GRAMMAR, parser="lalr", start="start")


def _depth(tree):
    """Nesting depth of a lark tree, computed without recursion."""
    from lark import Tree

    deepest, stack = 0, [(tree, 1)]
    while stack:
        node, d = stack.pop()
        deepest = max(deepest, d)
        stack.extend((c, d + 1) for c in node.children if isinstance(c, Tree))
    return deepest


def _transformer(limits, names):
    # sympy is imported here, not at module import, to keep ``amalgebra.cli`` start-up light.
    from lark import Transformer
    from sympy import (
        Add, I, Integer, KroneckerDelta, Mul, Pow, Rational, Symbol, cos, cosh, exp, pi, sin,
        sinh, sqrt,
    )

    functions = {"sqrt": sqrt, "exp": exp, "sin": sin, "cos": cos, "sinh": sinh, "cosh": cosh,
                 "KroneckerDelta": KroneckerDelta}

    def bounded(value):
        if isinstance(value, Rational) and max(abs(value.p).bit_length(),
                                               value.q.bit_length()) > limits.max_bits:
            raise ParseError(f"number of {max(abs(value.p).bit_length(), value.q.bit_length())} "
                             f"bits must have at most max_bits={limits.max_bits} bits")
        return value

    class Build(Transformer):
        def integer(self, children):
            digits = str(children[0])
            if len(digits) > limits.max_digits:
                raise ParseError(f"integer literal of {len(digits)} digits must have at most "
                                 f"max_digits={limits.max_digits} digits")
            return Integer(int(digits))

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
                if len(args) != FUNCTIONS[head]:
                    raise ParseError(f"{head} takes {FUNCTIONS[head]} argument(s), "
                                     f"got {len(args)}")
                return bounded(functions[head](*args))
            if head in CONSTRUCTORS:
                spec = CONSTRUCTORS[head]
                if len(args) != len(spec.kinds):
                    raise ParseError(f"{head} takes {len(spec.kinds)} argument(s), "
                                     f"got {len(args)}")
                built = []
                for kind, arg in zip(spec.kinds, args, strict=True):
                    if kind == "label":
                        if not isinstance(arg, Symbol):
                            raise ParseError(f"argument {arg} of {head} must be a bare label name")
                        built.append(arg.name)
                    else:
                        built.append(arg)
                try:
                    return spec.build(built)
                except ImportError as exc:
                    raise ParseError(f"{head} needs {spec.module}, which cannot be "
                                     f"imported: {exc}") from exc
            raise ParseError(f"function name={head!r} must be one of "
                             f"{sorted(FUNCTIONS) + sorted(CONSTRUCTORS)}")

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
                if base.is_Rational:
                    size = max(abs(base.p).bit_length(), base.q.bit_length()) * abs(exponent)
                    if size > limits.max_bits:
                        raise ParseError(f"power {base}^{exponent} must have at most "
                                         f"max_bits={limits.max_bits} bits")
                if base == 0 and exponent < 0:
                    raise ParseError("division by zero")
            return bounded(Pow(base, exponent))

    return Build()


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
    amalgebra.errors.ParseError: text='().__class__' is not in the grammar: unexpected ')' at column 2

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
    from lark.exceptions import UnexpectedCharacters, UnexpectedEOF, UnexpectedInput, VisitError

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
        level += (ch == "(") - (ch == ")")
        if level > limits.max_depth:
            raise ParseError(f"nesting depth must be at most max_depth={limits.max_depth}")
    try:
        tree = _parser().parse(text)
    except UnexpectedCharacters as exc:
        raise ParseError(f"text={_short(text)!r} is not in the grammar: unexpected "
                         f"character {text[exc.pos_in_stream]!r} at column {exc.column}") from None
    except UnexpectedEOF:
        raise ParseError(f"text={_short(text)!r} is not in the grammar: it ends too early") from None
    except UnexpectedInput as exc:
        token = getattr(exc, "token", None)
        if getattr(token, "type", None) == "$END":
            raise ParseError(f"text={_short(text)!r} is not in the grammar: it ends too "
                             "early") from None
        raise ParseError(f"text={_short(text)!r} is not in the grammar: unexpected "
                         f"{str(token)!r} at column {exc.column}") from None
    if _depth(tree) > 3 * limits.max_depth:
        raise ParseError(f"nesting depth must be at most max_depth={limits.max_depth}")
    try:
        return _transformer(limits, None if names is None else frozenset(names)).transform(tree)
    except VisitError as exc:
        inner = exc.orig_exc
        if isinstance(inner, ParseError):
            raise inner from None
        raise ParseError(f"text={_short(text)!r} cannot be built: "
                         f"{type(inner).__name__}: {inner}") from None


def _short(text, width=60):
    return text if len(text) <= width else text[: width - 3] + "..."


# ----------------------------------------------------------------------------- printing

_ADD, _MUL, _NEG, _POW, _ATOM = 1, 2, 2, 3, 4


def to_text(expr):
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

    See Also
    ========

    parse
    """
    return _write(expr)[0]


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
        text = f"{abs(e.p)}/{e.q}"
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
                             "grammar name ([A-Za-z_][A-Za-z0-9_]*, not I or pi, not __...)")
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
            if type(e).__name__ != spec.factory or len(e.args) != len(spec.kinds):
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
