r"""Coupling trees: any binary coupling scheme of labelled angular momenta.

Explanation
===========

A coupling scheme of :math:`n` angular momenta is a binary tree: the leaves
are the momenta (labels such as ``l1``, ``s1``), every internal node couples
its two children to a named intermediate momentum, and the root is the total
momentum.  The bracket notation of the textbooks is read and printed:

* ``((l1 s1) j1, (l2 s2) j2) J`` - jj coupling of two electrons,
* ``((l1 l2) L, (s1 s2) S) J``   - LS coupling of the same electrons,
* ``((l s) j, I) F``             - fine structure, then hyperfine structure,
* ``((j1 j2) j12, j3) J``        - a chain.

Inside a pair of brackets the two parts are separated by a comma or by
white space; a name after a closing bracket names the momentum of that
bracket.  The order of the two children matters:
:math:`|(a b) c\rangle = (-1)^{a+b-c} |(b a) c\rangle` (Condon-Shortley
Clebsch-Gordan coefficients, :mod:`amalgebra.coupling`), so it is part of
the tree.

Every name carries a value: a number (``1``, ``"1/2"``) or a SymPy
expression; a name without a value stands for the symbol of that name.  A
tree whose values are all numbers is checked against the triangle rule at
every node.

The tree is a SymPy object (``.args`` hold the structure and the values), so
it prints, pickles and compares like any other.  Text is read by a small
grammar of this module (names are ASCII identifiers), never evaluated.

Examples
========

>>> from amalgebra.coupling.trees import coupling_tree
>>> jj = coupling_tree("((l1 s1) j1, (l2 s2) j2) J")
>>> jj
((l1 s1) j1, (l2 s2) j2) J
>>> jj.leaves
('l1', 's1', 'l2', 's2')
>>> jj.intermediates
('j1', 'j2')
>>> hyperfine = coupling_tree("((l s) j, I) F", l=2, s="1/2", j="5/2", I="7/2", F=3)
>>> hyperfine.value("j"), hyperfine.total
(5/2, 3)
>>> hyperfine.func(*hyperfine.args) == hyperfine
True

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics* (Princeton, 1957), ch. 6
       (coupling of three and four angular momenta).
"""

import re

from sympy import Basic, Symbol, Tuple
from sympy.core.symbol import Str

from ..errors import QuantumNumberError, StateError
from ..notation import NotationHooks
from ..qnumbers import quantum_number, triangle

__all__ = ["CouplingTree", "coupling_tree", "chain_tree"]

#: the longest tree text read (characters) and the most momenta in one tree
MAX_TEXT = 4000
MAX_LEAVES = 64

_TOKEN = re.compile(r"\s*(?:([A-Za-z][A-Za-z0-9_]*)|(\()|(\))|(,))", re.ASCII)


def _tokens(text):
    pos, out = 0, []
    while pos < len(text):
        if text[pos:].strip() == "":
            break
        match = _TOKEN.match(text, pos)
        if match is None:
            raise StateError(f"tree text at column {pos + 1} must continue with a name, '(', ')' or ','")
        name, opening, closing, comma = match.groups()
        out.append((name or opening or closing or comma, pos + 1))
        pos = match.end()
    return out


class _Reader:
    """Recursive descent over ``tree := group NAME``, ``group := '(' item [','] item ')'``."""

    def __init__(self, text):
        self.tokens = _tokens(text)
        self.pos = 0

    def peek(self):
        return self.tokens[self.pos][0] if self.pos < len(self.tokens) else None

    def column(self):
        return self.tokens[self.pos][1] if self.pos < len(self.tokens) else "end"

    def take(self, expected=None):
        token = self.peek()
        if token is None or (expected is not None and token != expected):
            want = repr(expected) if expected else "a token"
            raise StateError(f"tree text at column {self.column()} must have {want}")
        self.pos += 1
        return token

    def name(self):
        token = self.peek()
        if token is None or not token[0].isalpha():
            raise StateError(f"tree text at column {self.column()} must have a momentum name")
        return self.take()

    def item(self, depth):
        if self.peek() == "(":
            left, right = self.group(depth + 1)
            return (left, right, self.name())
        return self.name()

    def group(self, depth):
        if depth > MAX_LEAVES:
            raise StateError(f"tree text must nest at most {MAX_LEAVES} brackets deep")
        self.take("(")
        left = self.item(depth)
        if self.peek() == ",":
            self.take(",")
        right = self.item(depth)
        self.take(")")
        return left, right

    def tree(self):
        if self.peek() != "(":
            raise StateError("tree text must start with '(': a tree couples at least two momenta")
        left, right = self.group(0)
        root = (left, right, self.name())
        if self.peek() is not None:
            raise StateError(f"tree text at column {self.column()} must end after the total momentum")
        return root


def _read_spec(spec):
    """Nested python tuples ``(left, right, name)`` with leaf names as ``str``."""
    if isinstance(spec, str):
        if len(spec) > MAX_TEXT:
            raise StateError(f"tree text of {len(spec)} characters must be at most {MAX_TEXT}")
        return _Reader(spec).tree()
    if isinstance(spec, CouplingTree):
        return spec.structure
    return _check_spec(spec, 0)


def _check_spec(spec, depth):
    if depth > MAX_LEAVES:
        raise StateError(f"a tree must nest at most {MAX_LEAVES} levels deep")
    if isinstance(spec, str):
        return _checked_name(spec)
    if isinstance(spec, (tuple, list)) and len(spec) == 3 and isinstance(spec[2], str):
        return (_check_spec(spec[0], depth + 1), _check_spec(spec[1], depth + 1), _checked_name(spec[2]))
    raise StateError(f"spec={spec!r} must be tree text or nested (left, right, name) tuples of names")


def _checked_name(name):
    if not re.fullmatch(r"[A-Za-z][A-Za-z0-9_]*", name, re.ASCII):
        raise StateError(f"name={name!r} must be an ASCII identifier (a letter, then letters, digits or _)")
    return name


def _names(node, out):
    if isinstance(node, str):
        out.append(node)
    else:
        _names(node[0], out)
        _names(node[1], out)
        out.append(node[2])
    return out


def _to_basic(node):
    if isinstance(node, str):
        return Str(node)
    return Tuple(_to_basic(node[0]), _to_basic(node[1]), Str(node[2]))


def _from_basic(node):
    if isinstance(node, Str):
        return node.name
    return (_from_basic(node[0]), _from_basic(node[1]), node[2].name)


def leaf_names(node):
    """The leaf names of a nested-tuple tree, left to right."""
    if isinstance(node, str):
        return (node,)
    return leaf_names(node[0]) + leaf_names(node[1])


class CouplingTree(NotationHooks, Basic):
    r"""A binary coupling scheme of labelled angular momenta, with the value of every momentum.

    Args: ``(structure, values)``: the structure nests ``Tuple(left, right,
    Str(name))`` with leaves ``Str(label)``; ``values`` is a ``Tuple`` of
    ``Tuple(Str(name), value)`` in the order of :attr:`names`.  Build trees
    with :func:`coupling_tree`.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> t = coupling_tree("((a b) x, c) J", a=1, b=1, c=1, x=2, J=3)
    >>> t.subtree_values()
    {('a', 'b'): 2, ('a', 'b', 'c'): 3}
    >>> t.with_values(x=1, J=2).value("x")
    1
    """

    __slots__ = ()
    _notation_key = "coupling_tree"

    def __new__(cls, structure, values):
        spec = _from_basic(structure) if isinstance(structure, Tuple) else _read_spec(structure)
        names = _names(spec, [])
        if len(set(names)) != len(names):
            repeated = sorted({n for n in names if names.count(n) > 1})
            raise StateError(f"names={repeated} must appear once each in a coupling tree")
        if len(leaf_names(spec)) > MAX_LEAVES:
            raise StateError(f"a coupling tree must couple at most {MAX_LEAVES} momenta")
        given = dict((k.name, v) for k, v in values) if isinstance(values, Tuple) else dict(values)
        unknown = sorted(set(given) - set(names))
        if unknown:
            raise StateError(f"values for {unknown} must name momenta of the tree {names}")
        checked = [(n, quantum_number(given[n], n, nonnegative=True) if n in given else Symbol(n))
                   for n in names]
        obj = Basic.__new__(cls, _to_basic(spec), Tuple(*[Tuple(Str(n), v) for n, v in checked]))
        obj._check_triangles()
        return obj

    # -- structure ------------------------------------------------------------------------

    @property
    def structure(self):
        """The tree as nested ``(left, right, name)`` tuples of ``str``."""
        return _from_basic(self.args[0])

    @property
    def names(self):
        """Every name, depth first (children before their parent, the total last)."""
        return tuple(k.name for k, _ in self.args[1])

    @property
    def values(self):
        """``{name: value}`` in the order of :attr:`names`."""
        return {k.name: v for k, v in self.args[1]}

    def value(self, name):
        """The value of one momentum."""
        try:
            return self.values[name]
        except KeyError:
            raise StateError(f"name={name!r} must be one of {list(self.names)}") from None

    @property
    def leaves(self):
        """The leaf labels, left to right."""
        return leaf_names(self.structure)

    @property
    def intermediates(self):
        """Names of the internal nodes below the root, depth first."""
        leaves = set(self.leaves)
        return tuple(n for n in self.names[:-1] if n not in leaves)

    @property
    def total_name(self):
        return self.structure[2]

    @property
    def total(self):
        """The value of the total momentum."""
        return self.value(self.total_name)

    def nodes(self):
        """``[(name, leaves below it, left child name, right child name)]`` for every internal node."""
        out = []

        def walk(node):
            if isinstance(node, str):
                return node
            left, right = walk(node[0]), walk(node[1])
            out.append((node[2], leaf_names(node), left, right))
            return node[2]

        walk(self.structure)
        return out

    def subtree_values(self):
        """``{leaves below a node: value}`` for every internal node (the scheme without names)."""
        values = self.values
        return {leaves: values[name] for name, leaves, _, _ in self.nodes()}

    def with_values(self, values=None, **more):
        """The same scheme with some values replaced."""
        merged = dict(self.values)
        merged.update(values or {})
        merged.update(more)
        return CouplingTree(self.args[0], merged)

    def is_numeric(self):
        """True when every value is a number."""
        return all(v.is_number for v in self.values.values())

    def _check_triangles(self):
        values = self.values
        for name, _, left, right in self.nodes():
            a, b, c = values[left], values[right], values[name]
            if all(x.is_number for x in (a, b, c)) and not triangle(a, b, c):
                raise QuantumNumberError(
                    f"{name}={c} must satisfy the triangle rule with {left}={a} and {right}={b} "
                    f"(|a-b| <= {name} <= a+b, a+b+{name} integer)")


def coupling_tree(spec, values=None, **more):
    r"""A :class:`CouplingTree` from bracket text or nested ``(left, right, name)`` tuples.

    Explanation
    ===========

    ``values`` (a mapping) and keyword arguments give momenta their values;
    unnamed ones stand for the symbol of their name.  See the module
    docstring for the notation.

    Examples
    ========

    >>> from amalgebra.coupling.trees import coupling_tree
    >>> ls = coupling_tree((("l1", "l2", "L"), ("s1", "s2", "S"), "J"), s1="1/2", s2="1/2")
    >>> ls, ls.value("s1"), ls.value("L")
    (((l1 l2) L, (s1 s2) S) J [s1=1/2, s2=1/2], 1/2, L)
    >>> coupling_tree("((a b) c d", a=1)
    Traceback (most recent call last):
    ...
    amalgebra.errors.StateError: tree text at column end must have ')'
    """
    merged = dict(values or {})
    merged.update(more)
    if isinstance(spec, CouplingTree):
        return spec.with_values(merged)
    return CouplingTree(spec, merged)


def chain_tree(labels, intermediates=None, total="J", values=None, **more):
    r"""The chain :math:`(((j_1 j_2) J_{12}\, j_3) J_{123} \dots) J`: couple in the order of ``labels``.

    ``intermediates`` names the n - 2 intermediate momenta (default
    ``J12``, ``J123``, ... from the leaf positions).

    Examples
    ========

    >>> from amalgebra.coupling.trees import chain_tree
    >>> chain_tree(["a", "b", "c"])
    ((a b) J12, c) J
    """
    labels = list(labels)
    if len(labels) < 2:
        raise StateError(f"labels={labels} must hold at least two momenta to couple")
    if intermediates is None:
        intermediates = ["J" + "".join(str(i + 1) for i in range(k + 1)) for k in range(1, len(labels) - 1)]
    intermediates = list(intermediates)
    if len(intermediates) != len(labels) - 2:
        raise StateError(f"intermediates={intermediates} must hold {len(labels) - 2} names")
    node = labels[0]
    for label, name in zip(labels[1:], [*intermediates, total]):
        node = (node, label, name)
    return coupling_tree(node, values, **more)
