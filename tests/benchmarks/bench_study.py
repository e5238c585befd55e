"""Benchmark: one study of 200 variants of the demo design (sample_data/countershaft.json).

Target: under 0.5 s on a 2-core laptop-class machine. Run: ``python tests/benchmarks/bench_study.py``
(``--threads N`` leaves numpy's BLAS at N threads; by default 1, since on 2 shared cores a
threaded BLAS on matrices of a few hundred rows is several times slower, see the report).
Prints the wall time of the study (best and median of ``--runs``, default 3) with the CPU time
of this process beside it (on a shared machine the wall time also counts the time other
programs hold the cores), and the path it took; exits 1 when the best run misses the target.
"""
from __future__ import annotations

import os
import sys

if "--threads" in sys.argv:
    _n = sys.argv[sys.argv.index("--threads") + 1]
else:
    _n = "1"
for _k in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_k, _n)

import json  # noqa: E402
import statistics  # noqa: E402
import time  # noqa: E402
from pathlib import Path  # noqa: E402

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

import engine  # noqa: E402
from engine.study import run_study  # noqa: E402

TARGET_S = 0.5
VARY = ["supports.B.x_mm=242:268:200"]  # B slides along its 40 mm seat (240–270 mm)


def main() -> int:
    design = json.loads((ROOT / "sample_data" / "countershaft.json").read_text(encoding="utf-8"))
    engine.solve(design, diagrams=False)  # warm the imports and the bearing table
    runs = int(sys.argv[sys.argv.index("--runs") + 1]) if "--runs" in sys.argv else 3
    times, cpu, res = [], [], None
    for _ in range(runs):
        t0, c0 = time.perf_counter(), time.process_time()
        res = run_study(design, VARY)
        times.append(time.perf_counter() - t0)
        cpu.append(time.process_time() - c0)
    best = min(times)
    t0 = time.perf_counter()
    for _ in range(20):
        engine.solve(design, diagrams=False)
    one = (time.perf_counter() - t0) / 20
    print(f"study of {len(res.variants)} variants ({VARY[0]}), path '{res.method}': "
          f"best {best:.3f} s, median {statistics.median(times):.3f} s of {', '.join(f'{t:.3f}' for t in times)} s "
          f"({best / len(res.variants) * 1e3:.2f} ms per variant); target {TARGET_S} s")
    print(f"CPU time of this process: best {min(cpu):.3f} s, median {statistics.median(cpu):.3f} s")
    print(f"one plain engine.solve(diagrams=False): {one * 1e3:.2f} ms "
          f"(x {len(res.variants)} = {one * len(res.variants):.2f} s by looping)")
    print(f"BLAS threads: {os.environ.get('OPENBLAS_NUM_THREADS')}; load average {os.getloadavg()[0]:.2f}")
    return 0 if best < TARGET_S else 1


if __name__ == "__main__":
    raise SystemExit(main())
