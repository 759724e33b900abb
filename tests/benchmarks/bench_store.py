"""Benchmark: loading stored-results files (amalgebra.derivations.store), before and after.

Writes one valid results file of N entries (default 60,000, about 1.4 MB, the size in
issue 17; ``--quick``: 6,000) and measures, in the same run:

* ``before``: the loader of the last commit whose format was ``amalgebra-results-1``
  (read from git, run unchanged), which parsed every expression while loading;
* ``load``: today's :func:`load_results` (structure checked, expressions parsed on use);
* ``strict``: ``load_results(strict=True)``, every expression parsed (the same work as
  ``before``, for comparison);
* ``check``: load plus the comparison of every entry with an unchanged new result
  (what ``amalgebra check`` does for a file whose results did not change; the new
  values are built before timing).

Run: ``python3 tests/benchmarks/bench_store.py [--quick] [--entries N]``.
"""

import argparse
import importlib.util
import random
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def make_file(path, entries, seed=1):
    """A valid file of ``entries`` results, each written as ``to_text`` writes it (so an
    unchanged new result has the identical text)."""
    from sympy import Rational, Symbol

    from amalgebra.parsing import to_text

    rng = random.Random(seed)
    names = [Symbol(n) for n in ("j", "m", "A", "B", "g_I", "g_J", "b", "x", "y")]
    # version 1 (expressions only): both the old and today's loader read it
    lines = ["# benchmark file (invented values)", 'format = "amalgebra-results-1"']
    per = 100
    for s in range(entries // per):
        lines += ["", f"[d{s}]"]
        for i in range(per):
            a, b = rng.sample(names, 2)
            value = Rational(rng.randint(1, 99), rng.randint(2, 9)) * a * (b + rng.randint(1, 9))
            lines.append(f'r{i} = "{to_text(value)}"')
    path.write_text("\n".join(lines) + "\n", encoding="utf-8")
    return path


def baseline_loader():
    """The load_results of the last commit with the amalgebra-results-1 loader, or None."""
    try:
        commits = subprocess.run(["git", "log", "--format=%H", "--", "amalgebra/derivations/store.py"],
                                 cwd=ROOT, capture_output=True, text=True, check=True).stdout.split()
        for commit in commits:
            source = subprocess.run(["git", "show", f"{commit}:amalgebra/derivations/store.py"],
                                    cwd=ROOT, capture_output=True, text=True, check=True).stdout
            if 'FORMAT = "amalgebra-results-1"' in source:
                break
        else:
            return None, None
    except (OSError, subprocess.CalledProcessError):
        return None, None
    folder = Path(tempfile.mkdtemp())
    module_path = folder / "_bench_store_before.py"
    module_path.write_text(source, encoding="utf-8")
    spec = importlib.util.spec_from_file_location("amalgebra.derivations._bench_store_before",
                                                  module_path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module.load_results, commit[:10]


def cold():
    """Clear SymPy's cache and the store's parse cache: every measurement starts cold."""
    from sympy.core.cache import clear_cache

    from amalgebra.derivations import store

    clear_cache()
    store._parse_leaf.cache_clear()


def timed(fn, repeat=1):
    best = float("inf")
    for _ in range(repeat):
        cold()
        start = time.process_time()
        fn()
        best = min(best, time.process_time() - start)
    return best


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--quick", action="store_true", help="6,000 entries instead of 60,000")
    parser.add_argument("--entries", type=int, default=None)
    args = parser.parse_args()
    entries = args.entries or (6_000 if args.quick else 60_000)

    from amalgebra.derivations.regression import compare_entry
    from amalgebra.derivations.store import load_results
    from amalgebra.parsing import parse

    path = make_file(Path(tempfile.mkdtemp()) / "deriv_bench.results.toml", entries)
    size = path.stat().st_size
    print(f"results file: {entries} entries, {size / 1e6:.2f} MB")
    rows = []
    before, commit = baseline_loader()
    if before is not None:
        t = timed(lambda: before(path))
        rows.append((f"before (loader of {commit}, parses all)", t))
    else:
        print("  (no baseline: git history unavailable)")
    t_load = timed(lambda: load_results(path), repeat=3)
    rows.append(("load_results (structure; parse on use)", t_load))
    t_strict = timed(lambda: load_results(path, strict=True))
    rows.append(("load_results(strict=True) (parses all)", t_strict))
    stored = load_results(path)

    def fresh():
        # new objects each time: SymPy keeps per-object caches (assumptions, term order)
        return {(d, k): parse(e.text) for d, v in stored.items() for k, e in v.items()}

    current = fresh()

    def check():
        loaded = load_results(path)
        for d, v in loaded.items():
            for k, e in v.items():
                compare_entry(d, k, e, current[(d, k)])

    t_check = timed(check)
    rows.append(("check of an unchanged file (load + compare)", t_check))
    from amalgebra.parsing import to_text

    current = fresh()
    t_text = timed(lambda: [to_text(v) for v in current.values()])
    rows.append(("  of which to_text of every new result", t_text))
    width = max(len(name) for name, _ in rows)
    for name, t in rows:
        print(f"  {name:<{width}}  {t:8.3f} s CPU  {t / entries * 1e3:8.4f} ms/entry")
    if before is not None:
        t_before = rows[0][1]
        print(f"  speed-up of load over before:   {t_before / t_load:7.1f}x")
        print(f"  speed-up of check over before:  {(t_before + t_text) / t_check:7.1f}x  "
              "(before: parse all + to_text all; now equal texts need no parsing)")
        print(f"  strict load over before:        {t_before / t_strict:7.2f}x  "
              "(the expression parser itself is unchanged)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
