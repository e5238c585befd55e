"""Element forces against the sign conventions of design-format.md and textbook formulas.

Gear forces: Shigley, Mechanical Engineering Design, 9th ed., Eqs. 13-36 to 13-40
(Wt = T/r, Wr = Wt·tan φn / cos ψ, Wa = Wt·tan ψ; bevel: Wr = Wt tan φ cos γ,
Wa = Wt tan φ sin γ). Belt: T1 − T2 = T/r, T1/T2 = k (flat-belt theory, Shigley Ch. 17).
"""
import math

import numpy as np
import pytest

import engine
from engine.loads import case_loads
from engine.model import parse_design


def one(element, *, torque_other=None):
    """A two-bearing shaft carrying `element` and a coupling that balances its torque."""
    d = {"shaft": {"segments": [{"length_mm": 400, "d_mm": 40}]},
         "supports": [{"id": "A", "x_mm": 50, "axial": "both"}, {"id": "B", "x_mm": 350}],
         "elements": [dict(element, id="E", x_mm=200), {"id": "K", "kind": "coupling", "x_mm": 0, "torque_Nm": torque_other}],
         "load_cases": [{"name": "c", "speed_rpm": 1000}], "gravity": None}
    design = parse_design(d)
    cl = case_loads(design, design.load_cases[0])
    return cl.F_N[0], cl.C_Nmm[0] / 1000.0, cl


def test_spur_gear_at_plus_y():
    # mesh at +y, torque +100 N·m on the shaft: tangent t = +z, Ft = T/R = 100/0.05 = 2000 N
    F, C, _ = one({"kind": "gear", "pitch_d_mm": 100, "mesh_angle_deg": 0, "torque_Nm": 100})
    assert F == pytest.approx([0.0, -2000 * math.tan(math.radians(20)), 2000.0])
    assert C[0] == pytest.approx(100.0)


def test_helical_gear_axial_force_and_its_couple():
    # right hand, Ft > 0: axial −Ft tan ψ; it acts at the mesh point (R on +y), so the couple
    # about z is −R·Fa (p × F). Radial Ft tan φn / cos ψ toward the axis.
    T, R, psi, phi = 150.0, 0.075, math.radians(20), math.radians(20)
    F, C, _ = one({"kind": "gear", "pitch_d_mm": 150, "helix_angle_deg": 20, "hand": "right",
                   "mesh_angle_deg": 0, "torque_Nm": T})
    Ft = T / R
    assert F[0] == pytest.approx(-Ft * math.tan(psi))
    assert F[1] == pytest.approx(-Ft * math.tan(phi) / math.cos(psi))
    assert C[2] == pytest.approx(-R * F[0])
    F2, _, _ = one({"kind": "gear", "pitch_d_mm": 150, "helix_angle_deg": 20, "hand": "left",
                    "mesh_angle_deg": 0, "torque_Nm": T})
    assert F2[0] == pytest.approx(+Ft * math.tan(psi))


def test_gear_mesh_angle_rotates_the_force():
    # at 90° the mesh point is on +z: tangent −y, radial force toward −z
    F, _, _ = one({"kind": "gear", "pitch_d_mm": 100, "mesh_angle_deg": 90, "torque_Nm": 100})
    assert F == pytest.approx([0.0, -2000.0, -2000 * math.tan(math.radians(20))], abs=1e-9)


def test_bevel_gear_axial_points_away_from_apex():
    T, R, phi, gam = 80.0, 0.04, math.radians(20), math.radians(30)
    F, _, _ = one({"kind": "bevel_gear", "pitch_d_mm": 80, "pitch_cone_angle_deg": 30, "apex": "+x",
                   "mesh_angle_deg": 0, "torque_Nm": T})
    Wt = T / R
    assert F[0] == pytest.approx(-Wt * math.tan(phi) * math.sin(gam))
    assert F[1] == pytest.approx(-Wt * math.tan(phi) * math.cos(gam))


def test_pulley_tension_ratio_half_wrap():
    # 180° wrap: both strands along the line of centres; T1 − T2 = T/R, T1 = k·T2
    T, R, k = 60.0, 0.1, 3.0
    F, C, _ = one({"kind": "pulley", "pitch_d_mm": 200, "strand_angle_deg": 90, "tension_ratio": k, "torque_Nm": T})
    T2 = T / R / (k - 1)
    assert F == pytest.approx([0.0, 0.0, (k + 1) * T2], abs=1e-9)
    assert C[0] == pytest.approx(T)


def test_pulley_wrap_angle_resultant():
    # strands at ±β from the line of centres, β = (180° − θ)/2:
    # |F| = sqrt(T1² + T2² + 2·T1·T2·cos 2β)
    T, R, k, wrap = 60.0, 0.1, 3.0, 150.0
    F, _, _ = one({"kind": "pulley", "pitch_d_mm": 200, "strand_angle_deg": 0, "wrap_angle_deg": wrap,
                   "tension_ratio": k, "torque_Nm": T})
    T2 = T / R / (k - 1)
    T1 = k * T2
    b2 = math.radians(180 - wrap)
    assert np.linalg.norm(F) == pytest.approx(math.sqrt(T1**2 + T2**2 + 2 * T1 * T2 * math.cos(b2)))
    # positive torque: tight strand on the −v side (v = +z for a strand toward +y)
    assert F[2] < 0


def test_pulley_pull_factor():
    F, _, _ = one({"kind": "pulley", "pitch_d_mm": 200, "strand_angle_deg": 180, "pull_factor": 1.5, "torque_Nm": -40})
    assert F == pytest.approx([0.0, -1.5 * 40 / 0.1, 0.0], abs=1e-9)


def test_sprocket_slack_strand_carries_nothing():
    F, _, _ = one({"kind": "sprocket", "pitch_d_mm": 120, "strand_angle_deg": 0, "torque_Nm": 30})
    assert F == pytest.approx([0.0, 30 / 0.06, 0.0], abs=1e-9)


def test_null_torque_balances_per_case():
    d = parse_design({"shaft": {"segments": [{"length_mm": 400, "d_mm": 40}]},
                      "supports": [{"id": "A", "x_mm": 50, "axial": "both"}, {"id": "B", "x_mm": 350}],
                      "elements": [{"id": "G", "kind": "gear", "x_mm": 100, "pitch_d_mm": 100, "torque_Nm": -70},
                                   {"id": "K", "kind": "coupling", "x_mm": 0, "torque_Nm": None}],
                      "load_cases": [{"name": "a", "speed_rpm": 100, "time_fraction": 0.5, "torque_factor": 2},
                                     {"name": "b", "speed_rpm": 100, "time_fraction": 0.5, "torques_Nm": {"G": -10}}]})
    t = [case_loads(d, c).torque_Nm for c in d.load_cases]
    assert t[0] == pytest.approx([-140.0, 140.0]) and t[1] == pytest.approx([-10.0, 10.0])


def test_element_weight_and_gravity_direction():
    F, _, _ = one({"kind": "coupling", "torque_Nm": 0.0, "mass_kg": 10.0}, torque_other=0.0)
    assert F == pytest.approx([0.0, 0.0, 0.0])  # gravity is off in this helper
    d = {"shaft": {"segments": [{"length_mm": 400, "d_mm": 40}]},
         "supports": [{"id": "A", "x_mm": 0, "axial": "both"}, {"id": "B", "x_mm": 400}],
         "elements": [{"id": "M", "kind": "force", "x_mm": 200, "mass_kg": 10.0}],
         "load_cases": [{"name": "c", "speed_rpm": 100}], "gravity": {"direction": "-z", "g_m_s2": 9.81}}
    r = engine.solve(d)
    shaft_w = 7850e-9 * math.pi / 4 * 40**2 * 400 * 9.81
    assert sum(s.Fz_N for s in r.load_cases[0].supports) == pytest.approx(98.1 + shaft_w)
    assert r.shaft.mass_kg == pytest.approx(shaft_w / 9.81)


def test_torque_diagram_carries_the_power_between_elements(countershaft):
    r = engine.solve(countershaft)
    x = np.array(r.diagrams.x_mm)
    T = np.array(r.diagrams.load_cases["rated"]["T_Nm"])
    assert T[(x > 40) & (x < 160)] == pytest.approx(95.0)  # pulley (x=30) drives, gear (x=165) takes off
    assert T[x > 170] == pytest.approx(0.0, abs=1e-9) and T[x < 25] == pytest.approx(0.0, abs=1e-9)


def test_reactions_balance_every_applied_force(countershaft):
    r = engine.solve(countershaft)
    for c in r.load_cases:
        w = r.shaft.mass_kg * 9.80665
        for k, extra in (("Fx_N", 0.0), ("Fy_N", -w), ("Fz_N", 0.0)):
            applied = sum(getattr(e, k) for e in c.elements) + extra
            assert sum(getattr(s, k) for s in c.supports) == pytest.approx(-applied, abs=1e-6 * 1e4)


def test_axial_force_that_no_support_takes_is_an_error(countershaft):
    for s in countershaft["supports"]:
        s["axial"] = "none"
    with pytest.raises(engine.EngineError) as exc:
        engine.solve(countershaft)
    (issue,) = exc.value.errors
    assert issue.path == "supports" and "toward +x" in issue.message and "'both'" in issue.message
