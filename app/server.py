"""Run the web app with uvicorn: ``run(host, port)`` is what ``shaftwright serve`` calls.

The BLAS library under numpy is limited to one thread per process before numpy is loaded:
each edit solves a small system, and several BLAS threads fighting over two cores with the
server's own work made one solve 30 times slower (measured here: median 87 ms with two
threads under load, 2.6 ms with one). Concurrency comes from serving requests, not from BLAS.
Set ``OPENBLAS_NUM_THREADS`` yourself to override.
"""
from __future__ import annotations

import argparse
import os

__all__ = ["run", "DEFAULT_HOST", "DEFAULT_PORT", "limit_blas_threads", "bind_refusal"]

DEFAULT_HOST = "127.0.0.1"
DEFAULT_PORT = 8000


def limit_blas_threads(n: int = 1) -> None:
    """Ask the BLAS/OpenMP libraries for ``n`` threads (effective only before numpy loads)."""
    for var in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
        os.environ.setdefault(var, str(n))


def _is_loopback(host: str) -> bool:
    import ipaddress

    try:
        return ipaddress.ip_address(host.strip("[]")).is_loopback
    except ValueError:
        return host.lower() == "localhost"


def bind_refusal(host: str, *, open_: bool = False) -> str | None:
    """Why the server must not listen on ``host``, or None.

    A server without accounts lets everyone who reaches it read and change every design, so
    it listens on this computer only (loopback) unless ``open_`` says otherwise."""
    if open_ or _is_loopback(host):
        return None
    from app.settings import Settings
    from app.store import open_store

    if open_store(Settings.from_env().db).has_accounts():
        return None
    return (f"not listening on {host}: this server has no accounts, so anyone on the network "
            "could read and change every design. Add one with 'shaftwright users add NAME', "
            "or pass --open to serve everyone anyway.")


def run(host: str = DEFAULT_HOST, port: int = DEFAULT_PORT, *, log_level: str = "info",
        workers: int = 1, open_: bool = False) -> None:
    """Serve the designer on ``http://host:port/`` until interrupted (loopback by default;
    another address needs accounts in the store, or ``open_``).

    ``workers`` > 1 starts that many server processes on the one port (uvicorn's process
    manager); each has its own solve processes (app.work) and result cache. They share the
    store: SQLite serialises their saves (WAL, one writer at a time), PostgreSQL locks per
    design; see docs/deployment.md."""
    limit_blas_threads()
    why = bind_refusal(host, open_=open_)
    if why:
        raise SystemExit(f"shaftwright: {why}")
    if not (open_ or _is_loopback(host)):  # should the last account go, refuse, don't open up
        os.environ["SHAFTWRIGHT_REQUIRE_ACCOUNTS"] = "1"
    import uvicorn

    if workers < 1:
        raise ValueError("workers must be 1 or more")
    if workers > 1:  # the CPUs shared out: about one solve process per CPU in all, at least one each
        os.environ.setdefault("SHAFTWRIGHT_SOLVE_PROCESSES", str(max(1, (os.cpu_count() or 1) // workers)))
    print(f"Shaftwright: open http://{host}:{port}/ (Ctrl+C stops)"
          + (f"; {workers} worker processes" if workers > 1 else ""), flush=True)
    uvicorn.run("app.main:create_app", factory=True, host=host, port=int(port), log_level=log_level,
                access_log=False, workers=workers, server_header=False)  # no server name or version sent


if __name__ == "__main__":
    ap = argparse.ArgumentParser(prog="python -m app.server")
    ap.add_argument("--host", default=DEFAULT_HOST)
    ap.add_argument("--port", type=int, default=DEFAULT_PORT)
    ap.add_argument("--log-level", default="warning")
    ap.add_argument("--workers", type=int, default=1)
    ap.add_argument("--open", action="store_true")
    a = ap.parse_args()
    run(a.host, a.port, log_level=a.log_level, workers=a.workers, open_=a.open)
