"""KaTeX renders every LaTeX form the library prints (issue 15).

The forms come from the library itself: the LaTeX of the sample of every ``sympy.Basic``
subclass kept by ``tests/test_package.py`` (imported, so a new sample is covered here at
once), of a sample of every other class with a ``_latex`` hook (a walker below fails when
a new one has none), of simple expressions built from them, of their notebook display
(``_repr_latex_``, rendered as the inline math a notebook gets), of the notation table in :mod:`amalgebra.notation`'s docstring, of the
derivation report (steps, a matrix with its basis legend) and of the command line's
``--latex`` output.  The sample forms are also compiled with pdflatex (amsmath, as the report).

The renderer is KaTeX (the version pinned in ``tests/derivations/katex/package.json``) run by
``tests/derivations/katex/render.js`` with ``throwOnError: true, strict: "error"``, so an
unknown macro, a TeX error or a construct KaTeX only tolerates fails;
:func:`test_the_checker_rejects_what_it_must` proves it can fail.  Without node or KaTeX the
tests skip locally (the reason is shown by ``pytest -rs``) and fail under ``CI=true``
(:mod:`amalgebra.testing.external`); ``.ci/run`` installs KaTeX with ``npm ci``.

What is checked is that KaTeX accepts the LaTeX, not how it looks; the exact strings are
pinned in ``tests/test_printing.py``.
"""

import importlib
import importlib.util
import inspect
import json
import pkgutil
import re
import shutil
import subprocess
from pathlib import Path
from types import SimpleNamespace

import pytest
from sympy import Matrix, Rational, Symbol, adjoint, latex, sqrt, symbols

import amalgebra
from amalgebra.testing.external import require_tool

HERE = Path(__file__).resolve().parent
KATEX_DIR = HERE / "derivations" / "katex"
RENDER = KATEX_DIR / "render.js"
HALF = Rational(1, 2)


def _render(sources):
    """``[(ok, error)]`` for each LaTeX source, rendered by KaTeX in strict mode (one node run)."""
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
                 "node with KaTeX (npm ci --prefix tests/derivations/katex)")
    done = subprocess.run([node, str(RENDER)], input=json.dumps(list(sources)), capture_output=True,
                          text=True, timeout=300, check=True)
    results = json.loads(done.stdout)
    assert len(results) == len(sources)
    return [(r["ok"], r["error"]) for r in results]


def _assert_all_render(named_sources):
    """Render ``[(name, tex)]``; fail listing every source KaTeX rejected, with its error.

    ``tex`` is a string (display math) or ``{"tex": ..., "inline": True}`` (inline math).
    """
    assert named_sources
    results = _render([tex for _, tex in named_sources])
    failures = [(name, tex, error) for (name, tex), (ok, error) in zip(named_sources, results, strict=True)
                if not ok]
    assert failures == [], failures


def _load_test_module(filename):
    """A sibling test module by path (tests/ is not a package); its sample lists are used, not copied."""
    spec = importlib.util.spec_from_file_location(f"katex_{Path(filename).stem}", HERE / filename)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


_PACKAGE = _load_test_module("test_package.py")


def _basic_samples():
    return _PACKAGE._samples()


def _result_samples():
    """One instance of every class with a LaTeX hook that is not a ``Basic`` (results for notebooks).

    Invented scenario: a spin-1 nucleus ``I`` coupled to an electron spin ``S`` by ``A I.S`` in a
    field ``b``; the other values are the small textbook cases each function's docstring uses.
    """
    import os
    import tempfile

    from sympy import Sum, pi

    from amalgebra.algebra import AngularMomentum
    from amalgebra.coupling import Coupling3j
    from amalgebra.coupling.recoupling import recoupling_matrix
    from amalgebra.coupling.trees import coupling_tree
    from amalgebra.derivations.written import written
    from amalgebra.matrices.explicit import to_matrix, verify_identity
    from amalgebra.racah import check_reduction, projection_sum, reduce_racah_sum
    from amalgebra.rotations.harmonics import addition_theorem
    from amalgebra.rotations.series import compose_rotations
    from amalgebra.states.basis import product_basis
    from amalgebra.states.coupled import coupling_matrix
    from amalgebra.states.hamiltonian import OperatorMatrix, hamiltonian_matrix
    from amalgebra.tables import tabulate
    from amalgebra.tensors.irreducible import bilinear_tensor_form, decompose
    from amalgebra.tensors.tree_elements import scalar_coupled, tree_operator_blocks
    from amalgebra.tensors.wigner_eckart import element_table

    J, S, I = AngularMomentum("J"), AngularMomentum("S"), AngularMomentum("I")
    A, b, g, Bz = symbols("A b g Bz")
    a_, b_, c_, m1, m2, m3 = symbols("a b c m1 m2 m3")
    values = dict(l1=1, l2=1, s1=HALF, s2=HALF)
    reduction = reduce_racah_sum(projection_sum(Coupling3j(a_, b_, c_, m1, m2, m3)**2, m1, m2, m3))
    hm = hamiltonian_matrix(A * (I.x*S.x + I.y*S.y + I.z*S.z) + b * S.z, {"I": 1, "S": HALF})
    hyperfine = coupling_tree("((l s) j, I) F", l=0, s=HALF, I=HALF)
    table_path = os.path.join(tempfile.mkdtemp(), "sixj.npz")
    return [
        recoupling_matrix(coupling_tree("((l1 l2) L, (s1 s2) S) J", **values),
                          coupling_tree("((l1 s1) j1, (l2 s2) j2) J", **values), total=1),
        verify_identity(J.plus*J.minus, J.squared - J.z**2 + J.z, {"J": [0, HALF]}),
        reduction, reduction.steps[0],
        check_reduction(Sum(Coupling3j(a_, b_, c_, m1, m2, m3)**2, (m1, -a_, a_), (m2, -b_, b_), (m3, -c_, c_)),
                        1, points=2, seed=1),
        coupling_matrix([HALF, HALF], ("A", "B")), element_table(1, 1, 1), decompose(J.x * J.y),
        tree_operator_blocks(hyperfine, [(A * c, op) for c, op in
                                         scalar_coupled(AngularMomentum("I"), AngularMomentum("j"))]),
        addition_theorem(1, *symbols("theta1 phi1 theta2 phi2", real=True)),
        compose_rotations(1, (0, pi / 2, 0), (0, pi / 2, 0)),
        product_basis({"I1": 1, "S": HALF}),
        hm.blocks[1].eigenvalues(), hm,
        OperatorMatrix(to_matrix(J.x, {"J": HALF}), product_basis({"J": HALF})),
        tabulate("sixj", 1, table_path, workers=1, progress=None),
        bilinear_tensor_form(S, g, (0, 0, Bz)),
        written(r"\dim V_{S=0}", 2),   # a step side in the author's own LaTeX (printed as given)
    ]


# Bases that carry a LaTeX hook for their subclasses but are never instantiated themselves.
_HOOK_BASES = ("amalgebra.notation.NotationHooks", "amalgebra.results.LatexDisplay",
               "amalgebra.algebra.operators.LabelledFamily", "amalgebra.algebra.operators.LabelledGenerator")


def _classes_with_latex():
    """Every public class of the library whose own MRO (within amalgebra) defines ``_latex``."""
    found = {}
    for info in pkgutil.walk_packages(amalgebra.__path__, "amalgebra."):
        if info.name.startswith(_PACKAGE._SKIP_MODULES):
            continue
        module = importlib.import_module(info.name)
        for name, cls in inspect.getmembers(module, inspect.isclass):
            if cls.__module__ != module.__name__ or name.startswith("_"):
                continue
            if any("_latex" in vars(k) for k in cls.__mro__ if k.__module__.startswith("amalgebra")):
                found[f"{cls.__module__}.{name}"] = cls
    return dict(sorted(found.items()))


def test_every_class_with_a_latex_hook_has_a_sample_here():
    classes = _classes_with_latex()
    covered = {type(s) for s in _basic_samples() + _result_samples()}
    missing = [name for name, cls in classes.items() if cls not in covered and name not in _HOOK_BASES]
    assert missing == [], "add a sample to tests/test_package.py (Basic) or _result_samples here"
    # the skipped bases are real bases of covered classes, so the skip list cannot hide a class
    for name in _HOOK_BASES:
        assert name in classes, name
        assert any(issubclass(c, classes[name]) for c in covered), name


def test_the_checker_rejects_what_it_must():
    # each bad source is refused by KaTeX itself (its documented behaviour, common practice, no
    # source): a double superscript (a TeX error), an undefined macro (throwOnError), an unknown
    # environment, and a non-ASCII letter in math mode (refused only under strict: "error")
    bad = [r"J^{2}^{2}", r"\notAMacro{x}", r"\begin{nosuchenv} x \end{nosuchenv}", "J_{z} \u00e9",
           {"tex": r"x \tag{1}", "inline": True}]   # \tag only in display math: the inline switch works
    good = [r"x^{2}", r"x \tag{1}", {"tex": r"\displaystyle x^{2}", "inline": True}]
    assert [ok for ok, _ in _render(bad + good)] == [False] * len(bad) + [True] * len(good)


def _derived(obj):
    """Simple expressions of a sample as they occur in sums: power, rational multiple, adjoint."""
    from sympy import Expr

    if not isinstance(obj, Expr):
        return []
    forms = [("squared", obj**2), ("times -3/7", Rational(-3, 7) * obj), ("between theta", obj * Symbol("theta") * obj)]
    forms.append(("adjoint", adjoint(obj)))
    return forms


def _notebook_latex(obj):
    """The notebook display (``_repr_latex_``, ``$\\displaystyle ...$``) as inline math, or None."""
    text = obj._repr_latex_() if hasattr(obj, "_repr_latex_") else None
    if text is None:
        return None
    assert text.startswith("$") and text.endswith("$") and not text.startswith("$$"), text
    return {"tex": text[1:-1], "inline": True}


def test_every_basic_sample_renders():
    sources = []
    for obj in _basic_samples():
        kind = type(obj).__name__
        sources.append((kind, latex(obj)))
        sources += [(f"{kind} {how}", latex(expr)) for how, expr in _derived(obj)]
        shown = _notebook_latex(obj)
        if shown is not None:
            sources.append((f"{kind} notebook", shown))
    assert len(sources) > 3 * len(_basic_samples())
    _assert_all_render(sources)


def test_sums_and_products_of_samples_render():
    # juxtaposition, precedence and superscripts of every pair: a*b, a + b, (a*b)**2; a pair the algebra
    # refuses (an operator plus a ket, kets of different spaces) raises a typed error and is left out
    from sympy import Expr

    from amalgebra.errors import AmalgebraError

    exprs = [obj for obj in _basic_samples() if isinstance(obj, Expr)]
    sources, refused = [], 0
    for a in exprs:
        for b in exprs:
            for how, build in (("*", lambda a, b: a * b), ("+", lambda a, b: a + b), ("(*)^2", lambda a, b: (a * b)**2)):
                try:
                    sources.append((f"{a} {how} {b}", latex(build(a, b))))
                except AmalgebraError:
                    refused += 1
    assert len(sources) > 2 * refused
    _assert_all_render(sources)


def _result_sources():
    sources = []
    for obj in _result_samples():
        kind = type(obj).__name__
        sources.append((kind, latex(obj)))
        shown = _notebook_latex(obj)
        if shown is not None:
            sources.append((f"{kind} notebook", shown))
    return sources


def test_every_result_sample_renders():
    _assert_all_render(_result_sources())


def test_the_sample_forms_compile_with_pdflatex(tmp_path):
    # the same LaTeX in real TeX (amsmath only, as the report uses): KaTeX accepting a form is not enough
    require_tool(shutil.which("pdflatex"), "pdflatex (apt: texlive-latex-base)")
    forms = [latex(obj) for obj in _basic_samples() + _labels_and_settings()] + [t for _, t in _result_sources()]
    body = "\n".join(r"\[ %s \]" % tex if isinstance(tex, str) else r"$%s$\par" % tex["tex"] for tex in forms)
    (tmp_path / "forms.tex").write_text("\\documentclass{article}\n\\usepackage{amsmath}\n\\begin{document}\n"
                                        f"{body}\n\\end{{document}}\n", encoding="utf-8")
    done = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error", "forms.tex"], cwd=tmp_path,
                          capture_output=True, text=True, timeout=300, check=False)
    assert done.returncode == 0, done.stdout[-3000:]
    assert "Undefined control sequence" not in done.stdout and (tmp_path / "forms.pdf").stat().st_size > 1000


def _labels_and_settings():
    """The label spellings the notation treats apart (one letter, longer, trailing digits) and the
    tensor settings (Racah, unit, non-Hermitian), in each kind that prints a label."""
    from amalgebra.algebra import AngularMomentum
    from amalgebra.bosons import BosonMode
    from amalgebra.coupling.trees import coupling_tree
    from amalgebra.states import coupled_ket, ket
    from amalgebra.states.tree_kets import tree_ket
    from amalgebra.tensors import SphericalTensor, VectorOperator
    from amalgebra.tensors.spherical import racah_tensor, unit_tensor
    from amalgebra.tensors.tree_elements import CoupledTensorOperator
    from amalgebra.tensors.wigner_eckart import ReducedMatrixElement

    out = []
    for label in ("J", "Sb", "S1", "I12", "N2b"):
        A = AngularMomentum(label)
        out += [A, A.z, A.plus, A.squared, A.squared**2, A.x**2 * A.minus, ket(1, 0, label), ket(HALF, -HALF, label).dual(),
                SphericalTensor("T", 2, label)[1], SphericalTensor("Tq", 1, label)[0]**2, SphericalTensor("T2", 1, label)[-1],
                VectorOperator("r", label).x, VectorOperator("mu", label), VectorOperator("r1", label).z,
                CoupledTensorOperator(VectorOperator("r", label), A, 1), BosonMode(label.lower()).create**2]
    jp = Symbol("j'")
    out += [racah_tensor(2)[1], unit_tensor(1, "S1")[0], VectorOperator("p", "L", hermitian=False).y,
            ReducedMatrixElement("Tq", 1, jp, Symbol("j"), "cg"), ReducedMatrixElement("T", HALF, HALF, HALF)**2,
            coupled_ket(1, HALF, HALF, -HALF, labels=("L1", "S1")),
            tree_ket(coupling_tree("((l1 s1) j1, (l2 s2) j2) J", l1=1, s1=HALF, j1=HALF, l2=1, s2=HALF,
                                   j2=Rational(3, 2), J=1), 0),
            coupling_tree("((l1 l2) L12, l3) Lt", l1=1, l2=2)]
    return out


def test_labels_and_settings_render():
    _assert_all_render([(str(obj), latex(obj)) for obj in _labels_and_settings()])


def _notation_table():
    """``[(object, str, LaTeX)]`` rows of the list-table in amalgebra.notation's docstring."""
    import amalgebra.notation as notation

    doc = notation.__doc__
    block = doc[doc.index(".. list-table::"):doc.index("\nExamples\n")]
    cells = re.findall(r"^   \* - (.*)\n     - (.*)\n     - (.*)$", block, flags=re.M)
    literal = re.compile(r"``(.*)``")
    return [(obj, literal.fullmatch(s).group(1), literal.fullmatch(t).group(1)) for obj, s, t in cells[1:]]


def test_the_notation_table_is_what_the_printers_print_and_renders():
    from amalgebra.parsing import parse

    rows = _notation_table()
    assert len(rows) >= 20
    for what, text, tex in rows:
        obj = parse(text)
        assert (str(obj), latex(obj)) == (text, tex), what
    _assert_all_render([(text, tex) for _, text, tex in rows])


def test_report_forms_render():
    # the report's math (report_latex): steps of library objects, a wide non-square matrix result (set as
    # a list of entries) and a ket result; invented scenario: a spin-1/2 "zeta" electron S in a field b
    from amalgebra.algebra import AngularMomentum
    from amalgebra.coupling.symbols import Coupling6j, CouplingBracket
    from amalgebra.derivations import derivation, report_latex
    from amalgebra.derivations.latex import value_rows
    from amalgebra.states import apply, ket
    from amalgebra.states.hamiltonian import hamiltonian_matrix

    S, I = AngularMomentum("S"), AngularMomentum("I1")
    b = symbols("b", positive=True)

    @derivation
    def zeta_levels(d):
        # the values are the engine's to check (its verdicts are not asserted here): common practice, no source
        d.step("ladder", S.plus * S.minus, S.squared - S.z**2 + S.z, "the ladder product")
        d.step("cg", CouplingBracket(HALF, HALF, HALF, -HALF, 1, 0), sqrt(2) / 2, "evaluate")
        d.step("sixj", Coupling6j(1, 1, 1, 1, 1, 1), Rational(1, 6), "evaluate")
        d.step("ket", apply(S.plus, ket(HALF, -HALF, "S")), ket(HALF, HALF, "S"), "raise $m$")
        d.result("wide", Matrix(3, 12, symbols("w0:36")))
        d.result("ket", ket(HALF, HALF, "S"))

    record = zeta_levels.run()
    assert record.error is None, record.error
    tex = report_latex([SimpleNamespace(name="deriv_zeta.py", records=[record], comparisons=[], load_error=None)])
    body = tex[tex.index(r"\begin{document}"):]
    math = [m.group(0) for m in re.finditer(r"\\begin\{(align\*?)\}.*?\\end\{\1\}", body, re.S)]
    math += re.findall(r"\\\[(.*?)\\\]", body, re.S)
    math += re.findall(r"(?<!\\)\$(.+?)(?<!\\)\$", body)
    assert len(math) >= 3, tex
    # matrices with their basis states as labels, as the report sets them (a derivation cannot hold an
    # OperatorMatrix yet, so through the report's own value_rows): a small one whole, a larger one with
    # a coupling (blocks), in the invented scenario of a spin-2 "zeta" nucleus I1 beside S
    A = symbols("A")
    labelled = []
    for hm in (hamiltonian_matrix(b * (S.z + I.z), {"S": HALF, "I1": 1}),
               hamiltonian_matrix(A * (I.x*S.x + I.y*S.y + I.z*S.z) + b * S.z, {"S": HALF, "I1": 2})):
        rows = value_rows(hm)
        text = "\n".join(rows)
        assert all(latex(state) in text for state in hm.basis), text   # every basis state is named
        labelled.append("\\begin{align*}\n" + " \\\\\n".join("&" + r for r in rows) + "\n\\end{align*}")
    _assert_all_render([(f"report math {i}", m) for i, m in enumerate(math)]
                       + [(f"labelled matrix {i}", m) for i, m in enumerate(labelled)])


@pytest.mark.parametrize("argv", [
    ["parse", "--latex", "T^(2)[J]_(1)*|(1_a 1/2_b)3/2_J, 1/2>"],
    ["parse", "--latex", "<1, 0; 1/2, 1/2|3/2, 1/2>*6j{1, 1, 1; 1, 1, 1} + 9j{1, 1, 0; 1, 1, 0; 0, 0, 0}"],
    ["table", "threej", "1", "1", "1", "--latex"],
    ["table", "sixj", "1", "1", "1", "1", "1", "1", "--latex"],
    ["table", "ninej", "1", "1", "0", "1", "1", "0", "0", "0", "0", "--latex"],
    ["table", "recoupling", "((l1 l2) L, (s1 s2) S) J", "((l1 s1) j1, (l2 s2) j2) J",
     "l1=1", "l2=1", "s1=1/2", "s2=1/2", "--latex"],
], ids=["parse-tensor-ket", "parse-symbols", "threej-all", "sixj", "ninej", "recoupling"])
def test_command_line_latex_renders(argv, capsys):
    from amalgebra.cli import main

    assert main(argv) == 0
    # a heading is a TeX comment line (checked below), not math to render on its own
    lines = [line for line in capsys.readouterr().out.splitlines() if line.strip() and not line.startswith("%")]
    assert lines
    _assert_all_render([(" ".join(argv), line) for line in lines])


def test_command_line_latex_is_latex_in_every_row(capsys):
    # plain text such as "m1=1 m2=0 m3=-1: -sqrt(6)/6" also renders, so check that --latex gave symbols:
    # every row of the table of all projections is one 3j array; the heading is a TeX comment
    from amalgebra.cli import main

    assert main(["table", "threej", "1", "1", "1", "--latex"]) == 0
    head, *rows = capsys.readouterr().out.splitlines()
    assert head.startswith("% ") and "Condon-Shortley" in head
    # 6 rows: the 7 projections with |m3| <= 1 but (1 1 1; 0 0 0), zero because j1 + j2 + j3 is odd
    # ((j1 j2 j3; -m) = (-1)^(j1+j2+j3) (j1 j2 j3; m), from memory)
    assert len(rows) == 6 and all(r.startswith(r"\begin{pmatrix}") and " = " in r for r in rows), rows
