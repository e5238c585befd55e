"""One error policy (issue 16, item 6): typed errors in, one shape of answer out.

- the four malformed inputs of the report get 4xx, not 500;
- a read-only store answers 503 with words and Retry-After (JSON, htmx alert, page), and the
  saves succeed again once the permissions are fixed, without a restart (the -wal/-shm files
  SQLite made while the file was read-only are made writable again);
- anything unexpected is a 500 in words with an error id that is also in the log.
"""
from __future__ import annotations

import base64
import json
import logging
import os
import pwd
import zlib

import pytest
from fastapi.testclient import TestClient

from app.main import create_app
from app.routers import pages
from app.settings import Settings, get_settings


@pytest.fixture
def client(tmp_path):
    app = create_app()
    app.dependency_overrides[get_settings] = lambda: Settings(db=str(tmp_path / "s.db"))
    return TestClient(app, raise_server_exceptions=False)


def _nested(depth: int):
    value: object = 1
    for _ in range(depth):
        value = {"a": value}
    return value


def test_the_four_malformed_inputs_get_4xx(client):
    # 1. a deeply nested ?d= on /study
    raw = ('{"a":' * 5000 + "1" + "}" * 5000).encode()
    d = base64.urlsafe_b64encode(zlib.compress(raw, 9)).decode().rstrip("=")
    r = client.get("/study", params={"d": d})
    assert 400 <= r.status_code < 500 or (r.status_code == 200 and "damaged" in r.text), r.status_code
    # 2. a deeply nested design on /study/arrangements
    r = client.post("/study/arrangements", data={"design": json.dumps(_nested(100))})
    assert 400 <= r.status_code < 500, r.status_code
    r = client.post("/study/arrangements", data={"design": "[" * 100_000 + "]" * 100_000})
    assert 400 <= r.status_code < 500, r.status_code
    # 3. a revision number beyond 64 bits
    did = client.post("/api/designs", json=pages.demo_design()).json()["id"]
    for url in (f"/api/designs/{did}/revisions/{2**64 + 1}", f"/d/{did}/r/{2**64 + 1}",
                f"/d/{did}/r/{2**64 + 1}/note", f"/api/designs/{did}/conflicts/{2**64}",
                f"/d/{did}/compare?a=1&b={2**64}"):
        assert client.get(url).status_code == 404, url
    r = client.post(f"/api/designs/{did}/revisions",
                    json={"design": pages.demo_design(), "base_revision": 2**64})
    assert r.status_code == 422 and r.json()["errors"][0]["path"] == "base_revision"
    # 4. "vary": 5 on /api/study
    r = client.post("/api/study", json={"design": pages.demo_design(), "vary": 5})
    assert r.status_code == 422 and r.json()["errors"][0]["path"] == "vary"


def test_errors_answer_in_the_clients_form(client):
    r = client.get("/api/designs/AAAAAAAAAAAAAAAAAAAAAAAA")
    assert r.status_code == 404 and r.json()["detail"].startswith("no design")
    r = client.get("/d/AAAAAAAAAAAAAAAAAAAAAAAA")
    assert r.status_code == 404 and "text/html" in r.headers["content-type"] and "Not found" in r.text
    r = client.get("/d/AAAAAAAAAAAAAAAAAAAAAAAA", headers={"HX-Request": "true"})
    assert r.status_code == 404 and 'id="sw-alert"' in r.text and 'hx-swap-oob="true"' in r.text
    assert r.headers["hx-reswap"] == "none"


def test_anything_unexpected_is_a_500_in_words_with_an_id_in_the_log(client, monkeypatch, caplog):
    from app.routers import designs

    def boom(*a, **k):
        raise ZeroDivisionError("a bug")
    monkeypatch.setattr(designs, "note_context", boom)
    did = client.post("/api/designs", json=pages.demo_design()).json()["id"]
    with caplog.at_level(logging.ERROR, logger="shaftwright.errors"):
        r = client.get(f"/d/{did}/r/1/note")
    assert r.status_code == 500 and "Something went wrong" in r.text
    error_id = r.text.split("Error id: <code>", 1)[1].split("<", 1)[0]
    assert len(error_id) == 8 and any(error_id in rec.getMessage() for rec in caplog.records)
    assert "ZeroDivisionError" in caplog.text and "a bug" not in r.text  # no internals shown
    monkeypatch.setattr(designs, "_revision_json", boom)
    r = client.get(f"/api/designs/{did}")
    assert r.status_code == 500 and len(r.json()["error_id"]) == 8


# --- the store turned read-only, then repaired --------------------------------------------

def _unprivileged(fn, tmp_path):
    """Run ``fn(folder)`` as a user that file permissions apply to (root ignores them)."""
    if os.geteuid() != 0:
        folder = tmp_path / "store"
        folder.mkdir()
        return fn(folder)
    import tempfile
    from pathlib import Path

    folder = Path(tempfile.mkdtemp(prefix="sw-ro-", dir="/tmp"))  # pytest's tmp is root-only
    folder.chmod(0o755)
    nobody = pwd.getpwnam("nobody")
    os.chown(folder, nobody.pw_uid, nobody.pw_gid)
    read, write = os.pipe()
    pid = os.fork()
    if pid == 0:  # the child: drop to nobody, run, report, leave without pytest's teardown
        code = 0
        try:
            os.close(read)
            os.setgid(nobody.pw_gid)
            os.setuid(nobody.pw_uid)
            out = {"ok": fn(folder)}
        except BaseException as exc:  # noqa: BLE001 - reported to the parent
            import traceback

            out = {"error": f"{exc!r}\n{traceback.format_exc()}"}
            code = 1
        with os.fdopen(write, "w") as f:
            json.dump(out, f)
        os._exit(code)
    os.close(write)
    with os.fdopen(read) as f:
        text = f.read()
    os.waitpid(pid, 0)
    out = json.loads(text)
    import shutil

    shutil.rmtree(folder, ignore_errors=True)
    assert "error" not in out, out.get("error")
    return out["ok"]


def _read_only_scenario(folder) -> dict:
    db = folder / "designs.db"
    app = create_app()
    app.dependency_overrides[get_settings] = lambda: Settings(db=str(db))
    client = TestClient(app, raise_server_exceptions=False)
    design = pages.demo_design()
    r = client.post("/api/designs", json=design)
    assert r.status_code == 201, r.text
    did = r.json()["id"]
    out = {}
    os.chmod(db, 0o444)
    r = client.post(f"/api/designs/{did}/revisions", json={"design": design, "base_revision": 1})
    out["api"] = (r.status_code, r.headers.get("retry-after"), r.json()["detail"])
    out["read"] = client.get(f"/api/designs/{did}").status_code  # reads go on
    from app import web

    form = web.design_to_form(design, "si")
    form.update(share_design_id=did, share_base_revision="1")
    r = client.post("/d/save", data=form, headers={"HX-Request": "true"})
    out["panel"] = (r.status_code, r.headers.get("retry-after"), r.text)
    out["sidecars"] = sorted(p.name for p in folder.iterdir())
    os.chmod(db, 0o644)  # the operator repairs the permissions; no restart
    r = client.post(f"/api/designs/{did}/revisions", json={"design": design, "base_revision": 1})
    out["after"] = (r.status_code, r.json().get("revision"))
    return out


def test_read_only_store_is_503_in_words_and_heals_without_a_restart(tmp_path):
    out = _unprivileged(_read_only_scenario, tmp_path)
    status, retry, detail = out["api"]
    assert status == 503 and retry == "10"
    assert "read-only" in detail and "nothing was changed" in detail
    assert out["read"] == 200
    status, retry, html = out["panel"]
    assert status == 503 and retry == "10"
    assert 'id="sw-alert"' in html and 'hx-swap-oob="true"' in html and "read-only" in html
    assert "designs.db-wal" in out["sidecars"]  # made while read-only: the case that used to stick
    assert out["after"] == [201, 2]


def test_htmx_is_configured_to_show_error_answers(client):
    page = client.get("/").text
    config = json.loads(page.split("name=\"htmx-config\" content='", 1)[1].split("'", 1)[0])
    rules = {r["code"]: r for r in config["responseHandling"]}
    assert rules["[45].."]["swap"] is True
    assert 'id="sw-alert"' in page and "/static/js/alerts.js" in page


def test_full_store_is_503_in_words_and_saves_resume_when_there_is_room(tmp_path, monkeypatch):
    """SQLite's own "database or disk is full" (a page-count cap stands in for the disk)."""
    import sqlite3

    from app import store as store_mod

    db = tmp_path / "full.db"
    app = create_app()
    app.dependency_overrides[get_settings] = lambda: Settings(db=str(db))
    client = TestClient(app, raise_server_exceptions=False)
    design = pages.demo_design()
    did = client.post("/api/designs", json=design).json()["id"]
    pages_now = sqlite3.connect(db).execute("PRAGMA page_count").fetchone()[0]
    real_connect = sqlite3.connect

    def capped(*a, **k):
        con = real_connect(*a, **k)
        con.execute(f"PRAGMA max_page_count={pages_now}")  # no room for one more page
        return con
    monkeypatch.setattr(store_mod.sqlite3, "connect", capped)
    big = {**design, "notes": "x" * 15000}
    r = client.post(f"/api/designs/{did}/revisions", json={"design": big, "base_revision": 1})
    assert r.status_code == 503 and r.headers["retry-after"] == "10"
    assert "disk that holds the store is full" in r.json()["detail"]
    monkeypatch.setattr(store_mod.sqlite3, "connect", real_connect)  # room again; no restart
    r = client.post(f"/api/designs/{did}/revisions", json={"design": big, "base_revision": 1})
    assert r.status_code == 201 and r.json()["revision"] == 2
