"""Equivalent dynamic load P (ISO 281) and static load P0 (ISO 76) for every bearing type.

Units: forces in N, angles in degrees. Every function broadcasts over numpy arrays, so a
whole catalogue (rows) times every load case (columns) is one call.

Public functions
----------------
deep_groove_e_Y        e and Y of a single-row deep groove ball bearing from f0·Fa/C0
angular_contact_factors e, X, Y (dynamic) and X0, Y0 (static) from the contact angle
dynamic_factors        the X1, Y1 (Fa/Fr <= e) and X2, Y2 (Fa/Fr > e) of one bearing type
equivalent_dynamic_load P = X·Fr + Y·Fa with the right branch per element
static_factors         X0, Y0 of one bearing type
equivalent_static_load P0 = max(X0·Fr + Y0·Fa, Fr) (single row) or Fr + Y0·Fa (pairs)

The tables are ISO 281:2007 Table 3 and ISO 76:2006 Table 1 as recalled (the standards were
not at hand: verify against them). The rotation factor of older texts is 1 here (ISO has none).
"""
from __future__ import annotations

import numpy as np

__all__ = [
    "SOURCE_P", "SOURCE_P0", "RADIAL_ONLY", "INDUCED_TYPES", "DOUBLE_ROW_TYPES",
    "DG_TABLE_F0FA_C0", "DG_TABLE_E", "DG_TABLE_Y", "AC_TABLE",
    "deep_groove_e_Y", "angular_contact_factors", "dynamic_factors",
    "equivalent_dynamic_load", "static_factors", "equivalent_static_load",
]

SOURCE_P = "ISO 281:2007 cl. 6.2 and Table 3 (values as recalled; verify against the standard)"
SOURCE_P0 = "ISO 76:2006 cl. 6 and Table 1 (values as recalled; verify against the standard)"

RADIAL_ONLY = ("cylindrical_roller", "needle_roller")
INDUCED_TYPES = ("angular_contact_ball", "tapered_roller")
DOUBLE_ROW_TYPES = ("self_aligning_ball", "spherical_roller")

# ISO 281 Table 3, single-row radial deep groove ball bearing (memory; X + Y·e ≈ 1 holds).
DG_TABLE_F0FA_C0 = np.array([0.172, 0.345, 0.689, 1.03, 1.38, 2.07, 3.45, 5.17, 6.89])
DG_TABLE_E = np.array([0.19, 0.22, 0.26, 0.28, 0.30, 0.34, 0.38, 0.42, 0.44])
DG_TABLE_Y = np.array([2.30, 1.99, 1.71, 1.55, 1.45, 1.31, 1.15, 1.04, 1.00])
DG_X2 = 0.56

# ISO 281 Table 3, angular contact ball bearings (memory). Columns:
# alpha, e, single X2, single Y2, pair Y1 (<= e), pair X2, pair Y2; ISO 76: single Y0.
AC_TABLE = np.array([
    # a    e     X2s   Y2s   Y1p   X2p   Y2p   Y0s
    [20, 0.57, 0.43, 1.00, 1.09, 0.70, 1.63, 0.42],
    [25, 0.68, 0.41, 0.87, 0.92, 0.67, 1.41, 0.38],
    [30, 0.80, 0.39, 0.76, 0.78, 0.63, 1.24, 0.33],
    [35, 0.95, 0.37, 0.66, 0.66, 0.60, 1.07, 0.29],
    [40, 1.14, 0.35, 0.57, 0.55, 0.57, 0.93, 0.26],
    [45, 1.34, 0.33, 0.50, 0.47, 0.54, 0.81, 0.22],
])
AC_ALPHA_MIN, AC_ALPHA_MAX = 20.0, 45.0

# X2 (Fa/Fr > e) of the types whose e and Y come from the table row (ISO 281 cl. 6.2.2, memory)
_X2_ROW = {"tapered_roller": 0.40, "spherical_roller": 0.67, "self_aligning_ball": 0.65}


def deep_groove_e_Y(f0_Fa_C0):
    """e and Y (for Fa/Fr > e) of a single-row deep groove ball bearing.

    Linear interpolation in ISO 281 Table 3 over f0·Fa/C0; outside the table the end values
    are held (common practice).

    Parameters
    ----------
    f0_Fa_C0 : array_like
        f0·Fa/C0, with f0 the bearing's ISO 76 factor, Fa [N] and C0 [N], [-]

    Returns
    -------
    e, Y : ndarray
        Limit of Fa/Fr and the axial factor for Fa/Fr > e (X = 0.56 there), [-]

    Examples
    --------
    >>> e, Y = deep_groove_e_Y(1.03)
    >>> float(e), float(Y)
    (0.28, 1.55)
    """
    x = np.asarray(f0_Fa_C0, dtype=float)
    return np.interp(x, DG_TABLE_F0FA_C0, DG_TABLE_E), np.interp(x, DG_TABLE_F0FA_C0, DG_TABLE_Y)


def _check_alpha(alpha_deg) -> np.ndarray:
    a = np.asarray(alpha_deg, dtype=float)
    if np.any((a < AC_ALPHA_MIN - 1e-9) | (a > AC_ALPHA_MAX + 1e-9)):
        raise ValueError(
            f"angular contact factors are tabulated here for contact angles {AC_ALPHA_MIN:g}–"
            f"{AC_ALPHA_MAX:g}°; below 20° ISO 281 makes them depend on i·Fa/C0, which is not "
            "implemented")
    return a


def angular_contact_factors(alpha_deg, *, paired: bool = False) -> dict[str, np.ndarray]:
    """Dynamic and static load factors of angular contact ball bearings from the contact angle.

    ISO 281 Table 3 rows for 20°–45° in steps of 5°, linearly interpolated between rows
    (interpolation between the listed angles is common practice). "paired" means two single
    bearings back-to-back or face-to-face at one position, or a double-row bearing; a tandem
    pair and two bearings at different positions each count as single.

    Parameters
    ----------
    alpha_deg : array_like
        Nominal contact angle, 20–45, [deg]
    paired : bool
        Factors of a pair (double row) instead of a single row

    Returns
    -------
    dict
        ``e, X1, Y1, X2, Y2, X0, Y0`` as arrays, [-]

    Examples
    --------
    >>> f = angular_contact_factors(40.0)
    >>> float(f["e"]), float(f["X2"]), float(f["Y2"])
    (1.14, 0.35, 0.57)
    """
    a = _check_alpha(alpha_deg)
    col = lambda k: np.interp(a, AC_TABLE[:, 0], AC_TABLE[:, k])  # noqa: E731
    e, Y0s = col(1), col(7)
    one, zero = np.ones_like(a), np.zeros_like(a)
    if paired:
        return {"e": e, "X1": one, "Y1": col(4), "X2": col(5), "Y2": col(6),
                "X0": one, "Y0": 2.0 * Y0s}
    return {"e": e, "X1": one, "Y1": zero, "X2": col(2), "Y2": col(3), "X0": 0.5 * one, "Y0": Y0s}


def dynamic_factors(bearing_type: str, *, Fa_N=0.0, C0_N=None, f0=None, contact_angle_deg=None,
                    e=None, Y1=None, Y2=None, paired: bool = False) -> dict[str, np.ndarray]:
    """The X and Y factors of ISO 281 cl. 6.2 for one bearing type, as arrays.

    - deep groove ball: X1 = 1, Y1 = 0; X2 = 0.56, e and Y2 from f0·Fa/C0 (Table 3);
    - angular contact ball: from the contact angle, single or paired (Table 3);
    - self-aligning ball (X2 = 0.65), spherical roller (X2 = 0.67): X1 = 1 and the row's
      e, Y1, Y2 (double row: Y1 = 0.42 or 0.45·cot α, Y2 = 0.65 or 0.67·cot α);
    - tapered roller: single row X1 = 1, Y1 = 0, X2 = 0.4, the row's e and Y2 (= 0.4·cot α);
      paired (two rows at one position) Y1 = 1.125·Y2, Y2 = 1.675·Y2 and X2 = 0.67, as
      ISO 281 gives 0.45·cot α and 0.67·cot α for double-row radial roller bearings;
    - cylindrical and needle roller: X = 1, Y = 0 (P = Fr; they carry no rated axial load).

    Parameters
    ----------
    bearing_type : str
        One of ``engine.model.BEARING_TYPES``
    Fa_N : array_like
        Axial load, only used by the deep groove table, [N]
    C0_N, f0 : array_like
        Static rating [N] and ISO 76 factor [-] (deep groove)
    contact_angle_deg : array_like
        Contact angle (angular contact) [deg]
    e, Y1, Y2 : array_like
        Row factors (self-aligning ball, tapered, spherical), [-]
    paired : bool
        Two rows at one position (angular contact and tapered only)

    Returns
    -------
    dict
        ``e, X1, Y1, X2, Y2`` broadcast arrays, [-]
    """
    if bearing_type == "deep_groove_ball":
        ee, yy = deep_groove_e_Y(np.asarray(f0, float) * np.asarray(Fa_N, float) / np.asarray(C0_N, float))
        return {"e": ee, "X1": 1.0, "Y1": 0.0, "X2": DG_X2, "Y2": yy}
    if bearing_type == "angular_contact_ball":
        f = angular_contact_factors(contact_angle_deg, paired=paired)
        return {k: f[k] for k in ("e", "X1", "Y1", "X2", "Y2")}
    if bearing_type == "tapered_roller":
        y2 = np.asarray(Y2, float)
        if paired:
            return {"e": np.asarray(e, float), "X1": 1.0, "Y1": 1.125 * y2, "X2": 0.67, "Y2": 1.675 * y2}
        return {"e": np.asarray(e, float), "X1": 1.0, "Y1": 0.0, "X2": 0.40, "Y2": y2}
    if bearing_type in DOUBLE_ROW_TYPES:
        return {"e": np.asarray(e, float), "X1": 1.0, "Y1": np.asarray(Y1, float),
                "X2": _X2_ROW[bearing_type], "Y2": np.asarray(Y2, float)}
    if bearing_type in RADIAL_ONLY:
        return {"e": np.inf, "X1": 1.0, "Y1": 0.0, "X2": 1.0, "Y2": 0.0}
    raise ValueError(f"unknown bearing type {bearing_type!r}")


def equivalent_dynamic_load(Fr_N, Fa_N, *, e, X1, Y1, X2, Y2) -> np.ndarray:
    r"""Equivalent dynamic radial load.

    .. math:: P = X_1 F_r + Y_1 F_a \;(F_a/F_r \le e), \qquad P = X_2 F_r + Y_2 F_a \;(F_a/F_r > e)

    Parameters
    ----------
    Fr_N, Fa_N : array_like
        Radial and axial load on the bearing, [N]
    e, X1, Y1, X2, Y2 : array_like
        Factors from :func:`dynamic_factors`, [-]

    Returns
    -------
    P : ndarray
        Equivalent dynamic load, [N]

    Notes
    -----
    ISO 281:2007 cl. 6.2 (memory). With Fr = 0 the branch Fa/Fr > e applies.

    Examples
    --------
    Tapered roller, Fr = 2 kN, Fa = 2.25 kN, e = 0.375, Y = 1.6 (derived check in
    references.md): P = 0.4·2000 + 1.6·2250

    >>> float(equivalent_dynamic_load(2000.0, 2250.0, e=0.375, X1=1, Y1=0, X2=0.4, Y2=1.6))
    4400.0
    """
    Fr = np.asarray(Fr_N, float)
    Fa = np.asarray(Fa_N, float)
    low = Fa <= np.asarray(e, float) * Fr
    return np.where(low, X1 * Fr + Y1 * Fa, X2 * Fr + Y2 * Fa)


def static_factors(bearing_type: str, *, contact_angle_deg=None, Y0=None,
                   paired: bool = False) -> tuple[np.ndarray | float, np.ndarray | float, bool]:
    """X0, Y0 of ISO 76 and whether P0 is floored at Fr (single-row radial bearings).

    deep groove X0 = 0.6, Y0 = 0.5; angular contact single X0 = 0.5, Y0 by angle (0.38 at 25°,
    0.26 at 40°), pair X0 = 1, Y0 doubled; tapered single X0 = 0.5, the row's Y0
    (0.22·cot α), paired X0 = 1, 2·Y0; self-aligning ball and spherical roller (double row)
    X0 = 1, the row's Y0 (0.44·cot α); cylindrical and needle X0 = 1, Y0 = 0 (memory).

    Returns
    -------
    X0, Y0, floor : the factors [-] and True where ISO 76 sets P0 = Fr if X0·Fr + Y0·Fa < Fr
    """
    if bearing_type == "deep_groove_ball":
        return 0.6, 0.5, True
    if bearing_type == "angular_contact_ball":
        f = angular_contact_factors(contact_angle_deg, paired=paired)
        return f["X0"], f["Y0"], not paired
    if bearing_type == "tapered_roller":
        y0 = np.asarray(Y0, float)
        return (1.0, 2.0 * y0, False) if paired else (0.5, y0, True)
    if bearing_type in DOUBLE_ROW_TYPES:
        return 1.0, np.asarray(Y0, float), False
    if bearing_type in RADIAL_ONLY:
        return 1.0, 0.0, False
    raise ValueError(f"unknown bearing type {bearing_type!r}")


def equivalent_static_load(Fr_N, Fa_N, *, X0, Y0, floor: bool) -> np.ndarray:
    r"""Static equivalent radial load (ISO 76:2006 cl. 6.1, memory).

    .. math:: P_0 = \max(X_0 F_r + Y_0 F_a,\; F_r) \text{ (single row)}, \quad
              P_0 = X_0 F_r + Y_0 F_a \text{ (double row, } X_0 = 1)

    Parameters
    ----------
    Fr_N, Fa_N : array_like
        Radial and axial load, [N]
    X0, Y0 : array_like
        Static factors from :func:`static_factors`, [-]
    floor : bool
        Apply P0 >= Fr

    Examples
    --------
    Deep groove, Fr = 1000 N, Fa = 200 N: 0.6·1000 + 0.5·200 = 700 < 1000, so P0 = Fr

    >>> float(equivalent_static_load(1000.0, 200.0, X0=0.6, Y0=0.5, floor=True))
    1000.0
    """
    Fr = np.asarray(Fr_N, float)
    P0 = X0 * Fr + Y0 * np.asarray(Fa_N, float)
    return np.maximum(P0, Fr) if floor else P0
