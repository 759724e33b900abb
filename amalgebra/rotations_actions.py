"""Deprecated location of :mod:`amalgebra.rotations.actions` (moved in amalgebra 0.2.0).

Import from :mod:`amalgebra.rotations.actions` (or the public names from :mod:`amalgebra`); this module
re-exports them and warns once on import.
"""

import warnings

from amalgebra.rotations.actions import *  # noqa: F401,F403
from amalgebra.rotations.actions import __all__  # noqa: F401

warnings.warn("amalgebra.rotations_actions moved to amalgebra.rotations.actions in amalgebra 0.2.0; import from amalgebra.rotations.actions or from amalgebra",
              DeprecationWarning, stacklevel=2)
