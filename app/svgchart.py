"""Server-drawn SVG line charts, made for print: no script, crisp at any zoom, legible in grey.

:func:`line_chart` draws one or more series y(x) sharing an x axis, with "nice" ticks
(1, 2, 5 × 10ⁿ), a zero line, and a legend. Values that are round-off (smaller than
:data:`RESOLUTION` times the largest value that matters on the chart) draw as zero, so a plane
that carries no load shows a flat line at zero, never magnified noise or a zero-height axis. Series differ by dash pattern as well as colour
so that a black-and-white print still tells them apart. Every label is escaped.

>>> svg = line_chart([0, 1, 2], [("M", [0, 1, 0])], title="<b>", y_label="M [N·m]")
>>> svg.startswith("<svg") and "&lt;b&gt;" in svg
True
"""
from __future__ import annotations

import math
from typing import Sequence

from markupsafe import Markup, escape

__all__ = ["nice_ticks", "line_chart", "RESOLUTION"]

RESOLUTION = 1e-9  # relative to the chart's scale; double round-off in a solve is ~1e-16 to 1e-12

_STYLES = [("#1f3b73", ""), ("#b5471b", "6 3"), ("#2e7d32", "2 2"), ("#6a1b9a", "8 3 2 3"),
           ("#5d4037", "1 3"), ("#00838f", "10 4")]


def nice_ticks(lo: float, hi: float, *, count: int = 5) -> list[float]:
    """About ``count`` round tick values covering [lo, hi] (steps of 1, 2 or 5 × 10ⁿ).

    >>> nice_ticks(0, 330)
    [0.0, 100.0, 200.0, 300.0, 400.0]
    >>> nice_ticks(-1.2, 0.7, count=4)
    [-1.5, -1.0, -0.5, 0.0, 0.5, 1.0]

    A tiny range still gets distinct ticks (they are rounded relative to the step):

    >>> t = nice_ticks(0, 3e-14, count=3); len(set(t)) == len(t) > 1
    True
    """
    if not (math.isfinite(lo) and math.isfinite(hi)):
        return [0.0, 1.0]
    if hi < lo:
        lo, hi = hi, lo
    if hi - lo < 1e-12 * max(1.0, abs(hi)):
        pad = abs(hi) * 0.1 or 1.0
        lo, hi = lo - pad, hi + pad
    raw = (hi - lo) / max(count, 1)
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 5, 10) if m * mag >= raw)
    start = math.floor(lo / step + 1e-9) * step
    digits = max(0, -math.floor(math.log10(step)) + 1)
    ticks, k = [], 0
    while start + k * step < hi + step * 0.999:
        ticks.append(round(start + k * step, digits) + 0.0)
        k += 1
    return ticks


def _label(v: float) -> str:
    return f"{v:.4g}".replace("e-0", "e-").replace("e+0", "e")


def line_chart(x: Sequence[float], series: Sequence[tuple[str, Sequence[float]]], *,
               title: str, y_label: str, x_label: str = "x [mm]",
               width: int = 680, height: int = 230, scale: float | None = None) -> Markup:
    """An SVG line chart of ``series`` (pairs of label and y values) against ``x``.

    Parameters
    ----------
    x : positions along the shaft, [mm]; may repeat a value (a jump draws as a vertical step)
    series : (label, values) pairs, each as long as ``x``; non-finite values break the line
    title, y_label, x_label : text shown on the chart (escaped)
    width, height : size of the drawing, [px at 96 dpi]
    scale : the largest magnitude that matters for this quantity (e.g. the largest bending
        moment in either plane, for the chart of one plane); default the chart's own largest.
        Values below ``RESOLUTION * scale`` are round-off and draw as zero.

    >>> "no data" in line_chart([0, 1], [("My", [1e-14, -2e-14])], title="t", y_label="My", scale=500.0)
    False
    """
    ml, mr, mt, mb = 64, 12, 26, 40
    lw, lh = width - ml - mr, height - mt - mb
    xs = [float(v) for v in x]
    finite = [abs(float(v)) for _, ys in series for v in ys if v is not None and math.isfinite(float(v))]
    if scale is not None and math.isfinite(scale):
        finite.append(abs(scale))
    floor = RESOLUTION * max(finite, default=0.0)
    series = [(name, [v if v is None or not math.isfinite(float(v)) or abs(float(v)) >= floor else 0.0
                      for v in ys]) for name, ys in series]
    ys_all = [float(v) for _, ys in series for v in ys if v is not None and math.isfinite(float(v))]
    parts = [f'<svg xmlns="http://www.w3.org/2000/svg" class="chart" role="img" '
             f'viewBox="0 0 {width} {height}" width="{width}" height="{height}" '
             f'aria-label="{escape(title)}">',
             f'<title>{escape(title)}</title>',
             f'<text x="{ml}" y="16" class="chart-title" font-size="13" font-weight="600">{escape(title)}</text>']
    if not xs or not ys_all:
        parts.append(f'<text x="{ml}" y="{mt + lh / 2}" font-size="12">no data</text></svg>')
        return Markup("".join(parts))
    yt = nice_ticks(min(min(ys_all), 0.0), max(max(ys_all), 0.0), count=4)
    y0, y1 = yt[0], yt[-1]
    if not y1 > y0:  # cannot happen with nice_ticks' distinct ticks; never divide by zero
        y0, y1 = y0 - 1.0, y1 + 1.0
    x0, x1 = min(xs), max(xs)
    if x1 - x0 < 1e-12:
        x0, x1 = x0 - 1.0, x1 + 1.0
    xt = [t for t in nice_ticks(x0, x1, count=6) if x0 - 1e-9 <= t <= x1 + 1e-9]

    def px(v: float) -> float:
        return ml + (v - x0) / (x1 - x0) * lw

    def py(v: float) -> float:
        return mt + lh - (v - y0) / (y1 - y0) * lh

    parts.append('<g font-size="10" fill="#333" stroke="none">')
    for t in xt:
        parts.append(f'<line x1="{px(t):.1f}" y1="{mt}" x2="{px(t):.1f}" y2="{mt + lh}" stroke="#ddd" stroke-width="0.6"/>'
                     f'<text x="{px(t):.1f}" y="{mt + lh + 13}" text-anchor="middle">{_label(t)}</text>')
    for t in yt:
        parts.append(f'<line x1="{ml}" y1="{py(t):.1f}" x2="{ml + lw}" y2="{py(t):.1f}" stroke="#ddd" stroke-width="0.6"/>'
                     f'<text x="{ml - 4}" y="{py(t) + 3:.1f}" text-anchor="end">{_label(t)}</text>')
    parts.append(f'<text x="{ml + lw / 2}" y="{height - 6}" text-anchor="middle">{escape(x_label)}</text>'
                 f'<text transform="translate(12 {mt + lh / 2}) rotate(-90)" text-anchor="middle">{escape(y_label)}</text>'
                 '</g>')
    parts.append(f'<rect x="{ml}" y="{mt}" width="{lw}" height="{lh}" fill="none" stroke="#555" stroke-width="0.8"/>')
    if y0 < 0 < y1:
        parts.append(f'<line x1="{ml}" y1="{py(0):.1f}" x2="{ml + lw}" y2="{py(0):.1f}" stroke="#555" stroke-width="0.8"/>')
    legend_x = ml + 8
    for i, (name, ys) in enumerate(series):
        colour, dash = _STYLES[i % len(_STYLES)]
        runs, run = [], []
        for xv, yv in zip(xs, ys):
            if yv is None or not math.isfinite(float(yv)):
                if run:
                    runs.append(run)
                run = []
                continue
            run.append(f"{px(xv):.1f},{py(float(yv)):.1f}")
        if run:
            runs.append(run)
        dash_attr = f' stroke-dasharray="{dash}"' if dash else ""
        for r in runs:
            parts.append(f'<polyline fill="none" stroke="{colour}" stroke-width="1.4"{dash_attr} points="{" ".join(r)}"/>')
        if len(series) > 1 or name:
            ly = mt + 12 + 13 * i
            parts.append(f'<line x1="{legend_x}" y1="{ly - 3}" x2="{legend_x + 22}" y2="{ly - 3}" stroke="{colour}" stroke-width="1.6"{dash_attr}/>'
                         f'<text x="{legend_x + 26}" y="{ly}" font-size="10" fill="#222">{escape(name)}</text>')
    parts.append("</svg>")
    return Markup("".join(parts))
