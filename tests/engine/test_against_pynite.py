"""The beam solver against an independent general-purpose FE library (PyNiteFEA, 3-D frame
elements, Euler–Bernoulli): a stepped, three-support shaft with loads in both planes.

The same shaft is built in PyNite from nodes at every step, support and load; its members
carry each segment's A, I and J. Our solver runs with shear deformation off so that both
use the same beam theory. Tolerance 0.1 % (the issue's), on reactions and on deflections
at every load point.
"""
import math

import numpy as np
import pytest
from Pynite import FEModel3D

import engine

E, G = 205e3, 80e3  # MPa
SEGMENTS = [(120.0, 40.0), (260.0, 55.0), (220.0, 50.0), (100.0, 40.0)]  # (length, d) mm
SUPPORTS = [30.0, 330.0, 650.0]
LOADS = [(150.0, -2500.0, 800.0), (480.0, 1200.0, -3000.0), (690.0, -900.0, -400.0)]  # x, Fy, Fz


def three_support_design(elements: int = 140) -> dict:
    """The shaft of this check as a design document (also the beam benchmark's)."""
    return {
        "name": "three-support check",
        "shaft": {"material": {"E_GPa": E / 1e3, "G_GPa": G / 1e3},
                  "segments": [{"length_mm": L, "d_mm": d} for L, d in SEGMENTS]},
        "supports": [{"id": f"S{i}", "x_mm": x, "axial": "both" if i == 0 else "none", "bearing_type": None}
                     for i, x in enumerate(SUPPORTS)],
        "elements": [{"id": f"F{i}", "kind": "force", "x_mm": x, "Fy_N": fy, "Fz_N": fz}
                     for i, (x, fy, fz) in enumerate(LOADS)],
        "load_cases": [{"name": "c", "speed_rpm": 100}],
        "gravity": None, "analysis": {"shear_deformation": False, "elements": elements},
    }


def ours():
    return engine.solve(three_support_design())


def theirs():
    m = FEModel3D()
    m.add_material("steel", E, G, E / (2 * G) - 1, 7.85e-9)
    edges = np.cumsum([0.0] + [L for L, _ in SEGMENTS])
    xs = sorted(set(edges.tolist()) | set(SUPPORTS) | {x for x, _, _ in LOADS})
    for i, x in enumerate(xs):
        m.add_node(f"N{i}", x, 0.0, 0.0)
    name = {x: f"N{i}" for i, x in enumerate(xs)}
    for i, (a, b) in enumerate(zip(xs[:-1], xs[1:])):
        d = SEGMENTS[int(np.searchsorted(edges, 0.5 * (a + b)) - 1)][1]
        I = math.pi * d**4 / 64
        m.add_section(f"s{i}", math.pi * d**2 / 4, I, I, 2 * I)
        m.add_member(f"M{i}", name[a], name[b], "steel", f"s{i}")
    for j, x in enumerate(SUPPORTS):
        # first support also holds x and the twist, so the frame is stable; none take moments
        m.def_support(name[x], support_DX=(j == 0), support_DY=True, support_DZ=True, support_RX=(j == 0))
    for x, fy, fz in LOADS:
        m.add_node_load(name[x], "FY", fy)
        m.add_node_load(name[x], "FZ", fz)
    m.analyze_linear()
    return m, name


def test_three_support_stepped_shaft_matches_pynite():
    r = ours()
    m, name = theirs()
    for s, x in zip(r.load_cases[0].supports, SUPPORTS):
        node = m.nodes[name[x]]
        assert s.Fy_N == pytest.approx(node.RxnFY["Combo 1"], rel=1e-3)
        assert s.Fz_N == pytest.approx(node.RxnFZ["Combo 1"], rel=1e-3)
    xd = np.array(r.diagrams.x_mm)
    uy = np.array(r.diagrams.load_cases["c"]["uy_mm"])
    uz = np.array(r.diagrams.load_cases["c"]["uz_mm"])
    for x, _, _ in LOADS:
        k = int(np.argmin(abs(xd - x)))
        node = m.nodes[name[x]]
        assert uy[k] == pytest.approx(node.DY["Combo 1"], rel=1e-3)
        assert uz[k] == pytest.approx(node.DZ["Combo 1"], rel=1e-3)
    # and the largest deflection lies between the nodes PyNite was given: ours is at least as large
    assert r.shaft.max_deflection_mm >= max(math.hypot(m.nodes[name[x]].DY["Combo 1"], m.nodes[name[x]].DZ["Combo 1"])
                                            for x, _, _ in LOADS) * (1 - 1e-3)
