"""engine.solve_many: one path for one design and for many.

Each design's entry equals what engine.solve gives for it alone (its bands are factored beside
the others', by the same arithmetic), errors stand in place without touching the others, and
the solve holds no dense 2N×2N matrix (memory grows with N, not N²).
"""
from __future__ import annotations

import copy
import tracemalloc

import numpy as np

import engine
from engine.model import DesignError, EngineError
from tests.conftest import load_sample


def test_each_entry_is_the_solve_of_that_design_alone():
    docs = [load_sample(n) for n in ("countershaft.json", "line_shaft.json", "bevel_pinion.json")]
    bad = copy.deepcopy(docs[0])
    bad["supports"][1]["x_mm"] = -5.0
    out = engine.solve_many([docs[0], bad, docs[1], docs[2]])
    assert isinstance(out[1], DesignError) and any("supports[1]" in e.path for e in out[1].errors)
    for doc, res in zip(docs, (out[0], out[2], out[3])):
        assert res.model_dump() == engine.solve(doc).model_dump()


def test_a_design_its_supports_do_not_hold_is_an_engine_error_in_its_place():
    good = load_sample("countershaft.json")
    loose = copy.deepcopy(good)
    for s in loose["supports"]:
        s["radial_stiffness_N_per_mm"] = 1e-12  # springs far too soft to hold the shaft
    out = engine.solve_many([good, loose, good], diagrams=False)
    assert not isinstance(out[0], Exception) and not isinstance(out[2], Exception)
    assert out[0].model_dump() == out[2].model_dump()
    assert isinstance(out[1], EngineError)
    assert out[1].errors[0].path == "supports" and "do not hold the shaft" in out[1].errors[0].message


def test_the_bending_solve_memory_grows_linearly():
    """20 000 elements: a dense stiffness would take 40 002² × 8 B ≈ 12.8 GB; the band
    takes 4 × 40 002 × 8 B ≈ 1.3 MB. Peak traced memory of the analysis stays far below."""
    from engine.solve import analyse

    doc = load_sample("line_shaft.json")
    doc["analysis"] = {"elements": 20_000}
    d = engine.parse_design(doc)
    tracemalloc.start()
    a = analyse(d)
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    assert np.isfinite(a.beam.u_mm).all()
    assert peak < 100e6, f"peak {peak / 1e6:.0f} MB"
