"""Three-way merge of design documents: a save on a stale base keeps both designers' work.

:func:`merge3` takes the revision the designer started from (``base``), the latest revision
(``theirs``) and the designer's version (``mine``) and walks the three JSON trees together,
key by key:

- a key that only one side changed takes that side's value (recorded in ``provenance`` with
  ``"mine"`` or ``"theirs"``);
- a key that both changed to the same value takes it;
- a key that both changed to different values is a *clash*: it takes the value named in
  ``resolutions`` (``{path: "mine" | "theirs"}``) when there is one, and is otherwise listed
  in ``clashes`` (and ``theirs`` is kept there, so the merged document is never half-made).

Mappings merge key by key; the lists of supports and elements are matched by ``id`` and the
load cases by ``name`` (the same keys as :func:`app.note.flatten`, so paths read
``supports[A].x_mm``); other lists (shaft segments, grooves) are matched by index. A row that
one side removed and the other changed is a clash on the whole row. Order: the latest
revision's order, then rows only the designer added, in their order.

The function is pure: no store, no web. The routes decide what to do with a clash (409 with
the clashing keys, the page's "keep mine" / "take theirs" choice).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Literal

from app.note import _KEYED as KEYED  # one keying of rows for diffs and merges

__all__ = ["Clash", "Merge", "merge3", "MISSING"]

Side = Literal["mine", "theirs"]


class _Missing:
    def __repr__(self) -> str:
        return "MISSING"


MISSING: Any = _Missing()  # a key or row that is not there (added or removed)


@dataclass(frozen=True)
class Clash:
    """Both sides changed ``path`` to different values (``MISSING`` = removed / not there)."""

    path: str
    base: Any
    theirs: Any
    mine: Any

    def as_json(self) -> dict[str, Any]:
        show = lambda v: None if v is MISSING else v  # noqa: E731
        return {"path": self.path, "base": show(self.base), "theirs": show(self.theirs),
                "mine": show(self.mine), "removed_in_theirs": self.theirs is MISSING,
                "removed_in_mine": self.mine is MISSING}


@dataclass
class Merge:
    """What :func:`merge3` found: the merged document, where each change came from, clashes."""

    document: dict[str, Any]
    provenance: dict[str, Side] = field(default_factory=dict)
    clashes: list[Clash] = field(default_factory=list)

    @property
    def clean(self) -> bool:
        return not self.clashes

    def keys_from(self, side: Side) -> list[str]:
        return [p for p, s in self.provenance.items() if s == side]


def merge3(base: dict, theirs: dict, mine: dict, *,
           resolutions: dict[str, Side] | None = None) -> Merge:
    """Merge ``mine`` and ``theirs``, both edited from ``base`` (see the module docstring).

    >>> m = merge3({"a": 1, "b": 1}, {"a": 2, "b": 1}, {"a": 1, "b": 3})
    >>> m.document, m.provenance, m.clean
    ({'a': 2, 'b': 3}, {'a': 'theirs', 'b': 'mine'}, True)
    >>> m = merge3({"a": 1}, {"a": 2}, {"a": 3})
    >>> [c.path for c in m.clashes], m.document
    (['a'], {'a': 2})
    >>> merge3({"a": 1}, {"a": 2}, {"a": 3}, resolutions={"a": "mine"}).document
    {'a': 3}
    """
    out = Merge(document={})
    merged = _merge(base, theirs, mine, "", out, resolutions or {})
    out.document = merged if isinstance(merged, dict) else {}
    return out


def _merge(base: Any, theirs: Any, mine: Any, path: str, out: Merge,
           resolutions: dict[str, Side]) -> Any:
    if _same(theirs, mine):
        return theirs
    if all(isinstance(v, dict) for v in (base, theirs, mine)):  # down to the changed leaves
        return _merge_dicts(base, theirs, mine, path, out, resolutions)
    if all(isinstance(v, list) for v in (base, theirs, mine)):
        return _merge_lists(base, theirs, mine, path, out, resolutions)
    if _same(base, theirs):
        out.provenance[path] = "mine"
        return mine
    if _same(base, mine):
        out.provenance[path] = "theirs"
        return theirs
    choice = resolutions.get(path)
    if choice in ("mine", "theirs"):
        out.provenance[path] = choice
        return mine if choice == "mine" else theirs
    out.clashes.append(Clash(path, base, theirs, mine))
    return theirs


def _same(a: Any, b: Any) -> bool:
    if a is MISSING or b is MISSING:
        return a is b
    return type(a) is type(b) and a == b or (_number(a) and _number(b) and a == b)


def _number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _merge_dicts(base: dict, theirs: dict, mine: dict, path: str, out: Merge,
                 resolutions: dict[str, Side]) -> dict:
    merged: dict[str, Any] = {}
    for k in list(theirs) + [k for k in mine if k not in theirs] + \
            [k for k in base if k not in theirs and k not in mine]:
        if k in merged:
            continue
        v = _merge(base.get(k, MISSING), theirs.get(k, MISSING), mine.get(k, MISSING),
                   f"{path}.{k}" if path else str(k), out, resolutions)
        if v is not MISSING:
            merged[k] = v
    return merged


def _labels(items: list, key: str | None) -> list[str] | None:
    """Each row's label (its id or name) when every row has a distinct one; else None."""
    if key is None or not all(isinstance(it, dict) and isinstance(it.get(key), str) for it in items):
        return None
    names = [it[key] for it in items]
    return names if len(set(names)) == len(names) else None


def _merge_lists(base: list, theirs: list, mine: list, path: str, out: Merge,
                 resolutions: dict[str, Side]) -> list:
    key = KEYED.get(path)
    lb, lt, lm = _labels(base, key), _labels(theirs, key), _labels(mine, key)
    if lb is None or lt is None or lm is None:  # match by position
        lb, lt, lm = ([str(i) for i in range(len(x))] for x in (base, theirs, mine))
    b, t, m = dict(zip(lb, base)), dict(zip(lt, theirs)), dict(zip(lm, mine))
    merged = []
    for lab in lt + [x for x in lm if x not in t] + [x for x in lb if x not in t and x not in m]:
        v = _merge(b.get(lab, MISSING), t.get(lab, MISSING), m.get(lab, MISSING),
                   f"{path}[{lab}]", out, resolutions)
        if v is not MISSING:
            merged.append(v)
    return merged
