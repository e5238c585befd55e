"""The rated bearing as mounted: pressure centre, radial stiffness, minimum load, friction.

Units: mm, N, N·mm, rpm, W. Everything here takes one catalogue row (the bearing a support's
checks rate) and the loads it carries; nothing here ranks rows.

Pressure centre (:func:`pressure_centre_offset_mm`)
    An angular contact ball or tapered roller bearing carries the shaft where its contact lines
    cross the axis, offset from the bearing's mid-width toward its back face by
    a = (dm/2)·tan α, dm = (d + D)/2 (geometry of the contact line through the pitch circle;
    Harris & Kotzalas, *Rolling Bearing Analysis*, 5th ed., Vol. 1, ch. 2, from memory). For
    tapered rollers tan α = e/1.5 (ISO 281:2007 cl. 6.2: e = 1.5·tan α). A table's ``a_mm``
    column, where given, wins. A '+x' bearing (it takes the shaft's push toward +x) has its back
    face toward −x, a '−x' bearing toward +x: a back-to-back pair ('+x' left, '−x' right)
    spreads, a face-to-face pair closes in. A matched pair at one position ('both') and a
    single bearing that floats act at mid-width.

Radial stiffness (:func:`radial_deflection_mm`, :func:`radial_stiffness`)
    Palmgren's load–deflection relations for steel rolling contacts, inner plus outer raceway
    (Palmgren, *Ball and Roller Bearing Engineering*, 1959, as given by Harris & Kotzalas,
    Vol. 1, ch. 6; constants from memory):
      point contact (ball):  δ = 4.36·10⁻⁴ · Q^(2/3) / Dw^(1/3)     [mm; N, mm]
      line contact (roller): δ = 7.68·10⁻⁵ · Q^0.9 / Lwe^0.8        [mm; N, mm]
    with the most heavily loaded element's load under a radial load and zero clearance
    Q_max = 4.37·Fr/(Z·cos α) (point) or 4.08·Fr/(Z·cos α) (line) (Sjövall's integrals, Harris
    & Kotzalas Vol. 1 ch. 7, from memory; Stribeck's 5·Fr/(Z cos α) includes a typical
    clearance), and the radial displacement δr = δ_max/cos α. For a row of several rows (i) the
    load divides among i·Z elements. The rolling elements (Z, Dw, Lwe) are those the bundled
    table's ratings assume (:data:`engine.bearings.ratings.GEOMETRY_ASSUMPTIONS`), from the
    row's d, D, B; the contact angle from the row (``contact_angle_deg``, else tan α = e/1.5).
    δr ∝ Fr^n (n = 2/3 point, 0.9 line): the secant stiffness Fr/δr reproduces the bearing's
    deflection at the carried load (used in the static deflections); the tangent stiffness
    dFr/dδr = Fr/(n·δr) is the stiffness for small vibrations about it (used in the natural
    frequencies). Neglected: radial clearance or preload (taken as zero), the rings' and
    housing's own flexibility and fits, centrifugal and gyroscopic ball forces, tilting
    stiffness, the axial load's effect on the load zone, temperature. A load below the
    minimum load is linearised at the minimum load (a zero-clearance Hertzian contact has no
    stiffness at zero load).

Minimum load (:func:`minimum_load_ratio`)
    About 0.01·C for ball bearings and 0.02·C for roller bearings, so the rolling elements roll
    rather than skid (common practice, from memory).

Friction torque (:func:`friction_torque_Nmm`)
    Palmgren's approximation M = M0 + M1 (Harris & Kotzalas Vol. 1, ch. 10; factors from memory):
      viscous M0 = 10⁻⁷·f0·(ν·n)^(2/3)·dm³ for ν·n ≥ 2000, else 160·10⁻⁷·f0·dm³   [N·mm]
      load    M1 = f1·P1·dm, f1 = z·(P0/C0)^y (ball) or a constant (roller)
    (ν in mm²/s, n in rpm). Factors: see :data:`FRICTION_FACTORS`. Without a lubricant in the
    design ISO VG 68 at 70 °C is assumed and said so. Power loss = M·ω.
"""
from __future__ import annotations

import dataclasses
import math

import numpy as np

from engine.bearings.catalogue import Catalogue
from engine.bearings.life import BALL_TYPES
from engine.bearings.ratings import internal_geometry

__all__ = ["SOURCE_PRESSURE_CENTRE", "SOURCE_STIFFNESS", "SOURCE_MIN_LOAD", "SOURCE_FRICTION",
           "MIN_LOAD_RATIO", "FRICTION_FACTORS", "contact_tan", "pressure_centre_offset_mm",
           "row_geometry", "radial_deflection_mm", "axial_deflection_mm", "radial_stiffness", "minimum_load_ratio",
           "friction_torque_Nmm"]

SOURCE_PRESSURE_CENTRE = ("pressure centre a = (dm/2)·tan α toward the back face, tan α = e/1.5 for tapered "
                          "rollers (ISO 281 cl. 6.2 e = 1.5·tan α; Harris & Kotzalas, Rolling Bearing "
                          "Analysis, from memory), or the table's a_mm")
SOURCE_STIFFNESS = ("Palmgren load–deflection, inner + outer raceway: δ = 4.36e-4·Q^(2/3)/Dw^(1/3) (ball), "
                    "7.68e-5·Q^0.9/Lwe^0.8 (roller) [mm, N]; Q_max = 4.37 (point) or 4.08 (line)·Fr/(Z·cos α), "
                    "zero clearance; δr = δ/cos α (Palmgren 1959 as given by Harris & Kotzalas, Rolling "
                    "Bearing Analysis, from memory); elements as the bundled table assumes; neglects "
                    "clearance, preload, ring and housing flexibility, tilt and speed effects")
SOURCE_MIN_LOAD = "minimum load about 0.01·C (ball), 0.02·C (roller): common practice, from memory"
SOURCE_FRICTION = ("Palmgren's friction torque M = M0 + M1, M0 = 1e-7·f0·(ν·n)^(2/3)·dm³ (ν·n ≥ 2000, else "
                   "160e-7·f0·dm³), M1 = f1·P1·dm (Harris & Kotzalas, Rolling Bearing Analysis; factors from memory)")

MIN_LOAD_RATIO = {"ball": 0.01, "roller": 0.02}

# bearing type -> (f0 oil bath, z, y) with f1 = z·(P0/C0)^y (y = 0: f1 = z); factors from memory
# (Harris & Kotzalas, Palmgren's tables; the middle of the ranges given there).
FRICTION_FACTORS: dict[str, tuple[float, float, float]] = {
    "deep_groove_ball": (2.0, 0.0008, 0.5),
    "angular_contact_ball": (2.0, 0.001, 0.33),
    "self_aligning_ball": (1.7, 0.0003, 0.4),
    "cylindrical_roller": (2.5, 0.0003, 0.0),
    "tapered_roller": (3.5, 0.0004, 0.0),
    "spherical_roller": (5.0, 0.0005, 0.0),
    "needle_roller": (9.0, 0.002, 0.0),
}
_DEFAULT_ALPHA = {"self_aligning_ball": 12.0, "tapered_roller": 14.0, "spherical_roller": 10.0}


def contact_tan(cat: Catalogue, row: int) -> float:
    """tan α of a row: its ``contact_angle_deg``, else e/1.5 (ISO 281 cl. 6.2), else 0."""
    a = float(cat.contact_angle_deg[row])
    if math.isfinite(a) and a > 0:
        return math.tan(math.radians(a))
    e = float(cat.e[row])
    return e / 1.5 if math.isfinite(e) and e > 0 else 0.0


def pressure_centre_offset_mm(cat: Catalogue, row: int, axial: str, bearing_type: str) -> float:
    """Signed shift of the reaction from the bearing's mid-width along x [mm]: −a for a '+x'
    bearing, +a for a '−x' one, 0 otherwise (see the module's docstring).

    >>> from engine.bearings.catalogue import parse_catalogue
    >>> t = ("designation,bearing_type,series,d_mm,D_mm,B_mm,C_N,C0_N,e,Y2,Y0\\n"
    ...      "T,tapered_roller,03,45,100,27.25,90000,100000,0.3,2,1.1\\n")
    >>> round(pressure_centre_offset_mm(parse_catalogue(t), 0, "+x", "tapered_roller"), 3)   # 72.5/2 · 0.2
    -7.25
    """
    if bearing_type not in ("angular_contact_ball", "tapered_roller") or axial not in ("+x", "-x"):
        return 0.0
    a_col = getattr(cat, "a_mm", None)
    a = float(a_col[row]) if a_col is not None and a_col.size > row and math.isfinite(float(a_col[row])) else \
        0.25 * (float(cat.d_mm[row]) + float(cat.D_mm[row])) * contact_tan(cat, row)
    return -a if axial == "+x" else a


def row_geometry(cat: Catalogue, row: int, bearing_type: str):
    """The rolling elements the bundled table assumes inside this row's envelope, with the
    row's own contact angle (:func:`engine.bearings.ratings.internal_geometry`; needle rows
    take the cylindrical rule)."""
    kind = "cylindrical_roller" if bearing_type == "needle_roller" else bearing_type
    alpha = math.degrees(math.atan(contact_tan(cat, row)))
    if kind in _DEFAULT_ALPHA:
        series = {"self_aligning_ball": "02", "tapered_roller": "02", "spherical_roller": "22"}[kind]
        g = internal_geometry(kind, d_mm=float(cat.d_mm[row]), D_mm=float(cat.D_mm[row]),
                              B_mm=float(cat.B_mm[row]), series=series)
        return dataclasses.replace(g, alpha_deg=alpha if alpha > 0 else _DEFAULT_ALPHA[kind])
    return internal_geometry(kind, d_mm=float(cat.d_mm[row]), D_mm=float(cat.D_mm[row]),
                             B_mm=float(cat.B_mm[row]), series=str(cat.series[row]),
                             alpha_deg=alpha if kind == "angular_contact_ball" else None)


def radial_deflection_mm(geom, bearing_type: str, Fr_N, *, paired: bool = False):
    """Radial displacement δr [mm] of the bearing under a radial load Fr [N] (Palmgren,
    zero clearance; see the module's docstring). Returns (δr, n) with n the load exponent.

    >>> from engine.bearings.ratings import Geometry
    >>> g = Geometry(1, 9, 12.7, 0.0, 65.0, 0.0)
    >>> d, n = radial_deflection_mm(g, "deep_groove_ball", 1000.0)
    >>> round(float(d), 5), n            # Q = 4.37·1000/9 = 485.6 N; 4.36e-4·485.6^(2/3)/12.7^(1/3)
    (0.01154, 0.6666666666666666)
    """
    ca = math.cos(math.radians(geom.alpha_deg))
    z = geom.i * geom.Z * (2 if paired else 1)
    Fr = np.asarray(Fr_N, float)
    if bearing_type in BALL_TYPES:
        Q = 4.37 * Fr / (z * ca)
        return 4.36e-4 * Q ** (2.0 / 3.0) / geom.Dw_mm ** (1.0 / 3.0) / ca, 2.0 / 3.0
    Q = 4.08 * Fr / (z * ca)
    return 7.68e-5 * Q ** 0.9 / geom.Lwe_mm ** 0.8 / ca, 0.9


def axial_deflection_mm(geom, bearing_type: str, Fa_N, *, paired: bool = False):
    """Axial displacement δa [mm] of a bearing with a contact angle under a pure axial load Fa
    [N]: every element carries Q = Fa/(i·Z·sin α), δa = δ(Q)/sin α (Palmgren's relations as in
    :func:`radial_deflection_mm`; zero clearance). Zero for a bearing without a contact angle
    (its axial deflection is not modelled)."""
    Fa = np.abs(np.asarray(Fa_N, float))
    if geom.alpha_deg <= 0:
        return np.zeros_like(Fa)
    sa = math.sin(math.radians(geom.alpha_deg))
    z = geom.i * geom.Z * (2 if paired else 1)
    Q = Fa / (z * sa)
    if bearing_type in BALL_TYPES:
        return 4.36e-4 * Q ** (2.0 / 3.0) / geom.Dw_mm ** (1.0 / 3.0) / sa
    return 7.68e-5 * Q ** 0.9 / geom.Lwe_mm ** 0.8 / sa


def minimum_load_ratio(bearing_type: str) -> float:
    """P_min/C: 0.01 ball, 0.02 roller (common practice, from memory)."""
    return MIN_LOAD_RATIO["ball" if bearing_type in BALL_TYPES else "roller"]


def radial_stiffness(cat: Catalogue, row: int, bearing_type: str, Fr_N, *, C_N: float,
                     paired: bool = False) -> tuple[np.ndarray, np.ndarray]:
    """(secant, tangent) radial stiffness [N/mm] of a row at radial loads Fr [N], each load
    raised to the minimum load first (see the module's docstring)."""
    g = row_geometry(cat, row, bearing_type)
    F = np.maximum(np.asarray(Fr_N, float), minimum_load_ratio(bearing_type) * C_N)
    d, n = radial_deflection_mm(g, bearing_type, F, paired=paired)
    k = F / d
    return k, k / n


def friction_torque_Nmm(bearing_type: str, *, dm_mm: float, speed_rpm, nu_mm2_s: float, Fr_N, Fa_N,
                        P0_N, C0_N: float, Y2: float | None = None, tan_alpha: float = 0.0) -> np.ndarray:
    """Palmgren's friction torque M = M0 + M1 [N·mm] per case (see the module's docstring).

    P1: deep groove max(Fr, 3·Fa − 0.1·Fr); angular contact max(Fr, Fa − 0.1·Fr); self-aligning
    max(Fr, 1.4·Y2·Fa); tapered and spherical max(Fr, 1.2·Y2·Fa); cylindrical and needle Fr
    (Harris & Kotzalas, from memory).

    >>> round(float(friction_torque_Nmm("deep_groove_ball", dm_mm=60, speed_rpm=1000, nu_mm2_s=20,
    ...       Fr_N=2000, Fa_N=0, P0_N=2000, C0_N=20000)), 1)    # M0 = 1e-7·2·20000^(2/3)·60³, M1 = 0.0008·0.316·2000·60
    62.2
    """
    f0, z, y = FRICTION_FACTORS[bearing_type]
    n = np.asarray(speed_rpm, float)
    vn = nu_mm2_s * n
    M0 = np.where(vn >= 2000.0, 1e-7 * f0 * np.maximum(vn, 0.0) ** (2.0 / 3.0), 160e-7 * f0) * dm_mm ** 3
    Fr, Fa = np.asarray(Fr_N, float), np.asarray(Fa_N, float)
    f1 = z * np.maximum(np.asarray(P0_N, float) / C0_N, 1e-9) ** y if y else z + 0.0 * Fr
    if bearing_type == "deep_groove_ball":
        P1 = np.maximum(Fr, 3.0 * Fa - 0.1 * Fr)
    elif bearing_type == "angular_contact_ball":
        P1 = np.maximum(Fr, Fa - 0.1 * Fr)
    elif bearing_type == "self_aligning_ball":
        P1 = np.maximum(Fr, 1.4 * (Y2 or 0.0) * Fa)
    elif bearing_type in ("tapered_roller", "spherical_roller"):
        P1 = np.maximum(Fr, 1.2 * (Y2 or 0.0) * Fa)
    else:
        P1 = Fr
    return M0 + f1 * P1 * dm_mm
