"""``solve(design) -> Result``: the engine's one entry point.

The steps, each a function of its own module:
validate (model) → element loads per case (loads) → mesh and bending in both planes, every
case at once (beam) → axial resolution over the supports → axial force and torque along x →
diagrams → bearings → shaft checks → result.
Units inside: mm, N, N·mm; the result carries N·m for moments as the contract says.
"""
from __future__ import annotations

import math
import re
from functools import lru_cache
from typing import Any

import numpy as np

import engine
from engine.checks import shaft_checks, sort_checks
from engine.bearings import Catalogue, parse_catalogue, rate_bearings
from engine.beam import BeamSolution, Mesh, axial_and_torque, build_mesh, solve_bending
from engine.loads import CaseLoads, case_loads
from engine.mounting import mounting, place_checks
from engine.model import Design, DesignError, EngineError, Issue, parse_design
from engine.result import (CaseResult, Diagrams, ElementForces, Result,
                           ShaftSummary, SupportReaction)

__all__ = ["solve", "Analysis", "analyse", "carry_axial"]


class Analysis:
    """Everything the later steps need from the structural solve of one design (plain data)."""

    def __init__(self, design: Design, mesh: Mesh, loads: list[CaseLoads], beam: BeamSolution,
                 Fr_N: np.ndarray, Fa_ext_N: np.ndarray, N_N: np.ndarray, T_Nmm: np.ndarray):
        self.design, self.mesh, self.loads, self.beam = design, mesh, loads, beam
        self.Fr_N, self.Fa_ext_N, self.N_N, self.T_Nmm = Fr_N, Fa_ext_N, N_N, T_Nmm


def _weight_density(design: Design, loads: list[CaseLoads]) -> np.ndarray:
    """(n_cases, 3) shaft weight per unit volume [N/mm³]: ρ [kg/mm³] · g (force factor applied)."""
    rho = design.shaft.material.density_kg_m3 * 1e-9
    return np.array([rho * cl.gravity_N_per_kg for cl in loads])


def analyse(design: Design) -> Analysis:
    """Loads and the bending solve for every load case; axial forces still unresolved."""
    mesh = build_mesh(design)
    loads = [case_loads(design, c) for c in design.load_cases]
    nc, N = len(loads), mesh.n_nodes
    F_nodal = np.zeros((nc, 2, N, 2))
    nodes = mesh.element_nodes
    for j, cl in enumerate(loads):
        np.add.at(F_nodal[j, 0, :, 0], nodes, cl.F_N[:, 1])
        np.add.at(F_nodal[j, 0, :, 1], nodes, cl.C_Nmm[:, 2])
        np.add.at(F_nodal[j, 1, :, 0], nodes, cl.F_N[:, 2])
        np.add.at(F_nodal[j, 1, :, 1], nodes, -cl.C_Nmm[:, 1])
    w = _weight_density(design, loads)
    beam = solve_bending(design, mesh, F_nodal, w[:, 1:])
    Fr = np.hypot(beam.R_N[:, 0, :], beam.R_N[:, 1, :])
    volume = float(np.sum(mesh.A_mm2 * mesh.le_mm))
    Fa_ext = np.array([cl.F_N[:, 0].sum() for cl in loads]) + w[:, 0] * volume
    return Analysis(design, mesh, loads, beam, Fr, Fa_ext, np.empty(0), np.empty(0))


def carry_axial(a: Analysis, Fx_N: np.ndarray) -> None:
    """Set the axial force and torque along the shaft (``a.N_N``, ``a.T_Nmm``) once the axial
    reactions ``Fx_N`` (n_cases, n_supports) of the supports are known."""
    Fx_loads = np.hstack([np.array([cl.F_N[:, 0] for cl in a.loads]), Fx_N])
    x_loads = np.concatenate([a.loads[0].x_mm if a.loads else [], [s.x_mm for s in a.design.supports]])
    T_loads = np.hstack([np.array([cl.C_Nmm[:, 0] for cl in a.loads]), np.zeros_like(Fx_N)])
    a.N_N, a.T_Nmm = axial_and_torque(a.mesh, x_loads, Fx_loads, T_loads,
                                      _weight_density(a.design, a.loads)[:, 0])


def _diagrams(a: Analysis) -> Diagrams:
    m, b = a.mesh, a.beam
    x = np.stack([m.x_mm[:-1], m.x_mm[1:]], axis=1).ravel()
    out: dict[str, dict[str, list[float]]] = {}
    for j, case in enumerate(a.design.load_cases):
        node = lambda arr: np.stack([arr[:-1], arr[1:]], axis=1).ravel()  # noqa: E731
        uy, uz = node(b.u_mm[j, 0]), node(b.u_mm[j, 1])
        sy, sz = node(b.slope_rad[j, 0]), node(b.slope_rad[j, 1])
        Mz, My = b.M_Nmm[j, 0].ravel() / 1e3, b.M_Nmm[j, 1].ravel() / 1e3
        rep = lambda arr: np.repeat(arr, 2)  # noqa: E731
        series = {
            "Vy_N": b.V_N[j, 0].ravel(), "Vz_N": b.V_N[j, 1].ravel(),
            "Mz_Nm": Mz, "My_Nm": My, "M_Nm": np.hypot(My, Mz),
            "T_Nm": rep(a.T_Nmm[j]) / 1e3, "N_N": rep(a.N_N[j]),
            "uy_mm": uy, "uz_mm": uz, "u_mm": np.hypot(uy, uz),
            "slope_y_rad": sy, "slope_z_rad": sz, "slope_rad": np.hypot(sy, sz),
        }
        for k, v in series.items():
            if not np.all(np.isfinite(v)):
                raise _overflow(f"load_cases[{j}]", f"diagrams.load_cases.{case.name}.{k}", "not finite")
        out[case.name] = {k: v.tolist() for k, v in series.items()}
    return Diagrams(x_mm=x.tolist(), load_cases=out)


def _overflow(design_path: str, result_path: str, value: Any) -> EngineError:
    return EngineError.at(
        design_path,
        f"the solution overflowed ({result_path} came out {value}): a size, force, speed, stiffness "
        "or factor of this design is far outside what a real shaft sees; check the magnitudes here")


def _non_finite(obj: Any, path: str = "") -> tuple[str, float] | None:
    """(path, value) of the first NaN or infinite float in a dumped result, or None."""
    if isinstance(obj, float):
        return None if math.isfinite(obj) else (path, obj)
    if isinstance(obj, dict):
        items = obj.items()
    elif isinstance(obj, list):
        items = ((f"[{i}]", v) for i, v in enumerate(obj))
    else:
        return None
    for k, v in items:
        hit = _non_finite(v, f"{path}{k}" if str(k).startswith("[") else (f"{path}.{k}" if path else str(k)))
        if hit is not None:
            return hit
    return None


def _check_finite(design: Design, result: Result) -> None:
    """Backstop: a result holds finite numbers only, or the solve is an EngineError that names
    the part of the design it concerns (the web layer and JSON cannot carry NaN or infinity)."""
    hit = _non_finite(result.model_dump(exclude={"diagrams"}))
    if hit is None:
        return
    where, value = hit
    m = re.match(r"(load_cases|bearings)\[(\d+)\]", where)
    if m and m.group(1) == "load_cases":
        design_path = m.group(0)
    elif m:
        sid = result.bearings[int(m.group(2))].id
        design_path = next((f"supports[{i}]" for i, s in enumerate(design.supports) if s.id == sid), "supports")
    else:
        design_path = "shaft"
    raise _overflow(design_path, where, value)


@lru_cache(maxsize=8)
def _own_table(csv: str, name: str) -> Catalogue:
    """The design's own bearing table, parsed once per distinct text; its errors point at
    ``bearing_table.csv`` and say the row and column."""
    try:
        return parse_catalogue(csv, name=name)
    except DesignError as exc:
        raise DesignError([Issue(path="bearing_table.csv", message=f"{e.path}: {e.message}" if e.path else e.message)
                           for e in exc.errors]) from None


def solve(design_data: Any, *, diagrams: bool = True, catalogue: Catalogue | None = None) -> Result:
    """Solve a design document (mapping or :class:`Design`) and return the :class:`Result`.

    ``diagrams=False`` leaves the along-x arrays empty (for studies of many variants);
    ``catalogue`` is a bearing table of the user's (default: the bundled illustrative one).

    Raises :class:`engine.model.DesignError` (bad input) or :class:`EngineError` (a design
    that cannot be solved as laid out, or whose numbers overflow: a result never holds NaN or
    infinity), each listing the key paths at fault.
    """
    design = parse_design(design_data)
    if catalogue is None and design.bearing_table is not None:
        catalogue = _own_table(design.bearing_table.csv, design.bearing_table.name)
    a = analyse(design)
    rated = rate_bearings(design, Fr_N=a.Fr_N, Fa_ext_N=a.Fa_ext_N, catalogue=catalogue)
    Fa, Fx = rated.split.Fa_N, rated.split.Fx_N
    carry_axial(a, Fx)

    sc = shaft_checks(a)
    mt = mounting(a, rated.bearings)  # keys, press fits, seats, fits, twist (engine.mounting)
    u_res = np.hypot(a.beam.u_mm[:, 0], a.beam.u_mm[:, 1])  # (nc, N)
    cases = []
    for j, (case, cl) in enumerate(zip(design.load_cases, a.loads)):
        k = int(np.argmax(u_res[j]))
        cases.append(CaseResult(
            name=case.name, speed_rpm=case.speed_rpm, time_fraction=case.time_fraction,
            elements=[ElementForces(id=cl.ids[i], kind=cl.kinds[i], x_mm=float(cl.x_mm[i]),
                                    Fx_N=cl.F_N[i, 0], Fy_N=cl.F_N[i, 1], Fz_N=cl.F_N[i, 2],
                                    My_Nm=cl.C_Nmm[i, 1] / 1e3, Mz_Nm=cl.C_Nmm[i, 2] / 1e3,
                                    torque_Nm=cl.C_Nmm[i, 0] / 1e3) for i in range(len(cl.ids))],
            supports=[SupportReaction(id=s.id, x_mm=s.x_mm, Fx_N=Fx[j, i], Fy_N=a.beam.R_N[j, 0, i],
                                      Fz_N=a.beam.R_N[j, 1, i], Fr_N=a.Fr_N[j, i], Fa_N=Fa[j, i])
                      for i, s in enumerate(design.supports)],
            max_deflection_mm=float(u_res[j, k]), max_deflection_x_mm=float(a.mesh.x_mm[k]),
        ))
    mass = float(np.sum(a.mesh.A_mm2 * a.mesh.le_mm)) * design.shaft.material.density_kg_m3 * 1e-9
    result = Result(
        engine_version=engine.__version__, load_cases=cases, bearings=mt.bearings, mounting=mt.mounting,
        checks=sort_checks(place_checks(design, rated.checks + sc.checks + mt.checks)), warnings=rated.warnings,
        shaft=ShaftSummary(max_deflection_mm=float(u_res.max()), mass_kg=mass, length_mm=design.shaft.length_mm,
                           sections=sc.sections, **sc.summary()),
        diagrams=_diagrams(a) if diagrams else Diagrams(x_mm=[], load_cases={}),
    )
    _check_finite(design, result)
    return result
