r"""How the engine checks one step ``lhs = rhs`` of a derivation.

Explanation
===========

Every check returns a :class:`Check` saying which method ran, whether it passed, and
whether its verdict is an exact proof.  The methods, in the order :func:`check_equality`
tries them:

``"canonical"``
    For operator (noncommutative) expressions without ``j``: the operator algebra's
    canonical form, ``amalgebra.algebra.canonical(lhs - rhs) == 0``.  Exact; a proof
    for every representation.
``"matrices"``
    When ``j`` is given (e.g. ``{"J": 1}``): the statement is claimed on that
    representation only, and is checked on exact explicit matrices,
    ``amalgebra.matrices.explicit.to_matrix(lhs - rhs, j=j, kind="exact")`` is the zero matrix.
    Exact, but only for those ``j``.  With ``also_at=[{"J": 1}, ...]`` a general
    operator identity is, in addition to its canonical-form proof, cross-checked on
    the matrices of those representations (a guard against an engine bug).
``"normal form"``
    For commutative expressions: ``lhs - rhs`` brought to the coefficient normal form of
    :mod:`amalgebra.algebra.coefficients` (rational functions over Q(i) and radicals, with
    ``exp``/``sin``/``cos`` of symbols as Laurent polynomials in ``exp(i x)``, the same
    form ``canonical`` uses for operator coefficients).  Exact both ways: 0 proves the
    step; a nonzero normal form *disproves* it when the difference has no opaque atom
    (no unknown function, no ``pi``, no radical of a composite expression), and the
    step then fails exactly instead of being sampled.
``"simplify"``
    For commutative expressions the normal form does not decide: ``lhs - rhs`` is ``0``
    after ``expand`` or ``sympy.simplify``.  Exact.
``"numeric"``
    Fallback when ``simplify`` cannot decide a commutative statement: ``lhs - rhs``
    evaluated with 30 significant digits at ``points`` pseudo-random real points
    (deterministic, seeded by the step name) must satisfy
    ``|lhs - rhs| <= tolerance * max(1, |lhs|)``.  This is *evidence, not a proof*:
    the step is reported as "checked numerically", never as exact.  ``exact=True``
    forbids the fallback.

Atoms no float point can reach (sums of 3j symbols need half-integer momenta) are
checked by a *sampler* an extension registers (:func:`register_sampler`;
:mod:`amalgebra.racah` registers direct summation at random admissible values): also
"checked numerically", never exact, and tried before ``simplify`` unless ``exact=True``.

Examples
========

>>> from sympy import I, cos, sin, symbols
>>> from amalgebra.derivations.checks import check_equality
>>> x = symbols("x")
>>> [c.summary() for c in check_equality(sin(x)**2 + cos(x)**2, 1)]
['exact (normal form)']
>>> check_equality(sin(x)**2, 1)[0].summary()        # decided exactly, not sampled
'FAILED (normal form: lhs - rhs = -cos(2*x)/2 - 1/2 is not 0 in the coefficient normal form)'
>>> check_equality(x*(1 + I), x + I*x)[0].method
'normal form'

See Also
========

amalgebra.derivations.record : where steps are declared.
"""

import random
from dataclasses import dataclass

__all__ = ["Check", "check_equality", "DEFAULT_TOLERANCE", "DEFAULT_POINTS", "register_sampler"]

#: Samplers for atoms a float point cannot reach (e.g. sums of 3j symbols, whose momenta
#: must be half-integers): ``sampler(lhs, rhs, seed, points)`` returns a ``Check`` (never
#: exact) or ``None`` when it does not apply.  Tried before ``simplify`` (unless exact=True).
_SAMPLERS = []


def register_sampler(sampler):
    """Add a sampler (see ``_SAMPLERS``); registering the same one twice is harmless."""
    if sampler not in _SAMPLERS:
        _SAMPLERS.append(sampler)

DEFAULT_TOLERANCE = 1e-12
DEFAULT_POINTS = 6


@dataclass(frozen=True)
class Check:
    """The verdict of one checking method on one step.

    Parameters
    ==========

    method : ``"canonical"``, ``"matrices"``, ``"normal form"``, ``"simplify"`` or ``"numeric"``.
    passed : whether the step held under this method.
    exact : whether a pass is an exact statement (False for ``"numeric"``).
    detail : human-readable context (the ``j`` values, points and tolerance, or why
        the method could not decide).
    evaluated : whether the sides were evaluated first (see
        :func:`amalgebra.derivations.written.side_value`): the step is printed as
        written and checked on the values.
    """

    method: str
    passed: bool
    exact: bool
    detail: str = ""
    #: the sides were evaluated (``doit``, a written value, a matrix element) before the check
    evaluated: bool = False

    def summary(self):
        """One phrase for reports, e.g. ``'exact (matrices at J=1)'``."""
        after = "; written sides evaluated" if self.evaluated else ""
        if not self.passed:
            return f"FAILED ({self.method}{': ' + self.detail if self.detail else ''}{after})"
        if not self.exact:
            return f"checked numerically ({self.detail}{after})"
        return f"exact ({self.method}{' ' + self.detail if self.detail else ''}{after})"


def _is_operator(expr):
    return getattr(expr, "is_commutative", True) is False


def _format_j(j):
    return ", ".join(f"{k}={j[k]}" for k in sorted(j))


def _zero_matrix(m):
    from sympy import simplify

    def zero(entry):
        if entry == 0:
            return True
        normal = _normal_form(entry)
        if normal is not None and (normal[0] == 0 or normal[1]):
            return normal[0] == 0
        return simplify(entry) == 0

    return all(zero(entry) for entry in m)


def _check_matrices(diff, j):
    try:
        from amalgebra.matrices.explicit import to_matrix
    except ImportError as exc:
        return Check("matrices", False, True, f"amalgebra.matrices.explicit unavailable: {exc}")
    m = to_matrix(diff, j=dict(j), kind="exact")
    return Check("matrices", _zero_matrix(m), True, f"at {_format_j(j)}")


def _normal_form(diff):
    """``(normal form, decides)`` of a commutative difference, or ``None`` outside the domain.

    ``decides`` is True when a nonzero normal form proves ``diff != 0``: every generator
    is algebraically independent of the others (symbols, their roots, exp of symbols).
    """
    try:
        from amalgebra.algebra.coefficients import ScalarDomain, normal_scalar
        from amalgebra.errors import OperatorError
    except ImportError:  # pragma: no cover - the algebra package is part of amalgebra
        return None
    try:
        value = normal_scalar(diff)
        domain = ScalarDomain([diff])
    except OperatorError:
        return None
    return value, domain.decides_nonzero()


def _check_canonical(diff):
    try:
        from amalgebra.algebra import canonical
    except ImportError as exc:
        return Check("canonical", False, True, f"amalgebra.algebra unavailable: {exc}")
    return Check("canonical", canonical(diff) == 0, True, "form")


def _sample_value(symbol, rng):
    if symbol.is_integer:
        return rng.randint(1, 9) if symbol.is_nonnegative or symbol.is_positive else rng.randint(-9, 9)
    if symbol.is_positive or symbol.is_nonnegative:
        return rng.uniform(0.5, 3.0)
    return rng.uniform(-3.0, 3.0)


def _check_numeric(lhs, diff, seed, points, tolerance):
    from sympy import Float, default_sort_key

    symbols = sorted(diff.free_symbols, key=default_sort_key)
    rng = random.Random(f"amalgebra-step:{seed}")
    for _ in range(points if symbols else 1):
        values = {s: Float(_sample_value(s, rng), 30) for s in symbols}
        try:
            d = complex(diff.xreplace(values).evalf(30))
            scale = max(1.0, abs(complex(lhs.xreplace(values).evalf(30))))
        except (TypeError, ValueError):
            return Check("numeric", False, False, "could not evaluate to a number")
        if d != d or abs(d) > tolerance * scale:
            where = " at a random point" if symbols else ""
            return Check("numeric", False, False,
                         f"|lhs - rhs| = {abs(d):.3g}{where}, tolerance {tolerance:g}")
    if not symbols:
        return Check("numeric", True, False, f"30-digit evaluation, tolerance {tolerance:g}")
    return Check("numeric", True, False, f"{points} random points, tolerance {tolerance:g}")


def check_equality(lhs, rhs, *, j=None, also_at=(), exact=False, seed="",
                   points=DEFAULT_POINTS, tolerance=DEFAULT_TOLERANCE):
    """Check ``lhs == rhs`` by the strongest method that applies; return the checks run.

    Parameters
    ==========

    lhs, rhs : sympy.Expr or sympy.Matrix, as written
        Unevaluated coupling symbols, factorials, sums and matrix expressions without
        free symbols, ``bra * op * ket`` matrix elements and
        :func:`~amalgebra.derivations.written.written` sides are evaluated first
        (:func:`~amalgebra.derivations.written.side_value`); the checks then say
        ``written sides evaluated``.
    j : dict, optional
        ``{label: j}``: the statement is claimed on these representations only and is
        checked on exact matrices.
    also_at : sequence of dict
        For a general operator identity: representations ``{label: j}`` at which the
        canonical-form proof is cross-checked on exact matrices (each adds a check).
    exact : bool
        Forbid the numerical fallback (a statement ``simplify`` cannot decide fails).
    seed : str
        Seeds the pseudo-random points of the numerical fallback (the step name).
    points, tolerance :
        Number of random points and relative tolerance of the numerical fallback.

    Returns
    =======

    tuple of :class:`Check`; the step holds when every check passed.

    Examples
    ========

    >>> from sympy import symbols, gamma
    >>> from amalgebra.derivations.checks import check_equality
    >>> n = symbols("n", positive=True, integer=True)
    >>> check_equality(gamma(n + 1), n*gamma(n))[0].summary()
    'exact (simplify)'
    """
    from dataclasses import replace

    from .written import side_value

    lhs_value, rhs_value = side_value(lhs), side_value(rhs)
    checks = _check_values(lhs_value, rhs_value, j=j, also_at=also_at, exact=exact, seed=seed,
                           points=points, tolerance=tolerance)
    if lhs_value is lhs and rhs_value is rhs:
        return checks
    # the report prints the sides as written; say that the verdict is on their values
    return tuple(replace(c, evaluated=True) for c in checks)


def _check_values(lhs, rhs, *, j, also_at, exact, seed, points, tolerance):
    from sympy import Basic, Integer, MatrixBase, expand, simplify

    if isinstance(lhs, int) and not isinstance(lhs, bool):
        lhs = Integer(lhs)
    if isinstance(rhs, int) and not isinstance(rhs, bool):
        rhs = Integer(rhs)
    for side, name in ((lhs, "lhs"), (rhs, "rhs")):
        if not isinstance(side, (Basic, MatrixBase)):
            raise TypeError(f"{name}={side!r} must be a SymPy expression or matrix")
    diff = lhs - rhs
    if isinstance(diff, MatrixBase):
        if j is not None:
            raise TypeError("j must not be given for a matrix statement")
        return (Check("simplify", _zero_matrix(diff), True, "entrywise"),)
    if also_at and (j is not None or not _is_operator(diff)):
        raise TypeError("also_at must be given only for a general operator identity (no j)")
    if j is not None:
        return (_check_matrices(diff, j),)
    if _is_operator(diff):
        return (_check_canonical(diff),) + tuple(_check_matrices(diff, at) for at in also_at)
    if diff == 0:
        return (Check("simplify", True, True),)
    normal = _normal_form(diff)
    if normal is not None and normal[0] == 0:
        return (Check("normal form", True, True),)
    if normal is not None and normal[1]:
        return (Check("normal form", False, True,
                      f"lhs - rhs = {normal[0]} is not 0 in the coefficient normal form"),)
    if not exact:
        # a sampler claims atoms simplify cannot decide (sums of coupling symbols) before
        # simplify spends minutes on them
        for sampler in _SAMPLERS:
            found = sampler(lhs, rhs, seed, points)
            if found is not None:
                return (found,)
    if expand(diff) == 0 or simplify(diff) == 0:
        return (Check("simplify", True, True),)
    if exact:
        return (Check("simplify", False, True, "simplify(lhs - rhs) is not 0 and exact=True"),)
    return (_check_numeric(lhs, diff, seed, points, tolerance),)
