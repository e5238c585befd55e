"""POST /api/optimise and the /optimise page's routes (in-process client)."""
from __future__ import annotations

import json
import re
from html import unescape

import pytest
from fastapi.testclient import TestClient

import engine
from app.main import create_app
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
