"""Noncommutative angular-momentum operator algebra.

Public map
==========

Operators (:mod:`.operators`)
    :class:`AngularMomentum`, :class:`AngularMomentumComponent`, :func:`dot`
Canonical form (:mod:`.canonical`, kernel in :mod:`.shiftform`, modes in :mod:`.modes`)
    :func:`canonical`, :func:`ladder_terms`, :func:`collect_casimir`, :func:`shift_form`,
    :func:`operator_coefficients` (coefficients as data); coefficient domain and normal
    form in :mod:`.coefficients`
Commutators (:mod:`.commutators`)
    :func:`commutator`, :func:`nested_commutator`, :func:`adjoint_action`
Rewriting (:mod:`.rewrite`)
    :func:`to_cartesian`, :func:`to_ladder`

Examples
========

>>> from amalgebra.algebra import AngularMomentum, commutator
>>> J = AngularMomentum("J")
>>> commutator(J.y, J.z)       # [Jy, Jz] = i Jx, Sakurai (3.1.20)
I*J.minus/2 + I*J.plus/2
"""

from .canonical import canonical, collect_casimir, ladder_terms, operator_coefficients, shift_form
from .commutators import adjoint_action, commutator, nested_commutator
from .operators import AngularMomentum, AngularMomentumComponent, dot
from .rewrite import to_cartesian, to_ladder

__all__ = [
    "AngularMomentum",
    "AngularMomentumComponent",
    "dot",
    "canonical",
    "ladder_terms",
    "collect_casimir",
    "shift_form",
    "operator_coefficients",
    "commutator",
    "nested_commutator",
    "adjoint_action",
    "to_cartesian",
    "to_ladder",
]
