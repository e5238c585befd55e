"""Hostile text in every text field comes back escaped on every page that shows it."""
from __future__ import annotations

import re

PAYLOAD = '<script>alert("sw{}")</script>'
MARK = re.compile(r'<script>alert\("sw\w+"\)</script>')


def _hostile(design: dict) -> tuple[dict, list[str]]:
    """The design with a distinct payload in every text field a user types."""
    tags = []

    def p(tag: str) -> str:
        tags.append(tag)
        return PAYLOAD.format(tag)

    design["name"] = p("name")
    design["notes"] = p("notes") + "\nsecond line & more"
    design["shaft"]["material"]["name"] = p("material")
    sup_ids = {}
    for i, s in enumerate(design["supports"]):
        new = p(f"sup{i}")[:40]
        sup_ids[s["id"]] = new
        s["id"] = new
    for i, e in enumerate(design["elements"]):
        e["id"] = p(f"el{i}")[:40]
    for i, c in enumerate(design["load_cases"]):
        c["name"] = p(f"case{i}")[:60]
    return design, tags


def _assert_escaped(html: str, where: str) -> None:
    assert not MARK.search(html), f"raw payload on {where}"
    assert "&lt;script&gt;alert(" in html, f"payload not shown as text on {where}"


def test_every_page_escapes_every_field(client, design):
    design, _ = _hostile(design)
    r = client.post("/api/designs", json={"design": design, "author": PAYLOAD.format("author"),
                                          "comment": PAYLOAD.format("comment")})
    assert r.status_code == 201, r.text
    did = r.json()["id"]
    r2 = client.post(f"/api/designs/{did}/revisions",
                     json={"design": {**design, "name": PAYLOAD.format("name2")}, "base_revision": 1,
                           "author": PAYLOAD.format("author2"), "comment": PAYLOAD.format("comment2")})
    assert r2.status_code == 201
    stale = client.post(f"/api/designs/{did}/revisions",  # the same key as r2: a clash, kept
                        json={"design": {**design, "name": PAYLOAD.format("name3")},
                              "base_revision": 1, "author": PAYLOAD.format("a3")})
    assert stale.status_code == 409
    pages = [f"/d/{did}", f"/d/{did}?from=1", f"/d/{did}/r/1", f"/d/{did}/r/2", f"/d/{did}/revisions",
             f"/d/{did}/compare?a=1&b=2", f"/d/{did}/r/1/note", f"/d/{did}/r/2/note"]
    for url in pages:
        resp = client.get(url)
        assert resp.status_code == 200, url
        _assert_escaped(resp.text, url)
    note = client.get(f"/d/{did}/r/1/note").text
    for tag in ("name", "notes", "material", "sup0", "el0", "case0", "author", "comment"):
        assert f"&lt;script&gt;alert(&#34;sw{tag}" in note or f"&lt;script&gt;alert(&quot;sw{tag}" in note, tag
    history = client.get(f"/d/{did}/revisions").text
    for tag in ("author", "comment", "author2", "comment2", "a3", "name2"):
        assert f"sw{tag}" in history, tag
    compare = client.get(f"/d/{did}/compare?a=1&b=2").text
    assert "swname2" in compare and "swcomment2" in compare


def test_error_messages_escape_what_the_user_typed(client, design):
    design["supports"][0]["bearing_type"] = PAYLOAD.format("bt")
    r = client.post("/d/import", files={"file": (PAYLOAD.format("file") + ".json",
                                                 __import__("json").dumps(design).encode(),
                                                 "application/json")})
    assert r.status_code == 422
    _assert_escaped(r.text, "import errors")
    assert "swbt" in r.text and "swfile" in r.text
