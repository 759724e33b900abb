r"""Checking a reduction by direct summation at random admissible numeric values.

Explanation
===========

:func:`check_reduction` draws numeric values for the free momenta (from
:math:`0, \tfrac12, \ldots, j_{\max}`) and projections (from the range of their
line), evaluates the original sum term by term with the library's exact
coefficients (nested loops over the summed variables, a branch dropped as
soon as a factor whose variables are all fixed vanishes), evaluates the
reduced form at the same values, and compares the two exact numbers.  Draws
where the original does not exist (a projection incompatible with its line)
are skipped; draws where both sides vanish are counted separately, since
they test the selection rules only.  The check passes when no draw disagrees
and at least one draw is nonzero.

This is evidence, not a proof: the reduction itself is exact algebra
(:mod:`amalgebra.racah.rules`); the check guards against a bug in it.

Examples
========

>>> from sympy import Sum, symbols
>>> from amalgebra.coupling import Coupling3j
>>> from amalgebra.racah import check_reduction
>>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
>>> s = Sum(Coupling3j(a, b, c, m1, m2, m3)**2, (m1, -a, a), (m2, -b, b), (m3, -c, c))
>>> report = check_reduction(s, 1, points=3, seed=1)
>>> report.passed, report.nonzero >= 3
(True, True)
>>> check_reduction(s, 2, points=2).passed     # a wrong closed form is caught
False
"""

import random
from dataclasses import dataclass, field

from sympy import Add, Mul, Rational, S, Sum, default_sort_key, expand, preorder_traversal

from sympy.printing.defaults import Printable

from .. import notation
from ..coupling import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from .triangle import TriangleDelta

__all__ = ["ReductionCheck", "check_reduction", "direct_value"]


@dataclass(repr=True)
class ReductionCheck(Printable):
    """Outcome of :func:`check_reduction`.

    ``nonzero``/``zero``: draws compared where the sum is nonzero / zero;
    ``skipped``: draws where the sum is not defined; ``failures``: the draws that
    disagree, as ``(values, direct, reduced)``; ``samples``: the compared draws.

    Examples
    ========

    The 3j symbols squared and summed over all projections give 1 inside the
    triangle (Edmonds 1957, eq. 3.7.8; from memory); the wrong value 2 is caught:

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> from amalgebra.racah import check_reduction, projection_sum
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> s = projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2, m3)
    >>> good = check_reduction(s, 1, points=2, seed=1)
    >>> good.summary()
    'passed: direct summation agrees at 2 nonzero and 0 zero random admissible points, 0 disagree'
    >>> bad = check_reduction(s, 2, points=2, seed=1)
    >>> bad.passed, len(bad.failures) > 0
    (False, True)
    """

    nonzero: int = 0
    zero: int = 0
    skipped: int = 0
    failures: list = field(default_factory=list)
    samples: list = field(default_factory=list)
    note: str = ""

    @property
    def passed(self):
        return not self.failures and self.nonzero > 0 and not self.note

    def _latex(self, printer, exp=None):
        return notation.reduction_check_latex(printer, self, exp)

    def _sympystr(self, printer):
        return self.summary()

    def summary(self):
        state = "passed" if self.passed else "FAILED"
        extra = f"; {self.note}" if self.note else ""
        return (f"{state}: direct summation agrees at {self.nonzero} nonzero and {self.zero} zero "
                f"random admissible points, {len(self.failures)} disagree{extra}")


def _evaluate(expr, cache):
    if isinstance(expr, Sum):
        return _sum(expr, cache)
    if not expr.args:
        return expr
    if expr.has(Sum):
        return expr.func(*[_evaluate(a, cache) for a in expr.args])
    return expr.doit()


def _sum(s, cache):
    term = s.function
    factors = Mul.make_args(term)
    order = _loop_order(list(reversed(s.limits)), factors)
    names = [lim[0] for lim in order]
    ready = [[] for _ in order]
    constant = []
    for f in factors:
        depth = max((names.index(v) for v in f.free_symbols if v in names), default=-1)
        (constant if depth < 0 else ready[depth]).append(f)
    total = []
    base = S.One
    for f in constant:
        base *= _evaluate(f, cache)
    if base == 0:
        return S.Zero

    def value(f, env):
        key = (f, tuple(env[v] for v in names if v in f.free_symbols))
        if key not in cache:
            cache[key] = _evaluate(f.xreplace(env), cache)
        return cache[key]

    def run(depth, env, partial):
        if depth == len(order):
            total.append(partial)
            return
        var, lo, hi = order[depth]
        lo, hi = lo.xreplace(env), hi.xreplace(env)
        if not (lo.is_number and hi.is_number):
            raise ValueError(f"limits of {var} are not numeric: ({lo}, {hi})")
        v = lo
        while v <= hi:
            env[var] = v
            p = partial
            for f in ready[depth]:
                p = p * value(f, env)
                if p == 0:
                    break
            if p != 0:
                run(depth + 1, env, p)
            v += 1
        env.pop(var, None)

    run(0, {}, base)
    return Add(*total)


_VALUES = {}


def _loop_order(limits, factors):
    """Loop order for the nested sums: a variable may run once its limits are fixed; among
    those, the one that completes the most factors first (so vanishing 3j symbols prune
    early)."""
    pending = list(limits)
    done = set()
    bound = {lim[0] for lim in limits}
    needs = [f.free_symbols & bound for f in factors]
    order = []
    while pending:
        ready = [lim for lim in pending
                 if not ((lim[1].free_symbols | lim[2].free_symbols) & bound - done)]
        if not ready:
            ready = pending[:1]

        def score(lim):
            now = done | {lim[0]}
            return -sum(1 for need in needs if lim[0] in need and need <= now)

        best = min(ready, key=score)
        pending.remove(best)
        done.add(best[0])
        order.append(best)
    return order


def direct_value(expr, values):
    """The exact value of ``expr`` (sums done term by term) at ``values`` ``{symbol: number}``.

    Values are remembered (at most a few thousand), since the steps of one reduction
    share their left and right sides.

    Examples
    ========

    >>> from sympy import S, symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> from amalgebra.racah import direct_value, projection_sum
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> s = projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2, m3)

    Inside the triangle the sum is 1, outside 0 (Edmonds 1957, eq. 3.7.8; from memory):

    >>> direct_value(s, {a: 1, b: S(1)/2, c: S(1)/2}), direct_value(s, {a: 2, b: S(1)/2, c: S(1)/2})
    (1, 0)
    """
    key = (expr, tuple(sorted(values.items(), key=lambda kv: default_sort_key(kv[0]))))
    if key in _VALUES:
        return _VALUES[key]
    out = _evaluate(expr.xreplace(values), {})
    if len(_VALUES) > 4000:
        _VALUES.clear()
    _VALUES[key] = out
    return out


def _projection_lines(expr):
    """``{symbol: line}`` for symbols written alone (up to sign) as a projection."""
    out = {}
    for node in preorder_traversal(expr):
        pairs = ()
        if isinstance(node, Coupling3j):
            pairs = ((0, 3), (1, 4), (2, 5))
        elif isinstance(node, CouplingBracket):
            pairs = ((0, 1), (2, 3), (4, 5))
        for jpos, mpos in pairs:
            m = node.args[mpos]
            if m.is_Symbol:
                out.setdefault(m, node.args[jpos])
            elif (-m).is_Symbol:
                out.setdefault(-m, node.args[jpos])
    return out


def _projection_symbols(expr):
    out = set()
    for node in preorder_traversal(expr):
        if isinstance(node, Coupling3j):
            for m in node.args[3:]:
                out |= m.free_symbols
        elif isinstance(node, CouplingBracket):
            for m in node.args[1::2]:
                out |= m.free_symbols
    return out


def _fixed_triads(expr, bound):
    """Triads of the coupling symbols in ``expr`` that hold no summed variable."""
    out = []
    for node in preorder_traversal(expr):
        if isinstance(node, Coupling3j):
            tri = [node.args[:3]]
        elif isinstance(node, CouplingBracket):
            tri = [node.args[0::2]]
        elif isinstance(node, Coupling6j):
            t = node.args
            tri = [(t[0], t[1], t[2]), (t[0], t[4], t[5]), (t[3], t[1], t[5]), (t[3], t[4], t[2])]
        elif isinstance(node, Coupling9j):
            t = node.args
            tri = [t[0:3], t[3:6], t[6:9], t[0::3], t[1::3], t[2::3]]
        else:
            continue
        for t in tri:
            if not any(a.free_symbols & bound for a in t):
                out.append(tuple(t))
    return out


def _admissible(triads, values):
    for t in triads:
        vals = [a.xreplace(values) for a in t]
        if not all(v.is_number for v in vals):
            continue
        if any(v < 0 for v in vals) or TriangleDelta(*vals) == 0:
            return False
    return True


def _draw(rng, js, ms, lines, jmax, values=None, triads=()):
    """Random values: each momentum drawn among the values that keep every triad whose
    other members are already drawn admissible (``None`` when some momentum has none)."""
    values = dict(values or {})
    top = int(2 * jmax)
    for j in js:
        if j in values:
            continue
        choices = []
        for k in range(top + 1):
            trial = dict(values)
            trial[j] = Rational(k, 2)
            if _admissible([t for t in triads if any(j in a.free_symbols for a in t)], trial):
                choices.append(trial[j])
        if not choices:
            return None
        values[j] = rng.choice(choices)
    for m in ms:
        line = lines.get(m)
        if line is None:
            values[m] = Rational(rng.randint(-top, top), 2)
            continue
        lv = line.xreplace(values)
        if not lv.is_number or lv < 0 or not (2 * lv).is_integer:
            return None
        values[m] = -lv + rng.randint(0, int(2 * lv))
    return values


def _same(a, b):
    if a == b:
        return True
    diff = expand(a - b)
    if diff == 0:
        return True
    return False


def check_reduction(expr, result, *, points=4, seed=0, jmax=Rational(3, 2), attempts=None):
    """Compare ``result`` with direct summation of ``expr`` at random admissible values.

    Parameters
    ==========

    expr : the sum (as given to :func:`~amalgebra.racah.reduce_racah_sum`).
    result : the claimed closed (or partial) form.
    points : how many nonzero comparisons to collect.
    seed : seeds the draws (deterministic).
    jmax : the largest momentum drawn.
    attempts : how many draws at most (default ``40 * points``).

    Returns
    =======

    :class:`ReductionCheck`.

    Examples
    ========

    The sum over :math:`m_1, m_2` of two 3j symbols with the same :math:`m_3` is
    :math:`1/(2c+1)` inside the triangle (Edmonds 1957, eq. 3.7.8; from memory):

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> from amalgebra.racah import check_reduction, projection_sum
    >>> from amalgebra.racah.triangle import TriangleDelta
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> s = projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2)
    >>> report = check_reduction(s, TriangleDelta(a, b, c) / (2*c + 1), points=2)
    >>> report.passed, report.failures
    (True, [])
    >>> check_reduction(s, TriangleDelta(a, b, c) / (2*a + 1), points=2).passed    # a wrong line
    False
    """
    from sympy import Integer

    if isinstance(result, int):
        result = Integer(result)
    free = sorted(expr.free_symbols, key=default_sort_key)
    extra = sorted(set(result.free_symbols) - set(free), key=default_sort_key)
    report = ReductionCheck()
    if extra:
        report.note = f"the result has symbols the sum has not: {extra}"
        return report
    mset = _projection_symbols(expr)
    js = [s for s in free if s not in mset]
    ms = [s for s in free if s in mset]
    lines = _projection_lines(expr)
    bound = set()
    for node in preorder_traversal(expr):
        if isinstance(node, Sum):
            bound |= {lim[0] for lim in node.limits}
    triads = _fixed_triads(expr, bound)
    rng = random.Random(f"amalgebra-racah:{seed}")
    for _ in range(attempts or 40 * points):
        if report.nonzero >= points:
            break
        values = _draw(rng, js, ms, lines, jmax, triads=triads if rng.random() > 0.1 else ())
        if values is None:
            report.skipped += 1
            continue
        if not _admissible(triads, values) and rng.random() > 0.1:
            report.skipped += 1   # mostly draws inside the triangles; a few outside test the zeros
            continue
        for _ in range(8 if ms else 0):
            # projections drawn again until the reduced form is nonzero (cheap to evaluate);
            # the direct sum still decides, and a few zero draws are kept
            try:
                if direct_value(result, values) != 0 or rng.random() < 0.1:
                    break
            except (ValueError, TypeError):
                break
            again = _draw(rng, [], ms, lines, jmax, {j: values[j] for j in js})
            if again is None:
                break
            values.update(again)
        try:
            lhs = direct_value(expr, values)
        except (ValueError, TypeError):
            report.skipped += 1
            continue
        rhs = direct_value(result, values)
        if not _same(lhs, rhs):
            report.failures.append((values, lhs, rhs))
            continue
        report.samples.append((values, lhs))
        if lhs == 0:
            report.zero += 1
        else:
            report.nonzero += 1
    return report
