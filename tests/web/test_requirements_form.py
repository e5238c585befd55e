"""The Requirements section of the editor: lubricant and contamination boxes (ISO 281's
modified life), placeholders that show the model's defaults, and a load case that is valid
the moment it is added.

Engine values are not checked here (that is tests/engine); these tests check the form:
what the boxes hold, where messages go, and that the design the form gives solves.
"""
from __future__ import annotations

import json

import pytest

import engine
from app import units, web
from app.routers.pages import demo_design
from engine.model import LoadCase, Lubricant, Requirements

LUB = "requirements.lubricant."


def _demo_with_oil(**lub):
    d = demo_design()
    d["requirements"]["lubricant"] = {"iso_vg": 68, "operating_temp_C": 60, **lub}
    d["requirements"]["contamination_ec"] = 0.5
    return d


def _by_path(form):
    return {v.path: v for s in web.editor_sections(form) for v in s.fields}


# --- 1. lubricant and contamination boxes --------------------------------------------------

@pytest.mark.parametrize("system", ["si", "us"])
def test_lubricant_and_ec_have_boxes_and_round_trip(system):
    d = _demo_with_oil(viscosity_index=120)
    form = web.design_to_form(d, system)
    assert form[LUB + "iso_vg"] == "68" and form[LUB + "operating_temp_C"] == {"si": "60", "us": "140"}[system]
    assert form[LUB + "viscosity_index"] == "120" and form["requirements.contamination_ec"] == "0.5"
    # the hidden carrier no longer holds them twice
    extra = json.loads(form.get("requirements._extra", "{}"))
    assert "lubricant" not in extra and "contamination_ec" not in extra
    assert LUB + "_extra" not in form
    back, issues = web.form_to_design(form)
    assert issues == []
    assert back["requirements"]["lubricant"] == {"iso_vg": 68, "operating_temp_C": 60, "viscosity_index": 120}
    assert back["requirements"]["contamination_ec"] == 0.5
    assert engine.parse_design(back).requirements == engine.parse_design(d).requirements


def test_lubricant_boxes_are_labelled_with_units_in_both_systems():
    for system, deg in (("si", "°C"), ("us", "°F")):
        v = _by_path(web.design_to_form(_demo_with_oil(), system))
        assert (v[LUB + "iso_vg"].label, v[LUB + "iso_vg"].unit) == ("ISO VG grade", "mm²/s at 40 °C")
        # temperature converts with its offset: °F = °C · 9/5 + 32 (NIST SP 811, B.8)
        assert (v[LUB + "operating_temp_C"].label, v[LUB + "operating_temp_C"].unit) == ("operating temperature", deg)
        assert (v[LUB + "viscosity_index"].label, v[LUB + "viscosity_index"].unit) == ("viscosity index", "")
        ec = v["requirements.contamination_ec"]
        assert (ec.label, ec.unit) == ("contamination factor ec", "")
        # the ISO 281 bands, extreme cleanliness 1 down to severe 0.1–0 (references.md, from memory)
        note = ec.note.replace("\u2060", "")  # word joiners keep "0.8–0.6" whole
        for band in ("1 extreme cleanliness", "0.8–0.6 high", "0.6–0.5 normal", "0.5–0.3 slight",
                     "0.3–0.1 typical", "0.1–0 severe", "0 very severe"):
            assert band.replace(" ", "\u00a0") in note, band  # a band never splits across lines
        assert note.index("1\u00a0extreme") < note.index("0.1–0\u00a0severe")


def test_lubricant_boxes_are_in_the_requirements_section_next_to_ec():
    sec = web.editor_sections(web.design_to_form(_demo_with_oil()))[-1]
    paths = [f.path for f in sec.fields]
    assert sec.key == "requirements"
    i = paths.index(LUB + "iso_vg")
    assert paths[i:i + 4] == [LUB + "iso_vg", LUB + "operating_temp_C", LUB + "viscosity_index",
                              "requirements.contamination_ec"]


def test_empty_grade_and_temperature_mean_no_lubricant_and_the_design_solves():
    form = web.design_to_form(_demo_with_oil())
    form[LUB + "iso_vg"] = form[LUB + "operating_temp_C"] = " "
    form["requirements.contamination_ec"] = ""
    design, data, issues = web.read_form(form)
    assert issues == [] and design is not None
    assert "lubricant" not in data["requirements"] and "contamination_ec" not in data["requirements"]
    assert design.requirements.lubricant is None
    engine.solve(design)


def test_a_design_without_lubricant_shows_empty_boxes():
    d = demo_design()
    d["requirements"].pop("lubricant", None)
    d["requirements"].pop("contamination_ec", None)
    form = web.design_to_form(d)
    assert form[LUB + "iso_vg"] == form[LUB + "operating_temp_C"] == form[LUB + "viscosity_index"] == ""
    back, issues = web.form_to_design(form)
    assert issues == [] and "lubricant" not in back["requirements"]


@pytest.mark.parametrize("given, missing", [
    ({"iso_vg": "68"}, ["operating_temp_C"]),
    ({"operating_temp_C": "60"}, ["iso_vg"]),
    ({"viscosity_index": "100"}, ["iso_vg", "operating_temp_C"]),
])
def test_grade_and_temperature_come_together_or_the_missing_one_is_named(given, missing):
    form = web.design_to_form(_demo_with_oil())
    for k in ("iso_vg", "operating_temp_C", "viscosity_index"):
        form[LUB + k] = given.get(k, "")
    design, _, issues = web.read_form(form)
    assert design is None
    assert sorted(i.path for i in issues) == sorted(LUB + k for k in missing)
    labels = {"iso_vg": "ISO VG grade", "operating_temp_C": "operating temperature",
              "viscosity_index": "viscosity index"}
    for i in issues:
        key = i.path.rsplit(".", 1)[1]
        assert i.message.startswith(labels[key] + " is needed with the ")
        assert all(labels[k] in i.message for k in given)
    # each message goes beside its own box, and the typed text stays
    slots = web.place_issues(issues, form)
    assert set(slots) == {"m-" + web.slug(LUB + k) for k in missing}
    for k, v in given.items():
        assert form[LUB + k] == v


def test_bad_lubricant_values_are_reported_beside_their_boxes_in_words():
    form = web.design_to_form(_demo_with_oil())
    form[LUB + "iso_vg"] = "1"          # Lubricant.iso_vg: at least 2
    form[LUB + "operating_temp_C"] = "6O"
    form["requirements.contamination_ec"] = "1.5"  # ec lies in 0…1
    _, _, issues = web.read_form(form)
    msgs = {i.path: i.message for i in issues}
    lo = Lubricant.model_fields["iso_vg"].metadata[0].ge
    assert msgs[LUB + "iso_vg"] == f"ISO VG grade must be at least {lo:g}\u202fmm²/s at 40 °C, got “1”"
    assert msgs[LUB + "operating_temp_C"] == "operating temperature must be a number in °C, not “6O”"
    assert msgs["requirements.contamination_ec"].startswith("contamination factor ec must be at most 1")
    assert set(web.place_issues(issues, form)) == {"m-requirements-lubricant-iso_vg",
                                                   "m-requirements-lubricant-operating_temp_C",
                                                   "m-requirements-contamination_ec"}


def test_unknown_lubricant_keys_and_a_stray_lubricant_survive_the_form():
    d = _demo_with_oil(supplier_note="invented")
    form = web.design_to_form(d)
    assert json.loads(form[LUB + "_extra"]) == {"supplier_note": "invented"}
    assert (LUB + "_extra", form[LUB + "_extra"]) in web.editor_sections(form)[0].extras
    back, _ = web.form_to_design(form)
    assert back["requirements"]["lubricant"]["supplier_note"] == "invented"
    # a lubricant that is not a mapping (a hand-edited file) goes on to the engine's message
    d = demo_design()
    d["requirements"]["lubricant"] = "oil"
    form = web.design_to_form(d)
    assert form[LUB + "iso_vg"] == ""
    _, data, issues = web.read_form(form)
    assert data["requirements"]["lubricant"] == "oil"
    assert any(i.path.startswith("requirements.lubricant") for i in issues)


def test_working_copy_from_before_the_boxes_is_upgraded():
    # form state as the page saved it when lubricant and ec travelled in requirements._extra
    old = web.design_to_form(demo_design())
    for k in list(old):
        if k.startswith(LUB) or k == "requirements.contamination_ec":
            del old[k]
    old["requirements._extra"] = json.dumps({"lubricant": {"iso_vg": 68, "operating_temp_C": 60},
                                             "contamination_ec": 0.5, "shaft_temperature_C": 80})
    new = web.upgrade_form(old)
    assert new[LUB + "iso_vg"] == "68" and new[LUB + "operating_temp_C"] == "60"
    assert new["requirements.contamination_ec"] == "0.5"
    assert json.loads(new["requirements._extra"]) == {"shaft_temperature_C": 80}
    assert web.form_to_design(new)[0]["requirements"] == web.form_to_design(old)[0]["requirements"]
    assert web.upgrade_form(new) == new


def test_unit_switch_keeps_the_lubricant():
    form = web.design_to_form(_demo_with_oil())
    us, _ = web.apply_op(form, "units:us")
    si, _ = web.apply_op(us, "units:si")
    assert us[LUB + "iso_vg"] == si[LUB + "iso_vg"] == form[LUB + "iso_vg"]  # no unit to switch
    # the temperature is shown in °F in US units and comes back to the same °C
    assert (form[LUB + "operating_temp_C"], us[LUB + "operating_temp_C"], si[LUB + "operating_temp_C"]) == ("60", "140", "60")


def test_page_shows_the_boxes(client):
    t = client.get("/").text
    assert 'name="requirements.lubricant.iso_vg"' in t
    assert 'ISO VG grade <span class="unit">[mm²/s at 40 °C]</span>' in t
    assert 'operating temperature <span class="unit">[°C]</span>' in t
    assert 'contamination factor ec <span class="unit">[–]</span>' in t
    assert 'id="n-requirements-contamination_ec"' in t


# --- 2. a new load case keeps the duty cycle valid -------------------------------------------

def _cases(form):
    return [(form[f"load_cases[{i}].name"], float(form[f"load_cases[{i}].time_fraction"]))
            for i in web._indices(form, "load_cases")]


def test_new_load_case_splits_the_largest_and_the_design_still_solves():
    d = demo_design()
    form = web.design_to_form(d)
    before = _cases(form)
    big = max(range(len(before)), key=lambda i: before[i][1])
    f2, focus = web.apply_op(form, "add:load_cases")
    after = _cases(f2)
    n = len(before)
    assert focus == f"load_cases[{n}].name"
    assert len(after) == n + 1
    assert after[big][1] == after[n][1] == before[big][1] / 2
    assert sum(s for _, s in after) == pytest.approx(1.0, abs=1e-9)
    assert after[n][0] not in {name for name, _ in before}
    # a copy of the case it splits: speed and factors as that case
    for k in ("speed_rpm", "torque_factor", "force_factor"):
        assert f2[f"load_cases[{n}].{k}"] == form[f"load_cases[{big}].{k}"]
    design, _, issues = web.read_form(f2)
    assert issues == [] and design is not None
    r0, r1 = engine.solve(engine.parse_design(d)), engine.solve(design)
    # splitting a case in two leaves the duty-cycle equivalent load as it was
    assert [b.equivalent_load_N for b in r1.bearings] == pytest.approx([b.equivalent_load_N for b in r0.bearings], rel=1e-9)


def test_new_load_case_copies_hidden_keys_and_takes_the_first_of_equals():
    d = demo_design()
    d["load_cases"] = [
        {"name": "a", "time_fraction": 0.4, "speed_rpm": 500, "torque_alternating_pct": 10},
        {"name": "b", "time_fraction": 0.4, "speed_rpm": 700},
        {"name": "c", "time_fraction": 0.2, "speed_rpm": 900}]
    f2, _ = web.apply_op(web.design_to_form(d), "add:load_cases")
    assert _cases(f2) == [("a", 0.2), ("b", 0.4), ("c", 0.2), ("case 4", 0.2)]
    assert f2["load_cases[3].speed_rpm"] == "500"
    assert json.loads(f2["load_cases[3]._extra"]) == {"torque_alternating_pct": 10}
    assert web.read_form(f2)[2] == []


def test_new_load_case_names_are_unique_and_the_first_case_has_all_the_time():
    form = web.design_to_form(demo_design())
    form["load_cases[0].name"] = "case 4"
    f2, _ = web.apply_op(form, "add:load_cases")
    assert f2["load_cases[3].name"] == "case 5"
    for k in [k for k in f2 if k.startswith("load_cases[")]:
        del f2[k]
    f3, _ = web.apply_op(f2, "add:load_cases")
    assert _cases(f3) == [("case 1", 1.0)]
    # no share that reads as a number: nothing to split, the sum message will say what to fix
    form["load_cases[0].time_fraction"] = form["load_cases[1].time_fraction"] = "x"
    form["load_cases[2].time_fraction"] = "0"
    f4, _ = web.apply_op(form, "add:load_cases")
    assert f4["load_cases[3].time_fraction"] == "0"


def test_add_load_case_through_the_page_stays_solvable(client):
    r = client.post("/editor/op", data={**web.design_to_form(demo_design()), "op": "add:load_cases"})
    assert r.status_code == 200
    assert 'name="load_cases[3].time_fraction"' in r.text


# --- 3. defaults shown as placeholders ------------------------------------------------------

@pytest.mark.parametrize("system", ["si", "us"])
def test_optional_requirements_show_the_model_default(system):
    v = _by_path(web.design_to_form(demo_design(), system))
    for key in ("fatigue_safety_min", "yield_safety_min", "gear_deflection_max_mm", "gear_slope_max_rad"):
        f = next(f for f in web.REQUIREMENT_FIELDS if f.key == key)
        default = Requirements.model_fields[key].default
        assert v["requirements." + key].value == ""
        assert v["requirements." + key].hint == "default " + units.fmt(default, f.quantity, system)
    assert v[LUB + "viscosity_index"].hint == "default " + units.fmt(Lubricant.model_fields["viscosity_index"].default)


def test_placeholders_follow_the_model_everywhere():
    form = web.design_to_form(demo_design())
    views = {v.path: v for s in web.editor_sections(form) for r in s.rows for v in r.fields}
    ff = views["load_cases[0].force_factor"]
    assert ff.hint == "default " + units.fmt(LoadCase.model_fields["force_factor"].default)
    # a field with its own hint keeps it; a required field has no placeholder
    assert views["shaft.segments[0].bore_mm"].hint == "empty: solid"
    assert views["load_cases[0].speed_rpm"].hint == ""
    # no default in the model (None): no "default" text
    assert not views["shaft.segments[0].fillet_r_mm"].hint.startswith("default")


def test_page_shows_default_placeholders(client):
    t = client.get("/").text
    assert 'name="requirements.fatigue_safety_min"' in t
    assert f'placeholder="default {units.fmt(Requirements.model_fields["fatigue_safety_min"].default)}"' in t
    assert f'placeholder="default {units.fmt(Requirements.model_fields["gear_slope_max_rad"].default, "slope")}"' in t
