"""What-if studies: vary one or two design variables over a range and solve every variant;
compare every sensible bearing arrangement for the current layout.

Units: those of the design (mm, N, rpm, h); slopes in rad.

Public functions
----------------
parse_variable       a variable path (``supports.B.x_mm``) -> :class:`Variable`, or DesignError
parse_values         a range ``start:stop:count`` or a list of values -> tuple of values
parse_study          design + ``["supports.B.x_mm=300:500:21", ...]`` -> :class:`Study`
apply_values         a design mapping with the study's variables set to given values
run_study            solve every variant -> :class:`StudyResult` (figures per variant)
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

The variants are solved by :func:`engine.solve` itself (``diagrams=False``), so a variant at
the current value reproduces the plain solve exactly, whatever the engine computes. The
batched path (the default once it reproduces the plain solve at the current design) runs the
same engine functions over all variants at once where they take a leading variant axis: the
bending (:func:`engine.beam.solve_bending_many`), the lateral modes
(:func:`engine.dynamics.lateral_frequencies_many`, first mode only: the figures show the
critical speed), the shoulder factors (:func:`engine.checks.shoulder_kt`) and the held
bearings' screen (:func:`engine.bearings.candidates.screen_rows`); then each variant's shaft
checks (:func:`engine.checks.shaft_checks`, without the minimum-diameter figure). Its figures
agree with the plain solve to 1e-9 relative.
"""
from __future__ import annotations

import math
import re
from typing import Any, Iterable, Literal, Sequence

import numpy as np
from pydantic import BaseModel, ConfigDict

from engine import dynamics
from engine.beam import solve_bending_many
from engine.checks import shoulder_kt
from engine.model import BEARING_TYPES, Design, DesignError, Issue, parse_design
from engine.result import Result

__all__ = [
    "MAX_VARIANTS", "MAX_VALUES", "ARRANGEMENTS", "Arrangement", "Variable", "Study",
    "BearingFigure", "VariantFigures", "StudyResult", "ArrangementBearing", "ArrangementOption",
    "ArrangementComparison", "parse_variable", "parse_values", "parse_study", "apply_values",
    "figures_of", "run_study", "arrangement_design", "arrangement_label", "compare_arrangements",
    "batched_bending", "batched_analyses",
]

MAX_VALUES = 400      # values of one variable
MAX_VARIANTS = 2500   # variants of a study (a 50 × 50 map); keeps a request within seconds

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

    def combinations(self) -> list[tuple]:
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
    method: str = "solve"

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


def _slopes_from_beam(design: Design) -> dict[str, float]:
    from engine.solve import analyse  # the structural step alone

    a = analyse(design)
    s = np.hypot(a.beam.slope_rad[:, 0], a.beam.slope_rad[:, 1])  # (cases, nodes)
    return {sup.id: float(s[:, node].max()) for sup, node in zip(design.supports, a.mesh.support_nodes)}


def figures_of(design: Design, result: Result, *, held: dict[str, str] | None = None,
               values: tuple = ()) -> VariantFigures:
    """The study figures of one solved design. ``held`` maps support id -> designation of the
    bearing to follow (default: each support's first-ranked candidate)."""
    held = held or {}
    slopes = _slopes_from_checks(result)
    beam_slopes = None
    if not slopes and any(s.bearing_type for s in design.supports):
        beam_slopes = _slopes_from_beam(design)
    bearings: list[BearingFigure] = []
    all_ok = True
    for br in result.bearings:
        cands = br.candidates
        want = held.get(br.id)
        pick = next((c for c in cands if c.designation == want), None) if want else None
        reselected = bool(want) and pick is None
        if pick is None and cands:
            pick = cands[0]
        if beam_slopes is not None:
            slope, limit = beam_slopes.get(br.id), None
        else:
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
    return {b.id: b.candidates[0].designation for b in result.bearings if b.candidates}


def _fault(exc: Exception) -> DesignError:
    """An engine fault on one variant, as a message (the study goes on)."""
    return DesignError([Issue(path="", message=f"the engine could not solve this variant "
                                               f"({type(exc).__name__}: {exc})")])


def _message(exc: DesignError) -> str:
    return "; ".join(f"{e.path}: {e.message}" if e.path else e.message for e in exc.errors)


def _cat(catalogue: Any) -> dict[str, Any]:
    """``catalogue=`` for engine.solve only when a table is given (solve's default otherwise)."""
    return {} if catalogue is None else {"catalogue": catalogue}


class _Subset:
    """The combinations of a study restricted to some variant indices (for the batched path)."""

    def __init__(self, study: Study, ks: list[int]):
        self._all, self._ks = study.combinations(), ks

    def combinations(self) -> list[tuple]:
        return [self._all[k] for k in self._ks]


def run_study(design: Any, study: Study | Sequence[Any], *,
              method: Literal["auto", "solve", "batched"] = "auto", catalogue: Any = None) -> StudyResult:
    """Solve every variant of ``study`` (or of ``vary`` items, see :func:`parse_study`).

    ``method``: ``solve`` calls :func:`engine.solve` for each variant; ``batched`` solves the
    bending of all variants at once (:func:`batched_analyses`) and then rates the bearings
    and checks the shaft of each as solve() does; ``auto`` (default) takes the batched path
    when it reproduces the plain solve at the current design (to 1e-9), else ``solve``.

    A variant the engine refuses (e.g. a support moved onto another) carries the engine's
    message in ``error`` and no figures; the study itself goes on.
    """
    import time

    import engine

    t0 = time.perf_counter()
    design = parse_design(design)
    if not isinstance(study, Study):
        study = parse_study(design, study)
    base_result = engine.solve(design, diagrams=False, **_cat(catalogue))
    held = _held(base_result)
    base_values = tuple(v.current for v in study.variables)
    base = figures_of(design, base_result, held=held, values=base_values)
    data = design.model_dump(mode="json", exclude_none=False)
    variants: list[VariantFigures | None] = [None] * study.n_variants
    designs: list[tuple[int, Design]] = []
    for k, vals in enumerate(study.combinations()):
        try:
            designs.append((k, parse_design(apply_values(data, study, vals))))
        except DesignError as exc:
            variants[k] = VariantFigures(values=vals, error=_message(exc), ok=False)
    used = "solve"
    if method in ("auto", "batched") and designs:
        # the batched path is used when it reproduces the plain solve at the current design
        try:
            check = _batched_figures([design], Study(variables=study.variables, values=tuple((v,) for v in base_values)),
                                     held, None, catalogue=catalogue)[0]
            agrees = isinstance(check, VariantFigures) and _same(check, base)
        except Exception:  # a layer not wired as the batched path expects: fall back
            agrees = False
        if agrees or method == "batched":
            used = "batched"
            sub = Study(variables=study.variables, values=study.values)
            base_loads = None
            if _loads_unchanged(study):
                from engine.loads import case_loads
                base_loads = [case_loads(design, c) for c in design.load_cases]
            fast_b = not any(v.kind == "choice" for v in study.variables)
            figs = _batched_figures([d for _, d in designs], _Subset(sub, [k for k, _ in designs]), held, base_loads,
                                    fast_bearings=fast_b, catalogue=catalogue)
            for (k, _), f in zip(designs, figs):
                variants[k] = (f.model_copy(update={"values": study.combinations()[k]}) if isinstance(f, VariantFigures)
                               else VariantFigures(values=study.combinations()[k], error=_message(f), ok=False))
    if used == "solve":
        for k, vd in designs:
            vals = study.combinations()[k]
            try:
                res = engine.solve(vd, diagrams=False, **_cat(catalogue))
                variants[k] = figures_of(vd, res, held=held, values=vals)
            except DesignError as exc:
                variants[k] = VariantFigures(values=vals, error=_message(exc), ok=False)
            except (ArithmeticError, ValueError, IndexError, np.linalg.LinAlgError) as exc:
                variants[k] = VariantFigures(values=vals, error=_message(_fault(exc)), ok=False)
    req = design.requirements
    return StudyResult(
        variables=study.variables, values=study.values, shape=study.shape, base=base,
        variants=variants,
        requirements={"life_h": req.life_h, "s0_min": req.s0_min,
                      "fatigue_safety_min": req.fatigue_safety_min,
                      "critical_speed_margin_pct": req.critical_speed_margin_pct},
        elapsed_s=time.perf_counter() - t0, method=used)


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


class ArrangementComparison(_Frozen):
    supports: tuple[str, str]
    options: list[ArrangementOption]
    elapsed_s: float = 0.0


def _option(key: str, label: str, data: dict, *, current: bool, n_candidates: int,
            catalogue: Any = None) -> ArrangementOption:
    import engine

    try:
        d = parse_design(data)
        res = engine.solve(d, diagrams=False, **_cat(catalogue))
    except DesignError as exc:
        return ArrangementOption(key=key, label=label, error=_message(exc), current=current)
    except (ArithmeticError, ValueError, IndexError, np.linalg.LinAlgError) as exc:
        return ArrangementOption(key=key, label=label, error=_message(_fault(exc)), current=current)
    fig = figures_of(d, res)
    by_id = {b.id: b for b in fig.bearings}
    bears: list[ArrangementBearing] = []
    vol = 0.0
    Ds, Bs, s0s = [], [], []
    for br in res.bearings:
        sup = d.support(br.id)
        f = by_id.get(br.id)
        top = br.candidates[:n_candidates]
        c0 = top[0] if top else None
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
    return ArrangementOption(
        key=key, label=label, current=current, ok=bool(fig.ok) and slope_ok and bool(bears),
        bearings=bears, min_life_h=min(lives) if lives else None, min_s0=min(s0s) if s0s else None,
        max_D_mm=max(Ds) if Ds else None, total_B_mm=sum(Bs) if Bs else None,
        volume_cm3=vol if Ds else None, failing=fig.failing)


def compare_arrangements(design: Any, *, keys: Iterable[str] | None = None,
                         n_candidates: int = 3, catalogue: Any = None) -> ArrangementComparison:
    """Every arrangement of :data:`ARRANGEMENTS` (or ``keys``) on the current layout, ranked.

    Each is solved by :func:`engine.solve`. Ranking: arrangements that meet every requirement
    first (bearing life, static safety and speed of the first-ranked candidates, slopes within
    the bearings' limits, no failing shaft check), then the smallest space taken (the annular
    volume Σ π/4·(D² − d²)·B of the chosen bearings), then the longer smallest life; those
    the engine cannot solve come last with its message.
    """
    import time

    t0 = time.perf_counter()
    design = parse_design(design)
    data = design.model_dump(mode="json")
    cur = _current_arrangement(design)
    keys = list(ARRANGEMENTS) if keys is None else list(keys)
    opts = []
    for k in keys:
        lab = arrangement_label(data, k) if k in ARRANGEMENTS else k
        if k not in ARRANGEMENTS:
            raise _err("arrangement", f"unknown arrangement {k!r}; use one of {', '.join(ARRANGEMENTS)}")
        opts.append(_option(k, lab, arrangement_design(data, k), current=(k == cur), n_candidates=n_candidates,
                            catalogue=catalogue))
    order = sorted(range(len(opts)), key=lambda i: (
        opts[i].error is not None, not opts[i].ok,
        opts[i].volume_cm3 if opts[i].volume_cm3 is not None else math.inf,
        -(opts[i].min_life_h or 0.0)))
    ranked = [opts[i].model_copy(update={"rank": r + 1}) for r, i in enumerate(order)]
    i, j = _ends(data)
    return ArrangementComparison(supports=(data["supports"][i]["id"], data["supports"][j]["id"]),
                                 options=ranked, elapsed_s=time.perf_counter() - t0)


# --- the batched structural solve -------------------------------------------------------------
# engine.beam.solve_bending_many: the bending of every variant at once (block-tridiagonal
# elimination over the variants); kept here under its first name.
batched_bending = solve_bending_many


def batched_analyses(designs: Sequence[Design], *, loads: Sequence[Any] | None = None) -> list[Any]:
    """:func:`engine.solve.analyse` for many designs at once (bending by :func:`batched_bending`).

    ``loads``: per design, the list of per-case loads when the caller already has them (a
    variant that moves no element and changes no element property has the base's loads).
    """
    from engine.beam import build_mesh
    from engine.loads import case_loads
    from engine.solve import Analysis, _weight_density

    meshes = [build_mesh(d) for d in designs]
    all_loads = [list(loads[k]) if loads is not None and loads[k] is not None
                 else [case_loads(d, c) for c in d.load_cases] for k, d in enumerate(designs)]
    F_list, w_list = [], []
    for d, mesh, ls in zip(designs, meshes, all_loads):
        nc, N = len(ls), mesh.n_nodes
        F = np.zeros((nc, 2, N, 2))
        if ls:  # as engine.solve.analyse, every case at once: Fy, Cz (x–y plane), Fz, −Cy (x–z plane)
            at = (slice(None), mesh.element_nodes)
            Fe, Ce = np.array([cl.F_N for cl in ls]), np.array([cl.C_Nmm for cl in ls])  # (nc, n_elements, 3)
            np.add.at(F[:, 0, :, 0], at, Fe[:, :, 1])
            np.add.at(F[:, 0, :, 1], at, Ce[:, :, 2])
            np.add.at(F[:, 1, :, 0], at, Fe[:, :, 2])
            np.add.at(F[:, 1, :, 1], at, -Ce[:, :, 1])
        F_list.append(F)
        w_list.append(_weight_density(d, ls))
    beams = batched_bending(designs, meshes, F_list, [w[:, 1:] for w in w_list])
    out = []
    for d, mesh, ls, beam, w in zip(designs, meshes, all_loads, beams, w_list):
        Fr = np.hypot(beam.R_N[:, 0, :], beam.R_N[:, 1, :])
        volume = float(np.sum(mesh.A_mm2 * mesh.le_mm))
        Fa_ext = np.array([cl.F_N[:, 0].sum() for cl in ls]) + w[:, 0] * volume
        out.append(Analysis(d, mesh, ls, beam, Fr, Fa_ext, np.empty(0), np.empty(0)))
    return out


# --- the batched study path ---------------------------------------------------------------------

class _HeldRating:
    """Rates only the bearings held by a study (one catalogue row per support) with the bearing
    layer's own screening (engine.bearings.candidates.screen_rows), for variants whose
    arrangement has no induced axial forces (no angular contact or tapered bearing): there the
    axial split does not depend on the rows, and a row's figures do not depend on the others,
    so the held row's life, static safety and verdict are those of the full rating.
    ``rate_many`` gives None where it does not apply (the caller then runs the full rating).
    """

    def __init__(self, design: Design, held: dict[str, str], catalogue: Any = None):
        from engine.bearings import bundled_catalogue
        from engine.bearings.equivalent import INDUCED_TYPES
        from engine.bearings.life import WEIBULL_B, WEIBULL_THETA, WEIBULL_X0, a1_iso, weibull_factor
        from engine.bearings.lubrication import viscosity_at

        self.ok = not any(s.bearing_type in INDUCED_TYPES for s in design.supports)
        self.cat = cat = bundled_catalogue() if catalogue is None else catalogue
        req = design.requirements
        if req.reliability_method == "weibull":
            self.a_R = float(weibull_factor(req.reliability_pct, x0=getattr(req, "weibull_x0", WEIBULL_X0),
                                            theta=getattr(req, "weibull_theta", WEIBULL_THETA),
                                            b=getattr(req, "weibull_b", WEIBULL_B)))
        else:
            self.a_R = float(a1_iso(req.reliability_pct))
        self.ec = req.contamination_ec
        self.nu = None
        if req.lubricant is not None and self.ec is not None:
            lub = req.lubricant
            try:
                self.nu = float(viscosity_at(lub.operating_temp_C, iso_vg=lub.iso_vg,
                                             viscosity_index=lub.viscosity_index))
            except ValueError:
                self.ok = False
        self.rows: dict[str, int] = {}
        for s in design.supports:
            name = held.get(s.id)
            if s.bearing_type is None:
                continue
            hit = np.flatnonzero((cat.designation == name) & (cat.bearing_type == s.bearing_type)) if name else []
            if len(hit) != 1:
                self.ok = False
            else:
                self.rows[s.id] = int(hit[0])

    def _fits(self, design: Design) -> bool:
        """The held rows still fit every bearing seat of this variant."""
        cat = self.cat
        for s in design.supports:
            if s.bearing_type is None:
                continue
            r = self.rows.get(s.id)
            bore = float(s.bore_mm if s.bore_mm is not None else design.shaft.diameter_at(s.x_mm))
            if r is None or abs(cat.d_mm[r] - bore) >= 0.01 or s.contact_angle_deg is not None \
                    or (s.dimension_series and cat.series[r] not in s.dimension_series):
                return False
        return True

    def rate_many(self, designs: Sequence[Design], analyses: Sequence[Any]) -> list[tuple[Any, list[Any]] | None]:
        """Per variant (split, bearings) of the held rows, or None where the full rating must
        run (the held row no longer fits, or the axial resolution refuses the layout).

        Variants with one bearing layout (types, axial roles, load cases) are rated together:
        their load cases are stacked for the axial resolution (case by case, so each variant's
        split is its own) and each support's held row is screened over all of them in one call.
        """
        from dataclasses import replace
        from types import SimpleNamespace

        from engine.bearings.axial import resolve_axial
        from engine.bearings.candidates import LIFE_CAP_H, screen_rows

        out: list[tuple[Any, list[Any]] | None] = [None] * len(designs)
        if not self.ok:
            return out
        cat = self.cat
        groups: dict[tuple, list[int]] = {}
        for k, d in enumerate(designs):
            if self._fits(d):
                key = (tuple((s.id, s.bearing_type, s.axial) for s in d.supports),
                       tuple((c.speed_rpm, c.time_fraction) for c in d.load_cases))
                groups.setdefault(key, []).append(k)
        for ks in groups.values():
            d0 = designs[ks[0]]
            req = d0.requirements
            G, nc, ns = len(ks), len(d0.load_cases), len(d0.supports)
            Fr = np.stack([analyses[k].Fr_N for k in ks])  # (G, nc, ns)
            Ka = np.stack([analyses[k].Fa_ext_N for k in ks])
            try:
                split = resolve_axial(d0, Fr.reshape(G * nc, ns), Ka.reshape(-1), induced_ratios=np.zeros(ns))
            except DesignError:
                continue  # each variant goes through the full rating, which gives its own message
            Fa = split.Fa_N.reshape(G, nc, ns)
            n = np.array([c.speed_rpm for c in d0.load_cases], float)
            t = np.array([c.time_fraction for c in d0.load_cases], float)
            per_support = []
            for i, s in enumerate(d0.supports):
                if s.bearing_type is None:
                    continue
                r = self.rows[s.id]
                sc = screen_rows(cat, np.array([r]), bearing_type=s.bearing_type, Fr_N=Fr[:, :, i],
                                 Fa_N=Fa[:, None, :, i], speed_rpm=n, time_fraction=t,
                                 life_h=req.life_h, a_R=self.a_R, s0_min=req.s0_min,
                                 application_factor=float(req.application_factor), paired=False,
                                 nu_mm2_s=self.nu, ec=self.ec)
                per_support.append((s, r, sc))
            parts = {f: getattr(split, f).reshape(G, nc, ns) for f in ("Fa_N", "Fx_N", "induced_N", "ratio")}
            for g, k in enumerate(ks):
                bearings = []
                for s, r, sc in per_support:
                    life_ok, static_ok, speed_ok = sc.life_ok[g, 0], sc.static_ok[g, 0], sc.speed_ok[g, 0]
                    reasons = [w for w, flag in (("life", life_ok), ("static", static_ok), ("speed", speed_ok))
                               if not flag]
                    cand = SimpleNamespace(designation=str(cat.designation[r]), Lnm_h=float(sc.Lnm_h[g, 0]),
                                           d_mm=float(cat.d_mm[r]), D_mm=float(cat.D_mm[r]), B_mm=float(cat.B_mm[r]),
                                           L10_h=float(sc.L10_h[g, 0]), s0=float(min(sc.s0[g, 0], LIFE_CAP_H)),
                                           ok=bool(sc.ok[g, 0]), reasons=reasons)
                    bearings.append(SimpleNamespace(id=s.id, bearing_type=s.bearing_type, candidates=[cand]))
                out[k] = (replace(split, **{f: v[g] for f, v in parts.items()}), bearings)
        return out


def _mirror_result(design: Design, a: Any, held: tuple[Any, list[Any]] | None = None,
                   modes: Any = None, kt_shoulders: Any = None, catalogue: Any = None) -> Any:
    """The parts of :func:`engine.solve`'s Result that the figures use, from an Analysis
    (bearings rated, axial force and torque along x, shaft checks), as solve() makes them.

    ``held``: (split, bearings) of the held rows (:meth:`_HeldRating.rate_many`), else the
    full bearing rating runs; ``modes``, ``kt_shoulders``: the variant's lateral modes and
    shoulder factors when already computed (for all variants at once)."""
    from types import SimpleNamespace

    from engine.bearings import rate_bearings
    from engine.checks import shaft_checks
    from engine.mounting import mounting
    from engine.solve import carry_axial

    if held is None:
        outcome = rate_bearings(design, Fr_N=a.Fr_N, Fa_ext_N=a.Fa_ext_N, catalogue=catalogue)
        split, bearings, bchecks = outcome.split, outcome.bearings, list(outcome.checks)
    else:
        (split, bearings), bchecks = held, []
    carry_axial(a, split.Fx_N)
    sc = shaft_checks(a, modes=modes, min_diameter=False, kt_shoulders=kt_shoulders)  # no section sizes shown
    bchecks += mounting(a, bearings, with_fits=False).checks
    shaft = SimpleNamespace(min_safety_factor=sc.min_safety_factor, critical_speed_rpm=sc.critical_speed_rpm)
    cases = [SimpleNamespace(speed_rpm=c.speed_rpm) for c in design.load_cases]
    return SimpleNamespace(bearings=bearings, checks=bchecks + list(sc.checks), shaft=shaft, load_cases=cases)


def _loads_unchanged(study: Study) -> bool:
    """True when no variable changes an element's loads (positions of supports and elements,
    segment sizes, bearings): the base design's per-case loads serve every variant."""
    for v in study.variables:
        p = v.path
        if p.startswith("elements.") and not p.endswith(".x_mm"):
            return False
    return True


def _batched_figures(designs: list[Design], study: Study, held: dict[str, str],
                     base_loads: list[Any] | None, *, fast_bearings: bool = False,
                     catalogue: Any = None) -> list[VariantFigures | DesignError]:
    from dataclasses import replace

    loads = None
    if base_loads is not None:
        loads = []
        for d in designs:
            xs = np.array([e.x_mm for e in d.elements], dtype=float)
            loads.append([replace(cl, x_mm=xs) for cl in base_loads])
    out: list[VariantFigures | DesignError] = []
    analyses = batched_analyses(designs, loads=loads)
    rated: list[Any] = [None] * len(designs)
    if fast_bearings and designs:
        try:
            rated = _HeldRating(designs[0], held, catalogue).rate_many(designs, analyses)
        except (ArithmeticError, ValueError, IndexError):  # each variant then takes the full rating
            rated = [None] * len(designs)
    try:  # the figures show the first critical speed only: one mode (5 trial vectors) converges fastest
        modes = dynamics.lateral_frequencies_many(designs, n_modes=1)
    except (ArithmeticError, ValueError, IndexError):  # each variant's own checks then say what is wrong
        modes = [None] * len(designs)
    try:
        kts = shoulder_kt([d.shaft for d in designs])
    except (ArithmeticError, ValueError, IndexError):
        kts = [None] * len(designs)
    for d, a, r, m, kt, vals in zip(designs, analyses, rated, modes, kts, study.combinations()):
        try:
            out.append(figures_of(d, _mirror_result(d, a, r, m, kt, catalogue), held=held, values=vals))
        except DesignError as exc:
            out.append(exc)
        except (ArithmeticError, ValueError, IndexError, np.linalg.LinAlgError) as exc:
            out.append(_fault(exc))
    return out


def _same(f: VariantFigures, g: VariantFigures, rtol: float = 1e-9) -> bool:
    """Two variants' figures agree (numbers to ``rtol``)."""
    def close(x, y):
        if x is None or y is None:
            return x is y
        if isinstance(x, (int, float)) and isinstance(y, (int, float)):
            return math.isclose(x, y, rel_tol=rtol, abs_tol=1e-12) or (math.isinf(x) and x == y)
        return x == y
    if f.ok != g.ok or f.failing != g.failing or len(f.bearings) != len(g.bearings):
        return False
    keys = ("min_life_h", "safety_factor", "max_slope_rad", "critical_speed_rpm")
    if not all(close(getattr(f, k), getattr(g, k)) for k in keys):
        return False
    for b, c in zip(f.bearings, g.bearings):
        for k in ("designation", "life_h", "L10_h", "s0", "ok", "slope_rad", "slope_limit_rad"):
            if not close(getattr(b, k), getattr(c, k)):
                return False
    return True
