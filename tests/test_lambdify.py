"""sympy.lambdify of the unevaluated symbols: every symbol kind, every default printer.

The lambdified functions run the float kernels (amalgebra.lambdify_kernels); the values are
compared with the exact symbols' ``doit()`` (the exact kernels, a separate route from the float
one), with published values, and with an independent matrix exponential (scipy.linalg.expm of the
textbook Jy matrix, amalgebra.testing.reference) for the D functions.
"""

import math

import numpy as np
import pytest
import scipy.linalg
from sympy import Rational, S, lambdify, pycode, sqrt, symbols

from amalgebra.coupling.symbols import Coupling3j, Coupling6j, Coupling9j, CouplingBracket
from amalgebra.errors import QuantumNumberError
from amalgebra.lambdify_kernels import exact_quantum_number
from amalgebra.tensors.wigner_eckart import ReducedMatrixElement, wigner_eckart
from amalgebra.rotations.wigner import RotationElement
from amalgebra.testing.reference import component_matrices

h = Rational(1, 2)
j, m, a, b, c = symbols("j m alpha beta gamma")

# the printers lambdify picks: None is its default (scipy + numpy here); "math" is the pure-Python
# printer; a list containing "mpmath" selects the mpmath printer
MODULES = [None, "math", "mpmath", "numpy", "scipy", ["math", "mpmath", "sympy"], "sympy"]

# symbol, exact value, source
PUBLISHED = [
    (CouplingBracket(1, 0, h, h, 3 * h, h), sqrt(Rational(2, 3)), "PDG CG table, 1 x 1/2"),
    (CouplingBracket(h, h, h, -h, 1, 0), sqrt(h), "PDG CG table, 1/2 x 1/2"),
    (Coupling3j(1, 1, 0, 0, 0, 0), -1 / sqrt(3), "DLMF 34.3.1: (-1)^(j-m)/sqrt(2j+1)"),
    (Coupling3j(1, 1, 2, 0, 0, 0), sqrt(Rational(2, 15)), "Edmonds 1957 table 2 (3j with m=0), from memory"),
    (Coupling6j(1, 1, 1, 1, 1, 1), Rational(1, 6), "from memory"),
    # {a b c; b a 0} = (-1)^(a+b+c)/sqrt((2a+1)(2b+1)): Edmonds 1957 eq. (6.3.2), from memory
    (Coupling6j(h, h, 1, h, h, 0), Rational(1, 2), "Edmonds 1957 eq. (6.3.2)"),
    (Coupling9j(1, 1, 0, 1, 1, 0, 0, 0, 0), Rational(1, 3), "Edmonds 1957 eq. 6.4.14 (a zero row gives a 6j)"),
]


@pytest.mark.parametrize("modules", MODULES, ids=str)
@pytest.mark.parametrize(("symbol", "value", "source"), PUBLISHED, ids=lambda x: str(x)[:24])
def test_coupling_symbols_lambdify_to_published_values(symbol, value, source, modules):
    f = lambdify([], symbol, modules=modules)
    assert float(f()) == pytest.approx(float(value), abs=1e-15), source
    assert symbol.doit() == value  # the exact route agrees with the source too


def _cases():
    """Symbolic arguments for every coupling symbol kind, with numbers to substitute."""
    return [
        (CouplingBracket(j, m, 1, 0, j, m), [(2, 1), (h * 5, h * 3), (1, -1), (3, 0)]),
        (Coupling3j(j, 1, j, m, 0, -m), [(2, 1), (h * 5, h * 3), (1, 1)]),
        (Coupling6j(j, j, 1, 1, 1, m), [(1, 1), (2, 1), (2, 2), (h * 3, h * 3)]),
        (Coupling9j(j, 1, m, 1, 1, 1, m, 1, j), [(2, 1), (h * 3, h), (1, 2)]),
        (RotationElement(j, m, 0, 0, b, 0), [(1, 1, 0.7), (2, -1, 2.1), (3, 0, -0.4)]),
    ]


@pytest.mark.parametrize("modules", MODULES, ids=str)
@pytest.mark.parametrize(("expr", "points"), _cases(), ids=lambda x: type(x).__name__)
def test_every_symbol_kind_lambdifies_to_its_exact_value(expr, points, modules):
    args = sorted(expr.free_symbols, key=str)
    f = lambdify(args, expr, modules=modules)
    for point in points:
        subs = dict(zip([j, m, b][:len(point)], point))
        exact = complex(expr.subs(subs).doit().evalf(30))  # exact kernels / closed form
        got = complex(f(*[float(subs[s]) for s in args]))
        assert got == pytest.approx(exact, abs=1e-13), (expr, point)
        assert exact != 0 or point == (3, 0)  # CG(3 0; 1 0|3 0) = 0, the only zero on purpose


def test_numpy_arrays_broadcast():
    f = lambdify((j, m), CouplingBracket(j, m, 1, 0, j, m))
    got = f(np.array([1, 2, 3]), np.array([1.0, 1.0, 0.0]))
    # <j m; 1 0|j m> = m / sqrt(j(j+1)): Edmonds 1957 table 2 (j2 = 1), from memory
    assert got == pytest.approx([1 / math.sqrt(2), 1 / math.sqrt(6), 0.0], abs=1e-15)


@pytest.mark.parametrize("modules", MODULES, ids=str)
def test_wigner_D_against_matrix_exponential(modules):
    # D^j_{m'm} = <j m'| exp(-i a Jz) exp(-i b Jy) exp(-i c Jz) |j m>, scipy.linalg.expm oracle
    alpha, beta, gamma = 0.3, 1.9, -0.8
    for jj in (h, 1, 3 * h, 2):
        mats = component_matrices(jj)
        R = (scipy.linalg.expm(-1j * alpha * mats["z"]) @ scipy.linalg.expm(-1j * beta * mats["y"])
             @ scipy.linalg.expm(-1j * gamma * mats["z"]))
        ms = [jj - k for k in range(int(2 * jj) + 1)]
        for row, mp in enumerate(ms):
            for col, mm in enumerate(ms):
                f = lambdify((j, m, a, b, c), RotationElement(j, m, mm, a, b, c), modules=modules)
                got = complex(f(float(jj), float(mp), alpha, beta, gamma))
                assert got == pytest.approx(R[row, col], abs=1e-12), (jj, mp, mm)


def test_d_function_published_value():
    # d^1_{11}(beta) = (1 + cos beta)/2, PDG d-function table
    f = lambdify(b, RotationElement(1, 1, 1, 0, b, 0))
    assert complex(f(1.2)) == pytest.approx((1 + math.cos(1.2)) / 2, abs=1e-15)


def test_reduced_matrix_element_is_a_lambdify_argument():
    R = ReducedMatrixElement("T", 1, 1, 1)
    expr = wigner_eckart(1, 1, 1, 0, 1, 1, R)
    f = lambdify([R], expr)
    # <1 1|T^1_0|1 1> = (-1)^0 (1 1 1; -1 0 1) <1||T||1>, and (1 1 1; -1 0 1) = 1/sqrt(6):
    # Edmonds 1957 eq. (5.4.1) and table 2, from memory
    assert f(2.0) == pytest.approx(2 / math.sqrt(6), abs=1e-15)
    assert R.free_symbols == set()


def test_pycode_is_self_contained():
    code = pycode(CouplingBracket(j, m, 1, 0, j, m))
    assert code == ("amalgebra.lambdify_kernels.float_call(amalgebra.coupling.floats.cg_float, "
                    "j, m, 1, 0, j, m)")


@pytest.mark.parametrize(("value", "exact"), [(0.5, S(1) / 2), (2, 2), (-1.5, -S(3) / 2), (1.0 + 1e-12, 1)])
def test_exact_quantum_number_accepts_half_integers(value, exact):  # common practice, no source
    assert exact_quantum_number(value) == exact


@pytest.mark.parametrize("value", [0.3, float("nan"), float("inf"), "x", 1.25, True])
def test_exact_quantum_number_rejects_others(value):
    with pytest.raises(QuantumNumberError):
        exact_quantum_number(value)


def test_lambdified_function_rejects_non_half_integer():
    f = lambdify(j, CouplingBracket(j, j, 0, 0, j, j))
    with pytest.raises(QuantumNumberError):
        f(0.3)


def test_numpy_arrays_of_angles_broadcast():
    # d^1_{11}(beta) = (1 + cos beta)/2 (PDG d-function table) over an array of angles
    betas = np.linspace(0.0, math.pi, 5)
    f = lambdify(b, RotationElement(1, 1, 1, 0, b, 0))
    assert f(betas) == pytest.approx((1 + np.cos(betas)) / 2, abs=1e-15)
