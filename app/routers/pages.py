"""Router: the designer's page.

``GET /`` opens the editor on the demo design. Every edit posts the whole form to
``POST /editor/solve`` (debounced in the browser) and gets back only what changes: the
results panel, the drawing, the diagram data and the field messages, as htmx out-of-band
swaps. Structural edits (add, remove, reorder a row, change a part's kind, switch units)
post to ``POST /editor/op`` and get the editor form back as well. A design that does not
validate gives 422 with the messages placed beside their fields; the last good results stay
on screen, marked out of date. ``GET /vendor/plotly.min.js`` serves plotly.js from the
installed ``plotly`` package (not committed to the repository a second time).
``GET /bearing-table.csv`` serves the bundled bearing table, as a template for the
designer's own: the browser reads that file itself (FileReader) into the design's
``bearing_table``, so the table travels with the design and needs no upload route.

:func:`render_editor` renders the full page for any design mapping, for other routers (a
saved design) to reuse.
"""
from __future__ import annotations

import json
import logging
import os
import time
from pathlib import Path
from typing import Any, Mapping

from fastapi import APIRouter, Request
from fastapi.responses import FileResponse, HTMLResponse, Response
from fastapi.templating import Jinja2Templates
from starlette.concurrency import run_in_threadpool

import engine
from app import drawing, plots, results_view, units, web, work
from app.security import install_templates
from engine.bearings.catalogue import BUNDLED_PATH
from engine.model import Issue

__all__ = ["router", "templates", "render_editor", "demo_design", "solve_form", "PLOTLY_JS",
           "bundled_bearing_table"]

log = logging.getLogger("shaftwright.pages")
ROOT = Path(__file__).resolve().parents[2]
templates = Jinja2Templates(directory=str(ROOT / "templates"))
templates.env.globals.update(fmt=units.fmt, unit_label=units.unit_label, slug=web.slug,
                             quantity_of_unit=units.quantity_of_unit,
                             bearing_label=lambda t: web.BEARING_LABELS.get(t or "", t or "rigid"))
install_templates(templates.env)  # form token, who is signed in, JSON escaping
router = APIRouter()

import plotly as _plotly  # noqa: E402

PLOTLY_JS = Path(_plotly.__file__).parent / "package_data" / "plotly.min.js"


def _plotly_version() -> str:
    import re

    try:
        head = PLOTLY_JS.read_bytes()[:200].decode("ascii", "replace")
    except OSError:
        return "missing"
    m = re.search(r"plotly\.js v([0-9][\w.\-]*)", head)
    return m.group(1) if m else "unknown"


PLOTLY_VERSION = _plotly_version()  # the plotly.js build inside the installed plotly package

_FALLBACK_DEMO: dict[str, Any] = {
    "format": "shaft-design/1", "name": "Starter shaft (invented example)",
    "shaft": {"segments": [{"length_mm": 40, "d_mm": 30}, {"length_mm": 160, "d_mm": 40},
                           {"length_mm": 40, "d_mm": 30}]},
    "supports": [{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                 {"id": "B", "x_mm": 220, "bearing_type": "deep_groove_ball", "axial": "none"}],
    "elements": [{"id": "G1", "kind": "gear", "x_mm": 90, "pitch_d_mm": 120, "torque_Nm": 80},
                 {"id": "C1", "kind": "coupling", "x_mm": 240, "torque_Nm": None}],
    "load_cases": [{"name": "normal", "time_fraction": 1, "speed_rpm": 1000}],
    "requirements": {"life_h": 20000},
}


def demo_design() -> dict[str, Any]:
    """The demo design: ``$SHAFTWRIGHT_DEMO`` or ``sample_data/countershaft.json``; a small
    built-in invented design if neither can be read."""
    for p in (os.environ.get("SHAFTWRIGHT_DEMO"), ROOT / "sample_data" / "countershaft.json"):
        if not p:
            continue
        try:
            return json.loads(Path(p).read_text(encoding="utf-8"))
        except (OSError, json.JSONDecodeError):
            continue
    return json.loads(json.dumps(_FALLBACK_DEMO))


def _solve(design: engine.Design) -> Any:
    """The bounded, cached solve (:func:`app.work.solve`: a load-case switch or a page read
    re-solves nothing; a solve past its time budget stops with a message)."""
    return work.solve(design)


def solve_form(form: Mapping[str, str]) -> dict[str, Any]:
    """Read, validate and solve posted form state; everything the templates need."""
    t0 = time.perf_counter()
    system = form.get("units", "si") if form.get("units") in units.SYSTEMS else "si"
    design, data, issues = web.read_form(form)
    result = None
    if design is not None:
        try:
            result = _solve(design)
        except engine.DesignError as exc:
            issues = list(exc.errors)
        except Exception as exc:  # never lose the page to an engine fault
            log.exception("engine failed")
            issues = [Issue(path="", message=f"the engine could not solve this design ({type(exc).__name__}: {exc})")]
    table = web.bearing_table_view(form)
    if result is None:
        issues = web.bearing_table_issues(table, issues)
    view_case = form.get("view_case", "")
    case_names = [c.name for c in result.load_cases] if result is not None else []
    if view_case not in case_names:
        view_case = case_names[0] if case_names else ""
    ctx: dict[str, Any] = {
        "form": form, "system": system, "design": design, "data": data, "result": result,
        "issues": issues, "slots": web.place_issues(issues, form), "view_case": view_case,
        "case_names": case_names,
        "drawing": drawing.shaft_svg(design, result, load_case=view_case, system=system, width_px=1120) if design is not None else None,
        "plot_json": plots.diagram_json(result, design, load_case=view_case, system=system) if result is not None else None,
        "view": results_view.results_view(result) if result is not None else None,
        "n_supports": len(design.supports) if design is not None else 0,
        "bearing_table": table,
    }
    ctx["elapsed_ms"] = (time.perf_counter() - t0) * 1000
    return ctx


def _form_of(raw: Any) -> dict[str, str]:
    return {k: v for k, v in raw.items() if isinstance(v, str)}


def render_editor(request: Request, design: Mapping[str, Any], *, title: str | None = None,
                  storage_key: str | None = None, system: str = "si", status_code: int = 200,
                  share: dict[str, Any] | None = None) -> HTMLResponse:
    """The whole editor page for ``design`` (a mapping, SI-mm).

    ``storage_key`` names the browser's local copy of the working design (default: the page
    path), so that a reload loses nothing until the design is saved. ``share`` is the state of
    the save-and-share panel (``partials/share_panel.html``; see ``app.routers.designs``).
    """
    form = web.design_to_form(design, system)
    ctx = solve_form(form)
    ctx.update(sections=web.editor_sections(form), focus=None, title=title or form.get("name") or "Shaftwright",
               storage_key=storage_key or request.url.path, plotly_src=f"/vendor/plotly-{PLOTLY_VERSION}.min.js", share=share)
    return templates.TemplateResponse(request, "editor.html", ctx, status_code=status_code)


@router.get("/", response_class=HTMLResponse)
def editor_page(request: Request, units_: str | None = None) -> HTMLResponse:
    """The designer's page, opened on the demo design."""
    return render_editor(request, demo_design(), system="us" if request.query_params.get("units") == "us" else "si")


@router.post("/editor/solve", response_class=HTMLResponse)
async def editor_solve(request: Request) -> HTMLResponse:
    """One live edit: the whole form in, the out-of-band fragments out (422 when invalid)."""
    form = _form_of(await request.form())

    def answer() -> HTMLResponse:  # solve and render off the event loop
        ctx = solve_form(form)
        return templates.TemplateResponse(request, "partials/live.html", ctx,
                                          status_code=200 if ctx["result"] is not None else 422)

    return await run_in_threadpool(answer)


@router.post("/editor/op", response_class=HTMLResponse)
async def editor_op(request: Request) -> HTMLResponse:
    """A structural edit: the editor form re-rendered, plus the live fragments."""
    form = _form_of(await request.form())
    return await run_in_threadpool(_editor_op, request, form)


def _editor_op(request: Request, form: dict[str, str]) -> HTMLResponse:
    op = form.pop("op", "")
    if op == "units":
        op = "units:" + form.pop("to_units", "si")
    if op == "restore":  # a working copy kept by the browser, perhaps from an older page
        form.pop("to_units", None)
        form, focus = web.upgrade_form(form), None
    else:
        form, focus = web.apply_op(form, op)
    ctx = solve_form(form)
    focus_id = None
    if focus:
        focus_id = ("op-" + web.slug(focus)) if ":" in focus else ("f-" + web.slug(focus))
    ctx.update(sections=web.editor_sections(form), focus=focus_id)
    return templates.TemplateResponse(request, "partials/op.html", ctx,
                                      status_code=200 if ctx["result"] is not None else 422)


@router.get("/bearing-table.csv", include_in_schema=False)
def bundled_bearing_table() -> Response:
    """The bundled illustrative bearing table, as a template for the designer's own."""
    return FileResponse(BUNDLED_PATH, media_type="text/csv; charset=utf-8",
                        filename="shaftwright-bearing-table.csv")


@router.get(f"/vendor/plotly-{PLOTLY_VERSION}.min.js", include_in_schema=False)
def plotly_js() -> Response:
    """plotly.js from the installed plotly package (MIT; licence in static/vendor/)."""
    return FileResponse(PLOTLY_JS, media_type="text/javascript",
                        headers={"Cache-Control": "public, max-age=31536000, immutable"})
