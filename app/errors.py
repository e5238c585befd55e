"""One error policy: typed errors in, one kind of answer out, whatever the route.

:func:`install` registers an exception handler per typed error on the app:

======================================  ======  ==============================================
error                                   status  meaning
======================================  ======  ==============================================
:class:`engine.DesignError` (and        422     bad input: each problem with its key path
:class:`app.limits.LimitError`)         (413)   (``status_code`` 413: too large, too much work)
:class:`app.store.NotFound`             404     no such design, revision or record
:class:`Conflict`                       409     a save that clashes with a newer revision
:class:`app.store.StoreUnavailable`     503     the store cannot be written (read-only, full
                                                disk, locked); ``Retry-After`` says when to
                                                try again, nothing the user typed is lost
``app.work.ServerBusy``                  503     every worker process busy for the whole budget
anything else                           500     a page in words with an error id; the same id
                                                and the traceback go to the log
======================================  ======  ==============================================

The answer takes the form the client reads: JSON (``{"detail", "errors": [{"path",
"message"}], "error_id"}``) for ``/api/…`` and clients that ask for JSON; for an htmx request
an alert fragment swapped out of band into ``#sw-alert`` (the bar every page has; htmx is
configured in ``templates/base.html`` to process 4xx/5xx answers), leaving the panel that
asked as it was; otherwise a full page (``templates/error.html``).

Routes raise; they do not choose status codes for these errors themselves.
"""
from __future__ import annotations

import logging
import secrets
from typing import Any

from fastapi import FastAPI, Request
from fastapi.exceptions import RequestValidationError
from fastapi.responses import HTMLResponse, JSONResponse, Response
from starlette.exceptions import HTTPException as StarletteHTTPException

from app.store import NotFound, StoreUnavailable
from app.work import ServerBusy
from engine.model import DesignError

__all__ = ["Conflict", "install", "error_response", "RETRY_AFTER_S"]

log = logging.getLogger("shaftwright.errors")
RETRY_AFTER_S = 10


class Conflict(Exception):
    """A save refused because it clashes with a newer revision (409). ``body`` is the JSON
    answer (it names the clashing keys and the conflict record that keeps the document)."""

    def __init__(self, detail: str, body: dict[str, Any] | None = None):
        super().__init__(detail)
        self.detail = detail
        self.body = body or {}


def _wants_json(request: Request) -> bool:
    if request.url.path.startswith("/api/") or request.url.path == "/openapi.json":
        return True
    accept = request.headers.get("accept", "")
    return "application/json" in accept and "text/html" not in accept


def _templates():
    from app.routers.pages import templates

    return templates


def error_response(request: Request, status: int, detail: str, *,
                   errors: list[dict[str, str]] | None = None, error_id: str | None = None,
                   headers: dict[str, str] | None = None,
                   body: dict[str, Any] | None = None) -> Response:
    """The one shape of an error answer (JSON, htmx alert fragment, or page)."""
    headers = dict(headers or {})
    errors = errors or []
    if _wants_json(request):
        content = {"detail": detail, "errors": errors, **(body or {})}
        if error_id:
            content["error_id"] = error_id
        return JSONResponse(content, status_code=status, headers=headers)
    ctx = {"status": status, "detail": detail, "errors": errors, "error_id": error_id,
           "retry_after": headers.get("Retry-After")}
    if request.headers.get("hx-request"):
        headers["HX-Reswap"] = "none"  # the panel that asked stays as it was
        return _templates().TemplateResponse(request, "partials/error_alert.html", ctx,
                                              status_code=status, headers=headers)
    try:
        return _templates().TemplateResponse(request, "error.html", ctx, status_code=status,
                                             headers=headers)
    except Exception:  # noqa: BLE001 - the error page itself must not fail
        log.exception("error page failed")
        return HTMLResponse(f"<!doctype html><title>Error {status}</title><p>{status}: the server "
                            f"could not answer this request. Error id {error_id or '-'}.</p>",
                            status_code=status, headers=headers)


def _issues(exc: DesignError) -> list[dict[str, str]]:
    return [{"path": i.path, "message": i.message} for i in exc.errors]


async def _design_error(request: Request, exc: DesignError) -> Response:
    status = getattr(exc, "status_code", 422)
    issues = _issues(exc)
    detail = issues[0]["message"] if len(issues) == 1 else f"{len(issues)} problems with the input"
    return error_response(request, status, detail, errors=issues)


async def _not_found(request: Request, exc: NotFound) -> Response:
    return error_response(request, 404, str(exc))


async def _conflict(request: Request, exc: Conflict) -> Response:
    return error_response(request, 409, exc.detail, body=exc.body)


async def _store_unavailable(request: Request, exc: StoreUnavailable) -> Response:
    log.warning("store unavailable: %s (%s)", exc, getattr(exc, "where", ""))
    return error_response(request, 503, str(exc), headers={"Retry-After": str(RETRY_AFTER_S)})


async def _busy(request: Request, exc: ServerBusy) -> Response:
    log.warning("busy: %s", exc)
    return error_response(request, 503, str(exc), headers={"Retry-After": str(RETRY_AFTER_S)})


async def _request_invalid(request: Request, exc: RequestValidationError) -> Response:
    errors = []
    for e in exc.errors():
        loc = [str(p) for p in e.get("loc", ()) if p not in ("body", "query", "path")]
        errors.append({"path": ".".join(loc), "message": str(e.get("msg", "is not valid"))})
    return error_response(request, 422, "the request is not valid: " + "; ".join(
        f"{e['path']} {e['message']}".strip() for e in errors[:5]), errors=errors)


async def _http_error(request: Request, exc: StarletteHTTPException) -> Response:
    detail = exc.detail if isinstance(exc.detail, str) else "the request was refused"
    if exc.status_code == 404 and detail == "Not Found":
        detail = f"there is no page at {request.url.path}"
    return error_response(request, exc.status_code, detail, headers=getattr(exc, "headers", None))


async def _unexpected(request: Request, exc: Exception) -> Response:
    error_id = secrets.token_hex(4)
    log.error("error %s on %s %s", error_id, request.method, request.url.path, exc_info=exc)
    return error_response(request, 500, "Something went wrong on the server; your input is kept. "
                          f"Report error id {error_id} to whoever runs this server (it is in "
                          "the server's log).", error_id=error_id)


def install(app: FastAPI) -> None:
    """Register the handlers of the one error policy on ``app``."""
    app.add_exception_handler(DesignError, _design_error)
    app.add_exception_handler(NotFound, _not_found)
    app.add_exception_handler(Conflict, _conflict)
    app.add_exception_handler(StoreUnavailable, _store_unavailable)
    app.add_exception_handler(ServerBusy, _busy)
    app.add_exception_handler(RequestValidationError, _request_invalid)
    app.add_exception_handler(StarletteHTTPException, _http_error)
    app.add_exception_handler(Exception, _unexpected)
