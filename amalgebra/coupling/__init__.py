"""Coupling coefficients: exact Clebsch-Gordan, 3j, 6j, 9j and Racah W, with a float path.

Public map
==========

Exact values (SymPy numbers ``r*sqrt(s)``, ``s`` squarefree)
    :func:`cg`, :func:`threej`, :func:`sixj`, :func:`ninej`, :func:`racah_w`
    (:mod:`amalgebra.coupling.coefficients`)
Correctly rounded floats computed from the exact values
    :func:`cg_float`, :func:`threej_float`, :func:`sixj_float`, :func:`ninej_float`
    (:mod:`amalgebra.coupling.floats`)
Caches (bounded LRU on canonical keys under the 72/144/72 symmetries)
    :func:`clear_coupling_caches`, :func:`coupling_cache_info`
    (:mod:`amalgebra.coupling.symmetry`)
Integer kernels (no SymPy); which kernel runs (compiled GMP or pure Python), and the
once-per-process notice when the compiled kernel is missing
    :mod:`amalgebra.coupling.kernels`, :func:`kernel_backend`, :class:`KernelFallbackWarning`
Closed forms for symbolic arguments
    :mod:`amalgebra.coupling.closed_forms`
Unevaluated symbols (printed in standard notation, evaluated by ``doit()``)
    :class:`CouplingBracket`, :class:`Coupling3j`, :class:`Coupling6j`,
    :class:`Coupling9j` (:mod:`amalgebra.coupling.symbols`)
"""

from .coefficients import cg, ninej, racah_w, sixj, threej
from .floats import cg_float, ninej_float, sixj_float, threej_float
from .kernels import KernelFallbackWarning, kernel_backend
from .symbols import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from .symmetry import clear_coupling_caches, coupling_cache_info

__all__ = [
    "cg",
    "threej",
    "sixj",
    "ninej",
    "racah_w",
    "cg_float",
    "threej_float",
    "sixj_float",
    "ninej_float",
    "clear_coupling_caches",
    "coupling_cache_info",
    "kernel_backend",
    "KernelFallbackWarning",
    "CouplingBracket",
    "Coupling3j",
    "Coupling6j",
    "Coupling9j",
]


def __getattr__(name):
    # the former names of the coupling-symbol classes, deprecated in 0.2.0
    from . import symbols

    if name in symbols._RENAMED:
        return symbols._renamed_class(name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
