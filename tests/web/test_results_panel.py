"""The results panel renders bearings, candidates and checks (failing first).

The engine result here is hand-made (a fixture of the result format, not computed values), so
that the panel is tested whatever the engine returns today.
"""
from __future__ import annotations

import re

import engine
from app import web
from app.routers import pages
from engine.result import BearingResult, Candidate, Check


def _with_extras(res):
    bearings = [BearingResult(id="A", bearing_type="deep_groove_ball", bore_mm=40, equivalent_load_N=2100.0,
                              required_C_N=15400.0, arrangement="locating", life_method="basic rating life",
                              candidates=[
                                  Candidate(designation="T-40-A", d_mm=40, D_mm=80, B_mm=18, C_N=30000, C0_N=19000,
                                            L10_h=51000, Lnm_h=51000, s0=9.0, ok=True),
                                  Candidate(designation="T-40-B", d_mm=40, D_mm=68, B_mm=15, C_N=13000, C0_N=9000,
                                            L10_h=4100, Lnm_h=4100, s0=4.2, ok=False,
                                            reasons=["rating life 4100 h is below the required 30000 h"])])]
    checks = [Check(code="slope", status="ok", message="slope at bearing B", value=0.0004, limit=0.001, unit="rad",
                    source="common practice", where="B"),
              Check(code="life", status="fail", message="bearing life at A", value=4100, limit=30000, unit="h",
                    source="ISO 281:2007, 6.2", where="A"),
              Check(code="deflection", status="warn", message="deflection at gear G1", value=0.12, limit=0.13,
                    unit="mm", source="common practice", where="G1", load_case="rated")]
    return res.model_copy(update={"bearings": bearings, "checks": checks})


def test_panel_lists_checks_failing_first_with_value_limit_source(client, monkeypatch):
    real = pages._solve
    monkeypatch.setattr(pages, "_solve", lambda d: _with_extras(real(d)))
    form = web.design_to_form(pages.demo_design())
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 200
    body = r.text
    rows = re.findall(r'<tr class="st-(\w+)">', body)
    assert rows == ["fail", "warn", "ok"]
    assert "ISO 281:2007, 6.2" in body and "30000 h" in body.replace("\u202f", " ")
    assert "T-40-A" in body and "meets all" in body
    assert "rating life 4100 h is below the required 30000 h" in body
    assert "1 failing · 1 to watch · 1 passing" in body


def test_panel_in_us_units_converts_check_values(client, monkeypatch):
    real = pages._solve
    monkeypatch.setattr(pages, "_solve", lambda d: _with_extras(real(d)))
    form = web.design_to_form(pages.demo_design(), "us")
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 200
    # 0.13 mm limit shown in inches: 0.13 / 25.4 = 0.005118 in (4 significant figures)
    assert "0.005118 in" in r.text


def test_engine_error_keeps_page_and_names_path(client, monkeypatch):
    def boom(d):
        raise engine.EngineError.at("supports[0].axial", "no support takes the axial force")
    monkeypatch.setattr(pages, "_solve", boom)
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design()))
    assert r.status_code == 422
    assert "m-supports-0-axial" in r.text and 'id="drawing"' in r.text


def test_unexpected_engine_fault_is_a_message_not_a_crash(client, monkeypatch):
    def boom(d):
        raise ZeroDivisionError("float division by zero")
    monkeypatch.setattr(pages, "_solve", boom)
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design()))
    assert r.status_code == 422
    assert "could not solve" in r.text
