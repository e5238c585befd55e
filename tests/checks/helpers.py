"""Helpers for the shaft-check tests: a solved Analysis of a design, as engine.solve makes it."""
from __future__ import annotations

import numpy as np

from engine.beam import axial_and_torque
from engine.bearings import rate_bearings
from engine.model import parse_design
from engine.solve import _weight_density, analyse


def analysis_of(data):
    """Analysis after the axial resolution, on the supports as typed (rigid unless a stiffness
    is typed, reactions at x_mm): the model these closed forms assume. engine.solve() goes on to
    mount the rated bearings (pressure centres, bearing stiffness; issue 13), which these
    checks of the shaft formulas leave out on purpose."""
    design = parse_design(data)
    a = analyse(design)
    Fx = rate_bearings(design, Fr_N=a.Fr_N, Fa_ext_N=a.Fa_ext_N).split.Fx_N
    Fx_loads = np.hstack([np.array([cl.F_N[:, 0] for cl in a.loads]), Fx])
    x_loads = np.concatenate([a.loads[0].x_mm if a.loads else [], [s.x_mm for s in design.supports]])
    T_loads = np.hstack([np.array([cl.C_Nmm[:, 0] for cl in a.loads]), np.zeros_like(Fx)])
    a.N_N, a.T_Nmm = axial_and_torque(a.mesh, x_loads, Fx_loads, T_loads, _weight_density(design, a.loads)[:, 0])
    return a
