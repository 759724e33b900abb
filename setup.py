"""Build script for the one optional compiled part of amalgebra: the GMP 3j/6j/9j kernels.

Everything else is configured in ``pyproject.toml``.  The extension is
optional: without a C compiler or the GMP headers (Debian: ``libgmp-dev``)
the build prints a warning naming what is missing and installs the
pure-Python package, whose results are identical (see
``amalgebra.coupling.kernels``); the first evaluation then warns once more
(``KernelFallbackWarning``), and ``amalgebra.kernel_backend()`` says
``"python (compiled kernel not built)"``.

Environment switches (read at build time):

* ``AMALGEBRA_PURE_PYTHON=1`` skips the extension (a pure wheel);
* ``AMALGEBRA_REQUIRE_COMPILED=1`` makes a failed extension build an error
  instead of a fallback (CI and wheel builders use it, so a wheel never ships
  without the kernel by accident);
* ``AMALGEBRA_GMP_PREFIX=DIR`` adds ``DIR/include`` and ``DIR/lib`` to the
  compiler's search paths, for a GMP outside them (the wheel builds of
  ``pyproject.toml``'s ``[tool.cibuildwheel]``: Homebrew's on macOS, vcpkg's on
  Windows).
"""

import os
import shutil
import sys
from pathlib import Path

from setuptools import Extension, setup
from setuptools.command.build_ext import build_ext
from setuptools.command.build_py import build_py


def _flag(name):
    return os.environ.get(name, "").lower() not in ("", "0", "false", "no")


class OptionalBuildExt(build_ext):
    """``build_ext`` that says loudly when the optional kernel could not be built."""

    def run(self):
        try:
            super().run()
        except Exception as exc:  # compiler missing: setuptools raises before compiling anything
            self._fallback(exc)

    def build_extension(self, ext):
        try:
            super().build_extension(ext)
        except Exception as exc:  # compile or link error (typically gmp.h or libgmp missing)
            self._fallback(exc)

    def _fallback(self, exc):
        if _flag("AMALGEBRA_REQUIRE_COMPILED"):
            raise
        banner = "=" * 78
        sys.stderr.write(
            f"\n{banner}\nWARNING: amalgebra's compiled coupling kernel was NOT built ({type(exc).__name__}: "
            f"{exc}).\nThe pure-Python kernel will run instead: identical results, several times slower.\n"
            "To build it: install a C compiler and GMP's headers (Debian/Ubuntu: apt-get install "
            "libgmp-dev;\nFedora: dnf install gmp-devel; macOS: brew install gmp) and reinstall.  "
            "Set AMALGEBRA_REQUIRE_COMPILED=1\nto make this an error instead.\n"
            f"{banner}\n\n")


def _gmp_location():
    """Search paths and library name of GMP: the compiler's defaults, or ``AMALGEBRA_GMP_PREFIX``."""
    prefix = os.environ.get("AMALGEBRA_GMP_PREFIX", "").strip()
    if not prefix:
        return {"libraries": ["gmp"]}
    lib = Path(prefix) / "lib"
    # MSVC links gmp.lib (vcpkg's name); a MinGW-style build names it libgmp.lib or libgmp.dll.a
    name = "libgmp" if sys.platform == "win32" and not (lib / "gmp.lib").exists() \
        and any((lib / f).exists() for f in ("libgmp.lib", "libgmp.dll.a")) else "gmp"
    return {"include_dirs": [str(Path(prefix) / "include")], "library_dirs": [str(lib)], "libraries": [name]}


extensions = []
if not _flag("AMALGEBRA_PURE_PYTHON"):
    extensions.append(Extension("amalgebra.coupling._racah6j", ["amalgebra/coupling/_racah6j.c"],
                                **_gmp_location()))



class BuildPyWithExamples(build_py):
    """Also ship ``worked_examples/`` as package data ``amalgebra/worked_examples``, so a bare
    ``amalgebra check`` runs them after ``pip install amalgebra`` (``amalgebra.cli``)."""

    def run(self):
        super().run()
        if getattr(self, "editable_mode", False):
            return  # an editable install reads them from the source tree
        target = Path(self.build_lib) / "amalgebra" / "worked_examples"
        target.mkdir(parents=True, exist_ok=True)
        for path in sorted(Path("worked_examples").iterdir()):
            if path.name.startswith("deriv_") and path.suffix in (".py", ".toml") \
                    or path.name == "README.md":
                shutil.copyfile(path, target / path.name)


setup(ext_modules=extensions, cmdclass={"build_ext": OptionalBuildExt, "build_py": BuildPyWithExamples})
