r"""The Wigner-Eckart engine: reduced matrix elements, both ways, and selection rules.

Explanation
===========

For an irreducible spherical tensor operator :math:`T^k_q` (rank ``k``,
components ``q = -k..k``) every matrix element between angular-momentum
eigenstates factors into a geometric coefficient and one *reduced matrix
element* independent of the projections.  Default normalisation (Edmonds 1957,
eq. 5.4.1; ``convention="edmonds"``):

.. math::

    \langle j' m' | T^k_q | j m \rangle
      = (-1)^{j'-m'} \begin{pmatrix} j' & k & j \\ -m' & q & m \end{pmatrix}
        \langle j' \| T^k \| j \rangle ,

so that :math:`\langle j \| J \| j \rangle = \sqrt{j(j+1)(2j+1)}`.  The
Clebsch-Gordan-form normalisation (``convention="cg"``, used e.g. by Rose
and Brink-Satchler style texts) is

.. math::

    \langle j' m' | T^k_q | j m \rangle
      = \langle j m\, k q | j' m' \rangle \, \langle j' \| T^k \| j \rangle_{\mathrm{CG}} ,

and the two are related by
:math:`\langle j'\|T^k\|j\rangle = \sqrt{2j'+1}\,\langle j'\|T^k\|j\rangle_{\mathrm{CG}}`
(:func:`convert_reduced`; follows from the 3j definition of design.md and
the column-swap symmetry of the 3j symbol, and is checked numerically in the
tests).  Any other convention name raises
:class:`~amalgebra.errors.ConventionError`.

:class:`ReducedMatrixElement` is an unevaluated SymPy ``Expr`` for
:math:`\langle j'\|T^k\|j\rangle` (state in ``.args``, double-bar printing) so
formulas stay symbolic in it.  :func:`wigner_eckart` builds a matrix element
from it, :func:`reduced_from_element` and :func:`reduced_from_table` go back,
:func:`element_table` gives all :math:`(m', q, m)` at once,
:func:`selection_rules` returns the conditions as SymPy booleans.  The
coupled-scheme formulas (Edmonds ch. 7) are in
:mod:`amalgebra.tensors.coupled_schemes`.

Examples
========

>>> from sympy import sqrt, Rational
>>> from amalgebra.tensors.wigner_eckart import wigner_eckart, ReducedMatrixElement, reduced_from_element
>>> T = ReducedMatrixElement("T", 1, 1, 1)
>>> T
<1||T^(1)||1>
>>> wigner_eckart(1, 1, 1, 1, 1, 0, T)
-sqrt(6)*<1||T^(1)||1>/6

An identity: with :math:`\langle j\|J\|j\rangle = \sqrt{j(j+1)(2j+1)}` the
engine reproduces :math:`\langle j, m|J_0|j m\rangle = m` (here ``j = 3/2``,
``m = 1/2``):

>>> j = Rational(3, 2)
>>> wigner_eckart(j, Rational(1, 2), 1, 0, j, Rational(1, 2), sqrt(j*(j + 1)*(2*j + 1)))
1/2
>>> reduced_from_element(Rational(1, 2), j, Rational(1, 2), 1, 0, j, Rational(1, 2)) == sqrt(15)
True

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton (1957), eq. (5.4.1).
.. [2] NIST DLMF chapter 34 (3j symbols), https://dlmf.nist.gov/34
"""

from sympy import Abs, And, Eq, Expr, Le, Mod, S, Tuple, simplify, sqrt
from sympy.core.symbol import Str

from .._validation import as_expression
from ..notation import NotationHooks
from ..coupling import cg, threej
from ..errors import ConventionError, QuantumNumberError, TensorOperatorError
from ..qnumbers import doubled, quantum_number
from ..results import ElementTable

__all__ = [
    "CONVENTIONS",
    "ReducedMatrixElement",
    "check_convention",
    "wigner_eckart",
    "wigner_eckart_factor",
    "wigner_eckart_factor_float",
    "reduced_from_element",
    "element_table",
    "reduced_from_table",
    "convert_reduced",
    "selection_rules",
    "hermitian_conjugate_reduced",
]

#: The accepted normalisation names.
CONVENTIONS = ("edmonds", "cg")


def check_convention(convention, name="convention"):
    """Return ``convention`` if it is one of :data:`CONVENTIONS`, else raise ConventionError.

    >>> check_convention("cg")
    'cg'
    """
    if isinstance(convention, Str):
        convention = convention.name
    if convention not in CONVENTIONS:
        raise ConventionError(f"{name}={convention!r} must be one of {', '.join(map(repr, CONVENTIONS))}")
    return convention


def _j(value, name):
    return quantum_number(value, name, nonnegative=True)


def _m(value, name):
    return quantum_number(value, name)


def _rank(k, name="k"):
    return quantum_number(k, name, nonnegative=True)


def _sign(exponent):
    """(-1)**exponent, exact, for an integer (numeric or symbolic) exponent."""
    exponent = as_expression(exponent)
    if exponent.is_Integer:
        return S.NegativeOne if int(exponent) % 2 else S.One
    if exponent.is_number:
        raise QuantumNumberError(f"phase exponent={exponent} must be an integer")
    return S.NegativeOne ** exponent


class ReducedMatrixElement(NotationHooks, Expr):
    r"""The unevaluated reduced matrix element :math:`\langle j'\|T^{k}\|j\rangle`.

    Explanation
    ===========

    ``args`` are ``(Str(name), k, j', j, Str(convention))``; the convention
    (``"edmonds"``, the default, or ``"cg"``; see the module docstring) is part
    of the object because the two normalisations differ by
    :math:`\sqrt{2j'+1}`.  It is a commutative scalar (a number yet unknown),
    never evaluated; ``j'``, ``j`` and ``k`` may be symbols.

    Examples
    ========

    >>> from sympy import latex, Rational
    >>> from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
    >>> r = ReducedMatrixElement("Q", 2, Rational(3, 2), Rational(3, 2))
    >>> r, latex(r)
    (<3/2||Q^(2)||3/2>, '\\langle \\frac{3}{2} \\| Q^{(2)} \\| \\frac{3}{2} \\rangle')
    >>> r.func(*r.args) == r
    True
    >>> ReducedMatrixElement("Q", 2, 1, 1, "cg")
    <1||Q^(2)||1>_cg

    Parameters
    ==========

    name : str
        The operator's name, e.g. ``"T"``.
    k : rank (nonnegative half-integer or symbol)
    jp, j : the bra and ket angular momenta
    convention : {"edmonds", "cg"}

    See Also
    ========

    wigner_eckart, convert_reduced
    """

    __slots__ = ()
    is_commutative = True
    #: an unknown number: ``lambdify([R], expr)`` takes it as an argument (replaced by a Dummy)
    is_symbol = True

    def __new__(cls, name, k, jp, j, convention="edmonds"):
        if isinstance(name, Str):
            name = name.name
        if not isinstance(name, str) or not name:
            raise TypeError(f"name={name!r} must be a non-empty str")
        convention = check_convention(convention)
        return Expr.__new__(cls, Str(name), _rank(k), _j(jp, "jp"), _j(j, "j"), Str(convention))

    name = property(lambda self: self.args[0].name, doc="The operator name.")
    rank = property(lambda self: self.args[1], doc="The rank k.")
    bra_j = property(lambda self: self.args[2], doc="j' of the bra.")
    ket_j = property(lambda self: self.args[3], doc="j of the ket.")
    convention = property(lambda self: self.args[4].name, doc="The normalisation name.")

    _notation_key = "reduced"


def wigner_eckart_factor(jp, mp, k, q, j, m, convention="edmonds"):
    r"""The geometric factor multiplying the reduced element in :math:`\langle j'm'|T^k_q|jm\rangle`.

    ``(-1)^(j'-m') (j' k j; -m' q m)`` for ``"edmonds"``,
    ``<j m k q|j' m'>`` for ``"cg"``.  Selection-rule violations give ``0``.

    Examples
    ========

    >>> from amalgebra.tensors.wigner_eckart import wigner_eckart_factor
    >>> wigner_eckart_factor(1, 0, 1, 0, 1, 0)
    0
    >>> wigner_eckart_factor(1, 1, 1, 1, 0, 0, "cg")
    1
    """
    convention = check_convention(convention)
    jp, j, k = _j(jp, "jp"), _j(j, "j"), _rank(k)
    mp, q, m = _m(mp, "mp"), _m(q, "q"), _m(m, "m")
    if convention == "cg":
        return cg(j, m, k, q, jp, mp)
    return _sign(jp - mp) * threej(jp, k, j, -mp, q, m)


def wigner_eckart_factor_float(jp, mp, k, q, j, m, convention="edmonds"):
    """Float twin of :func:`wigner_eckart_factor` (numeric arguments): the correctly rounded 3j or CG.

    The numeric matrices of :mod:`amalgebra.matrices` take their
    Wigner-Eckart factors from here, the exact ones from
    :func:`wigner_eckart_factor`: the same formula, written in this module only.

    >>> abs(wigner_eckart_factor_float(1, 0, 1, 0, 0, 0) - 3 ** -0.5) < 1e-15
    True
    """
    from ..coupling import cg_float, threej_float

    if convention == "cg":
        return cg_float(j, m, k, q, jp, mp)
    return (-1.0) ** int(jp - mp) * threej_float(jp, k, j, -mp, q, m)


def wigner_eckart(jp, mp, k, q, j, m, reduced=None, *, name="T", convention="edmonds"):
    r"""The matrix element :math:`\langle j' m'|T^k_q|j m\rangle` in terms of the reduced one.

    Explanation
    ===========

    Returns ``wigner_eckart_factor(...) * reduced``.  ``reduced`` defaults to
    the symbol ``ReducedMatrixElement(name, k, jp, j, convention)``; any SymPy
    expression (a number, a symbol) may be given instead.

    Examples
    ========

    >>> from amalgebra.tensors.wigner_eckart import wigner_eckart
    >>> wigner_eckart(2, 1, 1, 1, 1, 0, name="V")
    sqrt(10)*<2||V^(1)||1>/10
    >>> wigner_eckart(2, 1, 1, 1, 1, 0, 7, convention="cg")
    7*sqrt(2)/2

    Parameters
    ==========

    jp, mp, k, q, j, m : quantum numbers (numbers as accepted by :mod:`amalgebra.qnumbers`)
    reduced : Expr, optional
    name : str
        Operator name for the default symbolic reduced element.
    convention : {"edmonds", "cg"}

    See Also
    ========

    reduced_from_element, element_table, selection_rules
    """
    convention = check_convention(convention)
    if reduced is None:
        reduced = ReducedMatrixElement(name, k, jp, j, convention)
    return wigner_eckart_factor(jp, mp, k, q, j, m, convention) * as_expression(reduced)


def reduced_from_element(element, jp, mp, k, q, j, m, convention="edmonds"):
    r"""The reduced matrix element from one full matrix element :math:`\langle j'm'|T^k_q|jm\rangle`.

    Raises :class:`~amalgebra.errors.QuantumNumberError` when the geometric
    factor vanishes (a selection-rule zero carries no information).

    Examples
    ========

    >>> from amalgebra.tensors.wigner_eckart import reduced_from_element
    >>> reduced_from_element(1, "1/2", "1/2", 0, 0, "1/2", "1/2")   # <1/2 1/2|1|1/2 1/2> = 1
    sqrt(2)
    """
    factor = wigner_eckart_factor(jp, mp, k, q, j, m, convention)
    if factor == 0:
        raise QuantumNumberError(
            f"(jp, mp, k, q, j, m)=({jp}, {mp}, {k}, {q}, {j}, {m}) must have a nonzero "
            f"Wigner-Eckart factor to give the reduced matrix element")
    return as_expression(element) / factor


def _values(j2):
    return [S(j2 - 2 * i) / 2 for i in range(j2 + 1)]


def element_table(jp, k, j, reduced=None, *, name="T", convention="edmonds"):
    r"""All matrix elements :math:`\langle j' m'|T^k_q|j m\rangle` for numeric ``jp, k, j``.

    Returns a dict ``{(m', q, m): value}`` over every ``m'``, ``m`` (from the
    top down) with ``q = m' - m`` and ``|q| <= k``; other ``q`` give zero by
    the ``q = m' - m`` selection rule and are left out.

    Examples
    ========

    >>> from amalgebra.tensors.wigner_eckart import element_table
    >>> table = element_table("1/2", 1, "1/2", 1)
    >>> sorted(table.items())[:2]
    [((-1/2, -1, 1/2), sqrt(3)/3), ((-1/2, 0, -1/2), -sqrt(6)/6)]
    """
    convention = check_convention(convention)
    jp2, k2, j2 = doubled(jp, "jp", nonnegative=True), doubled(k, "k", nonnegative=True), \
        doubled(j, "j", nonnegative=True)
    if reduced is None:
        reduced = ReducedMatrixElement(name, S(k2) / 2, S(jp2) / 2, S(j2) / 2, convention)
    reduced = as_expression(reduced)
    table = {}
    for mp in _values(jp2):
        for m in _values(j2):
            q = mp - m
            if abs(q) * 2 > k2 or (k2 - 2 * q) % 2:
                continue
            table[(mp, q, m)] = wigner_eckart_factor(S(jp2) / 2, mp, S(k2) / 2, q, S(j2) / 2, m,
                                                     convention) * reduced
    return ElementTable(table)  # a dict that displays as LaTeX in notebooks


def reduced_from_table(table, jp, k, j, *, convention="edmonds"):
    r"""The reduced element of a whole table of matrix elements, checking it is a tensor.

    Explanation
    ===========

    ``table`` maps ``(m', q, m)`` to :math:`\langle j'm'|T^k_q|jm\rangle`
    (missing entries are zero), or is a callable ``f(m', q, m)``.  Every entry
    must equal its Wigner-Eckart factor times one common reduced element;
    otherwise :class:`~amalgebra.errors.TensorOperatorError` is raised (the
    operator is not an irreducible rank-``k`` tensor between these ``j``).
    Returns ``0`` when every entry vanishes.

    Examples
    ========

    >>> from sympy import sqrt
    >>> from amalgebra.tensors.wigner_eckart import element_table, reduced_from_table
    >>> reduced_from_table(element_table(2, 2, 1, sqrt(3)), 2, 2, 1) == sqrt(3)
    True
    """
    convention = check_convention(convention)
    jp2, k2, j2 = doubled(jp, "jp", nonnegative=True), doubled(k, "k", nonnegative=True), \
        doubled(j, "j", nonnegative=True)
    get = table if callable(table) else (lambda mp, q, m: table.get((mp, q, m), S.Zero))
    if not callable(table):
        for key in sorted(table, key=str):
            mp, q, m = (as_expression(x) for x in key)
            if (table[key] != 0 and (mp - m != q or abs(q) * 2 > k2 or abs(mp) * 2 > jp2
                                     or abs(m) * 2 > j2)):
                raise TensorOperatorError(f"table[{key}]={table[key]} must vanish: it breaks "
                                          f"q = m' - m or a range |m| <= j")
    candidate = None
    entries = []
    for mp in _values(jp2):
        for m in _values(j2):
            q = mp - m
            if abs(q) * 2 > k2 or (k2 - 2 * q) % 2:
                continue
            factor = wigner_eckart_factor(S(jp2) / 2, mp, S(k2) / 2, q, S(j2) / 2, m, convention)
            value = as_expression(get(mp, q, m))
            entries.append((factor, value, (mp, q, m)))
            if candidate is None and factor != 0 and value != 0:
                candidate = value / factor
    if candidate is None:
        candidate = S.Zero
    for factor, value, key in entries:
        if simplify(value - factor * candidate) != 0:
            raise TensorOperatorError(
                f"table[{key}]={value} must equal {factor}*{candidate} for an irreducible tensor "
                f"of rank k={S(k2) / 2} between j'={S(jp2) / 2} and j={S(j2) / 2}")
    return simplify(candidate)


def convert_reduced(value, jp, j, from_convention, to_convention):
    r"""Convert a reduced matrix element between normalisations.

    :math:`\langle j'\|T\|j\rangle_{\mathrm{edmonds}} = \sqrt{2j'+1}\,\langle j'\|T\|j\rangle_{\mathrm{cg}}`.
    A :class:`ReducedMatrixElement` given as ``value`` stands for that number, so it is
    re-labelled (the same quantity in the other normalisation is the other symbol).

    Examples
    ========

    >>> from amalgebra.tensors.wigner_eckart import convert_reduced, ReducedMatrixElement
    >>> convert_reduced(1, 1, 0, "cg", "edmonds")
    sqrt(3)
    >>> convert_reduced(ReducedMatrixElement("T", 1, 1, 0), 1, 0, "edmonds", "cg")
    <1||T^(1)||0>_cg
    """
    source, target = check_convention(from_convention, "from_convention"), \
        check_convention(to_convention, "to_convention")
    jp = _j(jp, "jp")
    _j(j, "j")
    value = as_expression(value)
    if isinstance(value, ReducedMatrixElement) and value.convention != source:
        raise ConventionError(f"from_convention={source!r} must match the convention "
                              f"{value.convention!r} of value={value}")
    if source == target:
        return value
    factor = sqrt(2 * jp + 1) if source == "cg" else 1 / sqrt(2 * jp + 1)
    if isinstance(value, ReducedMatrixElement):
        name, k, vjp, vj, _c = value.args
        return ReducedMatrixElement(name, k, vjp, vj, target)
    return factor * value


def selection_rules(jp, mp, k, q, j, m, parity=None):
    r"""The conditions for :math:`\langle j'm'|T^k_q|jm\rangle` to be allowed, as a SymPy boolean.

    Explanation
    ===========

    ``q = m' - m``; the triangle rule :math:`|j' - j| \le k \le j' + j` with
    :math:`j' + k + j` an integer; :math:`|m'| \le j'`, :math:`|m| \le j`,
    :math:`|q| \le k`; and, when ``parity=(pi', pi_T, pi)`` is given (each
    ``+1``/``-1`` or a symbol), :math:`\pi' = \pi_T \pi`.  Numeric input
    evaluates to ``true``/``false``; symbolic input stays an unevaluated
    ``And`` (it never decides what it cannot).

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.tensors.wigner_eckart import selection_rules
    >>> selection_rules(1, 0, 1, 0, 0, 0), selection_rules(2, 0, 1, 0, 0, 0)
    (True, False)
    >>> selection_rules(1, 0, 1, 0, 0, 0, parity=(1, -1, 1))   # E1 needs a parity change
    False
    >>> jp, j, mp, m, q = symbols("jp j mp m q")
    >>> selection_rules(jp, mp, 2, q, j, m)
    (Abs(m) <= j) & (Abs(mp) <= jp) & (Abs(q) <= 2) & (2 <= j + jp) & Eq(Mod(j + jp, 1), 0) & (Abs(j - jp) <= 2) & Eq(-m + mp - q, 0)
    """
    jp, j, k = _j(jp, "jp"), _j(j, "j"), _rank(k)
    mp, q, m = _m(mp, "mp"), _m(q, "q"), _m(m, "m")
    conditions = [
        Eq(mp - m - q, 0),
        Le(Abs(jp - j), k), Le(k, jp + j),
        Eq(Mod(jp + k + j, 1), 0),
        Le(Abs(mp), jp), Le(Abs(m), j), Le(Abs(q), k),
    ]
    if parity is not None:
        if not isinstance(parity, (tuple, list, Tuple)) or len(parity) != 3:
            raise TypeError(f"parity={parity!r} must be a triple (pi', pi_T, pi)")
        bra_p, op_p, ket_p = (as_expression(p) for p in parity)
        for label, p in (("pi'", bra_p), ("pi_T", op_p), ("pi", ket_p)):
            if p.is_number and p not in (1, -1):
                raise QuantumNumberError(f"parity {label}={p} must be +1 or -1")
        conditions.append(Eq(bra_p, op_p * ket_p))
    return And(*conditions)


def hermitian_conjugate_reduced(reduced):
    r"""The complex conjugate of :math:`\langle j'\|T^k\|j\rangle` for a Hermitian tensor ``T``.

    Explanation
    ===========

    A Hermitian tensor obeys :math:`(T^k_q)^\dagger = (-1)^q T^k_{-q}`; then
    :math:`\langle j'\|T^k\|j\rangle^* = (-1)^{j'-j}\langle j\|T^k\|j'\rangle`
    (Edmonds convention; from eq. 5.4.1 and the 3j column symmetries), and
    :math:`\langle j'\|T^k\|j\rangle_{\mathrm{cg}}^* = (-1)^{j'-j}\sqrt{(2j+1)/(2j'+1)}\,
    \langle j\|T^k\|j'\rangle_{\mathrm{cg}}`.

    Examples
    ========

    >>> from amalgebra.tensors.wigner_eckart import ReducedMatrixElement, hermitian_conjugate_reduced
    >>> hermitian_conjugate_reduced(ReducedMatrixElement("T", 1, 2, 1))
    -<1||T^(1)||2>
    """
    if not isinstance(reduced, ReducedMatrixElement):
        raise TypeError(f"reduced={reduced!r} must be a ReducedMatrixElement")
    name, k, jp, j, conv = reduced.args
    swapped = ReducedMatrixElement(name, k, j, jp, conv)
    phase = _sign(jp - j)
    if conv.name == "cg":
        return phase * sqrt(2 * j + 1) / sqrt(2 * jp + 1) * swapped
    return phase * swapped
