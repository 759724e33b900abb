"""Spherical tensor operators: families, products, decomposition, vector operators, coupled schemes.

Map of the subpackage
=====================

spherical        SphericalTensor (T^k_q families with a reduced element), TensorComponent,
                 racah_tensor (C^k), unit_tensor, tensor_matrix
products         TensorComponents, tensor_product, scalar_product, cross_product,
                 angular_momentum_tensor, quadrupole_tensor, stretched_tensor,
                 cartesian_to_spherical, spherical_to_cartesian, spherical_components
vectors          VectorOperator, VectorComponent, vector_commutator
irreducible      decompose (irreducible parts rank by rank), recombine, rotation_commutator
coupled_schemes  reduced elements in |(j1 j2) J> (Edmonds 7.1.1, 7.1.5-7.1.8), tensor_product_table,
                 projection theorem
mixedform        normal form of polynomials in angular-momentum AND tensor/vector components
                 (registered with amalgebra.algebra.canonical / commutator on import)

The Wigner-Eckart engine itself (ReducedMatrixElement, wigner_eckart, conventions) is
:mod:`amalgebra.tensors.wigner_eckart`.

>>> from amalgebra.tensors import SphericalTensor, decompose
>>> SphericalTensor("T", 1, "J")[0]
T^(1)[J]_(0)
"""

from . import coupled_schemes, irreducible, mixedform, products, spherical, vectors
from .coupled_schemes import *  # noqa: F401,F403
from .irreducible import *  # noqa: F401,F403
from .mixedform import *  # noqa: F401,F403
from .products import *  # noqa: F401,F403
from .spherical import *  # noqa: F401,F403
from .vectors import *  # noqa: F401,F403

__all__ = (list(spherical.__all__) + list(products.__all__) + list(vectors.__all__)
           + list(irreducible.__all__) + list(coupled_schemes.__all__) + list(mixedform.__all__))
