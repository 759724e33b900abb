r"""Vector operators under a named angular momentum (position, dipole, another spin, ...).

Explanation
===========

A :class:`VectorOperator` ``V`` declared under the angular momentum with label
``"J"`` has Cartesian components ``V.x, V.y, V.z`` (noncommutative atoms,
:class:`VectorComponent`) with the commutation rules built in
(:func:`vector_commutator`):

.. math::

    [J_a, V_b] = i\,\epsilon_{abc} V_c, \qquad
    [J_z, V_{\pm1}] = \pm V_{\pm 1}, \qquad [J_\pm, V_0] = \sqrt2\, V_{\pm1}, \dots

It is a rank-1 spherical tensor with the design.md components
:math:`V_{+1} = -(V_x + iV_y)/\sqrt2`, :math:`V_0 = V_z`,
:math:`V_{-1} = (V_x - iV_y)/\sqrt2` (:meth:`VectorOperator.spherical_tensor`),
so it enters :func:`~amalgebra.tensors.products.tensor_product`,
:func:`~amalgebra.tensors.products.scalar_product`,
:func:`~amalgebra.tensors.products.cross_product` and
:func:`~amalgebra.tensors.irreducible.decompose` like any tensor.  Components of
vectors under different labels commute only as far as the user says: the
library never reorders them.  An :class:`~amalgebra.algebra.AngularMomentum`
(e.g. a spin ``S``) is itself accepted wherever a vector is; it is a vector
under its own label and under any total angular momentum that contains it.

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.tensors.vectors import VectorOperator, vector_commutator
>>> r = VectorOperator("r", "L")
>>> L = AngularMomentum("L")
>>> vector_commutator(L.x, r.y)          # [Lx, y] = i z
I*r[L].z
>>> vector_commutator(L.plus, r.z)       # [L+, z] = -(x + i y)
-r[L].x - I*r[L].y

An identity, :math:`[L_z, V_{+1}] = V_{+1}`:

>>> from sympy import expand
>>> vp = r.spherical[1]
>>> expand(vector_commutator(L.z, vp) - vp) == 0
True

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics*, section 3.10 (vector operators).
"""

from sympy import Add, Basic, Expr, I, Mul, S, expand
from sympy.core.symbol import Str

from ..algebra.operators import AngularMomentumComponent, _FamilyNotOperator
from ..notation import NotationHooks
from ..errors import OperatorError, TensorOperatorError
from .products import TensorComponents, cartesian_to_spherical
from .spherical import _hermitian_flag, _label

__all__ = ["VectorOperator", "VectorComponent", "vector_commutator"]

_AXES = ("x", "y", "z")


class VectorOperator(_FamilyNotOperator, NotationHooks, Basic):
    r"""A vector operator named ``name`` under the angular momentum ``label``.

    ``args`` are ``(Str(name), Str(label), Str("hermitian"|"general"))``.

    Examples
    ========

    >>> from amalgebra.tensors.vectors import VectorOperator
    >>> d = VectorOperator("d", "J")
    >>> d.vector, d.label
    ((d[J].x, d[J].y, d[J].z), 'J')
    >>> d.func(*d.args) == d
    True

    Parameters
    ==========

    name : str
    label : str
        The angular momentum it is a vector under.
    hermitian : bool
        Hermitian Cartesian components (default ``True``).
    """

    __slots__ = ()
    _component_example = "{self.name}.x"
    _notation_key = "vector_operator"

    def __new__(cls, name, label="J", hermitian=True):
        herm = _hermitian_flag(hermitian)
        return Basic.__new__(cls, Str(_label(name, "name")), Str(_label(label)), Str(herm))

    name = property(lambda self: self.args[0].name, doc="The name.")
    label = property(lambda self: self.args[1].name, doc="The angular momentum it is a vector under.")
    hermitian = property(lambda self: self.args[2].name == "hermitian", doc="Hermitian components.")

    def component(self, axis):
        """The Cartesian component ``"x"``, ``"y"`` or ``"z"``."""
        return VectorComponent(self, axis)

    x = property(lambda self: self.component("x"))
    y = property(lambda self: self.component("y"))
    z = property(lambda self: self.component("z"))

    @property
    def vector(self):
        """``(V.x, V.y, V.z)``."""
        return (self.x, self.y, self.z)

    @property
    def spherical(self):
        """``{+1: V_{+1}, 0: V_0, -1: V_{-1}}`` (design.md convention)."""
        vp, v0, vm = cartesian_to_spherical(*self.vector)
        return {1: vp, 0: v0, -1: vm}

    def spherical_tensor(self):
        """The rank-1 :class:`~amalgebra.tensors.products.TensorComponents`."""
        return TensorComponents(1, cartesian_to_spherical(*self.vector))



class VectorComponent(NotationHooks, Expr):
    """A Cartesian component of a :class:`VectorOperator`: a noncommutative atom.

    ``args`` are ``(vector, Str(axis))``.

    Examples
    ========

    >>> from sympy import adjoint
    >>> from amalgebra.tensors.vectors import VectorOperator
    >>> r = VectorOperator("r", "L")
    >>> adjoint(r.x), r.x.is_hermitian
    (r[L].x, True)
    """

    __slots__ = ()
    _notation_key = "vector_component"
    is_commutative = False

    def __new__(cls, vector, axis):
        if not isinstance(vector, VectorOperator):
            raise OperatorError(f"vector={vector!r} must be a VectorOperator")
        if isinstance(axis, Str):
            axis = axis.name
        if axis not in _AXES:
            raise OperatorError(f"axis={axis!r} must be one of x, y, z")
        return Expr.__new__(cls, vector, Str(axis))

    vector = property(lambda self: self.args[0])
    axis = property(lambda self: self.args[1].name)
    label = property(lambda self: self.args[0].label)

    def _eval_is_hermitian(self):
        return True if self.vector.hermitian else None

    def _eval_adjoint(self):
        return self if self.vector.hermitian else None

    def _eval_conjugate(self):
        return None

    def _eval_transpose(self):
        return None



_EPS = {("x", "y"): "z", ("y", "z"): "x", ("z", "x"): "y"}


def _cartesian_rule(a, b, vector):
    """[J_a, V_b] = i eps_abc V_c."""
    if a == b:
        return S.Zero
    if (a, b) in _EPS:
        return I * vector.component(_EPS[(a, b)])
    return -I * vector.component(_EPS[(b, a)])


def vector_commutator(generator, component):
    r"""The commutator :math:`[G, V_b]` of an angular-momentum component with a vector component.

    ``generator`` is one of ``J.x, J.y, J.z, J.plus, J.minus, J.squared`` of
    the vector's angular momentum; ``component`` a :class:`VectorComponent` or
    a linear combination of components of one vector (e.g. ``V.spherical[1]``).
    A generator of another label raises
    :class:`~amalgebra.errors.TensorOperatorError`.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors.vectors import VectorOperator, vector_commutator
    >>> V, J = VectorOperator("V", "J"), AngularMomentum("J")
    >>> vector_commutator(J.z, V.x)
    I*V[J].y
    """
    if not isinstance(generator, AngularMomentumComponent):
        raise OperatorError(f"generator={generator!r} must be an angular-momentum component")
    expr = expand(component)
    terms = Add.make_args(expr)
    out = []
    for term in terms:
        coeff, factors = term.args_cnc()
        if len(factors) != 1 or not isinstance(factors[0], VectorComponent):
            raise OperatorError(f"component={component} must be a linear combination of vector components")
        atom = factors[0]
        if atom.label != generator.label:
            raise TensorOperatorError(
                f"generator={generator} must belong to {atom.label!r}: {atom.vector.name} is declared "
                f"a vector under {atom.label!r}, not {generator.label!r}")
        out.append(Mul(*coeff) * _single(generator, atom))
    return expand(Add(*out))


def _single(generator, atom):
    comp, vector, b = generator.component, atom.vector, atom.axis
    if comp in _AXES:
        return _cartesian_rule(comp, b, vector)
    if comp == "plus":
        return _cartesian_rule("x", b, vector) + I * _cartesian_rule("y", b, vector)
    if comp == "minus":
        return _cartesian_rule("x", b, vector) - I * _cartesian_rule("y", b, vector)
    # [J^2, V_b] = sum_a (J_a [J_a, V_b] + [J_a, V_b] J_a)
    J = generator.parent
    return Add(*[J.component(a) * _cartesian_rule(a, b, vector) + _cartesian_rule(a, b, vector)
                 * J.component(a) for a in _AXES])
