"""Form ⇄ design conversion: round trips, raw text kept, structural edits, units."""
from __future__ import annotations

import engine
import pytest
from app import units, web
from app.routers.pages import demo_design


def test_round_trip_si_is_exact():
    d = demo_design()
    back, issues = web.form_to_design(web.design_to_form(d, "si"))
    assert issues == []
    assert engine.parse_design(back).model_dump() == engine.parse_design(d).model_dump()


def test_round_trip_us_within_display_precision():
    d = demo_design()
    back, issues = web.form_to_design(web.design_to_form(d, "us"))
    assert issues == []
    a, b = engine.parse_design(d), engine.parse_design(back)
    for s1, s2 in zip(a.supports, b.supports):
        assert abs(s1.x_mm - s2.x_mm) < 1e-4 * max(1, s1.x_mm)


def test_unknown_keys_survive_the_form():
    d = demo_design()
    d["shaft"]["grooves"] = [{"x_mm": 10, "depth_mm": 1.0}]
    d["load_cases"][0]["torques_Nm"] = {}
    d["elements"][0]["keyway"] = "end_milled"
    back, _ = web.form_to_design(web.design_to_form(d))
    assert back["shaft"]["grooves"] == [{"x_mm": 10, "depth_mm": 1.0}]
    assert back["elements"][0]["keyway"] == "end_milled"


def test_bad_text_is_reported_at_its_path_and_kept():
    form = web.design_to_form(demo_design())
    form["shaft.segments[2].d_mm"] = "4O"
    design, _, issues = web.read_form(form)
    assert design is None
    assert [i.path for i in issues] == ["shaft.segments[2].d_mm"]
    assert form["shaft.segments[2].d_mm"] == "4O"
    assert web.place_issues(issues, form) == {"m-shaft-segments-2-d_mm": [issues[0].message]}


def test_issue_without_field_goes_to_row_or_section():
    form = web.design_to_form(demo_design())
    slots = web.place_issues([engine.Issue(path="load_cases", message="fractions"),
                              engine.Issue(path="load_cases[0].torques_Nm.X", message="no such")], form)
    assert slots == {"m-sec-load_cases": ["fractions"], "m-load_cases-0": ["no such"]}


def test_add_remove_move_rows():
    form = web.design_to_form(demo_design())
    n = len(demo_design()["supports"])
    f2, focus = web.apply_op(form, "add:supports")
    assert focus == f"supports[{n}].x_mm" and f2[f"supports[{n}].id"] not in {s["id"] for s in demo_design()["supports"]}
    f3, _ = web.apply_op(f2, f"up:supports:{n}")
    assert f3[f"supports[{n - 1}].id"] == f2[f"supports[{n}].id"]
    f4, _ = web.apply_op(f3, "remove:supports:0")
    assert f"supports[{n}].id" not in f4
    assert f4["supports[0].id"] == f3["supports[1].id"]


def test_add_element_of_each_kind_validates():
    for kind in web.ELEMENT_FIELDS:
        form = web.design_to_form(demo_design())
        f2, _ = web.apply_op(form, f"add:elements:{kind}")
        data, issues = web.form_to_design(f2)
        assert issues == [], kind
        assert data["elements"][-1]["kind"] == kind


def test_kind_change_fills_defaults():
    form = web.design_to_form(demo_design())
    form["elements[1].kind"] = "force"
    f2, _ = web.apply_op(form, "kind:1")
    assert f2["elements[1].Fy_N"] != ""
    data, issues = web.form_to_design(f2)
    assert issues == [] and data["elements"][1]["kind"] == "force"
    assert "pitch_d_mm" not in data["elements"][1]


def test_unit_switch_and_back_restores_values():
    form = web.design_to_form(demo_design())
    us, _ = web.apply_op(form, "units:us")
    si, _ = web.apply_op(us, "units:si")
    for k in ("supports[0].x_mm", "shaft.material.E_GPa", "shaft.material.density_kg_m3",
              "elements[0].pitch_d_mm"):
        assert float(si[k]) == float(form[k]), k


def test_parse_number_forms():
    assert web.parse_number(" 1 234.5 ") == 1234.5
    assert web.parse_number("\u22122,5") == -2.5
    for bad in ("", "abc", "nan", "inf", "1..2"):
        try:
            web.parse_number(bad)
        except ValueError:
            continue
        raise AssertionError(bad)


def test_engine_messages_use_labels_and_display_units():
    form = web.design_to_form(demo_design(), "us")
    form["elements[0].pitch_d_mm"] = "-2"
    form["requirements.reliability_pct"] = "80"
    _, _, issues = web.read_form(form)
    msgs = {i.path: i.message for i in issues}
    assert msgs["elements[0].pitch_d_mm"] == "pitch diameter must be greater than 0\u202fin, got “-2”"
    assert msgs["requirements.reliability_pct"] == "reliability must be at least 90%, got “80”"


def test_every_sample_design_survives_the_form_and_draws():
    import json
    import xml.dom.minidom
    from pathlib import Path

    from app import drawing

    root = Path(__file__).resolve().parents[2] / "sample_data"
    seen = 0
    for p in sorted(root.glob("*.json")):
        d = json.loads(p.read_text(encoding="utf-8"))
        if d.get("format") != "shaft-design/1":
            continue
        seen += 1
        for system in ("si", "us"):
            back, issues = web.form_to_design(web.design_to_form(d, system))
            assert issues == [], (p.name, system)
            a, b = engine.parse_design(d), engine.parse_design(back)
            if system == "si":
                assert a.model_dump() == b.model_dump(), p.name
        res = engine.solve(d)
        xml.dom.minidom.parseString(drawing.shaft_svg(d, res))
    assert seen >= 1


def test_keyway_and_twist_limit_boxes():
    """Issue 12: the keyway is a choice on every part, the twist limit a requirement (°/m,
    °/ft in US units: 1 °/ft = 1/0.3048 °/m, derived)."""
    d = demo_design()
    d["elements"][0]["keyway"] = "sled_runner"
    form = web.design_to_form(d)
    assert form["elements[0].keyway"] == "sled_runner" and "keyway" not in form.get("elements[0]._extra", "")
    form["elements[0].keyway"] = ""
    form["requirements.twist_limit_deg_per_m"] = "0.5"
    back, issues = web.form_to_design(form)
    assert issues == [] and "keyway" not in back["elements"][0]
    assert back["requirements"]["twist_limit_deg_per_m"] == 0.5
    us = web.design_to_form(back, "us")
    assert float(us["requirements.twist_limit_deg_per_m"]) == pytest.approx(0.5 * 0.3048, rel=1e-3)
    us["requirements.twist_limit_deg_per_m"] = "0.1"
    back, _ = web.form_to_design(us)
    assert back["requirements"]["twist_limit_deg_per_m"] == pytest.approx(0.1 / 0.3048)
