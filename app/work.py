"""Heavy work off the event loop, inside a time budget: solves and studies.

Why processes: the engine is numpy and a Python thread cannot be stopped, so a solve run in
the thread pool that meets its budget would go on burning a core after its answer was given
up. A check of the clock between the engine's steps would leave each step unbounded (one
dense solve of a large beam is one step) and would thread a deadline through every engine
function. A child process is the simplest thing that really bounds the cost: when the budget
is spent the child is killed and replaced, and the user gets :class:`BudgetExceeded`
(413, a message in words).

:func:`run_bounded` sends a call to one of a few long-lived child processes
and waits, in the calling thread, for at most the budget. The children are plain
``python -c`` subprocesses that talk over two pipes (not ``multiprocessing`` processes, whose
start re-imports the main module and so depends on how the server was launched). Call it from a thread (a plain
``def`` route, or ``run_in_threadpool``), never on the event loop. The pool has
``SHAFTWRIGHT_SOLVE_PROCESSES`` children (default: the number of CPUs); a call that finds
them all busy waits its turn within the same budget.

:func:`solve` is the bounded :func:`engine.solve` with the work limits of
:func:`app.limits.check_work` first and a cache of results by design content, so a page that
shows a stored revision solves it once, not on every read. Budgets (seconds): solve
``SHAFTWRIGHT_SOLVE_BUDGET_S`` (default 10), study ``SHAFTWRIGHT_STUDY_BUDGET_S``
(default 120); see :mod:`app.settings`.
"""
from __future__ import annotations

import hashlib
import logging
import os
import queue
import subprocess
import sys
import threading
import time
from collections import OrderedDict
from multiprocessing.connection import Connection
from pathlib import Path
from typing import Any, Callable

import engine
from app.limits import LimitError, check_work
from app.settings import get_settings
from engine.model import DesignError, EngineError, Issue

__all__ = ["BudgetExceeded", "EngineFault", "ServerBusy", "run_bounded", "solve", "clear_cache", "shutdown",
           "warm_up"]

log = logging.getLogger("shaftwright.work")


class BudgetExceeded(LimitError):
    """The work did not finish within its time budget and was stopped (413)."""

    def __init__(self, what: str, budget_s: float):
        super().__init__("", f"{what} did not finish within its time budget of {budget_s:g} s and "
                             "was stopped. Make the design lighter (fewer load cases, a coarser "
                             "mesh in analysis.elements, a shorter bearing table, fewer study "
                             "points) or ask whoever runs the server for a longer budget.",
                         status_code=413)


class EngineFault(RuntimeError):
    """The engine failed in a child process (a bug, not bad input): the message names the
    original exception (``ZeroDivisionError: …``); its traceback went to the server's log."""


class ServerBusy(Exception):
    """Every worker process stayed busy for the whole budget (503, try again shortly)."""


# --- the child side -----------------------------------------------------------------------

ROOT = Path(__file__).resolve().parents[1]


def _child_main(read_fd: int, write_fd: int) -> None:
    """The child's loop: calls in on one pipe, answers out on the other, until the parent goes."""
    import engine.solve  # noqa: F401 - imported before "ready": a call's budget is all solving
    import engine.study  # noqa: F401

    out = Connection(write_fd, readable=False)
    out.send(("ready",))
    _child(Connection(read_fd, writable=False), out)


def _child(conn, out=None) -> None:
    """Serve calls until the pipe closes: (fn, args, kwargs) in, ("ok", value) or an error out."""
    out = out or conn
    while True:
        try:
            fn, args, kwargs = conn.recv()
        except (EOFError, OSError):
            return
        try:
            answer = ("ok", fn(*args, **kwargs))
        except DesignError as exc:
            answer = ("design", type(exc).__name__, [(i.path, i.message) for i in exc.errors],
                      getattr(exc, "status_code", 422))
        except BaseException as exc:  # noqa: BLE001 - reported to the parent, which logs it
            import traceback

            answer = ("fault", f"{type(exc).__name__}: {exc}", traceback.format_exc())
        try:
            out.send(answer)
        except Exception as exc:  # noqa: BLE001 - e.g. a value that does not pickle
            out.send(("fault", f"the answer could not be sent back ({exc})", ""))


def _raise(answer: tuple) -> None:
    kind = answer[0]
    if kind == "design":
        _, cls, issues, status = answer
        issues = [Issue(path=p, message=m) for p, m in issues]
        if cls == "EngineError":
            raise EngineError(issues)
        if status != 422 or cls == "LimitError":
            err = LimitError("", "", status_code=status)
            err.errors = issues
            err.args = ("; ".join(f"{i.path}: {i.message}" for i in issues),)
            raise err
        raise DesignError(issues)
    log.error("engine fault in a solve process: %s\n%s", answer[1], answer[2])
    raise EngineFault(answer[1])


# --- the parent side ----------------------------------------------------------------------

START_TIMEOUT_S = 120


class _Worker:
    """One child process: ``python -c`` running :func:`_child_main` on two pipes."""

    def __init__(self):
        to_child_r, to_child_w = os.pipe()
        from_child_r, from_child_w = os.pipe()
        env = dict(os.environ)
        env["PYTHONPATH"] = str(ROOT) + (os.pathsep + env["PYTHONPATH"] if env.get("PYTHONPATH") else "")
        for var in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
            env.setdefault(var, "1")  # small systems: one BLAS thread per process is fastest
        try:
            self.proc = subprocess.Popen(
                [sys.executable, "-c", "import sys; from app.work import _child_main; "
                 "_child_main(int(sys.argv[1]), int(sys.argv[2]))", str(to_child_r), str(from_child_w)],
                pass_fds=(to_child_r, from_child_w), env=env, cwd=str(ROOT),
                stdin=subprocess.DEVNULL)
        finally:
            os.close(to_child_r)
            os.close(from_child_w)
        self.send = Connection(to_child_w, readable=False)
        self.conn = Connection(from_child_r, writable=False)
        try:  # the engine imported: not counted in any call's budget
            if not self.conn.poll(START_TIMEOUT_S) or self.conn.recv() != ("ready",):
                raise RuntimeError(f"a solve process did not start within {START_TIMEOUT_S} s")
        except (EOFError, OSError) as exc:
            self.stop()
            raise RuntimeError(f"a solve process could not start ({exc!r})") from None
        except BaseException:
            self.stop()
            raise

    def stop(self) -> None:
        try:
            self.proc.kill()
            self.proc.wait(timeout=5)
        finally:
            self.send.close()
            self.conn.close()


class _Pool:
    """A few child processes; a call takes an idle one (or starts one), a timed-out one dies."""

    def __init__(self, size: int):
        self.size = max(1, size)
        self._idle: "queue.LifoQueue[_Worker]" = queue.LifoQueue()
        self._lock = threading.Lock()
        self._count = 0
        self._pid = os.getpid()

    def _take(self, deadline: float) -> _Worker | None:
        while True:
            try:
                return self._idle.get_nowait()
            except queue.Empty:
                pass
            with self._lock:
                if self._count < self.size:
                    self._count += 1
                    break
            left = deadline - time.monotonic()
            if left <= 0:
                return None
            try:
                return self._idle.get(timeout=min(left, 0.5))
            except queue.Empty:
                continue
        try:
            return _Worker()
        except BaseException:
            with self._lock:
                self._count -= 1
            raise

    def _drop(self, worker: _Worker) -> None:
        with self._lock:
            self._count -= 1
        worker.stop()
        threading.Thread(target=self._replace, daemon=True).start()  # the next call finds one ready

    def _replace(self) -> None:
        with self._lock:
            if self._count >= self.size:
                return
            self._count += 1
        try:
            self._idle.put(_Worker())
        except Exception:  # noqa: BLE001 - the next call starts one itself (and reports)
            with self._lock:
                self._count -= 1
            log.exception("could not start a solve process")

    def call(self, fn: Callable, args: tuple, kwargs: dict, *, budget_s: float, what: str) -> Any:
        worker = self._take(time.monotonic() + budget_s)  # waiting for a free child: busy
        if worker is None:
            raise ServerBusy(f"the server is busy with other solves and studies; {what.lower()} "
                             f"could not start within {budget_s:g} s. Try again shortly.")
        deadline = time.monotonic() + budget_s
        try:
            worker.send.send((fn, args, kwargs))
            if not worker.conn.poll(max(0.0, deadline - time.monotonic())):
                log.warning("%s stopped at its budget of %g s", what, budget_s)
                self._drop(worker)
                raise BudgetExceeded(what, budget_s)
            answer = worker.conn.recv()
        except (EOFError, OSError, BrokenPipeError) as exc:  # the child died (e.g. out of memory)
            self._drop(worker)
            raise RuntimeError(f"the worker process for {what} ended unexpectedly ({exc!r})") from None
        except BudgetExceeded:
            raise
        except BaseException:
            self._drop(worker)
            raise
        self._idle.put(worker)
        if answer[0] == "ok":
            return answer[1]
        _raise(answer)

    def shutdown(self) -> None:
        while True:
            try:
                worker = self._idle.get_nowait()
            except queue.Empty:
                return
            self._drop(worker)


_POOLS: dict[str, _Pool] = {}
_POOL_LOCK = threading.Lock()


def _pool(kind: str = "solve") -> _Pool:
    """The pool of ``kind``: "solve" (edits, pages, the API's solve) or "study" (studies and
    arrangement comparisons), apart so that a long study never keeps an edit waiting."""
    with _POOL_LOCK:
        pool = _POOLS.get(kind)
        if pool is None or pool._pid != os.getpid():  # a forked server worker needs its own
            pool = _POOLS[kind] = _Pool(get_settings().solve_processes)
        return pool


def shutdown() -> None:
    """Stop the child processes (they also end with the server)."""
    with _POOL_LOCK:
        for pool in _POOLS.values():
            if pool._pid == os.getpid():
                pool.shutdown()
        _POOLS.clear()


def warm_up() -> None:
    """Start the forkserver and one child in the background (a server's first edit should not
    wait for the engine to be imported); called when the server starts."""
    def go(pause_s: float = 0.0):
        try:  # a pause, so that the calls overlap and each starts its own child
            run_bounded(time.sleep, pause_s, budget_s=60, what="Warming up")
        except Exception:  # noqa: BLE001 - a real call will report the problem
            log.exception("could not start a solve process")

    def all_of_them():
        go()  # the forkserver first, then the other children side by side
        n = _pool().size
        threads = [threading.Thread(target=go, args=(0.5,), daemon=True) for _ in range(n)]
        for t in threads:
            t.start()

    threading.Thread(target=all_of_them, name="shaftwright-warm-up", daemon=True).start()


def run_bounded(fn: Callable, *args: Any, budget_s: float, what: str, kind: str = "solve",
                **kwargs: Any) -> Any:
    """``fn(*args, **kwargs)`` in a child process, stopped after ``budget_s`` seconds.

    ``fn`` must be a module-level function and its arguments and value must pickle; ``kind``
    picks the pool ("solve" or "study"). Raises
    :class:`BudgetExceeded` when the budget is spent, the engine's :class:`DesignError`
    (and :class:`EngineError`, :class:`LimitError`) as raised in the child, and
    ``RuntimeError`` for any other failure (a 500 with an error id)."""
    return _pool(kind).call(fn, args, kwargs, budget_s=budget_s, what=what)


# --- solve, bounded and cached -------------------------------------------------------------

_CACHE: "OrderedDict[str, Any]" = OrderedDict()
_CACHE_LOCK = threading.Lock()
_CACHE_SIZE = 128
BUDGET_MEMORY_S = 60.0  # how long a solve that ran out of time is answered from memory


def clear_cache() -> None:
    with _CACHE_LOCK:
        _CACHE.clear()


def _solve_in_child(design: engine.Design, catalogue: Any = None) -> Any:
    return engine.solve(design, catalogue=catalogue)


def solve(design_data: Any, *, catalogue: Any = None) -> Any:
    """:func:`engine.solve` within the work limits and the solve budget, cached by content.

    Bad input raises :class:`DesignError` as :func:`engine.solve` does; a design that would
    take too much work raises :class:`LimitError` (413) before any solving; one that runs
    past the budget raises :class:`BudgetExceeded` (remembered for ``BUDGET_MEMORY_S``, so
    reading its page again soon after costs nothing, and tried again later)."""
    design = engine.parse_design(design_data)
    check_work(design)
    key = hashlib.sha256(design.model_dump_json().encode("utf-8")).hexdigest()
    if catalogue is None:
        with _CACHE_LOCK:
            hit = _CACHE.get(key)
            if hit is not None:
                _CACHE.move_to_end(key)
        if isinstance(hit, tuple) and hit[1] < time.monotonic():
            hit = None  # a budget failure is remembered for a while only: the server may have been busy
        if hit is not None:
            if isinstance(hit, tuple):
                raise hit[0].with_traceback(None)
            if isinstance(hit, BaseException):
                raise hit.with_traceback(None)
            return hit
    budget = get_settings().solve_budget_s
    try:
        outcome = run_bounded(_solve_in_child, design, catalogue, budget_s=budget,
                              what="The solve")
    except (DesignError, BudgetExceeded) as exc:
        outcome = exc
    if catalogue is None:
        with _CACHE_LOCK:
            _CACHE[key] = ((outcome, time.monotonic() + BUDGET_MEMORY_S)
                           if isinstance(outcome, BudgetExceeded) else outcome)
            if len(_CACHE) > _CACHE_SIZE:
                _CACHE.popitem(last=False)
    if isinstance(outcome, BaseException):
        raise outcome
    return outcome
