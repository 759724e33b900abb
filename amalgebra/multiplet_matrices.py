"""Deprecated location of :mod:`amalgebra.matrices.multiplets` (moved in amalgebra 0.2.0).

Import from :mod:`amalgebra.matrices.multiplets` (or the public names from :mod:`amalgebra`); this module
re-exports them and warns once on import.
"""

import warnings

from amalgebra.matrices.multiplets import *  # noqa: F401,F403
from amalgebra.matrices.multiplets import __all__  # noqa: F401

warnings.warn("amalgebra.multiplet_matrices moved to amalgebra.matrices.multiplets in amalgebra 0.2.0; import from amalgebra.matrices.multiplets or from amalgebra",
              DeprecationWarning, stacklevel=2)
