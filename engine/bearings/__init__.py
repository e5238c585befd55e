"""Bearing layer: axial resolution, equivalent loads, rating life, static safety, candidates.

Public entry points
-------------------
rate_bearings_many(designs, *, Fr_N, Fa_ext_N, catalogue=None) -> [BearingOutcome | EngineError]
    Called by ``engine.solve_many``: designs of one bearing layout are screened together,
    every support's rows over (variants × cases × rows) arrays. ``rate_bearings(design, …)``
    is the same for one design. In named steps: the life method (:func:`_life_method`), the
    first axial split, the screen, the refinement of an induced-force pair, the candidates,
    the checks, the result.
rate_bearings(design, *, Fr_N, Fa_ext_N, catalogue=None) -> BearingOutcome
    With the radial reactions of every support in every case and
    the net external axial force; returns the axial split, one ``BearingResult`` per support
    that has a bearing type, the checks and warnings.
resolve_axial(design, Fr_N, Fa_ext_N, *, Y_induced=None) -> AxialSplit
load_catalogue(path) -> Catalogue; parse_catalogue(text) -> Catalogue; bundled_catalogue()

Method (details and sources in the modules): for each support, every catalogue row of its
type (all bores, so the smallest passing bore of each series can be reported) is screened
over all load cases at once. Rows whose bore fits the seat are the candidates. Induced axial
forces of a cross-located angular contact / tapered pair depend on the row: a first pass uses
the median factor of the rows that fit each seat; the split is then recomputed with the two
top-ranked rows and those supports screened again (one refinement pass). The reported split
is that of the top-ranked rows.

The rated bearing of a support (the one its checks, notes and result rate) is the designer's
``supports[].designation`` when given (:func:`check_designations` refuses one that is not a
row of the table, of another type, or of another bore, at that key), else the first ranked
candidate; ``required_C_N`` is the rating that gives the required life at the stated
reliability with aISO = 1 under that bearing's duty-cycle equivalent load, and each candidate's
``C_margin_pct`` is measured against it. Minimum load, friction torque: engine.bearings.mounted.

Sign and units: N, mm, rpm, h. Nothing here writes files; the bundled table is read once.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any, Sequence

import numpy as np

from engine.bearings.axial import (DEFAULT_CONTACT_ANGLE_DEG, DEFAULT_TAPERED_Y, SOURCE_INDUCED,
                                   AxialSplit, check_contact_angles, induced_ratio, resolve_axial)
from engine.bearings.candidates import LIFE_CAP_H, Screen, rank, screen_rows, smallest_by_series
from engine.bearings.catalogue import (BUNDLED_PATH, Catalogue, bundled_catalogue, load_catalogue,
                                       parse_catalogue)
from engine.bearings.equivalent import INDUCED_TYPES, RADIAL_ONLY, SOURCE_P, SOURCE_P0
from engine.bearings.life import (SOURCE_A1, SOURCE_AISO, SOURCE_L10, SOURCE_MINER,
                                  SOURCE_WEIBULL, WEIBULL_B, WEIBULL_THETA, WEIBULL_X0, a1_iso,
                                  weibull_factor)
from engine.bearings.lubrication import SOURCE_NU1, SOURCE_VISCOSITY, viscosity_at
from engine.bearings.mounted import (SOURCE_FRICTION, SOURCE_MIN_LOAD, contact_tan, friction_torque_Nmm,
                                     minimum_load_ratio)
from engine.model import Design, DesignError, EngineError, Issue
from engine.result import BearingResult, Candidate, Check, SeriesMinimum

__all__ = ["BearingOutcome", "AxialSplit", "Catalogue", "rate_bearings", "rate_bearings_many", "resolve_axial",
           "load_catalogue", "parse_catalogue", "bundled_catalogue", "BUNDLED_PATH"]

_TYPE_WORDS = {"deep_groove_ball": "deep groove ball", "angular_contact_ball": "angular contact ball",
               "self_aligning_ball": "self-aligning ball", "cylindrical_roller": "cylindrical roller",
               "tapered_roller": "tapered roller", "spherical_roller": "spherical roller",
               "needle_roller": "needle roller"}
ILLUSTRATIVE = ("ratings of the bundled table are illustrative (ISO rating formulas from assumed "
                "internal geometry, no supplier's data): use your supplier's ratings for the final choice")


@dataclass(frozen=True)
class BearingOutcome:
    """What :func:`rate_bearings` returns."""

    split: AxialSplit
    bearings: list[BearingResult] = field(default_factory=list)
    checks: list[Check] = field(default_factory=list)
    warnings: list[str] = field(default_factory=list)
    # the rated bearing of each support (support index -> catalogue row), for the mounted
    # bearing's pressure centre and stiffness (engine.bearings.mounted); paired: a matched unit
    rated: dict[int, int] = field(default_factory=dict)
    paired: dict[int, bool] = field(default_factory=dict)
    rated_C_N: dict[int, float] = field(default_factory=dict)
    catalogue: Catalogue | None = None


def _fmt(v: float) -> str:
    if not np.isfinite(v):
        return "unbounded"
    return f"{v:,.0f}".replace(",", " ") if abs(v) >= 100 else f"{v:.3g}"


def _life_txt(c: Candidate, method: str) -> str:
    """The life part of a message; a life at the cap (P practically 0) is said to be one,
    not shown as a computed number of hours."""
    if c.Lnm_h >= LIFE_CAP_H:
        return "modified life above 10¹² h, not limited: the bearing carries practically no load"
    return f"modified life {_fmt(c.Lnm_h)} h (L10 {_fmt(c.L10_h)} h, {method.split(';')[0]})"


class _Support:
    """Per-support working data for one call."""

    def __init__(self, design: Design, i: int, cat: Catalogue):
        s = design.supports[i]
        self.i, self.s, self.kind = i, s, s.bearing_type
        self.bore = float(s.bore_mm if s.bore_mm is not None else design.shaft.diameter_at(s.x_mm))
        rows = cat.rows_of(self.kind)
        if s.dimension_series:
            rows = rows[np.isin(cat.series[rows], list(s.dimension_series))]
        if self.kind == "angular_contact_ball" and s.contact_angle_deg is not None:
            rows = rows[np.abs(cat.contact_angle_deg[rows] - s.contact_angle_deg) < 0.5]
        self.rows = rows
        self.fit = np.abs(cat.d_mm[rows] - self.bore) < 0.01  # positions into rows
        self.paired = s.axial == "both" and self.kind in INDUCED_TYPES
        hit = np.flatnonzero(cat.designation[rows] == s.designation) if s.designation else np.zeros(0, int)
        self.chosen = int(rows[hit[0]]) if hit.size else None  # catalogue row the designer chose

    def rated_pos(self, sc: Screen, order: np.ndarray) -> int | None:
        """Screened position of the bearing the checks rate: the designer's row, else the
        first ranked."""
        if self.chosen is not None:
            return int(np.flatnonzero(sc.idx == self.chosen)[0])
        return int(order[0]) if order.size else None

    def row_ratio(self, cat: Catalogue, rows: np.ndarray) -> np.ndarray:
        """S/Fr of catalogue rows for this support's type."""
        if self.kind == "tapered_roller":
            return 0.5 / cat.Y2[rows]
        if self.kind == "angular_contact_ball":
            return np.asarray(induced_ratio(self.kind, contact_angle_deg=cat.contact_angle_deg[rows]), float)
        return np.zeros(rows.size)

    def default_ratio(self, cat: Catalogue) -> float:
        if self.kind not in INDUCED_TYPES:
            return 0.0
        pick = self.rows[self.fit] if self.fit.any() else self.rows
        if pick.size:
            return float(np.median(self.row_ratio(cat, pick)))
        return float(induced_ratio(self.kind, Y=DEFAULT_TAPERED_Y,
                                   contact_angle_deg=self.s.contact_angle_deg or DEFAULT_CONTACT_ANGLE_DEG))


def _row_Fa(sp: _Support, split: AxialSplit, cat: Catalogue, Fr: np.ndarray, Ka: np.ndarray) -> np.ndarray:
    """Axial load per (row, case): row-refined for a member of an induced-force pair."""
    i = sp.i
    if split.pair is None or sp.kind not in INDUCED_TYPES or i not in split.pair or None in split.pair:
        return split.Fa_N[:, i][None, :]
    P, M = split.pair
    S_row = sp.row_ratio(cat, sp.rows)[:, None] * Fr[None, :, i]
    if i == P:
        return np.maximum(S_row, split.induced_N[None, :, M] + Ka[None, :])
    Fa_P = np.maximum(split.induced_N[None, :, P], S_row + Ka[None, :])
    return Fa_P - Ka[None, :]


@dataclass(frozen=True)
class _Life:
    """The life method of a design's requirements: reliability factor, its alternative, the
    lubricant's viscosity and the texts the messages use."""

    a_R: float
    a_other: float
    method: str
    other: str
    src_life: str
    nu: float | None
    ec: float | None
    warnings: tuple[str, ...]


def _life_method(design: Design) -> _Life:
    """Step 1: reliability factor (ISO 281 a1 or the textbook Weibull factor) and, when both
    lubricant and contamination are given, the operating viscosity for aISO."""
    req = design.requirements
    if req.reliability_method == "weibull":
        x0 = getattr(req, "weibull_x0", WEIBULL_X0)
        th = getattr(req, "weibull_theta", WEIBULL_THETA)
        b = getattr(req, "weibull_b", WEIBULL_B)
        a_R = float(weibull_factor(req.reliability_pct, x0=x0, theta=th, b=b))
        a_other = float(a1_iso(req.reliability_pct))
        method = (f"textbook Weibull factor {a_R:.3g} at R = {req.reliability_pct:g} % "
                  f"(x0 {x0:g}, θ {th:g}, b {b:g})")
        other = f"ISO 281 a1 = {a_other:.3g}"
        src_R = SOURCE_WEIBULL
    else:
        a_R = float(a1_iso(req.reliability_pct))
        a_other = float(weibull_factor(req.reliability_pct))
        method = f"ISO 281:2007 a1 = {a_R:.3g} at R = {req.reliability_pct:g} %"
        other = f"textbook Weibull factor {a_other:.3g}"
        src_R = SOURCE_A1
    warnings: list[str] = []
    nu = None
    ec = req.contamination_ec
    if req.lubricant is not None and ec is not None:
        lub = req.lubricant
        try:
            nu = float(viscosity_at(lub.operating_temp_C, iso_vg=lub.iso_vg,
                                    viscosity_index=lub.viscosity_index))
        except ValueError as exc:
            raise EngineError.at("requirements.lubricant.iso_vg", str(exc)) from None
        method += (f"; aISO from κ (ν = {nu:.3g} mm²/s at {lub.operating_temp_C:g} °C, VG {lub.iso_vg:g}, "
                   f"VI {lub.viscosity_index:g}) and ec = {ec:g}")
    elif (req.lubricant is None) != (ec is None):
        missing = "contamination_ec" if ec is None else "lubricant"
        warnings.append(f"requirements.{missing} is not given: the modified life uses aISO = 1 "
                        "(give both lubricant and contamination_ec for ISO 281's aISO)")
    src_life = "; ".join([SOURCE_L10, src_R] + ([SOURCE_AISO, SOURCE_NU1, SOURCE_VISCOSITY] if nu is not None else [])
                         + [SOURCE_MINER])
    return _Life(a_R, a_other, method, other, src_life, nu, ec, tuple(warnings))


def check_designations(design: Design, cat: Catalogue) -> None:
    """DesignError at ``supports[i].designation`` for a chosen bearing that is not a row of
    the table in use, is of another type or series, or whose bore does not fit the seat."""
    bad: list[Issue] = []
    for i, s in enumerate(design.supports):
        if not s.designation or s.bearing_type is None:
            continue
        hit = np.flatnonzero(cat.designation == s.designation)
        path = f"supports[{i}].designation"
        if not hit.size:
            bad.append(Issue(path=path, message=f"{s.id}: bearing '{s.designation}' is not in {cat.name}; "
                                                "choose one of the listed candidates or clear the choice"))
            continue
        r = int(hit[0])
        sp = _Support(design, i, cat)
        word = _TYPE_WORDS[s.bearing_type]
        if cat.bearing_type[r] != s.bearing_type:
            bad.append(Issue(path=path, message=f"{s.id}: '{s.designation}' is a "
                                                f"{_TYPE_WORDS.get(str(cat.bearing_type[r]), cat.bearing_type[r])} "
                                                f"bearing, not {word}"))
        elif abs(float(cat.d_mm[r]) - sp.bore) >= 0.01:
            bad.append(Issue(path=path, message=f"{s.id}: '{s.designation}' has bore {cat.d_mm[r]:g} mm; the "
                                                f"seat is {sp.bore:g} mm"))
        elif sp.chosen is None:
            bad.append(Issue(path=path, message=f"{s.id}: '{s.designation}' is outside the dimension series or "
                                                "contact angle this support asks for"))
    if bad:
        raise DesignError(bad)


def _layout_key(design: Design, cat: Catalogue) -> tuple:
    """Designs with equal keys have the same supports' rows, seats and roles, the same load
    case speeds and shares and the same requirements: their bearings are screened together."""
    return (id(cat), design.requirements.model_dump_json(),
            tuple((s.bearing_type, s.axial, tuple(s.dimension_series or ()), s.contact_angle_deg, s.designation,
                   s.bore_mm if s.bore_mm is not None else design.shaft.diameter_at(s.x_mm))
                  for s in design.supports),
            tuple((c.speed_rpm, c.time_fraction) for c in design.load_cases))


def _first_split(design: Design, sups: dict[int, _Support], cat: Catalogue, Fr: np.ndarray,
                 Ka: np.ndarray) -> tuple[np.ndarray, AxialSplit]:
    """Step 2: the axial split with each induced-force bearing's median factor of the rows
    that fit its seat."""
    ratio0 = np.zeros(len(design.supports))
    for i, sp in sups.items():
        ratio0[i] = sp.default_ratio(cat)
    return ratio0, resolve_axial(design, Fr, Ka, induced_ratios=ratio0)


def _screen(cat: Catalogue, sp: _Support, life: _Life, design: Design, Fr_i: np.ndarray, Fa: np.ndarray) -> Screen:
    """Step 3: every row of a support's type screened over every case (and every variant when
    ``Fr_i`` (V, nc) and ``Fa`` (V, 1 or rows, nc) carry a leading variant axis)."""
    req = design.requirements
    return screen_rows(cat, sp.rows, bearing_type=sp.kind, Fr_N=Fr_i, Fa_N=Fa,
                       speed_rpm=np.array([c.speed_rpm for c in design.load_cases], float),
                       time_fraction=np.array([c.time_fraction for c in design.load_cases], float),
                       life_h=req.life_h, a_R=life.a_R, s0_min=req.s0_min,
                       application_factor=float(req.application_factor), paired=sp.paired,
                       nu_mm2_s=life.nu, ec=life.ec)


def _variant(sc: Screen, v: int) -> Screen:
    """One variant's screen out of a screen over many (shared fields kept)."""
    shared = {"idx", "C_N", "C0_N", "limiting_speed_rpm", "n_max_rpm"}
    return Screen(**{f: (getattr(sc, f) if f in shared else getattr(sc, f)[v]) for f in Screen.__dataclass_fields__})


def _refine_pair(design: Design, sups: dict[int, _Support], cat: Catalogue, life: _Life, Fr: np.ndarray,
                 Ka: np.ndarray, ratio0: np.ndarray, split: AxialSplit, screens: dict, orders: dict) -> AxialSplit:
    """Step 4: for a cross-located induced-force pair, the split again with the two
    top-ranked rows' own factors, and those supports screened again (one pass)."""
    if split.pair is None or None in split.pair:
        return split
    members = [i for i in split.pair if i in sups and sups[i].kind in INDUCED_TYPES]
    if not members or not all(orders[i].size for i in members):
        return split
    ratio1 = ratio0.copy()
    for i in members:
        top = int(screens[i].idx[sups[i].rated_pos(screens[i], orders[i])])
        ratio1[i] = float(sups[i].row_ratio(cat, np.array([top]))[0])
    split = resolve_axial(design, Fr, Ka, induced_ratios=ratio1)
    for i in members:
        screens[i] = _screen(cat, sups[i], life, design, Fr[:, i], _row_Fa(sups[i], split, cat, Fr, Ka))
        orders[i] = rank(cat, screens[i], np.flatnonzero(sups[i].fit))
    return split


def _load_ratio(sc: Screen, pos: int, af: float) -> np.ndarray:
    """P/C per case of a screened row, the application factor taken out (the load it carries)."""
    return sc.P_N[pos] / af / sc.C_N[pos]


def _candidates(cat: Catalogue, sp: _Support, sc: Screen, order: np.ndarray, req, cases,
                required_C: float) -> list[Candidate]:
    """Step 5: the ranked candidates of one support with the reasons a row fails (and a
    light-load warning, which does not fail it), each with its margin on the required rating."""
    out: list[Candidate] = []
    lim = minimum_load_ratio(sp.kind)
    af = float(req.application_factor)
    for pos in order:
        r = sc.idx[pos]
        reasons = []
        if not sc.life_ok[pos]:
            reasons.append(f"life {_fmt(sc.Lnm_h[pos])} h < {_fmt(req.life_h)} h required")
        if not sc.static_ok[pos]:
            reasons.append(f"static safety s0 {sc.s0[pos]:.3g} < {req.s0_min:g}")
        if not sc.speed_ok[pos]:
            reasons.append(f"speed {_fmt(sc.n_max_rpm)} rpm > limiting {_fmt(sc.limiting_speed_rpm[pos])} rpm")
        ratio = _load_ratio(sc, pos, af)
        j = int(np.argmin(ratio))
        warns = []
        if ratio[j] < lim:
            warns.append(f"load P = {ratio[j]:.3g}·C in '{cases[j].name}' is below the minimum "
                           f"{lim:g}·C (the rolling elements may skid)")
        nl = cat.limiting_speed_rpm[r]
        out.append(Candidate(
            designation=str(cat.designation[r]) + (" (matched pair)" if sp.paired else ""),
            series=str(cat.series[r]), d_mm=float(cat.d_mm[r]), D_mm=float(cat.D_mm[r]),
            B_mm=float(cat.B_mm[r]), C_N=float(sc.C_N[pos]), C0_N=float(sc.C0_N[pos]),
            P_N=float(sc.Pm_N[pos]), L10_h=float(sc.L10_h[pos]), Lnm_h=float(sc.Lnm_h[pos]),
            s0=float(min(sc.s0[pos], LIFE_CAP_H)),
            limiting_speed_rpm=None if np.isnan(nl) else float(nl), ok=bool(sc.ok[pos]),
            reasons=reasons, warnings=warns,
            C_margin_pct=float((sc.C_N[pos] / required_C - 1.0) * 100.0) if required_C > 0 else None,
            da_min_mm=_given(cat.da_min_mm, r), Da_max_mm=_given(cat.Da_max_mm, r)))
    return out


def _given(column: np.ndarray, r: int) -> float | None:
    """An optional table column's value at row ``r`` (None where the table leaves it out)."""
    return float(column[r]) if r < len(column) and not np.isnan(column[r]) else None


def _support_checks(design: Design, i: int, sp: _Support, sc: Screen, order: np.ndarray, split: AxialSplit,
                    cands: list[Candidate], mins: list[SeriesMinimum], cat: Catalogue, life: _Life,
                    own_table: bool) -> list[Check]:
    """Step 6: the checks of one support: seat, life, static safety, speed, lubrication,
    candidates, axial load on a radial bearing, arrangement."""
    s, req, cases = sp.s, design.requirements, design.load_cases
    word = _TYPE_WORDS[sp.kind]
    where = s.id
    min_txt = ", ".join(f"series {m.series}: " + (f"d = {m.d_mm:g} mm" if m.d_mm is not None else "none")
                        for m in mins)
    top = sp.rated_pos(sc, order)
    checks: list[Check] = []
    if not sp.rows.size:
        checks.append(Check(code="bearing.seat", status="warn", where=where, source=cat.name,
                            message=f"{s.id}: the bearing table has no {word} rows"
                                    + (f" of series {', '.join(s.dimension_series)}" if s.dimension_series else "")
                                    + "; the bearing is not rated (load a table that has them)"))
    elif top is None:
        bores = np.unique(cat.d_mm[sp.rows])
        near = bores[np.argsort(np.abs(bores - sp.bore))[:3]]
        checks.append(Check(code="bearing.seat", status="fail", where=where, value=sp.bore,
                            unit="mm", source=cat.name,
                            message=f"{s.id}: no {word} bearing in the table has bore {sp.bore:g} mm "
                                    f"(nearest: {', '.join(f'{b:g}' for b in sorted(near))} mm); change the "
                                    f"seat diameter or set supports[{i}].bore_mm"
                                    + (f"; smallest that passes: {min_txt}" if mins else "")))
    if top is not None:
        c = cands[[int(p) for p in order].index(top)]
        life_status = "ok" if sc.life_ok[top] else "fail"
        checks.append(Check(code="bearing.life", status=life_status, where=where, value=c.Lnm_h,
                            limit=req.life_h, unit="h", source=life.src_life,
                            message=f"{s.id} {c.designation}: {_life_txt(c, life.method)} against "
                                    f"{_fmt(req.life_h)} h required"))
        wc = int(sc.worst_static_case[top])
        checks.append(Check(code="bearing.static", status="ok" if sc.static_ok[top] else "fail",
                            where=where, value=c.s0, limit=req.s0_min, unit="",
                            load_case=cases[wc].name, source=SOURCE_P0 + "; s0 = C0/P0",
                            message=f"{s.id} {c.designation}: static safety "
                                    + ("not limited (the bearing carries no load) " if c.s0 >= LIFE_CAP_H
                                       else f"s0 = {c.s0:.3g} ") +
                                    f"(P0 = {_fmt(sc.P0_N[top, wc])} N in '{cases[wc].name}')"))
        nl = sc.limiting_speed_rpm[top]
        if np.isnan(nl):
            checks.append(Check(code="bearing.speed", status="warn", where=where, value=sc.n_max_rpm,
                                unit="rpm", source=cat.name,
                                message=f"{s.id} {c.designation}: no limiting speed in the table; speed not checked"))
        else:
            checks.append(Check(code="bearing.speed", status="ok" if sc.speed_ok[top] else "fail",
                                where=where, value=sc.n_max_rpm, limit=float(nl), unit="rpm",
                                source=f"{cat.name}, limiting speed of the row"
                                       + (" (n·dm rule for grease, common practice)" if not own_table else ""),
                                message=f"{s.id} {c.designation}: highest speed {_fmt(sc.n_max_rpm)} rpm "
                                        f"against limiting {_fmt(nl)} rpm"))
        if life.nu is not None:
            km = float(sc.kappa_min[top])
            st = "ok" if km >= 1.0 else "warn"
            msg = f"{s.id}: viscosity ratio κ = {km:.3g} (lowest over the cases)"
            if km < 0.1:
                msg += "; below 0.1 ISO 281's aISO does not apply (evaluated at κ = 0.1): use a thicker oil"
            elif km < 1.0:
                msg += "; below 1 the film is thin and aISO lowers the life"
            checks.append(Check(code="bearing.lubrication", status=st, where=where, value=km, limit=1.0,
                                source=SOURCE_NU1 + "; " + SOURCE_VISCOSITY, message=msg))
        lim = minimum_load_ratio(sp.kind)
        ratio = _load_ratio(sc, top, float(req.application_factor))
        low = [j for j in range(len(cases)) if ratio[j] < lim]
        for j in low or [int(np.argmin(ratio))]:
            light = ratio[j] < lim
            checks.append(Check(code="bearing.min_load", status="warn" if light else "ok", where=where,
                                value=float(ratio[j]), limit=lim, unit="·C", load_case=cases[j].name,
                                source=SOURCE_MIN_LOAD,
                                message=f"{s.id} {c.designation}: load P = {ratio[j]:.3g}·C in '{cases[j].name}'"
                                        + (f", below the minimum {lim:g}·C of a {word} bearing: lightly loaded "
                                           "rolling elements skid and smear; load it more, choose a smaller "
                                           "bearing, or preload it" if light else
                                           f" (lowest over the cases), above the minimum {lim:g}·C")))
        if not sc.ok[order].any():
            checks.append(Check(code="bearing.candidates", status="fail", where=where,
                                value=float(sp.bore), unit="mm", source=cat.name,
                                message=f"{s.id}: no {word} bearing with bore {sp.bore:g} mm meets every "
                                        f"requirement; smallest bore that does: {min_txt}"))
    if sp.kind in RADIAL_ONLY:
        Fa_max = float(np.max(split.Fa_N[:, i])) if split.Fa_N.size else 0.0
        if Fa_max > 1e-6:
            checks.append(Check(code="bearing.axial_on_radial", status="warn", where=where,
                                value=Fa_max, limit=0.0, unit="N", source=SOURCE_P,
                                message=f"{s.id}: a {word} bearing is given {_fmt(Fa_max)} N axial load; "
                                        "its rating life takes P = Fr only (ISO 281 rates it radial "
                                        "only): check the ribs' axial capacity with the supplier, or let "
                                        "another support locate"))
    if s.bearing_type in INDUCED_TYPES and s.axial == "none":
        checks.append(Check(code="bearing.arrangement", status="warn", where=where, source=SOURCE_INDUCED,
                            message=f"{s.id}: a single {word} bearing cannot float: its induced axial "
                                    "force needs an opposed bearing ('+x'/'-x' pair) or a matched pair ('both')"))
    return checks


def _friction(design: Design, sp: _Support, sc: Screen, pos: int, cat: Catalogue, life: _Life,
              Fr: np.ndarray) -> tuple[np.ndarray, np.ndarray, str]:
    """Palmgren friction torque [N·mm] and power loss [W] of the rated row per case, and the note."""
    req, cases = design.requirements, design.load_cases
    r = int(sc.idx[pos])
    n = np.array([c.speed_rpm for c in cases], float)
    dm = 0.5 * (float(cat.d_mm[r]) + float(cat.D_mm[r]))
    if life.nu is not None:
        nu, how = life.nu, f"ν = {life.nu:.3g} mm²/s"
    elif req.lubricant is not None:
        lub = req.lubricant
        try:
            nu = float(viscosity_at(lub.operating_temp_C, iso_vg=lub.iso_vg, viscosity_index=lub.viscosity_index))
            how = f"ν = {nu:.3g} mm²/s"
        except ValueError:
            nu, how = None, "the lubricant's viscosity lies outside the viscosity relation"
    else:
        nu, how = None, "no lubricant given"
    if nu is None:
        nu = float(viscosity_at(70.0, iso_vg=68.0))
        how = f"ν = {nu:.3g} mm²/s assumed, ISO VG 68 at 70 °C ({how})"
    af = float(req.application_factor)
    M = friction_torque_Nmm(sp.kind, dm_mm=dm, speed_rpm=n, nu_mm2_s=nu, Fr_N=Fr[:, sp.i], Fa_N=sc.Fa_N[pos],
                            P0_N=sc.P0_N[pos] / af, C0_N=float(sc.C0_N[pos]),
                            Y2=float(cat.Y2[r]) if np.isfinite(cat.Y2[r]) else None,
                            tan_alpha=contact_tan(cat, r)) * (2.0 if sp.paired else 1.0)
    W = M * 1e-3 * n * 2.0 * np.pi / 60.0
    note = (f"friction torque {', '.join(f'{m / 1e3:.3g}' for m in M)} N·m and power loss "
            f"{', '.join(f'{w:.3g}' for w in W)} W per case ({how}; {SOURCE_FRICTION})")
    return M, W, note


def _bearing_result(design: Design, i: int, sp: _Support, sc: Screen, order: np.ndarray, split: AxialSplit,
                    cat: Catalogue, life: _Life, Fr: np.ndarray, own_table: bool) -> tuple[BearingResult, list[Check]]:
    """Steps 5–7 for one support: candidates, smallest bore per series, checks, notes and
    the BearingResult."""
    s, req = sp.s, design.requirements
    top = sp.rated_pos(sc, order)
    notes = [f"life method: {life.method}; for comparison {life.other}"]
    if top is not None:
        alt = float(sc.Lnm_h[top]) * life.a_other / life.a_R
        notes[0] += f" (it would give {_fmt(alt)} h for {cat.designation[sc.idx[top]]})"
    notes.append(f"application factor {float(req.application_factor):g} applied to Fr and Fa for P and P0")
    if not own_table:
        notes.append(ILLUSTRATIVE)
    if sp.paired:
        notes.append("matched pair at one position: C × 2^0.7 (ball) or 2^(7/9) (roller), C0 and Cu × 2, "
                     "pair load factors (ISO 281 cl. 6.1, 6.2)")
    if s.bearing_type in INDUCED_TYPES and split.pair and i in split.pair:
        notes.append(SOURCE_INDUCED)
    req_C = float(sc.required_C1_N[top]) if top is not None else 0.0
    req_C_aiso = float(sc.required_C_N[top]) if top is not None and life.nu is not None else None
    cands = _candidates(cat, sp, sc, order, req, design.load_cases, req_C)
    series_list = list(s.dimension_series) if s.dimension_series else sorted(set(cat.series[sp.rows]))
    mins = [SeriesMinimum(series=ser, d_mm=None if pos is None else float(cat.d_mm[sc.idx[pos]]),
                          designation=None if pos is None else str(cat.designation[sc.idx[pos]]))
            for ser, pos in smallest_by_series(cat, sc, series_list)]
    checks = _support_checks(design, i, sp, sc, order, split, cands, mins, cat, life, own_table)
    Fa_rep = np.broadcast_to(sc.Fa_N[top] if top is not None else split.Fa_N[:, i], (len(design.load_cases),))
    extra: dict[str, Any] = {}
    if top is not None:
        c = cands[[int(p) for p in order].index(top)]
        who = "designer" if sp.chosen is not None else "ranking"
        notes.append(f"rated bearing {c.designation}, chosen by the {who}"
                     + ("" if sp.chosen is None or top == order[0] else
                        f" (the ranking would put {cands[0].designation} first)"))
        notes.append(f"required C = {_fmt(req_C)} N with aISO = 1 (ISO 281 L10 at the stated reliability, "
                     f"duty-cycle equivalent load of {c.designation})"
                     + (f"; {_fmt(req_C_aiso)} N with {c.designation}'s typical aISO at the stated lubrication"
                        if req_C_aiso is not None else ""))
        M, W, fnote = _friction(design, sp, sc, top, cat, life, Fr)
        notes.append(fnote)
        extra = dict(designation=c.designation, chosen_by=who, required_C_aiso_N=req_C_aiso,
                     min_load_ratio=[float(v) for v in _load_ratio(sc, top, float(req.application_factor))],
                     friction_torque_Nm=[float(v) / 1e3 for v in M], power_loss_W=[float(v) for v in W])
    return BearingResult(
        id=s.id, bearing_type=sp.kind, bore_mm=sp.bore,
        equivalent_load_N=float(sc.Pm_N[top]) if top is not None else 0.0,
        required_C_N=req_C,
        life_method=life.method, arrangement=f"{split.roles[i]}; {split.arrangement}",
        Fr_N=[float(v) for v in Fr[:, i]], Fa_N=[float(v) for v in Fa_rep],
        candidates=cands, smallest_by_series=mins, notes=notes, **extra), checks


def _rate_group(designs: Sequence[Design], Frs: Sequence[np.ndarray], Kas: Sequence[np.ndarray], cat: Catalogue,
                own_table: bool, life: _Life) -> list[BearingOutcome | EngineError]:
    """Designs of one bearing layout (:func:`_layout_key`): the axial split of each, then every
    support's rows screened over (variants × cases × rows) at once, then per design the
    refinement of an induced-force pair, the candidates, checks and results."""
    d0 = designs[0]
    sups = {i: _Support(d0, i, cat) for i, s in enumerate(d0.supports) if s.bearing_type is not None}
    splits: list[Any] = []
    for d, Fr, Ka in zip(designs, Frs, Kas):
        try:
            splits.append(_first_split(d, sups, cat, Fr, Ka))
        except EngineError as exc:
            splits.append(exc)
    live = [v for v, sp in enumerate(splits) if not isinstance(sp, EngineError)]
    screens_all: dict[int, Screen] = {}
    if live:
        Fr_st = np.stack([Frs[v] for v in live])  # (V, nc, ns)
        for i, sp in sups.items():
            Fa = [_row_Fa(sp, splits[v][1], cat, Frs[v], Kas[v]) for v in live]
            width = max(f.shape[0] for f in Fa)
            Fa_st = np.stack([np.broadcast_to(f, (width, f.shape[1])) for f in Fa])
            screens_all[i] = _screen(cat, sp, life, d0, Fr_st[:, :, i], Fa_st)
    out: list[BearingOutcome | EngineError] = []
    for v, (d, Fr, Ka, sp_v) in enumerate(zip(designs, Frs, Kas, splits)):
        if isinstance(sp_v, EngineError):
            out.append(sp_v)
            continue
        ratio0, split = sp_v
        k = live.index(v)
        screens = {i: _variant(sc, k) for i, sc in screens_all.items()}
        orders = {i: rank(cat, screens[i], np.flatnonzero(sp.fit)) for i, sp in sups.items()}
        try:
            split = _refine_pair(d, sups, cat, life, Fr, Ka, ratio0, split, screens, orders)
        except EngineError as exc:
            out.append(exc)
            continue
        results, checks, rated, rated_C = [], [], {}, {}
        for i, sp in sups.items():
            br, ch = _bearing_result(d, i, sp, screens[i], orders[i], split, cat, life, Fr, own_table)
            results.append(br)
            checks += ch
            pos = sp.rated_pos(screens[i], orders[i])
            if pos is not None:
                rated[i], rated_C[i] = int(screens[i].idx[pos]), float(screens[i].C_N[pos])
        out.append(BearingOutcome(split=split, bearings=results, checks=checks,
                                  warnings=list(split.warnings) + list(cat.warnings) + list(life.warnings),
                                  rated=rated, paired={i: sp.paired for i, sp in sups.items()},
                                  rated_C_N=rated_C, catalogue=cat))
    return out


def rate_bearings_many(designs: Sequence[Design], *, Fr_N: Sequence[np.ndarray], Fa_ext_N: Sequence[np.ndarray],
                       catalogue: Catalogue | None = None) -> list[BearingOutcome | EngineError]:
    """:func:`rate_bearings` of many designs (``engine.solve_many``): one BearingOutcome, or the
    EngineError the design raised, each. Designs of one bearing layout are screened together,
    every support's rows over (variants × cases × rows) arrays."""
    cat = bundled_catalogue() if catalogue is None else catalogue
    out: list[Any] = [None] * len(designs)
    groups: dict[tuple, list[int]] = {}
    lives: dict[int, _Life] = {}
    for k, d in enumerate(designs):
        try:
            check_contact_angles(d)  # before the first-pass induced ratios look the angle up
            check_designations(d, cat)
            lives[k] = _life_method(d)
        except (EngineError, DesignError) as exc:
            out[k] = exc
            continue
        groups.setdefault(_layout_key(d, cat), []).append(k)
    for ks in groups.values():
        Frs = [np.atleast_2d(np.asarray(Fr_N[k], float)) for k in ks]
        Kas = [np.asarray(Fa_ext_N[k], float).reshape(-1) for k in ks]
        for k, r in zip(ks, _rate_group([designs[k] for k in ks], Frs, Kas, cat, catalogue is not None,
                                        lives[ks[0]])):
            out[k] = r
    return out


def rate_bearings(design: Design, *, Fr_N: np.ndarray, Fa_ext_N: np.ndarray,
                  catalogue: Catalogue | None = None) -> BearingOutcome:
    """Rate the bearings of a design: axial split, lives, static safety, ranked candidates
    (:func:`rate_bearings_many` of one design).

    Parameters
    ----------
    design : engine.model.Design
    Fr_N : ndarray (n_cases, n_supports)
        Radial reaction magnitude of every support in every load case, [N]
    Fa_ext_N : ndarray (n_cases,)
        Net external axial force on the shaft along +x, [N]
    catalogue : Catalogue, optional
        Bearing table; default the bundled illustrative table

    Returns
    -------
    BearingOutcome
        ``split`` (AxialSplit), ``bearings`` (one BearingResult per support with a bearing
        type, in design order), ``checks`` (codes ``bearing.seat``, ``bearing.life``,
        ``bearing.static``, ``bearing.speed``, ``bearing.axial_on_radial``,
        ``bearing.lubrication``, ``bearing.candidates``, ``bearing.arrangement``; where = support
        id), ``warnings``.

    Raises
    ------
    engine.model.EngineError
        From the axial resolution, or a lubricant outside the viscosity relation.
    """
    r = rate_bearings_many([design], Fr_N=[Fr_N], Fa_ext_N=[Fa_ext_N], catalogue=catalogue)[0]
    if isinstance(r, EngineError):
        raise r
    return r
