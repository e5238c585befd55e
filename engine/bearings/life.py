"""Rating life: basic L10, reliability factor (ISO a1 or Weibull), aISO, duty-cycle combination.

Units: loads in N, speeds in rpm, lives in millions of revolutions (``_Mrev``) or hours (``_h``).
All functions broadcast over numpy arrays.

Public functions
----------------
life_exponent      p = 3 (ball) or 10/3 (roller)
basic_life_Mrev    L10 = (C/P)^p
life_hours         L [10⁶ rev] -> hours at a speed
a1_iso             ISO 281:2007 reliability factor a1
weibull_factor     the textbook Weibull life factor at a reliability
a_iso              ISO 281 life modification factor aISO from κ, ec·Cu/P
mean_load          the revolution-weighted mean load of a duty cycle (Palmgren–Miner)
miner_life_h       the life of a duty cycle from the lives of its cases (Palmgren–Miner)
"""
from __future__ import annotations

import numpy as np

__all__ = [
    "SOURCE_L10", "SOURCE_A1", "SOURCE_WEIBULL", "SOURCE_AISO", "SOURCE_MINER",
    "WEIBULL_X0", "WEIBULL_THETA", "WEIBULL_B", "AISO_MAX", "KAPPA_MIN", "KAPPA_MAX", "BALL_TYPES",
    "life_exponent", "basic_life_Mrev", "life_hours", "a1_iso", "weibull_factor", "a_iso",
    "mean_load", "miner_life_h",
]

SOURCE_L10 = "ISO 281:2007 cl. 7.1, L10 = (C/P)^p, p = 3 ball, 10/3 roller (as recalled; verify)"
SOURCE_A1 = "ISO 281:2007 cl. 7.2 Table 12 a1 (values as recalled; verify against the standard)"
SOURCE_WEIBULL = ("textbook three-parameter Weibull life factor x0 + (θ − x0)·ln(1/R)^(1/b) "
                  "(Shigley, Mechanical Engineering Design, 9th ed., Eq. 11-7; parameters x0 0.02, "
                  "θ 4.459, b 1.483 as the book uses them; memory)")
SOURCE_AISO = "ISO 281:2007 cl. 7.3 / Annex, aISO from κ and ec·Cu/P (formulas as recalled; verify)"
SOURCE_MINER = "Palmgren–Miner rule over the duty cycle (ISO 281:2007 cl. 7.3.4 / common practice)"

BALL_TYPES = ("deep_groove_ball", "angular_contact_ball", "self_aligning_ball")

# Weibull parameters of the textbook method, life in multiples of the rating life.
WEIBULL_X0, WEIBULL_THETA, WEIBULL_B = 0.02, 4.459, 1.483
AISO_MAX = 50.0
KAPPA_MIN, KAPPA_MAX = 0.1, 4.0


def life_exponent(bearing_type: str) -> float:
    """p = 3 for ball bearings, 10/3 for roller bearings (ISO 281:2007 cl. 7.1)."""
    return 3.0 if bearing_type in BALL_TYPES else 10.0 / 3.0


def basic_life_Mrev(C_N, P_N, *, p: float):
    r"""Basic rating life L10 in millions of revolutions.

    .. math:: L_{10} = (C/P)^p

    Parameters
    ----------
    C_N : array_like
        Basic dynamic load rating, [N]
    P_N : array_like
        Equivalent dynamic load, [N] (0 gives inf)
    p : float
        Life exponent, 3 (ball) or 10/3 (roller), [-]

    Examples
    --------
    >>> float(basic_life_Mrev(30000.0, 3000.0, p=10/3)) == 10 ** (10 / 3)
    True
    """
    with np.errstate(divide="ignore"):
        return (np.asarray(C_N, float) / np.asarray(P_N, float)) ** p


def life_hours(L_Mrev, speed_rpm):
    """Hours for a life given in millions of revolutions: L_h = 10⁶·L/(60·n)."""
    return 1e6 * np.asarray(L_Mrev, float) / (60.0 * np.asarray(speed_rpm, float))


def a1_iso(reliability_pct):
    r"""Life modification factor for reliability, ISO 281:2007 (Table 12).

    .. math:: a_1 = 0.95\left[\frac{\ln(100/R)}{\ln(100/90)}\right]^{2/3} + 0.05

    This closed form reproduces every tabulated value (90 % → 1, 95 % → 0.64, 99 % → 0.25,
    99.95 % → 0.077) to their rounding; the 2007 edition's table ends at 99.95 %.

    Parameters
    ----------
    reliability_pct : array_like
        Required reliability, 90 ≤ R < 100, [%]

    Returns
    -------
    a1 : ndarray
        [-]

    Examples
    --------
    >>> round(float(a1_iso(95)), 2), round(float(a1_iso(99)), 2)
    (0.64, 0.25)
    """
    R = np.asarray(reliability_pct, float)
    return 0.95 * (np.log(100.0 / R) / np.log(100.0 / 90.0)) ** (2.0 / 3.0) + 0.05


def weibull_factor(reliability_pct, *, x0: float = WEIBULL_X0, theta: float = WEIBULL_THETA,
                   b: float = WEIBULL_B):
    r"""Life at a reliability, as a multiple of the rating life, by the textbook Weibull model.

    .. math:: a_R = x_0 + (\theta - x_0)\,[\ln(1/R)]^{1/b}

    Parameters
    ----------
    reliability_pct : array_like
        Required reliability, [%]
    x0, theta, b : float
        Guaranteed life, characteristic life (both in multiples of the rating life) and shape
        of the Weibull distribution, [-]

    Notes
    -----
    Shigley, Mechanical Engineering Design, 9th ed., Sec. 11-4, Eq. 11-7 (memory). With the
    book's parameters a_R(90 %) = 0.993, not exactly 1.

    Examples
    --------
    >>> round(float(weibull_factor(99)), 4)
    0.2196
    """
    R = np.asarray(reliability_pct, float) / 100.0
    return x0 + (theta - x0) * np.log(1.0 / R) ** (1.0 / b)


# ISO 281 aISO coefficients per κ band (memory): (c1 ball, k, c1 roller)
_BANDS = ((0.1, 0.4, 2.2649, 0.054381, 1.3993), (0.4, 1.0, 1.9987, 0.19087, 1.2348),
          (1.0, 4.0, 1.9987, 0.071739, 1.2348))
_EDGES = np.array([0.4, 1.0])
_C1_BALL, _K, _C1_ROLLER = (np.array([b[j] for b in _BANDS]) for j in (2, 3, 4))


def a_iso(*, kappa, ec_Cu_P, roller):
    r"""Life modification factor aISO of ISO 281:2007 for radial bearings.

    .. math::
        a_{ISO,ball} = 0.1\left[1 - \left(2.5671 - \frac{c_1}{\kappa^{k}}\right)^{0.83}
                       \left(\frac{e_C C_u}{P}\right)^{1/3}\right]^{-9.3}

        a_{ISO,roller} = 0.1\left[1 - \left(1.5859 - \frac{c_1}{\kappa^{k}}\right)
                       \left(\frac{e_C C_u}{P}\right)^{0.4}\right]^{-9.185}

    with (c1, k) = (2.2649, 0.054381) for 0.1 ≤ κ < 0.4, (1.9987, 0.19087) for 0.4 ≤ κ < 1 and
    (1.9987, 0.071739) for 1 ≤ κ ≤ 4 (ball); roller c1 = 1.3993, 1.2348, 1.2348, same k.

    Parameters
    ----------
    kappa : array_like
        Viscosity ratio ν/ν1, [-]; above 4 it is taken as 4, below 0.1 as 0.1 (the method
        does not cover κ < 0.1: the caller warns)
    ec_Cu_P : array_like
        Contamination factor times fatigue load limit over equivalent load, [-]
    roller : bool or array_like
        Roller (True) or ball (False) bearing

    Returns
    -------
    aISO : ndarray
        Capped at 50 (ISO 281), [-]

    Examples
    --------
    With no load above the fatigue limit margin (ec·Cu/P = 0) aISO is 0.1 for every κ:

    >>> float(a_iso(kappa=1.0, ec_Cu_P=0.0, roller=False))
    0.1
    """
    k_ = np.clip(np.asarray(kappa, float), KAPPA_MIN, KAPPA_MAX)
    x = np.maximum(np.asarray(ec_Cu_P, float), 0.0)
    roller = np.asarray(roller, bool)
    band = np.searchsorted(_EDGES, k_, side="right")  # 0: κ < 0.4, 1: κ < 1, 2: κ ≥ 1
    c1b, kk, c1r = _C1_BALL[band], _K[band], _C1_ROLLER[band]
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        ball_in = 1.0 - np.maximum(2.5671 - c1b / k_ ** kk, 0.0) ** 0.83 * x ** (1.0 / 3.0)
        roll_in = 1.0 - np.maximum(1.5859 - c1r / k_ ** kk, 0.0) * x ** 0.4
        inner = np.where(roller, roll_in, ball_in)
        expo = np.where(roller, -9.185, -9.3)
        a = np.where(inner > 0.0, 0.1 * np.abs(inner) ** expo, np.inf)
    return np.minimum(a, AISO_MAX)


def mean_load(P_N, *, speed_rpm, time_fraction, p: float, axis: int = -1):
    r"""Revolution-weighted mean equivalent load of a duty cycle (Palmgren–Miner).

    .. math:: P_m = \left(\frac{\sum_j t_j n_j P_j^p}{\sum_j t_j n_j}\right)^{1/p}

    Parameters
    ----------
    P_N : array_like
        Equivalent load per case along ``axis``, [N]
    speed_rpm, time_fraction : array_like
        Speed [rpm] and time fraction [-] per case
    p : float
        Life exponent, [-]

    Returns
    -------
    Pm : ndarray
        Mean load, [N]; the life at the mean speed Σ t·n under Pm equals the Miner life.

    Examples
    --------
    Two equal-revolution cases at 1 and 2 kN, ball bearing: ((1 + 8)/2)^(1/3) kN

    >>> round(float(mean_load([1000.0, 2000.0], speed_rpm=[100, 100], time_fraction=[0.5, 0.5], p=3)), 3)
    1650.964
    """
    w = np.asarray(speed_rpm, float) * np.asarray(time_fraction, float)
    P = np.moveaxis(np.asarray(P_N, float), axis, -1)
    return (np.sum(w * P ** p, axis=-1) / np.sum(w)) ** (1.0 / p)


def miner_life_h(life_h, *, time_fraction, axis: int = -1):
    r"""Life of a duty cycle from the life of each case if run alone (Palmgren–Miner).

    .. math:: L = \left(\sum_j t_j / L_j\right)^{-1}

    Parameters
    ----------
    life_h : array_like
        Life of each case along ``axis`` (inf where a case does no damage), [h]
    time_fraction : array_like
        Share of time of each case, summing to 1, [-]

    Examples
    --------
    >>> round(float(miner_life_h([10000.0, 5000.0], time_fraction=[0.5, 0.5])), 6)
    6666.666667
    """
    L = np.moveaxis(np.asarray(life_h, float), axis, -1)
    with np.errstate(divide="ignore"):
        dmg = np.sum(np.asarray(time_fraction, float) / L, axis=-1)
        return 1.0 / dmg
