"""Shaft stiffness checks: slope at each bearing against its type's permissible misalignment,
deflection and slope at each gear, and the relative slope across a mesh when the mating
shaft's slope is known.

Units: mm, rad. Slopes and deflections are resultants of the two transverse planes,
√(θy² + θz²) and √(uy² + uz²), taken at the node of the support or element.

Public names
------------
- :data:`SLOPE_LIMITS` — permissible slope by bearing type, (lower, upper, source).
- :data:`GEAR_LIMITS` — gear deflection and slope limits with their sources.
- :func:`slope_limit` — the limits that apply to one support.
- :func:`bearing_slope_checks`, :func:`gear_checks` — the verdicts as :class:`engine.result.Check`.

Status rule (ours): a slope at or below the lower end of the type's range is ``ok``, between
the lower and upper ends ``warn`` (the bearing tolerates it only with care: internal clearance,
crowned rollers), above the upper end ``fail``. A limit set on the support
(``misalignment_limit_rad``) is one value: at or below it ``ok``, above it ``fail``.

References
----------
.. [1] Budynas, R. G., Nisbett, J. K., *Shigley's Mechanical Engineering Design*, 9th ed.,
   McGraw-Hill, 2011, Table 7-2 "Typical maximum ranges for slopes and transverse
   deflections" (memory).
"""
from __future__ import annotations

import numpy as np

from engine.model import Design
from engine.result import Check

__all__ = ["SLOPE_LIMITS", "GEAR_LIMITS", "BEVEL_LIMITS", "slope_limit", "bearing_slope_checks", "gear_checks",
           "bevel_mesh_checks", "GEAR_KINDS"]

_T72 = "Shigley, Mechanical Engineering Design, 9th ed., Table 7-2 (memory)"
SLOPE_LIMITS: dict[str, tuple[float, float, str]] = {
    "tapered_roller": (0.0005, 0.0012, _T72),
    "cylindrical_roller": (0.0008, 0.0012, _T72),
    "deep_groove_ball": (0.001, 0.003, _T72),
    "spherical_roller": (0.026, 0.052, _T72),
    "self_aligning_ball": (0.026, 0.052, _T72),
    # not in Table 7-2: a single-row angular contact ball bearing carries its load on one
    # contact line and takes less tilt than a deep groove one; a needle bearing's long rollers
    # edge-load early (common practice)
    "angular_contact_ball": (0.0005, 0.001, "common practice (not in Table 7-2)"),
    "needle_roller": (0.0005, 0.0008, "common practice (not in Table 7-2)"),
}
GEAR_LIMITS = {
    "deflection_mm": (0.13, "Shigley 9th ed. Table 7-2: spur gears, 11–19 teeth/in "
                            "(0.25 mm coarser, 0.08 mm finer pitch) (memory)"),
    "slope_rad": (0.0005, "Shigley 9th ed. Table 7-2: uncrowned spur gears (memory)"),
}
GEAR_KINDS = ("gear",)  # held to the spur limits; bevel gears: bevel_mesh_checks
# A bevel pair's contact pattern moves when either member shifts along or across its axis; the
# trade's guidance for mounting under load is a few hundredths of a millimetre each way for
# medium-size gears (common practice, from memory; tighter for fine pitch, looser for large
# gears: take the gear maker's figure when known)
BEVEL_LIMITS = {
    "axial_mm": (0.075, "common practice (from memory): bevel gear displacement along its axis under load "
                        "about 0.075 mm at most for medium-size gears"),
    "radial_mm": (0.075, "common practice (from memory): bevel gear displacement across its axis under load "
                         "about 0.075 mm at most for medium-size gears"),
}


def slope_limit(support) -> tuple[float, float, str] | None:
    """(lower, upper, source) for a support; None for a plain support with no bearing and no
    limit of its own. A support's ``misalignment_limit_rad`` replaces its type's range."""
    if support.misalignment_limit_rad is not None:
        v = support.misalignment_limit_rad
        return v, v, "design: supports[].misalignment_limit_rad"
    if support.bearing_type is None:
        return None
    return SLOPE_LIMITS[support.bearing_type]


def _status(value: float, lower: float, upper: float) -> str:
    return "ok" if value <= lower else ("warn" if value <= upper else "fail")


def _resultant_at(arr: np.ndarray, nodes: np.ndarray) -> np.ndarray:
    """(n_cases, 2, N) → resultant at nodes, (n_cases, len(nodes))."""
    return np.hypot(arr[:, 0, nodes], arr[:, 1, nodes])


def bearing_slope_checks(design: Design, *, slope_rad: np.ndarray, support_nodes: np.ndarray) -> list[Check]:
    """One check per bearing: its largest resultant slope over the load cases against its limit.

    Parameters
    ----------
    slope_rad : (n_cases, 2, N) slopes in both planes at the nodes, [rad]
    support_nodes : (n_supports,) node of each support
    """
    if len(design.supports) == 0:
        return []
    th = _resultant_at(slope_rad, np.asarray(support_nodes))
    out: list[Check] = []
    for i, s in enumerate(design.supports):
        lim = slope_limit(s)
        if lim is None:
            continue
        j = int(np.argmax(th[:, i]))
        v = float(th[j, i])
        lower, upper, src = lim
        st = _status(v, lower, upper)
        kind = (s.bearing_type or "support").replace("_", " ")
        rng = f"{lower:g} rad" if lower == upper else f"{lower:g}–{upper:g} rad"
        msg = {"ok": f"slope {v:.3g} rad at {kind} {s.id} is within {lower:g} rad",
               "warn": f"slope {v:.3g} rad at {kind} {s.id} lies in the tolerated range {rng}: "
                       "check the bearing's permissible misalignment",
               "fail": f"slope {v:.3g} rad at {kind} {s.id} exceeds the permissible {rng}"}[st]
        out.append(Check(code="shaft.bearing_slope", status=st, message=msg, value=v, limit=lower,
                         unit="rad", source=src, where=s.id, load_case=design.load_cases[j].name))
    return out


def gear_checks(design: Design, *, u_mm: np.ndarray, slope_rad: np.ndarray,
                element_nodes: np.ndarray) -> list[Check]:
    """Deflection and slope at every gear (governing load case each), and the relative slope
    across the mesh where ``mate_slope_rad`` gives the mating shaft's slope.

    The relative slope is taken as |θ| + |θ_mate|: with one number for the mate its direction
    is unknown, so the two slopes are assumed to add (the conservative case). Limits:
    ``requirements.gear_deflection_max_mm`` and ``gear_slope_max_rad`` (defaults from
    Shigley Table 7-2; see :data:`GEAR_LIMITS`).
    """
    req = design.requirements
    nodes = np.asarray(element_nodes)
    idx = [i for i, e in enumerate(design.elements) if e.kind in GEAR_KINDS]
    if not idx:
        return []
    u = _resultant_at(u_mm, nodes[idx])
    th = _resultant_at(slope_rad, nodes[idx])
    dsrc = GEAR_LIMITS["deflection_mm"][1] if req.gear_deflection_max_mm == GEAR_LIMITS["deflection_mm"][0] \
        else "design: requirements.gear_deflection_max_mm"
    ssrc = GEAR_LIMITS["slope_rad"][1] if req.gear_slope_max_rad == GEAR_LIMITS["slope_rad"][0] \
        else "design: requirements.gear_slope_max_rad"
    out: list[Check] = []
    for k, i in enumerate(idx):
        e = design.elements[i]
        for code, word, arr, limit, unit, src in (
                ("shaft.gear_deflection", "deflection", u, req.gear_deflection_max_mm, "mm", dsrc),
                ("shaft.gear_slope", "slope", th, req.gear_slope_max_rad, "rad", ssrc)):
            j = int(np.argmax(arr[:, k]))
            v = float(arr[j, k])
            ok = v <= limit
            out.append(Check(code=code, status="ok" if ok else "fail",
                             message=f"{word} {v:.3g} {unit} at gear {e.id} "
                                     f"{'is within' if ok else 'exceeds'} {limit:g} {unit}",
                             value=v, limit=limit, unit=unit, source=src,
                             where=e.id, load_case=design.load_cases[j].name))
        mate = getattr(e, "mate_slope_rad", None)
        if mate is not None:
            j = int(np.argmax(th[:, k]))  # the case of the largest slope at this gear
            v = float(th[j, k] + abs(mate))
            ok = v <= req.gear_slope_max_rad
            out.append(Check(code="shaft.mesh_slope", status="ok" if ok else "fail",
                             message=f"relative slope across the mesh of {e.id}: {v:.3g} rad "
                                     f"(this shaft {th[j, k]:.3g} + mate {abs(mate):.3g}) "
                                     f"{'is within' if ok else 'exceeds'} {req.gear_slope_max_rad:g} rad",
                             value=v, limit=req.gear_slope_max_rad, unit="rad", source=ssrc,
                             where=e.id, load_case=design.load_cases[j].name))
    return out


def bevel_mesh_checks(design: Design, *, u_mm: np.ndarray, element_nodes: np.ndarray, x_mm: np.ndarray,
                      N_N: np.ndarray, EA_N: np.ndarray, x_axial_mm: np.ndarray,
                      bearing_axial_mm: np.ndarray) -> list[Check]:
    """Displacement of every bevel gear along and across the shaft axis (governing load case
    each) against :data:`BEVEL_LIMITS`, instead of the spur gear's slope and deflection limits.

    Across: the resultant transverse deflection √(uy² + uz²) at the gear. Along: the shaft's
    axial stretch between the support that carries the axial load in that case (``x_axial_mm``,
    (n_cases,)) and the gear, Σ N·Δx/(E·A) over the elements between them (``N_N`` (n_cases,
    n_el), ``EA_N`` (n_el,), nodes ``x_mm``), plus that bearing's own axial deflection
    (``bearing_axial_mm`` (n_cases,), Palmgren, see engine.bearings.mounted).
    """
    idx = [i for i, e in enumerate(design.elements) if e.kind == "bevel_gear"]
    if not idx:
        return []
    nodes = np.asarray(element_nodes)
    u = _resultant_at(u_mm, nodes[idx])
    mid = 0.5 * (x_mm[:-1] + x_mm[1:])
    strain = N_N / EA_N[None, :] * np.diff(x_mm)[None, :]  # (nc, n_el) elongation of each element
    out: list[Check] = []
    for k, i in enumerate(idx):
        e = design.elements[i]
        xg = float(e.x_mm)
        lo, hi = np.minimum(x_axial_mm, xg), np.maximum(x_axial_mm, xg)
        between = (mid[None, :] > lo[:, None]) & (mid[None, :] < hi[:, None])
        axial = np.abs(np.sum(np.where(between, strain, 0.0), axis=1)) + np.abs(bearing_axial_mm)
        for code, word, arr, (limit, src) in (
                ("shaft.bevel_axial", "along the axis", axial, BEVEL_LIMITS["axial_mm"]),
                ("shaft.bevel_radial", "across the axis", u[:, k], BEVEL_LIMITS["radial_mm"])):
            j = int(np.argmax(arr))
            v = float(arr[j])
            ok = v <= limit
            out.append(Check(code=code, status="ok" if ok else "fail",
                             message=f"bevel gear {e.id} moves {v:.3g} mm {word} under load, "
                                     f"{'within' if ok else 'beyond'} the {limit:g} mm a bevel mesh's contact "
                                     "pattern tolerates",
                             value=v, limit=limit, unit="mm", source=src, where=e.id,
                             load_case=design.load_cases[j].name))
    return out
