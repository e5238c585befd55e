"""Equivalent dynamic load P (ISO 281) and static load P0 (ISO 76).

Sources: ISO 281:2007 Table 3 and ISO 76:2006 Table 1 as given in shared/references.md
(confidence "memory": the standards were not at hand); derived checks from references.md.
"""
from __future__ import annotations

import numpy as np
import pytest

from engine.bearings.equivalent import (angular_contact_factors, deep_groove_e_Y, dynamic_factors,
                                        equivalent_dynamic_load, equivalent_static_load,
                                        static_factors)

# ISO 281:2007 Table 3, single-row deep groove (references.md, memory)
F0FA_C0 = [0.172, 0.345, 0.689, 1.03, 1.38, 2.07, 3.45, 5.17, 6.89]
E = [0.19, 0.22, 0.26, 0.28, 0.30, 0.34, 0.38, 0.42, 0.44]
Y = [2.30, 1.99, 1.71, 1.55, 1.45, 1.31, 1.15, 1.04, 1.00]


@pytest.mark.parametrize("x, e, y", list(zip(F0FA_C0, E, Y)))
def test_deep_groove_table_points(x, e, y):
    # ISO 281:2007 Table 3 (memory, references.md): exact at the table points
    ee, yy = deep_groove_e_Y(x)
    assert float(ee) == pytest.approx(e, abs=1e-12)
    assert float(yy) == pytest.approx(y, abs=1e-12)


def test_deep_groove_between_points_is_linear():
    # ISO 281:2007 Table 3 note: linear interpolation between table points (memory).
    # Midway between 1.03 and 1.38: e = (0.28 + 0.30)/2 = 0.29, Y = (1.55 + 1.45)/2 = 1.50 (derived)
    ee, yy = deep_groove_e_Y(0.5 * (1.03 + 1.38))
    assert float(ee) == pytest.approx(0.29, abs=1e-12)
    assert float(yy) == pytest.approx(1.50, abs=1e-12)
    # a quarter of the way from 0.345 to 0.689: e = 0.22 + 0.25·0.04 = 0.23, Y = 1.99 − 0.25·0.28 = 1.92
    ee, yy = deep_groove_e_Y(0.345 + 0.25 * (0.689 - 0.345))
    assert float(ee) == pytest.approx(0.23, abs=1e-12)
    assert float(yy) == pytest.approx(1.92, abs=1e-12)


def test_deep_groove_table_consistency():
    # Consistency noted in references.md: X + Y·e ≈ 1 at every table point (X = 0.56), within 0.03
    assert np.all(np.abs(0.56 + np.array(Y) * np.array(E) - 1.0) < 0.03)


def test_deep_groove_P_branches():
    # Fa/Fr ≤ e -> P = Fr (X = 1, Y = 0), ISO 281 cl. 6.2 (memory)
    C0, f0 = 10000.0, 14.0
    Fr, Fa = 5000.0, 200.0           # f0·Fa/C0 = 0.28 -> e ≈ 0.21 > Fa/Fr = 0.04
    f = dynamic_factors("deep_groove_ball", Fa_N=Fa, C0_N=C0, f0=f0)
    assert float(equivalent_dynamic_load(Fr, Fa, **f)) == pytest.approx(Fr)
    # Fa/Fr > e: f0·Fa/C0 = 14·1000/10000 = 1.40 -> Y = 1.45 − (0.02/0.69)·0.14 (linear), X = 0.56
    Fr, Fa = 1000.0, 1000.0
    Y_exp = 1.45 + (1.40 - 1.38) / (2.07 - 1.38) * (1.31 - 1.45)
    f = dynamic_factors("deep_groove_ball", Fa_N=Fa, C0_N=C0, f0=f0)
    assert float(equivalent_dynamic_load(Fr, Fa, **f)) == pytest.approx(0.56 * Fr + Y_exp * Fa, rel=1e-12)


@pytest.mark.parametrize("alpha, e, X2, Y2, Y1p, X2p, Y2p", [
    (25, 0.68, 0.41, 0.87, 0.92, 0.67, 1.41),   # ISO 281 Table 3 (references.md, memory)
    (30, 0.80, 0.39, 0.76, 0.78, 0.63, 1.24),
    (40, 1.14, 0.35, 0.57, 0.55, 0.57, 0.93),
])
def test_angular_contact_factors(alpha, e, X2, Y2, Y1p, X2p, Y2p):
    s = angular_contact_factors(alpha)
    p = angular_contact_factors(alpha, paired=True)
    assert (float(s["e"]), float(s["X2"]), float(s["Y2"])) == pytest.approx((e, X2, Y2))
    assert (float(p["Y1"]), float(p["X2"]), float(p["Y2"])) == pytest.approx((Y1p, X2p, Y2p))
    assert float(s["Y1"]) == 0 and float(p["X1"]) == 1


def test_angular_contact_out_of_range_raises():
    with pytest.raises(ValueError, match="20"):
        angular_contact_factors(15.0)


def test_tapered_pair_derived_check_P():
    # references.md derived check: Fr_A 4 kN, Fr_B 2 kN, Y 1.6, e 0.375, Fa_A 1.25, Fa_B 2.25 kN
    # -> P_A = 4.0 kN (Fa/Fr = 0.3125 ≤ e), P_B = 0.4·2 + 1.6·2.25 = 4.40 kN
    f = dynamic_factors("tapered_roller", e=0.375, Y1=0.0, Y2=1.6)
    P = equivalent_dynamic_load(np.array([4000.0, 2000.0]), np.array([1250.0, 2250.0]), **f)
    assert P.tolist() == pytest.approx([4000.0, 4400.0])


def test_tapered_matched_pair_uses_double_row_factors():
    # ISO 281 cl. 6.2 double-row radial roller: ≤ e X = 1, Y = 0.45 cot α; > e X = 0.67, Y = 0.67 cot α
    # (references.md, memory); with Y(single) = 0.4 cot α these are 1.125·Y and 1.675·Y (derived)
    f = dynamic_factors("tapered_roller", e=0.375, Y1=0.0, Y2=1.6, paired=True)
    assert float(f["Y1"]) == pytest.approx(1.8) and float(f["Y2"]) == pytest.approx(2.68)
    assert f["X2"] == pytest.approx(0.67)


@pytest.mark.parametrize("kind", ["cylindrical_roller", "needle_roller"])
def test_radial_roller_P_is_Fr(kind):
    # ISO 281 cl. 6.2: radial roller bearings with α = 0 carry radial load only, P = Fr (memory)
    f = dynamic_factors(kind)
    assert float(equivalent_dynamic_load(3210.0, 999.0, **f)) == 3210.0


def test_spherical_and_self_aligning_branches():
    # spherical roller ≤ e: X = 1, Y1; > e: X = 0.67, Y2 (ISO 281, references.md, memory)
    f = dynamic_factors("spherical_roller", e=0.3, Y1=2.2, Y2=3.4)
    assert float(equivalent_dynamic_load(1000.0, 200.0, **f)) == pytest.approx(1000 + 2.2 * 200)
    assert float(equivalent_dynamic_load(1000.0, 500.0, **f)) == pytest.approx(670 + 3.4 * 500)
    # self-aligning ball > e: X = 0.65 (references.md, memory)
    f = dynamic_factors("self_aligning_ball", e=0.3, Y1=2.1, Y2=3.2)
    assert float(equivalent_dynamic_load(1000.0, 500.0, **f)) == pytest.approx(650 + 3.2 * 500)


def test_static_equivalent_load():
    # ISO 76 (references.md, memory): deep groove X0 0.6, Y0 0.5, P0 = max(X0·Fr + Y0·Fa, Fr)
    X0, Y0, fl = static_factors("deep_groove_ball")
    assert float(equivalent_static_load(1000.0, 2000.0, X0=X0, Y0=Y0, floor=fl)) == pytest.approx(1600.0)
    assert float(equivalent_static_load(1000.0, 100.0, X0=X0, Y0=Y0, floor=fl)) == pytest.approx(1000.0)
    # angular contact 40°, single: X0 0.5, Y0 0.26; pair: X0 1, Y0 0.52 (references.md, memory)
    X0, Y0, fl = static_factors("angular_contact_ball", contact_angle_deg=40.0)
    assert float(equivalent_static_load(1000.0, 3000.0, X0=X0, Y0=Y0, floor=fl)) == pytest.approx(1280.0)
    X0, Y0, fl = static_factors("angular_contact_ball", contact_angle_deg=40.0, paired=True)
    assert float(equivalent_static_load(1000.0, 3000.0, X0=X0, Y0=Y0, floor=fl)) == pytest.approx(2560.0)
    # cylindrical: P0 = Fr
    X0, Y0, fl = static_factors("cylindrical_roller")
    assert float(equivalent_static_load(1000.0, 3000.0, X0=X0, Y0=Y0, floor=fl)) == 1000.0
