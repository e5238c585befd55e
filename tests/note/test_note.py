"""The design note: its content, the `shaftwright note` command, and revision comparison."""
from __future__ import annotations

import copy
import json
import subprocess
import sys
from pathlib import Path

import pytest

import engine
from app import units
from app.note import (CAUTIONS, compare_results, diff_documents, flatten, note_context,
                      print_pdf, render_note_html)

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "tests" / "store" / "example_design.json"


@pytest.fixture
def design() -> dict:
    return json.loads(EXAMPLE.read_text(encoding="utf-8"))


def pdf_text(path: Path) -> str:
    """Text of a PDF through poppler's pdftotext (installed with the test tools)."""
    return subprocess.run(["pdftotext", "-layout", str(path), "-"], capture_output=True,
                          text=True, check=True).stdout


def expected_numbers(design: dict) -> dict[str, list[str]]:
    """Reactions and chosen-bearing lives as the note prints them (units.fmt, SI), with the
    narrow no-break space between digit groups as pdftotext reads it back (a plain space)."""
    result = engine.solve(design)

    def shown(v: float, q: str) -> str:
        return units.fmt(v, q).replace("\u202f", " ")
    reactions = [shown(s.Fr_N, "force") for c in result.load_cases for s in c.supports]
    lives = [shown(b.candidates[0].L10_h, "time") for b in result.bearings if b.candidates]
    return {"reactions": reactions, "lives": lives, "bearings": [b.id for b in result.bearings]}


def test_note_page_holds_every_part(design):
    html = render_note_html(design)
    for heading in ("Cautions", "Inputs", "Assumptions", "Methods and their sources",
                    "Arrangement, to scale", "Results", "Diagrams", "Checks"):
        assert heading in html, heading
    for c in CAUTIONS:
        assert c.replace("'", "&#39;") in html
    assert "<script" not in html  # printing needs no script: charts are inline SVG
    assert html.count('<svg') >= 6  # the drawing and the diagrams
    assert "@page" in html and "size: A4" in html
    assert "Przemieniecki" in html


def test_note_context_solves_and_lists_diagrams(design):
    ctx = note_context(design)
    assert ctx["errors"] == [] and ctx["result"] is not None
    assert len(ctx["charts"]) >= 6
    assert ctx["name"] == design["name"]


def test_note_of_an_unsolvable_design_says_why(design):
    design["load_cases"][0]["time_fraction"] = 0.2
    html = render_note_html(design)
    assert "This design cannot be solved" in html and "time fractions sum to" in html


def test_shaftwright_note_prints_a_pdf(tmp_path, design):
    src = tmp_path / "rig.json"
    src.write_text(json.dumps(design), encoding="utf-8")
    out = tmp_path / "out" / "note.pdf"
    proc = subprocess.run([sys.executable, "-m", "app.cli", "note", str(src), "-o", str(out)],
                          cwd=ROOT, capture_output=True, text=True, timeout=180)
    assert proc.returncode == 0, proc.stderr
    assert out.read_bytes()[:5] == b"%PDF-"
    text = " ".join(pdf_text(out).split())  # lines wrap anywhere in a PDF
    assert design["name"] in text
    assert "qualified engineer must check" in text and "verify them against the standard" in text
    numbers = expected_numbers(design)
    assert numbers["bearings"] == ["L", "R"] and len(numbers["lives"]) == 2  # both are rated
    for value in numbers["reactions"] + numbers["lives"]:
        assert value in text, value
    info = subprocess.run(["pdfinfo", str(out)], capture_output=True, text=True, check=True).stdout
    assert "A4" in info


def test_shaftwright_note_refuses_a_bad_file(tmp_path, design):
    design["supports"][1]["x_mm"] = 5000
    src = tmp_path / "bad.json"
    src.write_text(json.dumps(design), encoding="utf-8")
    out = tmp_path / "bad.pdf"
    proc = subprocess.run([sys.executable, "-m", "app.cli", "note", str(src), "-o", str(out)],
                          cwd=ROOT, capture_output=True, text=True, timeout=60)
    assert proc.returncode == 2 and "supports[1].x_mm" in proc.stderr
    assert not out.exists()


def test_print_pdf_prints_only_local_pages(tmp_path):
    with pytest.raises(ValueError, match="only a note on this machine"):
        print_pdf("http://example.org/note", tmp_path / "x.pdf")


def test_diff_keys_rows_by_id(design):
    b = copy.deepcopy(design)
    b["elements"].insert(0, {"id": "EXTRA", "kind": "force", "x_mm": 10, "Fy_N": -5})
    b["supports"][1]["x_mm"] = 270
    b["load_cases"][0]["speed_rpm"] = 950
    changes = {c.path: c for c in diff_documents(design, b)}
    assert changes["supports[R].x_mm"].before == "280" and changes["supports[R].x_mm"].after == "270"
    assert changes["load_cases[steady].speed_rpm"].after == "950"
    assert changes["elements[EXTRA].kind"].kind == "added"
    assert not any(p.startswith("elements[SPUR]") for p in changes)  # not shifted by the insert
    assert diff_documents(design, copy.deepcopy(design)) == []
    assert flatten({"a": [], "b": {}}) == {"a": [], "b": {}}


def test_compare_results_side_by_side(design):
    b = copy.deepcopy(design)
    b["elements"][0]["torque_Nm"] = -150
    ra, rb = engine.solve(design), engine.solve(b)
    sections = {s.title: s for s in compare_results(ra, rb)}
    assert set(sections) == {"Reactions", "Bearing lives", "Checks", "Shaft"}
    rows = {r[0]: r for r in sections["Reactions"].rows}
    row = rows["steady · R · Fr_N"]
    assert row[3] is True and row[1] != row[2]
    assert sections["Reactions"].changed > 0
    same = compare_results(ra, ra)
    assert all(s.changed == 0 for s in same)


def test_note_names_the_bearing_table_in_use():
    from app.note import render_note_html
    from tests.conftest import SAMPLES, load_sample

    design = load_sample("countershaft.json")
    assert "bundled table" in render_note_html(design)
    rows = [ln for ln in (SAMPLES / "bearings.csv").read_text(encoding="utf-8").splitlines() if not ln.startswith("#")]
    design["bearing_table"] = {"name": "stores &lt;list&gt;", "csv": "\n".join(rows)}
    html = render_note_html(design)
    assert "own table &#39;stores &amp;lt;list&amp;gt;&#39;" in html and "verify them with the supplier" in html


def test_requirements_the_form_does_not_show_print_in_words(design):
    # presentation only: the lubricant and the contamination factor are named, not raw JSON
    d = copy.deepcopy(design)
    d.setdefault("requirements", {})["lubricant"] = {"iso_vg": 68, "operating_temp_C": 60}
    html = render_note_html(d)
    assert "ISO VG 68 at 60 °C" in html and "iso_vg" not in html
    from app.note import _extra_row
    assert _extra_row("lubricant", {"iso_vg": 68, "operating_temp_C": 60}) == ("lubricant", "ISO VG 68 at 60 °C", "")
    assert _extra_row("contamination_ec", 0.5) == ("contamination factor ec", "0.5", "")
    assert _extra_row("fatigue_criterion", "de_goodman")[1] == "DE–Goodman"


def test_a_round_off_series_draws_as_zero_not_as_a_zero_span():
    """The line shaft's x–z moment is pure round-off (about 1e-14 N·m next to hundreds of N·m
    in the other plane): the chart shows a flat zero line on a ±1 axis, and never divides by
    a zero tick span (it once raised ZeroDivisionError)."""
    import re

    from app.svgchart import line_chart, nice_ticks

    for lo, hi in ((0, 3e-14), (-1e-14, 1e-14), (-2e-300, 0), (5.0, 5.0)):
        t = nice_ticks(lo, hi)
        assert len(set(t)) == len(t) > 1 and t[0] <= lo and t[-1] >= hi
    svg = line_chart([0, 600, 1200], [("running", [0.0, 1.3e-14, -2.2e-14])],
                     title="Bending moment in the x–z plane", y_label="My [N·m]", scale=450.0)
    ticks = re.findall(r'text-anchor="end">([^<]+)<', svg)
    assert ticks[0] == "-1" and ticks[-1] == "1"
    ys = {p.split(",")[1] for p in re.search(r'points="([^"]+)"', svg).group(1).split()}
    assert len(ys) == 1  # one flat line


def test_line_shaft_note_renders():
    from app.note import render_note_html

    from tests.conftest import load_sample

    html = render_note_html(load_sample("line_shaft.json"))
    assert "Bending moment in the x–z plane" in html


def test_note_has_a_mounting_section_with_keys_fits_seats_and_shoulders():
    """Issue 12: key sizes and their checks, fits, seat lengths and shoulder heights."""
    demo = json.loads((ROOT / "sample_data" / "countershaft.json").read_text(encoding="utf-8"))
    result = engine.solve(demo)
    html = render_note_html(demo)
    part = html[html.index('id="mounting"'):html.index('class="page-break">Diagrams')]
    key = result.mounting.keys[0]
    assert "P1" in part and f"{key.b_mm:g}×{key.h_mm:g}×{key.length_mm:g}" in part  # 10×8×50, DIN 6885-1
    for b in result.bearings:
        assert f"{b.fits.shaft} / {b.fits.housing}" in part
    seat = result.mounting.seats[0]
    assert f"{seat.seat_from_mm:g}–{seat.seat_to_mm:g}" in part  # the seat's run, 60–90 mm
    assert "shoulder d at x, height" in part and f"at {seat.shoulder_x_mm:g}, {seat.shoulder_height_mm:g}" in part
    assert "verify them against the standards" in part
    # every mounting check that is not ok is spelled out there
    for c in result.checks:
        if c.code.startswith("mount.") and c.status != "ok":
            assert c.message.replace("'", "&#39;") in part


def test_key_and_press_fit_inputs_print_in_words():
    from app.note import _extra_row
    assert _extra_row("key", {"b_mm": 10, "ends": "square"}) == ("parallel key", "width 10 mm; ends square", "")
    assert _extra_row("press_fit", {"fit": "H7/s6", "hub_outer_d_mm": 100}) == (
        "press fit", "fit H7/s6; hub outer diameter 100 mm", "")
    assert _extra_row("keyway", "end_milled") == ("keyway", "end-milled", "")
    d = json.loads((ROOT / "sample_data" / "countershaft.json").read_text(encoding="utf-8"))
    d["requirements"]["twist_limit_deg_per_m"] = 1.5
    html = render_note_html(d)
    assert "max. twist" in html and "twist_limit" not in html
