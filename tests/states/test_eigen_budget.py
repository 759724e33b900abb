"""Issue 11, item 3: the eigenvalue time budget really interrupts, and the result says where.

Budgets are a fraction of a second on work that would take far longer; assertions allow a margin
of 10 s for a shared machine (common practice, no source).  Eigenvalues are checked against
numpy.linalg (independent library) at numeric points.
"""

import threading
import time

import numpy as np
import pytest
from sympy import Matrix, Rational, symbols, sqrt

from amalgebra.algebra import AngularMomentum
from amalgebra.states import eigen
from amalgebra.states.eigen import block_eigenvalues
from amalgebra.states.hamiltonian import hamiltonian_matrix

a, b, c = symbols("a b c")
MARGIN = 10.0


def _main_thread():
    import signal

    return hasattr(signal, "setitimer") and threading.current_thread() is threading.main_thread()


needs_timer = pytest.mark.skipif(not _main_thread(), reason="needs setitimer on the main thread")


def _spin(seconds=30.0):
    end = time.monotonic() + seconds
    while time.monotonic() < end:
        pass


def _slow_dense_block():
    """8 x 8, dense, three symbols, surds: Berkowitz with expansion did not finish in 60 s
    (measured on SymPy 1.14 while writing this test)."""
    def entry(i, k):
        i, k = min(i, k), max(i, k)
        base = ((i * 7 + k * 3) % 5 - 2) * a + ((i * 5 + k * 11) % 7 - 3) * b + ((i + 2 * k) % 3 - 1) * c \
            + (i * k) % 4 - 1
        return base * sqrt(i + k + 2) if (i + k) % 2 else base
    return Matrix(8, 8, entry)


def _numpy_eigs(mat, point):
    # independent: numpy.linalg.eigvals of the float matrix
    arr = np.array(mat.subs(point).evalf(), dtype=complex)
    return sorted(np.linalg.eigvals(arr), key=lambda z: (z.real, z.imag))


@needs_timer
def test_slow_dense_block_is_stopped_in_the_characteristic_polynomial():
    mat = _slow_dense_block()
    start = time.monotonic()
    res = block_eigenvalues(mat, time_budget=0.3)
    assert time.monotonic() - start < 0.3 + MARGIN
    assert res is not None and res.interrupted == "characteristic polynomial"
    assert "characteristic polynomial" in res.reason and "0.3 s" in res.reason
    assert "timer" in res.reason
    # nothing computed: no charpoly, nothing solved, and not complete although nothing is "unsolved"
    assert res.charpoly is None and res.roots == {} and res.unsolved == [] and not res.complete
    assert res.degree == 8 and res.symbols == (a, b, c)
    assert "degree 8" in str(res)
    point = {a: Rational(1, 3), b: Rational(-2, 7), c: Rational(5, 4)}
    assert np.allclose(res.numeric(point), _numpy_eigs(mat, point))


@needs_timer
def test_factoring_is_stopped_and_the_charpoly_kept(monkeypatch):
    # stand-in for a slow factor_list (a 16 x 16 polynomial block needs ~10 s CPU there)
    monkeypatch.setattr(eigen, "factor_list", lambda *args, **kw: _spin())
    mat = Matrix([[a, 1, 0], [1, b, 1], [0, 1, 1]])
    start = time.monotonic()
    res = block_eigenvalues(mat, time_budget=2)       # ample for the 3 x 3 charpoly before it
    assert time.monotonic() - start < 2 + MARGIN
    assert res.interrupted == "factoring" and "factoring" in res.reason
    lam = res.variable
    assert res.charpoly is not None and (res.charpoly - (mat - lam * Matrix.eye(3)).det() * -1).expand() == 0
    assert res.unsolved == [(res.charpoly, 1)] and not res.complete and res.roots == {}
    point = {a: 2, b: -1}
    assert np.allclose(res.numeric(point), _numpy_eigs(mat, point))


@needs_timer
def test_roots_are_stopped_and_the_solved_factors_kept(monkeypatch):
    real_roots = eigen.roots

    def slow_for_cubics(f, x, **kw):
        if f.as_poly(x).degree() >= 3:
            _spin()
        return real_roots(f, x, **kw)

    monkeypatch.setattr(eigen, "roots", slow_for_cubics)
    mat = Matrix([[7, 0, 0, 0], [0, a, 1, 0], [0, 1, b, 1], [0, 0, 1, 1]])   # 7 and a cubic factor
    res = block_eigenvalues(mat, time_budget=2)       # ample for the steps before
    assert res.interrupted == "roots of a degree-3 factor" and "roots of a degree-3 factor" in res.reason
    assert res.roots == {7: 1} and not res.complete
    [(cubic, mult)] = res.unsolved
    assert mult == 1 and cubic.as_poly(res.variable).degree() == 3
    point = {a: 2, b: -1}
    assert np.allclose(res.numeric(point), _numpy_eigs(mat, point))


def test_off_the_main_thread_the_budget_is_checked_between_steps(monkeypatch):
    def slow_factor_list(expr, *gens):
        time.sleep(2.5)                     # not interruptible here: the check after it stops the work
        return 1, [(expr, 1)]

    monkeypatch.setattr(eigen, "factor_list", slow_factor_list)
    mat = Matrix([[a, 1, 0], [1, b, 1], [0, 1, 1]])
    out = {}
    worker = threading.Thread(target=lambda: out.setdefault("res", block_eigenvalues(mat, time_budget=2)))
    worker.start()
    worker.join(MARGIN)
    res = out["res"]
    assert res.interrupted == "roots of a degree-3 factor"
    assert "checked between steps only (not the main thread)" in res.reason
    assert not res.complete and len(res.unsolved) == 1


def test_none_means_no_limit():
    mat = Matrix([[1, 1, 0], [1, 2, 1], [0, 1, 4]])        # the audit's failing case
    res = block_eigenvalues(mat, time_budget=None)
    assert res.complete and res.interrupted is None and sum(res.values()) == 3
    got = sorted(complex(v.evalf(30)).real for v, k in res.items() for _ in range(k))
    # independent: numpy.linalg.eigvalsh
    assert np.allclose(got, np.linalg.eigvalsh(np.array(mat, dtype=float)))
    S = AngularMomentum("S")
    hm = hamiltonian_matrix(a * S.z ** 2 + b * S.x, {"S": 1})
    for blk, values in hm.eigenvalues(None):
        assert values.complete and sum(values.values()) == blk.size
    assert all(blk.eigenvalues(None).complete for blk in hm.blocks)


def test_a_spent_shared_budget_still_solves_small_blocks():
    # blocks of size 1 and 2 need no budget; a 3 x 3 is stopped at its first step
    S = AngularMomentum("S")
    hm = hamiltonian_matrix(a * S.z ** 2 + b * S.x + c * S.z, {"S": 1})
    [(blk, values)] = hm.eigenvalues(time_budget=0)
    assert blk.size == 3 and values.interrupted == "characteristic polynomial" and not values.complete
    small = hamiltonian_matrix(a * S.x + c * S.z, {"S": "1/2"})
    [(blk2, values2)] = small.eigenvalues(time_budget=0)
    assert values2.complete and values2.interrupted is None


def test_spin_one_zero_field_and_transverse_field_is_solved():
    # D Sz^2 + E (Sx^2 - Sy^2) + Bx Sx on spin 1 (one 3 x 3 block): exact, checked with numpy at two points
    D, E, Bx = symbols("D E B_x", real=True)
    S = AngularMomentum("S")
    hm = hamiltonian_matrix(D * S.z ** 2 + E * (S.x ** 2 - S.y ** 2) + Bx * S.x, {"S": 1})
    [(blk, values)] = [(bk, v) for bk, v in hm.eigenvalues() if bk.size == 3]
    assert values.complete and values.interrupted is None and values.reason == ""
    for point in ({D: Rational(1, 3), E: Rational(1, 11), Bx: Rational(2, 5)},
                  {D: -2, E: Rational(3, 7), Bx: Rational(-1, 9)}):
        got = sorted(complex(v.subs(point).evalf(30)).real for v, k in values.items() for _ in range(k))
        want = np.linalg.eigvalsh(np.array(blk.matrix.subs(point).evalf(), dtype=float))   # numpy
        assert np.allclose(got, want, atol=1e-12)


def test_latex_and_str_of_an_interrupted_result():
    from sympy import latex

    res = block_eigenvalues(Matrix([[a, 1, 0], [1, b, 1], [0, 1, 1]]), time_budget=0)
    assert res.interrupted == "characteristic polynomial"
    assert "characteristic polynomial" in latex(res) and "degree 3" in str(res)


def test_bad_budgets_are_typed_errors():
    from amalgebra.errors import LimitError, NotNumericError

    with pytest.raises(LimitError, match="time_budget=-1.0 must be >= 0 or None"):
        block_eigenvalues(Matrix([[1, 2], [2, 1]]), time_budget=-1)
    with pytest.raises(NotNumericError, match="time_budget='10' must be a number"):
        block_eigenvalues(Matrix([[1, 2], [2, 1]]), time_budget="10")
    S = AngularMomentum("S")
    with pytest.raises(LimitError, match="time_budget=-2.0"):
        hamiltonian_matrix(a * S.z, {"S": 1}).eigenvalues(time_budget=-2)
