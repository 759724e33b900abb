r"""Boson modes, Fock kets and the Schwinger oscillator model of angular momentum.

Public map
==========

Operators (:mod:`.operators`)
    :class:`BosonMode`, :class:`BosonOperator`, :func:`boson_modes`; the kernel mode
    :data:`BOSON` (registered with :func:`amalgebra.algebra.modes.register_mode` at import,
    so :func:`amalgebra.algebra.canonical` normal-orders boson expressions)
Fock kets (:mod:`.fock`)
    :class:`FockKet`, :class:`FockBra`, :func:`fock_ket`, :func:`fock_bra`, :func:`vacuum`,
    :func:`occupation`, :func:`fock_components`, :func:`fock_inner`, :func:`apply_bosons`,
    :func:`fock_matrix_element`
Schwinger map (:mod:`.schwinger`)
    :func:`schwinger_images`, :func:`to_bosons`, :func:`from_bosons`, :func:`spin_to_fock`,
    :func:`fock_to_spin`, :func:`apply_schwinger`, :func:`schwinger_shifts`, :func:`rotated_creators`,
    :func:`schwinger_small_d`, :func:`schwinger_small_d_matrix`, :func:`clear_schwinger_caches`,
    :class:`NotInImageError` (from :mod:`amalgebra.errors`)

Examples
========

>>> from amalgebra.algebra import AngularMomentum, commutator
>>> from amalgebra.bosons import to_bosons
>>> J = AngularMomentum("J")
>>> to_bosons(J.plus)                  # J+ = a^dagger b
a.create*b.annihilate
>>> commutator(to_bosons(J.plus), to_bosons(J.minus)) == to_bosons(2*J.z)
True
"""

from .fock import (FockBra, FockKet, apply_bosons, fock_bra, fock_components, fock_inner, fock_ket,
                   fock_matrix_element, occupation, vacuum)
from .operators import BOSON, BosonMode, BosonOperator, boson_modes
from .schwinger import (NotInImageError, apply_schwinger, clear_schwinger_caches, fock_to_spin, from_bosons,
                        rotated_creators, schwinger_images, schwinger_shifts, schwinger_small_d,
                        schwinger_small_d_matrix, spin_to_fock, to_bosons)

__all__ = [
    "BosonMode", "BosonOperator", "boson_modes", "BOSON",
    "FockKet", "FockBra", "fock_ket", "fock_bra", "vacuum", "occupation", "fock_components", "fock_inner",
    "apply_bosons", "fock_matrix_element",
    "schwinger_images", "to_bosons", "from_bosons", "spin_to_fock", "fock_to_spin", "apply_schwinger",
    "schwinger_shifts",
    "rotated_creators", "schwinger_small_d", "schwinger_small_d_matrix", "clear_schwinger_caches",
    "NotInImageError",
]
