"""What-if studies: vary one or two design variables over a range and solve every variant;
compare every sensible bearing arrangement for the current layout.

Units: those of the design (mm, N, rpm, h); slopes in rad.

Public functions
----------------
parse_variable       a variable path (``supports.B.x_mm``) -> :class:`Variable`, or DesignError
parse_values         a range ``start:stop:count`` or a list of values -> tuple of values
parse_study          design + ``["supports.B.x_mm=300:500:21", ...]`` -> :class:`Study`
apply_values         a design mapping with the study's variables set to given values
iter_study           solve the variants chunk by chunk (engine.solve_many), yielding figures; stoppable
run_study            every variant -> :class:`StudyResult` (figures per variant), with progress and stop
arrangement_design   a design mapping with one of :data:`ARRANGEMENTS` applied
compare_arrangements every arrangement of :data:`ARRANGEMENTS` solved and ranked

Variables
---------
``supports.<id>.x_mm`` (also ``supports[1].x_mm``), ``supports.<id>.radial_stiffness_N_per_mm``,
``supports.<id>.bore_mm``, ``supports.<id>.contact_angle_deg``, ``supports.<id>.bearing_type``
(a choice), ``elements.<id>.<number key>`` (``x_mm``, ``pitch_d_mm``, ``mass_kg`` …),
``shaft.segments[i].d_mm`` / ``length_mm`` / ``bore_mm`` / ``fillet_r_mm``, and
``arrangement`` (a choice among :data:`ARRANGEMENTS`, applied to the two outermost supports).
Numbers take a range ``start:stop:count`` (``count`` evenly spaced values, both ends included)
or a comma-separated list; choices take a comma-separated list (or ``*`` for all of them).

Figures of a variant
--------------------
For each support with a bearing: the life of *the bearing chosen for the current design* (the
first-ranked candidate of the plain solve, held by its designation while the variant still
offers it; otherwise the variant's own first-ranked candidate, flagged ``reselected``): its
modified rating life ``Lnm_h`` (ISO 281:2007 cl. 7: a1·aISO·L10, which is a1·L10 when no
lubricant is given) and its static safety s0 (ISO 76). For the shaft: the governing (smallest)
safety factor of the shaft checks, the largest slope at a bearing over the load cases, and the
first lateral critical speed. A variant *meets every requirement* when no check fails and
each held bearing meets the life, static-safety and speed requirements.

The variants are solved by :func:`engine.solve_many` (``diagrams=False``), the engine's one
path, in chunks of :data:`CHUNK` variants (the solver's memory stays that of one chunk), so a
variant at the current value reproduces the plain solve exactly, whatever the engine computes.
This module holds the study's logic only: variables, ranges, figures and feasibility.
:func:`iter_study` hands the figures over chunk by chunk (for progress and streaming) and
stops when asked; :func:`run_study` collects them.
"""
from __future__ import annotations

import math
import re
from typing import Any, Callable, Iterable, Iterator, Literal, Sequence

import numpy as np
from pydantic import BaseModel, ConfigDict

from engine.model import BEARING_TYPES, Design, DesignError, Issue, parse_design
from engine.result import Result

__all__ = [
    "MAX_VARIANTS", "MAX_VALUES", "ARRANGEMENTS", "Arrangement", "Variable", "Study",
    "BearingFigure", "VariantFigures", "StudyResult", "ArrangementBearing", "ArrangementOption",
    "ArrangementComparison", "parse_variable", "parse_values", "parse_study", "apply_values",
    "figures_of", "iter_study", "run_study", "arrangement_design", "arrangement_label", "compare_arrangements",
    "CHUNK", "STOPPED", "StudyStart",
]

MAX_VALUES = 400       # values of one variable
MAX_VARIANTS = 20_000  # variants of a study (a 140 × 140 map); solved in chunks, streamed
CHUNK = 250            # variants solved together by engine.solve_many

_ERR_PATH = "vary"


def _err(path: str, message: str) -> DesignError:
    return DesignError([Issue(path=path, message=message)])


class _Frozen(BaseModel):
    model_config = ConfigDict(frozen=True)


# --- arrangements ---------------------------------------------------------------------------

class Arrangement(_Frozen):
    """A bearing-type and axial-role combination for the two outermost supports."""

    key: str
    label: str
    left: tuple[str, str]   # (bearing_type, axial) of the support with the smaller x
    right: tuple[str, str]


def _arr(key: str, label: str, left: tuple[str, str], right: tuple[str, str]) -> Arrangement:
    return Arrangement(key=key, label=label, left=left, right=right)


# Axial roles as in design-format.md and engine.bearings.axial: with the left support '+x' the
# pair of angular contact or tapered bearings is back-to-back (O), with it '-x' face-to-face (X).
ARRANGEMENTS: dict[str, Arrangement] = {a.key: a for a in (
    _arr("ball_locating_left", "deep groove ball, {L} locating, {R} floating",
         ("deep_groove_ball", "both"), ("deep_groove_ball", "none")),
    _arr("ball_locating_right", "deep groove ball, {R} locating, {L} floating",
         ("deep_groove_ball", "none"), ("deep_groove_ball", "both")),
    _arr("ball_locating_left_roller_floating", "{L} locating deep groove ball, {R} floating cylindrical roller",
         ("deep_groove_ball", "both"), ("cylindrical_roller", "none")),
    _arr("roller_floating_left_ball_locating", "{L} floating cylindrical roller, {R} locating deep groove ball",
         ("cylindrical_roller", "none"), ("deep_groove_ball", "both")),
    _arr("tapered_back_to_back", "tapered roller pair, back-to-back (O): {L} takes +x, {R} takes -x",
         ("tapered_roller", "+x"), ("tapered_roller", "-x")),
    _arr("tapered_face_to_face", "tapered roller pair, face-to-face (X): {L} takes -x, {R} takes +x",
         ("tapered_roller", "-x"), ("tapered_roller", "+x")),
    _arr("angular_back_to_back", "angular contact ball pair, back-to-back (O): {L} takes +x, {R} takes -x",
         ("angular_contact_ball", "+x"), ("angular_contact_ball", "-x")),
    _arr("angular_face_to_face", "angular contact ball pair, face-to-face (X): {L} takes -x, {R} takes +x",
         ("angular_contact_ball", "-x"), ("angular_contact_ball", "+x")),
    _arr("self_aligning_locating_left", "self-aligning ball, {L} locating, {R} floating",
         ("self_aligning_ball", "both"), ("self_aligning_ball", "none")),
    _arr("self_aligning_locating_right", "self-aligning ball, {R} locating, {L} floating",
         ("self_aligning_ball", "none"), ("self_aligning_ball", "both")),
    _arr("spherical_locating_left", "spherical roller, {L} locating, {R} floating",
         ("spherical_roller", "both"), ("spherical_roller", "none")),
    _arr("spherical_locating_right", "spherical roller, {R} locating, {L} floating",
         ("spherical_roller", "none"), ("spherical_roller", "both")),
)}


def _ends(data: dict) -> tuple[int, int]:
    """Indices of the supports with the smallest and the largest x."""
    xs = [float(s.get("x_mm", 0.0)) for s in data["supports"]]
    return int(np.argmin(xs)), int(np.argmax(xs))


def arrangement_design(data: dict, key: str) -> dict:
    """``data`` (a design mapping) with arrangement ``key`` applied to its outermost supports.

    The supports in between keep their bearing type and float (``axial: none``). Keys of
    :data:`ARRANGEMENTS`; an unknown key raises DesignError at path ``arrangement``.
    """
    if key not in ARRANGEMENTS:
        raise _err("arrangement", f"unknown arrangement {key!r}; use one of {', '.join(ARRANGEMENTS)}")
    arr = ARRANGEMENTS[key]
    out = dict(data)
    sups = [dict(s) for s in data["supports"]]
    i, j = _ends(data)
    for k, s in enumerate(sups):
        if k in (i, j):
            if (arr.left if k == i else arr.right)[0] != s.get("bearing_type"):
                s.pop("designation", None)  # the designer's bearing was of another type
            s["bearing_type"], s["axial"] = arr.left if k == i else arr.right
            if s["bearing_type"] != "angular_contact_ball":
                s.pop("contact_angle_deg", None)
        elif s.get("axial", "none") != "none":
            s["axial"] = "none"
    out["supports"] = sups
    return out


def arrangement_label(data: dict, key: str) -> str:
    """The arrangement's label with the outermost supports' ids filled in."""
    i, j = _ends(data)
    return ARRANGEMENTS[key].label.format(L=data["supports"][i]["id"], R=data["supports"][j]["id"])


# --- variables ------------------------------------------------------------------------------

class Variable(_Frozen):
    """One design variable of a study.

    ``path`` is canonical (ids for supports and elements: ``supports.B.x_mm``); ``kind`` is
    ``number`` or ``choice``; ``current`` is its value in the design (None: not set);
    ``choices`` lists the allowed values of a choice.
    """

    path: str
    kind: Literal["number", "choice"]
    label: str
    unit: str = ""
    current: float | str | None = None
    choices: tuple[str, ...] = ()
    lower: float | None = None   # smallest sensible value (inclusive), e.g. 0 for a position
    upper: float | None = None   # largest (inclusive), e.g. the shaft length
    positive: bool = False       # must be > 0


_SUPPORT_NUM = {"x_mm": "position", "radial_stiffness_N_per_mm": "radial stiffness",
                "bore_mm": "bearing bore", "contact_angle_deg": "contact angle"}
_SEGMENT_NUM = {"d_mm": "diameter", "length_mm": "length", "bore_mm": "bore", "fillet_r_mm": "fillet radius"}
_NOT_VARIABLE = {"id", "kind", "hand", "apex", "keyway", "press_fit"}

_RX_ITEM = re.compile(r"^(supports|elements)(?:\.([^.\[\]]+)|\[(\d+)\])\.(\w+)$")
_RX_SEG = re.compile(r"^shaft\.segments\[(\d+)\]\.(\w+)$")


def _unit_of(key: str) -> str:
    for suffix, unit in (("_N_per_mm", "N/mm"), ("_mm", "mm"), ("_deg", "deg"), ("_kg", "kg"),
                         ("_Nm", "N·m"), ("_rpm", "rpm"), ("_N", "N")):
        if key.endswith(suffix):
            return unit
    return ""


def parse_variable(path: str, design: Design) -> Variable:
    """Read a variable path against ``design``; DesignError naming the path when it is not one.

    >>> from engine.model import parse_design
    >>> d = parse_design({"shaft": {"segments": [{"length_mm": 100, "d_mm": 20}]},
    ...     "supports": [{"id": "A", "x_mm": 0}, {"id": "B", "x_mm": 100}],
    ...     "load_cases": [{"name": "c", "speed_rpm": 100}]})
    >>> parse_variable("supports[1].x_mm", d).path
    'supports.B.x_mm'
    """
    if not isinstance(path, str) or not path.strip():
        raise _err(_ERR_PATH, "name the design variable to vary, e.g. supports.B.x_mm")
    p = path.strip()
    L = design.shaft.length_mm
    if p == "arrangement":
        cur = _current_arrangement(design)
        return Variable(path=p, kind="choice", label="bearing arrangement", current=cur,
                        choices=tuple(ARRANGEMENTS))
    m = _RX_ITEM.match(p)
    if m:
        kind, ident, index, key = m.groups()
        items = design.supports if kind == "supports" else design.elements
        what = "support" if kind == "supports" else "element"
        if index is not None:
            k = int(index)
            if k >= len(items):
                raise _err(p, f"there is no {what} {kind}[{k}]: the design has {len(items)}")
            item = items[k]
        else:
            item = next((it for it in items if it.id == ident), None)
            if item is None:
                ids = ", ".join(it.id for it in items) or "none"
                raise _err(p, f"no {what} has the id {ident!r} (ids: {ids})")
        canon = f"{kind}.{item.id}.{key}"
        if kind == "supports" and key == "bearing_type":
            return Variable(path=canon, kind="choice", label=f"bearing type at {item.id}",
                            current=item.bearing_type, choices=BEARING_TYPES)
        if kind == "supports":
            if key not in _SUPPORT_NUM:
                raise _err(p, f"{key!r} cannot be varied on a support; use one of "
                              f"{', '.join(list(_SUPPORT_NUM) + ['bearing_type'])}")
            cur = getattr(item, key)
            if key == "bore_mm" and cur is None:
                cur = design.shaft.diameter_at(item.x_mm)
            return Variable(path=canon, kind="number", label=f"{_SUPPORT_NUM[key]} of support {item.id}",
                            unit=_unit_of(key), current=cur,
                            lower=0.0 if key == "x_mm" else None, upper=L if key == "x_mm" else None,
                            positive=key != "x_mm")
        fields = type(item).model_fields
        numeric = [k for k in fields if k not in _NOT_VARIABLE and isinstance(getattr(item, k), (int, float))
                   and not isinstance(getattr(item, k), bool)]
        if key not in numeric:
            raise _err(p, f"{key!r} is not a number of element {item.id} ({item.kind}) that can be "
                          f"varied; use one of {', '.join(numeric)}")
        return Variable(path=canon, kind="number", label=f"{key.replace('_', ' ')} of {item.id}",
                        unit=_unit_of(key), current=float(getattr(item, key)),
                        lower=0.0 if key == "x_mm" else None, upper=L if key == "x_mm" else None,
                        positive=key.endswith("d_mm"))
    m = _RX_SEG.match(p)
    if m:
        k, key = int(m.group(1)), m.group(2)
        segs = design.shaft.segments
        if k >= len(segs):
            raise _err(p, f"there is no shaft.segments[{k}]: the shaft has {len(segs)} segments "
                          f"(numbered from 0)")
        if key not in _SEGMENT_NUM:
            raise _err(p, f"{key!r} cannot be varied on a segment; use one of {', '.join(_SEGMENT_NUM)}")
        cur = getattr(segs[k], key)
        return Variable(path=p, kind="number", label=f"{_SEGMENT_NUM[key]} of segment {k}", unit="mm",
                        current=cur, lower=0.0 if key == "bore_mm" else None, positive=key != "bore_mm")
    raise _err(p, "not a variable a study can vary; use e.g. supports.B.x_mm, elements.G1.x_mm, "
                  "shaft.segments[3].d_mm, supports.A.bearing_type or arrangement")


def _current_arrangement(design: Design) -> str | None:
    data = {"supports": [{"x_mm": s.x_mm} for s in design.supports]}
    i, j = _ends(data)
    a, b = design.supports[i], design.supports[j]
    now = ((a.bearing_type, a.axial), (b.bearing_type, b.axial))
    return next((k for k, v in ARRANGEMENTS.items() if (v.left, v.right) == now), None)


_NUM = r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?"
_RX_RANGE = re.compile(rf"^\s*({_NUM})\s*:\s*({_NUM})\s*:\s*(\d+)\s*$")


def _number(text: str, path: str) -> float:
    try:
        v = float(text)
    except (TypeError, ValueError):
        raise _err(path, f"{text!r} is not a number") from None
    if not math.isfinite(v):
        raise _err(path, f"{text!r} is not a finite number")
    return v


def parse_values(spec: Any, var: Variable) -> tuple:
    """The values of ``var`` from a range ``"start:stop:count"``, a comma-separated list, a list,
    or a mapping ``{"start", "stop", "count"}``; DesignError at the variable's path if invalid.

    >>> v = Variable(path="supports.B.x_mm", kind="number", label="x", lower=0, upper=500)
    >>> parse_values("300:500:5", v)
    (300.0, 350.0, 400.0, 450.0, 500.0)
    """
    p = var.path
    if isinstance(spec, dict):
        missing = [k for k in ("start", "stop", "count") if k not in spec]
        if missing:
            raise _err(p, f"a range needs start, stop and count; {', '.join(missing)} missing")
        spec = f"{spec['start']}:{spec['stop']}:{spec['count']}"
    if var.kind == "choice":
        items = [s.strip() for s in spec.split(",")] if isinstance(spec, str) else list(spec or [])
        if items == ["*"]:
            items = list(var.choices)
        items = [s for s in items if s != ""]
        if not items:
            raise _err(p, f"give at least one value; one of {', '.join(var.choices)}")
        bad = [s for s in items if s not in var.choices]
        if bad:
            raise _err(p, f"{bad[0]!r} is not a value of {p}; use one of {', '.join(var.choices)} (or *)")
        values: tuple = tuple(dict.fromkeys(items))
    else:
        if isinstance(spec, str):
            m = _RX_RANGE.match(spec)
            if m:
                a, b, n = float(m.group(1)), float(m.group(2)), int(m.group(3))
                if n < 1:
                    raise _err(p, f"the range {spec!r} asks for {n} values; give a count of at least 1")
                if n > 1 and a == b:
                    raise _err(p, f"the range {spec!r} starts and stops at the same value; "
                                  "give two different ends or a count of 1")
                if n > MAX_VALUES:
                    raise _err(p, f"the range {spec!r} asks for {n} values; at most {MAX_VALUES} are solved")
                values = tuple(float(v) for v in (np.linspace(a, b, n) if n > 1 else [a]))
            elif ":" in spec:
                raise _err(p, f"{spec!r} is not a range; write start:stop:count, e.g. 300:500:21")
            else:
                values = tuple(_number(s.strip(), p) for s in spec.split(",") if s.strip())
        elif isinstance(spec, (list, tuple)):
            values = tuple(_number(v, p) if not isinstance(v, bool) else _number("bool", p) for v in spec)
        elif isinstance(spec, (int, float)) and not isinstance(spec, bool):
            values = (_number(spec, p),)
        else:
            raise _err(p, "give a range start:stop:count or a list of numbers")
        if not values:
            raise _err(p, "give at least one value")
        if len(values) > MAX_VALUES:
            raise _err(p, f"{len(values)} values; at most {MAX_VALUES} are solved")
        u = f" {var.unit}" if var.unit else ""
        lo, hi = min(values), max(values)
        if var.lower is not None and lo < var.lower - 1e-9:
            raise _err(p, f"the values reach {lo:g}{u}, below the smallest allowed ({var.lower:g}{u})")
        if var.upper is not None and hi > var.upper + 1e-9:
            raise _err(p, f"the values reach {hi:g}{u}, beyond the shaft's length ({var.upper:g}{u})")
        if var.positive and lo <= 0:
            raise _err(p, f"the values must be positive; the range reaches {lo:g}{u}")
    return values


class Study(_Frozen):
    """What to vary: one or two variables and their values; variants form a grid, the last
    variable fastest (variant k = (i, j) with k = i·len(values[1]) + j)."""

    variables: tuple[Variable, ...]
    values: tuple[tuple, ...]

    @property
    def shape(self) -> tuple[int, ...]:
        return tuple(len(v) for v in self.values)

    @property
    def n_variants(self) -> int:
        return int(np.prod(self.shape))

    def combination(self, k: int) -> tuple:
        """The values of variant k (the last variable fastest)."""
        if len(self.values) == 1:
            return (self.values[0][k],)
        i, j = divmod(k, len(self.values[1]))
        return (self.values[0][i], self.values[1][j])

    def combinations(self) -> list[tuple]:
        """The values of every variant, in variant order (computed once per call)."""
        if len(self.values) == 1:
            return [(v,) for v in self.values[0]]
        return [(a, b) for a in self.values[0] for b in self.values[1]]


def _split(item: Any) -> tuple[str, Any]:
    if isinstance(item, str):
        if "=" not in item:
            raise _err(_ERR_PATH, f"{item!r} gives no values; write PATH=start:stop:count, "
                                  "e.g. supports.B.x_mm=300:500:21")
        path, _, spec = item.partition("=")
        return path.strip(), spec.strip()
    if isinstance(item, dict):
        path = item.get("path") or item.get("variable")
        if not isinstance(path, str):
            raise _err(_ERR_PATH, "each varied variable needs a 'path', e.g. supports.B.x_mm")
        if "values" in item:
            return path, item["values"]
        return path, {k: item[k] for k in ("start", "stop", "count") if k in item}
    raise _err(_ERR_PATH, "each varied variable is 'PATH=start:stop:count' or {path, values}")


def parse_study(design: Any, vary: Sequence[Any]) -> Study:
    """A :class:`Study` from ``vary``: one or two items, each ``"PATH=SPEC"`` or
    ``{"path": ..., "values": SPEC}`` (SPEC a range, a list, or start/stop/count keys)."""
    design = parse_design(design)
    if isinstance(vary, (str, dict)):
        vary = [vary]
    vary = list(vary or [])
    if not 1 <= len(vary) <= 2:
        raise _err(_ERR_PATH, f"vary one or two design variables; {len(vary)} were given")
    variables, values = [], []
    for item in vary:
        path, spec = _split(item)
        var = parse_variable(path, design)
        if any(v.path == var.path for v in variables):
            raise _err(var.path, f"{var.path} is varied twice")
        variables.append(var)
        values.append(parse_values(spec, var))
    study = Study(variables=tuple(variables), values=tuple(values))
    if study.n_variants > MAX_VARIANTS:
        raise _err(_ERR_PATH, f"{study.n_variants} variants; at most {MAX_VARIANTS} are solved in one study")
    return study


def _set(data: dict, var: Variable, value: Any) -> dict:
    """A shallow-copied mapping with one variable set (only the touched branches copied)."""
    out = dict(data)
    p = var.path
    if p == "arrangement":
        return arrangement_design(out, value)
    m = _RX_ITEM.match(p)
    if m:
        kind, ident, _, key = m.groups()
        items = [dict(it) if it.get("id") == ident else it for it in out[kind]]
        for it in items:
            if it.get("id") == ident:
                it[key] = value
                if kind == "supports" and key in ("bearing_type", "bore_mm", "contact_angle_deg"):
                    it.pop("designation", None)  # the designer's bearing belonged to the old seat or type
        out[kind] = items
        return out
    m = _RX_SEG.match(p)
    k, key = int(m.group(1)), m.group(2)
    shaft = dict(out["shaft"])
    segs = list(shaft["segments"])
    segs[k] = {**segs[k], key: value}
    shaft["segments"] = segs
    out["shaft"] = shaft
    return out


def apply_values(data: dict, study: Study, values: Sequence[Any]) -> dict:
    """``data`` (a design mapping, e.g. ``Design.model_dump()``) with each variable of
    ``study`` set to the matching entry of ``values``; the input is not changed."""
    out = data
    for var, v in zip(study.variables, values):
        out = _set(out, var, v)
    return out


# --- figures --------------------------------------------------------------------------------

class BearingFigure(_Frozen):
    """One support's bearing in one variant."""

    id: str
    bearing_type: str
    designation: str = ""
    life_h: float | None = None      # modified rating life Lnm (a1·L10 without lubricant data)
    L10_h: float | None = None
    s0: float | None = None
    ok: bool | None = None
    reselected: bool = False         # the current design's bearing does not fit this variant
    slope_rad: float | None = None   # largest over the load cases
    slope_limit_rad: float | None = None


class VariantFigures(_Frozen):
    """The figures of one variant (None where the engine gives none)."""

    values: tuple
    error: str | None = None
    bearings: list[BearingFigure] = []
    min_life_h: float | None = None
    safety_factor: float | None = None
    max_slope_rad: float | None = None
    critical_speed_rpm: float | None = None
    max_speed_rpm: float | None = None
    ok: bool | None = None
    failing: list[str] = []          # codes (and where) of the checks that fail


class StudyResult(_Frozen):
    variables: tuple[Variable, ...]
    values: tuple[tuple, ...]
    shape: tuple[int, ...]
    base: VariantFigures             # the current design
    variants: list[VariantFigures]
    requirements: dict[str, float] = {}
    elapsed_s: float = 0.0
    solved: int = 0                  # variants solved (all of them unless the study was stopped)
    stopped: bool = False            # stopped on request; the rest carry a note and no figures

    def series(self, name: str) -> list[float | None]:
        """One figure over the variants, in variant order (``min_life_h``, ``safety_factor``,
        ``max_slope_rad``, ``critical_speed_rpm``, or ``life_h:<support id>``)."""
        if name.startswith("life_h:"):
            sid = name.split(":", 1)[1]
            return [next((b.life_h for b in v.bearings if b.id == sid), None) for v in self.variants]
        return [getattr(v, name) for v in self.variants]


_SLOPE_CODES = ("shaft.bearing_slope",)  # engine/stiffness.py: slope at each bearing, where = support id


def _slopes_from_checks(result: Result) -> dict[str, tuple[float, float | None]]:
    out: dict[str, tuple[float, float | None]] = {}
    for c in result.checks:
        if c.code in _SLOPE_CODES and c.value is not None:
            prev = out.get(c.where)
            if prev is None or c.value > prev[0]:
                out[c.where] = (float(c.value), c.limit)
    return out


def figures_of(design: Design, result: Result, *, held: dict[str, str] | None = None,
               values: tuple = ()) -> VariantFigures:
    """The study figures of one solved design. ``held`` maps support id -> designation of the
    bearing to follow (default: each support's first-ranked candidate)."""
    held = held or {}
    slopes = _slopes_from_checks(result)  # the engine's own bearing-slope checks, nothing solved here
    bearings: list[BearingFigure] = []
    all_ok = True
    for br in result.bearings:
        cands = br.candidates
        want = held.get(br.id)
        pick = next((c for c in cands if c.designation == want), None) if want else None
        reselected = bool(want) and pick is None
        if pick is None and cands:  # the bearing the support's checks rate (the designer's, else the first ranked)
            pick = next((c for c in cands if c.designation == br.designation), cands[0])
        slope, limit = slopes.get(br.id, (None, None))
        if pick is None:
            all_ok = False
            bearings.append(BearingFigure(id=br.id, bearing_type=br.bearing_type, ok=False,
                                          slope_rad=slope, slope_limit_rad=limit))
            continue
        all_ok &= bool(pick.ok)
        bearings.append(BearingFigure(
            id=br.id, bearing_type=br.bearing_type, designation=pick.designation,
            life_h=pick.Lnm_h, L10_h=pick.L10_h, s0=pick.s0, ok=pick.ok, reselected=reselected,
            slope_rad=slope, slope_limit_rad=limit))
    # the held bearings' own verdicts replace the bearing layer's (which judge its first pick)
    failing = [f"{c.code}" + (f" ({c.where})" if c.where else "") for c in result.checks
               if c.status == "fail" and not c.code.startswith("bearing.")]
    for br, b in zip(result.bearings, bearings):
        if b.ok is False:
            pick = next((c for c in br.candidates if c.designation == b.designation), None)
            words = [w for w in ("life", "static", "speed")
                     if pick is not None and any(r.startswith(w) for r in pick.reasons)] or ["seat"]
            failing += [f"bearing.{w} ({b.id})" for w in words]
    failing = sorted(dict.fromkeys(failing))  # independent of how the engine orders its checks
    lives = [b.life_h for b in bearings if b.life_h is not None]
    sl = [b.slope_rad for b in bearings if b.slope_rad is not None]
    return VariantFigures(
        values=tuple(values), bearings=bearings, min_life_h=min(lives) if lives else None,
        safety_factor=result.shaft.min_safety_factor, max_slope_rad=max(sl) if sl else None,
        critical_speed_rpm=result.shaft.critical_speed_rpm,
        max_speed_rpm=max(c.speed_rpm for c in result.load_cases) if result.load_cases else None,
        ok=all_ok and not failing, failing=failing)


def _held(result: Result) -> dict[str, str]:
    return {b.id: b.designation or b.candidates[0].designation for b in result.bearings if b.candidates}


def _message(exc: DesignError) -> str:
    return "; ".join(f"{e.path}: {e.message}" if e.path else e.message for e in exc.errors)


def _variant_figures(data: dict, study: Study, ks: range, held: dict[str, str],
                     catalogue: Any) -> list[VariantFigures]:
    """The figures of variants ``ks``: each design built and checked, all solved together
    by :func:`engine.solve_many`; a variant the engine refuses carries its message."""
    import engine

    out: list[VariantFigures | None] = [None] * len(ks)
    designs, where = [], []
    for i, k in enumerate(ks):
        try:
            designs.append(parse_design(apply_values(data, study, study.combination(k))))
            where.append(i)
        except DesignError as exc:
            out[i] = VariantFigures(values=study.combination(k), error=_message(exc), ok=False)
    results = engine.solve_many(designs, diagrams=False, catalogue=catalogue)
    for i, d, r in zip(where, designs, results):
        vals = study.combination(ks[i])
        out[i] = (VariantFigures(values=vals, error=_message(r), ok=False) if isinstance(r, DesignError)
                  else figures_of(d, r, held=held, values=vals))
    return out  # type: ignore[return-value]


class StudyStart(_Frozen):
    """What :func:`iter_study` yields first: the study, the current design's figures and the
    bearings the variants follow."""

    study: Study
    base: VariantFigures
    held: dict[str, str]
    requirements: dict[str, float]


def iter_study(design: Any, study: Study | Sequence[Any], *, catalogue: Any = None, chunk: int = CHUNK,
               stop: Callable[[], bool] | None = None) -> Iterator[StudyStart | list[VariantFigures]]:
    """Solve the variants of ``study`` chunk by chunk: first a :class:`StudyStart`, then one
    list of :class:`VariantFigures` per chunk of ``chunk`` variants, in variant order. Before
    each chunk ``stop()`` is asked; when it answers True the iteration ends there. Bad input
    (the design, a variable, a range) raises DesignError before anything is solved."""
    design = parse_design(design)
    if not isinstance(study, Study):
        study = parse_study(design, study)
    import engine

    base_result = engine.solve(design, diagrams=False, **({} if catalogue is None else {"catalogue": catalogue}))
    held = _held(base_result)
    req = design.requirements
    yield StudyStart(study=study, held=held,
                     base=figures_of(design, base_result, held=held,
                                     values=tuple(v.current for v in study.variables)),
                     requirements={"life_h": req.life_h, "s0_min": req.s0_min,
                                   "fatigue_safety_min": req.fatigue_safety_min,
                                   "critical_speed_margin_pct": req.critical_speed_margin_pct})
    data = design.model_dump(mode="json", exclude_none=False)
    n = study.n_variants
    for lo in range(0, n, max(1, chunk)):
        if stop is not None and stop():
            return
        yield _variant_figures(data, study, range(lo, min(n, lo + chunk)), held, catalogue)


STOPPED = "not solved: the study was stopped before this variant"


def run_study(design: Any, study: Study | Sequence[Any], *, catalogue: Any = None,
              progress: Callable[[int, int], None] | None = None,
              stop: Callable[[], bool] | None = None, chunk: int = CHUNK) -> StudyResult:
    """Solve every variant of ``study`` (or of ``vary`` items, see :func:`parse_study`).

    ``progress(done, total)`` is called after each chunk; ``stop()`` before each (True ends
    the study: the variants not solved carry the note :data:`STOPPED`). A variant the engine
    refuses (e.g. a support moved onto another) carries the engine's message in ``error`` and
    no figures; the study itself goes on.
    """
    import time

    t0 = time.perf_counter()
    it = iter_study(design, study, catalogue=catalogue, chunk=chunk, stop=stop)
    start = next(it)
    study = start.study
    variants: list[VariantFigures] = []
    for part in it:
        variants.extend(part)
        if progress is not None:
            progress(len(variants), study.n_variants)
    solved = len(variants)
    variants += [VariantFigures(values=study.combination(k), error=STOPPED, ok=False)
                 for k in range(solved, study.n_variants)]
    return StudyResult(
        variables=study.variables, values=study.values, shape=study.shape, base=start.base,
        variants=variants, requirements=start.requirements, elapsed_s=time.perf_counter() - t0,
        solved=solved, stopped=solved < study.n_variants)


# --- arrangement comparison -------------------------------------------------------------------

class ArrangementBearing(_Frozen):
    id: str
    bearing_type: str
    axial: str
    candidates: list[dict[str, Any]] = []   # the best few: designation, d, D, B, life, s0, ok
    designation: str = ""
    life_h: float | None = None
    s0: float | None = None
    ok: bool | None = None
    Fa_max_N: float = 0.0
    slope_rad: float | None = None
    slope_limit_rad: float | None = None
    D_mm: float | None = None
    B_mm: float | None = None


class ArrangementOption(_Frozen):
    key: str
    label: str
    rank: int = 0
    error: str | None = None
    current: bool = False
    ok: bool = False
    bearings: list[ArrangementBearing] = []
    min_life_h: float | None = None
    min_s0: float | None = None
    max_D_mm: float | None = None
    total_B_mm: float | None = None
    volume_cm3: float | None = None  # Σ π/4·(D² − d²)·B of the picked bearings
    failing: list[str] = []
    deciding: list[str] = []  # the failures this arrangement decides (not shared by every arrangement)
    light: list[str] = []  # bearings below their minimum load (support ids)


class ArrangementComparison(_Frozen):
    supports: tuple[str, str]
    options: list[ArrangementOption]
    elapsed_s: float = 0.0
    common_failing: list[str] = []  # shaft checks that fail alike for every arrangement: they rank none


def _option(key: str, label: str, d: Design | None, res: Any, *, current: bool,
            n_candidates: int) -> ArrangementOption:
    """One arrangement's figures from its solved result (or the error it gave)."""
    if isinstance(res, DesignError):
        return ArrangementOption(key=key, label=label, error=_message(res), current=current)
    fig = figures_of(d, res)
    by_id = {b.id: b for b in fig.bearings}
    bears: list[ArrangementBearing] = []
    vol = 0.0
    Ds, Bs, s0s = [], [], []
    for br in res.bearings:
        sup = d.support(br.id)
        f = by_id.get(br.id)
        top = br.candidates[:n_candidates]
        c0 = next((c for c in br.candidates if c.designation == br.designation), top[0] if top else None)
        fa = max((cr.supports[i].Fa_N for cr in res.load_cases for i, s in enumerate(d.supports)
                  if s.id == br.id), default=0.0)
        if c0 is not None:
            vol += math.pi / 4 * (c0.D_mm**2 - c0.d_mm**2) * c0.B_mm / 1e3
            Ds.append(c0.D_mm)
            Bs.append(c0.B_mm)
            s0s.append(c0.s0)
        bears.append(ArrangementBearing(
            id=br.id, bearing_type=br.bearing_type, axial=sup.axial,
            candidates=[{"designation": c.designation, "d_mm": c.d_mm, "D_mm": c.D_mm, "B_mm": c.B_mm,
                         "life_h": c.Lnm_h, "s0": c.s0, "ok": c.ok} for c in top],
            designation=c0.designation if c0 else "", life_h=c0.Lnm_h if c0 else None,
            s0=c0.s0 if c0 else None, ok=c0.ok if c0 else False, Fa_max_N=fa,
            slope_rad=f.slope_rad if f else None, slope_limit_rad=f.slope_limit_rad if f else None,
            D_mm=c0.D_mm if c0 else None, B_mm=c0.B_mm if c0 else None))
    slope_ok = all(b.slope_limit_rad is None or b.slope_rad is None or b.slope_rad <= b.slope_limit_rad
                   for b in bears)
    lives = [b.life_h for b in bears if b.life_h is not None]
    failing = list(fig.failing)
    light = sorted({c.where for c in res.checks if c.code == "bearing.min_load" and c.status == "warn"})
    return ArrangementOption(
        key=key, label=label, current=current, ok=bool(fig.ok) and slope_ok and bool(bears),
        bearings=bears, min_life_h=min(lives) if lives else None, min_s0=min(s0s) if s0s else None,
        max_D_mm=max(Ds) if Ds else None, total_B_mm=sum(Bs) if Bs else None,
        volume_cm3=vol if Ds else None, failing=sorted(dict.fromkeys(failing)), light=light)


def compare_arrangements(design: Any, *, keys: Iterable[str] | None = None,
                         n_candidates: int = 3, catalogue: Any = None) -> ArrangementComparison:
    """Every arrangement of :data:`ARRANGEMENTS` (or ``keys``) on the current layout, ranked.

    All are solved together by :func:`engine.solve_many`. Ranking: arrangements that meet every requirement
    first (bearing life, static safety and speed of the first-ranked candidates, slopes within
    the bearings' limits, no failing shaft check), then the smallest space taken (the annular
    volume Σ π/4·(D² − d²)·B of the chosen bearings), then the longer smallest life; those
    the engine cannot solve come last with its message.
    """
    import time

    import engine

    t0 = time.perf_counter()
    design = parse_design(design)
    data = design.model_dump(mode="json")
    cur = _current_arrangement(design)
    keys = list(ARRANGEMENTS) if keys is None else list(keys)
    for k in keys:
        if k not in ARRANGEMENTS:
            raise _err("arrangement", f"unknown arrangement {k!r}; use one of {', '.join(ARRANGEMENTS)}")
    designs: list[Design | None] = []
    results: list[Any] = []
    for k in keys:
        try:
            designs.append(parse_design(arrangement_design(data, k)))
            results.append(None)
        except DesignError as exc:
            designs.append(None)
            results.append(exc)
    solved = engine.solve_many([d for d in designs if d is not None], diagrams=False,
                               **({} if catalogue is None else {"catalogue": catalogue}))
    it = iter(solved)
    results = [next(it) if d is not None else r for d, r in zip(designs, results)]
    opts = [_option(k, arrangement_label(data, k), d, r, current=(k == cur), n_candidates=n_candidates)
            for k, d, r in zip(keys, designs, results)]
    # a shaft check that fails alike for every arrangement is not decided by the arrangement:
    # it does not rank them (the comparison says which)
    solved = [o for o in opts if o.error is None]
    code = lambda f: f.split(" (", 1)[0]  # noqa: E731  (where it fails moves with the bearings)
    common = sorted(set.intersection(*[{code(f) for f in o.failing if not f.startswith("bearing.")} for o in solved])) \
        if len(solved) > 1 else []
    opts = [o.model_copy(update={"deciding": [f for f in o.failing if code(f) not in common]}) for o in opts]
    order = sorted(range(len(opts)), key=lambda i: _rank_key(opts[i]))
    ranked = [opts[i].model_copy(update={"rank": r + 1}) for r, i in enumerate(order)]
    i, j = _ends(data)
    return ArrangementComparison(supports=(data["supports"][i]["id"], data["supports"][j]["id"]),
                                 options=ranked, elapsed_s=time.perf_counter() - t0, common_failing=common)


def _rank_key(o: ArrangementOption) -> tuple:
    """What the arrangement decides, in order: solved; its own failures (bearing life, static
    safety, speed, seat, slopes at the bearings, shaft checks not failing alike for all) fewest
    first; then bearings below their minimum load fewest first; then, among those that pass,
    the smallest space, else the longest smallest life."""
    passes = o.error is None and bool(o.bearings) and not o.deciding
    space = o.volume_cm3 if o.volume_cm3 is not None else math.inf
    life = -(o.min_life_h or 0.0)
    return (o.error is not None, not passes, len(o.deciding), len(o.light),
            *((space, life) if passes else (life, space)))
