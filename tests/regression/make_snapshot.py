"""Write the golden regression snapshot of the three demo results.

A REGRESSION SNAPSHOT, NOT VALIDATION: it records what the engine computed for
``sample_data/*.json`` at one commit, so that a refactor of the solver is held to every number
(``tests/regression/test_demo_snapshot.py``). It says nothing about whether those numbers are
right; the validation tests (closed forms, PyNiteFEA, Shigley's worked examples) do that.

Regenerate it only when the engine's results change on purpose (a new check, a corrected
formula), and say why in the commit message:

    python3 tests/regression/make_snapshot.py --reason "i12: mounting checks added"

The reason and the commit it was taken at are stored in the file.
"""
from __future__ import annotations

import argparse
import json
import os
import subprocess
import sys
from pathlib import Path

for _k in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_k, "1")

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

SNAPSHOT = Path(__file__).with_name("demo_results_snapshot.json")
DEMOS = ("countershaft.json", "line_shaft.json", "bevel_pinion.json")


def current_results() -> dict[str, dict]:
    """The engine's results of the demo designs, as JSON-ready mappings."""
    from engine.solve import solve

    out = {}
    for name in DEMOS:
        design = json.loads((ROOT / "sample_data" / name).read_text(encoding="utf-8"))
        out[name] = solve(design).model_dump(mode="json")
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--reason", required=True, help="why the snapshot is (re)taken; stored in the file")
    args = ap.parse_args(argv)
    try:
        commit = subprocess.run(["git", "rev-parse", "HEAD"], cwd=ROOT, capture_output=True, text=True,
                                check=True).stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        commit = "unknown"
    doc = {"what": "regression snapshot of the demo results (not validation)",
           "reason": args.reason, "taken_at_commit": commit, "results": current_results()}
    SNAPSHOT.write_text(json.dumps(doc, indent=1, sort_keys=True) + "\n", encoding="utf-8")
    print(f"wrote {SNAPSHOT.relative_to(ROOT)} ({args.reason})")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
