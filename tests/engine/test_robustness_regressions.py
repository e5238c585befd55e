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


@pytest.mark.parametrize("path, value", [
    (("shaft", "segments", 0, "length_mm"), 1e300),   # was ValueError in np.linspace (mesh count overflow)
    (("shaft", "segments", 3, "d_mm"), 1e300),        # was NaN reactions (d⁴ overflow)
    (("shaft", "material", "Su_MPa"), 1e300),         # was OverflowError in the S–N line
    (("shaft", "material", "E_GPa"), 1e300),          # was NaN reactions
    (("shaft", "material", "density_kg_m3"), 1e300),  # was inf equivalent load (weight)
    (("elements", 1, "torque_Nm"), -1e300),           # was inf equivalent load
    (("elements", 1, "mass_kg"), 1e300),
    (("load_cases", 0, "speed_rpm"), 1e300),          # was inf mean load (speed · P^p)
    (("load_cases", 0, "torque_factor"), -1e300),
    (("requirements", "application_factor"), 1e300),
])
def test_numbers_beyond_1e15_are_refused_with_their_path(path, value):
    doc = _demo()
    c = doc
    for p in path[:-1]:
        c = c[p]
    c[path[-1]] = value
    issues = _issues(doc)
    want = ".".join(str(p) for p in path).replace(".0.", "[0].").replace(".1.", "[1].").replace(".3.", "[3].")
    assert issues[0][0] == want, issues
    assert "at most 1e+15" in issues[0][1] or "at least -1e+15" in issues[0][1], issues


@pytest.mark.parametrize("path", [
    ("elements", 1, "pitch_d_mm"),          # was NaN reactions (force = torque / 1e-300)
    ("shaft", "material", "Su_MPa"),        # was NaN smallest diameter
    ("shaft", "material", "Sy_MPa"),
])
def test_positive_numbers_below_1e_15_are_refused_with_their_path(path):
    doc = _demo()
    c = doc
    for p in path[:-1]:
        c = c[p]
    c[path[-1]] = 1e-300
    issues = _issues(doc)
    assert issues[0][0] == ".".join(str(p) for p in path).replace(".1.", "[1]."), issues
    assert "too small to compute with" in issues[0][1]


def test_tiny_and_huge_but_sane_numbers_still_solve():
    """The bounds leave every number from 1e-12 to 1e12 alone (no behaviour change there)."""
    doc = _demo()
    doc["elements"][1]["pitch_d_mm"] = 1e-12
    assert _finite(engine.solve(doc))
    doc = _demo()
    doc["supports"][1]["radial_stiffness_N_per_mm"] = 1e12
    doc["shaft"]["material"]["Sy_MPa"] = 1e-12
    assert _finite(engine.solve(doc))


def test_a_non_finite_result_becomes_an_engine_error(monkeypatch):
    """Backstop: whatever still overflows inside the engine gives an EngineError naming the part
    of the design, never NaN in the result (JSON cannot carry it; the API answered 500)."""
    import numpy as np

    from engine import strength

    real = strength.min_diameter
    monkeypatch.setattr(strength, "min_diameter", lambda **kw: real(**kw) * np.nan)
    with pytest.raises(engine.EngineError) as exc:
        engine.solve(_demo())
    issue = exc.value.errors[0]
    assert issue.path == "shaft" and "d_min_mm" in issue.message and "overflowed" in issue.message


def test_a_non_finite_diagram_becomes_an_engine_error_at_its_load_case(monkeypatch):
    import numpy as np

    import sys

    solve_module = sys.modules["engine.solve"]  # the package re-exports the function under that name
    real = solve_module.axial_and_torque

    def poisoned(*args, **kw):
        N, T = real(*args, **kw)
        return N, T * np.inf

    monkeypatch.setattr(solve_module, "axial_and_torque", poisoned)
    with pytest.raises(engine.EngineError) as exc:
        engine.solve(_demo())
    assert exc.value.errors[0].path == "load_cases[0]"
    assert "diagrams.load_cases.rated.T_Nm" in exc.value.errors[0].message


# --- web layer ---------------------------------------------------------------------------

@pytest.fixture
def client(tmp_path, monkeypatch):
    monkeypatch.setenv("SHAFTWRIGHT_DB", str(tmp_path / "regressions.db"))
    from fastapi.testclient import TestClient

    from app.main import create_app

    with TestClient(create_app(), raise_server_exceptions=False) as c:
        yield c


@pytest.mark.parametrize("body, status", [
    (b"[" * 100_000, 422),          # was 500: RecursionError in json.loads
    (b'{"shaft": NaN}', 422),       # NaN is refused as JSON, not passed on
    (b'{"name": "' + b"x" * 1_100_000 + b'"}', 413),  # the byte limit now applies to /api/solve
])
def test_api_solve_applies_the_document_limits(client, body, status):
    r = client.post("/api/solve", content=body, headers={"content-type": "application/json"})
    assert r.status_code == status, r.text[:200]
    assert r.json()["errors"][0]["path"] == ""


def test_api_solve_answers_an_engine_fault_with_an_errors_list(client, monkeypatch):
    """Was a bare 500 for any exception but DesignError; now 422 with the fault in words."""
    import sys

    from app import work

    monkeypatch.setattr(sys.modules["engine.solve"], "shaft_checks",
                        lambda a: (_ for _ in ()).throw(ZeroDivisionError("boom")))
    # the patch lives in this process: run the bounded solve here rather than in a child
    # (the child's fault reaches the API the same way: tests/server/test_stalls.py)
    monkeypatch.setattr(work, "run_bounded", lambda fn, *a, budget_s, what, kind="solve", **k: fn(*a, **k))
    work.clear_cache()
    r = client.post("/api/solve", json=load_sample("countershaft.json"))
    assert r.status_code == 422
    assert "ZeroDivisionError" in r.json()["errors"][0]["message"]


def test_editor_form_with_unparseable_extra_keys(client):
    """Was 500: a hidden _extra field nested past the JSON parser's depth raised RecursionError."""
    from app.web import design_to_form

    form = design_to_form(load_sample("countershaft.json"))
    form["shaft._extra"] = "[" * 100_000
    r = client.post("/editor/solve", data=form)
    assert r.status_code == 200, r.text[:300]


@pytest.mark.parametrize("key, n", [("supports", 51), ("elements", 201), ("load_cases", 101)])
def test_counts_that_would_tie_the_solver_up_are_refused(key, n):
    """Was a 50 s, 3 GB solve (500 bearings × 500 load cases at 2000 elements, a 100 kB
    document the web limits let through); now a DesignError at the list's path."""
    doc = _demo()
    if key == "supports":
        doc["supports"] = [{"id": f"S{i}", "x_mm": 300.0 * i / n, "bearing_type": None} for i in range(n)]
    elif key == "elements":
        doc["elements"] = [{"id": f"F{i}", "kind": "force", "x_mm": 1.0 + i, "Fy_N": -10} for i in range(n)]
    else:
        doc["load_cases"] = [{"name": f"c{i}", "speed_rpm": 100, "time_fraction": 1 / n} for i in range(n)]
    issues = _issues(doc)
    assert (key, f"'{key}' has {n} entries; at most {n - 1} are accepted") in issues
