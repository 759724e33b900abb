"""Static typing: py.typed, the stub amalgebra/__init__.pyi against the runtime API, mypy clean.

The stub must list every name of ``amalgebra.__all__``; each function there must have the
runtime signature (parameter names, kinds, and the defaults it writes out); each class must be
re-exported from the module that defines it.  mypy (config in pyproject.toml) must pass on the
stub and on the typed usage sample tests/typing_check/usage.py, and must reject misuse (so the check
can fail).  Locally the mypy tests skip when mypy is missing; under CI=true they fail.
"""

import ast
import importlib.util
import inspect
import subprocess
import sys
from pathlib import Path

import pytest

import amalgebra
from amalgebra.testing.external import require_tool

ROOT = Path(__file__).resolve().parents[1]           # the checkout or the unpacked sdist
PACKAGE = Path(amalgebra.__file__).resolve().parent  # the package as imported (installed or not)
STUB = PACKAGE / "__init__.pyi"
USAGE = ROOT / "tests" / "typing_check" / "usage.py"


def _stub_tree():
    return ast.parse(STUB.read_text(encoding="utf-8"))


def _stub_functions():
    return {node.name: node for node in _stub_tree().body if isinstance(node, ast.FunctionDef)}


def _stub_reexports():
    """``{public name: module}`` for ``from .mod import X as X`` (the re-export form)."""
    found = {}
    for node in _stub_tree().body:
        if isinstance(node, ast.ImportFrom):
            module = ("amalgebra." + node.module) if node.level == 1 else node.module
            for alias in node.names:
                if alias.asname == alias.name:
                    found[alias.name] = module
    return found


def _stub_values():
    return {node.target.id for node in _stub_tree().body
            if isinstance(node, ast.AnnAssign) and isinstance(node.target, ast.Name)}


def test_py_typed_marker_ships_with_the_package():
    assert (PACKAGE / "py.typed").is_file() and STUB.is_file()


def test_every_public_name_is_in_the_stub():
    declared = set(_stub_functions()) | set(_stub_reexports()) | _stub_values()
    assert sorted(set(amalgebra.__all__) - declared) == []
    assert sorted(name for name in declared - set(amalgebra.__all__) if not name.startswith("_")) == []


def test_reexported_classes_are_the_runtime_objects():
    for name, module in _stub_reexports().items():
        if module == "sympy":
            continue
        assert getattr(amalgebra, name) is getattr(importlib.import_module(module), name), name


def _stub_parameters(node):
    args = node.args
    positional = args.posonlyargs + args.args
    defaults = [None] * (len(positional) - len(args.defaults)) + list(args.defaults)
    rows = [(a.arg, inspect.Parameter.POSITIONAL_OR_KEYWORD, d) for a, d in zip(positional, defaults)]
    if args.vararg:
        rows.append((args.vararg.arg, inspect.Parameter.VAR_POSITIONAL, None))
    rows += [(a.arg, inspect.Parameter.KEYWORD_ONLY, d) for a, d in zip(args.kwonlyargs, args.kw_defaults)]
    if args.kwarg:
        rows.append((args.kwarg.arg, inspect.Parameter.VAR_KEYWORD, None))
    return rows


@pytest.mark.parametrize("name", sorted(_stub_functions()))
def test_stub_signature_matches_runtime(name):
    node = _stub_functions()[name]
    runtime = inspect.signature(getattr(amalgebra, name))
    stub = _stub_parameters(node)
    assert [(n, k) for n, k, _ in stub] == [(p.name, p.kind) for p in runtime.parameters.values()]
    for (pname, _, default), param in zip(stub, runtime.parameters.values()):
        assert (default is None) == (param.default is inspect.Parameter.empty), (name, pname)
        if default is not None and not (isinstance(default, ast.Constant) and default.value is Ellipsis):
            assert ast.literal_eval(default) == param.default, (name, pname)
    assert node.returns is not None, f"{name} has no return annotation"
    assert all(a.annotation is not None for a in node.args.args + node.args.kwonlyargs), name


def test_typed_usage_sample_runs():
    spec = importlib.util.spec_from_file_location("amalgebra_typing_usage", USAGE)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    assert module.check_all() is True


def _mypy(*args):
    require_tool(importlib.util.find_spec("mypy") is not None, "mypy (pip install -e '.[test]')")
    return subprocess.run([sys.executable, "-m", "mypy", "--config-file", str(ROOT / "pyproject.toml"),
                           "--cache-dir", str(ROOT / ".mypy_cache"), *args],
                          cwd=ROOT, capture_output=True, text=True, timeout=600, check=False)


def test_mypy_is_clean_on_the_public_api():
    done = _mypy()  # files from [tool.mypy]: the stub and the usage sample, under strict
    assert done.returncode == 0, done.stdout + done.stderr
    assert "Success: no issues found in 2 source files" in done.stdout


def test_mypy_sees_the_lazily_loaded_names(tmp_path):
    bad = tmp_path / "misuse.py"
    bad.write_text(
        "import amalgebra as am\n"
        "x: str = am.cg_float(1, 0, 1, 0, 1, 0)\n"   # float is not str
        "am.sixj_float(1, 1)\n"                      # too few arguments
        "am.no_such_name\n"                          # not public
        "reveal_type(am.ket)\n",
        encoding="utf-8")
    done = _mypy(str(bad))
    out = done.stdout
    assert done.returncode == 1, out
    assert 'Incompatible types in assignment (expression has type "float", variable has type "str")' in out
    assert 'Missing positional arguments "j3", "j4", "j5", "j6" in call to "sixj_float"' in out
    assert 'Module has no attribute "no_such_name"' in out
    assert ('def (j: int | fractions.Fraction | str | Any, m: int | fractions.Fraction | str | Any, '
            'label: str =) -> amalgebra.states.kets.Ket' in out)


def test_stubtest_agrees_with_the_runtime():
    # mypy's own stub checker, on the top-level stub (tests/typing_check/stubtest_allowlist.txt leaves the
    # implementation modules, which are their own stubs, to mypy)
    require_tool(importlib.util.find_spec("mypy") is not None, "mypy (pip install -e '.[test]')")
    done = subprocess.run([sys.executable, "-m", "mypy.stubtest", "amalgebra",
                           "--mypy-config-file", str(ROOT / "pyproject.toml"),
                           "--allowlist", str(ROOT / "tests" / "typing_check" / "stubtest_allowlist.txt")],
                          cwd=ROOT, capture_output=True, text=True, timeout=600, check=False)
    assert done.returncode == 0, done.stdout[-4000:] + done.stderr[-2000:]
    assert "Success: no issues found" in done.stdout
