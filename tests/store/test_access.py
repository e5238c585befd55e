"""Accounts, API tokens, sessions and share links, over HTTP and in the store.

Each test runs on both stores (``[sqlite]``, ``[postgres]``; see conftest.py). The expected
behaviour is issue 16's: once an account exists every page and API route but /api/health,
the login page and static files needs a session or a token (401 or a redirect otherwise); a
read-only link shows the design and its note but cannot save (403); a state-changing request
from another origin is refused (403) and a JSON route takes JSON only (415).
"""
from __future__ import annotations

import re

import pytest

from app import auth, web
from app.store import AccountExists, NotFound
from tests.store.conftest import make_client

PASSWORD = "correct horse battery"


@pytest.fixture(autouse=True)
def _fresh_accounts_cache():
    auth.forget_accounts_cache()  # "are there accounts?" is remembered for 2 s per store
    yield
    auth.forget_accounts_cache()


def _add_account(store, name="ann", password=PASSWORD):
    store.add_account(name, auth.hash_password(password))
    auth.forget_accounts_cache()


def _token(store, name="ann") -> str:
    token, token_id, hashed = auth.new_api_token()
    store.add_token(name, token_id, hashed, label="test")
    return token


def _login(client, name="ann", password=PASSWORD):
    r = client.post("/login", data={"name": name, "password": password, "next": "/"},
                    follow_redirects=False)
    assert r.status_code == 303, r.text
    return r


def _csrf(client, path="/") -> str:
    html = client.get(path).text
    return re.search(r'<meta name="csrf-token" content="([^"]*)"', html).group(1)


def _form(design: dict, **share) -> dict:
    form = web.design_to_form(design, "si")
    form.update({f"share_{k}": str(v) for k, v in share.items()})
    return form


# --- the store ---------------------------------------------------------------------------------

def test_store_keeps_accounts_tokens_links_and_sessions(store, design):
    assert not store.has_accounts()
    _add_account(store)
    with pytest.raises(AccountExists):
        store.add_account("ann", "x")
    assert store.has_accounts() and [a.name for a in store.accounts()] == ["ann"]
    assert store.password_hash("ann").startswith("$argon2id$")  # a hash, never the password
    assert PASSWORD not in store.password_hash("ann")
    token = _token(store)
    assert store.accounts()[0].tokens == 1
    assert auth.identify(store, authorization=f"Bearer {token}").name == "ann"
    did = store.create(design).design_id
    link = store.add_link(did, link_id="l1", role="view", token_hash=auth.sha256("s" * 43),
                          label="for Bo", created_by="ann")
    assert store.link_by_token_hash(auth.sha256("s" * 43)).id == "l1"
    assert [k.id for k in store.links(did)] == ["l1"] and link.role == "view"
    store.add_session(auth.sha256("cookie"), csrf_token="t", expires_at=auth.session_expiry(),
                      link_id="l1")
    s = store.session(auth.sha256("cookie"))
    assert s.design_id == did and s.role == "view" and s.account is None
    store.add_session(auth.sha256("old"), csrf_token="t", expires_at="2000-01-01T00:00:00.000+00:00",
                      account="ann")
    assert store.session(auth.sha256("old")) is None  # expired
    store.add_session(auth.sha256("ann's"), csrf_token="t", expires_at=auth.session_expiry(),
                      account="ann")
    assert store.session(auth.sha256("ann's")).account == "ann"
    store.set_password_hash("ann", auth.hash_password("a new password"))
    assert store.session(auth.sha256("ann's")) is None  # a new password ends the sessions
    store.add_session(auth.sha256("ann's"), csrf_token="t", expires_at=auth.session_expiry(),
                      account="ann")
    store.revoke_link(did, "l1")
    assert store.session(auth.sha256("cookie")) is None  # a revoked link's sessions end
    with pytest.raises(NotFound):
        store.revoke_link(did, "l1")
    store.remove_account("ann")
    assert not store.has_accounts() and store.token(token.split("_")[1]) is None
    assert store.session(auth.sha256("ann's")) is None  # and so does removing the account
    with pytest.raises(NotFound):
        store.remove_account("ann")


# --- signing in --------------------------------------------------------------------------------

def test_once_an_account_exists_every_route_needs_a_session_or_a_token(client, store, design):
    did = client.post("/api/designs", json=design).json()["id"]  # open server: works
    _add_account(store)
    for path in (f"/api/designs/{did}", f"/api/designs/{did}/revisions", "/docs", "/openapi.json"):
        r = client.get(path, follow_redirects=False)
        assert r.status_code in (401, 303), path
    r = client.get(f"/api/designs/{did}")
    assert r.status_code == 401 and "sign in" in r.json()["detail"]
    assert r.headers["www-authenticate"].startswith("Bearer")
    assert client.post("/api/solve", json=design).status_code == 401
    assert client.post("/api/designs", json=design).status_code == 401
    for path in ("/", f"/d/{did}", f"/d/{did}/r/1/note", "/study"):
        r = client.get(path, follow_redirects=False)
        assert r.status_code == 303 and r.headers["location"].startswith("/login?next="), path
    r = client.post("/editor/solve", data={"name": "x"},
                    headers={"HX-Request": "true", "HX-Current-URL": f"http://testserver/d/{did}"})
    assert r.status_code == 401 and r.headers["hx-redirect"] == f"/login?next=%2Fd%2F{did}"
    # what stays public
    assert client.get("/api/health").status_code == 200
    assert client.get("/login").status_code == 200
    assert client.get("/static/css/shaftwright.css").status_code == 200


def test_a_token_works_and_a_wrong_one_does_not(client, store, design):
    _add_account(store)
    token = _token(store)
    ok = {"Authorization": f"Bearer {token}"}
    r = client.post("/api/designs", json={"design": design, "author": "someone else"}, headers=ok)
    assert r.status_code == 201
    did = r.json()["id"]
    assert r.json()["author"] == "ann"  # the revision's author is the account
    assert client.get(f"/api/designs/{did}", headers=ok).status_code == 200
    assert client.get("/", headers=ok).status_code == 200
    bad = {"Authorization": f"Bearer {token[:-2]}xx"}
    assert client.get(f"/api/designs/{did}", headers=bad).status_code == 401
    # removing the account stops its tokens at once
    store.remove_account("ann")
    _add_account(store, "bo")
    assert client.get(f"/api/designs/{did}", headers=ok).status_code == 401


def test_sign_in_sets_a_safe_cookie_and_forms_need_the_session_token(client, store, design):
    _add_account(store)
    r = client.post("/login", data={"name": "ann", "password": "wrong password"})
    assert r.status_code == 401 and "not right" in r.text
    r = client.post("/login", data={"name": "nobody", "password": PASSWORD})
    assert r.status_code == 401
    r = _login(client)
    cookie = r.headers["set-cookie"]
    assert cookie.startswith(auth.SESSION_COOKIE + "=")
    assert "HttpOnly" in cookie and "SameSite=lax" in cookie and "Path=/" in cookie
    assert "Secure" not in cookie  # plain http here; behind TLS the cookie is Secure
    assert client.get("/").status_code == 200
    token = _csrf(client)
    assert token
    form = _form(design, author="typed name")
    r = client.post("/d/save", data=form, headers={"HX-Request": "true"})
    assert r.status_code == 403 and "security token" in r.json()["detail"]
    for wrong in (b"nope", "nöpe".encode()):  # a wrong token, and one that is not even ASCII
        r = client.post("/d/save", data=form, headers={"HX-Request": "true", "X-CSRF-Token": wrong})
        assert r.status_code == 403
    r = client.post("/d/save", data=form, headers={"HX-Request": "true", "X-CSRF-Token": token})
    assert r.status_code == 200 and "Saved as revision 1" in r.text
    did = r.headers["hx-push-url"].rsplit("/", 1)[-1]
    assert client.get(f"/api/designs/{did}").json()["author"] == "ann"
    # a plain form carries the token as a field
    r = client.post("/logout", data={"csrf_token": token}, follow_redirects=False)
    assert r.status_code == 303 and r.headers["location"] == "/login"
    assert client.get(f"/api/designs/{did}").status_code == 401


def test_login_goes_back_only_to_a_local_page(client, store):
    _add_account(store)
    for target, expected in (("/study", "/study"), ("//evil.example/x", "/"),
                             ("https://evil.example/", "/"), ("/\\evil", "/")):
        r = client.post("/login", data={"name": "ann", "password": PASSWORD, "next": target},
                        follow_redirects=False)
        assert r.headers["location"] == expected, target


# --- share links -------------------------------------------------------------------------------

def _link(client, did: str, role: str, headers=None) -> str:
    r = client.post(f"/api/designs/{did}/links", json={"role": role, "label": "for Bo"},
                    headers=headers or {})
    assert r.status_code == 201, r.text
    assert r.json()["role"] == role
    return r.json()["url"].split("/s/", 1)[1]


def test_a_read_only_link_shows_the_note_but_cannot_save(client, store, db_location, design):
    _add_account(store)
    ann = {"Authorization": f"Bearer {_token(store)}"}
    did = client.post("/api/designs", json=design, headers=ann).json()["id"]
    other = client.post("/api/designs", json=design, headers=ann).json()["id"]
    secret = _link(client, did, "view", ann)
    bo = make_client(db_location)  # a browser without an account
    r = bo.get(f"/s/{secret}", follow_redirects=False)
    assert r.status_code == 303 and r.headers["location"] == f"/d/{did}"
    page = bo.get(f"/d/{did}")
    assert page.status_code == 200 and "read-only link" in page.text
    assert 'id="share-save"' not in page.text and 'id="design-form"' not in page.text
    assert bo.get(f"/d/{did}/r/1/note").status_code == 200
    assert bo.get(f"/d/{did}/revisions").status_code == 200
    assert bo.get(f"/d/{did}/compare?a=1&b=1").status_code == 200
    assert bo.get(f"/api/designs/{did}/revisions/1/export").status_code == 200
    token = _csrf(bo, f"/d/{did}/revisions")
    h = {"X-CSRF-Token": token}
    r = bo.post(f"/api/designs/{did}/revisions", json={"design": design, "base_revision": 1},
                headers=h)
    assert r.status_code == 403 and "read-only" in r.json()["detail"]
    r = bo.post("/d/save", data=_form(design, design_id=did, base_revision=1),
                headers={**h, "HX-Request": "true"})
    assert r.status_code == 403
    assert client.get(f"/api/designs/{did}", headers=ann).json()["revision"] == 1  # nothing saved
    for path in (f"/d/{other}", f"/api/designs/{other}", "/", f"/api/designs/{did}/links"):
        assert bo.get(path, follow_redirects=False).status_code in (403, 303), path
    assert bo.get("/", follow_redirects=False).headers["location"] == f"/d/{did}"
    assert bo.post(f"/d/{did}/links", data={"role": "edit"}, headers=h).status_code == 403
    # revoked: the link and its session stop at once
    link_id = client.get(f"/api/designs/{did}/links", headers=ann).json()["links"][0]["id"]
    assert client.delete(f"/api/designs/{did}/links/{link_id}", headers=ann).status_code == 200
    assert bo.get(f"/api/designs/{did}").status_code == 401
    assert bo.get(f"/s/{secret}", follow_redirects=False).status_code == 404


def test_an_edit_link_saves_that_design_only(client, store, db_location, design):
    _add_account(store)
    ann = {"Authorization": f"Bearer {_token(store)}"}
    did = client.post("/api/designs", json=design, headers=ann).json()["id"]
    other = client.post("/api/designs", json=design, headers=ann).json()["id"]
    secret = _link(client, did, "edit", ann)
    bo = make_client(db_location)
    bo.get(f"/s/{secret}")
    page = bo.get(f"/d/{did}")
    assert 'id="share-save"' in page.text and "share-links" not in page.text  # no link admin
    h = {"X-CSRF-Token": _csrf(bo, f"/d/{did}"), "HX-Request": "true"}
    r = bo.post("/d/save", data=_form({**design, "name": "by Bo"}, design_id=did, base_revision=1,
                                      author="Bo"), headers=h)
    assert r.status_code == 200 and "Saved as revision 2" in r.text
    assert client.get(f"/api/designs/{did}", headers=ann).json()["author"] == "Bo (via edit link for Bo)"
    r = bo.post("/d/save", data=_form(design, design_id=other, base_revision=1), headers=h)
    assert r.status_code == 403 or "only the design" in r.text
    r = bo.post("/d/save", data=_form(design), headers=h)  # a new design: no
    assert "only the design" in r.text
    assert bo.post("/api/designs", json=design, headers=h).status_code == 403


def test_the_design_page_lists_its_links(client, design):
    did = client.post("/api/designs", json=design).json()["id"]  # an open server
    r = client.post(f"/d/{did}/links", data={"role": "view", "link_label": "<b>Bo</b>"},
                    headers={"HX-Request": "true"})
    assert r.status_code == 200 and 'id="new-link"' in r.text and "/s/" in r.text
    assert "&lt;b&gt;Bo&lt;/b&gt;" in r.text
    for page in (f"/d/{did}", f"/d/{did}/revisions", f"/d/{did}/r/1"):
        html = client.get(page).text
        assert 'id="share-links"' in html and "&lt;b&gt;Bo&lt;/b&gt;" in html, page
        assert 'id="new-link"' not in html  # the address is shown once only
    link_id = client.get(f"/api/designs/{did}/links").json()["links"][0]["id"]
    r = client.post(f"/d/{did}/links/{link_id}/revoke", headers={"HX-Request": "true"})
    assert r.status_code == 200 and "1 revoked link" in r.text
    bad = client.post(f"/api/designs/{did}/links", json={"role": "owner"})
    assert bad.status_code == 422


# --- cross-site requests -----------------------------------------------------------------------

def test_a_cross_origin_form_post_is_refused(client, design):
    form = _form(design)
    for headers in ({"Origin": "http://evil.example"}, {"Origin": "null"},
                    {"Referer": "http://evil.example/page"},
                    {"Origin": "http://testserver:8080"}, {"Origin": "https://testserver"}):
        r = client.post("/d/save", data=form, headers=headers)
        assert r.status_code == 403 and "another web site" in r.text, headers
    did = client.post("/api/designs", json=design).json()["id"]
    r = client.post(f"/api/designs/{did}/revisions", json={"design": design},
                    headers={"Origin": "http://evil.example"})
    assert r.status_code == 403
    assert client.get(f"/api/designs/{did}").json()["revision"] == 1
    # the same origin, and a client that sends no Origin (a script), keep working
    assert client.post("/d/save", data=form, headers={"Origin": "http://testserver"}).status_code == 200
    assert client.post("/d/save", data=form, headers={"Referer": "http://testserver/d/x"}).status_code == 200
    assert client.post("/d/save", data=form).status_code == 200


def test_json_routes_take_json_only(client, design):
    import json

    did = client.post("/api/designs", json=design).json()["id"]
    body = json.dumps({"design": design, "base_revision": 1})
    for ctype in ("text/plain", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", None):
        headers = {"Content-Type": ctype} if ctype else {}
        r = client.post(f"/api/designs/{did}/revisions", content=body, headers=headers)
        assert r.status_code == 415 and "application/json" in r.json()["detail"], ctype
    for path in ("/api/designs", "/api/solve", "/api/study", "/api/arrangements"):
        r = client.post(path, content=json.dumps(design), headers={"Content-Type": "text/plain"})
        assert r.status_code == 415, path
    assert client.get(f"/api/designs/{did}").json()["revision"] == 1
    r = client.post(f"/api/designs/{did}/revisions", content=body,
                    headers={"Content-Type": "application/json; charset=utf-8"})
    assert r.status_code == 201


def test_behind_tls_the_session_cookie_is_secure(store, db_location):
    from fastapi.testclient import TestClient

    from app.main import create_app
    from app.settings import Settings, get_settings

    _add_account(store)
    app = create_app()
    app.dependency_overrides[get_settings] = lambda: Settings(db=str(db_location))
    tls = TestClient(app, base_url="https://testserver")
    r = tls.post("/login", data={"name": "ann", "password": PASSWORD}, follow_redirects=False)
    assert r.status_code == 303 and "Secure" in r.headers["set-cookie"]
