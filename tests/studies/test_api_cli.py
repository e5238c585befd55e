"""The study through the API, the page fragments and the command line."""
from __future__ import annotations

import csv
import io
import json

import pytest
from fastapi.testclient import TestClient

from app.cli import main
from app.main import create_app
from app.routers.studies import decode_design, encode_design
from tests.conftest import SAMPLES, load_sample

DEMO = str(SAMPLES / "countershaft.json")


@pytest.fixture(scope="module")
def client():
    return TestClient(create_app())


def test_api_study_returns_figures_per_variant(client):
    r = client.post("/api/study", json={"design": load_sample("countershaft.json"),
                                        "vary": ["supports.B.x_mm=200:260:4"]})
    assert r.status_code == 200
    doc = r.json()
    assert doc["shape"] == [4] and [v["values"] for v in doc["variants"]] == [[200.0], [220.0], [240.0], [260.0]]
    assert doc["variables"][0]["path"] == "supports.B.x_mm" and doc["variables"][0]["current"] == 255.0
    v = doc["variants"][0]
    assert {"bearings", "min_life_h", "safety_factor", "max_slope_rad", "critical_speed_rpm", "ok"} <= set(v)
    assert [b["id"] for b in v["bearings"]] == ["A", "B"] and v["bearings"][0]["life_h"] > 0


@pytest.mark.parametrize("body, path", [
    ({"design": load_sample("countershaft.json"), "vary": ["supports.B.x_mm=200:900:4"]}, "supports.B.x_mm"),
    ({"design": load_sample("countershaft.json"), "vary": ["elements.ZZ.x_mm=1:2:2"]}, "elements.ZZ.x_mm"),
    ({"design": load_sample("countershaft.json")}, "vary"),
    ({"design": {"shaft": {}}, "vary": ["supports.B.x_mm=1:2:2"]}, "shaft.segments"),
])
def test_api_study_bad_input_names_the_field(client, body, path):
    r = client.post("/api/study", json=body)
    assert r.status_code == 422
    assert path in [e["path"] for e in r.json()["errors"]]


def test_api_study_not_json(client):
    r = client.post("/api/study", content=b"{nope", headers={"content-type": "application/json"})
    assert r.status_code == 422 and r.json()["errors"]


def test_api_arrangements_ranked(client):
    r = client.post("/api/arrangements", json={"design": load_sample("countershaft.json")})
    assert r.status_code == 200
    opts = r.json()["options"]
    assert [o["rank"] for o in opts] == list(range(1, len(opts) + 1))
    assert sum(o["current"] for o in opts) == 1


def test_page_and_fragments(client):
    data = load_sample("countershaft.json")
    page = client.get("/study?d=" + encode_design(data))
    assert page.status_code == 200 and "What-if study" in page.text and "supports.B.x_mm" in page.text
    assert "Caution" in page.text  # the base template's caution stays on this page
    frag = client.post("/study/run", data={"design": json.dumps(data), "var1": "supports.B.x_mm",
                                           "range1": "200:260:4"})
    assert frag.status_code == 200 and 'id="study-plot-data"' in frag.text and "take" in frag.text
    plot = json.loads(frag.text.split('id="study-plot-data">', 1)[1].split("</script>", 1)[0])
    assert plot["layout"]["meta"]["values"] == [[200.0, 220.0, 240.0, 260.0]]
    assert any(s.get("x0") == 255.0 for s in plot["layout"]["shapes"])  # the current design marked
    two = client.post("/study/run", data={"design": json.dumps(data), "var1": "supports.B.x_mm", "range1": "200:260:3",
                                          "var2": "elements.G1.x_mm", "range2": "120:180:3"})
    assert two.status_code == 200 and '"heatmap"' in two.text
    bad = client.post("/study/run", data={"design": json.dumps(data), "var1": "supports.B.x_mm", "range1": "1:2"})
    assert bad.status_code == 422 and "supports.B.x_mm" in bad.text and "start:stop:count" in bad.text
    arr = client.post("/study/arrangements", data={"design": json.dumps(data)})
    assert arr.status_code == 200 and "back-to-back" in arr.text
    took = client.post("/study/apply", data={"design": json.dumps(data), "var1": "supports.B.x_mm", "value1": "240"})
    assert took.status_code == 200 and 'id="design-form"' in took.text and 'value="240"' in took.text


def test_editor_opens_the_study_on_its_design(client):
    from app import web

    form = web.design_to_form(load_sample("countershaft.json"), "si")
    form["supports[1].x_mm"] = "250"
    r = client.post("/study/open", data=form)
    url = r.headers["hx-redirect"]
    assert url.startswith("/study?d=")
    assert decode_design(url.split("=", 1)[1])["supports"][1]["x_mm"] == 250
    assert 'hx-post="/study/open"' in client.get("/").text


def test_cli_table_and_csv(capsys):
    assert main(["study", DEMO, "--vary", "supports.B.x_mm=200:260:4"]) == 0
    out = capsys.readouterr().out
    assert "supports.B.x_mm [mm]" in out and "life A [h]" in out and "critical speed [rpm]" in out
    assert main(["study", DEMO, "--vary", "supports.B.x_mm=200:260:4", "--vary", "elements.G1.x_mm=150,160", "--csv"]) == 0
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert rows[0][:2] == ["supports.B.x_mm [mm]", "elements.G1.x_mm [mm]"] and len(rows) == 1 + 8
    assert float(rows[1][0]) == 200.0 and float(rows[1][1]) == 150.0
    assert main(["study", DEMO, "--arrangements", "--csv"]) == 0
    rows = list(csv.reader(io.StringIO(capsys.readouterr().out)))
    assert rows[0][0] == "rank" and len(rows) == 13


@pytest.mark.parametrize("argv, words", [
    (["--vary", "supports.B.x_mm=200:900:4"], "error: supports.B.x_mm: the values reach 900 mm"),
    (["--vary", "supports.Q.x_mm=1:2:3"], "error: supports.Q.x_mm: no support has the id 'Q'"),
    ([], "error: vary:"),
])
def test_cli_bad_input_exits_2_naming_the_field(capsys, argv, words):
    assert main(["study", DEMO] + argv) == 2
    assert words in capsys.readouterr().err


def test_a_long_study_runs_as_a_job_with_progress_and_can_be_stopped(client):
    """More than one chunk of variants: the page gets a progress fragment that polls the job
    (share of variants done), the job runs off the event loop, and stop ends it early with
    the variants solved so far."""
    import time

    from engine.study import CHUNK

    data = load_sample("countershaft.json")
    n = 30 * (CHUNK // 10)  # three chunks
    frag = client.post("/study/run", data={"design": json.dumps(data), "var1": "supports.B.x_mm",
                                           "range1": "242:268:30", "var2": "elements.G1.x_mm",
                                           "range2": f"120:180:{CHUNK // 10}"})
    assert frag.status_code == 200 and 'id="study-progress"' in frag.text and f"of {n} variants done" in frag.text
    key = frag.text.split('hx-get="/study/job/', 1)[1].split('"', 1)[0]
    stop = client.post(f"/study/job/{key}/stop")
    assert stop.status_code == 200 and "Stopping" in stop.text
    for _ in range(600):
        r = client.get(f"/study/job/{key}")
        if 'id="study-plot-data"' in r.text:
            break
        assert 'id="study-progress"' in r.text
        time.sleep(0.1)
    assert r.status_code == 200 and "stopped on request" in r.text
    assert client.get("/study/job/no-such-job").status_code == 404


def test_cli_streams_csv_rows_per_chunk_and_stops_on_ctrl_c(capsys, monkeypatch):
    """CSV rows are written chunk by chunk; an interrupt (Ctrl-C) keeps the rows solved so far
    and says so on stderr; no progress bar when stderr is not a terminal."""
    import engine.study as study_mod

    real = study_mod._variant_figures
    calls = []

    def interrupted_after_two(*args, **kw):
        calls.append(1)
        if len(calls) > 2:
            raise KeyboardInterrupt
        return real(*args, **kw)

    monkeypatch.setattr(study_mod, "_variant_figures", interrupted_after_two)
    monkeypatch.setitem(study_mod.iter_study.__kwdefaults__, "chunk", 3)  # chunks of 3 variants
    assert main(["study", DEMO, "--vary", "supports.B.x_mm=242:268:10", "--csv"]) == 0
    cap = capsys.readouterr()
    rows = list(csv.reader(io.StringIO(cap.out)))
    assert len(rows) == 1 + 6 and float(rows[1][0]) == 242.0
    assert "stopped: 6 of 10 variants solved" in cap.err and "variant/s" not in cap.err
