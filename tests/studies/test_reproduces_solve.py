"""A study's variant at the current value reproduces the plain solve, and the batched path
agrees with solving every variant by engine.solve.

The solve path calls engine.solve itself, so it agrees exactly (==). The batched path solves
the bending of every variant at once by block elimination instead of one dense LAPACK solve
each; its figures agree with the plain solve to 1e-9 relative (rounding of a different
elimination order; the element matrices, loads and everything after the bending solve are
the engine's own functions).
"""
from __future__ import annotations

import math

import pytest

import engine
from engine.study import _same, figures_of, run_study
from tests.conftest import load_sample


@pytest.fixture(scope="module")
def demo():
    return load_sample("countershaft.json")


@pytest.fixture(scope="module")
def plain(demo):
    return engine.solve(demo, diagrams=False)


def test_variant_at_current_value_is_the_plain_solve(demo, plain):
    res = run_study(demo, ["supports.B.x_mm=200,255,265"], method="solve")
    cur = res.variants[1]
    assert cur.values == (255.0,)
    d = engine.parse_design(demo)
    assert cur == figures_of(d, plain, values=(255.0,))
    assert cur == res.base
    # the figures are real: both bearings rated, the shaft checked, a critical speed found
    assert [b.id for b in cur.bearings] == ["A", "B"]
    for b, br in zip(cur.bearings, plain.bearings):
        assert b.designation == br.candidates[0].designation
        assert b.life_h == br.candidates[0].Lnm_h and math.isfinite(b.life_h) and b.life_h > 0
        assert b.s0 == br.candidates[0].s0
    assert cur.safety_factor is not None and cur.safety_factor == plain.shaft.min_safety_factor
    assert cur.critical_speed_rpm is not None and cur.critical_speed_rpm == plain.shaft.critical_speed_rpm
    assert cur.max_slope_rad is not None and cur.max_slope_rad > 0


@pytest.mark.parametrize("vary", [
    ["supports.B.x_mm=200:265:6"],
    ["elements.G1.x_mm=110:200:4"],
    ["shaft.segments[3].d_mm=48:60:3"],
    ["supports.A.x_mm=60:80:3", "supports.B.x_mm=240:260:3"],
])
def test_batched_path_agrees_with_solving_each_variant(demo, vary):
    fast = run_study(demo, vary, method="batched")
    slow = run_study(demo, vary, method="solve")
    assert fast.method == "batched" and slow.method == "solve"
    assert len(fast.variants) == len(slow.variants)
    for f, s in zip(fast.variants, slow.variants):
        assert f.values == s.values
        assert _same(f, s, rtol=1e-9), (f, s)


def test_auto_takes_the_batched_path_once_it_reproduces_the_plain_solve(demo):
    res = run_study(demo, ["supports.B.x_mm=200:265:4"])
    assert res.method == "batched"


def test_a_variant_the_engine_refuses_carries_its_message(demo):
    # B moved onto A's position: the model's own message, the study goes on
    res = run_study(demo, ["supports.B.x_mm=75,200"])
    bad, good = res.variants
    assert bad.error and "supports" in bad.error and "both at x = 75" in bad.error and bad.ok is False
    assert good.error is None and good.bearings


def test_every_variant_is_the_solve_of_the_design_it_would_give(demo):
    """What a study shows for a variant is what taking that variant into the design gives."""
    from engine.study import _held, apply_values, parse_study

    d = engine.parse_design(demo)
    study = parse_study(d, ["elements.G1.x_mm=120:190:3", "supports.B.x_mm=245,262"])
    res = run_study(demo, study)
    held = _held(engine.solve(demo, diagrams=False))
    data = d.model_dump(mode="json")
    for vals, v in zip(study.combinations(), res.variants):
        vd = engine.parse_design(apply_values(data, study, vals))
        assert vd.element("G1").x_mm == vals[0] and vd.support("B").x_mm == vals[1]
        ref = figures_of(vd, engine.solve(vd, diagrams=False), held=held, values=vals)
        assert _same(v, ref, rtol=1e-9), (v, ref)
