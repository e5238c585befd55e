"""Benchmark: a small team's load on one server — mixed edits, saves, reads and studies.

Starts ``shaftwright serve --workers 4`` itself on a free loopback port with a fresh SQLite
store (or ``--db postgresql://…``), creates one design per client, then runs N clients for a
fixed time (default 60 s), each on its own keep-alive connection, each picking at random
(fixed seed) among:

- edit  (60 %): ``POST /editor/solve``, the demo form with a gear moved to a new position
  every time (no cached solve is reused), as the page's live edit sends it;
- read  (22 %): the design's editor page ``GET /d/{id}``, its note ``GET /d/{id}/r/{n}/note``
  or ``GET /api/designs/{id}`` (a page read must not re-solve a revision);
- save  (15 %): ``POST /api/designs/{id}/revisions`` on top of the client's last revision;
  one save in five comes from a second "designer" on a stale base changing another key, so
  it merges three ways (201 with ``merged_from``);
- study  (3 %): ``POST /api/study``, one support position at 7 values.

Between two requests a client waits ``--think-ms`` (default 300 ms, the editor's debounce:
the page sends a live edit at most that often) plus up to 200 ms of jitter; ``--think-ms 0``
gives a closed loop with no pause at all, which measures saturation rather than a team.

An error is any answer other than the expected status (or a broken connection). Prints, per
client count, the figures per kind (count, median, p95, max), throughput and the load average
before and after (the machine may be shared). Bounded: it stops after ``--seconds`` per run.
Targets (issue 16): 0 errors; edit p95 ≤ 150 ms with 20 clients.

Run: ``python tests/benchmarks/bench_load.py [--clients 20,50] [--seconds 60] [--workers 4]``
"""
from __future__ import annotations

import argparse
import http.client
import json
import os
import random
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
import urllib.parse
import urllib.request
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

from app import web  # noqa: E402
from app.routers.pages import demo_design  # noqa: E402

WEIGHTS = (("edit", 0.60), ("read", 0.22), ("save", 0.15), ("study", 0.03))


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


def start(workers: int, db: str, log_path: Path) -> tuple[subprocess.Popen, str]:
    port = _free_port()
    env = dict(os.environ, SHAFTWRIGHT_DB=db, PYTHONPATH=str(ROOT))
    proc = subprocess.Popen([sys.executable, "-m", "app.cli", "serve", "--host", "127.0.0.1",
                             "--port", str(port), "--workers", str(workers)],
                            cwd=str(ROOT), env=env, stdout=subprocess.DEVNULL,
                            stderr=open(log_path, "w"))
    url = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        try:
            with urllib.request.urlopen(url + "/api/health", timeout=1):
                time.sleep(3)  # let every worker start its solve processes
                return proc, url
        except OSError:
            time.sleep(0.2)
    proc.kill()
    raise RuntimeError("the server did not start")


def _json(conn, method: str, path: str, body: dict | None = None) -> tuple[int, dict]:
    conn.request(method, path, body=json.dumps(body).encode() if body is not None else None,
                 headers={"Content-Type": "application/json"})
    r = conn.getresponse()
    raw = r.read()
    return r.status, (json.loads(raw) if raw[:1] in (b"{", b"[") else {})


class Client(threading.Thread):
    def __init__(self, k: int, url: str, until: float, design_id: str, gear_key: str, x0: float,
                 think_s: float = 0.3):
        super().__init__(daemon=True)
        self.think_s = think_s
        self.k, self.until, self.did = k, until, design_id
        u = urllib.parse.urlparse(url)
        self.host, self.port = u.hostname, u.port
        self.rng = random.Random(1000 + k)
        self.times: dict[str, list[float]] = {name: [] for name, _ in WEIGHTS}
        self.errors: list[str] = []
        self.form = web.design_to_form(demo_design(), "si")
        self.gear_key, self.x0 = gear_key, x0
        self.doc = demo_design()
        self.rev = 1
        self.n = 0
        self.merged = False  # the last save was a merge (a stale save from it would clash)

    def _pick(self) -> str:
        x, acc = self.rng.random(), 0.0
        for name, w in WEIGHTS:
            acc += w
            if x < acc:
                return name
        return WEIGHTS[-1][0]

    def run(self) -> None:
        conn = http.client.HTTPConnection(self.host, self.port, timeout=60)
        while time.monotonic() < self.until:
            kind = self._pick()
            t0 = time.perf_counter()
            try:
                ok = getattr(self, "_" + kind)(conn)
            except (OSError, http.client.HTTPException) as exc:
                ok = f"{type(exc).__name__}: {exc}"
                conn.close()
                conn = http.client.HTTPConnection(self.host, self.port, timeout=60)
            dt = (time.perf_counter() - t0) * 1000
            self.times[kind].append(dt)
            if ok is not True:
                self.errors.append(f"{kind}: {ok}")
            if self.think_s:
                time.sleep(self.think_s + self.rng.random() * 0.2)
        conn.close()

    def _edit(self, conn) -> bool | str:
        self.n += 1
        f = dict(self.form)
        f[self.gear_key] = f"{self.x0 - 5 + ((self.k * 997 + self.n) % 1000) * 0.01:.2f}"
        conn.request("POST", "/editor/solve", body=urllib.parse.urlencode(f).encode(),
                     headers={"Content-Type": "application/x-www-form-urlencoded", "HX-Request": "true"})
        r = conn.getresponse()
        body = r.read()
        return True if r.status == 200 and b'id="results"' in body else f"status {r.status}"

    def _read(self, conn) -> bool | str:
        path = self.rng.choice([f"/d/{self.did}", f"/d/{self.did}/r/{self.rev}/note",
                                f"/api/designs/{self.did}"])
        conn.request("GET", path)
        r = conn.getresponse()
        r.read()
        return True if r.status == 200 else f"{path} status {r.status}"

    def _save(self, conn) -> bool | str:
        self.n += 1
        if self.rev > 1 and not self.merged and self.rng.random() < 0.2:
            # a second designer, still on an older revision, changes another key: a merge
            other = json.loads(json.dumps(self.doc))
            other["notes"] = f"note {self.k}-{self.n}"
            status, body = _json(conn, "POST", f"/api/designs/{self.did}/revisions",
                                 {"design": other, "base_revision": self.rev - 1})
            if status != 201 or "merged_from" not in body:
                return f"merge status {status} {str(body)[:120]}"
            self.merged = True
        else:
            self.doc["supports"][0]["x_mm"] = round(self.doc["supports"][0]["x_mm"] + 0.01, 2)
            status, body = _json(conn, "POST", f"/api/designs/{self.did}/revisions",
                                 {"design": self.doc, "base_revision": self.rev})
            if status != 201:
                return f"save status {status} {str(body)[:120]}"
            self.merged = False
        self.rev = body["revision"]
        self.doc = body["design"]
        return True

    def _study(self, conn) -> bool | str:
        s = self.doc["supports"][-1]
        x = s["x_mm"]
        status, body = _json(conn, "POST", "/api/study", {
            "design": self.doc, "vary": [f"supports.{s['id']}.x_mm={x - 10:.2f}:{x:.2f}:7"]})
        return True if status == 200 else f"study status {status} {str(body)[:120]}"


def _pct(xs: list[float], p: float) -> float:
    xs = sorted(xs)
    return xs[min(len(xs) - 1, int(round(p * (len(xs) - 1))))] if xs else float("nan")


def run(url: str, clients: int, seconds: float, think_s: float = 0.3) -> dict:
    form = web.design_to_form(demo_design(), "si")
    i = next(k for k in range(100) if form.get(f"elements[{k}].kind") == "gear")
    gear_key = f"elements[{i}].x_mm"
    conn = http.client.HTTPConnection(*urllib.parse.urlparse(url).netloc.split(":"), timeout=60)
    ids = []
    for _ in range(clients):
        status, body = _json(conn, "POST", "/api/designs", demo_design())
        assert status == 201, body
        ids.append(body["id"])
    conn.close()
    load_before = os.getloadavg()
    until = time.monotonic() + seconds
    threads = [Client(k, url, until, ids[k], gear_key, float(form[gear_key]), think_s)
               for k in range(clients)]
    t0 = time.perf_counter()
    for t in threads:
        t.start()
    for t in threads:
        t.join()
    wall = time.perf_counter() - t0
    out: dict = {"clients": clients, "seconds": round(wall, 1), "think_ms": round(think_s * 1000),
                 "load_avg_before": [round(x, 2) for x in load_before],
                 "load_avg_after": [round(x, 2) for x in os.getloadavg()], "cpus": os.cpu_count()}
    total = 0
    for name, _ in WEIGHTS:
        xs = [x for t in threads for x in t.times[name]]
        total += len(xs)
        out[name] = {"n": len(xs), "median_ms": round(statistics.median(xs), 1) if xs else None,
                     "p95_ms": round(_pct(xs, 0.95), 1) if xs else None,
                     "max_ms": round(max(xs), 1) if xs else None}
    errors = [e for t in threads for e in t.errors]
    out.update(requests=total, throughput_rps=round(total / wall, 1), errors=len(errors),
               first_errors=errors[:5])
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--clients", default="20,50", help="client counts, comma-separated")
    ap.add_argument("--seconds", type=float, default=60.0, help="length of each run")
    ap.add_argument("--workers", type=int, default=4, help="serve --workers")
    ap.add_argument("--db", default="", help="a store URL (default: a fresh SQLite file)")
    ap.add_argument("--think-ms", type=float, default=300.0, help="pause between a client's requests")
    args = ap.parse_args(argv)
    with tempfile.TemporaryDirectory() as tmp:
        log_path = Path(tmp) / "server.log"
        proc, url = start(args.workers, args.db or str(Path(tmp) / "bench.db"), log_path)
        try:
            results = [run(url, int(n), args.seconds, args.think_ms / 1000)
                       for n in args.clients.split(",")]
        finally:
            proc.terminate()
            try:
                proc.wait(timeout=15)
            except subprocess.TimeoutExpired:
                proc.kill()
        logged = [ln for ln in log_path.read_text(errors="replace").splitlines()
                  if "error" in ln.lower() or "warning" in ln.lower() or "stopped" in ln]
    for r in results:
        print(json.dumps(r))
    first = next((r for r in results if r["clients"] == 20), results[0])
    ok = first["errors"] == 0 and first["edit"]["p95_ms"] is not None and first["edit"]["p95_ms"] <= 150
    if logged:
        print(f"server log: {len(logged)} error/warning lines, the first: " + " | ".join(logged[:5]))
    print(f"{first['clients']} clients: {first['errors']} errors, edit p95 {first['edit']['p95_ms']} ms: "
          f"{'meets' if ok else 'MISSES'} the target (0 errors, edit p95 <= 150 ms)")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
