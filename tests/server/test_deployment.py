"""docs/deployment/nginx.conf works as written: TLS in front, the app behind it on loopback.

Starts ``shaftwright serve --workers 2`` and nginx with the example configuration (a
self-signed certificate made here with openssl), then reads the health route, a page and
saves a design through https. Needs nginx and openssl (Debian: ``apt-get install nginx-light
openssl``); skipped when nginx is not installed, except under CI=true, where it fails.
"""
from __future__ import annotations

import json
import os
import shutil
import socket
import ssl
import subprocess
import sys
import time
import urllib.request
from pathlib import Path

import pytest

from app.routers import pages

ROOT = Path(__file__).resolve().parents[2]
CONF = ROOT / "docs" / "deployment" / "nginx.conf"


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def _wait(url: str, ctx=None, timeout_s: float = 60) -> None:
    deadline = time.monotonic() + timeout_s
    while time.monotonic() < deadline:
        try:
            with urllib.request.urlopen(url, timeout=2, context=ctx) as r:
                if r.status == 200:
                    return
        except OSError:
            time.sleep(0.2)
    raise RuntimeError(f"{url} did not answer")


def test_the_example_nginx_configuration_serves_the_app_over_tls(tmp_path):
    nginx = shutil.which("nginx") or ("/usr/sbin/nginx" if Path("/usr/sbin/nginx").exists() else None)
    if nginx is None or shutil.which("openssl") is None:
        if os.environ.get("CI") == "true":
            pytest.fail("nginx and openssl are needed for the deployment test")
        pytest.skip("nginx or openssl is not installed")
    app_port, tls_port = _free_port(), _free_port()
    subprocess.run(["openssl", "req", "-x509", "-newkey", "rsa:2048", "-nodes", "-days", "1",
                    "-subj", "/CN=localhost", "-keyout", str(tmp_path / "key.pem"),
                    "-out", str(tmp_path / "cert.pem")], check=True, capture_output=True)
    for d in ("logs", "tmp"):
        (tmp_path / d).mkdir()
    conf = CONF.read_text().replace("127.0.0.1:8000", f"127.0.0.1:{app_port}").replace(
        "listen 8443 ssl", f"listen 127.0.0.1:{tls_port} ssl")
    (tmp_path / "nginx.conf").write_text(conf)
    env = dict(os.environ, SHAFTWRIGHT_DB=str(tmp_path / "s.db"), PYTHONPATH=str(ROOT))
    app = subprocess.Popen([sys.executable, "-m", "app.cli", "serve", "--port", str(app_port),
                            "--workers", "2"], cwd=str(ROOT), env=env,
                           stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    proxy = subprocess.Popen([nginx, "-p", str(tmp_path), "-c", str(tmp_path / "nginx.conf"),
                              "-g", "daemon off;"], stdout=subprocess.DEVNULL, stderr=subprocess.PIPE)
    ctx = ssl.create_default_context(cafile=str(tmp_path / "cert.pem"))
    ctx.check_hostname = False
    base = f"https://127.0.0.1:{tls_port}"
    try:
        _wait(f"http://127.0.0.1:{app_port}/api/health")
        _wait(base + "/api/health", ctx)
        with urllib.request.urlopen(base + "/", context=ctx, timeout=30) as r:
            assert r.status == 200 and b"Shaftwright" in r.read()
        req = urllib.request.Request(base + "/api/designs", data=json.dumps(pages.demo_design()).encode(),
                                     headers={"Content-Type": "application/json"}, method="POST")
        with urllib.request.urlopen(req, context=ctx, timeout=30) as r:
            assert r.status == 201 and json.loads(r.read())["revision"] == 1
        with urllib.request.urlopen(base + "/api/health", context=ctx, timeout=10) as r:
            assert "nginx/" not in r.headers.get("Server", "")  # server_tokens off
    finally:
        for p in (proxy, app):
            p.terminate()
            try:
                p.wait(timeout=15)
            except subprocess.TimeoutExpired:
                p.kill()
