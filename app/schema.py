"""The JSON Schemas of the design and result documents, generated from the engine's models.

One source for every description of the formats:

- :func:`design_schema` / :func:`result_schema`: JSON Schema (draft 2020-12) of
  ``shaft-design/1`` (what :func:`engine.model.parse_design` accepts) and ``shaft-result/1``
  (what :func:`engine.solve` returns); ``shaftwright schema [--result]`` prints them.
- :func:`install_openapi`: the app's OpenAPI document names the same models for the request
  and response bodies of the JSON API (:func:`api_bodies`), so ``/docs`` and
  ``/openapi.json`` show every key; the routes still read their bodies themselves (size
  limits, every problem with its key path), the models here only describe them.
- :func:`schema_rows` / :func:`markdown`: the key tables of ``docs/design-format.md``
  (``python3 -m app.schema > docs/design-format.md`` writes it; a test keeps it in step).

The models give the keys, types, limits and defaults; :data:`DESCRIPTIONS` gives each key's
meaning in a line (by key name, or ``Model.key`` where one name means different things);
:data:`RESULT_DESCRIPTIONS` the same for the result.
The structure checks of the schema are not the whole validation: cross-field rules (supports
on the shaft, torque balance, time fractions summing to 1, …) are checked by the engine.
"""
from __future__ import annotations

import json
from functools import lru_cache
from typing import Any, Iterable, Literal, Union

from pydantic import BaseModel, ConfigDict, Field
from pydantic.json_schema import models_json_schema

from engine.model import FORMAT, Design
from engine.result import Result

__all__ = ["design_schema", "result_schema", "install_openapi", "api_bodies", "DESCRIPTIONS", "RESULT_DESCRIPTIONS",
           "schema_rows", "object_rows", "schemas_html", "body_model", "markdown", "SaveRequest", "Revision", "RevisionSummary", "RevisionList", "ErrorList",
           "StudyRequest", "ArrangementsRequest", "OptimiseRequest"]

DRAFT = "https://json-schema.org/draft/2020-12/schema"

DESCRIPTIONS: dict[str, str] = {
    # design, top level
    "Design.format": "format name and version; always shaft-design/1",
    "Design.name": "the design's name, shown in the editor, the note and the share links",
    "Design.notes": "free text kept with the design",
    "Design.shaft": "the shaft: material, stepped segments, grooves",
    "Design.supports": "two or more supports (bearings or plain rigid supports), any order",
    "Design.elements": "what the shaft carries: gears, pulleys, sprockets, couplings, forces, moments",
    "Design.load_cases": "the duty cycle: one or more load cases whose time fractions sum to 1",
    "Design.requirements": "what every bearing and the shaft must meet",
    "Design.gravity": "direction and value of gravity; null leaves every weight out",
    "Design.analysis": "solver settings",
    "Design.bearing_table": "your own bearing table carried in the design (else the bundled one)",
    # shaft
    "Shaft.material": "the shaft's material",
    "Shaft.segments": "cylindrical segments from the left end (x = 0) to the right, without gaps",
    "Shaft.grooves": "retaining-ring grooves",
    "Material.name": "the material's name (text only)",
    "E_GPa": "Young's modulus, GPa",
    "G_GPa": "shear modulus, GPa",
    "density_kg_m3": "density, kg/m³ (the shaft's own weight)",
    "Su_MPa": "ultimate tensile strength, MPa",
    "Sy_MPa": "tensile yield strength, MPa",
    "Se_MPa": "rotating-beam endurance limit, MPa (default estimated from Su_MPa)",
    "length_mm": "segment length along x, mm",
    "d_mm": "outer diameter, mm",
    "Segment.bore_mm": "bore of a hollow segment, mm (0: solid)",
    "fillet_r_mm": "shoulder fillet radius at the segment's left end, mm",
    "surface": "surface finish for the Marin surface factor",
    "Groove.x_mm": "groove position from the shaft's left end, mm",
    "depth_mm": "groove depth, mm",
    "Groove.width_mm": "groove width, mm",
    "r_mm": "groove root radius, mm",
    # supports
    "id": "a short name, unique among the supports and elements (A, B, G1, …)",
    "Support.x_mm": "the support's position from the shaft's left end, mm",
    "bearing_type": "the bearing's type; null for a plain rigid support with no bearing to rate",
    "axial": "the axial force it takes: both (locates both ways), none (floats), +x or -x "
             "(only when the shaft pushes toward +x / -x)",
    "contact_angle_deg": "contact angle of an angular contact bearing, degrees",
    "radial_stiffness_N_per_mm": "radial stiffness, N/mm (default: rigid)",
    "Support.bore_mm": "bearing bore, mm (default the shaft diameter at x_mm; at a step the smaller)",
    "dimension_series": "restrict the candidates to these ISO dimension series, e.g. [\"02\", \"03\"]",
    "misalignment_limit_rad": "slope limit at this bearing, rad (overrides the type's limit)",
    # elements
    "kind": "the element's kind",
    "x_mm": "position from the shaft's left end, mm",
    "mass_kg": "the element's mass, kg (its weight acts on the shaft)",
    "keyway": "keyway under the hub (end_milled or sled_runner), for the shaft's notch factor",
    "press_fit": "true when the hub is pressed on (a notch for the shaft check)",
    "width_mm": "hub or face width, mm",
    "inertia_kg_m2": "mass moment of inertia about the axis, kg·m² (torsional frequency)",
    "torque_Nm": "torque the element applies TO the shaft, N·m (right-hand rule about +x); "
                 "at most one element may be null: it balances the others",
    "pitch_d_mm": "pitch diameter, mm (bevel gear: mean pitch diameter)",
    "pressure_angle_deg": "pressure angle, degrees",
    "helix_angle_deg": "helix angle, degrees (0: spur gear)",
    "hand": "helix hand of a helical gear (right or left)",
    "mesh_angle_deg": "where the mesh point is, measured about +x from +y toward +z, degrees",
    "mate_slope_rad": "the mating shaft's slope at the mesh, rad (relative slope across the mesh)",
    "pitch_cone_angle_deg": "pitch cone angle, degrees",
    "apex": "which way the cone's apex points along the shaft (+x or -x)",
    "strand_angle_deg": "direction from this shaft to the other shaft, about +x from +y toward +z, degrees",
    "wrap_angle_deg": "wrap angle of the belt or chain, degrees",
    "tension_ratio": "tight-to-slack strand tension ratio T1/T2 (give this or pull_factor)",
    "pull_factor": "shaft pull as a multiple of |torque|/R (give this or tension_ratio)",
    "Fx_N": "force along x, N", "Fy_N": "force along y, N", "Fz_N": "force along z, N",
    "arm_y_mm": "where off the axis the force acts: y offset, mm",
    "arm_z_mm": "where off the axis the force acts: z offset, mm",
    "PointMoment.My_Nm": "couple about y applied to the shaft, N·m",
    "PointMoment.Mz_Nm": "couple about z applied to the shaft, N·m",
    # duty cycle
    "LoadCase.name": "the case's name, unique in the design",
    "time_fraction": "share of the running time in this case (the cases sum to 1)",
    "LoadCase.speed_rpm": "shaft speed in this case, rpm",
    "torque_factor": "scales every element torque (and so the gear, pulley and sprocket forces)",
    "force_factor": "scales force and moment elements and weights",
    "torques_Nm": "element torques set outright for this case, by element id, N·m",
    "torque_alternating_pct": "alternating torque amplitude, % of the steady torque",
    # requirements
    "life_h": "required bearing life at the stated reliability, hours",
    "reliability_pct": "reliability of the required life, %",
    "reliability_method": "life adjustment for reliability: iso281 (a1) or weibull",
    "application_factor": "multiplies the bearing loads",
    "s0_min": "least static safety factor of a bearing",
    "lubricant": "the lubricant; with contamination_ec it switches on the modified life (aISO)",
    "contamination_ec": "ISO 281 contamination factor ec (0 to 1)",
    "fatigue_criterion": "fatigue criterion of the shaft check",
    "fatigue_safety_min": "least fatigue safety factor of the shaft",
    "yield_safety_min": "least first-cycle yield safety factor of the shaft",
    "critical_speed_margin_pct": "least margin below the first critical speed, %",
    "gear_deflection_max_mm": "largest deflection at a gear, mm",
    "gear_slope_max_rad": "largest slope at a gear, rad",
    "shaft_temperature_C": "shaft temperature, °C (Marin temperature factor)",
    "notch_sensitivity": "notch sensitivity model (neuber or kuhn_hardrath)",
    "iso_vg": "ISO VG viscosity grade (mm²/s at 40 °C)",
    "operating_temp_C": "operating temperature of the lubricant, °C",
    "viscosity_index": "viscosity index of the lubricant",
    "direction": "the direction gravity acts in",
    "g_m_s2": "acceleration of gravity, m/s²",
    "Analysis.elements": "finite elements along the shaft",
    "shear_deformation": "Timoshenko elements (true) or Euler–Bernoulli (false)",
    "BearingTable.name": "the table's name, shown in the note",
    "BearingTable.csv": "the table as CSV text, with the bundled table's columns",
}

RESULT_DESCRIPTIONS: dict[str, str] = {
    "Result.format": "format name and version; always shaft-result/1",
    "Result.engine_version": "version of the engine that solved the design",
    "Result.load_cases": "per load case: element forces, support reactions, largest deflection",
    "Result.bearings": "per support with a bearing: loads, equivalent load, ranked candidates",
    "Result.shaft": "the shaft: critical speeds, deflection, mass, checked sections",
    "Result.checks": "every verdict the engine draws, failing first, each with its value, limit and source",
    "Result.diagrams": "internal forces and deflections along x, per load case",
    "Result.warnings": "things the designer should know that are not checks",
    "id": "the support's or element's id in the design",
    "kind": "the element's kind",
    "x_mm": "position from the shaft's left end, mm",
    "Fx_N": "force along x, N", "Fy_N": "force along y, N", "Fz_N": "force along z, N",
    "ElementForces.My_Nm": "couple about y the element applies (off-axis axial force or moment element), N·m",
    "ElementForces.Mz_Nm": "couple about z the element applies, N·m",
    "ElementForces.torque_Nm": "torque the element applies to the shaft in this case, N·m",
    "SupportReaction.Fx_N": "axial force the support exerts on the shaft, N",
    "SupportReaction.Fr_N": "radial resultant √(Fy² + Fz²), N",
    "SupportReaction.Fa_N": "axial load the bearing carries after the axial resolution (magnitude), N",
    "CaseResult.name": "the load case's name", "CaseResult.speed_rpm": "shaft speed, rpm",
    "CaseResult.time_fraction": "share of the running time",
    "CaseResult.elements": "forces each element applies to the shaft",
    "CaseResult.supports": "reactions: forces each support exerts on the shaft",
    "max_deflection_mm": "largest resultant transverse deflection √(uy² + uz²), mm",
    "CaseResult.max_deflection_x_mm": "where the largest deflection is, mm",
    "BearingResult.bearing_type": "the bearing's type", "BearingResult.bore_mm": "bearing bore, mm",
    "BearingResult.equivalent_load_N": "duty-cycle equivalent dynamic load of the first candidate, N",
    "BearingResult.required_C_N": "dynamic rating that gives the required life at the stated reliability, N",
    "BearingResult.life_method": "how the life was computed",
    "BearingResult.arrangement": "the axial arrangement the bearing is part of",
    "BearingResult.Fr_N": "radial load per load case (application factor not applied), N",
    "BearingResult.Fa_N": "axial load per load case (application factor not applied), N",
    "BearingResult.candidates": "bearings of the table that fit, ranked best first (those that meet every requirement first)",
    "BearingResult.smallest_by_series": "the smallest bore per dimension series that would meet every requirement",
    "BearingResult.notes": "remarks on the rating",
    "Candidate.designation": "the row's designation in the bearing table", "Candidate.series": "ISO dimension series",
    "Candidate.d_mm": "bore, mm", "Candidate.D_mm": "outer diameter, mm", "Candidate.B_mm": "width, mm",
    "Candidate.C_N": "basic dynamic load rating, N", "Candidate.C0_N": "basic static load rating, N",
    "Candidate.P_N": "duty-cycle equivalent dynamic load with this row's factors, N",
    "Candidate.L10_h": "basic rating life, hours", "Candidate.Lnm_h": "modified rating life at the stated reliability, hours",
    "Candidate.s0": "static safety factor", "Candidate.limiting_speed_rpm": "the row's limiting speed, rpm",
    "Candidate.ok": "true when it meets every requirement", "Candidate.reasons": "why it does not",
    "SeriesMinimum.series": "ISO dimension series", "SeriesMinimum.d_mm": "smallest bore that passes, mm (null: none in the table)",
    "SeriesMinimum.designation": "that bearing's designation",
    "ShaftSection.kind": "what makes the section (shoulder, seat, groove, support, peak moment)",
    "ShaftSection.where": "the section in words", "ShaftSection.d_mm": "stressed diameter (at a groove its root), mm",
    "ShaftSection.bore_mm": "bore, mm", "ShaftSection.Kt": "theoretical stress concentration factor, bending",
    "ShaftSection.Kts": "theoretical stress concentration factor, torsion", "ShaftSection.Kf": "fatigue stress concentration factor, bending",
    "ShaftSection.Kfs": "fatigue stress concentration factor, torsion", "ShaftSection.Se_MPa": "corrected endurance limit, MPa",
    "ShaftSection.sigma_a_MPa": "von Mises alternating stress (Kf applied), MPa",
    "ShaftSection.tau_m_MPa": "mean torsional stress (Kfs applied), MPa",
    "ShaftSection.n_fatigue": "fatigue safety factor", "ShaftSection.n_yield": "first-cycle yield safety factor",
    "ShaftSection.d_min_mm": "smallest diameter that meets both targets in every case, mm",
    "ShaftSection.load_case": "the governing load case", "ShaftSection.miner": "true when Miner's rule over the duty cycle applies",
    "ShaftSummary.critical_speed_rpm": "first lateral critical speed, rpm",
    "ShaftSummary.natural_frequencies_rpm": "first lateral natural frequencies, rpm",
    "ShaftSummary.rayleigh_rpm": "Rayleigh's estimate of the first critical speed, rpm",
    "ShaftSummary.torsional_rpm": "first torsional natural frequency, rpm",
    "ShaftSummary.mass_kg": "the shaft's mass, kg", "ShaftSummary.length_mm": "the shaft's length, mm",
    "ShaftSummary.min_safety_factor": "the smallest safety factor of any section",
    "ShaftSummary.sections": "checked sections, worst first",
    "Check.code": "what is checked", "Check.status": "ok, warn or fail", "Check.message": "the verdict in words",
    "Check.value": "the value found", "Check.limit": "the limit it is held to", "Check.unit": "unit of value and limit",
    "Check.source": "where the limit or method comes from", "Check.where": "support or element id, or x = … mm",
    "Check.load_case": "the load case it applies to (empty: all)",
    "Diagrams.x_mm": "positions along x, mm (a jump repeats its x)",
    "Diagrams.load_cases": "per load case name: Vy_N, Vz_N, My_Nm, Mz_Nm, M_Nm, T_Nm, N_N, uy_mm, uz_mm, u_mm, "
                           "slope_y_rad, slope_z_rad, slope_rad (signs above)",
}


def _description(model: str, key: str) -> str | None:
    if model in _result_models():
        return RESULT_DESCRIPTIONS.get(f"{model}.{key}") or RESULT_DESCRIPTIONS.get(key)
    return DESCRIPTIONS.get(f"{model}.{key}") or DESCRIPTIONS.get(key)


@lru_cache(maxsize=1)
def _result_models() -> frozenset[str]:
    return frozenset({"Result", *Result.model_json_schema(mode="serialization").get("$defs", {})})


# --- request and response bodies of the JSON API (documentation models) ---------------------

class _Body(BaseModel):
    model_config = ConfigDict(extra="forbid")


class ErrorItem(_Body):
    path: str = Field(description="key path of the offending input (empty: the whole document)")
    message: str = Field(description="what is wrong, in the designer's words")


class ErrorList(_Body):
    """Bad input: every problem found, each with its key path."""

    errors: list[ErrorItem]


class SaveRequest(_Body):
    """A design with who saved it and why; ``base_revision`` is the revision it was edited from."""

    design: Design
    author: str = Field("", description="who saves it (shown in the history)")
    comment: str = Field("", description="why (shown in the history)")
    base_revision: int | None = Field(None, ge=1, description="the revision this edit started from "
                                      "(a stale base is kept as a conflict record, nothing is overwritten)")


class Revision(_Body):
    """A stored revision of a design, with its links."""

    id: str = Field(description="the design's id")
    revision: int = Field(description="revision number, from 1")
    design: Design
    name: str
    author: str
    comment: str
    created_at: str = Field(description="when it was saved (ISO 8601, UTC)")
    engine_version: str
    base_revision: int | None = None
    url: str = Field(description="the design's page (share link)")
    api_url: str
    revisions_url: str
    revision_url: str
    note_url: str = Field(description="the printable design note of this revision")
    export_url: str = Field(description="the design file of this revision")


class RevisionSummary(_Body):
    """One line of a design's history."""

    revision: int
    name: str
    author: str
    comment: str
    created_at: str = Field(description="when it was saved (ISO 8601, UTC)")
    engine_version: str
    base_revision: int | None = None
    url: str = Field(description="the revision's page")


class RevisionList(_Body):
    """Every revision of a design, oldest first."""

    id: str
    latest_revision: int
    revisions: list[RevisionSummary]


class StudyRequest(_Body):
    """A design and one or two variables to vary."""

    design: Design
    vary: list[Union[str, dict[str, Any]]] = Field(
        description="one or two variables: 'PATH=START:STOP:COUNT' (e.g. 'supports.B.x_mm=150:220:15') "
                    "or {\"path\": …, \"values\": […]}")


class ArrangementsRequest(_Body):
    """A design whose outermost supports get every sensible bearing arrangement."""

    design: Design


class OptimiseRequest(_Body):
    """A design, the variables to search with their bounds, the objectives and the budget
    (engine/search.py; ``shaftwright optimise`` takes the same)."""

    design: Design
    vary: list[Union[str, dict[str, Any]]] = Field(
        description="variables and bounds: 'PATH=LOW:HIGH' (continuous), 'PATH=LOW:HIGH:STEP' (rounded), "
                    "'PATH=LOW:HIGH:R20' (ISO 3 preferred numbers), 'PATH=a,b,c' or '*' for choices, e.g. "
                    "'shaft.segments[2].d_mm=40:60:1', 'supports.B.x_mm=200:260', 'supports.A.dimension_series=*'")
    objectives: list[Literal["mass_kg", "bearing_space_mm2", "max_bearing_D_mm", "life_margin", "fatigue_margin"]] = Field(
        ["mass_kg"], description="shaft mass, bearing space Σ D·B and the largest bearing outer diameter are "
                                 "minimised; the smallest life "
                                 "margin and fatigue safety margin are maximised")
    limits: list[str] | None = Field(None, description="limits of your own, 'NAME<=VALUE': max_bearing_D_mm, "
                                                       "mass_kg, bearing_space_mm2, length_mm")
    seed: int = Field(1, ge=0, description="seed; the same seed and generations give the same front")
    budget_s: float = Field(10.0, gt=0, le=20, description="time budget [s], checked between generations")
    generations: int = Field(60, ge=1, le=1000)
    population: int = Field(40, ge=4, le=200)


def _search_model() -> type[BaseModel] | None:
    try:
        from engine.search import SearchResult
    except ImportError:
        return None
    return SearchResult


def _study_models() -> tuple[type[BaseModel] | None, type[BaseModel] | None]:
    try:
        from engine.study import ArrangementComparison, StudyResult
    except ImportError:  # the study engine moved: describe the body as an object
        return None, None
    return StudyResult, ArrangementComparison


def api_bodies() -> dict[tuple[str, str], tuple[Any, type[BaseModel] | None, int]]:
    """(path, method) → (request model or models, response model, success status) of the JSON
    API; a tuple of request models means any one of them (a bare design, or a save request)."""
    study, arrangements = _study_models()
    return {
        ("/api/solve", "post"): (Design, Result, 200),
        ("/api/designs", "post"): ((SaveRequest, Design), Revision, 201),
        ("/api/designs/import", "post"): (None, Revision, 201),  # the file: multipart field "file"
        ("/api/designs/{design_id}", "get"): (None, Revision, 200),
        ("/api/designs/{design_id}/revisions", "get"): (None, RevisionList, 200),
        ("/api/designs/{design_id}/revisions", "post"): (SaveRequest, Revision, 201),
        ("/api/designs/{design_id}/revisions/{n}", "get"): (None, Revision, 200),
        ("/api/designs/{design_id}/revisions/{n}/export", "get"): (None, Design, 200),
        ("/api/study", "post"): (StudyRequest, study, 200),
        ("/api/arrangements", "post"): (ArrangementsRequest, arrangements, 200),
        ("/api/optimise", "post"): (OptimiseRequest, _search_model(), 200),
    }


# --- schemas ----------------------------------------------------------------------------------

def _describe(defs: dict[str, Any], top_name: str, top: dict[str, Any]) -> None:
    for name, schema in [(top_name, top), *defs.items()]:
        for key, prop in schema.get("properties", {}).items():
            text = _description(name, key)
            if text and "description" not in prop:
                prop["description"] = text
            prop.pop("title", None)


def _schema(model: type[BaseModel], mode: Literal["validation", "serialization"], *,
            ref_template: str = "#/$defs/{model}") -> dict[str, Any]:
    schema = model.model_json_schema(mode=mode, ref_template=ref_template)
    _describe(schema.get("$defs", {}), model.__name__, schema)
    return schema


def design_schema() -> dict[str, Any]:
    """JSON Schema of the design document (``shaft-design/1``), from :class:`engine.model.Design`."""
    s = _schema(Design, "validation")
    return {"$schema": DRAFT, "$id": "shaft-design/1", "title": f"Shaftwright design document ({FORMAT})",
            "description": "One shaft arrangement: shaft, supports, elements, duty cycle, requirements. "
                           "Units are in the key names; x runs along the shaft from its left end; "
                           "y, z transverse, right-handed. Cross-field rules (supports on the shaft, "
                           "torque balance, time fractions summing to 1) are checked by the engine.",
            **{k: v for k, v in s.items() if k not in ("title", "description")}}


def result_schema() -> dict[str, Any]:
    """JSON Schema of the result document (``shaft-result/1``), from :class:`engine.result.Result`."""
    s = _schema(Result, "serialization")
    return {"$schema": DRAFT, "$id": "shaft-result/1", "title": "Shaftwright result document (shaft-result/1)",
            "description": "What the engine computed for a design: per load case the element forces "
                           "and reactions, the bearings and their candidates, the shaft summary, "
                           "every check, and the diagrams along x.",
            **{k: v for k, v in s.items() if k not in ("title", "description")}}


def install_openapi(app: Any) -> None:
    """Make ``app.openapi()`` name the models of :func:`api_bodies` for each route's bodies."""
    from fastapi.openapi.utils import get_openapi

    def openapi() -> dict[str, Any]:
        if app.openapi_schema:
            return app.openapi_schema
        spec = get_openapi(title=app.title, version=app.version, description=app.description,
                           routes=app.routes)
        bodies = api_bodies()
        models = {m for req, resp, _ in bodies.values()
                  for m in ((*req, resp) if isinstance(req, tuple) else (req, resp)) if m is not None}
        pairs = [(m, "validation") for m in models if m is not Result] + [(ErrorList, "validation")]
        pairs += [(Result, "serialization")] if Result in models else []
        _, defs = models_json_schema(pairs, ref_template="#/components/schemas/{model}")
        components = spec.setdefault("components", {}).setdefault("schemas", {})
        for name, schema in defs.get("$defs", {}).items():
            _describe({}, name, schema)
            components.setdefault(name, schema)
        def ref(m: Any) -> dict[str, Any]:
            if isinstance(m, tuple):
                return {"anyOf": [ref(x) for x in m]}
            return {"$ref": f"#/components/schemas/{m.__name__}"}

        for (path, method), (req, resp, status) in bodies.items():
            op = spec.get("paths", {}).get(path, {}).get(method)
            if op is None:
                continue
            if req is not None:
                content = op.setdefault("requestBody", {"required": True}).setdefault("content", {})
                content.setdefault("application/json", {})["schema"] = ref(req)
            responses = op.setdefault("responses", {})
            if resp is not None:
                ok = responses.setdefault(str(status), {"description": "success"})
                ok.setdefault("content", {}).setdefault("application/json", {})["schema"] = ref(resp)
            if req is not None:
                bad = responses.setdefault("422", {"description": "bad input: every problem with its key path"})
                bad.setdefault("content", {}).setdefault("application/json", {})["schema"] = ref(ErrorList)
        app.openapi_schema = spec
        return spec

    app.openapi = openapi


# --- the reference page -----------------------------------------------------------------------

def _type(prop: dict[str, Any]) -> str:
    if "$ref" in prop:
        return prop["$ref"].rsplit("/", 1)[-1]
    if "const" in prop:
        return json.dumps(prop["const"])
    if "enum" in prop:
        return " | ".join(json.dumps(v) if v is not None else "null" for v in prop["enum"])
    if "oneOf" in prop or "anyOf" in prop:
        parts = [_type(p) for p in prop.get("oneOf", prop.get("anyOf", []))]
        return " | ".join(dict.fromkeys(parts))
    t = prop.get("type", "any")
    if t == "array":
        return f"list of {_type(prop.get('items', {}))}"
    if t == "object" and "additionalProperties" in prop and isinstance(prop["additionalProperties"], dict):
        return f"map of {_type(prop['additionalProperties'])}"
    return {"number": "number", "integer": "integer", "string": "text", "boolean": "true/false",
            "null": "null", "object": "object"}.get(t, str(t))


def _limits(prop: dict[str, Any]) -> str:
    out = []
    subs = [prop] + prop.get("anyOf", [])
    for p in subs:
        for key, sign in (("exclusiveMinimum", ">"), ("minimum", "≥"), ("exclusiveMaximum", "<"),
                          ("maximum", "≤"), ("minLength", "length ≥"), ("maxLength", "length ≤"),
                          ("minItems", "entries ≥"), ("maxItems", "entries ≤")):
            if key in p and not (key == "maximum" and p[key] >= 1e15) and not (key == "minimum" and p[key] <= -1e15):
                out.append(f"{sign} {p[key]:g}" if isinstance(p[key], float) else f"{sign} {p[key]}")
    return ", ".join(dict.fromkeys(out))


def object_rows(obj: dict[str, Any]) -> list[tuple[str, str, str, str, str]]:
    """Rows of key, type, required or default, limits, description of one object schema."""
    req = set(obj.get("required", []))
    rows = []
    for key, prop in obj.get("properties", {}).items():
        need = "required" if key in req else (
            "default " + json.dumps(prop["default"], ensure_ascii=False) if "default" in prop else "optional")
        if len(need) > 40:
            need = "default: see the type"
        rows.append((key, _type(prop), need, _limits(prop), prop.get("description", "")))
    return rows


def schema_rows(schema: dict[str, Any]) -> list[tuple[str, list[tuple[str, str, str, str, str]]]]:
    """Per object of ``schema`` (the top one first, then its ``$defs``): :func:`object_rows`."""
    objects = [(schema.get("title", "document"), schema)] + list(schema.get("$defs", {}).items())
    return [(name, object_rows(obj)) for name, obj in objects]


def schemas_html(spec: dict[str, Any]) -> str:
    """The OpenAPI document's schemas as HTML tables, one per object, anchored ``#schema-Name``
    (for ``/docs``); every text escaped."""
    from html import escape

    parts = ["<h2 id='schemas'>Schemas</h2>"]
    for name, obj in sorted(spec.get("components", {}).get("schemas", {}).items()):
        parts.append(f"<h3 id='schema-{escape(name)}'>{escape(name)}</h3>")
        if obj.get("description"):
            parts.append(f"<p>{escape(' '.join(obj['description'].split()))}</p>")
        rows = object_rows(obj)
        if rows:
            parts.append("<table><tr><th>key</th><th>type</th><th>required / default</th><th>limits</th>"
                         "<th>meaning</th></tr>")
            parts += ["<tr>" + "".join(f"<td>{escape(c)}</td>" for c in (f"{k}", t, n, lim, d)) + "</tr>"
                      for k, t, n, lim, d in rows]
            parts.append("</table>")
    return "".join(parts)


def body_model(schema: dict[str, Any] | None) -> list[str]:
    """The component names a body schema refers to (``$ref`` or ``anyOf`` of refs)."""
    if not schema:
        return []
    refs = [schema] if "$ref" in schema else schema.get("anyOf", [])
    return [r["$ref"].rsplit("/", 1)[-1] for r in refs if "$ref" in r]


def _md_table(rows: Iterable[tuple[str, ...]], names: Iterable[str] = ()) -> list[str]:
    """A markdown table of :func:`object_rows`; object names in a type link to their section."""
    import re

    linked = re.compile(r"\b(" + "|".join(sorted(map(re.escape, names), key=len, reverse=True)) + r")\b") if names else None
    lines = ["| key | type | required / default | limits | meaning |", "|---|---|---|---|---|"]
    for key, typ, need, lim, desc in rows:
        typ = typ.replace("|", "\\|")
        if linked:
            typ = linked.sub(lambda m: f"[{m.group(1)}](#{m.group(1).lower()})", typ)
        cells = [f"`{key}`", typ] + [c.replace("|", "\\|") for c in (need, lim, desc)]
        lines.append("| " + " | ".join(cells) + " |")
    return lines


SIGNS = """## Units, axes and signs

- Every number carries its unit in its key: `_mm`, `_N`, `_Nm` (torque and moment), `_rpm`,
  `_kW`, `_MPa`, `_GPa`, `_kg`, `_kg_m3`, `_kg_m2`, `_h`, `_deg`, `_rad`, `_pct`, `_C`.
- x runs along the shaft axis from the shaft's left end (`x_mm = 0`); y and z are transverse;
  x, y, z are right-handed. Gravity acts along −y unless `gravity` says otherwise.
- An angle about the shaft axis (`mesh_angle_deg`, `strand_angle_deg`) is measured about +x,
  from +y toward +z. A torque about +x is positive by the right-hand rule.
- An element's `torque_Nm` is the torque the element applies *to* the shaft: a driving element
  has one sign, a driven one the other, and they sum to zero (within 0.5 % of the largest).
  At most one element may leave it null; its torque then balances the others.
- A reaction is the force the support exerts *on* the shaft. `Fr_N` is the radial resultant
  √(Fy² + Fz²); `Fa_N` the axial load the bearing carries, a non-negative magnitude.
- Diagrams (result): shear V = Σ of the forces left of x; bending moment in each plane is
  sagging-positive, E·I·u″ = M (x–y plane: `Mz_Nm`, x–z plane: `My_Nm`); axial force
  tension-positive; torque T(x) = Σ of the element torques left of x; slopes
  `slope_y_rad` = duy/dx, `slope_z_rad` = duz/dx.
"""


def markdown() -> str:
    """docs/design-format.md: the sign conventions and a key table per object of both formats."""
    out = ["# Design and result formats (`shaft-design/1`, `shaft-result/1`)", "",
           "<!-- generated by `python3 -m app.schema > docs/design-format.md` from the engine's "
           "models (app/schema.py); do not edit by hand: tests/cli/test_schema.py checks it -->", "",
           "A design is one JSON document; `shaftwright solve DESIGN.json --json` and `POST /api/solve` "
           "turn it into a result document. `shaftwright schema` prints the design's JSON Schema "
           "(draft 2020-12) and `shaftwright schema --result` the result's; `/docs` and "
           "`/openapi.json` describe the JSON API with the same models. The demo designs in "
           "`sample_data/` are complete examples.", "",
           "The schema checks each key on its own; the engine also checks the rules across keys "
           "(every support and element on the shaft, ids unique, torques balanced, time fractions "
           "summing to 1, …) and answers every problem with its key path, e.g. `supports[1].x_mm`.",
           "", SIGNS]
    for title, schema in (("Design (`shaft-design/1`)", design_schema()),
                          ("Result (`shaft-result/1`)", result_schema())):
        out += [f"## {title}", ""]
        for name, rows in schema_rows(schema):
            heading = name if not name.startswith("Shaftwright") else ("Design" if "design" in name else "Result")
            out += [f"### {heading}", ""]
            obj = schema if name == schema.get("title") else schema["$defs"][name]
            if obj.get("description") and obj is not schema:
                out += [" ".join(obj["description"].split()), ""]
            if rows:
                out += _md_table(rows, schema.get("$defs", {}))
            out.append("")
    return "\n".join(out).rstrip() + "\n"


if __name__ == "__main__":
    import sys

    sys.stdout.write(markdown())
