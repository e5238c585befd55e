"""Find the arrangement: search step diameters, lengths, positions and bearings for the
lightest, most compact designs that meet every requirement.

Units: those of the design (mm, N, rpm, h); mass in kg, bearing space in mm².

Public
------
parse_search    design + ``["shaft.segments[2].d_mm=40:60:1", ...]`` -> :class:`Search`, or DesignError
run_search      the search -> :class:`SearchResult` (the Pareto front), with progress, stop and a budget
OBJECTIVES      the objectives one may choose, with their sense (smaller or larger is better)
LIMITS          designer limits one may add (an upper bound on a figure)

Variables
---------
The paths of :mod:`engine.study` (``supports.B.x_mm``, ``shaft.segments[i].d_mm`` / ``length_mm``,
``elements.<id>.x_mm``, ``supports.<id>.bearing_type``, ``arrangement`` …) plus
``supports.<id>.dimension_series`` (a choice among the bearing table's series). A number takes
``LOW:HIGH`` (continuous), ``LOW:HIGH:STEP`` (rounded to multiples of STEP from LOW),
``LOW:HIGH:R20`` (or ``R10``, ``R40``: ISO 3 preferred numbers within the bounds),
``LOW:HIGH:bores`` (a diameter: the bearing table's bores within the bounds) or a
comma-separated list; a choice takes a comma-separated list or ``*``. Paths and lists are read
by :mod:`engine.study`'s own parser (:func:`engine.study.parse_variable`,
:func:`engine.study.parse_values`); only the ``LOW:HIGH[:STEP]`` form is read here.

Objectives (of a solved design)
-------------------------------
``mass_kg``            shaft mass (smaller is better)
``bearing_space_mm2``  Σ D·B of each support's chosen bearing (smaller is better)
``max_bearing_D_mm``   the largest outer diameter of the chosen bearings (smaller is better)
``life_margin``        smallest Lnm/L_required over the chosen bearings (larger is better)
``fatigue_margin``     smallest n_fatigue/n_required over the shaft's sections (larger is better)

The chosen bearing of a support is the engine's first-ranked candidate (passing rows first, then
the smallest outer diameter and width: engine.bearings.candidates.rank), i.e. the first passing
candidate of the plain ranking whenever one passes.

Constraints: a design is feasible when the engine solves it, no check fails (status ``fail``:
lives, static safety, speed, fatigue, yield, hub connections, slopes, deflections, critical
speed, seats …), every support with a bearing type has a rated bearing, and each designer limit
holds (e.g. ``max_bearing_D_mm <= 90``).

Method
------
When every variable is discrete and the combinations number at most :data:`ENUMERATE_MAX`, all
are solved (exact). Otherwise NSGA-II (pymoo, Deb et al. 2002) over the variables, discrete ones
encoded as an index rounded to the nearest; every population is solved together by
:func:`engine.solve_many` (``diagrams=False``), the engine's one path; repeated variants are
solved once. Seeded and deterministic for a given seed and number of generations; the time
budget and ``stop()`` end the search at a generation boundary (the result says how many ran).
The front is the non-dominated set of every feasible design evaluated.
"""
from __future__ import annotations

import math
import re
import time
from typing import Any, Callable, Literal, Sequence

import numpy as np
from pydantic import BaseModel, ConfigDict

from engine.model import Design, DesignError, Issue, parse_design
from engine.study import _NUM, _RX_SEG, _SEGMENT_NUM, Variable, _set, _split, parse_values, parse_variable

__all__ = ["OBJECTIVES", "LIMITS", "ENUMERATE_MAX", "MAX_VARIABLES", "SearchVariable", "Search", "combinations",
           "FrontPoint", "SearchResult", "parse_search", "parse_limits", "run_search", "preferred_numbers",
           "evaluate_designs"]

OBJECTIVES: dict[str, tuple[str, str, Literal["min", "max"]]] = {
    "mass_kg": ("shaft mass", "kg", "min"),
    "bearing_space_mm2": ("bearing space Σ D·B", "mm²", "min"),
    "max_bearing_D_mm": ("largest bearing outer diameter", "mm", "min"),
    "life_margin": ("smallest bearing life margin Lnm/L required", "", "max"),
    "fatigue_margin": ("smallest fatigue safety margin n/n required", "", "max"),
}
LIMITS: dict[str, tuple[str, str]] = {
    "max_bearing_D_mm": ("largest bearing outer diameter", "mm"),
    "mass_kg": ("shaft mass", "kg"),
    "bearing_space_mm2": ("bearing space Σ D·B", "mm²"),
    "length_mm": ("shaft length", "mm"),
}
ENUMERATE_MAX = 400   # discrete spaces this small are solved exhaustively
MAX_VARIABLES = 12
SIGNIFICANT = 4       # objectives equal to 4 significant figures count as equal on the front
MAX_EVALUATIONS = 200_000
_ERR = "vary"

# ISO 3 preferred numbers (rounded values, one decade); ISO 3:1973 / ISO 17, from memory
_R = {
    "R10": (1.0, 1.25, 1.6, 2.0, 2.5, 3.15, 4.0, 5.0, 6.3, 8.0),
    "R20": (1.0, 1.12, 1.25, 1.4, 1.6, 1.8, 2.0, 2.24, 2.5, 2.8, 3.15, 3.55, 4.0, 4.5, 5.0, 5.6,
            6.3, 7.1, 8.0, 9.0),
    "R40": (1.0, 1.06, 1.12, 1.18, 1.25, 1.32, 1.4, 1.5, 1.6, 1.7, 1.8, 1.9, 2.0, 2.12, 2.24, 2.36,
            2.5, 2.65, 2.8, 3.0, 3.15, 3.35, 3.55, 3.75, 4.0, 4.25, 4.5, 4.75, 5.0, 5.3, 5.6, 6.0,
            6.3, 6.7, 7.1, 7.5, 8.0, 8.5, 9.0, 9.5),
}
_RX_BOUNDS = re.compile(rf"^\s*({_NUM})\s*:\s*({_NUM})\s*(?::\s*(\S+)\s*)?$")
_RX_SERIES = re.compile(r"^supports(?:\.([^.\[\]]+)|\[(\d+)\])\.dimension_series$")


def _err(path: str, message: str) -> DesignError:
    return DesignError([Issue(path=path, message=message)])


class _Frozen(BaseModel):
    model_config = ConfigDict(frozen=True)


def preferred_numbers(series: str, low: float, high: float) -> tuple[float, ...]:
    """The ISO 3 preferred numbers of ``series`` (R10, R20, R40) within [low, high].

    >>> preferred_numbers("R20", 30, 60)
    (31.5, 35.5, 40.0, 45.0, 50.0, 56.0)
    """
    base = _R[series.upper()]
    out = []
    if high <= 0:
        return ()
    for k in range(int(math.floor(math.log10(max(low, 1e-9)))) - 1, int(math.ceil(math.log10(high))) + 1):
        for b in base:
            v = round(b * 10.0**k, 6)
            if low - 1e-9 <= v <= high + 1e-9:
                out.append(v)
    return tuple(sorted(set(out)))


class SearchVariable(_Frozen):
    """One variable of a search: its study variable, its bounds (numbers) and, when discrete,
    its allowed values (a rounded range, a preferred-number series, a list or choices)."""

    variable: Variable
    low: float | None = None
    high: float | None = None
    step: str = ""                 # "", a number, or R10/R20/R40 (as given)
    values: tuple = ()             # the allowed values when discrete; () when continuous

    @property
    def path(self) -> str:
        return self.variable.path

    @property
    def discrete(self) -> bool:
        return bool(self.values)


class Search(_Frozen):
    variables: tuple[SearchVariable, ...]
    objectives: tuple[str, ...]
    limits: dict[str, float] = {}


def _series_variable(path: str, design: Design, catalogue: Any) -> Variable:
    m = _RX_SERIES.match(path)
    ident, index = m.groups()
    sups = design.supports
    if index is not None:
        if int(index) >= len(sups):
            raise _err(path, f"there is no support supports[{index}]: the design has {len(sups)}")
        sup = sups[int(index)]
    else:
        sup = next((s for s in sups if s.id == ident), None)
        if sup is None:
            raise _err(path, f"no support has the id {ident!r} (ids: {', '.join(s.id for s in sups)})")
    cat = catalogue if catalogue is not None else _catalogue(design)
    choices = tuple(sorted({str(s) for s in cat.series}))
    cur = sup.dimension_series[0] if sup.dimension_series and len(sup.dimension_series) == 1 else None
    return Variable(path=f"supports.{sup.id}.dimension_series", kind="choice",
                    label=f"dimension series at {sup.id}", current=cur, choices=choices)


def _catalogue(design: Design):
    from engine.bearings.catalogue import bundled_catalogue
    from engine.solve import _own_table

    if design.bearing_table is not None:
        return _own_table(design.bearing_table.csv, design.bearing_table.name)
    return bundled_catalogue()


def _search_variable(path: str, spec: Any, design: Design, catalogue: Any) -> SearchVariable:
    p = path.strip() if isinstance(path, str) else path
    var = (_series_variable(p, design, catalogue) if isinstance(p, str) and _RX_SERIES.match(p)
           else parse_variable(p, design))
    if var.kind == "choice":
        return SearchVariable(variable=var, values=parse_values(spec, var))
    m = _RX_BOUNDS.match(spec) if isinstance(spec, str) else None
    if m is None:
        if isinstance(spec, str) and spec.count(":") >= 1:
            raise _err(var.path, f"{spec!r} is not a range; write LOW:HIGH, LOW:HIGH:STEP or LOW:HIGH:R20, "
                                 "e.g. 40:60:1")
        values = tuple(sorted(set(parse_values(spec, var))))  # a list of numbers
        return SearchVariable(variable=var, low=values[0], high=values[-1], values=values)
    lo, hi, step = float(m.group(1)), float(m.group(2)), m.group(3) or ""
    u = f" {var.unit}" if var.unit else ""
    if not hi > lo:
        raise _err(var.path, f"the range {spec!r} must go from a lower to a higher value")
    # the bounds are checked as the study checks its values (positive, on the shaft)
    parse_values(f"{lo!r},{hi!r}", var)
    values: tuple = ()
    if step:
        if step.lower() == "bores":
            if not sv_is_diameter(var):
                raise _err(var.path, "the step 'bores' rounds a diameter to the bearing table's bores; "
                                     "use it on a diameter")
            cat = catalogue if catalogue is not None else _catalogue(design)
            values = tuple(float(b) for b in sorted(set(cat.d_mm.tolist())) if lo - 1e-9 <= b <= hi + 1e-9)
            if not values:
                raise _err(var.path, f"no bearing bore of the table lies within {lo:g}–{hi:g}{u}")
        elif step.upper() in _R:
            values = preferred_numbers(step, lo, hi)
            if not values:
                raise _err(var.path, f"no {step.upper()} preferred number lies within {lo:g}–{hi:g}{u}")
        else:
            try:
                st = float(step)
            except ValueError:
                raise _err(var.path, f"the step {step!r} is not a number, R10, R20, R40 or bores") from None
            if not (math.isfinite(st) and st > 0):
                raise _err(var.path, f"the step {step!r} must be a positive number")
            n = int(math.floor((hi - lo) / st + 1e-9)) + 1
            if n > 100_000:
                raise _err(var.path, f"the step {st:g}{u} gives {n} values; take a coarser step")
            values = tuple(round(lo + k * st, 9) for k in range(n))
    return SearchVariable(variable=var, low=lo, high=hi, step=step, values=values)


def sv_is_diameter(var: Variable) -> bool:
    return var.path.endswith(".d_mm") or var.path.endswith(".bore_mm")


def parse_limits(items: Sequence[str] | dict[str, float] | None) -> dict[str, float]:
    """Designer limits ``["max_bearing_D_mm<=90", ...]`` or a mapping -> {name: upper bound}."""
    out: dict[str, float] = {}
    if not items:
        return out
    pairs = items.items() if isinstance(items, dict) else []
    if not isinstance(items, dict):
        parsed = []
        for it in items:
            name, sep, val = str(it).partition("<=")
            if not sep:
                raise _err("limit", f"{it!r} is not a limit; write NAME<=VALUE, e.g. max_bearing_D_mm<=90")
            parsed.append((name.strip(), val.strip()))
        pairs = parsed
    for name, val in pairs:
        if name not in LIMITS:
            raise _err("limit", f"unknown limit {name!r}; use one of {', '.join(LIMITS)}")
        try:
            v = float(val)
        except (TypeError, ValueError):
            raise _err("limit", f"the limit on {LIMITS[name][0]} ({val!r}) is not a number") from None
        if not math.isfinite(v) or v <= 0:
            raise _err("limit", f"the limit on {LIMITS[name][0]} must be a positive number")
        out[name] = v
    return out


def parse_search(design: Any, vary: Sequence[Any], objectives: Sequence[str] = ("mass_kg",), *,
                 limits: Any = None, catalogue: Any = None) -> Search:
    """A :class:`Search`: ``vary`` items ``"PATH=LOW:HIGH[:STEP]"``, ``"PATH=a,b,c"`` or
    ``{"path", "values"}``; ``objectives`` names of :data:`OBJECTIVES`. DesignError naming the
    field when any is wrong."""
    design = parse_design(design)
    if isinstance(vary, (str, dict)):
        vary = [vary]
    vary = list(vary or [])
    if not vary:
        raise _err(_ERR, "mark at least one design variable to vary, e.g. shaft.segments[2].d_mm=40:60:1")
    if len(vary) > MAX_VARIABLES:
        raise _err(_ERR, f"{len(vary)} variables; at most {MAX_VARIABLES} are searched together")
    out: list[SearchVariable] = []
    for item in vary:
        path, spec = _split(item)
        sv = _search_variable(path, spec, design, catalogue)
        if any(v.path == sv.path for v in out):
            raise _err(sv.path, f"{sv.path} is varied twice")
        out.append(sv)
    objectives = list(dict.fromkeys(objectives or ["mass_kg"]))
    bad = [o for o in objectives if o not in OBJECTIVES]
    if bad:
        raise _err("objective", f"unknown objective {bad[0]!r}; use one of {', '.join(OBJECTIVES)}")
    return Search(variables=tuple(out), objectives=tuple(objectives), limits=parse_limits(limits))


# --- evaluation -----------------------------------------------------------------------------

class FrontPoint(_Frozen):
    """One evaluated design: the variables' values, its objectives and figures, its bearings."""

    values: dict[str, Any]
    objectives: dict[str, float | None]     # None: does not apply (no bearing, no loaded section)
    feasible: bool
    design: dict[str, Any] = {}
    bearings: list[dict[str, Any]] = []     # id, designation, series, D_mm, B_mm, life_h, ok
    failing: list[str] = []                 # what keeps it from being feasible
    governing: str = ""                     # the passing check with the least margin (and warnings)
    changes: list[str] = []                 # what differs from the current design, in words


def _figures(design: Design, res: Any, limits: dict[str, float]) -> dict[str, Any]:
    """Objectives, feasibility, bearings and the governing requirement of one solved design."""
    if isinstance(res, Exception):
        msg = "; ".join(e.message for e in getattr(res, "errors", [])) or str(res)
        return {"feasible": False, "failing": [f"not solved: {msg}"], "objectives": {}, "bearings": []}
    failing = sorted({f"{c.code}" + (f" ({c.where})" if c.where else "") for c in res.checks if c.status == "fail"})
    bearings, space, lives, Ds = [], 0.0, [], []
    by_id = {b.id: b for b in res.bearings}
    for s in design.supports:
        if s.bearing_type is None:
            continue
        br = by_id.get(s.id)
        c = br.candidates[0] if br is not None and br.candidates else None
        if c is None:
            failing.append(f"no rated bearing ({s.id})")
            continue
        space += c.D_mm * c.B_mm
        lives.append(c.Lnm_h / design.requirements.life_h)
        Ds.append(c.D_mm)
        bearings.append({"id": s.id, "designation": c.designation, "series": c.series, "d_mm": c.d_mm,
                         "D_mm": c.D_mm, "B_mm": c.B_mm, "life_h": c.Lnm_h, "s0": c.s0, "ok": c.ok})
    nf = [sec.n_fatigue for sec in res.shaft.sections]
    obj = {"mass_kg": float(res.shaft.mass_kg), "bearing_space_mm2": float(space),
           "max_bearing_D_mm": float(max(Ds)) if Ds else math.inf,
           "life_margin": float(min(lives)) if lives else math.inf,
           "fatigue_margin": float(min(nf)) / design.requirements.fatigue_safety_min if nf else math.inf}
    figs = {"max_bearing_D_mm": max(Ds) if Ds else 0.0, "length_mm": design.shaft.length_mm,
            "mass_kg": obj["mass_kg"], "bearing_space_mm2": space}
    for name, lim in limits.items():
        if figs[name] > lim * (1 + 1e-12):
            label, unit = LIMITS[name]
            failing.append(f"{label} {figs[name]:.4g} {unit} above the limit {lim:g} {unit}")
    return {"feasible": not failing, "failing": failing, "objectives": obj, "bearings": bearings,
            "governing": _governing(res.checks)}


def _governing(checks: Sequence[Any]) -> str:
    """The check with the least relative margin (engine.checks.sort_checks' order), in words."""
    from engine.checks import sort_checks

    rated = [c for c in checks if c.status == "ok" and c.value is not None and c.limit]
    warns = sum(c.status == "warn" for c in checks)
    more = f" ({warns} warning{'s' if warns > 1 else ''} besides)" if warns else ""
    if not rated:
        return more.strip(" ()")
    c = sort_checks(rated)[0]
    what = c.code.replace(".", " ").replace("_", " ")
    u = f" {c.unit}" if c.unit else ""
    return f"{what}{f' at {c.where}' if c.where else ''}: {c.value:.4g}{u} against {c.limit:.4g}{u}{more}"


def _apply(data: dict, variables: Sequence[SearchVariable], values: Sequence[Any]) -> dict:
    out = data
    for sv, v in zip(variables, values):
        if sv.path.endswith(".dimension_series"):
            v = [v]
        out = _set(out, sv.variable, v)
    return out


def evaluate_designs(designs: Sequence[dict], limits: dict[str, float] | None = None, *,
                     catalogue: Any = None) -> list[dict[str, Any]]:
    """Solve design mappings together (engine.solve_many) -> figures of each (objectives,
    feasibility, bearings, what fails)."""
    import engine

    parsed: list[Design | DesignError] = []
    for d in designs:
        try:
            parsed.append(parse_design(d))
        except DesignError as exc:
            parsed.append(exc)
    good = [p for p in parsed if not isinstance(p, DesignError)]
    solved = iter(engine.solve_many(good, diagrams=False, catalogue=catalogue)) if good else iter(())
    return [_figures(p, p if isinstance(p, DesignError) else next(solved), limits or {}) for p in parsed]


# --- the search -----------------------------------------------------------------------------

class SearchResult(_Frozen):
    objectives: tuple[str, ...]
    variables: list[dict[str, Any]]          # path, label, unit, current, low, high, step, values
    front: list[FrontPoint]                  # non-dominated feasible designs, by the first objective
    current: FrontPoint                      # the design as given
    method: str
    seed: int
    evaluations: int                         # variants solved (repeats solved once)
    generations: int = 0
    elapsed_s: float = 0.0
    stopped: bool = False                    # cut short by the budget or on request
    feasible: int = 0


def _sense(objectives: Sequence[str]) -> np.ndarray:
    return np.array([1.0 if OBJECTIVES[o][2] == "min" else -1.0 for o in objectives])


def _nondominated(F: np.ndarray) -> list[int]:
    """Indices of the rows of F (minimised) that no other row dominates; equal rows: the first."""
    keep = []
    for i in range(len(F)):
        dom = np.all(F <= F[i], axis=1) & np.any(F < F[i], axis=1)
        same = np.all(F == F[i], axis=1)
        same[i:] = False
        if not dom.any() and not same.any():
            keep.append(i)
    return keep


def _significant(F: np.ndarray, digits: int = SIGNIFICANT) -> np.ndarray:
    """F rounded to ``digits`` significant figures: designs that differ by less are equal."""
    with np.errstate(divide="ignore", invalid="ignore"):
        mag = np.where((F != 0) & np.isfinite(F), np.floor(np.log10(np.abs(F))), 0.0)
    scale = 10.0 ** (digits - 1 - mag)
    return np.where(np.isfinite(F), np.round(F * scale) / scale, F)


def _finite(v: float) -> float | None:
    """None for a figure that does not apply (a life margin without bearings: infinite)."""
    return v if math.isfinite(v) else None


def _fmt(v: Any) -> str:
    return f"{v:g}" if isinstance(v, (int, float)) else str(v)


def _label(var: Variable) -> str:
    """The variable in the designer's words: segments counted from 1, as the editor counts them."""
    m = _RX_SEG.match(var.path)
    if m:
        return f"{_SEGMENT_NUM[m.group(2)]} of segment {int(m.group(1)) + 1}"
    return var.label


def _changes(search: Search, values: Sequence[Any]) -> list[str]:
    out = []
    for sv, v in zip(search.variables, values):
        cur = sv.variable.current
        if (isinstance(v, float) and isinstance(cur, (int, float)) and abs(v - cur) < 1e-9) or v == cur:
            continue
        u = f" {sv.variable.unit}" if sv.variable.unit else ""
        was = _fmt(cur) if cur is not None else "any in the table"
        out.append(f"{_label(sv.variable)}: {was} → {_fmt(v)}{u}")
    return out


def combinations(search: Search) -> float:
    """How many designs the search's space holds: the product of its variables' numbers of
    values, or infinity when a variable is continuous (no step)."""
    if all(sv.discrete for sv in search.variables):
        return math.prod(len(sv.values) for sv in search.variables)
    return math.inf


def run_search(design: Any, search: Search | Sequence[Any], objectives: Sequence[str] | None = None, *,
               seed: int = 1, budget_s: float | None = 30.0, pop_size: int = 40, generations: int = 60,
               method: Literal["auto", "nsga2", "enumerate"] = "auto", limits: Any = None,
               catalogue: Any = None, progress: Callable[[int, int, float], None] | None = None,
               stop: Callable[[], bool] | None = None) -> SearchResult:
    """Search the variables of ``search`` (a :class:`Search`, or ``vary`` items read with
    ``objectives`` and ``limits`` by :func:`parse_search`) for the Pareto front.

    ``progress(evaluations, generation, elapsed_s)`` is called after each solved population;
    ``stop()`` before each (True ends the search there); ``budget_s`` bounds the wall time
    (checked between populations). Bad input raises DesignError before anything is solved.
    """
    t0 = time.perf_counter()
    design = parse_design(design)
    if not isinstance(search, Search):
        search = parse_search(design, search, objectives or ("mass_kg",), limits=limits, catalogue=catalogue)
    data = design.model_dump(mode="json", exclude_none=False)
    svars = search.variables
    sense = _sense(search.objectives)
    cache: dict[tuple, dict[str, Any]] = {}
    order: list[tuple] = []

    def evaluate(combos: list[tuple]) -> list[dict[str, Any]]:
        new = [c for c in dict.fromkeys(combos) if c not in cache]
        if new:
            figs = evaluate_designs([_apply(data, svars, c) for c in new], search.limits, catalogue=catalogue)
            for c, f in zip(new, figs):
                cache[c] = f
                order.append(c)
        return [cache[c] for c in combos]

    cur_vals = tuple(sv.variable.current for sv in svars)
    base = evaluate_designs([data], search.limits, catalogue=catalogue)[0]
    over = lambda: (budget_s is not None and time.perf_counter() - t0 > budget_s) or (stop is not None and stop())  # noqa: E731
    stopped, gens = False, 0
    n_disc = combinations(search)
    use_enum = method == "enumerate" or (method == "auto" and n_disc <= ENUMERATE_MAX)
    if use_enum:
        if not math.isfinite(n_disc):
            raise _err(_ERR, "every variable needs a step or a list of values to be enumerated")
        import itertools

        allc = list(itertools.product(*(sv.values for sv in svars)))
        for lo in range(0, len(allc), pop_size * 2):
            if over():
                stopped = True
                break
            evaluate(allc[lo:lo + pop_size * 2])
            gens += 1
            if progress is not None:
                progress(len(cache), gens, time.perf_counter() - t0)
        used = "enumerate"
    else:
        gens, stopped = _nsga2(svars, evaluate, sense, search.objectives, seed=seed, pop_size=pop_size,
                               generations=generations, over=over, progress=progress, t0=t0,
                               n_evaluated=lambda: len(cache))
        used = "nsga2"
    feas = [c for c in order if cache[c]["feasible"]]
    front: list[FrontPoint] = []
    if feas:
        F = np.array([[cache[c]["objectives"][o] for o in search.objectives] for c in feas]) * sense
        idx = _nondominated(_significant(F))
        idx.sort(key=lambda i: tuple(F[i]))
        for i in idx:
            c = feas[i]
            f = cache[c]
            doc = parse_design(_apply(data, svars, c)).model_dump(mode="json")  # None is meaningful (no bearing)
            front.append(FrontPoint(values=dict(zip((sv.path for sv in svars), c)),
                                    objectives={o: _finite(f["objectives"][o]) for o in search.objectives},
                                    feasible=True, design=doc, bearings=f["bearings"],
                                    governing=f.get("governing", ""), changes=_changes(search, c)))
    current = FrontPoint(values=dict(zip((sv.path for sv in svars), cur_vals)),
                         objectives={o: _finite(base["objectives"][o]) for o in search.objectives}
                         if base["objectives"] else {},
                         feasible=base["feasible"], bearings=base["bearings"], failing=base["failing"],
                         governing=base.get("governing", ""))
    return SearchResult(
        objectives=search.objectives,
        variables=[{"path": sv.path, "label": _label(sv.variable), "unit": sv.variable.unit,
                    "current": sv.variable.current, "low": sv.low, "high": sv.high, "step": sv.step,
                    "values": list(sv.values) if sv.variable.kind == "choice" else []} for sv in svars],
        front=front, current=current, method=used, seed=seed, evaluations=len(cache), generations=gens,
        elapsed_s=time.perf_counter() - t0, stopped=stopped, feasible=len(feas))


def _nsga2(svars: Sequence[SearchVariable], evaluate: Callable, sense: np.ndarray, objectives: Sequence[str], *,
           seed: int, pop_size: int, generations: int, over: Callable[[], bool],
           progress: Callable | None, t0: float, n_evaluated: Callable[[], int]) -> tuple[int, bool]:
    """NSGA-II (pymoo) by ask and tell; each population solved by ``evaluate``. Discrete
    variables are searched as an index in [0, n − 1], rounded. Returns (generations, stopped)."""
    from pymoo.algorithms.moo.nsga2 import NSGA2
    from pymoo.core.evaluator import Evaluator
    from pymoo.core.problem import Problem
    from pymoo.problems.static import StaticProblem

    xl = np.array([0.0 if sv.discrete else sv.low for sv in svars])
    xu = np.array([len(sv.values) - 1.0 if sv.discrete else sv.high for sv in svars])
    xu = np.where(xu > xl, xu, xl + 1e-9)  # one allowed value: a fixed variable
    problem = Problem(n_var=len(svars), n_obj=len(objectives), n_ieq_constr=1, xl=xl, xu=xu)
    algo = NSGA2(pop_size=pop_size, eliminate_duplicates=True)
    algo.setup(problem, termination=("n_gen", generations), seed=seed, verbose=False)

    def decode(x: np.ndarray) -> tuple:
        out = []
        for sv, v in zip(svars, x):
            if sv.discrete:
                out.append(sv.values[int(np.clip(np.rint(v), 0, len(sv.values) - 1))])
            else:
                out.append(round(float(np.clip(v, sv.low, sv.high)), 6))
        return tuple(out)

    gen = 0
    while algo.has_next():
        if over():
            return gen, True
        pop = algo.ask()
        figs = evaluate([decode(x) for x in pop.get("X")])
        F = np.array([[f["objectives"].get(o, math.inf) for o in objectives] for f in figs], float) * sense
        F = np.where(np.isfinite(F), F, 1e12)
        G = np.array([[0.0 if f["feasible"] else float(len(f["failing"]))] for f in figs])
        Evaluator().eval(StaticProblem(problem, F=F, G=G), pop)
        algo.tell(infills=pop)
        gen += 1
        if progress is not None:
            progress(n_evaluated(), gen, time.perf_counter() - t0)
    return gen, False
