"""The result document (format ``shaft-result/1``): plain, immutable data.

Keys follow ``design-format.md``; every number carries its unit in its key. Forces are
in N, moments and torques in N·m, lengths in mm, slopes in rad, speeds in rpm, lives in h.
"""
from __future__ import annotations

from typing import Literal

from pydantic import BaseModel, ConfigDict

__all__ = [
    "RESULT_FORMAT", "ElementForces", "SupportReaction", "CaseResult", "Candidate",
    "SeriesMinimum", "BearingResult", "ShaftSection", "ShaftSummary", "Check", "Diagrams", "Result",
]

RESULT_FORMAT = "shaft-result/1"


class _Out(BaseModel):
    model_config = ConfigDict(frozen=True)


class ElementForces(_Out):
    """Forces and torque an element applies to the shaft in one load case."""

    id: str
    kind: str
    x_mm: float
    Fx_N: float
    Fy_N: float
    Fz_N: float
    My_Nm: float = 0.0  # couple about y (axial force acting off the axis, or a moment element)
    Mz_Nm: float = 0.0
    torque_Nm: float = 0.0


class SupportReaction(_Out):
    """Force the support exerts on the shaft; Fr the radial resultant, Fa the axial load carried."""

    id: str
    x_mm: float
    Fx_N: float
    Fy_N: float
    Fz_N: float
    Fr_N: float
    Fa_N: float
    x_load_mm: float | None = None  # where the reaction acts: a pressure centre, else x_mm
    stiffness_N_per_mm: float | None = None  # radial stiffness in this case's deflections (None: rigid)


class CaseResult(_Out):
    name: str
    speed_rpm: float
    time_fraction: float
    elements: list[ElementForces]
    supports: list[SupportReaction]
    max_deflection_mm: float
    max_deflection_x_mm: float = 0.0


class Candidate(_Out):
    designation: str
    series: str = ""
    d_mm: float
    D_mm: float
    B_mm: float
    C_N: float
    C0_N: float
    P_N: float = 0.0  # duty-cycle equivalent dynamic load with this row's factors
    L10_h: float
    Lnm_h: float
    s0: float
    limiting_speed_rpm: float | None = None
    ok: bool
    reasons: list[str] = []  # why it fails (empty when ok)
    warnings: list[str] = []  # what to watch that does not fail it (a load below the minimum load)
    C_margin_pct: float | None = None  # (C / the support's required_C_N − 1)·100


class SeriesMinimum(_Out):
    """Smallest bore of one dimension series that meets every requirement (None: none does)."""

    series: str
    d_mm: float | None
    designation: str | None = None


class BearingResult(_Out):
    id: str
    bearing_type: str
    bore_mm: float
    equivalent_load_N: float
    required_C_N: float
    life_method: str = ""
    arrangement: str = ""
    Fr_N: list[float] = []  # per load case
    Fa_N: list[float] = []
    candidates: list[Candidate] = []
    smallest_by_series: list[SeriesMinimum] = []
    notes: list[str] = []
    designation: str = ""  # the bearing the support's checks rate
    chosen_by: Literal["designer", "ranking", ""] = ""
    required_C_aiso_N: float | None = None  # with the rated bearing's typical aISO (lubrication given)
    min_load_ratio: list[float] = []  # P/C per case (application factor not applied)
    friction_torque_Nm: list[float] = []  # per case, Palmgren
    power_loss_W: list[float] = []  # per case
    x_load_mm: float | None = None  # pressure centre (where the reaction acts)
    modal_stiffness_N_per_mm: float | None = None  # radial stiffness in the natural frequencies


class ShaftSection(_Out):
    """One checked section of the shaft and its governing load case.

    d_mm is the stressed diameter (at a groove, its root); Kt/Kts the largest theoretical
    factors at the section, Kf/Kfs the fatigue factors used; sigma_a_MPa the von Mises
    alternating stress (Kf applied) and tau_m_MPa the mean torsional stress (Kfs applied) in
    the governing case; n_fatigue, n_yield the section's safety factors (n_fatigue over the
    duty cycle when Miner's rule applies); d_min_mm the smallest diameter that meets both
    targets in every case (None when not computed, ``shaft_checks(min_diameter=False)``).
    """

    x_mm: float
    kind: str
    where: str
    d_mm: float
    bore_mm: float
    Kt: float
    Kts: float
    Kf: float
    Kfs: float
    Se_MPa: float
    sigma_a_MPa: float
    tau_m_MPa: float
    n_fatigue: float
    n_yield: float
    d_min_mm: float | None
    load_case: str
    miner: bool = False


class ShaftSummary(_Out):
    critical_speed_rpm: float | None = None
    natural_frequencies_rpm: list[float] = []
    rayleigh_rpm: float | None = None
    torsional_rpm: float | None = None
    max_deflection_mm: float
    mass_kg: float = 0.0
    length_mm: float = 0.0
    min_safety_factor: float | None = None
    sections: list[ShaftSection] = []  # worst first


class Check(_Out):
    code: str
    status: Literal["ok", "warn", "fail"]
    message: str
    value: float | None = None
    limit: float | None = None
    unit: str = ""
    source: str = ""
    where: str = ""  # support or element id, or "x = … mm"
    load_case: str = ""


class Diagrams(_Out):
    """Internal forces and deflections along x.

    ``x_mm`` repeats each interior node once, so jumps (at point loads) draw as vertical steps.
    Per load case: Vy_N, Vz_N (shear: sum of forces left of x), Mz_Nm (bending in the x–y
    plane) and My_Nm (in the x–z plane), both sagging-positive so that E·I·u'' = M in each
    plane, M_Nm their resultant, T_Nm torque, N_N axial force (tension positive), uy_mm, uz_mm,
    u_mm deflections, slope_y_rad = duy/dx, slope_z_rad = duz/dx, slope_rad the resultant.
    """

    x_mm: list[float]
    load_cases: dict[str, dict[str, list[float]]]


class Result(_Out):
    format: Literal["shaft-result/1"] = RESULT_FORMAT
    engine_version: str = ""
    load_cases: list[CaseResult]
    bearings: list[BearingResult] = []
    shaft: ShaftSummary
    checks: list[Check] = []
    diagrams: Diagrams
    warnings: list[str] = []
