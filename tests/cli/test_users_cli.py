"""``shaftwright users``: accounts and API tokens kept in the store, as hashes only."""
from __future__ import annotations

import io
import sqlite3

import pytest

from app import auth
from app.cli import main
from app.store import open_store


@pytest.fixture
def db(tmp_path, monkeypatch):
    path = tmp_path / "users.db"
    monkeypatch.setenv("SHAFTWRIGHT_DB", str(path))
    return path


def _run(monkeypatch, *argv, stdin=""):
    monkeypatch.setattr("sys.stdin", io.StringIO(stdin))
    return main(["users", *argv])


def test_add_list_token_remove(db, monkeypatch, capsys):
    assert _run(monkeypatch, "list") == 0
    assert "no accounts" in capsys.readouterr().out
    assert _run(monkeypatch, "add", "ann", stdin="a long password\n") == 0
    assert "ann added" in capsys.readouterr().out
    store = open_store.__wrapped__(str(db))
    assert auth.verify_password(store.password_hash("ann"), "a long password")
    assert _run(monkeypatch, "token", "ann", "--label", "ci") == 0
    token = capsys.readouterr().out.strip()
    assert token.startswith("swt_") and auth.identify(store, authorization=f"Bearer {token}").name == "ann"
    with sqlite3.connect(db) as con:  # neither secret is in the file
        dump = "\n".join(con.iterdump())
    assert "a long password" not in dump and token.split("_", 2)[2] not in dump
    _run(monkeypatch, "list")
    assert "ann" in (out := capsys.readouterr().out) and "1 API token" in out
    assert _run(monkeypatch, "password", "ann", stdin="another password\n") == 0
    assert auth.verify_password(store.password_hash("ann"), "another password")
    assert _run(monkeypatch, "remove", "ann") == 0
    assert not store.has_accounts()
    assert auth.identify(store, authorization=f"Bearer {token}").kind != "account"


def test_bad_names_short_passwords_and_duplicates_are_refused(db, monkeypatch):
    with pytest.raises(SystemExit, match="at least 8"):
        _run(monkeypatch, "add", "ann", stdin="short\n")
    with pytest.raises(SystemExit, match="not an account name"):
        _run(monkeypatch, "add", "<b>", stdin="a long password\n")
    _run(monkeypatch, "add", "ann", stdin="a long password\n")
    with pytest.raises(SystemExit, match="already an account"):
        _run(monkeypatch, "add", "ann", stdin="a long password\n")
    with pytest.raises(SystemExit, match="no account 'bo'"):
        _run(monkeypatch, "remove", "bo")
    with pytest.raises(SystemExit, match="no account 'bo'"):
        _run(monkeypatch, "token", "bo")
