"""Hypothesis strategies for angular-momentum operator polynomials.

Explanation
===========

:func:`operator_polynomials` draws small random polynomials (sums of products
of components, with small integer or Gaussian-rational coefficients) over a
given set of labels.  They are ordinary SymPy expressions, so a test can
evaluate them independently (e.g. with numpy matrices) and compare with the
canonical form.  ``max_weight`` bounds the weighted degree of every product
(``J^2`` counts 2, other components 1), which tests use to decide how many j
values are needed to identify a polynomial from its matrices.

Examples
========

>>> from hypothesis import given, settings
>>> from amalgebra.algebra import canonical
>>> from amalgebra.testing.strategies import operator_polynomials
>>> @settings(max_examples=5, database=None)
... @given(operator_polynomials(labels=("J",)))
... def check(p):
...     assert canonical(canonical(p)) == canonical(p)
>>> check()
"""

from hypothesis import strategies as st
from sympy import I, Integer, Mul, Add, Rational

from ..algebra.operators import COMPONENTS, AngularMomentumComponent

__all__ = ["components", "coefficients", "monomials", "operator_polynomials", "weight"]

_WEIGHT = {"squared": 2}


def weight(component):
    """Weighted degree of one component (``squared`` counts 2)."""
    return _WEIGHT.get(component, 1)


def components(labels=("J",), names=COMPONENTS):
    """A single component of one of ``labels``."""
    return st.builds(AngularMomentumComponent, st.sampled_from(list(labels)), st.sampled_from(list(names)))


def coefficients(gaussian=True):
    """Small exact nonzero coefficients: integers, halves, optionally times ``I``."""
    real = st.sampled_from([Integer(1), Integer(-1), Integer(2), Integer(-3), Rational(1, 2), Rational(-3, 2)])
    if not gaussian:
        return real
    return st.one_of(real, real.map(lambda c: c * I), real.map(lambda c: c * (1 + I)))


@st.composite
def monomials(draw, labels=("J",), max_weight=4, names=COMPONENTS, gaussian=True):
    """``c * A1 * A2 * ...`` with total weighted degree at most ``max_weight``."""
    factors = []
    total = 0
    count = draw(st.integers(0, max_weight))
    for _ in range(count):
        comp = draw(components(labels, names))
        if total + weight(comp.component) > max_weight:
            break
        total += weight(comp.component)
        factors.append(comp)
    return Mul(draw(coefficients(gaussian)), *factors)


def operator_polynomials(labels=("J",), max_terms=3, max_weight=4, names=COMPONENTS, gaussian=True):
    """Sums of up to ``max_terms`` random monomials (see :func:`monomials`)."""
    return st.lists(monomials(labels, max_weight, names, gaussian), min_size=1,
                    max_size=max_terms).map(lambda ms: Add(*ms))
