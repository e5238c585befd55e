"""No request stalls the others (issue 16, item 5).

- a bearing table whose header has 60,000 columns is refused in under 1 s (the CSV reader is
  linear in its input and caps the columns), on the JSON API and on the editor's live route;
- ``/api/health`` answers in under 1 s while a heavy solve runs in a real ``serve`` process,
  and the heavy solve stops at its time budget with a message;
- the work limits refuse products of counts that are each within their own limit.
The timings are this project's own requirements (the issue's "Must show"), not a standard's.
"""
from __future__ import annotations

import copy
import json
import threading
import time
import urllib.error
import urllib.request

import pytest
from fastapi.testclient import TestClient

from app import web
from app.main import create_app
from app.routers import pages
from engine.bearings.catalogue import COLUMNS, parse_catalogue
from engine.model import DesignError
from tests.browser.conftest import start_server, stop_server

REQUIRED_HEADER = ",".join(COLUMNS)


def _wide_table() -> str:
    # the required columns, then 60,000 more: many of them the same name, as in the report
    header = REQUIRED_HEADER + "," + ",".join(f"x{i % 50}" for i in range(60_000))
    return header + "\nB-1,deep_groove_ball,02,25,52,15,,14000,7850,,,13.8,,,,\n"


def _design_with_table() -> dict:
    d = pages.demo_design()
    d["bearing_table"] = {"name": "wide", "csv": _wide_table()}
    return d


def test_wide_header_is_refused_by_the_reader_in_under_a_second():
    t0 = time.perf_counter()
    with pytest.raises(DesignError) as info:
        parse_catalogue(_wide_table())
    assert time.perf_counter() - t0 < 1.0
    assert "60,016 columns" in str(info.value) and "at most 100" in str(info.value)


def test_wide_header_is_refused_by_the_api_and_the_editor_in_under_a_second():
    client = TestClient(create_app())
    assert client.post("/api/solve", json=pages.demo_design()).status_code == 200  # warm, as at start
    design = _design_with_table()
    t0 = time.perf_counter()
    r = client.post("/api/solve", json=design)
    assert time.perf_counter() - t0 < 1.0
    assert r.status_code == 422 and "columns" in r.text
    form = web.design_to_form(design, "si")
    t0 = time.perf_counter()
    r = client.post("/editor/solve", data=form)
    assert time.perf_counter() - t0 < 1.0
    assert r.status_code == 422 and "60,016 columns" in r.text


def _heavy(elements: int = 7000, cases: int = 28) -> dict:
    """Within every limit (nodes x cases just under MAX_BEAM_WORK), and about 0.9 s of solving
    with the banded solver here (2,000 elements took 2.8 s with the dense one, 0.2 s now)."""
    d = pages.demo_design()
    d["analysis"] = {"elements": elements}
    base = d["load_cases"][0]
    d["load_cases"] = [{**base, "name": f"case {i}", "time_fraction": 1 / cases} for i in range(cases)]
    return d


def _post(url: str, doc: dict, timeout: float = 60) -> tuple[int, dict]:
    req = urllib.request.Request(url, data=json.dumps(doc).encode(), method="POST",
                                 headers={"Content-Type": "application/json"})
    try:
        with urllib.request.urlopen(req, timeout=timeout) as r:
            return r.status, json.loads(r.read())
    except urllib.error.HTTPError as e:
        return e.code, json.loads(e.read())


@pytest.fixture
def budget_server(tmp_path):
    proc, url = start_server({"SHAFTWRIGHT_DB": str(tmp_path / "s.db"),
                              "SHAFTWRIGHT_SOLVE_BUDGET_S": "0.25", "SHAFTWRIGHT_SOLVE_PROCESSES": "2"})
    try:
        yield url
    finally:
        stop_server(proc)


def test_health_answers_while_a_heavy_solve_runs_and_the_solve_stops_at_its_budget(budget_server):
    url = budget_server
    out: dict = {}
    assert _post(url + "/api/solve", pages.demo_design())[0] == 200
    # the solve processes are up and their warm-up calls done (a busy answer is 503, see below)
    deadline = time.monotonic() + 60
    for n in range(1000):
        light = {**pages.demo_design(), "name": f"light {n}"}  # not in the result cache
        if _post(url + "/api/solve", light)[0] == 200 and n >= 2:
            break
        assert time.monotonic() < deadline, "the solve processes did not come up"
        time.sleep(0.5)
    time.sleep(1.0)

    def heavy():
        t0 = time.perf_counter()
        out["answer"] = _post(url + "/api/solve", _heavy())
        out["elapsed"] = time.perf_counter() - t0

    th = threading.Thread(target=heavy)
    th.start()
    time.sleep(0.3)  # the heavy solve is under way
    worst = 0.0
    while th.is_alive():
        t0 = time.perf_counter()
        with urllib.request.urlopen(url + "/api/health", timeout=5) as r:
            assert r.status == 200
        worst = max(worst, time.perf_counter() - t0)
        time.sleep(0.1)
    th.join()
    assert worst < 1.0, f"/api/health took {worst:.2f} s while a solve ran"
    status, body = out["answer"]
    assert status == 413, body
    assert "time budget of 0.25 s" in body["errors"][0]["message"]
    assert out["elapsed"] < 2.75, f"the solve was not stopped at its budget ({out['elapsed']:.1f} s)"
    # the server carries on: a light solve right after is answered
    status, body = _post(url + "/api/solve", pages.demo_design())
    assert status == 200 and body["load_cases"]


def test_work_limits_bound_the_products_not_only_the_counts():
    client = TestClient(create_app())
    big = _heavy(elements=2000, cases=100)  # each count within its limit, the product not
    r = client.post("/api/solve", json=big)
    assert r.status_code == 413
    assert "too much work" in r.json()["errors"][0]["message"]
    table = pages.demo_design()
    rows = "\n".join(f"T-{i},deep_groove_ball,02,25,52,15,,14000,7850,,,13.8,,,," for i in range(5000))
    table["bearing_table"] = {"name": "long", "csv": REQUIRED_HEADER + "\n" + rows + "\n"}
    table["load_cases"] = [{**table["load_cases"][0], "name": f"c{i}", "time_fraction": 0.01}
                           for i in range(100)]
    x0 = table["supports"][0]["x_mm"]
    table["supports"] += [{"id": f"E{i}", "x_mm": x0 + 1 + i, "bearing_type": "deep_groove_ball",
                           "axial": "none"} for i in range(10)]  # 12 bearings x 5,000 rows x 100
    r = client.post("/api/solve", json=table)
    assert r.status_code == 413 and "bearing table" in r.json()["errors"][0]["message"]


def test_a_page_read_does_not_solve_again(monkeypatch):
    from app import work

    work.clear_cache()
    calls = []
    real = work.run_bounded
    monkeypatch.setattr(work, "run_bounded", lambda *a, **k: calls.append(1) or real(*a, **k))
    d = copy.deepcopy(pages.demo_design())
    work.solve(d)
    work.solve(copy.deepcopy(d))
    assert len(calls) == 1


def _faulty(x: float) -> float:
    return x / 0.0 if x else 1.0  # ZeroDivisionError: a bug in the child, not bad input


def test_a_fault_in_a_solve_process_comes_back_by_name_and_the_api_answers_in_words(monkeypatch, caplog):
    from app import work
    from app.routers import api

    with pytest.raises(work.EngineFault, match="ZeroDivisionError: float division by zero"):
        work.run_bounded(_faulty, 1.0, budget_s=30, what="A test")
    assert "Traceback" in caplog.text  # the child's traceback is in the server's log
    assert work.run_bounded(_faulty, 0.0, budget_s=30, what="A test") == 1.0  # the child lives on
    monkeypatch.setattr(work, "_solve_in_child", _solve_faulty)
    work.clear_cache()
    code, body = api.solve_document(pages.demo_design())
    assert code == 422 and "ZeroDivisionError" in body["errors"][0]["message"]
    assert "Traceback" not in body["errors"][0]["message"]


def _solve_faulty(design, catalogue=None):
    return _faulty(1.0)


def test_a_study_stops_at_its_budget_with_a_message(monkeypatch):
    from app.routers import studies
    from app.settings import Settings

    monkeypatch.setattr(studies, "get_settings", lambda: Settings(study_budget_s=0.5))
    client = TestClient(create_app())
    heavy = _heavy(elements=2000, cases=20)
    x = heavy["supports"][-1]["x_mm"]
    t0 = time.perf_counter()
    r = client.post("/api/study", json={"design": heavy,
                                        "vary": [f"supports.{heavy['supports'][-1]['id']}.x_mm={x - 20}:{x}:21"]})
    assert time.perf_counter() - t0 < 5.0
    assert r.status_code == 413
    assert "The study did not finish within its time budget of 0.5 s" in r.json()["errors"][0]["message"]
    r = client.post("/study/run", data={"design": json.dumps(heavy), "var1": f"supports.{heavy['supports'][-1]['id']}.x_mm",
                                        "range1": f"{x - 20}:{x}:21"}, headers={"HX-Request": "true"})
    assert r.status_code == 413 and 'id="study-errors"' in r.text and "time budget" in r.text
