"""The designer's page in a real browser (Debian Chromium through Playwright).

Each test saves a screenshot to tests/artifacts/ for a designer to look at.
"""
from __future__ import annotations

import json

import pytest

pytestmark = pytest.mark.browser


def _open(page, url):
    page.goto(url + "/")
    page.wait_for_selector("html[data-ready='1']")
    page.wait_for_selector("#plot .main-svg")
    return page


def _element_index(page, eid: str) -> int:
    i = 0
    while page.locator(f"[name='elements[{i}].id']").count():
        if page.locator(f"[name='elements[{i}].id']").input_value() == eid:
            return i
        i += 1
    raise AssertionError(f"no element {eid}")


def _first_gear(page) -> int:
    i = 0
    while page.locator(f"[name='elements[{i}].kind']").count():
        if page.locator(f"[name='elements[{i}].kind']").input_value() == "gear":
            return i
        i += 1
    raise AssertionError("the demo has no gear")


def _reactions(page) -> str:
    return page.locator("table.reactions").first.inner_text()


def _plot_y(page, name="resultant", axis="y2"):
    return page.evaluate(
        """([name, axis]) => { const g = document.getElementById('plot');
             const t = g.data.find(t => t.name === name && t.yaxis === axis); return t ? Array.from(t.y) : null; }""",
        [name, axis])


def _wait_fresh(page):
    page.wait_for_selector("#status[data-state='fresh']")


def test_page_loads_complete_and_offline(page, live_server, artifacts):
    _open(page, live_server)
    assert page.locator("#drawing svg").count() == 1
    assert page.locator("table.reactions").count() >= 1
    assert page.locator(".caution").is_visible()
    assert "qualified engineer" in page.locator(".caution").inner_text()
    titles = page.locator("#plot .infolayer").first.text_content()
    for word in ("shear force", "bending moment", "torque", "deflection", "slope"):
        assert word in titles
    assert page.locator("#view-case option").count() >= 1
    page.screenshot(path=str(artifacts / "01-page.png"), full_page=True)
    assert page.outside_requests == [], "the page loads no file from outside the app"
    assert page.console_errors == []


def test_move_gear_changes_reactions_and_diagram(page, live_server, artifacts):
    _open(page, live_server)
    i = _first_gear(page)
    before_r = _reactions(page)
    before_m = _plot_y(page)
    x = page.locator(f"[name='elements[{i}].x_mm']")
    old = float(x.input_value())
    x.fill(f"{old - 20:g}")
    page.wait_for_function("(t) => document.querySelector('table.reactions').innerText !== t", arg=before_r)
    _wait_fresh(page)
    page.wait_for_function(
        """(b) => { const g = document.getElementById('plot'); const t = g.data.find(t => t.name === 'resultant' && t.yaxis === 'y2');
                   return JSON.stringify(Array.from(t.y)) !== b; }""", arg=json.dumps(before_m))
    assert _reactions(page) != before_r
    assert _plot_y(page) != before_m
    # the drawing moved the gear too
    assert x.input_value() == f"{old - 20:g}"
    page.screenshot(path=str(artifacts / "02-gear-moved.png"), full_page=True)
    assert page.console_errors == []


def test_invalid_value_message_beside_field_page_intact(page, live_server, artifacts):
    _open(page, live_server)
    before = _reactions(page)
    field = page.locator("[name='supports[1].x_mm']")
    field.fill("12o")
    msg = page.locator("#m-supports-1-x_mm")
    msg.wait_for(state="visible")
    assert "number" in msg.inner_text()
    assert field.input_value() == "12o", "what the user typed stays"
    assert field.get_attribute("aria-invalid") == "true"
    # the rest of the page is intact: last good results shown, marked out of date
    assert page.locator("#status[data-state='stale']").count() == 1
    assert "Out of date" in page.locator("#status").inner_text()
    assert _reactions(page) == before
    assert page.locator("#drawing svg").count() == 1
    assert page.locator("#plot .main-svg").count() >= 1
    assert page.locator("[name='supports[0].x_mm']").input_value() != ""
    page.screenshot(path=str(artifacts / "03-invalid-value.png"), full_page=True)
    # fixing it clears the message and brings fresh results
    field.fill("250")
    _wait_fresh(page)
    assert msg.inner_text() == ""


def test_add_third_support_gives_indeterminate_solution(page, live_server, artifacts):
    _open(page, live_server)
    page.locator("#op-add-supports").click()
    page.wait_for_selector("#row-supports-2")
    x = page.locator("[name='supports[2].x_mm']")
    assert page.evaluate("document.activeElement && document.activeElement.name") == "supports[2].x_mm"
    gear_x = float(page.locator(f"[name='elements[{_first_gear(page)}].x_mm']").input_value())
    x.fill(f"{gear_x + 30:g}")
    page.wait_for_function("(x) => [...document.querySelectorAll('table.reactions tr[data-support=\"C\"] td')]"
                           ".some(td => td.innerText === x)", arg=f"{gear_x + 30:g}")
    _wait_fresh(page)
    page.wait_for_selector("#indeterminate")
    assert "3 supports" in page.locator("#indeterminate").inner_text()
    rows = page.locator("table.reactions").first.locator("tbody tr")
    assert rows.count() == 3
    fr = [float(t.replace("\u2212", "-")) for t in rows.locator("td.fr").all_inner_texts()]
    assert all(v > 0 for v in fr), fr  # every support carries load
    page.screenshot(path=str(artifacts / "04-three-supports.png"), full_page=True)


def test_switch_units(page, live_server, artifacts):
    _open(page, live_server)
    si_x = float(page.locator("[name='supports[0].x_mm']").input_value())
    page.select_option("#units-switch", "us")
    page.wait_for_selector("input[name='units'][value='us']", state="attached")
    _wait_fresh(page)
    us_x = float(page.locator("[name='supports[0].x_mm']").input_value())
    assert abs(us_x * 25.4 - si_x) < 1e-3
    assert "[in]" in page.locator("label[for='f-supports-0-x_mm']").inner_text()
    assert "[lbf]" in page.locator("table.reactions").first.inner_text()
    titles = page.locator("#plot .infolayer").first.text_content()
    assert "lbf·ft" in titles
    page.screenshot(path=str(artifacts / "05-us-units.png"), full_page=True)


def test_drawing_part_takes_you_to_its_row_by_keyboard(page, live_server):
    _open(page, live_server)
    i = _first_gear(page)
    page.focus(f"a.sd-part[data-row='row-elements-{i}']")
    page.keyboard.press("Enter")
    inside = page.evaluate(f"document.activeElement.closest('#row-elements-{i}') !== null")
    assert inside


def test_tab_order_follows_layout(page, live_server):
    _open(page, live_server)
    order = []
    page.focus("#units-switch")
    for _ in range(60):
        page.keyboard.press("Tab")
        order.append(page.evaluate("""() => { const a = document.activeElement;
            return a.closest('#drawing') ? 'drawing' : a.closest('#design-form') ? 'editor' : a.closest('.results-col') ? 'results' : 'other'; }"""))
    firsts = [order.index(k) for k in ("drawing", "editor")]
    assert firsts == sorted(firsts)
    assert "results" not in order[: order.index("editor")]


def test_reload_keeps_working_copy(page, live_server):
    _open(page, live_server)
    page.locator("[name='name']").fill("my own countershaft")
    _wait_fresh(page)
    page.reload()
    page.wait_for_selector("html[data-ready='1']")
    page.wait_for_function("() => document.querySelector(\"[name='name']\").value === 'my own countershaft'")
    page.locator("#restored").wait_for(state="visible")


def test_change_kind_remove_and_reorder_rows(page, live_server, artifacts):
    _open(page, live_server)
    i = _first_gear(page)
    eid = page.locator(f"[name='elements[{i}].id']").input_value()
    page.select_option(f"[name='elements[{i}].kind']", "force")
    page.wait_for_selector(f"[name='elements[{i}].Fy_N']")
    assert page.locator(f"[name='elements[{i}].pitch_d_mm']").count() == 0
    assert page.locator(f"[name='elements[{i}].id']").input_value() == eid
    _wait_fresh(page)
    # reorder the load cases, then remove the last one: the duty cycle no longer sums to 1
    first = page.locator("[name='load_cases[0].name']").input_value()
    page.locator("#op-down-load_cases-0").click()
    page.wait_for_function("(n) => document.querySelector(\"[name='load_cases[1].name']\").value === n", arg=first)
    n = page.locator("[name$='].speed_rpm']").count()
    page.locator(f"#op-remove-load_cases-{n - 1}").click()
    page.wait_for_function(f"() => document.querySelectorAll(\"[name$='].speed_rpm']\").length === {n - 1}")
    if n > 2:  # fractions no longer sum to one: message at the duty-cycle section, results kept
        page.wait_for_selector("#m-sec-load_cases:not(:empty)")
        assert "sum" in page.locator("#m-sec-load_cases").inner_text()
        assert page.locator("#status[data-state='stale']").count() == 1
    page.screenshot(path=str(artifacts / "06-rows-edited.png"), full_page=True)


def test_load_case_selector_redraws_for_that_case(page, live_server):
    _open(page, live_server)
    names = page.locator("#view-case option").all_inner_texts()
    assert len(names) >= 2, "the demo design has several load cases"
    page.select_option("#view-case", names[-1])
    page.wait_for_function("(n) => document.getElementById('plot').layout.meta.load_case === n", arg=names[-1])
    assert names[-1] in page.locator("#drawing svg").text_content()


def test_keyboard_only_add_part(page, live_server):
    _open(page, live_server)
    page.focus("#add-kind")
    page.select_option("#add-kind", "coupling")
    page.keyboard.press("Tab")
    assert page.evaluate("document.activeElement.id") == "op-add-elements"
    page.keyboard.press("Enter")
    page.wait_for_function("() => document.activeElement && /^elements\\[\\d+\\]\\.x_mm$/.test(document.activeElement.name)")
    name = page.evaluate("document.activeElement.name")
    idx = name.split("[")[1].split("]")[0]
    assert page.locator(f"[name='elements[{idx}].kind']").input_value() == "coupling"


def test_docs_page_loads_nothing_from_outside(page, live_server):
    page.goto(live_server + "/docs")
    assert "/api/solve" in page.content()
    assert page.outside_requests == []
    assert page.console_errors == []


def _box(page, sel):
    return page.locator(sel).first.bounding_box()


def test_results_summary_first_diagrams_next_details_by_keyboard(page, live_server, artifacts):
    _open(page, live_server)
    verdict = page.locator("#verdict")
    assert verdict.is_visible()
    assert "failing" in verdict.inner_text() and "passing" in verdict.inner_text()
    topics = page.locator("#summary tr.gov").evaluate_all("rs => rs.map(r => r.dataset.topic)")
    for t in ("bearing.life", "bearing.static", "shaft.fatigue", "shaft.yield", "shaft.critical_speed"):
        assert t in topics, topics
    # reading order: summary, diagrams, reactions, bearings, every check
    tops = [_box(page, s)["y"] for s in ("#summary", "#plot", "table.reactions", "#h-brg", "#all-checks")]
    assert tops == sorted(tops), tops
    # the diagrams start within about one screen below the summary, not after every table
    assert _box(page, "#plot")["y"] - (_box(page, "#summary")["y"] + _box(page, "#summary")["height"]) < 200
    # every source is one line until it is opened
    heights = page.locator("#summary .srcline").evaluate_all("els => els.map(e => e.getBoundingClientRect().height)")
    assert heights and max(heights) < 20, heights
    # a folded family opens with the keyboard, and stays open across a live edit
    more = page.locator("details.more").first
    more_id = more.get_attribute("id")
    assert more.get_attribute("open") is None
    page.focus(f"#{more_id} > summary")
    page.keyboard.press("Enter")
    page.wait_for_function("(id) => document.getElementById(id).open", arg=more_id)
    assert page.locator(f"#{more_id} table.folded tbody tr").first.is_visible()
    before = page.locator("#all-checks").inner_text()
    i = _first_gear(page)
    x = page.locator(f"[name='elements[{i}].x_mm']")
    x.fill(f"{float(x.input_value()) - 15:g}")
    page.wait_for_function("(t) => document.getElementById('all-checks').innerText !== t", arg=before)
    _wait_fresh(page)
    page.wait_for_function("(id) => document.getElementById(id) && document.getElementById(id).open", arg=more_id)
    # a one-line source opens to its full text with the keyboard
    src = page.locator("#summary details.src").first
    assert not src.locator("p").is_visible()
    line = src.locator("summary").inner_text().replace("source:", "").strip().rstrip("…").strip()
    src.locator("summary").focus()
    page.keyboard.press("Enter")
    full = src.locator("p")
    full.wait_for(state="visible")
    assert full.inner_text().startswith(line) and len(full.inner_text()) > len(line)
    # the jump links work from the keyboard
    page.focus("#summary nav.jump a[href='#h-checks']")
    page.keyboard.press("Enter")
    page.wait_for_function("() => location.hash === '#h-checks'")
    top = page.evaluate("document.getElementById('h-checks').getBoundingClientRect().top")
    assert 0 <= top < 200
    assert page.console_errors == []


@pytest.mark.parametrize("width", [1440, 1024])
def test_results_column_fits_its_width(browser, live_server, artifacts, width):
    ctx = browser.new_context(viewport={"width": width, "height": 1000}, device_scale_factor=1)
    pg = ctx.new_page()
    try:
        _open(pg, live_server)
        col = pg.locator(".results-col")
        # nothing in the results column is wider than the column (no sideways scrolling)
        wide = pg.evaluate("""() => [...document.querySelectorAll('.results-col .tablewrap')]
            .filter(w => w.scrollWidth > w.clientWidth + 1).map(w => w.querySelector('table').className)""")
        assert wide == [], wide
        # value and limit never split from their unit
        split = pg.evaluate("""() => [...document.querySelectorAll('.results-col td.n .val')]
            .filter(e => e.getClientRects().length > 1 || e.getBoundingClientRect().height > 20).map(e => e.textContent)""")
        assert split == [], split
        pg.screenshot(path=str(artifacts / f"07-results-{width}.png"), full_page=True)
        col.screenshot(path=str(artifacts / f"08-results-column-{width}.png"))
    finally:
        ctx.close()


def test_failing_check_goes_to_the_top_after_an_edit(page, live_server, artifacts):
    _open(page, live_server)
    life = page.locator("[name='requirements.life_h']")
    life.fill("5000000")  # far beyond what the demo's bearings give: their life checks fail
    page.wait_for_selector("#verdict.v-fail")
    _wait_fresh(page)
    assert "fail" in page.locator("#verdict strong").inner_text()
    first = page.locator("#summary tr.gov").first
    assert "st-fail" in first.get_attribute("class")
    assert first.get_attribute("data-topic") == "bearing.life"
    statuses = page.locator("#summary tr.gov").evaluate_all(
        "rs => rs.map(r => ['st-fail', 'st-warn', 'st-ok'].findIndex(c => r.classList.contains(c)))")
    assert statuses == sorted(statuses)
    fams = page.locator("#all-checks section.family").evaluate_all("s => s.map(x => x.dataset.family)")
    assert fams[0] == "bearings"
    # the failing rows are shown, not folded
    shown = page.locator("#fam-bearings > .tablewrap tr.st-fail")
    assert shown.count() >= 1 and shown.first.is_visible()
    page.screenshot(path=str(artifacts / "09-results-failing.png"), full_page=True)


def test_print_opens_the_folds_and_restores_them(page, live_server):
    _open(page, live_server)
    n = page.locator("#results-detail details.more:not([open])").count()
    assert n >= 1
    page.evaluate("window.dispatchEvent(new Event('beforeprint'))")
    assert page.locator("#results-detail details.more:not([open])").count() == 0
    page.evaluate("window.dispatchEvent(new Event('afterprint'))")
    assert page.locator("#results-detail details.more:not([open])").count() == n


def test_requirements_show_lubricant_contamination_and_defaults(page, live_server, artifacts):
    _open(page, live_server)
    sec = page.locator("#sec-requirements")
    grade = page.locator("[name='requirements.lubricant.iso_vg']")
    temp = page.locator("[name='requirements.lubricant.operating_temp_C']")
    assert "[mm²/s at 40 °C]" in page.locator("label[for='f-requirements-lubricant-iso_vg']").inner_text()
    assert "[°C]" in page.locator("label[for='f-requirements-lubricant-operating_temp_C']").inner_text()
    assert page.locator("#n-requirements-contamination_ec").is_visible()
    assert "1\u00a0extreme\u00a0cleanliness" in page.locator("#n-requirements-contamination_ec").inner_text()
    assert page.locator("[name='requirements.fatigue_safety_min']").get_attribute("placeholder").startswith("default ")
    # every box of the section lies inside the editor column (nothing cut off or overlapping)
    col = _box(page, ".editor-col")
    for b in sec.locator("input").evaluate_all("els => els.map(e => e.getBoundingClientRect().toJSON())"):
        assert col["x"] <= b["x"] and b["x"] + b["width"] <= col["x"] + col["width"] + 1
    sec.scroll_into_view_if_needed()
    sec.screenshot(path=str(artifacts / "10-requirements.png"))
    # a temperature without a grade: the message names the missing box, beside it
    old = grade.input_value()
    grade.fill("")
    msg = page.locator("#m-requirements-lubricant-iso_vg")
    msg.wait_for(state="visible")
    assert "ISO VG grade is needed with the operating temperature" in msg.inner_text()
    assert grade.get_attribute("aria-invalid") == "true"
    assert page.locator("#status[data-state='stale']").count() == 1
    # both empty: no aISO, and the design solves again
    temp.fill("")
    _wait_fresh(page)
    assert msg.inner_text() == ""
    grade.fill(old)
    temp.fill("60")
    _wait_fresh(page)
    # the invalid states were answered with 422, as designed; nothing else went wrong
    assert [e for e in page.console_errors if "422" not in e] == []


def test_add_load_case_keeps_the_design_solvable(page, live_server, artifacts):
    _open(page, live_server)
    n = page.locator("[name$='].speed_rpm'][name^='load_cases']").count()
    page.locator("#op-add-load_cases").click()
    page.wait_for_selector(f"#row-load_cases-{n}")
    _wait_fresh(page)
    assert page.locator("#m-sec-load_cases").inner_text() == ""
    shares = [float(page.locator(f"[name='load_cases[{i}].time_fraction']").input_value()) for i in range(n + 1)]
    assert sum(shares) == pytest.approx(1.0, abs=1e-9)
    assert page.evaluate("document.activeElement && document.activeElement.name") == f"load_cases[{n}].name"
    page.wait_for_function("(n) => [...document.querySelectorAll('#view-case option')].length === n", arg=n + 1)
    page.locator(f"#row-load_cases-{n}").screenshot(path=str(artifacts / "11-new-load-case.png"))
    assert page.console_errors == []
