"""app.merge.merge3: three-way merge of design documents, key by key (issue 16, item 7).

Expected values are worked by hand from the rule in the module docstring (no outside source:
the rule is this project's own)."""
from __future__ import annotations

import copy

from app.merge import MISSING, merge3

BASE = {
    "name": "shaft",
    "shaft": {"segments": [{"length_mm": 100, "d_mm": 30}, {"length_mm": 200, "d_mm": 40}]},
    "supports": [{"id": "A", "x_mm": 160, "axial": "both"}, {"id": "B", "x_mm": 280, "axial": "none"}],
    "elements": [{"id": "G1", "kind": "gear", "x_mm": 90}],
    "load_cases": [{"name": "normal", "speed_rpm": 1000, "time_fraction": 1}],
}


def _edit(**changes):
    doc = copy.deepcopy(BASE)
    for path, value in changes.items():
        node = doc
        keys = path.split("__")
        for k in keys[:-1]:
            node = node[int(k)] if k.isdigit() else node[k]
        last = keys[-1]
        node[int(last) if last.isdigit() else last] = value
    return doc


def test_different_keys_merge_and_say_whose():
    theirs = _edit(supports__0__x_mm=170)          # support A moved 160 -> 170
    mine = _edit(supports__1__x_mm=290, name="mine")
    m = merge3(BASE, theirs, mine)
    assert m.clean
    assert m.document["supports"] == [{"id": "A", "x_mm": 170, "axial": "both"},
                                      {"id": "B", "x_mm": 290, "axial": "none"}]
    assert m.document["name"] == "mine"
    assert m.provenance == {"supports[A].x_mm": "theirs", "supports[B].x_mm": "mine", "name": "mine"}


def test_same_key_is_a_clash_and_theirs_stays_until_chosen():
    theirs, mine = _edit(supports__0__x_mm=170), _edit(supports__0__x_mm=150)
    m = merge3(BASE, theirs, mine)
    assert [(c.path, c.base, c.theirs, c.mine) for c in m.clashes] == [("supports[A].x_mm", 160, 170, 150)]
    assert m.document["supports"][0]["x_mm"] == 170  # never a stale value without a choice
    assert merge3(BASE, theirs, mine, resolutions={"supports[A].x_mm": "mine"}).document["supports"][0]["x_mm"] == 150
    assert merge3(BASE, theirs, mine, resolutions={"supports[A].x_mm": "theirs"}).clean


def test_rows_are_matched_by_id_not_position():
    theirs = copy.deepcopy(BASE)
    theirs["supports"].insert(0, {"id": "C", "x_mm": 10, "axial": "none"})  # a row added in front
    mine = _edit(supports__1__axial="both")                               # B changed, by position 1
    m = merge3(BASE, theirs, mine)
    assert m.clean
    assert [s["id"] for s in m.document["supports"]] == ["C", "A", "B"]
    assert m.document["supports"][2]["axial"] == "both"


def test_rows_added_on_both_sides_are_both_kept_and_removals_apply():
    theirs = copy.deepcopy(BASE)
    theirs["elements"].append({"id": "F1", "kind": "force", "x_mm": 50})
    mine = copy.deepcopy(BASE)
    mine["elements"].append({"id": "F2", "kind": "force", "x_mm": 60})
    del mine["load_cases"][0]["time_fraction"]
    m = merge3(BASE, theirs, mine)
    assert m.clean and [e["id"] for e in m.document["elements"]] == ["G1", "F1", "F2"]
    assert "time_fraction" not in m.document["load_cases"][0]


def test_a_row_removed_by_one_and_changed_by_the_other_is_a_clash_on_the_row():
    theirs = _edit(supports__1__x_mm=300)
    mine = copy.deepcopy(BASE)
    del mine["supports"][1]
    m = merge3(BASE, theirs, mine)
    assert [c.path for c in m.clashes] == ["supports[B]"] and m.clashes[0].mine is MISSING
    assert m.clashes[0].as_json()["removed_in_mine"] is True
    kept = merge3(BASE, theirs, mine, resolutions={"supports[B]": "mine"}).document
    assert [s["id"] for s in kept["supports"]] == ["A"]


def test_segments_merge_by_index_and_numbers_compare_by_value():
    theirs = _edit(shaft__segments__0__d_mm=32)
    mine = _edit(shaft__segments__1__d_mm=42.0, load_cases__0__speed_rpm=1000.0)  # 1000.0 == 1000
    m = merge3(BASE, theirs, mine)
    assert m.clean
    assert [s["d_mm"] for s in m.document["shaft"]["segments"]] == [32, 42.0]
    assert "load_cases[normal].speed_rpm" not in m.provenance
