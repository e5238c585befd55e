"""`shaftwright solve`: tables, the result document, the user's own bearing table, bad input."""
import json

import engine
from app.cli import main
from tests.conftest import SAMPLES, load_sample


def test_tables_name_every_support_and_bearing(capsys):
    assert main(["solve", str(SAMPLES / "countershaft.json")]) == 0
    out = capsys.readouterr().out
    for word in ("Load case 'rated'", "Load case 'peak'", "Fr N", "Bearing at A", "Bearing at B",
                 "required C", "Checks (failing first)", "Sources", "qualified"):
        assert word in out


def test_json_is_the_result_document(capsys):
    assert main(["solve", str(SAMPLES / "line_shaft.json"), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["format"] == "shaft-result/1"
    ref = engine.solve(load_sample("line_shaft.json"))
    assert [s["Fr_N"] for s in doc["load_cases"][0]["supports"]] == [s.Fr_N for s in ref.load_cases[0].supports]


def test_bad_design_exits_2_with_key_paths(tmp_path, capsys):
    bad = load_sample("countershaft.json")
    bad["supports"][1]["x_mm"] = -3
    f = tmp_path / "bad.json"
    f.write_text(json.dumps(bad))
    assert main(["solve", str(f)]) == 2
    assert "supports[1].x_mm" in capsys.readouterr().err


def test_own_bearing_table(tmp_path, capsys):
    # the bundled table, cut to the deep groove and cylindrical rows of 40 mm bore
    lines = (SAMPLES / "bearings.csv").read_text(encoding="utf-8").splitlines()
    head = [ln for ln in lines if ln.startswith("#")]
    rows = [ln for ln in lines if not ln.startswith("#")]
    keep = [rows[0]] + [r for r in rows[1:] if r.startswith(("DG-02-40,", "CR-02-40,"))]
    f = tmp_path / "mine.csv"
    f.write_text("\n".join(head + keep) + "\n")
    assert main(["solve", str(SAMPLES / "countershaft.json"), "--bearings", str(f), "--json"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert [[c["designation"] for c in b["candidates"]] for b in doc["bearings"]] == [["DG-02-40"], ["CR-02-40"]]
    f.write_text(rows[0] + "\nDG-02-40,deep_groove_ball\n")
    assert main(["solve", str(SAMPLES / "countershaft.json"), "--bearings", str(f)]) == 2
    assert "row 2" in capsys.readouterr().err


def test_bearing_table_carried_in_the_design():
    import pytest

    lines = (SAMPLES / "bearings.csv").read_text(encoding="utf-8").splitlines()
    rows = [ln for ln in lines if not ln.startswith("#")]
    design = load_sample("countershaft.json")
    design["bearing_table"] = {"name": "our stores list", "csv": "\n".join(
        [rows[0]] + [r for r in rows[1:] if r.startswith(("DG-03-40,", "CR-03-40,"))])}
    r = engine.solve(design)
    assert [[c.designation for c in b.candidates] for b in r.bearings] == [["DG-03-40"], ["CR-03-40"]]
    design["bearing_table"]["csv"] = rows[0] + "\nDG-03-40,deep_groove_ball\n"
    with pytest.raises(engine.DesignError) as exc:
        engine.solve(design)
    assert exc.value.errors[0].path == "bearing_table.csv" and "row 2" in exc.value.errors[0].message


def test_tables_align_text_left_and_numbers_right():
    from app.report import table

    out = table(["status", "where", "value", "unit"],
                [["OK", "x = 50 mm (shoulder)", 2.945, "rad"], ["FAIL", "BV", 1450.0, ""], ["OK", "A", None, "mm"]])
    lines = out.splitlines()
    assert lines[0] == "status  where                 value  unit"
    assert lines[2] == "OK      x = 50 mm (shoulder)  2.945  rad"
    assert lines[3] == "FAIL    BV                    1,450"
    assert lines[4] == "OK      A                         –  mm"
