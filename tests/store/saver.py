"""Helper run as a subprocess by the kill test: save revisions in a loop, report each commit.

Usage: python -m tests.store.saver LOCATION DESIGN_ID  (a file path or a postgresql:// URL)
Prints ``n`` on its own line (flushed) after revision ``n`` is committed, forever.
"""
from __future__ import annotations

import json
import sys
from pathlib import Path

from app.store import open_store

HERE = Path(__file__).resolve().parent


def main() -> None:
    db, design_id = sys.argv[1], sys.argv[2]
    store = open_store(db)
    doc = json.loads((HERE / "example_design.json").read_text(encoding="utf-8"))
    doc["notes"] = "x" * 20000  # a large-ish document makes each write take longer
    i = 0
    while True:
        i += 1
        doc["name"] = f"save {i}"
        rev = store.add_revision(design_id, doc, base_revision=None, comment=f"loop {i}")
        print(rev.n, flush=True)


if __name__ == "__main__":
    main()
