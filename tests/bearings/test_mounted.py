"""Bearings as mounted (issue 13): pressure centres, the designer's designation, minimum load,
bearing stiffness in the deflections and critical speeds, and the required rating.

Validation values: statics of a beam on two supports (the reactions' lever arms), the exact
frequency equation of a uniform Euler–Bernoulli beam on two end springs (derived below from
EI·w'''' = ρA·ω²·w with zero moment and a spring at each end; e.g. Blevins, *Formulas for
Natural Frequency and Mode Shape*, 1979, ch. 8, beams with elastic supports), ISO 281
(e = 1.5·tan α). Minimum load: common practice, from memory.
"""
from __future__ import annotations

import copy
import json
import math
from pathlib import Path

import numpy as np
import pytest

import engine
from engine.bearings import bundled_catalogue
from engine.bearings.catalogue import BUNDLED_PATH
from engine.bearings.mounted import radial_deflection_mm, row_geometry
from engine.model import DesignError

ROOT = Path(__file__).resolve().parents[2]
COUNTERSHAFT = json.loads((ROOT / "sample_data" / "countershaft.json").read_text(encoding="utf-8"))


def _row(designation: str) -> int:
    cat = bundled_catalogue()
    return int(np.flatnonzero(cat.designation == designation.replace(" (matched pair)", ""))[0])


def _tapered_pair(left: str, right: str, **analysis) -> dict:
    """A 45 mm shaft on two tapered roller bearings 200 mm apart, a radial load of 12 kN at
    x = 100 mm (nearer A) and 2 kN along +x; no weight."""
    return {
        "name": "tapered pair", "gravity": None,
        "shaft": {"material": {"name": "steel", "E_GPa": 205, "G_GPa": 80, "density_kg_m3": 7850,
                               "Su_MPa": 850, "Sy_MPa": 650},
                  "segments": [{"length_mm": 300, "d_mm": 45}]},
        "supports": [{"id": "A", "x_mm": 50, "bearing_type": "tapered_roller", "axial": left},
                     {"id": "B", "x_mm": 250, "bearing_type": "tapered_roller", "axial": right}],
        "elements": [{"id": "F", "kind": "force", "x_mm": 100, "Fy_N": -12000, "Fx_N": 2000}],
        "load_cases": [{"name": "run", "speed_rpm": 800}],
        "requirements": {"life_h": 10000},
        "analysis": analysis,
    }


@pytest.mark.parametrize("analysis", [{}, {"bearing_stiffness": False}])
def test_tapered_pairs_act_at_their_pressure_centres(analysis):
    res = {}
    for name, (left, right) in {"O": ("+x", "-x"), "X": ("-x", "+x")}.items():
        r = engine.solve(_tapered_pair(left, right, **analysis))
        cat = bundled_catalogue()
        case = r.load_cases[0]
        xs = {}
        for s, b in zip(case.supports, r.bearings):
            row = _row(b.designation)
            dm = 0.5 * (cat.d_mm[row] + cat.D_mm[row])
            a = dm / 2 * cat.e[row] / 1.5                       # (dm/2)·tan α, tan α = e/1.5 (ISO 281)
            role = {"A": left, "B": right}[s.id]
            expected = -a if role == "+x" else a               # toward the back face
            assert s.x_load_mm - s.x_mm == pytest.approx(expected, rel=0.01)
            assert b.x_load_mm == pytest.approx(s.x_load_mm)
            xs[s.id] = s.x_load_mm
        # statics about the pressure centres: the reactions balance the load and its moment
        F, xF = -12000.0, 100.0
        RB = -F * (xF - xs["A"]) / (xs["B"] - xs["A"])
        RA = -F - RB
        by = {s.id: s for s in case.supports}
        assert by["A"].Fy_N == pytest.approx(RA, rel=1e-6)
        assert by["B"].Fy_N == pytest.approx(RB, rel=1e-6)
        res[name] = (by["A"].Fr_N, by["B"].Fr_N, xs)
    # back-to-back spreads the centres, face-to-face closes them in: with the load nearer A,
    # the closer centres of X give A the larger share and B the smaller
    assert res["O"][2]["B"] - res["O"][2]["A"] > 200.0 > res["X"][2]["B"] - res["X"][2]["A"]
    assert res["X"][0] > res["O"][0] * 1.02
    assert res["X"][1] < res["O"][1] * 0.98


def test_a_chosen_designation_is_rated_and_a_wrong_one_is_an_error_at_its_key():
    base = engine.solve(COUNTERSHAFT)
    A = base.bearings[0]
    assert A.chosen_by == "ranking" and A.designation == A.candidates[0].designation
    pick = A.candidates[2]                                      # not the first ranked
    d = copy.deepcopy(COUNTERSHAFT)
    d["supports"][0]["designation"] = pick.designation
    r = engine.solve(d)
    bA = r.bearings[0]
    assert bA.designation == pick.designation and bA.chosen_by == "designer"
    assert [c.designation for c in bA.candidates][0] != pick.designation   # still listed and ranked
    chosen = next(c for c in bA.candidates if c.designation == pick.designation)
    row = _row(pick.designation)
    assert chosen.C_N == bundled_catalogue().C_N[row]           # its C, from the table
    life = next(c for c in r.checks if c.code == "bearing.life" and c.where == "A")
    assert pick.designation in life.message
    assert life.value == pytest.approx(chosen.Lnm_h)
    # its L10 from its own C: L10 ∝ C^3 for a ball bearing at the same loads
    first = bA.candidates[0]
    if abs(chosen.P_N - first.P_N) < 1e-9 * first.P_N:
        assert chosen.L10_h / first.L10_h == pytest.approx((chosen.C_N / first.C_N) ** 3, rel=1e-9)

    for bad, word in (("DG-99-40", "not in"), ("DG-02-45", "bore"), ("CR-02-40", "not deep groove")):
        d["supports"][0]["designation"] = bad
        with pytest.raises(DesignError) as exc:
            engine.solve(d)
        assert exc.value.errors[0].path == "supports[0].designation"
        assert word.split()[-1] in exc.value.errors[0].message


def test_minimum_load_warning_for_a_roller_bearing_at_0016_C():
    cat = bundled_catalogue()
    C = float(cat.C_N[_row("CR-02-40")])
    F = 2 * 0.016 * C                                           # each support carries F/2 = 0.016·C
    d = {"name": "light roller", "gravity": None,
         "shaft": {"material": {"name": "steel", "E_GPa": 205, "G_GPa": 80, "density_kg_m3": 7850,
                                "Su_MPa": 850, "Sy_MPa": 650},
                   "segments": [{"length_mm": 300, "d_mm": 40}]},
         "supports": [{"id": "A", "x_mm": 50, "bearing_type": "deep_groove_ball", "axial": "both"},
                      {"id": "B", "x_mm": 250, "bearing_type": "cylindrical_roller", "axial": "none",
                       "designation": "CR-02-40"}],
         "elements": [{"id": "F", "kind": "force", "x_mm": 150, "Fy_N": -F}],
         "load_cases": [{"name": "run", "speed_rpm": 1000}]}
    r = engine.solve(d)
    chk = [c for c in r.checks if c.code == "bearing.min_load" and c.where == "B"]
    assert len(chk) == 1 and chk[0].status == "warn"
    assert chk[0].value == pytest.approx(0.016, rel=1e-9) and chk[0].limit == 0.02   # common practice
    assert "skid" in chk[0].message
    cand = next(c for c in r.bearings[1].candidates if c.designation == "CR-02-40")
    assert any("below the minimum 0.02·C" in w for w in cand.warnings)
    okA = [c for c in r.checks if c.code == "bearing.min_load" and c.where == "A"]
    assert okA and okA[0].status == ("ok" if okA[0].value >= 0.01 else "warn")


def _beam_on_springs_first_omega(EI: float, rhoA: float, L: float, k: float) -> float:
    """Lowest root of the exact frequency equation of a uniform Euler–Bernoulli beam with zero
    moment and a radial spring k at each end (symmetric mode, w = A·cos βx + C·cosh βx about the
    middle, h = βL/2): EI·β³·(sin h + cos h·tanh h) = 2·k·cos h; ω = β²·√(EI/ρA)."""
    f = lambda b: EI * b**3 * (math.sin(b * L / 2) + math.cos(b * L / 2) * math.tanh(b * L / 2)) \
        - 2 * k * math.cos(b * L / 2)  # noqa: E731
    lo, hi = 1e-9, math.pi / L            # f(0+) < 0, f(π/L) > 0: the root lies below the rigid one
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if f(mid) < 0 else (lo, mid)
    return (0.5 * (lo + hi)) ** 2 * math.sqrt(EI / rhoA)


def test_critical_speed_on_two_ball_bearings_equals_the_beam_on_two_springs():
    L, dia = 300.0, 40.0
    d = {"name": "uniform on springs", "gravity": None,
         "shaft": {"material": {"name": "steel", "E_GPa": 205, "G_GPa": 80, "density_kg_m3": 7850,
                                "Su_MPa": 850, "Sy_MPa": 650},
                   "segments": [{"length_mm": L, "d_mm": dia}]},
         "supports": [{"id": "A", "x_mm": 0, "bearing_type": "deep_groove_ball", "axial": "both",
                       "designation": "DG-02-40"},
                      {"id": "B", "x_mm": L, "bearing_type": "deep_groove_ball", "axial": "none",
                       "designation": "DG-02-40"}],
         "elements": [{"id": "F", "kind": "force", "x_mm": L / 2, "Fy_N": -3000}],
         "load_cases": [{"name": "run", "speed_rpm": 1500}],
         "analysis": {"elements": 200, "shear_deformation": False}}
    r = engine.solve(d)
    kA, kB = (b.modal_stiffness_N_per_mm for b in r.bearings)
    assert kA == pytest.approx(kB, rel=1e-6)
    # the reported stiffness is Palmgren's tangent stiffness at the carried load, 1500 N
    cat = bundled_catalogue()
    g = row_geometry(cat, _row("DG-02-40"), "deep_groove_ball")
    delta, n = radial_deflection_mm(g, "deep_groove_ball", 1500.0)
    assert kA == pytest.approx(1500.0 / (n * float(delta)), rel=1e-6)   # at the settled load
    E, I = 205e3, math.pi * dia**4 / 64
    rhoA = 7850e-12 * math.pi * dia**2 / 4                     # t/mm
    rpm = _beam_on_springs_first_omega(E * I, rhoA, L, kA) * 60 / (2 * math.pi)
    assert r.shaft.critical_speed_rpm == pytest.approx(rpm, rel=0.02)
    rigid = engine.solve({**d, "analysis": {**d["analysis"], "bearing_stiffness": False}})
    assert rigid.shaft.critical_speed_rpm == pytest.approx(math.pi**2 / L**2 * math.sqrt(E * I / rhoA) * 60 / (2 * math.pi),
                                                           rel=0.01)   # simply supported (Shigley)
    assert r.shaft.critical_speed_rpm < 0.97 * rigid.shaft.critical_speed_rpm
    assert r.shaft.max_deflection_mm > rigid.shaft.max_deflection_mm
    # the deflections use the secant stiffness: each support sinks by Fr/k
    sup = r.load_cases[0].supports
    assert sup[0].stiffness_N_per_mm == pytest.approx(n * kA, rel=1e-6)
    assert rigid.load_cases[0].supports[0].stiffness_N_per_mm is None


def test_typed_stiffness_wins_and_plain_supports_stay_rigid():
    d = copy.deepcopy(COUNTERSHAFT)
    d["supports"][0]["radial_stiffness_N_per_mm"] = 5e4
    d["supports"][1]["bearing_type"] = None
    r = engine.solve(d)
    assert r.load_cases[0].supports[0].stiffness_N_per_mm == 5e4
    assert r.load_cases[0].supports[1].stiffness_N_per_mm is None


def test_required_C_does_not_change_when_a_larger_row_joins_the_table():
    base = engine.solve(COUNTERSHAFT)
    text = BUNDLED_PATH.read_text(encoding="utf-8")
    d = copy.deepcopy(COUNTERSHAFT)
    # an invented row of the same bore, larger in every way: it ranks after the rated one
    d["bearing_table"] = {"name": "bundled plus one",
                          "csv": text + "DG-04-40,deep_groove_ball,04,40,110,27,,71000,45000,,6000,13,,,,\n"}
    r = engine.solve(d)
    for b0, b1 in zip(base.bearings, r.bearings):
        assert b1.designation == b0.designation
        assert b1.required_C_N == pytest.approx(b0.required_C_N, rel=1e-12)
    assert len(r.bearings[0].candidates) == len(base.bearings[0].candidates) + 1
    # each candidate's margin is against that one figure
    for c in r.bearings[0].candidates:
        assert c.C_margin_pct == pytest.approx((c.C_N / r.bearings[0].required_C_N - 1) * 100, rel=1e-9)
    # aISO = 1: with the rated row's duty-cycle load Pm, a_R·L10(C_req) = the required life
    A = base.bearings[0]
    rated = next(c for c in A.candidates if c.designation == A.designation)
    a1 = 0.64                                                   # ISO 281 a1 at 95 % (as recalled)
    L10 = rated.L10_h * (A.required_C_N / rated.C_N) ** 3
    assert a1 * L10 == pytest.approx(COUNTERSHAFT["requirements"]["life_h"], rel=0.01)
    assert A.required_C_aiso_N is not None and "typical aISO" in " ".join(A.notes)


def test_friction_torque_is_reported_per_case():
    r = engine.solve(COUNTERSHAFT)
    for b in r.bearings:
        assert len(b.friction_torque_Nm) == len(COUNTERSHAFT["load_cases"])
        for M, W, case in zip(b.friction_torque_Nm, b.power_loss_W, COUNTERSHAFT["load_cases"]):
            assert M > 0 and W == pytest.approx(M * case["speed_rpm"] * 2 * math.pi / 60, rel=1e-9)
        assert any("Palmgren" in n for n in b.notes)


def test_bevel_gear_is_held_to_mesh_displacement_limits_not_the_spur_slope():
    """Along the axis: the shaft's stretch N·l/(E·A) between the locating support and the gear
    (plain supports: no bearing deflection), N the bevel's axial force Wt·tan φ·sin γ
    (design-format.md); across: the deflection at the gear. Limits: common practice, 0.075 mm."""
    d = {"name": "bevel", "gravity": None,
         "shaft": {"material": {"name": "steel", "E_GPa": 205, "G_GPa": 80, "density_kg_m3": 7850,
                                "Su_MPa": 850, "Sy_MPa": 650},
                   "segments": [{"length_mm": 300, "d_mm": 40}]},
         "supports": [{"id": "A", "x_mm": 50, "bearing_type": None, "axial": "both"},
                      {"id": "B", "x_mm": 250, "bearing_type": None, "axial": "none"}],
         "elements": [{"id": "C", "kind": "coupling", "x_mm": 10, "torque_Nm": None},
                      {"id": "BV", "kind": "bevel_gear", "x_mm": 280, "pitch_d_mm": 100, "pressure_angle_deg": 20,
                       "pitch_cone_angle_deg": 30, "apex": "+x", "torque_Nm": 100}],
         "load_cases": [{"name": "run", "speed_rpm": 500}]}
    r = engine.solve(d)
    codes = {c.code for c in r.checks if c.where == "BV"}
    assert {"shaft.bevel_axial", "shaft.bevel_radial"} <= codes and "shaft.gear_slope" not in codes
    ax = next(c for c in r.checks if c.code == "shaft.bevel_axial")
    Fa = 100e3 / 50 * math.tan(math.radians(20)) * math.sin(math.radians(30))
    assert ax.value == pytest.approx(Fa * (280 - 50) / (205e3 * math.pi / 4 * 40**2), rel=1e-6)
    assert ax.limit == 0.075 and "common practice" in ax.source
    rad = next(c for c in r.checks if c.code == "shaft.bevel_radial")
    dg = r.diagrams
    i = max(k for k, x in enumerate(dg.x_mm) if abs(x - 280) < 1e-9)
    assert rad.value == pytest.approx(dg.load_cases["run"]["u_mm"][i], rel=1e-9)


def test_the_tables_a_mm_column_wins():
    text = BUNDLED_PATH.read_text(encoding="utf-8").splitlines()
    head = [i for i, ln in enumerate(text) if ln.startswith("designation,")][0]
    a_given = {"TR-02-45": "11.5"}  # an invented pressure-centre distance for one row
    rows = [ln + "," + a_given.get(ln.split(",")[0], "") for ln in text[head + 1:]]
    csv = "\n".join(text[:head] + [text[head] + ",a_mm"] + rows) + "\n"
    d = _tapered_pair("+x", "-x")
    for s in d["supports"]:
        s["designation"] = "TR-02-45"
    d["bearing_table"] = {"name": "with pressure centres", "csv": csv}
    r = engine.solve(d)
    A, B = r.load_cases[0].supports
    assert A.x_load_mm - A.x_mm == pytest.approx(-11.5) and B.x_load_mm - B.x_mm == pytest.approx(11.5)
