r"""Angular-momentum operators as noncommutative SymPy expressions.

An :class:`AngularMomentum` is a named angular momentum (``"J"``, ``"L"``,
``"S"``, ``"I"``, ...).  Its components ``.x``, ``.y``, ``.z``, ``.plus``,
``.minus`` and ``.squared`` are :class:`AngularMomentumComponent` objects:
noncommutative ``Expr`` atoms that add, multiply, take powers and symbolic
coefficients like any SymPy expression.  ``Mul`` keeps their order; nothing is
reordered at construction.  The algebra itself (commutation relations, normal
ordering) lives in :func:`amalgebra.algebra.canonical`.

Explanation
===========

Conventions (fixed for the whole library): :math:`\hbar = 1`,
:math:`[J_x, J_y] = i J_z` and cyclic, :math:`J_\pm = J_x \pm i J_y`,
:math:`J^2 = J_x^2 + J_y^2 + J_z^2`, and the Condon-Shortley phase
:math:`J_\pm |j m\rangle = \sqrt{(j \mp m)(j \pm m + 1)}\,|j, m \pm 1\rangle`.
Operators of different labels commute.

``J_x``, ``J_y``, ``J_z`` and ``J^2`` are Hermitian; ``adjoint(J_+) = J_-``.

Notation: ``str`` prints the Python spelling (``J.x``, ``J.plus``,
``J.squared``), LaTeX prints :math:`J_{x}, J_{+}, J^{2}` (superscripts are
protected so that powers stay valid LaTeX), pretty printing uses subscripts.

Examples
========

>>> from sympy import adjoint, latex, Symbol
>>> from amalgebra.algebra import AngularMomentum, canonical
>>> J = AngularMomentum("J")
>>> a = Symbol("a")
>>> expr = a*J.plus*J.minus + J.z**2
>>> print(expr)
a*J.plus*J.minus + J.z**2
>>> latex(J.squared**2)
'\\left(J^{2}\\right)^{2}'
>>> adjoint(J.plus*J.z) == J.z*J.minus
True
>>> canonical(J.x**2 + J.y**2 + J.z**2) == J.squared   # J^2 = Jx^2 + Jy^2 + Jz^2
True

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics*, section 3.5.
"""

import numbers

from sympy import Basic, Expr, I, S
from sympy.core.symbol import Str
from sympy.matrices import MatrixBase
from sympy.matrices.expressions import MatrixExpr

from .._validation import check_label
from ..notation import NotationHooks
from ..errors import OperatorError

__all__ = ["AngularMomentum", "AngularMomentumComponent", "LabelledFamily", "LabelledGenerator", "dot", "COMPONENTS"]

#: component names; notation in amalgebra.notation
COMPONENTS = ("x", "y", "z", "plus", "minus", "squared")
_ADJOINT = {"plus": "minus", "minus": "plus"}


def _check_label(label, name="label"):
    # the package's one label rule (amalgebra._validation.check_label)
    return check_label(label, name, OperatorError)


def _is_addable(other):
    """True when ``other`` can sensibly meet an operator in ``+``, ``-`` or ``*``."""
    if isinstance(other, bool):
        return False
    if isinstance(other, (MatrixBase, MatrixExpr)):
        return False
    if isinstance(other, Basic):
        return isinstance(other, Expr)
    return isinstance(other, numbers.Number)


class _OperatorArithmetic:
    """Mixin: refuse arithmetic with objects that are not expressions, loudly.

    SymPy would answer ``NotImplemented`` and Python would raise a bare
    ``TypeError`` (or a Matrix would try to broadcast); an operator raises
    :class:`~amalgebra.errors.OperatorError` naming both sides instead.
    """

    __slots__ = ()

    def _refuse(self, other, op):
        if not _is_addable(other):
            raise OperatorError(f"other={other!r} must be a SymPy expression or a number to "
                                f"{op} the operator {self}, got {type(other).__name__}")

    def __add__(self, other):
        self._refuse(other, "add to")
        return super().__add__(other)

    def __radd__(self, other):
        self._refuse(other, "add to")
        return super().__radd__(other)

    def __sub__(self, other):
        self._refuse(other, "subtract from")
        return super().__sub__(other)

    def __rsub__(self, other):
        self._refuse(other, "subtract from")
        return super().__rsub__(other)

    def __mul__(self, other):
        self._refuse(other, "multiply")
        return super().__mul__(other)

    def __rmul__(self, other):
        self._refuse(other, "multiply")
        return super().__rmul__(other)

    def __truediv__(self, other):
        self._refuse(other, "divide")
        if isinstance(other, Basic) and other.is_commutative is False:
            raise OperatorError(f"other={other} must be commutative: operators cannot be inverted")
        return super().__truediv__(other)

    def __rtruediv__(self, other):
        raise OperatorError(f"self={self} must not be a divisor: operators cannot be inverted")

    def __pow__(self, other):
        if isinstance(other, bool) or not _is_addable(other):
            raise OperatorError(f"exponent={other!r} must be a nonnegative integer")
        if isinstance(other, numbers.Number) or (isinstance(other, Expr) and other.is_number):
            value = S(other)
            if value.is_Integer is not True or value.is_negative:
                raise OperatorError(f"exponent={other!r} must be a nonnegative integer: "
                                    f"operators have no inverses or roots here")
        return super().__pow__(other)

    def __rpow__(self, other):
        raise OperatorError(f"exponent={self} must not be an operator")


class _FamilyNotOperator:
    """Mixin of operator families: ``adjoint(J)`` names the problem instead of an AttributeError.

    A family (``AngularMomentum("J")``, a spherical tensor, a vector operator, a
    boson mode) is a container of operators, not an operator, so SymPy's
    ``adjoint``, ``conjugate`` and ``transpose`` of it raise
    :class:`~amalgebra.errors.OperatorError` pointing to the components.

    >>> from sympy import adjoint
    >>> from amalgebra.algebra import AngularMomentum
    >>> adjoint(AngularMomentum("J"))
    Traceback (most recent call last):
    ...
    amalgebra.errors.OperatorError: adjoint of AngularMomentum('J'): a family of operators, not an operator; take it of a component such as J.plus
    """

    __slots__ = ()
    #: a component to name in the message (``str.format`` with ``self``)
    _component_example = "{self.label}.plus"

    def _refuse(self, what):
        example = self._component_example.format(self=self)
        raise OperatorError(f"{what} of {self!r}: a family of operators, not an operator; take it of a "
                            f"component such as {example}")

    def _eval_adjoint(self):
        self._refuse("adjoint")

    def _eval_conjugate(self):
        self._refuse("conjugate")

    def _eval_transpose(self):
        self._refuse("transpose")


class LabelledFamily(_FamilyNotOperator, NotationHooks):
    """Base of the named containers of generators (an angular momentum, a boson mode).

    Explanation
    ===========

    A member is listed before ``Basic`` (``class Family(LabelledFamily,
    Basic)``); its args are ``(Str(label),)``.  The base validates the label,
    exposes it and prints once; the member supplies ``_notation_key``, and
    ``_family_pair(family, generator_class)`` records its
    :class:`LabelledGenerator` class once both exist (in a table rather than
    a class attribute, so that doctest does not collect that class's examples
    under a second name); :meth:`generator` builds it.

    Examples
    ========

    >>> from amalgebra.algebra.operators import AngularMomentum, LabelledFamily
    >>> J = AngularMomentum("J")
    >>> isinstance(J, LabelledFamily), J.generator("z") == J.z
    (True, True)
    """

    __slots__ = ()

    def __new__(cls, label):
        return Basic.__new__(cls, Str(_check_label(label)))

    @property
    def label(self):
        """The label as a Python ``str``."""
        return self.args[0].name

    def generator(self, name):
        """The generator of this family called ``name``."""
        return _GENERATORS[type(self)](self.args[0], name)


_GENERATORS = {}


def _family_pair(family, generator_class):
    """Record ``generator_class`` as the generators of the :class:`LabelledFamily` ``family``."""
    _GENERATORS[family] = generator_class


class AngularMomentum(LabelledFamily, Basic):
    """A named angular momentum; a container for its components.

    Explanation
    ===========

    ``AngularMomentum("J")`` is not itself an operator: use its components
    ``.x``, ``.y``, ``.z``, ``.plus`` (:math:`J_+ = J_x + i J_y`), ``.minus``
    (:math:`J_- = J_x - i J_y`) and ``.squared`` (:math:`J^2`).  Two angular
    momenta with the same label are equal; different labels commute.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> J == AngularMomentum("J"), J.label
    (True, 'J')
    >>> J.vector
    (J.x, J.y, J.z)

    Parameters
    ==========

    label : str
        An identifier-like name (``"J"``, ``"L"``, ``"S1"``, ...).

    See Also
    ========

    AngularMomentumComponent, dot, amalgebra.algebra.canonical
    """

    __slots__ = ()
    _notation_key = "angular_momentum"

    def component(self, name):
        """The component called ``name`` (one of :data:`COMPONENTS`)."""
        return self.generator(name)

    x = property(lambda self: self.component("x"), doc="The Cartesian component J_x.")
    y = property(lambda self: self.component("y"), doc="The Cartesian component J_y.")
    z = property(lambda self: self.component("z"), doc="The Cartesian component J_z.")
    plus = property(lambda self: self.component("plus"), doc="The raising operator ``J_+ = J_x + i J_y``.")
    minus = property(lambda self: self.component("minus"), doc="The lowering operator ``J_- = J_x - i J_y``.")
    squared = property(lambda self: self.component("squared"), doc="The Casimir J^2.")

    @property
    def vector(self):
        """The Cartesian components ``(J.x, J.y, J.z)``."""
        return (self.x, self.y, self.z)

    @property
    def spherical(self):
        """Spherical components ``{+1: -J_+/sqrt(2), 0: J_z, -1: J_-/sqrt(2)}``.

        Convention: :math:`V_{+1} = -(V_x + i V_y)/\\sqrt{2}`, :math:`V_0 = V_z`,
        :math:`V_{-1} = (V_x - i V_y)/\\sqrt{2}`.
        """
        root = S(2) ** S.Half
        return {1: -self.plus / root, 0: self.z, -1: self.minus / root}


class LabelledGenerator(NotationHooks, _OperatorArithmetic):
    r"""Base of the operator families: a noncommutative atom ``(Str(label), Str(name))``.

    Explanation
    ===========

    One family of generators (the components of an angular momentum, the
    operators of a boson mode, ...) is one subclass, listed before ``Expr``
    (``class Family(LabelledGenerator, Expr)``; the base is not itself a
    ``Basic`` so that it never appears as an atom type).  The base class
    builds, validates, takes adjoints and prints once; a member only declares
    metadata as class attributes, and ``is_commutative = False`` in its own
    body so that SymPy's assumption system records it:

    ``names``
        the allowed second arguments, in display order;
    ``name_field``
        how the second argument is called in error messages (``"component"``);
    ``hermitian``
        the names of the self-adjoint generators;
    ``partners``
        the adjoint map of the others, an involution (``{"plus": "minus", ...}``);
    ``_notation_key``
        the stem of the printing hooks in :mod:`amalgebra.notation`
        (``"component"`` reaches ``component_str``, ``component_latex``,
        ``component_pretty``).

    The metadata is checked when the subclass is defined: every name is either
    Hermitian or has a partner, never both, and the partner of a partner is the
    name itself, so that ``adjoint(adjoint(op)) == op`` always holds.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.algebra.operators import AngularMomentumComponent, LabelledGenerator
    >>> issubclass(AngularMomentumComponent, LabelledGenerator)
    True
    >>> Jm = AngularMomentumComponent("J", "minus")
    >>> adjoint(adjoint(Jm)) == Jm, Jm.is_hermitian        # (A^dagger)^dagger = A
    (True, False)

    Parameters
    ==========

    label : str
        An identifier-like name (``"J"``, ``"a"``, ...).
    name : str
        One of the class's :attr:`names`.

    See Also
    ========

    AngularMomentumComponent, amalgebra.bosons.operators.BosonOperator
    """

    __slots__ = ()

    names = ()
    name_field = "name"
    hermitian = frozenset()
    partners = {}

    def __init_subclass__(cls, **kwargs):
        super().__init_subclass__(**kwargs)
        names = tuple(cls.names)
        hermitian = frozenset(cls.hermitian)
        partners = dict(cls.partners)
        where = f"{cls.__name__}"
        if not names or len(set(names)) != len(names):
            raise OperatorError(f"{where}.names={names!r} must list distinct names")
        if not hermitian.isdisjoint(partners):
            raise OperatorError(f"{where}.hermitian={sorted(hermitian)} must not have adjoint partners")
        if hermitian | set(partners) != set(names):
            raise OperatorError(f"{where}.names={names!r} must each be Hermitian or have an adjoint partner")
        for name, partner in partners.items():
            if partners.get(partner) != name:
                raise OperatorError(f"{where}.partners={partners!r} must be an involution: "
                                    f"{name!r} -> {partner!r} has no way back")
        if not isinstance(cls._notation_key, str):
            raise OperatorError(f"{where}._notation_key={cls._notation_key!r} must name the printing hooks")
        cls.names, cls.hermitian, cls.partners = names, hermitian, partners

    def __new__(cls, label, name):
        label = _check_label(label)
        if isinstance(name, Str):
            name = name.name
        if name not in cls.names:
            raise OperatorError(f"{cls.name_field}={name!r} must be one of {', '.join(cls.names)}")
        return Expr.__new__(cls, Str(label), Str(name))

    @property
    def label(self):
        """The label, a ``str``."""
        return self.args[0].name

    def _eval_is_hermitian(self):
        return self.args[1].name in self.hermitian

    def _eval_adjoint(self):
        partner = self.partners.get(self.args[1].name)
        if partner is None:
            return self
        return self.func(self.args[0], partner)

    def _eval_conjugate(self):
        return None  # basis dependent: left unevaluated on purpose

    def _eval_transpose(self):
        return None


class AngularMomentumComponent(LabelledGenerator, Expr):
    """One component of a named angular momentum: a noncommutative atom.

    Explanation
    ===========

    ``args`` are ``(Str(label), Str(component))`` with component one of
    ``x, y, z, plus, minus, squared``.  The Hermitian components (``x``, ``y``,
    ``z``, ``squared``) report ``is_hermitian``; ``adjoint`` swaps ``plus`` and
    ``minus``.  Negative or non-integer numeric powers raise
    :class:`~amalgebra.errors.OperatorError`.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.algebra import AngularMomentum, AngularMomentumComponent
    >>> Jp = AngularMomentum("J").plus
    >>> Jp.func(*Jp.args) == Jp, adjoint(Jp)
    (True, J.minus)
    >>> AngularMomentumComponent("L", "z")
    L.z

    Parameters
    ==========

    label : str
    component : str
        One of ``"x", "y", "z", "plus", "minus", "squared"``.

    See Also
    ========

    LabelledGenerator
    """

    __slots__ = ()
    is_commutative = False

    names = COMPONENTS
    name_field = "component"
    hermitian = frozenset(COMPONENTS) - set(_ADJOINT)
    partners = _ADJOINT
    _notation_key = "component"

    def __new__(cls, label, component):
        return LabelledGenerator.__new__(cls, label, component)

    @property
    def component(self):
        """The component name, a ``str``."""
        return self.args[1].name

    @property
    def precedence(self):
        """Printing precedence (read by ``sympy.printing.precedence``): ``J.squared`` is a power."""
        from amalgebra.notation import component_precedence

        return component_precedence(self)

    @property
    def parent(self):
        """The :class:`AngularMomentum` this component belongs to."""
        return AngularMomentum(self.args[0])

    def _eval_rewrite_as_ladder(self, *args, **kwargs):
        J = self.parent
        if self.component == "x":
            return (J.plus + J.minus) / 2
        if self.component == "y":
            return (J.plus - J.minus) / (2 * I)
        return self

    def _eval_rewrite_as_cartesian(self, *args, **kwargs):
        J = self.parent
        if self.component == "plus":
            return J.x + I * J.y
        if self.component == "minus":
            return J.x - I * J.y
        return self


_family_pair(AngularMomentum, AngularMomentumComponent)


def dot(first, second):
    """Scalar product ``Ax*Bx + Ay*By + Az*Bz`` of two vector operators.

    Explanation
    ===========

    Either argument may be an :class:`AngularMomentum` or a 3-sequence of
    expressions (Cartesian components).  For two labels the components commute,
    so ``dot(I, J) == dot(J, I)`` after :func:`~amalgebra.algebra.canonical`;
    ``dot(J, J)`` is :math:`J^2`.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum, canonical, dot
    >>> I_, J = AngularMomentum("I"), AngularMomentum("J")
    >>> dot(I_, J)
    I.x*J.x + I.y*J.y + I.z*J.z
    >>> canonical(dot(J, J)) == J.squared
    True
    >>> canonical(dot(I_, J))    # I.J = Iz Jz + (I+ J- + I- J+)/2
    I.minus*J.plus/2 + I.plus*J.minus/2 + I.z*J.z

    Parameters
    ==========

    first, second : AngularMomentum or sequence of three expressions

    See Also
    ========

    AngularMomentum.vector
    """
    from sympy import Add, Mul

    a = _vector(first, "first")
    b = _vector(second, "second")
    return Add(*[Mul(u, v) for u, v in zip(a, b)])


def _vector(value, name):
    if isinstance(value, AngularMomentum):
        return value.vector
    if isinstance(value, (tuple, list)) and len(value) == 3:
        for item in value:
            if not _is_addable(item):
                raise OperatorError(f"{name}={value!r} must hold three expressions")
        return tuple(S(item) if not isinstance(item, Basic) else item for item in value)
    raise OperatorError(f"{name}={value!r} must be an AngularMomentum or a sequence of three components")
