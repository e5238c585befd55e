"""Fixtures for the store tests: a fresh store per test on each backend, an app bound to it.

``db_location`` (and so ``store``, ``client`` and ``server_factory``) runs each test twice:
``[sqlite]`` on a fresh file, ``[postgres]`` in a fresh schema of the server named by
``SHAFTWRIGHT_TEST_PG_URL`` (dropped afterwards). Without that variable the postgres cases
skip, except under ``CI=true``, where they fail: CI must provide the server (see .ci/run).
"""
from __future__ import annotations

import copy
import json
import os
import secrets
import sqlite3
from pathlib import Path
from urllib.parse import quote

import pytest
from fastapi.testclient import TestClient

from app.main import create_app
from app.settings import Settings, get_settings
from app.store import open_store
from tests.browser.conftest import start_server, stop_server

HERE = Path(__file__).resolve().parent
EXAMPLE = json.loads((HERE / "example_design.json").read_text(encoding="utf-8"))


@pytest.fixture
def design() -> dict:
    """An invented two-bearing shaft (see example_design.json); a fresh copy per test."""
    return copy.deepcopy(EXAMPLE)


@pytest.fixture
def db_path(tmp_path) -> Path:
    return tmp_path / "designs.db"


PG_URL_VAR = "SHAFTWRIGHT_TEST_PG_URL"


def pg_url() -> str:
    """The test server's URL; skips the test without one, or fails it under CI=true."""
    url = os.environ.get(PG_URL_VAR, "")
    if not url:
        reason = (f"{PG_URL_VAR} is not set, so there is no PostgreSQL server to test against "
                  "(README, Set-up, says how to run these)")
        if os.environ.get("CI") == "true":
            pytest.fail(f"{reason}; CI must start one (.ci/run does)")
        pytest.skip(reason)
    return url


def with_schema(url: str, schema: str) -> str:
    """``url`` whose connections work in ``schema`` (libpq ``options=-csearch_path=…``)."""
    return f"{url}{'&' if '?' in url else '?'}options={quote(f'-csearch_path={schema}')}"


@pytest.fixture
def pg_location():
    """A fresh, empty schema on the test server, as a URL; dropped after the test."""
    url = pg_url()
    import psycopg  # a test dependency: no skip when missing

    schema = f"test_{secrets.token_hex(6)}"
    with psycopg.connect(url, autocommit=True) as con:
        con.execute(f'CREATE SCHEMA "{schema}"')
    yield with_schema(url, schema)
    with psycopg.connect(url, autocommit=True) as con:
        con.execute(f'DROP SCHEMA "{schema}" CASCADE')


@pytest.fixture(params=["sqlite", "postgres"])
def db_location(request, db_path) -> str:
    """Where a test's store lives: a fresh SQLite file, or a fresh PostgreSQL schema."""
    if request.param == "postgres":
        return request.getfixturevalue("pg_location")
    return str(db_path)


def fresh_store(location: str):
    """A new store object on ``location`` (``open_store`` without its per-location cache)."""
    return open_store.__wrapped__(location)


@pytest.fixture
def store(db_location):
    return fresh_store(db_location)


def count_designs(location: str) -> int:
    """How many designs are stored at ``location``, counted by the database itself."""
    if location.startswith("postgresql:"):
        import psycopg

        with psycopg.connect(location) as con:
            if con.execute("SELECT to_regclass('designs')").fetchone()[0] is None:
                return 0
            return con.execute("SELECT COUNT(*) FROM designs").fetchone()[0]
    if not Path(location).exists():
        return 0
    with sqlite3.connect(location) as con:
        return con.execute("SELECT COUNT(*) FROM designs").fetchone()[0]


def make_client(db: Path | str) -> TestClient:
    """A client of a freshly built app whose settings point at ``db`` (a file or a URL)."""
    app = create_app()
    app.dependency_overrides[get_settings] = lambda: Settings(db=str(db))
    return TestClient(app)


@pytest.fixture
def client(db_location) -> TestClient:
    return make_client(db_location)


class Server:
    """The app in a uvicorn subprocess bound to one store (the browser tests' helper)."""

    def __init__(self, db: Path | str):
        self.db, self.proc, self.url = db, None, ""

    def start(self) -> "Server":
        self.proc, self.url = start_server({"SHAFTWRIGHT_DB": str(self.db)})
        return self

    def stop(self) -> None:
        if self.proc is not None and self.proc.poll() is None:
            stop_server(self.proc)


@pytest.fixture
def server_factory(db_location):
    started: list[Server] = []

    def start() -> Server:
        s = Server(db_location).start()
        started.append(s)
        return s

    yield start
    for s in started:
        s.stop()
