r"""Schwinger's oscillator model: angular momentum from two boson modes.

Explanation
===========

Convention (fixed for amalgebra, Sakurai section 3.8, Schwinger 1952):

.. math::

    J_+ = a^\dagger b, \quad J_- = b^\dagger a, \quad
    J_z = \tfrac12(\hat N_a - \hat N_b), \quad
    J^2 = \tfrac{\hat N}{2}\left(\tfrac{\hat N}{2} + 1\right),
    \quad \hat N = \hat N_a + \hat N_b ,

and on states :math:`|j\,m\rangle \leftrightarrow |n_a = j + m,\; n_b = j - m\rangle`,
so :math:`j = (n_a + n_b)/2`, :math:`m = (n_a - n_b)/2`, with

.. math::

    |j\,m\rangle = \frac{(a^\dagger)^{j+m} (b^\dagger)^{j-m}}{\sqrt{(j+m)!\,(j-m)!}}\,|0, 0\rangle .

With these choices the map is an algebra homomorphism, Condon-Shortley phases
included: :math:`J_+|j m\rangle = \sqrt{(j-m)(j+m+1)}\,|j, m+1\rangle`.

Image of the map (what :func:`from_bosons` accepts).  The map is injective.
An operator in its image commutes with :math:`\hat N`, i.e. every
normal-ordered term :math:`a^{\dagger p} a^{p'} b^{\dagger q} b^{q'} f(\hat N_a, \hat N_b)`
has :math:`p - p' + q - q' = 0`; such a term is
:math:`J_\pm^{d} f(j + J_z, j - J_z)` with the *operator*
:math:`j = \hat N/2`.  Since the enveloping algebra only contains
:math:`J^2 = j(j+1)`, not :math:`j` itself, the image is exactly the operators
commuting with :math:`\hat N` whose coefficients, written in
:math:`(J_z, j)`, are unchanged by :math:`j \to -1 - j` (then they are
polynomials in :math:`j(j+1)`).  So :math:`a^\dagger a` and
:math:`\hat N_a + \hat N_b` are *not* in the image; on one irrep (fixed
:math:`j`) they are, and ``from_bosons(..., j=Symbol("j"))`` returns that
restriction with :math:`j` as a commutative scalar.

Operators that leave the image change :math:`j`: :math:`a^\dagger` raises
:math:`j` and :math:`m` by :math:`1/2`, :math:`a^\dagger b^\dagger` raises
:math:`j` by 1; :func:`apply_schwinger` gives their exact action on
:math:`|j m\rangle` kets.

Examples
========

>>> from sympy import Symbol, sqrt
>>> from amalgebra.algebra import AngularMomentum, canonical, commutator
>>> from amalgebra.bosons import BosonMode, to_bosons, from_bosons, apply_schwinger
>>> from amalgebra.states import ket
>>> J = AngularMomentum("J")
>>> a, b = BosonMode("a"), BosonMode("b")
>>> to_bosons(J.z)
a.number/2 - b.number/2
>>> from_bosons(a.create*b.annihilate*b.number)        # J+ (j - Jz) needs j ...
Traceback (most recent call last):
...
amalgebra.errors.NotInImageError: expr term a.create*b.annihilate*b.number depends on j = (N_a + N_b)/2 other than through J^2 = j(j + 1); pass j=Symbol('j') to restrict to one irrep
>>> from_bosons(a.create*b.annihilate*b.number, j=Symbol("j"))
j*J.plus - J.plus*J.z
>>> apply_schwinger(a.create*b.create, ket(1, 0))       # pair creation raises j by 1
2*|2, 0>_J

An identity, [J+, J-] = 2 Jz through the bosons (Sakurai (3.8.5)):

>>> commutator(to_bosons(J.plus), to_bosons(J.minus)) == to_bosons(2*J.z) != 0
True

See Also
========

amalgebra.bosons.fock, amalgebra.rotations.wigner.small_d

References
==========

.. [1] J. Schwinger, "On Angular Momentum" (1952), in *Quantum Theory of Angular
   Momentum*, eds. L. C. Biedenharn and H. van Dam (Academic Press, 1965).
.. [2] J. J. Sakurai, *Modern Quantum Mechanics* (1994), section 3.8.
"""

import numbers
from fractions import Fraction
from functools import lru_cache
from math import comb, factorial

from sympy import Add, Dummy, Expr, I, Matrix, Mul, Rational, S, cos, expand, sin, sqrt
from sympy.polys.rings import PolyRing

from ..algebra.canonical import canonical
from ..algebra.convert import kernel_of
from ..algebra.operators import AngularMomentum, AngularMomentumComponent, _check_label
from ..errors import NotInImageError, NotNumericError, OperatorError, StateError
from ..qnumbers import doubled, doubled_projection
from ..states.kets import Ket, components
from .fock import FockKet, apply_bosons, fock_components, vacuum
from .operators import BOSON, BosonMode

__all__ = ["NotInImageError", "schwinger_images", "to_bosons", "from_bosons", "spin_to_fock",
           "fock_to_spin", "apply_schwinger", "schwinger_shifts", "rotated_creators", "schwinger_small_d",
           "schwinger_small_d_matrix", "clear_schwinger_caches"]


def _scalar(value, name):
    if isinstance(value, bool) or not isinstance(value, (numbers.Real, Fraction, Expr)):
        raise NotNumericError(f"{name}={value!r} must be a number or a commutative SymPy expression")
    value = S(value)
    if not value.is_commutative:
        raise NotNumericError(f"{name}={value} must be commutative (a number or a symbol), not an operator")
    return value


def _poly_expr(algebra, poly):
    """A kernel polynomial as a SymPy expression in the mode variables (ring symbols).

    Goes through ``algebra.terms`` (coefficients in ``algebra.domain``; Gaussian
    kernels carry the imaginary unit as an extra generator) rather than
    ``poly.as_expr()``.
    """
    domain = algebra.domain
    symbols = algebra.ring.symbols
    gens = [g for idx in algebra.var_index for g in idx]
    items = algebra.terms(poly) if hasattr(algebra, "terms") else list(poly.items())
    return Add(*[domain.to_sympy(domain.convert(c)) * Mul(*[symbols[g] ** mon[g] for g in gens if mon[g]])
                 for mon, c in sorted(items, reverse=True)])


def _mode_pair(modes):
    if isinstance(modes, (str, bytes)) or not hasattr(modes, "__len__") or len(modes) != 2:
        raise OperatorError(f"modes={modes!r} must be a pair of mode labels such as ('a', 'b')")
    first, second = (_check_label(getattr(m, "label", m), "modes") for m in modes)
    if first == second:
        raise OperatorError(f"modes={modes!r} must be two distinct labels")
    return first, second


def _setup(label, modes):
    label = _check_label(label, "label")
    first, second = _mode_pair(modes)
    if label in (first, second):
        raise OperatorError(f"label={label!r} must differ from the mode labels {first!r}, {second!r}")
    return label, first, second


def schwinger_images(label="J", modes=("a", "b")):
    """The boson image of every component of ``AngularMomentum(label)``.

    Returns ``{component: expression}`` for ``plus, minus, x, y, z, squared``
    (convention in the module docstring).

    >>> images = schwinger_images()
    >>> images["plus"], images["minus"]
    (a.create*b.annihilate, b.create*a.annihilate)
    >>> images["squared"]
    (a.number + b.number)*(1 + (a.number + b.number)/2)/2
    """
    label, first, second = _setup(label, modes)
    a, b = BosonMode(first), BosonMode(second)
    plus = a.create * b.annihilate
    minus = b.create * a.annihilate
    half_n = (a.number + b.number) / 2
    return {
        "plus": plus,
        "minus": minus,
        "x": (plus + minus) / 2,
        "y": (plus - minus) / (2 * I),
        "z": (a.number - b.number) / 2,
        "squared": half_n * (half_n + 1),
    }


def to_bosons(expr, label="J", modes=("a", "b")):
    r"""Map an angular-momentum expression to bosons (Schwinger map), normal-ordered.

    Every component of ``AngularMomentum(label)`` is replaced by its image
    (:func:`schwinger_images`); other labels and boson modes are kept.  The
    result is in canonical form (:func:`amalgebra.algebra.canonical`).

    Examples
    ========

    >>> from amalgebra.algebra import AngularMomentum
    >>> J = AngularMomentum("J")
    >>> to_bosons(J.minus*J.plus)                # = N_b (N_a + 1)
    a.number*b.number + b.number
    >>> to_bosons(J.minus*J.plus) == to_bosons(J.squared - J.z**2 - J.z)   # J-J+ = J^2 - Jz^2 - Jz
    True

    Parameters
    ==========

    expr : Expr
    label : str, default ``"J"``
    modes : pair of labels, default ``("a", "b")``

    Raises
    ======

    OperatorError
        Bad labels (equal modes, a mode named like ``label``) or bad operator input.

    See Also
    ========

    from_bosons, schwinger_images
    """
    images = schwinger_images(label, modes)
    mapping = {AngularMomentumComponent(label, c): v for c, v in images.items()}
    if not hasattr(expr, "xreplace"):
        return canonical(expr)  # numbers, or a clear OperatorError for bad input
    return canonical(expr.xreplace(mapping))


def from_bosons(expr, label="J", modes=("a", "b"), j=None):
    r"""The inverse Schwinger map, for boson expressions in its image.

    Explanation
    ===========

    See the module docstring for the image: each normal-ordered term must
    commute with :math:`\hat N_a + \hat N_b`, and its coefficient, written in
    :math:`J_z` and :math:`j = (\hat N_a + \hat N_b)/2`, must depend on
    :math:`j` only through :math:`J^2 = j(j+1)`.  With ``j`` given (a
    commutative SymPy expression, e.g. ``Symbol("j")``), the second condition
    is dropped and the result is the restriction to the irrep of that ``j``:
    :math:`\hat N_a \to j + J_z`, :math:`\hat N_b \to j - J_z`.

    Operators of other labels or modes are kept.  The result is canonical.

    Examples
    ========

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum, canonical
    >>> from amalgebra.bosons import BosonMode
    >>> a, b = BosonMode("a"), BosonMode("b")
    >>> from_bosons(b.create*a.annihilate)
    J.minus
    >>> from_bosons(a.number*b.number)        # N_a N_b = j^2 - Jz^2, not j(j+1)-only
    Traceback (most recent call last):
    ...
    amalgebra.errors.NotInImageError: expr term a.number*b.number depends on j = (N_a + N_b)/2 other than through J^2 = j(j + 1); pass j=Symbol('j') to restrict to one irrep
    >>> from_bosons(a.number*b.number + (a.number + b.number)/2)    # = J^2 - Jz^2
    J.squared - J.z**2
    >>> J = AngularMomentum("J")
    >>> e = J.plus**2*J.z + 3*J.squared*J.minus
    >>> from_bosons(to_bosons(e)) == canonical(e)      # round trip
    True
    >>> from_bosons(a.number + b.number, j=Symbol("j"))
    2*j

    Parameters
    ==========

    expr : Expr
        A polynomial in boson operators (of ``modes`` and possibly others).
    label : str
        The angular momentum to produce; must not already occur in ``expr``.
    modes : pair of labels
    j : Expr, optional
        Restrict to the irrep with this :math:`j` (a commutative expression).

    Raises
    ======

    NotInImageError
        A term changes :math:`\hat N_a + \hat N_b` (e.g. a lone ``a``), or
        (without ``j``) depends on :math:`j` beyond :math:`j(j+1)`; the
        message names the first offending normal-ordered term.
    OperatorError
        ``label`` already occurs in ``expr``, or a mode label names an angular momentum.

    See Also
    ========

    to_bosons, apply_schwinger
    """
    label, first, second = _setup(label, modes)
    if j is not None:
        j = _scalar(j, "j")
    algebra, (element,) = kernel_of(expr)
    if label in algebra.position:
        raise OperatorError(f"label={label!r} must not already occur in expr={expr}")
    for mode_label in (first, second):
        if mode_label in algebra.position and algebra.modes[algebra.position[mode_label]] is not BOSON:
            raise OperatorError(f"modes label {mode_label!r} must be a boson mode in expr={expr}")
    J = AngularMomentum(label)
    symbols = algebra.ring.symbols
    pa, pb = algebra.position.get(first), algebra.position.get(second)
    na = symbols[algebra.var_index[pa][0]] if pa is not None else None
    nb = symbols[algebra.var_index[pb][0]] if pb is not None else None
    z = Dummy("z")
    others = {}
    for i, other in enumerate(algebra.labels):
        if i in (pa, pb):
            continue
        for k, g in enumerate(algebra.var_index[i]):
            others[symbols[g]] = algebra.modes[i].variable_factor(other, k, 1)
    back = dict(others)
    back[z] = J.z
    casimir = _CasimirForm(algebra, pa, pb, J, others)
    terms = []
    for key in sorted(element):
        da = key[pa] if pa is not None else 0
        db = key[pb] if pb is not None else 0
        poly = element[key]
        if da + db:
            raise NotInImageError(f"expr term {_first_term(algebra, element, key)} changes N_a + N_b by "
                                  f"{da + db}: the image of the Schwinger map commutes with N_a + N_b")
        if j is not None:
            value = _poly_expr(algebra, poly)
            value = expand(value.xreplace({s: v for s, v in ((na, j + z), (nb, j - z)) if s is not None}))
            value = value.xreplace(back)
        else:
            value = casimir.convert(poly)
            if value is None:
                raise NotInImageError(f"expr term {_first_term(algebra, element, key)} depends on "
                                      f"j = (N_a + N_b)/2 other than through J^2 = j(j + 1); "
                                      f"pass j=Symbol('j') to restrict to one irrep")
        ladders = []
        if da:
            ladders.append(J.plus ** da if da > 0 else J.minus ** (-da))
        for i, d in enumerate(key):
            if d and i not in (pa, pb):
                ladders.append(algebra.modes[i].ladder_factor(algebra.labels[i], d))
        terms.append(Mul(*ladders, value) / element.den)
    return canonical(Add(*terms))


class _CasimirForm:
    r"""Rewrite a coefficient polynomial :math:`f(N_a, N_b, \ldots)` as :math:`h(J^2, J_z, \ldots)`.

    Works in a ``sympy.polys`` ring over the kernel domain's field: substitute
    :math:`N_a = t - \tfrac12 + z`, :math:`N_b = t - \tfrac12 - z` (so
    :math:`t = j + \tfrac12`, :math:`z = J_z`), require even powers of
    :math:`t` only, and put :math:`t^2 = J^2 + \tfrac14`.
    """

    def __init__(self, algebra, pa, pb, J, others):
        self.algebra = algebra
        self.field = algebra.domain.get_field()
        self.ga = algebra.var_index[pa][0] if pa is not None else None
        self.gb = algebra.var_index[pb][0] if pb is not None else None
        symbols = algebra.ring.symbols
        self.other_gens = [g for i, idx in enumerate(algebra.var_index) if i not in (pa, pb) for g in idx]
        self.other_factors = [others[symbols[g]] for g in self.other_gens]
        self.ring = PolyRing((Dummy("t"), Dummy("z")), self.field)
        t, z = self.ring.gens
        half = self.field.convert(Rational(1, 2))
        self.up, self.down = t - half + z, t - half - z
        self.quarter = self.field.convert(Rational(1, 4))
        self.J = J
        self._powers = {}

    def _power(self, which, e):
        hit = self._powers.get((which, e))
        if hit is None:
            base = self.up if which == 0 else self.down
            hit = self._powers[(which, e)] = base ** e
        return hit

    def convert(self, poly):
        """A SymPy expression in ``J.squared``, ``J.z`` and other labels' variables, or None."""
        algebra, field = self.algebra, self.field
        items = algebra.terms(poly) if hasattr(algebra, "terms") else list(poly.items())
        groups = {}
        one = self.ring.one
        for mon, c in items:
            value = one.mul_ground(field.convert(c, algebra.domain))
            if self.ga is not None and mon[self.ga]:
                value = value * self._power(0, mon[self.ga])
            if self.gb is not None and mon[self.gb]:
                value = value * self._power(1, mon[self.gb])
            rest = tuple(mon[g] for g in self.other_gens)
            groups[rest] = groups[rest] + value if rest in groups else value
        terms = []
        for rest in sorted(groups):
            acc = {}
            for (et, ez), c in groups[rest].items():
                if et % 2:
                    return None
                # t^(2i) z^k = (J^2 + 1/4)^i z^k: expand the binomial
                i = et // 2
                for r in range(i + 1):
                    coeff = c * field.convert(comb(i, r)) * self.quarter ** (i - r)
                    acc[(r, ez)] = acc.get((r, ez), field.zero) + coeff
            others = [f ** e for f, e in zip(self.other_factors, rest) if e]
            for (eq, ez), c in sorted(acc.items(), reverse=True):
                if c:
                    terms.append(Mul(field.to_sympy(c), self.J.squared ** eq, self.J.z ** ez, *others))
        return Add(*terms)


def _first_term(algebra, element, key):
    poly = element[key]
    items = algebra.terms(poly) if hasattr(algebra, "terms") else list(poly.items())
    mon, coeff = max(items, key=lambda item: item[0])
    value = algebra.domain.to_sympy(algebra.domain.convert(coeff)) / element.den
    return Mul(value, *algebra.term_factors(key, mon))


def schwinger_shifts(expr, modes=("a", "b")):
    r"""The changes :math:`(\Delta j, \Delta m)` that the terms of a boson operator make.

    Explanation
    ===========

    A normal-ordered term that changes :math:`n_a` by :math:`d_a` and
    :math:`n_b` by :math:`d_b` maps :math:`|j m\rangle` to
    :math:`|j + (d_a + d_b)/2,\; m + (d_a - d_b)/2\rangle`.  Returns the sorted
    list of distinct pairs; the operator is in the image of the Schwinger map
    only if every :math:`\Delta j` is 0 (see :func:`from_bosons`).

    Examples
    ========

    >>> from amalgebra.bosons import BosonMode
    >>> a, b = BosonMode("a"), BosonMode("b")
    >>> schwinger_shifts(a.create)                       # raises j and m by 1/2
    [(1/2, 1/2)]
    >>> schwinger_shifts(a.create*b.create + a.annihilate**2)
    [(-1, -1), (1, 0)]
    >>> schwinger_shifts(a.create*b.annihilate + a.number)    # J+ and a j-conserving term
    [(0, 0), (0, 1)]

    Parameters
    ==========

    expr : Expr
        A polynomial in boson operators; other labels are ignored.
    modes : pair of labels
    """
    first, second = _mode_pair(modes)
    algebra, (element,) = kernel_of(expr)
    pa, pb = algebra.position.get(first), algebra.position.get(second)
    shifts = set()
    for key in element:
        da = key[pa] if pa is not None else 0
        db = key[pb] if pb is not None else 0
        shifts.add((Rational(da + db, 2), Rational(da - db, 2)))
    return sorted(shifts)


def spin_to_fock(state, label="J", modes=("a", "b")):
    r"""Map kets :math:`|j m\rangle_{label}` to Fock kets :math:`|j+m, j-m\rangle`.

    Examples
    ========

    >>> from amalgebra.states import ket
    >>> spin_to_fock(ket("3/2", "-1/2") + 2*ket(0, 0))
    2*|0, 0>_(a,b) + |1, 2>_(a,b)

    Raises
    ======

    StateError
        For kets of another label, product kets or non-ket input.
    """
    label, first, second = _setup(label, modes)
    terms = []
    for basis, coeff in components(state, name="state").items():
        if not isinstance(basis, Ket) or basis.label != label:
            raise StateError(f"state={basis} must be a ket |j m>_{label} (or a combination of them)")
        terms.append(coeff * FockKet((first, second), (basis.j + basis.m, basis.j - basis.m)))
    return Add(*terms)


def fock_to_spin(state, label="J", modes=("a", "b")):
    r"""Map Fock kets :math:`|n_a, n_b\rangle` to :math:`|j m\rangle_{label}`,
    :math:`j = (n_a + n_b)/2`, :math:`m = (n_a - n_b)/2`.

    Examples
    ========

    >>> from amalgebra.bosons import fock_ket
    >>> fock_to_spin(fock_ket(3, 0))
    |3/2, 3/2>_J

    Raises
    ======

    StateError
        For Fock kets over other modes than ``modes``.
    """
    label, first, second = _setup(label, modes)
    expected = tuple(sorted((first, second)))
    terms = []
    for basis, coeff in fock_components(state, name="state").items():
        if basis.modes != expected:
            raise StateError(f"state={basis} must be a Fock ket of exactly the modes {expected}")
        n = basis.as_dict()
        terms.append(coeff * Ket((n[first] + n[second]) / 2, (n[first] - n[second]) / 2, label))
    return Add(*terms)


def apply_schwinger(op, state, label="J", modes=("a", "b")):
    r"""Act with a boson (or angular-momentum) operator on :math:`|j m\rangle` kets.

    Explanation
    ===========

    ``state`` goes to Fock kets (:func:`spin_to_fock`), components of
    ``AngularMomentum(label)`` in ``op`` to bosons, the operator acts
    exactly (:func:`~amalgebra.bosons.fock.apply_bosons`) and the result comes
    back as :math:`|j m\rangle` kets.  Operators outside the image change
    :math:`j`:

    .. math::

        a^\dagger|j m\rangle = \sqrt{j+m+1}\,|j+\tfrac12, m+\tfrac12\rangle, \quad
        b^\dagger|j m\rangle = \sqrt{j-m+1}\,|j+\tfrac12, m-\tfrac12\rangle,

        a|j m\rangle = \sqrt{j+m}\,|j-\tfrac12, m-\tfrac12\rangle, \quad
        b|j m\rangle = \sqrt{j-m}\,|j-\tfrac12, m+\tfrac12\rangle .

    Examples
    ========

    >>> from sympy import Symbol
    >>> from amalgebra.algebra import AngularMomentum
    >>> from amalgebra.bosons import BosonMode
    >>> from amalgebra.states import ket
    >>> a, b = BosonMode("a"), BosonMode("b")
    >>> j = Symbol("j", nonnegative=True)
    >>> m = Symbol("m")
    >>> apply_schwinger(a.create, ket(j, m))
    sqrt(j + m + 1)*|j + 1/2, m + 1/2>_J
    >>> apply_schwinger(a.annihilate*b.annihilate, ket(2, 1))    # pair annihilation: j -> j - 1
    sqrt(3)*|1, 1>_J
    >>> apply_schwinger(AngularMomentum("J").plus, ket(1, 0))     # Condon-Shortley
    sqrt(2)*|1, 1>_J
    """
    images = schwinger_images(label, modes)
    _, first, second = _setup(label, modes)
    if hasattr(op, "xreplace"):
        op = op.xreplace({AngularMomentumComponent(label, c): v for c, v in images.items()})
    fock = spin_to_fock(state, label, modes)
    return fock_to_spin(apply_bosons(op, fock), label, modes)


def rotated_creators(beta, modes=("a", "b")):
    r"""The creation operators rotated by :math:`U = e^{-i\beta J_y}`: :math:`U a^\dagger U^{-1}`, :math:`U b^\dagger U^{-1}`.

    With :math:`J_y = (a^\dagger b - b^\dagger a)/(2i)`,
    :math:`[J_y, a^\dagger] = \tfrac{i}{2} b^\dagger` and
    :math:`[J_y, b^\dagger] = -\tfrac{i}{2} a^\dagger`, so the Hadamard series gives

    .. math::

        a^\dagger \to \cos\tfrac\beta2\, a^\dagger + \sin\tfrac\beta2\, b^\dagger, \qquad
        b^\dagger \to -\sin\tfrac\beta2\, a^\dagger + \cos\tfrac\beta2\, b^\dagger .

    >>> from sympy import Symbol
    >>> rotated_creators(Symbol("beta"))
    (sin(beta/2)*b.create + cos(beta/2)*a.create, -sin(beta/2)*a.create + cos(beta/2)*b.create)
    """
    first, second = _mode_pair(modes)
    a, b = BosonMode(first), BosonMode(second)
    half = _scalar(beta, "beta") / 2
    c, s = cos(half), sin(half)
    return c * a.create + s * b.create, -s * a.create + c * b.create


def schwinger_small_d(j, mp, m, beta):
    r"""Wigner's :math:`d^j_{m'm}(\beta)` computed in the boson picture (Schwinger 1952).

    Explanation
    ===========

    :math:`e^{-i\beta J_y}|j m\rangle` is
    :math:`(A^\dagger)^{j+m} (B^\dagger)^{j-m} |0\rangle / \sqrt{(j+m)!(j-m)!}`
    with the rotated creators :math:`A^\dagger, B^\dagger` of
    :func:`rotated_creators`; the product is expanded and applied to the
    vacuum by the boson engine, and :math:`d^j_{m'm}` is read off as the
    component along :math:`|j m'\rangle`.  Active rotation, Condon-Shortley
    phase: the same function as :func:`amalgebra.rotations.wigner.small_d`.

    Examples
    ========

    >>> from sympy import Symbol, expand, cos
    >>> b = Symbol("beta")
    >>> schwinger_small_d("1/2", "-1/2", "1/2", b)
    sin(beta/2)
    >>> schwinger_small_d(1, 1, 0, b)
    -sqrt(2)*sin(beta/2)*cos(beta/2)
    >>> from amalgebra.rotations.wigner import small_d
    >>> expand(schwinger_small_d(2, 1, -1, b) - small_d(2, 1, -1, b))
    0

    Parameters
    ==========

    j, mp, m : numeric quantum numbers (validated by :mod:`amalgebra.qnumbers`)
    beta : SymPy expression or number

    Raises
    ======

    QuantumNumberError, ProjectionError, NotNumericError
        For invalid or symbolic ``j``, ``m'``, ``m``.
    """
    tj = doubled(j, "j", nonnegative=True)
    tmp = doubled_projection(tj, mp, "mp", "j")
    tm = doubled_projection(tj, m, "m", "j")
    half = _scalar(beta, "beta") / 2
    if abs(tm) > tj or abs(tmp) > tj:
        return S.Zero
    return _rotated_column(tj, tm).get(tmp, S.Zero).xreplace({_C: cos(half), _S: sin(half)})


def schwinger_small_d_matrix(j, beta):
    r"""The matrix :math:`d^j(\beta)` from the boson picture, rows :math:`m' = j, \ldots, -j`, columns :math:`m = j, \ldots, -j`.

    Same ordering as :func:`amalgebra.rotations.wigner.small_d_matrix`; one boson
    expansion per column (cached per ``(2j, 2m)``).

    >>> from sympy import Symbol
    >>> schwinger_small_d_matrix("1/2", Symbol("beta"))
    Matrix([
    [cos(beta/2), -sin(beta/2)],
    [sin(beta/2),  cos(beta/2)]])
    """
    tj = doubled(j, "j", nonnegative=True)
    half = _scalar(beta, "beta") / 2
    values = {_C: cos(half), _S: sin(half)}
    rows = []
    for tmp in range(tj, -tj - 1, -2):
        rows.append([_rotated_column(tj, tm).get(tmp, S.Zero).xreplace(values) for tm in range(tj, -tj - 1, -2)])
    return Matrix(rows)


_C, _S = Dummy("c"), Dummy("s")


@lru_cache(maxsize=512)
def _rotated_column(tj, tm):
    """``{2m': d^j_{m'm}}`` as polynomials in the placeholders ``_C = cos(beta/2)``, ``_S = sin(beta/2)``."""
    a, b = BosonMode("a"), BosonMode("b")
    up, down = _C * a.create + _S * b.create, -_S * a.create + _C * b.create
    p, q = (tj + tm) // 2, (tj - tm) // 2
    rotated = apply_bosons(Mul(up ** p, down ** q) if p and q else (up ** p if p else down ** q), vacuum())
    out = {}
    for basis, coeff in fock_components(rotated).items():
        n = basis.as_dict()
        out[n["a"] - n["b"]] = expand(coeff / sqrt(factorial(p) * factorial(q)))
    return out


def clear_schwinger_caches():
    """Forget the cached boson expansions of :func:`schwinger_small_d` (for cold benchmarks)."""
    _rotated_column.cache_clear()
