"""Wigner d-matrix elements of the (fictitious) ion "Calyxium-40" through Schwinger's bosons.

Calyxium-40 is an invented ion used only as a scenario: its ground level has J = 3/2,
and we rotate it about y by an angle beta (a quantisation axis tilted by beta).  In
Schwinger's oscillator model (fixed in ``DEVELOPERS.md``; Schwinger 1952, Sakurai
section 3.8)

    J+ = a^dagger b,  J- = b^dagger a,  Jz = (N_a - N_b)/2,
    |j m> = (a^dagger)^(j+m) (b^dagger)^(j-m) |0> / sqrt((j+m)! (j-m)!),

the rotation U = exp(-i beta Jy) only rotates the two creation operators,
a^dagger -> cos(beta/2) a^dagger + sin(beta/2) b^dagger,
b^dagger -> -sin(beta/2) a^dagger + cos(beta/2) b^dagger, so the rotated ket is a
polynomial in two creators applied to the vacuum, and d^j_{m'm}(beta) = <j m'|U|j m>
is read off as one Fock component.  Active rotations, Condon-Shortley phases.  The
derivations below

* prove the boson images of the commutation relations, of J^2 and of [Jy, a^dagger]
  in the normal-ordered (canonical) boson algebra;
* compute every d^{3/2}_{m'm}(beta) in the boson picture with
  :mod:`amalgebra.bosons` and compare it with :func:`amalgebra.rotations.wigner.small_d`
  and with Wigner's explicit sum (Sakurai eq. 3.8.33; from memory);
* check the unitarity of the rotated kets.
"""

from sympy import Add, I, Mul, Rational, Symbol, cos, expand, factorial, sin, sqrt

from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import (BosonMode, apply_bosons, fock_bra, fock_inner, fock_ket,
                              rotated_creators, to_bosons, vacuum)
from amalgebra.derivations import derivation, written
from amalgebra.derivations.written import commutator_side
from amalgebra.rotations.wigner import RotationElement

J = AngularMomentum("J")
MODE_A, MODE_B = BosonMode("a"), BosonMode("b")
J_ION = Rational(3, 2)
beta = Symbol("beta", real=True)


def _projections(j):
    return [j - k for k in range(int(2*j) + 1)]


def _tag(m):
    value = int(2*m)
    return ("p" if value >= 0 else "m") + str(abs(value))


def rotated_ket(j, m, angle=beta):
    """exp(-i angle Jy)|j m> as Fock kets: the rotated creators applied to the vacuum."""
    up, down = rotated_creators(angle)
    p, q = int(j + m), int(j - m)
    return apply_bosons(up**p*down**q, vacuum())/sqrt(factorial(p)*factorial(q))


def wigner_sum(j, mp, m, angle=beta):
    """Wigner's explicit formula for d^j_{m'm}, summed over k by hand."""
    c, s = cos(angle/2), sin(angle/2)
    terms = []
    for k in range(int(2*j) + 1):
        dens = (j + m - k, k, j - k - mp, k - m + mp)
        if min(dens) < 0:
            continue
        num = sqrt(factorial(j + m)*factorial(j - m)*factorial(j + mp)*factorial(j - mp))
        den = factorial(dens[0])*factorial(dens[1])*factorial(dens[2])*factorial(dens[3])
        terms.append((-1)**(k - m + mp)*num/den*c**(2*j - 2*k + m - mp)*s**(2*k - m + mp))
    return Add(*terms)


@derivation(title="Angular momentum in Schwinger's boson picture")
def boson_images(d):
    """Identities in the normal-ordered algebra of two boson modes:
    $[a^\\dagger b, b^\\dagger a] = N_a - N_b$ (the image of $[J_+, J_-] = 2J_z$),
    $J^2 \\mapsto \\tfrac{N}{2}(\\tfrac{N}{2} + 1)$, and $[J_y, a^\\dagger] = \\tfrac{i}{2}b^\\dagger$,
    $[J_y, b^\\dagger] = -\\tfrac{i}{2}a^\\dagger$, which make $e^{-i\\beta J_y}$ a rotation of
    the two creators (Sakurai section 3.8; from memory)."""
    na, nb = MODE_A.number, MODE_B.number
    d.step("ladder_commutator", commutator_side(to_bosons(J.plus), to_bosons(J.minus)), na - nb,
           "$a^\\dagger b\\, b^\\dagger a - b^\\dagger a\\, a^\\dagger b$ normal-ordered")
    d.step("is_2Jz", written(r"\Phi(2 J_z)", to_bosons(2*J.z)), na - nb,
           "$\\Phi$ the Schwinger map: $J_z \\mapsto (N_a - N_b)/2$")
    d.step("casimir", written(r"\Phi(\mathbf{J}^2)", to_bosons(J.squared)), (na + nb)/2*((na + nb)/2 + 1),
           "$J_z^2 + (J_+J_- + J_-J_+)/2$ with $[a, a^\\dagger] = 1$")
    d.step("jy_on_a", commutator_side(to_bosons(J.y), MODE_A.create), I*MODE_B.create/2,
           "$J_y = (a^\\dagger b - b^\\dagger a)/2i$")
    d.step("jy_on_b", commutator_side(to_bosons(J.y), MODE_B.create), -I*MODE_A.create/2,
           "the same for $b^\\dagger$")
    on_fock = fock_inner(fock_bra(2, 1), apply_bosons(to_bosons(J.squared), fock_ket(2, 1)))
    d.step("casimir_value", written(r"\langle 2, 1|\Phi(\mathbf{J}^2)|2, 1\rangle", on_fock),
           Mul(J_ION, J_ION + 1, evaluate=False), "$n_a + n_b = 3$: $j = 3/2$")
    # the stored-results grammar has no names for boson operators: store the number
    d.result("casimir_on_fock_2_1", on_fock)


@derivation(title="$d^{3/2}_{m'm}(\\beta)$ of Calyxium-40 from the rotated creators")
def calyxium_d_matrix(d):
    """For each $m$ the rotated ket is built from the rotated creators and projected on
    $|j m'\\rangle = |n_a = j + m', n_b = j - m'\\rangle$; all sixteen elements agree with
    the rotation module's $d^j_{m'm}$ and with Wigner's sum, and each rotated ket has
    unit norm ($\\sum_{m'} (d^j_{m'm})^2 = 1$)."""
    j = J_ION
    for m in _projections(j):
        state = rotated_ket(j, m)
        column = []
        for mp in _projections(j):
            element = fock_inner(fock_bra(int(j + mp), int(j - mp)), state)
            column.append(element)
            tag = f"{_tag(mp)}_{_tag(m)}"
            fock = written(rf"\langle {int(j + mp)}, {int(j - mp)}|R_y(\beta)|{int(j + m)}, {int(j - m)}\rangle",
                           element)
            d.step(f"d_{tag}", fock, RotationElement(j, mp, m, 0, beta, 0),
                   f"boson picture ($R_y(\\beta) = e^{{-i\\beta J_y}}$ on Fock kets $|n_a, n_b\\rangle$) "
                   f"vs the rotation module, m' = {mp}, m = {m}")
            d.then(f"wigner_{tag}", wigner_sum(j, mp, m), "Wigner's explicit sum")
        d.step(f"unitary_{_tag(m)}", written(rf"\sum_{{m'}} \bigl(d^{{3/2}}_{{m',{m}}}(\beta)\bigr)^2",
                                             Add(*[e**2 for e in column])), 1,
               f"the rotated ket of m = {m} has unit norm")
    d.step("top_corner", written(r"\langle 3, 0|R_y(\beta)|2, 1\rangle",
                                 fock_inner(fock_bra(3, 0), rotated_ket(j, Rational(1, 2)))),
           -sqrt(3)*cos(beta/2)**2*sin(beta/2),
           "$d^{3/2}_{3/2,1/2} = -\\sqrt3\\cos^2(\\beta/2)\\sin(\\beta/2)$ (Sakurai's table; from memory)")
    d.result("d_p3_p1", expand(fock_inner(fock_bra(3, 0), rotated_ket(j, Rational(1, 2)))))
    d.result("d_p1_p1", expand(fock_inner(fock_bra(2, 1), rotated_ket(j, Rational(1, 2)))))
