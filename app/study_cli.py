"""``shaftwright study``: a what-if study or the arrangement comparison from the command line.

    shaftwright study DESIGN.json --vary supports.B.x_mm=200:260:13 [--vary ...] [--csv]
    shaftwright study DESIGN.json --arrangements [--csv]

Prints a table (or CSV with ``--csv``) with one row per variant: the values, the life of each
bearing [h], the governing shaft safety factor, the largest slope at a bearing [mrad], the
first critical speed [rpm] and whether the variant meets every requirement. Exit status 2 on
bad input, one line per problem naming the file and the field
(``shaftwright: shaft.json: supports.B.x_mm: ...``; see :mod:`app.cli_io`).

The variants are solved chunk by chunk (``engine.study.iter_study``): CSV rows are written as
each chunk is done; when stderr is a terminal a progress bar (tqdm) shows the share of
variants done. Ctrl-C stops the study: the rows solved so far are printed, with a note.
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
                   help="a design variable and its values, e.g. supports.B.x_mm=200:260:13 or "
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


def _study_head(variables, ids: list[str]) -> list[str]:
    head = [v.path + (f" [{v.unit}]" if v.unit else "") for v in variables]
    head += [f"life {i} [h]" for i in ids] + [f"bearing {i}" for i in ids]
    return head + ["safety factor", "max slope at bearing [mrad]", "critical speed [rpm]", "meets all", "note"]


def _study_row(v: Any, ids: list[str]) -> list[Any]:
    by = {b.id: b for b in v.bearings}
    note = v.error or "; ".join(v.failing) or ""
    return (list(v.values) + [by[i].life_h if i in by else None for i in ids]
            + [(by[i].designation + (" (re-selected)" if by[i].reselected else "")) if i in by else "" for i in ids]
            + [v.safety_factor, None if v.max_slope_rad is None else v.max_slope_rad * 1e3,
               v.critical_speed_rpm, v.ok, note])


def study_rows(res: Any) -> tuple[list[str], list[list[Any]]]:
    """Header and rows of a :class:`engine.study.StudyResult` (raw values)."""
    ids = [b.id for b in res.base.bearings] or sorted({b.id for v in res.variants for b in v.bearings})
    return _study_head(res.variables, ids), [_study_row(v, ids) for v in res.variants]


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


def _csv(head: list[str] | None, rows: list[list[Any]]) -> str:
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    if head is not None:
        w.writerow(head)
    for r in rows:
        w.writerow(["" if c is None else (repr(c) if isinstance(c, float) else c) for c in r])
    return buf.getvalue()


class _Progress:
    """The share of variants done on stderr: a tqdm bar when stderr is a terminal, else nothing."""

    def __init__(self, total: int):
        self.bar = None
        if total and sys.stderr.isatty():
            try:
                from tqdm import tqdm
            except ImportError:  # pragma: no cover - tqdm is a dependency
                return
            self.bar = tqdm(total=total, unit="variant", file=sys.stderr, leave=False)

    def update(self, n: int) -> None:
        if self.bar is not None:
            self.bar.update(n)

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()


def _run_study(data: Any, vary: list[str], as_csv: bool) -> tuple[list[str], list[list[Any]], float, str]:
    """Solve the study chunk by chunk: CSV rows written as they come, progress on a terminal,
    Ctrl-C stops with the rows so far. (head, rows, seconds, note)."""
    import time

    from engine.study import iter_study

    t0 = time.perf_counter()
    it = iter_study(data, vary)
    start = next(it)  # bad input raises here, before anything is solved
    ids = [b.id for b in start.base.bearings]
    head = _study_head(start.study.variables, ids)
    total = start.study.n_variants
    if as_csv:
        sys.stdout.write(_csv(head, []))
        sys.stdout.flush()
    rows: list[list[Any]] = []
    bar = _Progress(total)
    note = ""
    try:
        for part in it:
            new = [_study_row(v, ids) for v in part]
            rows += new
            if as_csv:
                sys.stdout.write(_csv(None, new))
                sys.stdout.flush()
            bar.update(len(part))
    except KeyboardInterrupt:
        note = f"stopped: {len(rows)} of {total} variants solved"
    finally:
        bar.close()
    return head, rows, time.perf_counter() - t0, note


def cmd_study(args: argparse.Namespace) -> int:
    """Run the study (or the comparison) and print it; 0 on success. Bad input raises
    :class:`app.cli_io.InputError` (one line per problem, exit status 2, reported by app.cli)."""
    from app.cli_io import InputError, design_error_lines, read_design_file
    from engine.model import DesignError
    from engine.study import compare_arrangements

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
            head, rows, elapsed, note = _run_study(data, args.vary, args.csv)
            if note:
                print(note, file=sys.stderr)
            if not args.csv:
                _print_table(head, rows, elapsed)
            return 0
    except DesignError as exc:
        raise InputError(args.design, *design_error_lines(exc.errors)) from None
    if args.csv:
        sys.stdout.write(_csv(head, rows))
    else:
        _print_table(head, rows, res.elapsed_s)
    return 0


def _print_table(head: list[str], rows: list[list[Any]], elapsed_s: float) -> None:
    print(format_table(head, rows))
    print(f"\n{len(rows)} rows in {elapsed_s:.3f} s. Results inform design, they do not "
          "certify it: verify with the supplier's data and have a qualified engineer check.")
