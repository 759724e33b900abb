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
``s`` (see :mod:`amalgebra.coupling.kernels`).  Symbols are cached by canonical
key (:mod:`amalgebra.coupling.symmetry`).

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

from sympy import Add, Expr, Integer, Mul, Pow, Rational, S

from ..errors import NotNumericError
from ..qnumbers import doubled, doubled_projection, quantum_number, triangle_doubled
from .kernels import multiply_sqrt
from .symmetry import ninej_triple, sixj_triple, threej_triple

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


def _plain_doubled(values):
    """Doubled j's when every value is a nonnegative ``int`` or a SymPy integer or half-integer,
    else ``None`` (the caller then takes the general, validating route).

    One pass instead of :func:`_symbolic` followed by :func:`read_js`: the common call
    with plain numbers pays for neither the symbolic check nor a call per argument.
    """
    out = []
    for v in values:
        if type(v) is int:
            if v < 0:
                return None
            out.append(2 * v)
        elif isinstance(v, Rational) and v.p >= 0:
            q = v.q
            if q == 2:
                out.append(v.p)
            elif q == 1:
                out.append(2 * v.p)
            else:
                return None
        else:
            return None
    return out


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


def _plain_root(s):
    """``Pow(Integer(s), 1/2)`` unevaluated, built as ``Pow.__new__(..., evaluate=False)`` builds it.

    SymPy's own constructor spends most of its time on checks that cannot apply
    to an Integer base and a Half exponent; the result is the same object (a
    module-import check below falls back to the public constructor otherwise).
    """
    obj = Expr.__new__(Pow, Integer(s), S.Half)
    obj.is_commutative = True
    return obj


def _public_root(s):
    return Pow(Integer(s), S.Half, evaluate=False)


def _check_plain_root():
    try:
        fast = _plain_root(6)
        return fast == _public_root(6) and hash(fast) == hash(_public_root(6)) and (fast * fast) == 6
    except (AttributeError, TypeError):  # pragma: no cover - other SymPy versions
        return False


_root = _plain_root if _check_plain_root() else _public_root
_coprime = getattr(Rational, "from_coprime_ints", None) or Rational


def _to_sympy(triple):
    """SymPy number ``n/d*sqrt(s)`` from a canonical triple, never factorising ``s``."""
    n, d, s = triple
    if n == 0:
        return S.Zero
    coeff = _coprime(n, d)
    if s == 1:
        return coeff
    root = _root(s)
    if coeff is S.One:
        return root
    return Mul._from_args((coeff, root), is_commutative=True)


def threej_doubled(tj1, tj2, tj3, tm1, tm2, tm3):
    """Canonical triple ``(n, d, s)`` of a 3j from doubled ints (selection rules applied)."""
    if tm1 + tm2 + tm3 or not triangle_doubled(tj1, tj2, tj3):
        return 0, 1, 1
    if abs(tm1) > tj1 or abs(tm2) > tj2 or abs(tm3) > tj3:
        return 0, 1, 1
    if tm1 == 0 and tm2 == 0 and (tj1 + tj2 + tj3) // 2 & 1:
        return 0, 1, 1
    return threej_triple(tj1, tj2, tj3, tm1, tm2, tm3)


def sixj_doubled(tj1, tj2, tj3, tj4, tj5, tj6):
    """Canonical triple of a 6j from doubled ints (triangle rules applied)."""
    # Each triad (a b c) needs an even sum and |a - b| <= c <= a + b.
    if ((tj1 + tj2 + tj3) & 1 or (tj1 + tj5 + tj6) & 1 or (tj4 + tj2 + tj6) & 1 or (tj4 + tj5 + tj3) & 1
            or not abs(tj1 - tj2) <= tj3 <= tj1 + tj2 or not abs(tj1 - tj5) <= tj6 <= tj1 + tj5
            or not abs(tj4 - tj2) <= tj6 <= tj4 + tj2 or not abs(tj4 - tj5) <= tj3 <= tj4 + tj5):
        return 0, 1, 1
    return sixj_triple(tj1, tj2, tj3, tj4, tj5, tj6)


def ninej_doubled(*tj):
    """Canonical triple of a 9j (row by row) from doubled ints (triangle rules applied)."""
    for x, y, z in ((0, 1, 2), (3, 4, 5), (6, 7, 8), (0, 3, 6), (1, 4, 7), (2, 5, 8)):
        if not triangle_doubled(tj[x], tj[y], tj[z]):
            return 0, 1, 1
    return ninej_triple(*tj)


def cg_doubled(tj1, tm1, tj2, tm2, tJ, tM):
    """Canonical triple of <j1 m1 j2 m2|J M> from doubled ints (selection rules applied)."""
    if tm1 + tm2 != tM:
        return 0, 1, 1
    triple = threej_doubled(tj1, tj2, tJ, tm1, tm2, -tM)
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


_SIX_NAMES = ("j1", "j2", "j3", "j4", "j5", "j6")


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
    args = (j1, j2, j3, j4, j5, j6)
    tj = _plain_doubled(args)
    if tj is None:
        if _symbolic(args):
            return _closed_form("sixj_closed_form")(*args)
        tj = read_js(args)
    return _to_sympy(sixj_doubled(*tj))


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
    triple = sixj_doubled(ta, tb, te, td, tc, tf)
    if triple[0] and (ta + tb + tc + td) // 2 & 1:
        triple = (-triple[0], triple[1], triple[2])
    return _to_sympy(triple)
