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
Integer kernels (no SymPy); which 6j kernel runs (compiled GMP or pure Python)
    :mod:`amalgebra.coupling.kernels`, :func:`kernel_backend`
Closed forms for symbolic arguments
    :mod:`amalgebra.coupling.closed_forms`
Unevaluated symbols (printed in standard notation, evaluated by ``doit()``)
    :class:`ClebschGordanSymbol`, :class:`ThreeJSymbol`, :class:`SixJSymbol`,
    :class:`NineJSymbol` (:mod:`amalgebra.coupling.symbols`)
"""

from .coefficients import cg, ninej, racah_w, sixj, threej
from .floats import cg_float, ninej_float, sixj_float, threej_float
from .kernels import kernel_backend
from .symbols import ClebschGordanSymbol, NineJSymbol, SixJSymbol, ThreeJSymbol
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
    "ClebschGordanSymbol",
    "ThreeJSymbol",
    "SixJSymbol",
    "NineJSymbol",
]
