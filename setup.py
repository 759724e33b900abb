"""Build script for the one optional compiled part of amalgebra: the GMP 6j kernel.

Everything else is configured in ``pyproject.toml``.  The extension is
``optional``: without a C compiler or the GMP headers (Debian: ``libgmp-dev``)
the build prints a warning and installs the pure-Python package, whose
results are identical (see ``amalgebra.coupling.kernels``).  Set
``AMALGEBRA_PURE_PYTHON=1`` at install time to skip the extension.
"""

import os

from setuptools import Extension, setup

extensions = []
if os.environ.get("AMALGEBRA_PURE_PYTHON", "") in ("", "0"):
    extensions.append(Extension("amalgebra.coupling._racah6j", ["amalgebra/coupling/_racah6j.c"],
                                libraries=["gmp"], optional=True))

setup(ext_modules=extensions)
