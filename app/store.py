"""The design store: designs with immutable, numbered revisions.

A design is a random, unguessable id (144 random bits, URL-safe) and its revisions
1, 2, 3 … Each revision keeps the design document exactly as saved, the engine version that
saved it, a comment, the author's name as typed and the time (UTC). Saving never overwrites:
it adds a revision. Saving on top of a revision older than the latest is refused with
:class:`StaleBase`; the refused document is kept all the same, as a *conflict* record that
can be read back, so that nothing the user typed is lost.

The interface is :class:`Store` (a protocol). Two stores implement it on one shared body of
logic (numbering, conflicts, checksums, the integrity check); they differ only in how they
connect and lock:

- :class:`SqliteStore`, the embedded default: one file, WAL journal, created on first run.
  Every write runs in one ``BEGIN IMMEDIATE`` transaction, so concurrent writers (threads or
  processes) are serialised by SQLite.
- :class:`PostgresStore`, for a team running several workers against one server
  (``postgresql://`` URL, driver ``psycopg`` 3, extra ``[postgres]``). A save locks its
  design's row (``SELECT … FOR UPDATE``) for the length of its transaction, so the numbers of
  concurrent saves from any number of processes follow one another without gaps.

In both, a process killed in the middle of a save leaves either the whole revision or none of
it, and triggers refuse any UPDATE or DELETE of a revision (and, in PostgreSQL, a TRUNCATE),
so revisions never change.

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
from typing import Annotated, Any, ClassVar, Iterator, Protocol, runtime_checkable
from urllib.parse import urlsplit, urlunsplit

from fastapi import Depends
from pydantic import BaseModel, ConfigDict

from app.settings import Settings, get_settings

__all__ = [
    "Store", "SqliteStore", "PostgresStore", "Revision", "RevisionInfo", "ConflictRecord",
    "StoreError", "StoreUnavailable", "NotFound", "StaleBase", "new_design_id", "is_design_id",
    "Account", "ShareLink", "SessionInfo", "AccountExists",
    "open_store", "get_store", "StoreDep", "ID_BYTES",
]

ID_BYTES = 18  # 144 random bits; token_urlsafe gives 24 characters
_ID_CHARS = set("ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_")
SCHEMA_VERSION = 2  # 2: accounts, tokens, share links, sessions


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


class Account(_Frozen):
    """An account of the team (never its password or token hashes)."""

    name: str
    created_at: str
    tokens: int = 0


class ShareLink(_Frozen):
    """A share link of a design (the link's secret is not stored, only its hash)."""

    id: str
    design_id: str
    role: str  # "view" (view, note, compare, export) or "edit" (also save)
    label: str
    created_by: str
    created_at: str
    revoked_at: str | None = None


class SessionInfo(_Frozen):
    """A live browser session: of an account, or of a share link (then design and role)."""

    account: str | None = None
    csrf_token: str
    link_id: str | None = None
    design_id: str | None = None
    role: str | None = None
    link_label: str | None = None


class StoreError(Exception):
    """Base class of the store's errors."""


class StoreUnavailable(StoreError):
    """The store cannot be read or written just now (read-only file, full disk, locked,
    server down). Nothing was saved; the same request can succeed once that is fixed, with
    no restart: every operation opens its own connection."""


def _unavailable(exc: Exception, where: str) -> StoreUnavailable:
    text = str(exc).lower()
    if "readonly" in text or "read-only" in text or "permission" in text:
        why = "the store is read-only (check the permissions of the database file and its folder)"
    elif "full" in text or "no space" in text:
        why = "the disk that holds the store is full"
    elif "locked" in text or "busy" in text:
        why = "the store is busy with another save; try again"
    elif "unable to open" in text:
        why = "the database file cannot be opened (check that its folder exists and is writable)"
    else:
        why = f"the store cannot be reached ({str(exc).strip() or type(exc).__name__})"
    err = StoreUnavailable(f"{why[0].upper()}{why[1:]}; nothing was changed.")
    err.where = where  # for the server's log, not for the user
    return err


class NotFound(StoreError, KeyError):
    """No such design, revision or conflict record."""

    def __str__(self) -> str:  # KeyError would quote the message
        return str(self.args[0]) if self.args else "not found"


class AccountExists(StoreError):
    """An account of that name exists already."""


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


# The tables both stores lay out; the two differ only where the SQL dialects do.
_TABLES = """
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
){revisions_options};
CREATE TABLE IF NOT EXISTS conflicts (
    id              {conflict_id},
    design_id       TEXT NOT NULL REFERENCES designs(id),
    base_revision   INTEGER NOT NULL,
    latest_revision INTEGER NOT NULL,
    document        TEXT NOT NULL,
    comment         TEXT NOT NULL,
    author          TEXT NOT NULL,
    created_at      TEXT NOT NULL
);
CREATE INDEX IF NOT EXISTS conflicts_by_design ON conflicts (design_id, id);
"""

# Who may use the server (schema 2): accounts with their API tokens, share links of a design
# with a role, and browser sessions (of an account or of a link). Secrets are stored only as
# hashes (see app.auth). Laid out on every open, so stores made by schema 1 gain them.
_ACCESS_TABLES = """
CREATE TABLE IF NOT EXISTS accounts (
    name          TEXT PRIMARY KEY,
    password_hash TEXT NOT NULL,
    created_at    TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS api_tokens (
    id          TEXT PRIMARY KEY,
    account     TEXT NOT NULL REFERENCES accounts(name) ON DELETE CASCADE,
    token_hash  TEXT NOT NULL,
    label       TEXT NOT NULL,
    created_at  TEXT NOT NULL
);
CREATE TABLE IF NOT EXISTS share_links (
    id          TEXT PRIMARY KEY,
    design_id   TEXT NOT NULL REFERENCES designs(id),
    role        TEXT NOT NULL CHECK (role IN ('view', 'edit')),
    token_hash  TEXT NOT NULL UNIQUE,
    label       TEXT NOT NULL,
    created_by  TEXT NOT NULL,
    created_at  TEXT NOT NULL,
    revoked_at  TEXT
);
CREATE INDEX IF NOT EXISTS share_links_by_design ON share_links (design_id, created_at);
CREATE TABLE IF NOT EXISTS sessions (
    id_hash     TEXT PRIMARY KEY,
    account     TEXT REFERENCES accounts(name) ON DELETE CASCADE,
    link_id     TEXT REFERENCES share_links(id) ON DELETE CASCADE,
    csrf_token  TEXT NOT NULL,
    created_at  TEXT NOT NULL,
    expires_at  TEXT NOT NULL
);
"""

_SCHEMA = _TABLES.format(revisions_options=" WITHOUT ROWID",
                         conflict_id="INTEGER PRIMARY KEY AUTOINCREMENT") + """
CREATE TRIGGER IF NOT EXISTS revisions_never_change BEFORE UPDATE ON revisions
BEGIN SELECT RAISE(ABORT, 'revisions are immutable'); END;
CREATE TRIGGER IF NOT EXISTS revisions_never_vanish BEFORE DELETE ON revisions
BEGIN SELECT RAISE(ABORT, 'revisions are immutable'); END;
CREATE TRIGGER IF NOT EXISTS conflicts_never_change BEFORE UPDATE ON conflicts
BEGIN SELECT RAISE(ABORT, 'conflict records are immutable'); END;
""" + _ACCESS_TABLES


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


class _SqlStore:
    """What every SQL store shares: numbering, conflicts, checksums, reads, integrity check.

    A subclass supplies the connection (:meth:`_connect`, one per operation), the write
    transaction (:meth:`_write`), the lock that serialises saves to one design
    (:meth:`_lock_design`) and its engine's own checks (:meth:`_engine_problems`). SQL is
    written with ``?`` placeholders; ``_PARAM`` is the driver's own.
    """

    _PARAM: ClassVar[str] = "?"

    def _connect(self):  # pragma: no cover - abstract
        raise NotImplementedError

    def _write(self):  # pragma: no cover - abstract
        raise NotImplementedError

    def _lock_design(self, con, design_id: str) -> None:
        """Hold, until the transaction ends, the lock that serialises saves to ``design_id``."""

    def _engine_problems(self, con) -> list[str]:
        return []

    def _run(self, con, sql: str, params: tuple = ()):
        return con.execute(sql.replace("?", self._PARAM), params)

    # --- writes ----------------------------------------------------------------------------

    def create(self, document: dict, *, author: str = "", comment: str = "",
               engine_version: str = "") -> Revision:
        text, now = _dump(document), _now()
        with self._write() as con:
            for _ in range(5):  # a clash of 144 random bits will not happen; be sure anyway
                design_id = new_design_id()
                if self._run(con, "SELECT 1 FROM designs WHERE id=?", (design_id,)).fetchone() is None:
                    break
            self._run(con, "INSERT INTO designs (id, created_at) VALUES (?, ?)", (design_id, now))
            self._insert(con, design_id, 1, text, document, author=author, comment=comment,
                         engine_version=engine_version, now=now, base=None)
            return self._read_revision(con, design_id, 1)

    def add_revision(self, design_id: str, document: dict, *, base_revision: int | None,
                     author: str = "", comment: str = "", engine_version: str = "") -> Revision:
        text, now = _dump(document), _now()
        conflict_id = None
        with self._write() as con:
            self._lock_design(con, design_id)
            latest_n = self._run(con, "SELECT MAX(n) FROM revisions WHERE design_id=?",
                                 (design_id,)).fetchone()[0]
            if latest_n is None:
                raise NotFound(f"no design {design_id!r}")
            if base_revision is not None and base_revision != latest_n:
                conflict_id = self._run(
                    con, "INSERT INTO conflicts (design_id, base_revision, latest_revision, "
                    "document, comment, author, created_at) VALUES (?,?,?,?,?,?,?) RETURNING id",
                    (design_id, base_revision, latest_n, text, comment, author, now)).fetchone()[0]
            else:
                self._insert(con, design_id, latest_n + 1, text, document, author=author,
                             comment=comment, engine_version=engine_version, now=now,
                             base=base_revision)
            saved = self._read_revision(con, design_id, latest_n + (conflict_id is None))
        if conflict_id is not None:  # committed: the refused document is kept
            raise StaleBase(design_id=design_id, base_revision=base_revision, latest=saved,
                            conflict_id=conflict_id)
        return saved

    def _insert(self, con, design_id, n, text, document, *, author, comment, engine_version,
                now, base):
        self._run(
            con,
            f"INSERT INTO revisions ({_REV_COLS}, document, digest) VALUES (?,?,?,?,?,?,?,?,?,?)",
            (design_id, n, _name(document), comment, author, now, engine_version, base,
             text, _digest(text)))

    # --- reads -----------------------------------------------------------------------------

    def _one(self, sql: str, params: tuple):
        with self._connect() as con:
            return self._run(con, sql, params).fetchone()

    def _all(self, sql: str, params: tuple) -> list:
        with self._connect() as con:
            return self._run(con, sql, params).fetchall()

    def latest(self, design_id: str) -> Revision:
        row = self._one(f"SELECT {_REV_COLS}, document, digest FROM revisions WHERE design_id=? "
                        "ORDER BY n DESC LIMIT 1", (design_id,))
        if row is None:
            raise NotFound(f"no design {design_id!r}")
        return _revision(row)

    def revision(self, design_id: str, n: int) -> Revision:
        with self._connect() as con:
            return self._read_revision(con, design_id, n)

    def _read_revision(self, con, design_id: str, n: int) -> Revision:
        row = self._run(con, f"SELECT {_REV_COLS}, document, digest FROM revisions "
                        "WHERE design_id=? AND n=?", (design_id, int(n))).fetchone()
        if row is None:
            raise NotFound(f"design {design_id!r} has no revision {n}")
        return _revision(row)

    def revisions(self, design_id: str) -> list[RevisionInfo]:
        rows = self._all(f"SELECT {_REV_COLS} FROM revisions WHERE design_id=? ORDER BY n",
                         (design_id,))
        if not rows:
            raise NotFound(f"no design {design_id!r}")
        return [RevisionInfo(**dict(zip(_REV_COLS.split(", "), r))) for r in rows]

    def conflict(self, design_id: str, conflict_id: int) -> ConflictRecord:
        row = self._one(f"SELECT {_CON_COLS} FROM conflicts WHERE design_id=? AND id=?",
                        (design_id, int(conflict_id)))
        if row is None:
            raise NotFound(f"design {design_id!r} has no conflict record {conflict_id}")
        return _conflict(row)

    def conflicts(self, design_id: str) -> list[ConflictRecord]:
        rows = self._all(f"SELECT {_CON_COLS} FROM conflicts WHERE design_id=? ORDER BY id",
                         (design_id,))
        return [_conflict(r) for r in rows]

    def check_integrity(self) -> list[str]:
        """Problems found in the store: the engine's own check, revision gaps, altered documents.

        An empty list means the store is consistent.
        """
        problems: list[str] = []
        with self._connect() as con:
            problems += self._engine_problems(con)
            for design_id, count, top in self._run(
                    con, "SELECT design_id, COUNT(*), MAX(n) FROM revisions GROUP BY design_id"):
                if count != top:
                    problems.append(f"design {design_id}: {count} revisions but the latest is {top}")
            for design_id, n, text, digest in self._run(
                    con, "SELECT design_id, n, document, digest FROM revisions"):
                if _digest(text) != digest:
                    problems.append(f"design {design_id} revision {n}: document does not match its digest")
            orphans = self._run(con, "SELECT COUNT(*) FROM designs d WHERE NOT EXISTS "
                                "(SELECT 1 FROM revisions r WHERE r.design_id = d.id)").fetchone()[0]
            if orphans:
                problems.append(f"{orphans} design(s) without a revision")
        return problems

    # --- accounts, API tokens, share links, sessions (hashes only; see app.auth) -----------

    def has_accounts(self) -> bool:
        return self._one("SELECT 1 FROM accounts LIMIT 1", ()) is not None

    def add_account(self, name: str, password_hash: str) -> None:
        """A new account; :class:`AccountExists` when the name is taken."""
        with self._write() as con:
            if self._run(con, "SELECT 1 FROM accounts WHERE name=?", (name,)).fetchone():
                raise AccountExists(f"there is already an account {name!r}")
            self._run(con, "INSERT INTO accounts (name, password_hash, created_at) VALUES (?,?,?)",
                      (name, password_hash, _now()))

    def remove_account(self, name: str) -> None:
        """Remove an account with its tokens and sessions (its revisions keep its name)."""
        with self._write() as con:
            if not self._run(con, "DELETE FROM accounts WHERE name=? RETURNING name",
                             (name,)).fetchall():
                raise NotFound(f"no account {name!r}")

    def accounts(self) -> list[Account]:
        rows = self._all("SELECT a.name, a.created_at, (SELECT COUNT(*) FROM api_tokens t "
                         "WHERE t.account = a.name) FROM accounts a ORDER BY a.name", ())
        return [Account(name=r[0], created_at=r[1], tokens=r[2]) for r in rows]

    def password_hash(self, name: str) -> str | None:
        row = self._one("SELECT password_hash FROM accounts WHERE name=?", (name,))
        return row[0] if row else None

    def set_password_hash(self, name: str, password_hash: str) -> None:
        """A new password; the account's browser sessions end (its API tokens stay)."""
        with self._write() as con:
            self._run(con, "UPDATE accounts SET password_hash=? WHERE name=?", (password_hash, name))
            self._run(con, "DELETE FROM sessions WHERE account=?", (name,))

    def add_token(self, account: str, token_id: str, token_hash: str, *, label: str = "") -> None:
        with self._write() as con:
            if not self._run(con, "SELECT 1 FROM accounts WHERE name=?", (account,)).fetchone():
                raise NotFound(f"no account {account!r}")
            self._run(con, "INSERT INTO api_tokens (id, account, token_hash, label, created_at) "
                      "VALUES (?,?,?,?,?)", (token_id, account, token_hash, label, _now()))

    def token(self, token_id: str) -> tuple[str, str] | None:
        """(account, token hash) of an API token, or None."""
        row = self._one("SELECT account, token_hash FROM api_tokens WHERE id=?", (token_id,))
        return (row[0], row[1]) if row else None

    def add_link(self, design_id: str, *, link_id: str, role: str, token_hash: str,
                 label: str, created_by: str) -> ShareLink:
        with self._write() as con:
            if not self._run(con, "SELECT 1 FROM designs WHERE id=?", (design_id,)).fetchone():
                raise NotFound(f"no design {design_id!r}")
            self._run(con, "INSERT INTO share_links (id, design_id, role, token_hash, label, "
                      "created_by, created_at) VALUES (?,?,?,?,?,?,?)",
                      (link_id, design_id, role, token_hash, label, created_by, _now()))
            row = self._run(con, f"SELECT {_LINK_COLS} FROM share_links WHERE id=?",
                            (link_id,)).fetchone()
        return _link(row)

    def links(self, design_id: str) -> list[ShareLink]:
        rows = self._all(f"SELECT {_LINK_COLS} FROM share_links WHERE design_id=? "
                         "ORDER BY created_at, id", (design_id,))
        return [_link(r) for r in rows]

    def link_by_token_hash(self, token_hash: str) -> ShareLink | None:
        row = self._one(f"SELECT {_LINK_COLS} FROM share_links WHERE token_hash=?", (token_hash,))
        return _link(row) if row else None

    def revoke_link(self, design_id: str, link_id: str) -> None:
        """Revoke a link: it stops working at once, and its browser sessions end."""
        with self._write() as con:
            if not self._run(con, "UPDATE share_links SET revoked_at=? WHERE id=? AND design_id=? "
                             "AND revoked_at IS NULL RETURNING id",
                             (_now(), link_id, design_id)).fetchall():
                raise NotFound(f"design {design_id!r} has no open link {link_id!r}")
            self._run(con, "DELETE FROM sessions WHERE link_id=?", (link_id,))

    def add_session(self, id_hash: str, *, csrf_token: str, expires_at: str,
                    account: str | None = None, link_id: str | None = None) -> None:
        with self._write() as con:
            self._run(con, "DELETE FROM sessions WHERE expires_at < ?", (_now(),))
            self._run(con, "INSERT INTO sessions (id_hash, account, link_id, csrf_token, "
                      "created_at, expires_at) VALUES (?,?,?,?,?,?)",
                      (id_hash, account, link_id, csrf_token, _now(), expires_at))

    def session(self, id_hash: str) -> SessionInfo | None:
        """The live session with this hash (expired, or of a revoked link: None)."""
        row = self._one(
            "SELECT s.account, s.csrf_token, l.id, l.design_id, l.role, l.label, l.revoked_at "
            "FROM sessions s LEFT JOIN share_links l ON l.id = s.link_id "
            "WHERE s.id_hash=? AND s.expires_at > ?", (id_hash, _now()))
        if row is None or (row[2] is not None and row[6] is not None):
            return None
        if row[0] is None and row[2] is None:
            return None
        return SessionInfo(account=row[0], csrf_token=row[1], link_id=row[2], design_id=row[3],
                           role=row[4], link_label=row[5])

    def end_session(self, id_hash: str) -> None:
        with self._write() as con:
            self._run(con, "DELETE FROM sessions WHERE id_hash=?", (id_hash,))


class SqliteStore(_SqlStore):
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
        try:
            con = sqlite3.connect(self.path, timeout=self.busy_timeout_s, isolation_level=None)
        except sqlite3.OperationalError as exc:
            raise _unavailable(exc, str(self.path)) from None
        try:
            con.execute("PRAGMA foreign_keys=ON")
            con.execute("PRAGMA synchronous=FULL")
            yield con
        except sqlite3.OperationalError as exc:
            # read-only file or folder, full disk, I/O error, lock timeout: a 503, not a 500
            raise _unavailable(exc, str(self.path)) from None
        finally:
            con.close()

    @contextmanager
    def _write(self) -> Iterator[sqlite3.Connection]:
        """One write transaction; BEGIN IMMEDIATE takes the file's write lock up front, which
        also serialises the saves to each design (so :meth:`_lock_design` has nothing to do).

        Before it, :meth:`_repair_sidecars` makes the ``-wal``/``-shm`` files writable again
        when the database file is: SQLite creates them with the database file's permissions,
        so a read made while the file was read-only leaves them read-only, and every later
        save would fail after the permissions were repaired."""
        self._repair_sidecars()
        with self._connect() as con:
            con.execute("BEGIN IMMEDIATE")
            try:
                yield con
            except BaseException:
                if con.in_transaction:  # SQLite has already rolled back after e.g. a full disk
                    con.execute("ROLLBACK")
                raise
            con.execute("COMMIT")

    def _repair_sidecars(self) -> None:
        import os

        try:
            if not os.access(self.path, os.W_OK):
                return
            mode = self.path.stat().st_mode & 0o666
            for side in (self.path.with_name(self.path.name + "-wal"),
                         self.path.with_name(self.path.name + "-shm")):
                st = side.stat() if side.exists() else None
                if st is not None and not st.st_mode & 0o200 and st.st_uid == os.geteuid():
                    side.chmod(mode)
        except OSError:
            pass  # the save itself will say what is wrong

    def _engine_problems(self, con) -> list[str]:
        return [r[0] for r in con.execute("PRAGMA integrity_check") if r[0] != "ok"]


_PG_SCHEMA = _TABLES.format(
    revisions_options="",
    conflict_id="BIGINT GENERATED ALWAYS AS IDENTITY PRIMARY KEY") + """
CREATE OR REPLACE FUNCTION shaftwright_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN RAISE EXCEPTION '% are immutable', TG_ARGV[0] USING ERRCODE = 'integrity_constraint_violation'; END $$;
CREATE OR REPLACE TRIGGER revisions_never_change BEFORE UPDATE OR DELETE ON revisions
FOR EACH ROW EXECUTE FUNCTION shaftwright_refuse_change('revisions');
CREATE OR REPLACE TRIGGER revisions_never_truncated BEFORE TRUNCATE ON revisions
FOR EACH STATEMENT EXECUTE FUNCTION shaftwright_refuse_change('revisions');
CREATE OR REPLACE TRIGGER conflicts_never_change BEFORE UPDATE ON conflicts
FOR EACH ROW EXECUTE FUNCTION shaftwright_refuse_change('conflict records');
COMMENT ON TABLE revisions IS 'shaftwright store schema """ + str(SCHEMA_VERSION) + "';\n"
_PG_TRIGGERS = {"revisions_never_change", "revisions_never_truncated", "conflicts_never_change"}
_PG_SCHEMA_LOCK = 0x5348_4146  # advisory-lock key: one process at a time lays the tables out


def _redacted(url: str) -> str:
    """``url`` with any password replaced by ``***`` (for messages and ``repr``)."""
    parts = urlsplit(url)
    if parts.password is None:
        return url
    netloc = parts.netloc.replace(f":{parts.password}@", ":***@", 1)
    return urlunsplit(parts._replace(netloc=netloc))


class PostgresStore(_SqlStore):
    """:class:`Store` in a PostgreSQL database (server 14 or later), for several workers.

    ``url`` is a libpq connection URL (``postgresql://user@host/db``; ``postgresql:///db``
    uses the local socket). The tables are created on first use in the connection's first
    schema (``options=-csearch_path=…`` in the URL picks another). One short-lived connection
    per operation, so the object may be shared between threads and used after a fork; a save
    locks its design's row with ``SELECT … FOR UPDATE`` until it commits, so concurrent saves
    from any number of processes are numbered one after another without gaps.

    Raises :class:`StoreError` when the driver is missing or the server cannot be reached.
    """

    _PARAM: ClassVar[str] = "%s"

    def __init__(self, url: str, *, connect_timeout_s: int = 10):
        try:
            import psycopg
        except ImportError:
            raise StoreError("a PostgreSQL store needs the psycopg package: "
                             "pip install 'shaftwright[postgres]'") from None
        self._psycopg = psycopg
        self.url = url
        self.connect_timeout_s = connect_timeout_s
        with self._write() as con:
            con.execute("SELECT pg_advisory_xact_lock(%s)", (_PG_SCHEMA_LOCK,))
            if con.execute("SELECT to_regclass('revisions')").fetchone()[0] is None:
                con.execute(_PG_SCHEMA)
            if con.execute("SELECT to_regclass('sessions')").fetchone()[0] is None:
                con.execute(_ACCESS_TABLES)

    def __repr__(self) -> str:
        return f"PostgresStore({_redacted(self.url)!r})"

    @contextmanager
    def _connect(self):
        try:
            con = self._psycopg.connect(self.url, autocommit=True,
                                        connect_timeout=self.connect_timeout_s)
        except self._psycopg.OperationalError as exc:
            raise StoreUnavailable(f"cannot reach the PostgreSQL store at {_redacted(self.url)}: "
                                   f"{str(exc).strip()}") from None
        try:
            yield con
        except (self._psycopg.OperationalError, self._psycopg.errors.InsufficientResources) as exc:
            raise _unavailable(exc, _redacted(self.url)) from None  # disk full, server gone
        finally:
            con.close()

    @contextmanager
    def _write(self):
        """One transaction: committed when the block ends, rolled back when it raises."""
        with self._connect() as con, con.transaction():
            yield con

    def _lock_design(self, con, design_id: str) -> None:
        con.execute("SELECT id FROM designs WHERE id=%s FOR UPDATE", (design_id,))

    def _engine_problems(self, con) -> list[str]:
        found = {r[0] for r in con.execute(
            "SELECT tgname FROM pg_trigger WHERE tgenabled <> 'D' AND tgrelid IN "
            "(to_regclass('revisions'), to_regclass('conflicts'))")}
        return [f"trigger {name} is missing or disabled: records could be changed"
                for name in sorted(_PG_TRIGGERS - found)]


_LINK_COLS = "id, design_id, role, label, created_by, created_at, revoked_at"


def _link(row) -> ShareLink:
    return ShareLink(**dict(zip(_LINK_COLS.split(", "), row)))


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
    """Open (once per location) the store at ``location``: a ``postgresql://`` (or
    ``postgres://``) URL, ``sqlite:///path`` or a file path."""
    if location.startswith(("postgresql:", "postgres:")):
        return PostgresStore(location)
    if location.startswith("sqlite:///"):
        location = location[len("sqlite:///"):]
    return SqliteStore(location)


def get_store(settings: Annotated[Settings, Depends(get_settings)]) -> Store:
    """FastAPI dependency: the store named by the ``SHAFTWRIGHT_DB`` setting."""
    return open_store(settings.db)


StoreDep = Annotated[Store, Depends(get_store)]
