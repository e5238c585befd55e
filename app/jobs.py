"""Long work of a page on a worker thread, one runner for every page that has it: the study's
variants (app/routers/studies.py) and the arrangement search (app/routers/optimise.py).

A job is a callable ``work(job)`` started by :func:`start` on its own daemon thread (never on the
event loop). It reports its figures with ``job.report(done=..., ...)`` for the page's progress
fragment and asks ``job.stop_requested()`` between its steps: a Python thread cannot be
killed, so the work decides where it can stop (the study between chunks, the search between
populations) and any budget of its own stays with it. Its return value, or the exception it
raised, is kept for the page's next poll (:func:`get`).

At most :data:`MAX_RUNNING` jobs run at once on one server process, whatever their kind; a
finished job nobody asked for within :data:`KEEP_S` seconds is dropped. A job's key is an
unguessable token; :func:`get` finds a job only under its own kind.
"""
from __future__ import annotations

import logging
import secrets
import threading
import time
from typing import Any, Callable

from engine.model import DesignError

__all__ = ["Job", "MAX_RUNNING", "KEEP_S", "start", "get", "prune"]

log = logging.getLogger("shaftwright.jobs")

MAX_RUNNING = 8       # jobs (studies and searches) running at once on one server process
KEEP_S = 600.0        # a finished job nobody asked for is dropped after this


class Job:
    """One piece of work on its worker thread: its figures so far, a stop flag, then its result
    (or the exception that ended it)."""

    def __init__(self, kind: str, figures: dict[str, Any]):
        self.kind = kind
        self.figures: dict[str, Any] = dict(figures)
        self.stop = threading.Event()
        self.finished = threading.Event()
        self.result: Any = None
        self.error: Exception | None = None
        self.started = self.touched = time.monotonic()

    def report(self, **figures: Any) -> None:
        """The work's progress figures (read by the page's next poll)."""
        self.figures.update(figures)

    def stop_requested(self) -> bool:
        return self.stop.is_set()

    @property
    def elapsed_s(self) -> float:
        return time.monotonic() - self.started


_JOBS: dict[str, Job] = {}
_LOCK = threading.Lock()


def prune() -> None:
    """Drop the finished jobs nobody asked for within :data:`KEEP_S`."""
    now = time.monotonic()
    with _LOCK:
        for key in [k for k, j in _JOBS.items() if j.finished.is_set() and now - j.touched > KEEP_S]:
            del _JOBS[key]


def start(kind: str, work: Callable[[Job], Any], **figures: Any) -> str | None:
    """Start ``work(job)`` on a worker thread with the initial ``figures``; the job's key, or
    None when :data:`MAX_RUNNING` jobs run already."""
    prune()
    with _LOCK:
        if sum(not j.finished.is_set() for j in _JOBS.values()) >= MAX_RUNNING:
            return None
        key = secrets.token_urlsafe(12)
        job = _JOBS[key] = Job(kind, figures)

    def run() -> None:
        try:
            job.result = work(job)
        except Exception as exc:  # noqa: BLE001 - reported on the page by the next poll
            if not isinstance(exc, DesignError):
                log.exception("%s failed", kind)
            job.error = exc
        finally:
            job.finished.set()

    threading.Thread(target=run, name=f"{kind}-{key}", daemon=True).start()
    return key


def get(kind: str, key: str) -> Job | None:
    """The job of this kind under ``key`` (its last look noted, so it is kept), or None."""
    with _LOCK:
        job = _JOBS.get(key)
    if job is None or job.kind != kind:
        return None
    job.touched = time.monotonic()
    return job
