"""Display units and significant figures.

Conversion factors are exact by definition (NIST SP 811:2008, appendix B.8 and B.9):
1 in = 25.4 mm, 1 lbf = 4.4482216152605 N, 1 lb = 0.45359237 kg, 1 psi = 6894.757293168 Pa,
1 hp = 745.699872 W (mechanical horsepower, 550 ft·lbf/s).
"""
from __future__ import annotations

import math

import pytest

from app import units


def test_exact_factors():
    assert units.to_display(25.4, "length", "us") == 1.0
    assert math.isclose(units.to_display(4.4482216152605, "force", "us"), 1.0)
    assert math.isclose(units.to_display(4.4482216152605 * 0.3048, "moment", "us"), 1.0)
    assert math.isclose(units.to_display(6.894757293168, "stress", "us"), 1.0)  # 1 ksi
    assert math.isclose(units.to_display(6.894757293168, "modulus", "us"), 1.0)  # 1 Mpsi = 10^6 psi
    assert math.isclose(units.to_display(205.0, "modulus", "us"), 29.7325, rel_tol=1e-5)  # steel E
    assert math.isclose(units.to_display(0.745699872, "power", "us"), 1.0)
    assert math.isclose(units.to_display(27679.9047, "density", "us"), 1.0, rel_tol=1e-8)  # 1 lb/in³


def test_round_trip():
    for q in units.QUANTITIES:
        for v in (0.0, 1e-4, 3.7, 12345.6):
            assert math.isclose(units.from_display(units.to_display(v, q, "us"), q, "us"), v, abs_tol=1e-12)


def test_significant_figures():
    assert units.fmt(1234.5678, "force") == "1235"
    assert units.fmt(0.012345, "length") == "0.01235"
    assert units.fmt(-42.0, "moment", unit=True) == "\u221242\u202fN·m"
    assert units.fmt(None) == "–"
    assert units.fmt(2.5e-7, "slope") == "2.5×10⁻⁷"
    # lives read in full digits, grouped by three (ISO 80000-1:2009, 7.3.1), not as 5.597×10⁸
    assert units.fmt(5.597e8, "time") == "559\u202f700\u202f000"
    assert units.fmt(88060.0, "time", unit=True) == "88\u202f060\u202fh"
    assert units.fmt(7850.0, "density") == "7850"  # four digits stay whole
    assert units.fmt(-12346.0, "force") == "\u221212\u202f350"
    assert units.fmt(1.755e7, "time") == "17\u202f550\u202f000"
    assert units.fmt(2.4e12, "time") == "2.4×10¹²"  # beyond 10⁹ a power of ten
    assert units.fmt(0.0001204, "slope") == "0.00012"  # three figures for slopes
    assert units.fmt(0.00001523, "slope") == "0.0000152"
    assert units.fmt_input(2.5e-7, "slope") == "2.5e-07"  # inputs stay parseable
    assert units.fmt(25.4, "length", "us", unit=True) == "1\u202fin"


def test_input_text_parses_back():
    for v in (47.0, 0.0005, 7850.0, -95.0):
        t = units.fmt_input(v, "length", "si")
        assert float(t) == v


def test_temperature_converts_with_its_offset():
    # °F = °C · 9/5 + 32 (NIST SP 811, Appendix B.8); −40 is the same on both scales
    from app import units

    assert units.to_display(100.0, "temperature", "us") == pytest.approx(212.0)
    assert units.to_display(-40.0, "temperature", "us") == pytest.approx(-40.0)
    assert units.from_display(212.0, "temperature", "us") == pytest.approx(100.0)
    assert units.unit_label("temperature", "us") == "°F" and units.unit_label("temperature", "si") == "°C"
