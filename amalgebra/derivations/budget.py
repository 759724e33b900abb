r"""Deciding whether a stored value equals a new one, within a time and size budget.

Explanation
===========

``amalgebra check`` compares each stored result with the value the derivation gives
now.  Stored text is data that anyone may have edited, so no comparison may run without
bound: a tampered value such as ``(a + b + c + d + e)^40 - 1`` must cost milliseconds,
not the minutes an unbounded ``simplify`` or ``expand`` would take.  :func:`decide_equal`
therefore tries, in order, and reports which one decided:

``"structure"``
    the two expressions are the same SymPy object (``a == b``);
``"normal form"``
    an exact normal form of ``a - b`` is zero (or, for polynomials with rational
    coefficients, provably not zero): ``expand`` (and the numerator of ``together``)
    for commutative expressions, :func:`amalgebra.algebra.canonical` for operators,
    ``expand`` per ket for states.  Attempted only when the expansion is estimated at
    most :attr:`Budget.max_terms` terms (operators: degree at most
    :attr:`Budget.max_operator_degree`);
``"numeric"``
    ``a - b`` evaluated at :attr:`Budget.points` pseudo-random rational points (seeded
    by the result's name, so the verdict is reproducible) to :attr:`Budget.digits`
    digits; equal when ``|a - b| <= tolerance * max(1, |a|, |b|)`` at every point.
    Evidence, not proof: reported as such, and a failure under ``--exact``;
``"budget"``
    nothing decided within the budget (size beyond :attr:`Budget.max_nodes`, or more
    than :attr:`Budget.seconds` of wall time): ``equal`` is ``None`` and the
    comparison fails with a message saying so.

The wall-time bound is enforced by the package's one interrupting timer
(:mod:`amalgebra._deadline`, ``signal.setitimer``) when called from the main thread of a
POSIX process, which interrupts any SymPy routine; elsewhere the size bounds (with a
lower operator degree) keep every step small, and the clock is checked between steps.
An existing ``SIGALRM`` timer (pytest-timeout's, say) keeps its time: it fires first if
it ends first, and is restored afterwards.

Examples
========

>>> from sympy import cos, sin, symbols
>>> from amalgebra.derivations.budget import Budget, decide_equal
>>> a, b, c, d, e, j = symbols("a b c d e j")
>>> decide_equal(j**2 + j, j*(j + 1))
Decision(equal=True, method='normal form', detail='expand(a - b) = 0')
>>> decide_equal(sin(j)**2, 1 - cos(j)**2).detail
'expand((a - b).rewrite(exp)) = 0'
>>> decide_equal(sin(j)/j, 1 - j**2/6).equal           # false: decided by the numeric test
False
>>> tampered = decide_equal((a + b + c + d + e)**40 - 1, a)
>>> tampered.equal, tampered.method
(False, 'numeric')
"""

import contextlib
import math
import random
from dataclasses import dataclass

from .._deadline import Deadline, DeadlineExpired, armed

__all__ = ["Budget", "Decision", "decide_equal", "DEFAULT_BUDGET"]


@dataclass(frozen=True)
class Budget:
    """Bounds on one equality decision (see the module docstring).

    Parameters
    ==========

    seconds : wall time for one decision (one stored result, all its entries).
    max_nodes : largest expression tree (nodes of either side) compared at all.
    max_terms : largest estimated expansion attempted for the exact normal form.
    max_operator_degree : highest operator degree given to ``canonical`` (a quarter
        of it when no timer can interrupt the work).
    points, digits, tolerance : the seeded numeric test.
    """

    seconds: float = 5.0
    max_nodes: int = 20_000
    max_terms: int = 2_000
    max_operator_degree: int = 40
    points: int = 6
    digits: int = 30
    tolerance: float = 1e-12


DEFAULT_BUDGET = Budget()


@dataclass(frozen=True)
class Decision:
    """The verdict on ``a == b``: ``equal`` is True, False or None (undecided)."""

    equal: bool | None
    method: str
    detail: str = ""

    @property
    def exact(self):
        """True when the verdict is a proof (structure or normal form)."""
        return self.method in ("structure", "normal form")


def decide_equal(a, b, *, budget=None, seed="", clock=None):
    """Decide ``a == b`` for two SymPy expressions within ``budget``; see the module docstring.

    Parameters
    ==========

    a, b : sympy.Basic (expressions, operators or kets).
    budget : :class:`Budget`, optional.
    seed : str
        Seeds the numeric test's points (the result's name), so verdicts repeat.
    clock : internal; a shared deadline when several entries form one result.

    Returns
    =======

    Decision
    """
    from sympy import Integer

    a, b = (Integer(x) if isinstance(x, int) and not isinstance(x, bool) else x for x in (a, b))
    budget = DEFAULT_BUDGET if budget is None else budget
    own = clock is None
    clock = Deadline(budget.seconds) if own else clock
    context = armed(clock) if own else contextlib.nullcontext()
    try:
        with context:
            return _decide(a, b, budget, seed, clock)
    except DeadlineExpired as exc:
        if exc.deadline is not clock:       # an enclosing deadline: its owner handles it
            raise
        return Decision(None, "budget", f"not decided within the time budget of "
                                        f"{clock.seconds:g} s")
    except RecursionError:
        return Decision(None, "budget", "not decided: expression nested too deeply")


def _decide(a, b, budget, seed, clock):
    if a == b:
        return Decision(True, "structure", "the same expression")
    size = _nodes(a, budget.max_nodes) + _nodes(b, budget.max_nodes)
    if size > budget.max_nodes:
        return Decision(None, "budget", f"too large to compare (more than "
                                        f"max_nodes={budget.max_nodes} expression nodes)")
    clock.check()
    diff = a - b
    if diff == 0:
        return Decision(True, "normal form", "a - b = 0")
    if getattr(diff, "is_commutative", True) is False:
        return _decide_noncommutative(diff, budget, seed, clock)
    return _decide_scalar(diff, a, b, budget, seed, clock)


def _nodes(e, cap):
    """Number of nodes of an expression tree, counting stops past ``cap``."""
    count, stack = 0, [e]
    while stack and count <= cap:
        node = stack.pop()
        count += 1
        stack.extend(getattr(node, "args", ()))
    return count


def _expansion_size(e, cap):
    """(terms of expand(e) at top level, largest expansion anywhere), both capped."""
    from sympy import Add, Mul, Pow

    if isinstance(e, Add):
        inner = [_expansion_size(t, cap) for t in e.args]
        return min(sum(t for t, _ in inner), cap + 1), max(w for _, w in inner)
    if isinstance(e, Mul):
        inner = [_expansion_size(f, cap) for f in e.args]
        terms = 1
        for t, _ in inner:
            terms = min(terms * t, cap + 1)
        return terms, max([terms] + [w for _, w in inner])
    if isinstance(e, Pow):
        t, w = _expansion_size(e.base, cap)
        n = e.exp
        if n.is_Integer and t > 1:
            k = abs(int(n))
            size = cap + 1 if k > 4 * cap else min(math.comb(t + k - 1, k), cap + 1)
            return (size if n > 0 else 1), max(w, size)
        return 1, w
    if not getattr(e, "args", ()):
        return 1, 1
    inner = [_expansion_size(x, cap) for x in e.args]
    return 1, max(w for _, w in inner)


def _rational_polynomial(e):
    """True when e is a polynomial in its symbols with rational coefficients."""
    from sympy import Add, Mul, Pow, Symbol

    stack = [e]
    while stack:
        node = stack.pop()
        if node.is_Rational or isinstance(node, Symbol):
            continue
        if isinstance(node, (Add, Mul)):
            stack.extend(node.args)
        elif isinstance(node, Pow) and node.exp.is_Integer and node.exp > 0:
            stack.append(node.base)
        else:
            return False
    return True


def _decide_scalar(diff, a, b, budget, seed, clock):
    from sympy import cos, cosh, exp, expand, fraction, sin, sinh, together

    _, work = _expansion_size(diff, budget.max_terms)
    note = ""
    if work <= budget.max_terms:
        clock.check()
        expanded = expand(diff)
        if expanded == 0:
            return Decision(True, "normal form", "expand(a - b) = 0")
        if _rational_polynomial(expanded):
            return Decision(False, "normal form", "expand(a - b) is a nonzero polynomial")
        clock.check()
        numerator = fraction(together(expanded))[0]
        if _expansion_size(numerator, budget.max_terms)[1] <= budget.max_terms:
            clock.check()
            numerator = expand(numerator)
            if numerator == 0:
                return Decision(True, "normal form", "numerator of together(a - b) = 0")
        if expanded.has(sin, cos, sinh, cosh):
            # Trigonometric polynomials: in exponentials they are Laurent polynomials.
            clock.check()
            rewritten = expanded.rewrite(exp)
            if _expansion_size(rewritten, budget.max_terms)[1] <= budget.max_terms:
                clock.check()
                if expand(rewritten) == 0:
                    return Decision(True, "normal form", "expand((a - b).rewrite(exp)) = 0")
    else:
        note = f"; exact expansion not attempted (more than max_terms={budget.max_terms} terms)"
    clock.check()
    return _numeric(diff, a, b, budget, seed, clock, note)


def _sample(symbol, rng):
    """A seeded rational (or integer) value respecting the symbol's sign and integrality."""
    from sympy import Integer, Rational

    positive = bool(symbol.is_positive or symbol.is_nonnegative)
    if symbol.is_integer:
        return Integer(rng.randint(1, 9) if positive else rng.randint(-9, 9))
    return Rational(rng.randint(997 // 2 if positive else -3 * 997, 3 * 997), 997)


def _numeric(diff, a, b, budget, seed, clock, note=""):
    from sympy import default_sort_key

    from sympy import Float, Pow

    symbols = sorted(diff.free_symbols, key=default_sort_key)
    rng = random.Random(f"amalgebra-stored:{seed}")
    points = budget.points if symbols else 1
    # Exact rational points avoid cancellation errors; but a rational to a huge power is
    # a huge integer that no timer can interrupt, so then the points are floats.
    exact_points = all(abs(p.exp) <= 1000 for p in diff.atoms(Pow)
                       if p.exp.is_Integer)
    for _ in range(points):
        clock.check()
        values = {s: _sample(s, rng) for s in symbols}
        if not exact_points:
            values = {s: Float(v, budget.digits + 20) for s, v in values.items()}
        try:
            d = complex(diff.xreplace(values).evalf(budget.digits))
            scale = max(1.0, abs(complex(a.xreplace(values).evalf(budget.digits))),
                        abs(complex(b.xreplace(values).evalf(budget.digits))))
        except (TypeError, ValueError, ArithmeticError, AttributeError):
            return Decision(None, "budget", "not decided: no exact normal form applies and "
                                            "the difference does not evaluate to a number" + note)
        if d != d or abs(d) > budget.tolerance * scale:
            where = " at a seeded random point" if symbols else ""
            return Decision(False, "numeric", f"|a - b| = {abs(d):.3g}{where} "
                                              f"({budget.digits} digits){note}")
    where = f"{points} seeded random points" if symbols else "one evaluation"
    return Decision(True, "numeric", f"equal at {where} to {budget.digits} digits, tolerance "
                                     f"{budget.tolerance:g} (evidence, not a proof){note}")


def _operator_degree(e, cap):
    from sympy import Add, Mul, Pow

    if getattr(e, "is_commutative", True):
        return 0
    if isinstance(e, Add):
        return max(_operator_degree(t, cap) for t in e.args)
    if isinstance(e, Mul):
        return min(sum(_operator_degree(f, cap) for f in e.args), cap + 1)
    if isinstance(e, Pow) and e.exp.is_Integer:
        return min(_operator_degree(e.base, cap) * abs(int(e.exp)), cap + 1)
    return 1


def _decide_noncommutative(diff, budget, seed, clock):
    from sympy import Add, Mul, expand

    from ..errors import AmalgebraError

    cap = budget.max_operator_degree if clock.hard else max(budget.max_operator_degree // 4, 1)
    degree = _operator_degree(diff, cap)
    if degree > cap:
        return Decision(None, "budget", f"not decided: operator degree above {cap} "
                                        "(max_operator_degree) is beyond the budget")
    clock.check()
    method = "canonical"
    try:
        from amalgebra.algebra import canonical

        normal = canonical(diff)
    except (ImportError, AmalgebraError, TypeError, ValueError, NotImplementedError):
        method = "expand"
        _, work = _expansion_size(diff, budget.max_terms)
        if work > budget.max_terms:
            return Decision(None, "budget", f"not decided: expansion of more than "
                                            f"max_terms={budget.max_terms} terms")
        normal = expand(diff)
    if normal == 0:
        return Decision(True, "normal form", f"{method}(a - b) = 0")
    # Collect the coefficient of each operator word (or ket) and decide each one.
    coefficients = {}
    for term in Add.make_args(normal):
        c_part, nc_part = term.args_cnc()
        key = Mul(*nc_part)
        coefficients[key] = coefficients.get(key, 0) + Mul(*c_part)
    verdicts = []
    for index, coefficient in enumerate(coefficients.values()):
        clock.check()
        if coefficient == 0:
            continue
        verdict = _decide_scalar(coefficient, coefficient, 0 * coefficient, budget,
                                 f"{seed}#{index}", clock)
        if verdict.equal is not True:
            if verdict.equal is False:
                return Decision(False, verdict.method, f"{method}(a - b) has a nonzero "
                                                       f"coefficient ({verdict.detail})")
            return verdict
        verdicts.append(verdict)
    if all(v.exact for v in verdicts):
        return Decision(True, "normal form", f"{method}(a - b): every coefficient is 0")
    return Decision(True, "numeric", f"{method}(a - b): coefficients vanish numerically "
                                     "(evidence, not a proof)")
