"""Sphinx configuration of the amalgebra documentation (build: see DEVELOPERS.md, "Documentation").

Pages generated at build time, into ``docs/_generated/`` (git-ignored), so that they follow the code:

* the API reference: one page per module that defines a public name of ``amalgebra.__all__``
  (autodoc of the module's ``__all__``), and an index of every public name;
* the conventions list, taken from README.md's "Conventions" section (one text, no drift);
* one page per worked example: its description, its steps as checked by the engine (the
  derivations are run here, as ``amalgebra check`` runs them) and its source.

Docstrings use SymPy's section style (``Examples`` over a line of ``=``); inside autodoc such
headings are not allowed, so :func:`_sympy_sections` turns them into rubrics and numbered
references into plain text before docutils reads them.
"""

import importlib.util
import inspect
import re
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
ROOT = HERE.parent
sys.path.insert(0, str(ROOT))

import amalgebra  # noqa: E402  (after the path set-up)

project = "amalgebra"
author = "the amalgebra developers"
copyright = "the amalgebra developers, BSD-3-Clause"  # noqa: A001 - Sphinx's name
version = release = amalgebra.__version__

extensions = ["sphinx.ext.autodoc", "sphinx.ext.mathjax"]
exclude_patterns = ["_build"]
templates_path = []
html_theme = "alabaster"
html_static_path = []
autodoc_member_order = "bysource"
autodoc_default_options = {"members": True, "show-inheritance": False}
default_role = "code"

GENERATED = HERE / "_generated"

_UNDERLINE = re.compile(r"\s*([=\-~^])\1{2,}\s*")
_CITATION = re.compile(r"^(\s*)\.\. \[(\w+)\]\s*(.*)$")


_FIELD_SECTIONS = ("Parameters", "Other Parameters", "Returns", "Yields", "Raises", "See Also")


def _indent(line):
    return len(line) - len(line.lstrip())


def _field_section(lines, base):
    """numpydoc-style ``name : type`` entries, some without a description: one paragraph or
    definition-list item each, separated by blank lines (docutils needs them)."""
    out = []
    for i, line in enumerate(lines):
        if line.strip() and _indent(line) == base:
            nxt = next((x for x in lines[i + 1:] if x.strip()), "")
            if out and out[-1].strip():
                out.append("")
            out.append(line)
            if not (nxt and _indent(nxt) > base and lines[i + 1].strip()):
                out.append("")
        else:
            out.append(line)
    return out


def _sympy_sections(app, what, name, obj, options, lines):
    """SymPy-style section headings become rubrics; ``.. [1]`` references become line blocks."""
    out, i, section, base = [], 0, None, 0
    held = []

    def flush():
        out.extend(_field_section(held, base) if section in _FIELD_SECTIONS else held)
        held.clear()

    while i < len(lines):
        line = lines[i]
        nxt = lines[i + 1] if i + 1 < len(lines) else ""
        text = line.strip()
        if (text and not text.startswith(("..", ">>>", "|")) and _UNDERLINE.fullmatch(nxt)
                and len(nxt.strip()) >= len(text)):
            flush()
            section, base = text, _indent(line)
            out.extend([f"{line[:base]}.. rubric:: {text}", ""])
            i += 2
            continue
        match = _CITATION.match(line)
        if match:
            if held and held[-1].strip() and not held[-1].lstrip().startswith("|"):
                held.append("")
            line = f"{match.group(1)}| [{match.group(2)}] {match.group(3)}"
        held.append(re.sub(r"\[(\w+)\]_", r"[\1]", line))
        i += 1
    flush()
    lines[:] = out


def _write(path, text):
    path.parent.mkdir(parents=True, exist_ok=True)
    if not path.exists() or path.read_text(encoding="utf-8") != text:
        path.write_text(text, encoding="utf-8")


def _title(text, char="="):
    return f"{text}\n{char * len(text)}\n"


def public_modules():
    """``{module name: [public names it defines]}`` for every name of ``amalgebra.__all__``."""
    found = {}
    for name in amalgebra.__all__:
        if name in ("__version__", "I"):
            continue
        module = getattr(amalgebra, name).__module__
        found.setdefault(module, []).append(name)
    for extra in ("amalgebra.results", "amalgebra.lambdify_kernels", "amalgebra.notation"):
        found.setdefault(extra, [])
    return dict(sorted(found.items()))


def _api_pages():
    modules = public_modules()
    index = [_title("API reference"), "",
             "Every name below is importable from the package itself (``import amalgebra as am;",
             "am.cg(...)``); it is documented on the page of the module that defines it.", "",
             ".. toctree::", "   :maxdepth: 1", ""]
    index += [f"   {module}" for module in modules]
    index += ["", _title("Public names", "-"), "", ".. list-table::", "   :header-rows: 1", "",
              "   * - name", "     - defined in"]
    for name in sorted(n for n in amalgebra.__all__ if n not in ("__version__", "I")):
        obj = getattr(amalgebra, name)
        role = "class" if inspect.isclass(obj) else "func"
        index += [f"   * - :py:{role}:`~{obj.__module__}.{name}`", f"     - :doc:`{obj.__module__}`"]
    _write(GENERATED / "api" / "index.rst", "\n".join(index) + "\n")
    for module in modules:
        _write(GENERATED / "api" / f"{module}.rst",
               f"{_title(module)}\n.. automodule:: {module}\n")
    # pages of modules that moved or went away would document their objects twice
    for page in (GENERATED / "api").glob("amalgebra*.rst"):
        if page.stem not in modules:
            page.unlink()


def _conventions():
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text.split("\n## Conventions\n", 1)[1].split("\n## ", 1)[0]
    # Markdown's `code` is RST's ``code``; the bullets are the same in both
    rst = re.sub(r"(?<!`)`([^`\n]+)`(?!`)", r"``\1``", section.strip())
    _write(GENERATED / "conventions_readme.rst", rst + "\n")


def _example_pages():
    from amalgebra.derivations.latex import derivation_latex
    from amalgebra.derivations.runner import load_derivations

    files = sorted((ROOT / "worked_examples").glob("deriv_*.py"))
    index = [_title("Worked examples"), "",
             "The bundled derivations, each step checked by the engine when these pages were built",
             "(``amalgebra check worked_examples`` runs the same checks and compares the stored results).",
             "The scenarios (species, parameter values) are invented.", "",
             ".. toctree::", "   :maxdepth: 1", ""]
    for path in files:
        index.append(f"   {path.stem}")
        module_doc = (inspect.getdoc(_load(path)) or "").strip()
        lines = [_title(path.stem), ""]
        if module_doc:
            lines += ["::", ""] + [f"    {line}" for line in module_doc.splitlines()] + [""]
        for derivation in load_derivations(path):
            record = derivation.run()
            lines += [_title(record.title or record.name, "-"), ""]
            if record.error is not None:
                # shown, not hidden; the failure itself is the business of `amalgebra check` and the
                # worked-example tests, not of the documentation build
                first = str(record.error).splitlines()[0] if str(record.error) else type(record.error).__name__
                lines += [".. error::", "", f"   This derivation failed when the page was built: ``{first}``", ""]
            if record.description:
                lines += ["::", ""] + [f"    {line}" for line in record.description.splitlines()] + [""]
            body = derivation_latex(record)
            if body:
                lines += [".. math::", "   :nowrap:", ""] + [f"   {line}" for line in body.splitlines()] + [""]
        rel = Path("..", "..", "..", "worked_examples", path.name).as_posix()
        lines += [_title("Source", "-"), "", f".. literalinclude:: {rel}", "   :language: python", ""]
        _write(GENERATED / "examples" / f"{path.stem}.rst", "\n".join(lines))
    _write(GENERATED / "examples" / "index.rst", "\n".join(index) + "\n")


def _load(path):
    spec = importlib.util.spec_from_file_location(f"_docs_{path.stem}", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def _generate(app):
    _api_pages()
    _conventions()
    _example_pages()


def setup(app):
    app.connect("builder-inited", _generate)
    app.connect("autodoc-process-docstring", _sympy_sections)
    return {"parallel_read_safe": True}
