"""The editor page and its live fragments (server side)."""
from __future__ import annotations

import re

from app import web
from app.routers.pages import demo_design


def _form(design=None, system="si"):
    return web.design_to_form(design or demo_design(), system)


def test_page_has_editor_results_drawing_and_cautions(client):
    r = client.get("/")
    t = r.text
    assert r.status_code == 200
    for needle in ('id="design-form"', 'id="results"', 'id="drawing"', "<svg", 'id="plot-data"',
                   "preliminary design", "illustrative", "qualified engineer"):
        assert needle in t, needle
    # every number box is labelled with a unit
    for m in re.finditer(r'<label for="(f-[^"]+)">([^<]*)(<span class="unit">\[([^\]]*)\]</span>)?', t):
        inp = re.search(rf'id="{m.group(1)}"[^>]*class="num"', t)
        if inp:
            assert m.group(3), f"{m.group(1)} has no unit"


def test_live_edit_returns_fragments_not_page(client):
    form = _form()
    form["elements[1].x_mm"] = "150"
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 200
    assert 'id="results"' in r.text and 'hx-swap-oob="true"' in r.text
    assert "<html" not in r.text and 'id="design-form"' not in r.text


def test_invalid_value_gives_422_message_at_field(client):
    form = _form()
    form["supports[1].x_mm"] = "12o"
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 422
    m = re.search(r'<script type="application/json" id="issue-data"[^>]*>(.*?)</script>', r.text, re.S)
    assert m and "m-supports-1-x_mm" in m.group(1)
    assert 'id="results"' not in r.text, "last good results stay: not replaced"
    assert 'data-state="stale"' in r.text


def test_op_add_support_renders_third_row_and_indeterminate(client):
    form = _form()
    form["op"] = "add:supports"
    r = client.post("/editor/op", data=form)
    assert r.status_code == 200, r.text[:2000]
    assert 'id="row-supports-2"' in r.text
    assert "Statically indeterminate" in r.text


def test_op_units_switch_converts_fields(client):
    form = _form()
    form.update(op="units", to_units="us")
    r = client.post("/editor/op", data=form)
    assert r.status_code == 200
    assert "[in]" in r.text and "[lbf·ft]" in r.text
    x = float(re.search(r'name="supports\[0\]\.x_mm" type="text" value="([^"]+)"', r.text).group(1))
    assert abs(x * 25.4 - float(demo_design()["supports"][0]["x_mm"])) < 1e-3


def test_restore_keeps_raw_text(client):
    form = _form()
    form["elements[0].pitch_d_mm"] = "abc"
    form["op"] = "restore"
    r = client.post("/editor/op", data=form)
    assert r.status_code == 422
    assert 'value="abc"' in r.text
    assert "must be a number" in r.text


def test_plotly_served_from_package(client):
    from app.routers.pages import PLOTLY_VERSION

    r = client.get(f"/vendor/plotly-{PLOTLY_VERSION}.min.js")
    assert r.status_code == 200 and len(r.content) > 1_000_000
