"""Rotations: Wigner D and d, the Clebsch-Gordan series, rotating kets and operators, spherical harmonics.

Public map
==========

:mod:`amalgebra.rotations.wigner`
    Wigner ``D`` and ``d`` functions and matrices (active z-y-z rotations), ``RotationElement``;
:mod:`amalgebra.rotations.series`
    composition of rotations and the Clebsch-Gordan series;
:mod:`amalgebra.rotations.actions`
    rotating kets and operators;
:mod:`amalgebra.rotations.harmonics`
    spherical harmonics (Condon-Shortley), the addition theorem, Gaunt coefficients.

Every public name of the four modules is importable from here.
"""

from . import actions, harmonics, series, wigner
from .actions import *  # noqa: F401,F403
from .harmonics import *  # noqa: F401,F403
from .series import *  # noqa: F401,F403
from .wigner import *  # noqa: F401,F403

__all__ = [*wigner.__all__, *series.__all__, *actions.__all__, *harmonics.__all__]
