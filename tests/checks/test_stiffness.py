"""Bearing slope and gear deflection checks against closed forms and the limits table.

Simply supported shaft, span L, load P at a from the left (b = L − a) (Roark 8th ed. Table 8.1
case 1e; Shigley 9th ed. Table A-9-6): end slopes θA = P·a·b·(L + b)/(6EIL),
θB = P·a·b·(L + a)/(6EIL); deflection under the load P·a²·b²/(3EIL).
"""
from __future__ import annotations

import math

import pytest

from tests.checks.helpers import analysis_of
from engine import stiffness
from engine.checks import shaft_checks


def design(*, P=4000.0, a=100.0, L=300.0, d=40.0, bearings=("deep_groove_ball", "cylindrical_roller"), **gear):
    return {
        "shaft": {"material": {"E_GPa": 205, "G_GPa": 80, "density_kg_m3": 7850},
                  "segments": [{"length_mm": L, "d_mm": d}]},
        "supports": [{"id": "A", "x_mm": 0, "bearing_type": bearings[0], "axial": "both"},
                     {"id": "B", "x_mm": L, "bearing_type": bearings[1]}],
        "elements": [{"id": "F", "kind": "force", "x_mm": a, "Fy_N": -P},
                     {"id": "G", "kind": "gear", "x_mm": a, "pitch_d_mm": 100, "torque_Nm": 0, **gear}],
        "load_cases": [{"name": "run", "speed_rpm": 1000}],
        "gravity": None, "analysis": {"shear_deformation": False},
    }


def by(checks, code, where):
    return next(c for c in checks if c.code == code and c.where == where)


def test_bearing_slopes_match_the_closed_form():
    P, a, L, d, E = 4000.0, 100.0, 300.0, 40.0, 205e3
    b, I = L - a, math.pi * d**4 / 64
    out = shaft_checks(analysis_of(design()))
    thA = P * a * b * (L + b) / (6 * E * I * L)
    thB = P * a * b * (L + a) / (6 * E * I * L)
    cA, cB = by(out.checks, "shaft.bearing_slope", "A"), by(out.checks, "shaft.bearing_slope", "B")
    assert cA.value == pytest.approx(thA, rel=1e-6) and cB.value == pytest.approx(thB, rel=1e-6)
    assert cA.limit == 0.001 and cB.limit == 0.0008  # Shigley 9th ed. Table 7-2 (memory)
    assert "Table 7-2" in cA.source


def test_gear_deflection_matches_the_closed_form():
    P, a, L, d, E = 4000.0, 100.0, 300.0, 40.0, 205e3
    b, I = L - a, math.pi * d**4 / 64
    c = by(shaft_checks(analysis_of(design())).checks, "shaft.gear_deflection", "G")
    assert c.value == pytest.approx(P * a**2 * b**2 / (3 * E * I * L), rel=1e-6)
    assert c.limit == 0.13 and c.unit == "mm"


def test_status_bands_and_support_override():
    # a 0.0015 rad slope: deep groove ball tolerates it with care (0.001–0.003): warn;
    # cylindrical roller (0.0008–0.0012): fail
    th = 0.0015
    for btype, status in (("deep_groove_ball", "warn"), ("cylindrical_roller", "fail"),
                          ("spherical_roller", "ok")):
        lo, hi, _ = stiffness.SLOPE_LIMITS[btype]
        assert stiffness._status(th, lo, hi) == status
    P = 40000.0  # heavy load: large slopes
    out = shaft_checks(analysis_of(design(P=P)))
    assert by(out.checks, "shaft.bearing_slope", "B").status == "fail"
    d = design(P=P)
    d["supports"][1]["misalignment_limit_rad"] = 0.05
    c = by(shaft_checks(analysis_of(d)).checks, "shaft.bearing_slope", "B")
    assert c.status == "ok" and c.limit == 0.05 and "misalignment_limit_rad" in c.source


def test_plain_support_has_no_slope_check():
    out = shaft_checks(analysis_of(design(bearings=(None, "deep_groove_ball"))))
    assert [c.where for c in out.checks if c.code == "shaft.bearing_slope"] == ["B"]


def test_mesh_slope_adds_the_mates_slope():
    out = shaft_checks(analysis_of(design(mate_slope_rad=-0.0002)))
    own = by(out.checks, "shaft.gear_slope", "G").value
    mesh = by(out.checks, "shaft.mesh_slope", "G")
    assert mesh.value == pytest.approx(own + 0.0002)
    assert not any(c.code == "shaft.mesh_slope" for c in shaft_checks(analysis_of(design())).checks)


def test_every_type_has_a_sourced_limit():
    from engine.model import BEARING_TYPES
    for t in BEARING_TYPES:
        lo, hi, src = stiffness.SLOPE_LIMITS[t]
        assert 0 < lo <= hi and src
        assert "memory" in src or "common practice" in src
