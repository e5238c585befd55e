"""Fixtures for the web layer: a TestClient on a fresh app with a temporary store."""
from __future__ import annotations

import pytest
from fastapi.testclient import TestClient


@pytest.fixture
def client(tmp_path, monkeypatch):
    monkeypatch.setenv("SHAFTWRIGHT_DB", str(tmp_path / "web-test.db"))
    from app.main import create_app

    with TestClient(create_app()) as c:
        yield c
