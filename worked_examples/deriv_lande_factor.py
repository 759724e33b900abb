"""The Lande factor g_J of the (fictitious) ion "Zorbium-IV" as a matrix element.

Zorbium-IV is an invented triply ionised atom used only as a scenario; its ground term
is taken to be ^4F_{9/2}: orbital L = 3 (label ``L``), spin S = 3/2 (label ``S``),
coupled to J = 9/2 in the LS basis |(L S) J M>.  The magnetic moment operator (in
units of -mu_B) is the vector operator

    V = gL L + gS S,        gL = 1, gS symbolic (about 2.0023 for an electron spin).

hbar = 1, Condon-Shortley phases, spherical components ``V_{+1} = -(Vx + i Vy)/sqrt(2)``
and the Wigner-Eckart theorem in Edmonds' normalisation (eq. 5.4.1), all as fixed in
``DEVELOPERS.md``.  The derivations below

* prove the operator identity behind the projection theorem,
  J.V = [(gL + gS) J^2 + (gL - gS)(L^2 - S^2)] / 2 with J = L + S;
* compute every diagonal element <J M|Vz|J M> exactly from the coupled kets and find
  g_J M with g_J = 2/3 gL + 1/3 gS (= 4/3 for gS = 2);
* find the reduced matrix element <J||V||J> = g_J <J||J||J> from an off-diagonal
  element, as the projection theorem says (Edmonds 1957, eq. 5.4.3; from memory).
"""

from sympy import Add, Mul, Rational, Symbol, sqrt

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.derivations import derivation, written
from amalgebra.tensors.wigner_eckart import reduced_from_element
from amalgebra.states import coupled_ket, expectation, matrix_element
from amalgebra.tensors import projected_reduced

L_ORB, S_SPIN, J_TOT = 3, Rational(3, 2), Rational(9, 2)
L, S = AngularMomentum("L"), AngularMomentum("S")
gS = Symbol("g_S", positive=True)
gL = 1


def _ket(m):
    return coupled_ket(L_ORB, S_SPIN, J_TOT, m, labels=("L", "S"))


def _lande(j, l, s, g_l, g_s):
    """The vector-model factor (projection theorem) for V = g_l L + g_s S."""
    jj, ll, ss = j*(j + 1), l*(l + 1), s*(s + 1)
    return g_l*(jj + ll - ss)/(2*jj) + g_s*(jj - ll + ss)/(2*jj)


def _tag(m):
    value = int(2*m)
    return ("p" if value >= 0 else "m") + str(abs(value))


@derivation(title="J.V for V = gL L + gS S, an operator identity")
def projection_identity(d):
    """With $\\mathbf{J} = \\mathbf{L} + \\mathbf{S}$ and
    $\\mathbf{J}^2 = \\mathbf{L}^2 + \\mathbf{S}^2 + 2\\,\\mathbf{L}\\cdot\\mathbf{S}$,
    $\\mathbf{J}\\cdot\\mathbf{V} = g_L(\\mathbf{L}^2 + \\mathbf{L}\\cdot\\mathbf{S})
    + g_S(\\mathbf{S}^2 + \\mathbf{L}\\cdot\\mathbf{S})$, proved in the canonical form
    (valid for every $L$, $S$) and read on $|(L S) J M\\rangle$ as a number."""
    g_l = Symbol("g_L")
    jdotv = dot(L, L)*g_l + dot(S, L)*g_l + dot(L, S)*gS + dot(S, S)*gS
    j_squared = L.squared + S.squared + 2*dot(L, S)
    d.step("expand", jdotv, g_l*(L.squared + dot(L, S)) + gS*(S.squared + dot(L, S)),
           "$\\mathbf{L}\\cdot\\mathbf{L} = \\mathbf{L}^2$, $[L_a, S_b] = 0$",
           also_at=[{"L": 1, "S": Rational(1, 2)}])
    d.then("casimirs", ((g_l + gS)*j_squared + (g_l - gS)*(L.squared - S.squared))/2,
           "$\\mathbf{L}\\cdot\\mathbf{S} = (\\mathbf{J}^2 - \\mathbf{L}^2 - \\mathbf{S}^2)/2$")
    jj, ll, ss = J_TOT*(J_TOT + 1), L_ORB*(L_ORB + 1), S_SPIN*(S_SPIN + 1)
    value = ((g_l + gS)*jj + (g_l - gS)*(ll - ss))/2
    d.step("lande", written(r"\langle\mathbf{J}\cdot\mathbf{V}\rangle / J(J+1)", value/jj), _lande(J_TOT, L_ORB, S_SPIN, g_l, gS),
           "$g_J = \\langle\\mathbf{J}\\cdot\\mathbf{V}\\rangle/J(J+1)$ for $^4F_{9/2}$")
    d.result("jdotv_4F92", value)


@derivation(title="Diagonal elements <J M|Vz|J M> = g_J M for Zorbium-IV 4F_9/2")
def diagonal_elements(d):
    """Each $|(L S) J M\\rangle$ is expanded in product kets with Clebsch-Gordan
    coefficients and $\\langle V_z\\rangle$ is computed exactly; every one of the ten
    values is $g_J M$ with the vector-model $g_J$ (Edmonds 1957, eq. 5.4.3; from memory)."""
    g_j = _lande(J_TOT, L_ORB, S_SPIN, gL, gS)
    d.step("g_J_value", written(r"g_J\big|_{g_L=1}", g_j), Rational(2, 3) + gS/3, "$L = 3$, $S = 3/2$, $J = 9/2$, $g_L = 1$")
    vz = gL*L.z + gS*S.z
    for k in range(int(2*J_TOT) + 1):
        m = J_TOT - k
        d.step(f"vz_M{_tag(m)}", written(rf"\langle M{{=}}{m}|V_z|M{{=}}{m}\rangle", expectation(vz, _ket(m))), Mul(g_j, m, evaluate=False),
               f"exact expectation value in the coupled ket, M = {m}")
    d.step("electron_value", written(r"g_J\big|_{g_L=1,\, g_S=2}", g_j.subs(gS, 2)), Rational(4, 3), "$g_S = 2$ (Dirac value)")
    d.result("g_J", g_j)


@derivation(title="Reduced matrix element of V from an off-diagonal element")
def reduced_element(d):
    """$\\langle J, M+1|V_{+1}|J M\\rangle$ with $V_{+1} = -(V_+)/\\sqrt{2}$, computed from
    the coupled kets, is divided by the Wigner-Eckart factor
    $(-1)^{J-M'}\\begin{pmatrix}J&1&J\\\\-M'&1&M\\end{pmatrix}$ (Edmonds eq. 5.4.1); the
    result is $g_J\\langle J\\|J\\|J\\rangle = g_J\\sqrt{J(J+1)(2J+1)}$ for every $M$, as the
    projection theorem requires."""
    v_plus = -(gL*L.plus + gS*S.plus)/sqrt(2)
    jdotv = _lande(J_TOT, L_ORB, S_SPIN, gL, gS)*J_TOT*(J_TOT + 1)
    expected = projected_reduced(J_TOT, jdotv)
    d.step("projected", expected, (Rational(2, 3) + gS/3)*sqrt(J_TOT*(J_TOT + 1)*(2*J_TOT + 1)),
           "$\\langle J\\|V\\|J\\rangle = \\langle\\mathbf{J}\\cdot\\mathbf{V}\\rangle"
           "\\langle J\\|J\\|J\\rangle/J(J+1)$")
    values = []
    for m in (J_TOT - 1, Rational(1, 2), -J_TOT):
        element = matrix_element(_ket(m + 1), v_plus, _ket(m))
        reduced = reduced_from_element(element, J_TOT, m + 1, 1, 1, J_TOT, m)
        d.step(f"from_M{_tag(m)}", reduced, expected,
               f"Wigner-Eckart inversion of the element $M = {m} \\to {m + 1}$")
        values.append(reduced)
    squares = Add(*[abs(matrix_element(_ket(mp), gL*L.z + gS*S.z, _ket(mp)))**2
                    for mp in (J_TOT - k for k in range(int(2*J_TOT) + 1))])
    d.step("sum_of_squares", squares,
           (Rational(2, 3) + gS/3)**2*J_TOT*(J_TOT + 1)*(2*J_TOT + 1)/3,
           "$\\sum_M |\\langle M|V_0|M\\rangle|^2 = |\\langle J\\|V\\|J\\rangle|^2/3$ "
           "(3j orthogonality)")
    d.result("reduced_V", values[0])
