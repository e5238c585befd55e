"""Benchmark: studies of the demo design (sample_data/countershaft.json).

Run: ``python3 tests/benchmarks/bench_study.py [--runs 3] [--large 20000] [--skip-large]``

1. 200 variants (support B slides along its seat): best and median wall time of ``--runs``,
   CPU time beside it. Target (issue 11): at most 0.15 s.
2. ``--large`` variants (default 20 000: B's position × gear G1's position, 200 × 100) in a fresh
   interpreter: wall time and peak resident memory of that process (``ru_maxrss``). Targets:
   at most 20 s and 500 MB.
BLAS threads are left as the environment has them (the engine's kernels do not use threads).
The load average is printed beside the figures: the machine is shared. Exits 1 when a target
is missed. A benchmark, not a test: pytest does not collect it.
"""
from __future__ import annotations

import argparse
import json
import os
import resource
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

SMALL = ["supports.B.x_mm=242:268:200"]  # B slides along its 40 mm seat (240–270 mm)
TARGET_SMALL_S, TARGET_LARGE_S, TARGET_RSS_MB = 0.15, 20.0, 500.0


def large_vary(n: int) -> list[str]:
    a = 200 if n >= 200 else n
    return [f"supports.B.x_mm=242:268:{a}", f"elements.G1.x_mm=120:180:{max(1, n // a)}"]


def demo() -> dict:
    return json.loads((ROOT / "sample_data" / "countershaft.json").read_text(encoding="utf-8"))


def child(n: int) -> None:
    from engine.study import run_study

    t0, c0 = time.perf_counter(), time.process_time()
    res = run_study(demo(), large_vary(n))
    wall, cpu = time.perf_counter() - t0, time.process_time() - c0
    rss_mb = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0  # kB on Linux
    print(json.dumps({"n": len(res.variants), "wall_s": wall, "cpu_s": cpu, "rss_mb": rss_mb, "ok": sum(bool(v.ok) for v in res.variants),
                      "load": os.getloadavg()[0]}))


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=3)
    ap.add_argument("--large", type=int, default=20000)
    ap.add_argument("--skip-large", action="store_true")
    ap.add_argument("--child", type=int, default=0, help=argparse.SUPPRESS)
    args = ap.parse_args()
    if args.child:
        child(args.child)
        return 0
    import engine
    from engine.study import run_study

    engine.solve(demo(), diagrams=False)  # warm the imports and the bearing table
    walls, cpus = [], []
    for _ in range(args.runs):
        c0, t0 = time.process_time(), time.perf_counter()
        res = run_study(demo(), SMALL)
        walls.append(time.perf_counter() - t0)
        cpus.append(time.process_time() - c0)
    best = min(walls)
    ok = best <= TARGET_SMALL_S
    print(f"200 variants: best {best:.3f} s, median {statistics.median(walls):.3f} s of {args.runs} "
          f"(CPU best {min(cpus):.3f} s; {best / len(res.variants) * 1e3:.2f} ms per variant); "
          f"target {TARGET_SMALL_S} s; load average {os.getloadavg()[0]:.2f}")
    if not args.skip_large:
        r = subprocess.run([sys.executable, __file__, "--child", str(args.large)], capture_output=True, text=True,
                           check=True)
        m = json.loads(r.stdout.strip().splitlines()[-1])
        print(f"{m['n']} variants: {m['wall_s']:.1f} s ({m['wall_s'] / m['n'] * 1e3:.2f} ms per variant; "
              f"CPU {m['cpu_s']:.1f} s), "
              f"peak RSS {m['rss_mb']:.0f} MB; targets {TARGET_LARGE_S:g} s, {TARGET_RSS_MB:g} MB; "
              f"load average {m['load']:.2f}")
        ok &= m["wall_s"] <= TARGET_LARGE_S and m["rss_mb"] <= TARGET_RSS_MB
    print("all targets met" if ok else "TARGET MISSED")
    return 0 if ok else 1


if __name__ == "__main__":
    raise SystemExit(main())
