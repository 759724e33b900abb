"""Total-spin multiplets of the four unpaired electrons of the (fictitious) tetraradical "Pyrrhocene-4".

Pyrrhocene-4 is an invented molecule used only as a scenario: four spin-1/2 electrons
on a ring, labels ``s1, s2, s3, s4``, with a nearest-neighbour Heisenberg exchange
``H = Jex (s1.s2 + s2.s3 + s3.s4 + s4.s1)``.  hbar = 1, Condon-Shortley phases;
coupled states are built by successive coupling (((s1 s2) S12 s3) S123 s4) S M
(:func:`amalgebra.states.total_spin_states`).  The derivations below

* count the multiplets per total spin S, f(4, S) = 2, 3, 1 for S = 0, 1, 2, against
  the branching-diagram formula f(n, S) = (2S+1) n! / ((n/2+S+1)! (n/2-S)!)
  (Pauncz 1979, ch. 2; from memory) and the dimension 2^4 = 16;
* find the spectrum of the total S^2 on the 16-dimensional space from the exact
  characteristic polynomial, lambda^2 (lambda - 2)^9 (lambda - 6)^5;
* write out the two S = 0 states, identify them with the products of pair singlets
  and with the pair triplets coupled to zero, and check that they are S^2 = 0
  eigenstates; the ring exchange has the levels 0 and -2 Jex in this sector.
"""

from sympy import Add, Integer, Mul, Pow, Rational, Symbol, factor, factorial, sqrt

from amalgebra.algebra import AngularMomentum, dot
from amalgebra.derivations import derivation, written
from amalgebra.matrices.explicit import to_matrix
from amalgebra.states import (apply, inner, ket, multiplet_count, product_ket, singlet,
                              spin_labels, tensor, to_uncoupled, total_spin_squared,
                              total_spin_states)

N_SPINS = 4
HALF = Rational(1, 2)
LABELS = spin_labels(N_SPINS)
Jex = Symbol("J_ex", real=True)
lam = Symbol("lambda")


def branching_formula(n, s):
    """(2S+1) n! / ((n/2+S+1)! (n/2-S)!), the number of spin-S multiplets of n spins 1/2.

    Built unevaluated, so that the report shows the factorials (the check evaluates them).
    """
    def fac(k):
        return factorial(Integer(k), evaluate=False)

    denominator = Mul(fac(Rational(n, 2) + s + 1), fac(Rational(n, 2) - s), evaluate=False)
    return Mul(2*s + 1, fac(n), Pow(denominator, -1, evaluate=False), evaluate=False)


def ring_exchange():
    s = [AngularMomentum(lab) for lab in LABELS]
    return Jex*Add(*[dot(s[k], s[(k + 1) % N_SPINS]) for k in range(N_SPINS)])


def _pair_triplet(m, a, b):
    """The triplet |1 m> of the pair (a, b) in product kets, written out by hand."""
    up, down = (ket(HALF, HALF, a), ket(HALF, HALF, b)), (ket(HALF, -HALF, a), ket(HALF, -HALF, b))
    if m == 1:
        return product_ket(up[0], up[1])
    if m == -1:
        return product_ket(down[0], down[1])
    return (product_ket(up[0], down[1]) + product_ket(down[0], up[1]))/sqrt(2)


@derivation(title="Multiplets of four spins 1/2")
def multiplet_counts(d):
    """Branching-diagram paths against the closed formula, and the dimension check
    $\\sum_S (2S+1) f(4, S) = 2^4$."""
    counts = {}
    for s in (0, 1, 2):
        counts[s] = Integer(multiplet_count(N_SPINS, s))
        d.step(f"count_S{s}", counts[s], branching_formula(N_SPINS, s),
               f"paths to S = {s} in the branching diagram vs the closed formula")
        d.step(f"states_S{s}", Integer(len(total_spin_states(N_SPINS, S=s))),
               Mul(2*s + 1, counts[s], evaluate=False),
               f"coupled kets with S = {s}: $2S+1$ per multiplet")
    d.step("dimension", Add(*[Mul(2*s + 1, counts[s], evaluate=False) for s in counts], evaluate=False),
           Pow(2, N_SPINS, evaluate=False), "the coupled kets span the product space")
    d.step("odd_spin_absent", written(r"f(4, \tfrac{1}{2})", Integer(multiplet_count(N_SPINS, HALF))), 0,
           "half-integer $S$ is impossible for an even number of spins")
    for s in counts:
        d.result(f"multiplets_S{s}", counts[s])


@derivation(title="Spectrum of the total $S^2$ of Pyrrhocene-4")
def total_spin_spectrum(d):
    """The exact $16\\times16$ matrix of $\\mathbf{S}^2 = (\\sum_k \\mathbf{s}_k)^2$ in the
    product basis: its characteristic polynomial has the roots $S(S+1) = 0, 2, 6$ with
    multiplicities $(2S+1) f(4, S) = 2, 9, 5$, and its trace is $4\\cdot\\tfrac34\\cdot16$."""
    js = {lab: HALF for lab in LABELS}
    m = to_matrix(total_spin_squared(LABELS), j=js, kind="exact")
    d.step("trace", written(r"\operatorname{tr}\mathbf{S}^2", m.trace()),
           Add(*[Mul(s*(s + 1), 2*s + 1, multiplet_count(N_SPINS, s), evaluate=False)
                 for s in (0, 1, 2)], evaluate=False),
           "trace = $\\sum_S S(S+1)\\,(2S+1)\\,f(4, S)$, the eigenvalues with their multiplicities")
    d.then("trace_single_spins", Mul(N_SPINS, Rational(3, 4), Pow(2, N_SPINS, evaluate=False), evaluate=False),
           "each $s_k^2 = 3/4$; the $\\mathbf{s}_k\\cdot\\mathbf{s}_l$ are traceless")
    # factored, so that the report line stays readable (the expanded degree-16
    # polynomial is wider than a page); the check still compares the computed
    # characteristic polynomial with the claimed spectrum
    polynomial = factor(m.charpoly(lam).as_expr())
    d.step("charpoly", written(r"\det(\lambda - \mathbf{S}^2)", polynomial), lam**2*(lam - 2)**9*(lam - 6)**5,
           "characteristic polynomial of the exact matrix, factored")
    d.result("trace_S2", m.trace())


@derivation(title="The two singlets of Pyrrhocene-4 and the ring exchange")
def singlet_sector(d):
    """The $S = 0$ kets with intermediate $S_{12} = 0$ and $S_{12} = 1$ are orthonormal
    eigenvectors of $\\mathbf{S}^2$ with eigenvalue 0; the first is the product of the
    pair singlets $(12)(34)$, the second (up to its phase) the pair triplets coupled to
    zero, $(|T_+T_-\\rangle - |T_0T_0\\rangle + |T_-T_+\\rangle)/\\sqrt3$ (CG
    $\\langle 1\\,m\\,1\\,{-m}|0\\,0\\rangle = (-1)^{1-m}/\\sqrt3$).  In this basis the ring
    exchange has the levels $0$ and $-2J_{ex}$."""
    kets = total_spin_states(N_SPINS, S=0, M=0)
    d.step("count", written(r"\dim V_{S=0,\,M=0}", Integer(len(kets))), 2,
           "two branching-diagram paths to $S = 0$; $\\psi_0, \\psi_1$ their kets")
    s2 = total_spin_squared(LABELS)
    flat = [to_uncoupled(k) for k in kets]
    for i, psi in enumerate(flat):
        d.step(f"norm_{i}", written(rf"\langle\psi_{i}|\psi_{i}\rangle", inner(psi, psi)), 1,
               f"singlet {i} is normalised")
        image = apply(s2, psi)
        d.step(f"eigen_{i}", written(rf"\|\mathbf{{S}}^2\psi_{i}\|^2", inner(image, image)), 0,
               f"$\\|\\mathbf{{S}}^2\\psi_{i}\\|^2 = 0$: an $S = 0$ eigenvector")
    d.step("orthogonal", written(r"\langle\psi_0|\psi_1\rangle", inner(flat[0], flat[1])), 0,
           "different intermediate $S_{12}$")
    pair_singlets = tensor(singlet(("s1", "s2")), singlet(("s3", "s4")))
    d.step("pair_singlets", written(r"\langle\chi_{12}\chi_{34}|\psi_0\rangle", inner(pair_singlets, flat[0])), 1,
           "$\\chi_{kl}$ the singlet of the pair $(k l)$: overlap 1 with a normalised state, the same state")
    triplets = Add(*[(-1)**(1 - m)*tensor(_pair_triplet(m, "s1", "s2"), _pair_triplet(-m, "s3", "s4"))
                     for m in (1, 0, -1)])/sqrt(3)
    overlap = inner(triplets, flat[1])
    d.step("pair_triplets", written(r"\langle T_{12}T_{34}|\psi_1\rangle^2", overlap**2), 1,
           "$|T_{12}T_{34}\\rangle$ the pair triplets coupled to zero: overlap $\\pm1$, "
           "the same state up to a phase")
    H = ring_exchange()
    block = [[inner(a, apply(H, b)) for b in flat] for a in flat]
    polynomial = ((lam - block[0][0])*(lam - block[1][1]) - block[0][1]*block[1][0]).expand()
    d.step("ring_levels", polynomial, lam*(lam + 2*Jex),
           "characteristic polynomial of the $2\\times2$ exchange block: levels $0, -2J_{ex}$")
    d.result("triplet_pair_phase", overlap)
    d.result("exchange_block_trace", block[0][0] + block[1][1])
