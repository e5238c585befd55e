"""Load ratings from internal geometry: ISO 281 (C), ISO 76 (C0), ISO 281 Annex (Cu).

Used to build the illustrative bearing table (``sample_data/build_bearing_table.py``), never
to replace a supplier's ratings. Units: mm, N, degrees.

Public functions
----------------
fc_ball, fc_roller      geometry factor fc of ISO 281 (Tables 2 and 7) vs Dw·cos α/Dpw
f0_ball                 ISO 76 factor f0 vs Dw·cos α/Dpw
dynamic_rating_ball     Cr = bm·fc·(i·cos α)^0.7·Z^(2/3)·Dw^1.8   (Dw ≤ 25.4 mm)
dynamic_rating_roller   Cr = bm·fc·(i·Lwe·cos α)^(7/9)·Z^(3/4)·Dwe^(29/27)
static_rating_ball      C0r = f0·i·Z·Dw²·cos α
static_rating_roller    C0r = 44·(1 − Dwe·cos α/Dpw)·i·Z·Lwe·Dwe·cos α
fatigue_load_limit      Cu ≈ C0/22 (ball), C0/8.2 (roller), reduced above Dpw = 100 mm
internal_geometry       our assumed rolling elements for a boundary envelope (stated below)
rate_envelope           C, C0, Cu, f0, e, Y1, Y2, Y0 and a limiting speed for one envelope

All factor tables are as recalled from the standards, which were not at hand (verify).
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

__all__ = [
    "SOURCE_RATINGS", "GEOMETRY_ASSUMPTIONS", "SPEED_FACTOR_MM_PER_MIN",
    "fc_ball", "fc_roller", "f0_ball", "dynamic_rating_ball", "dynamic_rating_roller",
    "static_rating_ball", "static_rating_roller", "fatigue_load_limit", "Geometry",
    "internal_geometry", "rate_envelope",
]

SOURCE_RATINGS = ("ISO 281:2007 cl. 6.1 (C), ISO 76:2006 cl. 5 (C0), ISO 281:2007 Annex B "
                  "approximation (Cu); factor tables as recalled, verify against the standards")

INCH32 = 25.4 / 32.0  # ball sizes rounded to 1/32 in (common practice for ball gauges)

# ISO 281 Table 2, fc vs Dw·cos α/Dpw: single-row deep groove and angular contact (memory,
# the values in references.md); self-aligning ball (memory, low confidence).
_FC_GROOVE = np.array([[0.05, 46.7], [0.08, 52.8], [0.10, 55.5], [0.12, 57.5], [0.14, 58.8],
                       [0.16, 59.6], [0.18, 59.9], [0.20, 59.9], [0.22, 59.6], [0.25, 58.6],
                       [0.30, 56.0]])
_FC_SELF_ALIGNING = np.array([[0.05, 17.3], [0.06, 18.2], [0.07, 19.1], [0.08, 19.9],
                              [0.09, 20.6], [0.10, 21.2], [0.12, 22.3], [0.14, 23.1],
                              [0.16, 23.6], [0.18, 24.0], [0.20, 24.2], [0.25, 24.4],
                              [0.30, 24.3]])
# ISO 281 Table 7 (radial roller), fc vs Dwe·cos α/Dpw (memory).
_FC_ROLLER = np.array([[0.01, 52.1], [0.02, 60.8], [0.03, 66.5], [0.04, 70.7], [0.05, 74.1],
                       [0.06, 76.9], [0.07, 79.2], [0.08, 81.2], [0.09, 82.8], [0.10, 84.2],
                       [0.11, 85.4], [0.12, 86.4], [0.13, 87.1], [0.14, 87.7], [0.15, 88.2],
                       [0.16, 88.5], [0.17, 88.7], [0.18, 88.8], [0.19, 88.8], [0.20, 88.7],
                       [0.22, 88.2], [0.24, 87.5], [0.26, 86.4], [0.28, 85.2], [0.30, 83.8]])
# ISO 76 Table 2, f0 vs Dw·cos α/Dpw: radial groove ball; self-aligning ball (memory).
_F0_GROOVE = np.array([[0.00, 14.7], [0.02, 15.1], [0.04, 15.5], [0.06, 15.9], [0.08, 16.3],
                       [0.09, 16.5], [0.10, 16.4], [0.12, 15.9], [0.14, 15.4], [0.16, 14.9],
                       [0.18, 14.4], [0.20, 14.0], [0.22, 13.5], [0.24, 13.0], [0.26, 12.5],
                       [0.28, 12.1], [0.30, 11.6]])
_F0_SELF_ALIGNING = np.array([[0.00, 1.9], [0.05, 2.1], [0.10, 2.4], [0.15, 2.6], [0.20, 2.8],
                              [0.25, 3.0], [0.30, 3.3]])

# n·dm limits for grease lubrication [mm/min], rough rules of the trade (common practice).
SPEED_FACTOR_MM_PER_MIN = {
    "deep_groove_ball": 500_000, "angular_contact_ball": 450_000, "self_aligning_ball": 400_000,
    "cylindrical_roller": 450_000, "tapered_roller": 350_000, "spherical_roller": 300_000,
    "needle_roller": 350_000,
}

GEOMETRY_ASSUMPTIONS = """\
Rolling elements assumed from the boundary envelope d, D, B (ours, stated so they can be checked):
  pitch diameter Dpw = (d + D)/2; radial section h = (D - d)/2.
  deep groove ball: Dw = 0.60*h rounded to 1/32 in; Z = round(0.60*pi*Dpw/Dw) (filling-notch-free assembly); i = 1; alpha = 0.
  angular contact ball: Dw = 0.60*h rounded to 1/32 in; Z = round(0.80*pi*Dpw/Dw); i = 1; alpha = 25 or 40 deg.
  self-aligning ball: Dw = 0.50*h rounded to 1/32 in; Z per row = round(0.75*pi*Dpw/Dw); i = 2; alpha = 12 deg (series 02), 15 deg (series 03).
  cylindrical roller: Dwe = 0.50*h; Lwe = 0.55*B; Z = round(0.80*pi*Dpw/Dwe); i = 1.
  tapered roller: Dwe = 0.48*h (mean); Lwe = 0.70*T; Z = round(0.85*pi*Dpw/Dwe); i = 1; cup angle alpha = 14 deg (series 02), 12 deg (series 03).
  spherical roller: Dwe = 0.42*h; Lwe = 0.38*B per row; Z per row = round(0.80*pi*Dpw/Dwe); i = 2; alpha = 10 deg (series 22), 13 deg (series 23).
  limiting speed = n*dm limit / dm, with n*dm [mm/min] = 500 000 deep groove, 450 000 angular contact and cylindrical,
  400 000 self-aligning ball, 350 000 tapered, 300 000 spherical (rough grease values, common practice)."""


def _interp(table: np.ndarray, x):
    return np.interp(np.asarray(x, float), table[:, 0], table[:, 1])


def fc_ball(gamma, *, self_aligning: bool = False):
    """fc of ISO 281 Table 2 vs γ = Dw·cos α/Dpw (linear interpolation; memory)."""
    return _interp(_FC_SELF_ALIGNING if self_aligning else _FC_GROOVE, gamma)


def fc_roller(gamma):
    """fc of ISO 281 Table 7 (radial roller bearings) vs γ = Dwe·cos α/Dpw (memory)."""
    return _interp(_FC_ROLLER, gamma)


def f0_ball(gamma, *, self_aligning: bool = False):
    """f0 of ISO 76 Table 2 vs γ = Dw·cos α/Dpw (linear interpolation; memory)."""
    return _interp(_F0_SELF_ALIGNING if self_aligning else _F0_GROOVE, gamma)


def dynamic_rating_ball(*, i: int, Z: int, Dw_mm: float, Dpw_mm: float, alpha_deg: float,
                        self_aligning: bool = False, bm: float = 1.3) -> float:
    r"""Basic dynamic radial load rating of a radial ball bearing (ISO 281:2007 cl. 6.1.1).

    .. math:: C_r = b_m f_c (i\cos\alpha)^{0.7} Z^{2/3} D_w^{1.8} \quad (D_w \le 25.4\ \text{mm})

    and :math:`3.647\,b_m f_c (i\cos\alpha)^{0.7} Z^{2/3} D_w^{1.4}` above 25.4 mm.

    Parameters
    ----------
    i : int
        Rows of balls, [-]
    Z : int
        Balls per row, [-]
    Dw_mm, Dpw_mm : float
        Ball diameter and pitch diameter, [mm]
    alpha_deg : float
        Nominal contact angle, [deg]
    self_aligning : bool
        Use the self-aligning column of the fc table
    bm : float
        Rating factor for contemporary material, 1.3 for groove ball bearings (memory), [-]

    Returns
    -------
    Cr : float
        [N]

    Examples
    --------
    Derived check of references.md: i = 1, Z = 9, Dw = 7.938, Dpw = 39 mm -> about 14.0 kN

    >>> round(dynamic_rating_ball(i=1, Z=9, Dw_mm=7.938, Dpw_mm=39.0, alpha_deg=0.0) / 1000, 1)
    14.0
    """
    ca = math.cos(math.radians(alpha_deg))
    fc = float(fc_ball(Dw_mm * ca / Dpw_mm, self_aligning=self_aligning))
    base = bm * fc * (i * ca) ** 0.7 * Z ** (2.0 / 3.0)
    return base * (Dw_mm ** 1.8 if Dw_mm <= 25.4 else 3.647 * Dw_mm ** 1.4)


def dynamic_rating_roller(*, i: int, Z: int, Lwe_mm: float, Dwe_mm: float, Dpw_mm: float,
                          alpha_deg: float, bm: float = 1.1) -> float:
    r"""Basic dynamic radial load rating of a radial roller bearing (ISO 281:2007 cl. 6.1.2).

    .. math:: C_r = b_m f_c (i L_{we} \cos\alpha)^{7/9} Z^{3/4} D_{we}^{29/27}

    Parameters
    ----------
    i, Z : int
        Rows and rollers per row, [-]
    Lwe_mm, Dwe_mm, Dpw_mm : float
        Effective roller length, roller diameter, pitch diameter, [mm]
    alpha_deg : float
        Contact angle, [deg]
    bm : float
        1.1 cylindrical, tapered, needle; 1.15 spherical (memory), [-]

    Examples
    --------
    >>> round(dynamic_rating_roller(i=1, Z=14, Lwe_mm=8.25, Dwe_mm=6.75, Dpw_mm=38.5, alpha_deg=0))
    28360
    """
    ca = math.cos(math.radians(alpha_deg))
    fc = float(fc_roller(Dwe_mm * ca / Dpw_mm))
    return bm * fc * (i * Lwe_mm * ca) ** (7.0 / 9.0) * Z ** 0.75 * Dwe_mm ** (29.0 / 27.0)


def static_rating_ball(*, i: int, Z: int, Dw_mm: float, alpha_deg: float, f0: float) -> float:
    r"""Basic static radial load rating of a radial ball bearing (ISO 76:2006 cl. 5.1).

    .. math:: C_{0r} = f_0\, i\, Z\, D_w^2 \cos\alpha

    Examples
    --------
    >>> round(static_rating_ball(i=1, Z=9, Dw_mm=7.938, alpha_deg=0, f0=14.0))
    7939
    """
    return f0 * i * Z * Dw_mm ** 2 * math.cos(math.radians(alpha_deg))


def static_rating_roller(*, i: int, Z: int, Lwe_mm: float, Dwe_mm: float, Dpw_mm: float,
                         alpha_deg: float) -> float:
    r"""Basic static radial load rating of a radial roller bearing (ISO 76:2006 cl. 5.2).

    .. math:: C_{0r} = 44\left(1 - \frac{D_{we}\cos\alpha}{D_{pw}}\right) i Z L_{we} D_{we}\cos\alpha

    (4000 MPa contact stress at the centre of the most heavily loaded contact; memory.)
    """
    ca = math.cos(math.radians(alpha_deg))
    return 44.0 * (1.0 - Dwe_mm * ca / Dpw_mm) * i * Z * Lwe_mm * Dwe_mm * ca


def fatigue_load_limit(C0_N, *, roller: bool, Dpw_mm):
    r"""Approximate fatigue load limit Cu (ISO 281:2007 Annex B approximation; memory).

    .. math:: C_u = C_0/22 \;(\text{ball}),\; C_0/8.2 \;(\text{roller}) \text{ for } D_{pw} \le 100\ \text{mm},

    times (100/Dpw)^0.5 (ball) or (100/Dpw)^0.3 (roller) above 100 mm. Medium confidence.
    """
    C0 = np.asarray(C0_N, float)
    Dpw = np.asarray(Dpw_mm, float)
    if roller:
        return C0 / 8.2 * np.where(Dpw > 100.0, (100.0 / Dpw) ** 0.3, 1.0)
    return C0 / 22.0 * np.where(Dpw > 100.0, (100.0 / Dpw) ** 0.5, 1.0)


@dataclass(frozen=True)
class Geometry:
    """Assumed rolling-element set: rows i, elements per row Z, diameter, length, pitch, angle."""

    i: int
    Z: int
    Dw_mm: float
    Lwe_mm: float
    Dpw_mm: float
    alpha_deg: float


_ALPHA_BY_SERIES = {
    "self_aligning_ball": {"02": 12.0, "03": 15.0},
    "tapered_roller": {"02": 14.0, "03": 12.0},
    "spherical_roller": {"22": 10.0, "23": 13.0},
}


def internal_geometry(bearing_type: str, *, d_mm: float, D_mm: float, B_mm: float,
                      series: str, alpha_deg: float | None = None) -> Geometry:
    """Our assumed rolling elements inside a boundary envelope (see GEOMETRY_ASSUMPTIONS)."""
    Dpw = 0.5 * (d_mm + D_mm)
    h = 0.5 * (D_mm - d_mm)
    ball = lambda k: max(INCH32 * round(k * h / INCH32), INCH32)  # noqa: E731
    if bearing_type == "deep_groove_ball":
        Dw = ball(0.60)
        return Geometry(1, round(0.60 * math.pi * Dpw / Dw), Dw, 0.0, Dpw, 0.0)
    if bearing_type == "angular_contact_ball":
        Dw = ball(0.60)
        return Geometry(1, round(0.80 * math.pi * Dpw / Dw), Dw, 0.0, Dpw, float(alpha_deg))
    if bearing_type == "self_aligning_ball":
        Dw = ball(0.50)
        return Geometry(2, round(0.75 * math.pi * Dpw / Dw), Dw, 0.0, Dpw,
                        _ALPHA_BY_SERIES[bearing_type][series])
    if bearing_type == "cylindrical_roller":
        Dwe = 0.50 * h
        return Geometry(1, round(0.80 * math.pi * Dpw / Dwe), Dwe, 0.55 * B_mm, Dpw, 0.0)
    if bearing_type == "tapered_roller":
        Dwe = 0.48 * h
        return Geometry(1, round(0.85 * math.pi * Dpw / Dwe), Dwe, 0.70 * B_mm, Dpw,
                        _ALPHA_BY_SERIES[bearing_type][series])
    if bearing_type == "spherical_roller":
        Dwe = 0.42 * h
        return Geometry(2, round(0.80 * math.pi * Dpw / Dwe), Dwe, 0.38 * B_mm, Dpw,
                        _ALPHA_BY_SERIES[bearing_type][series])
    raise ValueError(f"no geometry rule for {bearing_type!r}")


def rate_envelope(bearing_type: str, *, d_mm: float, D_mm: float, B_mm: float, series: str,
                  alpha_deg: float | None = None) -> dict[str, float | None]:
    """Illustrative ratings and load factors for one boundary envelope.

    Returns C_N, C0_N, Cu_N, limiting_speed_rpm, contact_angle_deg, f0 (deep groove), and the
    row factors e, Y1, Y2, Y0 where the type takes them from the row (ISO 281 cl. 6.2 with
    α ≠ 0: self-aligning ball e = 1.5·tan α, Y1 = 0.42·cot α, Y2 = 0.65·cot α, Y0 = 0.44·cot α;
    tapered e = 1.5·tan α, Y2 = 0.4·cot α, Y0 = 0.22·cot α; spherical e = 1.5·tan α,
    Y1 = 0.45·cot α, Y2 = 0.67·cot α, Y0 = 0.44·cot α; memory).
    """
    g = internal_geometry(bearing_type, d_mm=d_mm, D_mm=D_mm, B_mm=B_mm, series=series,
                          alpha_deg=alpha_deg)
    out: dict[str, float | None] = {"contact_angle_deg": None, "f0": None, "e": None,
                                    "Y1": None, "Y2": None, "Y0": None}
    roller = bearing_type not in ("deep_groove_ball", "angular_contact_ball", "self_aligning_ball")
    ca = math.cos(math.radians(g.alpha_deg))
    if not roller:
        sa = bearing_type == "self_aligning_ball"
        f0 = float(f0_ball(g.Dw_mm * ca / g.Dpw_mm, self_aligning=sa))
        C = dynamic_rating_ball(i=g.i, Z=g.Z, Dw_mm=g.Dw_mm, Dpw_mm=g.Dpw_mm,
                                alpha_deg=g.alpha_deg, self_aligning=sa)
        C0 = static_rating_ball(i=g.i, Z=g.Z, Dw_mm=g.Dw_mm, alpha_deg=g.alpha_deg, f0=f0)
        if bearing_type == "deep_groove_ball":
            out["f0"] = f0
    else:
        bm = 1.15 if bearing_type == "spherical_roller" else 1.1
        C = dynamic_rating_roller(i=g.i, Z=g.Z, Lwe_mm=g.Lwe_mm, Dwe_mm=g.Dw_mm, Dpw_mm=g.Dpw_mm,
                                  alpha_deg=g.alpha_deg, bm=bm)
        C0 = static_rating_roller(i=g.i, Z=g.Z, Lwe_mm=g.Lwe_mm, Dwe_mm=g.Dw_mm, Dpw_mm=g.Dpw_mm,
                                  alpha_deg=g.alpha_deg)
    if g.alpha_deg > 0 and bearing_type != "cylindrical_roller":
        out["contact_angle_deg"] = g.alpha_deg
    t = math.tan(math.radians(g.alpha_deg)) if g.alpha_deg > 0 else 0.0
    if bearing_type == "self_aligning_ball":
        out.update(e=1.5 * t, Y1=0.42 / t, Y2=0.65 / t, Y0=0.44 / t)
    elif bearing_type == "tapered_roller":
        out.update(e=1.5 * t, Y1=0.0, Y2=0.4 / t, Y0=0.22 / t)
    elif bearing_type == "spherical_roller":
        out.update(e=1.5 * t, Y1=0.45 / t, Y2=0.67 / t, Y0=0.44 / t)
    Cu = float(fatigue_load_limit(C0, roller=roller, Dpw_mm=g.Dpw_mm))
    n_lim = SPEED_FACTOR_MM_PER_MIN[bearing_type] / g.Dpw_mm
    out.update(C_N=C, C0_N=C0, Cu_N=Cu, limiting_speed_rpm=n_lim)
    return out
