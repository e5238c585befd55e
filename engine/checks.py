"""The shaft checks of one solved design: strength at every critical section, stiffness at
bearings and gears, natural frequencies and the critical speed margin.

One entry point: :func:`shaft_checks` (``engine.solve`` calls it once the axial force and
torque along the shaft are known). Units inside: mm, N, N·mm, MPa, rad, rpm.

Sections (one per node that needs one, plus one per groove at its root diameter):

- every shoulder (a change of diameter), with its fillet radius (``fillet_r_mm`` of the
  segment to the right; when missing, a sharp fillet r/d = 0.02 is assumed, Shigley Table 7-1);
- every element seat, with its keyway or press fit;
- both hub ends (x ± width/2) of every keyed or press-fitted element, and both ends (or
  runouts) of a keyseat shorter than its hub (:func:`engine.mounting.hub_sections`); where such
  a place falls between nodes, M is interpolated linearly along the beam element in each plane
  (exact between point loads; the shaft's own weight makes it a parabola, whose deviation over
  one element is negligible) and T, N are the element's;
- every retaining-ring groove (``shaft.grooves``);
- every support;
- in every load case, the points of largest resultant moment and of largest nominal bending stress.

At a node the moment is the larger of the two element-end resultants √(My² + Mz²); torque
and axial force are the adjacent elements' values of larger magnitude (conservative at a seat
where they jump). The diameter is the smaller of the two adjacent ones. Several stress raisers
at one node (a keyed seat against a shoulder) do not multiply: the largest Kf of each kind of
load governs (common practice).

Fatigue: bending fully reversed (rotating shaft), torque steady plus the case's
``torque_alternating_pct``, axial force steady; von Mises amplitudes; criterion
``requirements.fatigue_criterion`` (default DE–Goodman, Shigley §7-4). A section whose every
case is below the endurance limit is rated for infinite life (the smallest case factor). When
some case exceeds it, the duty cycle over ``requirements.life_h`` is combined by Miner's rule and
the section's factor is the stress multiplier that makes the damage 1.

Critical speed: every case's speed must stay ``critical_speed_margin_pct`` (default 20 %,
common practice) below the first lateral frequency; running that far above it is reported as
a warning (supercritical running passes through the critical speed at start and stop).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from engine import dynamics, mounting, stiffness, strength
from engine.result import Check, ShaftSection

__all__ = ["Section", "ShaftCheckOutcome", "shaft_checks", "shoulder_kt", "sort_checks", "AT_LEAST_CODES",
           "CRITICAL_SPEED_SOURCE"]

CRITICAL_SPEED_SOURCE = ("common practice: run at least the margin below the first lateral "
                         "critical speed (memory: Shigley 9th ed. §7-6 asks for a generous margin)")
_FATIGUE_SRC = {
    "de_goodman": "Shigley 9th ed. Eq. 7-7 (DE–Goodman)",
    "de_gerber": "Shigley 9th ed. Eq. 7-9 (DE–Gerber)",
    "asme_elliptic": "Shigley 9th ed. Eq. 7-11 (DE–ASME elliptic)",
    "soderberg": "Shigley 9th ed. Eq. 7-13 (DE–Soderberg)",
}
CRITERION_NAMES = {"de_goodman": "DE–Goodman", "de_gerber": "DE–Gerber",
                   "asme_elliptic": "DE–ASME elliptic", "soderberg": "DE–Soderberg"}
_YIELD_SRC = "Shigley 9th ed. Eq. 7-15 (von Mises, first-cycle peak stresses)"
_EPS = 1e-6


# One checked section and its governing load case: the result's own model, so that the
# shaft checks and the result document share one definition (fields in engine.result).
Section = ShaftSection


@dataclass(frozen=True)
class ShaftCheckOutcome:
    """Everything the shaft checks give back; ``checks`` sorted failing first, then by margin."""

    checks: list[Check]
    critical_speed_rpm: float | None
    natural_frequencies_rpm: list[float]
    rayleigh_rpm: float | None
    torsional_rpm: float | None
    min_safety_factor: float | None
    sections: list[Section] = field(default_factory=list)

    def summary(self) -> dict:
        """The keys of :class:`engine.result.ShaftSummary` this outcome fills:
        ``ShaftSummary(max_deflection_mm=…, mass_kg=…, length_mm=…, **outcome.summary())``."""
        return {"critical_speed_rpm": self.critical_speed_rpm,
                "natural_frequencies_rpm": list(self.natural_frequencies_rpm),
                "rayleigh_rpm": self.rayleigh_rpm, "torsional_rpm": self.torsional_rpm,
                "min_safety_factor": self.min_safety_factor}


# --- sections ---------------------------------------------------------------------------------

class _Raisers:
    """Stress raisers collected per section: (section, Kt_b, Kt_t, Kt_a, r_mm or nan = Kf given)."""

    def __init__(self):
        self.rows: list[tuple[int, float, float, float, float]] = []

    def add(self, sec: int, kt: tuple[float, float, float], r_mm: float) -> None:
        self.rows.append((sec, *kt, r_mm))


def _node_values(a) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """(M, T, N) at every node, (n_cases, N): resultant moment (larger element end), torque
    and axial force of larger magnitude of the adjacent elements."""
    M_end = np.hypot(a.beam.M_Nmm[:, 0], a.beam.M_Nmm[:, 1])  # (nc, n_el, 2)
    nc, n_el = M_end.shape[0], M_end.shape[1]
    M = np.zeros((nc, n_el + 1))
    M[:, :-1] = M_end[:, :, 0]
    M[:, 1:] = np.maximum(M[:, 1:], M_end[:, :, 1])

    def larger(v: np.ndarray) -> np.ndarray:
        if v.size == 0:
            return np.zeros((nc, n_el + 1))
        left = np.concatenate([v[:, :1], v], axis=1)
        right = np.concatenate([v, v[:, -1:]], axis=1)
        return np.where(np.abs(left) >= np.abs(right), left, right)

    return M, np.abs(larger(np.asarray(a.T_Nmm, float))), larger(np.asarray(a.N_N, float))


def _shoulders(shaft) -> tuple[list, np.ndarray, np.ndarray, np.ndarray]:
    """The shaft's shoulders: (segment index right of it, left segment, right segment) each,
    and their larger and smaller diameters D, d [mm] and fillet radii r [mm] (a sharp
    r = 0.02·d where the segment gives none, Shigley Table 7-1)."""
    steps = [(i, s0, s1) for i, (s0, s1) in enumerate(zip(shaft.segments[:-1], shaft.segments[1:]), start=1)
             if abs(s0.d_mm - s1.d_mm) >= _EPS]
    D = np.array([max(s0.d_mm, s1.d_mm) for _, s0, s1 in steps])
    d = np.array([min(s0.d_mm, s1.d_mm) for _, s0, s1 in steps])
    r = np.array([s1.fillet_r_mm if s1.fillet_r_mm is not None else strength.SHARP_FILLET_R_OVER_D * dd
                  for (_, _, s1), dd in zip(steps, d)])
    return steps, D, d, r


def shoulder_kt(shafts) -> list[np.ndarray]:
    """Kt in bending, torsion and axial load of every shoulder of each shaft, (n_shoulders, 3)
    per shaft, by :func:`engine.strength.kt_shoulder` evaluated once for all the shafts
    (a study passes each variant's to :func:`shaft_checks`)."""
    parts = [_shoulders(sh)[1:] for sh in shafts]
    D, d, r = (np.concatenate([p[k] for p in parts]) for k in range(3))
    kts = np.stack([strength.kt_shoulder(D_mm=D, d_mm=d, r_mm=r, load=ld) for ld in ("bending", "torsion", "axial")],
                   axis=1)
    return np.split(kts, np.cumsum([p[0].size for p in parts])[:-1])


def _build_sections(a, M_node: np.ndarray, kt_shoulders: np.ndarray | None = None):
    """Section list: node, x, d, bore, surface, labels, primary kind; and their stress raisers.
    ``kt_shoulders``: the shoulders' Kt, (n, 3), when already known (:func:`shoulder_kt`)."""
    design, mesh = a.design, a.mesh
    shaft = design.shaft
    x = mesh.x_mm
    edges = np.array(shaft.edges_mm())
    mid = 0.5 * (x[:-1] + x[1:])
    seg_of_el = np.clip(np.searchsorted(edges, mid, side="right") - 1, 0, len(shaft.segments) - 1)
    n_el = mesh.le_mm.size
    node_at = lambda xv: int(np.argmin(np.abs(x - xv)))  # noqa: E731

    secs: list[dict] = []
    by_node: dict[int, int] = {}
    rz = _Raisers()

    def section(node: int) -> int:
        if node in by_node:
            return by_node[node]
        left, right = max(node - 1, 0), min(node, n_el - 1)
        el = left if mesh.d_mm[left] <= mesh.d_mm[right] else right
        secs.append(dict(node=node, x=float(x[node]), d=float(mesh.d_mm[el]), bore=float(mesh.bore_mm[el]),
                         surface=shaft.segments[int(seg_of_el[el])].surface, labels=[], kind=None))
        by_node[node] = len(secs) - 1
        return by_node[node]

    def tag(i: int, kind: str, label: str) -> None:
        secs[i]["labels"].append(label)
        secs[i]["kind"] = secs[i]["kind"] or kind

    steps, D, d, r = _shoulders(shaft)
    if steps:
        kts = shoulder_kt([shaft])[0] if kt_shoulders is None else kt_shoulders
        at = np.argmin(np.abs(x[None, :] - edges[[i for i, _, _ in steps], None]), axis=1)  # node_at, all at once
        for (i, _, s1), Di, di, ri, kt, node in zip(steps, D, d, r, kts, at):
            k = section(int(node))
            rz.add(k, tuple(float(v) for v in kt), float(ri))
            note = f"r {ri:g} mm" if s1.fillet_r_mm is not None else f"r {ri:.2g} mm assumed"
            tag(k, "shoulder", f"shoulder {Di:g}/{di:g} mm, {note}")

    for e, node in zip(design.elements, mesh.element_nodes):
        k = section(int(node))
        d = secs[k]["d"]
        bits = []
        if e.keyway is not None:
            rz.add(k, strength.KEYWAY_KT[e.keyway], strength.KEYWAY_R_OVER_D * d)
            bits.append(f"{e.keyway.replace('_', '-')} keyway")
        if e.press_fit:
            rz.add(k, strength.PRESS_FIT_KF, float("nan"))
            bits.append("press fit")
        if not bits:
            rz.add(k, (1.0, 1.0, 1.0), float("nan"))
        tag(k, "seat", f"seat of {e.id}" + (f" ({', '.join(bits)})" if bits else ""))

    off_node: dict[float, int] = {}
    for hs in mounting.hub_sections(design):
        node = node_at(hs.x_mm)
        if abs(x[node] - hs.x_mm) <= 1e-6:
            k = section(node)
        elif round(hs.x_mm, 6) in off_node:
            k = off_node[round(hs.x_mm, 6)]
        else:
            el = int(np.clip(np.searchsorted(x, hs.x_mm) - 1, 0, n_el - 1))
            secs.append(dict(node=node, x=float(hs.x_mm), d=float(mesh.d_mm[el]), bore=float(mesh.bore_mm[el]),
                             surface=shaft.segments[int(seg_of_el[el])].surface, labels=[], kind=None,
                             el=el, t=float((hs.x_mm - x[el]) / mesh.le_mm[el])))
            k = off_node[round(hs.x_mm, 6)] = len(secs) - 1
        rz.add(k, hs.kt, hs.r_mm)
        if hs.label not in secs[k]["labels"]:
            tag(k, "hub_end", hs.label)

    for g in shaft.grooves:
        node = node_at(g.x_mm)
        D = shaft.diameter_at(g.x_mm)
        left, right = max(node - 1, 0), min(node, n_el - 1)
        el = left if mesh.d_mm[left] <= mesh.d_mm[right] else right
        secs.append(dict(node=node, x=float(x[node]), d=D - 2 * g.depth_mm, bore=float(mesh.bore_mm[el]),
                         surface=shaft.segments[int(seg_of_el[el])].surface,
                         labels=[f"retaining-ring groove, root {D - 2 * g.depth_mm:g} mm"], kind="groove"))
        kt = tuple(float(strength.kt_groove(D_mm=D, t_mm=g.depth_mm, r_mm=g.r_mm, load=ld))
                   for ld in ("bending", "torsion", "axial"))
        rz.add(len(secs) - 1, kt, g.r_mm)

    for s, node in zip(design.supports, mesh.support_nodes):
        k = section(int(node))
        if not secs[k]["labels"]:
            rz.add(k, (1.0, 1.0, 1.0), float("nan"))
        tag(k, "support", f"support {s.id}")

    # points of largest moment and of largest nominal bending stress, per case
    Z = np.pi / 32.0 * (mesh.d_mm**4 - mesh.bore_mm**4) / mesh.d_mm
    Zn = np.minimum(np.concatenate([Z[:1], Z]), np.concatenate([Z, Z[-1:]]))
    for j in range(M_node.shape[0]):
        for node in {int(np.argmax(M_node[j])), int(np.argmax(M_node[j] / Zn))}:
            if M_node[j, node] <= 0:
                continue
            fresh = node not in by_node
            k = section(node)
            if fresh:
                rz.add(k, (1.0, 1.0, 1.0), float("nan"))
            label = "largest moment"
            if label not in secs[k]["labels"]:
                tag(k, "max_moment", label)
    return secs, rz


def _section_values(a, secs: list[dict], M_node, T_node, N_node):
    """(M, T, N) at every section, (n_cases, n_sections): the node's values, or for a section
    between nodes the moment interpolated linearly in each plane along its beam element and that
    element's torque and axial force."""
    nodes = np.array([s["node"] for s in secs])
    M, T, N = M_node[:, nodes].copy(), T_node[:, nodes].copy(), N_node[:, nodes].copy()
    for i, s in enumerate(secs):
        if "el" not in s:
            continue
        el, t = s["el"], s["t"]
        planes = a.beam.M_Nmm[:, :, el, 0] * (1.0 - t) + a.beam.M_Nmm[:, :, el, 1] * t  # (nc, 2)
        M[:, i] = np.hypot(planes[:, 0], planes[:, 1])
        T[:, i] = np.abs(np.asarray(a.T_Nmm, float)[:, el])
        N[:, i] = np.asarray(a.N_N, float)[:, el]
    return M, T, N


def _fatigue_factors(secs: list[dict], rz: _Raisers, *, Su_MPa: float, method: str):
    """Per section: (Kt, Kts, Kf, Kfs, Kf_ax), the largest of its raisers."""
    n = len(secs)
    out = np.ones((5, n))
    if not rz.rows:
        return out
    rows = np.array(rz.rows)
    sec = rows[:, 0].astype(int)
    ktb, ktt, kta, r = rows[:, 1], rows[:, 2], rows[:, 3], rows[:, 4]
    direct = np.isnan(r)
    rr = np.where(direct, 1.0, r)
    qb = np.where(direct, 1.0, strength.notch_sensitivity(Su_MPa=Su_MPa, r_mm=rr, load="bending", method=method))
    qt = np.where(direct, 1.0, strength.notch_sensitivity(Su_MPa=Su_MPa, r_mm=rr, load="torsion", method=method))
    vals = [ktb, ktt, strength.fatigue_notch_factor(ktb, qb), strength.fatigue_notch_factor(ktt, qt),
            strength.fatigue_notch_factor(kta, qb)]
    for i, v in enumerate(vals):
        np.maximum.at(out[i], sec, v)
    return out


# --- the entry point ---------------------------------------------------------------------------

# checks whose value must reach the limit from above (safety factors, lives); every other
# check with a value and a limit is read as "value at most limit"
AT_LEAST_CODES = frozenset({"shaft.fatigue", "shaft.yield", "bearing.life", "bearing.static",
                            "bearing.lubrication"}) | mounting.CODES_AT_LEAST


def _margin(c: Check) -> float:
    if c.value is None or not c.limit:
        return 0.0
    if c.code in AT_LEAST_CODES:
        return c.value / c.limit - 1.0
    return 1.0 - c.value / c.limit


def sort_checks(checks: list[Check]) -> list[Check]:
    """Failing first, then warnings, then the rest; within each, the smallest relative margin
    first (value/limit − 1 for the codes in :data:`AT_LEAST_CODES`, 1 − value/limit otherwise).
    Stable, so checks without a value keep their order. Usable on the merged list of bearing
    and shaft checks."""
    rank = {"fail": 0, "warn": 1, "ok": 2}
    return sorted(checks, key=lambda c: (rank[c.status], _margin(c)))


def shaft_checks(a, *, modes: dynamics.LateralModes | None = None, min_diameter: bool = True,
                 kt_shoulders: np.ndarray | None = None) -> ShaftCheckOutcome:
    """Every shaft check of a solved design.

    Parameters
    ----------
    a : :class:`engine.solve.Analysis` after the axial resolution (``a.N_N``, ``a.T_Nmm`` set)
    modes : the design's lateral modes when the caller has them already (a study solves the
        eigenproblems of all its variants at once, :func:`engine.dynamics.lateral_frequencies_many`);
        default: :func:`engine.dynamics.lateral_frequencies` here
    min_diameter : compute each section's smallest diameter (``Section.d_min_mm``, and in the
        fatigue message); False leaves it None (a study shows no sections)
    kt_shoulders : Kt of the design's shoulders, (n_shoulders, 3), when the caller has them
        (a study evaluates all its variants' at once, :func:`shoulder_kt`); default: here

    Returns
    -------
    :class:`ShaftCheckOutcome` — checks (sorted: failing first, then by margin), the first
    lateral critical speed and the first three lateral frequencies [rpm], Rayleigh's estimate
    [rpm], the first torsional frequency [rpm] (None unless two elements carry
    ``inertia_kg_m2``), the smallest fatigue or yield safety factor, and the sections (worst
    first).
    """
    design, mesh = a.design, a.mesh
    mat, req = design.shaft.material, design.requirements
    cases = design.load_cases
    names = [c.name for c in cases]
    crit = req.fatigue_criterion

    # strength ------------------------------------------------------------------------------
    M_node, T_node, N_node = _node_values(a)
    secs, rz = _build_sections(a, M_node, kt_shoulders)
    checks: list[Check] = []
    sections: list[Section] = []
    min_sf = None
    if secs:
        d = np.array([s["d"] for s in secs])
        bore = np.array([s["bore"] for s in secs])
        Kt, Kts, Kf, Kfs, Kfa = _fatigue_factors(secs, rz, Su_MPa=mat.Su_MPa, method=req.notch_sensitivity)
        ka = {srf: strength.marin_surface(srf, mat.Su_MPa) for srf in {s["surface"] for s in secs}}
        Se = (np.array([ka[s["surface"]] for s in secs]) * strength.marin_size(d)
              * strength.marin_temperature(req.shaft_temperature_C) * strength.marin_reliability(req.reliability_pct)
              * (strength.endurance_limit_specimen(mat.Su_MPa) if mat.Se_MPa is None else mat.Se_MPa))
        M, T, N = _section_values(a, secs, M_node, T_node, N_node)
        alt = np.array([c.torque_alternating_pct / 100.0 for c in cases])[:, None]
        Ta = alt * T
        sb, tm, sax = strength.nominal_stresses(d_mm=d, bore_mm=bore, M_Nmm=M, T_Nmm=T, N_N=N)
        ta = alt * tm
        sa, sm = strength.von_mises_amplitudes(Kf=Kf, Kfs=Kfs, Kf_ax=Kfa, sigma_a=sb, sigma_m_ax=sax,
                                               tau_a=ta, tau_m=tm)
        nf = strength.fatigue_safety(sigma_a_MPa=sa, sigma_m_MPa=sm, Se_MPa=Se, Su_MPa=mat.Su_MPa,
                                     Sy_MPa=mat.Sy_MPa, criterion=crit)
        ny = strength.yield_safety(Kf=Kf, Kfs=Kfs, Kf_ax=Kfa, sigma_a=sb, sigma_m_ax=sax, tau_a=ta,
                                   tau_m=tm, Sy_MPa=mat.Sy_MPa)
        jf = np.argmin(nf, axis=0)
        cols = np.arange(len(secs))
        n_f = nf[jf, cols]
        miner = n_f < 1.0
        if miner.any():
            cycles = np.array([req.life_h * 60.0 * c.speed_rpm * c.time_fraction for c in cases])
            duty = strength.miner_safety(cycles=cycles, sigma_a_MPa=sa[:, miner], sigma_m_MPa=sm[:, miner],
                                         Se_MPa=Se[miner], Su_MPa=mat.Su_MPa, Sy_MPa=mat.Sy_MPa, criterion=crit)
            n_f = n_f.copy()
            n_f[miner] = np.maximum(duty, n_f[miner])
        jy = np.argmin(ny, axis=0)
        n_y = ny[jy, cols]
        if min_diameter:
            dmin = strength.min_diameter(
                d_mm=np.broadcast_to(d, M.shape), bore_ratio=np.broadcast_to(bore / d, M.shape), Kf=Kf,
                Kfs=Kfs, Kf_ax=Kfa, M_Nmm=M, T_Nmm=T, Ta_Nmm=Ta, N_N=N, Se_d_MPa=np.broadcast_to(Se, M.shape),
                Su_MPa=mat.Su_MPa, Sy_MPa=mat.Sy_MPa, n_fatigue_target=req.fatigue_safety_min,
                n_yield_target=req.yield_safety_min, criterion=crit).max(axis=0)
        else:
            dmin = None
        worst = np.minimum(n_f / req.fatigue_safety_min, n_y / req.yield_safety_min)
        min_sf = float(min(n_f.min(), n_y.min()))

        for i in np.argsort(worst, kind="stable"):
            s = secs[i]
            j = int(jf[i])
            where = f"x = {s['x']:g} mm ({'; '.join(s['labels'])})"
            case_f = "duty cycle (Miner)" if miner[i] else names[j]
            sections.append(Section(
                x_mm=s["x"], kind=s["kind"], where=where, d_mm=float(d[i]), bore_mm=float(bore[i]),
                Kt=float(Kt[i]), Kts=float(Kts[i]), Kf=float(Kf[i]), Kfs=float(Kfs[i]), Se_MPa=float(Se[i]),
                sigma_a_MPa=float(sa[j, i]), tau_m_MPa=float(Kfs[i] * tm[j, i]), n_fatigue=float(n_f[i]),
                n_yield=float(n_y[i]), d_min_mm=None if dmin is None else float(dmin[i]), load_case=case_f,
                miner=bool(miner[i])))
            ok = n_f[i] >= req.fatigue_safety_min
            how = "over the duty cycle by Miner's rule" if miner[i] else f"for infinite life ({CRITERION_NAMES[crit]})"
            checks.append(Check(
                code="shaft.fatigue", status="ok" if ok else "fail",
                message=(f"fatigue safety {n_f[i]:.3g} {how} at {where}, "
                         f"{'meets' if ok else 'below'} {req.fatigue_safety_min:g}; "
                         f"Kf {Kf[i]:.2f}, Kfs {Kfs[i]:.2f}, Se {Se[i]:.0f} MPa"
                         + ("" if dmin is None else f", d_min {dmin[i]:.1f} mm")),
                value=float(n_f[i]), limit=req.fatigue_safety_min, unit="", where=where, load_case=case_f,
                x_mm=s["x"],
                source=_FATIGUE_SRC[crit] + ("; Miner's rule, Shigley Eq. 6-57" if miner[i] else "")))
            ok = n_y[i] >= req.yield_safety_min
            checks.append(Check(
                code="shaft.yield", status="ok" if ok else "fail",
                message=(f"first-cycle yield safety {n_y[i]:.3g} at {where}, "
                         f"{'meets' if ok else 'below'} {req.yield_safety_min:g}"),
                value=float(n_y[i]), limit=req.yield_safety_min, unit="", where=where,
                load_case=names[int(jy[i])], source=_YIELD_SRC, x_mm=s["x"]))

    # stiffness -----------------------------------------------------------------------------
    checks += stiffness.bearing_slope_checks(design, slope_rad=a.beam.slope_rad, support_nodes=mesh.support_nodes)
    checks += stiffness.gear_checks(design, u_mm=a.beam.u_mm, slope_rad=a.beam.slope_rad,
                                    element_nodes=mesh.element_nodes)

    # dynamics ------------------------------------------------------------------------------
    try:
        modes = modes if modes is not None else getattr(a, "modes", None)  # solved with the batch
        modes = dynamics.lateral_frequencies(design, n_modes=3) if modes is None else modes
        freqs = [float(v) for v in modes.rpm if np.isfinite(v)]
        rayleigh = modes.rayleigh_rpm if freqs else None
    except np.linalg.LinAlgError:
        freqs, rayleigh = [], None
        checks.append(Check(code="shaft.critical_speed", status="warn", where="shaft",
                            message="the natural frequencies could not be computed for this support "
                                    "layout (the shaft is not held against rigid-body motion)",
                            source=CRITICAL_SPEED_SOURCE))
    n_c = freqs[0] if freqs else None
    torsional = dynamics.torsional_frequency(design, mesh)
    if n_c:
        m = req.critical_speed_margin_pct / 100.0
        below, above = (1.0 - m) * n_c, (1.0 + m) * n_c
        for c in cases:
            v = c.speed_rpm
            if v <= below:
                st, msg = "ok", f"{v:g} rpm is at least {req.critical_speed_margin_pct:g} % below the first critical speed {n_c:.0f} rpm"
            elif v >= above:
                st, msg = "warn", (f"{v:g} rpm runs above the first critical speed {n_c:.0f} rpm: it passes "
                                   "through it at start and stop; check the damping and run-up")
            else:
                st, msg = "fail", (f"{v:g} rpm lies within {req.critical_speed_margin_pct:g} % of the first "
                                   f"critical speed {n_c:.0f} rpm")
            checks.append(Check(code="shaft.critical_speed", status=st, message=msg, value=float(v),
                                limit=float(below), unit="rpm", source=CRITICAL_SPEED_SOURCE,
                                where="shaft", load_case=c.name))

    return ShaftCheckOutcome(checks=sort_checks(checks), critical_speed_rpm=n_c, natural_frequencies_rpm=freqs,
                             rayleigh_rpm=rayleigh, torsional_rpm=torsional, min_safety_factor=min_sf,
                             sections=sections)
