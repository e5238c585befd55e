"""Run the docstring examples of the bearing modules (they re-run published or derived values)."""
from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = ["engine.bearings.equivalent", "engine.bearings.life", "engine.bearings.lubrication",
           "engine.bearings.ratings", "engine.bearings.axial", "engine.bearings.catalogue",
           "engine.bearings.candidates"]


@pytest.mark.parametrize("name", MODULES)
def test_module_doctests(name):
    res = doctest.testmod(importlib.import_module(name), optionflags=doctest.NORMALIZE_WHITESPACE)
    assert res.failed == 0


def test_engine_bearings_imports_no_web_code():
    import sys
    import engine.bearings  # noqa: F401
    for mod in list(sys.modules):
        if mod.startswith("engine.bearings"):
            src = open(sys.modules[mod].__file__, encoding="utf-8").read()
            for word in ("fastapi", "jinja2", "plotly", "import app", "from app", "open(", "write_text"):
                assert word not in src, (mod, word)
