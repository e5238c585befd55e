"""``solve_many(designs) -> [Result | DesignError | EngineError]``: the engine's one path;
``solve(design)`` is ``solve_many([design])[0]``, raised when it is an error.

The steps, each a function of its own module, over every design at once where they take many:
validate (model) → element loads per case (loads) → meshes, one pass per design (beam) →
bending in both planes, every case of every design in one banded solve (beam) → lateral modes
of every design, one banded factor (dynamics) → bearings and axial resolution (bearings) →
axial force and torque along x (beam) → shaft checks (checks) → finite-number backstop on the
arrays → result.
Units inside: mm, N, N·mm; the result carries N·m for moments as the contract says.
"""
from __future__ import annotations

import math
from functools import lru_cache
from typing import Any, Sequence

import numpy as np

import engine
from engine.checks import shaft_checks, sort_checks
from engine.bearings import BearingOutcome, Catalogue, parse_catalogue, rate_bearings_many
from engine.beam import BeamSolution, Mesh, axial_and_torque, build_meshes, solve_bending_many
from engine.bearings.mounted import (SOURCE_PRESSURE_CENTRE, SOURCE_STIFFNESS, axial_deflection_mm,
                                     pressure_centre_offset_mm, radial_stiffness, row_geometry)
from engine.stiffness import bevel_mesh_checks
from engine.dynamics import dynamics_elements, lateral_frequencies_many
from engine.loads import CaseLoads, case_loads
from engine.mounting import mounting, place_checks
from engine.model import Design, DesignError, EngineError, Issue, parse_design
from engine.result import (CaseResult, Diagrams, ElementForces, Result,
                           ShaftSummary, SupportReaction)

__all__ = ["solve", "solve_many", "Analysis", "analyse", "analyse_many", "carry_axial"]


class Analysis:
    """Everything the later steps need from the structural solve of one design (plain data).
    ``modes``: its lateral modes (``engine.dynamics.LateralModes``), solved with every other
    design of the batch; ``dyn_mesh`` the mesh they were solved on."""

    def __init__(self, design: Design, mesh: Mesh, loads: list[CaseLoads], beam: BeamSolution,
                 Fr_N: np.ndarray, Fa_ext_N: np.ndarray, N_N: np.ndarray, T_Nmm: np.ndarray):
        self.design, self.mesh, self.loads, self.beam = design, mesh, loads, beam
        self.Fr_N, self.Fa_ext_N, self.N_N, self.T_Nmm = Fr_N, Fa_ext_N, N_N, T_Nmm
        self.modes = None
        self.dyn_mesh: Mesh | None = None
        self.x_load_mm: list[float] = [s.x_mm for s in design.supports]
        self.springs: np.ndarray | None = None  # (n_cases, n_supports) secant stiffness used; NaN rigid/typed
        self.modal_k: dict[int, float] = {}


def _weight_density(design: Design, loads: list[CaseLoads]) -> np.ndarray:
    """(n_cases, 3) shaft weight per unit volume [N/mm³]: ρ [kg/mm³] · g (force factor applied)."""
    rho = design.shaft.material.density_kg_m3 * 1e-9
    return np.array([rho * cl.gravity_N_per_kg for cl in loads]).reshape(len(loads), 3)


def _nodal_forces(mesh: Mesh, loads: list[CaseLoads]) -> np.ndarray:
    """(n_cases, 2, N, 2) nodal forces of the elements, every case at once: Fy, Cz (x–y
    plane), Fz, −Cy (x–z plane)."""
    F = np.zeros((len(loads), 2, mesh.n_nodes, 2))
    if loads and mesh.element_nodes.size:
        at = (slice(None), mesh.element_nodes)
        Fe, Ce = np.array([cl.F_N for cl in loads]), np.array([cl.C_Nmm for cl in loads])  # (nc, n_el, 3)
        np.add.at(F[:, 0, :, 0], at, Fe[:, :, 1])
        np.add.at(F[:, 0, :, 1], at, Ce[:, :, 2])
        np.add.at(F[:, 1, :, 0], at, Fe[:, :, 2])
        np.add.at(F[:, 1, :, 1], at, -Ce[:, :, 1])
    return F


def analyse_many(designs: Sequence[Design], *, modes: bool = True,
                 springs: Sequence[np.ndarray | None] | None = None) -> list[Analysis | DesignError | EngineError]:
    """Loads, meshes (built once per design), the bending solve of every design in one banded
    solve and, with ``modes``, their lateral modes in one banded eigen-solve; axial forces
    still unresolved. ``springs``: per design None or (n_cases, n_supports) support stiffness
    per case [N/mm] (NaN: as the design says), see :func:`engine.beam.solve_bending_many`.
    An error in place of a design that cannot be analysed."""
    out: list[Any] = [None] * len(designs)
    ok, meshes, dmeshes, loads = [], [], [], []
    for k, d in enumerate(designs):
        try:
            ls = [case_loads(d, c) for c in d.load_cases]
            m, dm = build_meshes(d, (d.analysis.elements, dynamics_elements(d)))
        except (DesignError, EngineError) as exc:
            out[k] = exc
            continue
        ok.append(k), meshes.append(m), dmeshes.append(dm), loads.append(ls)
    ds = [designs[k] for k in ok]
    ws = [_weight_density(d, ls) for d, ls in zip(ds, loads)]
    sp = None if springs is None else [springs[k] for k in ok]
    beams = solve_bending_many(ds, meshes, [_nodal_forces(m, ls) for m, ls in zip(meshes, loads)],
                               [w[:, 1:] for w in ws], sp)
    held = [i for i, b in enumerate(beams) if not isinstance(b, EngineError)]
    lateral = lateral_frequencies_many([ds[i] for i in held], meshes=[dmeshes[i] for i in held]) if modes else []
    lat = dict(zip(held, lateral))
    for i, (k, d, m, ls, w, beam) in enumerate(zip(ok, ds, meshes, loads, ws, beams)):
        if isinstance(beam, EngineError):
            out[k] = beam
            continue
        Fr = np.hypot(beam.R_N[:, 0, :], beam.R_N[:, 1, :])
        volume = float(np.sum(m.A_mm2 * m.le_mm))
        Fa_ext = np.array([cl.F_N[:, 0].sum() for cl in ls]).reshape(-1) + w[:, 0] * volume
        a = Analysis(d, m, ls, beam, Fr, Fa_ext, np.empty(0), np.empty(0))
        a.modes = lat.get(i)
        a.dyn_mesh = dmeshes[i]
        out[k] = a
    return out


def analyse(design: Design) -> Analysis:
    """Loads and the bending solve for every load case of one design; axial forces still
    unresolved (:func:`analyse_many` of one; its error raised)."""
    a = analyse_many([design], modes=False)[0]
    if isinstance(a, Exception):
        raise a
    return a


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


def _series(a: Analysis, j: int) -> dict[str, np.ndarray]:
    """The along-x series of load case j (element ends, see :class:`engine.result.Diagrams`)."""
    b = a.beam
    node = lambda arr: np.stack([arr[:-1], arr[1:]], axis=1).ravel()  # noqa: E731
    rep = lambda arr: np.repeat(arr, 2)  # noqa: E731
    uy, uz = node(b.u_mm[j, 0]), node(b.u_mm[j, 1])
    sy, sz = node(b.slope_rad[j, 0]), node(b.slope_rad[j, 1])
    Mz, My = b.M_Nmm[j, 0].ravel() / 1e3, b.M_Nmm[j, 1].ravel() / 1e3
    return {"Vy_N": b.V_N[j, 0].ravel(), "Vz_N": b.V_N[j, 1].ravel(),
            "Mz_Nm": Mz, "My_Nm": My, "M_Nm": np.hypot(My, Mz),
            "T_Nm": rep(a.T_Nmm[j]) / 1e3, "N_N": rep(a.N_N[j]),
            "uy_mm": uy, "uz_mm": uz, "u_mm": np.hypot(uy, uz),
            "slope_y_rad": sy, "slope_z_rad": sz, "slope_rad": np.hypot(sy, sz)}


def _check_arrays(a: Analysis, Fa: np.ndarray, Fx: np.ndarray) -> None:
    """Backstop on the solve's arrays, before any result object is built: every deflection,
    slope, internal force, reaction and axial load finite, or an EngineError at the load case
    (the web layer and JSON cannot carry NaN or infinity)."""
    b = a.beam
    whole = (b.u_mm, b.slope_rad, b.V_N, b.M_Nmm, b.R_N, a.Fr_N, Fa, Fx, a.N_N, a.T_Nmm)
    if all(np.isfinite(v).all() for v in whole):
        return
    for j, case in enumerate(a.design.load_cases):
        for k, v in _series(a, j).items():
            if not np.isfinite(v).all():
                raise _overflow(f"load_cases[{j}]", f"diagrams.load_cases.{case.name}.{k}", "not finite")
        for name, arr in (("Fr_N", a.Fr_N), ("Fa_N", Fa), ("Fx_N", Fx), ("Fy_N", b.R_N[:, 0]), ("Fz_N", b.R_N[:, 1])):
            bad = ~np.isfinite(arr[j])
            if bad.any():
                raise _overflow(f"load_cases[{j}]", f"load_cases[{j}].supports[{int(np.argmax(bad))}].{name}",
                                "not finite")
    raise _overflow("shaft", "the deflections", "not finite")  # pragma: no cover - caught above


def _first_non_finite(items: Sequence[tuple[str, Any]]) -> tuple[str, float] | None:
    """(path, value) of the first NaN or infinite number among result objects' fields
    (their own floats and their lists of floats or of objects), or None."""
    for path, obj in items:
        for k, v in obj.__dict__.items():
            if isinstance(v, float):
                if not math.isfinite(v):
                    return f"{path}.{k}", v
            elif isinstance(v, list) and v:
                if isinstance(v[0], float):
                    arr = np.asarray(v)
                    if not np.isfinite(arr).all():
                        return f"{path}.{k}[{int(np.argmin(np.isfinite(arr)))}]", float(arr[~np.isfinite(arr)][0])
                elif hasattr(v[0], "__dict__"):
                    hit = _first_non_finite([(f"{path}.{k}[{i}]", o) for i, o in enumerate(v)])
                    if hit is not None:
                        return hit
    return None


def _check_objects(design: Design, bearings: list, sc, checks: list) -> None:
    """Backstop on the numbers the bearing layer and the shaft checks computed (lives,
    safety factors, sections, frequencies): finite, or an EngineError naming the support or
    the shaft. One array test over all of them; the path is looked for only on a hit."""
    objs = [*bearings, *(c for br in bearings for c in br.candidates),
            *(m for br in bearings for m in br.smallest_by_series), *sc.sections, *checks]
    vals = [v for o in objs for v in o.__dict__.values() if type(v) is float]
    vals += [v for br in bearings for v in br.Fr_N] + [v for br in bearings for v in br.Fa_N]
    vals += [v for v in (sc.critical_speed_rpm, sc.rayleigh_rpm, sc.torsional_rpm, sc.min_safety_factor)
             if v is not None]
    if np.isfinite(vals).all():
        return
    items = [(f"bearings[{i}]", br) for i, br in enumerate(bearings)]
    items += [(f"shaft.sections[{i}]", s) for i, s in enumerate(sc.sections)]
    items += [(f"checks[{i}]", c) for i, c in enumerate(checks)]
    hit = _first_non_finite(items)
    if hit is None:
        for name in ("critical_speed_rpm", "rayleigh_rpm", "torsional_rpm", "min_safety_factor"):
            v = getattr(sc, name)
            if v is not None and not math.isfinite(v):
                hit = (f"shaft.{name}", v)
                break
    if hit is None:
        return
    where, value = hit
    if where.startswith("bearings["):
        sid = bearings[int(where[9:where.index("]")])].id
        design_path = next((f"supports[{i}]" for i, s in enumerate(design.supports) if s.id == sid), "supports")
    else:
        design_path = "shaft"
    raise _overflow(design_path, where, value)


def _diagrams(a: Analysis) -> Diagrams:
    m = a.mesh
    x = np.stack([m.x_mm[:-1], m.x_mm[1:]], axis=1).ravel()
    out = {case.name: {k: v.tolist() for k, v in _series(a, j).items()}
           for j, case in enumerate(a.design.load_cases)}
    return Diagrams(x_mm=x.tolist(), load_cases=out)


@lru_cache(maxsize=8)
def _own_table(csv: str, name: str) -> Catalogue:
    """The design's own bearing table, parsed once per distinct text; its errors point at
    ``bearing_table.csv`` and say the row and column."""
    try:
        return parse_catalogue(csv, name=name)
    except DesignError as exc:
        raise DesignError([Issue(path="bearing_table.csv", message=f"{e.path}: {e.message}" if e.path else e.message)
                           for e in exc.errors]) from None


def _rate_all(analyses: Sequence[Analysis], catalogue: Catalogue | None) -> list[BearingOutcome | DesignError]:
    """The bearings of every analysed design, those on one bearing table rated together
    (:func:`engine.bearings.rate_bearings_many`)."""
    out: list[Any] = [None] * len(analyses)
    by_table: dict[int, tuple[Catalogue | None, list[int]]] = {}
    for k, a in enumerate(analyses):
        cat = catalogue
        if cat is None and a.design.bearing_table is not None:
            try:
                cat = _own_table(a.design.bearing_table.csv, a.design.bearing_table.name)
            except DesignError as exc:
                out[k] = exc
                continue
        by_table.setdefault(id(cat), (cat, []))[1].append(k)
    for cat, ks in by_table.values():
        rated = rate_bearings_many([analyses[k].design for k in ks], Fr_N=[analyses[k].Fr_N for k in ks],
                                   Fa_ext_N=[analyses[k].Fa_ext_N for k in ks], catalogue=cat)
        for k, r in zip(ks, rated):
            out[k] = r
    return out


# Bearings as mounted: the beam carries each rated bearing at its pressure centre and on its
# radial stiffness, which depend on the rated bearing and its load; solve, rate, mount, again,
# until the rated bearings stay the same and the stiffnesses change by less than _SETTLED.
_PASSES = 4
_SETTLED = 1e-3


def _mount(design: Design, rated: BearingOutcome, Fr: np.ndarray) -> tuple[Design, np.ndarray | None, list[float], dict[int, float]]:
    """The design as the beam sees it with its rated bearings mounted: supports at their
    pressure centres, the modal (tangent) stiffness typed in for the natural frequencies; the
    secant stiffness of each support per case (n_cases, n_supports; NaN rigid or typed) or
    None; the reactions' x; the modal stiffness per support index."""
    cat = rated.catalogue
    L = design.shaft.length_mm
    stiff = design.analysis.bearing_stiffness
    x_load = [s.x_mm for s in design.supports]
    springs = np.full((len(design.load_cases), len(design.supports)), np.nan)
    modal: dict[int, float] = {}
    sups = list(design.supports)
    for i, row in rated.rated.items():
        s = design.supports[i]
        x_load[i] = float(np.clip(s.x_mm + pressure_centre_offset_mm(cat, row, s.axial, s.bearing_type), 0.0, L))
        upd: dict[str, Any] = {"x_mm": x_load[i]}
        if stiff and s.radial_stiffness_N_per_mm is None:
            k_sec, k_tan = radial_stiffness(cat, row, s.bearing_type, Fr[:, i], C_N=rated.rated_C_N[i],
                                            paired=rated.paired.get(i, False))
            springs[:, i] = k_sec
            modal[i] = float(np.min(k_tan))  # the softest case: the lowest critical speed
            upd["radial_stiffness_N_per_mm"] = modal[i]
        sups[i] = s.model_copy(update=upd)
    if not modal and x_load == [s.x_mm for s in design.supports]:
        return design, None, x_load, {}
    eff = design.model_copy(update={"supports": sups})
    return eff, (springs if modal else None), x_load, modal


def _mounted_passes(good: list[tuple[int, Analysis]], rated: list, catalogue: Catalogue | None) -> dict[int, int]:
    """Solve again with the rated bearings mounted (:func:`_mount`) until they settle, at most
    ``_PASSES`` beam solves in all, every pending design of a pass in one batch. Updates
    ``good`` and ``rated`` in place; returns the beam solves each mounted design took (a
    negative count: it had not settled)."""
    passes: dict[int, int] = {}
    pending = [n for n, (_, a) in enumerate(good) if not isinstance(rated[n], Exception)]
    prev: dict[int, tuple] = {}
    for p in range(1, _PASSES + 1):
        mounts = {}
        for n in pending:
            a, r = good[n][1], rated[n]
            eff, springs, x_load, modal = _mount(a.design, r, a.Fr_N)
            key = (tuple(sorted(r.rated.items())), tuple(x_load))
            if n in prev:
                old_key, old_springs = prev[n]
                same_k = (springs is None and old_springs is None) or (
                    springs is not None and old_springs is not None
                    and np.nanmax(np.abs(springs - old_springs) / np.where(np.isfinite(old_springs), old_springs, 1.0),
                                  initial=0.0) < _SETTLED)
                if key == old_key and same_k:
                    passes[n] = p
                    continue
            if eff is a.design and n not in prev:
                continue  # nothing to mount: rigid supports at their x, as solved
            if p == _PASSES:
                passes[n] = -p
                continue
            prev[n] = (key, springs)
            mounts[n] = (eff, springs, x_load, modal)
        pending = list(mounts)
        if not pending:
            break
        new = analyse_many([mounts[n][0] for n in pending], modes=False, springs=[mounts[n][1] for n in pending])
        fresh = []
        for n, a in zip(pending, new):
            if isinstance(a, Exception):
                rated[n] = a
                continue
            orig = good[n][1].design
            a.eff_design, a.design = a.design, orig
            a.x_load_mm, a.springs, a.modal_k = mounts[n][2], mounts[n][1], mounts[n][3]
            good[n] = (good[n][0], a)
            fresh.append(n)
        for n, r in zip(fresh, _rate_all([good[n][1] for n in fresh], catalogue)):
            rated[n] = r
        pending = [n for n in fresh if not isinstance(rated[n], Exception)]
    return passes


def _modes(analyses: Sequence[Analysis]) -> None:
    """The lateral modes of every analysed design in one banded eigen-solve, each on the
    supports as mounted (pressure centres, the modal bearing stiffness)."""
    ds = [getattr(a, "eff_design", a.design) for a in analyses]
    for a, m in zip(analyses, lateral_frequencies_many(ds, meshes=[a.dyn_mesh for a in analyses])):
        a.modes = m


def _mount_notes(a: Analysis, rated: BearingOutcome, passes: int | None) -> list:
    """The bearing results with where each rated bearing carries the shaft, its stiffness and
    how the passes settled."""
    design, out = a.design, []
    idx = {s.id: i for i, s in enumerate(design.supports)}
    for br in rated.bearings:
        i = idx[br.id]
        if i not in rated.rated:
            out.append(br)
            continue
        s = design.supports[i]
        notes = list(br.notes)
        if abs(a.x_load_mm[i] - s.x_mm) > 1e-9:
            notes.append(f"reaction at the pressure centre x = {a.x_load_mm[i]:.4g} mm "
                         f"({a.x_load_mm[i] - s.x_mm:+.3g} mm from the bearing's middle; {SOURCE_PRESSURE_CENTRE})")
        k = a.modal_k.get(i)
        if k is not None and a.springs is not None:
            notes.append(f"radial stiffness of {br.designation}: {', '.join(f'{v:,.0f}' for v in a.springs[:, i])} "
                         f"N/mm per case in the deflections (secant at the case's load), {k:,.0f} N/mm in the "
                         f"natural frequencies (tangent, softest case); {SOURCE_STIFFNESS}")
        elif s.radial_stiffness_N_per_mm is not None:
            notes.append(f"radial stiffness {s.radial_stiffness_N_per_mm:,.0f} N/mm as typed")
        elif not design.analysis.bearing_stiffness:
            notes.append("rigid support (analysis.bearing_stiffness is off)")
        if passes is not None:
            notes.append(f"pressure centres and stiffness from the rated bearings: settled after {passes} solves"
                         if passes > 0 else
                         f"pressure centres and stiffness from the rated bearings did not settle in {-passes} "
                         "solves; the last is shown (the choice may flip between two bearings)")
        out.append(br.model_copy(update={"notes": notes, "x_load_mm": a.x_load_mm[i],
                                         "modal_stiffness_N_per_mm": k}))
    return out


def _stiffness(a: Analysis, s, j: int, i: int) -> float | None:
    """The radial stiffness support i had in load case j's deflections (None: rigid)."""
    if a.springs is not None and np.isfinite(a.springs[j, i]):
        return float(a.springs[j, i])
    return s.radial_stiffness_N_per_mm


def _bevel_checks(a: Analysis, rated: BearingOutcome, Fa: np.ndarray) -> list:
    """Bevel gears' displacement along and across the axis (engine.stiffness.bevel_mesh_checks):
    the axial path runs from the support carrying the most axial load in each case, through
    that bearing's own axial deflection where it has a contact angle."""
    design = a.design
    if not any(e.kind == "bevel_gear" for e in design.elements):
        return []
    nc = len(design.load_cases)
    carrier = np.argmax(Fa, axis=1) if Fa.size else np.zeros(nc, int)
    x_ax = np.array([a.x_load_mm[int(i)] for i in carrier], float)
    dax = np.zeros(nc)
    for j, i in enumerate(carrier):
        i = int(i)
        if i in rated.rated and rated.catalogue is not None:
            g = row_geometry(rated.catalogue, rated.rated[i], design.supports[i].bearing_type)
            dax[j] = float(axial_deflection_mm(g, design.supports[i].bearing_type, Fa[j, i],
                                               paired=rated.paired.get(i, False)))
    EA = design.shaft.material.E_GPa * 1e3 * a.mesh.A_mm2
    return bevel_mesh_checks(design, u_mm=a.beam.u_mm, element_nodes=a.mesh.element_nodes, x_mm=a.mesh.x_mm,
                             N_N=a.N_N, EA_N=EA, x_axial_mm=x_ax, bearing_axial_mm=dax)


def _finish(a: Analysis, rated: BearingOutcome, diagrams: bool, passes: int | None = None) -> Result:
    """Axial force and torque, shaft checks, backstop and the Result of one analysed design
    whose bearings are rated."""
    design = a.design
    rated = BearingOutcome(split=rated.split, bearings=_mount_notes(a, rated, passes), checks=rated.checks,
                           warnings=rated.warnings, rated=rated.rated, paired=rated.paired,
                           rated_C_N=rated.rated_C_N, catalogue=rated.catalogue)
    Fa, Fx = rated.split.Fa_N, rated.split.Fx_N
    carry_axial(a, Fx)
    _check_arrays(a, Fa, Fx)
    sc = shaft_checks(a)
    mt = mounting(a, rated.bearings)  # keys, press fits, seats, fits, twist (engine.mounting)
    checks = sort_checks(place_checks(design, rated.checks + sc.checks + _bevel_checks(a, rated, Fa) + mt.checks))
    _check_objects(design, mt.bearings, sc, checks)
    u_res = np.hypot(a.beam.u_mm[:, 0], a.beam.u_mm[:, 1])  # (nc, N)
    kmax = np.argmax(u_res, axis=1)
    R = a.beam.R_N
    cases = []
    for j, (case, cl) in enumerate(zip(design.load_cases, a.loads)):
        k = int(kmax[j])
        cases.append(CaseResult(
            name=case.name, speed_rpm=case.speed_rpm, time_fraction=case.time_fraction,
            elements=[ElementForces(id=cl.ids[i], kind=cl.kinds[i], x_mm=float(cl.x_mm[i]),
                                    Fx_N=cl.F_N[i, 0], Fy_N=cl.F_N[i, 1], Fz_N=cl.F_N[i, 2],
                                    My_Nm=cl.C_Nmm[i, 1] / 1e3, Mz_Nm=cl.C_Nmm[i, 2] / 1e3,
                                    torque_Nm=cl.C_Nmm[i, 0] / 1e3) for i in range(len(cl.ids))],
            supports=[SupportReaction(id=s.id, x_mm=s.x_mm, Fx_N=Fx[j, i], Fy_N=R[j, 0, i],
                                      Fz_N=R[j, 1, i], Fr_N=a.Fr_N[j, i], Fa_N=Fa[j, i], x_load_mm=a.x_load_mm[i],
                                      stiffness_N_per_mm=_stiffness(a, s, j, i))
                      for i, s in enumerate(design.supports)],
            max_deflection_mm=float(u_res[j, k]), max_deflection_x_mm=float(a.mesh.x_mm[k]),
        ))
    mass = float(np.sum(a.mesh.A_mm2 * a.mesh.le_mm)) * design.shaft.material.density_kg_m3 * 1e-9
    return Result(
        engine_version=engine.__version__, load_cases=cases, bearings=mt.bearings, mounting=mt.mounting,
        checks=checks, warnings=rated.warnings,
        shaft=ShaftSummary(max_deflection_mm=float(u_res.max()), mass_kg=mass, length_mm=design.shaft.length_mm,
                           sections=sc.sections, **sc.summary()),
        diagrams=_diagrams(a) if diagrams else Diagrams(x_mm=[], load_cases={}),
    )


def solve_many(designs: Sequence[Any], *, diagrams: bool = True,
               catalogue: Catalogue | None = None) -> list[Result | DesignError | EngineError]:
    """Solve design documents (mappings or :class:`Design`) together; one entry per design:
    its :class:`Result`, or the :class:`engine.model.DesignError` (bad input) or
    :class:`EngineError` (a design that cannot be solved as laid out, or whose numbers
    overflow: a result never holds NaN or infinity) that it raised, each listing the key paths
    at fault.

    The bending of every design is one banded solve and their lateral modes one banded
    eigen-solve (:func:`analyse_many`); bearings, shaft checks and the result follow per
    design. ``diagrams=False`` leaves the along-x arrays empty (for studies of many variants);
    ``catalogue`` is a bearing table of the user's (default: the design's own table, else the
    bundled illustrative one). Any other exception is a fault of the engine and propagates.
    """
    out: list[Any] = [None] * len(designs)
    parsed: list[tuple[int, Design]] = []
    for k, data in enumerate(designs):
        try:
            parsed.append((k, parse_design(data)))
        except DesignError as exc:
            out[k] = exc
    analyses = analyse_many([d for _, d in parsed], modes=False)
    good = [(k, a) for (k, _), a in zip(parsed, analyses) if not isinstance(a, Exception)]
    for (k, _), a in zip(parsed, analyses):
        if isinstance(a, Exception):
            out[k] = a
    rated_all = _rate_all([a for _, a in good], catalogue)
    passes = _mounted_passes(good, rated_all, catalogue)
    _modes([a for (_, a), r in zip(good, rated_all) if not isinstance(r, Exception)])
    for n, ((k, a), rated) in enumerate(zip(good, rated_all)):
        if isinstance(rated, Exception):
            out[k] = rated
            continue
        try:
            out[k] = _finish(a, rated, diagrams, passes.get(n))
        except (DesignError, EngineError) as exc:
            out[k] = exc
    return out


def solve(design_data: Any, *, diagrams: bool = True, catalogue: Catalogue | None = None) -> Result:
    """Solve a design document (mapping or :class:`Design`) and return the :class:`Result`:
    ``solve_many([design])[0]``, its DesignError or EngineError raised."""
    r = solve_many([design_data], diagrams=diagrams, catalogue=catalogue)[0]
    if isinstance(r, Exception):
        raise r
    return r
