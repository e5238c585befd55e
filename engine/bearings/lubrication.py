"""Lubricant viscosity at operating temperature, and the rated viscosity ν1 of ISO 281.

Units: kinematic viscosity in mm²/s, temperature in °C, speed in rpm, diameters in mm.

Public functions
----------------
nu100_from_vg            ν at 100 °C of an oil of ISO VG grade (ν at 40 °C) and viscosity index
viscosity_at             ν at a temperature, through 40 °C and 100 °C by the Walther relation
rated_viscosity          ν1, the viscosity needed for adequate lubrication (ISO 281)
viscosity_ratio          κ = ν/ν1

Method: the ISO VG grade is the oil's kinematic viscosity at 40 °C (ISO 3448: midpoint of the
grade). The viscosity at 100 °C follows from the viscosity index by inverting the definition
of ASTM D2270 / ISO 2909 (reference oils L, H from the standard's Table 1, here at every 0.5 mm²/s
of ν100 up to 20 mm²/s, then every 2 and every 5 mm²/s up to 70, interpolated log–log; above
70 mm²/s the standard's equations). Between and beyond the two points the viscosity follows
the Walther relation of ASTM D341, log log(ν + 0.7) = A − B·log T (T in K), valid for
ν ≥ 2 mm²/s. Mineral oils of VI 80–110 are what it describes well; synthetic oils with very
high VI or esters may deviate; use the supplier's data when at hand.
"""
from __future__ import annotations

import functools
import math

import numpy as np

__all__ = [
    "SOURCE_VISCOSITY", "SOURCE_NU1", "nu100_from_vg", "viscosity_at", "rated_viscosity",
    "viscosity_ratio",
]

SOURCE_VISCOSITY = ("ISO 3448 (VG = ν at 40 °C); ASTM D2270 viscosity index (L, H from its Table 1); "
                    "ASTM D341 Walther relation log log(ν + 0.7) = A − B·log T")
SOURCE_NU1 = "ISO 281:2007 cl. 6.3 / Annex, rated viscosity ν1 (formula as recalled; verify)"

# ASTM D2270 Table 1: ν100 [mm²/s] -> L, H (ν40 of the VI = 0 and VI = 100 reference oils).
_D2270 = np.array([
    [2.0, 7.994, 6.394], [2.5, 11.45, 9.063], [3.0, 15.49, 12.15], [3.5, 20.09, 15.66],
    [4.0, 25.32, 19.56], [4.5, 31.96, 23.81], [5.0, 40.23, 28.49], [5.5, 49.09, 33.34],
    [6.0, 57.97, 38.19], [6.5, 67.12, 43.18], [7.0, 78.0, 48.57], [7.5, 88.85, 53.98],
    [8.0, 100.0, 59.6], [8.5, 111.5, 65.32], [9.0, 123.3, 71.1], [9.5, 135.3, 76.91],
    [10.0, 147.7, 82.87], [10.5, 160.6, 88.95], [11.0, 173.9, 95.19], [11.5, 187.6, 101.5],
    [12.0, 201.9, 108.0], [12.5, 216.6, 114.7], [13.0, 231.9, 121.5], [13.5, 247.4, 128.4],
    [14.0, 263.3, 135.4], [14.5, 279.6, 142.4], [15.0, 296.5, 149.7], [15.5, 313.9, 157.0],
    [16.0, 331.9, 164.6], [16.5, 350.3, 172.3], [17.0, 369.4, 180.2], [17.5, 388.9, 188.1],
    [18.0, 408.6, 196.2], [18.5, 429.0, 204.3], [19.0, 449.9, 212.7], [19.5, 471.3, 221.1],
    [20.0, 493.2, 229.5], [22.0, 585.2, 264.9], [24.0, 683.9, 301.8], [26.0, 790.4, 340.5],
    [28.0, 904.1, 380.6], [30.0, 1023.0, 421.7], [35.0, 1356.0, 532.5], [40.0, 1730.0, 651.8],
    [45.0, 2152.0, 780.9], [50.0, 2618.0, 919.6], [55.0, 3126.0, 1066.0], [60.0, 3676.0, 1222.0],
    [65.0, 4268.0, 1386.0], [70.0, 4905.0, 1558.0],
])
_LOGY, _LOGL, _LOGH = (np.log(_D2270[:, k]) for k in range(3))


def _L_H(Y: float) -> tuple[float, float]:
    """L and H of ASTM D2270 at ν100 = Y [mm²/s]."""
    if Y > 70.0:
        return 0.8353 * Y * Y + 14.67 * Y - 216.0, 0.1684 * Y * Y + 11.85 * Y - 97.0
    ly = math.log(Y)
    return math.exp(np.interp(ly, _LOGY, _LOGL)), math.exp(np.interp(ly, _LOGY, _LOGH))


def _nu40_for(Y: float, VI: float) -> float:
    L, H = _L_H(Y)
    if VI <= 100.0:
        return L - VI / 100.0 * (L - H)
    N = math.log10(1.0 + 0.00715 * (VI - 100.0))
    return H / Y ** N


@functools.lru_cache(maxsize=256)
def nu100_from_vg(iso_vg: float, *, viscosity_index: float = 95.0) -> float:
    """Kinematic viscosity at 100 °C of an oil given its ISO VG grade and viscosity index.

    Inverts VI = 100·(L − U)/(L − H) (VI ≤ 100) or VI = (10^N − 1)/0.00715 + 100 with
    N = (ln H − ln U)/ln Y (VI > 100), ASTM D2270, for Y = ν100 with U = ν40 = VG, by bisection.

    Parameters
    ----------
    iso_vg : float
        ISO viscosity grade = ν at 40 °C, [mm²/s]
    viscosity_index : float
        Viscosity index, [-]

    Returns
    -------
    nu100 : float
        Kinematic viscosity at 100 °C, [mm²/s]

    Raises
    ------
    ValueError
        When no ν100 in 2–2000 mm²/s matches (VG too low for the VI).

    Examples
    --------
    ASTM D2270's own check pair is ν40 = 73.3, ν100 = 8.86 mm²/s, VI 92 (as cited in an
    open-source implementation of the standard); VI 92.5 gives back about 8.86:

    >>> round(nu100_from_vg(73.3, viscosity_index=92.5), 2)
    8.86
    """
    lo, hi = 2.0, 2000.0
    if not (_nu40_for(lo, viscosity_index) <= iso_vg <= _nu40_for(hi, viscosity_index)):
        raise ValueError(f"no oil of VG {iso_vg:g} with VI {viscosity_index:g} lies in the range "
                         "of ASTM D2270 (ν100 ≥ 2 mm²/s)")
    for _ in range(80):
        mid = math.sqrt(lo * hi)
        if _nu40_for(mid, viscosity_index) < iso_vg:
            lo = mid
        else:
            hi = mid
    return math.sqrt(lo * hi)


def viscosity_at(temp_C, *, iso_vg: float, viscosity_index: float = 95.0):
    r"""Kinematic viscosity of an oil at a temperature (Walther relation, ASTM D341).

    .. math:: \log_{10}\log_{10}(\nu + 0.7) = A - B \log_{10} T

    through (40 °C, VG) and (100 °C, ν100 from :func:`nu100_from_vg`).

    Parameters
    ----------
    temp_C : array_like
        Operating temperature, [°C]
    iso_vg : float
        ISO VG grade (ν at 40 °C), [mm²/s]
    viscosity_index : float
        Viscosity index, [-]

    Returns
    -------
    nu : float or ndarray
        Kinematic viscosity, [mm²/s]

    Notes
    -----
    The "+0.7" form of ASTM D341 holds for ν ≥ 2 mm²/s; it is used as is below that.

    Examples
    --------
    >>> round(float(viscosity_at(40.0, iso_vg=68)), 6)
    68.0
    """
    nu100 = nu100_from_vg(iso_vg, viscosity_index=viscosity_index)
    T1, T2 = math.log10(313.15), math.log10(373.15)
    z1, z2 = math.log10(math.log10(iso_vg + 0.7)), math.log10(math.log10(nu100 + 0.7))
    B = (z1 - z2) / (T2 - T1)
    A = z1 + B * T1
    T = np.log10(np.asarray(temp_C, float) + 273.15)
    nu = 10.0 ** (10.0 ** (A - B * T)) - 0.7
    return float(nu) if nu.ndim == 0 else nu


def rated_viscosity(speed_rpm, dm_mm):
    r"""Rated viscosity ν1 for adequate lubrication at the reference conditions of ISO 281.

    .. math:: \nu_1 = 45000\,n^{-0.83} d_m^{-0.5} \;(n < 1000), \qquad
              \nu_1 = 4500\,n^{-0.5} d_m^{-0.5} \;(n \ge 1000)

    Parameters
    ----------
    speed_rpm : array_like
        Rotational speed, [rpm]
    dm_mm : array_like
        Mean bearing diameter (d + D)/2, [mm]

    Returns
    -------
    nu1 : ndarray
        Rated viscosity, [mm²/s]

    Notes
    -----
    ISO 281:2007 (formula as recalled; the two branches differ by about 2 % at 1000 rpm).

    Examples
    --------
    >>> round(float(rated_viscosity(1000.0, 100.0)), 3)
    14.23
    """
    n = np.asarray(speed_rpm, float)
    dm = np.asarray(dm_mm, float)
    return np.where(n < 1000.0, 45000.0 * n ** -0.83, 4500.0 * n ** -0.5) / np.sqrt(dm)


def viscosity_ratio(nu_mm2_s, *, speed_rpm, dm_mm):
    """κ = ν/ν1 (ISO 281), with ν the operating viscosity [mm²/s]; see :func:`rated_viscosity`."""
    return np.asarray(nu_mm2_s, float) / rated_viscosity(speed_rpm, dm_mm)
