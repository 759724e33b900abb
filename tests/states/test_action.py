"""Operator action on kets and matrix elements (amalgebra.states.action, amalgebra.states.actionform).

Sources: equation and section numbers of textbooks cited beside the checks (Sakurai 1994 =
J. J. Sakurai, Modern Quantum Mechanics, rev. ed.; Edmonds 1957; Foot 2005; Pauncz 1979) are
quoted from memory, not checked against the books; the formulas themselves are standard.
"""

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import (I, KroneckerDelta, Piecewise, Rational, Symbol, adjoint, expand, simplify,
                   sqrt, symbols)

from amalgebra.algebra import AngularMomentum, canonical, dot
from amalgebra.errors import ConventionError, OperatorError, StateError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.states.action import apply, expectation, matrix_element
from amalgebra.states.kets import bra, ket, product_ket
from amalgebra.states.actionform import condon_shortley, action_form, sqrt_of_product
from amalgebra.testing.action_oracle import walk_action

J = AngularMomentum("J")
L, S = AngularMomentum("L"), AngularMomentum("S")
j = Symbol("j", nonnegative=True)
m, n = Symbol("m"), Symbol("n")


def explicit(twice_j):
    """Explicit float matrices (Jx, Jy, Jz), basis m = j..-j, from
    J+-|j m> = sqrt((j -+ m)(j +- m + 1))|j, m+-1> (Sakurai 1994, eq. 3.5.41)."""
    jj = twice_j / 2
    ms = [jj - k for k in range(twice_j + 1)]
    jp = np.zeros((twice_j + 1, twice_j + 1))
    for k in range(1, twice_j + 1):
        jp[k - 1, k] = np.sqrt((jj - ms[k]) * (jj + ms[k] + 1))
    jm = jp.T
    return (jp + jm) / 2, (jp - jm) / 2j, np.diag(ms).astype(complex)


OPERATORS = [
    # (sympy operator, numpy builder from (Jx, Jy, Jz))
    (J.x, lambda x, y, z: x),
    (J.y, lambda x, y, z: y),
    (J.plus * J.minus, lambda x, y, z: (x + 1j * y) @ (x - 1j * y)),
    (J.x * J.y * J.z, lambda x, y, z: x @ y @ z),
    (J.y ** 3 - 2 * J.z * J.x ** 2, lambda x, y, z: y @ y @ y - 2 * z @ x @ x),
    ((J.x ** 2 - J.y ** 2 + J.z * J.x) ** 2, lambda x, y, z: np.linalg.matrix_power(x @ x - y @ y + z @ x, 2)),
    (J.squared - J.z ** 2 + Rational(1, 3) * J.minus ** 2 * J.plus, lambda x, y, z: (
        x @ x + y @ y + (x - 1j * y) @ (x - 1j * y) @ (x + 1j * y) / 3)),
]


@pytest.mark.parametrize("index", range(len(OPERATORS)))
def test_symbolic_closed_form_against_explicit_matrices(index):
    # reference: explicit matrices from Sakurai (1994) eq. 3.5.41, numpy products
    op, build = OPERATORS[index]
    form = action_form(op, ("J",))
    closed = {d: matrix_element(bra(j, m + d[0]), op, ket(j, m), conditions=False) for d in form.terms}
    for twice_j in range(0, 10):
        x, y, z = explicit(twice_j)
        mat = build(x, y, z)
        jj = Rational(twice_j, 2)
        for col in range(twice_j + 1):
            mv = jj - col
            for row in range(twice_j + 1):
                d = int(col - row)
                value = closed.get((d,))
                got = 0 if value is None else complex(value.subs({j: jj, m: mv}))
                assert abs(got - mat[row, col]) < 1e-9, (twice_j, row, col)


@pytest.mark.parametrize("index", range(len(OPERATORS)))
@pytest.mark.parametrize("jv", ["1/2", 1, "5/2", 4])
def test_apply_against_exact_to_matrix(index, jv):
    # independent engine: amalgebra.matrices.explicit.to_matrix (operator-algebra engineer's code)
    op, _ = OPERATORS[index]
    mat = to_matrix(op, j={"J": jv}, kind="exact")
    jj = Rational(jv)
    basis = [ket(jj, jj - k) for k in range(int(2 * jj) + 1)]
    for col, k in enumerate(basis):
        out = apply(op, k)
        for row, b in enumerate(basis):
            assert expand(matrix_element(b.dual(), op, k) - mat[row, col]) == 0
            coeff = out.coeff(b) if out != 0 else 0
            assert expand(coeff - mat[row, col]) == 0


@pytest.mark.parametrize("index", range(len(OPERATORS)))
def test_action_route_equals_ladder_terms_route(index):
    # the one route (read off the canonical form) against the word-by-word oracle of amalgebra.testing
    op, _ = OPERATORS[index]
    form = action_form(op, ("J",))
    oracle = walk_action(op, ("J",), (j,), (m,))
    assert sorted(form.terms) == sorted(oracle) != []
    for key, value in oracle.items():
        assert expand(form.polynomial(key, {"J": (j, m)}) - value) == 0


def test_canonical_and_raw_forms_act_alike():
    op = (J.x + J.y * J.z) ** 3
    assert expand(apply(op, ket(j, m)) - apply(canonical(op), ket(j, m))) == 0


def test_condon_shortley_values():
    # Sakurai (1994) eq. 3.5.41: J+|1,-1> = sqrt(2)|1,0>; J+^2|1,-1> = 2|1,1>
    assert apply(J.plus, ket(1, -1)) == sqrt(2) * ket(1, 0)
    assert apply(J.plus ** 2, ket(1, -1)) == 2 * ket(1, 1)
    assert apply(J.minus, ket("3/2", "3/2")) == sqrt(3) * ket("3/2", "1/2")
    assert condon_shortley(2, 1, 1) == 2          # sqrt((2-1)(2+1+1)) = 2
    assert condon_shortley(2, 1, 2) == 0          # leaves the range
    assert condon_shortley(2, -1, -2) == 0


def test_out_of_range_is_exact_zero():
    # physics: the amplitude into |m| > j vanishes; no invalid ket is ever built
    assert apply(J.plus, ket(2, 2)) == 0
    assert apply(J.minus ** 3, ket(1, 1)) == 0
    assert apply(J.x, ket(0, 0)) == 0
    assert matrix_element(bra(2, 2), J.plus, ket(2, 1)) == 2
    assert matrix_element(bra(2, 0), J.plus, ket(2, 1)) == 0
    assert matrix_element(bra(1, 0), J.z, ket(2, 0)) == 0        # different j


def test_symbolic_action():
    # Sakurai (1994) eq. 3.5.41 with symbolic j, m
    assert apply(J.plus, ket(j, m)) == sqrt(j - m) * sqrt(j + m + 1) * ket(j, m + 1)
    assert apply(J.z, ket(j, m)) == m * ket(j, m)
    assert expand(apply(J.squared, ket(j, m)) - j * (j + 1) * ket(j, m)) == 0


def test_matrix_element_conditions():
    value = matrix_element(bra(j, n), J.z, ket(j, m))
    assert isinstance(value, Piecewise)
    assert value.args[0][0] == m * KroneckerDelta(m, n)
    assert value.subs({j: 2, m: 1, n: 1}) == 1
    assert value.subs({j: 1, m: 3, n: 3}) == 0     # outside the range of validity
    bare = matrix_element(bra(j, n), J.z, ket(j, m), conditions=False)
    assert bare == m * KroneckerDelta(m, n)
    # numeric m with range decided by the numbers and a numeric j: no condition
    assert matrix_element(bra(2, 1), J.plus, ket(2, 0)) == sqrt(6)


def test_multi_label_action():
    k = product_ket(ket(1, 0, "L"), ket("1/2", "-1/2", "S"))
    out = apply(dot(L, S), k)
    # L.S = Lz Sz + (L+ S- + L- S+)/2: Condon-Shortley factors, Sakurai eq. 3.5.41
    expected = (sqrt(2) / 2) * product_ket(ket(1, -1, "L"), ket("1/2", "1/2", "S"))
    assert expand(out - expected) == 0
    with pytest.raises(OperatorError, match="labels"):
        apply(J.z, k)                              # operator over a label the ket does not carry
    with pytest.raises(OperatorError):
        apply(J.z, ket(1, 0, "S"))


def test_bad_operators():
    with pytest.raises(OperatorError):
        apply(Symbol("X", commutative=False), ket(1, 0))
    with pytest.raises(OperatorError):
        action_form("J.x", ("J",))
    with pytest.raises(StateError):
        matrix_element(bra(1, 0, "L"), L.z, product_ket(ket(1, 0, "L"), ket(0, 0, "S")))


def test_symbolic_coefficients_and_expectation():
    a, b = symbols("a b")
    op = a * J.x + b * J.z
    psi = (ket("1/2", "1/2") + ket("1/2", "-1/2")) / sqrt(2)
    # <+x| a Jx + b Jz |+x> = a/2 (spin 1/2 along x): Sakurai (1994) sec. 1.4
    assert expectation(op, psi) == a / 2
    assert expectation(J.y, (ket("1/2", "1/2") + I * ket("1/2", "-1/2"))) == Rational(1, 2)


def test_sqrt_of_product():
    assert sqrt_of_product([2, 3, 4]) == 2 * sqrt(6)
    assert sqrt_of_product([0, 5]) == 0
    assert sqrt_of_product([1]) == 1
    with pytest.raises(OperatorError):
        sqrt_of_product([-1, 2])


@given(st.integers(0, 16), st.data())
@example(twice_j=3, data=None)
def test_commutation_relations_on_kets(twice_j, data):
    # [Jx, Jy] = i Jz, [Jz, J+] = J+ (Sakurai 1994, eqs. 3.1.20, 3.5.5)
    jj = Rational(twice_j, 2)
    col = 0 if data is None else data.draw(st.integers(0, twice_j))
    k = ket(jj, jj - col)
    assert expand(apply(J.x * J.y - J.y * J.x, k) - I * apply(J.z, k)) == 0
    assert expand(apply(J.z * J.plus - J.plus * J.z, k) - apply(J.plus, k)) == 0
    lhs = apply(J.x ** 2 + J.y ** 2 + J.z ** 2, k)
    assert lhs == jj * (jj + 1) * k


@given(st.integers(0, 12), st.integers(0, 12), st.integers(0, 12))
def test_hermiticity_of_matrix_elements(twice_j, r, c):
    # <a|O|b> = conjugate(<b|O^dagger|a>): common practice, no source
    jj = Rational(twice_j, 2)
    r, c = r % (twice_j + 1), c % (twice_j + 1)
    a, b = ket(jj, jj - r), ket(jj, jj - c)
    op = J.x * J.y + 2 * J.plus ** 2 * J.z
    lhs = matrix_element(a.dual(), op, b)
    rhs = matrix_element(b.dual(), adjoint(op), a).conjugate()
    assert expand(lhs - rhs) == 0


def test_large_j_exact():
    # reference: the baseline /work/shared/bench/matrix_elements_numeric.py printed
    # <1|O^4|0> = -162103765*sqrt(102)/2 at j = 50 (exact SymPy matrix products)
    op = (J.x ** 2 - J.y ** 2 + J.z * J.x) ** 4
    assert matrix_element(bra(50, 1), op, ket(50, 0)) == -162103765 * sqrt(102) / 2
    value = matrix_element(bra(200, 1), op, ket(200, 0))
    x, y, z = explicit(400)        # float cross-check, Sakurai eq. 3.5.41 matrices
    mat = np.linalg.matrix_power(x @ x - y @ y + z @ x, 4)
    assert abs(float(value) - mat[199, 200].real) < 1e-9 * abs(float(value))


def test_simplify_leaves_closed_form_valid():
    value = matrix_element(bra(j, m + 1), J.x, ket(j, m), conditions=False)
    assert simplify(value.subs({j: 3, m: 1}) - sqrt(10) / 2) == 0   # sqrt((3-1)(3+1+1))/2, Sakurai eq. 3.5.41


@pytest.mark.slow
def test_fourth_power_closed_form_large_sweep():
    # (Jx^2 - Jy^2 + Jz Jx)^4 in closed form against explicit float matrices (Sakurai 1994, eq. 3.5.41)
    # for every element up to j = 12
    op = (J.x ** 2 - J.y ** 2 + J.z * J.x) ** 4
    form = action_form(op, ("J",))
    for twice_j in range(0, 25):
        x, y, z = explicit(twice_j)
        mat = np.linalg.matrix_power(x @ x - y @ y + z @ x, 4)
        jj = Rational(twice_j, 2)
        scale = max(1.0, np.abs(mat).max())
        for col in range(twice_j + 1):
            for row in range(twice_j + 1):
                value = form.amplitude((col - row,), {"J": (jj, jj - col)})
                assert abs(complex(value) - mat[row, col]) < 1e-9 * scale


def test_routes_agree_with_symbolic_coefficients_over_two_labels():
    # the one route against the word-by-word oracle of amalgebra.testing, with scalar symbols
    a, b = symbols("a b")
    j2, m2 = Symbol("k", nonnegative=True), Symbol("q")
    for op in [a * dot(L, S) + b * S.z, (L.x * S.y - a * L.plus * S.minus ** 2) ** 2]:
        form = action_form(op, ("L", "S"))
        vals = {"L": (j, m), "S": (j2, m2)}
        oracle = walk_action(op, ("L", "S"), (j, j2), (m, m2))
        assert sorted(form.terms) == sorted(oracle) != []
        assert all(expand(form.polynomial(k, vals) - oracle[k]) == 0 for k in oracle)


_ATOMS = [J.x, J.y, J.z, J.plus, J.minus, J.squared]
_words = st.lists(st.sampled_from(range(len(_ATOMS))), min_size=1, max_size=4)
_polys = st.lists(st.tuples(st.integers(-3, 3), _words), min_size=1, max_size=4)


@given(_polys, st.integers(0, 6))
@example([(1, [0, 1, 2]), (-2, [3, 3, 4])], 3)
def test_random_polynomials_against_to_matrix(poly, twice_j):
    # independent engine: amalgebra.matrices.explicit.to_matrix (exact explicit matrices of the operator engineer)
    from sympy import Add, Mul
    op = Add(*[c * Mul(*[_ATOMS[i] for i in word]) for c, word in poly])
    if op == 0:
        return
    jj = Rational(twice_j, 2)
    mat = to_matrix(op, j={"J": jj}, kind="exact")
    basis = [ket(jj, jj - k) for k in range(twice_j + 1)]
    for col, k in enumerate(basis):
        for row, b in enumerate(basis):
            assert expand(matrix_element(b.dual(), op, k) - mat[row, col]) == 0
