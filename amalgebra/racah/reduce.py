r"""Reduce a sum over projections (and momenta) of coupling coefficients to a closed form.

Explanation
===========

:func:`reduce_racah_sum` reads the sum into a graph
(:mod:`amalgebra.racah.network`), removes the summed intermediate momenta the
user wrote (:math:`\sum_x (2x+1)\ldots`) by the rules read backwards, then
reduces the graph by the graphical method of Yutsis, Levinson and Vanagas
(1962) in the order of Fack, Pitre and Van der Jeugt (1994): deltas and zero
lines, loops, bubbles (orthogonality), triangles (a 6j symbol each), the graph
:math:`K_{3,3}` (a 9j symbol), and cycles of four or more lines shortened by an
interchange (each a new sum over a momentum of a 6j symbol).  The rules and
their phases are listed in :mod:`amalgebra.racah.rules` and
:mod:`amalgebra.racah.matching`; every one is an exact identity, so every
intermediate expression equals the input.

When no rule applies and projections are still summed, the reduction stops
and says so (``complete`` is False, ``reason`` says what is left): the
result is then the partial form, still equal to the input, never a guessed
closed form.

Conventions: Condon-Shortley phases and the library's 3j, 6j, 9j (Edmonds
1957); projections that are not summed are assumed to lie in the range of
their line (:math:`|m| \le j`, :math:`j-m` an integer), as in the printed
identities.

Examples
========

Orthogonality of 3j symbols (Edmonds 1957, eq. 3.7.8; from memory):

>>> from sympy import symbols
>>> from amalgebra.coupling import Coupling3j
>>> from amalgebra.racah import projection_sum, reduce_racah_sum
>>> a, b, c, cp, m1, m2, m3, m3p = symbols("a b c cp m1 m2 m3 m3p")
>>> s = projection_sum(Coupling3j(a, b, c, m1, m2, m3) * Coupling3j(a, b, cp, m1, m2, m3p), m1, m2)
>>> r = reduce_racah_sum(s)
>>> r.complete, r.result
(True, KroneckerDelta(c, cp)*KroneckerDelta(m3, m3p)*TriangleDelta(a, b, c)/(2*c + 1))
>>> r.check(points=3).passed
True
"""

from dataclasses import dataclass

from sympy import Add, S
from sympy.printing.defaults import Printable

from .. import notation

from .network import network_from_expr
from .rules import (RuleContext, bubble_rule, eliminate_momentum, free_lines, interchange_rule,
                    loop_rule, ninej_rule, resolve_deltas, triangle_rule, zero_lines)
from .finish import finish

__all__ = ["ReductionStep", "Reduction", "reduce_racah_sum"]

#: upper bound on rule applications (a reduction of n vertices needs about 2n)
MAX_STEPS = 400


@dataclass(frozen=True, repr=True)
class ReductionStep(Printable):
    """One rule application: its name, the identity used, and the expression after it.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> from amalgebra.racah import projection_sum, reduce_racah_sum
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> r = reduce_racah_sum(projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2, m3))
    >>> first = r.steps[0]
    >>> first.rule, "Edmonds 1957" in first.because
    ('bubble', True)
    >>> first.expr
    Sum(TriangleDelta(a, b, c)/(2*c + 1), (m3, -c, c))

    The steps form a chain that ends at the result:

    >>> r.steps[-1].expr == r.result
    True
    """

    rule: str
    because: str
    expr: object

    def _latex(self, printer, exp=None):
        return notation.reduction_step_latex(printer, self, exp)

    def _sympystr(self, printer):
        return repr(self)


@dataclass(frozen=True, repr=True)
class Reduction(Printable):
    """The outcome of :func:`reduce_racah_sum`.

    ``expr`` the input, ``result`` the reduced form (equal to ``expr``),
    ``complete`` True when no projection and no input momentum is summed any
    more, ``reason`` what stopped the reduction otherwise, ``steps`` the rule
    applications in order.

    Examples
    ========

    The normalisation of the 3j symbol (Edmonds 1957, eq. 3.7.8; from memory):

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> from amalgebra.racah import projection_sum, reduce_racah_sum
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> r = reduce_racah_sum(projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2, m3))
    >>> r.complete, r.result, r.reason
    (True, TriangleDelta(a, b, c), '')
    >>> [step.rule for step in r.steps]
    ['bubble', 'free line']

    The result agrees with direct summation at random admissible values:

    >>> r.check(points=2).passed
    True
    """

    expr: object
    result: object
    complete: bool
    reason: str
    steps: tuple

    def _latex(self, printer, exp=None):
        return notation.reduction_latex(printer, self, exp)

    def _sympystr(self, printer):
        return repr(self)

    def check(self, **options):
        """Compare ``result`` with direct summation of ``expr`` (see :func:`check_reduction`)."""
        from .check import check_reduction

        return check_reduction(self.expr, self.result, **options)


RULES = (("zero line", zero_lines), ("free line", free_lines), ("loop", loop_rule),
         ("bubble", bubble_rule), ("triangle", triangle_rule), ("ninej", ninej_rule),
         ("interchange", interchange_rule))


def _run(net, ctx, log, momenta):
    """Remove the summed ``momenta``, then apply the graph rules until none applies;
    return why the sum over a momentum could not be removed ('' when it could)."""
    reason = ""
    for x in momenta:
        if ctx.zero:
            break
        if not eliminate_momentum(net, ctx, x, log):
            reason = f"the sum over the momentum {x} matches no rule"
        elif resolve_deltas(net, ctx):
            log("delta", "Kronecker deltas from completeness summed")
    for _ in range(MAX_STEPS):
        if ctx.zero:
            break
        for name, rule in RULES:
            because = rule(net, ctx)
            if because:
                resolve_deltas(net, ctx)
                log(name, because)
                break
        else:
            break
    return reason


def _recorder(net, ctx, steps, prefix=""):
    def log(rule, because):
        expr = S.Zero if ctx.zero else net.to_expr((ctx.mdeltas, ctx.jdeltas))
        steps.append(ReductionStep(rule, prefix + because, expr))
    return log


def _resum(net):
    """The sums over momenta that interchanges introduced, removed again when that closes
    the graph with fewer sums (a sum over x of three 6j symbols becomes a 9j symbol, Edmonds
    1957, eq. 6.4.3); ``(network, context, steps)`` or ``None``."""
    news = [x for x, (_, _, kind) in net.xvars.items() if kind == "new"]
    if not news or net.mvars:
        return None
    trial = net.copy()
    for x in news:
        lo, hi, _ = trial.xvars[x]
        trial.xvars[x] = (lo, hi, "input")
    ctx = RuleContext()
    steps = []
    reason = _run(trial, ctx, _recorder(trial, ctx, steps, "sum over new momenta: "), news)
    if ctx.zero or (not reason and not trial.mvars and len(trial.xvars) < len(news)):
        return trial, ctx, steps
    return None


def _reduce_term(term, summed_m, summed_j):
    net = network_from_expr(term, summed_m, summed_j)
    ctx = RuleContext()
    steps = []
    ctx.jdeltas.extend(net.jdeltas)
    ctx.mdeltas.extend(net.mdeltas)
    net.jdeltas, net.mdeltas = [], []
    log = _recorder(net, ctx, steps)
    if resolve_deltas(net, ctx):
        log("delta", "Kronecker deltas summed")
    reason = _run(net, ctx, log, [x for x, (_, _, kind) in net.xvars.items() if kind == "input"])
    if not ctx.zero and not reason:
        again = _resum(net)
        if again is not None:
            net, ctx, more = again
            steps.extend(more)
    if ctx.zero:
        return S.Zero, True, "", steps
    result, tidy = finish(net)
    if tidy:
        steps.append(ReductionStep("tidy", tidy, result))
    if not reason:
        reason = _left_over(net)
    return result, not reason, reason, steps


def _left_over(net):
    if net.mvars:
        names = ", ".join(sorted(map(str, net.mvars)))
        return (f"projections {names} are still summed: the remaining graph "
                f"({len(net.verts)} 3j symbols) has no loop, bubble, triangle or cycle the rules reduce")
    if any(v in net.mvars for f, g in net.mdeltas for v in list(f) + list(g)):
        return "a Kronecker delta of projections could not be summed"
    return ""


def reduce_racah_sum(expr, *, summed_m=(), summed_j=()):
    r"""Reduce a sum of products of coupling coefficients to a closed form.

    Parameters
    ==========

    expr : SymPy expression
        A ``Sum`` (or several nested) of a product of 3j, Clebsch-Gordan, 6j and 9j
        symbols (:mod:`amalgebra.coupling`), ``KroneckerDelta``, phases
        ``(-1)**(...)`` linear in the momenta and projections, powers of
        ``(2j+1)`` and constants; a sum of such terms is reduced term by term.
        Projections run over :math:`-j..j` of their line, momenta over
        :math:`|a-b|..a+b` of one of their triads (:func:`projection_sum`,
        :func:`momentum_sum` build such sums).
    summed_m, summed_j : sequences of Symbols
        Further projections and momenta summed over their full ranges, for a
        summand given without ``Sum``.

    Returns
    =======

    :class:`Reduction` -- ``result``, ``complete``, ``reason``, ``steps``,
    and ``check()``.

    Examples
    ========

    The sum of three 3j symbols over three projections is a 3j times a 6j
    (Edmonds 1957, eq. 6.2.8; from memory):

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j as TJ
    >>> from amalgebra.racah import projection_sum, reduce_racah_sum
    >>> j1, j2, j3, l1, l2, l3, m1, m2, m3, u1, u2, u3 = symbols("j1 j2 j3 l1 l2 l3 m1 m2 m3 u1 u2 u3")
    >>> s = projection_sum((-1)**(l1 + l2 + l3 + u1 + u2 + u3) * TJ(j1, l2, l3, m1, u2, -u3)
    ...                    * TJ(l1, j2, l3, -u1, m2, u3) * TJ(l1, l2, j3, u1, -u2, m3), u1, u2, u3)
    >>> reduce_racah_sum(s).result
    3j(j1, j2, j3; m1, m2, m3)*6j{j1, j2, j3; l1, l2, l3}
    """
    if isinstance(expr, Add):
        parts = [_reduce_term(t, summed_m, summed_j) for t in Add.make_args(expr)]
        steps = []
        for i, p in enumerate(parts):
            steps.extend(ReductionStep(s.rule, f"term {i + 1}: {s.because}", s.expr) for s in p[3])
        reasons = "; ".join(p[2] for p in parts if p[2])
        return Reduction(expr, Add(*[p[0] for p in parts]), all(p[1] for p in parts), reasons,
                         tuple(steps))
    result, complete, reason, steps = _reduce_term(expr, summed_m, summed_j)
    return Reduction(expr, result, complete, reason, tuple(steps))
