"""Benchmark: the table of all 6j symbols with every j <= 20, exact and float (issue 16 target: < 60 s on 2 cores).

Prints the wall and CPU time of each stage (enumeration of the symmetry classes, evaluation,
writing) for local processes, and the size of the file.  ``--jmax J`` changes the size;
``--workers N`` the number of processes.  Run: ``python3 tests/benchmarks/bench_tables.py``.
"""

import argparse
import os
import resource
import tempfile
import time

from amalgebra.tables import tabulate


def _children_cpu():
    usage = resource.getrusage(resource.RUSAGE_CHILDREN)
    return usage.ru_utime + usage.ru_stime


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--jmax", default="20")
    parser.add_argument("--workers", type=int, default=2)
    args = parser.parse_args()
    folder = tempfile.mkdtemp()
    path = os.path.join(folder, "sixj.npz")
    marks = []

    def progress(done, total):
        marks.append((done, time.perf_counter()))

    print(f"all 6j with j <= {args.jmax}, exact and float, {args.workers} local processes; load average "
          f"{os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    start, cpu, child = time.perf_counter(), time.process_time(), _children_cpu()
    table = tabulate("sixj", args.jmax, path, workers=args.workers, progress=progress)
    wall = time.perf_counter() - start
    first = marks[0][1] - start if marks else float("nan")
    print(f"  classes: {len(table)}; file {os.path.getsize(path) / 1e6:.1f} MB")
    print(f"  wall {wall:.1f} s (target < 60 s); enumeration and first chunk {first:.1f} s")
    print(f"  CPU: main process {time.process_time() - cpu:.1f} s, workers {_children_cpu() - child:.1f} s")


if __name__ == "__main__":
    main()
