"""Build script for the one optional compiled part of amalgebra: the GMP 3j/6j/9j kernels.

Everything else is configured in ``pyproject.toml``.  The extension is
optional: without a C compiler or the GMP headers (Debian: ``libgmp-dev``)
the build prints a warning naming what is missing and installs the
pure-Python package, whose results are identical (see
``amalgebra.coupling.kernels``); the first evaluation then warns once more
(``KernelFallbackWarning``), and ``amalgebra.kernel_backend()`` says
``"python (compiled kernel not built)"``.

A build that compiles the kernel (not an editable one) also writes
``amalgebra/coupling/GMP-VERSION.txt``: the version of the libgmp the extension
loads at build time, which is the one a wheel repair tool then bundles; the
notice ``LICENSES/GMP-NOTICE.txt`` (shipped with GMP's licence texts in every
distribution, ``license-files`` in ``pyproject.toml``) points to it.

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
            return
        if not (self.inplace or getattr(self, "editable_mode", False)):
            self._record_gmp_version(ext)

    def _record_gmp_version(self, ext):
        """Write ``amalgebra/coupling/GMP-VERSION.txt`` into the build: the version of the libgmp the
        extension loads here, which is the one a repair tool (auditwheel, delocate, delvewheel) then
        copies into a binary wheel (named by ``LICENSES/GMP-NOTICE.txt``)."""
        version, how = _linked_gmp_version(self.get_ext_fullpath(ext.name), ext)
        target = Path(self.build_lib) / "amalgebra" / "coupling" / "GMP-VERSION.txt"
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_text(f"GNU MP {version}\n\nThe version of the GMP library that amalgebra/coupling/_racah6j was "
                          f"built against and loaded at build time ({how}).  A binary wheel carries this "
                          "library (see LICENSES/GMP-NOTICE.txt in the wheel's .dist-info/licenses/).\n",
                          encoding="utf-8")
        sys.stderr.write(f"amalgebra: the compiled kernel links GNU MP {version} ({how})\n")

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


def _linked_gmp_version(ext_path, ext):
    """``(version, how it was read)`` of the GMP the built extension uses.

    First the library's own ``__gmp_version`` string, read through ctypes from the built extension
    (the loader resolves its libgmp as at run time; on Windows, where a module's exports do not
    include its dependencies', from the GMP DLL beside the import library's prefix); else the
    ``__GNU_MP_VERSION*`` macros of the ``gmp.h`` on the include path; else ``"(unknown)"``."""
    import ctypes
    import re

    handles = []
    try:
        handles.append(ctypes.CDLL(str(Path(ext_path).resolve())))
    except OSError:
        pass
    for folder in ext.library_dirs:
        for dll in sorted((Path(folder).parent / "bin").glob("*gmp*.dll")):
            try:
                handles.append(ctypes.CDLL(str(dll)))
            except OSError:
                pass
    for handle in handles:
        try:
            return ctypes.c_char_p.in_dll(handle, "__gmp_version").value.decode("ascii"), \
                "__gmp_version of the library the extension loaded"
        except (ValueError, AttributeError, UnicodeDecodeError):
            continue
    machine = f"{os.uname().machine}-linux-gnu" if hasattr(os, "uname") else ""
    folders = [*ext.include_dirs, "/usr/include", f"/usr/include/{machine}", "/usr/local/include"]
    for folder in folders:
        for header in sorted(Path(folder).glob("gmp*.h")):
            text = header.read_text(encoding="latin-1")
            parts = [re.search(rf"#define\s+__GNU_MP_VERSION{suffix}\s+(\d+)", text)
                     for suffix in ("", "_MINOR", "_PATCHLEVEL")]
            if all(parts):
                return ".".join(m.group(1) for m in parts), f"the version macros of {header}"
    return "(unknown)", "neither the library's __gmp_version nor gmp.h's version macros could be read"


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
