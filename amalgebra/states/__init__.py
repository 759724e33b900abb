r"""States: kets and bras, operator action, matrix elements, coupled bases, Hamiltonians, many spins.

Public map
==========

Kets and bras (:mod:`.kets`)
    :class:`Ket`, :class:`Bra`, :class:`ProductKet`, :class:`ProductBra`, :func:`ket`, :func:`bra`,
    :func:`product_ket`, :func:`tensor`, :func:`components`, :func:`from_components`,
    :func:`inner`, :func:`norm`, :func:`normalize`
Action and matrix elements (:mod:`.action`, engine in :mod:`.actionform`)
    :func:`apply`, :func:`matrix_element`, :func:`expectation`, :class:`ActionForm`,
    :func:`action_form`, :func:`condon_shortley`
Coupled kets (:mod:`.coupled`)
    :class:`CoupledKet`, :class:`CoupledBra`, :func:`coupled_ket`, :func:`coupled_chain`,
    :func:`to_uncoupled`, :func:`uncoupled_to_coupled`, :func:`coupled_basis`,
    :func:`uncoupled_basis`, :func:`coupling_matrix`, :func:`coupling_paths`
Hamiltonians and bases (:mod:`.hamiltonian`, :mod:`.basis`, :mod:`.eigen`; the one engine is :mod:`.engine`)
    :func:`hamiltonian_matrix`, :class:`HamiltonianMatrix`, :class:`OperatorMatrix`, :class:`Block`,
    :func:`operator_matrix`, :class:`Basis`, :func:`product_basis`, :class:`Eigenvalues`, :func:`block_eigenvalues`
Many spins 1/2 (:mod:`.manyspin`)
    :func:`spin_labels`, :func:`multiplet_count`, :func:`total_spin_states`, :func:`singlet`,
    :func:`spin_along`, :func:`correlation`, :func:`chsh`, :func:`total_spin_squared`
Caches
    :func:`clear_state_caches`

Conventions: :math:`\hbar = 1`, Condon-Shortley phases
(:math:`J_\pm|j m\rangle = \sqrt{(j\mp m)(j\pm m+1)}|j, m\pm1\rangle`), real Clebsch-Gordan
coefficients, coupling in the stated order :math:`((j_1 j_2) J_{12}\, j_3) J_{123} \dots`.

Examples
========

>>> from amalgebra.algebra import AngularMomentum
>>> from amalgebra.states import ket, apply, coupled_ket, to_uncoupled
>>> J = AngularMomentum("J")
>>> apply(J.minus, ket("1/2", "1/2"))
|1/2, -1/2>_J
>>> to_uncoupled(coupled_ket("1/2", "1/2", 1, 1, labels=("A", "B")))
|1/2, 1/2>_A|1/2, 1/2>_B
"""

from . import coupled as _coupled
from . import actionform as _actionform
from .action import apply, expectation, matrix_element
from .coupled import (CoupledBra, CoupledKet, coupled_basis, coupled_chain, coupled_ket, coupling_matrix,
                      coupling_paths, to_uncoupled, uncoupled_basis, uncoupled_to_coupled)
from .basis import Basis, product_basis
from .eigen import Eigenvalues, block_eigenvalues
from . import engine as _engine
from .hamiltonian import Block, HamiltonianMatrix, OperatorMatrix, hamiltonian_matrix, operator_matrix
from .kets import (Bra, Ket, ProductBra, ProductKet, bra, components, from_components, inner, ket, norm,
                   normalize, product_ket, tensor)
from .manyspin import (chsh, correlation, multiplet_count, singlet, spin_along, spin_labels,
                       total_spin_squared, total_spin_states)
from .actionform import ActionForm, condon_shortley, action_form

__all__ = [
    "Ket", "Bra", "ProductKet", "ProductBra", "ket", "bra", "product_ket", "tensor", "components",
    "from_components", "inner", "norm", "normalize",
    "apply", "matrix_element", "expectation", "ActionForm", "action_form", "condon_shortley",
    "CoupledKet", "CoupledBra", "coupled_ket", "coupled_chain", "to_uncoupled", "uncoupled_to_coupled",
    "coupled_basis", "uncoupled_basis", "coupling_matrix", "coupling_paths",
    "hamiltonian_matrix", "HamiltonianMatrix", "OperatorMatrix", "Block", "operator_matrix",
    "Basis", "product_basis", "Eigenvalues", "block_eigenvalues",
    "spin_labels", "multiplet_count", "total_spin_states", "singlet", "spin_along", "correlation", "chsh",
    "total_spin_squared",
    "clear_state_caches",
]


def clear_state_caches():
    """Empty every cache of :mod:`amalgebra.states` (action forms, factorisations, CG expansions).

    >>> clear_state_caches()
    """
    _actionform.clear_caches()
    _engine.clear_caches()
    _coupled.clear_caches()
