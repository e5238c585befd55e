"""The design store: designs with immutable, numbered revisions.

A design is a random, unguessable id (144 random bits, URL-safe) and its revisions
1, 2, 3 … Each revision keeps the design document exactly as saved, the engine version that
saved it, a comment, the author's name as typed and the time (UTC). Saving never overwrites:
it adds a revision. Saving on top of a revision older than the latest is refused with
:class:`StaleBase`; the refused document is kept all the same, as a *conflict* record that
can be read back, so that nothing the user typed is lost.

The interface is :class:`Store` (a protocol); :class:`SqliteStore` is the embedded default:
one file, WAL journal, created on first run. Every write runs in one ``BEGIN IMMEDIATE``
transaction, so concurrent writers (threads or processes) are serialised by SQLite and a
process killed in the middle of a save leaves either the whole revision or none of it.
Triggers refuse any UPDATE or DELETE of a revision, so revisions never change.

A PostgreSQL store for a team running several workers would implement the same protocol
(``SELECT … FOR UPDATE`` on the design row in place of ``BEGIN IMMEDIATE``); it is not part
of this module yet, and ``open_store`` says so when given a ``postgresql://`` URL.

``get_store`` is the FastAPI dependency; it opens the store named by the ``SHAFTWRIGHT_DB``
setting (see :mod:`app.settings`) once per location.
"""
from __future__ import annotations

import hashlib
import json
import secrets
import sqlite3
from contextlib import contextmanager
from datetime import datetime, timezone
from functools import lru_cache
from pathlib import Path
from typing import Annotated, Any, Iterator, Protocol, runtime_checkable

from fastapi import Depends
from pydantic import BaseModel, ConfigDict

from app.settings import Settings, get_settings

__all__ = [
    "Store", "SqliteStore", "Revision", "RevisionInfo", "ConflictRecord",
    "StoreError", "NotFound", "StaleBase", "new_design_id", "is_design_id",
    "open_store", "get_store", "StoreDep", "ID_BYTES",
]

ID_BYTES = 18  # 144 random bits; token_urlsafe gives 24 characters
_ID_CHARS = set("ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_")
SCHEMA_VERSION = 1


def new_design_id() -> str:
    """A fresh design id: ``ID_BYTES`` bytes from the OS's secure random source."""
    return secrets.token_urlsafe(ID_BYTES)


def is_design_id(text: str) -> bool:
    """True when ``text`` has the shape of an id this store hands out (cheap pre-check)."""
    return 16 <= len(text) <= 64 and set(text) <= _ID_CHARS


class _Frozen(BaseModel):
    model_config = ConfigDict(frozen=True)


class RevisionInfo(_Frozen):
    """One line of a design's history (no document)."""

    design_id: str
    n: int
    name: str
    comment: str
    author: str
    created_at: str  # ISO 8601, UTC
    engine_version: str
    base_revision: int | None = None


class Revision(RevisionInfo):
    """One saved revision, document included (the document exactly as it was saved)."""

    document: dict[str, Any]
    digest: str  # sha256 of the stored JSON text


class ConflictRecord(_Frozen):
    """A save that was refused because its base was not the latest; kept so nothing is lost."""

    id: int
    design_id: str
    base_revision: int
    latest_revision: int
    document: dict[str, Any]
    comment: str
    author: str
    created_at: str


class StoreError(Exception):
    """Base class of the store's errors."""


class NotFound(StoreError, KeyError):
    """No such design, revision or conflict record."""

    def __str__(self) -> str:  # KeyError would quote the message
        return str(self.args[0]) if self.args else "not found"


class StaleBase(StoreError):
    """The save was based on revision ``base_revision`` but ``latest`` is newer.

    The refused document is kept as conflict record ``conflict_id``.
    """

    def __init__(self, *, design_id: str, base_revision: int, latest: Revision, conflict_id: int):
        self.design_id = design_id
        self.base_revision = base_revision
        self.latest = latest
        self.conflict_id = conflict_id
        super().__init__(f"design {design_id}: revision {base_revision} is not the latest "
                         f"(the latest is {latest.n})")


@runtime_checkable
class Store(Protocol):
    """What the web layer needs from a store of designs."""

    def create(self, document: dict, *, author: str = "", comment: str = "",
               engine_version: str = "") -> Revision:
        """Store a new design; its first revision is number 1."""

    def add_revision(self, design_id: str, document: dict, *, base_revision: int | None,
                     author: str = "", comment: str = "", engine_version: str = "") -> Revision:
        """Add the next revision. ``base_revision`` None appends unconditionally; a number
        that is not the latest raises :class:`StaleBase` (the document is kept as a conflict)."""

    def latest(self, design_id: str) -> Revision: ...

    def revision(self, design_id: str, n: int) -> Revision: ...

    def revisions(self, design_id: str) -> list[RevisionInfo]: ...

    def conflict(self, design_id: str, conflict_id: int) -> ConflictRecord: ...

    def conflicts(self, design_id: str) -> list[ConflictRecord]: ...


_SCHEMA = """
CREATE TABLE IF NOT EXISTS designs (
    id          TEXT PRIMARY KEY,
    created_at  TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS revisions (
    design_id      TEXT NOT NULL REFERENCES designs(id),
    n              INTEGER NOT NULL CHECK (n >= 1),
    name           TEXT NOT NULL,
    document       TEXT NOT NULL,
    digest         TEXT NOT NULL,
    engine_version TEXT NOT NULL,
    comment        TEXT NOT NULL,
    author         TEXT NOT NULL,
    created_at     TEXT NOT NULL,
    base_revision  INTEGER,
    PRIMARY KEY (design_id, n)
) WITHOUT ROWID;
CREATE TABLE IF NOT EXISTS conflicts (
    id              INTEGER PRIMARY KEY AUTOINCREMENT,
    design_id       TEXT NOT NULL REFERENCES designs(id),
    base_revision   INTEGER NOT NULL,
    latest_revision INTEGER NOT NULL,
    document        TEXT NOT NULL,
    comment         TEXT NOT NULL,
    author          TEXT NOT NULL,
    created_at      TEXT NOT NULL
);
CREATE INDEX IF NOT EXISTS conflicts_by_design ON conflicts (design_id, id);
CREATE TRIGGER IF NOT EXISTS revisions_never_change BEFORE UPDATE ON revisions
BEGIN SELECT RAISE(ABORT, 'revisions are immutable'); END;
CREATE TRIGGER IF NOT EXISTS revisions_never_vanish BEFORE DELETE ON revisions
BEGIN SELECT RAISE(ABORT, 'revisions are immutable'); END;
CREATE TRIGGER IF NOT EXISTS conflicts_never_change BEFORE UPDATE ON conflicts
BEGIN SELECT RAISE(ABORT, 'conflict records are immutable'); END;
"""


def _now() -> str:
    return datetime.now(timezone.utc).isoformat(timespec="milliseconds")


def _dump(document: dict) -> str:
    return json.dumps(document, ensure_ascii=False, separators=(",", ":"), allow_nan=False)


def _digest(text: str) -> str:
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def _name(document: dict) -> str:
    name = document.get("name") if isinstance(document, dict) else None
    return name if isinstance(name, str) else ""


_REV_COLS = "design_id, n, name, comment, author, created_at, engine_version, base_revision"


class SqliteStore:
    """:class:`Store` in one SQLite file (WAL journal), created on first use.

    One short-lived connection per operation, so the object is safe to share between
    threads and several processes may use the same file.
    """

    def __init__(self, path: str | Path, *, busy_timeout_s: float = 30.0):
        self.path = Path(path).expanduser().resolve()
        self.busy_timeout_s = busy_timeout_s
        self.path.parent.mkdir(parents=True, exist_ok=True)
        with self._connect() as con:
            con.execute("PRAGMA journal_mode=WAL")
            # one script, one transaction: several processes may open a new file at once
            con.executescript(f"BEGIN IMMEDIATE;{_SCHEMA}PRAGMA user_version={SCHEMA_VERSION};COMMIT;")

    def __repr__(self) -> str:
        return f"SqliteStore({str(self.path)!r})"

    @contextmanager
    def _connect(self) -> Iterator[sqlite3.Connection]:
        con = sqlite3.connect(self.path, timeout=self.busy_timeout_s, isolation_level=None)
        try:
            con.execute("PRAGMA foreign_keys=ON")
            con.execute("PRAGMA synchronous=FULL")
            yield con
        finally:
            con.close()

    @contextmanager
    def _write(self) -> Iterator[sqlite3.Connection]:
        """One write transaction; BEGIN IMMEDIATE takes the write lock up front."""
        with self._connect() as con:
            con.execute("BEGIN IMMEDIATE")
            try:
                yield con
            except BaseException:
                con.execute("ROLLBACK")
                raise
            con.execute("COMMIT")

    # --- writes ----------------------------------------------------------------------------

    def create(self, document: dict, *, author: str = "", comment: str = "",
               engine_version: str = "") -> Revision:
        text, now = _dump(document), _now()
        with self._write() as con:
            for _ in range(5):  # a clash of 144 random bits will not happen; be sure anyway
                design_id = new_design_id()
                if con.execute("SELECT 1 FROM designs WHERE id=?", (design_id,)).fetchone() is None:
                    break
            con.execute("INSERT INTO designs (id, created_at) VALUES (?, ?)", (design_id, now))
            self._insert(con, design_id, 1, text, document, author=author, comment=comment,
                         engine_version=engine_version, now=now, base=None)
        return self.revision(design_id, 1)

    def add_revision(self, design_id: str, document: dict, *, base_revision: int | None,
                     author: str = "", comment: str = "", engine_version: str = "") -> Revision:
        text, now = _dump(document), _now()
        with self._connect() as con:
            con.execute("BEGIN IMMEDIATE")
            try:
                row = con.execute("SELECT MAX(n) FROM revisions WHERE design_id=?",
                                  (design_id,)).fetchone()
                latest_n = row[0] if row else None
                if latest_n is None:
                    raise NotFound(f"no design {design_id!r}")
                if base_revision is not None and base_revision != latest_n:
                    cur = con.execute(
                        "INSERT INTO conflicts (design_id, base_revision, latest_revision, "
                        "document, comment, author, created_at) VALUES (?,?,?,?,?,?,?)",
                        (design_id, base_revision, latest_n, text, comment, author, now))
                    conflict_id = cur.lastrowid
                    con.execute("COMMIT")
                    raise StaleBase(design_id=design_id, base_revision=base_revision,
                                    latest=self.revision(design_id, latest_n),
                                    conflict_id=conflict_id)
                n = latest_n + 1
                self._insert(con, design_id, n, text, document, author=author, comment=comment,
                             engine_version=engine_version, now=now, base=base_revision)
                con.execute("COMMIT")
            except StaleBase:
                raise
            except BaseException:
                if con.in_transaction:
                    con.execute("ROLLBACK")
                raise
        return self.revision(design_id, n)

    @staticmethod
    def _insert(con, design_id, n, text, document, *, author, comment, engine_version, now, base):
        con.execute(
            f"INSERT INTO revisions ({_REV_COLS}, document, digest) VALUES (?,?,?,?,?,?,?,?,?,?)",
            (design_id, n, _name(document), comment, author, now, engine_version, base,
             text, _digest(text)))

    # --- reads -----------------------------------------------------------------------------

    def latest(self, design_id: str) -> Revision:
        with self._connect() as con:
            row = con.execute(
                f"SELECT {_REV_COLS}, document, digest FROM revisions WHERE design_id=? "
                "ORDER BY n DESC LIMIT 1", (design_id,)).fetchone()
        if row is None:
            raise NotFound(f"no design {design_id!r}")
        return _revision(row)

    def revision(self, design_id: str, n: int) -> Revision:
        with self._connect() as con:
            row = con.execute(
                f"SELECT {_REV_COLS}, document, digest FROM revisions WHERE design_id=? AND n=?",
                (design_id, int(n))).fetchone()
        if row is None:
            raise NotFound(f"design {design_id!r} has no revision {n}")
        return _revision(row)

    def revisions(self, design_id: str) -> list[RevisionInfo]:
        with self._connect() as con:
            rows = con.execute(f"SELECT {_REV_COLS} FROM revisions WHERE design_id=? ORDER BY n",
                               (design_id,)).fetchall()
        if not rows:
            raise NotFound(f"no design {design_id!r}")
        return [RevisionInfo(**dict(zip(_REV_COLS.split(", "), r))) for r in rows]

    def conflict(self, design_id: str, conflict_id: int) -> ConflictRecord:
        with self._connect() as con:
            row = con.execute(f"SELECT {_CON_COLS} FROM conflicts WHERE design_id=? AND id=?",
                              (design_id, int(conflict_id))).fetchone()
        if row is None:
            raise NotFound(f"design {design_id!r} has no conflict record {conflict_id}")
        return _conflict(row)

    def conflicts(self, design_id: str) -> list[ConflictRecord]:
        with self._connect() as con:
            rows = con.execute(f"SELECT {_CON_COLS} FROM conflicts WHERE design_id=? ORDER BY id",
                               (design_id,)).fetchall()
        return [_conflict(r) for r in rows]

    def check_integrity(self) -> list[str]:
        """Problems found in the file: SQLite's own check, revision gaps, altered documents.

        An empty list means the file is consistent.
        """
        problems: list[str] = []
        with self._connect() as con:
            problems += [r[0] for r in con.execute("PRAGMA integrity_check") if r[0] != "ok"]
            for design_id, count, top in con.execute(
                    "SELECT design_id, COUNT(*), MAX(n) FROM revisions GROUP BY design_id"):
                if count != top:
                    problems.append(f"design {design_id}: {count} revisions but the latest is {top}")
            for design_id, n, text, digest in con.execute(
                    "SELECT design_id, n, document, digest FROM revisions"):
                if _digest(text) != digest:
                    problems.append(f"design {design_id} revision {n}: document does not match its digest")
            orphans = con.execute("SELECT COUNT(*) FROM designs d WHERE NOT EXISTS "
                                  "(SELECT 1 FROM revisions r WHERE r.design_id = d.id)").fetchone()[0]
            if orphans:
                problems.append(f"{orphans} design(s) without a revision")
        return problems


_CON_COLS = "id, design_id, base_revision, latest_revision, document, comment, author, created_at"


def _revision(row) -> Revision:
    fields = dict(zip(_REV_COLS.split(", ") + ["document", "digest"], row))
    fields["document"] = json.loads(fields["document"])
    return Revision(**fields)


def _conflict(row) -> ConflictRecord:
    fields = dict(zip(_CON_COLS.split(", "), row))
    fields["document"] = json.loads(fields["document"])
    return ConflictRecord(**fields)


@lru_cache(maxsize=16)
def open_store(location: str) -> Store:
    """Open (once per location) the store at ``location``: a file path or ``sqlite:///path``."""
    if location.startswith(("postgresql:", "postgres:")):
        raise StoreError("a PostgreSQL store is not available yet; set SHAFTWRIGHT_DB to a file path")
    if location.startswith("sqlite:///"):
        location = location[len("sqlite:///"):]
    return SqliteStore(location)


def get_store(settings: Annotated[Settings, Depends(get_settings)]) -> Store:
    """FastAPI dependency: the store named by the ``SHAFTWRIGHT_DB`` setting."""
    return open_store(settings.db)


StoreDep = Annotated[Store, Depends(get_store)]
