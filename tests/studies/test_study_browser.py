"""The study page in headless Chromium: open it from the editor, run a study, see the plot
with the current design marked, pick a variant, take it into the design."""
from __future__ import annotations

import os

import pytest

from tests.browser.conftest import ARTIFACTS, CHROMIUM, CHROMIUM_ARGS, start_server, stop_server

pytestmark = pytest.mark.browser


@pytest.fixture(scope="module")
def server(tmp_path_factory):
    proc, url = start_server({"SHAFTWRIGHT_DB": str(tmp_path_factory.mktemp("db") / "s.db")})
    yield url
    stop_server(proc)


@pytest.fixture(scope="module")
def browser():
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        if os.environ.get("CI", "").lower() == "true":
            pytest.fail("playwright missing")
        pytest.skip("playwright missing")
    if not os.path.exists(CHROMIUM):
        pytest.skip("no chromium")
    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
        yield b
        b.close()


def test_study_from_the_editor_to_a_variant_and_back(server, browser):
    ARTIFACTS.mkdir(parents=True, exist_ok=True)
    page = browser.new_page(viewport={"width": 1400, "height": 1000})
    errors, outside = [], []
    page.on("console", lambda m: errors.append(m.text) if m.type == "error" else None)
    page.on("request", lambda r: outside.append(r.url) if not r.url.startswith(server) and not r.url.startswith("data:") else None)
    page.goto(server + "/")
    page.wait_for_selector("html[data-ready='1']")
    page.click("#open-study")
    page.wait_for_url("**/study?d=*")
    page.wait_for_selector("html[data-ready='1']")
    assert "Demo: mixer drive countershaft" in page.inner_text("#h-study")
    page.select_option("#var1", "supports.B.x_mm")
    page.fill("#range1", "242:268:14")
    page.click("#run-study")
    page.wait_for_selector("html[data-study-drawn='1']", timeout=30000)
    assert "14 variants solved" in page.inner_text("#study-summary")
    titles = page.locator("#study-plot .infolayer text").all_text_contents()
    assert any("life" in t for t in titles) and any("critical" in t for t in titles)
    assert page.locator("#study-plot .shapelayer path").count() >= 3  # limits, feasible band, current design
    page.screenshot(path=str(ARTIFACTS / "study_page.png"), full_page=True)
    # a bad range: the message names the variable, the plot stays
    page.fill("#range1", "242:268")
    page.click("#run-study")
    page.wait_for_selector("#study-errors")
    assert "supports.B.x_mm" in page.inner_text("#study-errors")
    # arrangements
    page.click("#run-arrangements")
    page.wait_for_selector("#arr-table")
    assert page.locator("#arr-table tbody tr[data-key]").count() >= 12
    # run again and take the variant of the third row into the design
    page.fill("#range1", "242:268:14")
    page.click("#run-study")
    page.wait_for_selector("#study-table button.take-row")
    with page.expect_navigation():
        page.locator("#study-table button.take-row").nth(2).click()
    page.wait_for_selector("#design-form")
    assert page.input_value("#design-form [name='supports[1].x_mm']") == "246"
    # the bad range answered 422 on purpose (the message is swapped in); nothing else may fail
    assert [e for e in errors if "status of 422" not in e] == [], errors
    assert not outside, outside
    page.close()
