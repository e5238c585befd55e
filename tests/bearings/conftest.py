"""Helpers for the bearing tests: small designs built without the shaft solver."""
from __future__ import annotations

import pytest

from engine.model import parse_design


def make_design(supports, *, cases=None, requirements=None, d_mm=40.0, L_mm=300.0):
    """A plain shaft of one diameter with the given supports and no elements (no solver needed)."""
    return parse_design({
        "name": "bearing test",
        "shaft": {"segments": [{"length_mm": L_mm, "d_mm": d_mm}]},
        "supports": supports,
        "elements": [],
        "load_cases": cases or [{"name": "run", "speed_rpm": 1000, "time_fraction": 1.0}],
        "requirements": requirements or {},
        "gravity": None,
    })


@pytest.fixture
def design_factory():
    return make_design
