"""Benchmarks of the tensor-operator layer (a script, not a test).

1. The complete table of reduced matrix elements of [T^2(1) x U^2(2)]^k, k = 0..4, between
   coupled states |(j1 j2) J> and |(j1' j2') J'> with j1, j2, j1', j2' in {0, 1/2, ..., 3}
   (Edmonds eq. 7.1.5, 9j symbols), exact, cold caches; target < 0.3 s and >= 10x the naive
   Fraction route of ../shared/bench/naive_racah.py, timed side by side when that folder is present.  Symbolic entries
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


def _naive_fraction_table():
    """The same entries by the hand-rolled route of ../shared/bench/naive_racah.py (Python ints and
    Fractions: the signed square of sqrt((2J+1)(2J'+1)(2k+1)) * 9j); None when that folder is absent."""
    import importlib.util
    import pathlib

    path = pathlib.Path(__file__).resolve().parents[3] / "shared" / "bench" / "naive_racah.py"
    if not path.exists():
        return None
    spec = importlib.util.spec_from_file_location("naive_racah", path)
    naive = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(naive)
    naive._fact_cache.clear()
    ts = range(7)
    start = time.process_time()
    count = 0
    for t1p in ts:
        for t1 in ts:
            if not naive.tri_ok(t1p, 4, t1):
                continue
            for t2p in ts:
                for t2 in ts:
                    if not naive.tri_ok(t2p, 4, t2):
                        continue
                    for tJ in range(abs(t1 - t2), t1 + t2 + 1, 2):
                        for tJp in range(abs(t1p - t2p), t1p + t2p + 1, 2):
                            for tk in range(0, 9, 2):
                                if naive.tri_ok(tJp, tk, tJ):
                                    naive.w9j_int(t1p, t1, 4, t2p, t2, 4, tJp, tJ, tk) * (tJ + 1) * (tJp + 1) * (tk + 1)
                                    count += 1
    elapsed = time.process_time() - start
    assert count == 12773, count
    return elapsed


def bench_table():
    _cold()
    start = time.process_time()
    table = tensor_product_table(JS, JS, 2, 2, range(5))
    cold = time.process_time() - start
    start = time.process_time()
    tensor_product_table(JS, JS, 2, 2, range(5))
    warm = time.process_time() - start
    _cold()
    start = time.process_time()
    symbolic = tensor_product_table(JS, JS, 2, 2, range(5), symbolic=True)
    sym = time.process_time() - start
    nonzero = sum(1 for v in table.values() if v != 0)
    naive = _naive_fraction_table()
    print(f"[T^2(1) x U^2(2)]^k table, k = 0..4, j <= 3: {len(table)} entries ({nonzero} nonzero); CPU seconds")
    print(f"  cold, coefficients:           {cold:8.3f} s   (target < 0.3 s)")
    if naive is not None:
        print(f"  naive Fraction route:         {naive:8.3f} s   (ratio {naive / cold:5.1f}x, target >= 10x)")
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
