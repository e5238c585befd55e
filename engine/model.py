"""The design document (format ``shaft-design/1``) as immutable pydantic models.

Every key of the contract in ``design-format.md`` is here, with its unit in its name.
Units inside the engine: mm, N, N·mm for moments in the solver, N·m at the boundary,
rpm, MPa, GPa, kg. Axes: x along the shaft from its left end, y and z transverse,
right-handed; angles about the shaft axis are measured about +x from +y toward +z.

Public entry point: :func:`parse_design` turns a JSON-like mapping into a :class:`Design`
or raises :class:`DesignError` carrying *every* problem found, each with the key path
(``supports[1].x_mm``) and a sentence a designer understands.
"""
from __future__ import annotations

import re
from typing import Annotated, Any, Literal, Union

from pydantic import AfterValidator, BaseModel, ConfigDict, Field, ValidationError

__all__ = [
    "FORMAT", "BEARING_TYPES", "ELEMENT_KINDS", "Issue", "DesignError", "EngineError",
    "Material", "Segment", "Groove", "Shaft", "Support", "SeatFits", "Key", "PressFit",
    "Gear", "BevelGear", "Pulley", "Sprocket", "Coupling", "PointForce", "PointMoment",
    "Element", "BearingTable", "LoadCase", "Lubricant", "Requirements", "Gravity", "Analysis", "Design",
    "parse_design", "TORQUE_TOLERANCE", "BIG", "TINY",
    "MAX_SEGMENTS", "MAX_GROOVES", "MAX_SUPPORTS", "MAX_ELEMENTS", "MAX_LOAD_CASES",
]

FORMAT = "shaft-design/1"
TORQUE_TOLERANCE = 0.005  # torques must balance within 0.5 % of the largest (contract)

BearingType = Literal[
    "deep_groove_ball", "angular_contact_ball", "self_aligning_ball", "cylindrical_roller",
    "tapered_roller", "spherical_roller", "needle_roller",
]
BEARING_TYPES: tuple[str, ...] = BearingType.__args__  # type: ignore[attr-defined]
AxialRole = Literal["both", "none", "+x", "-x"]

# No quantity of a shaft comes near 1e15 in its unit (mm, N, rpm, MPa, ...), and none that
# must be positive is as small as 1e-15; beyond these the solver's products (d⁴, P^(10/3),
# speed·load^p) overflow or divide by practically zero, so such numbers are refused with
# their key path rather than turned into NaN later.
BIG = 1e15
TINY = 1e-15


def _not_tiny(v: float) -> float:
    if v < TINY:
        raise ValueError(f"is too small to compute with: give at least {TINY:g} (got {v!r})")
    return v


Num = Annotated[float, Field(ge=-BIG, le=BIG)]

# Counts far beyond any real arrangement, small enough that one design cannot tie the solver
# up: the banded solve is linear in the node count, and the diagrams grow with cases × nodes.
# Without these limits 500 bearings and 500 load cases took 50 s and 3 GB.
MAX_SEGMENTS, MAX_GROOVES, MAX_SUPPORTS, MAX_ELEMENTS, MAX_LOAD_CASES = 500, 200, 50, 200, 100
# analysis.elements: the banded solver is O(N) in time and memory (engine/beam.py), so the cap
# is set by the diagrams the page draws, not by the solve (was 2000 with the dense solve)
MAX_MESH_ELEMENTS = 20_000
Pos = Annotated[float, Field(gt=0, le=BIG), AfterValidator(_not_tiny)]
NonNeg = Annotated[float, Field(ge=0, le=BIG)]


class _Doc(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, allow_inf_nan=False)


class Issue(_Doc):
    """One problem with the input: where it is (key path) and what is wrong."""

    path: str
    message: str


class DesignError(ValueError):
    """Bad input. ``errors`` lists every problem, each with its key path."""

    def __init__(self, errors: list[Issue]):
        self.errors = errors
        super().__init__("; ".join(f"{e.path}: {e.message}" for e in errors))


class EngineError(DesignError):
    """A design that is well formed but cannot be solved as laid out (e.g. an axial force
    that no support takes, an axially over-constrained arrangement). Same shape as DesignError."""

    @classmethod
    def at(cls, path: str, message: str) -> "EngineError":
        return cls([Issue(path=path, message=message)])


# --- shaft -------------------------------------------------------------------------------

class Material(_Doc):
    name: str = "steel"
    E_GPa: Pos = 205.0
    G_GPa: Pos = 80.0
    density_kg_m3: Pos = 7850.0
    Su_MPa: Pos = 850.0
    Sy_MPa: Pos = 650.0
    Se_MPa: Pos | None = None  # rotating-beam endurance limit; default estimated from Su


class Groove(_Doc):
    """A retaining-ring groove cut into the shaft (a stress raiser for the strength check)."""

    x_mm: NonNeg
    depth_mm: Pos
    width_mm: Pos = 1.3
    r_mm: Pos = 0.1


class Segment(_Doc):
    length_mm: Pos
    d_mm: Pos
    bore_mm: NonNeg = 0.0
    fillet_r_mm: Pos | None = None  # shoulder radius at the segment's left end
    surface: Literal["ground", "machined", "hot_rolled", "as_forged"] = "machined"


class Shaft(_Doc):
    material: Material = Material()
    segments: list[Segment] = Field(min_length=1, max_length=MAX_SEGMENTS)
    grooves: list[Groove] = Field(default=[], max_length=MAX_GROOVES)

    @property
    def length_mm(self) -> float:
        return sum(s.length_mm for s in self.segments)

    def edges_mm(self) -> list[float]:
        """x of every segment boundary, 0 … L."""
        xs = [0.0]
        for s in self.segments:
            xs.append(xs[-1] + s.length_mm)
        return xs

    def diameter_at(self, x_mm: float) -> float:
        """Outer diameter at x; at a step, the smaller of the two (a bearing seats there)."""
        edges = self.edges_mm()
        ds = []
        for s, a, b in zip(self.segments, edges[:-1], edges[1:]):
            if a - 1e-9 <= x_mm <= b + 1e-9:
                ds.append(s.d_mm)
        return min(ds) if ds else self.segments[-1].d_mm


# --- supports ----------------------------------------------------------------------------

_LETTERS = "a b c cd d e ef f fg g h js j k m n p r s t u v x y z za zb zc".split()
_GRADE = r"(01|0|[1-9]|1[0-8])"
_SHAFT_RE = re.compile(rf"^({'|'.join(_LETTERS)}){_GRADE}$")
_HOLE_RE = re.compile(rf"^({'|'.join(x.upper() for x in _LETTERS)}){_GRADE}$")


def _shaft_class(v: str) -> str:
    if not _SHAFT_RE.match(v):
        raise ValueError(f"must be an ISO 286 shaft tolerance class: small letter(s) and a grade, e.g. k5 (got {v!r})")
    return v


def _hole_class(v: str) -> str:
    if not _HOLE_RE.match(v):
        raise ValueError(f"must be an ISO 286 hole tolerance class: capital letter(s) and a grade, e.g. H7 (got {v!r})")
    return v


def _fit_name(v: str) -> str:
    hole, _, shaft = v.partition("/")
    if not (_HOLE_RE.match(hole) and hole.startswith("H") and not hole.startswith("HS") and _SHAFT_RE.match(shaft)):
        raise ValueError(f"must be a basic-hole fit such as H7/s6 (got {v!r})")
    return v


class SeatFits(_Doc):
    """The designer's ISO 286 tolerance classes for a bearing seat, e.g. shaft "k5", housing "H7"."""

    shaft: Annotated[str, AfterValidator(_shaft_class)] | None = None
    housing: Annotated[str, AfterValidator(_hole_class)] | None = None

class Support(_Doc):
    id: str = Field(min_length=1, max_length=40)
    x_mm: NonNeg
    bearing_type: BearingType | None = "deep_groove_ball"
    axial: AxialRole = "none"
    contact_angle_deg: Annotated[float, Field(gt=0, lt=90)] | None = None
    radial_stiffness_N_per_mm: Pos | None = None
    bore_mm: Pos | None = None
    dimension_series: list[str] | None = None  # restrict candidates, e.g. ["02", "03"]
    misalignment_limit_rad: Pos | None = None  # overrides the type's default slope limit
    designation: str | None = Field(default=None, min_length=1, max_length=80)  # the designer's chosen row of the bearing table
    # mounting (engine.mounting): the ring whose load rotates, and the designer's own fits
    inner_ring_load: Literal["rotating", "stationary"] = "rotating"
    fits: SeatFits | None = None


# --- elements ----------------------------------------------------------------------------

class Key(_Doc):
    """A parallel key (engine.mounting). Every size defaults from the DIN 6885-1 table for the
    seat diameter; the length from the hub width."""

    b_mm: Pos | None = None  # key width
    h_mm: Pos | None = None  # key height
    t1_mm: Pos | None = None  # keyseat depth in the shaft
    length_mm: Pos | None = None
    ends: Literal["rounded", "square"] = "rounded"  # rounded ends bear over length − b
    count: Annotated[int, Field(ge=1, le=2)] = 1
    Sy_MPa: Pos | None = None  # key material yield strength (default 350 MPa, common practice)
    hub_Sy_MPa: Pos | None = None  # hub material yield strength (default: the shaft's)


class PressFit(_Doc):
    """A press or shrink fit of a hub on the shaft (engine.mounting): an ISO 286 fit or the
    diametral interference, the hub's outer diameter and material, and the friction coefficient."""

    fit: Annotated[str, AfterValidator(_fit_name)] | None = None  # e.g. "H7/s6"
    interference_um: Pos | None = None  # diametral interference, instead of a fit
    hub_outer_d_mm: Pos | None = None  # default 2 × seat diameter (common practice)
    friction: Annotated[float, Field(gt=0, le=1)] = 0.12
    hub_E_GPa: Pos | None = None  # default: the shaft's
    hub_nu: Annotated[float, Field(ge=0, lt=0.5)] = 0.3
    shaft_nu: Annotated[float, Field(ge=0, lt=0.5)] = 0.3
    hub_Sy_MPa: Pos | None = None  # default: the shaft's


class _Element(_Doc):
    id: str = Field(min_length=1, max_length=40)
    x_mm: NonNeg
    mass_kg: NonNeg = 0.0
    keyway: Literal["end_milled", "sled_runner"] | None = None
    key: Key | None = None  # the parallel key in the keyway (sizes default from DIN 6885-1)
    press_fit: bool | PressFit = False  # true: the default fit H7/s6; or the fit spelled out
    width_mm: Pos | None = None  # hub or face width, for the drawing and the seat
    inertia_kg_m2: NonNeg | None = None  # polar mass moment of inertia about the shaft axis (torsional frequency)


class _Driving(_Element):
    torque_Nm: Num | None = None


class Gear(_Driving):
    kind: Literal["gear"] = "gear"
    pitch_d_mm: Pos
    pressure_angle_deg: Annotated[float, Field(gt=0, lt=45)] = 20.0
    helix_angle_deg: Annotated[float, Field(ge=0, lt=60)] = 0.0
    hand: Literal["right", "left"] | None = None
    mesh_angle_deg: Num = 0.0
    mate_slope_rad: Num | None = None  # slope of the mating gear's shaft at the mesh, if known


class BevelGear(_Driving):
    kind: Literal["bevel_gear"] = "bevel_gear"
    pitch_d_mm: Pos  # mean pitch diameter
    pressure_angle_deg: Annotated[float, Field(gt=0, lt=45)] = 20.0
    pitch_cone_angle_deg: Annotated[float, Field(gt=0, lt=90)]
    apex: Literal["+x", "-x"]
    mesh_angle_deg: Num = 0.0


class Pulley(_Driving):
    kind: Literal["pulley"] = "pulley"
    pitch_d_mm: Pos
    strand_angle_deg: Num = 0.0
    wrap_angle_deg: Annotated[float, Field(gt=0, le=360)] = 180.0
    tension_ratio: Annotated[float, Field(gt=1, le=BIG)] | None = None
    pull_factor: Pos | None = None


class Sprocket(_Driving):
    kind: Literal["sprocket"] = "sprocket"
    pitch_d_mm: Pos
    strand_angle_deg: Num = 0.0
    wrap_angle_deg: Annotated[float, Field(gt=0, le=360)] = 180.0


class Coupling(_Driving):
    kind: Literal["coupling"] = "coupling"


class PointForce(_Element):
    kind: Literal["force"] = "force"
    Fx_N: Num = 0.0
    Fy_N: Num = 0.0
    Fz_N: Num = 0.0
    arm_y_mm: Num = 0.0
    arm_z_mm: Num = 0.0


class PointMoment(_Element):
    kind: Literal["moment"] = "moment"
    My_Nm: Num = 0.0
    Mz_Nm: Num = 0.0


Element = Annotated[
    Union[Gear, BevelGear, Pulley, Sprocket, Coupling, PointForce, PointMoment],
    Field(discriminator="kind"),
]
ELEMENT_KINDS = ("gear", "bevel_gear", "pulley", "sprocket", "coupling", "force", "moment")
TORQUE_KINDS = ("gear", "bevel_gear", "pulley", "sprocket", "coupling")


# --- duty, requirements ------------------------------------------------------------------

class LoadCase(_Doc):
    name: str = Field(min_length=1, max_length=60)
    time_fraction: Annotated[float, Field(gt=0, le=1)] = 1.0
    speed_rpm: Pos
    torque_factor: Num = 1.0
    force_factor: Num = 1.0
    torques_Nm: dict[str, Num] = {}
    torque_alternating_pct: Annotated[float, Field(ge=0, le=1000)] = 0.0  # alternating torque amplitude, % of the steady torque


class Lubricant(_Doc):
    iso_vg: Annotated[float, Field(ge=2, le=3200)]
    operating_temp_C: Annotated[float, Field(ge=-40, le=200)]
    viscosity_index: Annotated[float, Field(ge=0, le=400)] = 95.0


class Requirements(_Doc):
    life_h: Pos = 20000.0
    reliability_pct: Annotated[float, Field(ge=90, lt=100)] = 90.0
    reliability_method: Literal["iso281", "weibull"] = "iso281"
    application_factor: Annotated[float, Field(ge=1, le=BIG)] = 1.0
    s0_min: Pos = 1.0
    lubricant: Lubricant | None = None
    contamination_ec: Annotated[float, Field(ge=0, le=1)] | None = None
    # shaft checks (defaults are common practice, stated where they are used)
    fatigue_criterion: Literal["de_goodman", "de_gerber", "asme_elliptic", "soderberg"] = "de_goodman"
    fatigue_safety_min: Pos = 1.5
    yield_safety_min: Pos = 1.5
    critical_speed_margin_pct: Annotated[float, Field(ge=0, lt=100)] = 20.0
    gear_deflection_max_mm: Pos = 0.13
    gear_slope_max_rad: Pos = 0.0005
    shaft_temperature_C: Annotated[float, Field(ge=-60, le=540)] = 20.0  # Marin temperature factor
    notch_sensitivity: Literal["neuber", "kuhn_hardrath"] = "neuber"
    twist_limit_deg_per_m: Pos | None = None  # angle of twist per metre; None: 0.25 (common practice, warns only)


class Gravity(_Doc):
    direction: Literal["-y", "+y", "-z", "+z", "-x", "+x"] = "-y"
    g_m_s2: Pos = 9.80665


class Analysis(_Doc):
    """Solver settings: element count, whether shear deformation is included, and whether
    supports with a bearing type get their rated bearing's radial stiffness (else rigid)."""

    elements: Annotated[int, Field(ge=10, le=MAX_MESH_ELEMENTS)] = 120
    shear_deformation: bool = True
    bearing_stiffness: bool = True


class BearingTable(_Doc):
    """The designer's own bearing table, carried in the design so that a shared link and the
    note use the same rows: CSV text with the columns of sample_data/bearings.csv."""

    name: str = Field(default="own bearing table", min_length=1, max_length=200)
    csv: str = Field(min_length=1, max_length=400_000)


class Design(_Doc):
    format: Literal["shaft-design/1"] = FORMAT
    name: str = Field(default="untitled shaft", max_length=200)
    notes: str = Field(default="", max_length=20000)
    shaft: Shaft
    supports: list[Support] = Field(max_length=MAX_SUPPORTS)
    elements: list[Element] = Field(default=[], max_length=MAX_ELEMENTS)
    load_cases: list[LoadCase] = Field(min_length=1, max_length=MAX_LOAD_CASES)
    requirements: Requirements = Requirements()
    gravity: Gravity | None = Gravity()
    analysis: Analysis = Analysis()
    bearing_table: BearingTable | None = None

    def support(self, sid: str) -> Support:
        return next(s for s in self.supports if s.id == sid)

    def element(self, eid: str) -> Any:
        return next(e for e in self.elements if e.id == eid)


# --- validation --------------------------------------------------------------------------

def _path(loc: tuple) -> str:
    out = ""
    for part in loc:
        if isinstance(part, int):
            out += f"[{part}]"
        elif part in ELEMENT_KINDS and out.startswith("elements"):
            continue  # the discriminated union adds the kind to the location
        else:
            out += ("." if out else "") + str(part)
    return out


def _message(err: dict) -> str:
    t, ctx, field = err["type"], err.get("ctx", {}), str(err["loc"][-1]) if err["loc"] else "value"
    if t == "missing":
        return f"'{field}' is required"
    if t == "extra_forbidden":
        return f"'{field}' is not a key of this part of the design (check its spelling)"
    if t in ("greater_than", "greater_than_equal", "less_than", "less_than_equal"):
        word = {"greater_than": "greater than", "greater_than_equal": "at least",
                "less_than": "less than", "less_than_equal": "at most"}[t]
        bound = next(iter(ctx.values())) if ctx else "?"
        if isinstance(bound, float) and abs(bound) >= 1e6:
            bound = f"{bound:g}"  # 1e+15, not 1000000000000000.0
        return f"'{field}' must be {word} {bound}, got {err.get('input')!r}"
    if t == "value_error":
        return f"'{field}' {err['msg'].removeprefix('Value error, ')}"
    if t == "finite_number":
        return f"'{field}' must be a finite number, got {err.get('input')!r}"
    if t in ("float_parsing", "float_type", "int_parsing", "int_type", "int_from_float"):
        return f"'{field}' must be a number, got {err.get('input')!r}"
    if t == "union_tag_invalid":
        return (f"unknown element kind {ctx.get('tag')!r}; use one of "
                f"{', '.join(ELEMENT_KINDS)}")
    if t == "union_tag_not_found":
        return f"every element needs a 'kind' ({', '.join(ELEMENT_KINDS)})"
    if t == "literal_error":
        return f"'{field}' must be one of {ctx.get('expected')}, got {err.get('input')!r}"
    if t == "too_short":
        return f"'{field}' needs at least {ctx.get('min_length')} entr{'y' if ctx.get('min_length') == 1 else 'ies'}"
    if t == "too_long":
        n = ctx.get("actual_length")
        return (f"'{field}' has {n} entries; at most {ctx.get('max_length')} are accepted" if n is not None
                else f"'{field}' is too long (at most {ctx.get('max_length')})")
    return f"'{field}': {err['msg']}"


def _semantic(d: Design) -> list[Issue]:
    """Checks across fields, all collected: geometry, ids, duty cycle, torque balance."""
    bad: list[Issue] = []
    add = lambda p, m: bad.append(Issue(path=p, message=m))  # noqa: E731
    L = d.shaft.length_mm
    for i, s in enumerate(d.shaft.segments):
        if s.bore_mm >= s.d_mm:
            add(f"shaft.segments[{i}].bore_mm",
                f"bore {s.bore_mm:g} mm must be smaller than the diameter {s.d_mm:g} mm")
        if s.fillet_r_mm is not None and i > 0 and s.fillet_r_mm >= 0.5 * min(s.d_mm, d.shaft.segments[i - 1].d_mm):
            add(f"shaft.segments[{i}].fillet_r_mm", "fillet radius must be less than half the smaller diameter")
    for i, g in enumerate(d.shaft.grooves):
        if g.x_mm > L:
            add(f"shaft.grooves[{i}].x_mm", f"groove at {g.x_mm:g} mm lies off the shaft (length {L:g} mm)")
        elif g.depth_mm >= 0.5 * d.shaft.diameter_at(g.x_mm):
            add(f"shaft.grooves[{i}].depth_mm", "groove depth must be less than the shaft radius")

    if len(d.supports) < 2:
        add("supports", f"a shaft needs at least two supports; this design has {len(d.supports)}")
    for kind, items in (("supports", d.supports), ("elements", d.elements)):
        seen: dict[str, int] = {}
        for i, it in enumerate(items):
            if it.x_mm > L + 1e-9:
                add(f"{kind}[{i}].x_mm", f"{it.id} at x = {it.x_mm:g} mm lies off the shaft (length {L:g} mm)")
            if it.id in seen:
                add(f"{kind}[{i}].id", f"id '{it.id}' is used twice ({kind}[{seen[it.id]}] and {kind}[{i}])")
            seen.setdefault(it.id, i)
    ids_sup = {s.id for s in d.supports}
    for i, e in enumerate(d.elements):
        if e.id in ids_sup:
            add(f"elements[{i}].id", f"id '{e.id}' is also a support's id; give it its own")
    xs: dict[float, int] = {}
    for i, s in enumerate(d.supports):
        key = round(s.x_mm, 6)
        if key in xs:
            add(f"supports[{i}].x_mm", f"supports {d.supports[xs[key]].id} and {s.id} are both at x = {s.x_mm:g} mm")
        xs.setdefault(key, i)
        if s.bearing_type is None and s.designation is not None:
            add(f"supports[{i}].designation", f"{s.id} is a plain support without a bearing: choose a bearing "
                                              "type before a bearing, or clear the bearing")
        if s.bearing_type is None and s.axial not in ("both", "none"):
            add(f"supports[{i}].axial", "a plain support without a bearing can only be 'both' or 'none'")
    locating = [i for i, s in enumerate(d.supports) if s.axial == "both"]
    if len(locating) > 1:
        names = ", ".join(d.supports[i].id for i in locating)
        add(f"supports[{locating[1]}].axial",
            f"more than one support locates the shaft both ways ({names}): the shaft is axially "
            "over-constrained; let all but one float ('none') or use a '+x'/'-x' pair")

    for i, e in enumerate(d.elements):
        if e.kind == "gear" and e.helix_angle_deg > 0 and e.hand is None:
            add(f"elements[{i}].hand", f"helical gear {e.id} needs 'hand' (right or left)")
        if e.kind == "pulley" and (e.tension_ratio is None) == (e.pull_factor is None):
            add(f"elements[{i}].tension_ratio", f"pulley {e.id} needs exactly one of 'tension_ratio' or 'pull_factor'")

    for i, e in enumerate(d.elements):
        if e.key is not None and e.keyway is None:
            add(f"elements[{i}].key", f"{e.id} has a key but no keyway: give 'keyway' (end_milled or sled_runner)")
        pf = e.press_fit
        if not isinstance(pf, bool):
            if pf.fit is not None and pf.interference_um is not None:
                add(f"elements[{i}].press_fit", f"the press fit of {e.id} gives both a fit and an interference: give one")
            elif pf.interference_um is None:
                from engine.mounting import fit_interference  # local: mounting imports the result models
                try:
                    fit_interference(pf.fit or "H7/s6", d.shaft.diameter_at(e.x_mm))
                except ValueError as exc:
                    add(f"elements[{i}].press_fit.fit", f"the press fit of {e.id}: {exc}")
            if pf.hub_outer_d_mm is not None and pf.hub_outer_d_mm <= d.shaft.diameter_at(e.x_mm):
                add(f"elements[{i}].press_fit.hub_outer_d_mm",
                    f"the hub of {e.id} must be larger outside ({pf.hub_outer_d_mm:g} mm) than its seat "
                    f"({d.shaft.diameter_at(e.x_mm):g} mm)")

    total = sum(c.time_fraction for c in d.load_cases)
    if abs(total - 1.0) > 1e-6:
        add("load_cases", f"time fractions sum to {total:.4g}; they must sum to 1")
    names: dict[str, int] = {}
    eids = {e.id: e for e in d.elements}
    for j, c in enumerate(d.load_cases):
        if c.name in names:
            add(f"load_cases[{j}].name", f"load case name '{c.name}' is used twice")
        names.setdefault(c.name, j)
        for k in c.torques_Nm:
            if k not in eids or eids[k].kind not in TORQUE_KINDS:
                add(f"load_cases[{j}].torques_Nm.{k}", f"'{k}' is not an element that carries torque")

    nulls = [i for i, e in enumerate(d.elements) if e.kind in TORQUE_KINDS and e.torque_Nm is None]
    if len(nulls) > 1:
        add(f"elements[{nulls[1]}].torque_Nm",
            "only one element may leave its torque empty (the balancing one); "
            f"{', '.join(d.elements[i].id for i in nulls)} all do")
    elif not bad:
        from engine.loads import torque_imbalance  # local: loads imports this module

        # the design's own torques first, reported at the first torque the user wrote; a case
        # that only scales them (torque_factor) repeats that mistake, so it is checked only
        # when the design balances; a case that sets its own torques is always checked
        given = [i for i, e in enumerate(d.elements) if e.kind in TORQUE_KINDS and e.torque_Nm is not None]
        design_at = f"elements[{given[0]}].torque_Nm" if given else "elements"
        checks = [(design_at, "the design", LoadCase(name="given", speed_rpm=1.0))]
        checks += [(f"load_cases[{j}].{'torques_Nm' if c.torques_Nm else 'torque_factor'}", f"load case '{c.name}'", c)
                   for j, c in enumerate(d.load_cases) if c.torques_Nm or c.torque_factor != c.force_factor]
        for where, what, case in checks:
            if bad and not case.torques_Nm:
                continue  # the design's imbalance, scaled: already reported once
            imb, largest = torque_imbalance(d, case)
            if imb is not None and largest > 0 and abs(imb) > TORQUE_TOLERANCE * largest:
                add(where, f"in {what} the element torques do not balance: they sum to {imb:+.4g} N·m "
                           f"(largest {largest:.4g} N·m); leave one torque empty to balance them, or correct them")
    return bad


def parse_design(data: Any) -> Design:
    """Validate a JSON-like mapping into a :class:`Design`; raise :class:`DesignError` with all problems.

    Structural problems (missing keys, wrong types, non-positive sizes, non-finite numbers,
    unknown kinds or keys) and cross-field problems (geometry, ids, duty cycle, torque balance)
    are both reported; the cross-field ones are checked once the structure is sound.
    """
    if isinstance(data, Design):
        return data
    if not isinstance(data, dict):
        raise DesignError([Issue(path="", message="a design must be a JSON object")])
    try:
        design = Design.model_validate(data)
    except ValidationError as exc:
        issues = [Issue(path=_path(e["loc"]), message=_message(e)) for e in _press_fit_union(exc.errors())]
        raise DesignError(_dedupe(issues)) from None
    bad = _semantic(design)
    if bad:
        raise DesignError(bad)
    return design


def _press_fit_union(errors: list[dict]) -> list[dict]:
    """``press_fit`` is true/false or an object: report the object's own problems when an object
    was given, else one sentence; never the union's member names."""
    out = []
    for e in errors:
        loc = e["loc"]
        if "press_fit" in loc:
            k = loc.index("press_fit")
            member = loc[k + 1] if len(loc) > k + 1 else None
            if member in ("bool", "PressFit"):
                given_obj = isinstance(e.get("input"), dict) or len(loc) > k + 2
                if member == "bool" or not given_obj:
                    if member == "bool" and not isinstance(e.get("input"), dict):
                        out.append({"type": "value_error", "loc": loc[:k + 1], "input": e.get("input"),
                                    "msg": "must be true, false, or the press fit spelled out: its fit "
                                           "(such as H7/s6) or its interference, the hub's outer diameter "
                                           "and the friction coefficient"})
                    continue
                e = {**e, "loc": loc[:k + 1] + loc[k + 2:]}
        out.append(e)
    return out


def _dedupe(issues: list[Issue]) -> list[Issue]:
    seen, out = set(), []
    for i in issues:
        if (i.path, i.message) not in seen:
            seen.add((i.path, i.message))
            out.append(i)
    return out
