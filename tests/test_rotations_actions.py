"""Tests of amalgebra.rotations.actions: rotating kets and angular-momentum operators."""

import math

import numpy as np
import pytest
import scipy.linalg
from sympy import I, Add, Float, Mul, Poly, Pow, Rational, Symbol, cos, expand, pi, sin, symbols

from amalgebra.algebra import AngularMomentum, AngularMomentumComponent
from amalgebra.errors import NotNumericError, OperatorError
from amalgebra.rotations.actions import rotate_ket, rotate_operator, rotated_components
from amalgebra.states import Ket, components, ket, product_ket

BETA = Symbol("beta", real=True)
ALPHA, GAMMA = symbols("alpha gamma", real=True)


def spin_matrices(j):
    """Jx, Jy, Jz, J+, J-, J^2 with numpy, basis m = j..-j, Condon-Shortley phase (built here)."""
    ms = np.arange(j, -j - 1, -1)
    dim = len(ms)
    jz = np.diag(ms).astype(complex)
    jp = np.zeros((dim, dim), dtype=complex)
    for col in range(1, dim):
        jp[col - 1, col] = math.sqrt((j - ms[col]) * (j + ms[col] + 1))
    jm = jp.conj().T
    jx, jy = (jp + jm) / 2, (jp - jm) / 2j
    return {"x": jx, "y": jy, "z": jz, "plus": jp, "minus": jm, "squared": j * (j + 1) * np.eye(dim)}


def expm_D(j, a, b, c):
    m = spin_matrices(j)
    expm = scipy.linalg.expm
    return expm(-1j * a * m["z"]) @ expm(-1j * b * m["y"]) @ expm(-1j * c * m["z"])


def evaluate(expr, mats):
    """numpy matrix of an operator polynomial, ``mats[(label, component)]`` given (independent walker)."""
    if isinstance(expr, AngularMomentumComponent):
        return mats[expr.label, expr.component]
    if isinstance(expr, Add):
        return sum(evaluate(arg, mats) for arg in expr.args)
    if isinstance(expr, Mul):
        c, nc = expr.args_cnc()
        out = complex(Mul(*c).evalf(25)) * np.eye(next(iter(mats.values())).shape[0])
        for factor in nc:
            out = out @ evaluate(factor, mats)
        return out
    if isinstance(expr, Pow) and not expr.is_commutative:
        return np.linalg.matrix_power(evaluate(expr.base, mats), int(expr.exp))
    return complex(expr.evalf(25)) * np.eye(next(iter(mats.values())).shape[0])


def one_label(label, j):
    return {(label, name): m for name, m in spin_matrices(j).items()}


def two_labels(j1, j2):
    m1, m2 = spin_matrices(j1), spin_matrices(j2)
    e1, e2 = np.eye(m1["z"].shape[0]), np.eye(m2["z"].shape[0])
    mats = {("L", n): np.kron(m, e2) for n, m in m1.items()}
    mats.update({("S", n): np.kron(e1, m) for n, m in m2.items()})
    return mats


def column(state, j, label="J"):
    comps = components(state)
    ms = [Rational(j) - k for k in range(int(2 * Rational(j)) + 1)]
    return np.array([complex(comps.get(Ket(j, m, label), 0).evalf(25)) for m in ms])


ANGLES = [(0.3, 1.1, -2.0), (2.5, 2.9, 0.7), (-1.2, 0.4, 3.1)]


@pytest.mark.parametrize("j", ["1/2", 1, "3/2", 2])
def test_rotate_ket_matches_expm(j):
    for a, b, c in ANGLES:
        D = expm_D(float(Rational(j)), a, b, c)  # independent: scipy.linalg.expm
        for index, m in enumerate([Rational(j) - k for k in range(int(2 * Rational(j)) + 1)]):
            rotated = rotate_ket(ket(j, m), Float(a, 30), Float(b, 30), Float(c, 30))
            assert np.allclose(column(rotated, j), D[:, index], atol=1e-12)


def test_rotate_ket_linear_and_unevaluated():
    state = 2 * ket(1, 1) - Symbol("z") * ket(1, -1)
    direct = rotate_ket(state, ALPHA, BETA, GAMMA)
    lazy = rotate_ket(state, ALPHA, BETA, GAMMA, evaluate=False)
    assert expand(lazy.doit() - direct) == 0
    assert expand(direct - 2 * rotate_ket(ket(1, 1), ALPHA, BETA, GAMMA)
                  + Symbol("z") * rotate_ket(ket(1, -1), ALPHA, BETA, GAMMA)) == 0


def test_rotate_product_ket_and_labels():
    a, b, c = ANGLES[1]
    state = product_ket(ket(1, 0, "L"), ket("1/2", "1/2", "S"))
    rotated = rotate_ket(state, Float(a, 30), Float(b, 30), Float(c, 30))
    # independent: Kronecker product of the two scipy rotation matrices
    target = np.kron(expm_D(1.0, a, b, c)[:, 1], expm_D(0.5, a, b, c)[:, 0])
    comps = components(rotated)
    got = np.array([complex(comps.get(product_ket(ket(1, ml, "L"), ket("1/2", ms, "S")), 0).evalf(25))
                    for ml in (1, 0, -1) for ms in (Rational(1, 2), Rational(-1, 2))])
    assert np.allclose(got, target, atol=1e-12)
    only_l = rotate_ket(state, ALPHA, BETA, GAMMA, labels=["L"])
    assert all(k.args[1] == ket("1/2", "1/2", "S") for k in components(only_l))
    assert rotate_ket(state, ALPHA, BETA, GAMMA, labels="X") == state


def test_rotated_coupled_state_mixes_only_M():
    from amalgebra.states import coupled_ket
    a, b, c = ANGLES[0]
    angles = (Float(a, 30), Float(b, 30), Float(c, 30))
    rotated = rotate_ket(coupled_ket(1, "1/2", "3/2", "1/2", labels=("L", "S")), *angles)
    # Edmonds 1957, sec. 4.3: R|J M> = sum_M' D^J_{M'M}|J M'>, written out in the uncoupled basis
    D = expm_D(1.5, a, b, c)
    expected = Add(*[(Float(D[k, 1].real, 30) + I * Float(D[k, 1].imag, 30))
                     * coupled_ket(1, "1/2", "3/2", Rational(3, 2) - k, labels=("L", "S")) for k in range(4)])
    got, want = components(rotated), components(expected)
    assert set(got) == set(want)
    for basis in got:
        assert abs(complex((got[basis] - want[basis]).evalf(25))) < 1e-12


@pytest.mark.parametrize("j", [1, "3/2"])
def test_rotate_operator_matches_matrices(j):
    J = AngularMomentum("J")
    mats = one_label("J", float(Rational(j)))
    exprs = [J.x, J.y, J.z, J.plus, J.minus, J.squared, J.x * J.y - J.z ** 2 + 3 * J.plus * J.z]
    for a, b, c in ANGLES:
        D = expm_D(float(Rational(j)), a, b, c)
        for expr in exprs:
            rotated = rotate_operator(expr, Float(a, 30), Float(b, 30), Float(c, 30))
            # independent: D O D^dagger with scipy/numpy matrices
            assert np.allclose(evaluate(rotated, mats), D @ evaluate(expr, mats) @ D.conj().T, atol=1e-11)


def test_rotate_operator_two_labels_and_selection():
    L, S = AngularMomentum("L"), AngularMomentum("S")
    mats = two_labels(1.0, 0.5)
    a, b, c = ANGLES[2]
    DL, DS = expm_D(1.0, a, b, c), expm_D(0.5, a, b, c)
    expr = L.z * S.x + L.plus * S.minus
    both = rotate_operator(expr, Float(a, 30), Float(b, 30), Float(c, 30))
    D = np.kron(DL, DS)
    assert np.allclose(evaluate(both, mats), D @ evaluate(expr, mats) @ D.conj().T, atol=1e-11)
    only_s = rotate_operator(expr, Float(a, 30), Float(b, 30), Float(c, 30), labels="S")
    D = np.kron(np.eye(3), DS)
    assert np.allclose(evaluate(only_s, mats), D @ evaluate(expr, mats) @ D.conj().T, atol=1e-11)


def test_rotate_operator_symbolic_about_y():
    J = AngularMomentum("J")
    rotated = rotate_operator(J.z, 0, BETA, 0)
    # Sakurai 3.1: R_y(beta) Jz R_y(beta)^-1 = Jz cos(beta) + Jx sin(beta), Jx = (J+ + J-)/2
    expected = expand(J.z * cos(BETA) + sin(BETA) * (J.plus + J.minus) / 2)
    diff = expand(rotated - expected)
    c, s = symbols("c s")
    for component in (J.plus, J.minus, J.z):
        coeff = diff.coeff(component).xreplace({cos(BETA / 2): c, sin(BETA / 2): s,
                                                cos(BETA): c ** 2 - s ** 2, sin(BETA): 2 * c * s})
        _, rem = Poly(expand(coeff), s, c).div(Poly(s ** 2 + c ** 2 - 1, s, c))
        assert rem.is_zero
    assert rotate_operator(J.squared, ALPHA, BETA, GAMMA) == J.squared
    assert rotate_operator(J.z, ALPHA, 0, GAMMA) == J.z


def test_rotate_operator_normal_order_exact():
    J = AngularMomentum("J")
    angles = (pi / 3, pi / 4, Rational(1, 2))
    # Sakurai (3.1.20): J^2 commutes with every rotation
    assert rotate_operator(J.x ** 2 + J.y ** 2 + J.z ** 2, *angles, normal_order=True) == J.squared
    # Sakurai (3.1.20): [Jx, Jy] = i Jz, and R(0, pi/2, 0) Jz R^-1 = Jx = (J+ + J-)/2
    rotated = rotate_operator(J.x * J.y - J.y * J.x, 0, pi / 2, 0, normal_order=True)
    assert rotated == expand(I * (J.plus + J.minus) / 2)


def test_rotated_components_keys():
    L = AngularMomentum("L")
    comps = rotated_components("L", ALPHA, BETA, GAMMA)
    assert sorted(str(k) for k in comps) == ["L.minus", "L.plus", "L.squared", "L.x", "L.y", "L.z"]
    lazy = rotated_components("L", ALPHA, BETA, GAMMA, evaluate=False)
    assert expand(lazy[L.z].doit() - comps[L.z]) == 0 != comps[L.z]


def test_errors():
    with pytest.raises(NotNumericError):
        rotate_ket(ket(Symbol("j"), 0), ALPHA, BETA, GAMMA)
    with pytest.raises(OperatorError):
        rotate_ket(ket(1, 0), ALPHA, BETA, GAMMA, labels=[1])
    with pytest.raises(TypeError):
        rotate_operator(AngularMomentum("J").z, "a", BETA, GAMMA)
    assert rotate_ket(ket(1, 0), 0, pi, 0) == -ket(1, 0)  # d^1_{00}(pi) = cos(pi) = -1, PDG table
