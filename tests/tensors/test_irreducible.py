"""Irreducible decomposition: sums reproduce the operator, parts have the stated rank and weight.

Rank and weight are checked on explicit float matrices (amalgebra.matrices.explicit.to_matrix, whose
matrices are independent of the decomposition code): for a part X of rank k and weight q,
sum_a [J_a, [J_a, X]] = k(k+1) X and [J_z, X] = q X (Racah 1942, definition of tensors).
"""

import pickle
from fractions import Fraction

import numpy as np
import pytest
from hypothesis import example, given, settings, strategies as st
from sympy import Add, I, Matrix, Rational, Symbol, expand, latex, pretty, sqrt, symbols

from amalgebra.algebra import AngularMomentum, canonical, dot
from amalgebra.errors import NotNumericError, OperatorError, TensorOperatorError
from amalgebra.matrices.explicit import to_matrix
from amalgebra.testing.strategies import operator_polynomials
from amalgebra.tensors.irreducible import (TensorForm, TensorFormTerm, bilinear_tensor_form, decompose,
                                           recombine, rotation_commutator, spin_hamiltonian_tensor_form)
from amalgebra.tensors.products import scalar_product, tensor_product
from amalgebra.tensors.spherical import SphericalTensor
from amalgebra.tensors.vectors import VectorOperator

J, S, Iop = AngularMomentum("J"), AngularMomentum("S"), AngularMomentum("I")


def _check_parts(parts, js, subs=None):
    """Casimir and weight of every part, on float matrices of the total angular momentum."""
    labels = sorted(js)
    total = {axis: sum(to_matrix(AngularMomentum(lab).component(axis), js, kind="float").astype(complex)
                       for lab in labels) for axis in ("x", "y", "z")}
    for k, comps in parts.items():
        assert sorted(comps) == [k - n for n in range(int(2 * k), -1, -1)]
        for q, X in comps.items():
            if X == 0:
                continue
            M = np.asarray(to_matrix(X, js, kind="float", subs=subs), dtype=complex)
            cas = sum(total[a] @ (total[a] @ M - M @ total[a]) - (total[a] @ M - M @ total[a]) @ total[a]
                      for a in "xyz")
            assert np.allclose(cas, float(k * (k + 1)) * M, atol=1e-9)
            assert np.allclose(total["z"] @ M - M @ total["z"], float(q) * M, atol=1e-9)


def test_jx_jy_symmetrised_is_pure_rank_two():
    # Jx Jy + Jy Jx = (J+^2 - J-^2)/(2i), the q = +-2 parts of a rank-2 tensor (common practice)
    parts = decompose(J.x * J.y + J.y * J.x)
    assert sorted(parts) == [2]
    assert parts[2][2] == canonical(J.plus ** 2 / (2 * I)) != 0
    assert parts[2][-2] == canonical(-J.minus ** 2 / (2 * I))
    assert parts[2][1] == parts[2][0] == parts[2][-1] == 0
    _check_parts(parts, {"J": 2})


def test_jx_jy_unsymmetrised_has_rank_one():
    # Jx Jy = (JxJy + JyJx)/2 + i Jz/2 ([Jx, Jy] = i Jz, Sakurai 3.1)
    parts = decompose(J.x * J.y)
    assert sorted(parts) == [1, 2]
    assert parts[1][0] == I * J.z / 2 and parts[1][1] == parts[1][-1] == 0
    assert canonical(recombine(parts)) == canonical(J.x * J.y)


def test_spin_hamiltonian_symmetric_D():
    # S.D.S with symmetric D: rank 0 = Tr(D)/3 S^2, no rank 1, rank 2 the traceless part
    # (Abragam and Bleaney 1970, ch. 3; common practice)
    d = symbols("dxx dxy dxz dyy dyz dzz")
    D = Matrix([[d[0], d[1], d[2]], [d[1], d[3], d[4]], [d[2], d[4], d[5]]])
    Sv = S.vector
    H = sum((Sv[a] * D[a, b] * Sv[b] for a in range(3) for b in range(3)), start=0 * S.x)
    parts = decompose(H)
    assert sorted(parts) == [0, 2]
    assert expand(parts[0][0] - (d[0] + d[3] + d[5]) / 3 * S.squared) == 0
    assert canonical(recombine(parts)) == canonical(H)
    values = dict(zip(d, [0.3, -1.1, 0.7, 2.0, 0.4, -0.5]))
    _check_parts(parts, {"S": Rational(3, 2)}, subs=values)


def test_quadrupole_coupling_I_Q_J():
    # I.Q.J with a general Q: rank 0 = Tr(Q)/3 I.J, rank 1 = antisymmetric part, rank 2 = rest
    # (common practice: Cartesian decomposition of a second-rank tensor)
    Q = Matrix(3, 3, lambda a, b: Symbol(f"Q{a}{b}"))
    Iv, Jv = Iop.vector, J.vector
    H = sum((Iv[a] * Q[a, b] * Jv[b] for a in range(3) for b in range(3)), start=0 * J.x)
    parts = decompose(H)
    assert sorted(parts) == [0, 1, 2]
    assert canonical(parts[0][0] - Q.trace() / 3 * dot(Iop, J)) == 0
    antisym = sum((Iv[a] * (Q[a, b] - Q[b, a]) / 2 * Jv[b] for a in range(3) for b in range(3)), start=0 * J.x)
    assert canonical(sum(parts[1].values()) - antisym) == 0
    assert canonical(recombine(parts)) == canonical(H)
    values = {Q[a, b]: 0.1 * (3 * a + b + 1) * (-1) ** b for a in range(3) for b in range(3)}
    _check_parts(parts, {"I": 1, "J": Rational(1, 2)}, subs=values)


def test_classical_vector_rotates_along():
    # S.g.B with B a classical vector rotated along: ranks 0, 1, 2; without it: rank 1 only
    g = Matrix(3, 3, lambda a, b: Symbol(f"g{a}{b}"))
    B = symbols("Bx By Bz")
    Sv = S.vector
    H = sum((Sv[a] * g[a, b] * B[b] for a in range(3) for b in range(3)), start=0 * S.x)
    parts = decompose(H, vectors=[B])
    assert sorted(parts) == [0, 1, 2]
    assert canonical(parts[0][0] - g.trace() / 3 * (Sv[0] * B[0] + Sv[1] * B[1] + Sv[2] * B[2])) == 0
    assert canonical(recombine(parts)) == canonical(H)
    only_spin = decompose(H)
    assert sorted(only_spin) == [1]
    assert canonical(recombine(only_spin)) == canonical(H)
    with pytest.raises(OperatorError):
        decompose(H, vectors=[(B[0], B[1])])


def test_labels_select_the_rotation():
    # I.J is a scalar under I + J but rank 1 under I alone
    parts_total = decompose(dot(Iop, J))
    assert sorted(parts_total) == [0]
    parts_I = decompose(dot(Iop, J), labels=("I",))
    assert sorted(parts_I) == [1]
    _check_parts(parts_total, {"I": 1, "J": 1})


def test_tensor_atoms_products_have_the_coupled_rank():
    T, U = SphericalTensor("T", 1, "L"), SphericalTensor("U", 2, "S")
    for k in (1, 2, 3):
        parts = decompose(tensor_product(T, U, k)[k - 1])
        assert sorted(parts) == [k]
        assert expand(parts[k][k - 1] - tensor_product(T, U, k)[k - 1]) == 0
    V = VectorOperator("r", "L")
    assert sorted(decompose(scalar_product(V, T))) == [0]
    # x y + y x is symmetric and traceless: rank 2 only (common practice)
    assert sorted(decompose(V.x * V.y + V.y * V.x)) == [2]
    assert sorted(decompose(V.x * V.x + V.y * V.y + V.z * V.z)) == [0]        # r.r is a scalar


@settings(database=None, deadline=None)
@given(operator_polynomials(labels=("J",), max_terms=3, max_weight=3))
def test_random_polynomials(poly):
    parts = decompose(poly)
    assert canonical(recombine(parts)) == canonical(poly)
    _check_parts(parts, {"J": Rational(3, 2)})


@settings(database=None, deadline=None)
@given(operator_polynomials(labels=("I", "S"), max_terms=2, max_weight=3))
def test_random_two_label_polynomials(poly):
    parts = decompose(poly)
    assert canonical(recombine(parts)) == canonical(poly)
    _check_parts(parts, {"I": 1, "S": Rational(1, 2)})


def test_rotation_commutator():
    T = SphericalTensor("T", 2, "J")
    for gen in (J.z, J.plus, J.minus, J.x, J.y):
        for q in (2, 0, -1):
            assert expand(rotation_commutator(gen, T[q]) - T.commutator_with(gen, q)) == 0
    # Leibniz rule on a product with an angular-momentum factor
    expr = T[1] * J.z
    got = rotation_commutator(J.plus, expr)
    # [J+, T_1 Jz] = [J+, T_1] Jz + T_1 [J+, Jz] = 2 T_2 Jz - T_1 J+  ([J+, Jz] = -J+, Sakurai 3.5)
    assert expand(got - (2 * T[2] * J.z - T[1] * J.plus)) == 0 != got
    # ... and on pure angular-momentum polynomials it agrees with the kernel's commutator
    X = J.x * J.z ** 2 + J.plus
    assert canonical(rotation_commutator(J.minus, X) - (J.minus * X - X * J.minus)) == 0
    with pytest.raises(TensorOperatorError):
        rotation_commutator(S.z, T[0], labels=("J",))
    with pytest.raises(OperatorError):
        rotation_commutator(J.squared, T[0])


def test_bad_factors():
    with pytest.raises(OperatorError):
        decompose(Symbol("x", commutative=False) * J.z)
    with pytest.raises(OperatorError):
        decompose(sqrt(J.z))


# -- bilinear forms U.M.V as coefficient tensors times operator tensors --------------------------
#
# Independent references used below:
# * Cartesian forms sum_ab U_a M_ab V_b are typed out here, not taken from the code;
# * the Clebsch-Gordan coefficients <1 mu 1 nu|k q> of the Particle Data Group table "1 x 1"
#   (upper half typed in; the lower half from <j1 -m1 j2 -m2|J -M> = (-1)^(j1+j2-J) <...>,
#   the symmetry printed with the PDG table), and spherical basis vectors e_q built with numpy.

MSYM = Matrix(3, 3, lambda a, b: Symbol(f"m{a}{b}"))
DSYM = Matrix(3, 3, lambda a, b: Symbol(f"d{min(a, b)}{max(a, b)}"))
BVEC = symbols("Bx By Bz")


def _cartesian_form(u, M, v):
    """sum_ab u_a M_ab v_b with u to the left of v (typed out independently of the code)."""
    return Add(*[u[a] * M[a, b] * v[b] for a in range(3) for b in range(3)])


def _pdg_cg_1x1():
    # PDG "1 x 1" table, upper half (M >= 0); keys (m1, m2, J, M)
    upper = {(1, 1, 2, 2): 1.0,
             (1, 0, 2, 1): np.sqrt(1 / 2), (0, 1, 2, 1): np.sqrt(1 / 2),
             (1, 0, 1, 1): np.sqrt(1 / 2), (0, 1, 1, 1): -np.sqrt(1 / 2),
             (1, -1, 2, 0): np.sqrt(1 / 6), (0, 0, 2, 0): np.sqrt(2 / 3), (-1, 1, 2, 0): np.sqrt(1 / 6),
             (1, -1, 1, 0): np.sqrt(1 / 2), (0, 0, 1, 0): 0.0, (-1, 1, 1, 0): -np.sqrt(1 / 2),
             (1, -1, 0, 0): np.sqrt(1 / 3), (0, 0, 0, 0): -np.sqrt(1 / 3), (-1, 1, 0, 0): np.sqrt(1 / 3)}
    table = dict(upper)
    for (m1, m2, J, M), c in upper.items():
        table[(-m1, -m2, J, -M)] = (-1) ** (2 - J) * c
    return table


def _numpy_spherical_basis():
    # e_{+1} = -(e_x + i e_y)/sqrt2, e_0 = e_z, e_{-1} = (e_x - i e_y)/sqrt2, so e_q . V = V_q (design.md)
    ex, ey, ez = np.eye(3)
    return {1: -(ex + 1j * ey) / np.sqrt(2), 0: ez.astype(complex), -1: (ex - 1j * ey) / np.sqrt(2)}


def _numpy_coefficients(M):
    """A^(k)_q = (-1)^k sum <1 mu 1 nu|k q> e_mu.M.e_nu, built with numpy and the PDG table."""
    cgt, e = _pdg_cg_1x1(), _numpy_spherical_basis()
    out = {}
    for k in (0, 1, 2):
        out[k] = {q: (-1) ** k * sum(cgt.get((mu, q - mu, k, q), 0.0) * (e[mu] @ M @ e[q - mu])
                                     for mu in (1, 0, -1) if abs(q - mu) <= 1)
                  for q in range(-k, k + 1)}
    return out


def _numeric(tensor_components):
    return {int(q): complex(c) for q, c in tensor_components.as_dict().items()}


def test_bilinear_recombination_is_the_cartesian_form_symbolic():
    # the recombination sum_k sum_q (-1)^q A_{-q} T_q reproduces sum_ab U_a M_ab V_b exactly
    # (spherical-tensor expansion of a bilinear form; Abragam and Bleaney 1970 use this form)
    cases = [(Iop, MSYM, S), (S, DSYM, S), (S, MSYM, S), (S, MSYM, BVEC), (BVEC, MSYM, J)]
    for U, M, V in cases:
        u = U.vector if hasattr(U, "vector") else U
        v = V.vector if hasattr(V, "vector") else V
        H = _cartesian_form(u, M, v)
        form = bilinear_tensor_form(U, M, V)
        assert canonical(form.recombine() - H) == 0 != canonical(H)
        assert canonical(form.cartesian() - H) == 0
    # vector operators: the kernel does not reorder them, so compare expanded words (U left of V),
    # with S_x = (S_+ + S_-)/2, S_y = (S_+ - S_-)/(2i) (Sakurai eq. 3.5.5)
    r = VectorOperator("r", "L")
    ladder = {S.x: (S.plus + S.minus) / 2, S.y: (S.plus - S.minus) / (2 * I)}
    H = _cartesian_form(r.vector, MSYM, S.vector).xreplace(ladder)
    assert expand(bilinear_tensor_form(r, MSYM, S).recombine() - H) == 0 != H


_RATIONALS = st.fractions(min_value=-3, max_value=3, max_denominator=6)


@settings(database=None, deadline=None)
@given(st.lists(_RATIONALS, min_size=9, max_size=9), st.sampled_from(["IS", "SS", "SB"]))
@example([1, 2, 3, 2, 0, 5, 3, 5, -1], "SS")                  # symmetric
@example([0, 2, -3, -2, 0, 5, 3, -5, 0], "IS")                # antisymmetric
@example([0] * 9, "SB")                                       # nothing left
def test_bilinear_recombination_random_rational(entries, pair):
    M = Matrix(3, 3, [Rational(f.numerator, f.denominator) for f in map(Fraction, entries)])
    U, V = {"IS": (Iop, S), "SS": (S, S), "SB": (S, BVEC)}[pair]
    u = U.vector
    v = V.vector if hasattr(V, "vector") else V
    form = bilinear_tensor_form(U, M, V)
    H = _cartesian_form(u, M, v)
    # canonical() may print equal commutative coefficients differently (Bx*(1 + I)/2 vs
    # Bx*(1/2 + I/2)), so compare the difference
    assert canonical(form.recombine() - H) == 0
    # rank content follows the Cartesian parts (common practice: trace / antisymmetric /
    # symmetric traceless parts of a second-rank tensor)
    expected = [k for k, present in ((0, M.trace() != 0), (1, M != M.T),
                                     (2, (M + M.T) / 2 - M.trace() / 3 * Matrix.eye(3) != Matrix.zeros(3)))
                if present]
    assert list(form.ranks) == expected


def test_bilinear_rank_content():
    # common practice (Cartesian decomposition of a second-rank tensor into trace,
    # antisymmetric and symmetric traceless parts, each irreducible: ranks 0, 1, 2)
    a, b, c, d, e, g = symbols("a b c d e g")
    traceless_symmetric = Matrix([[a, b, c], [b, d, e], [c, e, -a - d]])
    antisymmetric = Matrix([[0, a, b], [-a, 0, c], [-b, -c, 0]])
    assert bilinear_tensor_form(Iop, traceless_symmetric, S).ranks == (2,)
    assert bilinear_tensor_form(Iop, antisymmetric, S).ranks == (1,)
    assert bilinear_tensor_form(Iop, g * Matrix.eye(3), S).ranks == (0,)
    assert bilinear_tensor_form(S, g, BVEC).ranks == (0,)                 # scalar means g * identity
    assert bilinear_tensor_form(Iop, DSYM, S).ranks == (0, 2)             # symmetric: no rank 1
    assert bilinear_tensor_form(Iop, MSYM, S).ranks == (0, 1, 2)
    assert bilinear_tensor_form(Iop, Matrix.zeros(3), S).ranks == ()
    # rank 0 is Tr(M)/3 U.V (common practice)
    form = bilinear_tensor_form(Iop, MSYM, S)
    assert canonical(form.rank_part(0) - MSYM.trace() / 3 * dot(Iop, S)) == 0
    # rank 1 is the antisymmetric part sum U_a (M_ab - M_ba)/2 V_b (common practice)
    anti = _cartesian_form(Iop.vector, (MSYM - MSYM.T) / 2, S.vector)
    assert canonical(form.rank_part(1) - anti) == 0 != canonical(anti)


def test_coefficient_tensors_against_numpy_construction():
    rng = np.random.default_rng(20261202)
    e = _numpy_spherical_basis()
    cgt = _pdg_cg_1x1()
    for _ in range(5):
        ints = rng.integers(-9, 10, size=(3, 3))
        Mnum = ints / 4.0
        M = Matrix(3, 3, [Rational(int(x), 4) for x in ints.flat])
        got = {k: _numeric(A) for k, (A, _) in ((t.rank, (t.coefficient, t.operator))
                                               for t in bilinear_tensor_form(Iop, M, S).terms)}
        expected = _numpy_coefficients(Mnum)
        for k in (0, 1, 2):
            want = expected[k]
            if k not in got:
                assert all(abs(w) < 1e-12 for w in want.values())
                continue
            assert all(abs(got[k][q] - want[q]) < 1e-12 for q in want), (k, got[k], want)
        # normalisation, independently of the (-1)^k derivation: for classical vectors u, v,
        # sum_k sum_q (-1)^q A_{-q} [u x v]^k_q == u.M.v, with [u x v]^k_q from the PDG table
        u, v = rng.normal(size=3), rng.normal(size=3)
        us = {mu: e[mu] @ u for mu in (1, 0, -1)}
        vs = {nu: e[nu] @ v for nu in (1, 0, -1)}
        total = 0.0
        for k in (0, 1, 2):
            for q in range(-k, k + 1):
                t = sum(cgt.get((mu, q - mu, k, q), 0.0) * us[mu] * vs[q - mu]
                        for mu in (1, 0, -1) if abs(q - mu) <= 1)
                total += (-1) ** q * got.get(k, {-q: 0.0})[-q] * t
        assert abs(total - u @ Mnum @ v) < 1e-10
        # Cartesian closed forms stated in the docstring (derived by hand, checked with numpy here)
        m_axial = np.array([Mnum[1, 2] - Mnum[2, 1], Mnum[2, 0] - Mnum[0, 2], Mnum[0, 1] - Mnum[1, 0]])
        assert abs(got[0][0] - (-np.trace(Mnum) / np.sqrt(3))) < 1e-12
        for q in (1, 0, -1):
            assert abs(got[1][q] - (-1j / np.sqrt(2)) * (e[q] @ m_axial)) < 1e-12
        assert abs(got[2][2] - (Mnum[0, 0] - Mnum[1, 1] + 1j * (Mnum[0, 1] + Mnum[1, 0])) / 2) < 1e-12
        assert abs(got[2][0] - (2 * Mnum[2, 2] - Mnum[0, 0] - Mnum[1, 1]) / np.sqrt(6)) < 1e-12
        assert abs(got[2][-1] - (Mnum[0, 2] + Mnum[2, 0] - 1j * (Mnum[1, 2] + Mnum[2, 1])) / 2) < 1e-12


@pytest.mark.parametrize("U, V, generators", [
    (Iop, S, (Iop, S)),      # [I x S]^k rotates under I + S
    (S, S, (S,)),            # [S x S]^k rotates under S
])
def test_operator_tensors_transform_as_tensors(U, V, generators):
    # Racah 1942: [Jz, T^k_q] = q T^k_q, [J+-, T^k_q] = sqrt(k(k+1) - q(q+-1)) T^k_{q+-1}
    Jz = Add(*[G.z for G in generators])
    Jp = Add(*[G.plus for G in generators])
    Jm = Add(*[G.minus for G in generators])
    form = bilinear_tensor_form(U, MSYM, V)
    assert form.ranks == (0, 1, 2)
    for k, (A, T) in ((k, form[k][0]) for k in form.ranks):
        assert T == tensor_product(U, V, k)
        for q in range(-k, k + 1):
            Tq = T[q]
            assert canonical(Jz * Tq - Tq * Jz) == canonical(q * Tq)
            up = canonical(Jp * Tq - Tq * Jp)
            down = canonical(Jm * Tq - Tq * Jm)
            assert up == (canonical(sqrt(k * (k + 1) - q * (q + 1)) * T[q + 1]) if q < k else 0)
            assert down == (canonical(sqrt(k * (k + 1) - q * (q - 1)) * T[q - 1]) if q > -k else 0)


def _spin_hamiltonian():
    A = Matrix(3, 3, lambda a, b: Symbol(f"A{a}{b}"))
    g = Matrix(3, 3, lambda a, b: Symbol(f"g{a}{b}"))
    H = (_cartesian_form(S.vector, DSYM, S.vector) + _cartesian_form(Iop.vector, A, S.vector)
         + _cartesian_form(S.vector, g, BVEC))
    return [(S, DSYM, S), (Iop, A, S), (S, g, BVEC)], H


def test_spin_hamiltonian_matches_decompose_rank_by_rank():
    # the factored form and the projector method (decompose, B rotated along) are independent
    # constructions of the same unique irreducible parts (Racah 1942)
    forms, H = _spin_hamiltonian()
    tf = spin_hamiltonian_tensor_form(forms)
    parts = decompose(H, vectors=[BVEC])
    assert tf.ranks == tuple(sorted(parts)) == (0, 1, 2)
    for k in (0, 1, 2):
        assert canonical(tf.rank_part(k) - Add(*parts[k].values())) == 0 != canonical(tf.rank_part(k))
    assert canonical(tf.recombine() - H) == 0
    # pairs per rank, in input order: D has no rank 1
    assert [len(tf[k]) for k in (0, 1, 2)] == [3, 2, 3]
    assert [t.form for t in tf.terms if t.rank == 1] == [1, 2]
    assert list(tf) == list(tf.terms) and len(tf) == 8 and tf[3] == ()
    assert tf.as_dict()[1] == list(tf[1])


def test_vector_operator_form_matches_decompose():
    r = VectorOperator("r", "L")
    H = _cartesian_form(r.vector, MSYM, S.vector)
    tf = bilinear_tensor_form(r, MSYM, S)
    parts = decompose(H)
    assert tf.ranks == tuple(sorted(parts))
    for k in tf.ranks:
        assert expand(tf.rank_part(k) - Add(*parts[k].values())) == 0


def test_tensor_form_printing_is_deterministic():
    g, Bz = symbols("g Bz")
    tf = spin_hamiltonian_tensor_form([(S, g, (0, 0, Bz))])
    assert str(tf) == ("TensorForm(\n  k=0, form 0: A = TensorComponents(0, (-sqrt(3)*g)), "
                       "T = TensorComponents(0, (-sqrt(3)*Bz*S.z/3)))")
    assert repr(tf) == str(tf)
    assert latex(tf) == (r"\begin{aligned} A^{(0)} = \left[- \sqrt{3} g\right]^{(0)}, & T^{(0)} = "
                         r"\left[- \frac{\sqrt{3} Bz S_{z}}{3}\right]^{(0)} & \text{(form 0)} \end{aligned}")
    assert "k=0, form 0:" in pretty(tf, use_unicode=False)
    assert str(spin_hamiltonian_tensor_form([])) == "TensorForm()"
    term = tf.terms[0]
    assert isinstance(term, TensorFormTerm) and isinstance(tf, TensorForm)
    assert pickle.loads(pickle.dumps(term)) == term
    assert str(pickle.loads(pickle.dumps(tf))) == str(tf)


def test_bilinear_bad_input():
    with pytest.raises(OperatorError):
        bilinear_tensor_form(S.vector, MSYM, S)               # operators go in as objects
    with pytest.raises(OperatorError):
        bilinear_tensor_form(Symbol("x"), MSYM, S)
    with pytest.raises(TensorOperatorError):
        bilinear_tensor_form(S, Matrix.eye(2), S)
    with pytest.raises(TensorOperatorError):
        bilinear_tensor_form(S, [[1, 2], [3, 4]], S)
    with pytest.raises(TensorOperatorError):
        bilinear_tensor_form(S, np.eye(2), S)
    assert bilinear_tensor_form(S, np.eye(3, dtype=int), S).ranks == (0,)  # numpy arrays accepted
    with pytest.raises(NotNumericError):
        bilinear_tensor_form(S, [["1", 0, 0], [0, 1, 0], [0, 0, 1]], S)   # text is never parsed
    with pytest.raises(OperatorError):
        bilinear_tensor_form(S, S.z, S)                                   # operator-valued M
    with pytest.raises(OperatorError):
        spin_hamiltonian_tensor_form([(S, 1)])
