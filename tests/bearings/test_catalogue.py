"""The bundled bearing table and the validation of user tables.

Rating formulas: ISO 281:2007 cl. 6.1 and ISO 76 (references.md, memory); the derived check
Cr ≈ 14.0 kN of references.md. Envelopes: ISO 15 (references.md, read up to d ≈ 60).
"""
from __future__ import annotations

import re
from pathlib import Path

import numpy as np
import pytest

from engine.bearings.catalogue import BUNDLED_PATH, COLUMNS, bundled_catalogue, load_catalogue, parse_catalogue
from engine.bearings.ratings import dynamic_rating_ball, fc_ball, static_rating_roller
from engine.model import DesignError

HEAD = ",".join(COLUMNS)


def test_rating_formula_derived_check():
    # references.md derived check: i = 1, Z = 9, Dw = 7.938, Dpw = 39 mm -> fc ≈ 59.9, Cr ≈ 14.0 kN
    assert float(fc_ball(7.938 / 39.0)) == pytest.approx(59.9, abs=0.1)  # "≈ 59.9": 59.85 by interpolation
    assert dynamic_rating_ball(i=1, Z=9, Dw_mm=7.938, Dpw_mm=39.0, alpha_deg=0) == pytest.approx(14000, rel=0.01)


def test_static_roller_formula_by_hand():
    # ISO 76 cl. 5.2 (memory): C0r = 44·(1 − Dwe·cosα/Dpw)·i·Z·Lwe·Dwe·cosα; Z 14, Lwe 8, Dwe 7, Dpw 40, α 0
    assert static_rating_roller(i=1, Z=14, Lwe_mm=8, Dwe_mm=7, Dpw_mm=40, alpha_deg=0) == pytest.approx(
        44 * (1 - 7 / 40) * 14 * 8 * 7)


def test_bundled_table_coverage():
    cat = bundled_catalogue()
    need = {("deep_groove_ball", "10"), ("deep_groove_ball", "02"), ("deep_groove_ball", "03"),
            ("cylindrical_roller", "02"), ("tapered_roller", "02"), ("spherical_roller", "22"),
            ("self_aligning_ball", "02")}
    have = set(zip(cat.bearing_type, cat.series))
    assert need <= have
    ac = cat.rows_of("angular_contact_ball")
    assert set(cat.contact_angle_deg[ac]) == {25.0, 40.0}
    for kind in ("deep_groove_ball", "angular_contact_ball", "cylindrical_roller", "self_aligning_ball"):
        d = cat.d_mm[cat.rows_of(kind)]
        assert d.min() <= 10 and d.max() >= 100, kind
    for kind in ("tapered_roller", "spherical_roller"):
        d = cat.d_mm[cat.rows_of(kind)]
        assert d.min() <= 20 and d.max() >= 100, kind


def test_bundled_envelopes_match_iso15():
    # ISO 15 boundary dimensions (references.md; read in DIN 625-1 tables up to d ≈ 60)
    cat = bundled_catalogue()
    want = {("10", 25): (47, 12), ("02", 25): (52, 15), ("03", 25): (62, 17), ("02", 60): (110, 22),
            ("03", 100): (215, 47), ("10", 100): (150, 24)}
    for (ser, d), (D, B) in want.items():
        r = np.flatnonzero((cat.bearing_type == "deep_groove_ball") & (cat.series == ser) & (cat.d_mm == d))
        assert r.size == 1 and (cat.D_mm[r[0]], cat.B_mm[r[0]]) == (D, B)


def test_bundled_header_and_designations():
    text = BUNDLED_PATH.read_text(encoding="utf-8")
    head = "\n".join(ln for ln in text.splitlines() if ln.startswith("#"))
    assert "ILLUSTRATIVE RATINGS" in head and "supplier" in head and "ISO 281" in head
    cat = bundled_catalogue()
    assert all(re.fullmatch(r"(DG|AC25|AC40|SA|CR|TR|SR)-\d\d-\d+", str(d)) for d in cat.designation)
    # ratings are positive and C/C0 plausible for every row
    assert np.all(cat.C_N > 0) and np.all(cat.C0_N > 0) and np.all(cat.Cu_N < cat.C0_N)


def test_bundled_table_is_what_the_script_builds():
    # Regression snapshot (not validation): the committed CSV equals the builder's output
    import importlib.util
    spec = importlib.util.spec_from_file_location("btb", Path(BUNDLED_PATH).with_name("build_bearing_table.py"))
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    assert mod.build() == BUNDLED_PATH.read_text(encoding="utf-8")


def test_bigger_envelope_rates_higher():
    # Within one series and type C grows with the bore (a property of the ISO formulas)
    cat = bundled_catalogue()
    for kind in ("deep_groove_ball", "cylindrical_roller", "tapered_roller", "spherical_roller"):
        for ser in set(cat.series[cat.rows_of(kind)]):
            r = cat.rows_of(kind)
            r = r[cat.series[r] == ser]
            r = r[np.argsort(cat.d_mm[r])]
            assert np.all(np.diff(cat.C_N[r]) > 0), (kind, ser)


def test_user_table_loads(tmp_path):
    p = tmp_path / "mine.csv"
    p.write_text("# my supplier's data\n" + HEAD + ",notes\n"
                 "M-1,deep_groove_ball,02,30,62,16,,19500,11200,,11000,13.9,,,,,spare\n"
                 "M-2,tapered_roller,02,30,62,17.25,14,44000,47000,5200,8000,,0.37,,1.6,0.9,\n",
                 encoding="utf-8")
    cat = load_catalogue(p)
    assert len(cat) == 2 and cat.row_line.tolist() == [3, 4]
    assert cat.Cu_N[0] == pytest.approx(11200 / 22)  # estimated: ISO 281 approximation C0/22 (references.md)
    assert cat.Y1[1] == 0.0
    assert any("notes" in w for w in cat.warnings) and any("Cu_N" in w for w in cat.warnings)


def _errors(text):
    with pytest.raises(DesignError) as ei:
        parse_catalogue(text)
    return {e.path: e.message for e in ei.value.errors}


def test_validation_names_row_and_column():
    text = ("# header line 1\n" + HEAD + "\n"
            "A,deep_groove_ball,02,30,62,16,,abc,11200,,11000,13.9,,,,\n"        # line 3: bad number
            "B,roller_skate,02,30,62,16,,19500,11200,,11000,13.9,,,,\n"          # line 4: unknown type
            "C,deep_groove_ball,02,30,25,16,,19500,11200,,11000,13.9,,,,\n"      # line 5: D <= d
            "C,deep_groove_ball,02,35,72,17,,25000,15000,,9000,,,,,\n"           # line 6: dup + no f0
            "E,tapered_roller,02,30,62,17,14,44000,47000,,8000,,,,1.6,0.9\n"     # line 7: no e
            "F,angular_contact_ball,02,30,62,16,,20000,12000,,9000,,,,,\n"       # line 8: no angle
            "G,cylindrical_roller,02,30,62,16,,-5,11200,,11000,,,,,\n")          # line 9: negative C
    errs = _errors(text)
    assert "'abc' is not a number" in errs["row 3, column C_N"]
    assert "roller_skate" in errs["row 4, column bearing_type"]
    assert "must exceed the bore" in errs["row 5, column D_mm"]
    assert "used twice" in errs["row 6, column designation"]
    assert "f0" in errs["row 6, column f0"]
    assert "e" in errs["row 7, column e"]
    assert "contact angle" in errs["row 8, column contact_angle_deg"]
    assert "positive" in errs["row 9, column C_N"]


def test_validation_header_problems():
    assert "C0_N" in _errors("designation,bearing_type,series,d_mm,D_mm,B_mm,C_N\n")["header"]
    assert "no header" in _errors("# only comments\n")["header"]
    assert "no rows" in _errors(HEAD + "\n")["header"]


def test_unreadable_file(tmp_path):
    with pytest.raises(DesignError) as ei:
        load_catalogue(tmp_path / "missing.csv")
    assert ei.value.errors[0].path == "catalogue"


def test_non_finite_values_rejected():
    errs = _errors(HEAD + "\nA,deep_groove_ball,02,30,62,16,,inf,11200,,11000,13.9,,,,\n")
    assert "row 2, column C_N" in errs
