"""Tests of LaTeX rendering (amalgebra.derivations.latex), checked by pdflatex and KaTeX."""

import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest
from sympy import Add, Matrix, Mul, Symbol, latex, symbols

from amalgebra.derivations import derivation, derivation_latex, report_latex, run_folder
from amalgebra.derivations.latex import escape_text, justification_latex, value_rows
from amalgebra.derivations.latex_layout import ROW_WIDTH, expression_rows, visible_width
from amalgebra.testing.external import require_tool

HERE = Path(__file__).resolve().parent
EXAMPLES = HERE.parents[1] / "worked_examples"
KATEX_DIR = HERE / "katex"




def test_align_layout_exact():
    # issue 15: tagged rows, justifications and verdicts under the align, not in it
    @derivation
    def chain(d):
        x = symbols("x")
        d.step("a", (x + 1)**2, x**2 + 2*x + 1, "expand")
        d.then("b", x*(x + 2) + 1, "regroup $x^2 + 2x$")
        d.step("c", x - x, 0, "cancel_terms")

    assert derivation_latex(chain.run()) == (
        "\\begin{align}\n"
        "\\left(x + 1\\right)^{2} &= x^{2} + 2 x + 1 \\tag{a} \\\\\n"
        "&= x \\left(x + 2\\right) + 1 \\tag{b} \\\\\n"
        "0 &= 0 \\tag{c}\n"
        "\\end{align}\n"
        "\\begin{flushleft}\\small\n"
        "\\hangindent=2em\\hangafter=1 (a)~expand --- \\textit{exact (normal form)}\\par\n"
        "\\hangindent=2em\\hangafter=1 (b)~regroup $x^2 + 2x$ --- \\textit{exact (normal form)}\\par\n"
        "\\hangindent=2em\\hangafter=1 (c)~cancel\\_terms --- \\textit{exact (simplify)}\\par\n"
        "\\end{flushleft}")


def test_long_step_breaks_into_rows_with_one_tag():
    xs = symbols("x0:30")

    @derivation
    def long_sum(d):
        total = Add(*[x**2 for x in xs])
        d.step("a", total, total, "same sum")

    tex = derivation_latex(long_sum.run())
    align = tex.split("\\end{align}")[0]
    rows = align.strip().split("\n")[1:]
    assert len(rows) > 2
    assert align.count("\\tag{a}") == 1 and rows[-1].endswith("\\tag{a}")
    assert all(r.endswith("\\notag \\\\") or r.endswith("\\notag \\\\[0.6ex]") for r in rows[:-1])
    # every row within the width heuristic (tags and alignment marks aside)
    for row in rows:
        body = row.replace("\\tag{a}", "").replace("\\notag", "").replace("\\\\[0.6ex]", "")
        assert visible_width(body.rstrip(" \\")) <= ROW_WIDTH + 3, row
    # continuation rows of the sum begin "+" after a quad
    assert sum(r.startswith("&\\quad + ") for r in rows) >= 2


def test_coefficient_times_long_sum_uses_fixed_size_parentheses():
    a, xs = Symbol("a"), symbols("y0:30")
    rows = expression_rows(a * Add(*xs), 30)
    assert rows[0].startswith("a \\Bigl(") and rows[-1].endswith("\\Bigr)")
    assert "\\left" not in "".join(rows) and len(rows) >= 3
    assert all(visible_width(r) <= 30 for r in rows)


def test_long_product_breaks_at_factors():
    xs = symbols("z0:12")
    factors = [Add(x, 1, evaluate=True) for x in xs]
    rows = expression_rows(Mul(*factors), 30)
    assert len(rows) >= 3 and all(r.startswith("\\quad \\times ") for r in rows[1:])


@pytest.mark.parametrize("tex,              width", [
    ("x",                               1.0),
    ("x + y",                           4.0),     # a binary operator counts 2 (its spacing)
    ("x^{2}",                           1.7),     # scripts count 0.7 per character
    ("\\frac{abc}{d}",                   3.0),     # the wider of numerator and denominator
    ("\\left(x\\right)",                  3.0),     # \left and \right print nothing themselves
    ("\\mathrm{Ab}",                      2.0),
    ("\\begin{matrix}a & bb\\\\ccc & d\\end{matrix}", 3 + 2 + 1.8 + 2),  # widest per column
])
def test_visible_width_heuristic(tex, width):
    assert visible_width(tex) == pytest.approx(width)  # common practice, no source (our heuristic)


def test_wide_matrix_becomes_a_table_of_nonzero_entries():
    m = Matrix.diag(*symbols("a0:20"))
    rows = value_rows(m)
    assert "\\begin{matrix}" not in "".join(rows)
    assert "M_{20,20} = a_{19}" in "".join(rows) and "M_{1,2}" not in "".join(rows)
    assert all(visible_width(r) <= ROW_WIDTH for r in rows[1:])
    small = Matrix([[1, 2], [3, 4]])
    assert value_rows(small) == [latex(small)]


def test_small_matrix_with_a_basis_gets_row_and_column_labels():
    from amalgebra.states.basis import product_basis

    class Labelled:  # the shape of states.hamiltonian.OperatorMatrix: .matrix and .basis
        matrix = Matrix([[1, 0, 0], [0, 0, 0], [0, 0, -1]])
        basis = product_basis({"J": 1})

    (tex,) = value_rows(Labelled())
    assert tex.startswith(r"\begin{array}{r|ccc}")
    head, body = tex.split(r"\hline", 1)
    for state in Labelled.basis:                   # each ket heads a column and a row
        label = r"{\scriptstyle %s}" % latex(state)
        assert label in head and label in body
    assert body.count(r"\\") == 2 and r" & -1 \end{array}" in tex


def test_large_matrix_with_a_basis_gets_an_entry_list_and_a_legend():
    from amalgebra.states.basis import product_basis

    class Labelled:  # 9 x 9 (more than MAX_LABELLED) and no blocks
        basis = product_basis({"J": 4})
        matrix = Matrix.diag(*symbols("a0:9"))

    text = "".join(value_rows(Labelled()))
    assert r"\begin{array}" not in text
    assert "M_{1,1} = a_{0}" in text and "M_{9,9} = a_{8}" in text and "M_{1,2}" not in text
    assert "1\\colon " + latex(Labelled.basis[0]) in text
    assert "9\\colon " + latex(Labelled.basis[8]) in text


def test_blocked_matrix_is_set_block_by_block():
    from sympy import Rational

    from amalgebra.algebra import AngularMomentum
    from amalgebra.states.hamiltonian import hamiltonian_matrix

    I, J = AngularMomentum("I"), AngularMomentum("J")
    a = symbols("a")
    hm = hamiltonian_matrix(a*(I.z*J.z + (I.plus*J.minus + I.minus*J.plus)/2),
                            {"I": Rational(3, 2), "J": 1})        # 12 x 12, blocks of fixed M
    rows = value_rows(hm)
    text = "\n".join(rows)
    assert "12 $\\times$ 12 matrix in 6 blocks of sizes 3, 2, 1" in text.replace("\n", " ").replace(
        r"} \text{", " ")
    assert r"M = \frac{3}{2}\colon" in text and r"\begin{array}" in text
    assert r"\text{$1 \times 1$ blocks (basis state: value):}" in text
    assert text.count(r"\begin{array}") == 4 and "M_{" not in text   # 2, 3, 3, 2: all as arrays


def test_regression_status_in_a_summary_table():
    class Comparison:
        derivation, result, status = "spin_pair", "triplet_energy", "identical"

    class File:
        name, load_error, comparisons = "deriv_a.py", None, [Comparison()]

        @property
        def records(self):
            @derivation
            def spin_pair(d):
                d.step("a", Symbol("x") + 0, Symbol("x"), "trivial")
                d.result("triplet_energy", Symbol("x"))
            return [spin_pair.run()]

    doc = report_latex([File()])
    body, summary = doc.split("\\section*{Regression summary}")
    assert "identical" not in body
    assert "\\texttt{spin\\_\\allowbreak{}pair} & \\raggedright \\texttt{triplet\\_\\allowbreak{}energy} & identical" in summary


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


def test_broken_rows_and_entry_tables_render_with_katex():
    # the constructs the line breaker adds (\tag, \notag, \\[0.6ex], a lone \Bigl( or \Bigr),
    # \times rows, a basis legend with \colon) must be KaTeX-safe too
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
                 "KaTeX (npm install --prefix tests/derivations/katex)")
    from amalgebra.states.basis import product_basis

    class Labelled:
        matrix = Matrix.diag(*symbols("e0:9"))
        basis = product_basis({"I1": 1, "S": 1})

    @derivation
    def wide(d):
        a, xs = Symbol("a"), symbols("w0:40")
        d.step("a", Add(*xs) * a, a * Add(*xs), "factor")
        d.step("b", Mul(*[x + 1 for x in xs[:12]]), Mul(*[x + 1 for x in xs[:12]]), "same")
        d.result("table", Labelled.matrix)

    record = wide.run()
    sources = [derivation_latex(record).split("\\begin{flushleft}")[0],
               "\\begin{align*}\n" + " \\\\\n".join("&" + r for r in value_rows(Labelled()))
               + "\n\\end{align*}"]
    assert "\\Bigl(" in sources[0] and "\\times" in sources[0] and "\\colon" in sources[1]
    done = subprocess.run([node, str(KATEX_DIR / "render.js")], input=json.dumps(sources),
                          capture_output=True, text=True, timeout=60, check=True)
    assert [(r["ok"], r.get("error")) for r in json.loads(done.stdout)] == [(True, None), (True, None)]


def test_bundled_report_math_renders_with_katex():
    # every display of the bundled examples' report, labelled matrix arrays and blocks included
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
                 "KaTeX (npm install --prefix tests/derivations/katex)")
    examples = HERE.parents[1] / "worked_examples"
    report = report_latex(run_folder(examples).files, title="Worked examples")
    sources = [e[0] for e in re.findall(r"(\\begin\{(align\*?)\}.*?\\end\{\2\})", report, flags=re.S)]
    assert len(sources) > 50 and any(r"\begin{array}{r|" in s for s in sources)
    done = subprocess.run([node, str(KATEX_DIR / "render.js")], input=json.dumps(sources),
                          capture_output=True, text=True, timeout=300, check=True)
    results = json.loads(done.stdout)
    failures = [(src[:200], r["error"]) for src, r in zip(sources, results, strict=True) if not r["ok"]]
    assert failures == []


def test_wide_rectangular_matrix_lists_its_entries():
    m = Matrix(3, 12, symbols("w0:36"))
    text = "".join(value_rows(m, 39))
    assert "3 $\\times$ 12 matrix" in text
    assert "M_{1,12} = w_{11}" in text and "M_{3,12} = w_{35}" in text and "M_{3,1} = w_{24}" in text
