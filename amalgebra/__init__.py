"""amalgebra: exact angular-momentum algebra on top of SymPy.

Every result is an ordinary SymPy object (it prints, substitutes, simplifies,
lambdifies and pickles).  Conventions (Condon-Shortley phases, Edmonds
normalisation of reduced matrix elements, active z-y-z rotations) are listed
in the README and stated in each docstring.

Public map
==========

Quantum numbers and errors
    :mod:`amalgebra.qnumbers` (reading and validating j and m),
    :mod:`amalgebra.errors` (the typed exception hierarchy),
    :mod:`amalgebra.limits` (the largest j, powers and sizes accepted, and how to raise them).
Coupling coefficients
    :mod:`amalgebra.coupling`: ``cg``, ``threej``, ``sixj``, ``ninej``, ``racah_w``
    exact for numeric j, closed forms for symbolic j, correctly rounded floats;
    ``CouplingBracket``, ``Coupling3j``, ``Coupling6j``, ``Coupling9j`` as
    unevaluated symbols that print as the standard arrays (``.doit()`` evaluates).
Operators
    :mod:`amalgebra.algebra`: ``AngularMomentum``, ``canonical``, ``commutator``, ...;
    :mod:`amalgebra.matrices.explicit`: explicit matrices and identity checks.
States
    :mod:`amalgebra.states`: kets, operator action, matrix elements, coupled bases,
    Hamiltonian matrices, many spins.
Tensor operators
    :mod:`amalgebra.tensors` and :mod:`amalgebra.tensors.wigner_eckart` (Wigner-Eckart engine).
Rotations
    :mod:`amalgebra.rotations.wigner`, :mod:`amalgebra.rotations.series`,
    :mod:`amalgebra.rotations.actions`, :mod:`amalgebra.rotations.harmonics`.
Bosons
    :mod:`amalgebra.bosons`: boson modes, Fock kets, the Schwinger map.
Notation
    :mod:`amalgebra.notation`: the one module deciding how every object prints
    (str, Unicode pretty, LaTeX).
Racah sums
    :mod:`amalgebra.racah`: ``reduce_racah_sum`` (sums over projections of coupling
    coefficients to 6j/9j closed forms by the graphical method), ``check_reduction``.
Derivations
    :mod:`amalgebra.derivations`, :mod:`amalgebra.parsing`, the ``amalgebra`` command.
Plots
    :mod:`amalgebra.plotting`: energy-level diagrams against a field from an exact
    Hamiltonian matrix (matplotlib, the ``plot`` extra).

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
        "LimitError", "AngleError", "RacahSumError",
    ],
    "limits": ["Limits", "input_limits", "current_limits"],
    "qnumbers": ["half_integer", "triangle"],
    "coupling": [
        "cg", "threej", "sixj", "ninej", "racah_w", "cg_float", "threej_float",
        "sixj_float", "ninej_float", "clear_coupling_caches", "coupling_cache_info", "kernel_backend",
        "KernelFallbackWarning", "CouplingBracket", "Coupling3j", "Coupling6j", "Coupling9j",
    ],
    "coupling.closed_forms": ["closed_form_conditions"],
    "coupling.trees": ["CouplingTree", "coupling_tree", "chain_tree"],
    "coupling.recoupling": ["recoupling_coefficient", "recoupling_path", "recoupling_matrix",
                            "RecouplingMatrix", "tree_assignments"],
    "tables": ["tabulate", "load_table", "CouplingTable"],
    "states.tree_kets": ["TreeKet", "TreeBra", "tree_ket", "recouple", "tree_basis"],
    "tensors.tree_elements": ["CoupledTensorOperator", "scalar_coupled", "tree_reduced_element",
                              "tree_matrix_element", "tree_operator_blocks"],
    "algebra": [
        "AngularMomentum", "dot", "canonical", "ladder_terms", "collect_casimir",
        "commutator", "nested_commutator", "adjoint_action", "to_cartesian", "to_ladder",
        "operator_coefficients",
    ],
    "algebra.coefficients": ["normal_scalar", "scalar_is_zero"],
    "matrices.explicit": ["to_matrix", "verify_identity", "assert_identity"],
    "states": [
        "Ket", "Bra", "ProductKet", "ket", "bra", "product_ket", "inner", "norm", "normalize",
        "apply", "matrix_element", "expectation", "CoupledKet", "coupled_ket", "coupled_chain",
        "to_uncoupled", "uncoupled_to_coupled", "coupling_matrix", "hamiltonian_matrix",
        "multiplet_count", "total_spin_states", "singlet", "correlation", "chsh",
        "Basis", "product_basis", "OperatorMatrix", "HamiltonianMatrix", "Eigenvalues", "block_eigenvalues",
    ],
    "rotations.wigner": ["small_d", "wigner_D", "small_d_matrix", "wigner_D_matrix", "RotationElement"],
    "rotations.series": ["compose_rotations", "clebsch_gordan_series"],
    "rotations.actions": ["rotate_ket", "rotate_operator"],
    "rotations.harmonics": ["spherical_harmonic", "racah_harmonic", "addition_theorem", "harmonic_triple_integral"],
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
    "tensors.wigner_eckart": [
        "ReducedMatrixElement", "wigner_eckart", "reduced_from_element", "element_table",
        "convert_reduced", "selection_rules",
    ],
    "racah": [
        "projection_sum", "momentum_sum", "reduce_racah_sum", "Reduction", "ReductionStep",
        "check_reduction", "ReductionCheck", "direct_value", "reduction_steps", "TriangleDelta",
    ],
    "parsing": ["parse", "to_text"],
    "plotting": ["energy_levels", "plot_levels", "level_diagram"],
    "derivations": ["derivation"],
}

_LOCATION = {name: module for module, names in _SOURCES.items() for name in names}

# SymPy's imaginary unit, re-exported for convenience in examples
_LOCATION["I"] = None

__all__ = ["__version__", *sorted(_LOCATION)]


# former names of the coupling-symbol classes (deprecated in 0.2.0), resolved with a warning
_RENAMED = ("ClebschGordanSymbol", "ThreeJSymbol", "SixJSymbol", "NineJSymbol")


def __getattr__(name):
    if name in _RENAMED:
        from .coupling import symbols

        return symbols._renamed_class(name)
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
