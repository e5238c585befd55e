"""``shaftwright study``: a what-if study or the arrangement comparison from the command line.

    shaftwright study DESIGN.json --vary supports.B.x_mm=300:500:21 [--vary ...] [--csv]
    shaftwright study DESIGN.json --arrangements [--csv]

Prints a table (or CSV with ``--csv``) with one row per variant: the values, the life of each
bearing [h], the governing shaft safety factor, the largest slope at a bearing [mrad], the
first critical speed [rpm] and whether the variant meets every requirement. Exit status 2 on
bad input, one line per problem naming the file and the field
(``shaftwright: shaft.json: supports.B.x_mm: ...``; see :mod:`app.cli_io`).
"""
from __future__ import annotations

import argparse
import csv
import io
import sys
from typing import Any

__all__ = ["cmd_study", "add_arguments", "study_rows", "arrangement_rows", "format_table"]


def add_arguments(p: argparse.ArgumentParser) -> None:
    """The ``study`` subcommand's arguments."""
    p.add_argument("design", help="design file (JSON, format shaft-design/1)")
    p.add_argument("--vary", action="append", default=[], metavar="PATH=START:STOP:COUNT",
                   help="a design variable and its values, e.g. supports.B.x_mm=300:500:21 or "
                        "supports.A.bearing_type=deep_groove_ball,cylindrical_roller (once or twice)")
    p.add_argument("--arrangements", action="store_true",
                   help="compare every sensible bearing arrangement instead of varying")
    p.add_argument("--csv", action="store_true", help="print CSV instead of a table")


def _num(v: Any, digits: int = 4) -> str:
    if v is None:
        return ""
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, float):
        if v != v:
            return ""
        if abs(v) >= 1e9:
            return f"{v:.3g}"
        return f"{v:.{digits}g}"
    return str(v)


def study_rows(res: Any) -> tuple[list[str], list[list[Any]]]:
    """Header and rows of a :class:`engine.study.StudyResult` (raw values)."""
    ids = [b.id for b in res.base.bearings] or sorted({b.id for v in res.variants for b in v.bearings})
    head = [v.path + (f" [{v.unit}]" if v.unit else "") for v in res.variables]
    head += [f"life {i} [h]" for i in ids] + [f"bearing {i}" for i in ids]
    head += ["safety factor", "max slope at bearing [mrad]", "critical speed [rpm]", "meets all", "note"]
    rows = []
    for v in res.variants:
        by = {b.id: b for b in v.bearings}
        note = v.error or "; ".join(v.failing) or ""
        rows.append(list(v.values) + [by[i].life_h if i in by else None for i in ids]
                    + [(by[i].designation + (" (re-selected)" if by[i].reselected else "")) if i in by else ""
                       for i in ids]
                    + [v.safety_factor, None if v.max_slope_rad is None else v.max_slope_rad * 1e3,
                       v.critical_speed_rpm, v.ok, note])
    return head, rows


def arrangement_rows(cmp: Any) -> tuple[list[str], list[list[Any]]]:
    """Header and rows of a :class:`engine.study.ArrangementComparison`."""
    head = ["rank", "arrangement", "meets all", "bearings", "min life [h]", "min s0",
            "max D [mm]", "total B [mm]", "volume [cm3]", "slopes [mrad] / limits", "note"]
    rows = []
    for o in cmp.options:
        bears = ", ".join(f"{b.id} {b.designation or '-'}" for b in o.bearings)
        slopes = ", ".join(
            f"{b.id} {_num(None if b.slope_rad is None else b.slope_rad * 1e3, 3)}"
            + (f"/{_num(b.slope_limit_rad * 1e3, 3)}" if b.slope_limit_rad else "") for b in o.bearings)
        rows.append([o.rank, o.label + (" (current)" if o.current else ""), o.ok, bears, o.min_life_h,
                     o.min_s0, o.max_D_mm, o.total_B_mm, o.volume_cm3, slopes,
                     o.error or "; ".join(o.failing)])
    return head, rows


def format_table(head: list[str], rows: list[list[Any]]) -> str:
    """Fixed-width text table."""
    cells = [head] + [[_num(c) for c in r] for r in rows]
    widths = [max(len(r[k]) for r in cells) for k in range(len(head))]
    out = []
    for n, r in enumerate(cells):
        out.append("  ".join(c.rjust(w) if n and _numeric(c) else c.ljust(w) for c, w in zip(r, widths)).rstrip())
        if n == 0:
            out.append("  ".join("-" * w for w in widths))
    return "\n".join(out)


def _numeric(c: str) -> bool:
    try:
        float(c)
        return True
    except ValueError:
        return False


def _csv(head: list[str], rows: list[list[Any]]) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(head)
    for r in rows:
        w.writerow(["" if c is None else (repr(c) if isinstance(c, float) else c) for c in r])
    return buf.getvalue()


def cmd_study(args: argparse.Namespace) -> int:
    """Run the study (or the comparison) and print it; 0 on success, 2 on bad input."""
    from app.cli_io import InputError, design_error_lines, read_design_file
    from engine.model import DesignError
    from engine.study import compare_arrangements, run_study

    if args.arrangements and args.vary:
        raise InputError("", "--arrangements compares arrangements; leave out --vary")
    if not args.arrangements and not args.vary:
        raise InputError("", "give --vary PATH=START:STOP:COUNT (once or twice), or --arrangements")
    data = read_design_file(args.design)
    try:
        if args.arrangements:
            res = compare_arrangements(data)
            head, rows = arrangement_rows(res)
        else:
            res = run_study(data, args.vary)
            head, rows = study_rows(res)
    except DesignError as exc:
        raise InputError(args.design, *design_error_lines(exc.errors)) from None
    if args.csv:
        sys.stdout.write(_csv(head, rows))
    else:
        print(format_table(head, rows))
        print(f"\n{len(rows)} rows in {res.elapsed_s:.3f} s. Results inform design, they do not "
              "certify it: verify with the supplier's data and have a qualified engineer check.")
    return 0
