r"""Ordered bases of explicit matrices: kets with their quantum numbers, in the package's one order.

Explanation
===========

Every explicit matrix of the package (:func:`amalgebra.matrices.explicit.to_matrix`,
:func:`amalgebra.states.hamiltonian.hamiltonian_matrix`) is written in a
:class:`Basis`.  The product basis of a space ``{label: j or [j values]}`` has
**one order**:

* one label, one j: ``m = j, j-1, ..., -j`` (row 0 is ``m = j``);
* one label, a list of j values (a direct sum of multiplets): the j values in
  the order given, ``m`` descending within each;
* several labels: the Kronecker product over the labels in the package's
  label order (:func:`amalgebra._validation.label_key`: alphabetical, with
  ``S2`` before ``S10``), the first label outermost (slowest varying), as
  ``numpy.kron(A_first, A_second)``;
* boson modes (a truncated Fock space per mode, ``{"a": 3}`` for an operator
  that uses mode ``a``, meaning :math:`n_a = 0, \dots, 3`, or
  ``{"a": range(2, 6)}``): after all angular-momentum labels, the modes in
  label order, the first mode outermost, ``n`` ascending within each.  Each
  state is then a product ket with one Fock factor.

A coupled basis (:func:`~amalgebra.states.coupled.coupled_basis`) or a list of
states given by the user keeps its own order.  :meth:`Basis.index` finds a
ket, :meth:`Basis.select` picks states by quantum numbers (``M=0``, or the
``j``/``m`` of a label), :meth:`Basis.quantum_numbers` reports them.

Examples
========

>>> from amalgebra.states.basis import product_basis
>>> b = product_basis({"S": "1/2", "L": [0, 1]})
>>> len(b), b[0], b[1]
(8, |0, 0>_L|1/2, 1/2>_S, |0, 0>_L|1/2, -1/2>_S)
>>> b.select(M=0)                       # all states with M = m_L + m_S = 0: none (half-integer M)
()
>>> b.select(L=(1, 0))                  # j_L = 1, m_L = 0
(4, 5)
>>> b.index(b[5])
5
"""

from itertools import product

from sympy import S
from sympy.printing.defaults import Printable

from .. import notation
from .._validation import label_key
from ..errors import StateError
from ..qnumbers import half_integer
from .kets import Ket, _factor_map, _mode_map, _product_state, components

__all__ = ["Basis", "product_basis", "read_space", "read_spaces", "boson_labels"]

_LISTS = (list, tuple)


def read_space(j, name="j", error=StateError):
    """``{label: tuple of Rational j}`` in the package's label order, from ``{label: j or [j values]}``.

    The one reader of a space specification, used by
    :func:`~amalgebra.matrices.explicit.to_matrix`,
    :func:`~amalgebra.states.hamiltonian.hamiltonian_matrix` and
    :func:`product_basis`: labels follow the one label rule
    (:func:`amalgebra._validation.check_label`), a value is one j or a non-empty
    list (``list``, ``tuple`` or SymPy ``Tuple``) of distinct j values, each read by
    :mod:`amalgebra.qnumbers`.  A malformed dict or label raises ``error`` (as
    :func:`~amalgebra._validation.check_label`, each caller keeps its error
    class: ``OperatorError`` for ``to_matrix``, ``StateError`` for bases); a bad
    j value raises :class:`~amalgebra.errors.QuantumNumberError` (or
    ``NotNumericError``) everywhere.

    >>> read_space({"S": "1/2", "L": [0, 1]})
    {'L': (0, 1), 'S': (1/2,)}
    >>> read_space({"_x": 1})
    Traceback (most recent call last):
    ...
    amalgebra.errors.StateError: j key='_x' must be an identifier that starts with an ASCII letter, such as 'J', 'L1' or 'S_core'
    """
    from sympy import Tuple

    from .._validation import check_label
    from ..errors import QuantumNumberError

    if not isinstance(j, dict) or not j:
        raise error(f"{name}={j!r} must be a non-empty dict label -> j value or list of j values, "
                    f"e.g. {{'J': '3/2'}}")
    out = {}
    for label in sorted(j, key=lambda lab: label_key(check_label(lab, f"{name} key", error))):
        value = j[label]
        where = f"{name}[{str(label)!r}]"
        if isinstance(value, _LISTS + (Tuple,)):
            if len(value) == 0:
                raise QuantumNumberError(f"{where}={value!r} must list at least one j value")
            js = tuple(half_integer(v, where, nonnegative=True) for v in value)
            if len(set(js)) != len(js):
                raise QuantumNumberError(f"{where}={list(js)} must not repeat a j value: one multiplet "
                                         f"per j (reduced elements are keyed by (j', j))")
        else:
            js = (half_integer(value, where, nonnegative=True),)
        out[str(label)] = js
    return out


def boson_labels(expr):
    """The labels of the boson modes that an operator expression acts on (a sorted tuple).

    >>> from amalgebra.bosons import BosonMode
    >>> from amalgebra.algebra import AngularMomentum
    >>> boson_labels(AngularMomentum("J").plus * BosonMode("b").annihilate + BosonMode("a").number)
    ('a', 'b')
    """
    from ..bosons.operators import BosonOperator

    if not hasattr(expr, "atoms"):
        return ()
    return tuple(sorted({atom.args[0].name for atom in expr.atoms(BosonOperator)}, key=label_key))


def read_spaces(j, modes=(), name="j", error=StateError):
    """``(spaces, occupations)``: :func:`read_space` for the angular momenta, and the truncated Fock spaces.

    A label in ``modes`` (the boson modes of the operator, :func:`boson_labels`)
    takes an occupation cutoff ``n_max`` (occupations ``0, ..., n_max``) or a
    ``range`` of occupations; a ``range`` value always means a mode (so a mode
    the operator does not touch can be carried along).  ``occupations`` maps
    each mode, in label order, to its tuple of occupations (ascending).

    >>> read_spaces({"J": "1/2", "a": 2}, modes=("a",))
    ({'J': (1/2,)}, {'a': (0, 1, 2)})
    >>> read_spaces({"J": 1, "b": range(1, 3)})
    ({'J': (1,)}, {'b': (1, 2)})
    """
    from ..bosons.fock import occupation
    from ..errors import QuantumNumberError

    if not isinstance(j, dict) or not j:
        raise error(f"{name}={j!r} must be a non-empty dict label -> j value or list of j values, "
                    f"e.g. {{'J': '3/2'}}")
    am = {label: value for label, value in j.items() if str(label) not in modes and not isinstance(value, range)}
    occupations = {}
    for label in sorted((lab for lab in j if lab not in am), key=lambda lab: label_key(str(lab))):
        value, where = j[label], f"{name}[{str(label)!r}]"
        if isinstance(value, range):
            if len(value) == 0 or value.step < 0 or value.start < 0:
                raise QuantumNumberError(f"{where}={value!r} must be a non-empty ascending range of "
                                         f"occupations >= 0")
            ns = tuple(S(n) for n in value)
        elif isinstance(value, _LISTS):
            raise QuantumNumberError(f"{where}={value!r} must be an occupation cutoff n_max (occupations "
                                     f"0..n_max) or a range of occupations: {str(label)!r} is a boson mode")
        else:
            top = occupation(value, where)
            if not top.is_Integer:
                raise QuantumNumberError(f"{where}={value} must be a numeric occupation cutoff")
            ns = tuple(S(n) for n in range(int(top) + 1))
        occupations[str(label)] = ns
    spaces = read_space(am, name, error) if am else {}
    return spaces, occupations


def _multiplets(js):
    return [(jv, jv - i) for jv in js for i in range(int(2 * jv) + 1)]


class Basis(Printable):
    """An ordered basis: ``states`` (kets, product kets, coupled kets or combinations) and their labels.

    Not a SymPy object (it holds a list); immutable.  ``len``, iteration and
    indexing give the states.  ``str`` prints one state per line with its
    index.

    Examples
    ========

    >>> from amalgebra.states.basis import product_basis
    >>> b = product_basis({"J": 1})
    >>> print(b)
    0: |1, 1>_J
    1: |1, 0>_J
    2: |1, -1>_J
    >>> b.quantum_numbers(2)
    {'M': -1, 'J': (1, -1)}

    :meth:`index` inverts indexing:

    >>> all(b.index(state) == i for i, state in enumerate(b))
    True
    """

    __slots__ = ("labels", "modes", "states", "_index", "_values")

    def __init__(self, states, labels, values=None, modes=()):
        self.states = tuple(states)
        self.labels = tuple(labels)
        self.modes = tuple(modes)
        self._values = None if values is None else tuple(values)
        self._index = {s: i for i, s in enumerate(self.states)}

    @property
    def values(self):
        """Per state, the tuple of ``(j, m)`` per label then the occupation per mode (product bases), else ``None``."""
        return self._values

    def __len__(self):
        return len(self.states)

    def __iter__(self):
        return iter(self.states)

    def __getitem__(self, i):
        return self.states[i]

    def __eq__(self, other):
        return (isinstance(other, Basis) and self.states == other.states and self.labels == other.labels
                and self.modes == other.modes)

    def __hash__(self):
        return hash((self.states, self.labels, self.modes))

    def index(self, state):
        """The position of ``state`` (a ket of this basis); StateError when it is not one.

        >>> from amalgebra.states.kets import ket
        >>> product_basis({"J": 1}).index(ket(1, -1))
        2
        """
        i = self._index.get(state)
        if i is None:
            raise StateError(f"state={state} must be a state of this basis (labels {list(self.labels)})")
        return i

    def quantum_numbers(self, i):
        """``{"M": total m, label: (j, m), ...}`` of state ``i``, plus ``"F"`` (total J) for a coupled ket.

        With boson modes also ``"N"`` (the total occupation) and ``mode: n``.
        Keys that the state does not have definitely (a combination of
        different m) are left out.
        """
        state = self.states[i]
        out = {}
        if self._values is not None:
            values = self._values[i]
            pairs, ns = values[:len(self.labels)], values[len(self.labels):]
            out["M"] = sum((m for _, m in pairs), S.Zero)
            out.update({label: pair for label, pair in zip(self.labels, pairs)})
            if self.modes:
                out["N"] = sum(ns, S.Zero)
                out.update(zip(self.modes, ns))
            return out
        if hasattr(state, "J") and hasattr(state, "M") and hasattr(state, "intermediates"):
            out["M"], out["F"] = state.M, state.J
            return out
        comps = components(state)
        ms = {sum((m for _, m in _factor_map(b).values()), S.Zero) for b in comps}
        if len(ms) == 1:
            out["M"] = ms.pop()
        if self.modes:
            ns = {sum(_mode_map(b).values(), S.Zero) for b in comps}
            if len(ns) == 1:
                out["N"] = ns.pop()
        return out

    def select(self, **wanted):
        """Indices of the states whose quantum numbers match ``wanted`` (a tuple, basis order).

        Keys: ``M`` (total projection), ``F`` (total angular momentum of a
        coupled ket), ``N`` (total boson occupation), a label: ``L=(j, m)`` or
        ``L=j`` (any m), or a mode: ``a=n``.

        >>> product_basis({"I": "1/2", "J": "1/2"}).select(M=0)
        (1, 2)
        """
        out = []
        for i in range(len(self.states)):
            qn = self.quantum_numbers(i)
            ok = True
            for key, value in wanted.items():
                have = qn.get(key)
                if have is None:
                    ok = False
                    break
                if key in self.labels and not isinstance(value, tuple):
                    ok = have[0] == S(value)
                elif isinstance(value, tuple):
                    ok = have == tuple(S(v) for v in value)
                else:
                    ok = have == S(value)
                if not ok:
                    break
            if ok:
                out.append(i)
        return tuple(out)

    def __str__(self):
        return "\n".join(f"{i}: {s}" for i, s in enumerate(self.states))

    def __repr__(self):
        modes = f", modes={list(self.modes)}" if self.modes else ""
        return f"Basis({len(self.states)} states, labels={list(self.labels)}{modes})"

    def _sympystr(self, printer):
        return repr(self)

    def _latex(self, printer, exp=None):
        return notation.basis_latex(printer, self, exp)


def product_basis(j, modes=()):
    """The product :class:`Basis` of the space ``{label: j or [j values]}`` in the one order (module docstring).

    ``modes`` names the labels that are boson modes (their values are
    occupation cutoffs, see :func:`read_spaces`; a ``range`` value is a mode
    anyway).

    Examples
    ========

    >>> [str(s) for s in product_basis({"J": [0, "1/2"]})]
    ['|0, 0>_J', '|1/2, 1/2>_J', '|1/2, -1/2>_J']

    The dimension is the product of the :math:`2j+1` (here :math:`4 \\times 3`), and
    :math:`M = 5/2` is reached only by the first state:

    >>> from sympy import Rational
    >>> b = product_basis({"I": "3/2", "J": 1})
    >>> len(b) == (2 * 3/2 + 1) * (2 * 1 + 1), b.select(M=Rational(5, 2))
    (True, (0,))

    A spin-1/2 and one boson mode cut at two quanta (the modes come last, ``n`` ascending):

    >>> [str(s) for s in product_basis({"S": "1/2", "a": 1}, modes=("a",))]
    ['|1/2, 1/2>_S|0>_(a)', '|1/2, 1/2>_S|1>_(a)', '|1/2, -1/2>_S|0>_(a)', '|1/2, -1/2>_S|1>_(a)']
    """
    spaces, occupations = read_spaces(j, modes)
    labels, bosons = list(spaces), list(occupations)
    per_label = [_multiplets(spaces[label]) for label in labels] + [occupations[mode] for mode in bosons]
    values = list(product(*per_label))
    fock = None
    if bosons:
        from ..bosons.fock import FockKet

        fock = FockKet._unchecked
    states = [_product_state([Ket._unchecked(jv, m, label) for label, (jv, m) in zip(labels, vals)],
                             fock(bosons, vals[len(labels):]) if fock else None) for vals in values]
    return Basis(states, labels, values, bosons)
