"""Every demo design goes through every command and page: solve, study, note to PDF, the web
note, the compare page; and every `shaftwright` example in README runs as written.

New files in sample_data/ are picked up by themselves. The study range is derived from each
design (its second support moved about its own position, inside its neighbours), so it is
valid for any demo.
"""
from __future__ import annotations

import json
import re
import shlex
import shutil
import subprocess

import pytest

from app.cli import main
from tests.conftest import ROOT, SAMPLES

DEMOS = sorted(SAMPLES.glob("*.json"))
each_demo = pytest.mark.parametrize("demo", DEMOS, ids=[p.stem for p in DEMOS])


def _doc(demo) -> dict:
    return json.loads(demo.read_text(encoding="utf-8"))


def study_range(design: dict) -> str:
    """``supports.ID.x_mm=START:STOP:3`` around the second support, between its neighbours."""
    sups = sorted(design["supports"], key=lambda s: s["x_mm"])
    length = sum(s["length_mm"] for s in design["shaft"]["segments"])
    s = sups[1]
    lo_bound = sups[0]["x_mm"]
    hi_bound = sups[2]["x_mm"] if len(sups) > 2 else length
    x = s["x_mm"]
    lo, hi = x - 0.25 * (x - lo_bound), x + 0.25 * (hi_bound - x)
    return f"supports.{s['id']}.x_mm={lo:.6g}:{hi:.6g}:3"


@each_demo
def test_solve(demo, capsys):
    assert main(["solve", str(demo)]) == 0
    assert "Load case" in capsys.readouterr().out
    assert main(["solve", str(demo), "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["format"] == "shaft-result/1"


@each_demo
def test_study(demo, capsys):
    spec = study_range(_doc(demo))
    assert main(["study", str(demo), "--vary", spec]) == 0, capsys.readouterr().err
    out = capsys.readouterr().out
    assert "3 rows" in out and "Traceback" not in out


@each_demo
def test_note_to_pdf(demo, tmp_path, capsys):
    out = tmp_path / "note.pdf"
    assert main(["note", str(demo), "-o", str(out)]) == 0, capsys.readouterr().err
    text = subprocess.run(["pdftotext", "-layout", str(out), "-"], capture_output=True, text=True,
                          check=True).stdout
    assert _doc(demo)["name"] in " ".join(text.split())


@each_demo
def test_web_note_and_compare(demo):
    from fastapi.testclient import TestClient

    from app.main import create_app

    client = TestClient(create_app())
    design = _doc(demo)
    saved = client.post("/api/designs", json={"design": design, "author": "demo test"})
    assert saved.status_code == 201, saved.text
    first = saved.json()
    from app.routers.studies import encode_design

    for url in (first["url"], first["note_url"], "/study?d=" + encode_design(design)):
        r = client.get(url)
        assert r.status_code == 200 and "Traceback" not in r.text, url
    note = client.get(first["note_url"])
    assert design["name"] in note.text.replace("&#39;", "'")
    changed = json.loads(json.dumps(design))
    changed["load_cases"][0]["speed_rpm"] *= 1.1
    second = client.post(first["api_url"] + "/revisions",
                         json={"design": changed, "base_revision": 1}).json()
    r = client.get(f"/d/{first['id']}/compare?a=1&b={second['revision']}")
    assert r.status_code == 200 and "speed_rpm" in r.text


def _readme_examples() -> list[list[str]]:
    """The lines of README's command-line block (under "The command line"), comments cut."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    block = re.search(r"### The command line\s*```sh\n(.*?)```", text, re.S).group(1)
    return [shlex.split(line, comments=True)[1:] for line in block.splitlines() if line.startswith("shaftwright ")]


def test_readme_examples_run(tmp_path, capsys, monkeypatch):
    """Each `shaftwright …` example in README, run as written in a copy of the repository's
    sample_data, in a temporary folder."""
    examples = _readme_examples()
    assert any(a[0] == "study" for a in examples) and any(a[0] == "note" for a in examples)
    monkeypatch.chdir(tmp_path)
    shutil.copytree(SAMPLES, tmp_path / "sample_data")
    for argv in examples:
        assert main(argv) == 0, (argv, capsys.readouterr().err)
        capsys.readouterr()
