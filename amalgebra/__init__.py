"""amalgebra: exact angular-momentum algebra on top of SymPy.

Public map
==========

Quantum numbers and errors
    :mod:`amalgebra.qnumbers`, :mod:`amalgebra.errors`

Everything listed in ``__all__`` below is importable from the package itself.
"""

__version__ = "0.1.0"

from .errors import (  # noqa: F401
    AmalgebraError,
    ConventionError,
    DerivationStepError,
    NotNumericError,
    OperatorError,
    ParseError,
    ProjectionError,
    QuantumNumberError,
    StoredResultError,
)
from .qnumbers import half_integer, triangle  # noqa: F401

__all__ = [
    "__version__",
    "AmalgebraError",
    "ConventionError",
    "DerivationStepError",
    "NotNumericError",
    "OperatorError",
    "ParseError",
    "ProjectionError",
    "QuantumNumberError",
    "StoredResultError",
    "half_integer",
    "triangle",
]
