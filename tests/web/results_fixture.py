"""A hand-made set of checks and bearings for the results-column tests.

Not computed values: a fixture of the result format (invented numbers), so that the summary
and the grouping are tested whatever the engine returns today. The governing item of each
topic is known by construction (see the comments), and the load-case names are those of the
demo design (rated, light, peak).
"""
from __future__ import annotations

from html.parser import HTMLParser

from engine.result import BearingResult, Candidate, Check

__all__ = ["LONG_SOURCE", "fixture_checks", "fixture_bearings", "with_fixture", "parse_rows"]

LONG_SOURCE = ("ISO 281:2007 cl. 7.1, L10 = (C/P)^p (as recalled; verify); ISO 281:2007 cl. 7.2 Table 12 a1 "
               "(values as recalled; verify against the standard); Palmgren–Miner rule over the duty cycle")
SHIGLEY_FATIGUE = "Shigley 9th ed. Eq. 7-7 (DE–Goodman)"


def _c(code, status, message, value, limit, unit="", where="", load_case="", source="common practice"):
    return Check(code=code, status=status, message=message, value=value, limit=limit, unit=unit,
                 where=where, load_case=load_case, source=source)


def fixture_checks() -> list[Check]:
    """Checks in a deliberately scrambled order (the page must sort them)."""
    return [
        _c("shaft.fatigue", "ok", "fatigue safety 3.2 at x = 60 mm", 3.2, 1.5, where="x = 60 mm (shoulder 40/32 mm, r 1 mm)",
           load_case="peak", source=SHIGLEY_FATIGUE),
        # the lowest fatigue safety: governs shaft strength (fatigue)
        _c("shaft.fatigue", "ok", "fatigue safety 2.1 at x = 30 mm", 2.1, 1.5,
           where="x = 30 mm (seat of P1 (end-milled keyway))", load_case="peak", source=SHIGLEY_FATIGUE),
        _c("shaft.fatigue", "ok", "fatigue safety 6.0 at x = 90 mm", 6.0, 1.5, where="x = 90 mm (shoulder 46/40 mm, r 1.5 mm)",
           load_case="rated", source=SHIGLEY_FATIGUE),
        _c("shaft.yield", "ok", "first-cycle yield safety 8 at x = 60 mm", 8.0, 1.5, where="x = 60 mm (shoulder 40/32 mm, r 1 mm)",
           load_case="peak", source="Shigley 9th ed. Eq. 7-15"),
        # governs yield
        _c("shaft.yield", "ok", "first-cycle yield safety 5 at x = 30 mm", 5.0, 1.5,
           where="x = 30 mm (seat of P1 (end-milled keyway))", load_case="peak", source="Shigley 9th ed. Eq. 7-15"),
        # A has the larger slope, but B is nearer its (tighter) limit: B governs (margin 0.125 vs 0.775)
        _c("shaft.bearing_slope", "ok", "slope 0.0009 rad at bearing A", 0.0009, 0.004, "rad", "A", "peak",
           "Shigley 9th ed. Table 7-2 (memory)"),
        _c("shaft.bearing_slope", "ok", "slope 0.0007 rad at bearing B", 0.0007, 0.0008, "rad", "B", "peak",
           "Shigley 9th ed. Table 7-2 (memory)"),
        _c("shaft.gear_deflection", "warn", "deflection at gear G1 near its limit", 0.12, 0.13, "mm", "G1", "peak",
           "Shigley 9th ed. Table 7-2 (memory)"),
        _c("bearing.static", "ok", "A T-40-A: static safety s0 = 9", 9.0, 1.5, where="A", load_case="peak",
           source="ISO 76:2006 cl. 6; s0 = C0/P0"),
        _c("bearing.life", "fail", "A T-40-A: modified life 4100 h against 30000 h required", 4100.0, 30000.0, "h", "A",
           source=LONG_SOURCE),
        _c("bearing.life", "ok", "B T-40-C: modified life 90000 h against 30000 h required", 90000.0, 30000.0, "h", "B",
           source=LONG_SOURCE),
        # identical in the three cases: one row listing them
        *[_c("shaft.critical_speed", "ok", "960 rpm is at least 20 % below the first critical speed 12000 rpm",
             960.0, 9600.0, "rpm", "shaft", n, "common practice (memory)") for n in ("peak", "rated", "light")],
        _c("assembly.clearance", "ok", "an invented check of no known family", 2.0, 1.0, where="G1"),
    ]


def fixture_bearings() -> list[BearingResult]:
    def cand(des, L10, Lnm, ok):
        return Candidate(designation=des, d_mm=40, D_mm=80, B_mm=18, C_N=30000, C0_N=19000, L10_h=L10, Lnm_h=Lnm,
                         s0=9.0, ok=ok, reasons=[] if ok else ["rating life 4100 h is below the required 30000 h"])
    return [
        BearingResult(id="A", bearing_type="deep_groove_ball", bore_mm=40, equivalent_load_N=2100.0, required_C_N=15400.0,
                      arrangement="locating", life_method="basic rating life",
                      candidates=[cand("T-40-A", 3000.0, 4100.0, False), cand("T-40-B", 51000.0, 60000.0, True)]),
        BearingResult(id="B", bearing_type="cylindrical_roller", bore_mm=40, equivalent_load_N=900.0, required_C_N=8000.0,
                      arrangement="floating", life_method="basic rating life",
                      candidates=[cand("T-40-C", 90000.0, 90000.0, True)]),
    ]


def with_fixture(res):
    """The real result ``res`` with the fixture's checks and bearings in place of its own."""
    shaft = res.shaft.model_copy(update={"critical_speed_rpm": 12000.0})
    return res.model_copy(update={"checks": fixture_checks(), "bearings": fixture_bearings(), "shaft": shaft})


class _Rows(HTMLParser):
    """Collects every <tr> with its attributes, its text, and the ids and tags around it."""

    VOID = {"br", "col", "img", "input", "meta", "link", "hr", "wbr", "source"}

    def __init__(self):
        super().__init__()
        self.stack: list[tuple[str, dict]] = []
        self.rows: list[dict] = []
        self._row: dict | None = None

    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag == "tr":
            self._row = {"attrs": a, "text": "", "ancestors": [(t, x.get("id", ""), x.get("class", "")) for t, x in self.stack],
                         "titles": []}
            self.rows.append(self._row)
        if self._row is not None:
            self._row["text"] += " "  # block boundaries read as spaces
            if "title" in a:
                self._row["titles"].append(a["title"])
        if tag not in self.VOID:
            self.stack.append((tag, a))

    def handle_endtag(self, tag):
        if self._row is not None:
            self._row["text"] += " "
        if tag == "tr":
            self._row = None
        for i in range(len(self.stack) - 1, -1, -1):
            if self.stack[i][0] == tag:
                del self.stack[i:]
                break

    def handle_data(self, data):
        if self._row is not None:
            self._row["text"] += data


def parse_rows(html: str) -> list[dict]:
    """Every table row of ``html``: {"attrs", "text", "ancestors": [(tag, id, class)], "titles"}."""
    p = _Rows()
    p.feed(html)
    for r in p.rows:
        r["text"] = " ".join(r["text"].split())
        r["ids"] = [i for _, i, _ in r["ancestors"] if i]
        r["folded"] = any(t == "details" and "more" in c.split() for t, _, c in r["ancestors"])
    return p.rows
