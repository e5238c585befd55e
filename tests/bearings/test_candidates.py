"""Screening and ranking of catalogue rows, and rate_bearings end to end (without the solver).

Hand values: ISO 281 L10 = (C/P)^p with P = Fr for a cylindrical roller bearing (references.md);
Palmgren–Miner over the duty cycle; a1 of ISO 281:2007 (memory).
"""
from __future__ import annotations

import time

import numpy as np
import pytest

from engine.bearings import bundled_catalogue, parse_catalogue, rate_bearings
from engine.bearings.axial import pair_split
from engine.bearings.catalogue import COLUMNS
from engine.bearings.candidates import screen_rows
from engine.bearings.equivalent import dynamic_factors, equivalent_dynamic_load
from engine.bearings.life import a1_iso, a_iso, weibull_factor
from engine.bearings.lubrication import rated_viscosity, viscosity_at

from .conftest import make_design

HEAD = ",".join(COLUMNS)
CR_TABLE = parse_catalogue(HEAD + "\n"
                           "T-CR-40,cylindrical_roller,02,40,80,18,,50000,60000,7000,10000,,,,,\n"
                           "T-CR-40W,cylindrical_roller,22,40,80,23,,65000,80000,9000,9000,,,,,\n",
                           name="test table")
THREE = [{"name": "rated", "speed_rpm": 1000, "time_fraction": 0.6},
         {"name": "peak", "speed_rpm": 500, "time_fraction": 0.3},
         {"name": "creep", "speed_rpm": 100, "time_fraction": 0.1}]


def _cr_design(**req):
    return make_design([{"id": "A", "x_mm": 20, "bearing_type": "cylindrical_roller", "axial": "both"},
                        {"id": "B", "x_mm": 280, "bearing_type": "cylindrical_roller", "axial": "none"}],
                       requirements={"life_h": 10000, **req})


def test_cylindrical_P_equals_Fr_life_by_hand():
    # P = Fr exactly (ISO 281, radial only). C = 50 kN, Fr = 5 kN, 1000 rpm, roller p = 10/3:
    # L10 = 10^(10/3) = 2154.43 Mrev; L10h = 2154.43e6/(60·1000) = 35 907 h (derived by hand)
    out = rate_bearings(_cr_design(), Fr_N=np.array([[5000.0, 5000.0]]), Fa_ext_N=np.array([400.0]),
                        catalogue=CR_TABLE)
    a = out.bearings[0]
    top = next(c for c in a.candidates if c.designation == "T-CR-40")
    assert top.P_N == pytest.approx(5000.0, rel=1e-12)
    assert top.L10_h == pytest.approx(10 ** (10 / 3) * 1e6 / 60000, rel=1e-12)
    assert top.L10_h == pytest.approx(35907, rel=1e-4)
    assert top.Lnm_h == pytest.approx(top.L10_h)          # a1 = 1 at 90 %, no aISO
    assert top.s0 == pytest.approx(60000 / 5000)
    # the locating cylindrical bearing was given 400 N axial: a warning, not a failure
    warn = [c for c in out.checks if c.code == "bearing.axial_on_radial"]
    assert [c.where for c in warn] == ["A"] and warn[0].status == "warn" and warn[0].value == 400.0


def test_three_case_duty_cycle_cylindrical():
    # Palmgren–Miner by hand: Fr 5, 8, 12 kN at 1000, 500, 100 rpm for 60/30/10 % of the time
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "cylindrical_roller", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "cylindrical_roller", "axial": "none"}],
                    cases=THREE, requirements={"life_h": 10000, "reliability_pct": 95})
    Fr = np.array([[5000.0, 1.0], [8000.0, 1.0], [12000.0, 1.0]])
    out = rate_bearings(d, Fr_N=Fr, Fa_ext_N=np.zeros(3), catalogue=CR_TABLE)
    c = next(c for c in out.bearings[0].candidates if c.designation == "T-CR-40")
    p = 10 / 3
    L = [1e6 * (50000 / F) ** p / (60 * n) for F, n in ((5000, 1000), (8000, 500), (12000, 100))]
    L10 = 1 / (0.6 / L[0] + 0.3 / L[1] + 0.1 / L[2])
    assert c.L10_h == pytest.approx(L10, rel=1e-12)
    # revolution-weighted mean load (ISO 281 cl. 7.3.4 / Palmgren–Miner)
    Pm = ((600 * 5000 ** p + 150 * 8000 ** p + 10 * 12000 ** p) / 760) ** (1 / p)
    assert c.P_N == pytest.approx(Pm, rel=1e-12)
    # a1(95 %) = 0.64 (ISO 281:2007 Table 12, memory; formula value 0.638)
    assert c.Lnm_h == pytest.approx(float(a1_iso(95)) * L10, rel=1e-12)
    assert "a1" in out.bearings[0].life_method


def test_application_factor_multiplies_the_loads():
    out1 = rate_bearings(_cr_design(), Fr_N=np.array([[5000.0, 5000.0]]), Fa_ext_N=np.zeros(1), catalogue=CR_TABLE)
    out2 = rate_bearings(_cr_design(application_factor=1.5), Fr_N=np.array([[5000.0, 5000.0]]),
                         Fa_ext_N=np.zeros(1), catalogue=CR_TABLE)
    pick = lambda out: next(c for c in out.bearings[0].candidates if c.designation == "T-CR-40")  # noqa: E731
    c1, c2 = pick(out1), pick(out2)
    assert c2.P_N == pytest.approx(1.5 * c1.P_N)
    assert c2.L10_h == pytest.approx(c1.L10_h / 1.5 ** (10 / 3))
    assert c2.s0 == pytest.approx(c1.s0 / 1.5)


def test_weibull_method_is_labelled_and_used():
    out = rate_bearings(_cr_design(reliability_pct=99, reliability_method="weibull"),
                        Fr_N=np.array([[5000.0, 5000.0]]), Fa_ext_N=np.zeros(1), catalogue=CR_TABLE)
    b = out.bearings[0]
    c = b.candidates[0]
    # textbook Weibull factor at 99 % (Shigley 9th ed., memory): 0.2196
    assert c.Lnm_h == pytest.approx(float(weibull_factor(99)) * c.L10_h, rel=1e-12)
    assert "Weibull" in b.life_method and "a1" in b.notes[0]   # the other method is offered beside
    alt = c.Lnm_h * float(a1_iso(99)) / float(weibull_factor(99))
    assert f"{alt:,.0f}".replace(",", " ") in b.notes[0]


def test_aiso_used_when_lubricant_and_contamination_given():
    req = {"lubricant": {"iso_vg": 68, "operating_temp_C": 70}, "contamination_ec": 0.5}
    out = rate_bearings(_cr_design(**req), Fr_N=np.array([[5000.0, 5000.0]]), Fa_ext_N=np.zeros(1),
                        catalogue=CR_TABLE)
    c = next(c for c in out.bearings[0].candidates if c.designation == "T-CR-40")
    nu = viscosity_at(70.0, iso_vg=68)
    kappa = nu / float(rated_viscosity(1000.0, 60.0))    # dm = (40 + 80)/2
    aiso = float(a_iso(kappa=kappa, ec_Cu_P=0.5 * 7000 / 5000, roller=True))
    assert c.Lnm_h == pytest.approx(aiso * c.L10_h, rel=1e-12)
    assert any(ch.code == "bearing.lubrication" for ch in out.checks)
    assert "aISO" in out.bearings[0].life_method


def test_only_one_of_lubricant_or_ec_warns():
    out = rate_bearings(_cr_design(contamination_ec=0.5), Fr_N=np.array([[5000.0, 5000.0]]),
                        Fa_ext_N=np.zeros(1), catalogue=CR_TABLE)
    assert any("lubricant" in w for w in out.warnings)


def _scalar_deep_groove(cat, r, Fr, Fa, n, t, life_a1=1.0):
    """Row-by-row reference, scalar calls only (independent of the array screening)."""
    P = []
    for j in range(len(n)):
        f = dynamic_factors("deep_groove_ball", Fa_N=Fa[j], C0_N=cat.C0_N[r], f0=cat.f0[r])
        P.append(float(equivalent_dynamic_load(Fr[j], Fa[j], **{k: np.asarray(v).item() for k, v in f.items()})))
    L = [1e6 * (cat.C_N[r] / p) ** 3 / (60 * nj) for p, nj in zip(P, n)]
    return life_a1 / sum(tj / Lj for tj, Lj in zip(t, L))


def test_array_screen_equals_row_by_row():
    cat = bundled_catalogue()
    idx = cat.rows_of("deep_groove_ball")
    Fr = np.array([3000.0, 4000.0, 6000.0])
    Fa = np.array([500.0, 1500.0, 200.0])
    n = np.array([1500.0, 700.0, 300.0])
    t = np.array([0.5, 0.3, 0.2])
    sc = screen_rows(cat, idx, bearing_type="deep_groove_ball", Fr_N=Fr, Fa_N=Fa, speed_rpm=n,
                     time_fraction=t, life_h=20000, a_R=1.0, s0_min=1.0)
    for pos in range(0, idx.size, 7):
        assert sc.L10_h[pos] == pytest.approx(_scalar_deep_groove(cat, idx[pos], Fr, Fa, n, t), rel=1e-12)


@pytest.mark.parametrize("seed", range(12))
def test_ranking_puts_every_passing_before_every_failing(seed):
    rng = np.random.default_rng(seed)
    kinds = ["deep_groove_ball", "cylindrical_roller", "spherical_roller", "self_aligning_ball"]
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": kinds[seed % 4], "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": kinds[(seed + 1) % 4], "axial": "none"}],
                    cases=THREE, requirements={"life_h": float(rng.uniform(2000, 60000)),
                                               "s0_min": float(rng.uniform(0.5, 3.0))})
    Fr = rng.uniform(500, 15000, size=(3, 2))
    out = rate_bearings(d, Fr_N=Fr, Fa_ext_N=rng.uniform(-2000, 2000, size=3))
    for b in out.bearings:
        oks = [c.ok for c in b.candidates]
        assert oks == sorted(oks, reverse=True), oks           # all True before any False
        passing = [c for c in b.candidates if c.ok]
        keys = [(c.D_mm, c.B_mm, -c.Lnm_h) for c in passing]
        assert keys == sorted(keys)                            # D, then B, then longer life first
        for c in b.candidates:
            assert c.ok == (not c.reasons)


def test_smallest_bore_by_series_and_small_seat():
    # a 20 mm seat under a heavy load: nothing passes; the smallest passing bore per series is named
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "deep_groove_ball", "axial": "none"}],
                    d_mm=20.0, requirements={"life_h": 20000})
    out = rate_bearings(d, Fr_N=np.array([[6000.0, 6000.0]]), Fa_ext_N=np.array([0.0]))
    b = out.bearings[0]
    assert b.bore_mm == 20 and not any(c.ok for c in b.candidates)
    fails = [c for c in out.checks if c.code == "bearing.candidates" and c.where == "A"]
    assert fails and fails[0].status == "fail" and "smallest bore" in fails[0].message
    cat = bundled_catalogue()
    assert {m.series for m in b.smallest_by_series} == {"10", "02", "03"}
    assert any(m.d_mm is not None for m in b.smallest_by_series)
    for m in b.smallest_by_series:
        rows = cat.rows_of("deep_groove_ball")
        rows = rows[cat.series[rows] == m.series]
        sc = screen_rows(cat, rows, bearing_type="deep_groove_ball", Fr_N=[6000.0], Fa_N=[0.0],
                         speed_rpm=[1000.0], time_fraction=[1.0], life_h=20000, a_R=1.0, s0_min=1.0)
        ok_d = cat.d_mm[rows][sc.ok]
        if m.d_mm is None:      # no bore of this series is enough (series 10 here)
            assert ok_d.size == 0
        else:                   # the reported bore passes and no smaller one of the series does
            assert m.d_mm > 20 and ok_d.min() == m.d_mm


def test_seat_without_a_row():
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "needle_roller", "axial": "none"}],
                    d_mm=42.0)
    out = rate_bearings(d, Fr_N=np.array([[1000.0, 1000.0]]), Fa_ext_N=np.array([0.0]))
    seat = {c.where: c for c in out.checks if c.code == "bearing.seat"}
    assert seat["A"].status == "fail" and "42" in seat["A"].message and "40" in seat["A"].message
    assert seat["B"].status == "warn" and "needle" in seat["B"].message


def test_speed_above_limit_fails():
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "cylindrical_roller", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "cylindrical_roller", "axial": "none"}],
                    cases=[{"name": "fast", "speed_rpm": 9500, "time_fraction": 1.0}],
                    requirements={"life_h": 100})
    out = rate_bearings(d, Fr_N=np.array([[500.0, 500.0]]), Fa_ext_N=np.array([0.0]), catalogue=CR_TABLE)
    c = {c.designation: c for c in out.bearings[0].candidates}
    assert c["T-CR-40"].ok and not c["T-CR-40W"].ok and "limiting" in c["T-CR-40W"].reasons[0]
    assert out.bearings[0].candidates[0].designation == "T-CR-40"


def test_tapered_pair_through_rate_bearings():
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "tapered_roller", "axial": "-x"},
                     {"id": "B", "x_mm": 280, "bearing_type": "tapered_roller", "axial": "+x"}],
                    cases=[{"name": "c1", "speed_rpm": 500, "time_fraction": 0.5},
                           {"name": "c2", "speed_rpm": 500, "time_fraction": 0.5}])
    Fr = np.array([[4000.0, 2000.0], [4000.0, 2000.0]])
    Ka = np.array([1000.0, -1000.0])
    out = rate_bearings(d, Fr_N=Fr, Fa_ext_N=Ka)
    cat = bundled_catalogue()
    Y = {b.id: cat.Y2[list(cat.designation).index(b.candidates[0].designation)] for b in out.bearings}
    S_A, S_B = 0.5 * 4000 / Y["A"], 0.5 * 2000 / Y["B"]
    Fa_B, Fa_A = pair_split(S_B, S_A, Ka)                  # B takes +x (references.md resolution)
    assert out.split.Fa_N[:, 0] == pytest.approx(Fa_A) and out.split.Fa_N[:, 1] == pytest.approx(Fa_B)
    assert out.bearings[0].Fa_N == pytest.approx(list(Fa_A))
    assert np.allclose(out.split.Fx_N.sum(axis=1), -Ka)
    assert "face-to-face" in out.bearings[0].arrangement


def test_matched_pair_rating():
    # two identical rows as a unit: C × 2^(7/9) (roller), C0 × 2 (ISO 281 cl. 6.1, ISO 76; memory)
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "tapered_roller", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "cylindrical_roller", "axial": "none"}])
    out = rate_bearings(d, Fr_N=np.array([[3000.0, 3000.0]]), Fa_ext_N=np.array([500.0]))
    cat = bundled_catalogue()
    c = out.bearings[0].candidates[0]
    r = list(cat.designation).index(c.designation.replace(" (matched pair)", ""))
    assert c.C_N == pytest.approx(cat.C_N[r] * 2 ** (7 / 9)) and c.C0_N == pytest.approx(2 * cat.C0_N[r])


def test_plain_supports_are_not_rated_and_checks_are_complete():
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                     {"id": "M", "x_mm": 150, "bearing_type": None, "axial": "none"},
                     {"id": "B", "x_mm": 280, "bearing_type": "deep_groove_ball", "axial": "none"}])
    out = rate_bearings(d, Fr_N=np.array([[2000.0, 500.0, 2000.0]]), Fa_ext_N=np.array([300.0]))
    assert [b.id for b in out.bearings] == ["A", "B"]
    codes = {(c.code, c.where) for c in out.checks}
    for sid in ("A", "B"):
        assert {("bearing.life", sid), ("bearing.static", sid), ("bearing.speed", sid)} <= codes
    for c in out.checks:
        assert c.source and c.where and c.message
        if c.code in ("bearing.life", "bearing.static", "bearing.speed"):
            assert c.value is not None and c.limit is not None
    assert any("illustrative" in n for n in out.bearings[0].notes)


def test_rate_bearings_is_fast():
    # brief: about 1 ms for 2–3 supports and 3 cases; the bound here leaves room for a loaded CI machine
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "tapered_roller", "axial": "-x"},
                     {"id": "B", "x_mm": 150, "bearing_type": None, "axial": "none"},
                     {"id": "C", "x_mm": 280, "bearing_type": "tapered_roller", "axial": "+x"}],
                    cases=THREE, requirements={"lubricant": {"iso_vg": 68, "operating_temp_C": 60},
                                               "contamination_ec": 0.5})
    Fr = np.array([[4000.0, 1000.0, 2000.0], [5000.0, 1000.0, 3000.0], [7000.0, 1000.0, 4000.0]])
    Ka = np.array([1000.0, -800.0, 1500.0])
    rate_bearings(d, Fr_N=Fr, Fa_ext_N=Ka)
    times = []
    for _ in range(50):
        t0 = time.perf_counter()
        rate_bearings(d, Fr_N=Fr, Fa_ext_N=Ka)
        times.append(time.perf_counter() - t0)
    assert float(np.median(times)) < 0.01


def test_unloaded_bearing_gives_finite_json():
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "spherical_roller", "axial": "none"}])
    out = rate_bearings(d, Fr_N=np.zeros((1, 2)), Fa_ext_N=np.zeros(1))
    import json
    for b in out.bearings:
        text = b.model_dump_json()
        assert "Infinity" not in text and "NaN" not in text
        assert b.candidates and all(c.ok for c in b.candidates)
    for c in out.checks:
        assert "Infinity" not in c.model_dump_json()
    json.loads(out.bearings[0].model_dump_json())


def test_capped_life_and_static_safety_are_said_to_be_capped():
    """An unloaded bearing has L10 = (C/P)^p = ∞ (ISO 281 cl. 7.1 with P = 0) and s0 = C0/P0 = ∞
    (ISO 76): the result carries the cap LIFE_CAP_H as a finite number for JSON, but the
    messages must not present it as a computed life or safety (a 13-digit number of hours);
    they say the figure is a cap because the bearing carries no load (common practice)."""
    from engine.bearings.candidates import LIFE_CAP_H
    d = make_design([{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                     {"id": "B", "x_mm": 280, "bearing_type": "deep_groove_ball", "axial": "none"}])
    out = rate_bearings(d, Fr_N=np.array([[0.0, 2000.0]]), Fa_ext_N=np.zeros(1))
    life = {c.where: c for c in out.checks if c.code == "bearing.life"}
    static = {c.where: c for c in out.checks if c.code == "bearing.static"}
    assert life["A"].value == LIFE_CAP_H
    assert "1 000 000 000 000" not in life["A"].message and "no load" in life["A"].message
    assert "1e+12" not in static["A"].message and "no load" in static["A"].message
    # a loaded bearing keeps its computed figures
    assert "no load" not in life["B"].message and "no load" not in static["B"].message
