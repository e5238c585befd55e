"""Limits on incoming design documents, applied before any parsing or solving.

Every route that takes a design (save, import, solve, note) calls :func:`read_json` on the
request (or :func:`parse_json` on text it already holds, or :func:`check_counts` on an object
it already parsed). A document larger than ``max_document_bytes`` (default 1 000 000 bytes),
nested deeper than :data:`MAX_DEPTH`, or with a list (or mapping) of more than ``max_items``
entries (default 500: far beyond any real shaft, small enough that a hostile document cannot
tie up a worker) is refused with a :class:`LimitError` whose message names the key path.

:class:`LimitError` is an :class:`engine.model.DesignError`, so it shows like any other input
error; its ``status_code`` (413 for size, 422 otherwise) is what an HTTP route answers.
"""
from __future__ import annotations

import json
from typing import Any

from engine.model import DesignError, Issue

from app.settings import Settings, get_settings

__all__ = ["LimitError", "MAX_DEPTH", "check_size", "decode_text", "parse_json", "check_counts",
           "guard_document", "read_body", "read_json", "check_work", "MAX_BEAM_WORK",
           "MAX_TABLE_WORK", "check_json_type"]

MAX_DEPTH = 12  # a design is at most 5 levels deep; common practice for JSON bombs: cap it


class LimitError(DesignError):
    """An input refused for its size, depth or counts (or because it is not JSON)."""

    def __init__(self, path: str, message: str, *, status_code: int = 422):
        self.status_code = status_code
        super().__init__([Issue(path=path, message=message)])


def _settings(settings: Settings | None) -> Settings:
    return settings if settings is not None else get_settings()


def check_size(raw: bytes | str, *, settings: Settings | None = None) -> None:
    """Refuse a body over the byte limit (status 413)."""
    limit = _settings(settings).max_document_bytes
    size = len(raw.encode("utf-8")) if isinstance(raw, str) else len(raw)
    if size > limit:
        raise LimitError("", f"the document is {size:,} bytes; at most {limit:,} bytes are accepted",
                         status_code=413)


def _no_constant(name: str) -> float:
    raise ValueError(f"{name} is not a number a design may hold")


def decode_text(raw: bytes, *, what: str = "the document") -> str:
    """UTF-8 bytes as text, a leading byte-order mark skipped (some Windows editors write one);
    other bytes are refused, with where the first byte that is not UTF-8 is (the message
    begins with ``what``, or with "is not" when ``what`` is empty)."""
    if raw.startswith(b"\xef\xbb\xbf"):
        raw = raw[3:]
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[:exc.start].count(b"\n") + 1
        raise LimitError("", f"{what + ' ' if what else ''}is not UTF-8 text (byte 0x{raw[exc.start]:02X} on line {line}); "
                             "save it as UTF-8 and try again") from None


def parse_json(raw: bytes | str, *, settings: Settings | None = None) -> Any:
    """Size check, then UTF-8 text (:func:`decode_text`), JSON, the depth and count checks;
    the parsed value."""
    settings = _settings(settings)
    check_size(raw, settings=settings)
    if isinstance(raw, bytes):
        raw = decode_text(raw)
    try:
        value = json.loads(raw, parse_constant=_no_constant)
    except RecursionError:
        raise LimitError("", f"the document is nested too deeply (at most {MAX_DEPTH} levels)") from None
    except ValueError as exc:  # JSONDecodeError included
        raise LimitError("", f"the document is not valid JSON: {exc}") from None
    check_counts(value, settings=settings)
    return value


def check_counts(value: Any, *, settings: Settings | None = None) -> None:
    """Refuse nesting deeper than MAX_DEPTH and any list or mapping longer than max_items."""
    limit = _settings(settings).max_items
    stack: list[tuple[Any, str, int]] = [(value, "", 0)]
    while stack:
        item, path, depth = stack.pop()
        if depth > MAX_DEPTH:
            raise LimitError(path, f"the document is nested too deeply (at most {MAX_DEPTH} levels)")
        if isinstance(item, dict):
            if len(item) > limit:
                raise LimitError(path, f"{len(item):,} keys here; at most {limit:,} are accepted")
            for k, v in item.items():
                if isinstance(v, (dict, list)):
                    stack.append((v, f"{path}.{k}" if path else str(k), depth + 1))
        elif isinstance(item, list):
            if len(item) > limit:
                what = path.rsplit(".", 1)[-1] or "entries"
                raise LimitError(path, f"the design has {len(item):,} {what}; at most {limit:,} are accepted")
            for i, v in enumerate(item):
                if isinstance(v, (dict, list)):
                    stack.append((v, f"{path}[{i}]", depth + 1))


def guard_document(value: Any, *, settings: Settings | None = None) -> Any:
    """Apply every limit to an object parsed elsewhere (counts, depth, and its JSON size)."""
    check_counts(value, settings=settings)
    try:
        text = json.dumps(value, ensure_ascii=False, allow_nan=False, separators=(",", ":"))
    except ValueError:
        raise LimitError("", "the document holds a number that is not finite (NaN or infinity)") from None
    check_size(text, settings=settings)
    return value


def check_json_type(content_type: str | None) -> None:
    """Refuse (415) a body not sent as ``application/json``: a web page elsewhere can post
    ``text/plain`` or a form to this server without asking, but not JSON (that needs the
    browser's permission first), so JSON routes take JSON only."""
    media = (content_type or "").split(";")[0].strip().lower()
    if media != "application/json":
        raise LimitError("", f"send the body as JSON with 'Content-Type: application/json' "
                             f"(this request said {media or 'nothing'!r})", status_code=415)


async def read_body(request, *, settings: Settings | None = None) -> bytes:
    """Read a JSON request body under the byte limit (stops reading once over it); the bytes,
    to be parsed with :func:`parse_json` off the event loop. Only ``application/json`` bodies
    are read (415 otherwise, see :func:`check_json_type`)."""
    check_json_type(request.headers.get("content-type"))
    settings = _settings(settings)
    limit = settings.max_document_bytes
    declared = request.headers.get("content-length", "")
    if declared.isdigit() and int(declared) > limit:
        raise LimitError("", f"the document is {int(declared):,} bytes; at most {limit:,} bytes are "
                             "accepted", status_code=413)
    chunks, size = [], 0
    async for chunk in request.stream():
        size += len(chunk)
        if size > limit:
            raise LimitError("", f"the document is over {limit:,} bytes, the most accepted",
                             status_code=413)
        chunks.append(chunk)
    return b"".join(chunks)


async def read_json(request, *, settings: Settings | None = None) -> Any:
    """:func:`read_body`, then :func:`parse_json` (small bodies; big ones: parse in a thread)."""
    return parse_json(await read_body(request, settings=settings), settings=settings)


# The work a solve does grows with the beam's nodes times the load cases (the deflection
# solve and the diagrams, per case) and, for the bearings, with the table's rows times the
# bearings times the cases (every row is rated for every bearing in every case). The counts
# alone let the products reach minutes; these bound the products, and the time budget of
# app.work bounds whatever is left. Measured here (2 shared cores, one BLAS thread): 2,000
# elements with 28 cases solve in 2.8 s; 400 steps, 200 forces, 50 supports, 100 cases and
# 2,000 elements (about 265,000 node-cases, now refused) took 6.1 s.
MAX_BEAM_WORK = 200_000       # (analysis.elements + segments + supports + elements) x cases
MAX_TABLE_WORK = 5_000_000    # bearing-table rows x bearings x load cases (1,000,000: 0.7 s)


def check_work(design) -> None:
    """Refuse (413) a validated design whose work, not only its counts, is beyond the limits."""
    cases = len(design.load_cases)
    nodes = (design.analysis.elements + len(design.shaft.segments) + len(design.supports)
             + len(design.elements))
    if nodes * cases > MAX_BEAM_WORK:
        raise LimitError("analysis.elements", (
            f"{design.analysis.elements:,} beam elements with {cases} load cases is too much work "
            f"for one solve (about {nodes * cases:,} node-cases; at most {MAX_BEAM_WORK:,}): use "
            "fewer elements (analysis.elements) or fewer load cases"), status_code=413)
    table = design.bearing_table
    if table is not None:
        rows = table.csv.count("\n") + 1
        rated = sum(1 for s in design.supports if s.bearing_type is not None)
        work = rows * max(1, rated) * cases
        if work > MAX_TABLE_WORK:
            raise LimitError("bearing_table.csv", (
                f"the bearing table's {rows:,} rows, rated at {rated} bearings in "
                f"{cases} load cases, are too much work for one solve ({work:,} ratings; at most "
                f"{MAX_TABLE_WORK:,}): shorten the table or use fewer load cases"), status_code=413)
