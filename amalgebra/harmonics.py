"""Deprecated location of :mod:`amalgebra.rotations.harmonics` (moved in amalgebra 0.2.0).

Import from :mod:`amalgebra.rotations.harmonics` (or the public names from :mod:`amalgebra`); this module
re-exports them and warns once on import.
"""

import warnings

from amalgebra.rotations.harmonics import *  # noqa: F401,F403
from amalgebra.rotations.harmonics import __all__  # noqa: F401

warnings.warn("amalgebra.harmonics moved to amalgebra.rotations.harmonics in amalgebra 0.2.0; import from amalgebra.rotations.harmonics or from amalgebra",
              DeprecationWarning, stacklevel=2)
