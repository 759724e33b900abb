"""Static view of the public API of :mod:`amalgebra` (names are loaded lazily at run time).

``amalgebra/__init__.py`` resolves its public names on first use (``__getattr__``), which
type checkers and editors cannot follow; this stub lists every name of ``amalgebra.__all__``.
Classes are re-exported from their defining modules (so ``amalgebra.Ket is
amalgebra.states.kets.Ket`` for the type checker too); functions carry their annotations here.
``tests/test_typing.py`` checks that every name of ``__all__`` is here with the runtime
signature (parameter names, kinds and defaults) and runs mypy on this file.

SymPy ships no ``py.typed`` (1.14), so SymPy types are ``Any`` to a type checker for now.
"""

from collections.abc import Mapping, Sequence
from contextlib import AbstractContextManager
from fractions import Fraction
from typing import Any, TypeAlias

from sympy import Expr as _SymPyExpr
from sympy import I as I
from sympy import MatrixBase as _MatrixBase

from .algebra.operators import AngularMomentum as AngularMomentum
from .bosons.operators import BosonMode as BosonMode
from .coupling.kernels import KernelFallbackWarning as KernelFallbackWarning
from .coupling.symbols import (
    CouplingBracket as CouplingBracket,
    Coupling9j as Coupling9j,
    Coupling6j as Coupling6j,
    Coupling3j as Coupling3j,
)
from .errors import (
    AmalgebraError as AmalgebraError,
    AngleError as AngleError,
    ConventionError as ConventionError,
    DerivationStepError as DerivationStepError,
    LimitError as LimitError,
    NotInImageError as NotInImageError,
    NotNumericError as NotNumericError,
    OperatorError as OperatorError,
    ParseError as ParseError,
    ProjectionError as ProjectionError,
    QuantumNumberError as QuantumNumberError,
    StateError as StateError,
    StoredResultError as StoredResultError,
    TensorOperatorError as TensorOperatorError,
)
from .limits import Limits as Limits
from .tensors.wigner_eckart import ReducedMatrixElement as ReducedMatrixElement
from .rotations import RotationElement as RotationElement
from .states.coupled import CoupledKet as CoupledKet
from .states.kets import Bra as Bra, Ket as Ket, ProductKet as ProductKet
from .tensors.spherical import SphericalTensor as SphericalTensor
from .tensors.vectors import VectorOperator as VectorOperator

from .tensors.tree_elements import CoupledTensorOperator as CoupledTensorOperator
from .coupling.trees import CouplingTree as CouplingTree
from .coupling.recoupling import RecouplingMatrix as RecouplingMatrix

from .errors import RacahSumError as RacahSumError
from .racah.reduce import Reduction as Reduction
from .racah.check import ReductionCheck as ReductionCheck
from .racah.reduce import ReductionStep as ReductionStep
from .states.tree_kets import TreeBra as TreeBra
from .states.tree_kets import TreeKet as TreeKet
from .racah.triangle import TriangleDelta as TriangleDelta

from .states.basis import Basis as Basis
from .tables.storage import CouplingTable as CouplingTable
from .states.eigen import Eigenvalues as Eigenvalues
from .states.hamiltonian import HamiltonianMatrix as HamiltonianMatrix
from .states.hamiltonian import OperatorMatrix as OperatorMatrix

from .rotations.harmonics import AdditionTheorem
from .matrices.explicit import IdentityCheck
from .results import CouplingMatrix, Decomposition, ElementTable
from .rotations.series import RotationComposition
from .tensors.irreducible import TensorForm

__version__: str
__all__ = [
    "__version__", "AmalgebraError", "AngleError", "AngularMomentum", "Basis", "BosonMode", "Bra",
    "CouplingBracket", "ConventionError", "CoupledKet", "CoupledTensorOperator",
    "CouplingTable", "CouplingTree", "DerivationStepError", "Eigenvalues", "HamiltonianMatrix", "I",
    "KernelFallbackWarning", "Ket", "LimitError", "Limits", "Coupling9j", "NotInImageError",
    "NotNumericError", "OperatorError", "OperatorMatrix", "ParseError", "ProductKet",
    "ProjectionError", "QuantumNumberError", "RacahSumError", "RecouplingMatrix",
    "ReducedMatrixElement", "Reduction", "ReductionCheck", "ReductionStep", "RotationElement",
    "Coupling6j", "SphericalTensor", "StateError", "StoredResultError", "TensorOperatorError",
    "Coupling3j", "TreeBra", "TreeKet", "TriangleDelta", "VectorOperator", "addition_theorem",
    "adjoint_action", "apply", "apply_bosons", "assert_identity", "bilinear_tensor_form",
    "block_eigenvalues", "bra", "canonical", "cg", "cg_float", "chain_tree", "check_reduction",
    "chsh", "clear_coupling_caches", "clebsch_gordan_series", "closed_form_conditions",
    "collect_casimir", "commutator", "compose_rotations", "convert_reduced", "correlation",
    "coupled_chain", "coupled_ket", "coupling_cache_info", "coupling_matrix", "coupling_tree",
    "current_limits", "decompose", "derivation", "direct_value", "dot", "element_table",
    "energy_levels", "expectation", "fock_ket", "fock_to_spin", "from_bosons", "half_integer",
    "hamiltonian_matrix", "harmonic_triple_integral", "inner", "input_limits", "kernel_backend",
    "ket", "ladder_terms", "level_diagram", "load_table", "matrix_element", "momentum_sum",
    "multiplet_count", "nested_commutator", "ninej", "ninej_float", "norm", "normal_scalar",
    "normalize", "operator_coefficients", "parse", "plot_levels", "product_basis", "product_ket",
    "projection_sum", "projection_theorem", "racah_harmonic", "racah_tensor", "racah_w",
    "recombine", "recouple", "recoupling_coefficient", "recoupling_matrix", "recoupling_path",
    "reduce_racah_sum", "reduced_from_element", "reduced_part1", "reduced_part2",
    "reduced_tensor_product", "reduction_steps", "rotate_ket", "rotate_operator", "scalar_coupled",
    "scalar_is_zero", "scalar_product", "schwinger_small_d", "selection_rules", "singlet", "sixj",
    "sixj_float", "small_d", "small_d_matrix", "spherical_harmonic", "spin_hamiltonian_tensor_form",
    "spin_to_fock", "tabulate", "tensor_product", "threej", "threej_float", "to_bosons",
    "to_cartesian", "to_ladder", "to_matrix", "to_text", "to_uncoupled", "total_spin_states",
    "tree_assignments", "tree_basis", "tree_ket", "tree_matrix_element", "tree_operator_blocks",
    "tree_reduced_element", "triangle", "uncoupled_to_coupled", "unit_tensor", "verify_identity",
    "wigner_D", "wigner_D_matrix", "wigner_eckart",
]

#: a quantum number: an int, a Fraction, a string such as "3/2", or a SymPy number or symbol
_QuantumNumber: TypeAlias = int | Fraction | str | _SymPyExpr
#: an angle: a float or a SymPy expression
_Angle: TypeAlias = float | _SymPyExpr
_Expr: TypeAlias = _SymPyExpr
_Matrix: TypeAlias = _MatrixBase

def addition_theorem(
    l: _QuantumNumber,
    theta1: _Angle,
    phi1: _Angle,
    theta2: _Angle,
    phi2: _Angle,
) -> AdditionTheorem: ...
def adjoint_action(x: _Expr, y: _Expr, order: int) -> _Expr: ...
def apply(
    op: _Expr,
    state: _Expr,
    *,
    reduced: Any = None,
    convention: str = "edmonds",
) -> _Expr: ...
def apply_bosons(op: _Expr, state: _Expr) -> _Expr: ...
def assert_identity(
    lhs: _Expr,
    rhs: _Expr,
    j_values: Any,
    subs: Any = None,
    reduced: Any = None,
) -> None: ...
def bilinear_tensor_form(U: Any, M: Any, V: Any) -> TensorForm: ...
def bra(j: _QuantumNumber, m: _QuantumNumber, label: str = "J") -> Bra: ...
def canonical(expr: _Expr, components: str = "ladder") -> _Expr: ...
def cg(
    j1: _QuantumNumber,
    m1: _QuantumNumber,
    j2: _QuantumNumber,
    m2: _QuantumNumber,
    J: _QuantumNumber,
    M: _QuantumNumber,
) -> _Expr: ...
def cg_float(
    j1: _QuantumNumber,
    m1: _QuantumNumber,
    j2: _QuantumNumber,
    m2: _QuantumNumber,
    J: _QuantumNumber,
    M: _QuantumNumber,
) -> float: ...
def chsh(
    state: _Expr,
    a: _Angle,
    a2: _Angle,
    b: _Angle,
    b2: _Angle,
    labels: Sequence[str] = ("A", "B"),
) -> _Expr: ...
def clear_coupling_caches() -> None: ...
def clebsch_gordan_series(
    j1: _QuantumNumber,
    m1p: _QuantumNumber,
    m1: _QuantumNumber,
    j2: _QuantumNumber,
    m2p: _QuantumNumber,
    m2: _QuantumNumber,
    alpha: _Angle,
    beta: _Angle,
    gamma: _Angle,
    *,
    evaluate: bool = False,
) -> _Expr: ...
def closed_form_conditions(kind: str, *args: Any) -> _Expr: ...
def collect_casimir(expr: _Expr, label: str) -> dict[Any, _Expr]: ...
def commutator(a: _Expr, b: _Expr) -> _Expr: ...
def compose_rotations(
    j: _QuantumNumber,
    first: tuple[_Angle, _Angle, _Angle],
    second: tuple[_Angle, _Angle, _Angle],
) -> RotationComposition: ...
def convert_reduced(
    value: _Expr,
    jp: _QuantumNumber,
    j: _QuantumNumber,
    from_convention: str,
    to_convention: str,
) -> _Expr: ...
def correlation(state: _Expr, axis_a: Any, axis_b: Any) -> _Expr: ...
def coupled_chain(
    js: Any,
    intermediates: Any,
    J: _QuantumNumber,
    M: _QuantumNumber,
    labels: Sequence[str],
) -> CoupledKet: ...
def coupled_ket(
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    J: _QuantumNumber,
    M: _QuantumNumber,
    labels: Sequence[str] = ("J", "S"),
) -> CoupledKet: ...
def coupling_cache_info() -> dict[str, Any]: ...
def coupling_matrix(js: Any, labels: Sequence[str]) -> CouplingMatrix: ...
def decompose(
    expr: _Expr,
    labels: Sequence[str] | str | None = None,
    vectors: Any = (),
    *,
    canonicalize: bool = True,
) -> Decomposition: ...
def derivation(
    func: Any = None,
    *,
    name: str | None = None,
    title: Any = None,
    tolerance: float = 1e-12,
    points: int = 6,
) -> Any: ...
def dot(first: Any, second: Any) -> _Expr: ...
def element_table(
    jp: _QuantumNumber,
    k: _QuantumNumber,
    j: _QuantumNumber,
    reduced: Any = None,
    *,
    name: str = "T",
    convention: str = "edmonds",
) -> ElementTable: ...
def expectation(
    op: _Expr,
    state: _Expr,
    *,
    reduced: Any = None,
    convention: str = "edmonds",
) -> _Expr: ...
def fock_ket(*occupations: Any, modes: Sequence[str] = ("a", "b")) -> _Expr: ...
def fock_to_spin(state: _Expr, label: str = "J", modes: Sequence[str] = ("a", "b")) -> _Expr: ...
def from_bosons(
    expr: _Expr,
    label: str = "J",
    modes: Sequence[str] = ("a", "b"),
    j: _QuantumNumber | None = None,
) -> _Expr: ...
def current_limits() -> Limits: ...
def input_limits(**changes: int | None) -> AbstractContextManager[Limits]: ...
def half_integer(value: _Expr, name: str = "j", *, nonnegative: bool = False) -> _Expr: ...
def hamiltonian_matrix(
    op: _Expr,
    js: Mapping[str, Any],
    basis: str = "uncoupled",
    *,
    reduced: Any = None,
    convention: str = "edmonds",
) -> Any: ...
def harmonic_triple_integral(
    l1: _QuantumNumber,
    m1: _QuantumNumber,
    l2: _QuantumNumber,
    m2: _QuantumNumber,
    l3: _QuantumNumber,
    m3: _QuantumNumber,
    *,
    conjugate_first: bool = False,
) -> _Expr: ...
def inner(bra_state: _Expr, ket_state: _Expr) -> _Expr: ...
def kernel_backend() -> str: ...
def ket(j: _QuantumNumber, m: _QuantumNumber, label: str = "J") -> Ket: ...
def ladder_terms(expr: _Expr, jsq: _Expr, mz: _Expr) -> dict[Any, _Expr]: ...
def matrix_element(
    bra_state: _Expr,
    op: _Expr,
    ket_state: _Expr,
    *,
    conditions: bool = True,
    reduced: Any = None,
    convention: str = "edmonds",
) -> _Expr: ...
def multiplet_count(n: int, S: _QuantumNumber) -> int: ...
def nested_commutator(x: _Expr, y: _Expr, n: int) -> _Expr: ...
def ninej(
    j11: _QuantumNumber,
    j12: _QuantumNumber,
    j13: _QuantumNumber,
    j21: _QuantumNumber,
    j22: _QuantumNumber,
    j23: _QuantumNumber,
    j31: _QuantumNumber,
    j32: _QuantumNumber,
    j33: _QuantumNumber,
) -> _Expr: ...
def ninej_float(
    j11: _QuantumNumber,
    j12: _QuantumNumber,
    j13: _QuantumNumber,
    j21: _QuantumNumber,
    j22: _QuantumNumber,
    j23: _QuantumNumber,
    j31: _QuantumNumber,
    j32: _QuantumNumber,
    j33: _QuantumNumber,
) -> float: ...
def norm(state: _Expr) -> _Expr: ...
def normalize(state: _Expr) -> _Expr: ...
def parse(text: str, *, names: Sequence[str] | None = None, limits: Any = None) -> _Expr: ...
def product_ket(*kets: Any) -> ProductKet: ...
def projection_theorem(
    j: _QuantumNumber,
    mp: _QuantumNumber,
    q: _QuantumNumber,
    m: _QuantumNumber,
    jdotv: _Expr,
) -> _Expr: ...
def racah_harmonic(k: _QuantumNumber, q: _QuantumNumber, theta: _Angle, phi: _Angle) -> _Expr: ...
def racah_tensor(k: _QuantumNumber, label: str = "L", name: str = "C") -> SphericalTensor: ...
def racah_w(
    a: _QuantumNumber,
    b: _QuantumNumber,
    c: _QuantumNumber,
    d: _QuantumNumber,
    e: _QuantumNumber,
    f: _QuantumNumber,
) -> _Expr: ...
def recombine(parts: Any) -> _Expr: ...
def reduced_from_element(
    element: _Expr,
    jp: _QuantumNumber,
    mp: _QuantumNumber,
    k: _QuantumNumber,
    q: _QuantumNumber,
    j: _QuantumNumber,
    m: _QuantumNumber,
    convention: str = "edmonds",
) -> _Expr: ...
def reduced_part1(
    j1p: _QuantumNumber,
    j2p: _QuantumNumber,
    Jp: _QuantumNumber,
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    J: _QuantumNumber,
    k: _QuantumNumber,
    reduced: Any = None,
    *,
    name: str = "T",
    convention: str = "edmonds",
) -> _Expr: ...
def reduced_part2(
    j1p: _QuantumNumber,
    j2p: _QuantumNumber,
    Jp: _QuantumNumber,
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    J: _QuantumNumber,
    k: _QuantumNumber,
    reduced: Any = None,
    *,
    name: str = "U",
    convention: str = "edmonds",
) -> _Expr: ...
def reduced_tensor_product(
    j1p: _QuantumNumber,
    j2p: _QuantumNumber,
    Jp: _QuantumNumber,
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    J: _QuantumNumber,
    k1: _QuantumNumber,
    k2: _QuantumNumber,
    k: _QuantumNumber,
    reduced1: Any = None,
    reduced2: Any = None,
    *,
    names: Sequence[str] = ("T", "U"),
    convention: str = "edmonds",
) -> _Expr: ...
def rotate_ket(
    state: _Expr,
    alpha: _Angle,
    beta: _Angle,
    gamma: _Angle,
    *,
    labels: Sequence[str] | str | None = None,
    evaluate: bool = True,
) -> _Expr: ...
def rotate_operator(
    expr: _Expr,
    alpha: _Angle,
    beta: _Angle,
    gamma: _Angle,
    *,
    labels: Sequence[str] | str | None = None,
    evaluate: bool = True,
    normal_order: bool = False,
) -> _Expr: ...
def scalar_product(a: Any, b: Any) -> _Expr: ...
def schwinger_small_d(
    j: _QuantumNumber,
    mp: _QuantumNumber,
    m: _QuantumNumber,
    beta: _Angle,
) -> _Expr: ...
def selection_rules(
    jp: _QuantumNumber,
    mp: _QuantumNumber,
    k: _QuantumNumber,
    q: _QuantumNumber,
    j: _QuantumNumber,
    m: _QuantumNumber,
    parity: Any = None,
) -> _Expr: ...
def singlet(labels: Sequence[str] = ("A", "B")) -> _Expr: ...
def sixj(
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    j3: _QuantumNumber,
    j4: _QuantumNumber,
    j5: _QuantumNumber,
    j6: _QuantumNumber,
) -> _Expr: ...
def sixj_float(
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    j3: _QuantumNumber,
    j4: _QuantumNumber,
    j5: _QuantumNumber,
    j6: _QuantumNumber,
) -> float: ...
def small_d(
    j: _QuantumNumber, mp: _QuantumNumber, m: _QuantumNumber, beta: _Angle, form: str = "half_angle"
) -> _Expr: ...
def small_d_matrix(j: _QuantumNumber, beta: _Angle) -> _Matrix: ...
def spherical_harmonic(
    l: _QuantumNumber,
    m: _QuantumNumber,
    theta: _Angle,
    phi: _Angle,
) -> _Expr: ...
def spin_hamiltonian_tensor_form(forms: Any) -> TensorForm: ...
def spin_to_fock(state: _Expr, label: str = "J", modes: Sequence[str] = ("a", "b")) -> _Expr: ...
def tensor_product(a: Any, b: Any, k: _QuantumNumber) -> Any: ...
def threej(
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    j3: _QuantumNumber,
    m1: _QuantumNumber,
    m2: _QuantumNumber,
    m3: _QuantumNumber,
) -> _Expr: ...
def threej_float(
    j1: _QuantumNumber,
    j2: _QuantumNumber,
    j3: _QuantumNumber,
    m1: _QuantumNumber,
    m2: _QuantumNumber,
    m3: _QuantumNumber,
) -> float: ...
def to_bosons(expr: _Expr, label: str = "J", modes: Sequence[str] = ("a", "b")) -> _Expr: ...
def to_cartesian(expr: _Expr, casimir: bool = False) -> _Expr: ...
def to_ladder(expr: _Expr) -> _Expr: ...
def to_matrix(
    expr: _Expr,
    j: Mapping[str, Any],
    kind: str = "exact",
    subs: Any = None,
    reduced: Any = None,
    convention: str = "edmonds",
    with_basis: bool = False,
) -> Any: ...
def to_text(expr: _Expr, *, decimals: bool = False) -> str: ...
def to_uncoupled(state: _Expr) -> _Expr: ...
def total_spin_states(
    n: int,
    S: _QuantumNumber | None = None,
    M: _QuantumNumber | None = None,
    labels: Sequence[str] | str | None = None,
) -> list[Any]: ...
def triangle(a: _Angle, b: _Angle, c: Any) -> bool: ...
def uncoupled_to_coupled(state: _Expr, labels: Sequence[str] | str | None = None) -> _Expr: ...
def unit_tensor(k: _QuantumNumber, label: str = "J", name: str = "u") -> SphericalTensor: ...
def verify_identity(
    lhs: _Expr,
    rhs: _Expr,
    j_values: Any,
    subs: Any = None,
    reduced: Any = None,
) -> IdentityCheck: ...
def wigner_D(
    j: _QuantumNumber,
    mp: _QuantumNumber,
    m: _QuantumNumber,
    alpha: _Angle,
    beta: _Angle,
    gamma: _Angle,
) -> _Expr: ...
def wigner_D_matrix(j: _QuantumNumber, alpha: _Angle, beta: _Angle, gamma: _Angle) -> _Matrix: ...
def wigner_eckart(
    jp: _QuantumNumber,
    mp: _QuantumNumber,
    k: _QuantumNumber,
    q: _QuantumNumber,
    j: _QuantumNumber,
    m: _QuantumNumber,
    reduced: Any = None,
    *,
    name: str = "T",
    convention: str = "edmonds",
) -> _Expr: ...

# names added while the stub was written: annotations to tighten with their owners
def chain_tree(
    labels: Sequence[str],
    intermediates: Any = None,
    total: str = "J",
    values: Any = None,
    **more: Any,
) -> Any: ...
def coupling_tree(spec: Any, values: Any = None, **more: Any) -> Any: ...
def recoupling_coefficient(first: _Expr, second: _Expr, *, nine_j: bool = True) -> Any: ...
def recoupling_matrix(
    first: _Expr,
    second: _Expr,
    total: Any = None,
    *,
    nine_j: bool = True,
) -> Any: ...
def recoupling_path(first: _Expr, second: _Expr, *, nine_j: bool = True) -> Any: ...
def scalar_coupled(first: _Expr, second: _Expr) -> Any: ...
def tree_assignments(tree: Any, total: Any = None) -> Any: ...
def tree_matrix_element(
    bra: Any,
    mp: _QuantumNumber,
    operator: Any,
    q: _QuantumNumber,
    ket: Any,
    m: _QuantumNumber,
) -> Any: ...
def tree_operator_blocks(tree: Any, operator: Any) -> Any: ...
def tree_reduced_element(bra: Any, operator: Any, ket: Any) -> Any: ...

# names added after the stub was written: annotations to tighten with their owners
def check_reduction(
    expr: _Expr,
    result: Any,
    *,
    points: int = 4,
    seed: int = 0,
    jmax: Any = ...,
    attempts: Any = None,
) -> Any: ...
def direct_value(expr: _Expr, values: Any) -> Any: ...
def energy_levels(
    hamiltonian: Any,
    field: Any,
    fields: Any,
    *,
    parameters: Any = None,
    label_at: Any = None,
    basis_numbers: Any = None,
) -> Any: ...
def level_diagram(
    hamiltonian: Any,
    field: Any,
    fields: Any,
    *,
    parameters: Any = None,
    label_at: Any = None,
    basis_numbers: Any = None,
    ax: Any = None,
    **style: Any,
) -> Any: ...
def momentum_sum(term: Any, *xs: Any) -> Any: ...
def normal_scalar(value: _Expr) -> Any: ...
def operator_coefficients(expr: _Expr) -> Any: ...
def plot_levels(
    curves: Any,
    ax: Any = None,
    *,
    color_by: str = "F",
    annotate: Any = ("M",),
    energy_unit: str = "GHz",
    field_label: Any = None,
    field_unit: Any = None,
    title: Any = None,
    legend: bool = True,
) -> Any: ...
def projection_sum(term: Any, *ms: Any) -> Any: ...
def recouple(state: _Expr, tree: Any) -> Any: ...
def reduce_racah_sum(expr: _Expr, *, summed_m: Any = (), summed_j: Any = ()) -> Any: ...
def reduction_steps(d: Any, reduction: Any, prefix: str = "reduce") -> Any: ...
def scalar_is_zero(value: _Expr) -> Any: ...
def tree_basis(tree: Any) -> Any: ...
def tree_ket(tree: Any, M: _QuantumNumber) -> Any: ...
def block_eigenvalues(matrix: Any, time_budget: float = 10.0) -> Any: ...
def load_table(path: Any) -> Any: ...
def product_basis(j: Any, modes: Any = ()) -> Any: ...
def tabulate(
    kind: str,
    jmax: Any,
    path: Any,
    *,
    floats: bool = True,
    workers: Any = None,
    scheduler: Any = None,
    chunk_size: int = 20000,
    resume: bool = True,
    progress: str = "stderr",
) -> Any: ...
