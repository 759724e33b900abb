r"""Per-label "modes": the data the shift-form kernel needs about one generator set.

Explanation
===========

The kernel (:mod:`amalgebra.algebra.shiftform`) never hard-codes angular
momentum.  Each label of an expression is served by a *mode* object that
describes an algebra of the shape

.. math::

    \mathcal{A} = \bigoplus_{d \in \mathbb{Z}} R^{(d)} \, \mathbb{K}[v_1, \ldots, v_r],
    \qquad f(v)\, R^{(d)} = R^{(d)} f(v + d\, e_s),

where :math:`R^{(d)}` is the *d-th ladder power* (a raising power for
``d > 0``, a lowering power ``|d|`` for ``d < 0``), the :math:`v_i` are
commuting variables (central ones, and one *shift variable* :math:`v_s` that
moves by one unit per unit of shift), and products of opposite ladder powers
reduce to polynomials.  The protocol a mode implements:

``kind``
    a short name (``"angular_momentum"``).
``variables``
    names of the commuting variables, e.g. ``("sq", "z")``.
``shift_index``
    position in ``variables`` of the variable that ladders shift.
``raise_lower(k, v)`` and ``lower_raise(k, v)``
    the polynomials :math:`R^{(k)} R^{(-k)}` and :math:`R^{(-k)} R^{(k)}` for
    ``k >= 1``, built from the ring elements ``v`` (one per variable).
``atom(component, v, domain)``
    the kernel image of a generator: ``(pairs, den)``, a list of
    ``(shift, polynomial)`` pairs and an integer denominator.
``atom_constants(component)``
    SymPy numbers that image needs from the coefficient domain (``I``),
    so the kernel can pick a domain that contains them.
``ladder_factor(label, d)``, ``variable_factor(label, index, power)``
    the SymPy factors used when converting back to expressions, in the output
    convention ``coefficient * ladder power * monomial``.
``direct(component)``
    ``("shift", +-1)`` for a ladder generator, ``("var", index)`` for a
    variable, ``None`` otherwise (enables a fast path for input that is
    already in canonical shape).
``matches(expr)``
    True when a SymPy atom is a generator of this mode (returns its label and
    component).

A two-mode boson (``f(N) a^\dagger = a^\dagger f(N + 1)``,
``a^{\dagger k} a^k = N(N-1)\cdots(N-k+1)``) fits this protocol with one
variable ``N``; spherical tensor components :math:`T^k_q` would add a
generator whose shift is ``q`` on an existing angular-momentum label.

Examples
========

>>> from sympy import symbols, expand
>>> from amalgebra.algebra.modes import ANGULAR_MOMENTUM
>>> q, m = symbols("q m")
>>> expand(ANGULAR_MOMENTUM.raise_lower(1, (q, m)))     # J+ J- = J^2 - Jz^2 + Jz
-m**2 + m + q
"""

from sympy import I, S

from .operators import AngularMomentumComponent

__all__ = ["AngularMomentumMode", "ANGULAR_MOMENTUM", "mode_of", "register_mode"]


class AngularMomentumMode:
    """The mode of one angular momentum: variables ``(J^2, J_z)``, shift on ``J_z``.

    :math:`J_+^k J_-^k = \\prod_{i=0}^{k-1} (J^2 - (J_z - i)(J_z - i - 1))` and
    :math:`J_-^k J_+^k = \\prod_{i=0}^{k-1} (J^2 - (J_z + i)(J_z + i + 1))`,
    both from :math:`J_\\pm J_\\mp = J^2 - J_z^2 \\pm J_z` and
    :math:`f(J_z) J_\\pm = J_\\pm f(J_z \\pm 1)`.
    """

    kind = "angular_momentum"
    variables = ("sq", "z")
    shift_index = 1

    def raise_lower(self, k, v):
        q, m = v
        result = S.One if not hasattr(q, "ring") else q.ring.one
        for i in range(k):
            result = result * (q - (m - i) * (m - i - 1))
        return result

    def lower_raise(self, k, v):
        q, m = v
        result = S.One if not hasattr(q, "ring") else q.ring.one
        for i in range(k):
            result = result * (q - (m + i) * (m + i + 1))
        return result

    def atom(self, component, v, domain):
        """``(pairs, den)``: the generator is ``sum(R^(d) p for d, p in pairs) / den``."""
        q, m = v
        one = q.ring.one
        if component == "plus":
            return [(1, one)], 1
        if component == "minus":
            return [(-1, one)], 1
        if component == "z":
            return [(0, m)], 1
        if component == "squared":
            return [(0, q)], 1
        if component == "x":
            return [(1, one), (-1, one)], 2
        i = domain.from_sympy(I)
        return [(1, one.mul_ground(-i)), (-1, one.mul_ground(i))], 2  # Jy = (J+ - J-)/(2i)

    def direct(self, component):
        """How a generator sits in the output convention: ``("shift", +-1)``,
        ``("var", index)``, or ``None`` when it is a combination (``x``, ``y``)."""
        return _DIRECT.get(component)

    def atom_constants(self, component):
        return (I,) if component == "y" else ()

    def ladder_factor(self, label, d):
        if d > 0:
            return AngularMomentumComponent(label, "plus") ** d
        return AngularMomentumComponent(label, "minus") ** (-d)

    def variable_factor(self, label, index, power):
        name = "squared" if index == 0 else "z"
        return AngularMomentumComponent(label, name) ** power

    def matches(self, expr):
        if isinstance(expr, AngularMomentumComponent):
            return expr.label, expr.component
        return None


_DIRECT = {"plus": ("shift", 1), "minus": ("shift", -1), "squared": ("var", 0), "z": ("var", 1)}

ANGULAR_MOMENTUM = AngularMomentumMode()

_MODES = [ANGULAR_MOMENTUM]


def register_mode(mode):
    """Add a mode (an object following the protocol above) to the kernel's registry.

    Other generator families (two-mode bosons, ...) call this once at import.
    Registering the same object twice is a no-op.  A ``TypeError`` names the
    first missing protocol member.
    """
    for name in ("variables", "shift_index", "raise_lower", "lower_raise", "atom", "atom_constants",
                 "direct", "ladder_factor", "variable_factor", "matches"):
        if not hasattr(mode, name):
            raise TypeError(f"mode={mode!r} must define {name!r} (see amalgebra.algebra.modes)")
    if mode not in _MODES:
        _MODES.append(mode)
    return mode


def mode_of(atom):
    """Return ``(mode, label, component)`` for a generator atom, or ``None``."""
    for mode in _MODES:
        found = mode.matches(atom)
        if found is not None:
            return (mode,) + found
    return None
