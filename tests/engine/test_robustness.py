"""Robustness: bad or extreme input never crashes the engine or the web layer.

The rule (project rules, "bad input never crashes and never loses the user's work"):
``engine.solve(design)`` either returns a Result whose every number is finite, or raises
``engine.DesignError`` / ``engine.EngineError`` whose ``errors`` are Issue(path, message)
with string paths; ``POST /api/solve`` answers 200 or 4xx with ``{"errors": [...]}``; the
editor's live-edit post answers 200 or 422, never 500.

Method: a seeded, bounded mutation fuzzer (``random.Random(seed)``, no extra dependency).
It starts from the three demo designs in ``sample_data/`` and applies one to three
mutations per case: deleted keys, numbers set to 0, negatives, huge, tiny, NaN, strings,
None, lists; supports and elements moved to the ends and off the shaft, duplicated and
removed; every bearing type with every axial role; zero and extreme speeds; odd time
fractions; one-segment shafts, 0.01 mm segments, 200 segments; elastic supports with tiny
and huge stiffness; gear, helical and bevel parameters at their bounds; gravity along x;
and so on. Each case is reproducible from its index (the seed is ``SEED + index``).

No value here is an engineering check value: these tests check behaviour, not numbers.
A design the fuzzer builds is solved with a coarse mesh most of the time (``analysis.elements``
10–40, itself a mutation the design format allows) so that a few thousand cases fit the CI budget.
"""
from __future__ import annotations

import copy
import json
import math
import random
import signal
import time
from contextlib import contextmanager
from typing import Any, Callable

import pytest

import engine
from engine.model import BEARING_TYPES, ELEMENT_KINDS, DesignError
from tests.conftest import load_sample

SEED = 20261201
SAMPLES = ("countershaft.json", "line_shaft.json", "bevel_pinion.json")
AXIAL = ("both", "none", "+x", "-x")
CASE_TIME_LIMIT_S = 20.0  # one solve taking longer than this counts as a hang (generous: CI is noisy)
# the whole file stays under ~40 s on 2 cores: these counts were sized for that
N_ENGINE = 2400
N_API = 160
N_FORM = 120

BASES = {name: load_sample(name) for name in SAMPLES}

# --- values a field may be set to --------------------------------------------------------

NASTY_VALUES: tuple[Any, ...] = (
    0, 0.0, -1.0, -1e12, 1e12, 1e-12, -1e-12, 1e300, -1e300, float("nan"), float("inf"),
    float("-inf"), "abc", "", "12", None, [], {}, [1, 2], True, False, 10**400, "x" * 5000,
)
DELETE = object()


def _leaves(doc: Any, path: tuple = ()):
    """Every (container, key, path) in a JSON-like tree, containers included."""
    if isinstance(doc, dict):
        for k, v in doc.items():
            yield doc, k, path + (k,)
            yield from _leaves(v, path + (k,))
    elif isinstance(doc, list):
        for i, v in enumerate(doc):
            yield doc, i, path + (i,)
            yield from _leaves(v, path + (i,))


def _length(doc: dict) -> float:
    try:
        return float(sum(float(s["length_mm"]) for s in doc["shaft"]["segments"]))
    except Exception:  # noqa: BLE001 - a mutated document may hold anything
        return 300.0


def _rows(doc: dict, key: str) -> list:
    v = doc.get(key)
    return v if isinstance(v, list) else []


# --- mutations: each takes (rng, doc) and edits doc in place, returning a short label ----

def m_value(rng: random.Random, doc: dict) -> str:
    """Any key anywhere set to a nasty value, or deleted."""
    spots = list(_leaves(doc))
    if not spots:
        return "noop"
    cont, key, path = rng.choice(spots)
    v = DELETE if rng.random() < 0.2 else rng.choice(NASTY_VALUES)
    if v is DELETE:
        if isinstance(cont, dict):
            del cont[key]
        else:
            cont.pop(key)
        return f"del {path}"
    cont[key] = copy.deepcopy(v)
    return f"set {path}={str(v)[:20]}"


def m_number(rng: random.Random, doc: dict) -> str:
    """A numeric leaf scaled or set to an edge value (keeps the type, so the design may stay valid)."""
    spots = [(c, k, p) for c, k, p in _leaves(doc) if isinstance(c[k], (int, float)) and not isinstance(c[k], bool)]
    if not spots:
        return "noop"
    cont, key, path = rng.choice(spots)
    v = cont[key]
    new = rng.choice([0.0, -abs(v), v * 1e6, v * 1e-6, 1e12, 1e-12, v + 1e-9, v * 0.999, v * 1.001,
                      float(rng.randint(-5, 500)), 1e-300, 1e-30, 1e30])
    cont[key] = new
    return f"num {path}={new:g}"


def m_move(rng: random.Random, doc: dict) -> str:
    """A support or element moved to an end, just off the shaft, onto another item, or anywhere."""
    which = rng.choice(["supports", "elements"])
    rows = _rows(doc, which)
    if not rows:
        return "noop"
    r = rng.choice(rows)
    if not isinstance(r, dict):
        return "noop"
    L = _length(doc)
    others = [o.get("x_mm") for o in _rows(doc, "supports") + _rows(doc, "elements") if isinstance(o, dict)]
    x = rng.choice([0.0, L, L + 1e-6, L - 1e-6, L + 5.0, -1.0, -1e-9, 1e-9, L / 2, rng.uniform(0, L),
                    rng.choice(others) if others else 0.0, 1e12])
    r["x_mm"] = x
    return f"move {which} {r.get('id')} to {x}"


def m_dup(rng: random.Random, doc: dict) -> str:
    """A support or element duplicated, with the same id or a new one, at the same or another place."""
    which = rng.choice(["supports", "elements"])
    rows = _rows(doc, which)
    if not rows:
        return "noop"
    r = copy.deepcopy(rng.choice(rows))
    if isinstance(r, dict):
        if rng.random() < 0.7:
            r["id"] = f"{r.get('id', 'X')}dup{rng.randint(0, 99)}"
        if rng.random() < 0.6:
            r["x_mm"] = rng.uniform(0, _length(doc))
    rows.insert(rng.randrange(len(rows) + 1), r)
    return f"dup {which}"


def m_remove(rng: random.Random, doc: dict) -> str:
    """Supports or elements removed, down to none."""
    which = rng.choice(["supports", "elements", "load_cases", "shaft.segments"])
    rows = doc.get("shaft", {}).get("segments") if which == "shaft.segments" and isinstance(doc.get("shaft"), dict) \
        else _rows(doc, which)
    if not isinstance(rows, list) or not rows:
        return "noop"
    n = rng.choice([1, 1, 1, len(rows)])
    for _ in range(min(n, len(rows))):
        rows.pop(rng.randrange(len(rows)))
    return f"remove {n} of {which}"


def m_bearings(rng: random.Random, doc: dict) -> str:
    """Every support given a random bearing type (or none), axial role and contact angle."""
    out = []
    for s in _rows(doc, "supports"):
        if not isinstance(s, dict):
            continue
        s["bearing_type"] = rng.choice(BEARING_TYPES + (None,))
        s["axial"] = rng.choice(AXIAL)
        if rng.random() < 0.3:
            s["contact_angle_deg"] = rng.choice([1e-9, 10, 15, 19.99, 20, 25, 40, 45, 45.01, 60, 89.999])
        elif "contact_angle_deg" in s and rng.random() < 0.5:
            del s["contact_angle_deg"]
        if rng.random() < 0.15:
            s["bore_mm"] = rng.choice([10, 17, 25, 40, 45, 50, 1e-6, 999, 33.3])
        if rng.random() < 0.1:
            s["dimension_series"] = rng.choice([["02"], ["03", "02"], [], ["zz"]])
        out.append(f"{s['bearing_type']}/{s['axial']}")
    return "bearings " + ",".join(out)


def m_speed(rng: random.Random, doc: dict) -> str:
    """Zero, tiny, huge speeds; odd time fractions; many or single load cases; factors."""
    cases = _rows(doc, "load_cases")
    if not cases:
        return "noop"
    what = rng.randrange(6)
    if what == 0:
        c = rng.choice(cases)
        if isinstance(c, dict):
            c["speed_rpm"] = rng.choice([0, 0.0, 1e-12, 1e-3, 1e6, 1e12, -100])
        return "speed"
    if what == 1:  # time fractions: random split (sums to 1), or off
        w = [rng.random() + 1e-9 for _ in cases]
        tot = sum(w)
        for c, wi in zip(cases, w):
            if isinstance(c, dict):
                c["time_fraction"] = wi / tot if rng.random() < 0.8 else rng.choice([0, 1, 1e-12, 2])
        return "time fractions"
    if what == 2:  # many cases
        base = next((c for c in cases if isinstance(c, dict)), {"name": "c", "speed_rpm": 100})
        n = rng.choice([1, 2, 30])
        doc["load_cases"] = [{**copy.deepcopy(base), "name": f"c{i}", "time_fraction": 1.0 / n,
                              "speed_rpm": rng.choice([1e-6, 1, 100, 3000, 1e5])} for i in range(n)]
        return f"{n} cases"
    if what == 3:
        c = rng.choice(cases)
        if isinstance(c, dict):
            c[rng.choice(["torque_factor", "force_factor"])] = rng.choice([0, -1, 1e-12, 1e12, -1e12, 3])
        return "factor"
    if what == 4:  # per-case torques
        c = rng.choice(cases)
        ids = [e.get("id") for e in _rows(doc, "elements") if isinstance(e, dict)] + ["nope"]
        if isinstance(c, dict):
            c["torques_Nm"] = {rng.choice(ids): rng.choice([0, 100, -100, 1e12]) for _ in range(rng.randint(1, 3))}
        return "torques_Nm"
    c = rng.choice(cases)
    if isinstance(c, dict):
        c["torque_alternating_pct"] = rng.choice([0, 50, 1000, 1e-12])
    return "alternating"


def m_geometry(rng: random.Random, doc: dict) -> str:
    """One-segment shafts, 0.01 mm segments, 200 segments, hollow, tiny or huge diameters."""
    shaft = doc.get("shaft")
    if not isinstance(shaft, dict) or not isinstance(shaft.get("segments"), list) or not shaft["segments"]:
        return "noop"
    segs = shaft["segments"]
    L = _length(doc)
    d0 = next((s.get("d_mm") for s in segs if isinstance(s, dict) and isinstance(s.get("d_mm"), (int, float))), 40)
    what = rng.randrange(7)
    if what == 0:
        shaft["segments"] = [{"length_mm": L, "d_mm": d0}]
        return "one segment"
    if what == 1:  # a very short segment inserted somewhere (a thin collar or a groove-like step)
        segs.insert(rng.randrange(len(segs) + 1), {"length_mm": 0.01, "d_mm": d0 * rng.choice([0.5, 1.0, 1.2]),
                                                    "fillet_r_mm": rng.choice([None, 0.001, 1.0])})
        segs[:] = [{k: v for k, v in s.items() if v is not None} if isinstance(s, dict) else s for s in segs]
        return "0.01 mm segment"
    if what == 2:  # very many segments
        n = 200
        shaft["segments"] = [{"length_mm": L / n, "d_mm": d0 * (1.0 + 0.1 * (i % 2)),
                              **({"fillet_r_mm": 0.5} if i % 3 == 0 else {})} for i in range(n)]
        return "200 segments"
    if what == 3:
        s = rng.choice(segs)
        if isinstance(s, dict) and isinstance(s.get("d_mm"), (int, float)):
            s["bore_mm"] = rng.choice([0, s["d_mm"] * 0.5, s["d_mm"] * 0.999999, s["d_mm"], s["d_mm"] * 1.1])
        return "bore"
    if what == 4:
        for s in segs:
            if isinstance(s, dict):
                s["d_mm"] = rng.choice([1e-3, 0.5, 1e4, 1e6])
        return "all diameters extreme"
    if what == 5:  # whole shaft scaled (supports and elements with it)
        k = rng.choice([1e-4, 1e-2, 100.0, 1e4])
        for s in segs:
            if isinstance(s, dict) and isinstance(s.get("length_mm"), (int, float)):
                s["length_mm"] *= k
        for r in _rows(doc, "supports") + _rows(doc, "elements"):
            if isinstance(r, dict) and isinstance(r.get("x_mm"), (int, float)):
                r["x_mm"] *= k
        return f"scaled lengths x{k:g}"
    shaft["grooves"] = [{"x_mm": rng.choice([0.0, L, rng.uniform(0, L), L + 1]),
                         "depth_mm": rng.choice([0.1, 1.0, d0 / 2 - 1e-6, d0]),
                         **({"r_mm": rng.choice([1e-9, 0.1, 5])} if rng.random() < 0.5 else {}),
                         **({"width_mm": rng.choice([1e-9, 1.3, 50])} if rng.random() < 0.3 else {})}
                        for _ in range(rng.randint(1, 3))]
    return "grooves"


def m_elastic(rng: random.Random, doc: dict) -> str:
    """Elastic supports with tiny or huge stiffness (some or all of them)."""
    sups = [s for s in _rows(doc, "supports") if isinstance(s, dict)]
    if not sups:
        return "noop"
    chosen = sups if rng.random() < 0.4 else [rng.choice(sups)]
    for s in chosen:
        s["radial_stiffness_N_per_mm"] = rng.choice([1e-12, 1e-3, 1.0, 1e5, 1e12, 1e20, 1e300])
    return f"elastic x{len(chosen)}"


def _new_element(rng: random.Random, L: float, i: int) -> dict:
    kind = rng.choice(ELEMENT_KINDS)
    e: dict[str, Any] = {"id": f"N{i}", "kind": kind, "x_mm": rng.choice([0.0, L, rng.uniform(0, L)])}
    if kind in ("gear", "bevel_gear", "pulley", "sprocket"):
        e["pitch_d_mm"] = rng.choice([1e-6, 1.0, 100.0, 1e6])
    if kind == "gear":
        e["pressure_angle_deg"] = rng.choice([1e-9, 14.5, 20, 44.9999])
        e["helix_angle_deg"] = rng.choice([0, 1e-9, 30, 59.9999])
        if e["helix_angle_deg"] or rng.random() < 0.3:
            e["hand"] = rng.choice(["right", "left"])
        e["mesh_angle_deg"] = rng.choice([0, 90, -720, 1e6, 359.999])
        if rng.random() < 0.3:
            e["mate_slope_rad"] = rng.choice([0, -1, 1e-3, 10])
    elif kind == "bevel_gear":
        e["pressure_angle_deg"] = rng.choice([1e-9, 20, 44.9999])
        e["pitch_cone_angle_deg"] = rng.choice([1e-9, 45, 89.9999])
        e["apex"] = rng.choice(["+x", "-x"])
    elif kind == "pulley":
        if rng.random() < 0.5:
            e["tension_ratio"] = rng.choice([1.0000001, 2, 1e12])
        else:
            e["pull_factor"] = rng.choice([1e-12, 1.5, 1e6])
        e["wrap_angle_deg"] = rng.choice([1e-9, 180, 360])
        e["strand_angle_deg"] = rng.choice([0, 90, -45, 1e5])
    elif kind == "sprocket":
        e["wrap_angle_deg"] = rng.choice([1e-9, 120, 360])
        e["strand_angle_deg"] = rng.choice([0, 270])
    elif kind == "force":
        for k in ("Fx_N", "Fy_N", "Fz_N", "arm_y_mm", "arm_z_mm"):
            if rng.random() < 0.6:
                e[k] = rng.choice([0, -1000, 1e12, -1e-12, 500])
    elif kind == "moment":
        e["My_Nm"], e["Mz_Nm"] = rng.choice([0, 100, -1e9]), rng.choice([0, -50, 1e9])
    if kind in ("gear", "bevel_gear", "pulley", "sprocket", "coupling"):
        e["torque_Nm"] = rng.choice([None, 0, 100, -100, 1e12, 1e-12])
    if rng.random() < 0.4:
        e["mass_kg"] = rng.choice([0, 1e-12, 5, 1e6])
    if rng.random() < 0.2:
        e["keyway"] = rng.choice(["end_milled", "sled_runner"])
    if rng.random() < 0.2:
        e["press_fit"] = True
    if rng.random() < 0.15:  # the mounting keys (engine.mounting) at their bounds
        e["press_fit"] = {"fit": rng.choice(["H7/s6", "H7/u6", "H7/k6", "H6/r5"]),
                          "hub_outer_d_mm": rng.choice([1e-9, 50, 1e9]), "friction": rng.choice([1e-9, 0.12, 1])}
    if rng.random() < 0.15:
        e["keyway"] = "end_milled"
        e["key"] = {k: rng.choice([1e-9, 3, 1e9]) for k in rng.sample(["b_mm", "h_mm", "t1_mm", "length_mm"], 2)}
    if rng.random() < 0.3:
        e["width_mm"] = rng.choice([1e-9, 20, 80, 1e9])
    if rng.random() < 0.2:
        e["inertia_kg_m2"] = rng.choice([0, 1e-12, 0.05, 1e9])
    return e


def m_elements(rng: random.Random, doc: dict) -> str:
    """Elements of random kinds with parameters at their bounds added, or all replaced."""
    L = _length(doc)
    new = [_new_element(rng, L, i) for i in range(rng.randint(1, 3))]
    if rng.random() < 0.5 or not isinstance(doc.get("elements"), list):
        doc["elements"] = new
    else:
        doc["elements"].extend(new)
    return "elements " + ",".join(e["kind"] for e in new)


def m_gear_bounds(rng: random.Random, doc: dict) -> str:
    """Existing gears, bevel gears, pulleys and sprockets pushed to their parameter bounds."""
    out = []
    for e in _rows(doc, "elements"):
        if not isinstance(e, dict):
            continue
        k = e.get("kind")
        if k == "gear":
            e["helix_angle_deg"] = rng.choice([0, 59.9999, 60, 1e-9])
            e["pressure_angle_deg"] = rng.choice([1e-9, 44.9999, 45, 20])
            e.setdefault("hand", "left")
        elif k == "bevel_gear":
            e["pitch_cone_angle_deg"] = rng.choice([1e-9, 89.9999, 90, 0])
            e["pressure_angle_deg"] = rng.choice([1e-9, 44.9999])
        elif k == "pulley":
            e["wrap_angle_deg"] = rng.choice([1e-9, 360, 360.1])
            if "tension_ratio" in e:
                e["tension_ratio"] = rng.choice([1.0 + 1e-15, 1.0000001, 1, 1e300])
        elif k == "sprocket":
            e["wrap_angle_deg"] = rng.choice([1e-9, 360])
        else:
            continue
        out.append(k)
    return "bounds " + ",".join(out)


def m_gravity(rng: random.Random, doc: dict) -> str:
    """Gravity along any axis (x included), off, or of absurd size."""
    g = rng.choice([None, {"direction": "-x"}, {"direction": "+x"}, {"direction": "+z", "g_m_s2": 1e12},
                    {"direction": "-y", "g_m_s2": 1e-12}, {"direction": "sideways"}, {"g_m_s2": 0}])
    doc["gravity"] = g
    return f"gravity {g}"


def m_material(rng: random.Random, doc: dict) -> str:
    """Material constants at extremes, including inconsistent E and G and Su below Sy."""
    shaft = doc.get("shaft")
    if not isinstance(shaft, dict):
        return "noop"
    mat = shaft.setdefault("material", {})
    if not isinstance(mat, dict):
        return "noop"
    k = rng.choice(["E_GPa", "G_GPa", "density_kg_m3", "Su_MPa", "Sy_MPa", "Se_MPa"])
    mat[k] = rng.choice([1e-12, 1e-3, 1.0, 30.0, 1e6, 1e12])
    return f"material {k}={mat[k]:g}"


def m_requirements(rng: random.Random, doc: dict) -> str:
    """Requirements at their bounds; lubricant and contamination at theirs."""
    req = doc.setdefault("requirements", {})
    if not isinstance(req, dict):
        return "noop"
    choices = {
        "life_h": [1e-12, 1, 1e12], "reliability_pct": [90, 99.9999999, 99.99, 95],
        "application_factor": [1, 1e12], "s0_min": [1e-12, 1e12], "fatigue_safety_min": [1e-12, 1e6],
        "yield_safety_min": [1e-12, 1e6], "critical_speed_margin_pct": [0, 99.999],
        "gear_deflection_max_mm": [1e-12, 1e6], "gear_slope_max_rad": [1e-12, 10],
        "shaft_temperature_C": [-60, 540], "reliability_method": ["weibull", "iso281"],
        "fatigue_criterion": ["de_goodman", "de_gerber", "asme_elliptic", "soderberg"],
        "notch_sensitivity": ["neuber", "kuhn_hardrath"], "contamination_ec": [0, 1e-12, 1, None],
        "lubricant": [{"iso_vg": 2, "operating_temp_C": 200}, {"iso_vg": 3200, "operating_temp_C": -40},
                      {"iso_vg": 68, "operating_temp_C": 60, "viscosity_index": 0},
                      {"iso_vg": 68, "operating_temp_C": 60, "viscosity_index": 400},
                      {"iso_vg": 2, "operating_temp_C": -40, "viscosity_index": 400}, None],
    }
    for _ in range(rng.randint(1, 3)):
        k = rng.choice(list(choices))
        req[k] = copy.deepcopy(rng.choice(choices[k]))
    return "requirements"


def m_analysis(rng: random.Random, doc: dict) -> str:
    doc["analysis"] = {"elements": rng.choice([10, 11, 37, 120, 400]),  # 2000: one test below
                       "shear_deformation": rng.random() < 0.5}
    return f"analysis {doc['analysis']}"


MUTATIONS: tuple[Callable[[random.Random, dict], str], ...] = (
    m_value, m_value, m_number, m_number, m_move, m_move, m_dup, m_remove, m_bearings, m_bearings,
    m_speed, m_geometry, m_geometry, m_elastic, m_elements, m_gear_bounds, m_gravity, m_material,
    m_requirements, m_analysis,
)


def mutate(index: int) -> tuple[str, dict]:
    """Case ``index``: a demo design with one to three mutations (reproducible)."""
    rng = random.Random(SEED + index)
    name = SAMPLES[index % len(SAMPLES)]
    doc = copy.deepcopy(BASES[name])
    labels = [name.split(".")[0]]
    for _ in range(rng.choice([1, 1, 2, 2, 3])):
        try:
            labels.append(rng.choice(MUTATIONS)(rng, doc))
        except (TypeError, ValueError, OverflowError, KeyError, AttributeError):
            labels.append("noop (earlier mutation left no room)")
    if "analysis" not in doc and rng.random() < 0.85:
        doc["analysis"] = {"elements": rng.choice([10, 16, 24, 40])}  # coarse mesh: fast
    return " | ".join(labels), doc


# --- the oracle --------------------------------------------------------------------------

class _Hang(Exception):
    pass


@contextmanager
def time_limit(seconds: float):
    """Raise _Hang when the block runs longer than ``seconds`` (SIGALRM; main thread only)."""
    def handler(signum, frame):  # noqa: ARG001
        raise _Hang(f"took longer than {seconds:g} s")
    old = signal.signal(signal.SIGALRM, handler)
    signal.setitimer(signal.ITIMER_REAL, seconds)
    try:
        yield
    finally:
        signal.setitimer(signal.ITIMER_REAL, 0)
        signal.signal(signal.SIGALRM, old)


def non_finite(obj: Any, path: str = "") -> list[str]:
    """Paths of every float in a dumped result that is NaN or infinite."""
    bad: list[str] = []
    if isinstance(obj, float):
        if not math.isfinite(obj):
            bad.append(f"{path}={obj}")
    elif isinstance(obj, dict):
        for k, v in obj.items():
            bad += non_finite(v, f"{path}.{k}")
    elif isinstance(obj, (list, tuple)):
        for i, v in enumerate(obj):
            bad += non_finite(v, f"{path}[{i}]")
            if len(bad) > 3:
                break
    return bad


def check_engine(doc: Any) -> str | None:
    """None when the engine behaves; else what went wrong."""
    try:
        with time_limit(CASE_TIME_LIMIT_S):
            result = engine.solve(doc)
    except DesignError as exc:
        if not exc.errors:
            return "DesignError with no errors"
        for i in exc.errors:
            if not isinstance(i.path, str) or not isinstance(i.message, str) or not i.message:
                return f"bad issue {i!r}"
        return None
    except _Hang as exc:
        return f"hang: {exc}"
    except Exception as exc:  # noqa: BLE001 - the very thing under test
        return f"{type(exc).__name__}: {str(exc)[:300]}"
    text = result.model_dump_json()
    if "NaN" in text or "Infinity" in text:
        return "NaN/Infinity in the result JSON"
    bad = non_finite(result.model_dump())
    if bad:
        return "non-finite numbers in the result: " + ", ".join(bad[:4])
    return None


def _report(failures: list[tuple[int, str, str]]) -> str:
    lines = [f"{len(failures)} case(s) misbehaved; reproduce one with mutate(index):"]
    for idx, label, what in failures[:25]:
        lines.append(f"  [{idx}] {label}\n      -> {what}")
    return "\n".join(lines)


# --- the fuzzers ----------------------------------------------------------------------------

def test_engine_fuzz():
    """A few thousand mutated demo designs: a Result with finite numbers, or a DesignError."""
    failures, solved, t0 = [], 0, time.perf_counter()
    for idx in range(N_ENGINE):
        label, doc = mutate(idx)
        what = check_engine(doc)
        if what is not None:
            failures.append((idx, label, what))
    assert not failures, _report(failures)
    assert time.perf_counter() - t0 < 600


def test_every_bearing_type_with_every_axial_role():
    """Each support of each demo given every bearing type × axial role (the others as given)."""
    failures = []
    for name in SAMPLES:
        for si in range(len(BASES[name]["supports"])):
            for bt in BEARING_TYPES + (None,):
                for ax in AXIAL:
                    doc = copy.deepcopy(BASES[name])
                    doc["supports"][si].update(bearing_type=bt, axial=ax)
                    doc["analysis"] = {"elements": 12}
                    what = check_engine(doc)
                    if what is not None:
                        failures.append((0, f"{name} supports[{si}] {bt}/{ax}", what))
    assert not failures, _report(failures)


def test_two_support_role_pairs():
    """A simple two-bearing shaft with every pair of (bearing type, axial role) on its supports."""
    base = copy.deepcopy(BASES["countershaft.json"])
    base["analysis"] = {"elements": 10}
    rng = random.Random(SEED)
    combos = [(a, b, c, d) for a in BEARING_TYPES + (None,) for b in AXIAL for c in BEARING_TYPES + (None,) for d in AXIAL]
    failures = []
    for a, b, c, d in rng.sample(combos, 220):
        doc = copy.deepcopy(base)
        doc["supports"][0].update(bearing_type=a, axial=b)
        doc["supports"][1].update(bearing_type=c, axial=d)
        what = check_engine(doc)
        if what is not None:
            failures.append((0, f"A {a}/{b}, B {c}/{d}", what))
    assert not failures, _report(failures)


@pytest.fixture(scope="module")
def client(tmp_path_factory):
    import os

    os.environ.setdefault("SHAFTWRIGHT_DB", str(tmp_path_factory.mktemp("fuzz") / "fuzz.db"))
    from fastapi.testclient import TestClient

    from app.main import create_app

    with TestClient(create_app(), raise_server_exceptions=False) as c:
        yield c


def _json_or_text(doc: Any) -> bytes:
    try:
        return json.dumps(doc, allow_nan=True).encode()
    except (ValueError, OverflowError):
        return b"{not json"


def test_api_fuzz(client):
    """POST /api/solve with mutated documents: 200 with a finite result, or 4xx with errors."""
    failures = []
    for k in range(N_API):
        idx = 100_000 + k
        label, doc = mutate(idx)
        body = _json_or_text(doc)
        with time_limit(CASE_TIME_LIMIT_S * 2):
            r = client.post("/api/solve", content=body, headers={"content-type": "application/json"})
        if r.status_code == 200:
            if "NaN" in r.text or "Infinity" in r.text:
                failures.append((idx, label, "NaN/Infinity in a 200 answer"))
        elif 400 <= r.status_code < 500:
            errs = r.json().get("errors")
            if not errs or not all(isinstance(e.get("path"), str) and e.get("message") for e in errs):
                failures.append((idx, label, f"{r.status_code} without a usable errors list: {r.text[:200]}"))
        else:
            failures.append((idx, label, f"status {r.status_code}: {r.text[:200]}"))
    assert not failures, _report(failures)


FORM_TEXTS = ("", " ", "abc", "1e400", "-1e400", "nan", "inf", "-0", "0", "1,5", "1.5.5", "1e-300", "−3",
              "1 000", "99999999999999999999", "0x10", "1_0", "<script>", "x" * 3000, "1e12", "-1")


def test_editor_form_fuzz(client):
    """The editor's live-edit post with mangled form fields: 200 or 422, never a 500."""
    from app.web import design_to_form

    failures = []
    for k in range(N_FORM):
        rng = random.Random(SEED + 200_000 + k)
        name = SAMPLES[k % len(SAMPLES)]
        doc = copy.deepcopy(BASES[name])
        label = [name]
        if rng.random() < 0.5:  # a valid-but-odd design first, then its form mangled
            for _ in range(rng.randint(1, 2)):
                fn = rng.choice((m_move, m_bearings, m_geometry, m_elastic, m_elements, m_gear_bounds,
                                 m_gravity, m_speed))
                label.append(fn(rng, doc))
        try:
            form = design_to_form(doc, rng.choice(["si", "us"]))
        except Exception as exc:  # noqa: BLE001
            failures.append((k, " | ".join(label), f"design_to_form: {type(exc).__name__}: {exc}"))
            continue
        keys = [f for f in form if not f.endswith("_extra")]
        for _ in range(rng.randint(1, 4)):
            f = rng.choice(keys)
            form[f] = rng.choice(FORM_TEXTS)
            label.append(f"{f}={form[f][:12]!r}")
        if rng.random() < 0.2:
            xk = [f for f in form if f.endswith("_extra")]
            if xk:
                f = rng.choice(xk)
                form[f] = rng.choice(["{", "[]", '{"grooves": 5}', '{"x_mm": "abc"}', "null", '{"analysis": {"elements": -1}}'])
                label.append(f"{f} mangled")
        with time_limit(CASE_TIME_LIMIT_S * 2):
            r = client.post("/editor/solve", data=form)
        if r.status_code not in (200, 422):
            failures.append((k, " | ".join(label), f"status {r.status_code}: {r.text[:200]}"))
        elif "the engine could not solve this design" in r.text:
            failures.append((k, " | ".join(label), "engine fault shown on the page: " +
                             r.text.split("the engine could not solve this design", 1)[1][:200]))
    assert not failures, _report(failures)



@pytest.mark.parametrize("name", ["countershaft.json", "bevel_pinion.json"])
def test_every_number_at_every_extreme(name):
    """Each number of a demo, one at a time, set to ±1e-300, 1e-12, 1e12 and ±1e300."""
    failures = []
    for cont, key, path in list(_leaves(BASES[name])):
        if not isinstance(cont[key], (int, float)) or isinstance(cont[key], bool):
            continue
        for v in (1e-300, 1e-12, 1e12, 1e300, -1e300):
            doc = copy.deepcopy(BASES[name])
            c = doc
            for p in path[:-1]:
                c = c[p]
            c[path[-1]] = v
            doc["analysis"] = {"elements": 10}
            what = check_engine(doc)
            if what is not None:
                failures.append((0, f"{name} {path}={v:g}", what))
    assert not failures, _report(failures)


def test_finest_mesh_allowed():
    """analysis.elements at its upper bound (MAX_MESH_ELEMENTS, 20 000) on the three-bearing demo:
    solves in bounds."""
    from engine.model import MAX_MESH_ELEMENTS

    doc = copy.deepcopy(BASES["line_shaft.json"])
    doc["analysis"] = {"elements": MAX_MESH_ELEMENTS}
    assert check_engine(doc) is None
