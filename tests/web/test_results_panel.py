"""The results panel: summary of governing checks, checks grouped by family (failing first),
bearings and candidates, value/limit/source beside every verdict.

The engine result here carries hand-made checks and bearings (tests/web/results_fixture.py:
a fixture of the result format, invented numbers), so that the panel is tested whatever the
engine returns today; the governing items are known by construction.
"""
from __future__ import annotations

import html
import re

import engine
from app import web
from app.routers import pages
from tests.web.results_fixture import LONG_SOURCE, parse_rows, with_fixture

RANK = {"fail": 0, "warn": 1, "ok": 2}


def _post(client, monkeypatch, system="si"):
    real = pages._solve
    monkeypatch.setattr(pages, "_solve", lambda d: with_fixture(real(d)))
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design(), system))
    assert r.status_code == 200
    return r.text


def _status(row) -> str:
    return re.search(r"\bst-(\w+)", row["attrs"]["class"]).group(1)


def _summary_rows(body):
    return [r for r in parse_rows(body) if "summary" in r["ids"] and "gov" in r["attrs"].get("class", "")]


def _check_rows(body):
    return [r for r in parse_rows(body) if "all-checks" in r["ids"] and "data-code" in r["attrs"]]


def _family_of(row) -> str:
    return next(i for i in row["ids"] if i.startswith("fam-"))[4:]


def test_summary_verdict_and_counts(client, monkeypatch):
    body = _post(client, monkeypatch)
    # 15 checks reported; the three identical critical-speed checks are one row: 13 rows
    assert "1 check fails" in body
    assert "1 failing · 1 to watch · 11 passing" in body
    assert 'class="verdict-line v-fail"' in body


def test_summary_names_the_governing_check_of_each_topic(client, monkeypatch):
    body = _post(client, monkeypatch)
    rows = _summary_rows(body)
    by_topic: dict[str, list[dict]] = {}
    for r in rows:
        by_topic.setdefault(r["attrs"]["data-topic"], []).append(r)
    # bearings: life and static safety per support, with the chosen bearing's designation
    life = by_topic["bearing.life"]
    assert len(life) == 2
    a, b = life
    assert "T-40-A" in a["text"] and "Lnm" in a["text"] and "4100 h" in a["text"] and "30 000 h" in a["text"]
    assert "L10 3000 h" in a["text"], "the basic life is given beside the modified one"
    assert "T-40-C" in b["text"] and "basic rating life L10" in b["text"]
    assert len(by_topic["bearing.static"]) == 1 and "T-40-A" in by_topic["bearing.static"][0]["text"]
    # strength: the lowest fatigue and yield safety with its section
    fat = by_topic["shaft.fatigue"][0]["text"]
    assert "2.1" in fat and "x = 30 mm" in fat and "seat of P1 (end-milled keyway)" in fat
    yld = by_topic["shaft.yield"][0]["text"]
    assert "5" in yld and "x = 30 mm" in yld
    # stiffness: the bearing slope nearest its limit (B), not the largest slope (A)
    slope = by_topic["shaft.bearing_slope"][0]["text"]
    assert "0.0007 rad" in slope and "0.0008 rad" in slope and " B " in f" {slope} "
    assert "0.12 mm" in by_topic["shaft.gear_deflection"][0]["text"]
    # dynamics: operating speed against the first critical speed, all three cases named
    crit = by_topic["shaft.critical_speed"][0]["text"]
    assert "960 rpm" in crit and "9600 rpm" in crit and "first critical 12 000 rpm" in crit
    assert "rated, light, peak" in crit
    # every governing line has its value, its limit and a one-line source
    for r in rows:
        assert re.search(r"[≥≤] ", r["text"]), r["text"]
        assert "source:" in r["text"], r["text"]


def test_summary_puts_failing_and_watch_first(client, monkeypatch):
    rows = _summary_rows(_post(client, monkeypatch))
    statuses = [_status(r) for r in rows]
    assert statuses[0] == "fail" and statuses[1] == "warn"
    assert statuses == sorted(statuses, key=RANK.get)
    assert rows[0]["attrs"]["data-topic"] == "bearing.life" and "T-40-A" in rows[0]["text"]


def test_checks_grouped_by_family_failing_first_everywhere(client, monkeypatch):
    body = _post(client, monkeypatch)
    rows = _check_rows(body)
    fams = []
    for r in rows:
        f = _family_of(r)
        if f not in fams:
            fams.append(f)
    # families with a failing check first, then watch; ties in the fixed order
    assert fams == ["bearings", "stiffness", "strength", "dynamics", "other"]
    # inside each family: failing first, then watch, then by margin (smallest first)
    for f in fams:
        st = [_status(r) for r in rows if _family_of(r) == f]
        assert st == sorted(st, key=RANK.get), (f, st)
    strength = [r["text"] for r in rows if _family_of(r) == "strength"]
    assert "fatigue safety 2.1" in strength[0], "the smallest margin leads its family"
    # the code goes to its family
    codes = {r["attrs"]["data-code"]: _family_of(r) for r in rows}
    assert codes["bearing.life"] == codes["bearing.static"] == "bearings"
    assert codes["shaft.fatigue"] == codes["shaft.yield"] == "strength"
    assert codes["shaft.bearing_slope"] == codes["shaft.gear_deflection"] == "stiffness"
    assert codes["shaft.critical_speed"] == "dynamics" and codes["assembly.clearance"] == "other"


def test_worst_of_each_family_shown_rest_folded(client, monkeypatch):
    body = _post(client, monkeypatch)
    rows = _check_rows(body)
    for f in ("bearings", "stiffness", "strength"):
        fam = [r for r in rows if _family_of(r) == f]
        shown = [r for r in fam if not r["folded"]]
        folded = [r for r in fam if r["folded"]]
        bad = [r for r in fam if _status(r) != "ok"]
        assert shown == (bad or fam[:1]), f
        assert folded == fam[len(shown):], f
        assert all(_status(r) == "ok" for r in folded)
    # the fold is a native <details>/<summary>: it opens with Enter or Space
    assert re.search(r'<details class="more" id="more-strength">\s*<summary>4 more shaft strength checks, all passing</summary>', body)


def test_identical_checks_across_cases_shown_once_with_cases(client, monkeypatch):
    rows = _check_rows(_post(client, monkeypatch))
    crit = [r for r in rows if r["attrs"]["data-code"] == "shaft.critical_speed"]
    assert len(crit) == 1
    assert "rated, light, peak" in crit[0]["text"], "cases in the design's order"
    body = _post(client, monkeypatch)
    assert "2 identical across load cases shown once" in body


def test_value_limit_and_source_beside_every_check(client, monkeypatch):
    body = _post(client, monkeypatch)
    text = body.replace("\u202f", " ")
    assert "ISO 281:2007 cl. 7.1" in text and "30 000 h" in text
    rows = _check_rows(body)
    life = next(r for r in rows if r["attrs"]["data-code"] == "bearing.life")
    assert "4100 h" in life["text"] and "≥ 30 000 h" in life["text"]
    # the long source: one line (its first clause), the full text on expand (<details>)
    assert "source: ISO 281:2007 cl. 7.1, L10 = (C/P)^p (as recalled; verify) …" in life["text"]
    assert re.search(r'<details class="src"><summary><span class="sr">source: </span>ISO 281:2007 cl\. 7\.1, L10 = '
                     r'\(C/P\)\^p \(as recalled; verify\) …</summary><p>' + re.escape(html.escape(LONG_SOURCE, quote=False))
                     + r'</p></details>', body)
    # a short source is shown whole, with nothing to expand
    assert '<span class="src" title="common practice"><span class="sr">source: </span>common practice</span>' in body


def test_bearings_and_candidates_listed(client, monkeypatch):
    body = _post(client, monkeypatch)
    assert "T-40-A" in body and "meets all" in body
    assert "rating life 4100 h is below the required 30000 h" in body
    assert re.search(r'<details class="bearing" id="brg-A">', body)
    assert "first choice <strong>T-40-A</strong>" in body


def test_panel_in_us_units_converts_check_values(client, monkeypatch):
    body = _post(client, monkeypatch, "us")
    # 0.13 mm limit shown in inches: 0.13 / 25.4 = 0.005118 in (4 significant figures)
    assert "0.005118 in" in body
    # 0.0007 rad is a slope: the same in both systems
    assert "0.0007 rad" in body
    # the section's place along the shaft too: x = 30 mm is 30 / 25.4 = 1.181 in
    fat = next(r for r in _summary_rows(body) if r["attrs"]["data-topic"] == "shaft.fatigue")
    assert "x = 1.181 in" in fat["text"] and "x = 30 mm" not in fat["text"]


def test_demo_design_summary_is_compact(client):
    """On the real demo design: every topic in the summary once per support or shaft, the
    critical-speed checks of the three cases merged, sections of the demo named."""
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design()))
    assert r.status_code == 200
    rows = _summary_rows(r.text)
    topics = [x["attrs"]["data-topic"] for x in rows]
    for t in ("bearing.life", "bearing.static", "shaft.fatigue", "shaft.yield", "shaft.bearing_slope",
              "shaft.gear_deflection", "shaft.critical_speed"):
        assert t in topics, t
    assert topics.count("bearing.life") == 2 and topics.count("bearing.static") == 2
    # one row per topic and subject: the bearing topics once per support, the others once
    # (issues 12 and 13 added the mounting, twist and minimum-load topics: 14 rows here)
    bearing_topics = {t for t in topics if t.startswith("bearing.")}
    n_supports = topics.count("bearing.life")
    assert len(rows) == len(set(topics) - bearing_topics) + n_supports * len(bearing_topics) <= 14
    crit = _check_rows(r.text)
    assert sum(1 for x in crit if x["attrs"]["data-code"] == "shaft.critical_speed") == 1
    assert 'id="results-detail"' in r.text and 'hx-swap-oob="true"' in r.text


def test_engine_error_keeps_page_and_names_path(client, monkeypatch):
    def boom(d):
        raise engine.EngineError.at("supports[0].axial", "no support takes the axial force")
    monkeypatch.setattr(pages, "_solve", boom)
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design()))
    assert r.status_code == 422
    assert "m-supports-0-axial" in r.text and 'id="drawing"' in r.text
    assert 'id="results"' not in r.text and 'id="results-detail"' not in r.text, "last good results stay"


def test_unexpected_engine_fault_is_a_message_not_a_crash(client, monkeypatch):
    def boom(d):
        raise ZeroDivisionError("float division by zero")
    monkeypatch.setattr(pages, "_solve", boom)
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design()))
    assert r.status_code == 422
    assert "could not solve" in r.text


def test_bearing_rows_show_their_seat_fits(client):
    """Issue 12: each bearing's proposed ISO 286 fits in its row of the results."""
    r = client.post("/editor/solve", data=web.design_to_form(pages.demo_design()))
    assert r.status_code == 200
    import re
    rows = re.findall(r'<details class="bearing" id="brg-([^"]+)">\s*<summary>(.*?)</summary>', r.text, re.S)
    assert [sid for sid, _ in rows] == ["A", "B"]
    for _, summary in rows:
        assert re.search(r"fits: shaft <strong>[a-z]+\d</strong>, housing <strong>[A-Z]+\d</strong>", summary)
    assert "fits: shaft <strong>k5</strong>, housing <strong>H7</strong>" in rows[0][1]
