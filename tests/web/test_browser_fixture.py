"""Under CI=true a missing browser fails the browser tests instead of skipping them."""
from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]


def test_missing_browser_fails_under_ci(tmp_path):
    env = dict(os.environ, CI="true", SHAFTWRIGHT_CHROMIUM=str(tmp_path / "no-such-chromium"))
    r = subprocess.run([sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider",
                        "tests/browser/test_editor.py::test_page_loads_complete_and_offline"],
                       cwd=ROOT, env=env, capture_output=True, text=True, timeout=120)
    assert r.returncode != 0, r.stdout
    assert "CI=true: this is a failure" in r.stdout
    assert " skipped" not in r.stdout.splitlines()[-1]
