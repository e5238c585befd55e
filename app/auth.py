"""Who is asking: accounts, API tokens, share links and browser sessions.

With no account in the store the server is *open*: everyone who reaches it (loopback only,
unless ``serve --open``) may do everything, and the author of a revision is the name typed in.
Once an account exists (``shaftwright users add NAME``), every page and API route except
:data:`PUBLIC_PATHS` needs one of

- a browser session (cookie :data:`SESSION_COOKIE`, HttpOnly, SameSite=Lax, Secure behind
  TLS), made by signing in on ``/login`` or by opening a share link ``/s/<secret>``;
- ``Authorization: Bearer <token>`` with an API token from ``shaftwright users token NAME``.

A request without either gets 401 (API, htmx) or a redirect to the login page (a page).

Secrets are stored only as hashes: passwords and API tokens with Argon2id (argon2-cffi, its
recommended parameters, RFC 9106); the session and share-link secrets, which are 256 random
bits each, with SHA-256 (a slow hash adds nothing to a secret that cannot be guessed, and
every request checks one). An API token is ``swt_<id>_<secret>``: the id finds the row, Argon2
checks the secret; a token once verified is remembered in this process by its SHA-256 (the row
is still read on every request, so a removed account or token stops at once).

A share link gives a browser that opens it a session bound to one design and one role:
``view`` (the revisions, the note, the comparison, the export; no save) or ``edit`` (also
the editor and saving revisions of that design). :func:`link_allows` is the one list of what
a link may reach.
"""
from __future__ import annotations

import hashlib
import re
import secrets
import time
from collections import OrderedDict
from dataclasses import dataclass
from datetime import datetime, timedelta, timezone
from typing import Literal

from argon2 import PasswordHasher
from argon2.exceptions import InvalidHashError, VerificationError, VerifyMismatchError

__all__ = [
    "Principal", "SESSION_COOKIE", "SESSION_DAYS", "PUBLIC_PATHS", "hash_password",
    "verify_password", "new_api_token", "new_secret", "sha256", "identify", "link_allows",
    "principal_of", "author_for", "may_write", "valid_name", "ROLES", "NAME_RE",
    "session_expiry", "accounts_exist", "forget_accounts_cache", "MIN_PASSWORD",
]

SESSION_COOKIE = "sw_session"
SESSION_DAYS = 14
MIN_PASSWORD = 8  # NIST SP 800-63B, 5.1.1.1: at least 8 characters for a chosen secret
ROLES = ("view", "edit")
NAME_RE = re.compile(r"^[A-Za-z0-9][A-Za-z0-9._@-]{0,63}$")

# Reached without signing in: liveness, the login page, the app's own static files, and
# the entry of a share link (which makes its own session).
PUBLIC_PATHS = frozenset({"/api/health", "/login"})
PUBLIC_PREFIXES = ("/static/", "/vendor/", "/s/")

_HASHER = PasswordHasher()  # Argon2id with the library's defaults (RFC 9106 low-memory profile)
# Checked against when the account does not exist, so that a wrong name costs the same time
_DUMMY_HASH = _HASHER.hash("not a password of anyone")


def valid_name(name: str) -> bool:
    """An account name: 1–64 letters, digits, ``.``, ``_``, ``@``, ``-`` (not first)."""
    return bool(NAME_RE.match(name or ""))


def hash_password(password: str) -> str:
    return _HASHER.hash(password)


def verify_password(stored_hash: str | None, password: str) -> bool:
    """True when ``password`` matches ``stored_hash`` (None: no such account, still slow)."""
    try:
        return _HASHER.verify(stored_hash or _DUMMY_HASH, password) and stored_hash is not None
    except (VerifyMismatchError, VerificationError, InvalidHashError):
        return False


def new_secret() -> str:
    """256 random bits, URL-safe."""
    return secrets.token_urlsafe(32)


def sha256(text: str) -> str:
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def new_api_token() -> tuple[str, str, str]:
    """(token, token id, Argon2 hash of its secret): the token is shown once, never stored."""
    token_id, secret = secrets.token_hex(6), new_secret()
    return f"swt_{token_id}_{secret}", token_id, _HASHER.hash(secret)


def session_expiry(days: int = SESSION_DAYS) -> str:
    return (datetime.now(timezone.utc) + timedelta(days=days)).isoformat(timespec="milliseconds")


@dataclass(frozen=True)
class Principal:
    """Who a request comes from.

    ``kind``: ``open`` (no accounts exist), ``account``, ``link`` (a share link's session) or
    ``anonymous`` (accounts exist, no credentials). ``via``: ``cookie`` (a browser session,
    whose unsafe requests must carry ``csrf``), ``token`` (Authorization header) or ``""``.
    """

    kind: Literal["open", "account", "link", "anonymous"]
    name: str = ""
    design_id: str = ""
    role: str = ""
    link_label: str = ""
    via: str = ""
    csrf: str = ""
    session_hash: str = ""


OPEN = Principal("open")
ANONYMOUS = Principal("anonymous")

# --- identifying a request ---------------------------------------------------------------------

_ACCOUNTS_TTL_S = 2.0  # how long "are there accounts?" is remembered (another process may add one)
_accounts_cache: dict[object, tuple[float, bool]] = {}
_TOKENS: "OrderedDict[str, tuple[str, str]]" = OrderedDict()  # sha256(token) -> (token id, account)
_TOKENS_MAX = 512


def forget_accounts_cache() -> None:
    _accounts_cache.clear()


def accounts_exist(store, *, key: object = None, cached_only: bool = False) -> bool | None:
    """Whether the store holds an account (remembered for two seconds per store, or per
    ``key``, e.g. the store's location).

    With ``cached_only`` answer None instead of reading the store (for the event loop)."""
    key = id(store) if key is None else key
    hit = _accounts_cache.get(key)
    if hit is not None and time.monotonic() - hit[0] < _ACCOUNTS_TTL_S:
        return hit[1]
    if cached_only:
        return None
    value = store.has_accounts()
    _accounts_cache[key] = (time.monotonic(), value)
    return value


def _bearer(authorization: str) -> str | None:
    scheme, _, value = (authorization or "").partition(" ")
    return value.strip() if scheme.lower() == "bearer" and value.strip() else None


def _token_account(store, token: str) -> str | None:
    m = re.fullmatch(r"swt_([0-9a-f]{12})_([A-Za-z0-9_-]{20,100})", token)
    if not m:
        return None
    token_id, secret = m.groups()
    row = store.token(token_id)  # read every time: a removed token or account stops at once
    if row is None:
        return None
    account, stored = row
    key = sha256(token)
    if _TOKENS.get(key) == (token_id, account):
        return account
    try:
        _HASHER.verify(stored, secret)
    except (VerifyMismatchError, VerificationError, InvalidHashError):
        return None
    _TOKENS[key] = (token_id, account)
    if len(_TOKENS) > _TOKENS_MAX:
        _TOKENS.popitem(last=False)
    return account


def identify(store, *, authorization: str = "", session_cookie: str = "",
             cache_key: object = None) -> Principal:
    """The principal of a request from its Authorization header and session cookie.

    Blocking (reads the store): call it off the event loop. ``cache_key``: see
    :func:`accounts_exist`."""
    token = _bearer(authorization)
    if token is not None:
        account = _token_account(store, token)
        if account is not None:
            return Principal("account", name=account, via="token")
        return ANONYMOUS  # a wrong token is refused even on an open server: the client should know
    if session_cookie:
        h = sha256(session_cookie)
        s = store.session(h)
        if s is not None and s.account is not None:
            return Principal("account", name=s.account, via="cookie", csrf=s.csrf_token,
                             session_hash=h)
        if s is not None and s.link_id is not None:
            return Principal("link", design_id=s.design_id or "", role=s.role or "",
                             link_label=s.link_label or "", via="cookie", csrf=s.csrf_token,
                             session_hash=h)
    return ANONYMOUS if accounts_exist(store, key=cache_key) else OPEN


# --- what a share link may reach ---------------------------------------------------------------

_ID = r"(?P<id>[A-Za-z0-9_-]{1,64})"
_VIEW = [re.compile(p) for p in (
    rf"^/d/{_ID}$", rf"^/d/{_ID}/r/\d+$", rf"^/d/{_ID}/r/\d+/note$", rf"^/d/{_ID}/revisions$",
    rf"^/d/{_ID}/compare$", rf"^/api/designs/{_ID}$", rf"^/api/designs/{_ID}/revisions$",
    rf"^/api/designs/{_ID}/revisions/\d+$", rf"^/api/designs/{_ID}/revisions/\d+/export$")]
_EDIT_GET = [re.compile(p) for p in (rf"^/api/designs/{_ID}/conflicts/\d+$", r"^/study$")]
_EDIT_POST_DESIGN = [re.compile(rf"^/api/designs/{_ID}/revisions$")]
# the editor's own work on the form it shows; none of these touches the store
_EDIT_POST_FREE = frozenset({"/editor/solve", "/editor/op", "/d/save", "/study/open",
                             "/study/run", "/study/arrangements", "/study/apply", "/api/solve",
                             "/api/study", "/api/arrangements"})


def link_allows(p: Principal, method: str, path: str) -> bool:
    """May the holder of share link ``p`` make this request? (``/d/save`` checks its design
    in the route, see :func:`may_write`.)"""
    if method in ("GET", "HEAD"):
        for rx in _VIEW + (_EDIT_GET if p.role == "edit" else []):
            m = rx.match(path)
            if m:
                return "id" not in rx.groupindex or m.group("id") == p.design_id
        return False
    if path == "/logout":
        return True
    if p.role != "edit" or method != "POST":
        return False
    if path in _EDIT_POST_FREE:
        return True
    return any((m := rx.match(path)) and m.group("id") == p.design_id for rx in _EDIT_POST_DESIGN)


# --- helpers for routes ------------------------------------------------------------------------

def principal_of(request) -> Principal:
    """The principal the security middleware found for ``request`` (open when there is none)."""
    return getattr(request.state, "principal", None) or OPEN


def may_write(request, design_id: str | None) -> str | None:
    """None when the request may save to ``design_id`` (None: a new design); else why not."""
    p = principal_of(request)
    if p.kind in ("open", "account"):
        return None
    if p.kind == "link":
        if p.role != "edit":
            return "this link lets you view the design, not save it"
        if design_id != p.design_id:
            return "this link lets you save only the design it was made for"
        return None
    return "sign in to save"


def author_for(request, typed: str) -> str:
    """The revision's author: the account when one is signed in; else what was typed (a link
    holder's typed name says it came through the link)."""
    p = principal_of(request)
    if p.kind == "account":
        return p.name
    if p.kind == "link":
        via = f"edit link {p.link_label}".strip() if p.link_label else "edit link"
        return f"{typed} (via {via})" if typed else f"via {via}"
    return typed
