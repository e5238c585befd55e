"""Screen and rank catalogue rows for one support: every row × every load case as arrays.

Units: N, mm, rpm, h. Arrays are (n_rows, n_cases) inside; results per row are (n_rows,).
No Python loop runs over rows. Given radial loads of many variants of a design at once
(Fr (n_variants, n_cases)), every array gains that leading axis: (n_variants, n_rows, …).

For each row of the support's type: the equivalent dynamic load P per case (ISO 281, the
row's own factors), the revolution-weighted mean load Pm, the basic life L10_h of the duty
cycle (Palmgren–Miner), the modified life Lnm_h = a_R·aISO·L10 per case combined by Miner
(a_R = ISO a1 or the textbook Weibull factor; aISO only when lubricant and contamination are
given), the static safety s0 = C0/max P0 and the highest case speed against the row's limiting
speed. A row passes when Lnm_h ≥ the required life, s0 ≥ s0_min and the speed is within the
limit. Ranking: rows that pass first, then by outer diameter, width, and longer life first.

Public: :class:`Screen`, :func:`screen_rows`, :func:`rank`, :func:`smallest_by_series`,
``LIFE_CAP_H``.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from engine.bearings.catalogue import Catalogue
from engine.bearings.equivalent import (dynamic_factors, equivalent_dynamic_load,
                                        equivalent_static_load, static_factors)
from engine.bearings.life import BALL_TYPES, a_iso, life_exponent, life_hours, mean_load, miner_life_h
from engine.bearings.lubrication import rated_viscosity

__all__ = ["Screen", "screen_rows", "rank", "smallest_by_series", "pair_rating_factors", "LIFE_CAP_H"]

LIFE_CAP_H = 1e12  # lives above this (unloaded bearings) are reported as this value


@dataclass(frozen=True)
class Screen:
    """Per-row screening results (rows = ``idx`` into the catalogue)."""

    idx: np.ndarray
    C_N: np.ndarray
    C0_N: np.ndarray
    Fa_N: np.ndarray        # (n_rows, n_cases) axial load carried (before application factor)
    P_N: np.ndarray         # (n_rows, n_cases) equivalent dynamic load, application factor applied
    P0_N: np.ndarray        # (n_rows, n_cases)
    Pm_N: np.ndarray
    L10_h: np.ndarray
    Lnm_h: np.ndarray
    a_iso_eff: np.ndarray   # Lnm/(a_R·L10): the duty-cycle effective aISO (1 when not used)
    kappa_min: np.ndarray   # lowest κ over the cases (nan when not used)
    s0: np.ndarray
    worst_static_case: np.ndarray
    n_max_rpm: float
    limiting_speed_rpm: np.ndarray
    life_ok: np.ndarray
    static_ok: np.ndarray
    speed_ok: np.ndarray
    ok: np.ndarray
    required_C_N: np.ndarray     # with the row's own aISO (what C must be for Lnm = the required life)
    required_C1_N: np.ndarray    # with aISO = 1: the rating a designer compares bearings against


def pair_rating_factors(bearing_type: str) -> tuple[float, float]:
    """Rating multipliers of two identical rows mounted as a unit (ISO 281 cl. 6.1, ISO 76):
    C × 2^0.7 (ball) or 2^(7/9) (roller), C0 × 2."""
    return (2.0 ** 0.7 if bearing_type in BALL_TYPES else 2.0 ** (7.0 / 9.0)), 2.0


def screen_rows(cat: Catalogue, idx: np.ndarray, *, bearing_type: str, Fr_N, Fa_N, speed_rpm,
                time_fraction, life_h: float, a_R: float, s0_min: float,
                application_factor: float = 1.0, paired: bool = False,
                nu_mm2_s: float | None = None, ec: float | None = None) -> Screen:
    """Screen catalogue rows ``idx`` of one type against a support's duty cycle.

    Parameters
    ----------
    cat : Catalogue
    idx : ndarray of int
        Catalogue rows to screen (all of ``bearing_type``)
    Fr_N : array_like (n_cases,), or (n_variants, n_cases) for many variants at once
        Radial load per case, [N]
    Fa_N : array_like (n_cases,) or (n_rows, n_cases); with variants (n_variants, 1 or n_rows, n_cases)
        Axial load carried per case (per row where induced forces depend on the row), [N]
    speed_rpm, time_fraction : array_like (n_cases,)
        Speed [rpm] and share of time [-] of each case
    life_h : float
        Required life at the stated reliability, [h]
    a_R : float
        Reliability life factor (a1 or Weibull), [-]
    s0_min : float
        Minimum static safety, [-]
    application_factor : float
        Multiplies Fr and Fa for both P and P0, [-]
    paired : bool
        Two rows as a matched unit at one position (angular contact, tapered)
    nu_mm2_s, ec : float, optional
        Operating viscosity [mm²/s] and contamination factor [-]; both given -> aISO

    Returns
    -------
    Screen
        Per-row arrays (n_rows,) and per row and case (n_rows, n_cases); with variants a
        leading (n_variants,) axis on each (``idx``, ``C_N``, ``C0_N``, ``limiting_speed_rpm``
        and ``n_max_rpm`` are shared)
    """
    idx = np.asarray(idx, dtype=int)
    col = lambda a: a[idx][:, None]  # noqa: E731  (n_rows, 1)
    Fr = application_factor * np.asarray(Fr_N, float)[..., None, :]
    Fa = application_factor * np.broadcast_to(np.asarray(Fa_N, float), Fr.shape[:-2] + (idx.size, Fr.shape[-1]))
    n = np.asarray(speed_rpm, float)
    t = np.asarray(time_fraction, float)
    kc, k0 = pair_rating_factors(bearing_type) if paired else (1.0, 1.0)
    C, C0, Cu = kc * col(cat.C_N), k0 * col(cat.C0_N), k0 * col(cat.Cu_N)

    fac = dynamic_factors(bearing_type, Fa_N=Fa, C0_N=C0, f0=col(cat.f0),
                          contact_angle_deg=col(cat.contact_angle_deg), e=col(cat.e),
                          Y1=col(cat.Y1), Y2=col(cat.Y2), paired=paired)
    P = equivalent_dynamic_load(Fr, Fa, **fac)
    X0, Y0, floor = static_factors(bearing_type, contact_angle_deg=col(cat.contact_angle_deg),
                                   Y0=col(cat.Y0), paired=paired)
    P0 = equivalent_static_load(Fr, Fa, X0=X0, Y0=Y0, floor=floor)

    p = life_exponent(bearing_type)
    with np.errstate(divide="ignore", invalid="ignore"):
        L10_case = life_hours((C / P) ** p, n)                     # (rows, cases), inf if P = 0
        Pm = mean_load(P, speed_rpm=n, time_fraction=t, p=p)
        L10 = miner_life_h(L10_case, time_fraction=t)
        if nu_mm2_s is not None and ec is not None:
            dm = 0.5 * (col(cat.d_mm) + col(cat.D_mm))
            kappa = nu_mm2_s / rated_viscosity(n[None, :], dm)
            aiso = a_iso(kappa=kappa, ec_Cu_P=ec * Cu / P, roller=bearing_type not in BALL_TYPES)
            Lnm = miner_life_h(a_R * aiso * L10_case, time_fraction=t)
            kmin = np.broadcast_to(kappa.min(axis=-1), Lnm.shape)
        else:
            Lnm = a_R * L10
            kmin = np.full(Lnm.shape, np.nan)
        a_eff = np.where(np.isfinite(Lnm) & (L10 > 0), Lnm / (a_R * L10), 1.0)
        P0max = P0.max(axis=-1)
        s0 = np.where(P0max > 0, C0[:, 0] / P0max, np.inf)
        req_C = np.where(np.isfinite(Lnm) & (Lnm > 0), C[:, 0] * (life_h / Lnm) ** (1.0 / p), 0.0)
        # aISO = 1: L10 ∝ C^p at a given duty cycle, so a_R·L10(C_req) = life_h
        req_C1 = np.where(np.isfinite(L10) & (L10 > 0), C[:, 0] * (life_h / (a_R * L10)) ** (1.0 / p), 0.0)
    nlim = cat.limiting_speed_rpm[idx]
    n_max = float(n.max())
    life_ok = Lnm >= life_h * (1.0 - 1e-12)
    static_ok = s0 >= s0_min * (1.0 - 1e-12)
    speed_ok = np.broadcast_to(~(n_max > nlim), life_ok.shape)  # NaN limit -> not checked -> passes
    return Screen(idx=idx, C_N=C[:, 0], C0_N=C0[:, 0], Fa_N=Fa / application_factor, P_N=P,
                  P0_N=P0, Pm_N=Pm, L10_h=np.minimum(L10, LIFE_CAP_H),
                  Lnm_h=np.minimum(Lnm, LIFE_CAP_H), a_iso_eff=a_eff, kappa_min=kmin, s0=s0,
                  worst_static_case=P0.argmax(axis=-1), n_max_rpm=n_max, limiting_speed_rpm=nlim,
                  life_ok=life_ok, static_ok=static_ok, speed_ok=speed_ok,
                  ok=life_ok & static_ok & speed_ok, required_C_N=req_C, required_C1_N=req_C1)


def rank(cat: Catalogue, sc: Screen, among: np.ndarray) -> np.ndarray:
    """Order of the screened positions ``among`` (indices into ``sc`` arrays): passing rows
    first, then by outer diameter D, width B, and longer modified life first."""
    among = np.asarray(among, dtype=int)
    rows = sc.idx[among]
    order = np.lexsort((-sc.Lnm_h[among], cat.B_mm[rows], cat.D_mm[rows], ~sc.ok[among]))
    return among[order]


def smallest_by_series(cat: Catalogue, sc: Screen, series_list: list[str]) -> list[tuple[str, int | None]]:
    """For each dimension series, the screened position of the smallest bore that passes."""
    out = []
    ser = cat.series[sc.idx]
    d = cat.d_mm[sc.idx]
    for s in series_list:
        m = np.flatnonzero((ser == s) & sc.ok)
        out.append((s, int(m[np.argmin(d[m])]) if m.size else None))
    return out
