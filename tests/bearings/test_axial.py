"""Axial resolution: locating/floating, cross-located, O/X pairs with induced forces, errors.

The tapered pair values are the derived check of shared/references.md (equilibrium with
S = 0.5·Fr/Y, common practice; Shigley 9th ed. Sec. 11-9 uses the same resolution, memory).
"""
from __future__ import annotations

import numpy as np
import pytest

from engine.bearings.axial import induced_ratio, pair_split, resolve_axial
from engine.bearings.equivalent import dynamic_factors, equivalent_dynamic_load
from engine.model import EngineError

from .conftest import make_design


def _sup(i, x, kind, axial, **kw):
    return {"id": i, "x_mm": x, "bearing_type": kind, "axial": axial, **kw}


def test_locating_takes_all_either_way():
    d = make_design([_sup("A", 20, "deep_groove_ball", "both"), _sup("B", 280, "cylindrical_roller", "none")],
                    cases=[{"name": "a", "speed_rpm": 100, "time_fraction": 0.5},
                           {"name": "b", "speed_rpm": 100, "time_fraction": 0.5}])
    s = resolve_axial(d, np.array([[1000.0, 2000.0], [1000.0, 2000.0]]), np.array([700.0, -300.0]))
    assert s.Fa_N.tolist() == [[700.0, 0.0], [300.0, 0.0]]
    assert s.Fx_N.sum(axis=1).tolist() == [-700.0, 300.0]   # reactions balance the external force
    assert s.roles == ("locating", "floating")


def test_cross_located_deep_groove():
    # Without induced forces the bearing the shaft pushes takes the whole force (equilibrium)
    d = make_design([_sup("A", 20, "deep_groove_ball", "-x"), _sup("B", 280, "deep_groove_ball", "+x")],
                    cases=[{"name": "a", "speed_rpm": 100, "time_fraction": 0.5},
                           {"name": "b", "speed_rpm": 100, "time_fraction": 0.5}])
    s = resolve_axial(d, np.array([[1000.0, 1000.0]] * 2), np.array([500.0, -800.0]))
    assert s.Fa_N.tolist() == [[0.0, 500.0], [800.0, 0.0]]
    assert np.allclose(s.Fx_N.sum(axis=1), [-500.0, 800.0])
    assert "cross-located" in s.arrangement


def _tapered_pair(left_axial, right_axial):
    return make_design([_sup("A", 20, "tapered_roller", left_axial), _sup("B", 280, "tapered_roller", right_axial)],
                       cases=[{"name": "toward B", "speed_rpm": 500, "time_fraction": 0.5},
                              {"name": "toward A", "speed_rpm": 500, "time_fraction": 0.5}])


def test_tapered_pair_external_force_each_direction():
    # references.md derived check: Fr_A 4 kN, Fr_B 2 kN, Y 1.6, e 0.375.
    # S_A = 0.5·4000/1.6 = 1250 N, S_B = 625 N. Face-to-face: A (left) takes -x, B (right) takes +x.
    d = _tapered_pair("-x", "+x")
    Fr = np.array([[4000.0, 2000.0], [4000.0, 2000.0]])
    s = resolve_axial(d, Fr, np.array([1000.0, -1000.0]), Y_induced=np.array([1.6, 1.6]))
    assert "face-to-face" in s.arrangement
    assert s.induced_N[0].tolist() == pytest.approx([1250.0, 625.0])
    # Ka = 1 kN toward B (+x): S_A + Ka = 2250 ≥ S_B -> Fa_A = 1250, Fa_B = 2250 N (references.md)
    assert s.Fa_N[0].tolist() == pytest.approx([1250.0, 2250.0])
    # Ka = 1 kN toward A (−x): S_B + 1000 = 1625 ≥ S_A -> Fa_B = S_B = 625, Fa_A = 1625 N (derived)
    assert s.Fa_N[1].tolist() == pytest.approx([1625.0, 625.0])
    assert np.allclose(s.Fx_N.sum(axis=1), [-1000.0, 1000.0])
    f = dynamic_factors("tapered_roller", e=0.375, Y1=0.0, Y2=1.6)
    P = equivalent_dynamic_load(Fr, s.Fa_N, **f)
    # references.md: P_A = 4.0 kN, P_B = 4.40 kN; reverse: P_A = 0.4·4000 + 1.6·1625 = 4200 N, P_B = Fr = 2000 N
    assert P[0].tolist() == pytest.approx([4000.0, 4400.0])
    assert P[1].tolist() == pytest.approx([4200.0, 2000.0])


def test_tapered_pair_back_to_back():
    # Back-to-back (O): left takes +x. Ka = 0: each bearing carries at least its own S (derived)
    d = _tapered_pair("+x", "-x")
    s = resolve_axial(d, np.array([[4000.0, 2000.0]] * 2), np.array([0.0, 3000.0]), Y_induced=1.6)
    assert "back-to-back" in s.arrangement
    # case 1: Fa_A = max(1250, 625 + 0) = 1250 (A is the +x bearing), Fa_B = 1250
    assert s.Fa_N[0].tolist() == pytest.approx([1250.0, 1250.0])
    # case 2: Ka = 3 kN toward +x: Fa_A = max(1250, 625 + 3000) = 3625, Fa_B = 625
    assert s.Fa_N[1].tolist() == pytest.approx([3625.0, 625.0])


def test_pair_split_function():
    # references.md: S_A 1250 (takes -x), S_B 625 (takes +x), Ka 1000 toward B
    assert [float(v) for v in pair_split(625.0, 1250.0, 1000.0)] == [2250.0, 1250.0]


def test_angular_contact_induced_ratio():
    # S ≈ e·Fr; 40°: 1.14·Fr (references.md, memory)
    assert float(induced_ratio("angular_contact_ball", contact_angle_deg=40)) == pytest.approx(1.14)
    assert induced_ratio("deep_groove_ball") == 0.0


def test_two_locating_is_an_error():
    from engine.model import Design
    d = Design.model_validate({"shaft": {"segments": [{"length_mm": 300, "d_mm": 40}]},
                               "supports": [_sup("A", 20, "deep_groove_ball", "both"),
                                            _sup("B", 280, "deep_groove_ball", "both")],
                               "load_cases": [{"name": "c", "speed_rpm": 100}]})
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.array([[1.0, 1.0]]), np.array([0.0]))
    assert ei.value.errors[0].path == "supports[1].axial"
    assert "over-constrained" in ei.value.errors[0].message and "'none'" in ei.value.errors[0].message


def test_locating_plus_single_direction_is_an_error():
    d = make_design([_sup("A", 20, "deep_groove_ball", "both"), _sup("B", 280, "deep_groove_ball", "+x")])
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.array([[1.0, 1.0]]), np.array([0.0]))
    assert ei.value.errors[0].path == "supports[1].axial"


def test_force_no_support_can_take():
    d = make_design([_sup("A", 20, "deep_groove_ball", "none"), _sup("B", 280, "deep_groove_ball", "none")])
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.array([[1.0, 1.0]]), np.array([250.0]))
    assert ei.value.errors[0].path == "supports"
    assert "'run'" in ei.value.errors[0].message and "'both'" in ei.value.errors[0].message


def test_one_direction_only_fails_on_reversal():
    d = make_design([_sup("A", 20, "deep_groove_ball", "+x"), _sup("B", 280, "deep_groove_ball", "none")],
                    cases=[{"name": "fwd", "speed_rpm": 100, "time_fraction": 0.5},
                           {"name": "rev", "speed_rpm": 100, "time_fraction": 0.5}])
    ok = resolve_axial(d, np.array([[1.0, 1.0]] * 2), np.array([100.0, 50.0]))
    assert ok.Fa_N[:, 0].tolist() == [100.0, 50.0] and ok.warnings
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.array([[1.0, 1.0]] * 2), np.array([100.0, -50.0]))
    assert "'rev'" in ei.value.errors[0].message and "-x" in ei.value.errors[0].message


def test_lone_tapered_needs_a_partner():
    d = make_design([_sup("A", 20, "tapered_roller", "+x"), _sup("B", 280, "cylindrical_roller", "none")])
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.array([[1000.0, 1000.0]]), np.array([100.0]))
    assert ei.value.errors[0].path == "supports[0].axial"


def test_two_supports_same_direction_is_an_error():
    d = make_design([_sup("A", 20, "deep_groove_ball", "+x"), _sup("B", 150, "deep_groove_ball", "+x"),
                     _sup("C", 280, "deep_groove_ball", "-x")])
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.ones((1, 3)), np.array([0.0]))
    assert ei.value.errors[0].path == "supports[1].axial"


def test_contact_angle_outside_table_is_an_engine_error():
    d = make_design([_sup("A", 20, "angular_contact_ball", "-x", contact_angle_deg=15),
                     _sup("B", 280, "angular_contact_ball", "+x", contact_angle_deg=15)])
    with pytest.raises(EngineError) as ei:
        resolve_axial(d, np.array([[1000.0, 1000.0]]), np.array([0.0]))
    assert ei.value.errors[0].path == "supports[0].contact_angle_deg"
