"""The PDF of the bundled examples' report (issue 15): no overfull box over 10 pt, TeX rerun until settled.

These compile with pdflatex: skipped locally without it, a failure under CI=true
(amalgebra.testing.external.require_tool).
"""

import re
import shutil
from pathlib import Path


from amalgebra.cli import _build_pdf, main
from amalgebra.testing.external import require_tool

EXAMPLES = Path(__file__).resolve().parents[2] / "worked_examples"
OVERFULL = re.compile(r"^Overfull \\hbox \(([0-9.]+)pt too wide\)(.*)$", re.M)
OVERFULL_VBOX = re.compile(r"^Overfull \\vbox \(([0-9.]+)pt too high\)", re.M)
#: the page-width budget of issue 15: nothing sticks out by more than this
LIMIT_PT = 10.0


def overfull_boxes(log):
    """``[(points, where), ...]`` of the overfull hboxes a TeX log reports."""
    return [(float(pt), where.strip()) for pt, where in OVERFULL.findall(log)]


def test_overfull_parser_reads_a_tex_log():
    log = ("Overfull \\hbox (193.04869pt too wide) in paragraph at lines 9--10\n"
           "[]\\OT1/cmr/m/n/10 The\n"
           "Overfull \\hbox (2.5pt too wide) detected at line 382\n"
           "Underfull \\hbox (badness 10000) in paragraph at lines 1--2\n")
    assert overfull_boxes(log) == [(193.04869, "in paragraph at lines 9--10"),
                                   (2.5, "detected at line 382")]
    tall = "Overfull \\vbox (285.10274pt too high) has occurred while \\output is active []\n"
    assert OVERFULL_VBOX.findall(log + tall) == ["285.10274"]


def test_bundled_examples_report_fits_the_page(tmp_path, capsys):
    # what the README runs: `amalgebra report worked_examples -o report.tex` (TeX reruns)
    require_tool(shutil.which("pdflatex") or shutil.which("latexmk"),
                 "pdflatex (apt: texlive-latex-base)")
    tex = tmp_path / "report.tex"
    assert main(["report", str(EXAMPLES), "-o", str(tex), "-q"]) == 0, capsys.readouterr().err
    pdf = tmp_path / "report.pdf"
    assert pdf.stat().st_size > 10_000
    log = tex.with_suffix(".log").read_text(encoding="latin-1")
    assert "Output written on report.pdf" in log and "Rerun" not in log   # references settled
    wide = [(pt, where) for pt, where in overfull_boxes(log) if pt > LIMIT_PT]
    assert wide == []
    assert OVERFULL_VBOX.findall(log) == []           # nothing runs off the bottom of a page
    text = tex.read_text(encoding="utf-8")
    summary = text.split("\\section*{Regression summary}", 1)[1]
    assert re.search(r"\d+ stored results compared: \d+ identical\.", summary)
    assert "identical" not in text.split("\\section*{Regression summary}", 1)[0]


def test_build_pdf_reruns_until_references_settle(tmp_path):
    require_tool(shutil.which("pdflatex") or shutil.which("latexmk"),
                 "pdflatex (apt: texlive-latex-base)")
    tex = tmp_path / "refs.tex"
    # a forward reference: the first pdflatex run asks "Rerun to get cross-references right"
    tex.write_text("\\documentclass{article}\\begin{document}\n"
                   "See section~\\ref{sec:b}.\n\\section{A}\n\\section{B}\\label{sec:b}\n"
                   "\\end{document}\n", encoding="utf-8")
    pdf = _build_pdf(tex)
    assert pdf == tex.with_suffix(".pdf").resolve() and pdf.stat().st_size > 1000
    log = tex.with_suffix(".log").read_text(encoding="latin-1")
    assert "Rerun to get" not in log
    assert "\\newlabel{sec:b}{{2}" in tex.with_suffix(".aux").read_text(encoding="latin-1")
