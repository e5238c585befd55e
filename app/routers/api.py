"""Router: the JSON API and its offline documentation page.

- ``POST /api/solve``: a design document (``shaft-design/1``) in, a result (``shaft-result/1``)
  out. Bad input gives 422 with ``{"errors": [{"path": "supports[1].x_mm", "message": ...}]}``.
- ``GET /api/health``: liveness and versions.
- ``GET /docs``: the API described from the app's own OpenAPI document, rendered by the server
  with no script or style from outside the app (the default interactive docs load theirs from
  a CDN, which an offline tool cannot). ``/openapi.json`` stays where FastAPI puts it.
"""
from __future__ import annotations

import json
import logging
from typing import Any

from fastapi import APIRouter, Request
from fastapi.responses import HTMLResponse, JSONResponse

import engine
from starlette.concurrency import run_in_threadpool

from app import work
from app.limits import parse_json, read_body
from app.schema import body_model, schemas_html

__all__ = ["router", "solve_document"]

log = logging.getLogger("shaftwright.api")
router = APIRouter()

_DESIGN_EXAMPLE = {
    "format": "shaft-design/1", "name": "two-bearing shaft (invented example)",
    "shaft": {"segments": [{"length_mm": 300, "d_mm": 40}]},
    "supports": [{"id": "A", "x_mm": 20, "bearing_type": "deep_groove_ball", "axial": "both"},
                 {"id": "B", "x_mm": 280, "bearing_type": "deep_groove_ball", "axial": "none"}],
    "elements": [{"id": "F1", "kind": "force", "x_mm": 150, "Fy_N": -2000}],
    "load_cases": [{"name": "normal", "time_fraction": 1, "speed_rpm": 1000}],
}


def solve_document(data: Any) -> tuple[int, dict]:
    """Solve a design mapping: (200, result document) or (422, {"errors": [...]}).

    An engine fault (a bug, not bad input) is logged and answered like the editor answers it,
    as a message at the design's root, so that a client always gets an errors list."""
    try:
        result = work.solve(data)  # bounded in time, cached by content
    except engine.DesignError as exc:
        return (getattr(exc, "status_code", 422),  # 413: too large or too much work
                {"errors": [{"path": i.path, "message": i.message} for i in exc.errors]})
    except work.ServerBusy:  # 503 with Retry-After (app/errors.py), not a fault of the design
        raise
    except Exception as exc:  # noqa: BLE001 - never a bare 500 for a design
        log.exception("engine failed")
        return 422, {"errors": [{"path": "", "message": "the engine could not solve this design "
                                                       f"({type(exc).__name__}: {exc})"}]}
    return 200, result.model_dump(mode="json")


@router.post(
    "/api/solve", tags=["api"], summary="Solve a design",
    openapi_extra={"requestBody": {"required": True, "content": {"application/json": {
        "schema": {"type": "object", "description": "a design document, format shaft-design/1"},
        "example": _DESIGN_EXAMPLE}}}},
    responses={200: {"description": "the result document, format shaft-result/1"},
               422: {"description": "bad input: every problem with its key path",
                     "content": {"application/json": {"example": {"errors": [
                         {"path": "supports[1].x_mm", "message": "B at x = 900 mm lies off the shaft (length 300 mm)"}]}}}}},
)
async def api_solve(request: Request) -> JSONResponse:
    """A design document in, a result document out (422 with key paths for bad input)."""
    raw = await read_body(request)

    def answer() -> JSONResponse:
        data = parse_json(raw)  # size, depth and count limits; JSON without NaN (else 413/422)
        code, doc = solve_document(data)
        return JSONResponse(status_code=code, content=doc)

    return await run_in_threadpool(answer)


@router.get("/api/health", tags=["api"], summary="Liveness and versions")
async def api_health() -> dict:
    """On the event loop on purpose: no store, no engine, so it answers even when every
    thread of the pool waits for a solve."""
    return {"status": "ok", "engine_version": engine.__version__,
            "formats": {"design": "shaft-design/1", "result": "shaft-result/1"}}


_DOCS_CSS = """body{font:14px/1.5 ui-sans-serif,system-ui,sans-serif;color:#27343c;background:#f6f3ea;margin:0}
main{max-width:960px;margin:0 auto;padding:16px 24px}h1{font-size:20px}h2{font-size:15px;margin:22px 0 6px;border-bottom:1px solid #d9d3c2}
.op{background:#fffdf7;border:1px solid #d9d3c2;padding:8px 12px;margin:8px 0}.m{font:600 12px ui-monospace,monospace;padding:1px 6px;
border-radius:2px;background:#1f5d63;color:#fff}.m.get{background:#2d6a3e}code,pre{font:12px ui-monospace,monospace}pre{background:#fbfaf5;
border:1px solid #ebe6d7;padding:6px;overflow:auto;max-height:320px}
table{border-collapse:collapse;font-size:12.5px;margin:4px 0 12px}td,th{border:1px solid #ebe6d7;padding:2px 6px;text-align:left;vertical-align:top}
h3{font-size:14px;margin:16px 0 4px}.caution{background:#f3ead1;padding:6px 10px;font-size:12.5px}"""


@router.get("/docs", include_in_schema=False, response_class=HTMLResponse)
def api_docs(request: Request) -> HTMLResponse:
    """The API, described from the app's OpenAPI document, with nothing loaded from outside."""
    from html import escape

    spec = request.app.openapi()
    parts = [f"<!doctype html><html lang='en'><head><meta charset='utf-8'><title>Shaftwright API</title>"
             f"<link rel='icon' href='data:,'><style>{_DOCS_CSS}</style></head><body><main>"
             f"<h1>{escape(spec.get('info', {}).get('title', 'API'))} API "
             f"<small>{escape(str(spec.get('info', {}).get('version', '')))}</small></h1>"
             f"<p>{escape(spec.get('info', {}).get('description', ''))}</p>"
             "<p class='caution'>Results inform preliminary design only; the bundled bearing ratings are illustrative. "
             "The final design needs the supplier's data, the applicable codes and a qualified engineer's check.</p>"
             "<p>The machine-readable description: <a href='/openapi.json'>/openapi.json</a> (OpenAPI "
             f"{escape(str(spec.get('openapi', '')))}). Design and result formats: <code>shaft-design/1</code>, "
             "<code>shaft-result/1</code>.</p>"]
    for path, ops in sorted(spec.get("paths", {}).items()):
        for method, op in ops.items():
            parts.append(f"<div class='op'><span class='m {escape(method)}'>{escape(method.upper())}</span> "
                         f"<code>{escape(path)}</code> — {escape(op.get('summary', ''))}")
            if op.get("description"):
                parts.append(f"<p>{escape(op['description'])}</p>")
            body = op.get("requestBody", {}).get("content", {}).get("application/json", {})
            if body_model(body.get("schema")):
                parts.append("<p>Request body: " + " or ".join(
                    f"<a href='#schema-{escape(m)}'>{escape(m)}</a>" for m in body_model(body.get("schema"))) + "</p>")
            ex = body.get("example")
            if ex is not None:
                parts.append("<p>Example request body:</p><pre>" + escape(json.dumps(ex, indent=1)) + "</pre>")
            for code, resp in op.get("responses", {}).items():
                models = body_model(resp.get("content", {}).get("application/json", {}).get("schema"))
                parts.append(f"<p><b>{escape(code)}</b> {escape(resp.get('description', ''))}"
                             + "".join(f" <a href='#schema-{escape(m)}'>{escape(m)}</a>" for m in models) + "</p>")
                rex = resp.get("content", {}).get("application/json", {}).get("example")
                if rex is not None:
                    parts.append("<pre>" + escape(json.dumps(rex, indent=1)) + "</pre>")
            parts.append("</div>")
    parts.append(schemas_html(spec))
    parts.append("<p><a href='/'>back to the designer</a></p></main></body></html>")
    return HTMLResponse("".join(parts))
