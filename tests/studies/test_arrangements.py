"""The arrangement comparison on the demo layout."""
from __future__ import annotations

import math

import pytest

from engine.model import DesignError
from engine.study import ARRANGEMENTS, arrangement_design, compare_arrangements
from tests.conftest import load_sample


@pytest.fixture(scope="module")
def cmp():
    return compare_arrangements(load_sample("countershaft.json"))


def test_every_arrangement_is_solved_and_ranked(cmp):
    assert cmp.supports == ("A", "B")
    assert sorted(o.key for o in cmp.options) == sorted(ARRANGEMENTS)
    assert [o.rank for o in cmp.options] == list(range(1, len(ARRANGEMENTS) + 1))
    assert [o.key for o in cmp.options if o.current] == ["ball_locating_left_roller_floating"]
    ok = [o.ok for o in cmp.options]
    assert ok == sorted(ok, reverse=True), "those meeting every requirement come first"
    vols = [o.volume_cm3 for o in cmp.options if o.ok]
    assert vols == sorted(vols), "then the smallest space"


def test_each_option_carries_candidates_lives_static_safety_slopes_and_space(cmp):
    solved = [o for o in cmp.options if o.error is None]
    assert len(solved) >= 10
    for o in solved:
        assert len(o.bearings) == 2
        for b in o.bearings:
            assert b.candidates and b.designation == b.candidates[0]["designation"]
            assert b.life_h > 0 and b.s0 > 0 and b.D_mm > b.candidates[0]["d_mm"] and b.B_mm > 0
            assert b.slope_rad is not None and b.slope_rad >= 0
        d = [b.candidates[0]["d_mm"] for b in o.bearings]
        expect = sum(math.pi / 4 * (b.D_mm ** 2 - di ** 2) * b.B_mm for b, di in zip(o.bearings, d)) / 1e3
        assert o.volume_cm3 == pytest.approx(expect, rel=1e-12)
        assert o.max_D_mm == max(b.D_mm for b in o.bearings)


def test_pairs_carry_axial_load_in_both_bearings(cmp):
    """An O or X pair of tapered bearings: each bearing's induced force loads the other, so both
    carry axial load (engine/bearings/axial.py; the demo's helical gear pushes the shaft)."""
    for key in ("tapered_back_to_back", "tapered_face_to_face"):
        o = next(o for o in cmp.options if o.key == key)
        assert o.error is None
        assert all(b.Fa_max_N > 0 for b in o.bearings)
    dg = next(o for o in cmp.options if o.key == "ball_locating_left_roller_floating")
    assert [b.Fa_max_N > 0 for b in dg.bearings] == [True, False]


def test_unknown_arrangement_named():
    data = load_sample("countershaft.json")
    with pytest.raises(DesignError) as exc:
        arrangement_design(data, "sideways")
    assert exc.value.errors[0].path == "arrangement"
    with pytest.raises(DesignError) as exc:
        compare_arrangements(data, keys=["sideways"])
    assert exc.value.errors[0].path == "arrangement"
