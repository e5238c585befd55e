"""Validation of the design document: every problem at once, each with its key path."""
import math

import pytest

from engine.model import DesignError, parse_design
from tests.conftest import load_sample


def problems(data) -> dict[str, str]:
    with pytest.raises(DesignError) as exc:
        parse_design(data)
    return {e.path: e.message for e in exc.value.errors}


def test_demo_designs_are_valid():
    for name in ("countershaft.json", "line_shaft.json", "bevel_pinion.json"):
        parse_design(load_sample(name))


def test_structural_problems_are_all_reported_with_paths(countershaft):
    d = countershaft
    d["shaft"]["segments"][1]["length_mm"] = -5
    d["shaft"]["segments"][2]["d_mm"] = 0
    d["supports"][0]["x_mm"] = float("nan")
    d["elements"][0]["kind"] = "flywheel"
    d["elements"][1]["colour"] = "red"
    got = problems(d)
    assert "greater than 0" in got["shaft.segments[1].length_mm"]
    assert "greater than 0" in got["shaft.segments[2].d_mm"]
    assert "finite" in got["supports[0].x_mm"]
    assert "unknown element kind 'flywheel'" in got["elements[0]"]
    assert "not a key" in got["elements[1].colour"]


def test_cross_field_problems_are_all_reported(countershaft):
    d = countershaft
    d["shaft"]["segments"][0]["bore_mm"] = 40  # d is 32
    d["supports"][1]["x_mm"] = 75  # same x as A
    d["elements"][1]["x_mm"] = 900  # off the 270 mm shaft
    d["elements"][1]["id"] = "P1"  # duplicate
    d["load_cases"][0]["time_fraction"] = 0.5
    got = problems(d)
    assert "smaller than the diameter" in got["shaft.segments[0].bore_mm"]
    assert "both at x = 75" in got["supports[1].x_mm"]
    assert "off the shaft" in got["elements[1].x_mm"]
    assert "used twice" in got["elements[1].id"]
    assert "sum to 0.75" in got["load_cases"]


def test_fewer_than_two_supports(countershaft):
    countershaft["supports"] = countershaft["supports"][:1]
    assert "at least two supports" in problems(countershaft)["supports"]


def test_torque_imbalance_is_named_in_newton_metres_once_at_the_torque_written(countershaft):
    """The demo's three cases scale the torques (torque_factor 1, 0.5, 1.6): one wrong torque
    is one mistake, reported once, at the torque the user wrote, not at the factors."""
    countershaft["elements"][0]["torque_Nm"] = 90.0  # G1 is −95
    got = problems(countershaft)
    assert list(got) == ["elements[0].torque_Nm"]
    msg = got["elements[0].torque_Nm"]
    assert "-5 N·m" in msg and "largest 95 N·m" in msg


def test_torques_that_balance_within_half_a_percent_pass(countershaft):
    countershaft["elements"][0]["torque_Nm"] = 95.4  # 0.42 % of 95
    parse_design(countershaft)


def test_more_than_one_null_torque(countershaft):
    countershaft["elements"][1]["torque_Nm"] = None
    msg = problems(countershaft)["elements[1].torque_Nm"]
    assert "P1" in msg and "G1" in msg


def test_two_locating_supports_is_over_constrained(countershaft):
    countershaft["supports"][1]["axial"] = "both"
    assert "over-constrained" in problems(countershaft)["supports[1].axial"]


def test_not_an_object():
    assert problems([1, 2]) == {"": "a design must be a JSON object"}


def test_helical_gear_needs_a_hand(countershaft):
    del countershaft["elements"][1]["hand"]
    assert "needs 'hand'" in problems(countershaft)["elements[1].hand"]


def test_pulley_needs_exactly_one_of_ratio_or_pull_factor(countershaft):
    countershaft["elements"][0]["pull_factor"] = 1.5
    assert "exactly one" in problems(countershaft)["elements[0].tension_ratio"]


def test_infinite_number_is_refused(countershaft):
    countershaft["load_cases"][0]["speed_rpm"] = math.inf
    assert "finite" in problems(countershaft)["load_cases[0].speed_rpm"]


def test_torque_balance_is_checked_in_a_case_whose_factors_differ():
    """design-format.md, 'torque_Nm': the element torques must sum to zero (within 0.5 %) in
    every load case. An off-axis force's torque scales with force_factor while the gear's
    scales with torque_factor, so a case with torque_factor 2 and force_factor 1 leaves
    −2·100 + 100 = −100 N·m unbalanced (derived): that case must be refused, by its path."""
    d = {"shaft": {"segments": [{"length_mm": 300, "d_mm": 40}]},
         "supports": [{"id": "A", "x_mm": 10, "axial": "both"}, {"id": "B", "x_mm": 290}],
         "elements": [{"id": "G", "kind": "gear", "x_mm": 100, "pitch_d_mm": 100, "torque_Nm": -100},
                      {"id": "F", "kind": "force", "x_mm": 200, "Fz_N": 1000, "arm_y_mm": 100}],
         "load_cases": [{"name": "rated", "time_fraction": 0.5, "speed_rpm": 1000},
                        {"name": "peak", "time_fraction": 0.5, "speed_rpm": 1000, "torque_factor": 2.0}]}
    got = problems(d)
    assert list(got) == ["load_cases[1].torque_factor"]
    assert "'peak'" in got["load_cases[1].torque_factor"] and "-100 N·m" in got["load_cases[1].torque_factor"]
