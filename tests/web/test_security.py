"""Browser safety on the server side: the headers on every answer, JSON in HTML escaped by
the one helper (the /study/run break-out of issue 16 included), no inline script or inline
handler in any template, and the loopback-only rule of a server without accounts."""
from __future__ import annotations

import json
import re
from pathlib import Path

import pytest

from app import safejson
from app.routers.pages import demo_design
from app.security import CSP

ROOT = Path(__file__).resolve().parents[2]
BREAKOUT = "</script><img src=x onerror=alert(1)>"


def _hostile_demo() -> dict:
    d = demo_design()
    ids = {s["id"]: BREAKOUT[:30] + s["id"] for s in d["supports"]}
    for s in d["supports"]:
        s["id"] = ids[s["id"]]
    for e in d["elements"]:
        e["id"] = "<svg onload=alert(2)>" + e["id"]
    for c in d["load_cases"]:
        c["name"] = "\u2028</script>" + c["name"]
    return d


def _assert_headers(r, where: str) -> None:
    h = r.headers
    assert h.get("content-security-policy") == CSP, where
    assert h.get("x-content-type-options") == "nosniff", where
    assert h.get("referrer-policy") == "same-origin", where
    assert "frame-ancestors 'none'" in h["content-security-policy"], where
    assert "server" not in h, where


def test_the_policy_allows_only_the_apps_own_scripts_and_styles():
    parts = dict(p.split(" ", 1) for p in CSP.split("; "))
    assert parts["script-src"] == "'self'"  # no inline script, no eval, nothing from elsewhere
    assert parts["default-src"] == "'none'" and parts["object-src"] == "'none'"
    assert "unsafe" not in CSP  # neither inline styles nor eval (plotly needs neither here)
    assert all(t == "'self'" or t.startswith("'sha256-") for t in parts["style-src"].split())
    assert parts["frame-ancestors"] == "'none'" and parts["form-action"] == "'self'"


def test_headers_on_every_page_and_answer(client):
    did = client.post("/api/designs", json=demo_design()).json()["id"]
    pages = ["/", "/?units=us", "/study", "/login", "/docs", "/openapi.json", "/api/health",
             f"/d/{did}", f"/d/{did}/r/1", f"/d/{did}/revisions", f"/d/{did}/compare?a=1&b=1",
             f"/d/{did}/r/1/note", f"/api/designs/{did}", f"/api/designs/{did}/revisions/1/export",
             "/static/css/shaftwright.css", "/static/js/editor.js", "/bearing-table.csv",
             "/no/such/page", "/d/AAAAAAAAAAAAAAAAAAAAAAAA"]
    for path in pages:
        r = client.get(path)
        assert r.status_code in (200, 404), path
        _assert_headers(r, path)
    for r in (client.post("/api/solve", content=b"{}", headers={"Content-Type": "text/plain"}),
              client.post("/editor/solve", data={"name": "x"}),
              client.post("/d/save", data={}, headers={"Origin": "http://evil.example"})):
        _assert_headers(r, r.request.url.path)


def test_no_template_holds_inline_script_or_inline_handlers():
    for path in sorted((ROOT / "templates").rglob("*.html")):
        html = re.sub(r"\{#.*?#\}", "", path.read_text(encoding="utf-8"), flags=re.S)  # comments
        for m in re.finditer(r"<script\b([^>]*)>", html):
            attrs = m.group(1)
            assert "src=" in attrs or 'type="application/json"' in attrs, (path.name, attrs)
        assert not re.search(r"\son[a-z]+\s*=", html), path.name  # onclick=, onsubmit=, …
        assert "javascript:" not in html and "js:" not in html, path.name
        assert "<style" not in html.replace("<style>{{ css }}</style>", ""), path.name
        assert not re.search(r'\sstyle="', html), path.name
        assert "| safe" not in html.replace("drawing | safe", ""), path.name


def test_the_escaper_escapes_what_ends_a_script_block_or_a_js_string():
    text = json.dumps({"id": BREAKOUT + "&'\u2028\u2029"}, ensure_ascii=False)
    out = str(safejson.escape_json_text(text))
    for bad in ("<", ">", "&", "'", "\u2028", "\u2029"):
        assert bad not in out, repr(bad)
    assert json.loads(out) == json.loads(text)  # the same data back
    assert json.loads(str(safejson.json_for_html({"a": "</script>"}))) == {"a": "</script>"}
    with pytest.raises(ValueError):
        safejson.json_for_html(float("nan"))


def _json_blocks(html: str) -> list[str]:
    return re.findall(r'<script type="application/json"[^>]*>(.*?)</script>', html, re.S)


def test_hostile_ids_stay_inside_the_json_blocks_of_editor_and_study(client):
    from app import web
    from app.routers.studies import encode_design

    d = _hostile_demo()
    pages = [client.get("/study?d=" + encode_design(d)),
             client.post("/editor/solve", data=web.design_to_form(d, "si")),
             client.post("/study/run", data={"design": json.dumps(d),
                                             "var1": "shaft.segments[1].d_mm", "range1": "38:44:4"})]
    did = client.post("/api/designs", json=d).json()["id"]
    pages.append(client.get(f"/d/{did}"))
    for r in pages:
        assert r.status_code == 200, r.text[:300]
        assert "<img src=x" not in r.text and "<svg onload" not in r.text, r.request.url
        blocks = _json_blocks(r.text)
        assert blocks or r is pages[0], r.request.url  # the study page keeps its design in a textarea
        for b in blocks:
            assert "<" not in b and "\u2028" not in b
            json.loads(b)
    study = pages[2].text
    plot = json.loads(_json_blocks(study)[0])
    names = {t.get("name") for t in plot["data"]}
    assert "life " + BREAKOUT[:30] + "A" in names  # the id reaches the chart as the same text


def test_without_accounts_the_server_listens_on_loopback_only(tmp_path, monkeypatch):
    from app import auth
    from app.server import bind_refusal
    from app.store import open_store

    db = tmp_path / "bind.db"
    monkeypatch.setenv("SHAFTWRIGHT_DB", str(db))
    for host in ("127.0.0.1", "localhost", "::1", "127.0.0.2"):
        assert bind_refusal(host) is None, host
    why = bind_refusal("0.0.0.0")
    assert why and "no accounts" in why and "--open" in why and "users add" in why
    assert bind_refusal("192.168.1.20", open_=True) is None
    open_store(str(db)).add_account("ann", auth.hash_password("long enough"))
    assert bind_refusal("0.0.0.0") is None


def test_plotly_needs_no_inline_style_with_the_files_the_pages_link():
    """static/vendor/plotly-styles.css holds every rule plotly.js would inject (its rule map,
    read from the installed bundle), and the map library's placeholder id in
    partials/plotly_head.html is the one the bundle checks; a plotly.js upgrade that changes
    either fails here (and, in Chromium, in tests/browser/test_security.py)."""
    from app.routers.pages import PLOTLY_JS

    bundle = PLOTLY_JS.read_text(encoding="utf-8")
    m = re.search(r"(\w+)=\{(\"X,X div\":.*?)\};for\(\w+ in \1\)", bundle, re.S)
    assert m, "plotly.js no longer has its rule map where expected"
    pairs = re.findall(r"(?:\"([^\"]*)\"|(\w+)):(?:\"([^\"]*)\"|'([^']*)')", m.group(2))
    css = (ROOT / "static" / "vendor" / "plotly-styles.css").read_text(encoding="utf-8")
    assert len(pairs) > 50
    for k1, k2, v1, v2 in pairs:
        sel = re.sub(r"^,", " ,", k1 or k2).replace("X", ".js-plotly-plot .plotly").replace("Y", ".plotly-notifier")
        assert f"{sel}{{{v1 or v2}}}" in css, sel
    head = (ROOT / "templates" / "partials" / "plotly_head.html").read_text(encoding="utf-8")
    guard = re.search(r'<meta id="([0-9a-f]{64})"', head).group(1)
    assert f'document.getElementById("{guard}")' in bundle
    assert len(re.findall(r'createElement\("style"\)', bundle)) == 2  # the two handled above


def test_a_network_server_whose_accounts_are_gone_refuses_instead_of_opening(client, monkeypatch):
    monkeypatch.setenv("SHAFTWRIGHT_REQUIRE_ACCOUNTS", "1")  # what serve sets for --host 0.0.0.0
    r = client.get("/api/health")
    assert r.status_code == 503 and "no accounts" in r.json()["detail"]
    monkeypatch.delenv("SHAFTWRIGHT_REQUIRE_ACCOUNTS")
    assert client.get("/api/health").status_code == 200
