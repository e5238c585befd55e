"""Bearing life against support spacing for a simple shaft, against the closed form.

Symbols: a uniform shaft, weight left out, one radial force F at x = a; support A at x = 0,
support B at x = s (the studied variable). Statics (lever rule): R_B = F·a/s,
R_A = F·(s − a)/s. No axial force, so P = Fr for both bearing types (ISO 281:2007 cl. 6.2:
X = 1, Y = 0 when Fa = 0). Basic rating life ISO 281:2007 cl. 7.1: L10 = (C/P)^p 10⁶ rev,
p = 3 (ball), 10/3 (roller); in hours L10_h = L10·10⁶/(60·n). At 90 % reliability a1 = 1
(ISO 281:2007 Table 12) and, without lubricant data, the modified life is a1·L10 = L10.
Tolerance 1e-9 relative: the finite-element reactions of a statically determinate beam with
the load at a node are exact; only rounding remains.
"""
from __future__ import annotations

import math

import pytest

import engine
from engine.study import run_study

F_N, A_MM, N_RPM = 5000.0, 150.0, 1000.0


def simple(b_type: str) -> dict:
    return {
        "name": "closed-form check (invented)",
        "shaft": {"segments": [{"length_mm": 600, "d_mm": 40}]},
        "supports": [{"id": "A", "x_mm": 0, "bearing_type": "deep_groove_ball", "axial": "both"},
                     {"id": "B", "x_mm": 400, "bearing_type": b_type, "axial": "none"}],
        "elements": [{"id": "F1", "kind": "force", "x_mm": A_MM, "Fy_N": -F_N}],
        "load_cases": [{"name": "c", "speed_rpm": N_RPM}],
        "requirements": {"life_h": 1000, "reliability_pct": 90, "application_factor": 1.0},
        "gravity": None,
    }


@pytest.mark.parametrize("b_type, p", [("deep_groove_ball", 3.0), ("cylindrical_roller", 10.0 / 3.0)])
def test_life_against_spacing_follows_the_lever_rule_and_the_life_equation(b_type, p):
    design = simple(b_type)
    base = engine.solve(design, diagrams=False)
    assert len(base.bearings) == 2, "the bearing layer rates both supports"
    C = {b.id: b.candidates[0].C_N for b in base.bearings}
    res = run_study(design, ["supports.B.x_mm=250:600:15"])
    assert len(res.variants) == 15
    for v in res.variants:
        s = v.values[0]
        by = {b.id: b for b in v.bearings}
        assert v.error is None and not by["A"].reselected and not by["B"].reselected
        R_B, R_A = F_N * A_MM / s, F_N * (s - A_MM) / s
        hours = 1e6 / (60.0 * N_RPM)
        assert by["B"].life_h == pytest.approx((C["B"] / R_B) ** p * hours, rel=1e-9)
        assert by["A"].life_h == pytest.approx((C["A"] / R_A) ** 3.0 * hours, rel=1e-9)
    # independent of the rating: life_B(s2)/life_B(s1) = (s2/s1)^p
    first, last = res.variants[0], res.variants[-1]
    lb = lambda v: next(b.life_h for b in v.bearings if b.id == "B")  # noqa: E731
    assert lb(last) / lb(first) == pytest.approx((last.values[0] / first.values[0]) ** p, rel=1e-9)


def test_the_held_bearing_is_followed_while_it_fits():
    """A diameter change at B's seat to a bore the table lacks: B is re-selected (or unrated)
    and says so; A keeps its bearing."""
    design = simple("deep_groove_ball")
    design["shaft"]["segments"] = [{"length_mm": 300, "d_mm": 40}, {"length_mm": 300, "d_mm": 40}]
    design["supports"][1]["x_mm"] = 450
    res = run_study(design, ["shaft.segments[1].d_mm=40,45"])
    a40, a45 = ({b.id: b for b in v.bearings} for v in res.variants)
    assert a40["B"].designation == a45["A"].designation or a40["A"].designation == a45["A"].designation
    assert not a40["B"].reselected
    assert a45["B"].reselected or a45["B"].designation == ""
    assert math.isfinite(a45["A"].life_h)
