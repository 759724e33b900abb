"""Check, in the environment where a repaired (manylinux) wheel is installed, that the compiled kernel runs
on the libgmp the wheel brings and not on the system's.  Run with the installed environment's python -P
(.ci/run stage 3).

Checked after importing the extension: ``kernel_backend()`` reports the compiled kernel;
every libgmp mapped into this process (``/proc/self/maps``) lies in the wheel's ``amalgebra.libs/`` beside
the installed package; the version that library reports is the one the wheel records
(``amalgebra/coupling/GMP-VERSION.txt``); GMP's licence texts and notice are installed
(``.dist-info/licenses/LICENSES/``); and a 6j symbol evaluates to the value of Racah's formula
(Edmonds 1957, eq. 6.3.7: {1 1 1; 1 1 1} = 1/6).  Exits non-zero with a message otherwise.
"""

import ctypes
import importlib.metadata
import sys
from pathlib import Path

import sympy

import amalgebra
from amalgebra.coupling import _racah6j, kernel_backend, sixj

problems = []
backend = kernel_backend()
if backend != "compiled (GMP)":
    problems.append(f"kernel_backend() is {backend!r}, not the compiled kernel")

bundled = Path(_racah6j.__file__).resolve().parents[2] / "amalgebra.libs"
with open("/proc/self/maps", encoding="ascii", errors="replace") as maps:
    mapped = sorted({line.split()[-1] for line in maps if "libgmp" in line and "/" in line})
if not mapped:
    problems.append("no libgmp is mapped into the process after importing the extension")
outside = [path for path in mapped if Path(path).resolve().parent != bundled.resolve()]
if outside:
    problems.append(f"libgmp mapped from outside the wheel's {bundled}: {outside}")

# the GMP version recorded at build time (amalgebra/coupling/GMP-VERSION.txt, named by the notice) is the one
# the bundled library reports, and the licence texts and the notice are installed with the package
record = (Path(_racah6j.__file__).parent / "GMP-VERSION.txt").read_text(encoding="utf-8").splitlines()[0]
if mapped:
    reported = ctypes.c_char_p.in_dll(ctypes.CDLL(mapped[0]), "__gmp_version").value.decode("ascii")
    if record != f"GNU MP {reported}":
        problems.append(f"GMP-VERSION.txt says {record!r}, the bundled library {reported!r}")
licences = {str(f) for f in importlib.metadata.distribution("amalgebra").files or ()
            if str(f).split("/")[1:2] == ["licenses"]}
for name in ("LICENSE", "LICENSES/GMP-NOTICE.txt", "LICENSES/LGPL-3.0.txt", "LICENSES/GPL-3.0.txt",
             "LICENSES/GPL-2.0.txt"):
    if not any(f.endswith(f".dist-info/licenses/{name}") for f in licences):
        problems.append(f"{name} is not installed in the .dist-info/licenses/")

value = sixj(1, 1, 1, 1, 1, 1)
if value != sympy.Rational(1, 6):  # Edmonds 1957, eq. 6.3.7
    problems.append(f"sixj(1, 1, 1, 1, 1, 1) is {value}, not 1/6")

if problems:
    sys.exit("CI: " + "; ".join(problems))
print(f"CI: amalgebra {amalgebra.__version__}: {backend}, libgmp from the wheel: {', '.join(mapped)} "
      f"({record}, as GMP-VERSION.txt records); GMP's licence texts and notice installed")
