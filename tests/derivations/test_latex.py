"""Tests of LaTeX rendering (amalgebra.derivations.latex), checked by pdflatex and KaTeX."""

import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest
from sympy import Symbol, symbols

from amalgebra.derivations import derivation, derivation_latex, report_latex, run_folder
from amalgebra.derivations.latex import escape_text, justification_latex
from amalgebra.testing.external import require_tool

HERE = Path(__file__).resolve().parent
EXAMPLES = HERE.parents[1] / "worked_examples"
KATEX_DIR = HERE / "katex"




def test_align_layout_exact():
    @derivation
    def chain(d):
        x = symbols("x")
        d.step("a", (x + 1)**2, x**2 + 2*x + 1, "expand")
        d.then("b", x*(x + 2) + 1, "regroup $x^2 + 2x$")
        d.step("c", x - x, 0, "cancel_terms")

    assert derivation_latex(chain.run()) == (
        "\\begin{align}\n"
        "\\left(x + 1\\right)^{2} &= x^{2} + 2 x + 1 && \\text{expand} \\\\\n"
        "&= x \\left(x + 2\\right) + 1 && \\text{regroup $x^2 + 2x$} \\\\\n"
        "0 &= 0 && \\text{cancel\\_terms}\n"
        "\\end{align}")


def test_escaping():
    assert escape_text("\\ { } # $ % & _ ^ ~") == (
        r"\textbackslash{} \{ \} \# \$ \% \& \_ \textasciicircum{} \textasciitilde{}")
    assert justification_latex("odd $ sign") == r"\text{odd \$ sign}"
    assert justification_latex("a $x_1$ b_c") == r"\text{a $x_1$ b\_c}"
    # "<" and ">" print as inverted marks in the default OT1 text font
    assert escape_text("J -> J'") == r"J -\textgreater{} J'"
    assert escape_text("a<b") == r"a\textless{}b"


def test_titles_may_hold_math():
    @derivation(title="The total $S^2$ of a_pair")
    def spectrum(d):
        d.step("a", symbols("x") * 0, 0, "nothing")

    from amalgebra.derivations.latex import _record_block

    block = _record_block(spectrum.run(), {})
    assert block.startswith(r"\subsection{The total $S^2$ of a\_pair}")


def test_failed_derivation_renders_steps_so_far():
    @derivation(title="Broken_one")
    def broken(d):
        x = Symbol("x")
        d.step("ok", x + x, 2*x, "double")
        d.step("wrong", x*x, 2*x, "not true")

    class File:
        name, load_error, comparisons = "deriv_b.py", None, []
        records = [broken.run()]

    doc = report_latex([File()])
    assert r"\subsection{Broken\_one}" in doc
    assert r"\paragraph{Failed.} step 'wrong' of derivation 'broken' does not hold" in doc
    assert doc.startswith("\\documentclass{article}\n\\usepackage{amsmath}")
    assert doc.endswith("\\end{document}\n")


@pytest.fixture
def report_text(make_folder, good_source):
    folder = make_folder({"deriv_good.py": good_source})
    return (report_latex(run_folder(folder).files, title="Test report")
            + report_latex(run_folder(EXAMPLES).files, title="Worked examples"))


def _documents(text):
    return [d + "\\end{document}\n" for d in text.split("\\end{document}\n") if d.strip()]


def test_report_compiles_with_pdflatex(report_text, tmp_path):
    require_tool(shutil.which("pdflatex"), "pdflatex (apt: texlive-latex-base)")
    for i, doc in enumerate(_documents(report_text)):
        tex = tmp_path / f"report{i}.tex"
        tex.write_text(doc, encoding="utf-8")
        done = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error",
                               tex.name], cwd=tmp_path, capture_output=True, text=True,
                              timeout=120, check=False)
        assert done.returncode == 0, done.stdout[-2000:]
        assert (tmp_path / f"report{i}.pdf").stat().st_size > 1000


def test_report_math_renders_with_katex(report_text):
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
             "KaTeX (npm install --prefix tests/derivations/katex)")
    blocks = re.findall(r"\\begin\{(align\*?)\}.*?\\end\{\1\}", report_text, flags=re.S)
    assert len(blocks) >= 6
    envs = re.findall(r"(\\begin\{(align\*?)\}.*?\\end\{\2\})", report_text, flags=re.S)
    sources = [e[0] for e in envs]
    done = subprocess.run([node, str(KATEX_DIR / "render.js")], input=json.dumps(sources),
                          capture_output=True, text=True, timeout=120, check=True)
    results = json.loads(done.stdout)
    failures = [(src, r["error"]) for src, r in zip(sources, results, strict=True) if not r["ok"]]
    assert failures == []


def test_katex_checker_rejects_bad_latex():
    # the checker itself must be able to fail: a double superscript (KaTeX and TeX reject it)
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
             "KaTeX (npm install --prefix tests/derivations/katex)")
    done = subprocess.run([node, str(KATEX_DIR / "render.js")],
                          input=json.dumps(["J^{(1)}_{z}^{2}", "x^{2}"]),
                          capture_output=True, text=True, timeout=60, check=True)
    assert [r["ok"] for r in json.loads(done.stdout)] == [False, True]


def test_missing_tool_fails_under_ci(monkeypatch):
    monkeypatch.setenv("CI", "true")
    with pytest.raises(pytest.fail.Exception, match="required under CI=true"):
        require_tool(False, "some tool")
    monkeypatch.setenv("CI", "")
    with pytest.raises(pytest.skip.Exception):
        require_tool(False, "some tool")
