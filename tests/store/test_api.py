"""The /api/designs endpoints, import/export, the input limits, and restarting the app.

Each test runs on both stores (``[sqlite]``, ``[postgres]``; see conftest.py).
"""
from __future__ import annotations

import json
import threading

import httpx

from tests.store.conftest import count_designs, make_client


def test_create_then_read_back(client, design):
    r = client.post("/api/designs", json={"design": design, "author": "Ana", "comment": "first"})
    assert r.status_code == 201
    body = r.json()
    assert body["revision"] == 1 and body["url"] == f"/d/{body['id']}"
    assert len(body["id"]) >= 22  # >= 128 bits, URL-safe base64
    got = client.get(f"/api/designs/{body['id']}").json()
    assert got["design"] == design and got["author"] == "Ana" and got["comment"] == "first"
    assert got["engine_version"]


def test_bare_design_body_is_accepted(client, design):
    r = client.post("/api/designs", json=design)
    assert r.status_code == 201 and r.json()["revision"] == 1


def test_revisions_list_fetch_and_stale_base(client, design):
    did = client.post("/api/designs", json=design).json()["id"]
    v2 = {**design, "name": "second"}
    r = client.post(f"/api/designs/{did}/revisions",
                    json={"design": v2, "base_revision": 1, "comment": "renamed"})
    assert r.status_code == 201 and r.json()["revision"] == 2
    listing = client.get(f"/api/designs/{did}/revisions").json()
    assert [x["revision"] for x in listing["revisions"]] == [1, 2]
    assert listing["revisions"][1]["comment"] == "renamed" and listing["latest_revision"] == 2
    assert client.get(f"/api/designs/{did}/revisions/1").json()["design"] == design

    # a stale base merges three ways (issue 16): their rename and my notes both survive
    mine = {**design, "notes": "edited on top of 1"}
    merged = client.post(f"/api/designs/{did}/revisions", json={"design": mine, "base_revision": 1})
    assert merged.status_code == 201 and merged.json()["revision"] == 3
    assert merged.json()["merged_from"] | {"conflict_id": 0} == {
        "base_revision": 1, "latest_revision": 2, "yours": ["notes"], "theirs": ["name"],
        "conflict_id": 0}
    assert merged.json()["design"] == {**design, "name": "second", "notes": "edited on top of 1"}
    assert client.get(merged.json()["api_url"]).json()["revision"] == 3

    # the same key changed on both sides: 409 with the clashing key, nothing overwritten
    clash = {**design, "name": "third"}
    stale = client.post(f"/api/designs/{did}/revisions", json={"design": clash, "base_revision": 1})
    assert stale.status_code == 409
    body = stale.json()
    assert body["latest_revision"] == 3 and body["base_revision"] == 1
    assert body["clashes"] == [{"path": "name", "base": design["name"], "theirs": "second",
                                "mine": "third", "removed_in_theirs": False, "removed_in_mine": False}]
    assert "name" in body["detail"] and "resolutions" in body["detail"]
    kept = client.get(body["conflict_url"]).json()
    assert kept["document"] == clash
    latest = client.get(f"/api/designs/{did}").json()
    assert latest["revision"] == 3 and latest["design"]["name"] == "second"
    # the choice made: mine for the clashing key, their other changes kept
    chosen = client.post(f"/api/designs/{did}/revisions", json={
        "design": clash, "base_revision": 1, "resolutions": {"name": "mine"}})
    assert chosen.status_code == 201, chosen.text
    assert chosen.json()["design"]["name"] == "third"
    assert chosen.json()["design"]["notes"] == "edited on top of 1"


def test_unknown_and_malformed_ids_are_404(client, design):
    assert client.get("/api/designs/AAAAAAAAAAAAAAAAAAAAAAAA").status_code == 404
    assert client.get("/api/designs/..%2f..%2fetc").status_code == 404
    did = client.post("/api/designs", json=design).json()["id"]
    assert client.get(f"/api/designs/{did}/revisions/7").status_code == 404
    r = client.post("/api/designs/AAAAAAAAAAAAAAAAAAAAAAAA/revisions", json={"design": design})
    assert r.status_code == 404


def test_invalid_design_is_refused_with_its_path_and_stores_nothing(client, design, db_location):
    design["supports"][1]["x_mm"] = 9999
    r = client.post("/api/designs", json={"design": design})
    assert r.status_code == 422
    assert any(e["path"] == "supports[1].x_mm" for e in r.json()["errors"])
    assert count_designs(db_location) == 0


def test_bad_save_requests(client, design):
    did = client.post("/api/designs", json=design).json()["id"]
    for body, path in (({"base_revision": 1}, "design"),
                       ({"design": design, "base_revision": "one"}, "base_revision"),
                       ({"design": design, "author": 5}, "author"),
                       ({"design": design, "author": "x" * 101}, "author"),
                       ({"design": design, "colour": "red"}, "colour")):
        r = client.post(f"/api/designs/{did}/revisions", json=body)
        assert r.status_code == 422, body
        assert r.json()["errors"][0]["path"] == path
    r = client.post("/api/designs", content=b"{not json", headers={"content-type": "application/json"})
    assert r.status_code == 422 and "not valid JSON" in r.json()["errors"][0]["message"]


def test_document_over_one_megabyte_is_refused(client, design, db_location):
    design["notes"] = "n" * 1_000_001
    r = client.post("/api/designs", json=design)
    assert r.status_code == 413
    assert "at most 1,000,000 bytes" in r.json()["errors"][0]["message"]
    assert count_designs(db_location) == 0


def test_absurd_counts_and_nesting_are_refused(client, design, db_location):
    many = {**design, "elements": [{"id": f"F{i}", "kind": "force", "x_mm": 100, "Fy_N": 1}
                                   for i in range(501)]}
    r = client.post("/api/designs", json=many)
    assert r.status_code == 422
    err = r.json()["errors"][0]
    assert err["path"] == "elements" and "501 elements; at most 500" in err["message"]
    deep = {"design": design, "comment": "x"}
    nested: dict = {}
    cur = nested
    for _ in range(40):
        cur["a"] = {}
        cur = cur["a"]
    deep["design"] = {**design, "extra": nested}
    r = client.post("/api/designs", json=deep)
    assert r.status_code == 422 and "nested too deeply" in r.json()["errors"][0]["message"]
    bomb = b"[" * 100_000 + b"]" * 100_000
    r = client.post("/api/designs", content=bomb, headers={"content-type": "application/json"})
    assert r.status_code == 422 and "nested too deeply" in r.json()["errors"][0]["message"]
    assert count_designs(db_location) == 0


def test_export_then_import_round_trip(client, design):
    did = client.post("/api/designs", json=design).json()["id"]
    r = client.get(f"/api/designs/{did}/revisions/1/export")
    assert r.status_code == 200
    assert r.headers["content-disposition"].startswith('attachment; filename="test-rig-invented')
    assert json.loads(r.content) == design
    imp = client.post("/api/designs/import", files={"file": ("rig.json", r.content, "application/json")})
    assert imp.status_code == 201
    new = imp.json()
    assert new["id"] != did and new["revision"] == 1
    assert client.get(f"/api/designs/{new['id']}").json()["design"] == design


def test_bad_import_says_why_and_imports_nothing(client, design, db_location):
    bad = dict(design)
    bad["load_cases"] = [{"name": "only", "time_fraction": 0.5, "speed_rpm": 100}]
    cases = [
        (b"", "empty"),
        (b"\xff\xfe not text", "not UTF-8"),
        (b'{"name": ', "not valid JSON"),
        (b"[1, 2]", "must be a JSON object"),
        (json.dumps(bad).encode(), "time fractions sum to 0.5"),
        (b'{"x": NaN}', "NaN"),
    ]
    for raw, why in cases:
        r = client.post("/api/designs/import", files={"file": ("bad.json", raw, "application/json")})
        assert r.status_code == 422, why
        assert why in json.dumps(r.json(), ensure_ascii=False), (why, r.json())
    big = json.dumps({**design, "notes": "n" * 1_100_000}).encode()
    r = client.post("/api/designs/import", files={"file": ("big.json", big, "application/json")})
    assert r.status_code == 413
    assert count_designs(db_location) == 0


def test_import_page_redirects_or_explains(client, design):
    ok = client.post("/d/import", files={"file": ("rig.json", json.dumps(design).encode(), "application/json")},
                     follow_redirects=False)
    assert ok.status_code == 303 and ok.headers["location"].startswith("/d/")
    bad = client.post("/d/import", files={"file": ("bad.json", b"{", "application/json")})
    assert bad.status_code == 422 and "was not imported" in bad.text and "not valid JSON" in bad.text


def test_save_and_reload_after_rebuilding_the_app(db_location, design):
    did = make_client(db_location).post("/api/designs", json=design).json()["id"]
    fresh = make_client(db_location)  # a new application object on the same store
    assert fresh.get(f"/api/designs/{did}").json()["design"] == design


def test_save_and_reload_after_restarting_the_server(server_factory, design):
    first = server_factory()
    did = httpx.post(first.url + "/api/designs", json={"design": design, "comment": "before"}).json()["id"]
    httpx.post(first.url + f"/api/designs/{did}/revisions",
               json={"design": {**design, "name": "r2"}, "base_revision": 1})
    first.stop()
    second = server_factory()  # a new process on the same SHAFTWRIGHT_DB
    got = httpx.get(second.url + f"/api/designs/{did}").json()
    assert got["revision"] == 2 and got["design"]["name"] == "r2"
    assert httpx.get(second.url + f"/api/designs/{did}/revisions/1").json()["design"] == design


def test_ten_http_clients_saving_at_once_lose_no_revision(server_factory, design):
    srv = server_factory()
    did = httpx.post(srv.url + "/api/designs", json=design).json()["id"]
    barrier = threading.Barrier(10)
    codes: list[int] = []

    def client(k: int) -> None:
        with httpx.Client(base_url=srv.url, timeout=60) as c:
            barrier.wait()
            for j in range(3):
                r = c.post(f"/api/designs/{did}/revisions",
                           json={"design": {**design, "name": f"{k}-{j}"}, "comment": f"{k}/{j}"})
                codes.append(r.status_code)

    threads = [threading.Thread(target=client, args=(k,)) for k in range(10)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert codes == [201] * 30
    revs = httpx.get(srv.url + f"/api/designs/{did}/revisions").json()["revisions"]
    assert [r["revision"] for r in revs] == list(range(1, 32))
    assert {r["comment"] for r in revs[1:]} == {f"{k}/{j}" for k in range(10) for j in range(3)}


def test_import_reads_a_file_with_a_byte_order_mark(client, design):
    """Some Windows editors save UTF-8 with a byte-order mark: the import skips it."""
    raw = b"\xef\xbb\xbf" + json.dumps(design, ensure_ascii=False).encode("utf-8")
    r = client.post("/api/designs/import", files={"file": ("bom.json", raw, "application/json")})
    assert r.status_code == 201, r.text
