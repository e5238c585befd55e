"""Browser fixtures: a live uvicorn server and Playwright driving Debian's Chromium.

Reusable by every browser test: ``live_server`` (base URL of the app in a subprocess on a
free loopback port, ``SHAFTWRIGHT_DB`` pointing at a temporary file), ``browser`` (one
headless Chromium per session), ``page`` (a fresh context and page per test, console errors
collected in ``page.console_errors``, requests outside the app in ``page.outside_requests``)
and ``artifacts`` (the git-ignored directory for screenshots).

Under ``CI=true`` a missing browser or Playwright is a failure, not a skip.
"""
from __future__ import annotations

import os
import socket
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
ARTIFACTS = ROOT / "tests" / "artifacts"
CHROMIUM = os.environ.get("SHAFTWRIGHT_CHROMIUM", "/usr/bin/chromium")
CHROMIUM_ARGS = ["--no-sandbox", "--disable-gpu", "--disable-background-networking",
                 "--disable-component-update", "--disable-sync", "--no-first-run",
                 "--disable-default-apps", "--disable-domain-reliability", "--no-default-browser-check"]


def _free_port() -> int:
    with socket.socket(socket.AF_INET, socket.SOCK_STREAM) as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _unavailable(why: str) -> None:
    if os.environ.get("CI", "").lower() == "true":
        pytest.fail(f"browser tests cannot run: {why} (CI=true: this is a failure)")
    pytest.skip(f"browser tests cannot run: {why}")


def start_server(env_extra: dict[str, str] | None = None, *, timeout_s: float = 30.0):
    """Start the app as ``shaftwright serve`` does (``app.server.run``: uvicorn) on a free
    loopback port; return (process, base_url). Used by the fixtures and the benchmark."""
    port = _free_port()
    env = dict(os.environ)
    env.update(env_extra or {})
    env["PYTHONPATH"] = str(ROOT) + os.pathsep + env.get("PYTHONPATH", "")
    proc = subprocess.Popen(
        [sys.executable, "-m", "app.server", "--host", "127.0.0.1", "--port", str(port),
         "--log-level", "warning"],
        cwd=str(ROOT), env=env, stdout=subprocess.PIPE, stderr=subprocess.STDOUT)
    url = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + timeout_s
    while time.monotonic() < deadline:
        if proc.poll() is not None:
            out = proc.stdout.read().decode(errors="replace") if proc.stdout else ""
            raise RuntimeError(f"uvicorn exited early:\n{out}")
        try:
            with urllib.request.urlopen(url + "/api/health", timeout=1) as r:
                if r.status == 200:
                    return proc, url
        except OSError:
            time.sleep(0.1)
    proc.terminate()
    raise RuntimeError("uvicorn did not answer in time")


def stop_server(proc: subprocess.Popen) -> None:
    proc.terminate()
    try:
        proc.wait(timeout=10)
    except subprocess.TimeoutExpired:
        proc.kill()


@pytest.fixture(scope="session")
def live_server(tmp_path_factory):
    """Base URL of the app served by uvicorn (subprocess), with a temporary store."""
    db = tmp_path_factory.mktemp("store") / "shaftwright-test.db"
    proc, url = start_server({"SHAFTWRIGHT_DB": str(db)})
    try:
        yield url
    finally:
        stop_server(proc)


@pytest.fixture(scope="session")
def _playwright():
    try:
        from playwright.sync_api import sync_playwright
    except ImportError as exc:
        _unavailable(f"Playwright is not installed ({exc})")
    if not Path(CHROMIUM).exists():
        _unavailable(f"no Chromium at {CHROMIUM}")
    with sync_playwright() as p:
        yield p


@pytest.fixture(scope="session")
def browser(_playwright):
    """One headless Debian Chromium for the session."""
    try:
        b = _playwright.chromium.launch(executable_path=CHROMIUM, headless=True, args=CHROMIUM_ARGS)
    except Exception as exc:  # noqa: BLE001 - any launch failure means no browser
        _unavailable(f"Chromium would not start ({exc})")
    yield b
    b.close()


@pytest.fixture
def page(browser, live_server):
    """A fresh page (own context, so own local storage) at a desktop size."""
    ctx = browser.new_context(viewport={"width": 1440, "height": 1000}, device_scale_factor=1)
    pg = ctx.new_page()
    pg.console_errors = []  # type: ignore[attr-defined]
    pg.outside_requests = []  # type: ignore[attr-defined]
    pg.on("console", lambda m: m.type == "error" and pg.console_errors.append(m.text))
    pg.on("pageerror", lambda e: pg.console_errors.append(str(e)))

    def _req(r):
        if not (r.url.startswith(live_server) or r.url.startswith("data:") or r.url.startswith("blob:")):
            pg.outside_requests.append(r.url)
    pg.on("request", _req)
    pg.set_default_timeout(15000)
    yield pg
    ctx.close()


@pytest.fixture(scope="session")
def artifacts() -> Path:
    """Directory for screenshots and other artefacts (git-ignored)."""
    ARTIFACTS.mkdir(parents=True, exist_ok=True)
    return ARTIFACTS
