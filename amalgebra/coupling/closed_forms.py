r"""Closed forms of coupling coefficients for symbolic angular momenta.

Explanation
===========

Monographs tabulate Clebsch-Gordan coefficients ``<j1 m1 j2 m2|J M>`` as
algebraic functions of a *symbolic* ``j1`` (and ``m``) for a small numeric
``j2`` (Condon & Shortley 1935, Tables 2^3 and 3^3; Edmonds 1957, Table 2),
and 6j symbols such as ``{a b c; 1/2, c-1/2, b+1/2}`` as functions of
symbolic ``a, b, c`` (Edmonds 1957, Table 5).  The functions here produce
such forms for *any* arguments of the following shape, not from a table
(:func:`cg_closed_form`, :func:`threej_closed_form`, :func:`sixj_closed_form`;
:func:`ninej_closed_form` for a 9j with one zero argument):

* every argument is a number or a polynomial (in practice: affine) in SymPy
  symbols with rational coefficients, e.g. ``j``, ``j + 1/2``, ``2*j``,
  ``m - 1``, ``a + b``;
* the Racah single sum has a numeric number of terms (for CG and 3j: e.g.
  ``j2`` numeric and ``J - j1`` numeric; for 6j: e.g. one numeric argument
  per row pattern as in Edmonds' Table 5);
* the factorials of every symbolic combination cancel between prefactor and
  sum (true for the shapes above), so the result is algebraic.

The Racah formula (Edmonds 1957 eq. 3.6.11 for CG, eq. 6.3.7 for 6j) is then
evaluated exactly: every ratio ``(x+a)!/(x+b)!`` becomes a finite product,
the sum is taken in a rational-function field and the result is written as

.. math::

    (-1)^{\text{phase}} \times (\text{rational function})
    \times \sqrt{\text{rational function}},

with factored numerators and denominators; a symbolic phase is kept as
``(-1)**(expression)``.

Conventions (fixed for amalgebra): Condon-Shortley phase,
``<j1 j1; j2 (J-j1)|J J> > 0``, and
``(j1 j2 j3; m1 m2 m3) = (-1)**(j1-j2-m3) / sqrt(2 j3 + 1) <j1 m1 j2 m2|j3, -m3>``.

Conditions of validity
======================

A closed form equals the coefficient for **every** value of the symbols
that makes the arguments admissible, i.e. for which
:func:`closed_form_conditions` is true: each ``j`` and ``j - m`` is such that
``j +- m`` are nonnegative integers, and each triad satisfies the triangle
rule with an integer perimeter (``a+b-c``, ``a-b+c``, ``-a+b+c`` nonnegative
integers).  Outside that set the coefficient is zero (or undefined) while
the closed form is in general not zero.  Selection rules are handled like
this:

* a rule that fails for **all** values (numeric ``m1 + m2 - M != 0``,
  ``J - j1`` outside the range allowed by a numeric ``j2``, a numeric
  ``|m2| > j2``, a perimeter that cannot be an integer) gives exact
  ``S.Zero``;
* ``M - m1 - m2`` (or ``m1 + m2 + m3``) that is not a number is kept visible
  as a ``KroneckerDelta`` factor;
* any rule that depends on the symbols (``|m1| <= j1``, ``j1 >= 1`` for the
  ``J = j1 - 1`` row, ...) is *not* in the expression: it is part of
  :func:`closed_form_conditions`.

Arguments of an unsupported shape raise
:class:`~amalgebra.errors.NotNumericError`; numeric arguments are validated
through :mod:`amalgebra.qnumbers`, and a numeric difference of two arguments
that is not a multiple of 1/2 (``J - j1 = 1/3``) raises
:class:`~amalgebra.errors.QuantumNumberError` (``ProjectionError`` for a
``j - m`` that is not an integer).

Phases: a symbolic phase is written ``(-1)**E`` with the numeric part of
``E`` reduced to ``[0, 1)`` and the sign of ``E`` normalised (``E`` is an
integer wherever the coefficient is defined); coefficients of a symbol that
is itself a quantum number up to a number (``j``, ``m - 1/2``) are reduced
modulo 4, since ``(-1)**(4 j) = 1``.

Cost: building one closed form for ``j2 <= 2`` (6j: one entry ``<= 2``) took
2-15 ms with SymPy's cache warm and 25-240 ms cold on the project machine
(``tests/benchmarks/bench_closed_forms.py``); nothing is cached here.

Examples
========

>>> from sympy import symbols, S, simplify, sqrt
>>> from amalgebra.coupling.closed_forms import cg_closed_form, sixj_closed_form
>>> j, m = symbols("j m")
>>> cg_closed_form(j, m - S.Half, S.Half, S.Half, j + S.Half, m)
sqrt((j + m + 1/2)/(2*j + 1))
>>> cg_closed_form(j, m, 1, 0, j, m)
m/sqrt(j*(j + 1))

An identity: the two rows for ``j2 = 1/2`` and ``M = m`` are orthonormal.

>>> up = [cg_closed_form(j, m - S.Half, S.Half, S.Half, J, m) for J in (j + S.Half, j - S.Half)]
>>> down = [cg_closed_form(j, m + S.Half, S.Half, -S.Half, J, m) for J in (j + S.Half, j - S.Half)]
>>> simplify(up[0]**2 + down[0]**2), simplify(up[0]*up[1] + down[0]*down[1])
(1, 0)

References
==========

.. [1] E. U. Condon and G. H. Shortley, The Theory of Atomic Spectra (1935),
   Tables 2^3 and 3^3.
.. [2] A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957),
   eqs. 3.6.11, 6.3.7 and Tables 2 and 5.
"""

from sympy import And, Contains, Dummy, Float, KroneckerDelta, S, expand
from sympy.core.sorting import default_sort_key
from sympy.polys.domains import QQ
from sympy.polys.rings import ring as poly_ring

from ..errors import ConventionError, NotNumericError, ProjectionError, QuantumNumberError
from ..qnumbers import doubled, doubled_projection, half_integer, quantum_number
from .closed_forms_engine import factorial_sum, to_poly

__all__ = [
    "cg_closed_form",
    "threej_closed_form",
    "sixj_closed_form",
    "ninej_closed_form",
    "closed_form_conditions",
]


def _read(values, names, kinds):
    """Validate arguments; return SymPy values. ``kinds``: 'j' or index of the j of an 'm'."""
    out = []
    for value, name, kind in zip(values, names, kinds):
        value = quantum_number(value, name, nonnegative=(kind == "j"))
        if not value.is_Number:
            value = _exact_floats(value, name)
        out.append(value)
    for i, (value, kind) in enumerate(zip(out, kinds)):
        if kind == "j":
            continue
        if value.is_Number and out[kind].is_Number:
            doubled_projection(doubled(out[kind], names[kind]), value, names[i], names[kind])
        elif (out[kind] - value).is_Number and not (out[kind] - value).is_Integer:
            raise ProjectionError(f"{names[kind]} - {names[i]}={out[kind] - value} must be an integer")
    return out


def _exact_floats(value, name):
    """Replace the Floats of a symbolic argument (``j + 0.5``) by exact half-integers."""
    floats = sorted(value.atoms(Float), key=default_sort_key)
    if not floats:
        return value
    return value.xreplace({f: half_integer(f, name) for f in floats})


def _check_differences(values, names):
    """Numeric differences of two arguments must be multiples of 1/2."""
    for a in range(len(values)):
        for b in range(a + 1, len(values)):
            diff = values[a] - values[b]
            if diff.is_Number and not (2 * diff).is_Integer:
                raise QuantumNumberError(
                    f"{names[a]} - {names[b]}={diff} must be an integer or half-integer")


_NO_SYMBOL = Dummy("x")  # generator of the ring when every argument is a number


def _ring(values):
    symbols = set()
    for value in values:
        symbols |= value.free_symbols
    gens = sorted(symbols, key=default_sort_key) or [_NO_SYMBOL]
    return poly_ring(gens, QQ)[0]


def _polys(ring, values, names):
    return [to_poly(ring, v, n) for v, n in zip(values, names)]


def _half_integer_gens(polys):
    """Generators that appear alone (``+-x + number``) in some argument: half-integers."""
    found = set()
    for poly in polys:
        terms = [(monom, coeff) for monom, coeff in poly.terms() if any(monom)]
        if len(terms) == 1:
            monom, coeff = terms[0]
            if sum(monom) == 1 and abs(coeff) == 1:
                found.add(monom.index(1))
    return tuple(sorted(found))


_CG_NAMES = ("j1", "m1", "j2", "m2", "J", "M")


def _cg_parts(j1, m1, j2, m2, J, M):
    """Prefactor and summand of the Racah formula for <j1 m1 j2 m2|J M> without (2J+1)."""
    prefactor = [(j1 + j2 - J, 1), (j1 - j2 + J, 1), (-j1 + j2 + J, 1), (j1 + j2 + J + 1, -1),
                 (j1 + m1, 1), (j1 - m1, 1), (j2 + m2, 1), (j2 - m2, 1), (J + M, 1), (J - M, 1)]
    zero = j1.ring(0)
    summand = [(zero, 1, -1), (j1 + j2 - J, -1, -1), (j1 - m1, -1, -1), (j2 + m2, -1, -1),
               (J - j2 + m1, 1, -1), (J - j1 - m2, 1, -1)]
    return prefactor, summand


def _projection_rule(m_sum):
    """(zero?, delta) for the rule m_sum == 0: exact zero, a visible delta, or nothing."""
    if m_sum.is_Number:
        return m_sum != 0, S.One
    return False, KroneckerDelta(m_sum, 0)


def cg_closed_form(j1, m1, j2, m2, J, M):
    r"""Closed form of the Clebsch-Gordan coefficient ``<j1 m1 j2 m2|J M>`` for symbolic arguments.

    Explanation
    ===========

    Evaluates the Racah formula (Edmonds 1957, eq. 3.6.11) exactly when the
    sum has a numeric number of terms, typically ``j2`` numeric and
    ``J - j1`` numeric, with ``j1``, ``m1``, ``M`` symbolic.  Condon-Shortley
    phase, ``<j1 j1; j2 (J-j1)|J J> > 0``.

    The result equals the coefficient wherever
    ``closed_form_conditions("cg", j1, m1, j2, m2, J, M)`` holds (all
    ``j +- m`` and all triangle combinations nonnegative integers).  A
    numeric ``M - m1 - m2 != 0`` or a numeric triangle violation gives exact
    ``S.Zero``; a symbolic ``M - m1 - m2`` is kept as ``KroneckerDelta``.

    Examples
    ========

    >>> from sympy import symbols, S, simplify
    >>> j, m = symbols("j m")
    >>> cg_closed_form(j, m - 1, 1, 1, j + 1, m)
    sqrt((j + m)*(j + m + 1)/((2*j + 1)*(2*j + 2)))
    >>> cg_closed_form(j, m, S(1)/2, S(1)/2, j + 3, m + S(1)/2)
    0

    Normalisation (sum over m1 of the squares, J = j + 1/2, M = m):

    >>> simplify(cg_closed_form(j, m - S.Half, S.Half, S.Half, j + S.Half, m)**2
    ...          + cg_closed_form(j, m + S.Half, S.Half, -S.Half, j + S.Half, m)**2)
    1

    Parameters
    ==========

    j1, m1, j2, m2, J, M : number or SymPy expression
        Numbers are validated by :mod:`amalgebra.qnumbers`; expressions must
        be polynomials with rational coefficients in SymPy symbols.

    Raises
    ======

    NotNumericError
        When the Racah sum has no numeric number of terms or does not give an
        algebraic function (e.g. ``J - j1`` symbolic).

    See Also
    ========

    threej_closed_form, sixj_closed_form, closed_form_conditions

    References
    ==========

    .. [1] A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957), eq. 3.6.11.
    """
    args = _read((j1, m1, j2, m2, J, M), _CG_NAMES, ("j", 0, "j", 2, "j", 4))
    _check_differences(args[0::2], _CG_NAMES[0::2])
    _check_differences(args[1::2], _CG_NAMES[1::2])
    j1, m1, j2, m2, J, M = args
    zero, delta = _projection_rule(M - m1 - m2)
    if zero:
        return S.Zero
    if delta is not S.One:
        M = m1 + m2
    ring = _ring((j1, m1, j2, m2, J, M))
    polys = _polys(ring, (j1, m1, j2, m2, J, M), _CG_NAMES)
    prefactor, summand = _cg_parts(*polys)
    pJ = polys[4]
    prefactor += [(2 * pJ + 1, 1), (2 * pJ, -1)]  # 2J + 1 = (2J+1)!/(2J)!
    what = f"cg(j1={j1}, m1={m1}, j2={j2}, m2={m2}, J={J}, M={M})"
    return delta * factorial_sum(ring, prefactor, summand, what=what,
                                 half_integers=_half_integer_gens(polys))


_THREEJ_NAMES = ("j1", "j2", "j3", "m1", "m2", "m3")


def threej_closed_form(j1, j2, j3, m1, m2, m3):
    r"""Closed form of the Wigner 3j symbol ``(j1 j2 j3; m1 m2 m3)`` for symbolic arguments.

    Explanation
    ===========

    Uses ``(j1 j2 j3; m1 m2 m3) = (-1)**(j1-j2-m3) / sqrt(2 j3 + 1) <j1 m1 j2 m2|j3, -m3>``
    with the Racah formula evaluated as in :func:`cg_closed_form` (the
    factor ``sqrt(2 j3 + 1)`` cancels before evaluation).  Valid wherever
    ``closed_form_conditions("threej", ...)`` holds; a numeric
    ``m1 + m2 + m3 != 0`` gives ``S.Zero``, a symbolic one a
    ``KroneckerDelta``.

    Examples
    ========

    >>> from sympy import symbols, S, simplify
    >>> j, m = symbols("j m")
    >>> threej_closed_form(j, 1, j, -m, 0, m)
    (-1)**(j - m)*m/sqrt(j*(j + 1)*(2*j + 1))

    Symmetry under exchange of the first two columns, ``(-1)**(j1+j2+j3)``:

    >>> a = threej_closed_form(j, S.Half, j + S.Half, m - S.Half, S.Half, -m)
    >>> b = threej_closed_form(S.Half, j, j + S.Half, S.Half, m - S.Half, -m)
    >>> values = [{j: S(n) / 2, m: S(n) / 2 - k + S.Half} for n in range(1, 8) for k in range(n + 1)]
    >>> all(a.subs(v) == (-1)**(2*v[j] + 1) * b.subs(v) != 0 for v in values)
    True

    Parameters
    ==========

    j1, j2, j3, m1, m2, m3 : number or SymPy expression

    See Also
    ========

    cg_closed_form, closed_form_conditions

    References
    ==========

    .. [1] A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957), eqs. 3.7.3, 3.7.1.
    """
    args = _read((j1, j2, j3, m1, m2, m3), _THREEJ_NAMES, ("j", "j", "j", 0, 1, 2))
    _check_differences(args[:3], _THREEJ_NAMES[:3])
    _check_differences(args[3:], _THREEJ_NAMES[3:])
    j1, j2, j3, m1, m2, m3 = args
    zero, delta = _projection_rule(m1 + m2 + m3)
    if zero:
        return S.Zero
    if delta is not S.One:
        m3 = -m1 - m2
    ring = _ring((j1, j2, j3, m1, m2, m3))
    polys = _polys(ring, (j1, j2, j3, m1, m2, m3), _THREEJ_NAMES)
    pj1, pj2, pj3, pm1, pm2, pm3 = polys
    prefactor, summand = _cg_parts(pj1, pm1, pj2, pm2, pj3, -pm3)
    what = f"threej(j1={j1}, j2={j2}, j3={j3}, m1={m1}, m2={m2}, m3={m3})"
    return delta * factorial_sum(ring, prefactor, summand, phase=pj1 - pj2 - pm3, what=what,
                                 half_integers=_half_integer_gens(polys))


_SIXJ_NAMES = ("j1", "j2", "j3", "j4", "j5", "j6")


def _sixj_triads(j1, j2, j3, j4, j5, j6):
    return ((j1, j2, j3), (j1, j5, j6), (j4, j2, j6), (j4, j5, j3))


def sixj_closed_form(j1, j2, j3, j4, j5, j6):
    r"""Closed form of the 6j symbol ``{j1 j2 j3; j4 j5 j6}`` for symbolic arguments.

    Explanation
    ===========

    Evaluates Racah's formula (Edmonds 1957, eq. 6.3.7)

    .. math::

        \Delta(j_1 j_2 j_3)\Delta(j_1 j_5 j_6)\Delta(j_4 j_2 j_6)\Delta(j_4 j_5 j_3)
        \sum_k \frac{(-1)^k (k+1)!}{\prod_i (k-\alpha_i)! \prod_l (\beta_l - k)!}

    exactly when the sum has a numeric number of terms, e.g. one "large"
    symbolic j entering several arguments and small numeric differences
    (``{a b c; 1/2, c-1/2, b+1/2}``, ``{a b c; 1, c, b}``).  Valid wherever
    ``closed_form_conditions("sixj", ...)`` holds (the four triangle rules
    with integer perimeters); a triad that fails for all values gives
    ``S.Zero``.

    Examples
    ========

    >>> from sympy import symbols, S, simplify
    >>> a, b, c = symbols("a b c")
    >>> sixj_closed_form(a, b, c, 0, c, b)
    (-1)**(a + b + c)/sqrt((2*b + 1)*(2*c + 1))
    >>> sixj_closed_form(a, b, c, S.Half, c + 3, b + S.Half)
    0

    Symmetry under exchange of two columns:

    >>> x = sixj_closed_form(a, b, c, 1, c, b)
    >>> simplify(x - sixj_closed_form(b, a, c, c, 1, b))
    0

    Parameters
    ==========

    j1, j2, j3, j4, j5, j6 : number or SymPy expression

    See Also
    ========

    cg_closed_form, closed_form_conditions

    References
    ==========

    .. [1] A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957), eq. 6.3.7, Table 5.
    """
    args = _read((j1, j2, j3, j4, j5, j6), _SIXJ_NAMES, ("j",) * 6)
    _check_differences(args, _SIXJ_NAMES)
    ring = _ring(args)
    polys = _polys(ring, args, _SIXJ_NAMES)
    prefactor, summand = _sixj_parts(ring, polys)
    what = "sixj(" + ", ".join(f"{n}={v}" for n, v in zip(_SIXJ_NAMES, args)) + ")"
    return factorial_sum(ring, prefactor, summand, what=what, half_integers=_half_integer_gens(polys))


def _sixj_parts(ring, p):
    """Prefactor and summand of Racah's 6j formula for the PolyElements ``p``."""
    prefactor = []
    alphas = []
    for a, b, c in _sixj_triads(*p):
        prefactor += [(a + b - c, 1), (a - b + c, 1), (-a + b + c, 1), (a + b + c + 1, -1)]
        alphas.append(a + b + c)
    betas = (p[0] + p[1] + p[3] + p[4], p[1] + p[2] + p[4] + p[5], p[2] + p[0] + p[5] + p[3])
    summand = [(ring(1), 1, 1)] + [(-x, 1, -1) for x in alphas] + [(x, -1, -1) for x in betas]
    return prefactor, summand


_NINEJ_NAMES = ("j11", "j12", "j13", "j21", "j22", "j23", "j31", "j32", "j33")


def ninej_closed_form(j11, j12, j13, j21, j22, j23, j31, j32, j33):
    r"""Closed form of the 9j symbol with one argument equal to zero, for symbolic arguments.

    Explanation
    ===========

    Arguments are given row by row: ``{j11 j12 j13; j21 j22 j23; j31 j32 j33}``.
    One argument must be the number ``0``.  Row and column exchanges (each
    odd permutation gives ``(-1)**S``, ``S`` the sum of all nine arguments)
    move it to the lower right corner, and then (Edmonds 1957, eq. 6.4.14)

    .. math::

        \begin{Bmatrix} a & b & e \\ c & d & e \\ f & f & 0 \end{Bmatrix}
        = \frac{(-1)^{b+c+e+f}}{\sqrt{(2e+1)(2f+1)}}
          \begin{Bmatrix} a & b & e \\ d & c & f \end{Bmatrix},

    with the 6j evaluated as in :func:`sixj_closed_form`.  The two partners
    of the zero must be equal: a numeric difference gives ``S.Zero``, a
    symbolic one a ``KroneckerDelta``.  Valid wherever
    ``closed_form_conditions("ninej", ...)`` holds (the six triads of rows and
    columns).  Other 9j shapes raise
    :class:`~amalgebra.errors.NotNumericError`.

    Examples
    ========

    >>> from sympy import symbols, S, simplify
    >>> a, b, c = symbols("a b c")
    >>> ninej_closed_form(a, b, c, a, b, c, 0, 0, 0)
    1/sqrt((2*a + 1)*(2*b + 1)*(2*c + 1))
    >>> h = S.Half
    >>> x = ninej_closed_form(a, h, a + h, a + h, 1, a + h, h, h, 0)
    >>> x
    sqrt((2*a + 3)/(6*a + 3))/(4*(a + 1))

    Exchanging the first two columns multiplies by ``(-1)**S``, here ``S = 4 a + 4``:

    >>> simplify(x - ninej_closed_form(h, a, a + h, 1, a + h, a + h, h, h, 0))
    0

    Parameters
    ==========

    j11, j12, j13, j21, j22, j23, j31, j32, j33 : number or SymPy expression

    See Also
    ========

    sixj_closed_form, closed_form_conditions

    References
    ==========

    .. [1] A. R. Edmonds, Angular Momentum in Quantum Mechanics (1957), eqs. 6.4.5, 6.4.14.
    """
    args = _read((j11, j12, j13, j21, j22, j23, j31, j32, j33), _NINEJ_NAMES, ("j",) * 9)
    zeros = [i for i, v in enumerate(args) if v.is_Number and v == 0]
    if not zeros:
        raise NotNumericError(
            "ninej(" + ", ".join(f"{n}={v}" for n, v in zip(_NINEJ_NAMES, args)) + "): "
            "a closed form needs one argument equal to 0")
    row, col = divmod(zeros[0], 3)
    rows = [list(args[3 * r:3 * r + 3]) for r in range(3)]
    swaps = 0
    if row != 2:
        rows[row], rows[2] = rows[2], rows[row]
        swaps += 1
    if col != 2:
        for r in rows:
            r[col], r[2] = r[2], r[col]
        swaps += 1
    (a, b, e), (c, d, e2), (f, f2, _) = rows
    factor = S.One
    for x, y in ((e, e2), (f, f2)):
        diff = x - y
        if diff.is_Number:
            if diff != 0:
                return S.Zero
        else:
            factor *= KroneckerDelta(x, y)
    ring = _ring(args)
    pa, pb, pe, pc, pd, pf = _polys(ring, (a, b, e, c, d, f), ("a", "b", "e", "c", "d", "f"))
    prefactor, summand = _sixj_parts(ring, (pa, pb, pe, pd, pc, pf))
    # 1/sqrt((2e+1)(2f+1)) as sqrt((2e)!/(2e+1)!) sqrt((2f)!/(2f+1)!)
    prefactor += [(2 * pe, 1), (2 * pe + 1, -1), (2 * pf, 1), (2 * pf + 1, -1)]
    polys = _polys(ring, args, _NINEJ_NAMES)
    phase = swaps * sum(polys, ring(0)) + pb + pc + pe + pf
    what = "ninej(" + ", ".join(f"{n}={v}" for n, v in zip(_NINEJ_NAMES, args)) + ")"
    return factor * factorial_sum(ring, prefactor, summand, phase=phase, what=what,
                                  half_integers=_half_integer_gens(polys))


def _admissible(combinations):
    """And of 'x is a nonnegative integer' over the combinations.

    Combinations that differ by a number share one integrality clause (the
    numeric part taken modulo 1) and one inequality (the smallest numeric
    part); numeric combinations are decided at once.
    """
    integral, least = {}, {}
    for x in combinations:
        x = expand(x)
        const, part = x.as_coeff_Add()
        if part == 0:
            if not (const.is_Integer and const >= 0):
                return S.false
            continue
        if part.is_Number:  # pragma: no cover - as_coeff_Add puts numbers first
            raise AssertionError(x)
        integral.setdefault(part, const - (const.p // const.q))
        if part not in least or const < least[part]:
            least[part] = const
    clauses = []
    for part in integral:  # first-seen order, deterministic
        clauses.append(Contains(part + integral[part], S.Integers))
        clauses.append(part + least[part] >= 0)
    return And(*clauses)


def closed_form_conditions(kind, *args):
    r"""The condition under which a closed form equals its coefficient.

    Explanation
    ===========

    Returns a SymPy boolean: the conjunction of ``Contains(x, Integers)`` and
    ``x >= 0`` over the combinations ``x`` that the Racah formula needs as
    factorial arguments:

    * ``"cg"`` (``j1, m1, j2, m2, J, M``): ``j1 +- m1``, ``j2 +- m2``,
      ``J +- M``, ``j1 + j2 - J``, ``j1 - j2 + J``, ``-j1 + j2 + J``;
    * ``"threej"`` (``j1, j2, j3, m1, m2, m3``): the same with ``J = j3``,
      ``M = -m3``;
    * ``"sixj"``: ``a + b - c``, ``a - b + c``, ``-a + b + c`` for the four
      triads ``(j1 j2 j3), (j1 j5 j6), (j4 j2 j6), (j4 j5 j3)``;
    * ``"ninej"`` (row by row): the same for the three rows and three columns.

    These are exactly the admissibility conditions (each ``j`` a nonnegative
    half-integer, ``|m| <= j`` with ``j - m`` integer, triangle rules with
    integer perimeter).  The projection rule ``M = m1 + m2`` (``m1 + m2 + m3
    = 0``) is not included: the closed form handles it itself (exact zero or
    ``KroneckerDelta``).  Numeric clauses evaluate at once, so the result is
    ``true`` for fully numeric admissible arguments, ``false`` when a rule
    fails for every value of the symbols (then the closed form is
    ``S.Zero``, which is the coefficient).

    Examples
    ========

    >>> from sympy import symbols, S
    >>> j, m = symbols("j m")
    >>> cond = closed_form_conditions("cg", j, m - S.Half, S.Half, S.Half, j + S.Half, m)
    >>> sorted(map(str, cond.args))
    ['2*j >= 0', 'Contains(2*j, Integers)', 'Contains(j + m + 1/2, Integers)', 'Contains(j - m + 1/2, Integers)', 'j + m - 1/2 >= 0', 'j - m + 1/2 >= 0']
    >>> cond.subs({j: 2, m: S(5)/2}), cond.subs({j: 2, m: S(7)/2}), cond.subs({j: 2, m: 3})
    (True, False, False)
    >>> closed_form_conditions("cg", 1, 0, 1, 0, 1, 0)
    True
    >>> closed_form_conditions("cg", j, m, 1, 2, j, m + 2)
    False

    Parameters
    ==========

    kind : str
        ``"cg"``, ``"threej"``, ``"sixj"`` or ``"ninej"``.
    args : numbers or SymPy expressions
        The arguments in the order of the corresponding closed-form function.

    See Also
    ========

    cg_closed_form, threej_closed_form, sixj_closed_form, ninej_closed_form
    """
    arity = {"cg": 6, "threej": 6, "sixj": 6, "ninej": 9}
    if kind not in arity:
        raise ConventionError(f"kind={kind!r} must be 'cg', 'threej', 'sixj' or 'ninej'")
    if len(args) != arity[kind]:
        raise TypeError(f"closed_form_conditions({kind!r}, ...) needs {arity[kind]} arguments, got {len(args)}")
    args = tuple(quantum_number(a, f"args[{i}]") for i, a in enumerate(args))
    if kind == "cg":
        j1, m1, j2, m2, J, M = args
        return _admissible([j1 + m1, j1 - m1, j2 + m2, j2 - m2, J + M, J - M,
                            j1 + j2 - J, j1 - j2 + J, -j1 + j2 + J])
    if kind == "threej":
        j1, j2, j3, m1, m2, m3 = args
        return closed_form_conditions("cg", j1, m1, j2, m2, j3, -m3)
    if kind in ("sixj", "ninej"):
        if kind == "sixj":
            triads = _sixj_triads(*args)
        else:
            triads = [args[0:3], args[3:6], args[6:9], args[0::3], args[1::3], args[2::3]]
        combos = []
        for a, b, c in triads:
            combos += [a + b - c, a - b + c, -a + b + c]
        return _admissible(combos)
    raise AssertionError(kind)  # pragma: no cover
