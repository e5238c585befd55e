"""The designer's own bearing table on the editor page (server side).

The tables here are invented for the tests: the bundled illustrative table's deep groove and
cylindrical roller rows under designations of our own ("STORES-…"), so that a candidate's
designation tells which table it came from. No value is a check value: these are behaviour
tests of the page (which table is used, where its messages go, what travels with the design).
"""
from __future__ import annotations

import html
import json
import re

import engine
from app import web
from app.routers.pages import demo_design, solve_form
from engine.bearings.catalogue import BUNDLED_PATH

TYPES = ("deep_groove_ball", "cylindrical_roller")  # the demo design's two supports


def own_csv(prefix: str = "STORES-") -> str:
    """Header and the demo's bearing types from the bundled table, renamed ``prefix``…"""
    lines = [ln for ln in BUNDLED_PATH.read_text(encoding="utf-8").splitlines() if not ln.startswith("#")]
    rows = [ln for ln in lines[1:] if ln.split(",")[1] in TYPES]
    return "\n".join([lines[0]] + [prefix + r for r in rows]) + "\n"


def bad_csv() -> str:
    """Row 3 (line 3 of the file) has C_N "lots": the message must name row 3 and C_N."""
    lines = own_csv().splitlines()
    cells = lines[2].split(",")
    cells[lines[0].split(",").index("C_N")] = "lots"
    lines[2] = ",".join(cells)
    return "\n".join(lines) + "\n"


def _with_table(csv: str, name: str = "stores-list.csv") -> dict:
    d = demo_design()
    d["bearing_table"] = {"name": name, "csv": csv}
    return d


def _issue_slots(text: str) -> dict:
    m = re.search(r'<script type="application/json" id="issue-data"[^>]*>(.*?)</script>', text, re.S)
    assert m, "no issue data in the response"
    return json.loads(m.group(1))


def _hidden(text: str, name: str) -> str:
    m = re.search(rf'<input type="hidden" id="[^"]*" name="{re.escape(name)}" value="([^"]*)"', text)
    assert m, f"no hidden field {name}"
    return html.unescape(m.group(1))


# --- form round trip -----------------------------------------------------------------------

def test_form_round_trip_keeps_the_bearing_table():
    d = _with_table(own_csv())
    form = web.design_to_form(d)
    assert form["bearing_table.name"] == "stores-list.csv"
    assert form["bearing_table.csv"] == own_csv()
    assert "bearing_table" not in json.loads(form.get("_extra", "{}")), "not also in _extra"
    back, issues = web.form_to_design(form)
    assert issues == []
    assert back["bearing_table"] == d["bearing_table"]
    assert engine.parse_design(back).model_dump() == engine.parse_design(d).model_dump()


def test_round_trip_in_us_units_and_after_a_structural_edit():
    form = web.design_to_form(_with_table(own_csv()), "us")
    form, _ = web.apply_op(form, "add:supports")
    form, _ = web.apply_op(form, "units:si")
    back, _ = web.form_to_design(form)
    assert back["bearing_table"]["csv"] == own_csv()


def test_browser_line_ends_are_normalised():
    form = web.design_to_form(_with_table(own_csv()))
    form["bearing_table.csv"] = form["bearing_table.csv"].replace("\n", "\r\n")  # as a form posts it
    back, _ = web.form_to_design(form)
    assert back["bearing_table"]["csv"] == own_csv()


def test_no_table_means_the_bundled_one_and_other_keys_survive():
    form = web.design_to_form(demo_design())
    assert form["bearing_table.csv"] == "" and form["bearing_table.name"] == ""
    back, _ = web.form_to_design(form)
    assert "bearing_table" not in back
    d = _with_table(own_csv())
    d["bearing_table"]["supplier_note"] = "from the stores list, 2026"  # a key the form does not show
    back, _ = web.form_to_design(web.design_to_form(d))
    assert back["bearing_table"]["supplier_note"] == "from the stores list, 2026"


def test_a_name_without_text_is_an_empty_file():
    form = web.design_to_form(demo_design())
    form["bearing_table.name"] = "empty.csv"
    _, issues = web.form_to_design(form)
    assert [(i.path, "empty.csv is empty" in i.message) for i in issues] == [("bearing_table.csv", True)]


# --- the page ------------------------------------------------------------------------------

def test_page_shows_the_bundled_table_and_the_template_link(client):
    t = client.get("/").text
    n_bundled = sum(1 for ln in BUNDLED_PATH.read_text(encoding="utf-8").splitlines()[1:]
                    if ln.strip() and not ln.startswith("#")) - 1  # less the header line
    assert 'id="sec-bearing_table"' in t
    assert f"bundled illustrative table</strong>, {n_bundled} rows" in t
    assert 'id="bt-file"' in t and '<label for="bt-file"' in t, "the file input is labelled"
    assert 'href="/bearing-table.csv"' in t
    assert re.search(r'id="bt-bundled"[^>]*hidden', t), "nothing to go back from"
    # the section sits between the supports and the parts on the shaft
    assert t.index('id="sec-supports"') < t.index('id="sec-bearing_table"') < t.index('id="sec-elements"')
    assert "candidates from: the bundled illustrative table" in t
    assert "not any supplier's data" in t


def test_bundled_table_downloads_as_a_template(client):
    r = client.get("/bearing-table.csv")
    assert r.status_code == 200
    assert r.headers["content-type"].startswith("text/csv")
    assert "attachment" in r.headers.get("content-disposition", "")
    assert r.content == BUNDLED_PATH.read_bytes()


def test_candidates_come_from_the_own_table(client):
    form = web.design_to_form(_with_table(own_csv()))
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 200
    ctx = solve_form(form)
    designations = [c.designation for b in ctx["result"].bearings for c in b.candidates]
    assert designations and all(d.startswith("STORES-") for d in designations)
    assert "STORES-" in r.text
    # the section's line (swapped out of band) and the results name the table
    assert re.search(r'id="bt-info"[^>]*hx-swap-oob="true"', r.text)
    n_own = own_csv().count("\n") - 1
    assert f"stores-list.csv</strong>, {n_own} rows — your own" in r.text
    assert "candidates from: <strong>stores-list.csv</strong>" in r.text
    assert "your responsibility: verify them with the supplier" in r.text


def test_bad_table_message_names_row_and_column_at_the_section(client):
    form = web.design_to_form(_with_table(bad_csv(), "broken.csv"))
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 422
    slots = _issue_slots(r.text)
    msgs = slots.get("m-bearing_table-csv")
    assert msgs and any("row 3, column C_N" in m and "lots" in m for m in msgs), slots
    assert 'data-state="stale"' in r.text, "marked out of date"
    assert 'id="results"' not in r.text, "the last good results stay on the page"
    assert "broken.csv</strong> could not be read" in r.text
    # and the whole page (a reload, a share link) shows it beside the section too
    page = client.post("/editor/op", data={**form, "op": "restore"})
    assert page.status_code == 422
    sec = page.text[page.text.index('id="sec-bearing_table"'):]
    sec = sec[:sec.index("</fieldset>")]
    assert "row 3, column C_N" in sec
    assert _hidden(page.text, "bearing_table.csv").replace("\r\n", "\n") == bad_csv(), "the user's table is kept"


def test_bad_table_is_reported_even_when_another_field_is_wrong(client):
    form = web.design_to_form(_with_table(bad_csv(), "broken.csv"))
    form["supports[1].x_mm"] = "12o"
    r = client.post("/editor/solve", data=form)
    slots = _issue_slots(r.text)
    assert "m-supports-1-x_mm" in slots
    assert any("row 3, column C_N" in m for m in slots["m-bearing_table-csv"])


def test_a_bearing_table_that_is_not_a_table_never_crashes(client):
    d = demo_design()
    d["bearing_table"] = "my table"  # a hand-edited file
    form = web.design_to_form(d)
    assert "bearing_table" in json.loads(form["_extra"]), "kept, not silently dropped"
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 422
    assert _issue_slots(r.text).get("m-bearing_table-csv")
    for csv in ("", "\n\n", "just one line", "a,b\n1,2\n", "designation\n" + "x\n" * 5, "\x00,\ufeff\n"):
        form = web.design_to_form(_with_table("x"))
        form["bearing_table.csv"] = csv
        form["bearing_table.name"] = "odd.csv"
        r = client.post("/editor/solve", data=form)
        assert r.status_code in (200, 422), csv
        if r.status_code == 422:
            assert _issue_slots(r.text).get("m-bearing_table-csv"), csv


def test_save_and_reopen_the_share_link_keeps_the_table(client):
    form = web.design_to_form(_with_table(own_csv()))
    form.update(share_author="test", share_comment="own table")
    r = client.post("/d/save", data=form, headers={"HX-Request": "true"})
    assert r.status_code == 200 and r.headers["X-Shaftwright-Status"] == "200", r.text[:500]
    link = re.search(r'id="share-link" href="([^"]+)"', r.text).group(1)
    page = client.get(link)
    assert page.status_code == 200
    assert _hidden(page.text, "bearing_table.name") == "stores-list.csv"
    assert _hidden(page.text, "bearing_table.csv") == own_csv()
    assert "stores-list.csv</strong>, " in page.text and "STORES-" in page.text
    design_id = link.rsplit("/", 1)[1]
    exported = client.get(f"/api/designs/{design_id}/revisions/1/export")
    assert exported.status_code == 200
    assert json.loads(exported.content)["bearing_table"] == {"name": "stores-list.csv", "csv": own_csv()}
    # a second revision saved from the reopened page still carries it
    form2 = web.design_to_form(json.loads(exported.content))
    form2.update(share_design_id=design_id, share_base_revision="1", share_comment="again")
    r2 = client.post("/d/save", data=form2, headers={"HX-Request": "true"})
    assert "Saved as revision 2" in r2.text
    rev2 = client.get(f"/api/designs/{design_id}/revisions/2/export")
    assert json.loads(rev2.content)["bearing_table"]["csv"] == own_csv()


def test_many_problems_show_the_first_ten_one_per_line(client):
    lines = own_csv().splitlines()
    i = lines[0].split(",").index("C_N")
    bad = [lines[0]] + [",".join(c if k != i else "?" for k, c in enumerate(ln.split(","))) for ln in lines[1:31]]
    form = web.design_to_form(_with_table("\n".join(bad) + "\n", "thirty-bad.csv"))
    page = client.post("/editor/op", data={**form, "op": "restore"})
    m = re.search(r'id="m-bearing_table-csv"[^>]*>(.*?)</span>', page.text, re.S)
    shown = html.unescape(m.group(1)).split("\n")
    assert len(shown) == 11 and shown[0].startswith("row 2, column C_N")
    assert shown[-1] == "… and 20 more: fix these first."
    assert 'class="sec bt bad"' in page.text


def test_a_byte_order_mark_from_a_spreadsheet_is_dropped(client):
    form = web.design_to_form(_with_table(own_csv()))
    form["bearing_table.csv"] = "\ufeff" + form["bearing_table.csv"]
    back, _ = web.form_to_design(form)
    assert back["bearing_table"]["csv"] == own_csv()
    assert client.post("/editor/solve", data=form).status_code == 200
