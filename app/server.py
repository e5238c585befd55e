"""Run the web app with uvicorn: ``run(host, port)`` is what ``shaftwright serve`` calls."""
from __future__ import annotations

__all__ = ["run", "DEFAULT_HOST", "DEFAULT_PORT"]

DEFAULT_HOST = "127.0.0.1"
DEFAULT_PORT = 8000


def run(host: str = DEFAULT_HOST, port: int = DEFAULT_PORT, *, log_level: str = "info") -> None:
    """Serve the designer on ``http://host:port/`` until interrupted (loopback by default)."""
    import uvicorn

    uvicorn.run("app.main:create_app", factory=True, host=host, port=int(port), log_level=log_level,
                access_log=False)
