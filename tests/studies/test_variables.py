"""Study specs: variable paths and ranges, and the messages for bad ones (each names the
variable, or 'vary' when no variable can be named)."""
from __future__ import annotations

import pytest

from engine.model import DesignError, parse_design
from engine.study import MAX_VALUES, MAX_VARIANTS, apply_values, parse_study, parse_variable
from tests.conftest import load_sample


@pytest.fixture(scope="module")
def design():
    return parse_design(load_sample("countershaft.json"))


def _issue(exc: pytest.ExceptionInfo) -> tuple[str, str]:
    assert len(exc.value.errors) == 1
    e = exc.value.errors[0]
    return e.path, e.message


def test_paths_are_made_canonical(design):
    assert parse_variable("supports[1].x_mm", design).path == "supports.B.x_mm"
    v = parse_variable("supports.B.x_mm", design)
    assert (v.kind, v.unit, v.current, v.upper) == ("number", "mm", 255.0, 270.0)
    assert parse_variable("elements[1].x_mm", design).path == "elements.G1.x_mm"
    assert parse_variable("shaft.segments[3].d_mm", design).current == 52.0
    bt = parse_variable("supports.A.bearing_type", design)
    assert bt.kind == "choice" and bt.current == "deep_groove_ball" and "tapered_roller" in bt.choices
    arr = parse_variable("arrangement", design)
    assert arr.current == "ball_locating_left_roller_floating"


def test_range_and_list_values(design):
    s = parse_study(design, ["supports.B.x_mm=200:260:4"])
    assert s.values == ((200.0, 220.0, 240.0, 260.0),)
    s = parse_study(design, ["supports.B.x_mm=200, 230,255"])
    assert s.values == ((200.0, 230.0, 255.0),)
    s = parse_study(design, [{"path": "elements.G1.x_mm", "start": 100, "stop": 200, "count": 3},
                             {"path": "supports.A.bearing_type", "values": ["deep_groove_ball", "self_aligning_ball"]}])
    assert s.shape == (3, 2) and s.n_variants == 6
    assert s.combinations()[1] == (100.0, "self_aligning_ball")
    s = parse_study(design, ["arrangement=*"])
    assert len(s.values[0]) == 12


def test_apply_values_leaves_the_input_alone(design):
    data = design.model_dump(mode="json")
    s = parse_study(design, ["supports.B.x_mm=240:240:1", "shaft.segments[3].d_mm=60:60:1"])
    new = apply_values(data, s, (240.0, 60.0))
    assert new["supports"][1]["x_mm"] == 240.0 and new["shaft"]["segments"][3]["d_mm"] == 60.0
    assert data["supports"][1]["x_mm"] == 255.0 and data["shaft"]["segments"][3]["d_mm"] == 52.0
    arr = apply_values(data, parse_study(design, ["arrangement=tapered_face_to_face"]), ("tapered_face_to_face",))
    # face-to-face (X): the left bearing takes the push toward -x (engine/bearings/axial.py docstring)
    assert [(s["bearing_type"], s["axial"]) for s in arr["supports"]] == [("tapered_roller", "-x"), ("tapered_roller", "+x")]


@pytest.mark.parametrize("item, path, words", [
    ("supports.Q.x_mm=1:2:3", "supports.Q.x_mm", "no support has the id 'Q'"),
    ("supports.B.colour=1:2:3", "supports.B.colour", "cannot be varied"),
    ("elements.G1.hand=1:2:3", "elements.G1.hand", "not a number of element G1"),
    ("shaft.segments[9].d_mm=30:40:3", "shaft.segments[9].d_mm", "no shaft.segments[9]"),
    ("supports[5].x_mm=1:2:3", "supports[5].x_mm", "no support supports[5]"),
    ("load_cases[0].speed_rpm=1:2:3", "load_cases[0].speed_rpm", "not a variable a study can vary"),
    ("supports.B.x_mm=200:300:5", "supports.B.x_mm", "beyond the shaft's length (270 mm)"),
    ("supports.B.x_mm=-10:100:5", "supports.B.x_mm", "below the smallest allowed"),
    ("supports.B.x_mm=200:260", "supports.B.x_mm", "is not a range; write start:stop:count"),
    ("supports.B.x_mm=200:260:0", "supports.B.x_mm", "count of at least 1"),
    ("supports.B.x_mm=200:200:5", "supports.B.x_mm", "starts and stops at the same value"),
    (f"supports.B.x_mm=200:260:{MAX_VALUES + 1}", "supports.B.x_mm", f"at most {MAX_VALUES}"),
    ("supports.B.x_mm=abc", "supports.B.x_mm", "'abc' is not a number"),
    ("supports.B.x_mm=nan", "supports.B.x_mm", "not a finite number"),
    ("shaft.segments[3].d_mm=-5:60:3", "shaft.segments[3].d_mm", "must be positive"),
    ("supports.A.bearing_type=roller_skate", "supports.A.bearing_type", "'roller_skate' is not a value"),
    ("arrangement=sideways", "arrangement", "'sideways' is not a value"),
    ("supports.B.x_mm", "vary", "gives no values"),
    ("=1:2:3", "vary", "name the design variable"),
])
def test_bad_variable_or_range_names_it(design, item, path, words):
    with pytest.raises(DesignError) as exc:
        parse_study(design, [item])
    p, msg = _issue(exc)
    assert p == path and words in msg, (p, msg)


def test_number_of_variables_and_variants(design):
    with pytest.raises(DesignError) as exc:
        parse_study(design, [])
    assert _issue(exc)[0] == "vary"
    with pytest.raises(DesignError) as exc:
        parse_study(design, ["supports.A.x_mm=10:20:2", "supports.B.x_mm=200:210:2", "elements.G1.x_mm=100:110:2"])
    assert _issue(exc) == ("vary", "vary one or two design variables; 3 were given")
    with pytest.raises(DesignError) as exc:
        parse_study(design, ["supports.B.x_mm=200:210:2", "supports[1].x_mm=200:210:2"])
    assert _issue(exc) == ("supports.B.x_mm", "supports.B.x_mm is varied twice")
    with pytest.raises(DesignError) as exc:
        parse_study(design, ["supports.A.x_mm=10:80:150", "supports.B.x_mm=200:260:150"])
    assert _issue(exc) == ("vary", f"22500 variants; at most {MAX_VARIANTS} are solved in one study")
