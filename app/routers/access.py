"""Router: signing in and out, and a design's share links.

Pages and forms
- ``GET /login`` (``?next=/path``), ``POST /login`` (``name``, ``password``, ``next``): a
  session cookie for an account, then back to ``next``; ``POST /logout`` ends the session.
- ``GET /s/{secret}``: a share link. Opens a session bound to the link's design and role,
  then the design (a signed-in account keeps its own session and is just taken there).
- ``POST /d/{id}/links`` (``role`` = ``view`` | ``edit``, ``link_label``) and
  ``POST /d/{id}/links/{link_id}/revoke``: the links list of the design's page
  (``partials/links.html``), answered with that list again; a new link's address is shown
  once (only its hash is kept).

JSON API
- ``GET /openapi.json``: the app's OpenAPI document.
- ``GET /api/designs/{id}/links``: the design's links (no secrets).
- ``POST /api/designs/{id}/links`` ``{"role": "view" | "edit", "label": ""}`` → 201 with
  ``url`` (shown once).
- ``DELETE /api/designs/{id}/links/{link_id}``: revoke.

Only an account (or anyone on an open server) manages links; a link's holder cannot.
"""
from __future__ import annotations

import secrets
from typing import Any

from fastapi import APIRouter, Form, Request
from fastapi.responses import HTMLResponse, JSONResponse, RedirectResponse, Response

from app import auth
from app.note import TEMPLATES
from app.security import Refused
from app.store import NotFound, ShareLink, StoreDep, is_design_id
from engine.model import DesignError

__all__ = ["router", "links_for_page", "MAX_LABEL"]

router = APIRouter()
MAX_LABEL = 80


def _safe_next(target: str | None) -> str:
    """A local path to go back to after signing in (anything else: the start page)."""
    if not target or not target.startswith("/") or target.startswith("//") or "\\" in target:
        return "/"
    return target


def _cookie(response: Response, request: Request, secret: str) -> None:
    response.set_cookie(auth.SESSION_COOKIE, secret, max_age=auth.SESSION_DAYS * 86400,
                        httponly=True, samesite="lax", secure=request.url.scheme == "https",
                        path="/")


def _start_session(request: Request, store, response: Response, **who: Any) -> None:
    old = request.cookies.get(auth.SESSION_COOKIE)
    if old:
        store.end_session(auth.sha256(old))
    secret = auth.new_secret()
    store.add_session(auth.sha256(secret), csrf_token=auth.new_secret(),
                      expires_at=auth.session_expiry(), **who)
    _cookie(response, request, secret)


# --- signing in and out ------------------------------------------------------------------------

def _login_page(request: Request, store, *, next_: str, name: str = "", error: str = "",
                status_code: int = 200) -> HTMLResponse:
    return TEMPLATES.TemplateResponse(request, "login.html", {
        "next": _safe_next(next_), "name": name, "error": error,
        "has_accounts": store.has_accounts()}, status_code=status_code)


@router.get("/login", response_class=HTMLResponse, include_in_schema=False)
def login_page(request: Request, store: StoreDep, next: str = "/") -> HTMLResponse:  # noqa: A002
    return _login_page(request, store, next_=next)


@router.post("/login", response_class=HTMLResponse, include_in_schema=False)
def login(request: Request, store: StoreDep, name: str = Form(""), password: str = Form(""),
          next: str = Form("/")) -> Response:  # noqa: A002
    """Check the name and password (Argon2, in the thread pool); a session on success."""
    name = name.strip()
    ok = auth.valid_name(name) and len(password) <= 1024 and auth.verify_password(
        store.password_hash(name) if auth.valid_name(name) else None, password)
    if not ok:
        return _login_page(request, store, next_=next, name=name, status_code=401,
                           error="The name or the password is not right.")
    response = RedirectResponse(_safe_next(next), status_code=303)
    _start_session(request, store, response, account=name)
    return response


@router.post("/logout", include_in_schema=False)
def logout(request: Request, store: StoreDep) -> Response:
    old = request.cookies.get(auth.SESSION_COOKIE)
    if old:
        store.end_session(auth.sha256(old))
    response = RedirectResponse("/login" if store.has_accounts() else "/", status_code=303)
    response.delete_cookie(auth.SESSION_COOKIE, path="/")
    return response


@router.get("/s/{secret}", include_in_schema=False)
def open_link(request: Request, secret: str, store: StoreDep) -> Response:
    """A share link: a session for its design and role, then the design."""
    link = store.link_by_token_hash(auth.sha256(secret)) if 20 <= len(secret) <= 100 else None
    if link is None or link.revoked_at is not None:
        return TEMPLATES.TemplateResponse(request, "revisions.html", {
            "missing": "This share link does not work: it was revoked, or it is not complete",
            "design_id": None}, status_code=404)
    response = RedirectResponse(f"/d/{link.design_id}", status_code=303)
    if auth.principal_of(request).kind != "account":
        _start_session(request, store, response, link_id=link.id)
    return response


# --- a design's links --------------------------------------------------------------------------

def _may_manage(request: Request) -> bool:
    return auth.principal_of(request).kind in ("open", "account")


def links_for_page(request: Request, store, design_id: str) -> list[ShareLink] | None:
    """The design's links for its page, or None when the viewer may not manage them."""
    return store.links(design_id) if _may_manage(request) else None


def _make_link(request: Request, store, design_id: str, role: str, label: str) -> tuple[ShareLink, str]:
    if not is_design_id(design_id):
        raise NotFound(f"no design {design_id!r}")
    if not isinstance(role, str) or role not in auth.ROLES:
        raise Refused("a link's role is 'view' (read-only) or 'edit'", 422)
    if not isinstance(label, str):
        raise Refused("a link's label is text", 422)
    label = label.strip()
    if len(label) > MAX_LABEL:
        raise Refused(f"a link's label is at most {MAX_LABEL} characters", 422)
    secret = auth.new_secret()
    p = auth.principal_of(request)
    link = store.add_link(design_id, link_id=secrets.token_hex(6), role=role,
                          token_hash=auth.sha256(secret), label=label,
                          created_by=p.name if p.kind == "account" else "")
    return link, f"{str(request.base_url).rstrip('/')}/s/{secret}"


def _links_fragment(request: Request, store, design_id: str, *, new_link: dict | None = None,
                    status_code: int = 200) -> HTMLResponse:
    return TEMPLATES.TemplateResponse(request, "partials/links.html", {
        "design_id": design_id, "links": store.links(design_id), "new_link": new_link},
        status_code=status_code)


def _not_found(exc: NotFound) -> JSONResponse:
    return JSONResponse({"detail": str(exc)}, status_code=404)


@router.post("/d/{design_id}/links", response_class=HTMLResponse, include_in_schema=False)
def make_link_form(request: Request, design_id: str, store: StoreDep, role: str = Form("view"),
                   link_label: str = Form("")) -> Response:
    try:
        link, url = _make_link(request, store, design_id, role, link_label)
    except NotFound as exc:
        return _not_found(exc)
    return _links_fragment(request, store, design_id,
                           new_link={"url": url, "role": link.role, "id": link.id})


@router.post("/d/{design_id}/links/{link_id}/revoke", response_class=HTMLResponse,
             include_in_schema=False)
def revoke_link_form(request: Request, design_id: str, link_id: str, store: StoreDep) -> Response:
    try:
        store.revoke_link(design_id, link_id)
    except NotFound as exc:
        return _not_found(exc)
    return _links_fragment(request, store, design_id)


@router.get("/openapi.json", include_in_schema=False)
def openapi_document(request: Request) -> JSONResponse:
    """The app's OpenAPI document (here, not FastAPI's own route, so that it needs a sign-in
    once accounts exist, like every other route)."""
    return JSONResponse(request.app.openapi())


def _link_json(link: ShareLink) -> dict[str, Any]:
    return link.model_dump()


@router.get("/api/designs/{design_id}/links", tags=["api"], summary="A design's share links")
def list_links(design_id: str, store: StoreDep) -> JSONResponse:
    if not is_design_id(design_id):
        return _not_found(NotFound(f"no design {design_id!r}"))
    return JSONResponse({"id": design_id, "links": [_link_json(k) for k in store.links(design_id)]})


@router.post("/api/designs/{design_id}/links", status_code=201, tags=["api"],
             summary="Make a share link (role view or edit); its address is answered once")
async def make_link(request: Request, design_id: str, store: StoreDep) -> JSONResponse:
    from starlette.concurrency import run_in_threadpool

    from app.limits import read_json

    try:
        body = await read_json(request)
    except DesignError as exc:
        return JSONResponse({"detail": str(exc) or "invalid request", "errors": [
            {"path": i.path, "message": i.message} for i in exc.errors]},
            status_code=getattr(exc, "status_code", 422))
    if not isinstance(body, dict):
        raise Refused("the body must be a JSON object {\"role\": \"view\" | \"edit\", \"label\": …}", 422)
    try:
        link, url = await run_in_threadpool(_make_link, request, store, design_id,
                                            body.get("role", "view"), body.get("label") or "")
    except NotFound as exc:
        return _not_found(exc)
    return JSONResponse({**_link_json(link), "url": url}, status_code=201)


@router.delete("/api/designs/{design_id}/links/{link_id}", tags=["api"], summary="Revoke a share link")
def revoke_link(design_id: str, link_id: str, store: StoreDep) -> JSONResponse:
    try:
        store.revoke_link(design_id, link_id)
    except NotFound as exc:
        return _not_found(exc)
    return JSONResponse({"id": design_id, "link": link_id, "revoked": True})
