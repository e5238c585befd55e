"""Fixtures for the store tests: a fresh database file per test, an app bound to it."""
from __future__ import annotations

import copy
import json
from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from app.main import create_app
from app.settings import Settings, get_settings
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


def make_client(db: Path) -> TestClient:
    """A client of a freshly built app whose settings point at ``db``."""
    app = create_app()
    app.dependency_overrides[get_settings] = lambda: Settings(db=str(db))
    return TestClient(app)


@pytest.fixture
def client(db_path) -> TestClient:
    return make_client(db_path)


class Server:
    """The app in a uvicorn subprocess bound to one database file (the browser tests' helper)."""

    def __init__(self, db: Path):
        self.db, self.proc, self.url = db, None, ""

    def start(self) -> "Server":
        self.proc, self.url = start_server({"SHAFTWRIGHT_DB": str(self.db)})
        return self

    def stop(self) -> None:
        if self.proc is not None and self.proc.poll() is None:
            stop_server(self.proc)


@pytest.fixture
def server_factory(db_path):
    started: list[Server] = []

    def start() -> Server:
        s = Server(db_path).start()
        started.append(s)
        return s

    yield start
    for s in started:
        s.stop()
