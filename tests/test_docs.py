"""The documentation site: built by Sphinx with warnings as errors; every public name documented
with a runnable example.

The tutorial pages (docs/**/*.rst) are doctested by the default pytest run (--doctest-glob), the
docstring examples by --doctest-modules.  Locally the build test skips when Sphinx is missing;
under CI=true it fails instead (amalgebra.testing.external).
"""

import importlib.util
import inspect
import re
import subprocess
import sys
from pathlib import Path

import pytest

import amalgebra
from amalgebra.testing.external import require_tool

ROOT = Path(__file__).resolve().parents[1]
PUBLIC = sorted(n for n in amalgebra.__all__ if n not in ("__version__", "I"))  # I is SymPy's


@pytest.mark.parametrize("name", PUBLIC)
def test_every_public_name_has_an_examples_section_with_a_doctest(name):
    doc = inspect.getdoc(getattr(amalgebra, name)) or ""
    match = re.search(r"^Examples\n=+\n(.*)", doc, flags=re.M | re.S)
    assert match, f"{name}: no 'Examples' section in its docstring"
    assert ">>> " in match.group(1), f"{name}: the Examples section has no doctest"


def test_docs_build_with_warnings_as_errors(tmp_path):
    require_tool(importlib.util.find_spec("sphinx") is not None, "Sphinx (pip install -e '.[docs]')")
    out = tmp_path / "html"
    done = subprocess.run([sys.executable, "-m", "sphinx", "-E", "-W", "--keep-going", "-q", "-b", "html",
                           str(ROOT / "docs"), str(out)],
                          cwd=ROOT, capture_output=True, text=True, timeout=1200, check=False)
    assert done.returncode == 0, done.stdout[-4000:] + done.stderr[-4000:]
    api = out / "_generated" / "api"
    html = "".join(p.read_text(encoding="utf-8") for p in api.glob("amalgebra*.html"))
    missing = [n for n in PUBLIC
               if f'id="{getattr(amalgebra, n).__module__}.{n}"' not in html]
    assert missing == [], "public names without an API entry"
    conventions = (out / "conventions.html").read_text(encoding="utf-8")
    assert "Condon-Shortley" in conventions and "Edmonds" in conventions
    examples = sorted(p.stem for p in (ROOT / "worked_examples").glob("deriv_*.py"))
    rendered = (out / "_generated" / "examples")
    assert examples and all((rendered / f"{stem}.html").is_file() for stem in examples)
    page = (rendered / f"{examples[0]}.html").read_text(encoding="utf-8")
    assert "\\begin{align}" in page  # the checked steps, as MathJax displays
    for tutorial in (ROOT / "docs" / "tutorials").glob("*.rst"):
        assert (out / "tutorials" / f"{tutorial.stem}.html").is_file(), tutorial.name
