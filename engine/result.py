"""The result document (format ``shaft-result/1``): plain, immutable data.

Keys follow ``design-format.md``; every number carries its unit in its key. Forces are
in N, moments and torques in N·m, lengths in mm, slopes in rad, speeds in rpm, lives in h.
"""
from __future__ import annotations

from typing import Literal

from pydantic import BaseModel, ConfigDict, model_serializer

__all__ = [
    "RESULT_FORMAT", "ElementForces", "SupportReaction", "CaseResult", "Candidate",
    "SeriesMinimum", "BearingFits", "BearingResult", "ShaftSection", "ShaftSummary", "Check", "Diagrams",
    "KeyRating", "PressFitRating", "SeatRow", "TwistSpan", "Mounting", "Result",
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
    da_min_mm: float | None = None  # the table's shaft abutment diameter, smallest (None: not given)
    Da_max_mm: float | None = None  # the table's housing abutment diameter, largest (None: not given)


class SeriesMinimum(_Out):
    """Smallest bore of one dimension series that meets every requirement (None: none does)."""

    series: str
    d_mm: float | None
    designation: str | None = None


class BearingFits(_Out):
    """ISO 286 tolerance classes for a bearing's seat on the shaft and in the housing;
    ``chosen_by``: "proposed" (engine.mounting.propose_fits), "designer", or both."""

    shaft: str
    housing: str
    chosen_by: str = "proposed"
    basis: str = ""
    source: str = ""


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
    fits: BearingFits | None = None
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
    x_mm: float | None = None  # where along the shaft it applies; absent for whole-shaft checks

    @model_serializer(mode="wrap")
    def _drop_unplaced(self, handler):
        out = handler(self)
        if isinstance(out, dict) and out.get("x_mm", 0) is None:
            out.pop("x_mm")
        return out


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


class KeyRating(_Out):
    """A parallel key (engine.mounting): sizes [mm], peak torque, pressures and shear [MPa]."""

    element: str
    x_mm: float
    d_mm: float
    b_mm: float
    h_mm: float
    t1_mm: float
    length_mm: float
    bearing_length_mm: float
    count: int = 1
    standard: bool = True  # sizes from the DIN 6885-1 table
    peak_torque_Nm: float
    load_case: str = ""
    p_shaft_MPa: float
    p_hub_MPa: float
    p_key_MPa: float
    tau_MPa: float
    safety: float


class PressFitRating(_Out):
    """A press fit (engine.mounting): interference [µm], pressures [MPa], capacities, safeties."""

    element: str
    x_mm: float
    d_mm: float
    fit: str | None = None
    interference_min_um: float
    interference_max_um: float
    hub_outer_d_mm: float
    length_mm: float
    friction: float
    p_min_MPa: float
    p_max_MPa: float
    torque_capacity_Nm: float
    axial_capacity_N: float
    peak_torque_Nm: float
    slip_safety: float
    hub_yield_safety: float
    shaft_yield_safety: float


class SeatRow(_Out):
    """A bearing's seat: where the ring sits, the seat's run, the locating shoulder [mm]."""

    support: str
    x_mm: float
    designation: str
    d_mm: float
    D_mm: float
    width_mm: float
    from_mm: float
    to_mm: float
    seat_d_mm: float
    seat_from_mm: float | None = None
    seat_to_mm: float | None = None
    shoulder_x_mm: float | None = None
    shoulder_d_mm: float | None = None
    shoulder_height_mm: float | None = None
    da_min_mm: float | None = None
    da_max_mm: float | None = None
    located_by: list[str] = []


class TwistSpan(_Out):
    """Angle of twist between two torque-carrying elements in the case where it is largest."""

    from_id: str
    to_id: str
    x_from_mm: float
    x_to_mm: float
    angle_deg: float
    deg_per_m: float
    load_case: str


class Mounting(_Out):
    keys: list[KeyRating] = []
    press_fits: list[PressFitRating] = []
    seats: list[SeatRow] = []
    twist: list[TwistSpan] = []


class Result(_Out):
    format: Literal["shaft-result/1"] = RESULT_FORMAT
    engine_version: str = ""
    load_cases: list[CaseResult]
    bearings: list[BearingResult] = []
    shaft: ShaftSummary
    checks: list[Check] = []
    diagrams: Diagrams
    warnings: list[str] = []
    mounting: Mounting = Mounting()
