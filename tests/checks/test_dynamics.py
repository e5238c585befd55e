"""Lateral and torsional natural frequencies against closed forms.

Symbols: E Young's modulus [MPa], I second moment [mm⁴], A area [mm²], ρ density [t/mm³],
L span [mm], m a lumped mass [t], k a torsional stiffness [N·m/rad], J inertias [kg·m²].
"""
from __future__ import annotations

import math

import numpy as np
import pytest

from engine.dynamics import (generalized_eigen, lateral_frequencies, rayleigh_frequency,
                             torsional_frequency)
from engine.beam import build_mesh
from engine.model import parse_design


def uniform(*, L=1000.0, d=25.0, shear=False, density=7850.0, supports=None, elements=None):
    return parse_design({
        "shaft": {"material": {"E_GPa": 210, "G_GPa": 80.77, "density_kg_m3": density},
                  "segments": [{"length_mm": L, "d_mm": d}]},
        "supports": supports or [{"id": "A", "x_mm": 0, "bearing_type": None},
                                 {"id": "B", "x_mm": L, "bearing_type": None}],
        "elements": elements or [],
        "load_cases": [{"name": "run", "speed_rpm": 1000}],
        "analysis": {"shear_deformation": shear}, "gravity": None})


def test_uniform_simply_supported_first_three_modes():
    # Euler–Bernoulli, simply supported uniform shaft (Shigley 9th ed. Eq. 7-22; Roark 8th ed.
    # Table 16.1 case 1b): ω_n = (nπ/L)²·√(EI/(ρA)). Brief's tolerance 0.5 %.
    E, d, L, rho = 210e3, 25.0, 1000.0, 7850e-12
    I, A = math.pi * d**4 / 64, math.pi * d**2 / 4
    modes = lateral_frequencies(uniform())
    for n in (1, 2, 3):
        w = (n * math.pi / L) ** 2 * math.sqrt(E * I / (rho * A))
        assert modes.omega_rad_s[n - 1] == pytest.approx(w, rel=0.005)
    # references.md (derived): d = 25 mm, L = 1 m → 319.0 rad/s, 3047 rpm
    assert modes.omega_rad_s[0] == pytest.approx(319.0, abs=0.1)
    assert modes.rpm[0] == pytest.approx(3047, abs=1)


def test_timoshenko_stiffness_lowers_the_higher_modes_only_slightly():
    # Shear deformation lowers frequencies by roughly (nπ r/L)²·E/(κG)/2 (slender shaft): tiny
    # for mode 1, larger for mode 3 — a plausibility check, not a published value.
    eb = lateral_frequencies(uniform()).rpm
    ti = lateral_frequencies(uniform(shear=True)).rpm
    assert np.all(ti < eb)
    assert ti[0] / eb[0] > 0.999 and ti[2] / eb[2] > 0.99


def test_lumped_mass_on_light_shaft():
    # Mass m at mid-span of a simply supported, practically massless shaft:
    # ω = √(48·E·I/(m·L³)) (Roark 8th ed. Table 16.1 case 1a; static deflection P·L³/(48EI)).
    E, d, L, m_kg = 210e3, 25.0, 1000.0, 20.0
    I = math.pi * d**4 / 64
    des = uniform(density=1e-3, elements=[{"id": "M", "kind": "force", "x_mm": 500, "mass_kg": m_kg}])
    w = math.sqrt(48 * E * I / (m_kg * 1e-3 * L**3))
    modes = lateral_frequencies(des)
    assert modes.omega_rad_s[0] == pytest.approx(w, rel=1e-4)
    # Rayleigh with the static deflection shape is exact for one lumped mass
    assert rayleigh_frequency(modes) == pytest.approx(modes.rpm[0], rel=1e-4)


def test_elastic_supports_lower_the_frequency_and_tend_to_rigid():
    # Rigid shaft on two springs k carrying its own mass m: bounce mode ω = √(2k/m) when the
    # shaft is far stiffer than the springs (derived, two-spring rigid-body system).
    d, L = 60.0, 300.0
    soft = [{"id": "A", "x_mm": 0, "bearing_type": None, "radial_stiffness_N_per_mm": 100.0},
            {"id": "B", "x_mm": L, "bearing_type": None, "radial_stiffness_N_per_mm": 100.0}]
    m_t = 7850e-12 * math.pi * d**2 / 4 * L
    modes = lateral_frequencies(uniform(L=L, d=d, supports=soft))
    assert modes.omega_rad_s[0] == pytest.approx(math.sqrt(2 * 100.0 / m_t), rel=1e-3)
    stiff = [dict(s, radial_stiffness_N_per_mm=1e12) for s in soft]
    rigid = lateral_frequencies(uniform(L=L, d=d)).rpm[0]
    assert lateral_frequencies(uniform(L=L, d=d, supports=stiff)).rpm[0] == pytest.approx(rigid, rel=1e-3)


def stepped(overhang=False, shear=True):
    segs = [{"length_mm": 60, "d_mm": 30}, {"length_mm": 240, "d_mm": 45, "fillet_r_mm": 1.5},
            {"length_mm": 100, "d_mm": 35, "fillet_r_mm": 1}]
    sup = [{"id": "A", "x_mm": 30}, {"id": "B", "x_mm": 330 if not overhang else 300}]
    els = [{"id": "G", "kind": "force", "x_mm": 150, "mass_kg": 12},
           {"id": "P", "kind": "force", "x_mm": 380, "mass_kg": 6}]
    return parse_design({"shaft": {"segments": segs}, "supports": sup, "elements": els,
                         "load_cases": [{"name": "run", "speed_rpm": 1500}],
                         "analysis": {"shear_deformation": shear}})


@pytest.mark.parametrize("overhang", [False, True])
def test_rayleigh_bounds_the_finite_element_value_on_a_stepped_shaft(overhang):
    # Rayleigh's quotient is an upper bound of ω1 and, with the static deflection shape, close
    # to it (Shigley 9th ed. §7-6, Eq. 7-23;
    # from memory). Tolerance 3 %: the static shape is not the mode shape.
    modes = lateral_frequencies(stepped(overhang))
    r = rayleigh_frequency(modes)
    assert r >= modes.rpm[0] * (1 - 1e-9)
    assert r == pytest.approx(modes.rpm[0], rel=0.03)


def test_mesh_refinement_converges():
    # consistent-mass Euler–Bernoulli elements converge from above (a Rayleigh–Ritz property)
    des = stepped(shear=False)
    from engine.dynamics import dynamics_mesh
    coarse = lateral_frequencies(des, mesh=dynamics_mesh(des, elements=12)).rpm
    fine = lateral_frequencies(des, mesh=build_mesh(des)).rpm
    default = lateral_frequencies(des).rpm
    assert np.all(coarse >= fine * (1 - 1e-9))
    assert np.allclose(default, fine, rtol=1e-3)


def test_two_inertia_torsional_frequency():
    # Two discs on a shaft (Den Hartog, Mechanical Vibrations, §5, from memory):
    # ω = √(k(J1+J2)/(J1·J2)), k = G·Jp/L.
    d, G = 40.0, 80.77e3
    des = uniform(L=600, d=d, elements=[
        {"id": "D1", "kind": "force", "x_mm": 100, "inertia_kg_m2": 0.2},
        {"id": "D2", "kind": "force", "x_mm": 500, "inertia_kg_m2": 0.05}])
    Jp = math.pi * d**4 / 32
    k = G * Jp / 400.0 / 1000.0  # N·m/rad
    w = math.sqrt(k * (0.2 + 0.05) / (0.2 * 0.05))
    assert torsional_frequency(des, build_mesh(des)) == pytest.approx(w * 30 / math.pi, rel=1e-9)
    assert torsional_frequency(uniform(), build_mesh(uniform())) is None


def test_generalized_eigen_against_numpy_direct():
    rng = np.random.default_rng(1)
    A = rng.random((6, 6))
    K = A @ A.T + 6 * np.eye(6)
    B = rng.random((6, 6))
    M = B @ B.T + 6 * np.eye(6)
    lam, phi = generalized_eigen(K, M)
    direct = np.sort(np.linalg.eigvals(np.linalg.solve(M, K)).real)
    assert np.allclose(lam, direct)
    assert np.allclose(phi.T @ M @ phi, np.eye(6), atol=1e-10)


@pytest.mark.parametrize("overhang", [False, True])
def test_subspace_iteration_matches_the_full_eigenproblem(overhang):
    # the design's modes come from subspace iteration; the full Cholesky + eigh reduction is
    # the reference (same matrices, so agreement to round-off is expected)
    from engine.dynamics import dynamics_mesh, lateral_system, subspace_iteration
    des = stepped(overhang)
    K, M, free = lateral_system(des, dynamics_mesh(des))
    K, M = K[np.ix_(free, free)], M[np.ix_(free, free)]
    full, phi_full = generalized_eigen(K, M)
    lam, phi = subspace_iteration(K, M, 3)
    assert np.allclose(lam, full[:3], rtol=1e-9)
    assert np.allclose(np.abs(phi.T @ M @ phi_full[:, :3]), np.eye(3), atol=1e-6)


def test_modes_against_scipy_generalized_eigh():
    # independent library (tests only): scipy.linalg.eigh(K, M) on the same matrices
    import scipy.linalg as scipy_linalg
    from engine.dynamics import dynamics_mesh, lateral_system
    des = stepped(True)
    K, M, free = lateral_system(des, dynamics_mesh(des))
    K, M = K[np.ix_(free, free)], M[np.ix_(free, free)]
    ref = np.sqrt(scipy_linalg.eigh(K, M, eigvals_only=True)[:3]) * 30 / math.pi
    assert np.allclose(lateral_frequencies(des).rpm, ref, rtol=1e-9)
