r"""Exact Clebsch-Gordan coefficients, Wigner 3j, 6j, 9j symbols and Racah W coefficients.

Explanation
===========

Conventions (fixed for the whole of amalgebra, see ``design.md``):

* Condon-Shortley phases; the Clebsch-Gordan coefficient
  :math:`\langle j_1 m_1 j_2 m_2 | J M\rangle` is real with
  :math:`\langle j_1 j_1; j_2 (J-j_1) | J J\rangle > 0`.
* :math:`\begin{pmatrix} j_1 & j_2 & j_3\\ m_1 & m_2 & m_3\end{pmatrix}
  = (-1)^{j_1-j_2-m_3} (2j_3+1)^{-1/2} \langle j_1 m_1 j_2 m_2 | j_3, -m_3\rangle`
  (DLMF §34.2; Edmonds 1957, eqs. 3.7.3 and 3.7.7).
* 6j and 9j as in Edmonds (6.3.7), (6.4.3); Racah's
  :math:`W(abcd; ef) = (-1)^{a+b+c+d} \{a\ b\ e; d\ c\ f\}`.

Arguments are read by :mod:`amalgebra.qnumbers` (ints, ``Rational``,
``"3/2"``, exact half-integer floats).  A negative ``j`` or a value that is not a
multiple of 1/2 raises :class:`~amalgebra.errors.QuantumNumberError`, ``j - m``
not an integer raises :class:`~amalgebra.errors.ProjectionError`, a non-number
raises :class:`~amalgebra.errors.NotNumericError`.  A violated selection rule
(triangle rule, ``|m| > j``, ``m1 + m2 != M``) gives an exact ``0``.

If any argument is a symbolic SymPy expression the call is handed to the
closed forms of :mod:`amalgebra.coupling.closed_forms`.

Results are exact SymPy numbers in the canonical form ``r * sqrt(s)`` with
``r`` rational and ``s`` a squarefree integer, built without factorising
``s`` (see :mod:`amalgebra.coupling.kernels`), and put together directly from
the kernel's integers (no generic SymPy arithmetic, no assumption queries; the
objects are equal, with equal hashes and printing, to ``Rational(n, d)*sqrt(s)``
built the generic way, which the import checks and the tests pin).  Symbols are
cached by canonical key (:mod:`amalgebra.coupling.symmetry`); :func:`sixj` reads
its arguments, checks the triangle rules and builds the key in one step
(compiled when the extension is built).

Limits.  A coefficient that is not zero by a selection rule is computed only
for every ``j <= max_coupling_j`` (default 10 000; 9j: ``max_ninej_j``, default
1000) of :mod:`amalgebra.limits`; above, :class:`~amalgebra.errors.LimitError`
is raised at once, naming the limit and how to raise it
(``with amalgebra.limits.input_limits(max_coupling_j=...)``).  Zeros by a
selection rule and the Clebsch-Gordan coefficients that are exactly 1 (a zero
``j1`` or ``j2``, or ``J = j1 + j2`` with ``M = +-J``) come back for any size.

Examples
========

>>> from sympy import Rational, S, sqrt
>>> from amalgebra.coupling import cg, threej, sixj, ninej, racah_w
>>> cg("1/2", "1/2", "1/2", "-1/2", 1, 0)
sqrt(2)/2
>>> threej(1, 1, 2, 1, -1, 0)
sqrt(30)/30
>>> sixj(1, 1, 1, 1, 1, 1)
1/6
>>> ninej(1, 1, 0, 1, 1, 0, 0, 0, 0)  # a zero entry reduces a 9j to a 6j (DLMF 34.6.2)
1/3

An identity, completeness of the coupled basis (sum over J and m1 of squared coefficients):

>>> sum(cg(1, m1, 1, -m1, J, 0)**2 for m1 in (-1, 0, 1) for J in (0, 1, 2)) == 3
True

References
==========

.. [1] A. R. Edmonds, *Angular Momentum in Quantum Mechanics*, Princeton (1957), ch. 3 and 6.
.. [2] NIST Digital Library of Mathematical Functions, chapter 34, https://dlmf.nist.gov/34
"""

from fractions import Fraction

from sympy import Add, Expr, Integer, Mul, Pow, Rational, S

from ..errors import NotNumericError
from ..limits import DEFAULT_LIMITS, check_limit, current_limits
from ..qnumbers import doubled, doubled_projection, quantum_number, triangle_doubled
from . import kernels
from .kernels import multiply_sqrt, sixj_key_plain
from .symmetry import _sixj_canonical, _threej_canonical, ninej_triple, sixj_triple, threej_triple

__all__ = ["cg", "threej", "sixj", "ninej", "racah_w"]


def _symbolic(args):
    """True when some argument is a symbolic (non-numeric) SymPy expression.

    For a SymPy object this is ``not qnumbers.is_numeric(a)``, i.e. ``not a.is_Number``,
    tested inline because it runs on every call.
    """
    for a in args:
        if type(a) is not int and isinstance(a, Expr) and not a.is_Number:
            return True
    return False


def _closed_form(name):
    try:
        from amalgebra.coupling import closed_forms
    except ImportError as exc:  # pragma: no cover - depends on the closed-forms module
        raise NotNumericError(f"symbolic arguments need amalgebra.coupling.closed_forms ({exc})") from exc
    function = getattr(closed_forms, name, None)
    if function is None:
        raise NotNumericError(f"no closed form {name} is available for symbolic arguments; "
                              "give numeric j and m")
    return function


def _dj(value, name):
    """Doubled nonnegative ``j``; fast path for ``int`` and SymPy ``Rational``."""
    if type(value) is int and value >= 0:
        return 2 * value
    if isinstance(value, Rational) and value.q <= 2 and value.p >= 0:
        return value.p * (2 // value.q)
    return doubled(value, name, nonnegative=True)


def _dm(tj, value, name, jname):
    """Doubled projection ``m`` checked against doubled ``tj`` (``j - m`` integer)."""
    if type(value) is int:
        tm = 2 * value
    elif isinstance(value, Rational) and value.q <= 2:
        tm = value.p * (2 // value.q)
    else:
        return doubled_projection(tj, value, name, jname)
    if (tj - tm) & 1:
        return doubled_projection(tj, value, name, jname)  # raises ProjectionError
    return tm


def _public_root(s):
    return Pow(Integer(s), S.Half, evaluate=False)


def _public_value(triple):
    """The generic construction ``Rational(n, d) * sqrt(s)`` (the yardstick of :func:`_to_sympy`)."""
    n, d, s = triple
    return Rational(n, d) * Pow(Integer(s), S.Half)


_ROOTS = {}
_ROOTS_MAX = 1 << 14


def _fast_root(s):
    """``sqrt(s)`` for a squarefree ``s >= 2``, built as ``Pow(Integer(s), 1/2, evaluate=False)``
    builds it but without its checks, which cannot apply here; small roots are shared."""
    root = _ROOTS.get(s)
    if root is None:
        base = Expr.__new__(Integer)
        base.p = s
        root = Expr.__new__(Pow, base, S.Half)
        root.is_commutative = True
        if len(_ROOTS) < _ROOTS_MAX:
            _ROOTS[s] = root
    return root


_UNITS = {0: S.Zero, 1: S.One, -1: S.NegativeOne}
_new = object.__new__
_INTEGER_ASSUMPTIONS = Integer.default_assumptions
_RATIONAL_ASSUMPTIONS = Rational.default_assumptions
_MUL_ASSUMPTIONS = Mul.default_assumptions


def _fast_value(triple):
    """SymPy number ``n/d*sqrt(s)`` from a canonical triple, never factorising ``s`` and never
    running SymPy's generic arithmetic: the Rational, the root and the product are assembled
    slot by slot exactly as ``Basic.__new__`` assembles them for already canonical parts
    (``_check_fast_value`` compares with the generic construction at import)."""
    n, d, s = triple
    if d == 1:
        coeff = _UNITS.get(n)
        if coeff is None:
            coeff = _new(Integer)
            coeff._assumptions = _INTEGER_ASSUMPTIONS
            coeff._mhash = None
            coeff._args = ()
            coeff.p = n
        elif n == 0:
            return coeff
    elif n == 1 and d == 2:
        coeff = S.Half
    else:
        coeff = _new(Rational)
        coeff._assumptions = _RATIONAL_ASSUMPTIONS
        coeff._mhash = None
        coeff._args = ()
        coeff.p = n
        coeff.q = d
    if s == 1:
        return coeff
    root = _ROOTS.get(s) or _fast_root(s)
    if n == 1 and d == 1:
        return root
    value = _new(Mul)
    value._assumptions = _MUL_ASSUMPTIONS
    value._mhash = None
    value._args = (coeff, root)
    value.is_commutative = True
    return value


def _slow_value(triple):
    n, d, s = triple
    if n == 0:
        return S.Zero
    coeff = Rational(n, d)
    if s == 1:
        return coeff
    root = _public_root(s)
    if coeff is S.One:
        return root
    return Mul._from_args((coeff, root), is_commutative=True)


def _check_fast_value():
    """The direct construction gives SymPy's own objects (same type, args, hash, printing)."""
    try:
        for triple in ((0, 1, 1), (1, 1, 1), (-1, 1, 1), (7, 1, 1), (1, 2, 1), (-1, 2, 1), (5, 7, 1),
                       (1, 1, 6), (-1, 1, 6), (1, 2, 2), (-3, 35, 70), (12, 1, 5)):
            fast, public = _fast_value(triple), _public_value(triple)
            if not (type(fast) is type(public) and fast == public and hash(fast) == hash(public)
                    and fast.args == public.args and str(fast) == str(public)):
                return False
        return True
    except (AttributeError, TypeError):  # pragma: no cover - other SymPy versions
        return False


_to_sympy = _fast_value if _check_fast_value() else _slow_value

_FAST_DOUBLED = 2000
"""Largest doubled j of the one-step routes (within every default limit)."""


def _check_size(tj, names, field, why):
    """Refuse the largest of the doubled ``tj`` above the limit ``field`` in force (LimitError)."""
    big = max(tj)
    limits = current_limits()
    if big <= _FAST_DOUBLED and limits is DEFAULT_LIMITS:
        return
    limit = getattr(limits, field)
    if limit is None or big <= 2 * limit:
        return
    check_limit(field, Fraction(big, 2), names[tj.index(big)], why)


_SIX_NAMES = ("j1", "j2", "j3", "j4", "j5", "j6")
_CG_NAMES = ("j1", "j2", "J")
_THREEJ_NAMES = ("j1", "j2", "j3")
_NINE_NAMES = ("j11", "j12", "j13", "j21", "j22", "j23", "j31", "j32", "j33")
_WHY = "the Racah sum has up to 2j terms of thousands of digits"


def _sixj_key_python(*values):
    """Pure-Python twin of the compiled ``sixj_key``: the sorted key, 0 or None.

    ``None`` unless every value is an ``int`` or a SymPy integer or half-integer with
    ``0 <= 2j <= _FAST_DOUBLED`` (the caller then takes the general, validating route): the
    common call with plain numbers pays for neither the symbolic check nor a call per argument.
    """
    tj = []
    for v in values:
        if type(v) is int:
            t = 2 * v
        elif isinstance(v, Rational):
            t = v.q
            if t == 2:
                t = v.p
            elif t == 1:
                t = 2 * v.p
            else:
                return None
        else:
            return None
        if not 0 <= t <= _FAST_DOUBLED:
            return None
        tj.append(t)
    return sixj_key_plain(*tj)


def _no_key(*values):
    """Without the compiled module the 3j and CG calls take the validating route directly."""
    return None


if kernels._compiled is not None:
    kernels._compiled.register_rational(Rational, _FAST_DOUBLED)
    _sixj_key = kernels._compiled.sixj_key
    _threej_key = kernels._compiled.threej_key
    _cg_key = kernels._compiled.cg_key
else:
    _sixj_key = _sixj_key_python
    _threej_key = _cg_key = _no_key


def threej_doubled(tj1, tj2, tj3, tm1, tm2, tm3, names=_THREEJ_NAMES):
    """Canonical triple ``(n, d, s)`` of a 3j from doubled ints (selection rules applied,
    then the limit ``max_coupling_j``)."""
    if tm1 + tm2 + tm3 or not triangle_doubled(tj1, tj2, tj3):
        return 0, 1, 1
    if abs(tm1) > tj1 or abs(tm2) > tj2 or abs(tm3) > tj3:
        return 0, 1, 1
    if tm1 == 0 and tm2 == 0 and (tj1 + tj2 + tj3) // 2 & 1:
        return 0, 1, 1
    _check_size((tj1, tj2, tj3), names, "max_coupling_j", _WHY)
    return threej_triple(tj1, tj2, tj3, tm1, tm2, tm3)


def sixj_doubled(tj1, tj2, tj3, tj4, tj5, tj6, names=_SIX_NAMES):
    """Canonical triple of a 6j from doubled ints (triangle rules applied, then the limit
    ``max_coupling_j``)."""
    # Each triad (a b c) needs an even sum and |a - b| <= c <= a + b.
    if ((tj1 + tj2 + tj3) & 1 or (tj1 + tj5 + tj6) & 1 or (tj4 + tj2 + tj6) & 1 or (tj4 + tj5 + tj3) & 1
            or not abs(tj1 - tj2) <= tj3 <= tj1 + tj2 or not abs(tj1 - tj5) <= tj6 <= tj1 + tj5
            or not abs(tj4 - tj2) <= tj6 <= tj4 + tj2 or not abs(tj4 - tj5) <= tj3 <= tj4 + tj5):
        return 0, 1, 1
    _check_size((tj1, tj2, tj3, tj4, tj5, tj6), names, "max_coupling_j", _WHY)
    return sixj_triple(tj1, tj2, tj3, tj4, tj5, tj6)


def ninej_doubled(*tj):
    """Canonical triple of a 9j (row by row) from doubled ints (triangle rules applied, then
    the limit ``max_ninej_j``)."""
    for x, y, z in ((0, 1, 2), (3, 4, 5), (6, 7, 8), (0, 3, 6), (1, 4, 7), (2, 5, 8)):
        if not triangle_doubled(tj[x], tj[y], tj[z]):
            return 0, 1, 1
    _check_size(tj, _NINE_NAMES, "max_ninej_j", "a sum of up to 2j products of three 6j")
    return ninej_triple(*tj)


def cg_doubled(tj1, tm1, tj2, tm2, tJ, tM):
    """Canonical triple of <j1 m1 j2 m2|J M> from doubled ints (selection rules applied; the
    coefficients that are exactly 1 for any size; then the limit ``max_coupling_j``)."""
    if tm1 + tm2 != tM:
        return 0, 1, 1
    if (triangle_doubled(tj1, tj2, tJ) and abs(tm1) <= tj1 and abs(tm2) <= tj2 and abs(tM) <= tJ
            and (tj1 == 0 or tj2 == 0 or (tJ == tj1 + tj2 and abs(tM) == tJ))):
        return 1, 1, 1  # <j1 m1 0 0|j1 m1>, <0 0 j2 m2|j2 m2>, stretched <j1 +-j1 j2 +-j2|J +-J>
    triple = threej_doubled(tj1, tj2, tJ, tm1, tm2, -tM, _CG_NAMES)
    if triple[0] == 0:
        return triple
    n, d, s = multiply_sqrt(triple, tJ + 1)
    return (-n if (tj1 - tj2 + tM) // 2 & 1 else n), d, s


def read_threej(j1, j2, j3, m1, m2, m3):
    """Validated doubled arguments of a 3j."""
    tj1, tj2, tj3 = _dj(j1, "j1"), _dj(j2, "j2"), _dj(j3, "j3")
    return (tj1, tj2, tj3, _dm(tj1, m1, "m1", "j1"), _dm(tj2, m2, "m2", "j2"), _dm(tj3, m3, "m3", "j3"))


def read_cg(j1, m1, j2, m2, J, M):
    """Validated doubled arguments of a Clebsch-Gordan coefficient."""
    tj1, tj2, tJ = _dj(j1, "j1"), _dj(j2, "j2"), _dj(J, "J")
    return (tj1, _dm(tj1, m1, "m1", "j1"), tj2, _dm(tj2, m2, "m2", "j2"), tJ, _dm(tJ, M, "M", "J"))


def read_js(values, names=_SIX_NAMES):
    """Validated doubled j's, named by ``names`` in errors."""
    return [_dj(v, name) for v, name in zip(values, names)]


def read_ninej(values):
    """Validated doubled j's of a 9j, named j11 ... j33."""
    names = ("j11", "j12", "j13", "j21", "j22", "j23", "j31", "j32", "j33")
    return tuple(_dj(v, name) for v, name in zip(values, names))


def cg(j1, m1, j2, m2, J, M):
    r"""Clebsch-Gordan coefficient :math:`\langle j_1 m_1 j_2 m_2 | J M\rangle`, exact.

    Explanation
    ===========

    Condon-Shortley phase convention: real, with
    :math:`\langle j_1 j_1; j_2 (J-j_1) | J J\rangle > 0`; related to the 3j
    symbol by :math:`\langle j_1 m_1 j_2 m_2|J M\rangle = (-1)^{j_1-j_2+M}\sqrt{2J+1}
    \begin{pmatrix} j_1 & j_2 & J\\ m_1 & m_2 & -M\end{pmatrix}` (the 3j definition above, inverted).

    Examples
    ========

    >>> from amalgebra.coupling import cg
    >>> cg(1, 0, "1/2", "1/2", "3/2", "1/2")      # PDG table 1 x 1/2
    sqrt(6)/3
    >>> cg(1, 0, "1/2", "1/2", "1/2", "1/2")
    -sqrt(3)/3
    >>> cg(1, 1, 1, 1, 1, 2)                      # M != m1 + m2: a selection-rule zero
    0

    Parameters
    ==========

    j1, m1, j2, m2, J, M : int, Rational, str such as ``"3/2"``, or SymPy expressions
        (symbolic ones go to :func:`amalgebra.coupling.closed_forms.cg_closed_form`).

    See Also
    ========

    threej, amalgebra.coupling.floats.cg_float

    References
    ==========

    .. [1] Particle Data Group, "Clebsch-Gordan coefficients, spherical harmonics and d functions".
    """
    key = _cg_key(j1, m1, j2, m2, J, M)
    if key.__class__ is tuple:
        if current_limits() is DEFAULT_LIMITS:
            n, d, s = multiply_sqrt(_threej_canonical(key[0]), key[2] + 1)
            return _to_sympy((-n, d, s) if key[1] else (n, d, s))
    elif key == 0:
        return S.Zero
    elif key == 1:
        return S.One
    args = (j1, m1, j2, m2, J, M)
    if _symbolic(args):
        return _closed_form("cg_closed_form")(*args)
    return _to_sympy(cg_doubled(*read_cg(*args)))


def threej(j1, j2, j3, m1, m2, m3):
    r"""Wigner 3j symbol :math:`\begin{pmatrix} j_1 & j_2 & j_3\\ m_1 & m_2 & m_3\end{pmatrix}`, exact.

    Explanation
    ===========

    :math:`(j_1 j_2 j_3; m_1 m_2 m_3) = (-1)^{j_1-j_2-m_3}(2j_3+1)^{-1/2}
    \langle j_1 m_1 j_2 m_2 | j_3, -m_3\rangle`, evaluated by Racah's single sum
    (Edmonds 3.7.3) in integers.  Zero unless ``m1+m2+m3 = 0``, ``|mi| <= ji`` and
    the triangle rule holds.

    Examples
    ========

    >>> from amalgebra.coupling import threej
    >>> threej(1, 1, 0, 1, -1, 0)
    sqrt(3)/3
    >>> threej(2, 2, 2, 0, 0, 0)                 # DLMF 34.3.5
    -sqrt(70)/35
    >>> threej(1, 2, 3, 1, 1, -2) == threej(2, 3, 1, 1, -2, 1)    # cyclic symmetry (DLMF 34.3.8)
    True

    Parameters
    ==========

    j1, j2, j3, m1, m2, m3 : numbers as read by :mod:`amalgebra.qnumbers`, or SymPy expressions.

    See Also
    ========

    cg, sixj, amalgebra.coupling.floats.threej_float

    References
    ==========

    .. [1] NIST DLMF 34.2, 34.3, https://dlmf.nist.gov/34.2
    """
    key = _threej_key(j1, j2, j3, m1, m2, m3)
    if key:
        if current_limits() is DEFAULT_LIMITS:
            n, d, s = _threej_canonical(key[0])
            return _to_sympy((-n, d, s) if key[1] else (n, d, s))
    elif key == 0:
        return S.Zero
    args = (j1, j2, j3, m1, m2, m3)
    if _symbolic(args):
        return _closed_form("threej_closed_form")(*args)
    return _to_sympy(threej_doubled(*read_threej(*args)))


def sixj(j1, j2, j3, j4, j5, j6):
    r"""Wigner 6j symbol :math:`\{j_1\ j_2\ j_3; j_4\ j_5\ j_6\}`, exact.

    Explanation
    ===========

    Racah's single sum (Edmonds 6.3.7) with the four triangle coefficients of
    the triads (j1 j2 j3), (j1 j5 j6), (j4 j2 j6), (j4 j5 j3); zero unless all
    four triangle rules hold.

    Examples
    ========

    >>> from amalgebra.coupling import sixj
    >>> sixj(1, 1, 1, 1, 1, 1)
    1/6
    >>> sixj(0, 1, 1, 2, 1, 1)                    # a zero entry (DLMF §34.5)
    1/3
    >>> sixj(1, 2, 3, 2, 1, 2) == sixj(2, 1, 3, 1, 2, 2) != 0    # column swap (DLMF §34.4)
    True

    Parameters
    ==========

    j1, ..., j6 : numbers as read by :mod:`amalgebra.qnumbers`, or SymPy expressions.

    See Also
    ========

    racah_w, ninej

    References
    ==========

    .. [1] NIST DLMF 34.4, https://dlmf.nist.gov/34.4
    """
    key = _sixj_key(j1, j2, j3, j4, j5, j6)
    if key:
        if current_limits() is DEFAULT_LIMITS:
            return _to_sympy(_sixj_canonical(key))
    elif key == 0:
        return S.Zero
    args = (j1, j2, j3, j4, j5, j6)
    if _symbolic(args):
        return _closed_form("sixj_closed_form")(*args)
    return _to_sympy(sixj_doubled(*read_js(args)))


def ninej(j11, j12, j13, j21, j22, j23, j31, j32, j33):
    r"""Wigner 9j symbol, arguments row by row, exact.

    Explanation
    ===========

    :math:`\{j_{11}\ j_{12}\ j_{13}; j_{21}\ j_{22}\ j_{23}; j_{31}\ j_{32}\ j_{33}\}
    = \sum_x (-1)^{2x}(2x+1) \{j_{11}\ j_{12}\ j_{13}; j_{23}\ j_{33}\ x\}
    \{j_{21}\ j_{22}\ j_{23}; j_{12}\ x\ j_{32}\}\{j_{31}\ j_{32}\ j_{33}; x\ j_{11}\ j_{21}\}`
    (Edmonds 1957, eq. 6.4.3), summed exactly over a common denominator with
    one common square root.  Zero unless every row and column obeys the
    triangle rule.

    Examples
    ========

    >>> from amalgebra.coupling import ninej
    >>> ninej(1, 1, 1, 1, 1, 1, 1, 1, 1)
    0
    >>> ninej("1/2", "1/2", 1, "1/2", "1/2", 1, 1, 1, 2)
    1/9

    Parameters
    ==========

    j11, ..., j33 : numbers as read by :mod:`amalgebra.qnumbers`.  Symbolic
        arguments need ``ninej_closed_form`` in :mod:`amalgebra.coupling.closed_forms`,
        otherwise :class:`~amalgebra.errors.NotNumericError` is raised.

    See Also
    ========

    sixj

    References
    ==========

    .. [1] NIST DLMF 34.6, https://dlmf.nist.gov/34.6
    """
    args = (j11, j12, j13, j21, j22, j23, j31, j32, j33)
    if _symbolic(args):
        return _closed_form("ninej_closed_form")(*args)
    return _to_sympy(ninej_doubled(*read_ninej(args)))


def racah_w(a, b, c, d, e, f):
    r"""Racah W coefficient :math:`W(abcd; ef) = (-1)^{a+b+c+d}\{a\ b\ e; d\ c\ f\}`, exact.

    Examples
    ========

    >>> from amalgebra.coupling import racah_w, sixj
    >>> racah_w(1, 1, 1, 1, 1, 1)
    1/6
    >>> racah_w(1, 2, 1, 1, 2, 1) == -sixj(1, 2, 2, 1, 1, 1)
    True

    Parameters
    ==========

    a, b, c, d, e, f : numbers as read by :mod:`amalgebra.qnumbers`, or SymPy expressions.

    See Also
    ========

    sixj

    References
    ==========

    .. [1] G. Racah, Phys. Rev. 62, 438 (1942); Edmonds (1957), eq. 6.2.13.
    """
    args = (a, b, c, d, e, f)
    if _symbolic(args):
        phase = S.NegativeOne ** Add(*(quantum_number(v, n, nonnegative=True) for v, n in zip(args[:4], "abcd")))
        return phase * _closed_form("sixj_closed_form")(a, b, e, d, c, f)
    ta, tb, tc, td, te, tf = read_js(args, "abcdef")
    triple = sixj_doubled(ta, tb, te, td, tc, tf, "abedcf")
    if triple[0] and (ta + tb + tc + td) // 2 & 1:
        triple = (-triple[0], triple[1], triple[2])
    return _to_sympy(triple)
