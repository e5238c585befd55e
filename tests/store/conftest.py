"""Fixtures for the store tests: a fresh database file per test, an app bound to it."""
from __future__ import annotations

import copy
import json
import os
import socket
import subprocess
import sys
import time
from pathlib import Path

import httpx
import pytest
from fastapi.testclient import TestClient

from app.main import create_app
from app.settings import Settings, get_settings

HERE = Path(__file__).resolve().parent
ROOT = HERE.parents[1]
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


def free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Server:
    """``uvicorn app.main:create_app --factory`` in a subprocess, bound to one database file."""

    def __init__(self, db: Path):
        self.db, self.port, self.proc = db, free_port(), None

    @property
    def url(self) -> str:
        return f"http://127.0.0.1:{self.port}"

    def start(self) -> "Server":
        env = {**os.environ, "SHAFTWRIGHT_DB": str(self.db), "PYTHONPATH": str(ROOT)}
        self.proc = subprocess.Popen(
            [sys.executable, "-m", "uvicorn", "app.main:create_app", "--factory",
             "--host", "127.0.0.1", "--port", str(self.port), "--log-level", "warning"],
            cwd=ROOT, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
        deadline = time.monotonic() + 30
        while time.monotonic() < deadline:
            if self.proc.poll() is not None:
                raise RuntimeError("server exited: " + self.proc.stderr.read().decode()[-2000:])
            try:
                httpx.get(self.url + "/api/designs/x", timeout=1.0)
                return self
            except httpx.TransportError:
                time.sleep(0.1)
        raise RuntimeError("server did not start within 30 s")

    def stop(self) -> None:
        if self.proc and self.proc.poll() is None:
            self.proc.terminate()
            try:
                self.proc.wait(timeout=10)
            except subprocess.TimeoutExpired:
                self.proc.kill()
                self.proc.wait()


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
