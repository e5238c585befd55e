"""Plain-text tables of a result, for the command line."""
from __future__ import annotations

from engine.result import Result

__all__ = ["text_report", "table"]

CAUTION = ("Results inform preliminary design only. Bundled bearing ratings are illustrative; "
           "verify with the supplier's data, apply the relevant codes, and have a qualified "
           "engineer check the design.")


def _fmt(v) -> str:
    if v is None:
        return "–"
    if isinstance(v, float):
        if v != 0 and (abs(v) >= 1e6 or abs(v) < 1e-3):
            return f"{v:.3g}"
        return f"{v:,.4g}" if abs(v) < 1e4 else f"{v:,.0f}"
    return str(v)


def _is_number(cell: str) -> bool:
    try:
        float(cell.replace(",", ""))
        return True
    except ValueError:
        return False


def table(headers: list[str], rows: list[list]) -> str:
    """Columns separated by two spaces: text left-aligned, numbers right-aligned (a column is
    numeric when every filled cell is a number; "–" marks a missing value), headers likewise."""
    cells = [headers] + [[_fmt(c) for c in r] for r in rows]
    widths = [max(len(r[i]) for r in cells) for i in range(len(headers))]
    numeric = [any(_is_number(r[i]) for r in cells[1:])
               and all(_is_number(r[i]) or r[i] in ("", "–") for r in cells[1:]) for i in range(len(headers))]

    def line(r: list[str]) -> str:
        return "  ".join(c.rjust(w) if num else c.ljust(w) for c, w, num in zip(r, widths, numeric)).rstrip()

    return "\n".join([line(cells[0]), "  ".join("-" * w for w in widths)] + [line(r) for r in cells[1:]])


def text_report(r: Result) -> str:
    out: list[str] = []
    for c in r.load_cases:
        out.append(f"\nLoad case '{c.name}': {c.speed_rpm:g} rpm, {c.time_fraction:.0%} of the time")
        out.append(table(["element", "x mm", "Fx N", "Fy N", "Fz N", "torque N·m"],
                         [[e.id, e.x_mm, e.Fx_N, e.Fy_N, e.Fz_N, e.torque_Nm] for e in c.elements]))
        out.append("")
        out.append(table(["support", "x mm", "Fx N", "Fy N", "Fz N", "Fr N", "Fa N"],
                         [[s.id, s.x_mm, s.Fx_N, s.Fy_N, s.Fz_N, s.Fr_N, s.Fa_N] for s in c.supports]))
        out.append(f"largest deflection {c.max_deflection_mm:.4g} mm at x = {c.max_deflection_x_mm:.4g} mm")
    for b in r.bearings:
        out.append(f"\nBearing at {b.id} ({b.bearing_type.replace('_', ' ')}, bore {b.bore_mm:g} mm"
                   f"{', ' + b.arrangement if b.arrangement else ''}): equivalent load P = {b.equivalent_load_N:,.0f} N, "
                   f"required C = {b.required_C_N:,.0f} N  [{b.life_method}]")
        if b.Fr_N:
            out.append("  loads per case (application factor not applied): " + "; ".join(
                f"{c.name} Fr {fr:,.0f} N, Fa {fa:,.0f} N" for c, fr, fa in zip(r.load_cases, b.Fr_N, b.Fa_N)))
        if b.candidates:
            out.append(table(["candidate", "d", "D", "B", "C N", "C0 N", "L10 h", "Lnm h", "s0", "verdict"],
                             [[k.designation, k.d_mm, k.D_mm, k.B_mm, k.C_N, k.C0_N, k.L10_h, k.Lnm_h, k.s0,
                               "ok" if k.ok else "; ".join(k.reasons) or "fails"] for k in b.candidates[:5]]))
        if getattr(b, "fits", None) is not None:
            out.append(f"  seat fits: shaft {b.fits.shaft}, housing {b.fits.housing} ({b.fits.chosen_by}; {b.fits.basis})")
        for m in b.smallest_by_series:
            out.append(f"  smallest bore in series {m.series} that meets every requirement: "
                       f"{'none up to the largest in the table' if m.d_mm is None else f'{m.d_mm:g} mm ({m.designation})'}")
    s = r.shaft
    out.append(f"\nShaft: length {s.length_mm:g} mm, mass {s.mass_kg:.3g} kg, largest deflection {s.max_deflection_mm:.4g} mm"
               + (f", first critical speed {s.critical_speed_rpm:,.0f} rpm" if s.critical_speed_rpm else ""))
    if r.checks:
        sources: dict[str, int] = {}
        for c in r.checks:
            sources.setdefault(c.source, len(sources) + 1)
        out.append("\nChecks (failing first)")
        out.append(table(["status", "check", "where", "case", "value", "limit", "unit", "source"],
                         [[c.status.upper(), c.code, c.where, c.load_case, c.value, c.limit, c.unit,
                           f"[{sources[c.source]}]"] for c in r.checks]))
        out.append("\nSources")
        out.extend(f"  [{n}] {src or 'no source given'}" for src, n in sources.items())
    for w in r.warnings:
        out.append(f"warning: {w}")
    out.append("\n" + CAUTION)
    return "\n".join(out).lstrip("\n")
