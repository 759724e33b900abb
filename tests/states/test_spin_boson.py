"""Spin-boson states and truncated Fock spaces through the one engine (issue 11).

Every route (``apply``, ``matrix_element``, ``expectation``, ``inner``, ``to_matrix`` exact and float,
``hamiltonian_matrix``) is checked against matrices built here with numpy alone: spin matrices from the
Condon-Shortley formulas, ``a`` as ``sqrt(n)`` on the first off-diagonal of a larger Fock space, products
taken there and only then cut to the kept occupations (so the reference is ``P O P`` by construction).
"""

import itertools
import pickle

import numpy as np
import pytest
from sympy import I, Matrix, Rational, S, Symbol, adjoint, latex, sqrt, symbols

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.bosons import BosonMode, apply_bosons, fock_bra, fock_inner, fock_ket
from amalgebra.errors import OperatorError, QuantumNumberError, StateError
from amalgebra.matrices.explicit import to_matrix, verify_identity
from amalgebra.states import apply, bra, coupled_ket, expectation, inner, ket, matrix_element, product_ket
from amalgebra.states.hamiltonian import hamiltonian_matrix
from amalgebra.tensors import racah_tensor

J, L, Sp = AngularMomentum("J"), AngularMomentum("L"), AngularMomentum("S")
a, b = BosonMode("a"), BosonMode("b")
EXTRA = 6          # the oracle's Fock space reaches this far past the cutoff before it is cut


# ----------------------------------------------------------------------------------------- numpy oracle
# common practice, no source: J_z = diag(m), J_+|j m> = sqrt((j - m)(j + m + 1))|j m+1>, m = j .. -j;
# a|n> = sqrt(n)|n-1>, n = 0 .. nmax (Sakurai, Modern Quantum Mechanics, eqs. (2.3.16)-(2.3.17))

def spin(j):
    j = float(j)
    ms = np.array([j - k for k in range(int(2 * j) + 1)], dtype=float)
    plus = np.zeros((len(ms), len(ms)))
    for c in range(1, len(ms)):
        m = ms[c]
        plus[c - 1, c] = np.sqrt((j - m) * (j + m + 1))
    minus = plus.T
    return {"z": np.diag(ms), "+": plus, "-": minus, "x": (plus + minus) / 2, "y": (plus - minus) / 2j,
            "1": np.eye(len(ms))}


def boson(nmax):
    low = np.diag(np.sqrt(np.arange(1, nmax + 1, dtype=float)), 1)
    return {"a": low, "ad": low.T, "n": low.T @ low, "1": np.eye(nmax + 1)}


def cos_theta(ls):
    # from memory: <l+1 m|cos theta|l m> = sqrt(((l+1)^2 - m^2) / ((2l+1)(2l+3))), Hermitian, no diagonal
    # (C^1_0 = cos theta); the basis is the direct sum of the l in ``ls``, m descending in each
    states = [(l, l - k) for l in ls for k in range(2 * l + 1)]
    out = np.zeros((len(states), len(states)))
    for (r, (lp, mp)), (c, (l, m)) in itertools.product(enumerate(states), repeat=2):
        if mp == m and lp == l + 1:
            out[r, c] = out[c, r] = np.sqrt(((l + 1) ** 2 - m ** 2) / ((2 * l + 1) * (2 * l + 3)))
    return out


def cut(matrix, dims_big, dims_kept):
    """Rows/columns of the big Kronecker space whose every factor index is inside ``dims_kept``."""
    keep = [i for i, idx in enumerate(itertools.product(*[range(d) for d in dims_big]))
            if all(x < k for x, k in zip(idx, dims_kept))]
    return matrix[np.ix_(keep, keep)]


def kron(*ms):
    out = np.eye(1)
    for m in ms:
        out = np.kron(out, m)
    return out


def jc_oracle(j, nmax, w, w0, g):
    """Tavis-Cummings H = w N + w0 J_z + g (J_+ a + J_- a^dagger) on J = j, n <= nmax, cut after building."""
    sj, bb = spin(j), boson(nmax + EXTRA)
    big = (w * kron(sj["1"], bb["n"]) + w0 * kron(sj["z"], bb["1"])
           + g * (kron(sj["+"], bb["a"]) + kron(sj["-"], bb["ad"])))
    return cut(big, (int(2 * j) + 1, nmax + EXTRA + 1), (int(2 * j) + 1, nmax + 1))


CASES = [
    # (name, operator, space, oracle built from (spin dict, boson dict) on the big space)
    ("number times Jz", a.number * J.z, {"J": 1, "a": 3},
     lambda s, f: kron(s["z"], f["n"])),
    ("a a^dagger (cut at the top: P a a^dagger P, not P a P a^dagger P)", a.annihilate * a.create,
     {"J": "1/2", "a": 2}, lambda s, f: kron(s["1"], f["a"] @ f["ad"])),
    ("(J+ a + J- a^dagger)^2", (J.plus * a.annihilate + J.minus * a.create) ** 2, {"J": "3/2", "a": 3},
     lambda s, f: np.linalg.matrix_power(kron(s["+"], f["a"]) + kron(s["-"], f["ad"]), 2)),
    ("Jx a^dagger a + a^2 + i Jy", J.x * a.create * a.annihilate + a.annihilate ** 2 + I * J.y,
     {"J": 1, "a": 4}, lambda s, f: kron(s["x"], f["ad"] @ f["a"]) + kron(s["1"], f["a"] @ f["a"])
     + 1j * kron(s["y"], f["1"])),
    ("quadrature squared, (a + a^dagger)^2 Jz", (a.annihilate + a.create) ** 2 * J.z, {"J": "1/2", "a": 3},
     lambda s, f: kron(s["z"], np.linalg.matrix_power(f["a"] + f["ad"], 2))),
]


@pytest.mark.parametrize("name, op, space, oracle", CASES, ids=[c[0] for c in CASES])
def test_to_matrix_matches_the_numpy_oracle(name, op, space, oracle):
    j = Rational(space["J"])
    nmax = space["a"]
    big = oracle(spin(j), boson(nmax + EXTRA))
    expected = cut(big, (int(2 * j) + 1, nmax + EXTRA + 1), (int(2 * j) + 1, nmax + 1))
    exact = to_matrix(op, space)
    assert np.allclose(np.array(exact.evalf(), dtype=complex), expected, atol=1e-12)
    assert np.allclose(to_matrix(op, space, kind="float"), expected, atol=1e-12)
    assert np.allclose(to_matrix(op, space, kind="sparse").toarray(), expected, atol=1e-12)
    assert np.abs(expected).max() > 0


def test_tensor_component_times_quadrature_matches_the_oracle():
    # C^1_0 (a + a^dagger): a Stark-type coupling to one field mode, on l = 0 + 1 and n <= 2
    C1 = racah_tensor(1)
    f = boson(2 + EXTRA)
    big = np.kron(cos_theta([0, 1]), f["a"] + f["ad"])
    expected = cut(big, (4, 2 + EXTRA + 1), (4, 3))
    got = to_matrix(C1[0] * (a.annihilate + a.create), {"L": [0, 1], "a": 2}, kind="float")
    assert np.allclose(got, expected, atol=1e-12) and np.abs(expected).max() > 0


def test_apply_and_matrix_element_match_the_oracle_columns():
    # every basis state well inside the cutoff: apply is not truncated, so its image is the oracle column
    w, w0, g = Rational(3), Rational(1, 2), Rational(2, 7)
    H = w * a.number + w0 * J.z + g * (J.plus * a.annihilate + J.minus * a.create)
    nmax = 4
    expected = jc_oracle(1, nmax, 3.0, 0.5, 2 / 7)
    basis = [ket(1, m, "J") * fock_ket(n, modes="a") for m in (1, 0, -1) for n in range(nmax + 1)]
    for c, state in enumerate(basis):
        image = apply(H, state)
        for r, target in enumerate(basis):
            value = matrix_element(adjoint(target), H, state)
            assert abs(complex(value) - expected[r, c]) < 1e-12
            assert abs(complex(inner(adjoint(target), image)) - expected[r, c]) < 1e-12


def test_symbolic_quantum_numbers_agree_at_numeric_points():
    j, m = Symbol("j", nonnegative=True), Symbol("m")
    n = Symbol("n", integer=True, nonnegative=True)
    op = J.plus * a.annihilate ** 2 + J.z * a.number
    generic = matrix_element(bra(j, m + 1) * fock_bra(n - 2, modes="a"), op, ket(j, m) * fock_ket(n, modes="a"),
                             conditions=False)
    diagonal = matrix_element(bra(j, m) * fock_bra(n, modes="a"), op, ket(j, m) * fock_ket(n, modes="a"),
                              conditions=False)
    for jv, mv, nv in [(1, 0, 2), (Rational(3, 2), Rational(-1, 2), 5), (2, -2, 3)]:
        point = {j: jv, m: mv, n: nv}
        numeric = matrix_element(bra(jv, mv + 1) * fock_bra(nv - 2, modes="a"), op,
                                 ket(jv, mv) * fock_ket(nv, modes="a"))
        # from the oracle formulas above: sqrt((j-m)(j+m+1)) sqrt(n(n-1)) and m n
        assert numeric == sqrt((jv - mv) * (jv + mv + 1)) * sqrt(nv * (nv - 1)) != 0
        assert generic.subs(point) == numeric
        assert diagonal.subs(point) == mv * nv


def test_jaynes_cummings_blocks_and_dressed_energies():
    # from memory: Jaynes-Cummings dressed states, E_n,+- = w (n + 1/2) +- sqrt(D^2 + 4 g^2 (n + 1)) / 2 with
    # D = w0 - w for H = w N + w0 S_z + g (S_+ a + S_- a^dagger), spin 1/2; the excitation number M + N is
    # conserved (Jaynes and Cummings, Proc. IEEE 51, 89 (1963))
    w, w0, g = symbols("omega omega_0 g", positive=True)
    H = w * a.number + w0 * Sp.z + g * (Sp.plus * a.annihilate + Sp.minus * a.create)
    hm = hamiltonian_matrix(H, {"S": "1/2", "a": 3})
    assert hm.conserved == ("M+N",)
    sizes = [(blk.quantum_numbers["M+N"], blk.size) for blk in hm.blocks]
    assert sizes == [(Rational(7, 2), 1), (Rational(5, 2), 2), (Rational(3, 2), 2), (Rational(1, 2), 2),
                     (Rational(-1, 2), 1)]
    for blk, values in hm.eigenvalues():
        assert values.complete
        if blk.size != 2:
            continue
        nq = blk.quantum_numbers["M+N"] - Rational(1, 2)           # the doublet |up, n>, |down, n+1>
        root = sqrt((w0 - w) ** 2 + 4 * g ** 2 * (nq + 1))
        for sign in (1, -1):
            expected = w * (nq + S.Half) + sign * root / 2
            assert any((x - expected).expand().simplify() == 0 for x in values), (blk.quantum_numbers, values)
    numeric = np.linalg.eigvalsh(jc_oracle(Rational(1, 2), 3, 1.0, 1.5, 0.25))
    ours = sorted(float(v) for v in hm.matrix.subs({w: 1, w0: Rational(3, 2), g: Rational(1, 4)}).eigenvals())
    assert np.allclose(ours, numeric)


def test_one_basis_order_in_every_route():
    # the order documented in amalgebra.states.basis (README "Basis order")
    op = a.number * J.z + J.plus * a.annihilate + b.create
    space = {"b": 1, "J": "1/2", "a": 1}
    om = to_matrix(op, space, with_basis=True)
    hm = hamiltonian_matrix(op, space)
    assert om.matrix == hm.matrix and om.basis == hm.basis
    # angular momenta first, then the modes in label order, the first outermost, n ascending
    expected = [ket("1/2", m, "J") * fock_ket(na, nb) for m in ("1/2", "-1/2") for na in (0, 1) for nb in (0, 1)]
    assert list(om.basis) == expected
    # a user basis of the same states in another order gives the permuted matrix
    order = [3, 0, 6, 1, 7, 2, 5, 4]
    hu = hamiltonian_matrix(op, space, basis=[expected[i] for i in order])
    assert hu.matrix == om.matrix.extract(order, order)
    assert om.basis.select(N=1) == (1, 2, 5, 6) and om.basis.select(a=1, J=("1/2", "-1/2")) == (6, 7)


def test_identity_checks_on_truncated_spaces():
    # common practice, no source: [a, a^dagger] = 1 holds as P a a^dagger P = P (a^dagger a + 1) P
    assert verify_identity(a.annihilate * a.create, a.number + 1, {"a": [2, 5]}).holds
    assert verify_identity(J.plus * a.create - a.create * J.plus, 0, {"J": [S.Half, 1], "a": [3]}).holds
    assert not verify_identity(a.annihilate * a.create, a.number, {"a": [2]}).holds


def test_states_compose_across_families():
    psi = (ket("1/2", "1/2", "S") * fock_ket(0, modes="a") + ket("1/2", "-1/2", "S") * fock_ket(1, modes="a"))
    psi = psi / sqrt(2)
    flip = Sp.plus * a.annihilate + Sp.minus * a.create
    assert expectation(flip, psi) == 1                     # <psi|flip|psi> = 2 * (1/2) * 1
    assert inner(adjoint(psi), psi) == 1
    assert apply(flip, psi) == psi.expand()
    # a coupled ket times a Fock ket: <I.J N> = 1/4 * 1 on the triplet with one quantum
    I_, J_ = AngularMomentum("I"), AngularMomentum("J")
    triplet = coupled_ket("1/2", "1/2", 1, 0, ("I", "J")) * fock_ket(1, modes="a")
    assert expectation(dot(I_, J_) * a.number, triplet) == Rational(1, 4)
    # Fock kets alone keep working, through the same engine
    assert apply_bosons(a.create, fock_ket(2, 0)) == sqrt(3) * fock_ket(3, 0)
    assert fock_inner(fock_bra(1, 2), fock_ket(1, 2)) == 1


def test_product_states_are_canonical_objects():
    k = product_ket(fock_ket(1, modes="c"), ket(1, 0, "S"), fock_ket(0, modes="b"))
    assert k == ket(1, 0, "S") * fock_ket(0, 1, modes=("b", "c"))
    assert k.labels == ("S",) and k.modes == ("b", "c")
    assert str(k) == "|1, 0>_S|0, 1>_(b,c)"
    assert latex(k) == r"{\left|1, 0\right\rangle}_{S} {\left|0, 1\right\rangle}_{b,c}"
    assert pickle.loads(pickle.dumps(k)) == k and k.func(*k.args) == k
    assert adjoint(adjoint(k)) == k


@pytest.mark.parametrize("thunk, error, match", [
    (lambda: apply(J.plus, fock_ket(1, modes="J")), OperatorError, "boson mode of the state"),
    (lambda: apply(a.create, ket(1, 0, "a")), OperatorError, "angular momentum of the state"),
    (lambda: apply(a.create, ket(1, 0, "J")), OperatorError, "mode='a'"),
    (lambda: apply(racah_tensor(1)[0], ket(0, 0, "J") * fock_ket(0, modes="L")), OperatorError,
     "tensor under label='L'"),
    (lambda: product_ket(ket(1, 0, "a"), fock_ket(0, modes="a")), StateError, "both an angular momentum"),
    (lambda: product_ket(fock_ket(0, modes="a"), fock_ket(1, modes="a")), StateError, "repeated"),
    (lambda: to_matrix(a.create, {"J": 1}), OperatorError, "occupation cutoff"),
    (lambda: to_matrix(a.create, {"a": [0, 1]}), QuantumNumberError, "boson mode"),
    (lambda: to_matrix(a.create, {"a": range(3, 1)}), QuantumNumberError, "range"),
    (lambda: to_matrix(Symbol("w") * a.create, {"a": 2}, kind="float"), Exception, "numeric"),
    (lambda: hamiltonian_matrix(J.z * a.number, {"J": 1, "S": 1, "a": 1}, basis="coupled"), StateError,
     "couples angular momenta only"),
    (lambda: matrix_element(bra(1, 0, "J") * fock_bra(0, modes="b"), J.z, ket(1, 0, "J") * fock_ket(0, modes="a")),
     StateError, "same labels"),
])
def test_bad_input_names_the_problem(thunk, error, match):
    with pytest.raises(error, match=match):
        thunk()


def test_float_route_reports_free_symbols():
    from amalgebra.errors import NotNumericError

    with pytest.raises(NotNumericError, match="subs for w"):
        to_matrix(Symbol("w") * a.create, {"a": 2}, kind="float")
    assert np.allclose(to_matrix(Symbol("w") * a.create, {"a": 1}, kind="float", subs={"w": 2}),
                       [[0, 0], [2, 0]])


def test_exact_entries_are_radicals_not_floats():
    # common practice, no source: J_+|1/2, -1/2> = |1/2, 1/2>, a|n> = sqrt(n)|n-1>; basis |up 0..2>, |down 0..2>
    m = to_matrix(J.plus * a.annihilate, {"J": "1/2", "a": 2})
    assert m == Matrix([[0, 0, 0, 0, 1, 0], [0, 0, 0, 0, 0, sqrt(2)]] + [[0] * 6] * 4)


def test_symbolic_tensor_times_boson_agrees_with_numeric_kets():
    # the mixed normal form (symbolic l, m, n) and the tree walk (numeric kets) are the same operator
    from amalgebra.states.kets import components
    from amalgebra.tensors import SphericalTensor

    T = SphericalTensor("T", 1, "L")
    l = Symbol("l", integer=True, nonnegative=True)
    m, n = Symbol("m", integer=True), Symbol("n", integer=True, nonnegative=True)
    op = T[0] * a.create + a.number * T[1]
    generic = apply(op, ket(l, m, "L") * fock_ket(n, modes="a"))
    for lv, mv, nv in [(2, -1, 0), (3, 0, 4), (4, 1, 1)]:      # every target |l-1, m+1> exists
        numeric = components(apply(op, ket(lv, mv, "L") * fock_ket(nv, modes="a")))
        at_point = components(generic.subs({l: lv, m: mv, n: nv}))
        assert numeric and set(numeric) <= set(at_point)
        for state, value in at_point.items():
            assert (value - numeric.get(state, 0)).simplify() == 0


def test_subs_must_be_a_dict():
    from amalgebra.errors import NotNumericError

    for kind in ("exact", "float"):
        with pytest.raises(NotNumericError, match="subs=3 must be a dict"):
            to_matrix(J.z, {"J": 1}, kind=kind, subs=3)


def _random_word_sum(rng, atoms, words=4, length=3):
    terms = []
    for _ in range(words):
        factors = [atoms[i] for i in rng.integers(0, len(atoms), size=int(rng.integers(1, length + 1)))]
        coeff = Rational(int(rng.integers(-3, 4)), int(rng.integers(1, 4))) + I * int(rng.integers(-1, 2))
        word = S.One
        for f in factors:
            word = word * f
        terms.append(coeff * word)
    return sum(terms, S.Zero)


@pytest.mark.parametrize("seed", range(8))
def test_random_words_across_families_match_the_testing_oracle(seed):
    # amalgebra.testing.reference builds every atom from textbook formulas (no kernel) and multiplies
    # matrices on a larger Fock space before cutting: angular momenta x tensors x vectors x bosons
    from amalgebra.tensors import SphericalTensor, VectorOperator
    from amalgebra.testing.reference import evaluate_on_space

    T, r = SphericalTensor("T", 1, "L"), VectorOperator("r", "L")
    atoms = [L.plus, L.z, Sp.minus, Sp.x, T[0], T[-1], r.x, a.create, a.annihilate, a.number, b.create]
    op = _random_word_sum(np.random.default_rng(seed), atoms)
    space = {"L": [0, 1], "S": "1/2", "a": range(3), "b": range(2)}     # ranges: modes even where op lacks one
    expected = evaluate_on_space(op, {"L": [0, 1], "S": [0.5]}, modes={"a": 2, "b": 1})
    ones = {T: lambda jp, j: 1, r: lambda jp, j: 1}            # the oracle's default reduced elements
    assert np.allclose(to_matrix(op, space, kind="float", reduced=ones), expected, atol=1e-11)
    exact = to_matrix(op, space, reduced=ones)
    assert np.allclose(np.array(exact.evalf(), dtype=complex), expected, atol=1e-11)
    assert np.abs(expected).max() > 0


def test_spin_boson_states_read_back_from_text():
    # the str of every object reads back (tests/test_parsing.py); product kets with a Fock factor too
    from amalgebra import parse
    from amalgebra.parsing import to_text

    k = ket(1, 0, "S") * fock_ket(0, 1, modes=("b", "c"))
    for state in (k, adjoint(k), 2 * k + ket(1, 1, "S") * fock_ket(1, 1, modes=("b", "c")),
                  apply(Sp.minus * b.create, k)):
        assert parse(str(state)) == state
        assert parse(to_text(state)) == state


def test_operator_matrix_on_spin_boson_kets_matches_to_matrix():
    # operator_matrix acts through the same engine as apply: the same matrix as to_matrix on a closed set
    from amalgebra.states.hamiltonian import operator_matrix

    op = a.number * J.z + J.plus * J.minus
    om = to_matrix(op, {"J": 1, "a": 2}, with_basis=True)
    assert operator_matrix(op, list(om.basis)) == om.matrix != Matrix.zeros(9, 9)


def test_identity_check_keeps_a_stepped_range_of_occupations():
    # common practice, no source: N is diagonal, so it is checked on any set of occupations, here n = 0, 2, 4
    result = verify_identity(a.number * a.number, a.create * a.annihilate * a.number, {"a": [range(0, 5, 2)]})
    assert result.holds and result.checked == [{"a": range(0, 5, 2)}]
