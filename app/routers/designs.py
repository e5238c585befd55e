"""Router: stored designs — the JSON API, share links, history, comparison, the note.

JSON API (every body that holds a design goes through :mod:`app.limits` first):

- ``POST /api/designs`` — a design (or ``{"design", "author", "comment"}``) → 201
  ``{"id", "revision": 1, "url", ...}``
- ``GET /api/designs/{id}`` — the latest revision
- ``GET /api/designs/{id}/revisions`` — the list, without documents
- ``GET /api/designs/{id}/revisions/{n}`` — one revision
- ``POST /api/designs/{id}/revisions`` — ``{"design", "base_revision", "author", "comment",
  "resolutions"}`` → 201. When ``base_revision`` is not the latest, the save merges three ways
  (:mod:`app.merge`: base revision, latest, yours): changes to different keys → 201 with
  ``merged_from`` (which keys came from whom); changes to the same key → 409 with
  ``clashes`` (each key with its base, latest and your value) and the conflict record that
  keeps your document; send the same save again with ``"resolutions": {key: "mine" |
  "theirs"}`` for every clashing key. No save writes a stale value over a newer one.
- ``GET /api/designs/{id}/conflicts/{k}`` — a refused save, kept
- ``GET /api/designs/{id}/revisions/{n}/export`` — the design as a JSON file
- ``POST /api/designs/import`` — a JSON file (multipart ``file``) → a new design; a bad file
  answers 422 with every reason and stores nothing

Pages:

- ``/d/{id}`` — the latest revision in the editor (``?from=n`` edits revision n on top of
  the latest); ``/d/{id}/r/{n}`` — a fixed revision, read-only until "Edit this revision"
- ``/d/{id}/revisions`` — the history; ``/d/{id}/compare?a=&b=`` — two revisions side by side
- ``/d/{id}/r/{n}/note`` — the design note, made for printing
- ``POST /d/save`` — the editor's share panel (``partials/share_panel.html``) posts the
  editor form plus ``share_design_id``, ``share_base_revision``, ``share_author``,
  ``share_comment``; the answer is the panel again (saved, clashes to choose, or errors); a
  stale save that merges cleanly reloads the editor on the merged revision
- ``POST /d/import`` — the import form; on success a redirect to the new design
"""
from __future__ import annotations

import inspect
import json
import re
from typing import Any

from fastapi import APIRouter, Request, UploadFile
from fastapi.responses import HTMLResponse, JSONResponse, RedirectResponse, Response
from starlette.concurrency import run_in_threadpool

import engine
from app.auth import author_for, may_write, principal_of
from app.errors import Conflict
from app.limits import LimitError, check_counts, parse_json, read_body
from app.merge import Merge, merge3
from app.note import (TEMPLATES, NoteMeta, compare_results, diff_documents, drawing_svg,
                      note_context, solve_or_errors)
from app.routers.access import links_for_page
from app.settings import get_settings
from app.store import NotFound, Revision, StaleBase, Store, StoreDep, is_design_id
from engine.model import DesignError, Issue, parse_design

__all__ = ["router", "MAX_AUTHOR", "MAX_COMMENT"]

router = APIRouter()

MAX_AUTHOR = 100
MAX_COMMENT = 2000


# --- helpers ------------------------------------------------------------------------------

def _text(value: Any, path: str, limit: int) -> str:
    if value is None:
        return ""
    if not isinstance(value, str):
        raise DesignError([Issue(path=path, message=f"'{path}' must be text")])
    if len(value) > limit:
        raise DesignError([Issue(path=path, message=f"'{path}' is too long (at most {limit} characters)")])
    return value.strip()


def _validated(document: Any) -> dict:
    """The document if it is a valid design (as given, keys untouched); else DesignError."""
    check_counts(document)
    parse_design(document)
    return document


def _resolutions(value: Any) -> dict[str, str]:
    if value is None:
        return {}
    if not isinstance(value, dict) or not all(v in ("mine", "theirs") for v in value.values()):
        raise DesignError([Issue(path="resolutions", message="'resolutions' maps each clashing key "
                                 "to \"mine\" or \"theirs\"")])
    return value


def _split_body(body: Any, *, wrapped: bool) -> tuple[dict, str, str, Any, dict]:
    """(design, author, comment, base_revision, resolutions) from a request body."""
    if not isinstance(body, dict):
        raise DesignError([Issue(path="", message="the body must be a JSON object")])
    if wrapped or "design" in body:
        if "design" not in body:
            raise DesignError([Issue(path="design", message="'design' is required")])
        design = body["design"]
        extra = set(body) - {"design", "author", "comment", "base_revision", "resolutions"}
        if extra:
            raise DesignError([Issue(path=k, message=f"'{k}' is not a key of a save request")
                               for k in sorted(extra)])
        base = body.get("base_revision")
        if base is not None and (isinstance(base, bool) or not isinstance(base, int)
                                 or not 1 <= base < 2**63):
            raise DesignError([Issue(path="base_revision",
                                     message="'base_revision' must be a revision number (1, 2, …)")])
        return (_validated(design), _text(body.get("author"), "author", MAX_AUTHOR),
                _text(body.get("comment"), "comment", MAX_COMMENT), base,
                _resolutions(body.get("resolutions")))
    return _validated(body), "", "", None, {}


def _urls(design_id: str, n: int | None = None) -> dict[str, str]:
    out = {"url": f"/d/{design_id}", "api_url": f"/api/designs/{design_id}",
           "revisions_url": f"/d/{design_id}/revisions"}
    if n is not None:
        out.update(revision_url=f"/d/{design_id}/r/{n}", note_url=f"/d/{design_id}/r/{n}/note",
                   export_url=f"/api/designs/{design_id}/revisions/{n}/export")
    return out


def _revision_json(rev: Revision) -> dict[str, Any]:
    return {"id": rev.design_id, "revision": rev.n, "design": rev.document, "name": rev.name,
            "author": rev.author, "comment": rev.comment, "created_at": rev.created_at,
            "engine_version": rev.engine_version, "base_revision": rev.base_revision,
            **_urls(rev.design_id, rev.n)}


def _check_id(design_id: str) -> None:
    if not is_design_id(design_id):
        raise NotFound(f"no design {design_id!r}")


def _rev_n(n: int) -> int:
    """A revision or record number the store can hold (a 64-bit integer), else NotFound."""
    if not 1 <= n < 2**63:
        raise NotFound(f"there is no revision or record {n}")
    return n


def _conflict_json(exc: StaleBase, document: dict) -> dict[str, Any]:
    latest = exc.latest
    return {
        "detail": (f"revision {exc.base_revision} is not the latest: revision {latest.n} was saved "
                   f"since. Your version is kept as conflict record {exc.conflict_id}; nothing "
                   "was overwritten. Review the changes, then save again on top of "
                   f"revision {latest.n}."),
        "id": exc.design_id, "base_revision": exc.base_revision, "latest_revision": latest.n,
        "conflict_id": exc.conflict_id,
        "conflict_url": f"/api/designs/{exc.design_id}/conflicts/{exc.conflict_id}",
        "changes": [c.__dict__ for c in diff_documents(latest.document, document)],
        "latest": _revision_json(latest),
    }


def _save(store: Store, design_id: str | None, document: dict, *, author: str, comment: str,
          base: int | None) -> Revision:
    version = engine.__version__
    if design_id is None:
        return store.create(document, author=author, comment=comment, engine_version=version)
    return store.add_revision(design_id, document, base_revision=base, author=author,
                              comment=comment, engine_version=version)


class MergeClash(Exception):
    """A stale save whose changes clash with the latest revision's on some keys."""

    def __init__(self, stale: StaleBase, merge: Merge):
        self.stale, self.merge = stale, merge
        super().__init__(f"{len(merge.clashes)} key(s) changed on both sides")


def _save_merging(store: Store, design_id: str | None, document: dict, *, author: str,
                  comment: str, base: int | None,
                  resolutions: dict[str, str] | None = None) -> tuple[Revision, Merge | None, StaleBase | None]:
    """Save; on a stale base, merge three ways (base revision, latest, yours) and save the
    merge on top of the latest. (revision, merge or None, the stale answer or None).

    Raises :class:`MergeClash` when a key changed on both sides and ``resolutions`` does not
    say whose value to keep; the document is kept as a conflict record either way."""
    try:
        return _save(store, design_id, document, author=author, comment=comment, base=base), None, None
    except StaleBase as exc:
        stale = exc
    base_doc = store.revision(stale.design_id, stale.base_revision).document
    for _ in range(5):  # another save may land between the merge and its save: merge again
        merge = merge3(base_doc, stale.latest.document, document, resolutions=resolutions or {})
        if merge.clashes:
            raise MergeClash(stale, merge)
        try:
            _validated(merge.document)
        except DesignError as exc:
            raise DesignError([Issue(path=i.path, message=f"merged with revision {stale.latest.n}, "
                                     f"{i.message}") for i in exc.errors]) from None
        note = f"merged with revision {stale.latest.n}"
        try:
            rev = _save(store, design_id, merge.document, author=author,
                        comment=f"{comment} ({note})"[:MAX_COMMENT] if comment else note,
                        base=stale.latest.n)
            return rev, merge, stale
        except StaleBase as again:
            stale = StaleBase(design_id=again.design_id, base_revision=stale.base_revision,
                              latest=again.latest, conflict_id=stale.conflict_id)
    raise Conflict("the design is being saved by others too often to merge; try again")


def _merged_from(merge: Merge, stale: StaleBase) -> dict[str, Any]:
    return {"base_revision": stale.base_revision, "latest_revision": stale.latest.n,
            "yours": merge.keys_from("mine"), "theirs": merge.keys_from("theirs"),
            "conflict_id": stale.conflict_id}


def _clash_conflict(exc: MergeClash, document: dict) -> Conflict:
    stale = exc.stale
    keys = [c.path for c in exc.merge.clashes]
    body = _conflict_json(stale, document)
    body.update(clashes=[c.as_json() for c in exc.merge.clashes],
                merged_from=_merged_from(exc.merge, stale))
    detail = (f"revision {stale.base_revision} is not the latest: revision {stale.latest.n} was "
              f"saved since and changes the same input(s) as yours ({', '.join(keys[:10])}"
              f"{' …' if len(keys) > 10 else ''}). Nothing was saved or overwritten; your version "
              f"is kept as conflict record {stale.conflict_id}. Send the save again with "
              "\"resolutions\": {key: \"mine\" or \"theirs\"} for each of these keys.")
    body["detail"] = detail
    return Conflict(detail, body)


def _slug(name: str) -> str:
    s = re.sub(r"[^A-Za-z0-9]+", "-", name).strip("-").lower()[:60]
    return s or "design"


# --- JSON API -----------------------------------------------------------------------------

@router.post("/api/designs", status_code=201)
async def create_design(request: Request, store: StoreDep) -> JSONResponse:
    """Store a new design; answer its id, revision 1 and its share URL."""
    raw = await read_body(request)

    def work() -> JSONResponse:
        document, author, comment, _, _ = _split_body(parse_json(raw), wrapped=False)
        rev = _save(store, None, document, author=author_for(request, author), comment=comment, base=None)
        return JSONResponse(_revision_json(rev), status_code=201)

    return await run_in_threadpool(work)


@router.post("/api/designs/import", status_code=201)
async def import_design(request: Request, file: UploadFile, store: StoreDep) -> JSONResponse:
    """Import a design file (multipart field ``file``); a bad file stores nothing."""
    raw = await _read_upload(file)

    def work() -> JSONResponse:
        document = _validated(parse_json(raw))
        rev = _save(store, None, document, author=author_for(request, ""),
                    comment=f"imported from {file.filename or 'a file'}"[:MAX_COMMENT], base=None)
        return JSONResponse(_revision_json(rev), status_code=201)

    return await run_in_threadpool(work)


async def _read_upload(file: UploadFile) -> bytes:
    limit = get_settings().max_document_bytes
    raw = await file.read(limit + 1)
    if len(raw) > limit:
        raise LimitError("", f"the file is over {limit:,} bytes, the most accepted", status_code=413)
    if not raw.strip():
        raise LimitError("", "the file is empty")
    return raw


@router.get("/api/designs/{design_id}")
def get_latest(design_id: str, store: StoreDep) -> JSONResponse:
    _check_id(design_id)
    return JSONResponse(_revision_json(store.latest(design_id)))


@router.get("/api/designs/{design_id}/revisions")
def list_revisions(design_id: str, store: StoreDep) -> JSONResponse:
    _check_id(design_id)
    revs = store.revisions(design_id)
    return JSONResponse({"id": design_id, "latest_revision": revs[-1].n,
                         "revisions": [{"revision": r.n, "name": r.name, "author": r.author,
                                        "comment": r.comment, "created_at": r.created_at,
                                        "engine_version": r.engine_version,
                                        "base_revision": r.base_revision,
                                        "url": f"/d/{design_id}/r/{r.n}"} for r in revs]})


@router.get("/api/designs/{design_id}/revisions/{n}")
def get_revision(design_id: str, n: int, store: StoreDep) -> JSONResponse:
    _check_id(design_id)
    return JSONResponse(_revision_json(store.revision(design_id, _rev_n(n))))


@router.post("/api/designs/{design_id}/revisions", status_code=201)
async def add_revision(design_id: str, request: Request, store: StoreDep) -> JSONResponse:
    """Add a revision on top of ``base_revision``; a stale base merges three ways (201 with
    ``merged_from``) or, when the same key changed on both sides, 409 with ``clashes``."""
    _check_id(design_id)
    raw = await read_body(request)

    def work() -> JSONResponse:
        store.latest(design_id)
        document, author, comment, base, resolutions = _split_body(parse_json(raw), wrapped=True)
        refused = may_write(request, design_id)  # a read-only link, or another design's link
        if refused:
            return JSONResponse({"detail": refused}, status_code=403)
        try:
            rev, merge, stale = _save_merging(store, design_id, document, author=author_for(request, author),
                                              comment=comment, base=base, resolutions=resolutions)
        except MergeClash as exc:
            raise _clash_conflict(exc, document) from None
        body = _revision_json(rev)
        if merge is not None:
            body["merged_from"] = _merged_from(merge, stale)
        return JSONResponse(body, status_code=201)

    return await run_in_threadpool(work)


@router.get("/api/designs/{design_id}/conflicts/{conflict_id}")
def get_conflict(design_id: str, conflict_id: int, store: StoreDep) -> JSONResponse:
    _check_id(design_id)
    return JSONResponse(store.conflict(design_id, _rev_n(conflict_id)).model_dump())


@router.get("/api/designs/{design_id}/revisions/{n}/export")
def export_revision(design_id: str, n: int, store: StoreDep) -> Response:
    """The revision's design document as a downloadable JSON file."""
    _check_id(design_id)
    rev = store.revision(design_id, _rev_n(n))
    filename = f"{_slug(rev.name)}-r{rev.n}.json"
    return Response(json.dumps(rev.document, ensure_ascii=False, indent=2) + "\n",
                    media_type="application/json",
                    headers={"Content-Disposition": f'attachment; filename="{filename}"',
                             "X-Content-Type-Options": "nosniff"})


# --- pages --------------------------------------------------------------------------------

def _share_context(rev: Revision | None, *, base: int | None = None, **extra: Any) -> dict:
    share = {"design_id": rev.design_id if rev else "", "base_revision": base or (rev.n if rev else ""),
             "revision": rev.n if rev else None, "author": rev.author if rev else "",
             "url": f"/d/{rev.design_id}" if rev else "", "status": "", "errors": [],
             "changes": [], "conflict": None}
    share.update(extra)
    return share


def _editor_or_view(request: Request, document: dict, share: dict, rev: Revision,
                    store: Store) -> HTMLResponse:
    """The editor with this document (the pages router draws it), or the read-only view."""
    try:
        from app.routers.pages import render_editor  # the editor page, when it is there
    except ImportError:
        return _revision_page(request, rev, store)
    kwargs: dict[str, Any] = {"storage_key": f"/d/{rev.design_id}@{share['base_revision']}"}
    if "share" in inspect.signature(render_editor).parameters:
        kwargs["share"] = share
    return render_editor(request, document, **kwargs)


@router.get("/d/{design_id}", response_class=HTMLResponse)
def open_latest(request: Request, design_id: str, store: StoreDep) -> HTMLResponse:
    """The latest revision in the editor; ``?from=n`` loads revision n to edit on top of it."""
    from_ = _int(request.query_params.get("from"))
    _check_id(design_id)
    latest = store.latest(design_id)
    shown = store.revision(design_id, _rev_n(from_)) if from_ else latest
    if principal_of(request).role == "view":  # a read-only link: the read-only page
        return _revision_page(request, shown, store)
    extra: dict[str, Any] = {}
    merged, n = _int(request.query_params.get("merged")), _int(request.query_params.get("r"))
    if merged and n and merged < 2**63 and n < 2**63:
        report = _merge_report(store, design_id, latest, merged, n)
        if report:
            extra = {"status": "merged", "merge": report}
    share = _share_context(latest, base=latest.n, editing_from=shown.n,
                           links=links_for_page(request, store, design_id), **extra)
    return _editor_or_view(request, shown.document, share, shown, store)


def _int(text: str | None) -> int | None:
    return int(text) if text and text.isascii() and text.isdigit() else None


def _conflicts_for(request: Request, store: Store, design_id: str) -> list:
    """Refused saves hold others' unsaved work: not shown to a read-only link."""
    return [] if principal_of(request).role == "view" else store.conflicts(design_id)


def _revision_page(request: Request, rev: Revision, store: Store) -> HTMLResponse:
    revs = store.revisions(rev.design_id)
    design, result, errors = solve_or_errors(rev.document)
    drawing = drawing_svg(design, result) if design is not None else None
    return TEMPLATES.TemplateResponse(request, "revisions.html", {
        "design_id": rev.design_id, "revisions": revs, "selected": rev, "latest_n": revs[-1].n,
        "result": result, "errors": errors, "drawing": drawing,
        "conflicts": _conflicts_for(request, store, rev.design_id),
        "links": links_for_page(request, store, rev.design_id)})


@router.get("/d/{design_id}/r/{n}", response_class=HTMLResponse)
def open_revision(request: Request, design_id: str, n: int, store: StoreDep) -> HTMLResponse:
    """A fixed revision, read-only; "Edit this revision" opens it in the editor."""
    _check_id(design_id)
    rev = store.revision(design_id, _rev_n(n))
    return _revision_page(request, rev, store)


@router.get("/d/{design_id}/revisions", response_class=HTMLResponse)
def history(request: Request, design_id: str, store: StoreDep) -> HTMLResponse:
    _check_id(design_id)
    revs = store.revisions(design_id)
    return TEMPLATES.TemplateResponse(request, "revisions.html", {
        "design_id": design_id, "revisions": revs, "selected": None, "latest_n": revs[-1].n,
        "conflicts": _conflicts_for(request, store, design_id),
        "links": links_for_page(request, store, design_id)})


@router.get("/d/{design_id}/compare", response_class=HTMLResponse)
def compare(request: Request, design_id: str, store: StoreDep, a: int | None = None,
            b: int | None = None) -> HTMLResponse:
    """Two revisions side by side: changed inputs, changed results (reactions, lives, checks)."""
    _check_id(design_id)
    revs = store.revisions(design_id)
    b = _rev_n(b or revs[-1].n)
    a = _rev_n(a or max(1, b - 1))
    ra, rb = store.revision(design_id, a), store.revision(design_id, b)
    _, res_a, err_a = solve_or_errors(ra.document)
    _, res_b, err_b = solve_or_errors(rb.document)
    return TEMPLATES.TemplateResponse(request, "compare.html", {
        "design_id": design_id, "revisions": revs, "a": ra, "b": rb,
        "changes": diff_documents(ra.document, rb.document),
        "sections": compare_results(res_a, res_b), "errors_a": err_a, "errors_b": err_b})


@router.get("/d/{design_id}/r/{n}/note", response_class=HTMLResponse)
def note(request: Request, design_id: str, n: int, store: StoreDep) -> HTMLResponse:
    """The design note of one revision, a page made for printing (A4)."""
    _check_id(design_id)
    rev = store.revision(design_id, _rev_n(n))
    meta = NoteMeta(design_id=rev.design_id, revision=rev.n, author=rev.author,
                    created_at=rev.created_at, comment=rev.comment,
                    engine_version=rev.engine_version)
    return TEMPLATES.TemplateResponse(request, "note.html", note_context(rev.document, meta))


@router.post("/d/save", response_class=HTMLResponse)
async def save_from_editor(request: Request, store: StoreDep) -> HTMLResponse:
    """The share panel's Save: the editor form in, the panel (saved/conflict/errors) out."""
    from app.web import form_to_design

    declared = request.headers.get("content-length", "")
    limit = get_settings().max_document_bytes
    if declared.isdigit() and int(declared) > 2 * limit:  # form text is wordier than JSON
        return _panel(request, _share_context(None, errors=[Issue(
            path="", message=f"the form is over {2 * limit:,} bytes, the most accepted")]), 413)
    form = {k: v for k, v in (await request.form()).items() if isinstance(v, str)}
    return await run_in_threadpool(_save_form, request, store, form, form_to_design)


def _save_form(request: Request, store: Store, form: dict[str, str], form_to_design) -> Response:
    design_id = form.get("share_design_id", "").strip() or None
    base = _int(form.get("share_base_revision"))
    share_in = {"author": form.get("share_author", ""), "comment": form.get("share_comment", "")}
    resolutions = {k[len(_RESOLVE):]: v for k, v in form.items()
                   if k.startswith(_RESOLVE) and v in ("mine", "theirs")}
    document, issues = form_to_design({k: v for k, v in form.items() if not k.startswith(_RESOLVE)})
    try:
        if issues:
            raise DesignError(issues)
        _validated(document)
        author = author_for(request, _text(share_in["author"], "author", MAX_AUTHOR))
        comment = _text(share_in["comment"], "comment", MAX_COMMENT)
        refused = may_write(request, design_id)
        if refused:
            return _panel(request, _share_context(None, errors=[Issue(path="", message=refused)],
                                                  design_id=design_id or "", **share_in), 403)
        if design_id is not None:
            _check_id(design_id)
            store.latest(design_id)
        rev, merge, stale = _save_merging(store, design_id, document, author=author,
                                          comment=comment, base=base, resolutions=resolutions)
    except DesignError as exc:
        share = _share_context(None, errors=list(exc.errors), design_id=design_id or "",
                               base_revision=base or "", **share_in)
        return _panel(request, share, 422)
    except MergeClash as exc:
        latest = exc.stale.latest
        share = _share_context(latest, base=exc.stale.base_revision, status="clash",
                               conflict=exc.stale, latest_n=latest.n, revision=None,
                               clashes=[_clash_view(c, resolutions) for c in exc.merge.clashes],
                               merged_keys=exc.merge.provenance, **share_in)
        return _panel(request, share, 409)
    if merge is not None:  # the editor must show the merged design: open it
        url = f"/d/{rev.design_id}?merged={stale.conflict_id}&r={rev.n}"
        if request.headers.get("hx-request"):
            return Response(status_code=200, headers={"HX-Redirect": url})
        return RedirectResponse(url, status_code=303)
    share = _share_context(rev, status="saved", comment="",
                           links=links_for_page(request, store, rev.design_id))
    response = _panel(request, share, 200)
    if request.headers.get("hx-request"):
        response.headers["HX-Push-Url"] = f"/d/{rev.design_id}"
    return response


_RESOLVE = "share_resolve:"  # form fields share_resolve:<key> = mine | theirs


def _shown(value: Any) -> str:
    from app.merge import MISSING

    if value is MISSING:
        return "(removed)"
    text = value if isinstance(value, str) else json.dumps(value, ensure_ascii=False)
    return text if len(text) <= 160 else text[:157] + "…"


_ROWS = {"supports": "support", "elements": "part", "load_cases": "load case",
         "shaft.segments": "segment", "shaft.grooves": "groove"}


def key_words(path: str) -> str:
    """A design key in the designer's words: ``supports[A].x_mm`` → "support A · position x
    [mm]" (the editor's own labels); a key the editor does not show keeps its name."""
    from app import units, web

    fields: dict[str, Any] = {}
    for group in (web.TOP_FIELDS, web.SEGMENT_FIELDS, web.SUPPORT_FIELDS, web.LOAD_CASE_FIELDS,
                  web.REQUIREMENT_FIELDS, *web.ELEMENT_FIELDS.values()):
        for f in group:
            fields.setdefault(f.key, f)
    m = re.fullmatch(r"(supports|elements|load_cases|shaft\.segments|shaft\.grooves)\[([^\]]*)\](?:\.(.+))?", path)
    if m:
        what, label, rest = m.groups()
        label = str(int(label) + 1) if what.startswith("shaft.") and label.isdigit() else label
        head = f"{_ROWS[what]} {label}"
        if rest is None:
            return f"{head} (the whole row)"
        f = fields.get(rest)
        unit = units.unit_label(f.quantity) if f is not None else ""
        return f"{head} · {f.label if f else rest}" + (f" [{unit}]" if unit else "")
    if path.startswith("shaft.material."):
        f = next((f for f in web.MATERIAL_FIELDS if f.key == path.rsplit(".", 1)[1]), None)
        if f is not None:
            unit = units.unit_label(f.quantity)
            return f"material · {f.label}" + (f" [{unit}]" if unit else "")
    f = fields.get(path.rsplit(".", 1)[-1]) if path.count(".") <= 1 else None
    if f is not None:
        unit = units.unit_label(f.quantity)
        return f.label + (f" [{unit}]" if unit else "")
    return path.replace(".", " · ")


def _clash_view(clash, resolutions: dict[str, str]) -> dict[str, Any]:
    return {"path": clash.path, "label": key_words(clash.path), "field": _RESOLVE + clash.path,
            "base": _shown(clash.base),
            "theirs": _shown(clash.theirs), "mine": _shown(clash.mine),
            "choice": resolutions.get(clash.path, "")}


def _merge_report(store: Store, design_id: str, latest: Revision, conflict_id: int,
                  n: int) -> dict[str, Any] | None:
    """What the merged revision ``n`` took from whom (for the panel after a merged save)."""
    try:
        rev = store.revision(design_id, n)
        kept = store.conflict(design_id, conflict_id)
        if rev.base_revision is None:
            return None
        theirs = store.revision(design_id, rev.base_revision)
        base = store.revision(design_id, kept.base_revision)
    except NotFound:
        return None
    merge = merge3(base.document, theirs.document, kept.document)
    return {"revision": n, "theirs_n": theirs.n, "theirs_author": theirs.author,
            "yours": [key_words(k) for k in merge.keys_from("mine")],
            "theirs": [key_words(k) for k in merge.keys_from("theirs")],
            "chosen": [key_words(c.path) for c in merge.clashes]}


def _panel(request: Request, share: dict, status: int) -> HTMLResponse:
    # htmx swaps only 2xx answers unless configured otherwise: answer 200 to it, and say the
    # real outcome in the panel and in a header.
    htmx = bool(request.headers.get("hx-request"))
    resp = TEMPLATES.TemplateResponse(request, "partials/share_panel.html", {"share": share},
                                      status_code=200 if htmx else status)
    resp.headers["X-Shaftwright-Status"] = str(status)
    return resp


@router.post("/d/import", response_class=HTMLResponse)
async def import_page(request: Request, file: UploadFile, store: StoreDep) -> Response:
    """The import form: a valid file becomes a new design (redirect); a bad one says why."""
    try:
        raw = await _read_upload(file)
        document = await run_in_threadpool(lambda: _validated(parse_json(raw)))
    except DesignError as exc:
        share = _share_context(None, import_errors=list(exc.errors),
                               import_name=file.filename or "")
        return _panel(request, share, getattr(exc, "status_code", 422))
    rev = await run_in_threadpool(lambda: _save(
        store, None, document, author=author_for(request, ""),
        comment=f"imported from {file.filename or 'a file'}"[:MAX_COMMENT], base=None))
    url = f"/d/{rev.design_id}"
    if request.headers.get("hx-request"):
        return Response(status_code=200, headers={"HX-Redirect": url})
    return RedirectResponse(url, status_code=303)
