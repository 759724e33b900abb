r"""Spherical tensor operators :math:`T^k_q` with a reduced matrix element, and their components.

Explanation
===========

A :class:`SphericalTensor` is a family of :math:`2k+1` operators
:math:`T^k_q` (``q = k, ..., -k``) that is irreducible under the angular
momentum with a given *label* (``"J"``, ``"L"``, ...):

.. math::

    [J_z, T^k_q] = q\, T^k_q, \qquad
    [J_\pm, T^k_q] = \sqrt{k(k+1) - q(q \pm 1)}\; T^k_{q \pm 1}

(Racah's definition; design.md).  Its matrix elements follow from one reduced
matrix element per pair :math:`(j', j)` by the Wigner-Eckart theorem
(:mod:`amalgebra.tensors.wigner_eckart`, Edmonds normalisation by default).  The *kind*
says where the reduced element comes from:

``"abstract"``
    a symbol, :class:`~amalgebra.tensors.wigner_eckart.ReducedMatrixElement`;
``"unit"``
    Racah's unit tensor, :math:`\langle j'\|u^k\|j\rangle = \delta_{j'j}`
    (when the triangle rule allows it);
``"racah"``
    the Racah-normalised harmonic :math:`C^k_q = \sqrt{4\pi/(2k+1)}\,Y_{kq}` on
    orbital states, :math:`\langle l'\|C^k\|l\rangle = (-1)^{l'}\sqrt{(2l+1)(2l'+1)}
    \begin{pmatrix} l' & k & l\\ 0 & 0 & 0\end{pmatrix}` (Edmonds 1957 eq. 5.4.?,
    number not checked; the value is verified against Gaunt integrals of
    spherical harmonics in the tests).

:class:`TensorComponent` (``T[q]``) is a noncommutative SymPy atom; products
and sums of components are ordinary SymPy expressions.  With
``amalgebra.tensors`` imported, :func:`amalgebra.algebra.canonical` and the
commutator functions accept products of components and angular-momentum
components (:mod:`amalgebra.tensors.mixedform`: angular-momentum factors to the
left, tensor components in the order written); single commutators with the
angular momentum are also given by :meth:`SphericalTensor.commutator_with`, and
matrices by :func:`tensor_matrix`.

Hermitian families (``hermitian=True``) satisfy
:math:`(T^k_q)^\dagger = (-1)^q T^k_{-q}`, which ``adjoint`` applies.

Examples
========

>>> from sympy import adjoint
>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.tensors.spherical import SphericalTensor
>>> T = SphericalTensor("T", 2, "J")
>>> T[1], adjoint(T[1])
(T^(2)[J]_(1), -T^(2)[J]_(-1))
>>> J = AngularMomentum("J")
>>> T.commutator_with(J.plus, 1)
2*T^(2)[J]_(2)
>>> T.matrix_element(1, 1, 0, 1, 1)
sqrt(30)*<1||T^(2)||1>/30

An identity: :math:`\sum_q |\langle j'm'|C^k_q|jm\rangle|^2` summed over
:math:`m'` and ``q`` is :math:`\langle j'\|C^k\|j\rangle^2/(2j+1)` for any ``m``:

>>> from amalgebra.tensors.spherical import racah_tensor
>>> C = racah_tensor(2)
>>> sum(C.matrix_element(3, mp, q, 1, 0)**2 for mp in range(-3, 4) for q in range(-2, 3)) \
...     == C.reduced(3, 1)**2 / 3 != 0
True

References
==========

.. [1] G. Racah, Phys. Rev. 62, 438 (1942).
.. [2] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton (1957), ch. 5.
"""

from sympy import Basic, Expr, I, S, sqrt
from sympy.core.symbol import Str

from .._validation import check_label
from ..algebra.operators import AngularMomentumComponent, _FamilyNotOperator
from ..notation import NotationHooks
from ..coupling import threej
from ..errors import OperatorError, QuantumNumberError, TensorOperatorError
from ..qnumbers import doubled, doubled_projection, half_integer, quantum_number, triangle
from .wigner_eckart import ReducedMatrixElement, check_convention, convert_reduced, wigner_eckart_factor

__all__ = [
    "KINDS",
    "SphericalTensor",
    "TensorComponent",
    "racah_tensor",
    "unit_tensor",
    "tensor_matrix",
]

#: The accepted kinds of :class:`SphericalTensor`.
KINDS = ("abstract", "unit", "racah")


def _label(label, name="label"):
    return check_label(label, name, OperatorError)


def _hermitian_flag(hermitian):
    """The args form of a Hermitian flag: ``"hermitian"`` or ``"general"``."""
    herm = hermitian.name if isinstance(hermitian, Str) else (
        ("hermitian" if hermitian else "general") if isinstance(hermitian, bool) else None)
    if herm not in ("hermitian", "general"):
        raise OperatorError(f"hermitian={hermitian!r} must be True or False")
    return herm


class SphericalTensor(_FamilyNotOperator, NotationHooks, Basic):
    r"""A family of spherical tensor components :math:`T^k_q` under the angular momentum ``label``.

    Explanation
    ===========

    ``args`` are ``(Str(name), k, Str(label), Str(kind), Str("hermitian"|"general"))``.
    See the module docstring for the commutation rules and the kinds.

    Examples
    ========

    >>> from amalgebra.tensors.spherical import SphericalTensor
    >>> T = SphericalTensor("T", 1, "L")
    >>> T.rank, T.label, T.components
    (1, 'L', (T^(1)[L]_(1), T^(1)[L]_(0), T^(1)[L]_(-1)))
    >>> T.func(*T.args) == T
    True

    Parameters
    ==========

    name : str
    k : rank, a nonnegative integer or half-integer
    label : str, the angular momentum it is a tensor under
    kind : {"abstract", "unit", "racah"}
    hermitian : bool

    See Also
    ========

    racah_tensor, unit_tensor, tensor_matrix, amalgebra.tensors.wigner_eckart.wigner_eckart
    """

    __slots__ = ()
    _component_example = "{self.name}[0]"
    _notation_key = "spherical_tensor"

    def __new__(cls, name, k, label="J", kind="abstract", hermitian=True):
        name = _label(name, "name")
        k = half_integer(k, "k", nonnegative=True)
        label = _label(label)
        if isinstance(kind, Str):
            kind = kind.name
        if kind not in KINDS:
            raise OperatorError(f"kind={kind!r} must be one of {', '.join(KINDS)}")
        if kind == "racah" and not k.is_integer:
            raise QuantumNumberError(f"k={k} must be an integer for the Racah tensor C^k")
        herm = _hermitian_flag(hermitian)
        return Basic.__new__(cls, Str(name), k, Str(label), Str(kind), Str(herm))

    name = property(lambda self: self.args[0].name, doc="The name of the family.")
    rank = property(lambda self: self.args[1], doc="The rank k.")
    label = property(lambda self: self.args[2].name, doc="The angular momentum it is a tensor under.")
    kind = property(lambda self: self.args[3].name, doc="abstract, unit or racah.")
    hermitian = property(lambda self: self.args[4].name == "hermitian",
                         doc="True when ``(T_q)^dagger = (-1)^q T_-q``.")

    def check_q(self, q, name="q"):
        """Validate a component index: ``k - q`` an integer and ``|q| <= k``; return it exactly."""
        tk = doubled(self.rank, "k")
        tq = doubled_projection(tk, q, name, "k")
        if abs(tq) > tk:
            raise QuantumNumberError(f"{name}={S(tq) / 2} must satisfy |{name}| <= k={self.rank}")
        return S(tq) / 2

    def __getitem__(self, q):
        return TensorComponent(self, self.check_q(q))

    def component(self, q):
        """The component :math:`T^k_q` (same as ``self[q]``)."""
        return self[q]

    @property
    def components(self):
        """All components, ``q = k, k-1, ..., -k``."""
        tk = int(2 * self.rank)
        return tuple(TensorComponent(self, S(tk - 2 * i) / 2) for i in range(tk + 1))

    def reduced(self, jp, j, convention="edmonds"):
        r"""The reduced matrix element :math:`\langle j'\|T^k\|j\rangle` in ``convention``."""
        convention = check_convention(convention)
        jp = quantum_number(jp, "jp", nonnegative=True)
        j = quantum_number(j, "j", nonnegative=True)
        kind = self.kind
        if kind == "abstract":
            return ReducedMatrixElement(self.name, self.rank, jp, j, convention)
        if not (jp.is_number and j.is_number):
            raise QuantumNumberError(f"(jp, j)=({jp}, {j}) must be numeric for the {kind} tensor")
        if not triangle(jp, self.rank, j):
            return S.Zero
        if kind == "unit":
            value = S.One if jp == j else S.Zero
        else:
            if not (jp.is_integer and j.is_integer):
                raise QuantumNumberError(f"(l', l)=({jp}, {j}) must be integers for C^k on orbital states")
            value = (S.NegativeOne ** jp * sqrt((2 * j + 1) * (2 * jp + 1))
                     * threej(jp, self.rank, j, 0, 0, 0))
        return convert_reduced(value, jp, j, "edmonds", convention)

    def matrix_element(self, jp, mp, q, j, m, convention="edmonds"):
        r""":math:`\langle j' m'|T^k_q|j m\rangle` by the Wigner-Eckart theorem."""
        self.check_q(q)
        factor = wigner_eckart_factor(jp, mp, self.rank, q, j, m, convention)
        if factor == 0:
            return S.Zero
        return factor * self.reduced(jp, j, convention)

    def commutator_with(self, generator, q):
        r"""The commutator :math:`[G, T^k_q]` for a component ``G`` of the angular momentum ``label``.

        ``G`` is one of ``J.x, J.y, J.z, J.plus, J.minus, J.squared`` of an
        :class:`~amalgebra.algebra.AngularMomentum` with this tensor's label;
        another label raises :class:`~amalgebra.errors.TensorOperatorError`
        (the tensor was declared under a different angular momentum).
        """
        if not isinstance(generator, AngularMomentumComponent):
            raise OperatorError(f"generator={generator!r} must be an angular-momentum component")
        if generator.label != self.label:
            raise TensorOperatorError(
                f"generator={generator} must belong to the angular momentum {self.label!r}: "
                f"{self.name} is declared a tensor under {self.label!r}, not {generator.label!r}")
        q = self.check_q(q)
        comp = generator.component
        if comp == "squared":
            J = generator.parent
            parts = {c: self.commutator_with(J.component(c), q) for c in ("z", "plus", "minus")}
            return (J.z * parts["z"] + parts["z"] * J.z
                    + (J.plus * parts["minus"] + parts["plus"] * J.minus
                       + J.minus * parts["plus"] + parts["minus"] * J.plus) / 2)
        up, down = self._ladder(q, 1), self._ladder(q, -1)
        if comp == "z":
            return q * self[q]
        if comp == "plus":
            return up
        if comp == "minus":
            return down
        if comp == "x":
            return (up + down) / 2
        return (up - down) / (2 * I)

    def _ladder(self, q, sign):
        k = self.rank
        target = q + sign
        if abs(target) > k:
            return S.Zero
        return sqrt(k * (k + 1) - q * (q + sign)) * TensorComponent(self, target)



class TensorComponent(NotationHooks, Expr):
    r"""One component :math:`T^k_q` of a :class:`SphericalTensor`: a noncommutative atom.

    ``args`` are ``(tensor, q)``.  ``adjoint`` gives :math:`(-1)^q T^k_{-q}`
    for a Hermitian family and stays unevaluated otherwise.

    Examples
    ========

    >>> from sympy import latex
    >>> from amalgebra.tensors.spherical import SphericalTensor
    >>> c = SphericalTensor("Q", 2, "I")[-2]
    >>> c, latex(c), c.q, c.rank
    (Q^(2)[I]_(-2), '{Q^{(2)}_{-2}}', -2, 2)
    """

    __slots__ = ()
    _notation_key = "tensor_component"
    is_commutative = False

    def __new__(cls, tensor, q):
        if not isinstance(tensor, SphericalTensor):
            raise OperatorError(f"tensor={tensor!r} must be a SphericalTensor")
        return Expr.__new__(cls, tensor, tensor.check_q(q))

    tensor = property(lambda self: self.args[0], doc="The family.")
    q = property(lambda self: self.args[1], doc="The component index.")
    rank = property(lambda self: self.args[0].rank, doc="The rank k.")

    def _eval_adjoint(self):
        tensor, q = self.args
        if not tensor.hermitian:
            return None
        return S.NegativeOne ** q * TensorComponent(tensor, -q) if q.is_integer else None

    def _eval_conjugate(self):
        return None

    def _eval_transpose(self):
        return None



def racah_tensor(k, label="L", name="C"):
    r"""The Racah-normalised spherical harmonic tensor :math:`C^k` acting on orbital states ``label``.

    Examples
    ========

    >>> from amalgebra.tensors.spherical import racah_tensor
    >>> racah_tensor(1).reduced(1, 0)       # <1||C^1||0> = -sqrt(3) (1 1 0; 0 0 0) = 1
    1
    """
    return SphericalTensor(name, k, label, "racah")


def unit_tensor(k, label="J", name="u"):
    r"""Racah's unit tensor :math:`u^k` with :math:`\langle j'\|u^k\|j\rangle = \delta_{j'j}` (Edmonds form).

    Examples
    ========

    >>> from amalgebra.tensors.spherical import unit_tensor
    >>> u = unit_tensor(2)
    >>> u.reduced(2, 2), u.reduced(2, 1), u.reduced("1/2", "1/2")
    (1, 0, 0)
    """
    return SphericalTensor(name, k, label, "unit")


def tensor_matrix(tensor, q, js, *, reduced=None, convention="edmonds"):
    r"""The matrix of :math:`T^k_q` on the direct sum of :math:`|j m\rangle` spaces for ``js``.

    Explanation
    ===========

    Basis: for each ``j`` in ``js`` (in the order given) the states
    ``m = j, j-1, ..., -j`` (the order of :func:`amalgebra.matrices.explicit.to_matrix`,
    which computes it).  Entries by the Wigner-Eckart theorem with
    ``tensor.reduced(j', j)``, or with ``reduced[(j', j)]`` when a dict
    ``reduced`` is given (missing pairs are zero).  ``js`` may also be a dict
    ``{label: [j values]}``: its key must be the tensor's label, else
    :class:`~amalgebra.errors.TensorOperatorError`.

    Examples
    ========

    >>> from amalgebra.tensors.spherical import SphericalTensor, tensor_matrix
    >>> tensor_matrix(SphericalTensor("T", 1, "J"), 0, ["1/2"], reduced={("1/2", "1/2"): 1})
    Matrix([
    [sqrt(6)/6,          0],
    [        0, -sqrt(6)/6]])
    """
    if not isinstance(tensor, SphericalTensor):
        raise OperatorError(f"tensor={tensor!r} must be a SphericalTensor")
    if isinstance(js, dict):
        if list(js) != [tensor.label]:
            raise TensorOperatorError(f"js keys={sorted(js, key=str)} must be exactly [{tensor.label!r}]: "
                                      f"{tensor.name} is a tensor under {tensor.label!r}")
        js = js[tensor.label]
    q = tensor.check_q(q)
    from ..matrices.explicit import to_matrix   # the one matrix route (late: numeric sits above tensors)

    js = list(js) if isinstance(js, (list, tuple)) else [js]
    return to_matrix(tensor[q], {tensor.label: js}, reduced=None if reduced is None else {tensor: dict(reduced)},
                     convention=convention)
