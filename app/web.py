"""Form ⇄ design conversion for the editor page.

The editor is one HTML form whose field names are the design's key paths
(``supports[1].x_mm``, ``shaft.material.E_GPa``). Values in the form are *display* text in
the chosen unit system; the design document is SI-mm. This module:

- :func:`design_to_form` turns a design mapping into form state (path → text) for a system;
- :func:`form_to_design` turns posted form state back into a design mapping, collecting
  every problem with its key path and keeping the user's text untouched;
- :func:`apply_op` does the structural edits (add, remove, move a row; switch units);
- :func:`editor_sections` describes the rows and fields that the template draws;
- :func:`place_issues` finds, for each problem, the slot on the page where its message goes;
- :func:`bearing_table_view` says which bearing table the design rates against (the bundled
  illustrative one, or the designer's own, carried in the design as ``bearing_table``).

Keys the form does not show (grooves, per-case torques, solver settings, …) travel in hidden
``<path>._extra`` fields as JSON, so an edit in the browser never drops part of a saved design.
The designer's own bearing table travels in two hidden fields, ``bearing_table.name`` and
``bearing_table.csv`` (the CSV text as loaded); an empty ``bearing_table.csv`` means the
bundled table.
"""
from __future__ import annotations

import functools
import json
import math
import re
from dataclasses import dataclass, field
from typing import Any, Iterable, Mapping

from app import units
from engine.model import (BEARING_TYPES, ELEMENT_KINDS, BevelGear, Coupling, Gear, Issue, LoadCase,
                          Lubricant, Material, PointForce, PointMoment, Pulley, Requirements, Segment, Sprocket,
                          Support)

__all__ = [
    "Field", "Row", "Section", "FormState", "LISTS", "ELEMENT_FIELDS", "design_to_form",
    "form_to_design", "apply_op", "editor_sections", "place_issues", "slug", "parse_number",
    "BEARING_LABELS", "KIND_LABELS", "read_form", "BT_NAME", "BT_CSV", "BearingTableView",
    "bearing_table_view", "bearing_table_issues", "BUNDLED_TABLE_NAME", "REQUIREMENT_FIELDS", "upgrade_form",
    "LUBRICANT_FIELDS", "LOAD_CASE_FIELDS",
]

FormState = dict[str, str]
BT_NAME, BT_CSV = "bearing_table.name", "bearing_table.csv"  # form keys of the own table

BEARING_LABELS = {
    "deep_groove_ball": "deep groove ball", "angular_contact_ball": "angular contact ball",
    "self_aligning_ball": "self-aligning ball", "cylindrical_roller": "cylindrical roller",
    "tapered_roller": "tapered roller", "spherical_roller": "spherical roller",
    "needle_roller": "needle roller", "": "none (rigid support, not rated)",
}
AXIAL_LABELS = {"both": "locating, both ways", "none": "floating", "+x": "takes thrust toward +x",
                "-x": "takes thrust toward −x"}
KIND_LABELS = {"gear": "gear (spur/helical)", "bevel_gear": "bevel gear", "pulley": "belt pulley",
               "sprocket": "chain sprocket", "coupling": "coupling (torque only)",
               "force": "point force", "moment": "point moment"}


@dataclass(frozen=True)
class Field:
    """One editable key: its name in the document, label, quantity (for the unit), kind."""

    key: str
    label: str
    quantity: str = "ratio"
    kind: str = "number"  # number | text | select | check
    required: bool = True
    options: tuple[tuple[str, str], ...] = ()
    empty_means: str = "omit"  # omit | null  (what an empty optional box sends)
    hint: str = ""  # placeholder text in the empty box
    note: str = ""  # a short line shown across the grid after the box
    group: bool = False  # starts a group of its own: the box begins a new line of the grid


def _f(key: str, label: str, quantity: str = "ratio", **kw: Any) -> Field:
    return Field(key, label, quantity, **kw)


def _opt(key: str, label: str, quantity: str = "ratio", **kw: Any) -> Field:
    return Field(key, label, quantity, required=False, **kw)


_TORQUE = _opt("torque_Nm", "torque on shaft", "moment", empty_means="null",
               hint="empty: balances the others")
_SEL_BEARING = tuple((k, BEARING_LABELS[k]) for k in (*BEARING_TYPES, ""))

TOP_FIELDS = (_f("name", "design name", kind="text"),)
MATERIAL_FIELDS = (
    _f("name", "material", kind="text"),
    _f("E_GPa", "Young's modulus E", "modulus"),
    _f("G_GPa", "shear modulus G", "modulus"),
    _f("density_kg_m3", "density", "density"),
    _f("Su_MPa", "tensile strength Su", "stress"),
    _f("Sy_MPa", "yield strength Sy", "stress"),
)
SEGMENT_FIELDS = (
    _f("length_mm", "length", "length"),
    _f("d_mm", "diameter", "length"),
    _opt("bore_mm", "bore", "length", hint="empty: solid"),
    _opt("fillet_r_mm", "shoulder fillet r", "length"),
)
SUPPORT_FIELDS = (
    _f("id", "name", kind="text"),
    _f("x_mm", "position x", "length"),
    _f("bearing_type", "bearing", kind="select", options=_SEL_BEARING, required=False,
       empty_means="null"),
    _f("axial", "axial role", kind="select", options=tuple(AXIAL_LABELS.items())),
    _opt("contact_angle_deg", "contact angle", "angle"),
    _opt("radial_stiffness_N_per_mm", "radial stiffness", "stiffness", hint="empty: the bearing's"),
    _opt("designation", "chosen bearing", kind="text", hint="empty: first ranked"),
)
_COMMON = (_f("id", "name", kind="text"),
           _f("kind", "kind", kind="select", options=tuple(KIND_LABELS.items())),
           _f("x_mm", "position x", "length"))
_TAIL = (_opt("mass_kg", "mass", "mass"), _opt("width_mm", "hub width", "length"),
         _f("keyway", "keyway", kind="select", required=False, empty_means="omit",
            options=(("", "none"), ("end_milled", "end-milled"), ("sled_runner", "sled-runner"))))
ELEMENT_FIELDS: dict[str, tuple[Field, ...]] = {
    "gear": _COMMON + (
        _f("pitch_d_mm", "pitch diameter", "length"),
        _f("pressure_angle_deg", "pressure angle", "angle"),
        _f("helix_angle_deg", "helix angle", "angle"),
        _f("hand", "helix hand", kind="select", required=False, empty_means="omit",
           options=(("", "— (spur)"), ("right", "right"), ("left", "left"))),
        _f("mesh_angle_deg", "mesh point angle", "angle"),
        _TORQUE) + _TAIL,
    "bevel_gear": _COMMON + (
        _f("pitch_d_mm", "mean pitch diameter", "length"),
        _f("pressure_angle_deg", "pressure angle", "angle"),
        _f("pitch_cone_angle_deg", "pitch cone angle", "angle"),
        _f("apex", "cone apex toward", kind="select", options=(("+x", "+x"), ("-x", "−x"))),
        _f("mesh_angle_deg", "mesh point angle", "angle"),
        _TORQUE) + _TAIL,
    "pulley": _COMMON + (
        _f("pitch_d_mm", "pitch diameter", "length"),
        _f("strand_angle_deg", "belt direction", "angle"),
        _f("wrap_angle_deg", "wrap angle", "angle"),
        _opt("tension_ratio", "tension ratio T1/T2", hint="or give a pull factor"),
        _opt("pull_factor", "pull factor"),
        _TORQUE) + _TAIL,
    "sprocket": _COMMON + (
        _f("pitch_d_mm", "pitch diameter", "length"),
        _f("strand_angle_deg", "chain direction", "angle"),
        _f("wrap_angle_deg", "wrap angle", "angle"),
        _TORQUE) + _TAIL,
    "coupling": _COMMON + (_TORQUE,) + _TAIL,
    "force": _COMMON + (
        _f("Fx_N", "force Fx", "force"), _f("Fy_N", "force Fy", "force"),
        _f("Fz_N", "force Fz", "force"),
        _opt("arm_y_mm", "acts at y", "length"), _opt("arm_z_mm", "acts at z", "length"),
    ) + _TAIL,
    "moment": _COMMON + (_f("My_Nm", "moment My", "moment"), _f("Mz_Nm", "moment Mz", "moment"))
    + _TAIL,
}
_KIND_MODEL = {"gear": Gear, "bevel_gear": BevelGear, "pulley": Pulley, "sprocket": Sprocket,
               "coupling": Coupling, "force": PointForce, "moment": PointMoment}
LOAD_CASE_FIELDS = (
    _f("name", "name", kind="text"),
    _f("time_fraction", "share of time", hint="fractions sum to 1"),
    _f("speed_rpm", "speed", "speed"),
    _f("torque_factor", "torque factor"),
    _opt("force_factor", "force factor"),
)
_REQ_BEARINGS = (
    _f("life_h", "required bearing life", "time"),
    _f("reliability_pct", "reliability", "percent"),
    _f("application_factor", "application factor"),
    _f("s0_min", "min. static safety s0"),
)
# ISO 281:2007 guideline values of ec for Dpw < 100 mm (from memory: /work/shared/references.md)
_EC_BANDS = ("1 extreme cleanliness", "0.8–0.6 high", "0.6–0.5 normal", "0.5–0.3 slight",
             "0.3–0.1 typical", "0.1–0 severe", "0 very severe")
_REQ_EC = _opt("contamination_ec", "contamination factor ec", hint="empty: no aISO",
               note="contamination factor ec, guide values (ISO 281, Dpw < 100 mm): "
                    + " · ".join(b.replace(" ", "\u00a0").replace("–", "\u2060–\u2060") for b in _EC_BANDS)
                    + ". Leave the ISO VG grade and temperature empty for no aISO.")
_REQ_SHAFT = (
    _opt("fatigue_safety_min", "min. fatigue safety", group=True),
    _opt("yield_safety_min", "min. yield safety"),
    _opt("gear_deflection_max_mm", "max. deflection at gears", "deflection"),
    _opt("gear_slope_max_rad", "max. slope at gears", "slope"),
    _opt("twist_limit_deg_per_m", "max. twist", "twist", hint="empty: common practice"),
)
REQUIREMENT_FIELDS = _REQ_BEARINGS + (_REQ_EC,) + _REQ_SHAFT
# requirements.lubricant.*: both grade and temperature, or neither (then no aISO). The
# temperature stays in °C in either unit system: app.units has no temperature quantity.
LUBRICANT_FIELDS = (
    _opt("iso_vg", "ISO VG grade", "viscosity", hint="empty: no aISO", group=True),
    _opt("operating_temp_C", "operating temperature", "temperature", hint="empty: no aISO"),
    _opt("viscosity_index", "viscosity index"),
)
LUB = "requirements.lubricant."  # form prefix of the lubricant's fields
# labels of quantities that app.units does not convert (the same in both systems)
_FIXED_UNITS = {"viscosity": "mm²/s at 40 °C"}

# list path -> (fields of one row or None for elements, defaults of a new row in SI)
LISTS: dict[str, str] = {"shaft.segments": "segment", "supports": "support",
                         "elements": "element", "load_cases": "load case"}

_NEW_ELEMENT_DEFAULTS: dict[str, dict[str, Any]] = {
    "gear": {"pitch_d_mm": 120, "pressure_angle_deg": 20, "helix_angle_deg": 0,
             "mesh_angle_deg": 0, "torque_Nm": None},
    "bevel_gear": {"pitch_d_mm": 120, "pressure_angle_deg": 20, "pitch_cone_angle_deg": 45,
                   "apex": "+x", "mesh_angle_deg": 0, "torque_Nm": None},
    "pulley": {"pitch_d_mm": 150, "strand_angle_deg": 0, "wrap_angle_deg": 180,
               "tension_ratio": 3, "torque_Nm": None},
    "sprocket": {"pitch_d_mm": 120, "strand_angle_deg": 0, "wrap_angle_deg": 180,
                 "torque_Nm": None},
    "coupling": {"torque_Nm": None},
    "force": {"Fx_N": 0, "Fy_N": -1000, "Fz_N": 0},
    "moment": {"My_Nm": 0, "Mz_Nm": 0},
}

_IDX = re.compile(r"^(shaft\.segments|supports|elements|load_cases)\[(\d+)\]\.(.+)$")


def _unit(f: Field, system: str) -> str:
    """Unit label of a number field in ``system`` ("" for a plain ratio)."""
    return units.unit_label(f.quantity, system) or _FIXED_UNITS.get(f.quantity, "")


def slug(path: str) -> str:
    """A DOM-id-safe form of a key path: ``supports[1].x_mm`` → ``supports-1-x_mm``."""
    return re.sub(r"[^A-Za-z0-9_]+", "-", path).strip("-")


# --- numbers -------------------------------------------------------------------------------

def parse_number(text: str) -> float:
    """Read a number as a person types it: spaces and thin spaces ignored, a typographic minus
    accepted, one decimal comma accepted when there is no point. Raises ``ValueError``."""
    t = text.strip().replace("\u2212", "-").replace("\u202f", "").replace(" ", "").replace("_", "")
    if "," in t and "." not in t and t.count(",") == 1:
        t = t.replace(",", ".")
    v = float(t)
    if not math.isfinite(v):
        raise ValueError("not finite")
    return v


# --- design -> form --------------------------------------------------------------------------

def _default(model: Any, key: str) -> Any:
    """The model's default for ``key`` (None when it has none): shown in the box, so the user
    sees the value the engine will use."""
    info = getattr(model, "model_fields", {}).get(key) if model is not None else None
    if info is None or info.is_required():
        return None
    d = info.get_default(call_default_factory=True)
    return d if isinstance(d, (int, float, str)) and not isinstance(d, bool) else None


def _put_obj(out: FormState, prefix: str, obj: Mapping[str, Any], fields: Iterable[Field],
             system: str, skip: tuple[str, ...] = (), model: Any = None) -> None:
    fields = tuple(fields)
    shown = {f.key for f in fields}
    for f in fields:
        v = obj.get(f.key)
        if v is None and f.key not in obj and f.required:
            v = _default(model, f.key)
        if f.kind == "number":
            out[prefix + f.key] = "" if v is None else units.fmt_input(float(v), f.quantity, system)
        elif f.kind == "check":
            out[prefix + f.key] = "1" if v else ""
        else:
            out[prefix + f.key] = "" if v is None else str(v)
    extra = {k: v for k, v in obj.items() if k not in shown and k not in skip}
    if extra:
        out[prefix + "_extra"] = json.dumps(extra, separators=(",", ":"))


def design_to_form(design: Mapping[str, Any], system: str = "si") -> FormState:
    """Form state (path → display text) for a design mapping (SI-mm) in ``system``."""
    d = dict(design)
    out: FormState = {"units": system}
    _put_obj(out, "", d, TOP_FIELDS, system,
             skip=("shaft", "supports", "elements", "load_cases", "requirements", "gravity"))
    out["notes"] = str(d.get("notes", "") or "")
    extra = json.loads(out.pop("_extra", "{}"))
    extra.pop("notes", None)
    if "gravity" in d and d["gravity"] is not None:
        extra["gravity"] = d["gravity"]
    out[BT_NAME], out[BT_CSV] = "", ""
    bt = extra.get("bearing_table")
    if bt is None:
        extra.pop("bearing_table", None)
    elif isinstance(bt, dict) and isinstance(bt.get("csv"), str) and isinstance(bt.get("name", ""), str):
        extra.pop("bearing_table")
        out[BT_NAME], out[BT_CSV] = str(bt.get("name", "")), bt["csv"]
        rest = {k: v for k, v in bt.items() if k not in ("name", "csv")}
        if rest:
            out["bearing_table._extra"] = json.dumps(rest, separators=(",", ":"))
    # anything else under bearing_table stays in _extra, for the engine to report
    if extra:
        out["_extra"] = json.dumps(extra, separators=(",", ":"))
    out["gravity.on"] = "" if ("gravity" in d and d["gravity"] is None) else "1"
    shaft = dict(d.get("shaft") or {})
    _put_obj(out, "shaft.", shaft, (), system, skip=("material", "segments"))
    _put_obj(out, "shaft.material.", dict(shaft.get("material") or {}), MATERIAL_FIELDS, system,
             model=Material)
    for i, s in enumerate(shaft.get("segments") or []):
        _put_obj(out, f"shaft.segments[{i}].", s, SEGMENT_FIELDS, system, model=Segment)
    for i, s in enumerate(d.get("supports") or []):
        _put_obj(out, f"supports[{i}].", s, SUPPORT_FIELDS, system, model=Support)
    for i, e in enumerate(d.get("elements") or []):
        kind = e.get("kind", "gear")
        _put_obj(out, f"elements[{i}].", e, ELEMENT_FIELDS.get(kind, _COMMON), system,
                 model=_KIND_MODEL.get(kind))
    for i, c in enumerate(d.get("load_cases") or []):
        _put_obj(out, f"load_cases[{i}].", c, LOAD_CASE_FIELDS, system, model=LoadCase)
    req = dict(d.get("requirements") or {})
    lub = req.get("lubricant")
    if lub is None or isinstance(lub, dict):  # else: not a lubricant; _extra keeps it for the engine
        _put_obj(out, LUB, dict(lub or {}), LUBRICANT_FIELDS, system, model=Lubricant)
        req.pop("lubricant", None)
    else:
        _put_obj(out, LUB, {}, LUBRICANT_FIELDS, system)
    _put_obj(out, "requirements.", req, REQUIREMENT_FIELDS, system, model=Requirements)
    return out


def upgrade_form(form: Mapping[str, str]) -> FormState:
    """Form state saved before a key got its own box (a browser's working copy): the key
    moves out of the hidden ``requirements._extra`` into its box, so it is shown, and so an
    empty box means what it says. Form state that has the boxes is returned as it is."""
    out = dict(form)
    raw = out.get("requirements._extra", "")
    try:
        extra = json.loads(raw) if raw else {}
    except (ValueError, RecursionError):
        return out
    if not isinstance(extra, dict):
        return out
    system = out.get("units", "si") if out.get("units") in units.SYSTEMS else "si"
    part: FormState = {}
    moved = {f.key: extra.pop(f.key) for f in REQUIREMENT_FIELDS
             if "requirements." + f.key not in out and f.key in extra}
    try:
        _put_obj(part, "requirements.", moved, [f for f in REQUIREMENT_FIELDS if f.key in moved], system)
        if not any(LUB + f.key in out for f in LUBRICANT_FIELDS) and isinstance(extra.get("lubricant"), dict):
            _put_obj(part, LUB, extra.pop("lubricant"), LUBRICANT_FIELDS, system)
    except (TypeError, ValueError):  # a value that is not a number: leave it all where it was
        return out
    if not part:
        return out
    out.update(part)
    if extra:
        out["requirements._extra"] = json.dumps(extra, separators=(",", ":"))
    else:
        out.pop("requirements._extra", None)
    return out


# --- form -> design --------------------------------------------------------------------------

def _indices(form: Mapping[str, str], list_path: str) -> list[int]:
    seen = set()
    for k in form:
        m = _IDX.match(k)
        if m and m.group(1) == list_path:
            seen.add(int(m.group(2)))
    return sorted(seen)


def _read_obj(form: Mapping[str, str], prefix: str, fields: Iterable[Field], system: str,
              issues: list[Issue]) -> dict[str, Any]:
    obj: dict[str, Any] = {}
    raw_extra = form.get(prefix + "_extra", "")
    if raw_extra:
        try:
            extra = json.loads(raw_extra)
            if isinstance(extra, dict):
                obj.update(extra)
        except (ValueError, RecursionError):  # not JSON, or nested past the parser's depth
            pass
    for f in fields:
        path = prefix + f.key
        text = form.get(path, "")
        if f.kind == "check":
            obj[f.key] = bool(text)
            continue
        if text.strip() == "":
            if f.kind == "select" and f.empty_means == "null":
                obj[f.key] = None
            elif f.required and f.kind != "select":
                issues.append(Issue(path=path, message=f"{f.label} is required"))
            elif f.empty_means == "null":
                obj[f.key] = None
            continue
        if f.kind == "number":
            try:
                obj[f.key] = units.from_display(parse_number(text), f.quantity, system)
            except ValueError:
                lab = _unit(f, system)
                issues.append(Issue(path=path, message=f"{f.label} must be a number"
                                    + (f" in {lab}" if lab else "") + f", not “{text.strip()}”"))
        else:
            obj[f.key] = text.strip() if f.kind == "text" else text
    return obj


def form_to_design(form: Mapping[str, str]) -> tuple[dict[str, Any], list[Issue]]:
    """Design mapping (SI-mm) from posted form state, and the conversion problems found.

    Fields that cannot be read are left out of the mapping (and reported); everything else
    is carried over, so that the engine's own validation can report the remaining problems.
    """
    system = form.get("units", "si") if form.get("units") in units.SYSTEMS else "si"
    issues: list[Issue] = []
    d = _read_obj(form, "", TOP_FIELDS, system, issues)
    d.setdefault("format", "shaft-design/1")
    d["notes"] = form.get("notes", "")
    if not form.get("gravity.on"):
        d["gravity"] = None
    _read_bearing_table(form, d, issues)
    shaft = _read_obj(form, "shaft.", (), system, issues)
    shaft["material"] = _read_obj(form, "shaft.material.", MATERIAL_FIELDS, system, issues)
    shaft["segments"] = [_read_obj(form, f"shaft.segments[{i}].", SEGMENT_FIELDS, system, issues)
                         for i in _indices(form, "shaft.segments")]
    d["shaft"] = shaft
    d["supports"] = [_read_obj(form, f"supports[{i}].", SUPPORT_FIELDS, system, issues)
                     for i in _indices(form, "supports")]
    els = []
    for i in _indices(form, "elements"):
        kind = form.get(f"elements[{i}].kind", "gear")
        fields = ELEMENT_FIELDS.get(kind, _COMMON)
        e = _read_obj(form, f"elements[{i}].", fields, system, issues)
        model = _KIND_MODEL.get(kind)
        if model is not None:  # drop extras that belong to another kind
            e = {k: v for k, v in e.items() if k in model.model_fields}
        els.append(e)
    d["elements"] = els
    d["load_cases"] = [_read_obj(form, f"load_cases[{i}].", LOAD_CASE_FIELDS, system, issues)
                       for i in _indices(form, "load_cases")]
    d["requirements"] = _read_obj(form, "requirements.", REQUIREMENT_FIELDS, system, issues)
    _read_lubricant(form, d["requirements"], system, issues)
    # ids must stay at original indices for the paths to match: renumber nothing here.
    return d, issues


def _read_lubricant(form: Mapping[str, str], req: dict[str, Any], system: str,
                    issues: list[Issue]) -> None:
    """``requirements.lubricant`` from its three boxes into ``req``.

    All three empty: no lubricant key (no modified life with aISO; a non-mapping that
    ``requirements._extra`` carried stays, for the engine to report). Any one given: the ISO
    VG grade and the operating temperature are both needed, and a missing one is reported
    at its own box, naming what was given.
    """
    given = [f for f in LUBRICANT_FIELDS if form.get(LUB + f.key, "").strip()]
    if not given:
        return
    lub = _read_obj(form, LUB, LUBRICANT_FIELDS, system, issues)
    names = " and ".join(f.label for f in given)
    for f in LUBRICANT_FIELDS[:2]:
        if f not in given:
            issues.append(Issue(path=LUB + f.key, message=(
                f"{f.label} is needed with the {names} (or leave the lubricant empty: no aISO)")))
    req["lubricant"] = lub


def _read_bearing_table(form: Mapping[str, str], d: dict[str, Any], issues: list[Issue]) -> None:
    """The own bearing table from its two hidden fields into ``d["bearing_table"]``.

    A CSV in the fields decides; with none, ``_extra`` may still carry a ``bearing_table``
    that is not a table (a hand-edited file): it stays, for the engine to report. Line ends
    become ``\\n`` and a leading byte-order mark goes (a browser posts CRLF, a spreadsheet
    writes the mark): the saved design should not depend on either.
    """
    text = form.get(BT_CSV, "").replace("\r\n", "\n").removeprefix("\ufeff")
    name = form.get(BT_NAME, "").strip()
    if not text:
        if name:
            d.pop("bearing_table", None)
            issues.append(Issue(path=BT_CSV, message=f"{name} is empty: it has no header line and no rows"))
        return  # the bundled table, or what _extra carried (for the engine to report)
    bt: dict[str, Any] = {}
    raw = form.get("bearing_table._extra", "")
    if raw:
        try:
            rest = json.loads(raw)
            if isinstance(rest, dict):
                bt.update(rest)
        except (ValueError, RecursionError):
            pass
    bt.update(name=name or "own bearing table", csv=text)
    d["bearing_table"] = bt


# --- structural edits ---------------------------------------------------------------------

def _reindex(form: FormState, list_path: str, order: list[int | None]) -> FormState:
    """New form state where row ``order[j]`` of ``list_path`` becomes row j (None: new row)."""
    out = {k: v for k, v in form.items() if not ((m := _IDX.match(k)) and m.group(1) == list_path)}
    for j, old in enumerate(order):
        if old is None:
            continue
        pre = f"{list_path}[{old}]."
        for k, v in form.items():
            if k.startswith(pre):
                out[f"{list_path}[{j}]." + k[len(pre):]] = v
    return out


def _next_id(form: FormState, list_path: str, stem: str) -> str:
    used = {form.get(f"{list_path}[{i}].id", "") for i in _indices(form, list_path)}
    if stem == "":  # supports: A, B, C, ...
        for c in "ABCDEFGHIJKLMNOPQRSTUVWXYZ":
            if c not in used:
                return c
    n = 1
    while f"{stem}{n}" in used:
        n += 1
    return f"{stem}{n}"


def _shaft_length_mm(form: FormState) -> float:
    system = form.get("units", "si")
    total = 0.0
    for i in _indices(form, "shaft.segments"):
        try:
            total += units.from_display(parse_number(form.get(f"shaft.segments[{i}].length_mm", "")),
                                        "length", system)
        except ValueError:
            pass
    return total or 100.0


def _new_row(form: FormState, list_path: str, j: int, kind: str = "gear") -> FormState:
    system = form.get("units", "si")
    L = _shaft_length_mm(form)
    if list_path == "shaft.segments":
        last = _indices(form, list_path)
        d = 30.0
        if last:
            try:
                d = units.from_display(parse_number(form.get(f"shaft.segments[{last[-1]}].d_mm", "")),
                                       "length", system)
            except ValueError:
                pass
        obj, fields = {"length_mm": 50.0, "d_mm": d}, SEGMENT_FIELDS
    elif list_path == "supports":
        obj = {"id": _next_id(form, "supports", ""), "x_mm": round(L / 2, 1),
               "bearing_type": "deep_groove_ball", "axial": "none"}
        fields = SUPPORT_FIELDS
    elif list_path == "elements":
        stem = {"gear": "G", "bevel_gear": "BG", "pulley": "P", "sprocket": "S", "coupling": "C",
                "force": "F", "moment": "M"}.get(kind, "E")
        obj = {"id": _next_id(form, "elements", stem), "kind": kind, "x_mm": round(L / 2, 1),
               **_NEW_ELEMENT_DEFAULTS.get(kind, {})}
        fields = ELEMENT_FIELDS[kind]
    else:
        return _new_case(form, j)
    part: FormState = {}
    _put_obj(part, f"{list_path}[{j}].", obj, fields, system)
    form = dict(form)
    form.update(part)
    return form


def _new_case(form: FormState, j: int) -> FormState:
    """Form state with a new load case at row ``j`` that keeps the duty cycle valid.

    The new case splits the case with the largest share of time (the first of equals): it
    starts as a copy of that case (speed, factors and the keys the form does not show) under
    a name of its own, and the two take half of that case's share each. The fractions still
    sum to what they summed to, and the results do not change until the new case is edited.
    The first case has all the time; with no share that can be read as a number, the new
    case gets 0 and the duty-cycle message says what to fix.
    """
    system = form.get("units", "si")
    idx = _indices(form, "load_cases")
    names = {form.get(f"load_cases[{i}].name", "").strip() for i in idx}
    n = len(idx) + 1
    while f"case {n}" in names:
        n += 1
    shares: dict[int, float] = {}
    for i in idx:
        try:
            shares[i] = parse_number(form.get(f"load_cases[{i}].time_fraction", ""))
        except ValueError:
            continue
    donor = max((i for i in shares if shares[i] > 0), key=shares.__getitem__, default=None)
    pre, out = f"load_cases[{j}].", dict(form)
    if donor is None:
        _put_obj(out, pre, {"name": f"case {n}", "time_fraction": 0.0 if idx else 1.0,
                            "speed_rpm": 1000.0, "torque_factor": 1.0}, LOAD_CASE_FIELDS, system)
        return out
    src = f"load_cases[{donor}]."
    out.update({pre + k[len(src):]: v for k, v in form.items() if k.startswith(src)})
    out[pre + "name"] = f"case {n}"
    half = units.fmt_input(shares[donor] / 2, "ratio", system)
    out[src + "time_fraction"] = out[pre + "time_fraction"] = half
    return out


def _fill_kind(form: FormState, i: int) -> FormState:
    """After a kind change, give the new kind's fields their defaults where the row has none."""
    kind = form.get(f"elements[{i}].kind", "gear")
    if kind not in ELEMENT_FIELDS:
        return form
    system = form.get("units", "si")
    part: FormState = {}
    _put_obj(part, f"elements[{i}].", _NEW_ELEMENT_DEFAULTS.get(kind, {}), ELEMENT_FIELDS[kind], system)
    out = dict(form)
    for k, v in part.items():
        if k not in out and not k.endswith("._extra"):
            out[k] = v
    return out


def _switch_units(form: FormState, new: str) -> FormState:
    old = form.get("units", "si")
    if new not in units.SYSTEMS or new == old:
        return {**form, "units": new if new in units.SYSTEMS else old}
    out = dict(form)
    out["units"] = new

    def conv(path: str, f: Field) -> None:
        if f.kind != "number" or path not in form:
            return
        try:
            v = units.from_display(parse_number(form[path]), f.quantity, old)
        except ValueError:
            return  # keep what the user typed
        if new == "si":  # 6 figures: 1.850394 in comes back as 47 mm, not 47.0000076
            out[path] = units._text(units.sig(v, 6), 12)
        else:
            out[path] = units.fmt_input(v, f.quantity, new)

    for f in MATERIAL_FIELDS:
        conv("shaft.material." + f.key, f)
    for f in REQUIREMENT_FIELDS:
        conv("requirements." + f.key, f)
    for f in LUBRICANT_FIELDS:
        conv(LUB + f.key, f)
    for lp, fields in (("shaft.segments", SEGMENT_FIELDS), ("supports", SUPPORT_FIELDS),
                       ("load_cases", LOAD_CASE_FIELDS)):
        for i in _indices(form, lp):
            for f in fields:
                conv(f"{lp}[{i}].{f.key}", f)
    for i in _indices(form, "elements"):
        for f in ELEMENT_FIELDS.get(form.get(f"elements[{i}].kind", "gear"), _COMMON):
            conv(f"elements[{i}].{f.key}", f)
    return out


def apply_op(form: FormState, op: str) -> tuple[FormState, str | None]:
    """Apply a structural edit and return (new form state, path of the field to focus).

    ``op`` is ``add:<list>[:<kind>]``, ``remove:<list>:<i>``, ``up:<list>:<i>``,
    ``down:<list>:<i>``, ``kind:<i>`` (an element changed kind) or ``units:<si|us>``.
    Unknown or out-of-range ops leave the state as it is.
    """
    parts = op.split(":")
    verb = parts[0]
    if verb == "units" and len(parts) == 2:
        return _switch_units(form, parts[1]), None
    if verb == "kind" and len(parts) == 2 and parts[1].isdigit():
        return _fill_kind(form, int(parts[1])), f"elements[{parts[1]}].kind"
    if len(parts) < 2 or parts[1] not in LISTS:
        return form, None
    lp = parts[1]
    idx = _indices(form, lp)
    order: list[int | None] = list(idx)
    if verb == "add":
        kind = parts[2] if len(parts) > 2 and parts[2] in ELEMENT_KINDS else "gear"
        new = _reindex(form, lp, order)
        j = len(order)
        first = {"shaft.segments": "length_mm", "supports": "x_mm", "elements": "x_mm",
                 "load_cases": "name"}[lp]
        return _new_row(new, lp, j, kind), f"{lp}[{j}].{first}"
    if len(parts) != 3 or not parts[2].isdigit():
        return form, None
    i = int(parts[2])
    if i not in idx:
        return form, None
    pos = idx.index(i)
    if verb == "remove":
        order.pop(pos)
        focus = f"add:{lp}"
    elif verb == "up" and pos > 0:
        order[pos - 1], order[pos] = order[pos], order[pos - 1]
        focus = f"up:{lp}:{pos - 1}"
    elif verb == "down" and pos < len(order) - 1:
        order[pos + 1], order[pos] = order[pos], order[pos + 1]
        focus = f"down:{lp}:{pos + 1}"
    else:
        return form, None
    return _reindex(form, lp, order), focus


# --- what the template draws --------------------------------------------------------------

@dataclass
class FieldView:
    path: str
    id: str
    label: str
    unit: str
    kind: str
    value: str
    required: bool
    options: tuple[tuple[str, str], ...]
    hint: str
    wide: bool = False
    note: str = ""
    group: bool = False


@dataclass
class Row:
    list_path: str
    index: int
    position: int
    count: int
    title: str
    fields: list[FieldView]
    extra_name: str
    extra_value: str

    @property
    def id(self) -> str:
        return "row-" + slug(f"{self.list_path}[{self.index}]")


@dataclass
class Section:
    key: str
    title: str
    fields: list[FieldView] = field(default_factory=list)
    rows: list[Row] = field(default_factory=list)
    list_path: str | None = None
    noun: str = ""
    extras: list[tuple[str, str]] = field(default_factory=list)


def _placeholder(f: Field, model: Any, system: str) -> str:
    """What an empty box says: the field's own hint, else, for an optional number that the
    model fills in when it is left out, "default <value>" in the display unit system."""
    if f.hint or f.required or f.kind != "number" or f.empty_means != "omit":
        return f.hint
    d = _default(model, f.key)
    return "" if d is None else "default " + units.fmt(float(d), f.quantity, system).replace("\u202f", " ")


def _views(form: FormState, prefix: str, fields: Iterable[Field], system: str,
           model: Any = None) -> list[FieldView]:
    out = []
    for f in fields:
        path = prefix + f.key
        out.append(FieldView(path=path, id="f-" + slug(path), label=f.label,
                             unit=_unit(f, system) if f.kind == "number" else "",
                             kind=f.kind, value=form.get(path, ""), required=f.required,
                             options=f.options, hint=_placeholder(f, model, system),
                             wide=path in ("name", "shaft.material.name"), note=f.note, group=f.group))
    return out


def _rows(form: FormState, lp: str, system: str) -> list[Row]:
    idx = _indices(form, lp)
    rows = []
    for pos, i in enumerate(idx):
        pre = f"{lp}[{i}]."
        if lp == "elements":
            kind = form.get(pre + "kind", "gear")
            fields, model = ELEMENT_FIELDS.get(kind, _COMMON), _KIND_MODEL.get(kind)
            title = form.get(pre + "id", "") or f"element {pos + 1}"
        elif lp == "supports":
            fields, model, title = SUPPORT_FIELDS, Support, form.get(pre + "id", "") or f"support {pos + 1}"
        elif lp == "load_cases":
            fields, model, title = LOAD_CASE_FIELDS, LoadCase, form.get(pre + "name", "") or f"case {pos + 1}"
        else:
            fields, model, title = SEGMENT_FIELDS, Segment, f"segment {pos + 1}"
        rows.append(Row(list_path=lp, index=i, position=pos, count=len(idx), title=title,
                        fields=_views(form, pre, fields, system, model), extra_name=pre + "_extra",
                        extra_value=form.get(pre + "_extra", "")))
    return rows


def editor_sections(form: FormState) -> list[Section]:
    """The editor's sections, rows and fields, in page (and tab) order."""
    system = form.get("units", "si")
    extras = [(k, v) for k, v in form.items() if k in ("_extra", "shaft._extra",
                                                         "shaft.material._extra",
                                                         "requirements._extra",
                                                         LUB + "_extra") and v]
    return [
        Section("design", "Design", fields=_views(form, "", TOP_FIELDS, system), extras=extras),
        Section("material", "Shaft material", fields=_views(form, "shaft.material.", MATERIAL_FIELDS, system, Material)),
        Section("segments", "Shaft steps, left to right", rows=_rows(form, "shaft.segments", system),
                list_path="shaft.segments", noun="step"),
        Section("supports", "Supports", rows=_rows(form, "supports", system), list_path="supports",
                noun="support"),
        Section("elements", "Parts on the shaft", rows=_rows(form, "elements", system),
                list_path="elements", noun="part"),
        Section("load_cases", "Duty cycle", rows=_rows(form, "load_cases", system),
                list_path="load_cases", noun="load case"),
        Section("requirements", "Requirements", fields=(
            _views(form, "requirements.", _REQ_BEARINGS, system, Requirements)
            + _views(form, LUB, LUBRICANT_FIELDS, system, Lubricant)
            + _views(form, "requirements.", (_REQ_EC,) + _REQ_SHAFT, system, Requirements))),
    ]


def place_issues(issues: Iterable[Issue], form: Mapping[str, str]) -> dict[str, list[str]]:
    """Map each problem to the slot on the page where its message goes.

    A problem whose path is a field goes beside that field (slot ``m-<slug>``); one whose path
    is a row, or a key inside a row that has no field, goes to that row; one about a whole
    list goes to the list's section; the rest go to the design's general slot ``m-design``.
    """
    out: dict[str, list[str]] = {}
    lists = {"shaft.segments": "segments", "shaft": "segments", "supports": "supports",
             "elements": "elements", "load_cases": "load_cases", "requirements": "requirements",
             "shaft.material": "material"}
    for iss in issues:
        p = iss.path
        if p in form and not p.endswith("_extra"):
            slot = "m-" + slug(p)
        else:
            m = re.match(r"^(shaft\.segments|supports|elements|load_cases)\[(\d+)\]", p)
            if m:
                slot = "m-" + slug(m.group(0))
            elif p == "bearing_table" or p.startswith("bearing_table."):
                slot = "m-" + slug(BT_CSV)
            else:
                head = next((k for k in sorted(lists, key=len, reverse=True)
                             if p == k or p.startswith(k + ".") or p.startswith(k + "[")), None)
                slot = "m-sec-" + lists[head] if head else "m-sec-design"
        out.setdefault(slot, []).append(iss.message)
    return out


# --- the bearing table in use ---------------------------------------------------------------

BUNDLED_TABLE_NAME = "bundled illustrative table"


@dataclass(frozen=True)
class BearingTableView:
    """Which bearing table a design rates against, as the editor and the results show it.

    ``own``: the designer's table is in the design; ``rows``: rows read (None when it cannot
    be read); ``problems``: what is wrong with it, each at ``bearing_table.csv`` with row and
    column; ``warnings``: what was read but ignored or estimated; ``stray``: the design holds
    a ``bearing_table`` that is not a table (the engine says why).
    """

    own: bool
    name: str
    rows: int | None
    problems: tuple[Issue, ...] = ()
    warnings: tuple[str, ...] = ()
    stray: bool = False


@functools.lru_cache(maxsize=8)
def _read_table(text: str, name: str) -> tuple[int | None, tuple[Issue, ...], tuple[str, ...]]:
    """Rows, problems and warnings of a CSV table, read once per distinct text."""
    from engine.bearings import parse_catalogue
    from engine.model import DesignError

    try:
        cat = parse_catalogue(text, name=name)
    except DesignError as exc:  # the engine's own wording (engine.solve puts it at bearing_table.csv)
        return None, tuple(Issue(path=BT_CSV, message=f"{e.path}: {e.message}" if e.path else e.message)
                           for e in exc.errors), ()
    return len(cat), (), tuple(cat.warnings)


@functools.lru_cache(maxsize=1)
def _bundled_rows() -> int:
    from engine.bearings import bundled_catalogue

    return len(bundled_catalogue())


def bearing_table_view(form: Mapping[str, str]) -> BearingTableView:
    """The bearing table that the posted form state rates against."""
    text = form.get(BT_CSV, "").replace("\r\n", "\n").removeprefix("\ufeff")
    if not text:
        try:
            stray = "bearing_table" in json.loads(form.get("_extra") or "{}")
        except (ValueError, TypeError, RecursionError):
            stray = False
        return BearingTableView(own=stray, name=BUNDLED_TABLE_NAME if not stray else "bearing_table",
                                rows=None if stray else _bundled_rows(), stray=stray)
    name = form.get(BT_NAME, "").strip() or "own bearing table"
    if len(text) > 400_000:  # the design's limit; the model's message says so
        return BearingTableView(own=True, name=name, rows=None)
    rows, problems, warnings = _read_table(text, name)
    return BearingTableView(own=True, name=name, rows=rows, problems=problems, warnings=warnings)


def bearing_table_issues(view: BearingTableView, issues: list[Issue]) -> list[Issue]:
    """``issues`` and the table's own problems, unless they are there already (the engine
    reports them only for a design that is otherwise valid)."""
    if not view.problems or any(i.path == BT_CSV for i in issues):
        return issues
    return list(issues) + list(view.problems)


def read_form(form: Mapping[str, str]):
    """Validate posted form state: (Design or None, design mapping, problems).

    Problems found while reading the text come first; the engine's validation adds the rest,
    except at paths already reported (a box holding "abc" is not also "required").
    """
    from engine.model import DesignError, parse_design

    data, issues = form_to_design(form)
    seen = {i.path for i in issues}
    try:
        design = parse_design(data)
    except DesignError as exc:
        issues = issues + [_in_words(i, form) for i in exc.errors if i.path not in seen]
        return None, data, issues
    if issues:
        return None, data, issues
    return design, data, []


_BOUND = re.compile(r"^'(\w+)' must be (greater than|at least|less than|at most) ([-+0-9.eE]+), got .*$")
_KEYWORD = re.compile(r"^'(\w+)'")


def _field_of(path: str, form: Mapping[str, str]) -> Field | None:
    m = _IDX.match(path)
    if m:
        lp, i, key = m.group(1), m.group(2), m.group(3)
        fields = {"shaft.segments": SEGMENT_FIELDS, "supports": SUPPORT_FIELDS, "load_cases": LOAD_CASE_FIELDS,
                  "elements": ELEMENT_FIELDS.get(form.get(f"elements[{i}].kind", "gear"), _COMMON)}[lp]
    else:
        head, _, key = path.rpartition(".")
        fields = {"": TOP_FIELDS, "shaft.material": MATERIAL_FIELDS, "requirements": REQUIREMENT_FIELDS,
                  "requirements.lubricant": LUBRICANT_FIELDS}.get(head, ())
    return next((f for f in fields if f.key == key), None)


def _in_words(issue: Issue, form: Mapping[str, str]) -> Issue:
    """The engine's message for a field, in the field's label and the display unit system:
    "'x_mm' must be at least 0, got -5.0" becomes "position x must be at least 0 in, got “-0.2”"."""
    f = _field_of(issue.path, form)
    if f is None:
        return issue
    system = form.get("units", "si")
    m = _BOUND.match(issue.message)
    if m and f.kind == "number":
        bound = units.fmt(float(m.group(3)), f.quantity, system, unit=True)
        if f.quantity in _FIXED_UNITS:
            bound += "\u202f" + _FIXED_UNITS[f.quantity]
        typed = form.get(issue.path, "").strip()
        return Issue(path=issue.path, message=f"{f.label} must be {m.group(2)} {bound}, got “{typed}”")
    return Issue(path=issue.path, message=_KEYWORD.sub(f.label, issue.message, count=1))
