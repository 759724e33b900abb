r"""Tensor products, scalar and vector products of spherical tensors; tensors built from J.

Explanation
===========

Conventions (Condon-Shortley Clebsch-Gordan coefficients of
:mod:`amalgebra.coupling`):

* tensor product :math:`[A^{k_1}\times B^{k_2}]^k_q = \sum_{q_1 q_2}
  \langle k_1 q_1 k_2 q_2|k q\rangle A^{k_1}_{q_1} B^{k_2}_{q_2}` (factor order kept:
  ``A`` left of ``B``);
* scalar product :math:`A\cdot B = \sum_q (-1)^q A_q B_{-q} = (-1)^k\sqrt{2k+1}\,[A\times B]^0_0`
  (for vectors it is :math:`A_xB_x + A_yB_y + A_zB_z`);
* vector product of rank-1 tensors :math:`(A\times B)_q = -i\sqrt{2}\,[A\times B]^1_q`
  (equivalently :math:`[A\times B]^1 = \tfrac{i}{\sqrt 2}\,\mathbf{A}\times\mathbf{B}`);
* spherical components of a vector (design.md): :math:`V_{+1} = -(V_x + iV_y)/\sqrt2`,
  :math:`V_0 = V_z`, :math:`V_{-1} = (V_x - iV_y)/\sqrt2`.

A :class:`TensorComponents` holds the :math:`2k+1` components of any
irreducible tensor as SymPy expressions (``q = k, ..., -k``).  Anything with
spherical components can enter a product: an
:class:`~amalgebra.algebra.AngularMomentum` (rank 1), a
:class:`~amalgebra.tensors.spherical.SphericalTensor`, a
:class:`~amalgebra.tensors.vectors.VectorOperator`, a ``TensorComponents``, or
a 3-sequence of Cartesian components.

Examples
========

>>> from amalgebra.algebra import AngularMomentum, canonical
>>> from amalgebra.tensors.products import tensor_product, scalar_product, quadrupole_tensor
>>> J = AngularMomentum("J")
>>> Q = quadrupole_tensor(J)
>>> canonical(Q[2])
J.plus**2/2

Identities: :math:`J\cdot J = J^2`, and :math:`[J\times J]^1 = -J/\sqrt{2}` since
:math:`\mathbf{J}\times\mathbf{J} = i\mathbf{J}`:

>>> canonical(scalar_product(J, J)) == J.squared
True
>>> from sympy import sqrt
>>> all(canonical(tensor_product(J, J, 1)[q] + J.spherical[q]/sqrt(2)) == 0 for q in (1, 0, -1))
True

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton (1957), sections 5.1, 7.1.
.. [2] D. M. Brink and G. R. Satchler, *Angular Momentum*, 3rd ed. (1993), ch. 4 (vector products).
"""

from sympy import Add, Basic, I, Mul, S, Tuple, expand, sqrt

from .._validation import as_expression
from ..notation import NotationHooks
from ..algebra.operators import AngularMomentum
from ..coupling import cg
from ..errors import OperatorError, QuantumNumberError
from ..qnumbers import doubled, half_integer, triangle
from .spherical import SphericalTensor

__all__ = [
    "TensorComponents",
    "spherical_components",
    "cartesian_to_spherical",
    "spherical_to_cartesian",
    "tensor_product",
    "scalar_product",
    "cross_product",
    "angular_momentum_tensor",
    "quadrupole_tensor",
    "stretched_tensor",
]


class TensorComponents(NotationHooks, Basic):
    r"""The components of one irreducible tensor of rank ``k``, as SymPy expressions.

    ``args`` are ``(k, Tuple(T_k, T_{k-1}, ..., T_{-k}))``; ``self[q]`` reads one.

    Examples
    ========

    >>> from amalgebra.tensors.products import TensorComponents
    >>> from sympy import symbols
    >>> a, b, c = symbols("a b c")
    >>> v = TensorComponents(1, (a, b, c))
    >>> v[1], v[-1], v.rank
    (a, c, 1)
    >>> v.func(*v.args) == v
    True
    """

    __slots__ = ()

    def __new__(cls, k, components):
        k = half_integer(k, "k", nonnegative=True)
        components = tuple(as_expression(c) for c in components)
        if len(components) != int(2 * k) + 1:
            raise QuantumNumberError(f"components={len(components)} must number 2k+1={int(2 * k) + 1}")
        return Basic.__new__(cls, k, Tuple(*components))

    rank = property(lambda self: self.args[0], doc="The rank k.")

    @property
    def components(self):
        """The components as a tuple, ``q = k, ..., -k``."""
        return tuple(self.args[1])

    def __getitem__(self, q):
        tk = int(2 * self.rank)
        tq = doubled(q, "q")
        if abs(tq) > tk or (tk - tq) % 2:
            raise QuantumNumberError(f"q={S(tq) / 2} must be one of k, k-1, ..., -k for k={self.rank}")
        return self.args[1][(tk - tq) // 2]

    def as_dict(self):
        """``{q: component}``."""
        tk = int(2 * self.rank)
        return {S(tk - 2 * i) / 2: c for i, c in enumerate(self.args[1])}

    def applyfunc(self, f):
        """Apply ``f`` to every component (e.g. ``canonical``)."""
        return TensorComponents(self.rank, [f(c) for c in self.components])

    _notation_key = "tensor_components"


def cartesian_to_spherical(vx, vy, vz):
    r"""``(V_{+1}, V_0, V_{-1})`` from Cartesian components (design.md convention).

    >>> from sympy import symbols
    >>> from amalgebra.tensors.products import cartesian_to_spherical
    >>> x, y, z = symbols("x y z")
    >>> cartesian_to_spherical(x, y, z)
    (sqrt(2)*(-x - I*y)/2, z, sqrt(2)*(x - I*y)/2)
    """
    root = sqrt(2)
    return (-(vx + I * vy) / root, vz, (vx - I * vy) / root)


def spherical_to_cartesian(v):
    r"""``(V_x, V_y, V_z)`` from a rank-1 tensor (inverse of :func:`cartesian_to_spherical`).

    A plain 3-sequence is read as the spherical components ``(V_{+1}, V_0, V_{-1})``.

    >>> from sympy import symbols
    >>> from amalgebra.tensors.products import spherical_to_cartesian, cartesian_to_spherical
    >>> x, y, z = symbols("x y z")
    >>> tuple(expand(c) for c in spherical_to_cartesian(cartesian_to_spherical(x, y, z))) == (x, y, z)
    True
    """
    if isinstance(v, (tuple, list, Tuple)) and len(v) == 3:
        v = TensorComponents(1, v)
    v = spherical_components(v)
    if v.rank != 1:
        raise QuantumNumberError(f"rank={v.rank} must be 1 for Cartesian components")
    root = sqrt(2)
    vp, v0, vm = v.components
    return (expand((vm - vp) / root), expand(I * (vm + vp) / root), v0)


def spherical_components(value, name="value"):
    r"""The :class:`TensorComponents` of anything with spherical components.

    Accepts a :class:`TensorComponents`, an
    :class:`~amalgebra.algebra.AngularMomentum`, a
    :class:`~amalgebra.tensors.spherical.SphericalTensor`, a
    :class:`~amalgebra.tensors.vectors.VectorOperator`, or three Cartesian
    components.

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors.products import spherical_components
    >>> spherical_components(AngularMomentum("L")).components
    (-sqrt(2)*L.plus/2, L.z, sqrt(2)*L.minus/2)
    """
    if isinstance(value, TensorComponents):
        return value
    if isinstance(value, AngularMomentum):
        sph = value.spherical
        return TensorComponents(1, (sph[1], sph[0], sph[-1]))
    if isinstance(value, SphericalTensor):
        return TensorComponents(value.rank, value.components)
    spherical = getattr(value, "spherical_tensor", None)
    if callable(spherical):
        return spherical()
    if isinstance(value, (tuple, list, Tuple)) and len(value) == 3:
        return TensorComponents(1, cartesian_to_spherical(*(as_expression(v) for v in value)))
    raise OperatorError(f"{name}={value!r} must be a tensor (TensorComponents, AngularMomentum, "
                        f"SphericalTensor, VectorOperator) or three Cartesian components")


def tensor_product(a, b, k):
    r"""The tensor product :math:`[A^{k_1}\times B^{k_2}]^k` (see the module docstring).

    ``k`` must satisfy the triangle rule with the two ranks, else
    :class:`~amalgebra.errors.QuantumNumberError`.

    Examples
    ========

    >>> from amalgebra.tensors.spherical import SphericalTensor
    >>> from amalgebra.tensors.products import tensor_product
    >>> A, B = SphericalTensor("A", 1, "L"), SphericalTensor("B", 1, "S")
    >>> tensor_product(A, B, 2)[2]
    A^(1)[L]_(1)*B^(1)[S]_(1)
    """
    a, b = spherical_components(a, "a"), spherical_components(b, "b")
    k = half_integer(k, "k", nonnegative=True)
    k1, k2 = a.rank, b.rank
    if not triangle(k1, k2, k):
        raise QuantumNumberError(f"k={k} must satisfy the triangle rule with the ranks ({k1}, {k2})")
    da, db = a.as_dict(), b.as_dict()
    out = []
    for i in range(int(2 * k) + 1):
        q = k - i
        terms = []
        for q1, comp1 in da.items():
            q2 = q - q1
            if q2 not in db:
                continue
            coeff = cg(k1, q1, k2, q2, k, q)
            if coeff != 0:
                terms.append(coeff * Mul(comp1, db[q2]))
        out.append(expand(Add(*terms)))   # flat sums: nested products are slow for the kernel
    return TensorComponents(k, out)


def scalar_product(a, b):
    r"""The scalar product :math:`A\cdot B = \sum_q (-1)^q A_q B_{-q}` of two tensors of equal rank.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum, canonical, dot
    >>> from amalgebra.tensors.products import scalar_product
    >>> L, S = AngularMomentum("L"), AngularMomentum("S")
    >>> canonical(scalar_product(L, S) - dot(L, S))
    0
    """
    a, b = spherical_components(a, "a"), spherical_components(b, "b")
    if a.rank != b.rank:
        raise QuantumNumberError(f"ranks=({a.rank}, {b.rank}) must be equal for a scalar product")
    db = b.as_dict()
    terms = []
    for q, comp in a.as_dict().items():
        if not q.is_integer:
            raise QuantumNumberError(f"rank={a.rank} must be an integer for a scalar product")
        terms.append(S.NegativeOne ** q * Mul(comp, db[-q]))
    return Add(*terms)


def cross_product(a, b):
    r"""The vector product of two rank-1 tensors, :math:`(A\times B)_q = -i\sqrt2\,[A\times B]^1_q`.

    Returned as a rank-1 :class:`TensorComponents`; use
    :func:`spherical_to_cartesian` for ``x, y, z``.

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum, canonical
    >>> from amalgebra.tensors.products import cross_product, spherical_to_cartesian
    >>> J = AngularMomentum("J")
    >>> [canonical(c) for c in spherical_to_cartesian(cross_product(J, J))]   # J x J = i J
    [I*J.minus/2 + I*J.plus/2, -J.minus/2 + J.plus/2, I*J.z]
    """
    a, b = spherical_components(a, "a"), spherical_components(b, "b")
    if a.rank != 1 or b.rank != 1:
        raise QuantumNumberError(f"ranks=({a.rank}, {b.rank}) must both be 1 for a vector product")
    coupled = tensor_product(a, b, 1)
    return TensorComponents(1, [expand(-I * sqrt(2) * c) for c in coupled.components])


def angular_momentum_tensor(J):
    r"""An angular momentum as a rank-1 tensor: :math:`(-J_+/\sqrt2, J_z, J_-/\sqrt2)`.

    Its reduced element is :math:`\langle j\|J\|j\rangle = \sqrt{j(j+1)(2j+1)}` (Edmonds).

    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.tensors.products import angular_momentum_tensor
    >>> angular_momentum_tensor(AngularMomentum("S"))[0]
    S.z
    """
    if not isinstance(J, AngularMomentum):
        raise OperatorError(f"J={J!r} must be an AngularMomentum")
    return spherical_components(J)


def quadrupole_tensor(J):
    r"""The quadrupole tensor :math:`[J\times J]^2` of one angular momentum.

    :math:`[J\times J]^2_0 = (3J_z^2 - J^2)/\sqrt6`, :math:`[J\times J]^2_{\pm2} = J_\pm^2/2`.

    >>> from amalgebra.algebra import AngularMomentum, canonical
    >>> from amalgebra.tensors.products import quadrupole_tensor
    >>> J = AngularMomentum("J")
    >>> canonical(quadrupole_tensor(J)[0] - (3*J.z**2 - J.squared)/sqrt(6))
    0
    """
    return tensor_product(angular_momentum_tensor(J), angular_momentum_tensor(J), 2)


def stretched_tensor(J, k):
    r"""The rank-``k`` tensor :math:`[\cdots[[J\times J]^2\times J]^3\cdots]^k` built from one angular momentum.

    Nonzero on states with :math:`2j \ge k`; ``k = 0`` gives ``1``.

    >>> from amalgebra.algebra import AngularMomentum, canonical
    >>> from amalgebra.tensors.products import stretched_tensor
    >>> J = AngularMomentum("J")
    >>> canonical(stretched_tensor(J, 3)[3]) == canonical(-J.plus**3 / (2*sqrt(2)))
    True
    """
    k = int(half_integer(k, "k", nonnegative=True)) if half_integer(k, "k", nonnegative=True).is_integer \
        else None
    if k is None:
        raise QuantumNumberError("k must be a nonnegative integer for a tensor built from J")
    if k == 0:
        return TensorComponents(0, (S.One,))
    out = angular_momentum_tensor(J)
    for rank in range(2, k + 1):
        out = tensor_product(out, angular_momentum_tensor(J), rank)
    return out
