"""Check, in the environment where a repaired (manylinux) wheel is installed, that the compiled kernel runs
on the libgmp the wheel brings and not on the system's.  Run with the installed environment's python -P
(.ci/run stage 3).

Three facts are checked after importing the extension: ``kernel_backend()`` reports the compiled kernel;
every libgmp mapped into this process (``/proc/self/maps``) lies in the wheel's ``amalgebra.libs/`` beside
the installed package; and a 6j symbol evaluates to the value of Racah's formula
(Edmonds 1957, eq. 6.3.7: {1 1 1; 1 1 1} = 1/6).  Exits non-zero with a message otherwise.
"""

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

value = sixj(1, 1, 1, 1, 1, 1)
if value != sympy.Rational(1, 6):  # Edmonds 1957, eq. 6.3.7
    problems.append(f"sixj(1, 1, 1, 1, 1, 1) is {value}, not 1/6")

if problems:
    sys.exit("CI: " + "; ".join(problems))
print(f"CI: amalgebra {amalgebra.__version__}: {backend}, libgmp from the wheel: {', '.join(mapped)}")
