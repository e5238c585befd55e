"""In Chromium: hostile ids run no script on any page, the policy reports nothing, and a team
server asks for a sign-in, saves with the form token, and serves a read-only link.

Every page is watched three ways: dialogs (``alert`` and friends), the page's
``securitypolicyviolation`` events (a report means markup got into the page and the CSP
stopped it: both are failures here), and console errors (the ``page`` fixture).
"""
from __future__ import annotations

import json
import urllib.request

import pytest
from playwright.sync_api import expect

from app import auth
from app.routers.studies import encode_design
from app.security import CSP
from app.store import open_store
from tests.browser.conftest import start_server, stop_server
from tests.conftest import load_sample

WATCH = """
window.__csp = [];
document.addEventListener('securitypolicyviolation', function (e) {
  window.__csp.push(e.violatedDirective + ' ' + e.blockedURI + ' ' + (e.sample || ''));
});
"""
# payloads for every text a designer types that a page shows or sends to a chart
P_SCRIPT = "</script><img src=x onerror=alert(1)>"
P_SVG = '"><svg onload=alert(2)>'
P_ATTR = "' onmouseover='alert(3)' x='"


def _hostile() -> dict:
    d = load_sample("countershaft.json")
    d["name"] = P_SCRIPT + " name"
    d["notes"] = P_SVG + " notes"
    d["shaft"]["material"]["name"] = P_ATTR + " steel"
    for s in d["supports"]:
        s["id"] = P_SCRIPT[:34] + s["id"]
    for e in d["elements"]:
        e["id"] = P_SVG + e["id"]
    for c in d["load_cases"]:
        c["name"] = "\u2028" + P_ATTR + c["name"]
    return d


def _watch(page):
    page.dialogs = []
    page.on("dialog", lambda d: (page.dialogs.append(d.message), d.dismiss()))
    page.add_init_script(WATCH)


def _clean(page, where: str) -> None:
    csp = page.evaluate("window.__csp || []")
    injected = page.evaluate("document.querySelectorAll('[onerror],[onload],[onmouseover],img[src=x]').length")
    assert page.dialogs == [], (where, page.dialogs)
    assert csp == [], (where, csp)
    assert injected == 0, where
    assert page.console_errors == [], (where, page.console_errors)


def _post_json(url: str, body: dict, headers: dict | None = None) -> dict:
    req = urllib.request.Request(url, data=json.dumps(body).encode(), method="POST",
                                 headers={"Content-Type": "application/json", **(headers or {})})
    with urllib.request.urlopen(req, timeout=30) as r:
        return json.loads(r.read())


def test_hostile_ids_run_no_script_on_any_page(page, live_server):
    _watch(page)
    d = _hostile()
    saved = _post_json(live_server + "/api/designs", {"design": d, "author": P_SVG, "comment": P_SCRIPT})
    did = saved["id"]
    _post_json(live_server + f"/api/designs/{did}/revisions",
               {"design": {**d, "name": P_ATTR}, "base_revision": 1, "author": P_SCRIPT})
    pages = [f"/d/{did}", f"/d/{did}/r/1", f"/d/{did}/r/2", f"/d/{did}/revisions",
             f"/d/{did}/compare?a=1&b=2", f"/d/{did}/r/1/note", "/study?d=" + encode_design(d),
             "/docs", "/login"]
    for path in pages:
        page.goto(live_server + path)
        page.wait_for_load_state("networkidle")
        _clean(page, path)
    # the editor: a live edit swaps in new results, drawing and chart data
    page.goto(live_server + f"/d/{did}")
    page.wait_for_selector("html[data-ready='1']")
    page.wait_for_selector("#plot .main-svg")
    page.fill("#f-supports-1-x_mm", "221")
    page.wait_for_timeout(1200)
    page.locator("#plot").hover()
    _clean(page, "editor after a live edit")
    # the study result (the break-out of issue 16) and the arrangement comparison
    page.goto(live_server + "/study?d=" + encode_design(d))
    page.wait_for_selector("html[data-ready='1']")
    page.select_option("#var1", "shaft.segments[1].d_mm")
    page.click("#run-study")
    page.wait_for_selector("html[data-study-drawn='1']")
    expect(page.locator("#study-plot")).to_contain_text("life " + P_SCRIPT[:34] + "A")
    page.locator("#study-plot").hover()
    page.click("#run-arrangements")
    page.wait_for_selector("#arrangements table")
    _clean(page, "study result")


def test_no_server_header_and_the_policy_on_a_live_server(live_server):
    with urllib.request.urlopen(live_server + "/", timeout=30) as r:
        assert r.headers.get("server") is None
        assert r.headers.get("content-security-policy") == CSP


@pytest.fixture
def team_server(tmp_path):
    db = tmp_path / "team.db"
    open_store.__wrapped__(str(db)).add_account("ann", auth.hash_password("ann's password"))
    proc, url = start_server({"SHAFTWRIGHT_DB": str(db)})
    try:
        yield url
    finally:
        stop_server(proc)


def test_team_server_sign_in_save_and_a_read_only_link(browser, page, team_server):
    _watch(page)
    page.goto(team_server + "/")
    expect(page).to_have_url(team_server + "/login?next=%2F")
    page.fill("input[name=name]", "ann")
    page.fill("input[name=password]", "wrong")
    page.click("button[type=submit]")
    expect(page.locator("body")).to_contain_text("not right")
    page.console_errors.clear()  # the refused sign-in answers 401, which the console reports
    page.fill("input[name=password]", "ann's password")
    page.click("button[type=submit]")
    page.wait_for_selector("html[data-ready='1']")
    expect(page.locator(".account-bar")).to_contain_text("ann")
    page.fill("#f-name", "Team design (invented)")  # a live solve, with the form token
    page.wait_for_timeout(800)
    page.click("#share-save")
    expect(page.locator(".share-ok")).to_contain_text("Saved as revision 1")
    page.click("#make-view-link")
    link = page.locator("#new-link")
    expect(link).to_be_visible()
    url = link.get_attribute("href")
    _clean(page, "signed-in editor")
    # a plain form (the study's "take this variant") carries the form token too
    page.click("#open-study")
    page.wait_for_url("**/study?d=*")
    page.wait_for_selector("html[data-ready='1']")
    page.click("#run-study")
    page.wait_for_selector("html[data-study-drawn='1']")
    page.locator("button.take-row").first.click()
    page.wait_for_url("**/study/apply")
    page.wait_for_selector("#design-form")
    _clean(page, "a variant taken into the design")

    ctx = browser.new_context(viewport={"width": 1440, "height": 1000})
    other = ctx.new_page()
    other.console_errors = []
    other.on("console", lambda m: m.type == "error" and other.console_errors.append(m.text))
    _watch(other)
    try:
        other.goto(url)
        expect(other.locator("h1")).to_have_text("Team design (invented)")
        expect(other.locator("body")).to_contain_text("read-only link")
        assert other.locator("#share-save").count() == 0
        other.click("text=design note (print)")
        expect(other.locator("h1")).to_contain_text("Design note")
        _clean(other, "read-only link")
    finally:
        ctx.close()
