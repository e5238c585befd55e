"""To-scale side view of the shaft as SVG, drawn by the server.

:func:`shaft_svg` draws the stepped outline (x–y plane, one scale for both axes), bores as
hidden lines, the supports with a bearing symbol per type, the parts on the shaft (gear,
bevel gear, pulley, sprocket, coupling, point force, point moment) and, when a result is
given, the radial force of every part and the reaction of every support as arrows with their
values. Every part is a link to its row in the editor (``#row-supports-0``), so a click or
Enter on it takes the user to the fields that define it. Used by the editor page and by the
printed note; the output is a self-contained ``<svg>`` string with no external references.

Units: design mm; drawing px, with ``scale`` = px per mm the same along x and y.
"""
from __future__ import annotations

import math
from html import escape
from typing import Any

from app import units

__all__ = ["shaft_svg", "SVG_STYLE"]

_SUP_W_MM_FRAC = 0.045  # bearing symbol width as a fraction of shaft length (drawing choice)


def _nice_step(span: float) -> float:
    raw = span / 8
    p = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 2.5, 5, 10):
        if m * p >= raw:
            return m * p
    return 10 * p


def _arrow(x1: float, y1: float, x2: float, y2: float, cls: str, head: float = 7) -> str:
    """Line from (x1,y1) to (x2,y2) with a head at the end."""
    ang = math.atan2(y2 - y1, x2 - x1)
    a1, a2 = ang + math.radians(155), ang - math.radians(155)
    pts = (f"{x2:.1f},{y2:.1f} {x2 + head * math.cos(a1):.1f},{y2 + head * math.sin(a1):.1f} "
           f"{x2 + head * math.cos(a2):.1f},{y2 + head * math.sin(a2):.1f}")
    return (f'<line class="{cls}" x1="{x1:.1f}" y1="{y1:.1f}" x2="{x2:.1f}" y2="{y2:.1f}"/>'
            f'<polygon class="{cls} head" points="{pts}"/>')


def _as_dict(design: Any) -> dict:
    if hasattr(design, "model_dump"):
        return design.model_dump()
    return dict(design)


# The drawing's own style sheet: constant, so that the Content-Security-Policy can allow it by
# its hash (app.security) without allowing inline styles in general.
SVG_STYLE = (
    ".shaft-drawing{font:11px ui-sans-serif,system-ui,sans-serif}"
    ".sd-shaft{fill:#e9e4d6;stroke:#27343c;stroke-width:1.4}"
    ".sd-bore{fill:none;stroke:#27343c;stroke-width:.8;stroke-dasharray:4 3}"
    ".sd-axis{stroke:#6c7a80;stroke-width:.7;stroke-dasharray:14 3 2 3}"
    ".sd-brg{fill:#f7f5ee;stroke:#1f5d63;stroke-width:1.3}.sd-roll{fill:#1f5d63}"
    ".sd-gear{fill:#e8d2a6;stroke:#7a5516;stroke-width:1.2}.sd-pitch{stroke:#7a5516;stroke-dasharray:3 2}"
    ".sd-pul{fill:#d7dfcf;stroke:#45613a;stroke-width:1.2}"
    ".sd-cpl{fill:#d9d4e4;stroke:#4d4470;stroke-width:1.2}"
    ".sd-load line,.sd-load polygon{stroke:#9c3b25;fill:#9c3b25;stroke-width:1.6}"
    ".sd-reac line,.sd-reac polygon{stroke:#2d6a3e;fill:#2d6a3e;stroke-width:1.6}"
    ".sd-fixed{fill:none;stroke:#27343c;stroke-width:1.2}"
    ".sd-txt{fill:#27343c}.sd-val{fill:#9c3b25;font-weight:600}.sd-rv{fill:#2d6a3e;font-weight:600}"
    ".sd-dim{stroke:#6c7a80;stroke-width:.7}.sd-dimt{fill:#6c7a80;font-size:10px}"
    "a.sd-part:focus{outline:none}a.sd-part:focus>*:first-child,a.sd-part:hover>*:first-child"
    "{stroke:#c0392b;stroke-width:2.4}"
)


def shaft_svg(design: Any, result: Any = None, *, width_px: int = 900, load_case: str | None = None,
              system: str = "si", links: bool = True) -> str:
    """SVG of the shaft arrangement, to scale.

    Parameters
    ----------
    design : Design or mapping
        The (valid) design, SI-mm.
    result : Result, optional
        When given, the forces of ``load_case`` (default: the first) are drawn with values.
    width_px : int
        Width of the drawing [px]; the height follows from the scale.
    system : {"si", "us"}
        Unit system of the labels.
    links : bool
        Wrap every part in a link to its editor row (off for the printed note).
    """
    d = _as_dict(design)
    segs = d["shaft"]["segments"]
    L = sum(float(s["length_mm"]) for s in segs) or 1.0
    els = d.get("elements") or []
    sups = d.get("supports") or []
    dmax = max(float(s["d_mm"]) for s in segs)
    reach = [dmax]
    for e in els:
        if e.get("pitch_d_mm"):
            reach.append(float(e["pitch_d_mm"]))
        elif e.get("kind") == "coupling":
            reach.append(2.2 * dmax)
    hmax_mm = max(reach)
    margin_l, margin_r = 56.0, 56.0
    scale = (width_px - margin_l - margin_r) / L
    # keep tall arrangements readable: cap the shape height, the scale stays one for x and y
    max_h_px = min(0.42 * width_px, 400.0)
    if hmax_mm * scale > max_h_px:
        scale = max_h_px / hmax_mm
    draw_w = L * scale
    x0 = (width_px - draw_w) / 2
    arrow_room = 66.0 if result is not None else 26.0
    top = 30.0 + arrow_room
    cy = top + hmax_mm * scale / 2
    height = cy + hmax_mm * scale / 2 + arrow_room + 30.0
    X = lambda x: x0 + float(x) * scale  # noqa: E731
    R = lambda r: float(r) * scale  # noqa: E731

    out: list[str] = [
        f'<svg xmlns="http://www.w3.org/2000/svg" class="shaft-drawing" viewBox="0 0 {width_px} {height:.0f}" '
        f'width="{width_px}" height="{height:.0f}" role="img" '
        f'aria-label="Side view of the shaft to scale, {units.fmt(L, "length", system, unit=True)} long">',
        f"<style>{SVG_STYLE}</style>",
    ]

    def part(href: str, title: str, body: str) -> str:
        if not links:
            return f"<g><title>{escape(title)}</title>{body}</g>"
        return (f'<a class="sd-part" href="#{href}" data-row="{href}" aria-label="{escape(title)}">'
                f"<title>{escape(title)}</title>{body}</a>")

    # shaft outline (one closed path: top edge left→right, bottom edge back)
    edges = [0.0]
    for s in segs:
        edges.append(edges[-1] + float(s["length_mm"]))
    top_pts, bot_pts = [], []
    for s, a, b in zip(segs, edges[:-1], edges[1:]):
        r = R(float(s["d_mm"]) / 2)
        top_pts += [(X(a), cy - r), (X(b), cy - r)]
        bot_pts += [(X(a), cy + r), (X(b), cy + r)]
    pts = top_pts + bot_pts[::-1]
    path = "M" + " L".join(f"{x:.1f},{y:.1f}" for x, y in pts) + " Z"
    seg_body = [f'<path class="sd-shaft" d="{path}"/>']
    for i, (s, a, b) in enumerate(zip(segs, edges[:-1], edges[1:])):
        if i > 0:
            r = R(min(float(s["d_mm"]), float(segs[i - 1]["d_mm"])) / 2)
            seg_body.append(f'<line class="sd-shaft" x1="{X(a):.1f}" y1="{cy - r:.1f}" x2="{X(a):.1f}" y2="{cy + r:.1f}"/>')
        bore = float(s.get("bore_mm") or 0)
        if bore > 0:
            rb = R(bore / 2)
            seg_body.append(f'<rect class="sd-bore" x="{X(a):.1f}" y="{cy - rb:.1f}" width="{R(b - a):.1f}" height="{2 * rb:.1f}"/>')
    out.append(seg_body[0])
    for i, (s, a, b) in enumerate(zip(segs, edges[:-1], edges[1:])):
        r = R(float(s["d_mm"]) / 2)
        title = (f"step {i + 1}: Ø {units.fmt(float(s['d_mm']), 'length', system, unit=True)} × "
                 f"{units.fmt(float(s['length_mm']), 'length', system, unit=True)}")
        body = (f'<rect x="{X(a):.1f}" y="{cy - r:.1f}" width="{R(b - a):.1f}" height="{2 * r:.1f}" '
                f'fill="transparent" stroke="none"/>')
        out.append(part(f"row-shaft-segments-{i}", title, body))
    out.extend(seg_body[1:])
    out.append(f'<line class="sd-axis" x1="{x0 - 14:.1f}" y1="{cy:.1f}" x2="{x0 + draw_w + 14:.1f}" y2="{cy:.1f}"/>')

    # parts on the shaft
    dia_at = lambda x: min([float(s["d_mm"]) for s, a, b in zip(segs, edges[:-1], edges[1:])  # noqa: E731
                            if a - 1e-9 <= float(x) <= b + 1e-9] or [float(segs[-1]["d_mm"])])
    for i, e in enumerate(els):
        kind = e.get("kind", "gear")
        x = X(e["x_mm"])
        rs = R(dia_at(e["x_mm"]) / 2)
        title = f"{e.get('id', '')}: {kind.replace('_', ' ')} at x = {units.fmt(float(e['x_mm']), 'length', system, unit=True)}"
        pd = float(e.get("pitch_d_mm") or 0)
        w_mm = float(e.get("width_mm") or 0) or max(0.18 * pd, 0.5 * dia_at(e["x_mm"])) if pd else 0
        w = max(R(w_mm), 6.0)
        rp = R(pd / 2)
        if kind == "gear":
            body = (f'<rect class="sd-gear" x="{x - w / 2:.1f}" y="{cy - rp:.1f}" width="{w:.1f}" height="{2 * rp:.1f}"/>'
                    f'<line class="sd-pitch" x1="{x - w / 2 - 4:.1f}" y1="{cy - rp + 3:.1f}" x2="{x + w / 2 + 4:.1f}" y2="{cy - rp + 3:.1f}"/>')
            if float(e.get("helix_angle_deg") or 0) > 0:
                sgn = 1 if e.get("hand") != "left" else -1
                for k in (-1, 0, 1):
                    yy = cy + k * rp * 0.55
                    body += (f'<line class="sd-pitch" x1="{x - w / 3:.1f}" y1="{yy + sgn * w / 3:.1f}" '
                             f'x2="{x + w / 3:.1f}" y2="{yy - sgn * w / 3:.1f}"/>')
        elif kind == "bevel_gear":
            s = 1 if e.get("apex") == "+x" else -1
            inner = rp * 0.7
            body = (f'<polygon class="sd-gear" points="{x - s * w / 2:.1f},{cy - rp:.1f} {x + s * w / 2:.1f},{cy - inner:.1f} '
                    f'{x + s * w / 2:.1f},{cy + inner:.1f} {x - s * w / 2:.1f},{cy + rp:.1f}"/>')
        elif kind in ("pulley", "sprocket"):
            cls = "sd-pul"
            body = f'<rect class="{cls}" x="{x - w / 2:.1f}" y="{cy - rp:.1f}" width="{w:.1f}" height="{2 * rp:.1f}" rx="{min(w, 2 * rp) * 0.18:.1f}"/>'
            if kind == "pulley":
                body += f'<polyline class="{cls}" points="{x - w / 4:.1f},{cy - rp:.1f} {x:.1f},{cy - rp + 7:.1f} {x + w / 4:.1f},{cy - rp:.1f}"/>'
            else:
                n = 5
                zz = " ".join(f"{x - w / 2 + k * w / n:.1f},{cy - rp + (4 if k % 2 else 0):.1f}" for k in range(n + 1))
                body += f'<polyline class="{cls}" points="{zz}"/>'
        elif kind == "coupling":
            rc = max(R(1.1 * dia_at(e["x_mm"])), rs + 6)
            wc = max(R(0.9 * dia_at(e["x_mm"])), 10.0)
            body = (f'<rect class="sd-cpl" x="{x - wc / 2:.1f}" y="{cy - rc:.1f}" width="{wc:.1f}" height="{2 * rc:.1f}" rx="3"/>'
                    f'<line class="sd-cpl" x1="{x:.1f}" y1="{cy - rc:.1f}" x2="{x:.1f}" y2="{cy + rc:.1f}"/>')
        elif kind == "moment":
            rr = rs + 12
            body = (f'<path class="sd-fixed" d="M{x - rr * 0.7:.1f},{cy - rr * 0.7:.1f} A{rr:.1f},{rr:.1f} 0 0 1 {x + rr * 0.7:.1f},{cy - rr * 0.7:.1f}"/>'
                    f'<circle class="sd-roll" cx="{x:.1f}" cy="{cy:.1f}" r="3"/>')
        else:  # point force: a marker; its arrow is drawn with the loads
            body = (f'<circle class="sd-fixed" cx="{x:.1f}" cy="{cy:.1f}" r="{rs + 4:.1f}" stroke-dasharray="3 2"/>'
                    f'<circle class="sd-roll" cx="{x:.1f}" cy="{cy:.1f}" r="2.5"/>')
        lab_y = cy - max(rp, rs) - 6 if kind not in ("coupling",) else cy - max(R(1.1 * dia_at(e['x_mm'])), rs + 6) - 6
        label = f'<text class="sd-txt" x="{x:.1f}" y="{lab_y:.1f}" text-anchor="middle">{escape(str(e.get("id", "")))}</text>' \
            if result is None else ""
        out.append(part(f"row-elements-{i}", title, body + label))

    # supports: a bearing symbol above and below the seat
    bw = max(L * _SUP_W_MM_FRAC * scale, 11.0)
    for i, s in enumerate(sups):
        x = X(s["x_mm"])
        rs = R(dia_at(s["x_mm"]) / 2)
        bh = max(R(0.32 * dia_at(s["x_mm"])), 10.0)
        bt = s.get("bearing_type")
        title = (f"{s.get('id', '')}: {(bt or 'rigid support').replace('_', ' ')}, axial "
                 f"{s.get('axial', 'none')}, at x = {units.fmt(float(s['x_mm']), 'length', system, unit=True)}")
        body = ""
        for sgn in (-1, 1):
            y_in = cy + sgn * rs
            y_out = cy + sgn * (rs + bh)
            yt = min(y_in, y_out)
            if bt is None:
                # rigid support: a wedge on the outside
                body += (f'<polygon class="sd-brg" points="{x:.1f},{y_in:.1f} {x - bw / 2:.1f},{y_out:.1f} '
                         f'{x + bw / 2:.1f},{y_out:.1f}"/>')
                continue
            body += f'<rect class="sd-brg" x="{x - bw / 2:.1f}" y="{yt:.1f}" width="{bw:.1f}" height="{bh:.1f}"/>'
            ym = (y_in + y_out) / 2
            if bt in ("deep_groove_ball", "angular_contact_ball"):
                body += f'<circle class="sd-roll" cx="{x:.1f}" cy="{ym:.1f}" r="{min(bw, bh) * 0.28:.1f}"/>'
                if bt == "angular_contact_ball":
                    body += (f'<line class="sd-brg" x1="{x - bw * 0.35:.1f}" y1="{ym + sgn * bh * 0.35:.1f}" '
                             f'x2="{x + bw * 0.35:.1f}" y2="{ym - sgn * bh * 0.35:.1f}"/>')
            elif bt == "self_aligning_ball":
                for k in (-1, 1):
                    body += f'<circle class="sd-roll" cx="{x + k * bw * 0.2:.1f}" cy="{ym:.1f}" r="{min(bw, bh) * 0.18:.1f}"/>'
            elif bt in ("cylindrical_roller", "needle_roller"):
                hh = bh * (0.5 if bt == "cylindrical_roller" else 0.22)
                body += f'<rect class="sd-roll" x="{x - bw * 0.3:.1f}" y="{ym - hh / 2:.1f}" width="{bw * 0.6:.1f}" height="{hh:.1f}"/>'
            elif bt == "tapered_roller":
                body += (f'<polygon class="sd-roll" points="{x - bw * 0.3:.1f},{ym - sgn * bh * 0.15:.1f} {x + bw * 0.3:.1f},{ym - sgn * bh * 0.3:.1f} '
                         f'{x + bw * 0.3:.1f},{ym + sgn * bh * 0.1:.1f} {x - bw * 0.3:.1f},{ym + sgn * bh * 0.2:.1f}"/>')
            else:  # spherical roller
                body += f'<ellipse class="sd-roll" cx="{x:.1f}" cy="{ym:.1f}" rx="{bw * 0.3:.1f}" ry="{bh * 0.28:.1f}"/>'
        ax = s.get("axial", "none")
        yb = cy + rs + bh + 3
        if ax in ("both", "+x"):
            body += f'<polygon class="sd-roll" points="{x + bw / 2 + 1:.1f},{yb:.1f} {x + bw / 2 + 8:.1f},{yb + 4:.1f} {x + bw / 2 + 1:.1f},{yb + 8:.1f}"/>'
        if ax in ("both", "-x"):
            body += f'<polygon class="sd-roll" points="{x - bw / 2 - 1:.1f},{yb:.1f} {x - bw / 2 - 8:.1f},{yb + 4:.1f} {x - bw / 2 - 1:.1f},{yb + 8:.1f}"/>'
        body += (f'<text class="sd-txt" x="{x:.1f}" y="{cy + rs + bh + (40 if result is not None else 22) + (arrow_room - 26 if result is not None else 0):.1f}" '
                 f'text-anchor="middle">{escape(str(s.get("id", "")))}</text>') if result is None else ""
        out.append(part(f"row-supports-{i}", title, body))

    # forces of one load case
    if result is not None and getattr(result, "load_cases", None):
        case = next((c for c in result.load_cases if c.name == load_case), result.load_cases[0])
        ids = {e.get("id"): (i, e) for i, e in enumerate(els)}
        mags = [math.hypot(f.Fy_N, f.Fz_N) for f in case.elements] + [s.Fr_N for s in case.supports]
        fmax = max(mags + [1e-9])
        for f in case.elements:
            i, e = ids.get(f.id, (None, {}))
            fr = math.hypot(f.Fy_N, f.Fz_N)
            x = X(f.x_mm)
            kind = e.get("kind", "")
            reach_mm = float(e.get("pitch_d_mm") or 0) / 2 if kind != "coupling" else 0
            y_tip = cy - max(R(reach_mm), R(dia_at(f.x_mm) / 2)) - 3
            if fr > 1e-6 * fmax and fr > 0:
                ln = 18 + 40 * fr / fmax
                out.append(f'<g class="sd-load">{_arrow(x, y_tip - ln, x, y_tip, "sd-a")}</g>')
                out.append(f'<text class="sd-val" x="{x:.1f}" y="{y_tip - ln - 5:.1f}" text-anchor="middle">'
                           f'{escape(f.id)} {units.fmt(fr, "force", system, n=3, unit=True)}</text>')
            else:
                out.append(f'<text class="sd-txt" x="{x:.1f}" y="{y_tip - 6:.1f}" text-anchor="middle">{escape(f.id)}</text>')
            if abs(f.Fx_N) > 1e-6 * max(fmax, 1):
                sgn = 1 if f.Fx_N > 0 else -1
                ya = cy + max(R(reach_mm), R(dia_at(f.x_mm) / 2)) + 12  # under the part, clear of it
                out.append(f'<g class="sd-load">{_arrow(x - sgn * 26, ya, x - sgn * 2, ya, "sd-a", 5)}</g>')
                out.append(f'<text class="sd-val" x="{x - sgn * 30:.1f}" y="{ya + 3:.1f}" text-anchor="{"end" if sgn > 0 else "start"}">'
                           f'axial {units.fmt(abs(f.Fx_N), "force", system, n=3, unit=True)}</text>')
        sid = {s.get("id"): s for s in sups}
        for r in case.supports:
            s = sid.get(r.id, {})
            x = X(r.x_mm)
            rs = R(dia_at(r.x_mm) / 2)
            bh = max(R(0.32 * dia_at(r.x_mm)), 10.0)
            y_tip = cy + rs + bh + 12
            ln = 18 + 40 * r.Fr_N / fmax
            out.append(f'<g class="sd-reac">{_arrow(x, y_tip + ln, x, y_tip, "sd-a")}</g>')
            label = f"{escape(r.id)} {units.fmt(r.Fr_N, 'force', system, n=3, unit=True)}"
            if r.Fa_N > 0.5:
                label += f" · axial {units.fmt(r.Fa_N, 'force', system, n=3, unit=True)}"
            out.append(f'<text class="sd-rv" x="{x:.1f}" y="{y_tip + ln + 13:.1f}" text-anchor="middle">{label}</text>')
        out.append(f'<text class="sd-dimt" x="{width_px - 8}" y="14" text-anchor="end">forces in load case '
                   f'“{escape(case.name)}”: radial resultants; reactions act on the shaft</text>')

    # scale bar along the bottom: ticks at round values of x
    yd = height - 16
    f_len = units.from_display(1.0, "length", system)  # mm per display unit
    step = _nice_step(L / f_len) * f_len
    out.append(f'<line class="sd-dim" x1="{X(0):.1f}" y1="{yd:.1f}" x2="{X(L):.1f}" y2="{yd:.1f}"/>')
    k = 0.0
    while k <= L + 1e-9:
        out.append(f'<line class="sd-dim" x1="{X(k):.1f}" y1="{yd - 4:.1f}" x2="{X(k):.1f}" y2="{yd + 4:.1f}"/>')
        out.append(f'<text class="sd-dimt" x="{X(k):.1f}" y="{yd + 13:.1f}" text-anchor="middle">'
                   f'{units.fmt(k, "length", system, n=3)}</text>')
        k += step
    out.append(f'<text class="sd-dimt" x="{X(L) + 8:.1f}" y="{yd + 3:.1f}">x [{units.unit_label("length", system)}]</text>')
    out.append(f'<text class="sd-dimt" x="8" y="14">to scale · 1 {units.unit_label("length", system)} = '
               f'{units.fmt(units.from_display(1, "length", system) * scale, "ratio", n=3)} px</text>')
    out.append("</svg>")
    return "".join(out)
