r"""A reduction as derivation steps: one step per rule application.

Explanation
===========

:func:`reduction_steps` writes the steps of a
:class:`~amalgebra.racah.Reduction` into a derivation (``d`` of
:func:`amalgebra.derivations.derivation`): the first step states
``input = (after the first rule)``, each further one continues the chain with
``d.then``, and the justification is the rule with its published source.  The
derivation engine checks each step; for sums of coupling symbols it does so by
direct summation at random admissible values (:mod:`amalgebra.racah.check`),
reported as "checked numerically": evidence, the algebra being exact.

Examples
========

>>> from sympy import symbols
>>> from amalgebra.coupling import Coupling3j
>>> from amalgebra.derivations import derivation
>>> from amalgebra.racah import projection_sum, reduce_racah_sum, reduction_steps
>>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
>>> @derivation
... def theta(d):
...     s = projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2, m3)
...     reduction_steps(d, reduce_racah_sum(s), "theta")
>>> rec = theta.run()
>>> rec.ok, [s.name for s in rec.steps]
(True, ['theta_1_bubble', 'theta_2_free_line'])
"""

__all__ = ["reduction_steps", "register_step_check"]


def register_step_check():
    """Let the derivation engine check steps holding coupling symbols by direct summation."""
    from ..derivations import checks

    hook = getattr(checks, "register_sampler", None)
    if hook is not None:
        hook(_sampler)


def _holds_coupling(expr):
    from ..coupling import Coupling3j, Coupling6j, Coupling9j, CouplingBracket

    return bool(expr.atoms(Coupling3j, Coupling6j, Coupling9j, CouplingBracket))


def _sampler(lhs, rhs, seed, points):
    """A :class:`~amalgebra.derivations.checks.Check` for a step of coupling symbols, or ``None``."""
    from sympy import Basic

    if not (isinstance(lhs, Basic) and isinstance(rhs, Basic)):
        return None
    if not (_holds_coupling(lhs) or _holds_coupling(rhs)):
        return None
    if not (lhs.free_symbols or rhs.free_symbols):
        return None
    from sympy import expand

    if expand(lhs - rhs) == 0:
        return None          # the exact route proves it
    from ..derivations.checks import Check
    from .check import check_reduction

    # at most two nonzero points with j <= 1: a step may hold a dozen summed projections
    report = check_reduction(lhs, rhs, points=min(points, 2), seed=seed, jmax=1, attempts=120)
    if not report.failures and not report.note and report.nonzero == 0:
        return None          # no admissible nonzero point found: leave the step to the other routes
    return Check("numeric", report.passed, False,
                 f"direct summation, exact, at {report.nonzero} nonzero and {report.zero} zero "
                 f"random admissible points" if report.passed else report.summary())


def reduction_steps(d, reduction, prefix="reduce"):
    """Write ``reduction`` into the derivation ``d``; return the final expression.

    Step names are ``<prefix>_<k>_<rule>``.  A reduction without steps (nothing
    to do) writes one step ``input = result``.

    Examples
    ========

    >>> from sympy import symbols
    >>> from amalgebra.coupling import Coupling3j
    >>> from amalgebra.derivations import derivation
    >>> from amalgebra.racah import projection_sum, reduce_racah_sum
    >>> a, b, c, m1, m2, m3 = symbols("a b c m1 m2 m3")
    >>> reduction = reduce_racah_sum(projection_sum(Coupling3j(a, b, c, m1, m2, m3)**2, m1, m2, m3))
    >>> @derivation
    ... def normalisation(d):
    ...     final = reduction_steps(d, reduction, "norm")
    ...     assert final == reduction.result
    >>> record = normalisation.run()
    >>> record.ok, [step.name for step in record.steps]
    (True, ['norm_1_bubble', 'norm_2_free_line'])
    """
    register_step_check()
    steps = list(reduction.steps)
    if not steps:
        return d.step(f"{prefix}_1_none", reduction.expr, reduction.result, "no rule applies")
    previous = None
    for k, st in enumerate(steps, 1):
        name = f"{prefix}_{k}_{st.rule.replace(' ', '_')}"
        because = st.because.replace("\n", " ")
        if previous is None:
            d.step(name, reduction.expr, st.expr, because)
        else:
            d.then(name, st.expr, because)
        previous = st.expr
    return previous
