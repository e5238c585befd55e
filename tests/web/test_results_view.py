"""app.results_view: families, margins, merged load cases, one-line sources, governing items.

Hand-made checks (tests/web/results_fixture.py, invented numbers): the expected governing
item of each topic is known by construction. Margins follow the engine's rule
(engine.checks.sort_checks: value/limit − 1 for at-least codes, 1 − value/limit otherwise).
"""
from __future__ import annotations

import pytest

import engine
from app import results_view as rv
from app.routers.pages import demo_design
from engine.result import Check
from tests.web.results_fixture import LONG_SOURCE, with_fixture


@pytest.fixture(scope="module")
def view():
    return rv.results_view(with_fixture(engine.solve(demo_design())))


@pytest.mark.parametrize("code, family", [
    ("bearing.life", "bearings"), ("bearing.static", "bearings"), ("bearing.lubrication", "bearings"),
    ("bearing.speed", "bearings"), ("shaft.fatigue", "strength"), ("shaft.yield", "strength"),
    ("shaft.bearing_slope", "stiffness"), ("shaft.gear_slope", "stiffness"), ("shaft.mesh_slope", "stiffness"),
    ("shaft.gear_deflection", "stiffness"), ("shaft.critical_speed", "dynamics"), ("assembly.clearance", "other"),
])
def test_family_of(code, family):
    assert rv.family_of(code) == family


def test_margin_at_least_and_at_most():
    life = Check(code="bearing.life", status="ok", message="", value=45000, limit=30000)
    slope = Check(code="shaft.bearing_slope", status="ok", message="", value=0.0007, limit=0.0008)
    bare = Check(code="bearing.seat", status="fail", message="")
    assert rv.margin(life) == pytest.approx(45000 / 30000 - 1)  # 0.5
    assert rv.margin(slope) == pytest.approx(1 - 0.0007 / 0.0008)  # 0.125
    assert rv.margin(bare) == 0.0


def test_merge_cases_only_identical_checks():
    def crit(case, v=960.0):
        return Check(code="shaft.critical_speed", status="ok", message="m", value=v, limit=9600.0, unit="rpm",
                     where="shaft", load_case=case)
    rows = rv.merge_cases([crit("peak"), crit("rated"), crit("light", 1200.0), crit("light")],
                          ["rated", "light", "peak"])
    assert [r.cases for r in rows] == [("rated", "light", "peak"), ("light",)]
    assert rows[1].check.value == 1200.0


def test_short_source_one_clause_full_text_kept():
    short = rv.short_source(LONG_SOURCE)
    assert short == "ISO 281:2007 cl. 7.1, L10 = (C/P)^p (as recalled; verify) …"
    assert len(short) <= rv.SOURCE_CHARS + 2
    assert rv.short_source("Shigley 9th ed. Eq. 7-7 (DE–Goodman)") == "Shigley 9th ed. Eq. 7-7 (DE–Goodman)"
    long_clause = "common practice: run at least the margin below the first lateral critical speed (memory: a note)"
    s = rv.short_source(long_clause)
    assert s.endswith(" …") and len(s) <= rv.SOURCE_CHARS + 2 and "(" not in s


def test_counts_verdict_and_merged(view):
    assert view.counts == {"fail": 1, "warn": 1, "ok": 11}
    assert view.verdict == "fail" and view.n_checks == 15 and view.n_merged == 2


def test_governing_items(view):
    g = {}
    for item in view.governing:
        g.setdefault(item.topic, []).append(item)
    assert [i.where for i in g["bearing.life"]] == ["A", "B"]
    assert g["bearing.life"][0].detail == "T-40-A" and g["bearing.life"][0].label.endswith("Lnm")
    assert g["bearing.life"][0].extra == ("L10", 3000.0, "time")
    assert g["bearing.life"][1].label.endswith("L10") and g["bearing.life"][1].extra is None
    assert g["shaft.fatigue"][0].row.check.value == 2.1
    assert g["shaft.fatigue"][0].where == "x = 30 mm"
    assert g["shaft.fatigue"][0].detail == "seat of P1 (end-milled keyway)"
    assert g["shaft.yield"][0].row.check.value == 5.0
    assert g["shaft.bearing_slope"][0].where == "B"
    assert g["shaft.critical_speed"][0].extra == ("first critical", 12000.0, "speed")
    assert g["shaft.critical_speed"][0].row.cases == ("rated", "light", "peak")
    statuses = [i.status for i in view.governing]
    assert statuses == sorted(statuses, key=rv.RANK.get)


def test_families_and_folds(view):
    assert [f.key for f in view.families] == ["bearings", "stiffness", "strength", "dynamics", "other"]
    bearings = view.families[0]
    assert [r.status for r in bearings.shown] == ["fail"] and len(bearings.folded) == 2
    stiffness = view.families[1]
    assert [r.status for r in stiffness.shown] == ["warn"]
    strength = view.families[2]
    assert len(strength.shown) == 1 and strength.shown[0].check.value == 2.1
    margins = [r.margin for r in strength.rows]
    assert margins == sorted(margins)


def test_governing_not_covered_failure_is_named():
    """A failing check outside the summary's topics (a bearing speed) is named at the top too."""
    res = engine.solve(demo_design())
    extra = Check(code="bearing.speed", status="fail", message="A: highest speed above the limiting speed",
                  value=9000.0, limit=7700.0, unit="rpm", where="A", source="bearing table")
    v = rv.results_view(res.model_copy(update={"checks": [*res.checks, extra]}))
    assert v.governing[0].topic == "bearing.speed" and v.governing[0].status == "fail"


def test_doctests():
    import doctest

    assert doctest.testmod(rv).failed == 0
