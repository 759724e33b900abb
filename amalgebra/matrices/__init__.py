"""Explicit matrices of operator expressions (exact, numpy, scipy.sparse) and identity checks.

Public map
==========

:mod:`amalgebra.matrices.explicit`
    ``to_matrix`` for any expression the library builds (one route decision), single multiplets,
    ``verify_identity`` / ``assert_identity``;
:mod:`amalgebra.matrices.multiplets`
    numeric (numpy, scipy.sparse) matrices on direct sums of multiplets, tensor and vector components by the
    Wigner-Eckart theorem (exact matrices come from :mod:`amalgebra.states.engine`).
"""

from . import explicit, multiplets
from .explicit import *  # noqa: F401,F403
from .multiplets import *  # noqa: F401,F403

__all__ = [*explicit.__all__, *multiplets.__all__]
