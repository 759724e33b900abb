"""Printing of every object kind: exact str, Unicode pretty and LaTeX; KaTeX and pdflatex checks.

The expected strings are written by hand from the notation chosen in
``amalgebra.notation`` (module docstring table); the notation itself is
common practice (Edmonds 1957 ch. 3 and 6 for the 3j, 6j, 9j arrays; the
Dirac bra-ket; the double bar of a reduced matrix element).
"""

import json
import os
import pickle
import shutil
import subprocess
import sys
import textwrap
from pathlib import Path

import pytest
from sympy import Basic, Rational, S, Symbol, conjugate, latex, pretty, sqrt, symbols
from sympy.printing.defaults import Printable

from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import BosonMode, FockBra, FockKet
from amalgebra.coupling import cg, ninej, sixj, threej
from amalgebra.coupling.symbols import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from amalgebra.coupling.trees import coupling_tree
from amalgebra.errors import ProjectionError, QuantumNumberError
from amalgebra.racah.triangle import TriangleDelta
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement
from amalgebra.rotations.wigner import RotationElement
from amalgebra.states.coupled import CoupledBra, CoupledKet
from amalgebra.states.kets import Bra, Ket, ProductBra, ProductKet
from amalgebra.states.tree_kets import tree_ket
from amalgebra.tensors.products import TensorComponents
from amalgebra.tensors.spherical import SphericalTensor
from amalgebra.tensors.tree_elements import CoupledTensorOperator
from amalgebra.tensors.vectors import VectorOperator
from amalgebra.testing.external import require_tool

KATEX_DIR = Path(__file__).resolve().parent / "derivations" / "katex"
HALF = Rational(1, 2)
J = AngularMomentum("J")
S1 = AngularMomentum("S1")
FINE = tree_ket(coupling_tree("(l s) j", l=1, s="1/2", j="3/2"), Rational(1, 2))
A = BosonMode("a")
T = SphericalTensor("T", 2, "J")
R = VectorOperator("r", "L")
a, b, c, d, e, f, g, h, i = symbols("a b c d e f g h i")
j, m = symbols("j m")
alpha, beta, gamma = symbols("alpha beta gamma")


def _lines(*rows):
    return "\n".join(rows)


# common practice, no source (notation): one row per object kind.
#  name           object                                        str                                   pretty (unicode)                     LaTeX
TABLE = [
    ("am",         J,                                             "AngularMomentum('J')",               "J",                                 r"\mathbf{J}"),
    ("jz",         J.z,                                           "J.z",                                "J_z",                               r"J_{z}"),
    ("jx",         J.x,                                           "J.x",                                "Jₓ",                                r"J_{x}"),
    ("jplus",      J.plus,                                        "J.plus",                             "J₊",                                r"J_{+}"),
    ("jminus_S1",  S1.minus,                                      "S1.minus",                           "S₁₋",                               r"S_{1-}"),
    ("jsquared",   J.squared,                                     "J.squared",                          _lines(" 2", "J "),                  r"J^{2}"),  # issue 15: no parentheses alone
    ("ket",        Ket(1, 0, "S"),                                "|1, 0>_S",                           "|1, 0⟩_S",                          r"{\left|1, 0\right\rangle}_{S}"),
    ("bra",        Bra(1, -1, "L"),                               "<1, -1|_L",                          "⟨1, -1|_L",                         r"{\left\langle 1, -1\right|}_{L}"),
    ("ket_sym",    Ket(j, m, "S1"),                               "|j, m>_S1",                          "|j, m⟩_S1",                         r"{\left|j, m\right\rangle}_{{S_{1}}}"),
    ("product",    ProductKet(Ket(1, 0, "L"), Ket(0, 0, "S")),    "|1, 0>_L|0, 0>_S",                   "|1, 0⟩_L|0, 0⟩_S",
     r"{\left|1, 0\right\rangle}_{L} {\left|0, 0\right\rangle}_{S}"),
    ("product_bra", ProductBra(Bra(1, 0, "L"), Bra(0, 0, "S")),   "<1, 0|_L<0, 0|_S",                   "⟨1, 0|_L⟨0, 0|_S",
     r"{\left\langle 1, 0\right|}_{L} {\left\langle 0, 0\right|}_{S}"),
    ("coupled",    CoupledKet((1, 1), (), 2, 0, ("A", "B")),      "|(1_A 1_B)2, 0>",                    "|(1_A 1_B)2, 0⟩",
     r"\left|\left(1_{A} 1_{B}\right) 2, 0\right\rangle"),
    ("coupled3",   CoupledBra((1, 1, 1), (2,), 3, 1, ("A", "B", "C")), "<((1_A 1_B)2 1_C)3, 1|",        "⟨((1_A 1_B)2 1_C)3, 1|",
     r"\left\langle \left(\left(1_{A} 1_{B}\right) 2\, 1_{C}\right) 3, 1\right|"),
    ("mode",       A,                                             "BosonMode('a')",                     "a",                                 r"a"),
    ("annihilate", A.annihilate,                                  "a.annihilate",                       "a",                                 r"a"),
    ("create",     A.create,                                      "a.create",                           "a†",                                r"{a^{\dagger}}"),
    ("number",     A.number,                                      "a.number",                           "Nₐ",                                r"\hat{N}_{a}"),
    ("fock_ket",   FockKet(("b", "a"), (1, 2)),                   "|2, 1>_(a,b)",                       "|2, 1⟩_(a,b)",                      r"{\left|2, 1\right\rangle}_{a,b}"),
    ("fock_bra",   FockBra(("a",), (3,)),                         "<3|_(a)",                            "⟨3|_(a)",                           r"{\left\langle 3\right|}_{a}"),
    ("wigner_D",   RotationElement(1, 1, 0, alpha, beta, gamma),  "D^{1}_{1,0}(alpha, beta, gamma)",
     _lines(" 1           ", "D   (α, β, γ)", " 1,0         "),                                           r"D^{1}_{1,0}\left(\alpha,\beta,\gamma\right)"),
    ("reduced",    ReducedMatrixElement("T", 1, 1, 1),            "<1||T^(1)||1>",                      "⟨1‖T^(1)‖1⟩",                       r"\langle 1 \| T^{(1)} \| 1 \rangle"),
    ("reduced_cg", ReducedMatrixElement("Q", 2, 1, 1, "cg"),      "<1||Q^(2)||1>_cg",                   "⟨1‖Q^(2)‖1⟩_cg",                    r"\langle 1 \| Q^{(2)} \| 1 \rangle_{\mathrm{CG}}"),
    ("tensor",     T,                                             "T^(2)[J]",                           "T^(2)",                             r"T^{(2)}"),
    # str says the label a tensor or vector is under (issue 15: parse(str(x)) == x); pretty and LaTeX do not
    ("tensor_q",   T[-1],                                         "T^(2)[J]_(-1)",                      _lines(" (2)", "T   ", " -1 "),     r"{T^{(2)}_{-1}}"),
    ("vector",     R,                                             "VectorOperator('r', 'L')",           "r",                                 r"\mathbf{r}"),
    ("vector_z",   R.z,                                           "r[L].z",                             "r_z",                               r"r_{z}"),
    # bold names keep the label rule (trailing digits a subscript); \mathbf is upright, so no \mathrm inside it
    ("am_digits",  S1,                                            "AngularMomentum('S1')",              "S1",                                r"{\mathbf{S}_{1}}"),
    ("vector_digits", VectorOperator("r1", "L"),                  "VectorOperator('r1', 'L')",          "r1",                                r"{\mathbf{r}_{1}}"),
    ("coupled_am", CoupledTensorOperator(AngularMomentum("Sb"), S1, 1), "[Sb x S1]^(1)",                "[Sb × S1]^(1)",
     r"\left[\mathbf{Sb} \times {\mathbf{S}_{1}}\right]^{(1)}"),
    ("components", TensorComponents(1, (a, b, c)),                "TensorComponents(1, (a, b, c))",     "[a, b, c]^(1)",                     r"\left[a,\ b,\ c\right]^{(1)}"),
    ("tree",       coupling_tree("((l1 s1) j1, (l2 s2) j2) J"),  "((l1 s1) j1, (l2 s2) j2) J",         "((l1 s1) j1, (l2 s2) j2) J",
     r"\left(\left(l_{1}\, s_{1}\right) j_{1},\, \left(l_{2}\, s_{2}\right) j_{2}\right) J"),
    ("tree_values", coupling_tree("((l s) j, I) F", l=2, s="1/2", j="5/2", I="7/2", F=3),
     "((l s) j, I) F [l=2, s=1/2, j=5/2, I=7/2, F=3]",                                                    "((l s) j, I) F [l=2, s=1/2, j=5/2, I=7/2, F=3]",
     r"\left(\left(l\, s\right) j,\, I\right) F\quad \left(l = 2,\, s = \frac{1}{2},\, j = \frac{5}{2},\, I = \frac{7}{2},\, F = 3\right)"),
    # the tree kets take the angle brackets of the coupled kets above (Unicode pretty: the closing angle);
    # every momentum carries its name, the intermediate and total ones too (a coupled ket's do not)
    ("tree_ket",   FINE,                                          "|(1_l 1/2_s)3/2_j, 1/2>",            "|(1_l 1/2_s)3/2_j, 1/2⟩",
     r"\left|\left(1_{l}\, \frac{1}{2}_{s}\right) \frac{3}{2}_{j}, \frac{1}{2}\right\rangle"),
    ("tree_bra",   FINE.dual(),                                   "<(1_l 1/2_s)3/2_j, 1/2|",            "⟨(1_l 1/2_s)3/2_j, 1/2|",
     r"\left\langle \left(1_{l}\, \frac{1}{2}_{s}\right) \frac{3}{2}_{j}, \frac{1}{2}\right|"),
    ("coupled_op", CoupledTensorOperator(SphericalTensor("T", 1, "a"), SphericalTensor("U", 2, "b"), 2),
     "[T^(1)[a] x U^(2)[b]]^(2)",                                                                           "[T^(1) × U^(2)]^(2)",
     r"\left[T^{(1)} \times U^{(2)}\right]^{(2)}"),
    # the triangle symbol Delta(a b c) as the textbooks write it (arguments sorted: it is symmetric)
    ("triangle",   TriangleDelta(c, a, b),                        "TriangleDelta(a, b, c)",             "Δ(a, b, c)",                        r"\Delta\left(a, b, c\right)"),
    ("cg",         CouplingBracket(1, 0, HALF, HALF, Rational(3, 2), HALF), "<1, 0; 1/2, 1/2|3/2, 1/2>",
     "⟨1, 0; 1/2, 1/2 | 3/2, 1/2⟩",
     r"\left\langle 1, 0; \frac{1}{2}, \frac{1}{2} \middle| \frac{3}{2}, \frac{1}{2} \right\rangle"),
    ("threej",     Coupling3j(1, 1, 0, 0, 0, 0),                "3j(1, 1, 0; 0, 0, 0)",
     _lines("⎛1  1  0⎞", "⎜       ⎟", "⎝0  0  0⎠"),                                                      r"\begin{pmatrix} 1 & 1 & 0 \\ 0 & 0 & 0 \end{pmatrix}"),
    ("sixj",       Coupling6j(a, b, c, d, e, f),                  "6j{a, b, c; d, e, f}",
     _lines("⎧a  b  c⎫", "⎨       ⎬", "⎩d  e  f⎭"),                                                      r"\begin{Bmatrix} a & b & c \\ d & e & f \end{Bmatrix}"),
    ("ninej",      Coupling9j(a, b, c, d, e, f, g, h, i),        "9j{a, b, c; d, e, f; g, h, i}",
     _lines("⎧a  b  c⎫", "⎪       ⎪", "⎨d  e  f⎬", "⎪       ⎪", "⎩g  h  i⎭"),
     r"\begin{Bmatrix} a & b & c \\ d & e & f \\ g & h & i \end{Bmatrix}"),
]
IDS = [row[0] for row in TABLE]

# Powers, sums and products, where superscript protection and precedence matter.
COMPOSITES = [
    ("jsquared_pow", J.squared**2,                     r"\left(J^{2}\right)^{2}"),
    ("create_pow",   A.create**2,                      r"{a^{\dagger}}^{2}"),
    ("tensor_pow",   T[1]**2,                          r"{T^{(2)}_{1}}^{2}"),
    ("threej_pow",   Coupling3j(1, 1, 0, 0, 0, 0)**2, r"\begin{pmatrix} 1 & 1 & 0 \\ 0 & 0 & 0 \end{pmatrix}^{2}"),
    ("cg_pow",       CouplingBracket(j, m, 0, 0, j, m)**2,
     r"\left\langle j, m; 0, 0 \middle| j, m \right\rangle^{2}"),
    ("op_on_ket",    sqrt(2) * J.plus * Ket(1, 0, "J"), r"\sqrt{2} J_{+} {\left|1, 0\right\rangle}_{J}"),
]


@pytest.mark.parametrize("name, obj, text, unicode, tex", TABLE, ids=IDS)
def test_str(name, obj, text, unicode, tex):
    assert str(obj) == text


@pytest.mark.parametrize("name, obj, text, unicode, tex", TABLE, ids=IDS)
def test_str_reads_back(name, obj, text, unicode, tex):
    # issue 15: every str form of the table says all its object holds
    from amalgebra.parsing import parse

    assert parse(text) == obj


@pytest.mark.parametrize("name, obj, text, unicode, tex", TABLE, ids=IDS)
def test_pretty_unicode(name, obj, text, unicode, tex):
    assert pretty(obj, use_unicode=True) == unicode


@pytest.mark.parametrize("name, obj, text, unicode, tex", TABLE, ids=IDS)
def test_latex(name, obj, text, unicode, tex):
    assert latex(obj) == tex


@pytest.mark.parametrize("name, obj, tex", COMPOSITES, ids=[r[0] for r in COMPOSITES])
def test_latex_composites(name, obj, tex):
    assert latex(obj) == tex


def _basic_classes():
    import importlib
    import inspect
    import pkgutil

    import amalgebra

    skip = ("amalgebra.cli", "amalgebra.pytest_plugin", "amalgebra.testing")
    # deprecated shims of moved modules only re-export (and warn): their classes are found at the new paths
    shims = {"amalgebra.rotations_series", "amalgebra.rotations_actions", "amalgebra.harmonics",
             "amalgebra.numeric", "amalgebra.multiplet_matrices", "amalgebra.reduced"}
    found = set()
    for info in pkgutil.walk_packages(amalgebra.__path__, "amalgebra."):
        if info.name.startswith(skip) or info.name in shims:
            continue
        for name, cls in inspect.getmembers(importlib.import_module(info.name), inspect.isclass):
            if issubclass(cls, Basic) and cls.__module__.startswith("amalgebra") and not name.startswith("_"):
                found.add(cls)
    return found


def test_table_covers_every_object_kind():
    # a new Basic class must get a row (and so a notation) in TABLE
    missing = sorted(cls.__name__ for cls in _basic_classes() - {type(row[1]) for row in TABLE})
    assert missing == []


def test_pretty_ascii_has_no_unicode():
    for name, obj, *_ in TABLE:
        text = pretty(obj, use_unicode=False)
        assert text.isascii(), (name, text)
    # common practice, no source: ASCII fallbacks of the brackets and the double bar
    assert pretty(Ket(1, 0, "S"), use_unicode=False) == "|1, 0>_S"
    assert pretty(ReducedMatrixElement("T", 1, 1, 1), use_unicode=False) == "<1||T^(1)||1>"
    assert pretty(A.create, use_unicode=False) == "a^+"


def test_every_object_is_printable_for_jupyter():
    # SymPy's Printable gives _repr_latex_ ($\displaystyle ...$) from our _latex hook.
    for name, obj, _text, _unicode, tex in TABLE:
        assert isinstance(obj, Printable), name
        assert obj._repr_latex_() == "$\\displaystyle %s$" % tex, name


def _hamiltonian():
    from amalgebra.states.hamiltonian import hamiltonian_matrix

    return hamiltonian_matrix(J.z, {"J": HALF})


def _identity_check(lhs, rhs):
    from amalgebra.matrices.explicit import verify_identity

    return verify_identity(lhs, rhs, {"J": [HALF]})


def test_result_objects_print_through_printable():
    hm = _hamiltonian()
    assert isinstance(hm, Printable)
    # common practice, no source: J_z on j = 1/2 is diag(1/2, -1/2) in the m = 1/2, -1/2 basis
    assert latex(hm) == r"\left[\begin{matrix}\frac{1}{2} & 0\\0 & - \frac{1}{2}\end{matrix}\right]"
    assert repr(hm) == str(hm) and str(hm).startswith("HamiltonianMatrix(size=2, ")
    from amalgebra.matrices.explicit import to_matrix
    om = to_matrix(J.z, {"J": HALF}, with_basis=True)
    assert isinstance(om, Printable) and latex(om) == latex(hm)     # the same matrix, printed alone
    assert repr(om) == str(om) == "OperatorMatrix(size=2, basis=Basis(2 states, labels=['J']))"
    good = _identity_check(J.plus * J.minus - J.minus * J.plus, 2 * J.z)
    assert isinstance(good, Printable)
    assert latex(good) == r"\text{identity holds for 1 j set(s): J=1/2}"
    bad = _identity_check(J.plus * J.minus, J.z)
    assert latex(bad).startswith(r"\text{identity fails at J=1/2: entry (row 0, col 0), \textless{}m=")


def _result_latex():
    return [latex(_hamiltonian()), latex(_identity_check(J.plus * J.minus, J.z)),
            latex(_identity_check(J.z, J.z))]


# -- coupling symbols ---------------------------------------------------------------------

SYMBOL_CASES = [
    # class                 function  arguments
    (CouplingBracket,   cg,       (1, 0, HALF, HALF, Rational(3, 2), HALF)),
    (CouplingBracket,   cg,       (1, 1, 1, -1, 2, 0)),
    (CouplingBracket,   cg,       (1, 1, 1, 1, 1, 2)),           # M != m1 + m2
    (Coupling3j,          threej,   (1, 1, 0, 0, 0, 0)),
    (Coupling3j,          threej,   (2, 1, 1, 0, 1, -1)),
    (Coupling3j,          threej,   (j, 1, j, m, 0, -m)),            # closed form
    (Coupling6j,            sixj,     (1, 1, 1, 1, 1, 1)),
    (Coupling6j,            sixj,     (HALF, HALF, 1, HALF, HALF, 0)),
    (Coupling9j,           ninej,    (1, 1, 0, 1, 1, 0, 0, 0, 0)),
    (Coupling9j,           ninej,    (HALF, HALF, 1, HALF, HALF, 1, 1, 1, 2)),
]


@pytest.mark.parametrize("cls, function, args", SYMBOL_CASES)
def test_symbol_doit_agrees_with_function(cls, function, args):
    symbol = cls(*args)
    assert symbol.doit() == function(*args)
    assert symbol != function(*args)          # unevaluated until asked


@pytest.mark.parametrize("cls, function, args", SYMBOL_CASES)
def test_symbol_args_invariant_and_pickle(cls, function, args):
    symbol = cls(*args)
    assert all(isinstance(x, Basic) for x in symbol.args)
    assert symbol.func(*symbol.args) == symbol
    assert pickle.loads(pickle.dumps(symbol)) == symbol
    assert not hasattr(symbol, "__dict__")
    assert conjugate(symbol) == symbol        # the coefficients are real (Condon-Shortley)
    assert symbol.is_real is True and symbol.is_commutative is True


def test_symbol_published_values():
    # Particle Data Group CG table, 1 x 1/2: <1 0; 1/2 1/2|3/2 1/2> = sqrt(2/3)
    assert CouplingBracket(1, 0, HALF, HALF, Rational(3, 2), HALF).doit() == sqrt(Rational(2, 3))
    # NIST DLMF 34.3.1: (j j 0; m -m 0) = (-1)^(j-m)/sqrt(2j+1); j = 1, m = 0
    assert Coupling3j(1, 1, 0, 0, 0, 0).doit() == -1 / sqrt(3)
    # NIST DLMF 34.4 (6j with a zero): {a b c; b a 0} = (-1)^(a+b+c)/sqrt((2a+1)(2b+1)); a = b = 1/2, c = 1
    assert Coupling6j(HALF, HALF, 1, HALF, HALF, 0).doit() == Rational(1, 2)


def test_symbol_no_canonicalisation_and_stays_symbolic():
    one, two = Coupling6j(1, 2, 3, 1, 2, 3), Coupling6j(2, 1, 3, 2, 1, 3)   # column swap, same value
    assert one != two and one.doit() == two.doit()
    k, q, big_j, big_m = symbols("k q J M")
    general = CouplingBracket(j, m, k, q, big_j, big_m)
    assert general.doit() == general                       # no closed form: left as written
    # coupling to j2 = 0 is the identity (common practice, no source)
    assert CouplingBracket(j, m, 0, 0, j, m).doit() == 1


def test_symbol_validation():
    with pytest.raises(QuantumNumberError):
        Coupling3j(-1, 1, 0, 0, 0, 0)
    with pytest.raises(QuantumNumberError):
        Coupling6j(Rational(1, 3), 1, 1, 1, 1, 1)
    with pytest.raises(TypeError, match="args="):
        Coupling9j(1, 1, 1)
    with pytest.raises(ProjectionError, match="m1=1/2 must differ from j1=1"):
        Coupling3j(1, 1, 1, HALF, HALF, -1)
    with pytest.raises(ProjectionError, match="M=1 must differ from J=1/2"):
        CouplingBracket(1, 0, HALF, HALF, HALF, 1)
    # selection-rule violations are legitimate symbols that evaluate to zero
    # (common practice, no source: |m| > j and a failed triangle give 0)
    assert CouplingBracket(1, 2, 1, 0, 1, 2).doit() == 0
    assert Coupling3j(1, 1, 5, 0, 0, 0).doit() == 0


# -- determinism --------------------------------------------------------------------------

_SCRIPT = textwrap.dedent("""
    from sympy import latex, pretty, symbols, sqrt
    from amalgebra.algebra import AngularMomentum, canonical, dot
    from amalgebra.states import coupled_ket
    from amalgebra.states.kets import Ket, ProductKet
    from amalgebra.tensors import quadrupole_tensor
    from amalgebra.coupling.symbols import Coupling6j, CouplingBracket
    I_, J = AngularMomentum("I"), AngularMomentum("J")
    x, y, z = symbols("x y z")
    objs = [canonical(dot(I_, J)) + J.squared, canonical((J.x + J.y)**2) * x,
            coupled_ket(1, "1/2", "3/2", "1/2", labels=("L", "S")).doit(),
            quadrupole_tensor(J), (y * ProductKet(Ket(1, 0, "L"), Ket(0, 0, "S")) + z * Ket(1, 1, "L")),
            Coupling6j(*symbols("a:f")) + sqrt(3) * CouplingBracket(*symbols("j1 m1 j2 m2 J M"))]
    for obj in objs:
        print(str(obj)); print(pretty(obj, use_unicode=True)); print(latex(obj))
""")


def test_output_is_hash_seed_independent():
    outputs = []
    for seed in ("0", "1", "2"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        done = subprocess.run([sys.executable, "-c", _SCRIPT], env=env, capture_output=True, timeout=300,
                              check=True)
        outputs.append(done.stdout)
    assert len(outputs[0]) > 500
    assert outputs[0] == outputs[1] == outputs[2]


# -- rendering with KaTeX and pdflatex ----------------------------------------------------



def _all_latex():
    return [row[4] for row in TABLE] + [row[2] for row in COMPOSITES] + _result_latex()


def test_every_latex_renders_with_katex_strict():
    node = shutil.which("node")
    require_tool(node and (KATEX_DIR / "node_modules" / "katex").is_dir(),
             "KaTeX (npm install --prefix tests/derivations/katex)")
    sources = _all_latex() + ["J^{2}^{2}"]     # the last must fail: the checker can fail
    done = subprocess.run([node, str(KATEX_DIR / "render.js")], input=json.dumps(sources),
                          capture_output=True, text=True, timeout=120, check=True)
    results = json.loads(done.stdout)
    assert len(results) == len(sources)
    assert results[-1]["ok"] is False
    failures = [(src, r["error"]) for src, r in zip(sources[:-1], results[:-1], strict=True) if not r["ok"]]
    assert failures == []


def test_every_latex_compiles_with_pdflatex(tmp_path):
    require_tool(shutil.which("pdflatex"), "pdflatex (apt: texlive-latex-base)")
    body = "\n".join(r"\[ %s \]" % tex for tex in _all_latex())
    doc = ("\\documentclass{article}\n\\usepackage{amsmath}\n\\begin{document}\n"
           f"{body}\n\\end{{document}}\n")
    (tmp_path / "objects.tex").write_text(doc, encoding="utf-8")
    done = subprocess.run(["pdflatex", "-interaction=nonstopmode", "-halt-on-error", "objects.tex"],
                          cwd=tmp_path, capture_output=True, text=True, timeout=120, check=False)
    assert done.returncode == 0, done.stdout[-2000:]
    assert (tmp_path / "objects.pdf").stat().st_size > 1000


def test_missing_tool_fails_under_ci(monkeypatch):
    monkeypatch.setenv("CI", "true")
    with pytest.raises(pytest.fail.Exception, match="required under CI=true"):
        require_tool(False, "some tool")
    monkeypatch.setenv("CI", "")
    with pytest.raises(pytest.skip.Exception):
        require_tool(False, "some tool")


def test_symbols_print_by_notation_of_their_args():
    # printer settings reach the arguments (printer._print recursion): a Symbol named with a
    # Greek letter prints as Greek in LaTeX inside every array symbol
    lam = Symbol("lambda")
    assert latex(Coupling6j(lam, 1, 1, 1, 1, 1)) == r"\begin{Bmatrix} \lambda & 1 & 1 \\ 1 & 1 & 1 \end{Bmatrix}"
    assert str(Coupling3j(lam, lam, 0, S.Zero, 0, 0)) == "3j(lambda, lambda, 0; 0, 0, 0)"
