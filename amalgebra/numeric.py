"""Deprecated location of :mod:`amalgebra.matrices.explicit` (moved in amalgebra 0.2.0).

Import from :mod:`amalgebra.matrices.explicit` (or the public names from :mod:`amalgebra`); this module
re-exports them and warns once on import.
"""

import warnings

from amalgebra.matrices.explicit import *  # noqa: F401,F403
from amalgebra.matrices.explicit import __all__  # noqa: F401

warnings.warn("amalgebra.numeric moved to amalgebra.matrices.explicit in amalgebra 0.2.0; import from amalgebra.matrices.explicit or from amalgebra",
              DeprecationWarning, stacklevel=2)
