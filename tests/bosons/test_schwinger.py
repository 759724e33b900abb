"""The Schwinger map: images, homomorphism, inverse on its image, kets, j-changing operators, d-matrices."""

import importlib.util
import pathlib

import numpy as np
import pytest
import scipy.linalg
from hypothesis import example, given, settings
from hypothesis import strategies as st
from sympy import I, Integer, Mul, Rational, Symbol, cos, expand, pi, series, sin, sqrt

from amalgebra.algebra import AngularMomentum, adjoint_action, canonical, commutator
from amalgebra.bosons import (BosonMode, NotInImageError, apply_bosons, apply_schwinger, boson_modes,
                              fock_ket, fock_to_spin, from_bosons, rotated_creators, schwinger_images,
                              schwinger_small_d, spin_to_fock, to_bosons, vacuum)
from amalgebra.errors import NotNumericError, OperatorError, ProjectionError, QuantumNumberError, StateError
from amalgebra.rotations.wigner import small_d
from amalgebra.states import apply, ket, product_ket

_spec = importlib.util.spec_from_file_location("boson_oracle_schwinger",
                                               pathlib.Path(__file__).with_name("boson_oracle.py"))
oracle = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(oracle)

J = AngularMomentum("J")
a, b = boson_modes("a", "b")
A, Ad, Na = a.annihilate, a.create, a.number
B, Bd, Nb = b.annihilate, b.create, b.number
j = Symbol("j", nonnegative=True)
m = Symbol("m")
COMPONENTS = [J.x, J.y, J.z, J.plus, J.minus, J.squared]


# ---------------------------------------------------------------- the map itself
def test_images_pin_the_convention():
    # design.md fixed convention (Sakurai (3.8.4)-(3.8.5), from memory): J+ = a^dagger b,
    # J- = b^dagger a, Jz = (N_a - N_b)/2, J^2 = (N/2)(N/2 + 1)
    assert to_bosons(J.plus) == Ad * B
    assert to_bosons(J.minus) == A * Bd == canonical(Bd * A)     # modes commute; labels sorted
    assert to_bosons(J.z) == Na / 2 - Nb / 2
    assert to_bosons(J.squared) == canonical((Na + Nb) / 2 * ((Na + Nb) / 2 + 1))
    assert set(schwinger_images()) == {"plus", "minus", "x", "y", "z", "squared"}


def test_other_modes_and_labels():
    c = BosonMode("c")
    L = AngularMomentum("L")
    assert to_bosons(L.plus, "L", ("c", "d")) == c.create * BosonMode("d").annihilate
    assert to_bosons(J.plus * L.z) == Ad * B * L.z
    assert to_bosons(3) == 3


@pytest.mark.parametrize("x", COMPONENTS)
@pytest.mark.parametrize("y", COMPONENTS)
def test_commutators_are_preserved(x, y):
    # Sakurai section 3.8 / Schwinger (1952): the map is a Lie-algebra homomorphism
    assert commutator(to_bosons(x), to_bosons(y)) == to_bosons(commutator(x, y))


def test_su2_relations_through_bosons():
    # Sakurai (3.1.20): [Jx, Jy] = i Jz and cyclic, checked on the boson side
    bx, by, bz = (to_bosons(c) for c in (J.x, J.y, J.z))
    assert commutator(bx, by) == canonical(I * bz) != 0
    assert commutator(by, bz) == canonical(I * bx) != 0
    assert commutator(bz, bx) == canonical(I * by) != 0
    # Sakurai (3.8.x), from memory: J^2 = (N/2)(N/2 + 1) as an operator identity
    assert to_bosons(J.x ** 2 + J.y ** 2 + J.z ** 2) == canonical((Na + Nb) / 2 * ((Na + Nb) / 2 + 1))


@pytest.mark.parametrize("na, nb", [(na, nb) for na in range(5) for nb in range(5)])
def test_casimir_on_fock_kets(na, nb):
    # Sakurai section 3.8: J^2 |n_a n_b> = (N/2)(N/2 + 1) |n_a n_b>, N = n_a + n_b
    total = Rational(na + nb, 2)
    casimir = to_bosons(J.x ** 2 + J.y ** 2 + J.z ** 2)
    assert apply_bosons(casimir, fock_ket(na, nb)) == total * (total + 1) * fock_ket(na, nb)
    assert apply_bosons(to_bosons(J.z), fock_ket(na, nb)) == Rational(na - nb, 2) * fock_ket(na, nb)


LETTERS = COMPONENTS
word = st.lists(st.sampled_from(range(len(LETTERS))), min_size=1, max_size=3)
poly = st.lists(st.tuples(st.integers(-2, 2), word), min_size=1, max_size=3)


def _build(terms):
    return sum((Integer(c) * Mul(*[LETTERS[i] for i in w]) for c, w in terms), Integer(0))


@given(poly)
@example([(1, [5, 5]), (2, [0, 1, 2])])
def test_round_trip(terms):
    # injectivity of the map (Sakurai 3.8): from_bosons inverts to_bosons on its image
    expr = _build(terms)
    assert from_bosons(to_bosons(expr)) == canonical(expr)


@given(poly, poly)
def test_homomorphism(t1, t2):
    # common practice, no source: an algebra map sends products to products
    x, y = _build(t1), _build(t2)
    assert to_bosons(x * y) == canonical(to_bosons(x) * to_bosons(y))


@given(poly, st.sampled_from([(0, 0), ("1/2", "-1/2"), (1, 1), (1, 0), ("3/2", "1/2"), (2, -1)]))
def test_matrix_elements_match_states_engine(terms, jm):
    # independent engine: amalgebra.states.apply (Condon-Shortley, Edmonds (2.2.8)-(2.2.9))
    expr = _build(terms)
    state = ket(*jm)
    assert expand(apply_schwinger(expr, state) - apply(expr, state)) == 0


# ---------------------------------------------------------------- inverse map, image and its errors
@pytest.mark.parametrize("expr, expected", [
    (Ad * B, J.plus),
    (Bd * A, J.minus),
    (Ad ** 2 * B ** 2, J.plus ** 2),
    (Na - Nb, 2 * J.z),
    (Na * Nb + (Na + Nb) / 2, J.squared - J.z ** 2),      # N_a N_b = j^2 - Jz^2, plus j
    (Integer(7), Integer(7)),
])
def test_from_bosons_table(expr, expected):
    # derived by hand from the design.md convention (n_a = j + m, n_b = j - m)
    assert from_bosons(expr) == canonical(expected)


@pytest.mark.parametrize("expr, pattern", [
    (A, r"expr term a.annihilate changes N_a \+ N_b by -1"),
    (Ad * Bd, r"changes N_a \+ N_b by 2"),
    (Ad * B + Bd, r"term b.create changes"),
    (Na, r"term a.number depends on j"),
    (Na + Nb, r"depends on j = \(N_a \+ N_b\)/2 other than through J\^2"),
    (Na * Nb, r"depends on j"),
])
def test_not_in_image(expr, pattern):
    with pytest.raises(NotInImageError, match=pattern):
        from_bosons(expr)


def test_restriction_to_one_irrep():
    # derived by hand: on the irrep of j, N_a = j + Jz, N_b = j - Jz (design.md convention)
    assert from_bosons(Na, j=j) == j + J.z
    assert from_bosons(Na + Nb, j=j) == 2 * j
    assert from_bosons(Ad * B * Nb, j=j) == canonical(J.plus * (j - J.z))
    with pytest.raises(NotNumericError):
        from_bosons(Na, j=J.z)
    with pytest.raises(NotNumericError):
        from_bosons(Na, j="j")


def test_inverse_keeps_other_operators():
    c, L = BosonMode("c"), AngularMomentum("L")
    assert from_bosons(Ad * B * c.number * L.plus) == canonical(J.plus * c.number * L.plus)


@pytest.mark.parametrize("thunk", [
    lambda: to_bosons(J.plus, "J", ("a", "a")),
    lambda: to_bosons(J.plus, "a", ("a", "b")),
    lambda: to_bosons(J.plus, "J", "ab"),
    lambda: to_bosons(J.plus, "J", ("a", "b", "c")),
    lambda: to_bosons([J.plus]),
    lambda: from_bosons(Ad * B * J.z),                       # label already used
    lambda: from_bosons(AngularMomentum("a").z),             # a mode label naming an angular momentum
])
def test_bad_map_input(thunk):
    with pytest.raises(OperatorError):
        thunk()


# ---------------------------------------------------------------- kets
def test_kets_map_both_ways():
    # design.md: |j m> <-> |n_a = j + m, n_b = j - m>
    assert spin_to_fock(ket("3/2", "-1/2")) == fock_ket(1, 2)
    assert spin_to_fock(ket(j, m)) == fock_ket(j + m, j - m)
    assert fock_to_spin(fock_ket(0, 3)) == ket("3/2", "-3/2")
    assert fock_to_spin(fock_ket(j + m, j - m)) == ket(j, m)
    psi = ket(1, 1) - 2 * ket(0, 0)
    assert fock_to_spin(spin_to_fock(psi)) == psi


@pytest.mark.parametrize("tj", range(0, 7))
def test_kets_from_vacuum(tj):
    # Sakurai (3.8.13), from memory: |j m> = a^dagger^(j+m) b^dagger^(j-m) / sqrt((j+m)!(j-m)!) |0>
    from math import factorial

    for tm in range(-tj, tj + 1, 2):
        p, q = (tj + tm) // 2, (tj - tm) // 2
        state = apply_bosons(Ad ** p * Bd ** q, vacuum()) / sqrt(factorial(p) * factorial(q))
        assert fock_to_spin(state) == ket(Rational(tj, 2), Rational(tm, 2))


@pytest.mark.parametrize("state, error", [
    (product_ket(ket(1, 0, "J"), ket(0, 0, "L")), StateError),
    (ket(1, 0, "L"), StateError),
    (J.plus, StateError),
])
def test_bad_spin_states(state, error):
    with pytest.raises(error):
        spin_to_fock(state)


def test_bad_fock_states():
    with pytest.raises(StateError):
        fock_to_spin(fock_ket(1, 0, modes=("a", "c")))


# ---------------------------------------------------------------- operators that change j
@pytest.mark.parametrize("op, expected", [
    # derived by hand from a|n> = sqrt(n)|n-1> (Sakurai (2.3.16)) with n_a = j + m, n_b = j - m;
    # cf. Schwinger (1952): a^dagger, b^dagger are spinor creators raising j by 1/2
    (Ad, sqrt(j + m + 1) * ket(j + Rational(1, 2), m + Rational(1, 2))),
    (Bd, sqrt(j - m + 1) * ket(j + Rational(1, 2), m - Rational(1, 2))),
    (A, sqrt(j + m) * ket(j - Rational(1, 2), m - Rational(1, 2))),
    (B, sqrt(j - m) * ket(j - Rational(1, 2), m + Rational(1, 2))),
    (Ad * Bd, sqrt(j + m + 1) * sqrt(j - m + 1) * ket(j + 1, m)),
    (Ad ** 2, sqrt(j + m + 1) * sqrt(j + m + 2) * ket(j + 1, m + 1)),
    (Bd ** 2, sqrt(j - m + 1) * sqrt(j - m + 2) * ket(j + 1, m - 1)),
    (A * B, sqrt(j + m) * sqrt(j - m) * ket(j - 1, m)),
    (A ** 2, sqrt(j + m) * sqrt(j + m - 1) * ket(j - 1, m - 1)),
])
def test_j_changing_operators(op, expected):
    assert expand(apply_schwinger(op, ket(j, m)) - expected) == 0
    assert apply_schwinger(op, ket(j, m)) != 0


@pytest.mark.parametrize("op, state, expected", [
    # numeric cases of the table above (same source)
    (Ad, ket(0, 0), ket(Rational(1, 2), Rational(1, 2))),
    (Ad * Bd, ket(1, 0), 2 * ket(2, 0)),
    (A, ket(1, -1), 0),                                 # n_a = 0: annihilated
    (A * B, ket(Rational(1, 2), Rational(1, 2)), 0),
    (B ** 2, ket(2, 0), sqrt(2) * ket(1, 1)),
])
def test_j_changing_numeric(op, state, expected):
    assert apply_schwinger(op, state) == expected


# ---------------------------------------------------------------- rotations in the boson picture
def test_rotated_creators_match_hadamard_series():
    # Sakurai (2.3.47) (Baker-Hausdorff): e^X Y e^-X = sum ad_X^n Y / n!, with X = -i beta Jy;
    # the series of cos(beta/2) a^dagger + sin(beta/2) b^dagger to order 5
    beta = Symbol("beta")
    jy = to_bosons(J.y)
    up, down = rotated_creators(beta)
    for creator, target in ((Ad, up), (Bd, down)):
        lhs = adjoint_action(-I * beta * jy, creator, 5)
        rhs = canonical(series(target, beta, 0, 6).removeO())
        assert expand(lhs - rhs) == 0


def _tj_values():
    return [(tj, tmp, tm) for tj in range(0, 7) for tmp in range(-tj, tj + 1, 2) for tm in range(-tj, tj + 1, 2)]


@pytest.mark.parametrize("tj, tmp, tm", _tj_values())
def test_d_matrix_equals_wigner_formula(tj, tmp, tm):
    # Wigner's formula, Edmonds (4.1.15), as implemented by amalgebra.rotations.wigner.small_d
    beta = Symbol("beta")
    args = (Rational(tj, 2), Rational(tmp, 2), Rational(tm, 2))
    assert expand(schwinger_small_d(*args, beta) - small_d(*args, beta)) == 0


def _spin_jy(tj):
    """Jy for spin j = tj/2 from the Condon-Shortley ladder elements (Sakurai (3.5.41)); rows m = j..-j."""
    ms = [Rational(tj - 2 * k, 2) for k in range(tj + 1)]
    jv = Rational(tj, 2)
    plus = np.zeros((tj + 1, tj + 1))
    for col, mv in enumerate(ms[1:], start=1):
        plus[col - 1, col] = float(sqrt((jv - mv) * (jv + mv + 1)))
    return (plus - plus.T) / 2j


@pytest.mark.parametrize("tj", range(0, 7))
@pytest.mark.parametrize("beta", [0.3, 1.7, 2.9, -0.8])
def test_d_matrix_equals_expm(tj, beta):
    # scipy.linalg.expm twice: (1) spin-j matrices of Jy, (2) truncated two-mode Fock matrices of
    # Jy = (a^dagger b - b^dagger a)/(2i) built by the independent oracle (exact on N = 2j <= 6 at dim 7)
    spin = scipy.linalg.expm(-1j * beta * _spin_jy(tj))
    dim = 7
    jy_fock = oracle.fock_matrix((Ad * B - Bd * A) / (2 * I), ["a", "b"], dim)
    fock = scipy.linalg.expm(-1j * beta * jy_fock)
    for row, tmp in enumerate(range(tj, -tj - 1, -2)):
        for col, tm in enumerate(range(tj, -tj - 1, -2)):
            value = complex(schwinger_small_d(Rational(tj, 2), Rational(tmp, 2), Rational(tm, 2), beta))
            r = oracle.basis_index(((tj + tmp) // 2, (tj - tmp) // 2), dim)
            c = oracle.basis_index(((tj + tm) // 2, (tj - tm) // 2), dim)
            assert abs(value - spin[row, col]) < 1e-12
            assert abs(value - fock[r, c]) < 1e-12


@pytest.mark.parametrize("args, error", [
    ((Symbol("j"), 0, 0), NotNumericError),
    ((1, "1/2", 0), ProjectionError),
    ((-1, 0, 0), QuantumNumberError),
    ((1, 0, 0, [1]), NotNumericError),
])
def test_d_matrix_bad_input(args, error):
    if len(args) == 3:
        args = args + (Symbol("beta"),)
    with pytest.raises(error):
        schwinger_small_d(*args)


def test_d_matrix_out_of_range_and_special_values():
    # Edmonds (4.1.15): |m| > j gives zero; d^1_{00}(pi/2) = cos(pi/2) = 0 (Edmonds table 2)
    assert schwinger_small_d(1, 2, 0, Symbol("beta")) == 0
    assert schwinger_small_d(1, 0, 0, pi / 2) == 0
    assert expand(schwinger_small_d(1, 0, 0, Symbol("beta")) - (cos(Symbol("beta") / 2) ** 2
                                                                - sin(Symbol("beta") / 2) ** 2)) == 0


@pytest.mark.parametrize("tj", range(0, 7))
def test_d_matrix_whole(tj):
    # Wigner's formula, Edmonds (4.1.15), via amalgebra.rotations.wigner.small_d_matrix (same row/column order)
    from amalgebra.bosons import schwinger_small_d_matrix
    from amalgebra.rotations.wigner import small_d_matrix

    beta = Symbol("beta")
    diff = schwinger_small_d_matrix(Rational(tj, 2), beta) - small_d_matrix(Rational(tj, 2), beta)
    assert diff.applyfunc(expand).is_zero_matrix


@pytest.mark.parametrize("expr", [
    Symbol("x") * J.plus * J.z + sqrt(2) * J.x,
    (1 + I) * J.y ** 2 * J.squared,
    J.x / Symbol("x"),
    J.squared ** 3 - J.z ** 4,
])
def test_round_trip_coefficient_domains(expr):
    # injectivity of the map (Sakurai 3.8); symbols, algebraic and Gaussian coefficients
    assert from_bosons(to_bosons(expr)) == canonical(expr)


def test_irrep_restriction_numeric_j():
    # derived by hand: N_a N_b = (j + Jz)(j - Jz) = j^2 - Jz^2 at j = 3/2
    assert from_bosons(Na * Nb, j=Rational(3, 2)) == Rational(9, 4) - J.z ** 2


def test_public_names():
    import amalgebra.bosons as pkg

    for name in pkg.__all__:
        assert hasattr(pkg, name), name
    assert issubclass(NotInImageError, ValueError)


def test_output_is_hash_seed_independent():
    # determinism rule of the project: printed results must not depend on PYTHONHASHSEED
    import os
    import subprocess
    import sys

    code = ("from amalgebra.algebra import AngularMomentum\n"
            "from amalgebra.bosons import to_bosons, from_bosons, apply_schwinger, boson_modes\n"
            "from amalgebra.states import ket\n"
            "J = AngularMomentum('J'); a, b = boson_modes('a', 'b')\n"
            "e = to_bosons((J.x + J.y + J.z)**3)\n"
            "print(e); print(from_bosons(e)); print(apply_schwinger(a.create + b.create*J.plus, ket(1, 0)))\n")
    outputs = set()
    for seed in ("0", "12345"):
        env = dict(os.environ, PYTHONHASHSEED=seed)
        outputs.add(subprocess.run([sys.executable, "-c", code], env=env, capture_output=True, text=True,
                                   check=True).stdout)
    assert len(outputs) == 1


@pytest.mark.slow
@pytest.mark.parametrize("tj", range(7, 13))
def test_d_matrix_large_j(tj):
    # Wigner's formula, Edmonds (4.1.15) (amalgebra.rotations.wigner.small_d_matrix) and scipy.linalg.expm of
    # the spin-j Jy matrix (Sakurai (3.5.41)), for j = 7/2 .. 6
    from amalgebra.bosons import schwinger_small_d_matrix
    from amalgebra.rotations.wigner import small_d_matrix

    beta = Symbol("beta")
    exact = schwinger_small_d_matrix(Rational(tj, 2), beta)
    assert (exact - small_d_matrix(Rational(tj, 2), beta)).applyfunc(expand).is_zero_matrix
    numeric = np.array(exact.subs(beta, 1.1).evalf(), dtype=complex)
    assert np.allclose(numeric, scipy.linalg.expm(-1.1j * _spin_jy(tj)), atol=1e-12)


@pytest.mark.parametrize("op, expected", [
    # derived by hand from the design.md convention: d_a, d_b changes of n_a, n_b give
    # (dj, dm) = ((d_a + d_b)/2, (d_a - d_b)/2)
    (Ad, [(Rational(1, 2), Rational(1, 2))]),
    (B, [(Rational(-1, 2), Rational(1, 2))]),
    (Ad * Bd, [(1, 0)]),
    (A ** 2 + Bd ** 2, [(-1, -1), (1, -1)]),
    (to_bosons(J.x), [(0, -1), (0, 1)]),
    (Na * Nb, [(0, 0)]),
])
def test_schwinger_shifts(op, expected):
    from amalgebra.bosons import schwinger_shifts

    assert schwinger_shifts(op) == expected


@pytest.mark.parametrize("tj, tm", [(tj, tm) for tj in range(0, 5) for tm in range(-tj, tj + 1, 2)])
@pytest.mark.parametrize("op", [Ad, Bd, A, B, Ad * Bd, A * B, Ad ** 2])
def test_shifts_agree_with_action(tj, tm, op):
    # consistency of schwinger_shifts with apply_schwinger (each result ket moved by the stated shift)
    from amalgebra.bosons import schwinger_shifts

    ((dj, dm),) = schwinger_shifts(op)
    jv, mv = Rational(tj, 2), Rational(tm, 2)
    result = apply_schwinger(op, ket(jv, mv))
    from amalgebra.states.kets import components

    for basis in components(result):
        assert (basis.j - jv, basis.m - mv) == (dj, dm)
