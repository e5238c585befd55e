"""The study page in headless Chromium (the session's browser and server, tests/browser/conftest.py): open it from the editor, run a study, see the plot
with the current design marked, pick a variant, take it into the design."""
from __future__ import annotations

import pytest

from tests.browser.conftest import ARTIFACTS

pytestmark = pytest.mark.browser


def test_study_from_the_editor_to_a_variant_and_back(live_server, browser):
    server = live_server
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
