"""The design search (engine/search.py) against a closed form and against the plain solve.

Known optimum (test_smallest_diameter_is_the_closed_form_minimum): a uniform shaft of one
step on two supports at x = 0 and x = L, a spur gear at mid-span (pitch diameter D_p, 20°
pressure angle) taking the torque T a coupling at x = 0 brings in. Gear forces: tangential
Ft = 2T/D_p, radial Fr = Ft·tan 20°, resultant F = Ft/cos 20° (Shigley 9th ed. §13-14, Eq.
13-35/13-36; from memory). Simply supported, load at mid-span: Ma = F·L/4 (statics); the
shaft rotates under a fixed load, so the bending is fully reversed (Ma alternating, Mm = 0)
and the torque steady (Tm = T, Ta = 0). DE-Goodman solved for d (Shigley's Mechanical
Engineering Design, 9th ed., Eq. 7-8; from memory):

    d = [ 16 n / π · ( 2 Kf Ma / Se + √3 Kfs Tm / Sut ) ]^(1/3)

with the Kf, Kfs and Se the engine reports at that section (Se carries the size factor kb of
the found diameter, which changes by far less than the step between neighbouring diameters).
The search's smallest passing diameter must be the first grid value at or above it.
"""
from __future__ import annotations

import math

import pytest

import engine
from engine.model import DesignError
from engine.search import parse_search, preferred_numbers, run_search

T_NM, PD_MM, L_MM, N_TARGET, SU = 400.0, 200.0, 400.0, 2.0, 850.0


def one_step(bearings: bool = False, d: float = 40.0) -> dict:
    """Span L between the supports; with bearings the shaft runs on 60 mm past each so that
    the coupling's hub and each bearing's seat fit on it."""
    bt = "deep_groove_ball" if bearings else None
    a = 60.0 if bearings else 0.0
    return {
        "name": "one step on two supports (invented)",
        "shaft": {"material": {"Su_MPa": SU, "Sy_MPa": 650},
                  "segments": [{"length_mm": L_MM + 2 * a, "d_mm": d}]},
        "supports": [{"id": "A", "x_mm": a, "bearing_type": bt, "axial": "both" if bearings else "none"},
                     {"id": "B", "x_mm": a + L_MM, "bearing_type": bt}],
        "elements": [{"id": "C", "kind": "coupling", "x_mm": 0, "torque_Nm": T_NM},
                     {"id": "G", "kind": "gear", "x_mm": a + L_MM / 2, "pitch_d_mm": PD_MM, "torque_Nm": -T_NM}],
        "load_cases": [{"name": "running", "speed_rpm": 300}],
        "requirements": {"fatigue_safety_min": N_TARGET, "yield_safety_min": 1.2, "life_h": 20000,
                         "gear_deflection_max_mm": 100, "gear_slope_max_rad": 1},
        "gravity": None,
    }


def closed_form_d(Kf: float, Kfs: float, Se: float) -> float:
    Ft = 2.0 * T_NM * 1e3 / PD_MM
    Ma = Ft / math.cos(math.radians(20.0)) * L_MM / 4.0  # N·mm
    Tm = T_NM * 1e3
    return (16.0 * N_TARGET / math.pi * (2.0 * Kf * Ma / Se + math.sqrt(3.0) * Kfs * Tm / SU)) ** (1.0 / 3.0)


@pytest.mark.parametrize("method, step", [("enumerate", 0.5), ("nsga2", 0.5), ("nsga2", None)])
def test_smallest_diameter_is_the_closed_form_minimum(method, step):
    """Rounded to a step: the first grid value at or above the closed form. Continuous: within
    0.1 mm above it (the tolerance the test grants the evolutionary search, common practice)."""
    bounds = "20:60" + (f":{step}" if step else "")
    res = run_search(one_step(), [f"shaft.segments[0].d_mm={bounds}"], ["mass_kg"], seed=4,
                     method=method, budget_s=None, generations=40 if step is None else 25, pop_size=20)
    assert len(res.front) == 1
    best = res.front[0]
    d = best.values["shaft.segments[0].d_mm"]
    sec = engine.solve(best.design, diagrams=False).shaft.sections[0]
    assert sec.x_mm == pytest.approx(L_MM / 2)
    d_cf = closed_form_d(sec.Kf, sec.Kfs, sec.Se_MPa)
    assert d_cf <= d + 1e-6 < d_cf + (step or 0.1), (d, d_cf)
    assert sec.n_fatigue >= N_TARGET
    if step is None:
        return
    # and the next smaller grid diameter fails: the search found the smallest
    below = one_step(d=d - step)
    r = engine.solve(below, diagrams=False)
    assert any(c.status == "fail" and c.code == "shaft.fatigue" for c in r.checks)


def test_lightest_bearings_are_the_first_passing_of_the_plain_ranking():
    res = run_search(one_step(bearings=True), ["shaft.segments[0].d_mm=20:60:5",
                                               "supports.A.dimension_series=*", "supports.B.dimension_series=*"],
                     ["mass_kg", "bearing_space_mm2"], seed=2, budget_s=None)
    assert res.front, res.current.failing
    for p in res.front:
        plain = {b.id: b for b in engine.solve(p.design, diagrams=False).bearings}
        for b in p.bearings:
            first_ok = next(c for c in plain[b["id"]].candidates if c.ok)
            assert b["designation"] == first_ok.designation
    lightest = min(res.front, key=lambda q: q.objectives["mass_kg"])
    # the unrestricted plain ranking at the same diameter: its first passing row per support has
    # D·B no smaller than the search's pick (the search may only pick a better series)
    free = dict(lightest.design)
    free["supports"] = [{k: v for k, v in s.items() if k != "dimension_series"} for s in free["supports"]]
    plain = {b.id: b for b in engine.solve(free, diagrams=False).bearings}
    for b in lightest.bearings:
        c = next(c for c in plain[b["id"]].candidates if c.ok)
        assert b["D_mm"] * b["B_mm"] <= c.D_mm * c.B_mm + 1e-9


def test_every_front_design_passes_every_check_alone():
    design = one_step(bearings=True)
    res = run_search(design, ["shaft.segments[0].d_mm=25:60:5", "elements.G.x_mm=180:340",
                              "supports.B.dimension_series=02,03"],
                     ["mass_kg", "fatigue_margin"], seed=7, budget_s=60, generations=12, pop_size=24)
    assert res.method == "nsga2" and len(res.front) >= 3
    for p in res.front:
        r = engine.solve(p.design)
        assert [c.code for c in r.checks if c.status == "fail"] == []
        assert r.shaft.mass_kg == pytest.approx(p.objectives["mass_kg"], rel=1e-12)
        assert p.objectives["fatigue_margin"] >= 1.0


def test_seeded_search_is_deterministic():
    args = (one_step(), ["shaft.segments[0].d_mm=25:60"], ["mass_kg", "fatigue_margin"])
    a = run_search(*args, seed=5, budget_s=None, generations=5, pop_size=12)
    b = run_search(*args, seed=5, budget_s=None, generations=5, pop_size=12)
    assert [p.values for p in a.front] == [p.values for p in b.front]


def test_stop_and_progress():
    seen = []
    res = run_search(one_step(), ["shaft.segments[0].d_mm=25:60"], ["mass_kg"], seed=1, budget_s=None,
                     generations=50, pop_size=8, progress=lambda e, g, t: seen.append(g),
                     stop=lambda: len(seen) >= 2)
    assert res.stopped and res.generations == 2 and seen == [1, 2]


def test_designer_limit_and_preferred_numbers():
    assert preferred_numbers("R20", 30, 60) == (31.5, 35.5, 40.0, 45.0, 50.0, 56.0)  # ISO 3 R20 (memory)
    res = run_search(one_step(), ["shaft.segments[0].d_mm=20:60:R20"], ["mass_kg"], limits=["mass_kg<=1"])
    assert res.front == [] and res.method == "enumerate"


@pytest.mark.parametrize("vary, objective, where", [
    (["shaft.segments[3].d_mm=20:40"], "mass_kg", "shaft.segments[3].d_mm"),
    (["shaft.segments[0].d_mm=40:20"], "mass_kg", "shaft.segments[0].d_mm"),
    (["shaft.segments[0].d_mm=20:40:x"], "mass_kg", "shaft.segments[0].d_mm"),
    (["shaft.segments[0].d_mm=-5:40"], "mass_kg", "shaft.segments[0].d_mm"),
    (["supports.A.dimension_series=07"], "mass_kg", "supports.A.dimension_series"),
    (["shaft.segments[0].d_mm=20:40"], "speed", "objective"),
    ([], "mass_kg", "vary"),
])
def test_bad_input_names_the_field(vary, objective, where):
    with pytest.raises(DesignError) as exc:
        parse_search(one_step(bearings=True), vary, [objective])
    assert exc.value.errors[0].path == where


def test_bores_step_takes_the_table_bores():
    from engine.bearings.catalogue import bundled_catalogue

    s = parse_search(one_step(bearings=True), ["shaft.segments[0].d_mm=28:52:bores"])
    bores = sorted({float(b) for b in bundled_catalogue().d_mm if 28 <= b <= 52})
    assert list(s.variables[0].values) == bores and len(bores) >= 3
    with pytest.raises(DesignError):
        parse_search(one_step(bearings=True), ["supports.A.x_mm=10:50:bores"])


def test_life_margin_without_bearings_does_not_apply():
    res = run_search(one_step(), ["shaft.segments[0].d_mm=30:40:5"], ["mass_kg", "life_margin"])
    assert res.front and all(p.objectives["life_margin"] is None for p in res.front)


def test_outer_diameter_objective_is_the_largest_chosen_bearing():
    res = run_search(one_step(bearings=True), ["supports.A.dimension_series=02,03", "supports.B.dimension_series=02,03"],
                     ["max_bearing_D_mm", "life_margin"])
    assert res.front
    for p in res.front:
        assert p.objectives["max_bearing_D_mm"] == max(b["D_mm"] for b in p.bearings)
