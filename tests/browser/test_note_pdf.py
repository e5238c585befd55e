"""The design note printed to PDF from the browser: name, reactions and bearing lives."""
from __future__ import annotations

import json
import subprocess

import httpx

from tests.note.test_note import EXAMPLE, expected_numbers


def test_note_prints_to_pdf_with_reactions_and_lives(page, live_server, tmp_path):
    design = json.loads(EXAMPLE.read_text(encoding="utf-8"))
    saved = httpx.post(live_server + "/api/designs",
                       json={"design": design, "author": "Print tester", "comment": "for the note"}).json()
    page.goto(live_server + saved["note_url"])
    assert page.locator("h1").inner_text() == f"Design note: {design['name']}"
    assert page.locator("script").count() == 0  # a page that prints without any script
    out = tmp_path / "note.pdf"
    page.pdf(path=str(out), format="A4", print_background=True)
    text = subprocess.run(["pdftotext", "-layout", str(out), "-"], capture_output=True, text=True,
                          check=True).stdout
    flat = " ".join(text.split())
    assert design["name"] in flat and "Print tester" in flat
    assert saved["id"] in flat  # the title block names the stored design
    numbers = expected_numbers(design)
    assert numbers["bearings"] == ["L", "R"] and len(numbers["lives"]) == 2
    for value in numbers["reactions"]:
        assert value in text, f"reaction {value} N missing"
    for value in numbers["lives"]:
        assert value in text, f"life {value} h missing"
    assert "qualified engineer must check" in flat
    assert page.console_errors == [] and page.outside_requests == []
