"""Benchmark: the demo solve with every shaft check on.

Run: ``python tests/benchmarks/bench_solve.py [--runs N] [--threads N] [--strict] [design.json]``
(``--threads`` leaves numpy's BLAS at N threads; by default 1, as the app and the tests run it:
on two shared cores a threaded BLAS makes these small solves several times slower).
Prints the median and 95th percentile of the whole solve with every shaft check on, and of the
shaft checks alone. While ``engine.solve`` does not yet call ``engine.checks.shaft_checks``
itself, the whole solve is timed as ``solve()`` plus ``shaft_checks()`` on the analysis that
solve() builds (measured back to back in each run), which is what the wired solve will do. Budget: 10 ms median on the project's 2-core machine
(issue 6). ``--strict`` exits 1 over budget. A benchmark, not a test: pytest does not collect it.
"""
from __future__ import annotations

import argparse
import json
import os
import statistics
import sys
import time
from pathlib import Path

_n = sys.argv[sys.argv.index("--threads") + 1] if "--threads" in sys.argv else "1"
for _k in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_k, _n)  # before numpy is imported

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from engine.checks import shaft_checks  # noqa: E402
from engine.model import parse_design  # noqa: E402
from engine.solve import solve  # noqa: E402
from tests.checks.helpers import analysis_of  # noqa: E402

BUDGET_MS = 10.0


def _stats(ts: list[float]) -> tuple[float, float]:
    ts = sorted(ts)
    return statistics.median(ts) * 1e3, ts[min(len(ts) - 1, int(0.95 * len(ts)))] * 1e3


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("design", nargs="?", default=str(ROOT / "sample_data" / "countershaft.json"))
    ap.add_argument("--runs", type=int, default=200)
    ap.add_argument("--threads", default="1", help="BLAS threads (read before numpy is imported)")
    ap.add_argument("--strict", action="store_true")
    args = ap.parse_args(argv)
    data = json.loads(Path(args.design).read_text(encoding="utf-8"))
    design = parse_design(data)
    wired = any(c.code.startswith("shaft.") for c in solve(design).checks)

    a = analysis_of(design)
    for _ in range(10):
        solve(design)
        shaft_checks(a)
    t_full, t_checks = [], []
    for _ in range(args.runs):
        t0 = time.perf_counter()
        solve(design)
        t1 = time.perf_counter()
        if not wired:
            shaft_checks(a)
        t2 = time.perf_counter()
        shaft_checks(a)
        t3 = time.perf_counter()
        t_full.append(t2 - t0)
        t_checks.append(t3 - t2)
    med, p95 = _stats(t_full)
    cmed, cp95 = _stats(t_checks)
    how = "solve() with the shaft checks wired in" if wired else "solve() + shaft_checks(), not yet wired"
    print(f"design: {Path(args.design).name}, {a.mesh.le_mm.size} elements, {len(design.load_cases)} load cases, "
          f"{args.runs} runs")
    print(f"whole solve ({how}): median {med:.2f} ms, p95 {p95:.2f} ms (budget {BUDGET_MS:g} ms median)")
    print(f"shaft_checks alone: median {cmed:.2f} ms, p95 {cp95:.2f} ms")
    print(f"BLAS threads: {os.environ.get('OPENBLAS_NUM_THREADS')}; load average {os.getloadavg()[0]:.2f}")
    over = med > BUDGET_MS
    if over:
        print("OVER BUDGET")
    return 1 if (over and args.strict) else 0


if __name__ == "__main__":
    sys.exit(main())
