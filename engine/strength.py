"""Shaft strength: stress concentration, notch sensitivity, endurance limit, fatigue and yield
safety, Miner's rule over the duty cycle, and the smallest diameter that meets a target.

Units throughout: mm, N, N·mm, MPa (N/mm²), °C. Every function is vectorised over numpy
arrays (sections × load cases) and keyword-only once it takes more than two numbers.

Public functions
----------------
- :func:`kt_shoulder` — Kt of a shoulder fillet (bending, torsion, axial) from Norton's power
  fits of Peterson's stepped-shaft charts.
- :func:`kt_groove` — Kt of a circumferential groove from fits of Peterson's U-groove charts.
- :data:`KEYWAY_KT`, :data:`GROOVE_KT`, :data:`PRESS_FIT_KF` — first-iteration factors.
- :func:`notch_sensitivity`, :func:`fatigue_notch_factor` — q (Neuber, Kuhn–Hardrath), Kf.
- :func:`endurance_limit_specimen`, :func:`marin_surface`, :func:`marin_size`,
  :func:`marin_temperature`, :func:`marin_reliability`, :func:`endurance_limit` — Se.
- :func:`nominal_stresses`, :func:`von_mises_amplitudes` — stresses at a section.
- :func:`fatigue_safety` (DE–Goodman, DE–Gerber, ASME elliptic, Soderberg), :func:`yield_safety`.
- :func:`fatigue_strength_fraction`, :func:`cycles_to_failure`, :func:`equivalent_reversed_stress`,
  :func:`miner_damage`, :func:`miner_safety` — finite life and the duty cycle.
- :func:`min_diameter` — smallest diameter reaching the target safety factors.

References
----------
.. [1] Budynas, R. G., Nisbett, J. K., *Shigley's Mechanical Engineering Design*, 9th ed.,
   McGraw-Hill, 2011: §6-7 to §6-14 (S–N line, Marin factors, notch sensitivity, fluctuating
   stresses), §7-4 (shaft stresses, DE criteria), Table 7-1 (first-iteration Kt). Equation,
   table and figure numbers throughout are as recalled (memory): verify against the book.
.. [2] Norton, R. L., *Machine Design: An Integrated Approach*, Prentice Hall: Appendix C,
   power-law fits Kt ≈ A·(r/d)^b of Peterson's stepped-shaft charts (constants from memory).
.. [3] Pilkey, W. D., *Peterson's Stress Concentration Factors*, 2nd ed., Wiley, 1997
   (the charts the fits describe).
.. [4] Dowling, N. E., *Mechanical Behavior of Materials*, 4th ed., Pearson, 2013, §10.6
   (Neuber/Kuhn–Hardrath notch sensitivity, log β = −(σu − 134 MPa)/586; memory).
"""
from __future__ import annotations

import math
from statistics import NormalDist
from typing import Literal

import numpy as np

__all__ = [
    "CRITERIA", "DEFAULT_CRITERION", "SAFETY_CAP", "SHOULDER_FITS", "kt_shoulder",
    "KEYWAY_KT", "KEYWAY_R_OVER_D", "GROOVE_KT", "GROOVE_FITS", "kt_groove", "PRESS_FIT_KF", "SHARP_FILLET_R_OVER_D",
    "notch_sensitivity", "fatigue_notch_factor",
    "endurance_limit_specimen", "marin_surface", "marin_size", "marin_temperature",
    "marin_reliability", "endurance_limit",
    "nominal_stresses", "von_mises_amplitudes", "fatigue_safety", "yield_safety",
    "fatigue_strength_fraction", "cycles_to_failure", "equivalent_reversed_stress",
    "miner_damage", "miner_safety", "min_diameter",
]

Criterion = Literal["de_goodman", "de_gerber", "asme_elliptic", "soderberg"]
CRITERIA: tuple[str, ...] = ("de_goodman", "de_gerber", "asme_elliptic", "soderberg")
DEFAULT_CRITERION = "de_goodman"  # Shigley [1] §7-4 recommends it as the basic design criterion
SAFETY_CAP = 100.0  # safety factors are reported up to this value (an unloaded section is "≥ 100")

# --- stress concentration -----------------------------------------------------------------

# Norton [2] Appendix C: Kt ≈ A·(r/d)^b for a stepped round shaft with a shoulder fillet,
# rows by D/d (from memory; the charts are Peterson's [3], also Shigley [1] Figs. A-15-7,
# A-15-8, A-15-9). Rows are evaluated, made non-decreasing in D/d (the physical trend; one
# recalled row crosses its neighbour), then interpolated linearly in D/d.
SHOULDER_FITS: dict[str, tuple[tuple[float, float, float], ...]] = {
    "bending": (  # Peterson chart for bending (Shigley Fig. A-15-9)
        (1.01, 0.91938, -0.17032), (1.02, 0.96048, -0.17711), (1.03, 0.98061, -0.18381),
        (1.05, 0.98137, -0.19653), (1.07, 0.97527, -0.20958), (1.10, 0.95120, -0.23757),
        (1.20, 0.97098, -0.21796), (1.50, 0.93836, -0.25759), (2.00, 0.90879, -0.28598),
        (3.00, 0.89334, -0.30860), (6.00, 0.87868, -0.33243)),
    "torsion": (  # Peterson chart for torsion (Shigley Fig. A-15-8)
        (1.09, 0.90337, -0.12692), (1.20, 0.83425, -0.21649), (1.33, 0.84897, -0.23161),
        (2.00, 0.86331, -0.23865)),
    "axial": (  # Peterson chart for axial load (Shigley Fig. A-15-7)
        (1.01, 0.98413, -0.10474), (1.02, 1.01220, -0.12474), (1.05, 1.00480, -0.17611),
        (1.07, 0.98498, -0.19548), (1.10, 0.98450, -0.20818), (1.15, 0.98084, -0.22485),
        (1.20, 0.96272, -0.25527), (1.30, 0.99682, -0.25751), (1.50, 0.99957, -0.28221),
        (2.00, 1.01470, -0.30035)),
}
SHARP_FILLET_R_OVER_D = 0.02  # Shigley [1] Table 7-1 "sharp" shoulder, used when no radius is given
# the same rows as arrays: D/d grid with 1 prepended, A and b as columns (rows, 1)
_SHOULDER_GRID = {load: (np.concatenate([[1.0], np.array(rows)[:, 0]]), np.array(rows)[:, 1:2],
                         np.array(rows)[:, 2:3]) for load, rows in SHOULDER_FITS.items()}

# Shigley [1] Table 7-1 first-iteration estimates (memory): (Kt bending, Kt torsion, Kt axial).
# Keyseats are for standard proportions with a bottom radius r/d ≈ 0.02 (KEYWAY_R_OVER_D). The
# table gives no torsion value for a sled-runner keyseat nor axial values for keyseats: the
# end-mill torsion value and the bending values stand in (common practice, conservative).
KEYWAY_KT: dict[str, tuple[float, float, float]] = {
    "end_milled": (2.14, 3.0, 2.14),
    "sled_runner": (1.7, 3.0, 1.7),
}
KEYWAY_R_OVER_D = 0.02
GROOVE_KT: tuple[float, float, float] = (5.0, 3.0, 5.0)  # retaining-ring groove, Table 7-1 (for comparison)
# A press-fitted hub acts through fretting, not a geometric notch: Kf taken directly, q = 1
# (common practice: about 2 in bending, range 1.5–2.5; torsion about 1.5; memory).
PRESS_FIT_KF: tuple[float, float, float] = (2.0, 1.5, 2.0)


def kt_shoulder(*, D_mm, d_mm, r_mm, load: Literal["bending", "torsion", "axial"] = "bending"):
    """Theoretical stress concentration factor of a shoulder fillet on a round shaft.

    .. math:: K_t \\approx A(D/d)\\,(r/d)^{b(D/d)}

    Parameters
    ----------
    D_mm : larger diameter, [mm]
    d_mm : smaller diameter, [mm]
    r_mm : fillet radius, [mm]
    load : "bending", "torsion" or "axial"

    Returns
    -------
    Kt : stress concentration factor on the nominal stress of the smaller diameter, [-]

    Notes
    -----
    Power fits (Norton [2], constants from memory) of Peterson's charts [3]. Between D/d = 1
    and the first tabulated row Kt is interpolated linearly from 1; above the last row the last
    row is used (the charts flatten there). r/d is capped at 0.3 (the end of the charts);
    Kt ≥ 1. Agreement with chart readings is a few per cent.

    Examples
    --------
    Shigley [1] Example 7-1 reads Kt = 1.68 off Fig. A-15-9 at D/d = 1.5, r/d = 0.1:

    >>> round(float(kt_shoulder(D_mm=1.5, d_mm=1.0, r_mm=0.1)), 2)
    1.7
    """
    D, d, r = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (D_mm, d_mm, r_mm)))
    ratio = np.maximum(D / d, 1.0)
    rd = np.minimum(np.maximum(r / d, 1e-4), 0.3)
    grid, A, b = _SHOULDER_GRID[load]
    vals = np.ones((grid.size, rd.size))  # row 0: Kt = 1 at D/d = 1
    vals[1:] = np.maximum.accumulate(np.maximum(A * rd.ravel()[None, :] ** b, 1.0), axis=0)
    q = ratio.ravel()
    idx = np.clip(np.searchsorted(grid, q, side="right") - 1, 0, grid.size - 2)
    t = np.clip((q - grid[idx]) / (grid[idx + 1] - grid[idx]), 0.0, 1.0)
    cols = np.arange(q.size)
    kt = vals[idx, cols] * (1 - t) + vals[idx + 1, cols] * t
    return np.maximum(kt, 1.0).reshape(D.shape)


# Peterson's charts for a U-shaped circumferential groove in a round bar, as polynomial fits
# Kt = C1 + C2·(2t/D) + C3·(2t/D)² + C4·(2t/D)³ with Ci = a + b·√(t/r) + c·(t/r), two bands of
# t/r (fits given with the U-groove charts in Pilkey [3] and in Roark's Formulas; from memory —
# checked for consistency: shallow limit C1 ≈ 1 + 2√(t/r) (1 + √(t/r) in torsion), deep limit
# ΣCi ≈ 1). Rows: (a, b, c) for C1..C4.
GROOVE_FITS: dict[str, tuple[tuple[tuple[float, float, float], ...], tuple[tuple[float, float, float], ...]]] = {
    "bending": (((0.594, 2.958, -0.520), (0.422, -10.545, 2.692), (0.501, 14.375, -4.486), (-0.613, -6.573, 2.177)),
                ((0.965, 1.926, 0.0), (-2.773, -4.414, -0.017), (4.785, 4.681, 0.096), (-1.995, -2.241, -0.074))),
    "torsion": (((0.966, 1.056, -0.022), (-0.192, -4.037, 0.674), (0.808, 5.321, -1.231), (-0.567, -2.364, 0.566)),
                ((1.089, 0.924, 0.018), (-1.504, -2.141, -0.047), (2.486, 2.289, 0.091), (-1.056, -1.104, -0.059))),
    "axial": (((0.455, 3.354, -0.769), (3.129, -15.955, 7.404), (-6.909, 29.037, -16.104), (4.325, -16.511, 9.469)),
              ((0.935, 1.922, 0.004), (0.537, -3.708, 0.040), (-2.538, 3.438, -0.012), (2.066, -1.652, -0.031))),
}


def kt_groove(*, D_mm, t_mm, r_mm, load: Literal["bending", "torsion", "axial"] = "bending"):
    r"""Theoretical stress concentration factor of a circumferential groove in a round shaft.

    .. math:: K_t = C_1 + C_2\frac{2t}{D} + C_3\left(\frac{2t}{D}\right)^2 + C_4\left(\frac{2t}{D}\right)^3,
              \quad C_i = a_i + b_i\sqrt{t/r} + c_i\,t/r

    Parameters
    ----------
    D_mm : shaft diameter outside the groove, [mm]
    t_mm : groove depth, [mm]
    r_mm : groove root (corner) radius, [mm]
    load : "bending", "torsion" or "axial"

    Returns
    -------
    Kt on the nominal stress of the root diameter d = D − 2t, [-]

    Notes
    -----
    Fits of Peterson's U-groove charts (:data:`GROOVE_FITS`, bands 0.25 ≤ t/r ≤ 2 and
    2 ≤ t/r ≤ 50; above 50 the t/r = 50 value is used, below 0.25 Kt − 1 is scaled by
    √(t/r / 0.25), the shallow-notch trend). A retaining-ring groove is flat-bottomed; its
    factor lies below that of a U-groove of the same depth and root radius (Peterson), so
    this is a conservative estimate. For common ring grooves it gives 4.5–6 in bending and
    about 3 in torsion, as Shigley's Table 7-1 first-iteration values (5.0, 3.0) suggest.

    >>> round(float(kt_groove(D_mm=30, t_mm=1.0, r_mm=0.2)), 2)
    4.49
    """
    D, t, r = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (D_mm, t_mm, r_mm)))
    tr_raw = t / np.maximum(r, 1e-9)
    tr = np.clip(tr_raw, 0.25, 50.0)
    x = 2.0 * t / D
    low, high = (np.array(band) for band in GROOVE_FITS[load])
    sq = np.sqrt(tr)
    kt = np.zeros_like(tr)
    for k in range(4):
        ci = np.where(tr <= 2.0, low[k, 0] + low[k, 1] * sq + low[k, 2] * tr,
                      high[k, 0] + high[k, 1] * sq + high[k, 2] * tr)
        kt = kt + ci * x**k
    # below t/r = 0.25 (a very shallow groove) Kt − 1 falls as √(t/r), the shallow-notch trend
    kt = np.where(tr_raw < 0.25, 1.0 + (kt - 1.0) * np.sqrt(np.maximum(tr_raw, 0.0) / 0.25), kt)
    return np.maximum(kt, 1.0)


# --- notch sensitivity ----------------------------------------------------------------------

def notch_sensitivity(*, Su_MPa, r_mm, load: Literal["bending", "torsion"] = "bending",
                      method: Literal["neuber", "kuhn_hardrath"] = "neuber"):
    """Notch sensitivity q of steel by Neuber's equation.

    .. math:: q = \\frac{1}{1 + \\sqrt{a}/\\sqrt{r}}

    ``neuber``: Neuber constant √a from Shigley [1] Eq. 6-35a (bending, axial) and 6-35b
    (torsion), fitted to Figs. 6-20/6-21, with Sut in kpsi and √a in √in, valid
    50 ≤ Sut ≤ 250 kpsi (345–1724 MPa; Sut is clamped to that range):

    √a = 0.246 − 3.08·10⁻³ Sut + 1.51·10⁻⁵ Sut² − 2.67·10⁻⁸ Sut³ (bending)
    √a = 0.190 − 2.51·10⁻³ Sut + 1.35·10⁻⁵ Sut² − 2.67·10⁻⁸ Sut³ (torsion)

    ``kuhn_hardrath``: Neuber's form with the Kuhn–Hardrath correlation for steels as given
    by Dowling [4]: a = β, log₁₀ β[mm] = −(Su − 134 MPa)/586 (bending and torsion alike).

    Parameters
    ----------
    Su_MPa : ultimate tensile strength, [MPa]
    r_mm : notch root radius, [mm]

    Returns
    -------
    q : notch sensitivity, 0 … 1, [-]

    Examples
    --------
    Shigley [1] Example 7-1: Sut = 105 kpsi, r = 0.11 in → q = 0.85 (bending), 0.88 (torsion)

    >>> round(float(notch_sensitivity(Su_MPa=105 * 6.894757, r_mm=0.11 * 25.4)), 2)
    0.85
    >>> round(float(notch_sensitivity(Su_MPa=105 * 6.894757, r_mm=0.11 * 25.4, load="torsion")), 2)
    0.88
    """
    Su = np.asarray(Su_MPa, dtype=float)
    r = np.maximum(np.asarray(r_mm, dtype=float), 1e-9)
    if method == "kuhn_hardrath":
        sqrt_a = np.sqrt(10.0 ** (-(Su - 134.0) / 586.0))  # √mm
    else:
        s = np.clip(Su / 6.894757, 50.0, 250.0)  # kpsi
        c0 = 0.246 if load == "bending" else 0.190
        c1 = 3.08e-3 if load == "bending" else 2.51e-3
        c2 = 1.51e-5 if load == "bending" else 1.35e-5
        sqrt_a = (c0 - c1 * s + c2 * s**2 - 2.67e-8 * s**3) * math.sqrt(25.4)  # √in → √mm
    return 1.0 / (1.0 + sqrt_a / np.sqrt(r))


def fatigue_notch_factor(Kt, q):
    """Fatigue stress concentration factor Kf = 1 + q·(Kt − 1) (Shigley [1] Eq. 6-32).

    >>> round(float(fatigue_notch_factor(1.68, 0.85)), 2)
    1.58
    """
    return 1.0 + np.asarray(q, dtype=float) * (np.asarray(Kt, dtype=float) - 1.0)


# --- endurance limit --------------------------------------------------------------------------

_SURFACE = {  # Shigley [1] Table 6-2, Sut in MPa: ka = a·Sut^b
    "ground": (1.58, -0.085), "machined": (4.51, -0.265),
    "hot_rolled": (57.7, -0.718), "as_forged": (272.0, -0.995),
}


def endurance_limit_specimen(Su_MPa: float) -> float:
    """Rotating-beam endurance limit of steel, Se' = 0.5·Sut for Sut ≤ 1400 MPa, else 700 MPa
    (Shigley [1] Eq. 6-8). [MPa]"""
    return 0.5 * Su_MPa if Su_MPa <= 1400.0 else 700.0


def marin_surface(surface: str, Su_MPa: float) -> float:
    """Surface factor ka = a·Sut^b (Shigley [1] Eq. 6-19, Table 6-2; Sut in MPa).

    >>> round(marin_surface("machined", 105 * 6.894757), 3)   # Shigley Example 7-1: 0.787
    0.788
    """
    a, b = _SURFACE[surface]
    return min(1.0, a * Su_MPa**b)


def marin_size(d_mm):
    """Size factor for a rotating round section in bending or torsion (Shigley [1] Eq. 6-20).

    .. math:: k_b = (d/7.62)^{-0.107}\\ (2.79 \\le d \\le 51\\ \\mathrm{mm});\\quad
              1.51\\,d^{-0.157}\\ (51 < d \\le 254\\ \\mathrm{mm})

    Below 2.79 mm kb = 1; above 254 mm the 254 mm value is used. [-]

    >>> round(float(marin_size(1.1 * 25.4)), 3)   # Shigley Example 7-1: 0.870
    0.87
    """
    d = np.clip(np.asarray(d_mm, dtype=float), 2.79, 254.0)
    return np.where(d <= 51.0, (d / 7.62) ** -0.107, 1.51 * d**-0.157)


def marin_temperature(T_C: float) -> float:
    """Temperature factor kd = ST/SRT (Shigley [1] Eq. 6-27, polynomial in °F, 70–1000 °F):

    kd = 0.975 + 0.432·10⁻³T − 0.115·10⁻⁵T² + 0.104·10⁻⁸T³ − 0.595·10⁻¹²T⁴.
    At and below 70 °F (21 °C) kd = 1; above 1000 °F (538 °C) the 1000 °F value is used.
    """
    T = min(max(1.8 * T_C + 32.0, 70.0), 1000.0)
    return min(1.0, 0.975 + 0.432e-3 * T - 0.115e-5 * T**2 + 0.104e-8 * T**3 - 0.595e-12 * T**4)


def marin_reliability(reliability_pct: float) -> float:
    """Reliability factor ke = 1 − 0.08·za, za the standard normal variate of the reliability
    (Shigley [1] Eq. 6-28, Table 6-5: 8 % standard deviation of the endurance limit).

    >>> round(marin_reliability(99), 3), round(marin_reliability(90), 3)
    (0.814, 0.897)
    """
    if reliability_pct <= 50.0:
        return 1.0
    return 1.0 - 0.08 * NormalDist().inv_cdf(reliability_pct / 100.0)


def endurance_limit(*, Su_MPa: float, d_mm, surface: str = "machined", T_C: float = 20.0,
                    reliability_pct: float = 90.0, Se_prime_MPa: float | None = None):
    """Endurance limit at the critical location, Se = ka·kb·kc·kd·ke·kf·Se' (Shigley [1] Eq. 6-18).

    kc = 1: the loads are combined into a von Mises equivalent bending stress (Shigley [1]
    §7-4). kf = 1 (miscellaneous effects not modelled). ``Se_prime_MPa`` overrides the estimate
    from Sut (a measured rotating-beam limit).

    Returns Se [MPa] with the shape of ``d_mm``.

    >>> round(float(endurance_limit(Su_MPa=723.95, d_mm=27.94, reliability_pct=99)) / 6.894757, 1)
    29.3
    """
    Se1 = endurance_limit_specimen(Su_MPa) if Se_prime_MPa is None else Se_prime_MPa
    return (marin_surface(surface, Su_MPa) * marin_size(d_mm) * marin_temperature(T_C)
            * marin_reliability(reliability_pct) * Se1)


# --- stresses ---------------------------------------------------------------------------------

def nominal_stresses(*, d_mm, bore_mm, M_Nmm, T_Nmm, N_N):
    """Nominal stresses of a round, possibly hollow, section.

    .. math:: \\sigma_b = \\frac{32 M d}{\\pi(d^4 - d_i^4)},\\quad
              \\tau = \\frac{16 T d}{\\pi(d^4 - d_i^4)},\\quad
              \\sigma_{ax} = \\frac{4 N}{\\pi(d^2 - d_i^2)}

    Returns (σ_b, τ, σ_ax) [MPa]; N tension-positive.
    """
    d, di = np.asarray(d_mm, float), np.asarray(bore_mm, float)
    c4 = math.pi * (d**4 - di**4)
    return 32.0 * M_Nmm * d / c4, 16.0 * T_Nmm * d / c4, 4.0 * N_N / (math.pi * (d**2 - di**2))


def von_mises_amplitudes(*, Kf, Kfs, Kf_ax, sigma_a, sigma_m_ax, tau_a, tau_m):
    """Von Mises alternating and mean stresses with the fatigue factors applied (Shigley [1]
    Eqs. 7-5, 7-6): σa' = √((Kf σa)² + 3(Kfs τa)²), σm' = √((Kf,ax σm,ax)² + 3(Kfs τm)²).
    Bending on a rotating shaft is fully reversed (σm,bending = 0); axial force is steady.
    Returns (σa', σm') [MPa]."""
    sa = np.hypot(Kf * sigma_a, math.sqrt(3.0) * Kfs * tau_a)
    sm = np.hypot(Kf_ax * sigma_m_ax, math.sqrt(3.0) * Kfs * tau_m)
    return sa, sm


def fatigue_safety(*, sigma_a_MPa, sigma_m_MPa, Se_MPa, Su_MPa, Sy_MPa,
                   criterion: Criterion = DEFAULT_CRITERION):
    """Fatigue safety factor for infinite life from von Mises amplitudes (Shigley [1] §7-4).

    With x = σm'/Sut, y = σa'/Se:

    - DE–Goodman (Eq. 7-7):     1/n = y + x
    - DE–Gerber (Eq. 7-9):      n·y + (n·x)² = 1  →  n = 2/(y + √(y² + 4x²))
    - ASME elliptic (Eq. 7-11): 1/n = √(y² + (σm'/Sy)²)
    - Soderberg (Eq. 7-13):     1/n = y + σm'/Sy

    Returns n [-], capped at :data:`SAFETY_CAP`.

    Examples
    --------
    Shigley [1] Example 7-1 (kpsi): σa' = 15.2, σm' = 10.0, Se = 29.3, Sut = 105, Sy = 82
    → 1.63, 1.87, 1.88, 1.56.

    >>> [round(float(fatigue_safety(sigma_a_MPa=15.2, sigma_m_MPa=10.0, Se_MPa=29.3, Su_MPa=105,
    ...       Sy_MPa=82, criterion=c)), 2) for c in CRITERIA]
    [1.63, 1.87, 1.88, 1.56]
    """
    with np.errstate(divide="ignore", invalid="ignore"):
        n = 1.0 / _inverse_fatigue_safety(np.asarray(sigma_a_MPa, float), np.asarray(sigma_m_MPa, float),
                                          Se_MPa=Se_MPa, Su_MPa=Su_MPa, Sy_MPa=Sy_MPa, criterion=criterion)
    return np.minimum(np.nan_to_num(n, nan=SAFETY_CAP, posinf=SAFETY_CAP), SAFETY_CAP)


def _inverse_fatigue_safety(sa, sm, *, Se_MPa, Su_MPa, Sy_MPa, criterion: str):
    """1/n of :func:`fatigue_safety` (the one place the four criteria are written), [-]."""
    y, x = sa / Se_MPa, sm / Su_MPa
    if criterion == "de_goodman":
        return y + x
    if criterion == "de_gerber":
        return 0.5 * (y + np.sqrt(y**2 + 4.0 * x**2))
    if criterion == "asme_elliptic":
        return np.hypot(y, sm / Sy_MPa)
    if criterion == "soderberg":
        return y + sm / Sy_MPa
    raise ValueError(f"unknown fatigue criterion {criterion!r}; use one of {CRITERIA}")


def _peak_von_mises(*, Kf, Kfs, Kf_ax, sigma_a, sigma_m_ax, tau_a, tau_m):
    """σ'max of :func:`yield_safety`: √((Kf|σa| + Kf,ax|σm,ax|)² + 3(Kfs(|τa| + |τm|))²), [MPa]."""
    return np.hypot(Kf * np.abs(sigma_a) + Kf_ax * np.abs(sigma_m_ax),
                    math.sqrt(3.0) * Kfs * (np.abs(tau_a) + np.abs(tau_m)))


def yield_safety(*, Kf, Kfs, Kf_ax, sigma_a, sigma_m_ax, tau_a, tau_m, Sy_MPa):
    """First-cycle yield safety by von Mises on the peak stresses (Shigley [1] Eq. 7-15):

    σ'max = √((Kf|σa| + Kf,ax|σm,ax|)² + 3(Kfs(|τa| + |τm|))²),  ny = Sy/σ'max. [-], capped.

    >>> s = yield_safety(Kf=1, Kfs=1, Kf_ax=1, sigma_a=15.2, sigma_m_ax=0, tau_a=0, tau_m=5.77, Sy_MPa=82)
    >>> round(float(s), 2)    # 82/√(15.2² + 3·5.77²) (derived); Shigley Example 7-1 gives 4.48 from unrounded stresses (memory)
    4.51
    """
    peak = _peak_von_mises(Kf=Kf, Kfs=Kfs, Kf_ax=Kf_ax, sigma_a=sigma_a, sigma_m_ax=sigma_m_ax,
                           tau_a=tau_a, tau_m=tau_m)
    with np.errstate(divide="ignore"):
        n = Sy_MPa / peak
    return np.minimum(n, SAFETY_CAP)


# --- finite life and the duty cycle -------------------------------------------------------------

def fatigue_strength_fraction(Su_MPa: float) -> float:
    """Fraction f of Sut that is the fatigue strength at 10³ cycles (Shigley [1] Fig. 6-18; the
    fit f = 1.06 − 2.8·10⁻³Sut + 6.9·10⁻⁶Sut², Sut in kpsi, 70–200 kpsi, of the 10th ed.;
    memory). f = 0.9 below 70 kpsi; the 200 kpsi value above it."""
    s = min(max(Su_MPa / 6.894757, 70.0), 200.0)
    return 1.06 - 2.8e-3 * s + 6.9e-6 * s**2


def cycles_to_failure(*, sigma_rev_MPa, Se_MPa, Su_MPa: float):
    """Cycles to failure on the S–N line Sf = a·N^b between 10³ and 10⁶ cycles (Shigley [1]
    Eqs. 6-13 to 6-16): a = (f·Sut)²/Se, b = −log₁₀(f·Sut/Se)/3, N = (σrev/a)^(1/b).

    Infinite (np.inf) at or below Se; at least 1 cycle. Above f·Sut the line is extrapolated
    (low-cycle fatigue is outside the method). [cycles]
    """
    s = np.asarray(sigma_rev_MPa, float)
    Se = np.asarray(Se_MPa, float)
    f = fatigue_strength_fraction(Su_MPa)
    a = (f * Su_MPa) ** 2 / Se
    b = -np.log10(f * Su_MPa / Se) / 3.0
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        N = np.where(s > Se, (np.maximum(s, 1e-12) / a) ** (1.0 / b), np.inf)
    return np.maximum(N, 1.0)


def equivalent_reversed_stress(*, sigma_a_MPa, sigma_m_MPa, Su_MPa, Sy_MPa,
                               criterion: Criterion = DEFAULT_CRITERION):
    """Completely reversed stress equivalent to (σa', σm') on the chosen criterion's line
    (Shigley [1] §6-14, e.g. Goodman σrev = σa'/(1 − σm'/Sut)). Infinite when σm' reaches the
    criterion's static strength. [MPa]"""
    sa, sm = np.asarray(sigma_a_MPa, float), np.asarray(sigma_m_MPa, float)
    if criterion == "de_goodman":
        den = 1.0 - sm / Su_MPa
    elif criterion == "de_gerber":
        den = 1.0 - (sm / Su_MPa) ** 2
    elif criterion == "asme_elliptic":
        den = np.sqrt(np.maximum(1.0 - (sm / Sy_MPa) ** 2, 0.0))
    else:
        den = 1.0 - sm / Sy_MPa
    with np.errstate(divide="ignore"):
        return np.where(den > 0, sa / np.maximum(den, 1e-300), np.inf)


def miner_damage(*, cycles, sigma_rev_MPa, Se_MPa, Su_MPa: float):
    """Palmgren–Miner damage D = Σ nᵢ/Nᵢ over the load cases (axis 0) (Shigley [1] Eq. 6-57).

    cycles : (n_cases, …) applied cycles of each case; sigma_rev_MPa : same shape. Returns D."""
    N = cycles_to_failure(sigma_rev_MPa=sigma_rev_MPa, Se_MPa=Se_MPa, Su_MPa=Su_MPa)
    return np.sum(np.asarray(cycles, float) / N, axis=0)


def miner_safety(*, cycles, sigma_a_MPa, sigma_m_MPa, Se_MPa, Su_MPa: float, Sy_MPa: float,
                 criterion: Criterion = DEFAULT_CRITERION, iterations: int = 48):
    """Duty-cycle safety factor: the factor s on every stress of every case at which Miner's
    damage over the given cycles reaches 1 (bisection on log s, vectorised over sections).

    Arrays have shape (n_cases, n_sections); returns (n_sections,). [-], capped.
    """
    sa, sm = np.asarray(sigma_a_MPa, float), np.asarray(sigma_m_MPa, float)
    cyc = np.asarray(cycles, float)
    if cyc.ndim == 1:
        cyc = cyc[:, None]
    lo = np.full(sa.shape[1:], 1e-3)
    hi = np.full(sa.shape[1:], SAFETY_CAP)

    def damage(s):
        rev = equivalent_reversed_stress(sigma_a_MPa=s * sa, sigma_m_MPa=s * sm, Su_MPa=Su_MPa,
                                         Sy_MPa=Sy_MPa, criterion=criterion)
        return miner_damage(cycles=cyc, sigma_rev_MPa=rev, Se_MPa=Se_MPa, Su_MPa=Su_MPa)

    done = damage(hi) <= 1.0
    for _ in range(iterations):
        mid = np.sqrt(lo * hi)
        ok = damage(mid) <= 1.0
        lo = np.where(ok, mid, lo)
        hi = np.where(ok, hi, mid)
    return np.where(done, SAFETY_CAP, lo)


# --- minimum diameter ---------------------------------------------------------------------------

def min_diameter(*, d_mm, bore_ratio, Kf, Kfs, Kf_ax, M_Nmm, T_Nmm, Ta_Nmm, N_N, Se_d_MPa,
                 Su_MPa: float, Sy_MPa: float, n_fatigue_target: float, n_yield_target: float,
                 criterion: Criterion = DEFAULT_CRITERION, iterations: int = 12, rtol: float = 1e-9):
    """Smallest diameter at which a section reaches both target safety factors in a load case.

    The section is scaled as a whole: bore/d, Kf, Kfs held at the present design's values,
    the size factor kb follows d (``Se_d_MPa`` is Se at the present d and is rescaled by
    kb(d)/kb(d₀)). Solves ρ(d) = min(n_f/n_f,target, n_y/n_y,target) = 1, which inverts
    exactly the checks of :func:`fatigue_safety` and :func:`yield_safety`.

    Notes
    -----
    ρ grows like d³ where bending and torsion govern and like d² where axial force does, so
    the root is found by a secant iteration on (log d, log ρ), started with the exponent 3
    (d₁ = d₀·ρ₀^(−1/3), Shigley's Eq. 7-8 for a pure-moment section) and safeguarded to
    exponents between 1 and 4. It converges in a handful of steps. Sections carrying no
    load return 0. Returns d_min [mm], same shape as the inputs.
    """
    d0 = np.asarray(d_mm, float)
    br = np.asarray(bore_ratio, float)
    kb0 = marin_size(d0)

    def log_ratio(d):
        sb, tm, sax = nominal_stresses(d_mm=d, bore_mm=br * d, M_Nmm=M_Nmm, T_Nmm=T_Nmm, N_N=N_N)
        ta = tm * (np.asarray(Ta_Nmm, float) / np.where(T_Nmm == 0, 1.0, T_Nmm))
        sa, sm = von_mises_amplitudes(Kf=Kf, Kfs=Kfs, Kf_ax=Kf_ax, sigma_a=sb, sigma_m_ax=sax,
                                      tau_a=ta, tau_m=tm)
        Se = Se_d_MPa * marin_size(d) / kb0
        with np.errstate(divide="ignore", invalid="ignore"):
            inv_nf = _inverse_fatigue_safety(sa, sm, Se_MPa=Se, Su_MPa=Su_MPa, Sy_MPa=Sy_MPa, criterion=criterion)
            peak = _peak_von_mises(Kf=Kf, Kfs=Kfs, Kf_ax=Kf_ax, sigma_a=sb, sigma_m_ax=sax, tau_a=ta, tau_m=tm)
            return -np.log(np.maximum(inv_nf * n_fatigue_target, peak / Sy_MPa * n_yield_target))

    u0 = np.log(d0)
    g0 = log_ratio(d0)
    unloaded = ~np.isfinite(g0)
    g0 = np.where(unloaded, 0.0, g0)
    p = np.full_like(u0, 3.0)
    u1 = u0 - g0 / p
    for _ in range(iterations):
        g1 = log_ratio(np.exp(u1))
        g1 = np.where(unloaded, 0.0, g1)
        if np.all(np.abs(g1) <= rtol):
            break
        du = u1 - u0
        with np.errstate(divide="ignore", invalid="ignore"):
            slope = np.where(np.abs(du) > 1e-14, (g1 - g0) / du, p)
        p = np.clip(np.nan_to_num(slope, nan=3.0), 1.0, 4.0)
        u0, g0 = u1, g1
        u1 = u1 - g1 / p
    return np.where(unloaded, 0.0, np.exp(u1))
