"""amalgebra: exact angular-momentum algebra on top of SymPy.

Every result is an ordinary SymPy object (it prints, substitutes, simplifies,
lambdifies and pickles).  Conventions (Condon-Shortley phases, Edmonds
normalisation of reduced matrix elements, active z-y-z rotations) are listed
in the README and stated in each docstring.

Public map
==========

Quantum numbers and errors
    :mod:`amalgebra.qnumbers` (reading and validating j and m),
    :mod:`amalgebra.errors` (the typed exception hierarchy).
Coupling coefficients
    :mod:`amalgebra.coupling`: ``cg``, ``threej``, ``sixj``, ``ninej``, ``racah_w``
    exact for numeric j, closed forms for symbolic j, correctly rounded floats;
    ``ClebschGordanSymbol``, ``ThreeJSymbol``, ``SixJSymbol``, ``NineJSymbol`` as
    unevaluated symbols that print as the standard arrays (``.doit()`` evaluates).
Operators
    :mod:`amalgebra.algebra`: ``AngularMomentum``, ``canonical``, ``commutator``, ...;
    :mod:`amalgebra.numeric`: explicit matrices and identity checks.
States
    :mod:`amalgebra.states`: kets, operator action, matrix elements, coupled bases,
    Hamiltonian matrices, many spins.
Tensor operators
    :mod:`amalgebra.tensors` and :mod:`amalgebra.reduced` (Wigner-Eckart engine).
Rotations
    :mod:`amalgebra.rotations`, :mod:`amalgebra.rotations_series`,
    :mod:`amalgebra.rotations_actions`, :mod:`amalgebra.harmonics`.
Bosons
    :mod:`amalgebra.bosons`: boson modes, Fock kets, the Schwinger map.
Notation
    :mod:`amalgebra.notation`: the one module deciding how every object prints
    (str, Unicode pretty, LaTeX).
Derivations
    :mod:`amalgebra.derivations`, :mod:`amalgebra.parsing`, the ``amalgebra`` command.

The names in ``__all__`` are importable from the package itself; they are
loaded on first use, so ``import amalgebra`` stays cheap (the pytest plugin and
the command rely on that).

>>> import amalgebra as am
>>> am.cg(1, 0, "1/2", "1/2", "3/2", "1/2")
sqrt(6)/3
>>> J = am.AngularMomentum("J")
>>> am.commutator(J.x, J.y) == am.canonical(am.I * J.z) != 0
True
"""

import importlib

__version__ = "0.1.0"

# public name -> module that defines it
_SOURCES = {
    "errors": [
        "AmalgebraError", "QuantumNumberError", "ProjectionError", "NotNumericError",
        "OperatorError", "ConventionError", "ParseError", "StoredResultError",
        "DerivationStepError", "StateError", "TensorOperatorError", "NotInImageError",
    ],
    "qnumbers": ["half_integer", "triangle"],
    "coupling": [
        "cg", "threej", "sixj", "ninej", "racah_w", "cg_float", "threej_float",
        "sixj_float", "ninej_float", "clear_coupling_caches", "coupling_cache_info", "kernel_backend",
        "ClebschGordanSymbol", "ThreeJSymbol", "SixJSymbol", "NineJSymbol",
    ],
    "coupling.closed_forms": ["closed_form_conditions"],
    "algebra": [
        "AngularMomentum", "dot", "canonical", "ladder_terms", "collect_casimir",
        "commutator", "nested_commutator", "adjoint_action", "to_cartesian", "to_ladder",
    ],
    "numeric": ["to_matrix", "verify_identity", "assert_identity"],
    "states": [
        "Ket", "Bra", "ProductKet", "ket", "bra", "product_ket", "inner", "norm", "normalize",
        "apply", "matrix_element", "expectation", "CoupledKet", "coupled_ket", "coupled_chain",
        "to_uncoupled", "uncoupled_to_coupled", "coupling_matrix", "hamiltonian_matrix",
        "multiplet_count", "total_spin_states", "singlet", "correlation", "chsh",
    ],
    "rotations": ["small_d", "wigner_D", "small_d_matrix", "wigner_D_matrix", "RotationElement"],
    "rotations_series": ["compose_rotations", "clebsch_gordan_series"],
    "rotations_actions": ["rotate_ket", "rotate_operator"],
    "harmonics": ["spherical_harmonic", "racah_harmonic", "addition_theorem", "harmonic_triple_integral"],
    "bosons": [
        "BosonMode", "fock_ket", "apply_bosons", "to_bosons", "from_bosons",
        "spin_to_fock", "fock_to_spin", "schwinger_small_d",
    ],
    "tensors": [
        "SphericalTensor", "VectorOperator", "racah_tensor", "unit_tensor", "tensor_product",
        "scalar_product", "decompose", "recombine", "reduced_part1", "reduced_part2",
        "reduced_tensor_product", "projection_theorem", "bilinear_tensor_form",
        "spin_hamiltonian_tensor_form",
    ],
    "reduced": [
        "ReducedMatrixElement", "wigner_eckart", "reduced_from_element", "element_table",
        "convert_reduced", "selection_rules",
    ],
    "parsing": ["parse", "to_text"],
    "derivations": ["derivation"],
}

_LOCATION = {name: module for module, names in _SOURCES.items() for name in names}

# SymPy's imaginary unit, re-exported for convenience in examples
_LOCATION["I"] = None

__all__ = ["__version__", *sorted(_LOCATION)]


def __getattr__(name):
    if name == "I":
        from sympy import I

        return I
    module = _LOCATION.get(name)
    if module is None:
        raise AttributeError(f"module 'amalgebra' has no attribute {name!r}")
    value = getattr(importlib.import_module(f"amalgebra.{module}"), name)
    globals()[name] = value
    return value


def __dir__():
    return sorted(set(globals()) | set(__all__))
