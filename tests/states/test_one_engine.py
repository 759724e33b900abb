"""Issue 11: one engine from operators to kets and matrices.

Every (operator family x state kind) pair is compared with the numpy oracle of
amalgebra.testing.reference (textbook ladder matrices and Wigner-Eckart with Racah's
3j formula in floats, no use of the amalgebra kernel or coupling package).
"""

import numpy as np
import pytest
from sympy import I, Matrix, Rational, Symbol, adjoint, sqrt, symbols, sympify

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.bosons import BosonMode, fock_bra, fock_ket
from amalgebra.errors import OperatorError, StateError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.states import (apply, bra, coupled_ket, expectation, hamiltonian_matrix, inner, ket,
                              matrix_element, product_ket)
from amalgebra.states.basis import product_basis
from amalgebra.states.eigen import block_eigenvalues
from amalgebra.tensors import SphericalTensor, VectorOperator, racah_tensor
from amalgebra.testing.reference import evaluate_on_space, space_states, threej_float

h = Rational(1, 2)
L, S, J = AngularMomentum("L"), AngularMomentum("S"), AngularMomentum("J")
T = SphericalTensor("T", 1, "L")
Q = SphericalTensor("Q", 2, "L")
C1 = racah_tensor(1)
r = VectorOperator("r", "L")
a = Symbol("a")


def red_t(jp, j):
    """An invented reduced-element table <j'||T||j> = 1 + j' + 2 j (any numbers do)."""
    return 1 + jp + 2 * j


def red_c(jp, j):
    # <l'||C^1||l> = (-1)^l' sqrt((2l+1)(2l'+1)) (l' 1 l; 0 0 0) (Edmonds 1957, eq. 5.4.5, from memory)
    return (-1) ** int(round(jp)) * np.sqrt((2 * j + 1) * (2 * jp + 1)) * threej_float(jp, 1, j, 0, 0, 0)


REDUCED = {T: red_t, Q: red_t, r: red_t}            # SymPy j', j in: a SymPy value out
ORACLE_REDUCED = {T: red_t, Q: red_t, r: red_t, C1: red_c}


# (name, operator, space): the space holds every intermediate j, so P O P = O on the kets checked
FAMILIES = [
    ("angular momentum, one label", L.x ** 2 * L.y - 2 * L.z * L.plus + L.squared, {"L": [1]}),
    ("angular momentum, two labels", dot(L, S) + L.z ** 2 * S.x, {"L": [1], "S": [h]}),
    ("tensor component", T[1], {"L": [0, 1, 2]}),
    ("tensor of rank 2 with J", Q[-1] * L.plus + L.z * Q[0], {"L": [0, 1, 2]}),
    ("Racah tensor", C1[0], {"L": [0, 1, 2]}),
    ("vector components", r.x * r.y + L.z * r.z, {"L": [0, 1, 2, 3]}),
    ("symbolic coefficient, tensor product", a * T[0] * T[1] + L.z * S.plus, {"L": [0, 1, 2, 3], "S": [h]}),
]
U = SphericalTensor("U", 1, "S")
REDUCED[U] = red_t
ORACLE_REDUCED[U] = red_t
# families whose matrices are checked on the whole space (exact, float, sparse, hamiltonian_matrix)
MATRIX_FAMILIES = FAMILIES + [
    ("half-integer multiplets of different j", U[1] * S.z - 2 * U[0] + S.plus * U[-1], {"S": [h, 3 * h, 5 * h]}),
    ("direct sum times a second label", Q[1] * L.minus * S.z + T[0] * S.x + dot(L, S),
     {"L": [0, 1, 2], "S": [h]}),
    ("long words with shared suffixes", (T[1] + L.z) ** 3 * r.x - a * T[0] * r.x + L.plus * T[-1] * r.x,
     {"L": [0, 1, 2]}),
    ("rank 2 times powers of J", Q[2] * L.minus ** 2 + a * L.x ** 3 * Q[0], {"L": [1, 2]}),
]


def _oracle(op, space, subs=None):
    expr = op.subs(subs) if subs else op
    return evaluate_on_space(expr, space, ORACLE_REDUCED)


def _ket(values, labels):
    kets = [ket(j, m, lab) for lab, (j, m) in zip(labels, values)]
    return kets[0] if len(kets) == 1 else product_ket(*kets)


def _inner_states(space, op):
    """Kets whose images stay inside the space (j at most one below the top for rank <= 2 words)."""
    labels, states = space_states(space)
    top = {lab: max(space[lab]) for lab in labels}
    depth = 2 if op.has(Q) or op.has(r) or op.has(T[0] * T[1]) else 1
    keep = [s for s in states if all(j <= top[lab] - depth or len(space[lab]) == 1
                                     for lab, (j, _) in zip(labels, s))]
    return labels, states, keep


@pytest.mark.parametrize("name, op, space", FAMILIES, ids=[f[0] for f in FAMILIES])
def test_matrix_element_on_product_kets_against_oracle(name, op, space):
    # oracle: amalgebra.testing.reference (numpy, Edmonds 1957 eq. 5.4.1 with Racah's 3j formula)
    ref = _oracle(op, space, {a: Rational(3, 7)})
    labels, states, keep = _inner_states(space, op)
    for col in keep:
        for row_index, row in enumerate(states):
            value = matrix_element(_ket(row, labels), op, _ket(col, labels), reduced=REDUCED).subs(a, Rational(3, 7))
            assert abs(complex(value) - ref[row_index, states.index(col)]) < 1e-9, (row, col)


@pytest.mark.parametrize("name, op, space", FAMILIES, ids=[f[0] for f in FAMILIES])
def test_to_matrix_and_hamiltonian_matrix_against_oracle(name, op, space):
    # oracle as above; to_matrix and hamiltonian_matrix in the one basis order (README)
    ref = _oracle(op, space, {a: Rational(3, 7)})
    m1 = to_matrix(op, space, reduced=REDUCED).subs(a, Rational(3, 7))
    m2 = hamiltonian_matrix(op, space, reduced=REDUCED).matrix.subs(a, Rational(3, 7))
    assert m1 == m2
    assert np.allclose(np.array(m1.evalf(), dtype=complex), ref, atol=1e-10)


@pytest.mark.parametrize("name, op, space", MATRIX_FAMILIES, ids=[f[0] for f in MATRIX_FAMILIES])
def test_every_kind_of_matrix_against_oracle(name, op, space):
    # oracle: amalgebra.testing.reference.evaluate_on_space (numpy products of textbook atom matrices,
    # Edmonds 1957 eq. 5.4.1 with Racah's 3j formula); exact, float, sparse and hamiltonian_matrix
    point = {a: Rational(3, 7)}
    ref = _oracle(op, space, point)
    exact = to_matrix(op, space, reduced=REDUCED)
    assert exact == hamiltonian_matrix(op, space, reduced=REDUCED).matrix
    assert np.allclose(np.array(exact.subs(point).evalf(), dtype=complex), ref, atol=1e-10)
    dense = to_matrix(op, space, reduced=REDUCED, kind="float", subs=point)
    sparse = to_matrix(op, space, reduced=REDUCED, kind="sparse", subs=point)
    assert np.allclose(dense, ref, atol=1e-10) and np.allclose(sparse.toarray(), ref, atol=1e-10)
    assert np.abs(ref).max() > 0.1
    # matrix_element between kets is not truncated to the space: compare with the oracle on a space
    # holding every j a word of up to four components reaches (P O P differs from O at the top)
    big = {lab: js if len(js) == 1 else [Rational(int(2 * js[0]) % 2, 2) + n for n in range(int(max(js)) + 5)]
           for lab, js in space.items()}
    labels, states = space_states(space)
    _, big_states = space_states(big)
    big_ref = _oracle(op, big, point)
    basis = product_basis(space)
    for col in range(0, len(states), 3):
        for row in range(len(states)):
            value = matrix_element(basis[row], op, basis[col], reduced=REDUCED)
            want = big_ref[big_states.index(states[row]), big_states.index(states[col])]
            assert abs(complex(value.subs(point)) - want) < 1e-9, (row, col)


def test_tree_and_normal_form_agree_on_symbolic_and_numeric_kets():
    # the engine's two readings of a tensor operator (tree on numeric kets, mixed normal form on
    # symbolic ones) at numeric points; oracle: the numpy matrix on L = 0+...+5 (holds every j reached)
    j, m = Symbol("j", integer=True, nonnegative=True), Symbol("m", integer=True)
    op = T[1] * L.z * T[-1] + L.plus * r.z
    space = {"L": [0, 1, 2, 3, 4, 5]}
    labels, states = space_states(space)
    ref = _oracle(op, space)
    image = apply(op, ket(j, m, "L"), reduced=REDUCED)
    for jv, mv in ((2, 0), (2, -1), (3, 1)):
        numeric = apply(op, ket(jv, mv, "L"), reduced=REDUCED)
        col = states.index(((float(jv), float(mv)),))
        for row, ((jp, mp),) in enumerate(states):
            b = bra(Rational(jp), Rational(mp), "L")
            got = complex(inner(b, numeric))
            closed = complex(inner(b, image).subs({j: jv, m: mv}))
            assert abs(got - ref[row, col]) < 1e-10 and abs(closed - ref[row, col]) < 1e-10


def test_one_space_reader_same_rules_for_every_route():
    # one reader (states.basis.read_space): the one label rule and the same messages; to_matrix keeps
    # OperatorError, bases StateError (the check_label convention)
    for bad, match in (({"_x": 1}, "identifier"), ({}, "non-empty dict"), ([("L", 1)], "non-empty dict"),
                       ({1: 1}, "str")):
        with pytest.raises(OperatorError, match=match):
            to_matrix(L.z, bad)
        with pytest.raises(StateError, match=match):
            product_basis(bad)
    from amalgebra.errors import QuantumNumberError
    for bad in ({"L": [1, 1]}, {"L": []}, {"L": "1/3"}):
        with pytest.raises(QuantumNumberError):
            to_matrix(L.z, bad)
        with pytest.raises(QuantumNumberError):
            hamiltonian_matrix(L.z, bad)


def test_vectorised_ladder_factor_is_the_one_factor():
    # amalgebra._exact.ladder_float_array against the scalar ladder_radicand (same module) and the
    # numpy oracle's J+ matrix (Sakurai 1994 eq. 3.5.41, from memory)
    from amalgebra._exact import ladder_float_array, ladder_radicand
    from amalgebra.testing.reference import component_matrices

    for twice_j in range(0, 8):
        jv = twice_j / 2
        ms = jv - np.arange(twice_j + 1)
        for d in (-3, -2, -1, 1, 2, 3):
            got = ladder_float_array(jv, ms, d)
            want = [float(ladder_radicand(Rational(twice_j, 2), Rational(int(2 * mv), 2), d)) ** 0.5 for mv in ms]
            assert np.allclose(got, want, atol=1e-12)
        plus = component_matrices(jv)["plus"]
        assert np.allclose(ladder_float_array(jv, ms[1:], 1), np.diag(plus, 1).real)


def test_doctest_collection_imports_each_module_once(tmp_path):
    # pytest's --import-mode=importlib executed amalgebra/states/basis.py twice when its doctests were
    # collected first (parent package imported, then the file run again): two Basis classes.  The root
    # conftest imports package modules by name first; this runs that collection order in a subprocess.
    import pathlib
    import subprocess
    import sys

    root = pathlib.Path(__file__).resolve().parents[2]
    probe = tmp_path / "test_probe.py"
    probe.write_text("import sys\n\ndef test_one_class():\n    import amalgebra.states\n"
                     "    assert sys.modules['amalgebra.states.basis'].Basis is amalgebra.states.Basis\n")
    run = subprocess.run([sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider", "-p", "no:xdist",
                          "-c", str(root / "pyproject.toml"), "--rootdir", str(root),
                          str(root / "amalgebra" / "states" / "basis.py"), str(probe)],
                         cwd=root, capture_output=True, text=True)
    assert run.returncode == 0, run.stdout[-2000:]
    assert "passed" in run.stdout


def test_apply_on_linear_combination_against_oracle():
    # oracle: the same numpy vector products (linearity of the action)
    space = {"L": [0, 1, 2]}
    labels, states = space_states(space)
    op = T[1] + I * L.minus * T[0]
    psi = (ket(1, 0, "L") - 2 * I * ket(1, -1, "L")) / sqrt(5)
    out = apply(op, psi, reduced=REDUCED)
    vec = np.zeros(len(states), dtype=complex)
    vec[states.index(((1.0, 0.0),))] = 1 / np.sqrt(5)
    vec[states.index(((1.0, -1.0),))] = -2j / np.sqrt(5)
    want = _oracle(op, space) @ vec
    for i, ((j, m),) in enumerate(states):
        got = complex(inner(bra(Rational(j), Rational(m), "L"), out))
        assert abs(got - want[i]) < 1e-10


def _cg(j1, m1, j2, m2, jj, mm):
    # <j1 m1 j2 m2|J M> = (-1)^(j1-j2+M) sqrt(2J+1) (j1 j2 J; m1 m2 -M) (3j definition, design.md)
    return (-1) ** int(round(j1 - j2 + mm)) * np.sqrt(2 * jj + 1) * threej_float(j1, j2, jj, m1, m2, -mm)


def test_coupled_kets_against_oracle():
    # oracle: numpy matrix of the operator sandwiched between CG vectors from Racah's 3j formula
    space = {"L": [1], "S": [h]}
    op = dot(L, S) + 3 * L.z - S.x
    ref = _oracle(op, space)
    labels, states = space_states(space)
    coupled = [(Rational(3, 2), Rational(1, 2)), (Rational(1, 2), Rational(1, 2)), (Rational(1, 2), -h)]

    def vector(jj, mm):
        v = np.zeros(len(states))
        for i, ((j1, m1), (j2, m2)) in enumerate(states):
            v[i] = _cg(j1, m1, j2, m2, float(jj), float(mm))
        return v

    for jb, mb in coupled:
        for jk, mk in coupled:
            got = matrix_element(adjoint(coupled_ket(1, h, jb, mb, labels=("L", "S"))), op,
                                 coupled_ket(1, h, jk, mk, labels=("L", "S")))
            want = vector(jb, mb) @ ref @ vector(jk, mk)
            assert abs(complex(got) - want) < 1e-10


@pytest.mark.parametrize("op", [T[0], T[1], L.plus * T[0], L.x ** 2 + L.z], ids=str)
def test_symbolic_j_m_at_numeric_points(op):
    # oracle: numpy on the direct sum 0+1+2+3; the symbolic closed form is evaluated at several points
    j, m = Symbol("j", integer=True, nonnegative=True), Symbol("m", integer=True)
    space = {"L": [0, 1, 2, 3]}
    labels, states = space_states(space)
    ref = _oracle(op, space)
    for dj in (-1, 0, 1):
        for dm in (-1, 0, 1, 2):
            closed = matrix_element(bra(j + dj, m + dm, "L"), op, ket(j, m, "L"), conditions=False,
                                    reduced=REDUCED)
            for jv, mv in ((1, 0), (2, -1), (2, 1), (1, 1)):
                jp, mp = jv + dj, mv + dm
                if ((float(jp), float(mp)),) not in states or abs(mp) > jp:
                    continue
                value = complex(closed.subs({j: jv, m: mv}))
                want = ref[states.index(((float(jp), float(mp)),)), states.index(((float(jv), float(mv)),))]
                assert abs(value - want) < 1e-9, (op, dj, dm, jv, mv)


def test_fock_kets_through_the_same_entry_points():
    # oracle: numpy truncated boson matrices a|n> = sqrt(n)|n-1> (common practice, no source)
    b = BosonMode("c")
    nmax = 6
    ann = np.diag(np.sqrt(np.arange(1, nmax + 1)), 1)
    cre = ann.T
    op = b.create ** 2 * b.annihilate + 3 * b.number
    ref = cre @ cre @ ann + 3 * cre @ ann
    for n in range(0, 4):
        for k in range(0, 5):
            got = matrix_element(fock_bra(k, modes="c"), op, fock_ket(n, modes="c"))
            assert abs(complex(got) - ref[k, n]) < 1e-12
    assert expectation(b.number, fock_ket(3, modes="c")) == 3
    assert inner(fock_ket(2, modes="c"), fock_ket(2, modes="c")) == 1


def test_stark_element_from_the_issue():
    # <1 0|C^1_0|0 0> = 1/sqrt(3) (Edmonds 1957, eq. 5.4.5 with (1 1 0; 0 0 0) = -1/sqrt3, from memory)
    assert matrix_element(bra(1, 0, "L"), C1[0], ket(0, 0, "L")) == sqrt(3) / 3
    assert apply(C1[0], ket(0, 0, "L")) == sqrt(3) / 3 * ket(1, 0, "L")


def test_basis_order_is_one_for_every_route():
    # README Conventions: labels in label order, first outermost, m = j..-j, direct sums j as given
    op = L.z + 2 * S.plus * L.minus + T[0]
    js = {"S": h, "L": [2, 0]}           # dict order S, L: the product basis still puts L outermost
    basis = product_basis(js)
    assert [str(s) for s in basis][:3] == ["|2, 2>_L|1/2, 1/2>_S", "|2, 2>_L|1/2, -1/2>_S",
                                           "|2, 1>_L|1/2, 1/2>_S"]
    m1 = to_matrix(op, js, reduced=REDUCED)
    hm = hamiltonian_matrix(op, js, reduced=REDUCED)
    assert hm.basis == basis and to_matrix(op, js, reduced=REDUCED, with_basis=True).basis == basis
    assert hm.matrix == m1
    # every entry equals the matrix element between the basis kets through apply
    for r_, bra_ket in enumerate(basis):
        for c_, ket_ in enumerate(basis):
            assert matrix_element(bra_ket, op, ket_, reduced=REDUCED) == m1[r_, c_]


def test_basis_selection_and_blocks_on_direct_sums():
    js = {"L": [0, 1, 2]}
    hm = hamiltonian_matrix(a * L.squared + L.z, js)
    assert hm.select(M=0) == (0, 2, 6)                   # |0 0>, |1 0>, |2 0>
    assert hm.index(ket(1, -1, "L")) == 3
    assert hm.conserved == ("M", "j_L")
    assert len(hm.blocks) == 9 and all(b.size == 1 for b in hm.blocks)
    # a tensor mixes j: only M stays conserved
    ht = hamiltonian_matrix(L.z + T[0], js, reduced=REDUCED)
    assert ht.conserved == ("M",)
    assert sorted(b.size for b in ht.blocks) == [1, 1, 2, 2, 3]     # M = +-2, +-1, 0
    with pytest.raises(StateError):
        hm.index(ket(3, 0, "L"))


def test_hamiltonian_matrix_is_a_sympy_object():
    hm = hamiltonian_matrix(a * dot(L, S), {"L": 1, "S": h})
    assert hm.matrix.is_Matrix and hm.matrix.__class__.__name__ == "ImmutableDenseMatrix"
    assert sympify(hm) == hm.matrix
    v = Matrix([1, 0, 0, 0, 0, 0])
    assert hm.matrix * v == hm.matrix[:, 0]
    assert (hm.matrix - hm.matrix.T).is_zero_matrix            # Hermitian and real here


def test_eigenvalues_hyperfine_zeeman_40x40_all_blocks():
    # issue 11: ALL 13 blocks solved exactly (no time limit, so the check does not hang on machine load);
    # checked against numpy.linalg.eigvalsh of the numeric matrix (independent library) at a point
    A, B = symbols("A B", real=True)
    Iop, Jop = AngularMomentum("I"), AngularMomentum("J")
    H = A * dot(Iop, Jop) + B * (2 * Jop.z - Rational(1, 1000) * Iop.z)
    hm = hamiltonian_matrix(H, {"I": Rational(9, 2), "J": Rational(3, 2)})
    assert hm.matrix.shape == (40, 40) and len(hm.blocks) == 13
    point = {A: Rational(3, 5), B: Rational(2, 7)}
    exact = []
    for blk, values in hm.eigenvalues(time_budget=None):
        assert values.complete and not values.unsolved and values.interrupted is None, (blk, values)
        assert sum(values.values()) == blk.size
        exact.extend(complex(v.subs(point).evalf(30)).real for v, k in values.items() for _ in range(k))
    want = np.linalg.eigvalsh(np.array(hm.matrix.subs(point).evalf(), dtype=float))
    assert len(exact) == 40 and np.allclose(sorted(exact), want, atol=1e-9)


def test_spin_one_zero_field_and_transverse_field_solved():
    # D Sz^2 + E (Sx^2 - Sy^2) + g Bx Sx on spin 1: a 3x3 block; numpy checks the roots at a point
    D, E, Bx = symbols("D E B_x", real=True)
    Sop = AngularMomentum("S")
    hm = hamiltonian_matrix(D * Sop.z ** 2 + E * (Sop.x ** 2 - Sop.y ** 2) + Bx * Sop.x, {"S": 1})
    [(blk, values)] = [(b, v) for b, v in hm.eigenvalues() if b.size == 3]
    assert values.complete and sum(values.values()) == 3
    point = {D: Rational(1, 3), E: Rational(1, 11), Bx: Rational(2, 5)}
    got = sorted(complex(v.subs(point).evalf(30)).real for v in values)
    want = np.linalg.eigvalsh(np.array(blk.matrix.subs(point).evalf(), dtype=float))
    assert np.allclose(got, want, atol=1e-12)


def test_unsolved_block_is_explicit():
    # a quintic without a closed form: explicit result, factored charpoly, numeric eigenvalues
    mat = Matrix(5, 5, lambda i, k: 1 if abs(i - k) == 1 else (i + 1 if i == k else 0)) + Matrix.diag(0, 0, 0, 0, a)
    res = block_eigenvalues(mat)
    assert not res.complete and res.unsolved and res.degree == 5 and a in res.symbols
    nums = res.numeric({a: 1})
    want = np.linalg.eigvalsh(np.array(mat.subs(a, 1), dtype=float))
    assert np.allclose(sorted(z.real for z in nums), want)


def test_bad_input_typed_errors():
    # a tensor component without a declared space (its label is not the ket's / not in j)
    with pytest.raises(OperatorError, match="label='L'"):
        apply(T[0], ket(1, 0, "S"))
    with pytest.raises(OperatorError, match="'L'"):
        to_matrix(T[0], {"S": 1})
    # a ket of an unknown label (bra and ket of different labels)
    with pytest.raises(StateError, match="labels"):
        matrix_element(bra(1, 0, "L"), L.z, ket(1, 0, "S"))
    # an operator on a ket of another label
    with pytest.raises(OperatorError, match="label='L'"):
        apply(L.z, ket(1, 0, "S"))
    # boson operators on |j m> kets
    with pytest.raises(OperatorError, match="Fock"):
        apply(BosonMode("c").create, ket(1, 0, "c"))
    # one label rule everywhere (issue 11): '_x' refused by operators and kets alike
    with pytest.raises(OperatorError):
        AngularMomentum("_x")
    with pytest.raises(StateError):
        ket(1, 0, "_x")


def test_one_ladder_factor_against_the_oracle():
    # oracle: amalgebra.testing.reference.component_matrices (Sakurai 1994 eq. 3.5.41, from memory)
    from amalgebra._exact import condon_shortley, ladder_float, ladder_radicand
    from amalgebra.testing.reference import component_matrices

    for twice_j in range(0, 7):
        jv = Rational(twice_j, 2)
        plus = component_matrices(float(jv))["plus"]
        for i in range(twice_j + 1):
            mv = jv - i
            up = plus[i - 1, i].real if i > 0 else 0.0
            assert abs(ladder_float(jv, mv, 1) - up) < 1e-12
            assert abs(float(condon_shortley(jv, mv, 1)) - up) < 1e-12
            assert ladder_radicand(jv, mv, 1) == (jv - mv) * (jv + mv + 1)
            two = np.linalg.matrix_power(plus, 2)[i - 2, i].real if i > 1 else 0.0
            assert abs(float(condon_shortley(jv, mv, 2)) - two) < 1e-12
            assert abs(float(condon_shortley(jv, mv, -1)) - (plus.T[i + 1, i].real if i < twice_j else 0)) < 1e-12


def test_one_label_order_everywhere():
    # natural order (common practice, no source): S2 before S10, first label outermost
    from amalgebra._validation import label_key

    assert sorted(["S10", "S2", "I", "L"], key=label_key) == ["I", "L", "S2", "S10"]
    js = {"S10": h, "S2": h}
    assert product_basis(js).labels == ("S2", "S10")
    s2, s10 = AngularMomentum("S2"), AngularMomentum("S10")
    m = to_matrix(s2.z, js)
    assert list(m.diagonal()) == [h, h, -h, -h]          # S2 outermost: slow index
    assert hamiltonian_matrix(s2.z + 0 * s10.z, js).matrix == m


def test_label_order_for_every_kind():
    # the float and sparse kinds keep the one order too (S2 outermost before S10)
    js = {"S10": h, "S2": h}
    s2 = AngularMomentum("S2")
    exact = np.array(to_matrix(s2.z, js).evalf(), dtype=float)
    assert np.allclose(to_matrix(s2.z, js, kind="float"), exact)
    assert np.allclose(to_matrix(s2.z, js, kind="sparse").toarray(), exact)


def test_parity_blocks_where_known():
    # C^k has parity (-1)^k: <l'||C^k||l> = 0 unless l' + k + l is even (Edmonds 1957, eq. 5.4.5, from memory)
    C2 = racah_tensor(2)
    hm = hamiltonian_matrix(L.z + C2[0], {"L": [0, 1, 2]})
    assert hm.conserved == ("M", "parity")
    for blk in hm.blocks:
        ls = {hm.basis.quantum_numbers(i)["L"][0] for i in blk.indices}
        assert len({l % 2 for l in ls}) == 1 and blk.quantum_numbers["parity"] == (-1) ** int(min(ls))
    assert hamiltonian_matrix(L.z + C1[0], {"L": [0, 1, 2]}).conserved == ("M",)      # the dipole flips parity
