"""Benchmark: the design search (engine/search.py) on the demo countershaft.

Run: ``python3 tests/benchmarks/bench_search.py [--budget 30] [--seed 1]``

Four continuous variables — the pulley seat's and the gear seat's diameters
(shaft.segments[0] and [3]), the positions of supports A and B along their 40 mm seats — and
each support's dimension series free (every series of the bundled table); objectives shaft
mass and the smallest fatigue safety margin (they conflict: the pulley seat governs fatigue).
Target (issue 17): at least 20 designs on the front within 30 s. Prints the front size, the
designs solved, evaluations per second, the generations run and the load average (the
machine is shared; figures under load are honest ones). Exits 1 when the target is missed.
A benchmark, not a test: pytest does not collect it.
"""
from __future__ import annotations

import argparse
import json
import os
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

VARY = ["shaft.segments[0].d_mm=24:40", "shaft.segments[3].d_mm=44:70",
        "supports.A.x_mm=62:88", "supports.B.x_mm=242:268",
        "supports.A.dimension_series=*", "supports.B.dimension_series=*"]
OBJECTIVES = ["mass_kg", "fatigue_margin"]
TARGET_POINTS, TARGET_S = 20, 30.0


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--budget", type=float, default=TARGET_S - 2.0)
    ap.add_argument("--seed", type=int, default=1)
    a = ap.parse_args()
    from engine.search import run_search

    design = json.loads((ROOT / "sample_data" / "countershaft.json").read_text(encoding="utf-8"))
    load0 = os.getloadavg()
    t0, c0 = time.perf_counter(), time.process_time()
    res = run_search(design, VARY, OBJECTIVES, seed=a.seed, budget_s=a.budget)
    wall, cpu = time.perf_counter() - t0, time.process_time() - c0
    load1 = os.getloadavg()
    print(f"front points: {len(res.front)} (target ≥ {TARGET_POINTS}); method {res.method}, "
          f"{res.generations} generations{' (stopped at the budget)' if res.stopped else ''}")
    print(f"designs solved: {res.evaluations} ({res.feasible} meet every requirement) in {wall:.2f} s wall, "
          f"{cpu:.2f} s CPU (target ≤ {TARGET_S:g} s)")
    print(f"evaluations per second: {res.evaluations / wall:.0f} (wall), {res.evaluations / max(cpu, 1e-9):.0f} (CPU)")
    print(f"load average before {load0[0]:.1f}, after {load1[0]:.1f} (2 cores, shared)")
    best = res.front[0] if res.front else None
    if best:
        print(f"lightest: {best.objectives} {best.values}")
    return 0 if len(res.front) >= TARGET_POINTS and wall <= TARGET_S else 1


if __name__ == "__main__":
    raise SystemExit(main())
