"""Element forces: every element kind of the design turned into a force and a couple on the shaft.

Units: forces in N, positions in mm, couples in N·mm inside this module (``C_Nmm``);
torques in N·m at the boundary (``torque_Nm``). Axes and signs are those of
``design-format.md``: x along the shaft, angles about +x measured from +y toward +z, a torque
on an element is the torque it applies TO the shaft, a right-hand helix advances like a
right-hand screw along +x.

Each element becomes, per load case, a force ``F`` (3,) acting at the shaft axis at ``x_mm``
and a couple ``C`` (3,) about that axis point: ``C = p × F_applied`` for forces applied off the
axis at ``p`` (gear mesh point, force arm), plus any applied couple. ``C[0]`` is the torque.
Weights (``mass_kg`` · g, and the shaft's own, handled by the beam as a distributed load) act
along ``gravity.direction``.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from engine.model import TORQUE_KINDS, Design, LoadCase

__all__ = ["CaseLoads", "element_torques", "torque_imbalance", "case_loads", "gravity_vector"]

_AXIS = {"x": 0, "y": 1, "z": 2}


@dataclass(frozen=True)
class CaseLoads:
    """Loads of one case, element by element, in design order.

    ``F_N`` (n, 3) forces at the axis; ``C_Nmm`` (n, 3) couples about the axis point;
    ``x_mm`` (n,); ``torque_Nm`` (n,) = C_Nmm[:, 0]/1000; ``gravity_N_per_kg`` (3,) the
    weight vector per kg in this case (force factor applied); zero when gravity is off.
    """

    ids: tuple[str, ...]
    kinds: tuple[str, ...]
    x_mm: np.ndarray
    F_N: np.ndarray
    C_Nmm: np.ndarray
    gravity_N_per_kg: np.ndarray

    @property
    def torque_Nm(self) -> np.ndarray:
        return self.C_Nmm[:, 0] / 1000.0


def gravity_vector(design: Design) -> np.ndarray:
    """Acceleration of gravity as a vector [m/s²] (N per kg); zeros when ``gravity`` is null."""
    g = np.zeros(3)
    if design.gravity is not None:
        sign = -1.0 if design.gravity.direction[0] == "-" else 1.0
        g[_AXIS[design.gravity.direction[1]]] = sign * design.gravity.g_m_s2
    return g


def _arm_torque_Nm(e, force_factor: float) -> float:
    """Torque about +x of a force element applied at (arm_y, arm_z): (y·Fz − z·Fy) [N·m]."""
    return force_factor * (e.arm_y_mm * e.Fz_N - e.arm_z_mm * e.Fy_N) / 1000.0


def _given_torques(design: Design, case: LoadCase) -> dict[str, float | None]:
    out: dict[str, float | None] = {}
    for e in design.elements:
        if e.kind in TORQUE_KINDS:
            if e.id in case.torques_Nm:
                out[e.id] = case.torques_Nm[e.id]
            else:
                out[e.id] = None if e.torque_Nm is None else e.torque_Nm * case.torque_factor
        elif e.kind == "force":
            out[e.id] = _arm_torque_Nm(e, case.force_factor)
    return out


def torque_imbalance(design: Design, case: LoadCase) -> tuple[float | None, float]:
    """(sum of element torques [N·m], largest |torque|); the sum is None when one torque is
    left empty, since that one is then the balancing torque."""
    given = _given_torques(design, case)
    values = [v for v in given.values() if v is not None]
    largest = max((abs(v) for v in values), default=0.0)
    if any(v is None for v in given.values()):
        return None, largest
    return sum(values), largest


def element_torques(design: Design, case: LoadCase) -> dict[str, float]:
    """Torque each element applies to the shaft in ``case`` [N·m]; the empty one balances."""
    given = _given_torques(design, case)
    rest = sum(v for v in given.values() if v is not None)
    return {k: (-rest if v is None else v) for k, v in given.items()}


def _unit_vectors(angle_deg: float) -> tuple[np.ndarray, np.ndarray]:
    """(e_r, t): radial unit vector at ``angle`` about +x from +y, and the tangent a positive
    rotation about +x moves that point along."""
    a = math.radians(angle_deg)
    return np.array([0.0, math.cos(a), math.sin(a)]), np.array([0.0, -math.sin(a), math.cos(a)])


def _gear(e, T_Nmm: float) -> tuple[np.ndarray, np.ndarray]:
    """Spur or helical gear mesh force (design-format.md, 'Gear forces').

    Ft = T/R (signed) along the tangent t; radial |Ft|·tan φn / cos β toward the axis;
    axial −Ft·tan β (right hand) or +Ft·tan β (left hand), acting at the mesh point, so the
    couple p × F bends the shaft. Shigley, Mechanical Engineering Design, 9th ed., Eq. 13-40.
    """
    R = e.pitch_d_mm / 2.0
    er, t = _unit_vectors(e.mesh_angle_deg)
    Ft = T_Nmm / R
    beta, phi = math.radians(e.helix_angle_deg), math.radians(e.pressure_angle_deg)
    Fa = (-1.0 if e.hand == "right" else 1.0) * Ft * math.tan(beta) if beta else 0.0
    F = Ft * t - abs(Ft) * math.tan(phi) / math.cos(beta) * er + np.array([Fa, 0.0, 0.0])
    return F, np.cross(R * er, F)


def _bevel(e, T_Nmm: float) -> tuple[np.ndarray, np.ndarray]:
    """Straight bevel gear at the mean pitch radius: Wt = |T|/R; radial Wt·tan φ·cos γ toward
    the axis; axial Wt·tan φ·sin γ away from the cone apex. Shigley 9th ed., Eq. 13-38."""
    R = e.pitch_d_mm / 2.0
    er, t = _unit_vectors(e.mesh_angle_deg)
    Ft = T_Nmm / R
    phi, gam = math.radians(e.pressure_angle_deg), math.radians(e.pitch_cone_angle_deg)
    Wt = abs(Ft)
    Fa = Wt * math.tan(phi) * math.sin(gam) * (-1.0 if e.apex == "+x" else 1.0)
    F = Ft * t - Wt * math.tan(phi) * math.cos(gam) * er + np.array([Fa, 0.0, 0.0])
    return F, np.cross(R * er, F)


def _strands(e, T_Nmm: float, T1: float, T2: float) -> np.ndarray:
    """Resultant of the two strand pulls on the shaft.

    u points along ``strand_angle_deg`` (toward the other shaft), v = u turned +90° about x.
    With wrap θ each strand leaves at β = (π − θ)/2 from u. A strand on the +v side turns the
    shaft negatively, so for a positive torque the tight strand is on the −v side.
    """
    u, v = _unit_vectors(e.strand_angle_deg)
    b = (math.pi - math.radians(e.wrap_angle_deg)) / 2.0
    side = -1.0 if T_Nmm >= 0 else 1.0  # the tight strand's side
    tight = math.cos(b) * u + side * math.sin(b) * v
    slack = math.cos(b) * u - side * math.sin(b) * v
    return T1 * tight + T2 * slack


def _pulley(e, T_Nmm: float) -> tuple[np.ndarray, np.ndarray]:
    """Belt pulley. Tension ratio k: T1 − T2 = |T|/R, T1 = k·T2 (flat or V belt, Euler–
    Eytelwein: k = e^(μθ)). Pull factor f: resultant f·|T|/R along the strand direction
    (common practice: f ≈ 1.5 for V belts, 2–3 for flat belts)."""
    R = e.pitch_d_mm / 2.0
    net = abs(T_Nmm) / R
    if e.pull_factor is not None:
        u, _ = _unit_vectors(e.strand_angle_deg)
        F = e.pull_factor * net * u
    else:
        T2 = net / (e.tension_ratio - 1.0)
        F = _strands(e, T_Nmm, e.tension_ratio * T2, T2)
    return F, np.array([T_Nmm, 0.0, 0.0])


def _sprocket(e, T_Nmm: float) -> tuple[np.ndarray, np.ndarray]:
    """Chain sprocket: the tight strand pulls |T|/R, the slack strand carries nothing."""
    F = _strands(e, T_Nmm, abs(T_Nmm) / (e.pitch_d_mm / 2.0), 0.0)
    return F, np.array([T_Nmm, 0.0, 0.0])


def case_loads(design: Design, case: LoadCase) -> CaseLoads:
    """Forces and couples of every element in ``case`` (torque balance applied, weights added)."""
    torques = element_torques(design, case)
    g = gravity_vector(design) * case.force_factor
    n = len(design.elements)
    F, C = np.zeros((n, 3)), np.zeros((n, 3))
    for i, e in enumerate(design.elements):
        T = torques.get(e.id, 0.0) * 1000.0
        if e.kind == "gear":
            F[i], C[i] = _gear(e, T)
        elif e.kind == "bevel_gear":
            F[i], C[i] = _bevel(e, T)
        elif e.kind == "pulley":
            F[i], C[i] = _pulley(e, T)
        elif e.kind == "sprocket":
            F[i], C[i] = _sprocket(e, T)
        elif e.kind == "coupling":
            C[i] = (T, 0.0, 0.0)
        elif e.kind == "force":
            F[i] = case.force_factor * np.array([e.Fx_N, e.Fy_N, e.Fz_N])
            C[i] = np.cross([0.0, e.arm_y_mm, e.arm_z_mm], F[i])
        elif e.kind == "moment":
            C[i] = (0.0, case.force_factor * e.My_Nm * 1000.0, case.force_factor * e.Mz_Nm * 1000.0)
        F[i] += e.mass_kg * g
    return CaseLoads(
        ids=tuple(e.id for e in design.elements), kinds=tuple(e.kind for e in design.elements),
        x_mm=np.array([e.x_mm for e in design.elements], dtype=float), F_N=F, C_Nmm=C,
        gravity_N_per_kg=g,
    )
