"""Coupling tables at scale: completeness, exactness, floats, resuming, parallel and dask runs, safe loading.

Sources: the library's exact functions ``threej``/``sixj``/``ninej`` (themselves checked against
published values and the numpy oracle in ``tests/coupling``), mpmath for the rounding of the
floats, and brute-force enumeration for completeness (common practice, no source).
"""

import itertools
import os

import mpmath
import numpy as np
import pytest
from sympy import Rational

from amalgebra.coupling import ninej, sixj, threej
from amalgebra.errors import LimitError, QuantumNumberError, StoredResultError
from amalgebra.tables import canonical_keys, load_table, tabulate
from amalgebra.testing.external import in_ci


def _half(t):
    return Rational(t, 2)


def _triad(a, b, c):
    return (a + b + c) % 2 == 0 and abs(a - b) <= c <= a + b


def _all_sixj(top):
    for t in itertools.product(range(top + 1), repeat=6):
        if (_triad(t[0], t[1], t[2]) and _triad(t[0], t[4], t[5]) and _triad(t[3], t[1], t[5])
                and _triad(t[3], t[4], t[2])):
            yield tuple(_half(x) for x in t)


def test_every_sixj_up_to_jmax_is_in_the_table_and_exact(tmp_path):
    table = tabulate("sixj", 2, tmp_path / "six.npz", workers=1, progress=None)
    seen = 0
    for js in _all_sixj(4):
        assert table.exact(*js) == sixj(*js)
        seen += 1
    assert seen == 570 and len(table) < seen / 5   # one entry per class: far fewer than symbols
    # a class is stored once: the keys are distinct and sorted
    keys = [tuple(r) for r in table.keys.tolist()]
    assert keys == sorted(set(keys))


def test_threej_table_complete_and_signed(tmp_path):
    table = tabulate("threej", Rational(3, 2), tmp_path / "three.npz", workers=1, progress=None)
    count = 0
    for tj in itertools.product(range(4), repeat=3):
        if not _triad(*tj):
            continue
        for tm in itertools.product(*[range(-t, t + 1, 2) for t in tj]):
            if sum(tm) != 0:
                continue
            args = [*map(_half, tj), *map(_half, tm)]
            assert table.exact(*args) == threej(*args)
            count += 1
    assert count > 100


def test_ninej_table_complete(tmp_path):
    table = tabulate("ninej", 1, tmp_path / "nine.npz", workers=1, progress=None)
    checked = 0
    for t in itertools.product(range(3), repeat=9):
        rows = (t[0:3], t[3:6], t[6:9])
        if all(_triad(*r) for r in rows) and all(_triad(*c) for c in zip(*rows)):
            js = [_half(x) for x in t]
            assert table.exact(*js) == ninej(*js)
            checked += 1
    assert checked > 100


def test_floats_are_correctly_rounded(tmp_path):
    # mpmath at 200 bits, rounded once to double (source: mpmath)
    table = tabulate("sixj", 3, tmp_path / "f.npz", workers=1, progress=None)
    mpmath.mp.prec = 200
    for row in range(0, len(table), 7):
        n, d, s = table.triple(row)
        expected = float(mpmath.mpf(n) / d * mpmath.sqrt(s))
        assert table.values[row] == expected


def test_selection_rule_zero_and_outside_the_table(tmp_path):
    table = tabulate("sixj", 1, tmp_path / "z.npz", workers=1, progress=None)
    assert table.exact(1, 1, 3, 1, 1, 1) == 0          # triangle (1 1 3) fails
    with pytest.raises(KeyError, match="not in this table"):
        table.exact(2, 2, 2, 2, 2, 2)


def test_resume_after_an_interruption(tmp_path):
    path = tmp_path / "r.npz"
    calls = []

    def stop_after_two(done, total):
        calls.append(done)
        if len(calls) == 2:
            raise KeyboardInterrupt

    with pytest.raises(KeyboardInterrupt):
        tabulate("sixj", 3, path, workers=1, chunk_size=50, progress=stop_after_two)
    parts = tmp_path / "r.npz.parts"
    assert parts.is_dir() and len(list(parts.glob("part_*.npz"))) == 2 and not path.exists()
    resumed_from = []
    tabulate("sixj", 3, path, workers=1, chunk_size=50, progress=lambda done, total: resumed_from.append(done))
    assert resumed_from[0] == 3                # the two finished parts were not recomputed
    assert not parts.exists()
    fresh = tabulate("sixj", 3, tmp_path / "fresh.npz", workers=1, chunk_size=50, progress=None)
    again = load_table(path)
    assert np.array_equal(again.keys, fresh.keys) and np.array_equal(again.values, fresh.values)


def test_unfinished_parts_of_another_table_are_not_mixed_in(tmp_path):
    path = tmp_path / "m.npz"
    with pytest.raises(KeyboardInterrupt):
        tabulate("sixj", 2, path, workers=1, chunk_size=10,
                 progress=lambda done, total: (_ for _ in ()).throw(KeyboardInterrupt))
    with pytest.raises(StoredResultError, match="different table"):
        tabulate("sixj", 3, path, workers=1, chunk_size=10, progress=None)
    assert tabulate("sixj", 3, path, workers=1, chunk_size=10, progress=None, resume=False)


def test_local_processes_give_the_same_table(tmp_path):
    serial = tabulate("sixj", 3, tmp_path / "a.npz", workers=1, progress=None)
    parallel = tabulate("sixj", 3, tmp_path / "b.npz", workers=2, chunk_size=100, progress=None)
    assert np.array_equal(serial.keys, parallel.keys)
    assert [serial.triple(i) for i in range(len(serial))] == [parallel.triple(i) for i in range(len(parallel))]


def test_a_two_worker_dask_cluster_gives_the_same_table(tmp_path):
    distributed = pytest.importorskip("distributed") if not in_ci() else __import__("distributed")
    serial = tabulate("sixj", 2, tmp_path / "a.npz", workers=1, progress=None)
    with distributed.LocalCluster(n_workers=2, threads_per_worker=1, processes=True,
                                  dashboard_address=None, host="127.0.0.1") as cluster:
        remote = tabulate("sixj", 2, tmp_path / "d.npz", scheduler=cluster.scheduler_address,
                          chunk_size=40, progress=None)
    assert np.array_equal(serial.keys, remote.keys)
    assert np.array_equal(serial.values, remote.values)


def test_loading_is_safe_and_checked(tmp_path):
    garbage = tmp_path / "g.npz"
    garbage.write_bytes(b"not a zip file at all")
    with pytest.raises(StoredResultError, match="cannot be read"):
        load_table(garbage)
    other = tmp_path / "o.npz"
    np.savez(other, x=np.arange(3))
    with pytest.raises(StoredResultError, match="not an amalgebra coupling table"):
        load_table(other)
    pickled = tmp_path / "p.npz"
    np.savez(pickled, **{name: np.array([{"a": 1}], dtype=object) for name in
                         ("format", "version", "kind", "jmax2", "keys", "numerator", "denominator",
                          "radicand", "value", "convention")})
    with pytest.raises(StoredResultError):       # object arrays would need pickle: refused
        load_table(pickled)


def test_bad_arguments(tmp_path):
    with pytest.raises(LimitError, match="at most"):
        canonical_keys("sixj", 1000)
    with pytest.raises(QuantumNumberError, match="must be one of"):
        canonical_keys("twelvej", 2)
    with pytest.raises(StoredResultError, match="must exist"):
        tabulate("sixj", 1, tmp_path / "no" / "such" / "t.npz", progress=None)
    assert not os.path.exists(tmp_path / "no")
