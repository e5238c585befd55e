"""Diagrams along the shaft as plotly figure data, built from a :class:`engine.result.Result`.

:func:`diagram_figure` gives one figure (a plain ``{"data": [...], "layout": {...}}`` dict that
``Plotly.react`` draws) with five stacked panels sharing x: shear force in both planes, bending
moment in both planes and its resultant, torque, deflection, slope. Supports are marked by
vertical lines and triangles on the x axis, parts by dotted lines, all labelled with their ids.
:func:`diagram_html` wraps the same figure as an HTML fragment (for the printed note).

Plain dicts are built by hand (no ``graph_objects``): it is an order of magnitude faster, and
the live editor sends a new figure on every edit. Values are rounded to 5 significant figures
before sending; that is far below what a diagram can show.
"""
from __future__ import annotations

import json
from typing import Any

import numpy as np

from app import units

__all__ = ["PANELS", "diagram_figure", "diagram_json", "diagram_html"]

# (panel title, quantity, [(array key, legend name, colour, dash)])
PANELS = (
    ("shear force", "force", [("Vy_N", "Vy (x–y plane)", "#1f5d63", "solid"),
                              ("Vz_N", "Vz (x–z plane)", "#b0701a", "solid")]),
    ("bending moment", "moment", [("Mz_Nm", "Mz (x–y plane)", "#1f5d63", "solid"),
                                  ("My_Nm", "My (x–z plane)", "#b0701a", "solid"),
                                  ("M_Nm", "resultant", "#27343c", "dot")]),
    ("torque", "moment", [("T_Nm", "T", "#6a3d7a", "solid")]),
    ("deflection", "deflection", [("uy_mm", "uy", "#1f5d63", "solid"), ("uz_mm", "uz", "#b0701a", "solid"),
                                  ("u_mm", "resultant", "#27343c", "dot")]),
    ("slope", "slope", [("slope_y_rad", "θy = duy/dx", "#1f5d63", "solid"),
                        ("slope_z_rad", "θz = duz/dx", "#b0701a", "solid"),
                        ("slope_rad", "resultant", "#27343c", "dot")]),
)


def _r(vals: list[float], factor: float) -> list[float]:
    """Values / factor rounded to 5 significant figures (non-finite values become 0)."""
    v = np.asarray(vals, dtype=float) / factor
    v = np.where(np.isfinite(v), v, 0.0)
    a = np.abs(v)
    mag = np.where(a > 0, 10.0 ** (4 - np.floor(np.log10(np.where(a > 0, a, 1.0)))), 1.0)
    return (np.round(v * mag) / mag).tolist()


def diagram_figure(result: Any, design: Any = None, *, load_case: str | None = None,
                   system: str = "si") -> dict:
    """Plotly figure dict of the diagrams of one load case (default: the first).

    ``design`` (mapping or model, optional) supplies the support and part positions for the
    markers; without it they are taken from the result's load case.
    """
    diag = result.diagrams
    names = list(diag.load_cases)
    name = load_case if load_case in diag.load_cases else (names[0] if names else "")
    arrays = diag.load_cases.get(name, {})
    lx = units.QUANTITIES["length"]
    fx = lx.us_factor if system == "us" else 1.0
    x = _r(list(diag.x_mm), fx)
    n = len(PANELS)
    gap = 0.035
    h = (1 - gap * (n - 1)) / n
    data: list[dict] = []
    layout: dict[str, Any] = {
        "paper_bgcolor": "rgba(0,0,0,0)", "plot_bgcolor": "#fbfaf5",
        "font": {"family": "ui-sans-serif, system-ui, sans-serif", "size": 11, "color": "#27343c"},
        "margin": {"l": 64, "r": 14, "t": 26, "b": 40}, "height": 820, "showlegend": False,
        "legend": {"orientation": "h", "y": 1.0, "yanchor": "bottom", "x": 0, "font": {"size": 10}},
        "hovermode": "x unified", "annotations": [], "shapes": [],
        "meta": {"load_case": name, "system": system, "cases": names},
    }
    for k, (title, qty, series) in enumerate(PANELS):
        ax = "" if k == 0 else str(k + 1)
        top = 1 - k * (h + gap)
        q = units.QUANTITIES[qty]
        fq = q.us_factor if system == "us" else 1.0
        unit = units.unit_label(qty, system)
        layout[f"yaxis{ax}"] = {"domain": [top - h, top], "title": {"text": f"{title} [{unit}]", "font": {"size": 10}},
                                "zeroline": True, "zerolinecolor": "#9aa5aa", "gridcolor": "#e4e0d2",
                                "tickfont": {"size": 10}, "automargin": True}
        layout[f"xaxis{ax}"] = {"anchor": f"y{ax}", "gridcolor": "#e4e0d2", "zeroline": False,
                                "showticklabels": k == n - 1, "tickfont": {"size": 10}}
        if k:
            layout[f"xaxis{ax}"]["matches"] = "x"
        if qty == "slope":
            layout[f"yaxis{ax}"]["exponentformat"] = "e"
        for key, label, colour, dash in series:
            if key not in arrays:
                continue
            data.append({"type": "scatter", "mode": "lines", "x": x, "y": _r(arrays[key], fq),
                         "name": label, "legendgroup": title, "xaxis": f"x{ax}", "yaxis": f"y{ax}",
                         "line": {"color": colour, "width": 1.6, "dash": dash},
                         "hovertemplate": f"%{{y:.4g}} {unit}<extra>{label}</extra>",
                         "showlegend": False})
    layout["xaxis" + str(n)]["title"] = {"text": f"x along the shaft [{units.unit_label('length', system)}]"}

    # supports and parts
    sups, els = [], []
    if design is not None:
        dd = design.model_dump() if hasattr(design, "model_dump") else dict(design)
        sups = [(s["id"], float(s["x_mm"])) for s in dd.get("supports", [])]
        els = [(e["id"], float(e["x_mm"])) for e in dd.get("elements", [])]
    elif result.load_cases:
        c = result.load_cases[0]
        sups = [(s.id, s.x_mm) for s in c.supports]
        els = [(e.id, e.x_mm) for e in c.elements]
    for sid, sx in sups:
        layout["shapes"].append({"type": "line", "xref": "x", "yref": "paper", "x0": sx / fx, "x1": sx / fx,
                                 "y0": 0, "y1": 1, "line": {"color": "#1f5d63", "width": 1, "dash": "dash"},
                                 "layer": "below"})
        layout["annotations"].append({"x": sx / fx, "y": 1.0, "xref": "x", "yref": "paper", "text": f"▲ {sid}",
                                      "showarrow": False, "yanchor": "top", "font": {"color": "#1f5d63", "size": 10},
                                      "yshift": 14})
    for eid, ex in els:
        layout["shapes"].append({"type": "line", "xref": "x", "yref": "paper", "x0": ex / fx, "x1": ex / fx,
                                 "y0": 0, "y1": 1, "line": {"color": "#9c3b25", "width": 1, "dash": "dot"},
                                 "layer": "below"})
        layout["annotations"].append({"x": ex / fx, "y": 1.0, "xref": "x", "yref": "paper", "text": eid,
                                      "showarrow": False, "yanchor": "top", "font": {"color": "#9c3b25", "size": 10},
                                      "yshift": 14})
    layout["margin"]["t"] = 30
    return {"data": data, "layout": layout}


def diagram_json(result: Any, design: Any = None, *, load_case: str | None = None, system: str = "si") -> str:
    """:func:`diagram_figure` as compact JSON, safe inside a ``<script>`` element.

    The x values, the same for every trace, are sent once as ``"x"`` at the top level and left
    out of the traces (the page puts them back before drawing): it halves the payload.
    """
    fig = diagram_figure(result, design, load_case=load_case, system=system)
    x = fig["data"][0]["x"] if fig["data"] else []
    for t in fig["data"]:
        t.pop("x", None)
    fig["x"] = x
    s = json.dumps(fig, separators=(",", ":"), ensure_ascii=False)
    return s.replace("</", "<\\/")


def diagram_html(result: Any, design: Any = None, *, load_case: str | None = None, system: str = "si",
                 div_id: str = "diagrams") -> str:
    """An HTML fragment that draws the figure (plotly.js must be on the page already)."""
    import plotly.io as pio

    fig = diagram_figure(result, design, load_case=load_case, system=system)
    return pio.to_html(fig, full_html=False, include_plotlyjs=False, div_id=div_id,
                       config={"displaylogo": False, "responsive": True, "staticPlot": False})
