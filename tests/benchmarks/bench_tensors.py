"""Benchmarks of the tensor-operator layer (a script, not a test).

1. The complete table of reduced matrix elements of [T^2(1) x U^2(2)]^k, k = 0..4, between
   coupled states |(j1 j2) J> and |(j1' j2') J'> with j1, j2, j1', j2' in {0, 1/2, ..., 3}
   (Edmonds eq. 7.1.5, 9j symbols), exact, cold caches; target < 10 s.  Symbolic entries
   (coefficient times <j1'||T||j1><j2'||U||j2>) are timed as well.
2. The irreducible decomposition of a general S.D.S + I.A.S + S.g.B spin Hamiltonian with
   symbolic entries (D symmetric, A and g general, B a classical vector); target < 1 s.
   Timed twice: the projector method (decompose, parts X^(k)_q) and the factored form
   (spin_hamiltonian_tensor_form, coefficient tensors A^(k) times operator tensors
   T^(k) = [U x V]^(k)); the two are checked to agree rank by rank (outside the timing).

Run:  python tests/benchmarks/bench_tensors.py
"""

import time

from sympy import Matrix, Rational, Symbol, symbols
from sympy.core.cache import clear_cache

from amalgebra.algebra import AngularMomentum, canonical
from amalgebra.coupling import clear_coupling_caches
from amalgebra.tensors.coupled_schemes import tensor_product_table
from amalgebra.tensors.irreducible import decompose, recombine, spin_hamiltonian_tensor_form

JS = [Rational(n, 2) for n in range(7)]


def _cold():
    clear_cache()
    clear_coupling_caches()


def bench_table():
    _cold()
    start = time.perf_counter()
    table = tensor_product_table(JS, JS, 2, 2, range(5))
    cold = time.perf_counter() - start
    start = time.perf_counter()
    tensor_product_table(JS, JS, 2, 2, range(5))
    warm = time.perf_counter() - start
    _cold()
    start = time.perf_counter()
    symbolic = tensor_product_table(JS, JS, 2, 2, range(5), symbolic=True)
    sym = time.perf_counter() - start
    nonzero = sum(1 for v in table.values() if v != 0)
    print(f"[T^2(1) x U^2(2)]^k table, k = 0..4, j <= 3: {len(table)} entries ({nonzero} nonzero)")
    print(f"  cold, coefficients:           {cold:8.3f} s   (target < 10 s)")
    print(f"  warm (coupling caches full):  {warm:8.3f} s")
    print(f"  cold, symbolic entries:       {sym:8.3f} s")
    assert len(symbolic) == len(table)
    return cold


def spin_hamiltonian():
    S, I = AngularMomentum("S"), AngularMomentum("I")
    D = Matrix(3, 3, lambda a, b: Symbol(f"D{min(a, b)}{max(a, b)}"))
    A = Matrix(3, 3, lambda a, b: Symbol(f"A{a}{b}"))
    g = Matrix(3, 3, lambda a, b: Symbol(f"g{a}{b}"))
    B = symbols("Bx By Bz")
    forms = [(S, D, S), (I, A, S), (S, g, B)]
    Sv, Iv = S.vector, I.vector
    terms = [Sv[a] * D[a, b] * Sv[b] for a in range(3) for b in range(3)]
    terms += [Iv[a] * A[a, b] * Sv[b] for a in range(3) for b in range(3)]
    terms += [Sv[a] * g[a, b] * B[b] for a in range(3) for b in range(3)]
    from sympy import Add
    return Add(*terms), B, forms


def bench_decomposition():
    H, B, forms = spin_hamiltonian()
    _cold()
    start = time.perf_counter()
    parts = decompose(H, vectors=[B])
    cold = time.perf_counter() - start
    start = time.perf_counter()
    decompose(H, vectors=[B])
    warm = time.perf_counter() - start
    _cold()
    start = time.perf_counter()
    decompose(H, vectors=[B], canonicalize=False)
    raw = time.perf_counter() - start
    print("S.D.S + I.A.S + S.g.B decomposition (27 symbols, ranks "
          f"{sorted(parts)}):")
    print(f"  cold, canonical parts:        {cold:8.3f} s   (target < 1 s)")
    print(f"  warm:                         {warm:8.3f} s")
    print(f"  cold, expanded parts only:    {raw:8.3f} s")
    assert canonical(recombine(parts)) == canonical(H)
    _cold()
    start = time.perf_counter()
    factored = spin_hamiltonian_tensor_form(forms)
    fcold = time.perf_counter() - start
    start = time.perf_counter()
    spin_hamiltonian_tensor_form(forms)
    fwarm = time.perf_counter() - start
    _cold()
    start = time.perf_counter()
    with_sums = spin_hamiltonian_tensor_form(forms)
    sums = [with_sums.rank_part(k) for k in with_sums.ranks]
    fsum = time.perf_counter() - start
    pairs = ", ".join(f"k={k}: {len(factored[k])}" for k in factored.ranks)
    print(f"  factored A^(k) . T^(k) ({pairs} pairs):")
    print(f"  cold, factored form:          {fcold:8.3f} s   (target < 1 s)")
    print(f"  warm, factored form:          {fwarm:8.3f} s")
    print(f"  cold, factored + rank sums:   {fsum:8.3f} s   ({len(sums)} expanded sum_q (-1)^q A_-q T_q)")
    for k in factored.ranks:
        assert canonical(factored.rank_part(k) - sum(parts[k].values())) == 0
    return cold, fcold


if __name__ == "__main__":
    bench_table()
    bench_decomposition()
