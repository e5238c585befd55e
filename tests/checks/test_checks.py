"""The shaft-check entry point on an invented design: sections, verdicts, ordering, Miner.

The design is a scenario of our own (no real machine). Values checked here are properties
of the method or hand calculations from the formulas (derived), not snapshots.
"""
from __future__ import annotations

import copy
import math

import pytest

from tests.checks.helpers import analysis_of
from engine import strength as st
from engine.checks import Section, ShaftCheckOutcome, shaft_checks

DEMO = {
    "name": "invented test shaft",
    "shaft": {"material": {"E_GPa": 205, "G_GPa": 80, "density_kg_m3": 7850, "Su_MPa": 700, "Sy_MPa": 500},
              "segments": [{"length_mm": 45, "d_mm": 30},
                           {"length_mm": 60, "d_mm": 38, "fillet_r_mm": 1.0},
                           {"length_mm": 150, "d_mm": 46, "fillet_r_mm": 1.5},
                           {"length_mm": 65, "d_mm": 38, "fillet_r_mm": 1.0},
                           {"length_mm": 50, "d_mm": 30, "fillet_r_mm": 0.8}],
              "grooves": [{"x_mm": 340, "depth_mm": 1.0, "r_mm": 0.2}]},
    "supports": [{"id": "L", "x_mm": 75, "bearing_type": "deep_groove_ball", "axial": "both"},
                 {"id": "R", "x_mm": 290, "bearing_type": "cylindrical_roller"}],
    "elements": [{"id": "G1", "kind": "gear", "x_mm": 180, "pitch_d_mm": 180, "torque_Nm": 250,
                  "keyway": "end_milled", "mass_kg": 4, "inertia_kg_m2": 0.02},
                 {"id": "C1", "kind": "coupling", "x_mm": 20, "torque_Nm": None, "keyway": "sled_runner",
                  "inertia_kg_m2": 0.01}],
    "load_cases": [{"name": "rated", "time_fraction": 0.9, "speed_rpm": 1450},
                   {"name": "peak", "time_fraction": 0.1, "speed_rpm": 1450, "torque_factor": 2.0,
                    "torque_alternating_pct": 20}],
    "requirements": {"life_h": 20000},
}


@pytest.fixture(scope="module")
def out() -> ShaftCheckOutcome:
    return shaft_checks(analysis_of(DEMO))


def test_sections_cover_shoulders_seats_supports_grooves_and_peaks(out):
    kinds = {s.kind for s in out.sections}
    assert {"shoulder", "seat", "support", "groove"} <= kinds
    xs = {s.x_mm for s in out.sections}
    assert {45, 105, 255, 320, 180, 20, 75, 290, 340} <= xs
    groove = next(s for s in out.sections if s.kind == "groove")
    assert groove.d_mm == pytest.approx(28.0)
    assert groove.Kt == pytest.approx(float(st.kt_groove(D_mm=30, t_mm=1.0, r_mm=0.2)))
    gear = next(s for s in out.sections if s.x_mm == 180)
    assert gear.Kt == 2.14 and gear.Kts == 3.0  # Shigley Table 7-1, end-milled keyseat
    assert any("largest moment" in s.where for s in out.sections)


def test_sections_worst_first_and_min_safety(out):
    worst = [min(s.n_fatigue / 1.5, s.n_yield / 1.5) for s in out.sections]
    assert worst == sorted(worst)
    assert out.min_safety_factor == pytest.approx(min(min(s.n_fatigue, s.n_yield) for s in out.sections))


def test_checks_sorted_and_sourced(out):
    rank = {"fail": 0, "warn": 1, "ok": 2}
    ranks = [rank[c.status] for c in out.checks]
    assert ranks == sorted(ranks)
    codes = {c.code for c in out.checks}
    assert {"shaft.fatigue", "shaft.yield", "shaft.bearing_slope", "shaft.gear_deflection",
            "shaft.gear_slope", "shaft.critical_speed"} <= codes
    for c in out.checks:
        assert c.source and c.where and c.load_case and c.value is not None and c.limit is not None
        assert math.isfinite(c.value)
    first_fatigue = next(c for c in out.checks if c.code == "shaft.fatigue")
    assert first_fatigue.value == pytest.approx(min(s.n_fatigue for s in out.sections))


def test_shoulder_section_by_hand(out):
    # shoulder at x = 255 mm: D/d = 46/38, r = 1.0 mm; Kt from the fit, q by Neuber (Shigley
    # Eq. 6-35), Se by the Marin factors (machined, d = 38 mm, 90 % → ke = 0.897): derived
    s = next(s for s in out.sections if s.x_mm == 255)
    Kt = float(st.kt_shoulder(D_mm=46, d_mm=38, r_mm=1.0))
    q = float(st.notch_sensitivity(Su_MPa=700, r_mm=1.0))
    assert s.Kt == pytest.approx(Kt) and s.Kf == pytest.approx(1 + q * (Kt - 1))
    Se = 0.5 * 700 * 4.51 * 700**-0.265 * (38 / 7.62) ** -0.107 * 0.897
    assert s.Se_MPa == pytest.approx(Se, rel=1e-3)


def test_dynamics_summary(out):
    assert len(out.natural_frequencies_rpm) == 3
    assert out.critical_speed_rpm == out.natural_frequencies_rpm[0]
    assert out.rayleigh_rpm >= out.critical_speed_rpm * (1 - 1e-9)
    assert out.rayleigh_rpm == pytest.approx(out.critical_speed_rpm, rel=0.05)
    assert out.torsional_rpm is not None and out.torsional_rpm > 0


def test_critical_speed_margin_bands():
    d = copy.deepcopy(DEMO)
    n_c = shaft_checks(analysis_of(d)).critical_speed_rpm
    for speed, status in ((0.7 * n_c, "ok"), (0.9 * n_c, "fail"), (1.3 * n_c, "warn")):
        d["load_cases"] = [{"name": "x", "speed_rpm": speed}]
        c = next(c for c in shaft_checks(analysis_of(d)).checks if c.code == "shaft.critical_speed")
        assert c.status == status and c.limit == pytest.approx(0.8 * n_c)  # default margin 20 %


def test_criterion_choice_orders_as_expected():
    # with the same stresses, Soderberg ≤ Goodman ≤ Gerber (Shigley 9th ed. Fig. 6-27)
    res = {}
    for crit in ("soderberg", "de_goodman", "de_gerber"):
        d = copy.deepcopy(DEMO)
        d["requirements"]["fatigue_criterion"] = crit
        res[crit] = shaft_checks(analysis_of(d)).sections[0].n_fatigue
    assert res["soderberg"] <= res["de_goodman"] <= res["de_gerber"]


def test_minimum_diameter_reaches_the_target_at_every_section(out):
    # scaling each section to d_min gives safety ≥ target; checked by re-solving a design whose
    # sections are all enlarged: every d_min must then be at or below the section's diameter
    for s in out.sections:
        if min(s.n_fatigue, s.n_yield) >= 1.5 and not s.miner:
            assert s.d_min_mm <= s.d_mm * (1 + 1e-9)
        else:
            assert s.d_min_mm > s.d_mm * (1 - 1e-9)


def test_overload_case_uses_miner():
    # a short, heavy overload pushes one case past the endurance limit: Miner's rule combines it
    d = copy.deepcopy(DEMO)
    d["load_cases"] = [{"name": "rated", "time_fraction": 0.999, "speed_rpm": 1450},
                       {"name": "jam", "time_fraction": 0.001, "speed_rpm": 100, "torque_factor": 9.0}]
    d["elements"][0]["torque_Nm"] = 150
    out = shaft_checks(analysis_of(d))
    m = [s for s in out.sections if s.miner]
    assert m, "expected a section rated by Miner's rule"
    s = m[0]
    assert s.load_case == "duty cycle (Miner)"
    c = next(c for c in out.checks if c.code == "shaft.fatigue" and c.where == s.where)
    assert "Miner" in c.source and c.value == pytest.approx(s.n_fatigue)


def test_engine_modules_do_not_import_web_code():
    # house rule (STYLE.md): engine/ knows nothing of the web; scipy is for tests only
    import ast
    import pathlib
    root = pathlib.Path(__file__).resolve().parents[2] / "engine"
    for name in ("checks", "dynamics", "stiffness", "strength"):
        tree = ast.parse((root / f"{name}.py").read_text())
        mods = {n.module for n in ast.walk(tree) if isinstance(n, ast.ImportFrom)} | \
               {a.name for n in ast.walk(tree) if isinstance(n, ast.Import) for a in n.names}
        assert not {m.split(".")[0] for m in mods if m} & {"fastapi", "jinja2", "plotly", "app", "scipy"}


def test_section_is_plain_data(out):
    s = out.sections[0]
    assert isinstance(s, Section)
    d = s.model_dump()
    assert {"x_mm", "kind", "d_mm", "Kt", "Kts", "Kf", "Kfs", "sigma_a_MPa", "tau_m_MPa", "n_fatigue",
            "n_yield", "d_min_mm", "load_case"} <= set(d)


def test_summary_fills_the_result_model(out):
    from engine.result import ShaftSummary
    s = ShaftSummary(max_deflection_mm=0.01, **out.summary())
    assert s.critical_speed_rpm == out.critical_speed_rpm and len(s.natural_frequencies_rpm) == 3
    assert s.min_safety_factor == out.min_safety_factor and s.torsional_rpm == out.torsional_rpm


def _section_at(out, x):
    return next(s for s in out.sections if s.x_mm == x)


def test_press_fit_and_keyway_take_the_larger_factor():
    # several raisers at one node do not multiply; the larger Kf of each load kind governs
    # (common practice). Press fit: Kf taken directly (2.0 bending, 1.5 torsion; common practice).
    d = copy.deepcopy(DEMO)
    d["elements"][0]["press_fit"] = True
    s = _section_at(shaft_checks(analysis_of(d)), 180)
    kf_key = 1 + float(st.notch_sensitivity(Su_MPa=700, r_mm=0.02 * 46)) * (2.14 - 1)
    assert s.Kf == pytest.approx(max(2.0, kf_key))
    d["elements"][0]["keyway"] = None
    s = _section_at(shaft_checks(analysis_of(d)), 180)
    assert (s.Kf, s.Kfs) == (2.0, 1.5)


def test_alternating_torque_and_temperature_lower_the_fatigue_safety():
    # the shoulder at x = 105 mm carries torque (between the coupling and the gear)
    base = _section_at(shaft_checks(analysis_of(DEMO)), 105)
    d = copy.deepcopy(DEMO)
    for c in d["load_cases"]:
        c["torque_alternating_pct"] = 50
    alt = _section_at(shaft_checks(analysis_of(d)), 105)
    assert alt.n_fatigue < base.n_fatigue and alt.n_yield < base.n_yield
    d = copy.deepcopy(DEMO)
    d["requirements"]["shaft_temperature_C"] = 400
    hot = _section_at(shaft_checks(analysis_of(d)), 105)
    # Shigley Eq. 6-27; the polynomial gives 0.99995 at 70 °F, hence the ratio of the two
    assert hot.Se_MPa == pytest.approx(base.Se_MPa * st.marin_temperature(400) / st.marin_temperature(20))


def test_hollow_section_stresses():
    # σ = 32·M·d/(π(d⁴ − di⁴)), τ = 16·T·d/(π(d⁴ − di⁴)) (Shigley 9th ed. §3-12, §3-11; derived)
    sb, tau, sax = st.nominal_stresses(d_mm=40.0, bore_mm=20.0, M_Nmm=1e5, T_Nmm=2e5, N_N=3e3)
    assert sb == pytest.approx(32 * 1e5 * 40 / (math.pi * (40**4 - 20**4)))
    assert tau == pytest.approx(16 * 2e5 * 40 / (math.pi * (40**4 - 20**4)))
    assert sax == pytest.approx(4 * 3e3 / (math.pi * (40**2 - 20**2)))


def test_sort_checks_reads_at_least_and_at_most_margins():
    from engine.checks import sort_checks
    from engine.result import Check
    life = Check(code="bearing.life", status="ok", message="", value=21000, limit=20000)  # +5 %
    slope = Check(code="shaft.bearing_slope", status="ok", message="", value=0.0009, limit=0.001)  # +10 %
    fat = Check(code="shaft.fatigue", status="ok", message="", value=1.8, limit=1.5)  # +20 %
    bad = Check(code="shaft.yield", status="fail", message="", value=1.2, limit=1.5)
    assert sort_checks([fat, slope, life, bad]) == [bad, life, slope, fat]
