"""Settings of the web layer, read once from the environment.

``get_settings()`` is a cached FastAPI dependency; tests override it with
``app.dependency_overrides[get_settings] = lambda: Settings(db=...)`` or clear its cache
after changing the environment (``get_settings.cache_clear()``).

Environment variables:

- ``SHAFTWRIGHT_DB``: where designs are stored. A file path (SQLite, created on first run,
  WAL mode) or a ``postgresql://`` URL (PostgreSQL 14 or later, for several workers; needs
  the ``[postgres]`` extra; the tables are created on first use). Default:
  ``shaftwright.db`` in the working directory.
- ``SHAFTWRIGHT_CHROMIUM``: the headless browser used to print the design note to PDF.
  Default ``/usr/bin/chromium``.
- ``SHAFTWRIGHT_MAX_DOCUMENT_BYTES`` (default 1 000 000) and ``SHAFTWRIGHT_MAX_ITEMS``
  (default 500): the limits on an incoming design document (see :mod:`app.limits`).
- ``SHAFTWRIGHT_SOLVE_BUDGET_S`` (default 10) and ``SHAFTWRIGHT_STUDY_BUDGET_S`` (default
  120): the time after which a solve or a study is stopped and the user told why;
  ``SHAFTWRIGHT_SOLVE_PROCESSES`` (default: the number of CPUs): the child processes per
  server worker that run them (see :mod:`app.work`).
"""
from __future__ import annotations

import os
from dataclasses import dataclass
from functools import lru_cache

__all__ = ["Settings", "get_settings", "DEFAULT_DB"]

DEFAULT_DB = "shaftwright.db"


@dataclass(frozen=True)
class Settings:
    """Web-layer settings; every field has a default that works on a laptop."""

    db: str = DEFAULT_DB
    chromium: str = "/usr/bin/chromium"
    max_document_bytes: int = 1_000_000
    max_items: int = 500
    solve_budget_s: float = 10.0
    study_budget_s: float = 120.0
    solve_processes: int = max(1, os.cpu_count() or 1)

    @classmethod
    def from_env(cls, env: dict[str, str] | None = None) -> "Settings":
        env = os.environ if env is None else env
        return cls(
            db=env.get("SHAFTWRIGHT_DB") or DEFAULT_DB,
            chromium=env.get("SHAFTWRIGHT_CHROMIUM") or "/usr/bin/chromium",
            max_document_bytes=_int(env, "SHAFTWRIGHT_MAX_DOCUMENT_BYTES", 1_000_000),
            max_items=_int(env, "SHAFTWRIGHT_MAX_ITEMS", 500),
            solve_budget_s=_float(env, "SHAFTWRIGHT_SOLVE_BUDGET_S", 10.0),
            study_budget_s=_float(env, "SHAFTWRIGHT_STUDY_BUDGET_S", 120.0),
            solve_processes=_int(env, "SHAFTWRIGHT_SOLVE_PROCESSES", max(1, os.cpu_count() or 1)),
        )


def _int(env, key: str, default: int) -> int:
    raw = env.get(key)
    if not raw:
        return default
    try:
        value = int(raw)
    except ValueError:
        raise ValueError(f"setting {key} must be a whole number, got {raw!r}") from None
    if value <= 0:
        raise ValueError(f"setting {key} must be positive, got {value}")
    return value


def _float(env, key: str, default: float) -> float:
    raw = env.get(key)
    if not raw:
        return default
    try:
        value = float(raw)
    except ValueError:
        raise ValueError(f"setting {key} must be a number of seconds, got {raw!r}") from None
    if not value > 0 or value == float("inf"):
        raise ValueError(f"setting {key} must be a positive number of seconds, got {raw!r}")
    return value


@lru_cache
def get_settings() -> Settings:
    """The settings of this process (cached; see the module docstring for overriding)."""
    return Settings.from_env()
