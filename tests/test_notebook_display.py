"""Every result kind shows LaTeX in a Jupyter notebook without init_printing().

A small notebook is written with nbformat and executed by nbclient in a real IPython kernel
(ipykernel); each cell's last value must produce a ``text/latex`` output, checked for the notation
of amalgebra.notation.  Locally the test skips when nbclient/ipykernel are missing; under CI=true
it fails instead (amalgebra.testing.external).
"""

import importlib.util

import pytest

from amalgebra.testing.external import require_tool

SETUP = """\
import amalgebra as am
from sympy import symbols, Rational
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
from amalgebra.rotations.wigner import RotationElement
a, b, c, B = symbols("alpha beta gamma B")
J, S = am.AngularMomentum("J"), am.AngularMomentum("S")
"""

# (cell source, substrings its text/latex output must contain)
CELLS = [
    ("am.CouplingBracket(1, 0, Rational(1, 2), Rational(1, 2), Rational(3, 2), Rational(1, 2))",
     [r"\middle|"]),
    ("am.Coupling3j(1, 1, 0, 0, 0, 0)", [r"\begin{pmatrix}"]),
    ("am.Coupling6j(1, 1, 1, 1, 1, 1)", [r"\begin{Bmatrix}"]),
    ("am.Coupling9j(1, 1, 0, 1, 1, 0, 0, 0, 0)", [r"\begin{Bmatrix}"]),
    ("RotationElement(1, 1, 0, a, b, c)", [r"D^{1}_{1,0}"]),
    ("ReducedMatrixElement('T', 1, 1, 1)", [r"\|"]),
    ("am.ket(1, 0, 'S')", [r"\right\rangle"]),
    ("am.commutator(J.x, J.y)", [r"J_{z}"]),
    ("am.coupling_matrix(['1/2', '1/2'], ('A', 'B'))", [r"\begin{array}{r|cccc}", r"\hline"]),
    ("am.element_table('1/2', 1, '1/2')", [r"\begin{array}{rrr|l}", r"\langle"]),
    ("am.decompose(J.x * J.y)", [r"\begin{aligned}", r"X^{(2)}_{2}"]),
    ("am.hamiltonian_matrix(2 * S.z, {'S': '1/2'})", [r"\left[\begin{matrix}"]),
    ("am.verify_identity(J.plus * J.minus, J.squared - J.z**2 + J.z, {'J': [1]})", [r"\text{"]),
    ("am.bilinear_tensor_form(S, B, (0, 0, B))", [r"A^{(0)}"]),
    ("am.addition_theorem(1, a, b, c, B)", [" = "]),
    ("am.compose_rotations(1, (0, 1, 0), (0, 2, 0))", [r"\left[\begin{matrix}", r"\text{defect }"]),
    ("am.recoupling_matrix(am.coupling_tree('((l1 l2) L, (s1 s2) S) J', l1=1, l2=1, s1='1/2', s2='1/2'), "
     "am.coupling_tree('((l1 s1) j1, (l2 s2) j2) J', l1=1, l2=1, s1='1/2', s2='1/2'), total=1)",
     [r"\begin{array}", r"\hline"]),
    ("am.product_basis({'J': '1/2'})", [r"\begin{array}{rl}", r"\right\rangle"]),
    ("am.block_eigenvalues(am.hamiltonian_matrix(2 * S.z, {'S': '1/2'}).matrix)", [r"\times 1"]),
    ("am.tree_ket(am.coupling_tree('(a b) J', a=1, b=1, J=2), 1)", [r"\right\rangle"]),
    ("am.coupling_tree('((l s) j, I) F')", [r"l\, s"]),
    ("am.tree_operator_blocks(am.coupling_tree('(a b) J', a='1/2', b='1/2'), "
     "am.scalar_coupled(am.AngularMomentum('a'), am.AngularMomentum('b')))", [r"\left[\begin{matrix}"]),
    ("am.tabulate('sixj', 1, 'table.npz', workers=1, progress=None)", [r"\text{CouplingTable"]),
]


def _have(module):
    return importlib.util.find_spec(module) is not None


def test_every_result_kind_has_a_latex_repr_in_a_notebook(tmp_path):
    require_tool(all(_have(m) for m in ("nbclient", "nbformat", "ipykernel")),
                 "nbclient, nbformat and ipykernel (pip install -e '.[test]')")
    import nbformat
    from nbclient import NotebookClient

    nb = nbformat.v4.new_notebook()
    nb.cells = [nbformat.v4.new_code_cell(SETUP)] + [nbformat.v4.new_code_cell(src) for src, _ in CELLS]
    NotebookClient(nb, timeout=300, kernel_name="python3", allow_errors=True, resources={"metadata": {"path": str(tmp_path)}}).execute()

    assert not nb.cells[0].outputs  # the set-up cell shows nothing (no init_printing() anywhere)
    for cell, (src, needles) in zip(nb.cells[1:], CELLS):
        results = [o for o in cell.outputs if o.output_type == "execute_result"]
        assert len(results) == 1, (src, cell.outputs)
        data = results[0]["data"]
        assert "text/latex" in data, (src, sorted(data))
        tex = data["text/latex"]
        assert tex.startswith("$\\displaystyle ") and tex.endswith("$"), (src, tex)
        for needle in needles:
            assert needle in tex, (src, needle, tex)
