"""Browser safety and access checks, applied to every route in one place.

:func:`install` adds to an app

- :class:`SecurityHeaders`, a middleware that puts :data:`SECURITY_HEADERS` on every
  response (pages, API, static files, errors): a Content-Security-Policy that lets the page
  run only the app's own script files (no inline script, no ``eval``) and load nothing from
  elsewhere, ``frame-ancestors 'none'``, ``X-Content-Type-Options: nosniff`` and
  ``Referrer-Policy: same-origin`` (a design's id travels in its URLs; it must not leave the
  site in a Referer). No ``server`` header is sent (``app.server`` turns uvicorn's off).
- :data:`GUARD`, the dependency every router is included with. For each request it
  1. refuses (403) a state-changing request (POST, PUT, PATCH, DELETE) that a browser marks as
     coming from another origin: its ``Origin`` header, or its ``Referer`` when there is no
     ``Origin``, names another scheme, host or port (``Origin: null`` too). A script or
     command-line client sends neither and is not affected;
  2. finds who asks (:func:`app.auth.identify`, off the event loop) and whether they may
     (:func:`app.auth.link_allows` for a share link): without credentials once an account
     exists, 401 (API, htmx) or a redirect to ``/login`` (a page);
  3. for a browser session (cookie), requires the session's form token on every
     state-changing request: header ``X-CSRF-Token`` (htmx sends it, see
     ``static/js/csrf.js``) or form field ``csrf_token`` (plain forms carry it).
- exception handlers for the two refusals, :class:`AuthRequired` and :class:`Refused`.

JSON routes accept only ``Content-Type: application/json`` (415 otherwise); that check lives
where JSON bodies are read, :func:`app.limits.read_json`.
"""
from __future__ import annotations

import os
import secrets
from typing import Any
from urllib.parse import parse_qsl, quote, urlsplit

from fastapi import Depends, FastAPI, Request
from fastapi.responses import HTMLResponse, JSONResponse, RedirectResponse, Response
from starlette.concurrency import run_in_threadpool
from starlette.datastructures import MutableHeaders

from app import auth

__all__ = ["install", "GUARD", "SECURITY_HEADERS", "CSP", "AuthRequired", "Refused",
           "csrf_token", "cross_site", "install_templates"]

# The policy: scripts and styles only from the app's own files, no inline script, no eval, no
# inline style (not even style="…" attributes): the three constant <style> blocks the server
# embeds are allowed by their hashes (see _style_hashes). plotly.js needs neither
# 'unsafe-inline' nor 'unsafe-eval' for the charts drawn here: it sets styles through the
# CSSOM, which CSP does not restrict, and its own style rules come from a file
# (templates/partials/plotly_head.html). Checked in Chromium with securitypolicyviolation
# listeners on every page, hovering the charts (tests/browser/test_security.py).
# Images: the app's and data: URLs (the favicon placeholder, plotly's "download as PNG").
_CSP_PARTS = (
    "default-src 'none'",
    "script-src 'self'",
    "style-src 'self' {style_hashes}",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    "base-uri 'none'",
    "object-src 'none'",
)


def _style_hashes() -> str:
    """CSP hashes of the constant <style> blocks the server embeds: the SVG drawing's, the
    printed note's (its style sheet is inlined so that a saved note stands alone) and the
    offline API page's."""
    import base64
    import hashlib
    from pathlib import Path

    from app.drawing import SVG_STYLE
    from app.routers.api import _DOCS_CSS

    note_css = (Path(__file__).resolve().parents[1] / "static" / "css" / "note.css").read_text(encoding="utf-8")
    return " ".join("'sha256-" + base64.b64encode(hashlib.sha256(text.encode("utf-8")).digest()).decode() + "'"
                    for text in (SVG_STYLE, note_css, _DOCS_CSS))


CSP = "; ".join(_CSP_PARTS).format(style_hashes=_style_hashes())
SECURITY_HEADERS: tuple[tuple[str, str], ...] = (
    ("content-security-policy", CSP),
    ("x-content-type-options", "nosniff"),
    ("referrer-policy", "same-origin"),
    ("x-frame-options", "DENY"),  # for browsers that predate frame-ancestors
    ("cross-origin-opener-policy", "same-origin"),
)
_UNSAFE = frozenset({"POST", "PUT", "PATCH", "DELETE"})
_FORM_TOKEN_BODY_LIMIT = 4_000_000  # a plain form's body read for its token (bytes)


class SecurityHeaders:
    """ASGI middleware: :data:`SECURITY_HEADERS` on every response, no ``server`` header."""

    def __init__(self, app):
        self.app = app

    async def __call__(self, scope, receive, send):
        if scope["type"] != "http":
            return await self.app(scope, receive, send)

        async def send_with_headers(message):
            if message["type"] == "http.response.start":
                headers = MutableHeaders(scope=message)
                for name, value in SECURITY_HEADERS:
                    headers.setdefault(name, value)
                if "server" in headers:
                    del headers["server"]
            await send(message)

        await self.app(scope, receive, send_with_headers)


class AuthRequired(Exception):
    """No valid credentials while accounts exist: 401 (API, htmx) or a redirect to login."""

    def __init__(self, message: str = "sign in first: this server has accounts"):
        self.message = message
        super().__init__(message)


class Refused(Exception):
    """A request refused for what it is (another origin, no form token, a link's limits)."""

    def __init__(self, message: str, status_code: int = 403):
        self.message, self.status_code = message, status_code
        super().__init__(message)


# --- the checks --------------------------------------------------------------------------------

_DEFAULT_PORT = {"http": 80, "https": 443}


def _origin_of(url: str) -> tuple[str, str, int] | None:
    try:
        parts = urlsplit(url)
        port = parts.port
    except ValueError:
        return None
    if not parts.scheme or not parts.hostname:
        return None
    scheme = parts.scheme.lower()
    return scheme, parts.hostname.lower(), port or _DEFAULT_PORT.get(scheme, 0)


def cross_site(request: Request) -> str | None:
    """Why a state-changing request comes from another origin, or None when it does not."""
    own = _origin_of(f"{request.url.scheme}://{request.headers.get('host', '')}")
    origin = request.headers.get("origin")
    if origin is not None:
        if origin.strip().lower() == "null" or _origin_of(origin) != own:
            return "this request came from another web site (Origin), so it was refused"
        return None
    referer = request.headers.get("referer")
    if referer and _origin_of(referer) != own:
        return "this request came from another web site (Referer), so it was refused"
    return None


def _location(request: Request) -> str:
    """Where the store the routes use lives (the settings the routes see, overrides included)."""
    from app.settings import get_settings

    return request.app.dependency_overrides.get(get_settings, get_settings)().db


def _identify(location: str, authorization: str, cookie: str) -> auth.Principal:
    from app.store import open_store

    return auth.identify(open_store(location), authorization=authorization,
                         session_cookie=cookie, cache_key=location)


def _public(path: str) -> bool:
    return path in auth.PUBLIC_PATHS or path.startswith(auth.PUBLIC_PREFIXES)


async def _form_token(request: Request) -> str:
    header = request.headers.get("x-csrf-token")
    if header:
        return header
    ctype = request.headers.get("content-type", "").split(";")[0].strip().lower()
    if ctype == "application/x-www-form-urlencoded":
        declared = request.headers.get("content-length", "")
        if declared.isdigit() and int(declared) > _FORM_TOKEN_BODY_LIMIT:
            raise Refused("the form is too large", 413)
        body = await request.body()  # kept by the request: the route reads the same body
        for key, value in parse_qsl(body.decode("latin-1"), keep_blank_values=True):
            if key == "csrf_token":
                return value
    return ""


async def guard(request: Request) -> auth.Principal:
    """The dependency every router is included with (see the module docstring)."""
    method, path = request.method, request.url.path
    if method in _UNSAFE:
        why = cross_site(request)
        if why:
            raise Refused(why)
    location = _location(request)
    authorization = request.headers.get("authorization", "")
    cookie = request.cookies.get(auth.SESSION_COOKIE, "")
    principal = None
    if not authorization and not cookie:  # the common case on an open server: no store work
        known = auth.accounts_exist(None, key=location, cached_only=True)
        if known is not None:
            principal = auth.ANONYMOUS if known else auth.OPEN
    if principal is None:  # opening the store, reading sessions, Argon2: in the thread pool
        principal = await run_in_threadpool(_identify, location, authorization, cookie)
    request.state.principal = principal
    if principal.kind == "open" and os.environ.get("SHAFTWRIGHT_REQUIRE_ACCOUNTS") == "1":
        raise Refused("this server listens on the network but has no accounts left: add one "
                      "with 'shaftwright users add NAME'", 503)
    if _public(path):
        return principal
    if principal.kind == "anonymous":
        raise AuthRequired()
    if principal.kind == "link":
        if path == "/" and method == "GET":
            raise Refused(f"/d/{principal.design_id}", 303)
        if not auth.link_allows(principal, method, path):
            raise Refused("this share link does not reach this page or action"
                          if principal.role == "edit" else
                          "this is a read-only link: it lets you view the design, its note, "
                          "its history and comparisons, and export it, but not save")
    if method in _UNSAFE and principal.via == "cookie":
        token = await _form_token(request)
        if not token or not secrets.compare_digest(token.encode("utf-8"), principal.csrf.encode("utf-8")):
            raise Refused("the form's security token is missing or out of date: reload the "
                          "page and try again")
    return principal


GUARD = Depends(guard)


def csrf_token(request: Any) -> str:
    """The form token of the request's session ("" without one), for templates."""
    state = getattr(request, "state", None)
    p = getattr(state, "principal", None) if state is not None else None
    return p.csrf if p is not None else ""


# --- answers -----------------------------------------------------------------------------------

def _wants_page(request: Request) -> bool:
    return (request.method in ("GET", "HEAD") and not request.url.path.startswith("/api/")
            and not request.headers.get("hx-request"))


async def _auth_required(request: Request, exc: AuthRequired) -> Response:
    target = request.url.path + (f"?{request.url.query}" if request.url.query else "")
    current = request.headers.get("hx-current-url")  # htmx: back to the page, not the POST
    if current and _origin_of(current) == _origin_of(str(request.base_url)):
        parts = urlsplit(current)
        target = parts.path + (f"?{parts.query}" if parts.query else "")
    login = "/login?next=" + quote(target, safe="")
    if _wants_page(request):
        return RedirectResponse(login, status_code=303)
    headers = {"WWW-Authenticate": 'Bearer realm="shaftwright"'}
    if request.headers.get("hx-request"):
        headers.update({"HX-Redirect": login, "HX-Reswap": "none"})
    return JSONResponse({"detail": exc.message, "errors": [{"path": "", "message": exc.message}]},
                        status_code=401, headers=headers)


async def _refused(request: Request, exc: Refused) -> Response:
    if exc.status_code == 303:
        return RedirectResponse(exc.message, status_code=303)
    if _wants_page(request):
        from html import escape

        return HTMLResponse(
            "<!doctype html><html lang='en'><head><meta charset='utf-8'><title>Not allowed – "
            "Shaftwright</title><link rel='stylesheet' href='/static/css/note.css'></head>"
            f"<body class='history'><h1>Not allowed</h1><p>{escape(exc.message)}.</p>"
            "<p><a href='/'>Shaftwright</a></p></body></html>", status_code=exc.status_code)
    headers = {"HX-Reswap": "none"} if request.headers.get("hx-request") else None  # keep the panel
    return JSONResponse({"detail": exc.message, "errors": [{"path": "", "message": exc.message}]},
                        status_code=exc.status_code, headers=headers)


def install_templates(env) -> None:
    """What every template environment needs: the form token, who is signed in, and the one
    JSON-in-HTML escaper (:mod:`app.safejson`)."""
    from app import safejson

    safejson.install(env)
    env.globals.update(csrf_token=csrf_token,
                       principal=lambda request: auth.principal_of(request) if request else None)


def install(app: FastAPI) -> None:
    """Headers middleware and the refusal handlers (routers add :data:`GUARD` themselves)."""
    app.add_middleware(SecurityHeaders)
    app.add_exception_handler(AuthRequired, _auth_required)
    app.add_exception_handler(Refused, _refused)
