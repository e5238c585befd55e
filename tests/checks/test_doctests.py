"""Run the docstring examples of the shaft modules: they re-run published or derived values
(Shigley 9th ed. Example 7-1 for the strength functions; see each docstring for its source)."""
from __future__ import annotations

import doctest
import importlib

import pytest

MODULES = ["engine.strength", "engine.stiffness", "engine.dynamics", "engine.checks", "engine.beam",
           "engine.loads", "engine.mounting"]


@pytest.mark.parametrize("name", MODULES)
def test_module_doctests(name):
    res = doctest.testmod(importlib.import_module(name), optionflags=doctest.NORMALIZE_WHITESPACE)
    assert res.failed == 0
