"""The printed design note, the comparison of two revisions, and printing to PDF.

- :func:`note_context` turns a design document (and, when it is stored, its revision's
  metadata) into everything ``templates/note.html`` shows: title block, inputs, assumptions,
  methods with their sources, results tables, the to-scale drawing, server-drawn diagrams
  (:mod:`app.svgchart`, so printing needs no script), every check, and the cautions.
- :func:`render_note_html` renders that page without a web request (for the command line).
- :func:`print_pdf` prints a note (a design, or the URL of a note on this machine) to PDF
  through headless Chromium.
- :func:`cmd_note` is ``shaftwright note DESIGN.json -o note.pdf``.
- :func:`diff_documents` and :func:`compare_results` give what changed between two
  revisions: the inputs key by key, and the results (reactions, lives, checks) side by side.

Numbers are shown in SI-mm with :func:`app.units.fmt` (4 significant figures by default).
"""
from __future__ import annotations

import argparse
import json
import subprocess
import sys
import tempfile
from dataclasses import dataclass, field
from datetime import datetime, timezone
from pathlib import Path
from typing import Any, Iterable
from urllib.parse import urlparse

from fastapi.templating import Jinja2Templates
from markupsafe import Markup

import engine
from app import units
from app.limits import LimitError, parse_json
from app.security import install_templates
from app.settings import get_settings
from app.svgchart import line_chart
from engine.model import Design, DesignError, parse_design
from engine.result import Result

__all__ = [
    "ROOT", "TEMPLATES", "CAUTIONS", "NoteMeta", "Change", "note_context", "render_note_html",
    "print_pdf", "cmd_note", "flatten", "diff_documents", "result_digest", "compare_results",
    "solve_or_errors", "chromium_command", "drawing_svg",
]

ROOT = Path(__file__).resolve().parents[1]
TEMPLATES = Jinja2Templates(directory=str(ROOT / "templates"))
TEMPLATES.env.globals["fmt"] = units.fmt
install_templates(TEMPLATES.env)  # form token, who is signed in, JSON escaping

CAUTIONS = (
    "Results inform preliminary design only; they do not certify it.",
    "The bundled bearing ratings are illustrative, not any supplier's data: verify every "
    "bearing with the supplier's data before you buy or build.",
    "Apply the codes and standards that govern your machine.",
    "A qualified engineer must check the design before it is used.",
    "ISO factors and tables are used as recalled, not read from the standards: verify them "
    "against the standard.",
)


@dataclass(frozen=True)
class NoteMeta:
    """Where a note's design comes from: a stored revision, or a file (no id)."""

    design_id: str = ""
    revision: int | None = None
    author: str = ""
    created_at: str = ""
    comment: str = ""
    engine_version: str = ""
    source: str = ""  # e.g. the file name, when printed from the command line


# --- solving --------------------------------------------------------------------------------

def solve_or_errors(document: dict | Design) -> tuple[Design | None, Result | None, list]:
    """(design, result, errors): the errors are the engine's issues when it cannot solve."""
    try:
        design = parse_design(document)
    except DesignError as exc:
        return None, None, list(exc.errors)
    from app import work  # the bounded, cached solve: a stored revision is solved once

    try:
        return design, work.solve(design), []
    except DesignError as exc:
        return design, None, list(exc.errors)


# --- inputs ---------------------------------------------------------------------------------

def _web_fields():
    from app import web  # the editor's field definitions give the labels and quantities

    return web


def _value(v: Any, quantity: str = "ratio") -> str:
    if v is None:
        return "–"
    if isinstance(v, bool):
        return "yes" if v else "no"
    if isinstance(v, (int, float)):
        return units.fmt(float(v), quantity, "si", n=6)
    if isinstance(v, (dict, list)):
        return json.dumps(v, ensure_ascii=False)
    return str(v)


def _kv(obj: dict, fields: Iterable) -> list[tuple[str, str, str]]:
    """(label, value, unit) for the listed fields present in ``obj``, then the other keys."""
    rows, shown = [], set()
    for f in fields:
        shown.add(f.key)
        if f.key in obj:
            unit = units.unit_label(f.quantity, "si") if f.kind == "number" else ""
            rows.append((f.label, _value(obj[f.key], f.quantity), unit))
    for k, v in obj.items():
        if k not in shown and k not in ("kind", "id"):
            rows.append(_extra_row(k, v))
    return rows


# keys the editor does not show, printed in words with their units instead of as raw JSON
_EXTRA_LABELS: dict[str, tuple[str, str, str]] = {
    "contamination_ec": ("contamination factor ec", "ratio", ""),
    "shaft_temperature_C": ("shaft temperature", "ratio", "°C"),
    "critical_speed_margin_pct": ("margin below the first critical speed", "percent", "%"),
    "reliability_method": ("reliability method", "", ""),
    "fatigue_criterion": ("fatigue criterion", "", ""),
    "notch_sensitivity": ("notch sensitivity", "", ""),
    "keyway": ("keyway", "", ""),
}
# the parts of a key and a press fit (engine.mounting), in words with their units
_PART_WORDS = {"b_mm": ("width", "mm"), "h_mm": ("height", "mm"), "t1_mm": ("keyseat depth", "mm"),
               "length_mm": ("length", "mm"), "ends": ("ends", ""), "count": ("keys", ""),
               "Sy_MPa": ("key Sy", "MPa"), "hub_Sy_MPa": ("hub Sy", "MPa"), "fit": ("fit", ""),
               "interference_um": ("interference", "µm"), "hub_outer_d_mm": ("hub outer diameter", "mm"),
               "friction": ("friction coefficient", ""), "hub_E_GPa": ("hub E", "GPa"),
               "hub_nu": ("hub Poisson's ratio", ""), "shaft_nu": ("shaft Poisson's ratio", "")}


_EXTRA_VALUES = {"de_goodman": "DE–Goodman", "de_gerber": "DE–Gerber", "asme_elliptic": "ASME elliptic",
                 "soderberg": "Soderberg", "iso281": "ISO 281 a1", "weibull": "Weibull (three-parameter)",
                 "neuber": "Neuber", "kuhn_hardrath": "Kuhn–Hardrath", "end_milled": "end-milled",
                 "sled_runner": "sled-runner"}


def _extra_row(key: str, v: Any) -> tuple[str, str, str]:
    """(label, value, unit) of a key the form does not list: the lubricant as "ISO VG 68 at
    60 °C", known keys in words, anything else under its own key."""
    if key == "lubricant" and isinstance(v, dict):
        parts = []
        if v.get("iso_vg") is not None:
            parts.append(f"ISO VG {_value(v['iso_vg'])}")
        if v.get("operating_temp_C") is not None:
            parts.append(f"at {_value(v['operating_temp_C'])} °C")
        if v.get("viscosity_index") is not None:
            parts.append(f"(VI {_value(v['viscosity_index'])})")
        rest = {k: x for k, x in v.items() if k not in ("iso_vg", "operating_temp_C", "viscosity_index")}
        if rest:
            parts.append(_value(rest))
        return ("lubricant", " ".join(parts) or "–", "")
    if key in ("key", "press_fit") and isinstance(v, dict):
        words = [f"{_PART_WORDS.get(k, (k, ''))[0]} {_value(x)}{(' ' + _PART_WORDS[k][1]) if _PART_WORDS.get(k, ('', ''))[1] else ''}"
                 for k, x in v.items()]
        return ("parallel key" if key == "key" else "press fit", "; ".join(words) or "as standard", "")
    if key == "press_fit" and isinstance(v, bool):
        return ("press fit", "yes (H7/s6, hub 2·d assumed)" if v else "no", "")
    if key in _EXTRA_LABELS:
        label, quantity, unit = _EXTRA_LABELS[key]
        text = _value(v, quantity) if quantity else _EXTRA_VALUES.get(str(v), _value(v))
        return (label, text, unit)
    return (key, _value(v), "")


def _inputs(design: Design, document: dict) -> dict[str, Any]:
    web = _web_fields()
    edges = design.shaft.edges_mm()
    segments = [{"i": i + 1, "x0": edges[i], "x1": edges[i + 1], "seg": s}
                for i, s in enumerate(design.shaft.segments)]
    elements = []
    for e, raw in zip(design.elements, document.get("elements", [])):
        fields = [f for f in web.ELEMENT_FIELDS.get(e.kind, ())
                  if f.key not in ("id", "kind", "x_mm", "torque_Nm", "mass_kg")]
        params = [(lab, val, unit) for lab, val, unit in _kv(raw, fields)
                  if lab not in ("x_mm", "torque_Nm", "mass_kg")]
        elements.append({"e": e, "kind": web.KIND_LABELS.get(e.kind, e.kind), "params": params,
                         "torque_given": raw.get("torque_Nm") is not None})
    return {
        "material": _kv(document.get("shaft", {}).get("material", {}) or {}, web.MATERIAL_FIELDS),
        "segments": segments,
        "grooves": list(design.shaft.grooves),
        "supports": design.supports,
        "bearing_labels": web.BEARING_LABELS,
        "axial_labels": web.AXIAL_LABELS,
        "elements": elements,
        "load_cases": design.load_cases,
        "requirements": _kv(document.get("requirements", {}) or {}, web.REQUIREMENT_FIELDS),
        "requirements_model": design.requirements,
    }


def _assumptions(design: Design) -> list[str]:
    a = design.analysis
    g = design.gravity
    out = [
        f"The shaft is a beam of {len(design.shaft.segments)} stepped, round segments, "
        f"{units.fmt(design.shaft.length_mm, 'length', unit=True)} long, modelled with "
        f"{a.elements} finite elements, "
        + ("shear deformation included (Timoshenko beam)." if a.shear_deformation
           else "shear deformation left out (Euler–Bernoulli beam)."),
        "Supports act at a point at their x position, as simple supports (no moment restraint); "
        "rigid unless a radial stiffness is given.",
        "Each element's forces act at its x position (gear mesh, belt or chain pull, point "
        "force); torques act about the shaft axis and are carried between the elements.",
        (f"Weight acts along {g.direction} with g = {units.fmt(g.g_m_s2, 'ratio', n=6)} m/s²: the "
         "shaft's own weight and every element's mass load the shaft." if g is not None
         else "Weight is left out (gravity switched off in the design)."),
        "The duty cycle is the listed load cases, each for its share of the time; bearing "
        "loads are combined over the cycle into one equivalent load.",
        f"Bearing loads are multiplied by the application factor "
        f"{units.fmt(design.requirements.application_factor)}; lives are stated at "
        f"{units.fmt(design.requirements.reliability_pct, 'percent', unit=True)} reliability.",
        (f"Bearing candidates come from the designer's own table '{design.bearing_table.name}': its "
         "data are the designer's responsibility; verify them with the supplier."
         if design.bearing_table is not None else
         "Bearing candidates come from the bundled table: ISO boundary dimensions with ratings "
         "estimated from the ISO rating formulas and assumed internal geometry (illustrative, "
         "not any supplier's data); use your supplier's ratings for the final choice."),
    ]
    return out


def _methods(result: Result | None) -> list[tuple[str, str]]:
    """(method, source): the structural methods, then every source the results name."""
    out = [
        ("Bending in both transverse planes: two-node Timoshenko beam elements, which reduce "
         "to Euler–Bernoulli elements without shear deformation",
         "Przemieniecki, Theory of Matrix Structural Analysis, 1968, §5.6"),
        ("Shear coefficient of a hollow circular section",
         "Cowper, J. Appl. Mech. 33, 1966"),
        ("Element forces (gears, bevel gears, pulleys, sprockets) and sign conventions",
         "the design-document contract of this program (shaft-design/1)"),
    ]
    if result is None:
        return out
    seen = set()
    for b in result.bearings:
        if b.life_method and b.life_method not in seen:
            seen.add(b.life_method)
            out.append((f"Bearing life ({b.bearing_type.replace('_', ' ')})", b.life_method))
    for c in result.checks:
        key = (c.code, c.source)
        if c.source and key not in seen:
            seen.add(key)
            out.append((f"Check: {c.code.replace('_', ' ')}", c.source))
    return out


# --- results --------------------------------------------------------------------------------

_DIAGRAMS = (
    ("M_Nm", "Bending moment, resultant", "M [N·m]"),
    ("Mz_Nm", "Bending moment in the x–y plane", "Mz [N·m]"),
    ("My_Nm", "Bending moment in the x–z plane", "My [N·m]"),
    ("T_Nm", "Torque", "T [N·m]"),
    ("Vy_N", "Shear force in y", "Vy [N]"),
    ("Vz_N", "Shear force in z", "Vz [N]"),
    ("N_N", "Axial force (tension positive)", "N [N]"),
    ("u_mm", "Deflection, resultant", "u [mm]"),
    ("slope_rad", "Slope, resultant", "slope [rad]"),
)


# quantities drawn against one scale: a plane whose moment is round-off next to the other
# plane's draws as zero (app.svgchart.RESOLUTION)
_SCALE_GROUPS = (("M_Nm", "Mz_Nm", "My_Nm"), ("Vy_N", "Vz_N"))


def _charts(result: Result) -> list[Markup]:
    x = result.diagrams.x_mm
    charts = []

    def largest(keys: tuple[str, ...]) -> float:
        return max((abs(v) for q in result.diagrams.load_cases.values() for k in keys
                    for v in q.get(k, []) if v is not None and v == v and abs(v) != float("inf")),
                   default=0.0)

    for key, title, ylab in _DIAGRAMS:
        series = [(name, q[key]) for name, q in result.diagrams.load_cases.items() if key in q]
        if not series:
            continue
        if key == "N_N" and all(abs(v) < 1e-9 for _, ys in series for v in ys):
            continue  # no axial force anywhere: nothing to draw
        group = next((g for g in _SCALE_GROUPS if key in g), (key,))
        charts.append(line_chart(x, series, title=title, y_label=ylab, scale=largest(group)))
    return charts


def drawing_svg(design: Design, result: Result | None) -> Markup | None:
    try:
        from app.drawing import shaft_svg
    except ImportError:
        return None
    return Markup(shaft_svg(design, result))


def note_context(document: dict, meta: NoteMeta | None = None) -> dict[str, Any]:
    """Everything ``note.html`` shows, for a design document and where it comes from."""
    meta = meta or NoteMeta()
    design, result, errors = solve_or_errors(document)
    ctx: dict[str, Any] = {
        "meta": meta, "document": document, "design": design, "result": result,
        "errors": errors, "cautions": CAUTIONS,
        "name": (design.name if design else str(document.get("name", "")) or "untitled shaft"),
        "engine_version": (result.engine_version if result and result.engine_version
                           else meta.engine_version or engine.__version__),
        "printed_at": datetime.now(timezone.utc).strftime("%Y-%m-%d %H:%M UTC"),
        "css": Markup((ROOT / "static" / "css" / "note.css").read_text(encoding="utf-8")),
        "fmt": units.fmt,
    }
    if design is None:
        return ctx
    ctx.update(inputs=_inputs(design, document), assumptions=_assumptions(design),
               methods=_methods(result), drawing=drawing_svg(design, result))
    if result is not None:
        sources: dict[str, int] = {}
        for c in result.checks:
            sources.setdefault(c.source, len(sources) + 1)
        ctx.update(charts=_charts(result), check_sources=sources,
                   status_counts={s: sum(c.status == s for c in result.checks)
                                  for s in ("ok", "warn", "fail")})
    return ctx


def render_note_html(document: dict, meta: NoteMeta | None = None) -> str:
    """The note as one self-contained HTML page (styles inline, drawings as inline SVG)."""
    return TEMPLATES.env.get_template("note.html").render(note_context(document, meta))


# --- printing ---------------------------------------------------------------------------------

_CHROMIUM_FLAGS = ("--headless", "--no-sandbox", "--disable-gpu", "--no-pdf-header-footer",
                   "--disable-background-networking", "--disable-component-update",
                   "--disable-sync", "--no-first-run", "--disable-default-apps",
                   "--disable-extensions", "--mute-audio")


def chromium_command(url: str, out_path: Path, *, chromium: str, profile_dir: Path) -> list[str]:
    """The headless-Chromium command line that prints ``url`` to ``out_path``."""
    return [chromium, *_CHROMIUM_FLAGS, f"--user-data-dir={profile_dir}",
            f"--print-to-pdf={out_path}", url]


def _local_url(url: str) -> str:
    parsed = urlparse(url)
    if parsed.scheme == "file":
        return url
    if parsed.scheme in ("http", "https") and parsed.hostname in ("localhost", "127.0.0.1", "::1"):
        return url
    raise ValueError(f"only a note on this machine can be printed (localhost or a file), not {url!r}")


class _Progress:
    """A progress bar on stderr for the note's steps (only when stderr is a terminal).

    The steps are few and the browser's is the long one, so the bar shows the step's name and
    the time so far, refreshed while the browser works."""

    STEPS = 3  # solve, render, print

    def __init__(self, *, enabled: bool | None = None):
        self.enabled = sys.stderr.isatty() if enabled is None else enabled
        self._bar = None

    def __enter__(self) -> "_Progress":
        if self.enabled:
            from tqdm import tqdm

            self._bar = tqdm(total=self.STEPS, file=sys.stderr, leave=False, dynamic_ncols=True,
                             bar_format="{desc} |{bar}| {n}/{total} [{elapsed}]")
        return self

    def __exit__(self, *exc: object) -> None:
        if self._bar is not None:
            self._bar.close()
            self._bar = None

    def step(self, what: str) -> None:
        if self._bar is not None:
            if self._bar.desc:
                self._bar.update(1)
            self._bar.set_description_str(what)

    def tick(self) -> None:
        if self._bar is not None:
            self._bar.refresh()


def browser_path(chromium: str | None = None) -> str:
    """The headless browser to print with: ``SHAFTWRIGHT_CHROMIUM`` (default
    ``/usr/bin/chromium``), else ``chromium`` or ``chromium-browser`` on the PATH. Raises
    :class:`app.cli_io.ToolMissing`, saying how to get one, when there is none."""
    import shutil

    from app.cli_io import ToolMissing

    chromium = chromium or get_settings().chromium
    for name in (chromium, "chromium", "chromium-browser"):
        found = shutil.which(name)
        if found:
            return found
    raise ToolMissing(f"printing the note needs Chromium, and there is none at {chromium}: install it "
                      "(Debian/Ubuntu: apt-get install chromium, as root) or set SHAFTWRIGHT_CHROMIUM "
                      "to the path of a Chromium or Chrome program")


def print_pdf(design_or_url: dict | Design | str, out_path: str | Path, *,
              meta: NoteMeta | None = None, chromium: str | None = None,
              timeout_s: float = 120.0, progress: _Progress | None = None) -> Path:
    """Print the design note to PDF (A4) with headless Chromium; return the PDF's path.

    ``design_or_url`` is a design document (rendered here, no server needed) or the URL of a
    note served on this machine (``http://127.0.0.1:…/d/{id}/r/{n}/note``). Raises
    :class:`app.cli_io.ToolMissing` when there is no browser (a ``RuntimeError``), and
    ``RuntimeError`` when Chromium fails or writes no PDF.
    """
    import time

    progress = progress or _Progress(enabled=False)
    chromium = browser_path(chromium)
    out = Path(out_path).expanduser().resolve()
    out.parent.mkdir(parents=True, exist_ok=True)
    with tempfile.TemporaryDirectory(prefix="shaftwright-note-") as tmp:
        tmpdir = Path(tmp)
        if isinstance(design_or_url, str):
            url = _local_url(design_or_url)
        else:
            progress.step("drawing the note")
            doc = (design_or_url.model_dump(mode="json") if isinstance(design_or_url, Design)
                   else design_or_url)
            page = tmpdir / "note.html"
            page.write_text(render_note_html(doc, meta), encoding="utf-8")
            url = page.as_uri()
        if out.exists():
            out.unlink()
        progress.step("printing with Chromium")
        cmd = chromium_command(url, out, chromium=chromium, profile_dir=tmpdir / "profile")
        with tempfile.TemporaryFile(mode="w+", encoding="utf-8", errors="replace") as err:
            try:
                proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=err, text=True)
            except OSError as exc:
                raise RuntimeError(f"cannot start the browser {chromium}: {exc.strerror or exc}") from None
            deadline = time.monotonic() + timeout_s
            while proc.poll() is None:
                if time.monotonic() > deadline:
                    proc.kill()
                    proc.wait()
                    raise RuntimeError(f"cannot print: the browser took longer than {timeout_s:g} s")
                progress.tick()
                time.sleep(0.2)
            err.seek(0)
            stderr = err.read()
    if not out.exists() or out.read_bytes()[:5] != b"%PDF-":
        tail = stderr.strip().splitlines()[-3:]
        raise RuntimeError("the browser wrote no PDF (exit code "
                           f"{proc.returncode}): " + " | ".join(tail))
    return out


def cmd_note(args: argparse.Namespace) -> int:
    """``shaftwright note DESIGN.json -o note.pdf``: print a design file's note to PDF.

    Bad input raises :class:`app.cli_io.InputError`, a missing browser
    :class:`app.cli_io.ToolMissing`; ``shaftwright`` reports both in its one style."""
    from app.cli_io import InputError, design_error_lines, read_design_file

    path = Path(args.design)
    output = getattr(args, "output", None) or path.with_suffix(".pdf")
    progress = _Progress(enabled=getattr(args, "progress", None))
    with progress:
        progress.step("reading and solving the design")
        document = read_design_file(path)
        design, result, errors = solve_or_errors(document)
        if errors:
            raise InputError(path, *design_error_lines(errors))
        meta = NoteMeta(source=path.name, engine_version=engine.__version__)
        try:
            out = print_pdf(document, output, meta=meta, progress=progress)
        except OSError as exc:  # the output's folder cannot be made or written
            raise InputError(output, f"cannot write the PDF there: {exc.strerror or exc}") from None
    print(f"wrote {out}")
    return 0


# --- comparing revisions -------------------------------------------------------------------

@dataclass(frozen=True)
class Change:
    """One input that differs: its key path and its value before and after (None: absent)."""

    path: str
    before: str | None
    after: str | None

    @property
    def kind(self) -> str:
        return "added" if self.before is None else "removed" if self.after is None else "changed"


_KEYED = {"supports": "id", "elements": "id", "load_cases": "name"}


def flatten(doc: Any, prefix: str = "") -> dict[str, Any]:
    """Leaf values by key path. Supports and elements are keyed by id, load cases by name
    (``elements[G1].x_mm``), so that inserting a row does not show every later row changed."""
    out: dict[str, Any] = {}
    if isinstance(doc, dict):
        if not doc and prefix:
            out[prefix] = {}
        for k, v in doc.items():
            out.update(flatten(v, f"{prefix}.{k}" if prefix else str(k)))
    elif isinstance(doc, list):
        key = _KEYED.get(prefix)
        labels = [str(i) for i in range(len(doc))]
        if key and all(isinstance(it, dict) and isinstance(it.get(key), str) for it in doc):
            names = [it[key] for it in doc]
            if len(set(names)) == len(names):
                labels = names
        if not doc and prefix:
            out[prefix] = []
        for lab, v in zip(labels, doc):
            out.update(flatten(v, f"{prefix}[{lab}]"))
    else:
        out[prefix] = doc
    return out


def _show(v: Any) -> str:
    if isinstance(v, float) and v.is_integer():
        v = int(v)
    return json.dumps(v, ensure_ascii=False) if not isinstance(v, str) else v


def diff_documents(a: dict, b: dict) -> list[Change]:
    """Every input that differs between documents ``a`` and ``b``, in ``b``'s key order."""
    fa, fb = flatten(a), flatten(b)
    paths = list(fb) + [p for p in fa if p not in fb]
    out = []
    for p in paths:
        va, vb = fa.get(p, _MISSING), fb.get(p, _MISSING)
        if va is _MISSING or vb is _MISSING or _show(va) != _show(vb):
            out.append(Change(p, None if va is _MISSING else _show(va),
                              None if vb is _MISSING else _show(vb)))
    return out


_MISSING = object()


def result_digest(result: Result | None) -> dict[str, dict[str, str]]:
    """The results a comparison shows, as formatted text by section and label."""
    out: dict[str, dict[str, str]] = {"Reactions": {}, "Bearing lives": {}, "Checks": {},
                                      "Shaft": {}}
    if result is None:
        return out
    for c in result.load_cases:
        for s in c.supports:
            for key, q in (("Fy_N", "force"), ("Fz_N", "force"), ("Fr_N", "force"), ("Fa_N", "force")):
                out["Reactions"][f"{c.name} · {s.id} · {key}"] = units.fmt(getattr(s, key), q)
    for b in result.bearings:
        top = next((c for c in b.candidates if c.designation == b.designation), b.candidates[0] if b.candidates else None)
        out["Bearing lives"][f"{b.id} · bearing"] = top.designation if top else "none found"
        out["Bearing lives"][f"{b.id} · P_N"] = units.fmt(b.equivalent_load_N, "force")
        if top:
            out["Bearing lives"][f"{b.id} · L10_h"] = units.fmt(top.L10_h, "time")
            out["Bearing lives"][f"{b.id} · Lnm_h"] = units.fmt(top.Lnm_h, "time")
            out["Bearing lives"][f"{b.id} · s0"] = units.fmt(top.s0)
    for c in result.checks:
        label = " · ".join(p for p in (c.code, c.where, c.load_case) if p)
        value = "" if c.value is None else " " + units.fmt(c.value, units.quantity_of_unit(c.unit) or "ratio")
        out["Checks"][label] = f"{c.status}{value}"
    sh = result.shaft
    out["Shaft"]["max deflection [mm]"] = units.fmt(sh.max_deflection_mm, "deflection")
    out["Shaft"]["first critical speed [rpm]"] = units.fmt(sh.critical_speed_rpm, "speed")
    out["Shaft"]["mass [kg]"] = units.fmt(sh.mass_kg, "mass")
    return out


@dataclass
class CompareSection:
    title: str
    rows: list[tuple[str, str, str, bool]] = field(default_factory=list)  # label, a, b, changed

    @property
    def changed(self) -> int:
        return sum(r[3] for r in self.rows)


def compare_results(ra: Result | None, rb: Result | None) -> list[CompareSection]:
    """Results of two revisions side by side; each row says whether it changed."""
    da, db = result_digest(ra), result_digest(rb)
    out = []
    for title in da:
        labels = list(da[title]) + [k for k in db[title] if k not in da[title]]
        sec = CompareSection(title)
        for lab in labels:
            a, b = da[title].get(lab, "–"), db[title].get(lab, "–")
            sec.rows.append((lab, a, b, a != b))
        out.append(sec)
    return out
