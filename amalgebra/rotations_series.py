"""Deprecated location of :mod:`amalgebra.rotations.series` (moved in amalgebra 0.2.0).

Import from :mod:`amalgebra.rotations.series` (or the public names from :mod:`amalgebra`); this module
re-exports them and warns once on import.
"""

import warnings

from amalgebra.rotations.series import *  # noqa: F401,F403
from amalgebra.rotations.series import __all__  # noqa: F401

warnings.warn("amalgebra.rotations_series moved to amalgebra.rotations.series in amalgebra 0.2.0; import from amalgebra.rotations.series or from amalgebra",
              DeprecationWarning, stacklevel=2)
