"""POST /api/optimise and the /optimise page's routes (in-process client)."""
from __future__ import annotations

import json
import re
from html import unescape

import pytest
from fastapi.testclient import TestClient

import engine
from app.main import create_app
from tests.conftest import load_sample
from tests.search.test_search import one_step


@pytest.fixture(scope="module")
def client():
    return TestClient(create_app())


def test_api_front_of_complete_passing_designs(client):
    r = client.post("/api/optimise", json={"design": one_step(), "vary": ["shaft.segments[0].d_mm=20:60:1"],
                                           "objectives": ["mass_kg", "fatigue_margin"], "seed": 2, "budget_s": 5})
    assert r.status_code == 200
    body = r.json()
    assert body["method"] == "enumerate" and len(body["front"]) >= 2
    for p in body["front"]:
        res = engine.solve(p["design"], diagrams=False)
        assert not [c for c in res.checks if c.status == "fail"]
        assert p["objectives"]["mass_kg"] == pytest.approx(res.shaft.mass_kg)


@pytest.mark.parametrize("body, path", [
    ({"design": one_step(), "vary": ["shaft.segments[2].d_mm=20:60"]}, "shaft.segments[2].d_mm"),
    ({"design": one_step(), "vary": []}, "vary"),
    ({"design": one_step(), "vary": ["shaft.segments[0].d_mm=20:60"], "budget_s": 600}, "budget_s"),
    ({"design": one_step(), "vary": ["shaft.segments[0].d_mm=20:60"], "objectives": ["cost"]}, "objective"),
    ({"design": {"shaft": 3}, "vary": ["shaft.segments[0].d_mm=20:60"]}, "shaft"),
    ({"vary": ["x=1:2"]}, "design"),
])
def test_api_bad_input_is_422_naming_the_field(client, body, path):
    r = client.post("/api/optimise", json=body)
    assert r.status_code == 422
    assert r.json()["errors"][0]["path"].startswith(path)


def test_openapi_documents_the_request(client):
    spec = client.get("/openapi.json").json()
    op = spec["paths"]["/api/optimise"]["post"]
    assert op["requestBody"]["content"]["application/json"]["schema"] == {"$ref": "#/components/schemas/OptimiseRequest"}
    assert "budget_s" in spec["components"]["schemas"]["OptimiseRequest"]["properties"]


def test_page_run_and_open_in_editor(client):
    assert client.get("/optimise").status_code == 200
    form = {"design": json.dumps(one_step()), "path": ["shaft.segments[0].d_mm"], "bounds": ["20:60:2"],
            "use": ["0"], "objective": ["mass_kg"], "seed": "1", "budget": "5"}
    r = client.post("/optimise/run", data=form)
    assert r.status_code == 200
    blob = re.search(r'<script type="application/json" id="optimise-plot-data">(.*?)</script>', r.text, re.S)
    fig = json.loads(blob.group(1))
    assert fig["layout"]["meta"]["n"] == 1 and fig["data"][1]["name"].startswith("current design")
    design = unescape(re.search(r'<textarea name="design" hidden>(.*?)</textarea>', r.text, re.S).group(1))
    r = client.post("/optimise/apply", data={"design": design})
    assert r.status_code == 200 and "design-form" in r.text
    r = client.post("/optimise/run", data={**form, "use": []})
    assert r.status_code == 422 and "tick at least one" in r.text


def test_api_body_limits(client):
    r = client.post("/api/optimise", content=b"{not json", headers={"content-type": "application/json"})
    assert r.status_code == 422 and r.json()["errors"]
    r = client.post("/api/optimise", content=b"[" * 5000 + b"]" * 5000, headers={"content-type": "application/json"})
    assert r.status_code in (413, 422) and r.json()["errors"]


def test_a_long_search_runs_as_a_job_with_progress_and_stops_with_the_front_so_far(client):
    """Continuous bounds (NSGA-II, many populations): the page gets a progress fragment (designs
    solved, generation, time of the budget, a stop button) that polls the job; stop ends the
    search after the population in hand and the answer is the front of the designs solved so far."""
    import time

    data = load_sample("countershaft.json")
    form = {"design": json.dumps(data), "path": ["shaft.segments[0].d_mm", "supports.B.x_mm"],
            "bounds": ["24:36", "242:268"], "use": ["0", "1"], "objective": ["mass_kg", "fatigue_margin"],
            "seed": "1", "budget": "20"}
    r = client.post("/optimise/run", data=form)
    assert r.status_code == 200 and 'id="search-progress"' in r.text, r.text
    assert "Searching: " in r.text and "designs solved, generation " in r.text and "of the 20 s budget" in r.text
    key = r.text.split('hx-get="/optimise/job/', 1)[1].split('"', 1)[0]
    assert 'hx-post="/optimise/job/' + key + '/stop"' in r.text and 'id="search-progress-bar"' in r.text
    assert client.get(f"/study/job/{key}").status_code == 404  # a search is not a study
    for _ in range(600):  # wait until a population has been solved, so there is a front so far
        r = client.get(f"/optimise/job/{key}")
        assert r.status_code == 200
        m = re.search(r"(\d+) designs solved, generation (\d+) of 60", r.text)
        if m and int(m.group(2)) >= 1:
            break
        assert 'id="optimise-plot-data"' not in r.text, "the search ended before it could be stopped"
        time.sleep(0.05)
    assert int(m.group(1)) >= 40
    stop = client.post(f"/optimise/job/{key}/stop")
    assert stop.status_code == 200 and "Stopping after the designs in hand" in stop.text
    assert 'id="stop-search"' not in stop.text
    for _ in range(600):
        r = client.get(f"/optimise/job/{key}")
        if 'id="optimise-plot-data"' in r.text:
            break
        assert 'id="search-progress"' in r.text
        time.sleep(0.05)
    assert r.status_code == 200 and "stopped on request after" in r.text and "solved so far" in r.text
    gens = int(re.search(r"stopped on request after (\d+) generations", r.text).group(1))
    assert 1 <= gens < 60
    fig = json.loads(re.search(r'<script type="application/json" id="optimise-plot-data">(.*?)</script>',
                               r.text, re.S).group(1))
    n = fig["layout"]["meta"]["n"]
    assert n >= 1 and r.text.count('class="open-row"') == n
    for blob in re.findall(r'<textarea name="design" hidden>(.*?)</textarea>', r.text, re.S)[:3]:
        res = engine.solve(json.loads(unescape(blob)), diagrams=False)
        assert not [c for c in res.checks if c.status == "fail"]  # the front so far passes every check
    assert client.get("/optimise/job/no-such-job").status_code == 404
    assert client.post("/optimise/job/no-such-job/stop").status_code == 404
