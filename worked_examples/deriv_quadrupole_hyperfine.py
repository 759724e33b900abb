"""Electric-quadrupole hyperfine energies of the (fictitious) atom "Brennium-57".

Brennium-57 is an invented species used only as a scenario: nuclear spin I = 3/2
(label ``I``) and an electronic level with J = 2 (label ``J``), so F = 1/2, ..., 7/2.
The hyperfine Hamiltonian with magnetic-dipole constant ``A`` and electric-quadrupole
constant ``B`` is the usual one (e.g. Woodgate, Elementary Atomic Structure, ch. 9;
Kopfermann, Nuclear Moments; from memory):

    H = A I.J + B [3 (I.J)^2 + (3/2) I.J - I^2 J^2] / [2 I (2I - 1) J (2J - 1)].

hbar = 1, Condon-Shortley phases.  The derivations below

* prove that the quadrupole numerator is three times the contraction of the two
  symmetric traceless second-rank tensors Q_ab = (X_a X_b + X_b X_a)/2 - delta_ab X^2/3
  of I and of J (an operator identity, valid for every I and J);
* evaluate H exactly in the coupled basis |(I J) F M> and find, for every F, the
  Casimir formula E(F) = A K/2 + B [3/4 K(K+1) - I(I+1)J(J+1)] / [2I(2I-1)J(2J-1)],
  K = F(F+1) - I(I+1) - J(J+1);
* check that the quadrupole shifts have zero weighted mean and that the stretched
  level F = I + J is shifted by B/4 for every I, J (symbolic).
"""

from sympy import Add, Mul, Pow, Rational, Symbol, symbols

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.derivations import derivation, written
from amalgebra.states import hamiltonian_matrix

I_SPIN, J_LEVEL = Rational(3, 2), 2
NUC, EL = AngularMomentum("I"), AngularMomentum("J")
A, B = symbols("A B", real=True)
F = Symbol("F", positive=True)


def quadrupole_numerator():
    """3 (I.J)^2 + (3/2) I.J - I^2 J^2 as an operator."""
    ij = dot(NUC, EL)
    return 3*ij*ij + Rational(3, 2)*ij - NUC.squared*EL.squared


def _quadrupole_tensor(X):
    """Cartesian components Q_ab of the symmetric traceless tensor of X, as a dict."""
    comps = {"x": X.x, "y": X.y, "z": X.z}
    out = {}
    for a in "xyz":
        for c in "xyz":
            value = (comps[a]*comps[c] + comps[c]*comps[a])/2
            if a == c:
                value = value - X.squared/3
            out[a, c] = value
    return out


def casimir_energy(i, j, f, a=A, b=B):
    """The Casimir formula for the magnetic-dipole plus electric-quadrupole energy."""
    ii, jj = i*(i + 1), j*(j + 1)
    K = f*(f + 1) - ii - jj
    return a*K/2 + b*(Rational(3, 4)*K*(K + 1) - ii*jj)/(2*i*(2*i - 1)*j*(2*j - 1))


def casimir_shown(i, j, f):
    """The Casimir formula at numbers, left unevaluated so that the report shows K."""
    ii, jj = i*(i + 1), j*(j + 1)
    K = f*(f + 1) - ii - jj
    quadrupole = Mul(Add(Rational(3, 4)*K*(K + 1), -ii*jj, evaluate=False),
                     Pow(2*i*(2*i - 1)*j*(2*j - 1), -1, evaluate=False), evaluate=False)
    return Add(Mul(A, Rational(K, 2), evaluate=False), Mul(B, quadrupole, evaluate=False),
               evaluate=False)


def _tag(f):
    return f"{int(2*f)}"


@derivation(title="The quadrupole operator as a contraction of two rank-2 tensors")
def quadrupole_operator(d):
    """$\\sum_{ab} Q_{ab}(\\mathbf{I})\\,Q_{ab}(\\mathbf{J}) = (\\mathbf{I}\\cdot\\mathbf{J})^2
    + \\tfrac12\\mathbf{I}\\cdot\\mathbf{J} - \\tfrac13\\mathbf{I}^2\\mathbf{J}^2$, proved in
    the canonical form (the $\\tfrac12\\mathbf{I}\\cdot\\mathbf{J}$ comes from reordering
    $I_aI_b$ against $J_bJ_a$ with the commutation relations); cross-checked on the
    exact matrices of two small representations."""
    qi, qj = _quadrupole_tensor(NUC), _quadrupole_tensor(EL)
    contraction = Add(*[qi[key]*qj[key] for key in sorted(qi)])
    ij = dot(NUC, EL)
    d.step("contraction", contraction,
           ij*ij + ij/2 - NUC.squared*EL.squared/3,
           "write out $Q_{ab}$ and reorder",
           also_at=[{"I": 1, "J": 1}, {"I": Rational(3, 2), "J": 1}])
    d.then("numerator", quadrupole_numerator()/3, "factor out $1/3$ of the numerator")
    d.step("traceless", Add(*[qi[a, a] for a in "xyz"]), 0,
           "$Q_{ab}$ is traceless: $\\sum_a X_a^2 = \\mathbf{X}^2$")


@derivation(title="Casimir formula for the hyperfine levels of Brennium-57")
def casimir_levels(d):
    """The exact matrix of $H$ in the coupled basis is diagonal in $F$ and $M_F$;
    each diagonal element equals the Casimir formula with
    $K = F(F+1) - I(I+1) - J(J+1)$ ($I = 3/2$, $J = 2$)."""
    denominator = 2*I_SPIN*(2*I_SPIN - 1)*J_LEVEL*(2*J_LEVEL - 1)
    H = A*dot(NUC, EL) + B*quadrupole_numerator()/denominator
    hm = hamiltonian_matrix(H, {"I": I_SPIN, "J": J_LEVEL}, basis="coupled")
    d.step("conserved", written(r"N_{\text{conserved}}", len(hm.conserved)), 2,
           "both $M$ and $F$ label the blocks")
    level = {}
    for blk in hm.blocks:
        level.setdefault(blk.quantum_numbers["F"], []).append(blk.matrix[0, 0])
    fs = sorted(level)
    for f in fs:
        energies = level[f]
        d.step(f"level_F{_tag(f)}", written(rf"\langle F{{=}}{f}|H|F{{=}}{f}\rangle", energies[0]), casimir_shown(I_SPIN, J_LEVEL, f),
               f"diagonal element at F = {f} (doubled in the name)")
        d.step(f"degenerate_F{_tag(f)}", written(rf"\sum_{{M_F}} E_{{F={f}, M_F}}", Add(*energies)), Mul(2*f + 1, energies[0], evaluate=False),
               f"all $2F+1 = {2*f + 1}$ values of $M_F$ share the level")
    d.step("weighted_mean", written(r"\sum_F (2F+1) E_F",
                                    Add(*[(2*f + 1)*casimir_energy(I_SPIN, J_LEVEL, f) for f in fs])), 0,
           "$\\sum_F (2F+1) E_F = \\mathrm{tr}\\,H = 0$: both terms are traceless")
    for f in fs:
        d.result(f"E_F{_tag(f)}", casimir_energy(I_SPIN, J_LEVEL, f))
    # the same H in the product basis |m_I>|m_J>: 20 x 20, blocks of conserved M only
    hu = hamiltonian_matrix(H, {"I": I_SPIN, "J": J_LEVEL})
    d.step("product_basis_trace", written(r"\operatorname{tr} H_{\text{product}}", hu.matrix.trace()),
           written(r"\operatorname{tr} H_{\text{coupled}}", hm.matrix.trace()),
           "the trace does not depend on the basis")
    d.result("H_product_basis", hu)


@derivation(title="Stretched-level quadrupole shift for symbolic I and J")
def stretched_shift(d):
    """For $F = I + J$, $K = 2IJ$ and the quadrupole shift is $B/4$ for every $I, J$ with
    $2I - 1 \\neq 0 \\neq 2J - 1$: $\\tfrac34 K(K+1) - I(I+1)J(J+1) =
    \\tfrac12 IJ(2I-1)(2J-1)$."""
    i, j = symbols("i j", positive=True)     # I and J of the text
    ii, jj = i*(i + 1), j*(j + 1)
    K = (i + j)*(i + j + 1) - ii - jj
    d.step("K_stretched", K, 2*i*j, "$F(F+1)$ at $F = I + J$")
    d.step("numerator", Rational(3, 4)*(2*i*j)*(2*i*j + 1) - ii*jj,
           i*j*(2*i - 1)*(2*j - 1)/2, "multiply out")
    shift = casimir_energy(i, j, i + j, a=0)
    d.step("shift", written(r"E_Q(F = I + J)", shift), B/4, "divide by $2I(2I-1)J(2J-1)$")
    d.step("brennium", written(r"E_Q(F = \tfrac{7}{2})", casimir_energy(I_SPIN, J_LEVEL, I_SPIN + J_LEVEL, a=0)), B/4,
           "the Brennium-57 case, $F = 7/2$")
    d.result("casimir_formula", casimir_energy(i, j, F))
