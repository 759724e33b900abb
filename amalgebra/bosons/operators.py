r"""Independent boson modes as noncommutative SymPy expressions.

Explanation
===========

A :class:`BosonMode` (``BosonMode("a")``) names one harmonic-oscillator
mode.  Its operators ``.annihilate`` (:math:`a`), ``.create``
(:math:`a^\dagger`) and ``.number`` (:math:`\hat N_a = a^\dagger a`) are
:class:`BosonOperator` atoms: noncommutative ``Expr`` objects that add,
multiply and take nonnegative integer powers like any SymPy expression.
Nothing is reordered at construction.

Conventions: :math:`[a, a^\dagger] = 1`, operators of different modes
commute, :math:`\hat N_a` is Hermitian and ``adjoint`` swaps :math:`a` and
:math:`a^\dagger`.  On Fock kets
:math:`a|n\rangle = \sqrt{n}\,|n-1\rangle`,
:math:`a^\dagger|n\rangle = \sqrt{n+1}\,|n+1\rangle`
(see :mod:`amalgebra.bosons.fock`).

Normal ordering uses the same shift-form kernel as angular momenta
(:func:`amalgebra.algebra.canonical`): importing this module registers
:data:`BOSON` with :func:`amalgebra.algebra.modes.register_mode`.  The
canonical form of one mode is

.. math::

    \sum_{d \ge 0} a^{\dagger d} f_d(\hat N) + \sum_{d > 0} a^{d} g_d(\hat N),
    \qquad f(\hat N)\, a^\dagger = a^\dagger f(\hat N + 1),

with :math:`a^{\dagger k} a^k = \hat N(\hat N - 1)\cdots(\hat N - k + 1)` and
:math:`a^k a^{\dagger k} = (\hat N + 1)\cdots(\hat N + k)`.

Notation: ``str`` prints the Python spelling (``a.create``), LaTeX prints
:math:`a`, :math:`{a^{\dagger}}`, :math:`\hat{N}_{a}` (the dagger is
braced so that powers stay valid LaTeX), pretty printing uses ``a``, ``a†``,
``N_a``.

Examples
========

>>> from sympy import adjoint, latex
>>> from amalgebra.algebra import canonical, commutator
>>> from amalgebra.bosons import BosonMode
>>> a = BosonMode("a")
>>> commutator(a.annihilate, a.create)          # [a, a^dagger] = 1
1
>>> canonical(a.annihilate*a.create)            # a a^dagger = N + 1
1 + a.number
>>> canonical(a.annihilate**2*a.create**2) == canonical((a.number + 1)*(a.number + 2))
True
>>> adjoint(a.create*a.number) == a.number*a.annihilate
True
>>> latex(a.create**2)
'{a^{\\dagger}}^{2}'

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics* (1994), section 2.3.
"""

from sympy import Basic, Expr

from ..algebra.modes import register_mode
from ..algebra.operators import LabelledFamily, LabelledGenerator, _family_pair

__all__ = ["BosonMode", "BosonOperator", "BosonKernelMode", "BOSON", "KINDS", "boson_modes"]

#: the operator kinds of one mode
KINDS = ("annihilate", "create", "number")
_ADJOINT = {"annihilate": "create", "create": "annihilate"}


class BosonMode(LabelledFamily, Basic):
    r"""A named boson mode; a container for :math:`a`, :math:`a^\dagger`, :math:`\hat N`.

    Explanation
    ===========

    ``BosonMode("a")`` is not itself an operator: use ``.annihilate``
    (:math:`a`), ``.create`` (:math:`a^\dagger`) and ``.number``
    (:math:`\hat N_a = a^\dagger a`).  Modes with the same label are equal;
    different labels commute.  A label must not also name an angular momentum
    in the same expression.

    Examples
    ========

    >>> from amalgebra.algebra import canonical
    >>> from amalgebra.bosons import BosonMode
    >>> b = BosonMode("b")
    >>> b == BosonMode("b"), b.label
    (True, 'b')
    >>> canonical(b.create*b.annihilate) == b.number      # N = b^dagger b
    True

    Parameters
    ==========

    label : str
        An identifier-like name (``"a"``, ``"b"``, ``"c1"``, ...).

    See Also
    ========

    BosonOperator, amalgebra.bosons.fock.fock_ket
    """

    __slots__ = ()
    _component_example = "{self.label}.create"
    _notation_key = "boson_mode"

    def operator(self, kind):
        """The operator called ``kind`` (one of :data:`KINDS`)."""
        return self.generator(kind)

    annihilate = property(lambda self: self.operator("annihilate"), doc="The annihilation operator a.")
    create = property(lambda self: self.operator("create"), doc="The creation operator a^dagger.")
    number = property(lambda self: self.operator("number"), doc="The number operator N = a^dagger a.")


class BosonOperator(LabelledGenerator, Expr):
    r"""One operator of a boson mode: a noncommutative atom.

    Explanation
    ===========

    ``args`` are ``(Str(label), Str(kind))`` with kind one of ``annihilate``,
    ``create``, ``number``.  ``number`` is Hermitian; ``adjoint`` swaps
    ``annihilate`` and ``create``.  Negative or non-integer numeric powers
    raise :class:`~amalgebra.errors.OperatorError`.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.bosons import BosonOperator
    >>> ad = BosonOperator("a", "create")
    >>> ad.func(*ad.args) == ad, adjoint(ad), ad.is_hermitian
    (True, a.annihilate, False)
    >>> BosonOperator("b", "number").is_hermitian
    True

    Parameters
    ==========

    label : str
    kind : str
        One of ``"annihilate", "create", "number"``.

    See Also
    ========

    BosonMode, amalgebra.algebra.operators.LabelledGenerator
    """

    __slots__ = ()
    is_commutative = False

    names = KINDS
    name_field = "kind"
    hermitian = frozenset({"number"})
    partners = _ADJOINT
    _notation_key = "boson_operator"

    def __new__(cls, label, kind):
        return LabelledGenerator.__new__(cls, label, kind)

    @property
    def kind(self):
        """``"annihilate"``, ``"create"`` or ``"number"``."""
        return self.args[1].name

    @property
    def mode(self):
        """The :class:`BosonMode` this operator belongs to."""
        return BosonMode(self.args[0])


_family_pair(BosonMode, BosonOperator)


def boson_modes(*labels):
    """A tuple of :class:`BosonMode` objects, one per label.

    >>> a, b = boson_modes("a", "b")
    >>> b.create
    b.create
    """
    return tuple(BosonMode(label) for label in labels)


class BosonKernelMode:
    """The kernel mode of one boson: one variable ``N`` that ladders shift.

    Implements the mode protocol of :mod:`amalgebra.algebra.modes`:
    :math:`R^{(d)} = a^{\\dagger d}` for ``d > 0`` and :math:`a^{|d|}` for
    ``d < 0``, :math:`a^{\\dagger k} a^k = \\prod_{i<k} (N - i)`,
    :math:`a^k a^{\\dagger k} = \\prod_{i=1}^{k} (N + i)`.

    >>> from sympy import symbols, expand
    >>> n = symbols("n")
    >>> expand(BOSON.raise_lower(2, (n,)))     # a^dagger^2 a^2 = N(N - 1)
    n**2 - n
    >>> expand(BOSON.lower_raise(2, (n,)))     # a^2 a^dagger^2 = (N + 1)(N + 2)
    n**2 + 3*n + 2
    """

    kind = "boson"
    variables = ("N",)
    shift_index = 0

    def raise_lower(self, k, v):
        (n,) = v
        result = n.ring.one if hasattr(n, "ring") else 1
        for i in range(k):
            result = result * (n - i)
        return result

    def lower_raise(self, k, v):
        (n,) = v
        result = n.ring.one if hasattr(n, "ring") else 1
        for i in range(1, k + 1):
            result = result * (n + i)
        return result

    def atom(self, component, v, domain):
        (n,) = v
        one = n.ring.one
        if component == "create":
            return [(1, one)], 1
        if component == "annihilate":
            return [(-1, one)], 1
        return [(0, n)], 1

    def direct(self, component):
        return _DIRECT[component]

    def atom_constants(self, component):
        return ()

    def ladder_factor(self, label, d):
        if d > 0:
            return BosonOperator(label, "create") ** d
        return BosonOperator(label, "annihilate") ** (-d)

    def variable_factor(self, label, index, power):
        return BosonOperator(label, "number") ** power

    def matches(self, expr):
        if isinstance(expr, BosonOperator):
            return expr.label, expr.kind
        return None


_DIRECT = {"create": ("shift", 1), "annihilate": ("shift", -1), "number": ("var", 0)}

#: the registered kernel mode of every boson label
BOSON = register_mode(BosonKernelMode())
