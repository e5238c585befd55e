"""Shared test helpers: demo designs and a small design builder."""
from __future__ import annotations

import os

# One BLAS thread, as the app runs (app/server.py): the systems are small, and threaded BLAS on
# two shared cores made a single solve ten to a hundred times slower. Must precede numpy.
for _var in ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS"):
    os.environ.setdefault(_var, "1")

import tempfile

# No test may write the store into the working tree: unless a test sets its own, the app's
# default database lives in a temporary folder for the whole run.
os.environ.setdefault("SHAFTWRIGHT_DB", os.path.join(tempfile.mkdtemp(prefix="shaftwright-tests-"), "default.db"))

import copy
import json
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
SAMPLES = ROOT / "sample_data"


def load_sample(name: str) -> dict:
    return json.loads((SAMPLES / name).read_text(encoding="utf-8"))


def beam_design(*, L=1000.0, d=50.0, supports=((0.0, "both"), (1000.0, "none")), forces=(),
                E=200.0, G=80.0, shear=False, elements=200, bore=0.0) -> dict:
    """A uniform shaft on simple supports with point forces: the textbook beam, weight off."""
    return {
        "name": "test beam",
        "shaft": {"material": {"E_GPa": E, "G_GPa": G},
                  "segments": [{"length_mm": L, "d_mm": d, "bore_mm": bore}]},
        "supports": [{"id": f"S{i}", "x_mm": x, "axial": ax, "bearing_type": None}
                     for i, (x, ax) in enumerate(supports)],
        "elements": [{"id": f"F{i}", "kind": "force", "x_mm": x, **f} for i, (x, f) in enumerate(forces)],
        "load_cases": [{"name": "c", "speed_rpm": 100}],
        "gravity": None,
        "analysis": {"shear_deformation": shear, "elements": elements},
    }


@pytest.fixture
def countershaft() -> dict:
    return copy.deepcopy(load_sample("countershaft.json"))
