"""The beam solver against closed-form beam theory.

Symbols: P point load [N], L span [mm], a, b distances of the load from the left and right
support [mm], E Young's modulus [MPa], I second moment of area [mm⁴].
Sources: Roark's Formulas for Stress and Strain, 8th ed., Table 8.1 (cases 1e, 3e, 2e);
Shigley, Mechanical Engineering Design, 9th ed., Table A-9 (cases 6, 10); as collected in
shared/references.md. These are Euler–Bernoulli results, so these tests switch shear
deformation off (``analysis.shear_deformation = false``); the shear test at the end says
why the default (Timoshenko) differs, and by how much.
Tolerances: reactions 0.1 %, deflections 1 % (the issue's); the FE is exact at nodes for
point loads, so the actual agreement is far tighter.
"""
import math

import numpy as np
import pytest

import engine
from tests.conftest import beam_design

E, d = 200e3, 50.0
I = math.pi * d**4 / 64


def diagram(r, key, case="c"):
    return np.array(r.diagrams.x_mm), np.array(r.diagrams.load_cases[case][key])


def at(x, arr, x0):
    return arr[np.argmin(abs(x - x0))]


def test_simply_supported_point_load():
    # Roark Table 8.1 case 1e / Shigley Table A-9-6: R1 = Pb/L, R2 = Pa/L,
    # y(a) = P a² b² / (3 E I L); for a ≤ b, y_max = P a (L² − a²)^1.5 / (9√3 E I L)
    P, L, a = 1000.0, 1000.0, 300.0
    b = L - a
    r = engine.solve(beam_design(forces=[(a, {"Fy_N": -P})]))
    s = r.load_cases[0].supports
    assert s[0].Fy_N == pytest.approx(P * b / L, rel=1e-3)
    assert s[1].Fy_N == pytest.approx(P * a / L, rel=1e-3)
    x, uy = diagram(r, "uy_mm")
    assert at(x, uy, a) == pytest.approx(-P * a**2 * b**2 / (3 * E * I * L), rel=1e-2)
    ymax = P * a * (L**2 - a**2) ** 1.5 / (9 * math.sqrt(3) * E * I * L)
    assert r.shaft.max_deflection_mm == pytest.approx(ymax, rel=1e-2)
    assert r.load_cases[0].max_deflection_x_mm == pytest.approx(L - math.sqrt((L**2 - a**2) / 3), abs=L / 200)
    # end slopes: θ1 = P a b (L + b)/(6 E I L) (Roark Table 8.1 case 1e)
    _, sl = diagram(r, "slope_y_rad")
    assert sl[0] == pytest.approx(-P * a * b * (L + b) / (6 * E * I * L), rel=1e-2)
    # largest moment P a b / L under the load, sagging (positive in our convention)
    _, Mz = diagram(r, "Mz_Nm")
    assert Mz.max() == pytest.approx(P * a * b / L / 1000, rel=1e-3)


def test_overhung_load():
    # Shigley Table A-9-10, overhang a beyond support B: R_A = −P a / L, R_B = P (L + a)/L,
    # tip deflection P a² (L + a) / (3 E I)
    P, L, a = 800.0, 600.0, 150.0
    r = engine.solve(beam_design(L=L + a, supports=((0.0, "both"), (L, "none")), forces=[(L + a, {"Fy_N": -P})]))
    s = r.load_cases[0].supports
    assert s[0].Fy_N == pytest.approx(-P * a / L, rel=1e-3)
    assert s[1].Fy_N == pytest.approx(P * (L + a) / L, rel=1e-3)
    x, uy = diagram(r, "uy_mm")
    assert uy[-1] == pytest.approx(-P * a**2 * (L + a) / (3 * E * I), rel=1e-2)


def test_two_equal_spans_statically_indeterminate():
    # Roark Table 8.1 / Shigley Table A-9: continuous beam of two equal spans l, P at each
    # mid-span: reactions 5P/16, 11P/8, 5P/16; moment over the middle support 3Pl/16;
    # deflection under each load 7 P l³ / (768 E I)
    P, l = 1200.0, 500.0
    r = engine.solve(beam_design(L=2 * l, supports=((0, "both"), (l, "none"), (2 * l, "none")),
                                 forces=[(l / 2, {"Fy_N": -P}), (1.5 * l, {"Fy_N": -P})]))
    R = [s.Fy_N for s in r.load_cases[0].supports]
    assert R == pytest.approx([5 * P / 16, 11 * P / 8, 5 * P / 16], rel=1e-3)
    x, Mz = diagram(r, "Mz_Nm")
    assert at(x, Mz, l) == pytest.approx(-3 * P * l / 16 / 1000, rel=1e-3)  # hogging
    _, uy = diagram(r, "uy_mm")
    assert at(x, uy, l / 2) == pytest.approx(-7 * P * l**3 / (768 * E * I), rel=1e-2)


def test_loads_in_both_planes_superpose():
    # The two transverse planes are independent for a round shaft: a load in y and one in z
    # give the simply supported reactions in each plane; Fr is their resultant.
    L = 1000.0
    r = engine.solve(beam_design(forces=[(250.0, {"Fy_N": -1000.0}), (600.0, {"Fz_N": 2000.0})]))
    A, B = r.load_cases[0].supports
    assert (A.Fy_N, B.Fy_N) == pytest.approx((750.0, 250.0), rel=1e-3)
    assert (A.Fz_N, B.Fz_N) == pytest.approx((-2000 * 400 / L, -2000 * 600 / L), rel=1e-3)
    assert A.Fr_N == pytest.approx(math.hypot(750.0, 800.0), rel=1e-3)
    x, uz = diagram(r, "uz_mm")
    a, b = 600.0, 400.0
    assert at(x, uz, a) == pytest.approx(2000 * a**2 * b**2 / (3 * E * I * L), rel=1e-2)


def test_equilibrium_with_moment_and_offset_axial_force():
    # Statics (derived): an axial force F acting at radius r above the axis bends the shaft
    # like a couple −F·r about z (it turns the shaft clockwise seen with y up); the reactions
    # form the opposite couple over the span: the left support pulls down, the right pushes up.
    F, r_arm, L = 2000.0, 60.0, 1000.0
    r = engine.solve(beam_design(forces=[(400.0, {"Fx_N": F, "arm_y_mm": r_arm})]))
    A, B = r.load_cases[0].supports
    assert A.Fx_N == pytest.approx(-F)
    assert A.Fy_N == pytest.approx(-F * r_arm / L, rel=1e-6) and B.Fy_N == pytest.approx(F * r_arm / L, rel=1e-6)
    x, N = diagram(r, "N_N")
    assert at(x, N, 200.0) == pytest.approx(F) and at(x, N, 700.0) == pytest.approx(0.0, abs=1e-9)


def test_elastic_supports_add_their_deflection():
    # Springs in series with the beam (derived): a central load P on supports of stiffness k
    # deflects P/(2k) more than on rigid supports: P L³/(48 E I) + P/(2k).
    P, L, k = 1000.0, 1000.0, 5e4
    des = beam_design(forces=[(500.0, {"Fy_N": -P})])
    for s in des["supports"]:
        s["radial_stiffness_N_per_mm"] = k
    r = engine.solve(des)
    x, uy = diagram(r, "uy_mm")
    assert at(x, uy, 500.0) == pytest.approx(-(P * L**3 / (48 * E * I) + P / (2 * k)), rel=1e-3)


def test_shear_deformation_adds_to_short_thick_shafts():
    # Timoshenko beam theory, simply supported, central load: y = P L³/(48 E I) + P L/(4 κ G A)
    # (Timoshenko & Gere, Mechanics of Materials; Cowper's κ for a solid circle,
    # 6(1+ν)/(7+6ν)). For L/d = 3 the shear term is about 10 % of the total; for
    # L/d = 20 it is below 0.3 %, which is why the Euler–Bernoulli closed forms above hold
    # to 1 % with shear on for slender shafts.
    P, G = 1000.0, 80e3
    nu = E / (2 * G) - 1
    kappa = 6 * (1 + nu) / (7 + 6 * nu)
    A = math.pi * d**2 / 4
    for L in (150.0, 1000.0):
        r = engine.solve(beam_design(L=L, supports=((0, "both"), (L, "none")), forces=[(L / 2, {"Fy_N": -P})], shear=True))
        x, uy = diagram(r, "uy_mm")
        timo = P * L**3 / (48 * E * I) + P * L / (4 * kappa * G * A)
        assert at(x, uy, L / 2) == pytest.approx(-timo, rel=1e-3)
    eb = P * 1000.0**3 / (48 * E * I)
    assert abs(at(x, uy, 500.0)) / eb - 1 == pytest.approx(12 * E * I / (kappa * G * A * 1000.0**2), rel=1e-3)


def test_hollow_section_stiffness():
    # I = π (d⁴ − di⁴)/64 for a hollow shaft (any strength-of-materials text)
    P, L, di = 1000.0, 1000.0, 30.0
    Ih = math.pi * (d**4 - di**4) / 64
    r = engine.solve(beam_design(forces=[(500.0, {"Fy_N": -P})], bore=di))
    x, uy = diagram(r, "uy_mm")
    assert at(x, uy, 500.0) == pytest.approx(-P * L**3 / (48 * E * Ih), rel=1e-3)


def test_self_weight_uniform_load():
    # Uniform load w on a simply supported span: y_max = 5 w L⁴ / (384 E I), reactions w L/2
    # (Roark Table 8.1 case 2e). w = ρ A g with the shaft's own weight.
    des = beam_design(L=1000.0)
    des["gravity"] = {"direction": "-y", "g_m_s2": 9.81}
    des["shaft"]["material"]["density_kg_m3"] = 7850.0
    r = engine.solve(des)
    w = 7850e-9 * math.pi * d**2 / 4 * 9.81
    assert [s.Fy_N for s in r.load_cases[0].supports] == pytest.approx([w * 500, w * 500], rel=1e-6)
    assert r.shaft.max_deflection_mm == pytest.approx(5 * w * 1000.0**4 / (384 * E * I), rel=1e-3)
