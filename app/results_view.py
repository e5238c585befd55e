"""How the results column reads the checks: families, governing items, load cases merged.

The engine hands back one flat list of :class:`engine.result.Check` (about thirty for a
two-bearing shaft with three load cases). The page shows them as a designer reads them:

- :func:`results_view` builds a :class:`ResultsView`: the overall verdict, the *governing*
  check of each topic (bearing life and static safety per support with the chosen bearing,
  lowest fatigue and yield safety with their section, largest bearing slope against its limit,
  gear deflection and slope, running speed against the first critical speed), then every
  check grouped by family (:data:`FAMILIES`), failing first everywhere;
- :func:`merge_cases` shows a check that is identical in several load cases (same code,
  where, status, value and limit) once, with the cases listed;
- :func:`short_source` cuts a source to one line; the template keeps the full text on hover
  (``title``) and on expand (``<details>``).

"Governing" is the smallest relative margin, the same measure the engine sorts by
(``engine.checks.sort_checks``): value/limit − 1 for at-least checks (safety factors, lives),
1 − value/limit for at-most checks (slopes, deflections, speeds). Units are those of the
checks (SI-mm); the template converts for display. Pure functions of the result: no I/O.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from typing import Any, Iterable, Sequence

from engine.checks import AT_LEAST_CODES

__all__ = [
    "FAMILIES", "RANK", "family_of", "margin", "short_source", "short_where", "CheckRow",
    "Family", "Governing", "ResultsView", "merge_cases", "results_view",
]

FAMILIES: tuple[tuple[str, str], ...] = (
    ("bearings", "Bearings"), ("strength", "Shaft strength"), ("mounting", "Mounting"),
    ("stiffness", "Stiffness"), ("dynamics", "Dynamics"), ("other", "Other"),
)
_FAMILY_TITLE = dict(FAMILIES)
_FAMILY_ORDER = {k: i for i, (k, _) in enumerate(FAMILIES)}
RANK = {"fail": 0, "warn": 1, "ok": 2}
_STIFFNESS = {"shaft.bearing_slope", "shaft.gear_slope", "shaft.gear_deflection", "shaft.mesh_slope",
              "shaft.twist", "shaft.bevel_axial", "shaft.bevel_radial"}
_STRENGTH = {"shaft.fatigue", "shaft.yield"}
_DYNAMICS = {"shaft.critical_speed"}
SOURCE_CHARS = 64  # one line of the check column at 1440 px; narrower, CSS ends the line with "…"
SOURCE_PLAIN = 40  # sources up to this long fit one line at 1024 px: no need to expand them


def family_of(code: str) -> str:
    """Family key of a check code: ``bearing.*`` → bearings, fatigue and yield → strength,
    keys, press fits, seats and shoulders → mounting, slopes, deflections and twist → stiffness,
    critical speed → dynamics, anything else → other."""
    if code.startswith("bearing."):
        return "bearings"
    if code.startswith("mount."):
        return "mounting"
    if code in _STRENGTH:
        return "strength"
    if code in _STIFFNESS or code.endswith(("_slope", "_deflection")):
        return "stiffness"
    if code in _DYNAMICS or code.endswith(("critical_speed", "_frequency")):
        return "dynamics"
    return "other"


def margin(check: Any) -> float:
    """Relative margin of a check [-]: value/limit − 1 for at-least codes, 1 − value/limit
    otherwise; 0 when it has no value or no limit (same rule as ``engine.checks``)."""
    v, lim = check.value, check.limit
    if v is None or not lim or not math.isfinite(v):
        return 0.0
    return v / lim - 1.0 if check.code in AT_LEAST_CODES else 1.0 - v / lim


def _first_clause(text: str) -> str:
    """``text`` up to the first "; " outside parentheses."""
    start = 0
    while True:
        i = text.find("; ", start)
        if i < 0:
            return text
        head = text[:i]
        if head.count("(") <= head.count(")"):
            return head
        start = i + 2


def _drop_trailing_brackets(text: str) -> str:
    """``"Eq. 7-7 (DE–Goodman)"`` → ``"Eq. 7-7"``; unchanged when it does not end in ")"."""
    if not text.endswith(")"):
        return text
    depth = 0
    for i in range(len(text) - 1, -1, -1):
        depth += text[i] == ")"
        depth -= text[i] == "("
        if depth == 0:
            return text[:i].rstrip()
    return text


def short_source(text: str, n: int = SOURCE_CHARS) -> str:
    """One line of a source: its first clause (up to the first "; " outside brackets); when
    that is longer than ``n`` characters, without its closing bracketed remark, and failing
    that cut at a word boundary. An ellipsis marks anything left out; equal to ``text`` when
    nothing was.

    >>> short_source("ISO 76:2006 cl. 6 and Table 1 (values as recalled; verify); s0 = C0/P0")
    'ISO 76:2006 cl. 6 and Table 1 (values as recalled; verify) …'
    >>> short_source("Shigley, Mechanical Engineering Design, 9th ed., Table 7-2 (memory)")
    'Shigley, Mechanical Engineering Design, 9th ed., Table 7-2 …'
    >>> short_source("common practice")
    'common practice'
    """
    t = " ".join((text or "").split())
    head = _first_clause(t)
    if len(head) > n:
        bare = _drop_trailing_brackets(head)
        head = bare if bare and len(bare) <= n else (head[:n].rsplit(" ", 1)[0] or head[:n]).rstrip(",;:( ")
    return head if head == t else head + " …"


def short_where(where: str) -> str:
    """``"x = 60 mm (shoulder 40/32 mm, r 1 mm)"`` → ``"x = 60 mm"``; other places unchanged."""
    if where.startswith("x = ") and " (" in where:
        return where.split(" (", 1)[0]
    return where


_X_MM = re.compile(r"^x = (-?[0-9]+(?:\.[0-9]*)?(?:[eE][-+]?[0-9]+)?) mm\b")


def _key_number(v: float | None) -> float | None:
    if v is None or not math.isfinite(v) or v == 0:
        return v
    return round(v, 9 - int(math.floor(math.log10(abs(v)))))  # 10 significant figures


@dataclass(frozen=True)
class CheckRow:
    """One row of the checks tables: a check and the load cases it stands for."""

    check: Any
    cases: tuple[str, ...] = ()
    family: str = "other"
    margin: float = 0.0
    source_short: str = ""  # one line of the source (:func:`short_source`)
    source_cut: bool = False  # the line may leave something out: the page offers the full text

    @property
    def status(self) -> str:
        return self.check.status

    @property
    def code(self) -> str:
        return self.check.code

    @property
    def at_least(self) -> bool:
        """True when the value must reach the limit (safety factors, lives), False when it must
        stay below it."""
        return self.check.code in AT_LEAST_CODES

    @property
    def comparator(self) -> str:
        return "≥" if self.at_least else "≤"

    @property
    def where_short(self) -> str:
        return short_where(self.check.where)

    @property
    def x_mm(self) -> float | None:
        """Position along the shaft [mm] when the check's place is "x = … mm", else None (the
        page shows it in the display units)."""
        m = _X_MM.match(self.check.where)
        return float(m.group(1)) if m else None

    @property
    def sort_key(self) -> tuple[int, float]:
        return (RANK.get(self.status, 3), self.margin)


def merge_cases(checks: Iterable[Any], case_order: Sequence[str] = ()) -> list[CheckRow]:
    """Rows for ``checks``, one per distinct check: checks that agree in code, where, status,
    value, limit and unit (to 10 significant figures) but differ in load case become one row
    listing its cases (in ``case_order``, then as met). Order of first appearance is kept."""
    pos = {n: i for i, n in enumerate(case_order)}
    groups: dict[tuple, list[Any]] = {}
    for c in checks:
        key = (c.code, c.where, c.status, _key_number(c.value), _key_number(c.limit), c.unit,
               c.message if not c.load_case else "")
        groups.setdefault(key, []).append(c)
    rows = []
    for members in groups.values():
        cases = sorted({m.load_case for m in members if m.load_case},
                       key=lambda n: (pos.get(n, len(pos)), n))
        first = members[0]
        full = " ".join((first.source or "").split())
        short = short_source(full)
        rows.append(CheckRow(check=first, cases=tuple(cases), family=family_of(first.code),
                             margin=margin(first), source_short=short,
                             source_cut=short != full or len(full) > SOURCE_PLAIN))
    return rows


def _sorted(rows: Iterable[CheckRow]) -> list[CheckRow]:
    return sorted(rows, key=lambda r: r.sort_key)


@dataclass(frozen=True)
class Family:
    """One family of checks, its rows failing first and then by margin."""

    key: str
    title: str
    rows: tuple[CheckRow, ...]

    def count(self, status: str) -> int:
        return sum(1 for r in self.rows if r.status == status)

    @property
    def worst(self) -> str:
        return min((r.status for r in self.rows), key=lambda s: RANK.get(s, 3), default="ok")

    @property
    def shown(self) -> tuple[CheckRow, ...]:
        """Rows shown open: every failing and to-watch row, or the governing one if all pass."""
        bad = tuple(r for r in self.rows if r.status != "ok")
        return bad or self.rows[:1]

    @property
    def folded(self) -> tuple[CheckRow, ...]:
        return self.rows[len(self.shown):]


@dataclass(frozen=True)
class Governing:
    """One line of the summary: what is judged, the governing row and a figure beside it
    (``extra``: label, SI value, quantity name), e.g. ("L10", 25344.0, "time")."""

    topic: str
    label: str
    row: CheckRow
    where: str = ""
    detail: str = ""
    extra: tuple[str, float, str] | None = None

    @property
    def status(self) -> str:
        return self.row.status


@dataclass(frozen=True)
class ResultsView:
    rows: tuple[CheckRow, ...]
    families: tuple[Family, ...]
    governing: tuple[Governing, ...]
    n_checks: int = 0  # checks as the engine reported them, before merging
    counts: dict[str, int] = field(default_factory=dict)

    @property
    def verdict(self) -> str:
        if self.counts.get("fail"):
            return "fail"
        return "warn" if self.counts.get("warn") else "ok"

    @property
    def n_merged(self) -> int:
        """How many reported checks were folded into another row (identical across cases)."""
        return self.n_checks - len(self.rows)


def _first(rows: Sequence[CheckRow], codes: set[str], where: str | None = None) -> CheckRow | None:
    for r in rows:
        if r.code in codes and (where is None or r.check.where == where):
            return r
    return None


def _section_words(where: str) -> str:
    """``"x = 30 mm (seat of P1 (keyway))"`` → ``"seat of P1 (keyway)"``."""
    rest = where[len(short_where(where)):].strip()
    return rest[1:-1] if rest.startswith("(") and rest.endswith(")") else rest


def results_view(result: Any) -> ResultsView:
    """The results column's view of ``result`` (an :class:`engine.result.Result`)."""
    case_order = [c.name for c in result.load_cases]
    rows = _sorted(merge_cases(result.checks, case_order))
    counts = {s: sum(1 for r in rows if r.status == s) for s in ("fail", "warn", "ok")}

    fams = []
    for key, title in FAMILIES:
        members = tuple(r for r in rows if r.family == key)
        if members:
            fams.append(Family(key=key, title=title, rows=members))
    fams.sort(key=lambda f: (RANK.get(f.worst, 3), _FAMILY_ORDER[f.key]))

    gov: list[Governing] = []
    for b in result.bearings:
        chosen = next((c for c in b.candidates if c.designation == b.designation), b.candidates[0] if b.candidates else None)
        des = chosen.designation if chosen is not None else ""
        life = _first(rows, {"bearing.life"}, b.id)
        if life is not None:
            basic = chosen is not None and math.isclose(chosen.Lnm_h, chosen.L10_h, rel_tol=1e-9)
            label = "basic rating life L10" if basic else "modified rating life Lnm"
            extra = None if basic or chosen is None else ("L10", chosen.L10_h, "time")
            gov.append(Governing(topic="bearing.life", label=label, row=life, where=b.id, detail=des, extra=extra))
        static = _first(rows, {"bearing.static"}, b.id)
        if static is not None:
            gov.append(Governing(topic="bearing.static", label="static safety s0", row=static, where=b.id,
                                 detail=des))
    for codes, topic, label in (({"shaft.fatigue"}, "shaft.fatigue", "lowest fatigue safety"),
                                ({"shaft.yield"}, "shaft.yield", "lowest yield safety"),
                                ({"shaft.bearing_slope"}, "shaft.bearing_slope", "bearing slope, nearest its limit"),
                                ({"shaft.gear_deflection"}, "shaft.gear_deflection", "largest deflection at a gear"),
                                ({"shaft.gear_slope", "shaft.mesh_slope"}, "shaft.gear_slope", "largest slope at a gear")):
        r = _first(rows, codes)
        if r is not None:
            section = _section_words(r.check.where) if topic in ("shaft.fatigue", "shaft.yield") else ""
            gov.append(Governing(topic=topic, label=label, row=r, where=r.where_short, detail=section))
    twist = _first(rows, {"shaft.twist"})
    if twist is not None:
        gov.append(Governing(topic="shaft.twist", label="largest twist per metre", row=twist,
                             where=twist.check.where))
    mount = [r for r in rows if r.family == "mounting"]
    if mount:  # the weakest mounting check stands for its family; the rest are one click away
        worst = mount[0]
        more = sum(1 for r in mount[1:] if r.status != "ok")
        gov.append(Governing(topic="mounting", label=worst.check.message, row=worst, where=worst.where_short,
                             detail=(f"and {more} more mounting check{'s' if more > 1 else ''} "
                                     f"{'fail or ' if any(r.status == 'fail' for r in mount[1:]) else ''}"
                                     "to watch" if more else "")))
    crit = _first(rows, {"shaft.critical_speed"})
    if crit is not None:
        n_c = getattr(result.shaft, "critical_speed_rpm", None)
        gov.append(Governing(topic="shaft.critical_speed", label="operating speed vs first critical speed",
                             row=crit,
                             extra=("first critical", n_c, "speed") if n_c else None))
    covered = {id(g.row) for g in gov} | {id(r) for r in mount}
    for r in rows:  # everything else that fails or needs watching is named at the top as well
        if r.status != "ok" and id(r) not in covered:
            gov.append(Governing(topic=r.code, label=r.check.message, row=r, where=r.where_short))
    gov.sort(key=lambda g: RANK.get(g.status, 3))  # stable: failing first, topics in order
    return ResultsView(rows=tuple(rows), families=tuple(fams), governing=tuple(gov),
                       n_checks=len(result.checks), counts=counts)
