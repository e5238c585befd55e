"""Regressions for the crashes the robustness fuzzer (``test_robustness.py``) found.

Each test is one input that raised a traceback or gave NaN/inf before its fix, and the
behaviour it has now: a DesignError or EngineError naming the field, or a finite Result.
No value here is an engineering check value.
"""
from __future__ import annotations

import json

import pytest

import engine
from engine.model import DesignError
from tests.conftest import load_sample


def _demo(name: str = "countershaft.json") -> dict:
    doc = load_sample(name)
    doc["analysis"] = {"elements": 12}
    return doc


def _finite(result) -> bool:
    """Every number of the result is finite (json refuses NaN and infinity with allow_nan=False)."""
    json.dumps(result.model_dump(), allow_nan=False)
    return True


def _issues(doc: dict) -> list[tuple[str, str]]:
    with pytest.raises(DesignError) as exc:
        engine.solve(doc)
    return [(i.path, i.message) for i in exc.value.errors]


def test_angular_contact_angle_outside_table_is_a_design_error():
    """Was ValueError from the factor table (rate_bearings looked the angle up for its first-pass
    induced ratio before the axial resolution could reject it); now an EngineError at the
    support's contact_angle_deg, the same one the axial resolution gives."""
    doc = _demo()
    doc["supports"][0].update(bearing_type="angular_contact_ball", axial="-x", contact_angle_deg=10)
    doc["supports"][1].update(bearing_type="angular_contact_ball", axial="+x")
    with pytest.raises(engine.EngineError) as exc:
        engine.solve(doc)
    assert exc.value.errors[0].path == "supports[0].contact_angle_deg"
    assert "20–45°" in exc.value.errors[0].message
