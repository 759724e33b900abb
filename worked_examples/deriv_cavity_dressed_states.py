"""Dressed states of the (fictitious) ion "Dravium-7+" in a one-mode cavity: spin-boson algebra.

Dravium-7+ is an invented species used only as a scenario: two of its levels, split by
``w0``, form a spin 1/2 (label ``S``, ``S_z = +1/2`` the upper level); they couple with
strength ``g`` to one cavity mode of frequency ``w`` (boson mode ``a``) in the
rotating-wave form

    H = w N + w0 S_z + g (S_+ a + S_- a^dagger),        N = a^dagger a,

hbar = 1, Condon-Shortley phases for ``S``, ``a|n> = sqrt(n)|n-1>`` (see ``DEVELOPERS.md``).
The derivations below

* prove, in the operator algebra (every representation), that the excitation number
  ``S_z + N`` commutes with H;
* read the coupling ``<up, n| H |down, n+1> = g sqrt(n+1)`` off the spin-boson kets for a
  symbolic photon number ``n``;
* find, block by block of the exact matrix on n <= 4 (blocks of fixed ``M + N`` found by the
  library), the dressed doublets E(n, +-) = w (n + 1/2) +- sqrt(D^2 + 4 g^2 (n+1))/2 with
  D = w0 - w (the Jaynes-Cummings spectrum; Jaynes and Cummings, Proc. IEEE 51, 89 (1963),
  from memory), and at resonance the vacuum Rabi splitting 2 g.
"""

from sympy import Rational, Symbol, sqrt, symbols

from amalgebra.algebra import AngularMomentum
from amalgebra.bosons import BosonMode, fock_bra, fock_ket
from amalgebra.derivations import derivation, written
from amalgebra.states import bra, hamiltonian_matrix, ket

SPIN, MODE = AngularMomentum("S"), BosonMode("a")
w, w0, g = symbols("omega omega_0 g", positive=True)
n = Symbol("n", integer=True, nonnegative=True)
lam = Symbol("lambda")
HALF = Rational(1, 2)
CUTOFF = 4


def hamiltonian():
    """w N + w0 S_z + g (S_+ a + S_- a^dagger) for Dravium-7+ in the cavity."""
    return w*MODE.number + w0*SPIN.z + g*(SPIN.plus*MODE.annihilate + SPIN.minus*MODE.create)


def dressed(photons, sign):
    """The dressed level of the doublet {|up, n>, |down, n+1>}, upper (sign = +1) or lower branch."""
    return w*(photons + HALF) + sign*sqrt((w0 - w)**2 + 4*g**2*(photons + 1))/2


@derivation(title="The excitation number of Dravium-7+ in the cavity is conserved")
def excitation_number(d):
    """$[H, S_z + N] = 0$ as an operator identity: $S_+ a$ raises $m_S$ by one and lowers $n$
    by one, $S_- a^\\dagger$ the reverse, and the rest is diagonal."""
    H = hamiltonian()
    X = SPIN.z + MODE.number
    d.step("commutes", H*X - X*H, 0, "normal-ordered commutator of $H$ with $S_z + N$",
           also_at=[{"S": HALF, "a": 3}])
    d.result("excitation_number", X)


@derivation(title="The spin-photon coupling of Dravium-7+ for any photon number")
def coupling_element(d):
    """$\\langle\\uparrow, n|H|\\downarrow, n+1\\rangle = g\\sqrt{n+1}$ from
    $S_+|\\downarrow\\rangle = |\\uparrow\\rangle$ and $a|n+1\\rangle = \\sqrt{n+1}|n\\rangle$, for a
    symbolic photon number $n$; the diagonal elements are $w n \\pm w_0/2$."""
    up_bra = bra(HALF, HALF, "S")*fock_bra(n, modes="a")
    down_ket = ket(HALF, -HALF, "S")*fock_ket(n + 1, modes="a")
    H = hamiltonian()
    d.step("flip", up_bra*H*down_ket, g*sqrt(n + 1), "one photon absorbed, the ion raised")
    d.step("diagonal_up", up_bra*H*(ket(HALF, HALF, "S")*fock_ket(n, modes="a")), w*n + w0/2,
           "$w N + w_0 S_z$ on $|\\uparrow, n\\rangle$")
    d.result("g_n", g*sqrt(n + 1))


@derivation(title="Dressed doublets of Dravium-7+ on the truncated cavity")
def dressed_doublets(d):
    """The exact matrix of $H$ on $n \\le 4$ splits into blocks of fixed $M + N$ (found by the
    library); each $2\\times2$ block $\\{|\\uparrow, n\\rangle, |\\downarrow, n+1\\rangle\\}$ has
    characteristic polynomial $(\\lambda - E_{n+})(\\lambda - E_{n-})$, an exact identity because
    the square root squares out.  The truncated space is $P H P$ for the projector $P$ on
    $n \\le 4$, so $|\\uparrow, 4\\rangle$ (whose partner $|\\downarrow, 5\\rangle$ is cut) and the
    ground state $|\\downarrow, 0\\rangle$ stand alone."""
    hm = hamiltonian_matrix(hamiltonian(), {"S": HALF, "a": CUTOFF})
    assert hm.conserved == ("M+N",)
    d.step("blocks", written(r"N_{\text{blocks}}", len(hm.blocks)), CUTOFF + 2,
           "$M + N = 1/2 + k$, $k = -1, \\dots, 4$")
    for blk in hm.blocks:
        excitations = blk.quantum_numbers["M+N"]
        if blk.size == 1:
            continue
        photons = excitations - HALF
        d.step(f"charpoly_n{photons}", blk.matrix.charpoly(lam).as_expr(),
               (lam - dressed(photons, 1))*(lam - dressed(photons, -1)),
               f"the doublet with {photons} photon(s) and the ion up")
    ground = hm.blocks[-1].matrix[0, 0]
    d.step("ground", written(r"E_{\downarrow, 0}", ground), -w0/2,
           "the last $1\\times1$ block, $|\\downarrow, 0\\rangle$: no photon, the ion down")
    splitting = (dressed(0, 1) - dressed(0, -1)).subs(w0, w)
    d.step("vacuum_rabi", written(r"E_{0+} - E_{0-}\big|_{w_0 = w}", splitting), 2*g,
           "the vacuum Rabi splitting at resonance")
    d.result("E_plus", dressed(n, 1))
    d.result("E_minus", dressed(n, -1))
