r"""Fock kets :math:`|n_a, n_b, \ldots\rangle`, boson operators acting on them, inner products.

Explanation
===========

A :class:`FockKet` holds one occupation number per mode label; its args are
``(Tuple(Str(label), ...), Tuple(n, ...))`` with the labels sorted, so
``|n_a n_b>`` built in any label order is the same object.  Linear
combinations are ordinary SymPy sums of ``coefficient * FockKet``;
``sympy.adjoint`` gives the :class:`FockBra` (coefficients conjugated).

Convention (exact action, :math:`\hbar = 1`):

.. math::

    a|n\rangle = \sqrt{n}\,|n-1\rangle, \qquad
    a^\dagger|n\rangle = \sqrt{n+1}\,|n+1\rangle, \qquad
    \hat N|n\rangle = n|n\rangle,

Fock kets are orthonormal, :math:`\langle n'|n\rangle = \delta_{n'n}` per
mode.  Fock kets are states like the ``|j m>`` kets: :func:`amalgebra.states.apply`,
``matrix_element``, ``inner`` and ``expectation`` take them, and a product
``ket(j, m, "J") * fock_ket(n, modes="a")`` (or ``product_ket``) is a
spin-boson product ket on which operators mixing both act
(:func:`apply_bosons` is the same function as ``apply``).  The engine
normal-orders the operator once in the shift-form
kernel (:func:`amalgebra.algebra.canonical`), then reads each term
:math:`a^{\dagger d} f(\hat N)` off as :math:`f(n)\sqrt{(n+1)\cdots(n+d)}`
(and :math:`a^{d} f(\hat N)` as :math:`f(n)\sqrt{n(n-1)\cdots(n-d+1)}`,
an exact zero below the vacuum for numeric ``n``).

Occupations are nonnegative integers; a symbolic occupation (``n``,
``j + m``) is accepted unless SymPy can tell it is negative or not an
integer.  Bad input raises :class:`~amalgebra.errors.QuantumNumberError`
(negative or non-integer ``n``), :class:`~amalgebra.errors.NotNumericError`
(not a number or expression) or :class:`~amalgebra.errors.StateError`
(repeated labels, mismatched modes).

Examples
========

>>> from sympy import adjoint, sqrt, Symbol
>>> from amalgebra.bosons import BosonMode, fock_ket, apply_bosons, fock_inner
>>> a, b = BosonMode("a"), BosonMode("b")
>>> apply_bosons(a.create, fock_ket(2, 0))
sqrt(3)*|3, 0>_(a,b)
>>> apply_bosons(b.annihilate, fock_ket(2, 0))
0
>>> n = Symbol("n", integer=True, nonnegative=True)
>>> apply_bosons(a.annihilate, fock_ket(n, 1))
sqrt(n)*|n - 1, 1>_(a,b)

An identity, :math:`a a^\dagger - a^\dagger a = 1` on any ket:

>>> psi = fock_ket(3, 1) + 2*fock_ket(0, 4)
>>> apply_bosons(a.annihilate*a.create - a.create*a.annihilate, psi) == psi
True
>>> fock_inner(adjoint(psi), psi)
5

See Also
========

amalgebra.bosons.operators.BosonMode, amalgebra.bosons.schwinger

References
==========

.. [1] J. J. Sakurai, *Modern Quantum Mechanics* (1994), eqs. (2.3.16)-(2.3.17).
"""


from sympy import Expr, S, Tuple
from sympy.core.symbol import Str

from ..algebra.operators import _check_label
from ..errors import NotNumericError, OperatorError, QuantumNumberError, StateError
from ..qnumbers import doubled, is_numeric
from ..states.kets import _declare_mode_states, _DualState, _dual_pair, components

__all__ = ["FockKet", "FockBra", "fock_ket", "fock_bra", "vacuum", "occupation", "fock_components",
           "fock_inner", "apply_bosons", "fock_matrix_element"]


def occupation(value, name="n"):
    """Validate an occupation number: a nonnegative integer, or a symbolic expression.

    Numbers are read as in :mod:`amalgebra.qnumbers` (ints, ``Fraction``,
    SymPy numbers, strings like ``"3"``, floats only when exactly integral).

    >>> occupation("3"), occupation(2.0)
    (3, 2)
    >>> occupation(-1)
    Traceback (most recent call last):
    ...
    amalgebra.errors.QuantumNumberError: n=-1 must be a nonnegative integer occupation number

    Raises
    ======

    QuantumNumberError
        Negative or non-integer numbers; symbolic values SymPy knows to be
        negative or non-integer.
    NotNumericError
        Anything that is neither a number nor a commutative SymPy expression.
    """
    if isinstance(value, bool):
        raise NotNumericError(f"{name}={value!r} must be a nonnegative integer, not a bool")
    if is_numeric(value):
        try:
            twice = doubled(value, name)
        except QuantumNumberError:
            raise QuantumNumberError(f"{name}={value} must be a nonnegative integer occupation number") from None
        if twice < 0 or twice % 2:
            raise QuantumNumberError(f"{name}={value} must be a nonnegative integer occupation number")
        return S(twice // 2)
    if isinstance(value, Expr) and value.is_commutative:
        if value.is_integer is False or value.is_negative:
            raise QuantumNumberError(f"{name}={value} must be a nonnegative integer occupation number")
        return value
    raise NotNumericError(f"{name}={value!r} must be a nonnegative integer or a SymPy expression")


def _mode_labels(modes, name="modes"):
    if isinstance(modes, (str, Str)):
        modes = (modes,)
    if isinstance(modes, Tuple):
        modes = modes.args
    labels = []
    for mode in modes:
        label = getattr(mode, "label", mode)
        if isinstance(label, Str):
            label = label.name
        try:
            labels.append(_check_label(label, name))
        except OperatorError as exc:
            raise StateError(str(exc)) from None
    if not labels:
        raise StateError(f"{name}={modes!r} must name at least one mode")
    if len(set(labels)) != len(labels):
        raise StateError(f"{name}={tuple(labels)} must be distinct labels")
    return labels


def _canonical_args(modes, occupations):
    labels = _mode_labels(modes)
    if isinstance(occupations, Tuple):
        occupations = occupations.args
    occupations = tuple(occupations)
    if len(occupations) != len(labels):
        raise StateError(f"occupations={occupations} must give one number per mode of {tuple(labels)}")
    values = [occupation(n, f"n_{label}") for label, n in zip(labels, occupations)]
    pairs = sorted(zip(labels, values), key=lambda p: p[0])
    return Tuple(*[Str(label) for label, _ in pairs]), Tuple(*[n for _, n in pairs])


class _FockMixin(_DualState):
    __slots__ = ()
    is_commutative = False
    _notation_key = "fock"

    def __new__(cls, modes, occupations):
        return Expr.__new__(cls, *_canonical_args(modes, occupations))

    @classmethod
    def _unchecked(cls, modes, occupations):
        """Internal: from mode strs and validated occupations (sorted by mode here, as ``__new__`` does)."""
        pairs = sorted(zip(modes, occupations), key=lambda p: p[0])
        return Expr.__new__(cls, Tuple(*[Str(label) for label, _ in pairs]), Tuple(*[n for _, n in pairs]))

    @property
    def modes(self):
        """The mode labels, sorted, as a tuple of ``str``."""
        return tuple(s.name for s in self.args[0].args)

    @property
    def occupations(self):
        """The occupation numbers in the order of :attr:`modes`."""
        return self.args[1].args

    def as_dict(self):
        """``{label: n}``."""
        return dict(zip(self.modes, self.occupations))

    def _body(self, printer):
        return ", ".join(printer._print(n) for n in self.occupations)

    def _subscript(self):
        return ",".join(self.modes)


class FockKet(_FockMixin, Expr):
    r"""The Fock ket :math:`|n_{a}, n_{b}, \ldots\rangle` over sorted mode labels.

    Examples
    ========

    >>> from sympy import adjoint, latex
    >>> from amalgebra.bosons import FockKet
    >>> k = FockKet(("b", "a"), (1, 2))
    >>> k, k.as_dict(), k.func(*k.args) == k
    (|2, 1>_(a,b), {'a': 2, 'b': 1}, True)
    >>> adjoint(k)
    <2, 1|_(a,b)
    >>> latex(k)
    '{\\left|2, 1\\right\\rangle}_{a,b}'

    Parameters
    ==========

    modes : sequence of labels (str or :class:`~amalgebra.bosons.BosonMode`)
    occupations : sequence of occupation numbers, one per mode
    """

    __slots__ = ()


class FockBra(_FockMixin, Expr):
    r"""The Fock bra :math:`\langle n_{a}, n_{b}, \ldots|`, dual of :class:`FockKet`.

    >>> from sympy import adjoint
    >>> from amalgebra.bosons import FockBra
    >>> b = FockBra(("a",), (3,))
    >>> b, adjoint(b), adjoint(adjoint(b)) == b
    (<3|_(a), |3>_(a), True)
    """

    __slots__ = ()


_dual_pair(FockKet, FockBra)


def fock_ket(*occupations, modes=("a", "b")):
    """The Fock ket with the given occupations of ``modes`` (default ``("a", "b")``).

    Examples
    ========

    >>> fock_ket(1, 0)
    |1, 0>_(a,b)
    >>> fock_ket(4, modes=("c",))
    |4>_(c)
    """
    return FockKet(modes, occupations)


def fock_bra(*occupations, modes=("a", "b")):
    """The Fock bra with the given occupations (see :func:`fock_ket`).

    >>> fock_bra(0, 2)
    <0, 2|_(a,b)
    """
    return FockBra(modes, occupations)


def vacuum(modes=("a", "b")):
    """The vacuum :math:`|0, 0, \\ldots\\rangle` of ``modes``.

    >>> vacuum()
    |0, 0>_(a,b)
    """
    labels = _mode_labels(modes)
    return FockKet(labels, (0,) * len(labels))


def fock_components(state, kind=FockKet, name="state"):
    """A linear combination of Fock kets (or bras) as ``{basis: coefficient}``.

    Keys keep first-appearance order; coefficients that vanish are dropped.

    >>> from sympy import Symbol
    >>> c = Symbol("c")
    >>> fock_components(c*fock_ket(1, 0) + fock_ket(0, 1) - c*fock_ket(1, 0))
    {|0, 1>_(a,b): 1}

    Raises
    ======

    StateError
        When ``state`` is not a linear combination of ``kind`` objects.
    """
    return components(state, (kind,), name)


def fock_inner(bra_state, ket_state):
    r"""The inner product :math:`\langle\phi|\psi\rangle` of Fock states.

    Bilinear; the bra already carries conjugated coefficients (use
    ``sympy.adjoint(phi)``); a ket given first is turned into its bra.
    Overlaps are ``KroneckerDelta`` products, which stay visible for
    symbolic occupations.

    >>> from sympy import Symbol, adjoint, sqrt
    >>> n = Symbol("n", integer=True, nonnegative=True)
    >>> fock_inner(fock_bra(1, 2), fock_ket(1, 2) + 3*fock_ket(2, 1))
    1
    >>> fock_inner(fock_bra(n, 0), fock_ket(2, 0))
    KroneckerDelta(2, n)

    Raises
    ======

    StateError
        When bra and ket carry different mode labels.
    """
    from ..states.kets import inner

    return inner(bra_state, ket_state)


def apply_bosons(op, state):
    r"""Apply a boson operator polynomial to a Fock ket or a combination of them.

    Explanation
    ===========

    The same function as :func:`amalgebra.states.apply` (one engine: ``op`` is
    normal-ordered once in the kernel, then every term
    :math:`a^{\dagger d} f(\hat N)` acts exactly on each basis ket, see the
    module docstring), kept under this name.  Modes of the kets that ``op``
    does not mention are left alone; every mode of ``op`` must be a mode of
    the kets.  Spin-boson product kets (``ket(j, m, "J") * fock_ket(n,
    modes="a")``) take operators that mix both.

    Examples
    ========

    >>> from amalgebra.bosons import BosonMode, fock_ket, vacuum
    >>> a, b = BosonMode("a"), BosonMode("b")
    >>> apply_bosons(a.create**2*b.create, vacuum())
    sqrt(2)*|2, 1>_(a,b)
    >>> apply_bosons(a.number + b.number, fock_ket(2, 3))     # N_a + N_b counts quanta
    5*|2, 3>_(a,b)

    Parameters
    ==========

    op : Expr
        Polynomial in :class:`~amalgebra.bosons.BosonOperator` atoms (and
        angular-momentum or tensor components of the ``|j m>`` factors of a
        product ket) with commutative coefficients.
    state : FockKet, product ket with a Fock factor, or a linear combination of them

    Raises
    ======

    OperatorError
        ``op`` acts on a mode or label the state does not carry, or contains
        unknown operators.
    StateError
        ``state`` is not a linear combination of kets.
    """
    from ..states.action import apply

    return apply(op, state)


def fock_matrix_element(bra_state, op, ket_state):
    r""":math:`\langle\phi|\,\mathrm{op}\,|\psi\rangle` for Fock states.

    >>> from sympy import sqrt
    >>> from amalgebra.bosons import BosonMode
    >>> a = BosonMode("a")
    >>> fock_matrix_element(fock_bra(3, modes="a"), a.create**2, fock_ket(1, modes="a")) == sqrt(6)
    True
    """
    from ..states.action import matrix_element

    return matrix_element(bra_state, op, ket_state)


_declare_mode_states(FockKet, FockBra)
