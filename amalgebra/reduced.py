"""Deprecated location of :mod:`amalgebra.tensors.wigner_eckart` (moved in amalgebra 0.2.0).

Import from :mod:`amalgebra.tensors.wigner_eckart` (or the public names from :mod:`amalgebra`); this module
re-exports them and warns once on import.
"""

import warnings

from amalgebra.tensors.wigner_eckart import *  # noqa: F401,F403
from amalgebra.tensors.wigner_eckart import __all__  # noqa: F401

warnings.warn("amalgebra.reduced moved to amalgebra.tensors.wigner_eckart in amalgebra 0.2.0; import from amalgebra.tensors.wigner_eckart or from amalgebra",
              DeprecationWarning, stacklevel=2)
