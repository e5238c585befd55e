"""The shaft as mounted (engine.mounting and the hub-end sections of engine.checks).

Designs here are invented scenarios. Each value names its source: a textbook example or table
(memory: recalled, verify against the book), a closed form written out in the test (derived),
or common practice.
"""
from __future__ import annotations

import copy
import json
import math
from pathlib import Path

import pytest

from engine import mounting as mt
from engine.model import DesignError, parse_design
from engine.solve import solve

ROOT = Path(__file__).resolve().parents[2]
DEMOS = sorted((ROOT / "sample_data").glob("*.json"))


def demo(name: str = "countershaft") -> dict:
    return json.loads((ROOT / "sample_data" / f"{name}.json").read_text())


def checks_of(result, code: str) -> list:
    return [c for c in result.checks if c.code == code]


# --- 1. notch sections where the hubs end ------------------------------------------------------

# An overhung keyed pulley: hub 7–47 mm on a 30 mm journal, centre at x = 27 mm, pulley pull
# F across the axis; a 30/40 step with a generous fillet at x = 50, bearings at 70 and 230; a
# coupling at 200 takes the torque off. No weight (gravity null), so left of the first
# bearing the moment is the cantilever's, M(x) = F·(x − 27) (statics), and T = 200 N·m.
OVERHUNG = {
    "name": "overhung keyed pulley (invented)",
    "gravity": None,
    "shaft": {"material": {"E_GPa": 205, "G_GPa": 80, "Su_MPa": 700, "Sy_MPa": 500},
              "segments": [{"length_mm": 50, "d_mm": 30},
                           {"length_mm": 210, "d_mm": 40, "fillet_r_mm": 3.0}]},
    "supports": [{"id": "A", "x_mm": 70, "bearing_type": None, "axial": "both"},
                 {"id": "B", "x_mm": 230, "bearing_type": None}],
    "elements": [{"id": "P1", "kind": "pulley", "x_mm": 27, "pitch_d_mm": 200, "tension_ratio": 3,
                  "strand_angle_deg": 90, "torque_Nm": 200, "keyway": "end_milled", "width_mm": 40},
                 {"id": "C1", "kind": "coupling", "x_mm": 200, "torque_Nm": None}],
    "load_cases": [{"name": "run", "speed_rpm": 1000}],
}


def test_hub_inner_end_is_checked_with_its_own_moment_and_governs():
    r = solve(OVERHUNG)
    sec = next(s for s in r.shaft.sections if abs(s.x_mm - 47.0) < 1e-9)
    assert "P1 hub end" in sec.where
    P1 = r.load_cases[0].elements[0]
    F = math.hypot(P1.Fy_N, P1.Fz_N)  # the pulley's pull [N]
    M = F * (47.0 - 27.0)  # cantilever moment at the hub's inner end [N·mm] (statics)
    T = 200e3  # [N·mm]
    d = 30.0
    Kf, Kfs, Se, Sut = sec.Kf, sec.Kfs, sec.Se_MPa, 700.0  # the tool's own factors, as the issue asks
    # Shigley 9th ed. Eq. 7-8 (DE–Goodman, solid round shaft), with Ma = M, Tm = T, Mm = Ta = 0:
    # 1/n = 16/(π d³) · { [4(Kf·Ma)²]^½ / Se + [3(Kfs·Tm)²]^½ / Sut }
    n_hand = 1.0 / (16.0 / (math.pi * d**3) * (math.sqrt(4 * (Kf * M) ** 2) / Se
                                                + math.sqrt(3 * (Kfs * T) ** 2) / Sut))
    assert sec.n_fatigue == pytest.approx(n_hand, rel=0.01)
    fatigue = checks_of(r, "shaft.fatigue")
    worst = min(fatigue, key=lambda c: c.value)
    assert worst.x_mm == pytest.approx(47.0) and "P1 hub end" in worst.where
    centre = next(c for c in fatigue if c.x_mm == pytest.approx(27.0))
    assert centre.value > 1.5 * worst.value
    centre_sec = next(s for s in r.shaft.sections if s.x_mm == pytest.approx(27.0))
    assert centre_sec.sigma_a_MPa < 0.01 * sec.sigma_a_MPa  # the hub's centre carries almost no moment
    assert all(c.x_mm is not None for c in fatigue + checks_of(r, "shaft.yield"))


def test_keyseat_ends_are_sections_when_the_key_is_shorter_than_the_hub():
    d = copy.deepcopy(OVERHUNG)
    d["elements"][0]["key"] = {"length_mm": 28}
    r = solve(d)
    labels = {round(s.x_mm, 6): s.where for s in r.shaft.sections}
    assert "P1 keyseat end" in labels[41.0] and "P1 keyseat end" in labels[13.0]
    d["elements"][0]["keyway"] = "sled_runner"
    r = solve(d)
    assert any("keyseat runout" in s.where for s in r.shaft.sections)


def test_demo_countershaft_pulley_hub_inner_end_is_the_weakest_section():
    r = solve(demo())
    worst = min(checks_of(r, "shaft.fatigue"), key=lambda c: c.value)
    # issue 12: hand DE–Goodman at x = 55 mm gave about 3.39, below the 3.465 of the shoulder
    assert worst.x_mm == pytest.approx(55.0)
    assert worst.value < 3.465


# --- 2. hub connections ------------------------------------------------------------------------

def test_key_size_follows_din_6885_1():
    # DIN 6885-1 (memory): d 30–38 → 10 × 8, t1 5; 44–50 → 14 × 9, t1 5.5; 17–22 → 6 × 6, t1 3.5
    assert mt.key_size(32) == mt.KeySize(10, 8, 5.0, 3.3)
    assert mt.key_size(50) == mt.KeySize(14, 9, 5.5, 3.8)
    assert mt.key_size(20) == mt.KeySize(6, 6, 3.5, 2.8)
    assert mt.key_size(300) is None
    assert mt.key_length(47) == 45 and mt.key_length(5) is None


def test_key_reproduces_shigley_example_7_6():
    # Shigley 9th ed. Example 7-6 (memory): 1 7/16 in shaft, 40 hp at 600 rpm → T = 4200 lbf·in,
    # F = T/r = 5841 lbf; 3/8 in square key of cold-drawn 1020, Sy = 65 kpsi, design factor 2.80:
    # shear needs l = 1.16 in, crushing (on half the height) l = 1.34 in.
    d, T, t = 1.4375, 4200.0, 0.375
    F, p_shaft, p_hub, p_key, tau = mt.key_stresses(T_Nmm=T, d_mm=d, b_mm=t, h_mm=t, t1_mm=t / 2,
                                                    bearing_length_mm=1.16)
    assert float(F) == pytest.approx(5841, rel=0.002)
    assert 0.577 * 65e3 / float(tau) == pytest.approx(2.80, rel=0.01)
    F, p_shaft, p_hub, p_key, tau = mt.key_stresses(T_Nmm=T, d_mm=d, b_mm=t, h_mm=t, t1_mm=t / 2,
                                                    bearing_length_mm=1.34)
    assert 65e3 / float(p_key) == pytest.approx(2.80, rel=0.01)
    assert float(p_shaft) == float(p_hub) == float(p_key)  # square key, keyseat at half height


def test_key_checks_in_a_design_use_the_peak_torque_and_name_the_part():
    d = copy.deepcopy(OVERHUNG)
    d["load_cases"] = [{"name": "run", "speed_rpm": 1000, "time_fraction": 0.9},
                       {"name": "start", "speed_rpm": 500, "time_fraction": 0.1, "torque_factor": 2.5}]
    d["elements"][0]["key"] = {"ends": "square", "Sy_MPa": 300}
    r = solve(d)
    keys = checks_of(r, "mount.key")
    assert len(keys) == 4 and all(c.where == "P1" and c.x_mm == 27 for c in keys)
    row = r.mounting.keys[0]
    # DIN 6885-1: d = 30 → 8 × 7, t1 = 4 (d over 22 up to 30); length 40 from the 40 mm hub
    assert (row.b_mm, row.h_mm, row.t1_mm, row.length_mm) == (8, 7, 4, 40)
    F = 2 * 500e3 / 30  # peak torque 2.5 × 200 N·m in 'start'
    assert row.peak_torque_Nm == pytest.approx(500) and row.load_case == "start"
    assert row.p_hub_MPa == pytest.approx(F / ((7 - 4) * 40))
    assert row.tau_MPa == pytest.approx(F / (8 * 40))
    flank = next(c for c in keys if "key flank" in c.message)
    assert flank.value == pytest.approx(300 / (F / (3 * 40)))
    assert flank.status == ("ok" if flank.value >= 1.5 else "fail")


def test_a_key_that_cannot_carry_the_peak_torque_fails_with_its_factor():
    d = copy.deepcopy(OVERHUNG)
    d["elements"][0]["width_mm"] = 12
    d["load_cases"][0]["torque_factor"] = 3
    r = solve(d)
    bad = [c for c in checks_of(r, "mount.key") if c.status == "fail"]
    assert bad and all(c.value < 1.5 and "P1" in c.message for c in bad)


def test_iso_286_deviations_as_published():
    # ISO 286-2 (memory): Ø50 H7 = 0/+25, s6 = +43/+59; Ø40 k5 = +2/+13; Ø25 H7 = 0/+21;
    # Ø30 h6 = −13/0; Ø60 r6 = +41/+60; Ø80 u6 = +102/+121 (65–80 step); Ø45 m6 = +9/+25
    assert mt.hole_deviations("H7", 50) == (0, 25)
    assert mt.shaft_deviations("s6", 50) == (43, 59)
    assert mt.shaft_deviations("k5", 40) == (2, 13)
    assert mt.hole_deviations("H7", 25) == (0, 21)
    assert mt.shaft_deviations("h6", 30) == (-13, 0)
    assert mt.shaft_deviations("r6", 60) == (41, 60)
    assert mt.shaft_deviations("u6", 80) == (102, 121)
    assert mt.shaft_deviations("m6", 45) == (9, 25)
    # Shigley 9th ed. Table 7-9 / ISO 286: H7/s6 medium drive fit at 50 mm → 18 … 59 µm
    assert mt.fit_interference("H7/s6", 50) == (18, 59)
    with pytest.raises(ValueError):
        mt.fit_interference("H7/s6", 600)


def test_press_fit_pressure_and_capacity_by_lame():
    # Lamé, solid shaft, hub of outer diameter do, same material (Shigley 9th ed. Eq. 3-57 with
    # ri = 0, written with diameters and the diametral interference δ):
    #   p = E·δ/(2·d) · (1 − d²/do²)
    E, d, do, delta = 205e3, 50.0, 100.0, 0.059
    p = E * delta / (2 * d) * (1 - d**2 / do**2)
    assert float(mt.lame_pressure(interference_mm=delta, d_mm=d, shaft_bore_mm=0, hub_outer_d_mm=do,
                                  E_shaft_MPa=E, E_hub_MPa=E)) == pytest.approx(p, rel=1e-12)
    # different materials, hollow shaft (Shigley Eq. 3-56 written out):
    #   p = δ / ( d/Eo·((do² + d²)/(do² − d²) + νo) + d/Ei·((d² + di²)/(d² − di²) − νi) )
    Eo, Ei, di, nuo, nui = 100e3, 205e3, 20.0, 0.26, 0.3
    p2 = delta / (d / Eo * ((do**2 + d**2) / (do**2 - d**2) + nuo) + d / Ei * ((d**2 + di**2) / (d**2 - di**2) - nui))
    assert float(mt.lame_pressure(interference_mm=delta, d_mm=d, shaft_bore_mm=di, hub_outer_d_mm=do,
                                  E_shaft_MPa=Ei, E_hub_MPa=Eo, nu_shaft=nui, nu_hub=nuo)) == pytest.approx(p2, rel=1e-12)
    # torque and axial capacity: T = π/2·f·p·d²·l, F = π·f·p·d·l (Shigley 9th ed. Eq. 7-40)
    T, F = mt.press_fit_capacity(p_MPa=p, d_mm=d, length_mm=60, friction=0.12)
    assert float(T) == pytest.approx(math.pi / 2 * 0.12 * p * d**2 * 60)
    assert float(F) == pytest.approx(math.pi * 0.12 * p * d * 60)
    # hub bore: σt = p(do² + d²)/(do² − d²), σr = −p (Shigley Eq. 3-58)
    s_hub, s_shaft = mt.press_fit_stresses(p_MPa=p, d_mm=d, shaft_bore_mm=0, hub_outer_d_mm=do)
    st = p * (do**2 + d**2) / (do**2 - d**2)
    assert float(s_hub) == pytest.approx(math.sqrt(st**2 + st * p + p**2)) and float(s_shaft) == pytest.approx(p)


def test_press_fit_in_a_design():
    # a gear pressed H7/s6 on a 50 mm seat, hub 100 mm outside and 60 mm long, f = 0.12
    design = {
        "name": "pressed gear (invented)", "gravity": None,
        "shaft": {"material": {"E_GPa": 205, "Su_MPa": 800, "Sy_MPa": 600},
                  "segments": [{"length_mm": 300, "d_mm": 50}]},
        "supports": [{"id": "A", "x_mm": 20, "bearing_type": None, "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": None}],
        "elements": [{"id": "G1", "kind": "gear", "x_mm": 150, "pitch_d_mm": 200, "torque_Nm": 900,
                      "width_mm": 60, "press_fit": {"fit": "H7/s6", "hub_outer_d_mm": 100, "friction": 0.12}},
                     {"id": "C1", "kind": "coupling", "x_mm": 290, "torque_Nm": None}],
        "load_cases": [{"name": "run", "speed_rpm": 500}],
    }
    r = solve(design)
    row = r.mounting.press_fits[0]
    E, d, do = 205e3, 50.0, 100.0
    p_min = E * 0.018 / (2 * d) * (1 - d**2 / do**2)  # δmin = 18 µm (H7/s6 at 50 mm)
    assert row.p_min_MPa == pytest.approx(p_min)
    T_cap = math.pi / 2 * 0.12 * p_min * d**2 * 60 / 1e3  # [N·m]
    assert row.torque_capacity_Nm == pytest.approx(T_cap)
    slip = next(c for c in checks_of(r, "mount.press_fit") if "slip" in c.message)
    assert slip.value == pytest.approx(T_cap / 900) and slip.x_mm == 150
    assert slip.status == ("ok" if T_cap / 900 >= 1.5 else "fail")
    # press-fitted hub ends are notch sections too
    assert any("G1 hub end (press fit)" in s.where for s in r.shaft.sections)
    # old form: press_fit true still loads and assumes H7/s6 and a 2·d hub, saying so
    design["elements"][0]["press_fit"] = True
    r = solve(design)
    assert "assumed" in next(c for c in checks_of(r, "mount.press_fit") if "slip" in c.message).message


# --- 3. seats, shoulders, overlaps --------------------------------------------------------------

def test_a_bearing_hanging_past_its_step_is_reported():
    d = demo()
    d["supports"][0]["x_mm"] = 62  # 23 mm wide bearing on the 40 mm seat that starts at 60
    r = solve(d)
    seat = checks_of(r, "mount.seat")
    assert len(seat) == 1 and seat[0].status == "fail" and seat[0].where == "A"
    assert "support A" in seat[0].message and "40/32 mm step at x = 60 mm" in seat[0].message
    assert seat[0].value == pytest.approx(60 - (62 - 11.5))


def test_a_gear_overlapping_a_bearing_is_reported():
    d = demo()
    d["elements"][1]["x_mm"] = 240  # G1's 45 mm hub reaches 262.5 mm, over bearing B (246–264)
    r = solve(d)
    ov = checks_of(r, "mount.overlap")
    assert ov and ov[0].status == "fail"
    assert "gear G1" in ov[0].message and "support B" in ov[0].message


def test_a_hub_running_onto_a_larger_diameter_is_reported():
    d = demo()
    d["elements"][1]["x_mm"] = 145  # G1's 45 mm hub on the 52 mm seat now reaches back to 122.5 mm
    r = solve(d)
    seat = [c for c in checks_of(r, "mount.seat") if c.where == "G1"]
    assert not seat  # the hub reaches the smaller 46 mm diameter only: it overhangs, it does not collide
    d["elements"][1]["x_mm"] = 110  # on the 46 mm seat, 87.5–132.5 mm: runs onto the 52 mm part at 130
    seat = [c for c in checks_of(solve(d), "mount.seat") if c.where == "G1"]
    assert seat and seat[0].status == "fail" and seat[0].value == pytest.approx(2.5)
    assert "gear G1" in seat[0].message and "52 mm" in seat[0].message and seat[0].x_mm == 130


def test_a_shoulder_too_high_for_the_bearing_is_reported():
    d = demo()
    d["shaft"]["segments"][2]["d_mm"] = 70  # the 90–130 mm step: far above the abutment range
    d["supports"][0]["x_mm"] = 90 - 11.5  # the 23 mm bearing against it
    r = solve(d)
    sh = [c for c in checks_of(r, "mount.shoulder") if c.where == "A"]
    assert sh and sh[0].status != "ok" and "too high" in sh[0].message and "support A" in sh[0].message
    assert sh[0].x_mm == 90 and sh[0].value == 70 and sh[0].limit == pytest.approx(40 + 0.30 * (90 - 40))
    # and too low: the demo's 46 mm shoulder against the 40 × 90 mm bearing (rule: at least
    # d + 0.15·(D − d) = 47.5 mm, common practice)
    d["shaft"]["segments"][2]["d_mm"] = 46
    low = [c for c in checks_of(solve(d), "mount.shoulder_low") if c.where == "A"]
    assert low and "too low" in low[0].message and low[0].limit == pytest.approx(47.5) and low[0].value == 46


def test_a_ring_groove_under_a_seat_is_reported():
    d = demo()
    d["shaft"]["grooves"] = [{"x_mm": 75, "depth_mm": 1.0}]
    r = solve(d)
    g = checks_of(r, "mount.groove")
    assert g and "support A" in g[0].message and g[0].x_mm == 75


def test_seat_rows_give_seat_length_and_shoulder_height():
    d = demo()
    d["supports"][0]["x_mm"] = 90 - 11.5
    r = solve(d)
    seat = next(s for s in r.mounting.seats if s.support == "A")
    assert (seat.seat_from_mm, seat.seat_to_mm) == (60, 90)
    assert seat.shoulder_d_mm == 46 and seat.shoulder_height_mm == 3
    assert any("+x" in v and "shoulder" in v for v in seat.located_by)


# --- 4. fits --------------------------------------------------------------------------------------

@pytest.mark.parametrize("kind, bore, ratio, ring, floating, shaft, housing", [
    # common practice (memory): the rolling-bearing seat-fit table, rotating inner ring load
    ("deep_groove_ball", 40, 0.05, "rotating", False, "j6", "H7"),     # ball, light, 17–100
    ("deep_groove_ball", 40, 0.09, "rotating", False, "k5", "H7"),     # ball, normal, 17–100
    ("deep_groove_ball", 12, 0.09, "rotating", False, "j5", "H7"),     # ball, normal, 10–17
    ("deep_groove_ball", 120, 0.09, "rotating", False, "m5", "H7"),    # ball, normal, 100–140
    ("cylindrical_roller", 50, 0.05, "rotating", False, "k6", "H7"),   # roller, light, 25–60
    ("cylindrical_roller", 50, 0.09, "rotating", False, "m5", "H7"),   # roller, normal, 40–65
    ("spherical_roller", 120, 0.09, "rotating", False, "n6", "H7"),    # roller, normal, 100–140
    ("cylindrical_roller", 120, 0.15, "rotating", False, "p6", "H7"),  # roller, heavy, 65–140
    ("deep_groove_ball", 40, 0.09, "stationary", True, "g6", "M7"),    # stationary inner ring, must slide
    ("tapered_roller", 40, 0.15, "stationary", False, "h6", "N7"),     # stationary inner ring, heavy
])
def test_fit_proposals_follow_the_table(kind, bore, ratio, ring, floating, shaft, housing):
    s, h, why = mt.propose_fits(bearing_type=kind, bore_mm=bore, P_over_C=ratio, inner_ring_load=ring,
                                floating=floating)
    assert (s, h) == (shaft, housing)
    assert ring in why


def test_fits_are_in_the_result_and_the_designer_overrides_them():
    r = solve(demo())
    a = next(b for b in r.bearings if b.id == "A")
    assert a.fits.shaft == "k5" and a.fits.housing == "H7" and a.fits.chosen_by == "proposed"
    assert r.model_dump()["bearings"][0]["fits"]["shaft"] == "k5"
    d = demo()
    d["supports"][0]["fits"] = {"shaft": "m5"}
    a = next(b for b in solve(d).bearings if b.id == "A")
    assert (a.fits.shaft, a.fits.housing) == ("m5", "H7") and "designer" in a.fits.chosen_by
    d["supports"][0]["fits"] = {"shaft": "K5"}
    with pytest.raises(DesignError) as exc:
        parse_design(d)
    assert exc.value.errors[0].path == "supports[0].fits.shaft"


# --- 5. twist ---------------------------------------------------------------------------------------

def test_twist_between_two_couplings_is_t_l_over_g_j():
    # uniform 40 mm shaft, 500 N·m between couplings 400 mm apart: θ = T·L/(G·J), J = π d⁴/32
    design = {
        "name": "twist (invented)", "gravity": None,
        "shaft": {"material": {"G_GPa": 80}, "segments": [{"length_mm": 500, "d_mm": 40}]},
        "supports": [{"id": "A", "x_mm": 30, "bearing_type": None, "axial": "both"},
                     {"id": "B", "x_mm": 470, "bearing_type": None}],
        "elements": [{"id": "C1", "kind": "coupling", "x_mm": 50, "torque_Nm": 500},
                     {"id": "C2", "kind": "coupling", "x_mm": 450, "torque_Nm": None}],
        "load_cases": [{"name": "run", "speed_rpm": 300}],
        "requirements": {"twist_limit_deg_per_m": 1.0},
    }
    r = solve(design)
    theta = 500e3 * 400 / (80e3 * math.pi * 40**4 / 32)
    span = r.mounting.twist[0]
    assert span.angle_deg == pytest.approx(math.degrees(theta), rel=1e-9)
    c = checks_of(r, "shaft.twist")[0]
    assert c.value == pytest.approx(math.degrees(theta) / 0.4) and c.limit == 1.0
    assert c.status == ("ok" if c.value <= 1.0 else "fail") and c.where == "C1 to C2"


# --- x_mm on every check -------------------------------------------------------------------------

@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_every_check_of_every_demo_is_placed(path):
    r = solve(json.loads(path.read_text()))
    dumped = r.model_dump()["checks"]
    for c, raw in zip(r.checks, dumped):
        if c.where == "shaft":
            assert c.x_mm is None and "x_mm" not in raw  # whole-shaft checks carry none
        else:
            assert c.x_mm is not None, (c.code, c.where)
            assert 0 <= c.x_mm <= r.shaft.length_mm


# --- input ----------------------------------------------------------------------------------------

def test_mounting_keys_are_optional_and_bad_ones_are_named():
    parse_design(demo())  # a file without any of the new keys loads as before
    cases = [
        (("elements", 0, "press_fit"), [1], "elements[0].press_fit", "true, false, or the press fit"),
        (("elements", 0, "press_fit"), {"fit": "H7/s6", "interference_um": 30}, "elements[0].press_fit", "give one"),
        (("elements", 0, "press_fit"), {"fit": "H7/q6"}, "elements[0].press_fit.fit", "H7/s6"),
        (("elements", 0, "press_fit"), {"hub_outer_d_mm": 30}, "elements[0].press_fit.hub_outer_d_mm", "32 mm"),
        (("supports", 0, "fits"), {"housing": "h7"}, "supports[0].fits.housing", "H7"),
        (("requirements", "twist_limit_deg_per_m"), 0, "requirements.twist_limit_deg_per_m", "greater than 0"),
    ]
    for where, value, path, words in cases:
        d = demo()
        obj = d
        for k in where[:-1]:
            obj = obj[k]
        obj[where[-1]] = value
        with pytest.raises(DesignError) as exc:
            parse_design(d)
        assert [(e.path, words in e.message) for e in exc.value.errors] == [(path, True)], exc.value.errors
    d = demo()
    d["elements"][0].pop("keyway")
    d["elements"][0]["key"] = {"b_mm": 10}
    with pytest.raises(DesignError) as exc:
        parse_design(d)
    assert exc.value.errors[0].path == "elements[0].key" and "P1" in exc.value.errors[0].message


def test_a_tables_own_abutment_diameter_sets_the_shoulder_limit():
    """The contract's optional table column da_min_mm (smallest shaft abutment diameter) replaces
    the common-practice rule: the demo's 46 mm shoulder passes against a row that says 45 mm and
    fails against the rule's 47.5 mm (test above). Table values invented for the test."""
    from engine.bearings.catalogue import BUNDLED_PATH

    d = demo()
    d["shaft"]["segments"][2]["d_mm"] = 46
    d["supports"][0]["x_mm"] = 90 - 11.5
    lines = BUNDLED_PATH.read_text(encoding="utf-8").splitlines()
    head = next(i for i, ln in enumerate(lines) if ln.strip() and not ln.startswith("#"))
    rows = [lines[head] + ",da_min_mm,Da_max_mm"] + [
        ln + (",45,82" if ln.startswith("DG-03-40,") else ",,") for ln in lines[head + 1:] if ln.strip()]
    d["bearing_table"] = {"name": "own table with abutments", "csv": "\n".join(rows)}
    d["supports"][0]["designation"] = "DG-03-40"
    r = solve(d)
    cand = next(c for b in r.bearings if b.id == "A" for c in b.candidates if c.designation == "DG-03-40")
    assert (cand.da_min_mm, cand.Da_max_mm) == (45, 82)
    assert not [c for c in checks_of(r, "mount.shoulder_low") if c.where == "A" and c.status != "ok"]
    seat = next(s for s in r.mounting.seats if s.support == "A")
    assert seat.da_min_mm == 45
