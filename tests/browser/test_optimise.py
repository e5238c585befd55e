"""The search page in headless Chromium: open it from the editor, run a search, see the front
plotted with the current design marked, take a point into the editor as a new working copy."""
from __future__ import annotations

import pytest

pytestmark = pytest.mark.browser


def test_search_from_the_editor_to_a_front_point_and_back(live_server, page, artifacts):
    page.goto(live_server + "/")
    page.wait_for_selector("html[data-ready='1']")
    page.click("#open-search")
    page.wait_for_url("**/optimise?d=*")
    assert "Demo: mixer drive countershaft" in page.inner_text("#h-search")
    # the pulley seat's diameter (segment 1) and support B's dimension series
    rows = page.locator("#search-vars tbody tr")
    labels = rows.all_inner_texts()
    k_d = next(i for i, t in enumerate(labels) if "diameter of segment 1 [mm]" in t)
    k_s = next(i for i, t in enumerate(labels) if "dimension series at B" in t)
    rows.nth(k_d).locator("input[name=bounds]").fill("24:36:1")
    rows.nth(k_d).locator("input[name=use]").check()
    rows.nth(k_s).locator("input[name=use]").check()
    page.uncheck("input[name=objective][value=bearing_space_mm2]")
    page.check("input[name=objective][value=fatigue_margin]")
    page.click("#run-search")
    page.wait_for_selector("html[data-front-drawn]", timeout=60000)
    n = int(page.get_attribute("html", "data-front-drawn"))
    assert n >= 5 and page.locator("#optimise-table tbody tr").count() == n
    assert "designs on the front" in page.inner_text("#optimise-summary")
    legend = " ".join(page.locator("#optimise-plot .legendtext").all_text_contents())
    assert "current design" in legend and "front" in legend
    assert page.locator("#optimise-plot .scatterlayer .trace").count() == 2  # front and the current design
    page.screenshot(path=str(artifacts / "optimise_page.png"), full_page=True)
    # bad bounds: the message names the variable
    rows.nth(k_d).locator("input[name=bounds]").fill("36:24")
    page.click("#run-search")
    page.wait_for_selector("#optimise-errors")
    assert "shaft.segments[0].d_mm" in page.inner_text("#optimise-errors")
    rows.nth(k_d).locator("input[name=bounds]").fill("24:36:1")
    page.click("#run-search")
    page.wait_for_selector("#optimise-table button.open-row")
    # the lightest design (first row): its pulley seat is the smallest on the front
    first = page.locator("#optimise-table tbody tr").first.inner_text()
    assert "diameter of segment 1: 32 →" in first
    with page.expect_navigation():
        page.locator("#optimise-table button.open-row").first.click()
    page.wait_for_selector("#design-form")
    d0 = float(page.input_value("#design-form [name='shaft.segments[0].d_mm']"))
    assert 24 <= d0 < 32
    # the one 422 is the answer to the bad bounds above
    assert [e for e in page.console_errors if "422" not in e] == [] and page.outside_requests == []


def test_a_long_search_shows_its_progress_and_stops_with_the_front_so_far(live_server, page, artifacts):
    """Continuous bounds: the search runs as a job; the page shows the designs solved, the
    generation and the time of the budget with a bar, polls, and the stop button ends it with
    the front of the designs solved so far drawn and tabled."""
    import re

    page.goto(live_server + "/optimise")
    rows = page.locator("#search-vars tbody tr")
    labels = rows.all_inner_texts()
    k_d = next(i for i, t in enumerate(labels) if "diameter of segment 1 [mm]" in t)
    k_b = next(i for i, t in enumerate(labels) if "position of support B [mm]" in t)
    rows.nth(k_d).locator("input[name=bounds]").fill("24:36")
    rows.nth(k_d).locator("input[name=use]").check()
    rows.nth(k_b).locator("input[name=use]").check()
    page.fill("input[name=budget]", "20")
    page.click("#run-search")
    page.wait_for_selector("#search-progress")
    label = page.locator("#search-progress label")
    # polled: a population solved shows up in the words and on the bar
    page.wait_for_function("() => /generation [1-9]/.test((document.querySelector('#search-progress label') || {}).textContent || '')",
                           timeout=30000)
    text = label.inner_text()
    assert re.search(r"Searching: \d+ designs solved, generation \d+ of 60, \d+ s of the 20 s budget", text), text
    assert int(page.get_attribute("#search-progress-bar", "value")) >= 1
    page.screenshot(path=str(artifacts / "optimise_progress.png"), full_page=True)
    page.click("#stop-search")
    page.wait_for_selector("html[data-front-drawn]", timeout=30000)
    n = int(page.get_attribute("html", "data-front-drawn"))
    summary = page.inner_text("#optimise-summary")
    assert "stopped on request after" in summary and "the front of the designs solved so far" in summary
    assert n >= 1 and page.locator("#optimise-table tbody tr").count() == n
    assert page.locator("#search-progress").count() == 0
    page.screenshot(path=str(artifacts / "optimise_stopped.png"), full_page=True)
    assert page.console_errors == [] and page.outside_requests == []
