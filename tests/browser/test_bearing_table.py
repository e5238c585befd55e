"""The designer's own bearing table in a real browser: load a .csv, see the candidates come
from it, load a broken one and see its message, go back to the bundled table.

The tables are invented for the test (the bundled illustrative rows renamed "STORES-…"; see
tests/web/test_bearing_table.py). Screenshots go to tests/artifacts/.
"""
from __future__ import annotations

import pytest
from playwright.sync_api import expect

from tests.web.test_bearing_table import bad_csv, own_csv

pytestmark = pytest.mark.browser


def _open(page, url):
    page.goto(url + "/")
    page.wait_for_selector("html[data-ready='1']")
    page.wait_for_selector("#plot .main-svg")


def _designations(page) -> list[str]:
    return page.locator("table.cands tbody tr td:nth-child(2)").all_text_contents()


def test_load_own_table_broken_table_and_back(page, live_server, artifacts, tmp_path):
    own = tmp_path / "stores-list.csv"
    own.write_text(own_csv(), encoding="utf-8")
    broken = tmp_path / "broken.csv"
    broken.write_text(bad_csv(), encoding="utf-8")

    _open(page, live_server)
    info = page.locator("#bt-info")
    expect(info).to_contain_text("bundled illustrative table")
    expect(page.locator("#bt-bundled")).to_be_hidden()
    expect(page.locator("#bt-source")).to_contain_text("candidates from: the bundled illustrative table")
    before = _designations(page)
    assert before and not any(d.startswith("STORES-") for d in before)

    # keyboard: the file input is reachable and labelled
    assert page.locator("label[for='bt-file']").inner_text().startswith("load your own table")
    page.focus("#op-add-supports")  # the last control of the supports section
    page.keyboard.press("Tab")
    assert page.evaluate("document.activeElement.id") == "bt-file"

    # 1. load our own table: the candidates become its rows
    page.set_input_files("#bt-file", str(own))
    expect(info).to_contain_text("stores-list.csv")
    expect(info).to_contain_text("your own")
    page.wait_for_selector("#status[data-state='fresh']")
    page.wait_for_function("() => [...document.querySelectorAll('table.cands tbody tr td:nth-child(2)')]"
                           ".every(td => td.textContent.startsWith('STORES-'))")
    after = _designations(page)
    assert after and all(d.startswith("STORES-") for d in after)
    expect(page.locator("#bt-source")).to_contain_text("candidates from: stores-list.csv")
    expect(page.locator("#bt-source")).to_contain_text("verify them with the supplier")
    expect(page.locator("details.bearing summary").first).to_contain_text("first choice STORES-")
    expect(page.locator("#bt-bundled")).to_be_visible()
    page.locator("details.bearing").first.evaluate("d => d.open = true")
    page.locator("#sec-bearing_table").screenshot(path=str(artifacts / "10-bearing-table-own.png"))
    page.screenshot(path=str(artifacts / "10-bearing-table-own-page.png"), full_page=True)

    # the working copy in this browser keeps it across a reload
    page.reload()
    page.wait_for_selector("html[data-ready='1']")
    page.locator("#restored").wait_for(state="visible")
    expect(page.locator("#bt-info")).to_contain_text("stores-list.csv")
    page.wait_for_selector("#status[data-state='fresh']")
    assert all(d.startswith("STORES-") for d in _designations(page))

    # 2. a broken table: its row and column beside the section, the last results kept
    page.set_input_files("#bt-file", str(broken))
    msg = page.locator("#m-bearing_table-csv")
    expect(msg).to_contain_text("row 3, column C_N")
    expect(msg).to_contain_text("lots")
    page.wait_for_selector("#status[data-state='stale']")
    expect(page.locator("#bt-info")).to_contain_text("broken.csv could not be read")
    expect(page.locator("#sec-bearing_table")).to_have_class("sec bt bad")
    assert all(d.startswith("STORES-") for d in _designations(page)), "the last good results stay"
    assert page.locator("[name='supports[0].x_mm']").input_value() != "", "the design is intact"
    page.locator("#sec-bearing_table").screenshot(path=str(artifacts / "11-bearing-table-broken.png"))
    # the status list's link takes the keyboard to the file input
    page.locator("#status a[data-path='bearing_table.csv']").first.click()
    assert page.evaluate("document.activeElement.id") == "bt-file"

    # 3. back to the bundled table
    page.locator("#bt-bundled").click()
    expect(page.locator("#bt-info")).to_contain_text("bundled illustrative table")
    page.wait_for_selector("#status[data-state='fresh']")
    expect(msg).to_be_empty()
    page.wait_for_function("() => ![...document.querySelectorAll('table.cands tbody tr td:nth-child(2)')]"
                           ".some(td => td.textContent.startsWith('STORES-'))")
    assert _designations(page) == before
    expect(page.locator("#bt-bundled")).to_be_hidden()
    assert page.evaluate("document.activeElement.id") == "bt-file", "focus stays in the section"
    expect(page.locator("#bt-source")).to_contain_text("not any supplier's data")
    assert page.outside_requests == []
    # a design that does not validate is answered 422 on purpose; the browser logs that
    assert [e for e in page.console_errors if "status of 422" not in e] == []
