"""Benchmark: the beam alone against PyNiteFEA on the same mesh, side by side in one run.

Run: ``python3 tests/benchmarks/bench_beam.py [--sizes 50,200,1000,5000] [--runs N]``

The shaft is the stepped three-support shaft of ``tests/engine/test_against_pynite.py``
(Euler–Bernoulli, loads in both planes). At each size the engine's mesh of that many elements
is built once and given to both solvers: ours, ``engine.solve.analyse`` (element loads, the
mesh, banded assembly, the banded solve of both planes, reactions and element end forces);
PyNiteFEA's ``FEModel3D.analyze_linear`` on a frame of the same nodes and members (its own
assembly and sparse solve; building its model is not timed). Also checks the reactions:
Euler–Bernoulli elements are exact at the nodes, so ours should not move with the mesh; they
must stay within 0.1 % of the coarsest size's (the drift is printed: the bending stiffness's
condition grows as N⁴, so thousands of very short elements cost digits in any displacement
solver, the dense LU one this replaced included), and PyNiteFEA's are compared with ours
(printed when they differ by more than 0.1 %). Prints the median times, the ratio and the log-log slope of our
time against the element count (least squares over the sizes). Targets (issue 11): at least
10x faster at every size, slope at most 1.2. Exits 1 when a target is missed.
A benchmark, not a test: pytest does not collect it.
"""
from __future__ import annotations

import argparse
import math
import os
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

import numpy as np  # noqa: E402

from engine.model import parse_design  # noqa: E402
from engine.solve import analyse  # noqa: E402
from tests.engine.test_against_pynite import E, G, LOADS, three_support_design  # noqa: E402


def design(n: int):
    return parse_design(three_support_design(n))


def pynite_model(mesh):
    from Pynite import FEModel3D

    m = FEModel3D()
    m.add_material("steel", E, G, E / (2 * G) - 1, 7.85e-9)
    for i, x in enumerate(mesh.x_mm):
        m.add_node(f"N{i}", float(x), 0.0, 0.0)
    for i, (d, le) in enumerate(zip(mesh.d_mm, mesh.le_mm)):
        I = math.pi * d**4 / 64
        m.add_section(f"s{i}", math.pi * d**2 / 4, I, I, 2 * I)
        m.add_member(f"M{i}", f"N{i}", f"N{i + 1}", "steel", f"s{i}")
    for j, node in enumerate(mesh.support_nodes):
        m.def_support(f"N{node}", support_DX=(j == 0), support_DY=True, support_DZ=True, support_RX=(j == 0))
    for node, (_, fy, fz) in zip(mesh.element_nodes, LOADS):
        m.add_node_load(f"N{node}", "FY", fy)
        m.add_node_load(f"N{node}", "FZ", fz)
    return m


def timed(fn, runs: int) -> float:
    ts = []
    for _ in range(runs):
        t0 = time.perf_counter()
        fn()
        ts.append(time.perf_counter() - t0)
    return statistics.median(ts)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="50,200,1000,5000")
    ap.add_argument("--runs", type=int, default=0, help="runs per size (default: more for small sizes)")
    args = ap.parse_args(argv)
    sizes = [int(s) for s in args.sizes.split(",")]
    print(f"load average {os.getloadavg()[0]:.2f} {os.getloadavg()[1]:.2f}; BLAS threads "
          f"{os.environ.get('OPENBLAS_NUM_THREADS', 'default')}")
    print(f"{'elements':>8} {'ours [ms]':>10} {'PyNiteFEA [ms]':>15} {'ratio':>8}")
    ours_t, ok, R0 = [], True, None
    for n in sizes:
        d = design(n)
        a = analyse(d)
        n_el = a.mesh.le_mm.size
        runs = args.runs or max(3, min(200, 20000 // n))
        t_ours = timed(lambda: analyse(d), runs)
        prun = max(1, min(5, 2000 // n))
        models = [pynite_model(a.mesh) for _ in range(prun)]
        ts = []
        for m in models:
            t0 = time.perf_counter()
            m.analyze_linear(check_statics=False, check_stability=False)  # its pivot test trips on short stiff elements
            ts.append(time.perf_counter() - t0)
        t_py = statistics.median(ts)
        m = models[0]
        R = a.beam.R_N[0, 0]
        R0 = R if R0 is None else R0
        drift = float(np.max(np.abs(R - R0)) / np.abs(R0).max())
        if drift > 1e-3:
            ok = False
        ref = np.array([m.nodes[f"N{node}"].RxnFY["Combo 1"] for node in a.mesh.support_nodes])
        dev = float(np.max(np.abs(ref - R)) / np.abs(R).max())
        note = f"  reactions: ours drift {drift:.1e} from the coarsest, PyNiteFEA's differ {dev:.1e} from ours"
        ratio = t_py / t_ours
        ok &= ratio >= 10
        ours_t.append((n_el, t_ours))
        print(f"{n_el:>8} {t_ours * 1e3:>10.3f} {t_py * 1e3:>15.1f} {ratio:>7.0f}x{note}")
    x = np.log([n for n, _ in ours_t])
    y = np.log([t for _, t in ours_t])
    slope = float(np.polyfit(x, y, 1)[0])
    ok &= slope <= 1.2
    print(f"log-log slope of our time against elements: {slope:.2f} (target at most 1.2)")
    print(f"load average after {os.getloadavg()[0]:.2f}")
    print("all targets met" if ok else "TARGET MISSED")
    return 0 if ok else 1


if __name__ == "__main__":
    raise SystemExit(main())
