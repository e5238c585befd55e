"""Router: what-if studies and the arrangement comparison.

JSON API
- ``POST /api/study``: ``{"design": {...}, "vary": ["supports.B.x_mm=300:500:21", ...]}`` (each
  item also ``{"path": ..., "values": "start:stop:count" | [..]}``) -> the study result:
  variables, values, the current design's figures and every variant's figures.
- ``POST /api/arrangements``: ``{"design": {...}}`` (or the design itself) -> every sensible
  bearing arrangement of the outermost supports, ranked.
Bad input gives 422 ``{"errors": [{"path": "supports.B.x_mm", "message": ...}]}``.

Pages
- ``GET /study``: the study page, on the design carried in ``?d=`` (compressed, URL-safe) or the
  demo design. ``POST /study/open``: the editor's form state in, an ``HX-Redirect`` to the study
  page on that design out (the editor's "what-if studies" button).
- ``POST /study/run`` and ``POST /study/arrangements``: the result fragments (htmx). A study of
  more than one chunk of variants (``engine.study.CHUNK``) runs as a job on a worker thread
  (never on the event loop): ``/study/run`` answers with a progress fragment that polls
  ``GET /study/job/{id}`` (share of variants done, a stop button posting
  ``POST /study/job/{id}/stop``) until it answers with the result fragment.
- ``POST /study/apply``: a variant taken into the design: the editor page opened on it.
"""
from __future__ import annotations

import base64
import hashlib
import json
import logging
import math
import zlib
from typing import Any

from fastapi import APIRouter, Request
from fastapi.responses import HTMLResponse, JSONResponse, Response
from starlette.concurrency import run_in_threadpool

import engine
from engine.model import DesignError, Issue
from engine.study import (ARRANGEMENTS, CHUNK, StudyResult, apply_values, compare_arrangements,
                          parse_study, run_study)

from app import jobs, work
from app.limits import LimitError, check_counts, parse_json, read_body
from app.settings import get_settings

__all__ = ["router", "encode_design", "decode_design", "study_plot", "variable_options"]

log = logging.getLogger("shaftwright.studies")
router = APIRouter()


# --- helpers ----------------------------------------------------------------------------------

def encode_design(data: Any) -> str:
    """A design mapping as compact, URL-safe text (zlib + base64url)."""
    raw = json.dumps(data, separators=(",", ":"), ensure_ascii=False).encode("utf-8")
    return base64.urlsafe_b64encode(zlib.compress(raw, 9)).decode("ascii").rstrip("=")


def decode_design(text: str) -> Any:
    """Inverse of :func:`encode_design`; DesignError at path ``d`` when it is not one."""
    try:
        raw = zlib.decompress(base64.urlsafe_b64decode(text + "=" * (-len(text) % 4)), bufsize=1 << 16)
        if len(raw) > 2_000_000:
            raise ValueError("too large")
        data = json.loads(raw.decode("utf-8"))
        check_counts(data)  # nesting and counts, as for any design that comes in
        return data
    except LimitError:
        raise
    except (ValueError, zlib.error, UnicodeDecodeError, RecursionError):
        raise DesignError([Issue(path="d", message="the design in the link is damaged; open the study "
                                                   "from the editor again")]) from None


def _bounded(fn, *args) -> Any:
    """A study's work in a child process, stopped at the study budget (app.work)."""
    return work.run_bounded(fn, *args, budget_s=get_settings().study_budget_s, what="The study",
                            kind="study")


def _guard(data: Any) -> Any:
    from app.limits import guard_document

    return guard_document(data)


def _design_of(body: Any) -> Any:
    if isinstance(body, dict) and "design" in body:
        return body["design"]
    return body


def _clean(v: Any) -> Any:
    """Non-finite floats to None, so that the JSON is valid."""
    if isinstance(v, float) and not math.isfinite(v):
        return None
    if isinstance(v, dict):
        return {k: _clean(x) for k, x in v.items()}
    if isinstance(v, (list, tuple)):
        return [_clean(x) for x in v]
    return v


# --- JSON API ---------------------------------------------------------------------------------

async def _answer(request: Request, job) -> JSONResponse:
    """Read the JSON body, run ``job(body)`` in a thread (bounded by the study budget); errors
    are answered by the app's one error policy (app/errors.py)."""
    raw = await read_body(request)

    def run() -> JSONResponse:
        return JSONResponse(_clean(job(parse_json(raw)).model_dump(mode="json")))

    return await run_in_threadpool(run)


def _vary(value: Any) -> list:
    if isinstance(value, str):
        value = [value]
    if not isinstance(value, list) or not all(isinstance(v, (str, dict)) for v in value):
        raise DesignError([Issue(path="vary", message="'vary' is a list of one or two variables, "
                                 "e.g. [\"supports.B.x_mm=300:500:21\"]")])
    return value


_STUDY_EXAMPLE = {"design": {"...": "a design document, format shaft-design/1"},
                  "vary": ["supports.B.x_mm=200:270:15"]}


@router.post("/api/study", tags=["api"], summary="Vary one or two design variables",
             openapi_extra={"requestBody": {"required": True, "content": {"application/json": {
                 "schema": {"type": "object"}, "example": _STUDY_EXAMPLE}}}},
             responses={422: {"description": "bad input, each problem with its path (the variable's "
                                             "name, 'vary', or a key of the design)"}})
async def api_study(request: Request) -> JSONResponse:
    """Solve every variant: per variant the bearing lives, the governing shaft safety factor,
    the largest slope at a bearing and the first critical speed."""
    def job(body):
        if not isinstance(body, dict) or "vary" not in body:
            raise DesignError([Issue(path="vary", message="give 'design' and 'vary' (one or two "
                                                          "variables, e.g. \"supports.B.x_mm=300:500:21\")")])
        return _bounded(run_study, _guard(_design_of(body)), _vary(body["vary"]))

    return await _answer(request, job)


@router.post("/api/arrangements", tags=["api"], summary="Compare bearing arrangements",
             openapi_extra={"requestBody": {"required": True, "content": {"application/json": {
                 "schema": {"type": "object"}, "example": {"design": {"...": "a design document"}}}}}})
async def api_arrangements(request: Request) -> JSONResponse:
    """Every sensible bearing-type and axial-arrangement combination of the outermost
    supports, each with its best candidates, lives, static safety, slopes and space, ranked."""
    def job(body):
        return _bounded(compare_arrangements, _guard(_design_of(body)))

    return await _answer(request, job)


# --- page -------------------------------------------------------------------------------------

def _templates():
    from app.routers.pages import templates

    return templates


def _plotly_src() -> str:
    from app.routers.pages import PLOTLY_VERSION

    return f"/vendor/plotly-{PLOTLY_VERSION}.min.js"


def _demo() -> dict:
    from app.routers.pages import demo_design

    return demo_design()


def variable_options(design: engine.Design) -> list[dict[str, Any]]:
    """The variables offered on the page, each with a default range around its value."""
    L = design.shaft.length_mm
    out: list[dict[str, Any]] = []

    def span(x: float, lo: float, hi: float, n: int = 21) -> str:
        a, b = max(lo, x - 0.25 * L), min(hi, x + 0.25 * L)
        return f"{a:.4g}:{b:.4g}:{n}"

    for s in design.supports:
        out.append({"path": f"supports.{s.id}.x_mm", "label": f"position of support {s.id} [mm]",
                    "current": s.x_mm, "range": span(s.x_mm, 0.0, L)})
    for e in design.elements:
        out.append({"path": f"elements.{e.id}.x_mm", "label": f"position of {e.kind.replace('_', ' ')} {e.id} [mm]",
                    "current": e.x_mm, "range": span(e.x_mm, 0.0, L)})
    for i, g in enumerate(design.shaft.segments):
        out.append({"path": f"shaft.segments[{i}].d_mm", "label": f"diameter of segment {i + 1} [mm]",
                    "current": g.d_mm, "range": f"{max(g.bore_mm + 1, 0.8 * g.d_mm):.4g}:{1.25 * g.d_mm:.4g}:21"})
    for s in design.supports:
        if s.bearing_type is not None:
            out.append({"path": f"supports.{s.id}.bearing_type", "label": f"bearing type at {s.id}",
                        "current": s.bearing_type, "range": "*"})
    out.append({"path": "arrangement", "label": "bearing arrangement (outermost supports)",
                "current": None, "range": "*"})
    return out


def _design_from(request: Request, d: str | None) -> tuple[Any, list[Issue]]:
    if not d:
        return _demo(), []
    try:
        return decode_design(d), []
    except DesignError as exc:
        return _demo(), list(exc.errors)


def page_context(data: Any, issues: list[Issue], options_of, default_title: str) -> dict[str, Any]:
    """What the study and the search pages share: the design (or its problems, added to
    ``issues``), the variables ``options_of(design)`` offers, the title and the scripts."""
    design, opts = None, []
    try:
        design = engine.parse_design(data)
        opts = options_of(design)
    except DesignError as exc:
        issues = issues + list(exc.errors)
    return {"title": (data.get("name") if isinstance(data, dict) else None) or default_title,
            "design_json": json.dumps(data, ensure_ascii=False), "design": design, "issues": issues,
            "options": opts, "plotly_src": _plotly_src(), "engine_version": engine.__version__}


def _render_page(request: Request, data: Any, issues: list[Issue], status_code: int = 200) -> HTMLResponse:
    ctx = page_context(data, issues, variable_options, "Study") | {"arrangements": ARRANGEMENTS, "back": "/"}
    return _templates().TemplateResponse(request, "study.html", ctx, status_code=status_code)


@router.get("/study", response_class=HTMLResponse)
def study_page(request: Request, d: str | None = None) -> HTMLResponse:
    """The study page on the design of the link (or the demo design)."""
    data, issues = _design_from(request, d)
    return _render_page(request, data, issues)


@router.post("/study/open")
async def study_open(request: Request) -> Response:
    """From the editor: its form state in, a redirect to the study page on that design out."""
    from app import web

    form = {k: v for k, v in (await request.form()).items() if isinstance(v, str)}
    _, data, _ = await run_in_threadpool(web.read_form, form)
    url = "/study?d=" + encode_design(data)
    return Response(status_code=200, headers={"HX-Redirect": url})


def _form_design(form: dict[str, str]) -> Any:
    return _guard(parse_json(form.get("design", "") or "null"))  # size, depth, counts (413/422)


def _vary_of(form: dict[str, str]) -> list[str]:
    out = []
    for k in ("1", "2"):
        path, spec = form.get(f"var{k}", "").strip(), form.get(f"range{k}", "").strip()
        if path:
            out.append(f"{path}={spec}")
    return out


def _fragment(request: Request, name: str, ctx: dict, status_code: int = 200) -> HTMLResponse:
    return _templates().TemplateResponse(request, name, ctx, status_code=status_code)


def _result_fragment(request: Request, res: StudyResult, *, over_budget: bool = False) -> HTMLResponse:
    ctx = {"res": res, "plot_json": json.dumps(_clean(study_plot(res))), "table": _table(res),
           "budget_s": get_settings().study_budget_s if over_budget else None}
    return _fragment(request, "partials/study_result.html", ctx)


def _fault_fragment(request: Request, exc: Exception) -> HTMLResponse:
    return _fragment(request, "partials/study_errors.html",
                     {"issues": [Issue(path="", message=f"the study could not be run ({type(exc).__name__}: {exc})")]}, 422)


def _start_job(data: Any, study) -> str | None:
    """Start the study as a job (app.jobs); its key, or None when too many run already. It
    stops between chunks: on request, or at the study budget."""
    budget_s = get_settings().study_budget_s

    def work(job: jobs.Job) -> StudyResult:
        res = run_study(data, study, progress=lambda done, total: job.report(done=done),
                        stop=lambda: job.stop_requested() or job.elapsed_s > budget_s)
        job.report(over_budget=not job.stop_requested() and res.stopped)
        return res

    return jobs.start("study", work, done=0, total=study.n_variants, over_budget=False)


def _busy_issue() -> Issue:
    return Issue(path="", message=f"{jobs.MAX_RUNNING} studies and searches are running on this server; "
                                  "wait for one to finish and run this one again")


def _progress_fragment(request: Request, key: str, job: jobs.Job) -> HTMLResponse:
    done, total = job.figures["done"], job.figures["total"]
    pct = int(100 * done / total) if total else 0
    n = lambda v: "{:,}".format(v).replace(",", " ")  # noqa: E731
    label = (("Stopping after the variants in hand: " if job.stop_requested() else "Solving: ")
             + f"{n(done)} of {n(total)} variants done ({pct} %)")
    return _fragment(request, "partials/job_progress.html",
                     {"name": "study", "url": f"/study/job/{key}", "target": "study-result", "label": label,
                      "max": total, "value": done, "pct": pct, "stopping": job.stop_requested()})


@router.post("/study/run", response_class=HTMLResponse)
async def study_run(request: Request) -> HTMLResponse:
    """Run the study of the page's form: the plots and the table (422: the messages). A study
    of more than one chunk runs as a job: the answer is its progress fragment."""
    form = {k: v for k, v in (await request.form()).items() if isinstance(v, str)}
    def answer() -> HTMLResponse:  # off the event loop
        try:
            data = _form_design(form)
            vary = _vary_of(form)
            study = parse_study(data, vary)
            if study.n_variants <= CHUNK:  # one chunk: in a child process, stopped at the budget
                return _result_fragment(request, _bounded(run_study, data, vary))
        except DesignError as exc:
            return _fragment(request, "partials/study_errors.html", {"issues": exc.errors},
                             getattr(exc, "status_code", 422))
        key = _start_job(data, study)
        if key is None:
            return _fragment(request, "partials/study_errors.html", {"issues": [_busy_issue()]}, 503)
        return _progress_fragment(request, key, jobs.get("study", key))

    return await run_in_threadpool(answer)


@router.get("/study/job/{key}", response_class=HTMLResponse)
def study_job(request: Request, key: str) -> HTMLResponse:
    """A running study's progress fragment, or its result once it has finished."""
    job = jobs.get("study", key)
    if job is None:
        return _fragment(request, "partials/study_errors.html", {"issues": [Issue(
            path="", message="this study is no longer on the server (it finished long ago, or the "
                             "server restarted); run it again")]}, 404)
    if not job.finished.is_set():
        return _progress_fragment(request, key, job)
    if isinstance(job.error, DesignError):
        return _fragment(request, "partials/study_errors.html", {"issues": job.error.errors}, 422)
    if job.error is not None:
        return _fault_fragment(request, job.error)
    return _result_fragment(request, job.result, over_budget=job.figures["over_budget"])


@router.post("/study/job/{key}/stop", response_class=HTMLResponse)
def study_job_stop(request: Request, key: str) -> HTMLResponse:
    """Ask a running study to stop after the chunk it is solving; the next poll shows the
    variants solved so far."""
    job = jobs.get("study", key)
    if job is None:
        return HTMLResponse("", status_code=404)
    job.stop.set()
    return _progress_fragment(request, key, job)


@router.post("/study/arrangements", response_class=HTMLResponse)
async def study_arrangements(request: Request) -> HTMLResponse:
    """The arrangement comparison of the page's design (fragment)."""
    form = {k: v for k, v in (await request.form()).items() if isinstance(v, str)}

    def answer() -> HTMLResponse:
        try:
            cmp = _bounded(compare_arrangements, _form_design(form))
        except DesignError as exc:
            return _fragment(request, "partials/study_errors.html", {"issues": exc.errors},
                             getattr(exc, "status_code", 422))
        return _fragment(request, "partials/study_arrangements.html", {"cmp": cmp})

    return await run_in_threadpool(answer)


@router.post("/study/apply", response_class=HTMLResponse)
async def study_apply(request: Request) -> HTMLResponse:
    """Take a variant into the design: the editor opened on the design with the values set
    (``arrangement`` as a variable, or ``take_arrangement`` from the comparison)."""
    form = {k: v for k, v in (await request.form()).items() if isinstance(v, str)}
    return await run_in_threadpool(_apply, request, form)


def _apply(request: Request, form: dict[str, str]) -> HTMLResponse:
    from app.routers.pages import render_editor
    from engine.study import arrangement_design

    try:
        data = _form_design(form)
        design = engine.parse_design(data)
        base = design.model_dump(mode="json")
        if form.get("take_arrangement"):
            new = arrangement_design(base, form["take_arrangement"])
        else:
            vary = []
            for k in ("1", "2"):
                if form.get(f"var{k}"):
                    vary.append(f"{form[f'var{k}']}={form.get(f'value{k}', '')}")
            study = parse_study(design, vary)
            new = apply_values(base, study, [v[0] for v in study.values])
        engine.parse_design(new)
    except DesignError as exc:
        return _fragment(request, "partials/study_errors.html", {"issues": exc.errors}, 422)
    key = "/study/apply:" + hashlib.sha1(json.dumps(new, sort_keys=True).encode()).hexdigest()[:12]
    return render_editor(request, new, title=new.get("name"), storage_key=key)


# --- plots and table --------------------------------------------------------------------------

_OK_FILL = "rgba(46, 125, 90, 0.14)"
_FIGS = (("life", "bearing life [h]"), ("safety_factor", "shaft safety factor [-]"),
         ("slope", "slope at bearings [mrad]"), ("critical_speed_rpm", "first critical speed [rpm]"))


def _axis_values(var, values: tuple) -> tuple[list, str]:
    if var.kind == "number":
        return list(values), "linear"
    return [str(v) for v in values], "category"


def _runs(mask: list[bool]) -> list[tuple[int, int]]:
    out, start = [], None
    for i, m in enumerate(mask + [False]):
        if m and start is None:
            start = i
        elif not m and start is not None:
            out.append((start, i - 1))
            start = None
    return out


def study_plot(res: StudyResult) -> dict[str, Any]:
    """Plotly figure data: one variable -> four stacked line charts against it; two ->
    four heat maps. Current design marked; the region meeting every requirement shaded."""
    ids = [b.id for b in res.base.bearings] or sorted({b.id for v in res.variants for b in v.bearings})
    req = res.requirements
    meta = {"variables": [v.model_dump(mode="json") for v in res.variables],
            "values": [list(v) for v in res.values], "ok": [bool(v.ok) for v in res.variants]}
    if len(res.variables) == 1:
        var = res.variables[0]
        x, xtype = _axis_values(var, res.values[0])
        traces: list[dict] = []
        shapes: list[dict] = []
        for i in ids:
            traces.append({"type": "scatter", "mode": "lines+markers", "name": f"life {i}", "x": x,
                           "y": [next((b.life_h for b in v.bearings if b.id == i), None) for v in res.variants],
                           "xaxis": "x", "yaxis": "y", "marker": {"size": 4}})
        traces.append({"type": "scatter", "mode": "lines+markers", "name": "safety factor", "x": x,
                       "y": [v.safety_factor for v in res.variants], "xaxis": "x", "yaxis": "y2", "marker": {"size": 4}})
        for i in ids:
            traces.append({"type": "scatter", "mode": "lines+markers", "name": f"slope {i}", "x": x,
                           "y": [next((None if b.slope_rad is None else b.slope_rad * 1e3
                                       for b in v.bearings if b.id == i), None) for v in res.variants],
                           "xaxis": "x", "yaxis": "y3", "marker": {"size": 4}})
        traces.append({"type": "scatter", "mode": "lines+markers", "name": "critical speed", "x": x,
                       "y": [v.critical_speed_rpm for v in res.variants], "xaxis": "x", "yaxis": "y4",
                       "marker": {"size": 4}})
        limits = [("y", req.get("life_h"), "required life"),
                  ("y2", req.get("fatigue_safety_min"), "required safety")]
        lims = {b.id: b.slope_limit_rad for b in res.base.bearings if b.slope_limit_rad}
        for i, lim in lims.items():
            limits.append(("y3", lim * 1e3, f"slope limit {i}"))
        if res.base.max_speed_rpm and req.get("critical_speed_margin_pct") is not None:
            limits.append(("y4", res.base.max_speed_rpm / (1 - req["critical_speed_margin_pct"] / 100.0),
                           "speed + margin"))
        for ax, val, name in limits:
            if val:
                shapes.append({"type": "line", "xref": "paper", "x0": 0, "x1": 1, "yref": ax, "y0": val, "y1": val,
                               "line": {"dash": "dot", "width": 1, "color": "#9a3b2f"}, "name": name})
        ok = [bool(v.ok) for v in res.variants]
        for a, b in _runs(ok):
            if xtype == "linear":
                x0 = x[a] - (0.5 * (x[a + 1] - x[a]) if a + 1 < len(x) else 0)
                x1 = x[b] + (0.5 * (x[b] - x[b - 1]) if b > 0 else 0)
                x0, x1 = (x[a] if a == 0 else x0), (x[b] if b == len(x) - 1 else x1)
            else:
                x0, x1 = a - 0.5, b + 0.5
            shapes.append({"type": "rect", "xref": "x", "yref": "paper", "x0": x0, "x1": x1, "y0": 0, "y1": 1,
                           "fillcolor": _OK_FILL, "line": {"width": 0}, "layer": "below"})
        cur = var.current
        if cur is not None:
            shapes.append({"type": "line", "xref": "x", "yref": "paper", "x0": cur, "x1": cur, "y0": 0, "y1": 1,
                           "line": {"dash": "dash", "width": 1.5, "color": "#27343c"}})
        layout = {
            "height": 760, "margin": {"l": 70, "r": 20, "t": 30, "b": 50}, "showlegend": True,
            "legend": {"orientation": "h", "y": 1.06}, "shapes": shapes, "hovermode": "x unified",
            "xaxis": {"title": {"text": var.path + (f" [{var.unit}]" if var.unit else "")}, "type": xtype,
                      "anchor": "y4"},
            "yaxis": {"title": {"text": "life [h]"}, "type": "log", "domain": [0.78, 1.0]},
            "yaxis2": {"title": {"text": "safety [-]"}, "domain": [0.53, 0.75]},
            "yaxis3": {"title": {"text": "slope [mrad]"}, "domain": [0.28, 0.50]},
            "yaxis4": {"title": {"text": "critical [rpm]"}, "domain": [0.0, 0.25]},
            "annotations": [{"text": "shaded: meets every requirement · dashed: current design", "xref": "paper",
                             "yref": "paper", "x": 1, "y": -0.07, "showarrow": False, "xanchor": "right",
                             "font": {"size": 11}}],
            "meta": meta,
        }
        return {"data": traces, "layout": layout}

    # two variables: heat maps
    va, vb = res.variables
    xa, ta = _axis_values(va, res.values[0])
    xb, tb = _axis_values(vb, res.values[1])
    na, nb = res.shape

    def grid(get) -> list[list]:
        z = [[None] * na for _ in range(nb)]  # rows: second variable (y), columns: first (x)
        for k, v in enumerate(res.variants):
            i, j = divmod(k, nb)
            z[j][i] = get(v)
        return z

    panels = [
        ("min life [h] (log10)", lambda v: None if not v.min_life_h else math.log10(max(v.min_life_h, 1e-9))),
        ("safety factor [-]", lambda v: v.safety_factor),
        ("max slope at bearing [mrad]", lambda v: None if v.max_slope_rad is None else v.max_slope_rad * 1e3),
        ("critical speed [rpm]", lambda v: v.critical_speed_rpm),
    ]
    okz = grid(lambda v: 1.0 if v.ok else None)
    traces, layout = [], {"height": 900, "margin": {"l": 70, "r": 40, "t": 40, "b": 60}, "meta": meta,
                          "annotations": [], "showlegend": False}
    doms = [([0.0, 0.43], [0.6, 0.97]), ([0.57, 1.0], [0.6, 0.97]), ([0.0, 0.43], [0.0, 0.37]), ([0.57, 1.0], [0.0, 0.37])]
    for p, ((title, get), (dx, dy)) in enumerate(zip(panels, doms), start=1):
        sx = "" if p == 1 else str(p)
        cb_x = dx[1] + 0.005
        traces.append({"type": "heatmap", "x": xa, "y": xb, "z": grid(get), "xaxis": f"x{sx}", "yaxis": f"y{sx}",
                       "colorscale": "Viridis", "colorbar": {"len": 0.4, "x": cb_x, "y": (dy[0] + dy[1]) / 2,
                                                             "thickness": 10}, "name": title,
                       "hovertemplate": "%{x}, %{y}: %{z:.4g}<extra>" + title + "</extra>"})
        traces.append({"type": "heatmap", "x": xa, "y": xb, "z": okz, "xaxis": f"x{sx}", "yaxis": f"y{sx}",
                       "showscale": False, "hoverinfo": "skip", "zmin": 0, "zmax": 1,
                       "colorscale": [[0, "rgba(255,255,255,0)"], [1, "rgba(255,255,255,0.35)"]]})
        if va.current is not None and vb.current is not None:
            traces.append({"type": "scatter", "mode": "markers", "x": [va.current], "y": [vb.current],
                           "xaxis": f"x{sx}", "yaxis": f"y{sx}", "name": "current design", "hoverinfo": "name",
                           "marker": {"symbol": "x", "size": 11, "color": "#e4572e", "line": {"width": 1}}})
        layout[f"xaxis{sx}"] = {"domain": dx, "type": ta, "anchor": f"y{sx}",
                                "title": {"text": va.path + (f" [{va.unit}]" if va.unit else "")}}
        layout[f"yaxis{sx}"] = {"domain": dy, "type": tb, "anchor": f"x{sx}",
                                "title": {"text": vb.path + (f" [{vb.unit}]" if vb.unit else "")}}
        layout["annotations"].append({"text": title, "xref": "paper", "yref": "paper", "x": (dx[0] + dx[1]) / 2,
                                      "y": dy[1] + 0.01, "showarrow": False, "yanchor": "bottom"})
    layout["annotations"].append({"text": "lighter veil: meets every requirement · ×: current design",
                                  "xref": "paper", "yref": "paper", "x": 1, "y": -0.06, "showarrow": False,
                                  "xanchor": "right", "font": {"size": 11}})
    return {"data": traces, "layout": layout}


def _table(res: StudyResult) -> dict[str, Any]:
    from app.study_cli import study_rows

    head, rows = study_rows(res)
    return {"head": head, "rows": rows, "n_vars": len(res.variables)}
