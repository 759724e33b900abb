"""Hyperfine plus Zeeman structure of the (fictitious) atom "Quillium-93": the Breit-Rabi formula.

Quillium-93 is an invented species used only as a scenario: nuclear spin I = 5/2
(label ``I``), a ground level with J = 1/2 (label ``J``), magnetic hyperfine constant
``A > 0`` and, in a field B along z,

    H = A I.J + b (gJ Jz + gI Iz),        b = mu_B B,

with the g-factors ``gJ``, ``gI`` kept symbolic (the sign convention puts the nuclear
Zeeman term with a plus sign and a signed ``gI``).  hbar = 1, Condon-Shortley phases
(see ``DEVELOPERS.md``).  ``Jz + Iz`` commutes with H, so the exact matrix in the
uncoupled basis |m_I> |m_J> splits into blocks of fixed M = m_I + m_J; every block is
at most 2x2 because J = 1/2.  The derivations below

* find the zero-field levels F = 3 and F = 2 and the splitting dW = A (I + 1/2);
* prove, block by block, that the eigenvalues are the Breit-Rabi formula
  (Breit and Rabi, Phys. Rev. 38, 2082 (1931)):
  E(M) = -dW/(2(2I+1)) + gI b M +- (dW/2) sqrt(1 + 4 M x/(2I+1) + x^2),
  x = (gJ - gI) b / dW, with the stretched states M = +-(I + 1/2) on a single branch;
* read off the weak-field g_F factors from the slope at b = 0.

The level diagram against the field is drawn by the library
(:mod:`amalgebra.plotting`: the exact coupled-basis matrix of H, diagonalised block by
block at each field value, levels labelled by F and M) with invented numbers
(``PLOT_VALUES``); it needs the optional dependency matplotlib
(``pip install amalgebra[plot]``), the derivations never do::

    python worked_examples/deriv_hyperfine_zeeman.py levels.png
"""

import sys

from sympy import Add, Mul, Rational, Symbol, diff, sqrt, symbols

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.derivations import derivation, written
from amalgebra.states import hamiltonian_matrix

I_SPIN = Rational(5, 2)
J_SPIN = Rational(1, 2)
NUC, EL = AngularMomentum("I"), AngularMomentum("J")
A = Symbol("A", positive=True)
b, gJ, gI = symbols("b g_J g_I", real=True)
M = Symbol("M")
lam = Symbol("lambda")

#: Invented Quillium-93 parameters for the plot: A in GHz, b = mu_B B in GHz.
PLOT_VALUES = {"A": 1.872, "gJ": 2.0023, "gI": -0.000412}

DW = A*(I_SPIN + Rational(1, 2))       # zero-field splitting E(F=3) - E(F=2)
X = (gJ - gI)*b/DW


def hamiltonian():
    """A I.J + b (gJ Jz + gI Iz) for Quillium-93."""
    return A*dot(NUC, EL) + b*(gJ*EL.z + gI*NUC.z)


def breit_rabi(sign, m=M):
    """The Breit-Rabi level of the upper (sign = +1) or lower (sign = -1) branch."""
    root = sqrt(1 + 4*m*X/(2*I_SPIN + 1) + X**2)
    return -DW/(2*(2*I_SPIN + 1)) + gI*b*m + sign*DW/2*root


def _doubled(value):
    """Name fragment for a half-integer M: 5/2 -> 'p5', -3/2 -> 'm3' (doubled)."""
    value = int(2*value)
    return ("p" if value >= 0 else "m") + str(abs(value))


@derivation(title="Zero-field hyperfine levels of Quillium-93")
def zero_field_levels(d):
    """In the coupled basis $|(I J) F M_F\\rangle$ the operator $A\\,\\mathbf{I}\\cdot\\mathbf{J}$ is
    diagonal with $E_F = \\tfrac{A}{2}[F(F+1) - I(I+1) - J(J+1)]$ (the Lande interval rule;
    from memory), so $F = 3$ lies at $5A/4$, $F = 2$ at $-7A/4$, and the splitting is
    $\\Delta W = A(I + 1/2) = 3A$."""
    hc = hamiltonian_matrix(A*dot(NUC, EL), {"I": I_SPIN, "J": J_SPIN}, basis="coupled")
    level = {}
    for blk in hc.blocks:
        level.setdefault(blk.quantum_numbers["F"], blk.matrix[0, 0])
    for F in (3, 2):
        K = Add(F*(F + 1), -I_SPIN*(I_SPIN + 1), -J_SPIN*(J_SPIN + 1), evaluate=False)
        d.step(f"level_F{F}", level[F], Mul(A/2, K, evaluate=False),
               f"diagonal element of the coupled-basis matrix, F = {F}, "
               "against the interval-rule formula")
    d.step("splitting", written("E_3 - E_2", level[3] - level[2]), DW, "$\\Delta W = E_3 - E_2 = A(I + 1/2)$")
    d.step("centroid", written("7 E_3 + 5 E_2", 7*level[3] + 5*level[2]), 0,
           "$\\sum_F (2F+1) E_F = \\mathrm{tr}\\,A\\,\\mathbf{I}\\cdot\\mathbf{J} = 0$")
    d.result("E_F3", level[3])
    d.result("E_F2", level[2])


@derivation(title="Breit-Rabi formula for every M block of Quillium-93")
def breit_rabi_blocks(d):
    """The exact matrix of $H$ in the uncoupled basis has blocks of fixed
    $M = m_I + m_J$.  For $|M| < I + 1/2$ a block is $2\\times 2$ and its characteristic
    polynomial equals $(\\lambda - E_+)(\\lambda - E_-)$ with $E_\\pm$ the Breit-Rabi
    levels (Breit and Rabi 1931), an exact polynomial identity because the square root
    squares out.  The stretched states $M = \\pm(I + 1/2)$ are $1\\times 1$ blocks lying
    on one branch, with $\\sqrt{(1 \\pm x)^2}$ replaced by $1 \\pm x$."""
    hm = hamiltonian_matrix(hamiltonian(), {"I": I_SPIN, "J": J_SPIN})
    d.step("conserved", written(r"N_{\text{blocks}}", len(hm.blocks)), 2*(I_SPIN + J_SPIN) + 1,
           "one block per $M = I + J, \\dots, -(I + J)$: $J_z + I_z$ commutes with $H$")
    top = I_SPIN + J_SPIN
    for blk in hm.blocks:
        m = blk.quantum_numbers["M"]
        tag = _doubled(m)
        if abs(m) == top:
            sign = 1 if m > 0 else -1
            stretched = (-DW/(2*(2*I_SPIN + 1)) + gI*b*m + DW/2*(1 + sign*X))
            d.step(f"stretched_M{tag}", blk.matrix[0, 0], stretched,
                   f"$1\\times1$ block M = {m}: $m_I = {'' if sign > 0 else '-'}I$, $m_J = {m - sign*I_SPIN}$")
            continue
        charpoly = blk.matrix.charpoly(lam).as_expr()
        d.step(f"charpoly_M{tag}", charpoly,
               (lam - breit_rabi(1, m))*(lam - breit_rabi(-1, m)),
               f"characteristic polynomial of the M = {m} block, Breit-Rabi roots")
    d.result("E_upper", breit_rabi(1))
    d.result("E_lower", breit_rabi(-1))
    d.result("E_stretched_top", hm.blocks[0].matrix[0, 0])


@derivation(title="Weak-field g_F of Quillium-93 from the Breit-Rabi slope")
def weak_field_g_factors(d):
    """The slope $\\partial E_\\pm/\\partial b$ at $b = 0$ is $g_F M$ with the vector-model
    factor $g_F = g_J\\,\\frac{F(F+1) - I(I+1) + J(J+1)}{2F(F+1)}
    + g_I\\,\\frac{F(F+1) + I(I+1) - J(J+1)}{2F(F+1)}$ (standard weak-field result, e.g.
    Woodgate, Elementary Atomic Structure, ch. 9; from memory); the upper branch is
    $F = 3$, the lower $F = 2$ ($A > 0$)."""
    results = {}
    for F, sign in ((3, 1), (2, -1)):
        ff, ii, jj = F*(F + 1), I_SPIN*(I_SPIN + 1), J_SPIN*(J_SPIN + 1)
        g_F = gJ*(ff - ii + jj)/(2*ff) + gI*(ff + ii - jj)/(2*ff)
        slope = diff(breit_rabi(sign), b).subs(b, 0)
        d.step(f"slope_F{F}", slope, g_F*M, f"derivative of the Breit-Rabi level at $b = 0$, F = {F}")
        results[F] = g_F
    d.step("sum_rule", written("g_{F=3} + g_{F=2}", results[3] + results[2]), 2*gI,
           "for $J = 1/2$ the electronic parts $\\pm g_J/(2I+1)$ cancel")
    d.result("g_F3", results[3])
    d.result("g_F2", results[2])


def plot_hamiltonian():
    """The exact matrix of :func:`hamiltonian` in the coupled basis |(I J) F M>, ``b`` left symbolic.

    This is what the level plot diagonalises: ``M`` is conserved (its blocks label the
    levels exactly); ``F`` is read off at ``b = 0``, where the coupled kets are the eigenstates.
    """
    return hamiltonian_matrix(hamiltonian(), {"I": I_SPIN, "J": J_SPIN}, basis="coupled")


def level_curves(fields, values=None):
    """Numeric Quillium-93 levels along ``b = mu_B B`` from the library
    (:func:`amalgebra.plotting.energy_levels` on :func:`plot_hamiltonian`).

    ``values`` overrides :data:`PLOT_VALUES` (keys ``A``, ``gJ``, ``gI``).  Returns the
    :class:`~amalgebra.plotting.LevelCurves`: twelve levels labelled by ``F`` (at
    ``b = 0``) and ``M``; energies are ``E/h`` in the unit of ``A`` (GHz).  Needs numpy.
    """
    from amalgebra.plotting import energy_levels

    vals = dict(PLOT_VALUES, **(values or {}))
    return energy_levels(plot_hamiltonian(), b, fields, label_at=0,
                         parameters={A: vals["A"], gJ: vals["gJ"], gI: vals["gI"]})


def write_level_plot(path, fields=None, values=None):
    """Write the level diagram of Quillium-93 against ``b = mu_B B`` (GHz); return the path.

    Drawn by :func:`amalgebra.plotting.plot_levels` (colour and legend by ``F``, each
    curve annotated with its ``M``).  Needs the optional dependency matplotlib
    (``amalgebra[plot]``); raises ``ModuleNotFoundError`` with an install hint when it
    is missing.
    """
    from amalgebra.plotting import plot_levels

    if fields is None:
        fields = [0.05*k for k in range(121)]
    ax = plot_levels(level_curves(fields, values), color_by="F", annotate=("M",),
                     energy_unit="GHz", field_label=r"$\mu_B B/h$",
                     title="Quillium-93 (invented): hyperfine levels in a field, I = 5/2, J = 1/2")
    ax.figure.savefig(path, dpi=120)
    return path


def main(argv=None):
    """Command line: ``python deriv_hyperfine_zeeman.py [OUTPUT]`` writes the level diagram."""
    import argparse
    from pathlib import Path

    parser = argparse.ArgumentParser(
        prog="deriv_hyperfine_zeeman.py",
        description="Draw the hyperfine-Zeeman level diagram of the invented atom Quillium-93 "
                    "(needs matplotlib: pip install 'amalgebra[plot]').")
    parser.add_argument("output", nargs="?", default="quillium93_levels.png",
                        help="image file to write: .png, .pdf or .svg (default: %(default)s)")
    args = parser.parse_args(argv)
    if Path(args.output).suffix.lower() not in (".png", ".pdf", ".svg"):
        parser.error(f"output={args.output!r} must end in .png, .pdf or .svg")
    print(write_level_plot(args.output))
    return 0


if __name__ == "__main__":  # pragma: no cover - manual use
    sys.exit(main())
