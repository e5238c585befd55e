"""One command-line style for bad input (app.cli_io): every command, every kind of bad file.

Each mistake is one line ``shaftwright: FILE: message`` on stderr with exit status 2; a
missing browser is exit status 3 with how to get one; no traceback ever reaches the user.
"""
from __future__ import annotations

import json
import subprocess
import sys

import pytest

from app.cli import main
from tests.conftest import ROOT, SAMPLES, load_sample

COMMANDS = {
    "solve": lambda f, tmp: ["solve", str(f)],
    "note": lambda f, tmp: ["note", str(f), "-o", str(tmp / "out.pdf")],
    "study": lambda f, tmp: ["study", str(f), "--vary", "supports.B.x_mm=150:200:3"],
}


def _bad_files(tmp):
    """(name, path, what the message must say) for each kind of bad input file."""
    tmp.mkdir(exist_ok=True)
    (tmp / "folder.json").mkdir(exist_ok=True)
    (tmp / "bad.txt").write_text("hello, not JSON\n", encoding="utf-8")
    latin = load_sample("bevel_pinion.json")
    latin["name"] = "Rührwerk"  # ü is 0xFC in Latin-1, not UTF-8
    raw = json.dumps(latin, ensure_ascii=False, indent=1).encode("latin-1")
    (tmp / "latin1.json").write_bytes(raw)
    line = raw[:raw.index(b"\xfc")].count(b"\n") + 1
    design = load_sample("bevel_pinion.json")
    design["supports"][1]["x_mm"] = 5000
    (tmp / "design_error.json").write_text(json.dumps(design), encoding="utf-8")
    return [("missing", tmp / "missing.json", "no such design file"),
            ("folder", tmp / "folder.json", "is a folder, not a design file"),
            ("not_json", tmp / "bad.txt", "not valid JSON"),
            ("latin1", tmp / "latin1.json", f"is not UTF-8 text (byte 0xFC on line {line})"),
            ("design_error", tmp / "design_error.json", "supports[1].x_mm: B at x = 5000 mm lies off the shaft")]


@pytest.mark.parametrize("command", sorted(COMMANDS))
def test_each_bad_file_is_one_line_with_exit_status_2(command, tmp_path, capsys):
    for name, path, says in _bad_files(tmp_path / "in"):
        rc = main(COMMANDS[command](path, tmp_path))
        out, err = capsys.readouterr()
        lines = err.strip().splitlines()
        assert rc == 2, (name, err)
        assert lines == [f"shaftwright: {path}: " + lines[0].split(f"{path}: ", 1)[1]], (name, err)
        assert says in lines[0], (name, err)
        assert "Traceback" not in err and out == ""
        assert not (tmp_path / "out.pdf").exists()


@pytest.mark.parametrize("command", sorted(COMMANDS))
def test_a_file_with_a_byte_order_mark_is_read(command, tmp_path, capsys, monkeypatch):
    """Windows editors may save UTF-8 with a byte-order mark: it is skipped, not refused."""
    f = tmp_path / "bom.json"
    f.write_bytes(b"\xef\xbb\xbf" + (SAMPLES / "bevel_pinion.json").read_bytes())
    if command == "note":  # reading is what is tested here; no browser needed
        import app.note

        monkeypatch.setattr(app.note, "print_pdf", lambda doc, out, **kw: out)
    assert main(COMMANDS[command](f, tmp_path)) == 0, capsys.readouterr().err


def test_a_missing_browser_is_exit_status_3_with_how_to_get_one(tmp_path, capsys, monkeypatch):
    from app.settings import get_settings

    monkeypatch.setenv("SHAFTWRIGHT_CHROMIUM", str(tmp_path / "no-such-browser"))
    monkeypatch.setenv("PATH", str(tmp_path))  # nor one on the PATH
    get_settings.cache_clear()
    try:
        rc = main(["note", str(SAMPLES / "bevel_pinion.json"), "-o", str(tmp_path / "n.pdf")])
    finally:
        get_settings.cache_clear()
    err = capsys.readouterr().err.strip().splitlines()
    assert rc == 3 and len(err) == 1
    assert err[0].startswith("shaftwright: printing the note needs Chromium")
    assert "apt-get install chromium" in err[0] and "SHAFTWRIGHT_CHROMIUM" in err[0]


def test_study_option_mistakes_are_one_line(capsys):
    f = str(SAMPLES / "bevel_pinion.json")
    assert main(["study", f]) == 2
    assert capsys.readouterr().err.strip() == (
        "shaftwright: give --vary PATH=START:STOP:COUNT (once or twice), or --arrangements")
    assert main(["study", f, "--vary", "supports.B.x_mm=100:900:5"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith(f"shaftwright: {f}: supports.B.x_mm: ")
    assert "beyond the shaft's length" in err[0]


def test_bad_bearing_table_names_the_table_file(tmp_path, capsys):
    t = tmp_path / "mine.csv"
    t.write_bytes("designation,type\nDG-02-40,Kugellager ä\n".encode("latin-1"))
    assert main(["solve", str(SAMPLES / "countershaft.json"), "--bearings", str(t)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert err == [f"shaftwright: {t}: is not UTF-8 text (byte 0xE4 on line 2); save it as UTF-8 and try again"]


def test_no_traceback_in_a_real_process(tmp_path):
    """The installed entry point, as a user runs it: one line, exit status 2, no traceback."""
    f = tmp_path / "bad.txt"
    f.write_text("{", encoding="utf-8")
    proc = subprocess.run([sys.executable, "-m", "app.cli", "solve", str(f)], cwd=ROOT,
                          capture_output=True, text=True, timeout=60)
    assert proc.returncode == 2 and "Traceback" not in proc.stderr
    assert proc.stderr.count("\n") == 1 and proc.stderr.startswith(f"shaftwright: {f}: the document is not valid JSON")


def test_every_option_has_help():
    from app.cli import build_parser

    parser = build_parser()
    sub = next(a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction")
    for name, p in sub.choices.items():
        for action in p._actions:
            if action.option_strings and action.dest != "help" or action.dest == "design":
                assert action.help, f"shaftwright {name} {action.option_strings or action.dest} has no help"
    assert "address to listen on" in sub.choices["serve"].format_help()


def test_note_progress_bar_names_its_steps_only_on_a_terminal(tmp_path, capsys):
    """tqdm draws on stderr when it is a terminal (forced on here); off, it writes nothing."""
    from app.note import _Progress

    with _Progress(enabled=True) as bar:
        for what in ("reading and solving the design", "drawing the note", "printing with Chromium"):
            bar.step(what)
            bar.tick()
    err = capsys.readouterr().err
    assert "printing with Chromium" in err and "2/3" in err
    with _Progress() as bar:  # stderr is captured here, not a terminal
        bar.step("reading and solving the design")
    assert capsys.readouterr().err == ""


def test_note_output_that_cannot_be_written_is_one_line(tmp_path, capsys):
    blocker = tmp_path / "a_file"
    blocker.write_text("", encoding="utf-8")
    out = blocker / "note.pdf"  # a folder that is a file
    assert main(["note", str(SAMPLES / "bevel_pinion.json"), "-o", str(out)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith(f"shaftwright: {out}: cannot write the PDF there")


def test_serve_refuses_a_port_in_use_in_one_line(capsys):
    import socket

    with socket.socket() as busy:
        busy.bind(("127.0.0.1", 0))
        busy.listen()
        port = busy.getsockname()[1]
        assert main(["serve", "--port", str(port)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert err == [f"shaftwright: port {port} on 127.0.0.1 is in use: pick another with --port N or SHAFTWRIGHT_PORT"]
