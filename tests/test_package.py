"""Package-level contracts: the public surface, import cost, and the SymPy args invariant.

The walker below finds every ``sympy.Basic`` subclass defined in amalgebra and
fails when one has no sample instance here, so a new class cannot skip the
contract (style brief, habit 2).
"""

import importlib
import inspect
import pickle
import pkgutil
import subprocess
import sys

import pytest
from sympy import Basic, Symbol, symbols

import amalgebra

# Modules that are not library code proper: the command, the pytest plugin, test helpers.
_SKIP_MODULES = ("amalgebra.cli", "amalgebra.pytest_plugin", "amalgebra.testing",
                 # deprecated shims of moved modules (they only re-export and warn)
                 "amalgebra.rotations_series", "amalgebra.rotations_actions", "amalgebra.harmonics", "amalgebra.numeric", "amalgebra.multiplet_matrices", "amalgebra.reduced")


def _library_modules():
    for info in pkgutil.walk_packages(amalgebra.__path__, "amalgebra."):
        if not info.name.startswith(_SKIP_MODULES):
            yield importlib.import_module(info.name)


def _basic_classes():
    found = {}
    for module in _library_modules():
        for name, cls in inspect.getmembers(module, inspect.isclass):
            if issubclass(cls, Basic) and cls.__module__.startswith("amalgebra") and not name.startswith("_"):
                found[f"{cls.__module__}.{name}"] = cls
    return dict(sorted(found.items()))


def _samples():
    from amalgebra.algebra import AngularMomentum
    from amalgebra.bosons import BosonMode, fock_ket
    from amalgebra.coupling.symbols import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
    from amalgebra.coupling.trees import coupling_tree
    from amalgebra.states.tree_kets import tree_ket
    from amalgebra.tensors.tree_elements import CoupledTensorOperator
    from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
    from amalgebra.rotations.wigner import RotationElement
    from amalgebra.states import coupled_ket, ket, product_ket
    from amalgebra.tensors import SphericalTensor, VectorOperator, quadrupole_tensor

    j, m = symbols("j m")
    alpha, beta, gamma = symbols("alpha beta gamma")
    J = AngularMomentum("J")
    a = BosonMode("a")
    T = SphericalTensor("T", 2, label="J")
    V = VectorOperator("r", label="L")
    coupled = coupled_ket(1, "1/2", "3/2", "1/2", labels=("L", "S"))
    return [
        J, J.plus, a, a.create, fock_ket(2, 1), fock_ket(2, 1).adjoint(),
        ket(j, m, "J"), ket(j, m, "J").dual(), product_ket(ket(1, 0, "L"), ket("1/2", "1/2", "S")),
        product_ket(ket(1, 0, "L"), ket("1/2", "1/2", "S")).adjoint(),
        coupled, coupled.adjoint(),
        ReducedMatrixElement("T", 2, Symbol("jp"), j),
        __import__("amalgebra.racah", fromlist=["TriangleDelta"]).TriangleDelta(j, 1, Symbol("jp")),
        RotationElement(1, 1, 0, alpha, beta, gamma),
        T, T[1], quadrupole_tensor(J), V, V.z,
        CouplingBracket(j, m, 1, 0, j, m), Coupling3j(1, 1, 0, 0, 0, 0),
        Coupling6j(j, 1, j, 1, j, 1), Coupling9j(1, 1, 0, 1, 1, 0, 0, 0, 0),
        coupling_tree("((l s) j, I) F", l=2, s="1/2"),
        tree_ket(coupling_tree("(a b) J", a=1, b="1/2", J="3/2"), "1/2"),
        tree_ket(coupling_tree("(a b) J", a=1, b="1/2", J="3/2"), "1/2").dual(),
        CoupledTensorOperator(T, SphericalTensor("U", 1, label="S"), 2),
    ]


def test_every_basic_class_has_a_sample_and_keeps_the_args_invariant():
    samples = _samples()
    covered = {type(s) for s in samples}
    missing = [name for name, cls in _basic_classes().items() if cls not in covered]
    assert not missing, f"add a sample instance to tests/test_package.py for: {missing}"
    for obj in samples:
        assert all(isinstance(a, Basic) for a in obj.args), obj
        assert obj.func(*obj.args) == obj, obj
        assert pickle.loads(pickle.dumps(obj)) == obj, obj
        assert not hasattr(obj, "__dict__"), f"{type(obj).__name__} has a __dict__ (missing __slots__ = ())"


def test_all_lists_exactly_the_names_that_resolve():
    for name in amalgebra.__all__:
        assert getattr(amalgebra, name) is not None, name
    with pytest.raises(AttributeError):
        amalgebra.no_such_name  # noqa: B018


@pytest.mark.parametrize("module", sorted(m.__name__ for m in _library_modules()))
def test_every_module_declares_all_and_its_names_exist(module):
    mod = importlib.import_module(module)
    assert hasattr(mod, "__all__"), f"{module} has no __all__"
    for name in mod.__all__:
        assert hasattr(mod, name), f"{module}.__all__ names {name!r}, which is not defined"


def test_import_is_light():
    # The pytest plugin is imported in every pytest session of an environment, so
    # importing the package must not pull in SymPy.
    code = "import sys, amalgebra, amalgebra.pytest_plugin; print('sympy' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


def test_readme_examples_run():
    # The README's examples are doctests; a stale example fails here.
    import doctest
    from pathlib import Path

    readme = Path(__file__).resolve().parents[1] / "README.md"
    result = doctest.testfile(str(readme), module_relative=False, optionflags=doctest.ELLIPSIS)
    assert result.attempted >= 5 and result.failed == 0
