"""Result containers (amalgebra.results): still tuples/dicts, pickle, and LaTeX that KaTeX accepts."""

import json
import pickle
import shutil
import subprocess
from pathlib import Path

from sympy import Rational, latex, pi, sqrt, symbols

from amalgebra.algebra import AngularMomentum
from amalgebra.rotations.harmonics import addition_theorem
from amalgebra.rotations.series import compose_rotations
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement, element_table
from amalgebra.results import CouplingMatrix, Decomposition, ElementTable
from amalgebra.states.coupled import coupling_matrix
from amalgebra.tensors.irreducible import decompose
from amalgebra.testing.external import require_tool

KATEX_DIR = Path(__file__).parent / "derivations" / "katex"
J = AngularMomentum("J")


def _samples():
    t1, p1, t2, p2 = symbols("theta1 phi1 theta2 phi2", real=True)
    return [coupling_matrix(["1/2", "1/2"], ("A", "B")), element_table(1, 1, 1), decompose(J.x * J.y),
            addition_theorem(1, t1, p1, t2, p2), compose_rotations(1, (0, pi / 2, 0), (0, pi / 2, 0))]


def test_containers_keep_their_python_behaviour():
    U, unc, cpl = result = coupling_matrix([1, "1/2"], ("L", "S"))
    assert isinstance(result, CouplingMatrix) and isinstance(result, tuple)
    assert result == (U, unc, cpl) and repr(result) == repr((U, unc, cpl))
    table = element_table("1/2", 1, "1/2")
    assert isinstance(table, ElementTable) and repr(table) == repr(dict(table))
    # <1/2 1/2|T^1_0|1/2 1/2> = (-1)^0 (1/2 1 1/2; -1/2 0 1/2) <1/2||T||1/2> (Edmonds 1957 eq. 5.4.1)
    # with (j 1 j; -m 0 m) = (-1)^(j-m) m / sqrt(j(j+1)(2j+1)) = 1/sqrt(6) (Edmonds table 2, from memory)
    red = ReducedMatrixElement("T", 1, Rational(1, 2), Rational(1, 2))
    assert table[(Rational(1, 2), 0, Rational(1, 2))] == red / sqrt(6)
    parts = decompose(J.x * J.y)
    assert isinstance(parts, Decomposition) and sorted(parts) == [1, 2]  # J.x J.y has no scalar part


def test_containers_pickle_to_equal_objects_of_the_same_type():
    for obj in _samples():
        back = pickle.loads(pickle.dumps(obj))
        assert type(back) is type(obj) and back == obj


def test_latex_of_every_container_is_accepted_by_katex():
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
                 "KaTeX (npm install --prefix tests/derivations/katex)")
    sources = [latex(obj) for obj in _samples()] + [obj._repr_latex_().strip("$") for obj in _samples()]
    done = subprocess.run([node, str(KATEX_DIR / "render.js")], input=json.dumps(sources),
                          capture_output=True, text=True, timeout=120, check=True)
    results = json.loads(done.stdout)
    assert [(s, r["error"]) for s, r in zip(sources, results, strict=True) if not r["ok"]] == []
