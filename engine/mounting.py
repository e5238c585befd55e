"""The shaft as mounted: parallel keys, press fits, bearing seats and shoulders, overlaps,
ISO 286 fits for the bearing seats, and the angle of twist.

Units inside: mm, N, N·mm, MPa, µm for interferences and tolerances, rad (degrees in the
messages). Every table below is as recalled (memory), not read from the standard: the note
says so, and every value carries its source.

Public names
------------
- :data:`KEY_TABLE`, :data:`KEY_LENGTHS`, :func:`key_size`, :func:`key_length` — DIN 6885-1
  parallel keys (the same sizes as ISO/R 773).
- :func:`key_stresses` — bearing pressure on the shaft keyseat, the hub keyway and the key
  flank, and the key's shear stress (Shigley §7-7; contact heights after DIN 6892).
- :data:`IT_UM`, :func:`shaft_deviations`, :func:`hole_deviations`, :func:`fit_interference`
  — ISO 286-1 tolerance grades and fundamental deviations for the fits a hub or a bearing seat
  uses.
- :func:`lame_pressure`, :func:`press_fit_capacity`, :func:`press_fit_stresses` — thick-cylinder
  press fit (Lamé; Shigley §3-16, §7-8; DIN 7190).
- :func:`propose_fits` — shaft and housing tolerance classes for a rolling bearing.
- :func:`twist_angles` — θ = ∫T/(G·J) dx between the torque-carrying elements.
- :func:`hub_sections` — the notch sections at hub ends and keyseat ends (used by
  :mod:`engine.checks`).
- :func:`mounting` — every mounting check of a solved design and the ``mounting`` part of the
  result; :func:`place_checks` — ``x_mm`` on every check that applies at a place.

References
----------
.. [1] Budynas, R. G., Nisbett, J. K., *Shigley's Mechanical Engineering Design*, 9th ed.,
   McGraw-Hill, 2011: §3-16 (press and shrink fits, Eqs. 3-49 to 3-58), §7-7 (keys,
   Example 7-6), §7-8 (limits and fits, Table 7-9, Eq. 7-40 torque capacity); Table 7-1
   (keyseat Kt). Numbers as recalled (memory).
.. [2] DIN 6885-1 (1968) Parallel keys, keyways, deep pattern: sizes b × h, keyseat depths
   t1, t2 by shaft diameter, standard lengths (memory).
.. [3] DIN 6892 (2012) Parallel keys — calculation and design, method C: bearing pressure on
   the load-bearing height, load share 0.75 for two keys (memory).
.. [4] ISO 286-1:2010 / ISO 286-2:2010 Geometrical product specifications — ISO code system
   for tolerances on linear sizes: standard tolerance grades IT, fundamental deviations
   (memory).
.. [5] DIN 7190-1 (2017) Interference fits — calculation and design rules (memory).
"""
from __future__ import annotations

import bisect
import math
import re
from dataclasses import dataclass
from typing import Any, Iterable

import numpy as np

from engine import strength
from engine.result import (BearingFits, Check, KeyRating, Mounting, PressFitRating, SeatRow,
                           TwistSpan)

__all__ = [
    "KEY_TABLE", "KEY_LENGTHS", "KEY_SY_MPA", "KEY_SOURCE", "key_size", "key_length", "key_stresses",
    "IT_UM", "SIZE_STEPS_MM", "shaft_deviations", "hole_deviations", "fit_interference", "FIT_SOURCE",
    "lame_pressure", "press_fit_capacity", "press_fit_stresses", "SLIP_SAFETY_MIN",
    "FITS_SOURCE", "load_band", "propose_fits",
    "TWIST_LIMIT_DEG_PER_M", "twist_angles",
    "HubSection", "hub_sections", "ABUTMENT_RULE", "abutment_range",
    "MountingOutcome", "mounting", "place_checks", "CODES_AT_LEAST",
]

# --- parallel keys ---------------------------------------------------------------------------

KEY_SOURCE = "DIN 6885-1 parallel keys (memory)"
# (shaft d over, up to and including [mm], b, h, t1 shaft keyseat depth, t2 hub keyway depth) [mm]
KEY_TABLE: tuple[tuple[float, float, float, float, float, float], ...] = (
    (6, 8, 2, 2, 1.2, 1.0), (8, 10, 3, 3, 1.8, 1.4), (10, 12, 4, 4, 2.5, 1.8),
    (12, 17, 5, 5, 3.0, 2.3), (17, 22, 6, 6, 3.5, 2.8), (22, 30, 8, 7, 4.0, 3.3),
    (30, 38, 10, 8, 5.0, 3.3), (38, 44, 12, 8, 5.0, 3.3), (44, 50, 14, 9, 5.5, 3.8),
    (50, 58, 16, 10, 6.0, 4.3), (58, 65, 18, 11, 7.0, 4.4), (65, 75, 20, 12, 7.5, 4.9),
    (75, 85, 22, 14, 9.0, 5.4), (85, 95, 25, 14, 9.0, 5.4), (95, 110, 28, 16, 10.0, 6.4),
    (110, 130, 32, 18, 11.0, 7.4), (130, 150, 36, 20, 12.0, 8.4), (150, 170, 40, 22, 13.0, 9.4),
    (170, 200, 45, 25, 15.0, 10.4), (200, 230, 50, 28, 17.0, 11.4),
)
# standard key lengths [mm] (DIN 6885-1, memory)
KEY_LENGTHS: tuple[float, ...] = (6, 8, 10, 12, 14, 16, 18, 20, 22, 25, 28, 32, 36, 40, 45, 50, 56, 63, 70,
                                  80, 90, 100, 110, 125, 140, 160, 180, 200, 220, 250, 280, 320, 360, 400)
KEY_SY_MPA = 350.0  # key steel (C45 / E335 bright drawn): Sy about 350 MPa (common practice, memory)
HUB_LENGTH_PER_D = 1.5  # hub length where none is given: about 1.5·d (common practice)
KEY_METHOD = ("Shigley 9th ed. §7-7 (key shear F/(b·l) against 0.577·Sy, bearing F/(l·contact height) "
              "against Sy); contact heights t1 and h − t1 and two-key load share 0.75 after DIN 6892 "
              "method C (memory)")


@dataclass(frozen=True)
class KeySize:
    b_mm: float
    h_mm: float
    t1_mm: float
    t2_mm: float


def key_size(d_mm: float) -> KeySize | None:
    """Standard parallel key for a shaft diameter, DIN 6885-1 [2] (memory); None outside 6–230 mm.

    >>> key_size(32)        # 30 < d ≤ 38: 10 × 8, keyseat 5 mm
    KeySize(b_mm=10, h_mm=8, t1_mm=5.0, t2_mm=3.3)
    """
    for lo, hi, b, h, t1, t2 in KEY_TABLE:
        if lo < d_mm <= hi:
            return KeySize(b, h, t1, t2)
    return None


def key_length(space_mm: float) -> float | None:
    """The longest standard key length that fits in ``space_mm`` (DIN 6885-1 [2]); None if none does.

    >>> key_length(50), key_length(47.5)
    (50, 45)
    """
    i = bisect.bisect_right(KEY_LENGTHS, space_mm + 1e-9)
    return KEY_LENGTHS[i - 1] if i else None


def key_stresses(*, T_Nmm, d_mm: float, b_mm: float, h_mm: float, t1_mm: float, bearing_length_mm: float,
                 count: int = 1):
    """Bearing pressures and shear of a parallel key transmitting torque T.

    .. math:: F = \\frac{2T}{d\\,i\\,\\varphi},\\quad p_{shaft} = \\frac{F}{t_1 l},\\quad
              p_{hub} = \\frac{F}{(h - t_1) l},\\quad p_{key} = \\frac{F}{\\min(t_1, h - t_1)\\,l},
              \\quad \\tau = \\frac{F}{b\\,l}

    F is the tangential force at the shaft surface (Shigley [1] §7-7), i the number of keys,
    φ = 1 for one key and 0.75 for two (DIN 6892 [3], memory); l the bearing length (the key
    length, less b for round-ended keys). The key flank carries F on both contact heights; its
    pressure is that on the smaller one. Returns (F [N], p_shaft, p_hub, p_key, τ [MPa]).

    Shigley [1] Example 7-6 (memory): T = 4200 lbf·in on a 1 7/16 in shaft gives F = 5840 lbf;
    a 3/8 in square key 1.34 in long bears at 5840/(1.34·0.1875) = 23.2 kpsi (the units
    only need to agree):

    >>> F, ps, ph, pk, tau = key_stresses(T_Nmm=4200, d_mm=1.4375, b_mm=0.375, h_mm=0.375,
    ...                                   t1_mm=0.1875, bearing_length_mm=1.34)
    >>> round(float(F)), round(float(pk))
    (5843, 23258)
    """
    phi = 1.0 if count == 1 else 0.75
    F = 2.0 * np.abs(np.asarray(T_Nmm, float)) / (d_mm * count * phi)
    l = bearing_length_mm
    return F, F / (t1_mm * l), F / ((h_mm - t1_mm) * l), F / (min(t1_mm, h_mm - t1_mm) * l), F / (b_mm * l)


# --- ISO 286 ---------------------------------------------------------------------------------

FIT_SOURCE = "ISO 286-1/-2 tolerance grades and fundamental deviations (memory)"
# upper ends of the nominal size steps [mm], the fine steps used by r, s, t, u above 10 mm
SIZE_STEPS_MM = (3, 6, 10, 14, 18, 24, 30, 40, 50, 65, 80, 100, 120, 140, 160, 180, 200, 225, 250, 280, 315,
                 355, 400, 450, 500)
# main steps of the IT grades: ≤3, 3–6, 6–10, 10–18, 18–30, 30–50, 50–80, 80–120, 120–180,
# 180–250, 250–315, 315–400, 400–500 [µm] (ISO 286-1 Table 1, memory)
_MAIN = (3, 6, 10, 18, 30, 50, 80, 120, 180, 250, 315, 400, 500)
IT_UM: dict[int, tuple[float, ...]] = {
    4: (3, 4, 4, 5, 6, 7, 8, 10, 12, 14, 16, 18, 20),
    5: (4, 5, 6, 8, 9, 11, 13, 15, 18, 20, 23, 25, 27),
    6: (6, 8, 9, 11, 13, 16, 19, 22, 25, 29, 32, 36, 40),
    7: (10, 12, 15, 18, 21, 25, 30, 35, 40, 46, 52, 57, 63),
    8: (14, 18, 22, 27, 33, 39, 46, 54, 63, 72, 81, 89, 97),
}
# fundamental deviations of shafts on the main steps [µm]: es for f, g, h; ei for k, m, n, p
# (k: grades 4–7) (ISO 286-1 Table 2, memory)
_DEV_MAIN: dict[str, tuple[float, ...]] = {
    "f": (-6, -10, -13, -16, -20, -25, -30, -36, -43, -50, -56, -62, -68),
    "g": (-2, -4, -5, -6, -7, -9, -10, -12, -14, -15, -17, -18, -20),
    "h": (0,) * 13,
    "k": (0, 1, 1, 1, 2, 2, 2, 3, 3, 4, 4, 4, 5),
    "m": (2, 4, 6, 7, 8, 9, 11, 13, 15, 17, 20, 21, 23),
    "n": (4, 8, 10, 12, 15, 17, 20, 23, 27, 31, 34, 37, 40),
    "p": (6, 12, 15, 18, 22, 26, 32, 37, 43, 50, 56, 62, 68),
}
# ei of r, s, u on the fine steps (SIZE_STEPS_MM) [µm] (ISO 286-1 Table 2, memory)
_DEV_FINE: dict[str, tuple[float, ...]] = {
    "r": (10, 15, 19, 23, 23, 28, 28, 34, 34, 41, 43, 51, 54, 63, 65, 68, 77, 80, 84, 94, 98, 108, 114, 126, 132),
    "s": (14, 19, 23, 28, 28, 35, 35, 43, 43, 53, 59, 71, 79, 92, 100, 108, 122, 130, 140, 158, 170, 190, 208,
          232, 252),
    "u": (18, 23, 28, 33, 33, 41, 48, 60, 70, 87, 102, 124, 144, 170, 190, 210, 236, 258, 284, 315, 350, 390,
          435, 490, 540),
}
SHAFT_LETTERS = tuple(_DEV_MAIN) + ("js",) + tuple(_DEV_FINE)
_CLASS = re.compile(r"^([a-zA-Z]{1,2})(\d{1,2})$")


def _step(d_mm: float, steps: tuple) -> int:
    if not 0 < d_mm <= steps[-1]:
        raise ValueError(f"{d_mm:g} mm lies outside the ISO 286 table here (up to {steps[-1]} mm)")
    return bisect.bisect_left(steps, d_mm)


def _it(grade: int, d_mm: float) -> float:
    if grade not in IT_UM:
        raise ValueError(f"IT{grade} is not in the table here (IT{min(IT_UM)} to IT{max(IT_UM)})")
    return IT_UM[grade][_step(d_mm, _MAIN)]


def shaft_deviations(cls: str, d_mm: float) -> tuple[float, float]:
    """(ei, es) [µm] of a shaft tolerance class such as ``"s6"`` at nominal size d (ISO 286 [4]).

    >>> shaft_deviations("s6", 50), shaft_deviations("k5", 40), shaft_deviations("h6", 30)
    ((43, 59), (2, 13), (-13, 0))
    """
    m = _CLASS.match(cls)
    if not m:
        raise ValueError(f"'{cls}' is not a tolerance class (a letter and a grade, e.g. k5)")
    letter, grade = m.group(1), int(m.group(2))
    it = _it(grade, d_mm)
    if letter == "js":
        return -it / 2, it / 2
    if letter in ("f", "g", "h"):
        es = _DEV_MAIN[letter][_step(d_mm, _MAIN)]
        return es - it, es
    if letter in _DEV_MAIN:
        ei = _DEV_MAIN[letter][_step(d_mm, _MAIN)]
        if letter == "k" and grade > 7:
            ei = 0.0
        return ei, ei + it
    if letter in _DEV_FINE:
        ei = _DEV_FINE[letter][_step(d_mm, SIZE_STEPS_MM)]
        return ei, ei + it
    raise ValueError(f"shaft class '{cls}' is not in the table here (letters {', '.join(SHAFT_LETTERS)})")


def hole_deviations(cls: str, d_mm: float) -> tuple[float, float]:
    """(EI, ES) [µm] of a hole class of the basic-hole system, ``"H7"`` etc.: EI = 0, ES = IT
    (ISO 286 [4]).

    >>> hole_deviations("H7", 50)
    (0, 25)
    """
    m = _CLASS.match(cls)
    if not m or m.group(1) != "H":
        raise ValueError(f"hole class '{cls}' is not one the table here has (H6, H7 or H8)")
    return 0, _it(int(m.group(2)), d_mm)


def fit_interference(fit: str, d_mm: float) -> tuple[float, float]:
    """Smallest and largest diametral interference [µm] of a basic-hole fit such as ``"H7/s6"``:
    δmin = ei − ES, δmax = es − EI (ISO 286 [4]; Shigley [1] §7-8, Eqs. 7-38, 7-39).

    Shigley [1] Table 7-9's H7/s6 at 50 mm (memory): hole 50.000–50.025, shaft 50.043–50.059:

    >>> fit_interference("H7/s6", 50)
    (18, 59)
    """
    hole, shaft = fit.split("/")
    EI, ES = hole_deviations(hole, d_mm)
    ei, es = shaft_deviations(shaft, d_mm)
    return ei - ES, es - EI


# --- press fits ----------------------------------------------------------------------------------

SLIP_SAFETY_MIN = 1.5  # against slip of a press fit: 1.5 (common practice; DIN 7190 suggests 1.5–2, memory)
PRESS_FIT_SOURCE = ("Lamé thick cylinders, Shigley 9th ed. Eq. 3-56; torque π/2·f·p·d²·l "
                    "(Shigley §7-8, Eq. 7-40); DIN 7190 (memory)")
HUB_OD_PER_D = 2.0  # hub outer diameter where none is given: 2·d (common practice)


def lame_pressure(*, interference_mm, d_mm: float, shaft_bore_mm: float, hub_outer_d_mm: float,
                  E_shaft_MPa: float, E_hub_MPa: float, nu_shaft: float = 0.3, nu_hub: float = 0.3):
    """Contact pressure of a press fit by Lamé's thick-cylinder equations (Shigley [1] Eq. 3-56):

    .. math:: p = \\frac{\\delta}{\\frac{d}{E_o}\\left(\\frac{d_o^2 + d^2}{d_o^2 - d^2} + \\nu_o\\right)
                  + \\frac{d}{E_i}\\left(\\frac{d^2 + d_i^2}{d^2 - d_i^2} - \\nu_i\\right)}

    δ the diametral interference [mm] (Shigley writes it with radii and the radial δ; the same),
    d the fit diameter, d_i the shaft's bore (0: solid), d_o the hub's outer diameter [mm];
    E [MPa]. Returns p [MPa]. No smoothing of the surfaces is subtracted (DIN 7190 takes about
    0.8·(Rz_shaft + Rz_hub) off δ: enter ``interference_um`` to allow for it).
    """
    d, di, do = d_mm, shaft_bore_mm, hub_outer_d_mm
    hub = d / E_hub_MPa * ((do**2 + d**2) / (do**2 - d**2) + nu_hub)
    shaft = d / E_shaft_MPa * ((d**2 + di**2) / (d**2 - di**2) - nu_shaft)
    return np.asarray(interference_mm, float) / (hub + shaft)


def press_fit_capacity(*, p_MPa, d_mm: float, length_mm: float, friction: float):
    """Torque and axial force a press fit carries before it slips:
    T = (π/2)·f·p·d²·l [N·mm], F = π·f·p·d·l [N] (Shigley [1] Eq. 7-40; DIN 7190 [5])."""
    p = np.asarray(p_MPa, float)
    return math.pi / 2 * friction * p * d_mm**2 * length_mm, math.pi * friction * p * d_mm * length_mm


def press_fit_stresses(*, p_MPa, d_mm: float, shaft_bore_mm: float, hub_outer_d_mm: float):
    """Von Mises stress at the hub's bore and at the shaft's most stressed point (Shigley [1]
    Eqs. 3-58, 3-59):

    hub bore: σt = p(d_o² + d²)/(d_o² − d²), σr = −p;
    solid shaft: σt = σr = −p (von Mises p); hollow shaft, at its bore: σt = −2p·d²/(d² − d_i²).
    Returns (σ'_hub, σ'_shaft) [MPa].
    """
    p = np.asarray(p_MPa, float)
    d, di, do = d_mm, shaft_bore_mm, hub_outer_d_mm
    st = p * (do**2 + d**2) / (do**2 - d**2)
    hub = np.sqrt(st**2 + st * p + p**2)
    shaft = p if di <= 0 else 2 * p * d**2 / (d**2 - di**2)
    return hub, shaft


# --- bearing seat fits ---------------------------------------------------------------------------

FITS_SOURCE = ("common practice: the general rolling-bearing seat-fit table (ring load rotating or "
               "stationary, load P/C, bearing type, bore), ISO 286 classes (memory)")
BALL_TYPES = ("deep_groove_ball", "angular_contact_ball", "self_aligning_ball")
# rotating inner ring load, solid steel shaft: (bore up to [mm], shaft class) by type and load band
_ROTATING_INNER = {
    ("ball", "light"): ((17, "js5"), (100, "j6"), (140, "k6"), (math.inf, "m6")),
    ("ball", "normal"): ((10, "js5"), (17, "j5"), (100, "k5"), (140, "m5"), (math.inf, "m6")),
    ("ball", "heavy"): ((17, "k5"), (100, "m5"), (math.inf, "m6")),
    ("roller", "light"): ((25, "j6"), (60, "k6"), (140, "m6"), (math.inf, "n6")),
    ("roller", "normal"): ((40, "k5"), (65, "m5"), (100, "m6"), (140, "n6"), (280, "p6"), (math.inf, "r6")),
    ("roller", "heavy"): ((40, "m5"), (65, "n6"), (140, "p6"), (math.inf, "r6")),
}
# housing, by the outer ring's load: stationary (the usual rotating shaft) or rotating
_HOUSING = {"stationary": {"light": "H7", "normal": "H7", "heavy": "H7"},
            "rotating": {"light": "K7", "normal": "M7", "heavy": "N7"}}


def load_band(P_over_C: float | None) -> str:
    """light P ≤ 0.06·C, normal up to 0.12·C, heavy above (common practice, memory)."""
    if P_over_C is None:
        return "normal"
    return "light" if P_over_C <= 0.06 else ("normal" if P_over_C <= 0.12 else "heavy")


def propose_fits(*, bearing_type: str, bore_mm: float, P_over_C: float | None, inner_ring_load: str = "rotating",
                 floating: bool = False) -> tuple[str, str, str]:
    """Shaft and housing tolerance classes for a rolling bearing (common practice, memory).

    Rotating inner ring load (the shaft turns under a load of fixed direction): an interference
    fit on the shaft, tighter with the load band and the bore, roller bearings a step tighter
    than ball bearings; the housing H7. Stationary inner ring load (the shaft stands, the
    housing turns, or the load turns with the shaft's unbalance): shaft g6 where the ring must
    slide (a floating bearing), else h6; the housing K7/M7/N7 by the band.

    >>> propose_fits(bearing_type="deep_groove_ball", bore_mm=40, P_over_C=0.09)[:2]
    ('k5', 'H7')
    """
    band = load_band(P_over_C)
    if inner_ring_load == "stationary":
        shaft = "g6" if floating else "h6"
        housing = _HOUSING["rotating"][band]
        why = f"stationary inner ring load, {band} load"
    else:
        family = "ball" if bearing_type in BALL_TYPES else "roller"
        shaft = next(c for upto, c in _ROTATING_INNER[(family, band)] if bore_mm <= upto)
        housing = _HOUSING["stationary"][band]
        why = f"rotating inner ring load, {band} load, {family} bearing, bore {bore_mm:g} mm"
    if P_over_C is not None:
        why += f" (P/C = {P_over_C:.3f})"
    else:
        why += " (no rating C: normal load assumed)"
    return shaft, housing, why


# --- twist ---------------------------------------------------------------------------------------

TWIST_LIMIT_DEG_PER_M = 0.25  # transmission shafts: 0.25°/m (common practice, memory)
TWIST_SOURCE = "θ = ∫T/(G·J) dx (Shigley 9th ed. Eq. 4-5 per span, memory); limit "


def twist_angles(*, T_Nmm, le_mm, J_mm4, G_MPa: float, first_el: int, last_el: int):
    """Angle of twist [rad] over the mesh elements first_el … last_el − 1, every load case:
    θ = Σ T·l/(G·J) (Shigley [1] Eq. 4-5 summed over the steps), T (n_cases, n_el)."""
    s = slice(first_el, last_el)
    return np.sum(np.asarray(T_Nmm)[:, s] * le_mm[s] / (G_MPa * J_mm4[s]), axis=1)


# --- notch sections --------------------------------------------------------------------------------

@dataclass(frozen=True)
class HubSection:
    """A notch section that engine.checks adds: where, its label, Kt (bending, torsion, axial)
    and the notch radius [mm] (nan: the factors are fatigue factors already, q = 1)."""

    x_mm: float
    label: str
    kt: tuple[float, float, float]
    r_mm: float
    element: str


def _key_length_of(e, d_mm: float) -> float | None:
    k = getattr(e, "key", None)
    if k is not None and k.length_mm is not None:
        return k.length_mm
    space = e.width_mm if e.width_mm is not None else HUB_LENGTH_PER_D * d_mm
    return key_length(space)


def hub_sections(design) -> list[HubSection]:
    """Sections at both hub ends (x ± width/2) of every keyed or press-fitted element that gives
    ``width_mm``, and at both ends of each keyseat (end-milled) or its runout (sled-runner)
    where the key is shorter than the hub. Hub ends past the shaft's ends are left out (no
    moment there). Keyseat factors: Shigley [1] Table 7-1 (``strength.KEYWAY_KT``, r = 0.02·d);
    press fit: ``strength.PRESS_FIT_KF`` taken as Kf (fretting at the hub's edge)."""
    L = design.shaft.length_mm
    out: list[HubSection] = []
    for e in design.elements:
        if e.keyway is None and not e.press_fit:
            continue
        d = design.shaft.diameter_at(e.x_mm)
        ends = []
        if e.width_mm is not None:
            ends = [(e.x_mm - e.width_mm / 2, f"{e.id} hub end"), (e.x_mm + e.width_mm / 2, f"{e.id} hub end")]
        for x, label in ends:
            if 0 < x < L:
                if e.keyway is not None:
                    out.append(HubSection(x, f"{label} ({e.keyway.replace('_', '-')} keyway)",
                                          strength.KEYWAY_KT[e.keyway], strength.KEYWAY_R_OVER_D * d, e.id))
                if e.press_fit:
                    out.append(HubSection(x, f"{label} (press fit)", strength.PRESS_FIT_KF, float("nan"), e.id))
        if e.keyway is not None:
            lk = _key_length_of(e, d)
            if lk is not None and (e.width_mm is None or lk < e.width_mm - 1e-6):
                word = "keyseat end" if e.keyway == "end_milled" else "keyseat runout"
                for x in (e.x_mm - lk / 2, e.x_mm + lk / 2):
                    if 0 < x < L:
                        out.append(HubSection(x, f"{e.id} {word} ({e.keyway.replace('_', '-')})",
                                              strength.KEYWAY_KT[e.keyway], strength.KEYWAY_R_OVER_D * d, e.id))
    return out


# --- seats ------------------------------------------------------------------------------------------

ABUTMENT_RULE = ("common practice (memory): shaft shoulder diameter between d + 0.15·(D − d) and "
                 "d + 0.30·(D − d), i.e. high enough to take the ring's side face past its chamfer, "
                 "low enough to clear the cage and seals and leave room for a puller")
GAP_MM = 0.5  # a locating feature within this of the bearing's side touches it (common practice)
OVERLAP_TOL_MM = 0.01


def abutment_range(cand) -> tuple[float, float, str]:
    """(da_min, da_max, source) of a bearing: the table's ``da_min_mm``/``da_max_mm`` where it has
    them, else :data:`ABUTMENT_RULE`."""
    lo, hi = getattr(cand, "da_min_mm", None), getattr(cand, "da_max_mm", None)
    d, D = cand.d_mm, cand.D_mm
    rule_lo, rule_hi = d + 0.15 * (D - d), d + 0.30 * (D - d)
    if lo is not None and not math.isnan(lo):
        return lo, (hi if hi is not None and not math.isnan(hi) else rule_hi), "the bearing table's abutment diameters"
    return rule_lo, rule_hi, ABUTMENT_RULE


def _rated_row(b) -> Any:
    des = getattr(b, "designation", None)
    if des:
        for c in b.candidates:
            if c.designation == des:
                return c
    return b.candidates[0] if b.candidates else None


def _steps(shaft) -> list[tuple[float, float, float]]:
    """(x, d left, d right) of every change of diameter."""
    edges = shaft.edges_mm()
    return [(edges[i], s0.d_mm, s1.d_mm) for i, (s0, s1) in enumerate(zip(shaft.segments[:-1], shaft.segments[1:]),
                                                                       start=1)
            if abs(s0.d_mm - s1.d_mm) > 1e-9]


def _length_off(shaft, lo: float, hi: float, d_seat: float) -> float:
    """Length of [lo, hi] where the shaft's diameter is not d_seat [mm]."""
    edges = shaft.edges_mm()
    off = 0.0
    for s, a, b in zip(shaft.segments, edges[:-1], edges[1:]):
        w = min(hi, b) - max(lo, a)
        if w > 0 and abs(s.d_mm - d_seat) > 1e-6:
            off += w
    off += max(0.0, -lo) + max(0.0, hi - shaft.length_mm)
    return off


# --- the entry point ------------------------------------------------------------------------------

# checks whose value must reach the limit from above (the rest: value at most limit)
CODES_AT_LEAST = frozenset({"mount.key", "mount.press_fit", "mount.shoulder_low"})


@dataclass(frozen=True)
class MountingOutcome:
    checks: list[Check]
    bearings: list[Any]  # the bearing results with their fits
    mounting: Mounting


def _peak_torque(a, i: int) -> tuple[float, int]:
    """(largest |T|·(1 + alternating share) of element i over the cases [N·mm], that case)."""
    vals = [abs(float(cl.C_Nmm[i, 0])) * (1 + c.torque_alternating_pct / 100.0)
            for cl, c in zip(a.loads, a.design.load_cases)]
    j = int(np.argmax(vals)) if vals else 0
    return (vals[j] if vals else 0.0), j


def _peak_axial(a, i: int) -> float:
    return max((abs(float(cl.F_N[i, 0])) for cl in a.loads), default=0.0)


def _fmt(v: float) -> str:
    return f"{v:.3g}" if abs(v) < 1000 else f"{v:,.0f}"


def _keys(a, checks: list[Check]) -> list[KeyRating]:
    design, req = a.design, a.design.requirements
    names = [c.name for c in design.load_cases]
    rows = []
    for i, e in enumerate(design.elements):
        if e.keyway is None:
            continue
        d = design.shaft.diameter_at(e.x_mm)
        k = e.key
        std = key_size(d)
        where = e.id
        given = k is not None and k.b_mm is not None and k.h_mm is not None
        if std is None and not given:
            checks.append(Check(code="mount.key", status="warn", where=where, x_mm=e.x_mm, source=KEY_SOURCE,
                                message=f"{e.id}: no standard parallel key for a {d:g} mm seat (the table covers "
                                        "6–230 mm); give the key's sizes to have it checked"))
            continue
        b = k.b_mm if given else std.b_mm
        h = k.h_mm if given else std.h_mm
        t1 = (k.t1_mm if k is not None and k.t1_mm is not None else
              (std.t1_mm if std is not None and not given else 0.6 * h))
        if t1 >= h:
            checks.append(Check(code="mount.key", status="fail", where=where, x_mm=e.x_mm, source=KEY_SOURCE,
                                message=f"{e.id}: the keyseat depth {t1:g} mm is not less than the key height {h:g} mm"))
            continue
        lk = _key_length_of(e, d)
        if lk is None:
            checks.append(Check(code="mount.key", status="warn", where=where, x_mm=e.x_mm, source=KEY_SOURCE,
                                message=f"{e.id}: the hub is shorter than the shortest standard key (6 mm)"))
            continue
        ends = k.ends if k is not None else "rounded"
        count = k.count if k is not None else 1
        lb = lk - b if ends == "rounded" else lk
        if lb <= 0:
            checks.append(Check(code="mount.key", status="fail", where=where, x_mm=e.x_mm, source=KEY_SOURCE,
                                message=f"{e.id}: a round-ended key {lk:g} mm long and {b:g} mm wide has no "
                                        "straight bearing length"))
            continue
        T, j = _peak_torque(a, i)
        F, ps, ph, pk, tau = (float(v) for v in key_stresses(T_Nmm=T, d_mm=d, b_mm=b, h_mm=h, t1_mm=t1,
                                                              bearing_length_mm=lb, count=count))
        Sy_key = k.Sy_MPa if k is not None and k.Sy_MPa is not None else KEY_SY_MPA
        Sy_hub = k.hub_Sy_MPa if k is not None and k.hub_Sy_MPa is not None else design.shaft.material.Sy_MPa
        Sy_shaft = design.shaft.material.Sy_MPa
        cap = strength.SAFETY_CAP
        n = {"shaft": min(Sy_shaft / ps, cap) if ps > 0 else cap, "hub": min(Sy_hub / ph, cap) if ph > 0 else cap,
             "key": min(Sy_key / pk, cap) if pk > 0 else cap,
             "shear": min(0.577 * Sy_key / tau, cap) if tau > 0 else cap}
        size = (f"{count} × " if count > 1 else "") + f"{b:g} × {h:g} × {lk:g} mm"
        label = f"key of {e.id} ({size}{'' if given else ', DIN 6885-1 size'}; keyseat {t1:g} mm)"
        tq = f"peak torque {T / 1e3:.4g} N·m ('{names[j]}')" if names else "no torque"
        src = KEY_METHOD + ("" if given else "; size: " + KEY_SOURCE)
        lim = req.yield_safety_min
        for part, p, Sy, word in (("shaft", ps, Sy_shaft, "on the shaft keyseat"),
                                  ("hub", ph, Sy_hub, "on the hub keyway"),
                                  ("key", pk, Sy_key, "on the key flank")):
            st = "ok" if n[part] >= lim else "fail"
            checks.append(Check(code="mount.key", status=st, where=where, x_mm=e.x_mm, load_case=names[j] if names else "",
                                value=n[part], limit=lim, unit="", source=src,
                                message=f"{label}: bearing pressure {word} {p:.3g} MPa at the {tq}; "
                                        f"safety {n[part]:.3g} against Sy {Sy:g} MPa"))
        st = "ok" if n["shear"] >= lim else "fail"
        checks.append(Check(code="mount.key", status=st, where=where, x_mm=e.x_mm, load_case=names[j] if names else "",
                            value=n["shear"], limit=lim, unit="", source=src,
                            message=f"{label}: shear {tau:.3g} MPa at the {tq}; safety {n['shear']:.3g} against "
                                    f"0.577·Sy = {0.577 * Sy_key:.0f} MPa"))
        rows.append(KeyRating(element=e.id, x_mm=e.x_mm, d_mm=d, b_mm=b, h_mm=h, t1_mm=t1, length_mm=lk,
                              bearing_length_mm=lb, count=count, standard=not given,
                              peak_torque_Nm=T / 1e3, load_case=names[j] if names else "",
                              p_shaft_MPa=ps, p_hub_MPa=ph, p_key_MPa=pk, tau_MPa=tau,
                              safety=min(n.values())))
    return rows


def _press_fits(a, checks: list[Check]) -> list[PressFitRating]:
    design, req = a.design, a.design.requirements
    mat = design.shaft.material
    names = [c.name for c in design.load_cases]
    rows = []
    for i, e in enumerate(design.elements):
        if not e.press_fit:
            continue
        spec = e.press_fit if not isinstance(e.press_fit, bool) else None
        d = design.shaft.diameter_at(e.x_mm)
        bore = next((s.bore_mm for s, lo, hi in zip(design.shaft.segments, design.shaft.edges_mm()[:-1],
                                                    design.shaft.edges_mm()[1:]) if lo <= e.x_mm <= hi), 0.0)
        assumed = []
        fit = None
        if spec is not None and spec.interference_um is not None:
            dmin = dmax = spec.interference_um
        else:
            fit = spec.fit if spec is not None and spec.fit is not None else "H7/s6"
            if spec is None or spec.fit is None:
                assumed.append("fit H7/s6 assumed")
            try:
                dmin, dmax = fit_interference(fit, d)
            except ValueError as exc:
                checks.append(Check(code="mount.press_fit", status="fail", where=e.id, x_mm=e.x_mm,
                                    source=FIT_SOURCE, message=f"{e.id}: press fit {fit}: {exc}"))
                continue
        do = spec.hub_outer_d_mm if spec is not None and spec.hub_outer_d_mm is not None else None
        if do is None:
            do = HUB_OD_PER_D * d
            assumed.append(f"hub outer diameter {do:g} mm assumed (2·d)")
        length = e.width_mm
        if length is None:
            length = HUB_LENGTH_PER_D * d
            assumed.append(f"hub length {length:g} mm assumed (1.5·d)")
        f = spec.friction if spec is not None else 0.12
        E = mat.E_GPa * 1e3
        E_hub = spec.hub_E_GPa * 1e3 if spec is not None and spec.hub_E_GPa is not None else E
        Sy_hub = spec.hub_Sy_MPa if spec is not None and spec.hub_Sy_MPa is not None else mat.Sy_MPa
        nu_s = spec.shaft_nu if spec is not None else 0.3
        nu_h = spec.hub_nu if spec is not None else 0.3
        if do <= d:
            checks.append(Check(code="mount.press_fit", status="fail", where=e.id, x_mm=e.x_mm, source=PRESS_FIT_SOURCE,
                                message=f"{e.id}: the hub's outer diameter {do:g} mm is not larger than the seat {d:g} mm"))
            continue
        if dmin <= 0:
            checks.append(Check(code="mount.press_fit", status="fail", where=e.id, x_mm=e.x_mm, source=FIT_SOURCE,
                                message=f"{e.id}: fit {fit} has a smallest interference of {dmin:g} µm at {d:g} mm: "
                                        "it is not a press fit; choose a tighter fit"))
            continue
        p_min, p_max = (float(lame_pressure(interference_mm=v / 1000, d_mm=d, shaft_bore_mm=bore, hub_outer_d_mm=do,
                                            E_shaft_MPa=E, E_hub_MPa=E_hub, nu_shaft=nu_s, nu_hub=nu_h))
                        for v in (dmin, dmax))
        Tcap, Fcap = (float(v) for v in press_fit_capacity(p_MPa=p_min, d_mm=d, length_mm=length, friction=f))
        T, j = _peak_torque(a, i)
        Fa = _peak_axial(a, i)
        need = math.hypot(2 * T / d, Fa)  # friction force the joint must hold at its surface [N]
        slip = min(Fcap / need, strength.SAFETY_CAP) if need > 0 else strength.SAFETY_CAP
        s_hub, s_shaft = (float(v) for v in press_fit_stresses(p_MPa=p_max, d_mm=d, shaft_bore_mm=bore,
                                                                hub_outer_d_mm=do))
        n_hub, n_shaft = min(Sy_hub / s_hub, strength.SAFETY_CAP), min(mat.Sy_MPa / s_shaft, strength.SAFETY_CAP)
        what = f"press fit of {e.id} ({fit + ', ' if fit else ''}interference {dmin:g}–{dmax:g} µm on {d:g} mm" + \
               (f"; {', '.join(assumed)}" if assumed else "") + ")"
        case = names[j] if names else ""
        checks.append(Check(code="mount.press_fit", status="ok" if slip >= SLIP_SAFETY_MIN else "fail",
                            where=e.id, x_mm=e.x_mm, load_case=case, value=slip, limit=SLIP_SAFETY_MIN,
                            source=PRESS_FIT_SOURCE + "; slip safety: common practice",
                            message=f"{what}: at the smallest interference p = {p_min:.3g} MPa holds "
                                    f"{Tcap / 1e3:.4g} N·m and {_fmt(Fcap)} N axially (f = {f:g}); peak torque "
                                    f"{T / 1e3:.4g} N·m with {_fmt(Fa)} N axial: slip safety {slip:.3g}"))
        for part, n, s, Sy in (("hub", n_hub, s_hub, Sy_hub), ("shaft", n_shaft, s_shaft, mat.Sy_MPa)):
            checks.append(Check(code="mount.press_fit", status="ok" if n >= req.yield_safety_min else "fail",
                                where=e.id, x_mm=e.x_mm, value=n, limit=req.yield_safety_min,
                                source=PRESS_FIT_SOURCE + "; von Mises against Sy",
                                message=f"{what}: at the largest interference p = {p_max:.3g} MPa, {part} von Mises "
                                        f"{s:.3g} MPa: yield safety {n:.3g} against Sy {Sy:g} MPa"))
        rows.append(PressFitRating(element=e.id, x_mm=e.x_mm, d_mm=d, fit=fit, interference_min_um=dmin,
                                   interference_max_um=dmax, hub_outer_d_mm=do, length_mm=length, friction=f,
                                   p_min_MPa=p_min, p_max_MPa=p_max, torque_capacity_Nm=Tcap / 1e3,
                                   axial_capacity_N=Fcap, peak_torque_Nm=T / 1e3, slip_safety=slip,
                                   hub_yield_safety=n_hub, shaft_yield_safety=n_shaft))
    return rows


def _spans(design, bearings) -> tuple[list[tuple[str, str, float, float]], dict[str, Any]]:
    """Occupied lengths: (kind, name, from, to) of bearings and element hubs; rows by support id."""
    spans, rows = [], {}
    by_id = {b.id: b for b in bearings}
    for s in design.supports:
        b = by_id.get(s.id)
        row = _rated_row(b) if b is not None else None
        if row is not None:
            rows[s.id] = row
            spans.append(("bearing", f"the bearing at support {s.id}", s.x_mm - row.B_mm / 2, s.x_mm + row.B_mm / 2))
    for e in design.elements:
        w = e.width_mm or 0.0
        if e.kind in ("force", "moment") and e.width_mm is None:
            continue
        spans.append(("element", f"{e.kind.replace('_', ' ')} {e.id}", e.x_mm - w / 2, e.x_mm + w / 2))
    return spans, rows


def _seats(a, bearings, checks: list[Check]) -> list[SeatRow]:
    design = a.design
    shaft = design.shaft
    steps = _steps(shaft)
    spans, rows = _spans(design, bearings)
    out = []
    for s in design.supports:
        row = rows.get(s.id)
        if row is None:
            continue
        B = row.B_mm
        lo, hi = s.x_mm - B / 2, s.x_mm + B / 2
        name = f"support {s.id} ({row.designation}, {B:g} mm wide, x = {lo:g}–{hi:g} mm)"
        # the shaft's seat diameter under the bearing's middle (a sleeve may make it differ from
        # the bearing's bore); the seat is judged on the shaft
        d_seat = shaft.diameter_at(s.x_mm)
        off = _length_off(shaft, lo, hi, d_seat)
        inside = [st for st in steps if lo + OVERLAP_TOL_MM < st[0] < hi - OVERLAP_TOL_MM]
        if off > OVERLAP_TOL_MM:
            where_step = (f" past the {max(inside[0][1:]):g}/{min(inside[0][1:]):g} mm step at x = {inside[0][0]:g} mm"
                          if inside else " past the shaft's end" if lo < 0 or hi > shaft.length_mm else "")
            checks.append(Check(code="mount.seat", status="fail", where=s.id, x_mm=s.x_mm, value=off, limit=0.0,
                                unit="mm", source="common practice: a bearing ring sits on one seat diameter",
                                message=f"the bearing at {name} hangs {off:.3g} mm off its {d_seat:g} mm "
                                        f"seat{where_step}; move it onto the seat or lengthen the seat"))
        # the seat's length: the run of the seat diameter that holds the bearing's middle
        edges = shaft.edges_mm()
        seg = next((k for k in range(len(shaft.segments)) if edges[k] - 1e-9 <= s.x_mm <= edges[k + 1] + 1e-9
                    and abs(shaft.segments[k].d_mm - d_seat) < 1e-6), None)
        seat_from = seat_to = None
        if seg is not None:
            k0 = k1 = seg
            while k0 > 0 and abs(shaft.segments[k0 - 1].d_mm - d_seat) < 1e-6:
                k0 -= 1
            while k1 < len(shaft.segments) - 1 and abs(shaft.segments[k1 + 1].d_mm - d_seat) < 1e-6:
                k1 += 1
            seat_from, seat_to = edges[k0], edges[k1 + 1]
        # what locates it on each side: a shoulder, a ring groove or a neighbour's hub
        located: dict[str, str] = {}
        nearest: dict[str, tuple[float, float, float]] = {}  # side -> (gap, x, D) of the nearest shoulder
        for side, edge in (("-x", lo), ("+x", hi)):
            best = None
            for x, dl, dr in steps:
                d_out = dl if side == "-x" else dr
                gap = (edge - x) if side == "-x" else (x - edge)
                if d_out > d_seat + 1e-6 and -OVERLAP_TOL_MM <= gap and (best is None or gap < best[0]):
                    best = (gap, x, d_out)
            if best is not None and best[0] <= max(B, 10.0):
                nearest[side] = (best[0], best[1], best[2])
            if best is not None and best[0] <= GAP_MM:
                located[side] = f"the {best[2]:g} mm shoulder at x = {best[1]:g} mm"
            elif best is not None:
                located.setdefault("_near" + side, f"{best[0]:.3g} mm from the {best[2]:g} mm shoulder at x = {best[1]:g} mm")
            for gi, g in enumerate(shaft.grooves):
                gap = (edge - (g.x_mm + g.width_mm / 2)) if side == "-x" else ((g.x_mm - g.width_mm / 2) - edge)
                if -OVERLAP_TOL_MM <= gap <= GAP_MM + 1.0 and side not in located:
                    located[side] = f"a retaining ring in the groove at x = {g.x_mm:g} mm"
            for kind, nm, a0, a1 in spans:
                if kind != "element" or a1 - a0 <= 0:
                    continue
                gap = (edge - a1) if side == "-x" else (a0 - edge)
                if -OVERLAP_TOL_MM <= gap <= GAP_MM and side not in located:
                    located[side] = f"the hub of {nm}"
        need = {"both": ("-x", "+x"), "+x": ("-x",), "-x": ("+x",)}.get(s.axial, ())
        missing = [sd for sd in need if sd not in located]
        if not any(k in located for k in ("-x", "+x")) and not need:
            missing = ["either"]
        if missing:
            sides = " and ".join("its −x side" if m == "-x" else "its +x side" if m == "+x" else "either side"
                                 for m in missing)
            near = "; ".join(located[k] for k in ("_near-x", "_near+x") if k in located)
            checks.append(Check(code="mount.locate", status="warn", where=s.id, x_mm=s.x_mm,
                                source="common practice: each bearing ring is located against a shoulder, a ring "
                                       "or a spacer on the side(s) its axial role loads",
                                message=f"nothing on the shaft locates the bearing at {name} on {sides}"
                                        + (f" (it is {near}: place it against the shoulder or fit a spacer)" if near
                                           else ": give it a shoulder, a retaining ring, a nut or a spacer")))
        # the shoulder that backs the ring: the touching one (on the side the axial role loads
        # first), else the nearest
        order = ("+x", "-x") if s.axial == "-x" else ("-x", "+x")
        pick = sorted((sd for sd in order if sd in nearest), key=lambda sd: (sd not in located, order.index(sd)))
        shoulder = (pick[0], nearest[pick[0]][1], nearest[pick[0]][2]) if pick else None
        da_lo, da_hi, da_src = abutment_range(row)
        sh_row = {}
        if shoulder is not None:
            side, xs, Dsh = shoulder
            height = (Dsh - d_seat) / 2
            sh_row = dict(shoulder_x_mm=xs, shoulder_d_mm=Dsh, shoulder_height_mm=height)
            table = da_src != ABUTMENT_RULE
            if Dsh < da_lo - 1e-6 or Dsh > da_hi + 1e-6:
                too = "too low" if Dsh < da_lo else "too high"
                why = ("the ring's side face is not backed past its chamfer" if too == "too low"
                       else "it reaches the cage or seal and leaves no room for a puller")
                checks.append(Check(code="mount.shoulder_low" if too == "too low" else "mount.shoulder",
                                    status="fail" if table else "warn", where=s.id,
                                    x_mm=xs, value=Dsh, limit=da_lo if too == "too low" else da_hi, unit="mm",
                                    source=da_src,
                                    message=f"the {Dsh:g} mm shoulder at x = {xs:g} mm is {too} for the bearing at "
                                            f"support {s.id} ({row.designation}, {row.d_mm:g} × {row.D_mm:g} mm): "
                                            f"abutment {da_lo:.3g}–{da_hi:.3g} mm; {why}"))
            else:
                checks.append(Check(code="mount.shoulder", status="ok", where=s.id, x_mm=xs, value=Dsh, limit=da_hi,
                                    unit="mm", source=da_src,
                                    message=f"the {Dsh:g} mm shoulder at x = {xs:g} mm suits the bearing at support "
                                            f"{s.id} ({row.designation}): abutment {da_lo:.3g}–{da_hi:.3g} mm"))
        out.append(SeatRow(support=s.id, x_mm=s.x_mm, designation=row.designation, d_mm=row.d_mm, D_mm=row.D_mm,
                           width_mm=B, from_mm=lo, to_mm=hi, seat_from_mm=seat_from, seat_to_mm=seat_to,
                           seat_d_mm=d_seat, da_min_mm=da_lo, da_max_mm=da_hi,
                           located_by=[f"{'−x' if k == '-x' else '+x'}: {v}" for k, v in located.items()
                                       if not k.startswith("_")], **sh_row))
    # overlaps between parts, and grooves under a seat or hub
    for m in range(len(spans)):
        for n in range(m + 1, len(spans)):
            k1, n1, a0, a1 = spans[m]
            k2, n2, b0, b1 = spans[n]
            ov = min(a1, b1) - max(a0, b0)
            if ov > OVERLAP_TOL_MM or (ov >= 0 and (a1 - a0 <= 0 or b1 - b0 <= 0) and ov > -OVERLAP_TOL_MM
                                        and (a0 < b0 < a1 or a0 < b1 < a1 or b0 < a0 < b1 or b0 < a1 < b1)):
                checks.append(Check(code="mount.overlap", status="fail", where=f"{n1}, {n2}",
                                    x_mm=(max(a0, b0) + min(a1, b1)) / 2, value=max(ov, 0.0), limit=0.0, unit="mm",
                                    source="geometry: two parts cannot take the same length of shaft",
                                    message=f"{n1} (x = {a0:g}–{a1:g} mm) and {n2} (x = {b0:g}–{b1:g} mm) overlap"
                                            + (f" by {ov:.3g} mm" if ov > 0 else "")))
    # a hub cannot run onto a larger diameter than its seat
    edges = shaft.edges_mm()
    for e in design.elements:
        if not e.width_mm or e.kind in ("force", "moment"):
            continue
        h0, h1 = e.x_mm - e.width_mm / 2, e.x_mm + e.width_mm / 2
        d_seat = shaft.diameter_at(e.x_mm)
        for seg, a0, a1 in zip(shaft.segments, edges[:-1], edges[1:]):
            over = min(h1, a1) - max(h0, a0)
            if over > OVERLAP_TOL_MM and seg.d_mm > d_seat + 1e-6:
                xs = a0 if a0 > h0 else a1
                checks.append(Check(code="mount.seat", status="fail", where=e.id, x_mm=xs, value=over, limit=0.0,
                                    unit="mm", source="geometry: a hub's bore fits one seat diameter",
                                    message=f"the hub of {e.kind.replace('_', ' ')} {e.id} (x = {h0:g}–{h1:g} mm, "
                                            f"bore {d_seat:g} mm) runs {over:.3g} mm onto the {seg.d_mm:g} mm "
                                            f"diameter at x = {xs:g} mm; move it or shorten its hub"))
    for gi, g in enumerate(shaft.grooves):
        g0, g1 = g.x_mm - g.width_mm / 2, g.x_mm + g.width_mm / 2
        for kind, nm, a0, a1 in spans:
            if min(a1, g1) - max(a0, g0) > OVERLAP_TOL_MM:
                checks.append(Check(code="mount.groove", status="fail", where=nm, x_mm=g.x_mm,
                                    value=min(a1, g1) - max(a0, g0), limit=0.0, unit="mm",
                                    source="common practice: a ring groove lies beside a seat, never under it",
                                    message=f"the retaining-ring groove at x = {g.x_mm:g} mm lies under {nm} "
                                            f"(x = {a0:g}–{a1:g} mm): move it beside the part it retains"))
    return out


def _fits(design, bearings) -> list[Any]:
    out = []
    sup = {s.id: s for s in design.supports}
    for b in bearings:
        s = sup.get(b.id)
        if s is None:
            out.append(b)
            continue
        row = _rated_row(b)
        ratio = b.equivalent_load_N / row.C_N if row is not None and row.C_N > 0 and b.equivalent_load_N > 0 else None
        shaft, housing, why = propose_fits(bearing_type=b.bearing_type, bore_mm=b.bore_mm, P_over_C=ratio,
                                           inner_ring_load=s.inner_ring_load, floating=s.axial == "none")
        given = s.fits
        chosen = "proposed"
        if given is not None and (given.shaft or given.housing):
            chosen = "designer" if given.shaft and given.housing else "designer and proposed"
            shaft = given.shaft or shaft
            housing = given.housing or housing
        out.append(b.model_copy(update={"fits": BearingFits(shaft=shaft, housing=housing, chosen_by=chosen,
                                                               basis=why, source=FITS_SOURCE)}))
    return out


def _twist(a, checks: list[Check]) -> list[TwistSpan]:
    design, mesh = a.design, a.mesh
    req = design.requirements
    from engine.model import TORQUE_KINDS
    carriers = sorted(((e.x_mm, e.id, int(node)) for e, node in zip(design.elements, mesh.element_nodes)
                       if e.kind in TORQUE_KINDS), key=lambda t: t[0])
    T = np.asarray(a.T_Nmm, float)
    if len(carriers) < 2 or T.size == 0:
        return []
    limit = req.twist_limit_deg_per_m if req.twist_limit_deg_per_m is not None else TWIST_LIMIT_DEG_PER_M
    own = req.twist_limit_deg_per_m is not None  # the designer's own limit fails, the default warns
    G = design.shaft.material.G_GPa * 1e3
    names = [c.name for c in design.load_cases]
    out = []
    for (x0, id0, n0), (x1, id1, n1) in zip(carriers[:-1], carriers[1:]):
        if n1 <= n0:
            continue
        th = np.abs(twist_angles(T_Nmm=T, le_mm=mesh.le_mm, J_mm4=mesh.J_mm4, G_MPa=G, first_el=n0, last_el=n1))
        j = int(np.argmax(th))
        if th[j] <= 0:
            continue
        deg = math.degrees(float(th[j]))
        per_m = deg / ((x1 - x0) / 1000.0)
        ok = per_m <= limit
        src = TWIST_SOURCE + (f"{limit:g}°/m set in the design" if own else f"{limit:g}°/m (common practice)")
        checks.append(Check(code="shaft.twist", status="ok" if ok else ("fail" if own else "warn"),
                            where=f"{id0} to {id1}", x_mm=(x0 + x1) / 2, load_case=names[j], value=per_m,
                            limit=limit, unit="°/m", source=src,
                            message=f"the shaft twists {deg:.3g}° between {id0} and {id1} ({x1 - x0:g} mm) in "
                                    f"'{names[j]}': {per_m:.3g}°/m against {limit:g}°/m"
                                    + ("" if ok or own else
                                       " (the common-practice limit for precise drives; a line shaft commonly "
                                       "accepts more: set your own twist limit in the requirements)")))
        out.append(TwistSpan(from_id=id0, to_id=id1, x_from_mm=x0, x_to_mm=x1, angle_deg=deg, deg_per_m=per_m,
                             load_case=names[j]))
    return out


def mounting(a, bearings: list[Any], *, with_fits: bool = True) -> MountingOutcome:
    """Every mounting check of a solved design (``a``: :class:`engine.solve.Analysis` with the
    torque along x set) and its rated bearings: keys, press fits, seats and shoulders, overlaps,
    grooves, twist; and the bearings with their proposed (or the designer's) fits
    (``with_fits=False``: the bearings as given, for a study's figures, which show no fits)."""
    checks: list[Check] = []
    keys = _keys(a, checks)
    fits = _press_fits(a, checks)
    seats = _seats(a, bearings, checks)
    twist = _twist(a, checks)
    return MountingOutcome(checks=checks, bearings=_fits(a.design, bearings) if with_fits else list(bearings),
                           mounting=Mounting(keys=keys, press_fits=fits, seats=seats, twist=twist))


def place_checks(design, checks: Iterable[Check]) -> list[Check]:
    """The checks with ``x_mm`` set where a check names one support or element and has none yet."""
    xs = {s.id: s.x_mm for s in design.supports}
    xs.update({e.id: e.x_mm for e in design.elements})
    return [c.model_copy(update={"x_mm": xs[c.where]}) if c.x_mm is None and c.where in xs else c for c in checks]
