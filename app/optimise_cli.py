"""``shaftwright optimise``: search the design's sizes, positions and bearings for the front of
the lightest, most compact designs that meet every requirement (:mod:`engine.search`).

    shaftwright optimise DESIGN.json --vary shaft.segments[2].d_mm=40:60:1 \\
        --vary supports.B.x_mm=200:260 --objective mass_kg --objective bearing_space_mm2 --seed 1

Prints a table of the front (one row per design: objectives, the varied values, the chosen
bearings, the requirement with the least margin), ``--csv`` the same as CSV, or ``--json``
``{"front": [{"design": {…}, "objectives": {…}}, …], …}`` with each design complete.
Bad input: one line per problem naming the file and the field, exit status 2 (app.cli_io).
When stderr is a terminal a progress bar (tqdm) counts the generations; Ctrl-C stops the
search and prints the front found so far.
"""
from __future__ import annotations

import argparse
import json
import signal
import sys
import threading
from typing import Any

from app.study_cli import _csv, format_table

__all__ = ["add_arguments", "cmd_optimise", "front_rows"]


def add_arguments(p: argparse.ArgumentParser) -> None:
    from engine.search import LIMITS, OBJECTIVES

    p.add_argument("design", metavar="DESIGN.json", help="design file (JSON, format shaft-design/1)")
    p.add_argument("--vary", action="append", default=[], metavar="PATH=LOW:HIGH[:STEP]",
                   help="a design variable and its bounds, as in 'study': shaft.segments[2].d_mm=40:60:1 "
                        "(STEP rounds; R10/R20/R40 takes ISO preferred numbers; no step: continuous), "
                        "supports.B.x_mm=200:260, supports.A.bearing_type=deep_groove_ball,cylindrical_roller, "
                        "supports.A.dimension_series=02,03 (or *); repeat for each variable")
    p.add_argument("--objective", action="append", default=[], metavar="NAME",
                   help="what to optimise, once or more: " + "; ".join(
                       f"{k} ({v[0]}, {'smaller' if v[2] == 'min' else 'larger'} is better)"
                       for k, v in OBJECTIVES.items()) + " (default mass_kg)")
    p.add_argument("--limit", action="append", default=[], metavar="NAME<=VALUE",
                   help="a limit of your own a design must keep: " + ", ".join(
                       f"{k} ({v[0]} [{v[1]}])" for k, v in LIMITS.items()))
    p.add_argument("--seed", type=int, default=1, metavar="N",
                   help="seed of the search (the same seed and generations give the same front; default 1)")
    p.add_argument("--budget", type=float, default=30.0, metavar="SECONDS",
                   help="time budget; the search stops after the generation that passes it (default 30)")
    p.add_argument("--generations", type=int, default=60, metavar="N",
                   help="generations of the evolutionary search (default 60)")
    p.add_argument("--population", type=int, default=40, metavar="N",
                   help="designs per generation (default 40)")
    fmt = p.add_mutually_exclusive_group()
    fmt.add_argument("--csv", action="store_true", help="print the front as CSV")
    fmt.add_argument("--json", action="store_true",
                     help='print {"front": [{"design": {...}, "objectives": {...}}, ...]} with complete designs')


def front_rows(res: Any) -> tuple[list[str], list[list[Any]]]:
    """Header and rows of a :class:`engine.search.SearchResult`: the current design first."""
    from engine.search import OBJECTIVES

    ids = [b["id"] for b in res.current.bearings] or sorted({b["id"] for p in res.front for b in p.bearings})
    head = (["design"] + [f"{o}" + (f" [{OBJECTIVES[o][1]}]" if OBJECTIVES[o][1] else "") for o in res.objectives]
            + [v["path"] + (f" [{v['unit']}]" if v["unit"] else "") for v in res.variables]
            + [f"bearing {i}" for i in ids] + ["least margin", "note"])
    rows = []
    for k, p in enumerate([res.current] + list(res.front)):
        by = {b["id"]: b["designation"] for b in p.bearings}
        rows.append([("current" if k == 0 else str(k))] + [p.objectives.get(o) for o in res.objectives]
                    + [p.values.get(v["path"]) for v in res.variables] + [by.get(i, "") for i in ids]
                    + [p.governing, "; ".join(p.failing) if k == 0 else ""])
    return head, rows


class _Bar:
    def __init__(self, total: int):
        self.bar, self.n = None, 0
        if sys.stderr.isatty():
            from tqdm import tqdm

            self.bar = tqdm(total=total, unit="gen", file=sys.stderr, leave=False)

    def __call__(self, evaluations: int, generation: int, elapsed: float) -> None:
        if self.bar is not None:
            self.bar.update(generation - self.n)
            self.bar.set_postfix_str(f"{evaluations} designs solved")
            self.n = generation

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()


def cmd_optimise(args: argparse.Namespace) -> int:
    from app.cli_io import InputError, design_error_lines, read_design_file
    from engine.model import DesignError
    from engine.search import parse_search, run_search

    if not args.vary:
        raise InputError("", "give --vary PATH=LOW:HIGH[:STEP] for each design variable to search")
    if not (args.budget > 0 and args.budget <= 3600):
        raise InputError("", f"--budget must be more than 0 and at most 3600 seconds, not {args.budget:g}")
    if not 1 <= args.generations <= 10_000:
        raise InputError("", f"--generations must be 1 to 10000, not {args.generations}")
    if not 4 <= args.population <= 1000:
        raise InputError("", f"--population must be 4 to 1000, not {args.population}")
    data = read_design_file(args.design)
    stop = {"now": False}
    try:
        search = parse_search(data, args.vary, args.objective or ["mass_kg"], limits=args.limit)
        bar = _Bar(args.generations)
        previous = signal.getsignal(signal.SIGINT)
        if threading.current_thread() is threading.main_thread():  # Ctrl-C: stop after this generation
            signal.signal(signal.SIGINT, lambda *_: stop.__setitem__("now", True))
        try:
            res = run_search(data, search, seed=args.seed, budget_s=args.budget, pop_size=args.population,
                             generations=args.generations, progress=bar, stop=lambda: stop["now"])
        finally:
            bar.close()
            if threading.current_thread() is threading.main_thread():
                signal.signal(signal.SIGINT, previous)
    except DesignError as exc:
        raise InputError(args.design, *design_error_lines(exc.errors)) from None
    if args.json:
        out = {"front": [{"design": p.design, "objectives": p.objectives, "values": p.values,
                          "bearings": p.bearings, "governing": p.governing, "changes": p.changes}
                         for p in res.front],
               "current": {"objectives": res.current.objectives, "values": res.current.values,
                           "feasible": res.current.feasible, "failing": res.current.failing},
               "objectives": list(res.objectives), "method": res.method, "seed": res.seed,
               "evaluations": res.evaluations, "generations": res.generations,
               "elapsed_s": res.elapsed_s, "stopped": res.stopped}
        print(json.dumps(out, indent=1, ensure_ascii=False))
        return 0
    head, rows = front_rows(res)
    if args.csv:
        sys.stdout.write(_csv(head, rows))
        return 0
    print(format_table(head, rows))
    print(f"\n{len(res.front)} designs on the front; {res.evaluations} designs solved ({res.feasible} meet every "
          f"requirement) by {res.method} in {res.elapsed_s:.1f} s"
          + (" (stopped at the time budget or on Ctrl-C)" if res.stopped else "") + ".")
    if not res.front:
        print("No design within the bounds meets every requirement: widen the bounds or relax a limit.")
    print("Results inform design, they do not certify it: verify with the supplier's data and have a "
          "qualified engineer check.")
    return 0
