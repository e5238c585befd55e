"""The server-drawn shaft and the diagram data."""
from __future__ import annotations

import json
import re
import xml.dom.minidom

import engine
from app import drawing, plots
from app.routers.pages import demo_design


def test_svg_is_well_formed_to_scale_and_linked():
    d = demo_design()
    res = engine.solve(d)
    svg = drawing.shaft_svg(d, res, width_px=900)
    xml.dom.minidom.parseString(svg)  # well-formed
    for i in range(len(d["supports"])):
        assert f'href="#row-supports-{i}"' in svg
    for i in range(len(d["elements"])):
        assert f'href="#row-elements-{i}"' in svg
    # to scale: the outline spans L·scale and the largest step's height is d·scale
    L = sum(s["length_mm"] for s in d["shaft"]["segments"])
    pts = [tuple(map(float, p.split(","))) for p in re.search(r'class="sd-shaft" d="M([^"]+) Z"', svg).group(1).split(" L")]
    xs = [p[0] for p in pts]
    ys = [p[1] for p in pts]
    scale = (max(xs) - min(xs)) / L
    dmax = max(s["d_mm"] for s in d["shaft"]["segments"])
    assert abs((max(ys) - min(ys)) - dmax * scale) < 0.3
    # force values are written on the drawing
    assert "N</text>" in svg or "kN</text>" in svg.replace("\u202f", "")


def test_svg_without_result_and_without_links():
    svg = drawing.shaft_svg(demo_design(), None, links=False)
    xml.dom.minidom.parseString(svg)
    assert "href=" not in svg


def test_diagram_figure_has_all_panels_and_units():
    d = demo_design()
    res = engine.solve(d)
    fig = plots.diagram_figure(res, d, system="us")
    names = {t["name"] for t in fig["data"]}
    assert {"Vy (x–y plane)", "Mz (x–y plane)", "My (x–z plane)", "T", "uy", "θy = duy/dx"} <= names
    assert "[lbf·ft]" in json.dumps(fig["layout"], ensure_ascii=False)
    case = res.load_cases[0].name
    m_si = max(abs(v) for v in res.diagrams.load_cases[case]["M_Nm"])
    tr = next(t for t in fig["data"] if t["yaxis"] == "y2" and t["name"] == "resultant")
    assert abs(max(abs(v) for v in tr["y"]) - m_si / 1.3558179483314004) < 1e-3 * m_si
    assert len(fig["layout"]["shapes"]) == len(d["supports"]) + len(d["elements"])
    assert "</" not in plots.diagram_json(res, d)


def test_every_part_kind_and_bearing_type_draws():
    from app import web
    from engine.model import BEARING_TYPES

    d = demo_design()
    form = web.design_to_form(d)
    for kind in web.ELEMENT_FIELDS:
        form, _ = web.apply_op(form, f"add:elements:{kind}")
    for _ in BEARING_TYPES:
        form, _ = web.apply_op(form, "add:supports")
    n0 = len(d["supports"])
    L = sum(s["length_mm"] for s in d["shaft"]["segments"])
    for j, bt in enumerate(list(BEARING_TYPES) + [""]):
        if n0 + j < n0 + len(BEARING_TYPES):
            form[f"supports[{n0 + j}].bearing_type"] = bt
            form[f"supports[{n0 + j}].x_mm"] = f"{5 + 3 * j:g}"
    data, issues = web.form_to_design(form)
    assert issues == []
    svg = drawing.shaft_svg(data, None)
    xml.dom.minidom.parseString(svg)
    for i in range(len(data["elements"])):
        assert f'href="#row-elements-{i}"' in svg
    for i in range(len(data["supports"])):
        assert f'href="#row-supports-{i}"' in svg
    assert L > 0
