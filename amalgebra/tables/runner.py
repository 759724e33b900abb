r"""Computing a coupling table: enumeration, evaluation in chunks, resumable parts, local or dask workers.

Explanation
===========

:func:`tabulate` finds the symmetry classes (:mod:`amalgebra.tables.enumeration`), splits
them into chunks of ``chunk_size`` and evaluates each chunk with the library's exact
integer kernels (the same ones :func:`~amalgebra.coupling.sixj` uses), then the correctly
rounded floats.  Each finished chunk is written as a part file in the folder
``<path>.parts/``; a run that stops (Ctrl-C, a lost worker, a crash) and is started again
with the same arguments skips the parts already written, so it resumes.  When every part
is there the table file is written at once (a temporary file, then a rename) and the parts
are removed.

Work goes to local processes by default (``workers`` of them; ``None`` is the number of
cores) or, with ``scheduler="tcp://host:port"``, to an existing ``dask.distributed``
cluster (the ``dask`` extra): this is how a group that outgrows one machine uses it.

Examples
========

>>> import os, tempfile
>>> from amalgebra.tables.runner import tabulate
>>> folder = tempfile.mkdtemp()
>>> table = tabulate("threej", 1, os.path.join(folder, "threej.npz"), workers=1, progress=None)
>>> table.exact(1, 1, 0, 1, -1, 0), table.float(1, 1, 0, 1, -1, 0)    # 1/sqrt(3)
(sqrt(3)/3, 0.5773502691896257)
"""

import hashlib
import json
import os
import shutil

import numpy as np

from ..errors import StoredResultError
from .enumeration import canonical_keys, sixj_packed_for, unpack_sixj, _check_kind, _doubled_jmax
from .storage import CouplingTable, write_table

__all__ = ["tabulate", "evaluate_keys"]


def evaluate_keys(kind, keys, floats=True):
    """Exact triples ``(n, d, s)`` and floats of the canonical symbols of ``keys`` (rows of ints).

    Runs in a worker: plain Python ints out, no SymPy objects.
    """
    from ..coupling import kernels, symmetry
    from ..coupling.floats import triple_to_float

    if kind == "sixj":
        def one(key):
            return kernels.sixj_kernel_sorted(*key)
    elif kind == "threej":
        # the canonical-key kernels behind the library's caches, called without the cache
        one = symmetry._threej_canonical.__wrapped__
    else:
        raw = symmetry._ninej_canonical.__wrapped__

        def one(key):
            return raw((tuple(key[0:3]), tuple(key[3:6]), tuple(key[6:9])))
    triples = [tuple(int(x) for x in one(tuple(int(v) for v in row))) for row in keys]
    values = [triple_to_float(*t) if floats else float("nan") for t in triples]
    return triples, values


def _digest(keys):
    return hashlib.sha256(np.ascontiguousarray(keys).tobytes()).hexdigest()


def _parts_folder(path):
    return f"{path}.parts"


def _prepare_parts(path, kind, jmax2, keys, chunk_size, floats, resume):
    folder = _parts_folder(path)
    meta = {"kind": kind, "jmax2": jmax2, "count": int(keys.shape[0]), "chunk_size": chunk_size,
            "floats": bool(floats), "keys_sha256": _digest(keys)}
    meta_path = os.path.join(folder, "meta.json")
    if os.path.isdir(folder) and resume:
        try:
            with open(meta_path, encoding="utf-8") as stream:
                old = json.load(stream)
        except (OSError, ValueError):
            old = None
        if old != meta:
            raise StoredResultError(f"{folder}: unfinished parts of a different table; remove the folder "
                                    "or give resume=False to start again")
    else:
        if os.path.isdir(folder):
            shutil.rmtree(folder)
        os.makedirs(folder)
        with open(meta_path, "w", encoding="utf-8") as stream:
            json.dump(meta, stream)
    return folder


def _part_path(folder, index):
    return os.path.join(folder, f"part_{index:06d}.npz")


def _save_part(folder, index, triples, values):
    from .storage import _hex

    tmp = _part_path(folder, index) + ".tmp.npz"
    np.savez(tmp, numerator=_hex([t[0] for t in triples]), denominator=_hex([t[1] for t in triples]),
             radicand=_hex([t[2] for t in triples]), value=np.asarray(values, dtype=np.float64))
    os.replace(tmp, _part_path(folder, index))


def _load_part(folder, index):
    with np.load(_part_path(folder, index), allow_pickle=False) as data:
        return data["numerator"], data["denominator"], data["radicand"], data["value"]


def _chunk_task(kind, keys, floats):
    return evaluate_keys(kind, keys, floats)


def _enumerate(kind, jmax, pool):
    if kind != "sixj" or pool is None:
        return canonical_keys(kind, jmax)
    top = _doubled_jmax(kind, jmax)
    # largest slices first, so the two halves of the work end together
    slices = list(pool.map(sixj_packed_for, range(top, -1, -1), [top] * (top + 1)))
    return unpack_sixj(slices, top)


def tabulate(kind, jmax, path, *, floats=True, workers=None, scheduler=None, chunk_size=20000,
             resume=True, progress="stderr"):
    r"""Compute every ``kind`` symbol (``"threej"``, ``"sixj"``, ``"ninej"``) up to ``jmax`` into ``path`` (.npz).

    Explanation
    ===========

    One entry per symmetry class, exact (and float unless ``floats=False``); see the module
    docstring for parallel runs (``workers`` local processes, or a ``dask.distributed``
    ``scheduler`` address), resuming, and :mod:`amalgebra.tables.storage` for the format.
    ``progress`` is ``"stderr"`` (one line per tenth of the chunks), ``None``, or a callable
    ``progress(done, total)`` called after each chunk.  Returns the
    :class:`~amalgebra.tables.storage.CouplingTable`.

    Examples
    ========

    >>> import os, tempfile
    >>> from amalgebra.coupling import sixj
    >>> from amalgebra.tables import tabulate
    >>> t = tabulate("sixj", 2, os.path.join(tempfile.mkdtemp(), "t.npz"), workers=1, progress=None)
    >>> t.exact(2, 2, 2, 2, 2, 2) == sixj(2, 2, 2, 2, 2, 2) != 0
    True
    """
    kind = _check_kind(kind)
    jmax2 = _doubled_jmax(kind, jmax)
    path = os.fspath(path)
    folder = os.path.dirname(os.path.abspath(path))
    if not os.path.isdir(folder):
        raise StoredResultError(f"{path}: the folder {folder} must exist")
    report = _reporter(progress)
    client = _dask_client(scheduler) if scheduler is not None else None
    pool = None
    try:
        if client is None and (workers is None or workers > 1):
            from concurrent.futures import ProcessPoolExecutor

            pool = ProcessPoolExecutor(max_workers=workers)
        keys = _enumerate(kind, jmax, pool)
        chunk_size = max(1, int(chunk_size))
        starts = list(range(0, keys.shape[0], chunk_size)) or [0]
        parts = _prepare_parts(path, kind, jmax2, keys, chunk_size, floats, resume)
        todo = [i for i in range(len(starts)) if not os.path.exists(_part_path(parts, i))]
        done = len(starts) - len(todo)
        chunks = {i: keys[starts[i]:starts[i] + chunk_size] for i in todo}
        for index, (triples, values) in _run(chunks, kind, floats, pool, client):
            _save_part(parts, index, triples, values)
            done += 1
            report(done, len(starts))
    finally:
        if pool is not None:
            pool.shutdown(cancel_futures=True)
        if client is not None:
            client.close()
    pieces = [_load_part(parts, i) for i in range(len(starts))]
    numerator, denominator, radicand, value = (np.concatenate([p[k] for p in pieces]) for k in range(4))
    triples = list(zip((int(x, 16) for x in numerator), (int(x, 16) for x in denominator),
                       (int(x, 16) for x in radicand)))
    write_table(path, kind, jmax2, keys, triples, value)
    shutil.rmtree(parts)
    return CouplingTable(kind, jmax2, keys, numerator, denominator, radicand, value)


def _run(chunks, kind, floats, pool, client):
    """Yield ``(index, result)`` as chunks finish."""
    if client is not None:
        from distributed import as_completed

        futures = {client.submit(_chunk_task, kind, chunk, floats, pure=False): i for i, chunk in chunks.items()}
        for future in as_completed(futures):
            yield futures[future], future.result()
        return
    if pool is None:
        for i, chunk in chunks.items():
            yield i, _chunk_task(kind, chunk, floats)
        return
    from concurrent.futures import as_completed as finished

    futures = {pool.submit(_chunk_task, kind, chunk, floats): i for i, chunk in chunks.items()}
    for future in finished(futures):
        yield futures[future], future.result()


def _dask_client(scheduler):
    try:
        from distributed import Client
    except ImportError as exc:
        raise StoredResultError("a dask scheduler needs the dask extra: "
                                "python3 -m pip install 'amalgebra[dask]'") from exc
    return Client(scheduler)


def _reporter(progress):
    if progress is None:
        return lambda done, total: None
    if callable(progress):
        return progress
    if progress != "stderr":
        raise StoredResultError(f"progress={progress!r} must be 'stderr', None or a callable")
    import sys

    state = {"last": -1}

    def report(done, total):
        tenth = (10 * done) // max(total, 1)
        if tenth != state["last"]:
            state["last"] = tenth
            print(f"amalgebra table: {done}/{total} chunks", file=sys.stderr, flush=True)

    return report
