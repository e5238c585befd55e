"""A study's variant at the current value reproduces the plain solve, and a study (which
solves its variants together by engine.solve_many, in chunks) shows for every variant exactly
what engine.solve gives for that variant alone: the designs' bands are laid end to end and
factored at once, each block by the same arithmetic as alone, and the modes' iteration
converges block by block from the same start vectors.
"""
from __future__ import annotations

import math

import pytest

import engine
from engine.study import figures_of, run_study
from tests.conftest import load_sample


@pytest.fixture(scope="module")
def demo():
    return load_sample("countershaft.json")


@pytest.fixture(scope="module")
def plain(demo):
    return engine.solve(demo, diagrams=False)


def test_variant_at_current_value_is_the_plain_solve(demo, plain):
    res = run_study(demo, ["supports.B.x_mm=200,255,265"])
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
    ["supports.A.bearing_type=deep_groove_ball,cylindrical_roller,tapered_roller"],
])
def test_every_variant_equals_its_own_solve_in_any_chunking(demo, vary):
    from engine.study import _held, apply_values, parse_study

    d = engine.parse_design(demo)
    study = parse_study(d, vary)
    held = _held(engine.solve(demo, diagrams=False))
    data = d.model_dump(mode="json")
    one = run_study(demo, study)
    small = run_study(demo, study, chunk=2)  # other neighbours in every solve
    for k, vals in enumerate(study.combinations()):
        try:
            vd = engine.parse_design(apply_values(data, study, vals))
            ref = figures_of(vd, engine.solve(vd, diagrams=False), held=held, values=vals)
        except engine.DesignError as exc:
            assert one.variants[k].error and str(exc.errors[0].message) in one.variants[k].error
            continue
        assert one.variants[k] == ref
        assert small.variants[k] == ref


def test_a_study_can_be_stopped_and_reports_progress(demo):
    seen = []
    res = run_study(demo, ["supports.B.x_mm=242:268:10"], chunk=3,
                    progress=lambda done, total: seen.append((done, total)), stop=lambda: len(seen) >= 2)
    assert seen == [(3, 10), (6, 10)]
    assert res.stopped and res.solved == 6 and len(res.variants) == 10
    assert all(v.error is None for v in res.variants[:6])
    assert all(v.error and "stopped" in v.error for v in res.variants[6:])


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
        assert v == ref
