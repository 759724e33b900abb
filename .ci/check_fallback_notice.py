"""Check, in an environment where the sdist was installed by a plain ``pip install`` on a machine without
GMP's headers or a C compiler (.ci/run stage 4, inside .ci/without_system_gmp.sh), that the fallback to
the pure-Python kernel is announced: ``kernel_backend()`` names it, and the first evaluation emits
``KernelFallbackWarning`` once (a second evaluation does not repeat it), with the value unchanged
(Edmonds 1957, eq. 6.3.7: {1 1 1; 1 1 1} = 1/6).  Run with the environment's python -P.
"""

import importlib.util
import sys
import warnings

import sympy

from amalgebra.coupling import KernelFallbackWarning, kernel_backend, sixj

problems = []
if importlib.util.find_spec("amalgebra.coupling._racah6j") is not None:
    problems.append("the extension was built although GMP's headers and the compiler were hidden")
if kernel_backend() != "python (compiled kernel not built)":
    problems.append(f"kernel_backend() is {kernel_backend()!r}")
with warnings.catch_warnings(record=True) as caught:
    warnings.simplefilter("always")
    first = sixj(1, 1, 1, 1, 1, 1)
    sixj(2, 2, 2, 2, 2, 2)  # a second, different symbol: no second notice
notices = [w for w in caught if issubclass(w.category, KernelFallbackWarning)]
if len(notices) != 1:
    problems.append(f"{len(notices)} KernelFallbackWarning notices on two evaluations, not one")
if first != sympy.Rational(1, 6):  # Edmonds 1957, eq. 6.3.7
    problems.append(f"sixj(1, 1, 1, 1, 1, 1) is {first}, not 1/6")
if problems:
    sys.exit("CI: " + "; ".join(problems))
print(f"CI: plain install without GMP: kernel_backend() = {kernel_backend()!r}; notice at first use: "
      f"{str(notices[0].message)[:70]}...")
