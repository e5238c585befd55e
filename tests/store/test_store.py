"""The stores: revisions are numbered, immutable, never lost.

These are behaviour tests of our own store (no published values are involved). A test that
takes ``store`` or ``db_location`` runs on both backends (``[sqlite]``, ``[postgres]``; see
conftest.py); the SQLite-only ones name ``db_path``. PostgreSQL's own: test_postgres.py.
"""
from __future__ import annotations

import multiprocessing as mp
import os
import signal
import sqlite3
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from app.settings import Settings
from app.store import (ID_BYTES, NotFound, SqliteStore, StaleBase, Store, is_design_id,
                       new_design_id, open_store)
from tests.store.conftest import fresh_store

ROOT = Path(__file__).resolve().parents[2]


def test_created_on_first_run_in_wal_mode(db_path, design):
    assert not db_path.exists()
    store = SqliteStore(db_path)
    assert isinstance(store, Store)
    assert db_path.exists()
    with sqlite3.connect(db_path) as con:
        assert con.execute("PRAGMA journal_mode").fetchone()[0] == "wal"
    rev = store.create(design, author="Ana", comment="first", engine_version="9.9")
    assert (rev.n, rev.author, rev.comment, rev.engine_version) == (1, "Ana", "first", "9.9")
    assert rev.document == design and rev.name == design["name"]
    assert rev.created_at.endswith("+00:00")


def test_default_location_is_the_working_directory(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    settings = Settings.from_env({})
    assert settings.db == "shaftwright.db"
    store = open_store(settings.db)
    assert store.path == tmp_path / "shaftwright.db" and store.path.exists()
    assert Settings.from_env({"SHAFTWRIGHT_DB": str(tmp_path / "x" / "y.db")}).db.endswith("y.db")


def test_ids_are_random_and_at_least_128_bits():
    ids = {new_design_id() for _ in range(2000)}
    assert len(ids) == 2000
    assert ID_BYTES * 8 >= 128
    assert all(len(i) == 24 and is_design_id(i) for i in ids)  # 18 bytes -> 24 URL-safe chars
    assert not is_design_id("../../etc/passwd") and not is_design_id("1")


def test_reload_after_reopening(db_location, design):
    rev = fresh_store(db_location).create(design, comment="one")
    again = fresh_store(db_location)  # a new object, as after a restart
    assert again.latest(rev.design_id).document == design
    assert again.revision(rev.design_id, 1).comment == "one"


def test_saving_adds_revisions_and_never_changes_old_ones(store, design):
    first = store.create(design, comment="r1")
    seen = [first]
    for k in range(2, 6):
        doc = {**design, "name": f"variant {k}"}
        rev = store.add_revision(first.design_id, doc, base_revision=k - 1, comment=f"r{k}")
        assert rev.n == k and rev.base_revision == k - 1
        seen.append(rev)
    for rev in seen:  # every revision reads back exactly as it was returned when saved
        assert store.revision(first.design_id, rev.n) == rev
    assert [r.n for r in store.revisions(first.design_id)] == [1, 2, 3, 4, 5]
    assert store.latest(first.design_id).n == 5
    assert store.check_integrity() == []


def test_database_refuses_to_alter_a_revision(db_path, design):
    store = SqliteStore(db_path)
    rev = store.create(design)
    con = sqlite3.connect(db_path)
    with pytest.raises(sqlite3.IntegrityError, match="immutable"):
        con.execute("UPDATE revisions SET document='{}' WHERE design_id=?", (rev.design_id,))
    with pytest.raises(sqlite3.IntegrityError, match="immutable"):
        con.execute("DELETE FROM revisions WHERE design_id=?", (rev.design_id,))
    con.close()
    assert store.revision(rev.design_id, 1) == rev


def test_stale_base_is_refused_and_loses_nothing(store, design):
    r1 = store.create(design, author="Ana")
    theirs = {**design, "name": "theirs"}
    r2 = store.add_revision(r1.design_id, theirs, base_revision=1, author="Ben")
    mine = {**design, "notes": "my edit"}
    with pytest.raises(StaleBase) as info:
        store.add_revision(r1.design_id, mine, base_revision=1, author="Cy", comment="mine")
    exc = info.value
    assert (exc.base_revision, exc.latest.n) == (1, 2)
    assert exc.latest == r2
    # both are kept: the revisions untouched, the refused document as a conflict record
    assert [r.n for r in store.revisions(r1.design_id)] == [1, 2]
    assert store.revision(r1.design_id, 1) == r1 and store.revision(r1.design_id, 2) == r2
    kept = store.conflict(r1.design_id, exc.conflict_id)
    assert kept.document == mine and (kept.author, kept.comment) == ("Cy", "mine")
    assert (kept.base_revision, kept.latest_revision) == (1, 2)
    assert store.conflicts(r1.design_id) == [kept]


def test_unknown_design_and_revision(store, design):
    with pytest.raises(NotFound):
        store.latest("nope")
    with pytest.raises(NotFound):
        store.add_revision("nope", design, base_revision=None)
    rev = store.create(design)
    with pytest.raises(NotFound):
        store.revision(rev.design_id, 2)


def test_ten_threads_saving_at_once_lose_no_revision(store, design):
    first = store.create(design)
    barrier = threading.Barrier(10)
    errors: list[BaseException] = []

    def client(k: int) -> None:
        try:
            barrier.wait()
            for j in range(5):
                store.add_revision(first.design_id, {**design, "name": f"c{k}-{j}"},
                                   base_revision=None, comment=f"{k}/{j}")
        except BaseException as exc:  # noqa: BLE001 - reported below
            errors.append(exc)

    threads = [threading.Thread(target=client, args=(k,)) for k in range(10)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert errors == []
    revs = store.revisions(first.design_id)
    assert [r.n for r in revs] == list(range(1, 52))
    assert {r.comment for r in revs[1:]} == {f"{k}/{j}" for k in range(10) for j in range(5)}
    assert store.check_integrity() == []


def test_ten_clients_on_one_base_one_wins_nine_are_kept(store, design):
    first = store.create(design)
    barrier = threading.Barrier(10)
    outcome: dict[int, str] = {}

    def client(k: int) -> None:
        barrier.wait()
        try:
            store.add_revision(first.design_id, {**design, "name": f"c{k}"}, base_revision=1,
                               comment=str(k))
            outcome[k] = "saved"
        except StaleBase:
            outcome[k] = "stale"

    threads = [threading.Thread(target=client, args=(k,)) for k in range(10)]
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    assert sorted(outcome.values()).count("saved") == 1
    assert [r.n for r in store.revisions(first.design_id)] == [1, 2]
    kept = {c.comment for c in store.conflicts(first.design_id)}
    assert kept == {str(k) for k, v in outcome.items() if v == "stale"}  # nothing lost


def _process_client(location: str, design_id: str, k: int, design: dict) -> None:
    store = fresh_store(location)
    for j in range(5):
        store.add_revision(design_id, {**design, "name": f"p{k}-{j}"}, base_revision=None,
                           comment=f"{k}/{j}")


def test_ten_processes_saving_at_once_lose_no_revision(store, db_location, design):
    first = store.create(design)
    ctx = mp.get_context("spawn")
    procs = [ctx.Process(target=_process_client, args=(db_location, first.design_id, k, design))
             for k in range(10)]
    for p in procs:
        p.start()
    for p in procs:
        p.join(timeout=120)
    assert [p.exitcode for p in procs] == [0] * 10
    revs = store.revisions(first.design_id)
    assert [r.n for r in revs] == list(range(1, 52))
    assert {r.comment for r in revs[1:]} == {f"{k}/{j}" for k in range(10) for j in range(5)}
    assert store.check_integrity() == []


@pytest.mark.parametrize("commits_before_kill", [1, 7, 25])
def test_killed_mid_save_leaves_a_consistent_database(store, db_location, design,
                                                      commits_before_kill):
    first = store.create(design)
    env = {**os.environ, "PYTHONPATH": str(ROOT)}
    proc = subprocess.Popen([sys.executable, "-m", "tests.store.saver", db_location, first.design_id],
                            cwd=ROOT, env=env, stdout=subprocess.PIPE, text=True)
    committed = []
    try:
        while len(committed) < commits_before_kill:
            line = proc.stdout.readline()
            assert line, "the saver stopped early"
            committed.append(int(line))
        time.sleep(0.003 * commits_before_kill)  # land the kill at varying points of a save
        proc.send_signal(signal.SIGKILL)
        proc.wait(timeout=10)
        committed += [int(x) for x in proc.stdout.read().split()]  # reported before the kill
    finally:
        if proc.poll() is None:
            proc.kill()
        proc.stdout.close()
    assert proc.returncode == -signal.SIGKILL
    reopened = fresh_store(db_location)
    assert reopened.check_integrity() == []  # the engine's check, no gaps, digests match
    numbers = [r.n for r in reopened.revisions(first.design_id)]
    assert numbers == list(range(1, numbers[-1] + 1))
    assert set(committed) <= set(numbers)  # every committed revision survived
    assert reopened.revision(first.design_id, 1) == first
    for n in committed:
        assert reopened.revision(first.design_id, n).name == f"save {n - 1}"
    nxt = reopened.add_revision(first.design_id, design, base_revision=numbers[-1])
    assert nxt.n == numbers[-1] + 1  # and it still takes saves


def _open_and_save(location: str, k: int, design: dict) -> None:
    fresh_store(location).create({**design, "name": f"opened by {k}"})


def test_several_processes_opening_a_new_store_at_once(db_location, design):
    ctx = mp.get_context("spawn")
    procs = [ctx.Process(target=_open_and_save, args=(db_location, k, design)) for k in range(4)]
    for p in procs:
        p.start()
    for p in procs:
        p.join(timeout=120)
    assert [p.exitcode for p in procs] == [0] * 4  # the tables are laid out once, by one of them
    assert fresh_store(db_location).check_integrity() == []
