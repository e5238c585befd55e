"""``shaftwright optimise`` from the command line: --json, --csv, the table and bad input."""
from __future__ import annotations

import csv
import io
import json

import engine
from app.cli import main
from tests.search.test_search import one_step


def _file(tmp_path, doc):
    p = tmp_path / "shaft.json"
    p.write_text(json.dumps(doc), encoding="utf-8")
    return str(p)


def test_json_front_holds_complete_designs_that_pass(tmp_path, capsys):
    f = _file(tmp_path, one_step())
    rc = main(["optimise", f, "--vary", "shaft.segments[0].d_mm=20:60:1", "--objective", "mass_kg",
               "--objective", "fatigue_margin", "--seed", "3", "--json"])
    assert rc == 0
    out = json.loads(capsys.readouterr().out)
    assert len(out["front"]) >= 2
    for p in out["front"]:
        assert set(p["objectives"]) == {"mass_kg", "fatigue_margin"}
        r = engine.solve(p["design"], diagrams=False)  # a complete design document
        assert not [c for c in r.checks if c.status == "fail"]


def test_csv_and_table(tmp_path, capsys):
    f = _file(tmp_path, one_step())
    assert main(["optimise", f, "--vary", "shaft.segments[0].d_mm=20:60:2", "--csv"]) == 0
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert rows[0][:2] == ["design", "mass_kg [kg]"] and rows[1][0] == "current" and len(rows) == 3
    assert main(["optimise", f, "--vary", "shaft.segments[0].d_mm=20:60:2"]) == 0
    assert "designs on the front" in capsys.readouterr().out


def test_bad_input_one_line_exit_2(tmp_path, capsys):
    f = _file(tmp_path, one_step())
    for argv, words in (
        (["--vary", "shaft.segments[4].d_mm=20:60"], "shaft.segments[4].d_mm: there is no"),
        (["--vary", "shaft.segments[0].d_mm=20:60", "--objective", "cost"], "unknown objective 'cost'"),
        (["--vary", "shaft.segments[0].d_mm=20:60:abc"], "the step 'abc'"),
        (["--vary", "shaft.segments[0].d_mm=20:60", "--limit", "mass_kg=3"], "NAME<=VALUE"),
        (["--vary", "shaft.segments[0].d_mm=20:60", "--budget", "0"], "--budget"),
        ([], "give --vary"),
    ):
        assert main(["optimise", f, *argv]) == 2
        err = capsys.readouterr().err.strip().splitlines()
        assert len(err) == 1 and err[0].startswith("shaftwright: ") and words in err[0], err
    assert main(["optimise", str(tmp_path / "none.json"), "--vary", "shaft.segments[0].d_mm=20:60"]) == 2
    assert "no such design file" in capsys.readouterr().err


def test_ctrl_c_stops_after_the_generation_and_prints_the_front(tmp_path):
    import os
    import signal
    import subprocess
    import sys
    import time
    from pathlib import Path

    root = Path(__file__).resolve().parents[2]
    f = _file(tmp_path, one_step())
    proc = subprocess.Popen([sys.executable, "-m", "app.cli", "optimise", f, "--vary", "shaft.segments[0].d_mm=20:60",
                             "--generations", "10000", "--budget", "600", "--population", "8", "--json"],
                            cwd=root, stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                            env={**os.environ, "PYTHONPATH": str(root), "OPENBLAS_NUM_THREADS": "1"})
    time.sleep(6)
    proc.send_signal(signal.SIGINT)
    out, err = proc.communicate(timeout=60)
    assert proc.returncode == 0, err
    body = json.loads(out)
    assert body["stopped"] and body["front"]
