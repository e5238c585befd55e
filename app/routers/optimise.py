"""Router: find the arrangement (engine/search.py) through the API and on a page.

JSON API
- ``POST /api/optimise``: ``{"design": {...}, "vary": ["shaft.segments[2].d_mm=40:60:1", ...],
  "objectives": ["mass_kg", "bearing_space_mm2"], "seed": 1, "budget_s": 10, "limits": [...]}``
  -> the search result: the front (each point a complete design with its objectives, bearings,
  least margin and what changed), the current design's figures, evaluations, generations.
  The budget is bounded by :data:`MAX_BUDGET_S`. Bad input: 422 ``{"errors": [{"path", "message"}]}``.

Pages
- ``GET /optimise``: the search page on the design of ``?d=`` (as the study page carries it) or
  the demo design: mark variables and bounds, choose objectives, run.
- ``POST /optimise/open``: the editor's form state in, an ``HX-Redirect`` to the page on that
  design out (the editor's "find the arrangement" button).
- ``POST /optimise/run``: the result fragment (htmx): the front plotted (the figure as JSON in a
  ``<script type="application/json">`` block, drawn by static/js/optimise.js; no inline script),
  the current design marked, and the table of front designs. A search of more than one
  population runs as a job on a worker thread (app/jobs.py, the study's runner): the answer is a
  progress fragment (designs solved, generation, time of the budget, a stop button posting
  ``POST /optimise/job/{id}/stop``) that polls ``GET /optimise/job/{id}`` until it answers with
  the result fragment; stopped, the front of the designs solved so far.
- ``POST /optimise/apply``: one front design opened in the editor as a new working copy.

Every route that solves is a plain ``def``: FastAPI runs it on a worker thread, never on the event
loop (``/optimise/open`` only awaits the form and converts it, as ``/study/open`` does).
"""
from __future__ import annotations

import hashlib
import json
import logging
import math
from typing import Any

from fastapi import APIRouter, Depends, Form, Request
from fastapi.responses import HTMLResponse, JSONResponse, Response

import engine
from engine.model import DesignError, Issue
from engine.search import ENUMERATE_MAX, LIMITS, OBJECTIVES, SearchResult, combinations, parse_search, run_search

from app import jobs

__all__ = ["router", "MAX_BUDGET_S", "front_plot", "search_options"]

log = logging.getLogger("shaftwright.optimise")
router = APIRouter()

MAX_BUDGET_S = 20.0       # a request's search stops after the generation that passes this
DEFAULT_BUDGET_S = 10.0


def _clean(v: Any) -> Any:
    from app.routers.studies import _clean as clean

    return clean(v)


def _errors(exc: DesignError) -> JSONResponse:
    return JSONResponse(status_code=getattr(exc, "status_code", 422), content={"errors": [{"path": i.path, "message": i.message}
                                                               for i in exc.errors]})


def _err(path: str, message: str) -> DesignError:
    return DesignError([Issue(path=path, message=message)])


def _number(body: dict, key: str, default: float, lo: float, hi: float, *, integer: bool = False) -> float:
    v = body.get(key, default)
    if isinstance(v, bool) or not isinstance(v, (int, float)) or not math.isfinite(v):
        raise _err(key, f"{key} must be a number")
    if integer and v != int(v):
        raise _err(key, f"{key} must be a whole number")
    if not lo <= v <= hi:
        raise _err(key, f"{key} must be {lo:g} to {hi:g}, not {v:g}")
    return int(v) if integer else float(v)


def search_request(body: Any) -> dict[str, Any]:
    """The run_search arguments of an API body; DesignError naming the field when wrong."""
    from app.limits import guard_document

    if not isinstance(body, dict) or "design" not in body:
        raise _err("design", "send {\"design\": {...}, \"vary\": [...], \"objectives\": [...]}")
    vary = body.get("vary")
    if not isinstance(vary, list) or not vary:
        raise _err("vary", "give the variables to search, e.g. [\"shaft.segments[2].d_mm=40:60:1\"]")
    objectives = body.get("objectives", ["mass_kg"])
    if isinstance(objectives, str):
        objectives = [objectives]
    if not isinstance(objectives, list) or not all(isinstance(o, str) for o in objectives):
        raise _err("objectives", "objectives is a list of names: " + ", ".join(OBJECTIVES))
    return {"design": guard_document(body["design"]), "search": vary, "objectives": objectives,
            "limits": body.get("limits"),
            "seed": _number(body, "seed", 1, 0, 2**31 - 1, integer=True),
            "budget_s": _number(body, "budget_s", DEFAULT_BUDGET_S, 0.1, MAX_BUDGET_S),
            "generations": _number(body, "generations", 60, 1, 1000, integer=True),
            "pop_size": _number(body, "population", 40, 4, 200, integer=True)}


def _run(args: dict[str, Any], **kw: Any) -> SearchResult:
    """run_search on the arguments of :func:`search_request` (``search`` the ``vary`` items or a
    parsed :class:`Search`); ``kw``: its ``progress`` and ``stop``."""
    args = dict(args)
    design = args.pop("design")
    search = args.pop("search")
    return run_search(design, search, **args, **kw)


async def _limited_body(request: Request) -> Any:
    """The JSON body under the app's size and depth limits (app.limits.read_json: I/O only, on
    the event loop), or the LimitError saying why it was refused; the route itself runs on a
    worker thread."""
    from app.limits import LimitError, read_json

    try:
        return await read_json(request)
    except LimitError as exc:
        return exc


_EXAMPLE = {"design": {"...": "a design document, format shaft-design/1"},
            "vary": ["shaft.segments[3].d_mm=44:70", "supports.B.x_mm=242:268", "supports.B.dimension_series=*"],
            "objectives": ["mass_kg", "bearing_space_mm2"], "seed": 1, "budget_s": 10}


@router.post("/api/optimise", tags=["api"], summary="Find the arrangement: search for the front of passing designs",
             openapi_extra={"requestBody": {"required": True, "content": {"application/json": {
                 "schema": {"type": "object"}, "example": _EXAMPLE}}}},
             responses={422: {"description": "bad input: every problem with its key path"}})
def api_optimise(body: Any = Depends(_limited_body)) -> JSONResponse:
    """Search the marked variables within their bounds (NSGA-II, or every combination of a small
    discrete space) for the designs that meet every requirement and are best in the objectives."""
    try:
        if isinstance(body, DesignError):
            raise body
        res = _run(search_request(body))
    except DesignError as exc:
        return _errors(exc)
    except Exception as exc:  # noqa: BLE001 - an engine fault is answered in words, the server stays up
        log.exception("search failed")
        return JSONResponse(status_code=500, content={"errors": [{"path": "", "message":
                            f"the engine could not search ({type(exc).__name__}: {exc})"}]})
    return JSONResponse(_clean(res.model_dump(mode="json")))


# --- page -------------------------------------------------------------------------------------

def search_options(design: engine.Design) -> list[dict[str, Any]]:
    """The variables offered on the page, each with default bounds around its value."""
    L = design.shaft.length_mm
    out: list[dict[str, Any]] = []
    seats, x0 = set(), 0.0
    for i, g in enumerate(design.shaft.segments):
        if any(s.bearing_type is not None and s.bore_mm is None and x0 <= s.x_mm <= x0 + g.length_mm
               for s in design.supports):
            seats.add(i)  # a bearing sits on it: its diameter is a bore of the bearing table
        x0 += g.length_mm
    for i, g in enumerate(design.shaft.segments):
        lo, hi = max(g.bore_mm + 1, 0.75 * g.d_mm), 1.25 * g.d_mm
        out.append({"path": f"shaft.segments[{i}].d_mm", "label": f"diameter of segment {i + 1} [mm]",
                    "current": g.d_mm, "range": f"{math.floor(lo):g}:{math.ceil(hi):g}:" + ("bores" if i in seats else "1")})
    x0 = 0.0
    for s in design.supports:
        # the seat segment the support stands on bounds its position (the bore stays a table bore)
        x0, seg_lo, seg_hi = 0.0, 0.0, L
        for g in design.shaft.segments:
            if x0 <= s.x_mm <= x0 + g.length_mm:
                seg_lo, seg_hi = x0, x0 + g.length_mm
                break
            x0 += g.length_mm
        out.append({"path": f"supports.{s.id}.x_mm", "label": f"position of support {s.id} [mm]",
                    "current": s.x_mm, "range": f"{seg_lo + 0.1 * (seg_hi - seg_lo):.4g}:{seg_hi - 0.1 * (seg_hi - seg_lo):.4g}"})
    for s in design.supports:
        if s.bearing_type is not None:
            out.append({"path": f"supports.{s.id}.dimension_series", "label": f"dimension series at {s.id}",
                        "current": None, "range": "*"})
            out.append({"path": f"supports.{s.id}.bearing_type", "label": f"bearing type at {s.id}",
                        "current": s.bearing_type, "range": s.bearing_type})
    for e in design.elements:
        out.append({"path": f"elements.{e.id}.x_mm", "label": f"position of {e.kind.replace('_', ' ')} {e.id} [mm]",
                    "current": e.x_mm, "range": f"{max(0.0, e.x_mm - 0.1 * L):.4g}:{min(L, e.x_mm + 0.1 * L):.4g}"})
    return out


def _templates():
    from app.routers.studies import _templates

    return _templates()


@router.get("/optimise", response_class=HTMLResponse)
def optimise_page(request: Request, d: str | None = None) -> HTMLResponse:
    """The search page on the design of the link (or the demo design)."""
    from app.routers.studies import _design_from, page_context

    data, issues = _design_from(request, d)
    ctx = page_context(data, issues, search_options, "Search") | {
        "objectives": OBJECTIVES, "limits": LIMITS, "max_budget": MAX_BUDGET_S}
    return _templates().TemplateResponse(request, "optimise.html", ctx)


@router.post("/optimise/open")
async def optimise_open(request: Request) -> Response:
    """From the editor: its form state in, a redirect to the search page on that design out.
    (Reading a form is I/O; the form is turned into a design as /study/open does.)"""
    from app import web
    from app.routers.studies import encode_design

    form = {k: v for k, v in (await request.form()).items() if isinstance(v, str)}
    _, data, _ = web.read_form(form)
    return Response(status_code=200, headers={"HX-Redirect": "/optimise?d=" + encode_design(data)})


def front_plot(res: SearchResult) -> dict[str, Any]:
    """Plotly figure of the front: the first two objectives (one objective: against the first
    varied number), the current design marked; ``layout.meta.n`` the number of front points."""
    objs = list(res.objectives)
    xs_name = objs[0]
    if len(objs) >= 2:
        ys_name = objs[1]
        get_y = lambda p: p.objectives.get(ys_name)  # noqa: E731
        ylab = f"{OBJECTIVES[ys_name][0]}" + (f" [{OBJECTIVES[ys_name][1]}]" if OBJECTIVES[ys_name][1] else "")
    else:
        var = res.variables[0]
        get_y = lambda p: p.values.get(var["path"])  # noqa: E731
        ylab = var["label"] + (f" [{var['unit']}]" if var["unit"] else "")
    xlab = f"{OBJECTIVES[xs_name][0]}" + (f" [{OBJECTIVES[xs_name][1]}]" if OBJECTIVES[xs_name][1] else "")
    text = ["; ".join(f"{b['id']} {b['designation']}" for b in p.bearings) for p in res.front]
    data = [{"type": "scatter", "mode": "markers+lines", "name": "front (meets every requirement)",
             "x": [p.objectives.get(xs_name) for p in res.front], "y": [get_y(p) for p in res.front],
             "text": text, "customdata": list(range(len(res.front))),
             "marker": {"size": 8, "color": "#1f5d63"}, "line": {"color": "#9fb9bb", "width": 1}}]
    cur = res.current
    if cur.objectives:
        data.append({"type": "scatter", "mode": "markers", "name": "current design"
                     + ("" if cur.feasible else " (does not meet every requirement)"),
                     "x": [cur.objectives.get(xs_name)], "y": [get_y(cur)],
                     "marker": {"size": 13, "symbol": "diamond", "color": "#b5542c"}})
    layout = {"height": 380, "margin": {"l": 60, "r": 10, "t": 10, "b": 50},
              "xaxis": {"title": {"text": xlab}}, "yaxis": {"title": {"text": ylab}},
              "legend": {"orientation": "h", "y": -0.2}, "meta": {"n": len(res.front)}}
    return {"data": data, "layout": layout}


def _fragment(request: Request, name: str, ctx: dict, status_code: int = 200) -> HTMLResponse:
    return _templates().TemplateResponse(request, name, ctx, status_code=status_code)


def _result_fragment(request: Request, res: SearchResult, *, stopped_on_request: bool = False) -> HTMLResponse:
    rows = [{"k": k, "p": p, "design_json": json.dumps(p.design, ensure_ascii=False)}
            for k, p in enumerate(res.front)]
    return _fragment(request, "partials/optimise_result.html",
                     {"res": res, "plot": _clean(front_plot(res)), "rows": rows, "objectives": OBJECTIVES,
                      "stopped_on_request": stopped_on_request})


def _errors_fragment(request: Request, issues: list[Issue], status_code: int) -> HTMLResponse:
    return _fragment(request, "partials/optimise_errors.html", {"issues": issues}, status_code)


def _start_job(args: dict[str, Any]) -> str | None:
    """Start the search as a job (app.jobs): it reports after each population solved and stops
    before the next one on request (its time budget is its own, as run_search keeps it)."""
    def work(job: jobs.Job) -> SearchResult:
        res = _run(dict(args), stop=job.stop_requested,
                   progress=lambda n, gen, t: job.report(evaluations=n, generation=gen))
        job.report(stopped_on_request=job.stop_requested() and res.stopped)
        return res

    search = args["search"]
    n = combinations(search)
    return jobs.start("search", work, evaluations=0, generation=0, budget_s=args["budget_s"],
                      combinations=n if n <= ENUMERATE_MAX else None, generations=args["generations"],
                      stopped_on_request=False)


def _progress_fragment(request: Request, key: str, job: jobs.Job) -> HTMLResponse:
    """'N designs solved, generation g of G, t s of the b s budget' and a bar of the share done:
    the search ends at its last generation or at its budget, whichever comes first."""
    f = job.figures
    budget, t = f["budget_s"], min(job.elapsed_s, f["budget_s"])
    of_budget = f"{t:.0f} s of the {budget:g} s budget"
    if f["combinations"] is not None:  # every combination is solved
        share = max(f["evaluations"] / f["combinations"], t / budget)
        figures = f"{f['evaluations']} of {f['combinations']} combinations solved, {of_budget}"
    else:
        share = max(f["generation"] / f["generations"], t / budget)
        figures = f"{f['evaluations']} designs solved, generation {f['generation']} of {f['generations']}, {of_budget}"
    stopping = job.stop_requested()
    label = ("Stopping after the designs in hand: " if stopping else "Searching: ") + figures
    pct = min(100, int(100 * share))
    return _fragment(request, "partials/job_progress.html",
                     {"name": "search", "url": f"/optimise/job/{key}", "target": "optimise-result",
                      "label": label, "max": 100, "value": pct, "pct": pct, "stopping": stopping})


@router.post("/optimise/run", response_class=HTMLResponse)
def optimise_run(request: Request, design: str = Form(""), path: list[str] = Form([]),
                 bounds: list[str] = Form([]), use: list[str] = Form([]), objective: list[str] = Form([]),
                 seed: str = Form("1"), budget: str = Form("10")) -> HTMLResponse:
    """Run the search of the page's form (the problems: 422). A search of one population (every
    combination of a small space) answers with the result fragment; a longer one runs as a job
    (app.jobs) and answers with its progress fragment, which polls ``/optimise/job/{key}``."""
    from app.routers.studies import _form_design

    try:
        data = _form_design({"design": design})
        chosen = {int(u) for u in use if u.isdigit()}
        vary = [f"{p}={b}" for k, (p, b) in enumerate(zip(path, bounds)) if k in chosen]
        if not vary:
            raise _err("vary", "tick at least one design variable to search")
        body = {"design": data, "vary": vary, "objectives": objective or ["mass_kg"]}
        for key, text in (("seed", seed), ("budget_s", budget)):
            try:
                body[key] = float(text) if key == "budget_s" else int(text)
            except ValueError:
                raise _err(key, f"{'seed' if key == 'seed' else 'time budget'} {text!r} is not a number") from None
        args = search_request(body)
        args["search"] = parse_search(args["design"], args["search"], args["objectives"], limits=args["limits"])
        if combinations(args["search"]) <= 2 * args["pop_size"]:  # one population: at once
            return _result_fragment(request, _run(args))
    except DesignError as exc:
        return _errors_fragment(request, exc.errors, getattr(exc, "status_code", 422))
    key = _start_job(args)
    if key is None:
        from app.routers.studies import _busy_issue

        return _errors_fragment(request, [_busy_issue()], 503)
    return _progress_fragment(request, key, jobs.get("search", key))


@router.get("/optimise/job/{key}", response_class=HTMLResponse)
def optimise_job(request: Request, key: str) -> HTMLResponse:
    """A running search's progress fragment, or its result (the front) once it has finished."""
    job = jobs.get("search", key)
    if job is None:
        return _errors_fragment(request, [Issue(path="", message="this search is no longer on the server (it "
                                                "finished long ago, or the server restarted); run it again")], 404)
    if not job.finished.is_set():
        return _progress_fragment(request, key, job)
    if isinstance(job.error, DesignError):
        return _errors_fragment(request, job.error.errors, getattr(job.error, "status_code", 422))
    if job.error is not None:
        return _errors_fragment(request, [Issue(path="", message="the engine could not search "
                                                f"({type(job.error).__name__}: {job.error})")], 500)
    return _result_fragment(request, job.result, stopped_on_request=job.figures["stopped_on_request"])


@router.post("/optimise/job/{key}/stop", response_class=HTMLResponse)
def optimise_job_stop(request: Request, key: str) -> HTMLResponse:
    """Ask a running search to stop after the population it is solving; the next poll shows the
    front of the designs solved so far."""
    job = jobs.get("search", key)
    if job is None:
        return HTMLResponse("", status_code=404)
    job.stop.set()
    return _progress_fragment(request, key, job)


@router.post("/optimise/apply", response_class=HTMLResponse)
def optimise_apply(request: Request, design: str = Form("")) -> HTMLResponse:
    """A front design opened in the editor as a new working copy (its own browser storage key)."""
    from app.routers.pages import render_editor
    from app.routers.studies import _form_design

    try:
        data = _form_design({"design": design})
        engine.parse_design(data)
    except DesignError as exc:
        return _fragment(request, "partials/optimise_errors.html", {"issues": exc.errors}, 422)
    key = "/optimise/apply:" + hashlib.sha1(json.dumps(data, sort_keys=True).encode()).hexdigest()[:12]
    return render_editor(request, data, title=data.get("name"), storage_key=key)
