"""Bearing tables: read and validate a CSV table into numpy arrays.

The bundled table is ``sample_data/bearings.csv`` (illustrative ratings from the ISO rating
formulas; see its header). A user's own table with the same columns is loaded the same way;
every problem is reported as ``engine.model.DesignError`` with ``Issue(path="row 12, column
C_N", ...)``, where the row is the line number in the file (comment lines count).

Format: UTF-8 text; lines starting with ``#`` are comments (the provenance header); then one
header line with the column names below (order free, extra columns ignored with a warning);
then one bearing per line. Units are in the column names (mm, N, deg, rpm).

Public functions
----------------
parse_catalogue   text -> Catalogue
load_catalogue    file path -> Catalogue
bundled_catalogue the bundled table, loaded once and cached
"""
from __future__ import annotations

import csv
from collections import Counter
import functools
import math
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from engine.model import BEARING_TYPES, DesignError, Issue

__all__ = ["COLUMNS", "REQUIRED", "BUNDLED_PATH", "Catalogue", "parse_catalogue",
           "load_catalogue", "bundled_catalogue"]

COLUMNS = ("designation", "bearing_type", "series", "d_mm", "D_mm", "B_mm", "contact_angle_deg",
           "C_N", "C0_N", "Cu_N", "limiting_speed_rpm", "f0", "e", "Y1", "Y2", "Y0")
MAX_COLUMNS = 100  # the columns above and room for a supplier's own extras
# optional columns a table may add (design-format.md, keys added later): a_mm, the pressure
# centre's distance from the bearing's mid-width toward its back face; da_min_mm and Da_max_mm,
# the abutment diameters on the shaft (smallest shoulder) and in the housing (largest)
OPTIONAL = ("a_mm", "da_min_mm", "Da_max_mm")
REQUIRED = ("designation", "bearing_type", "series", "d_mm", "D_mm", "B_mm", "C_N", "C0_N")
_NUMERIC = ("d_mm", "D_mm", "B_mm", "contact_angle_deg", "C_N", "C0_N", "Cu_N",
            "limiting_speed_rpm", "f0", "e", "Y1", "Y2", "Y0", "a_mm", "da_min_mm", "Da_max_mm")
_ROW_FACTOR_TYPES = {"tapered_roller": ("e", "Y2", "Y0"),
                     "spherical_roller": ("e", "Y1", "Y2", "Y0"),
                     "self_aligning_ball": ("e", "Y1", "Y2", "Y0")}
_BALL = ("deep_groove_ball", "angular_contact_ball", "self_aligning_ball")
BUNDLED_PATH = Path(__file__).resolve().parents[2] / "sample_data" / "bearings.csv"
MAX_ISSUES = 100


@dataclass(frozen=True, eq=False)
class Catalogue:
    """A validated bearing table as column arrays (one element per row).

    Float columns use NaN for an empty cell. ``row_line`` is each row's line in the file.
    """

    name: str
    designation: np.ndarray
    bearing_type: np.ndarray
    series: np.ndarray
    d_mm: np.ndarray
    D_mm: np.ndarray
    B_mm: np.ndarray
    contact_angle_deg: np.ndarray
    C_N: np.ndarray
    C0_N: np.ndarray
    Cu_N: np.ndarray
    limiting_speed_rpm: np.ndarray
    f0: np.ndarray
    e: np.ndarray
    Y1: np.ndarray
    Y2: np.ndarray
    Y0: np.ndarray
    row_line: np.ndarray
    a_mm: np.ndarray = field(default_factory=lambda: np.zeros(0))  # pressure centre from mid-width (NaN: not given)
    da_min_mm: np.ndarray = field(default_factory=lambda: np.zeros(0))  # shaft abutment, smallest (NaN: not given)
    Da_max_mm: np.ndarray = field(default_factory=lambda: np.zeros(0))  # housing abutment, largest (NaN: not given)
    warnings: tuple[str, ...] = ()
    _by_type: dict = field(default_factory=dict, repr=False)

    def __len__(self) -> int:
        return int(self.d_mm.size)

    def rows_of(self, bearing_type: str) -> np.ndarray:
        """Indices of the rows of one bearing type (cached)."""
        if bearing_type not in self._by_type:
            self._by_type[bearing_type] = np.flatnonzero(self.bearing_type == bearing_type)
        return self._by_type[bearing_type]


def _num(text: str) -> float | None:
    t = text.strip()
    if not t:
        return None
    v = float(t)  # raises ValueError
    if not math.isfinite(v):
        raise ValueError("not finite")
    return v


def parse_catalogue(text: str, *, name: str = "bearing table") -> Catalogue:
    """Parse and validate a bearing table given as CSV text.

    Parameters
    ----------
    text : str
        The CSV text (``#`` comment lines, a header line, then rows)
    name : str
        What to call the table in messages

    Returns
    -------
    Catalogue

    Raises
    ------
    engine.model.DesignError
        With one Issue per problem (up to 100), paths ``header``, ``column X`` or
        ``row N, column X``; N is the line number in the file.

    Examples
    --------
    >>> t = ("designation,bearing_type,series,d_mm,D_mm,B_mm,C_N,C0_N,f0\\n"
    ...      "X-1,deep_groove_ball,02,25,52,15,14000,7850,13.8\\n")
    >>> parse_catalogue(t).C_N.tolist()
    [14000.0]
    """
    issues: list[Issue] = []
    warnings: list[str] = []
    add = lambda p, m: issues.append(Issue(path=p, message=m))  # noqa: E731
    lines = text.splitlines()
    start = next((i for i, ln in enumerate(lines) if ln.strip() and not ln.lstrip().startswith("#")), None)
    if start is None:
        raise DesignError([Issue(path="header", message=f"{name} has no header line and no rows")])
    header = [h.strip() for h in next(csv.reader([lines[start]]))]
    if len(header) > MAX_COLUMNS:  # refused before any check that grows with the columns
        raise DesignError([Issue(path="header", message=(
            f"{name} has {len(header):,} columns; a bearing table has at most {MAX_COLUMNS} "
            f"(the columns are {', '.join(COLUMNS)})"))])
    missing = [c for c in REQUIRED if c not in header]
    if missing:
        raise DesignError([Issue(path="header", message=(
            f"{name} lacks the column(s) {', '.join(missing)}; the columns are {', '.join(COLUMNS)}"))])
    dup = sorted(h for h, k in Counter(header).items() if k > 1)  # linear in the columns
    if dup:
        raise DesignError([Issue(path="header", message=f"column(s) {', '.join(dup)} appear twice")])
    extra = [h for h in header if h not in COLUMNS + OPTIONAL]
    if extra:
        warnings.append(f"{name}: column(s) {', '.join(extra)} are not used and were ignored")
    col = {h: k for k, h in enumerate(header)}

    cols: dict[str, list] = {c: [] for c in COLUMNS + OPTIONAL}
    line_no: list[int] = []
    seen: dict[str, int] = {}
    cu_estimated = 0
    no_speed = 0
    for ln_idx in range(start + 1, len(lines)):
        raw = lines[ln_idx]
        if not raw.strip() or raw.lstrip().startswith("#"):
            continue
        if len(issues) >= MAX_ISSUES:
            break
        n = ln_idx + 1
        cells = next(csv.reader([raw]))
        if len(cells) > len(header):
            add(f"row {n}", f"has {len(cells)} cells but the header has {len(header)} columns")
            continue
        get = lambda c: cells[col[c]].strip() if c in col and col[c] < len(cells) else ""  # noqa: E731
        row_bad = len(issues)
        vals: dict[str, float | None] = {}
        for c in _NUMERIC:
            try:
                vals[c] = _num(get(c))
            except ValueError:
                add(f"row {n}, column {c}", f"'{get(c)}' is not a number")
                vals[c] = None
        desig, kind, series = get("designation"), get("bearing_type"), get("series")
        if not desig:
            add(f"row {n}, column designation", "every row needs a designation")
        elif desig in seen:
            add(f"row {n}, column designation", f"'{desig}' is used twice (rows {seen[desig]} and {n})")
        else:
            seen[desig] = n
        if kind not in BEARING_TYPES:
            add(f"row {n}, column bearing_type",
                f"'{kind}' is not a bearing type; use one of {', '.join(BEARING_TYPES)}")
        if not series:
            add(f"row {n}, column series", "every row needs a dimension series (e.g. 02)")
        for c in ("d_mm", "D_mm", "B_mm", "C_N", "C0_N"):
            v = vals[c]
            if v is None and c not in [i.path.split("column ")[-1] for i in issues[row_bad:]]:
                add(f"row {n}, column {c}", f"{c} is required")
            elif v is not None and v <= 0:
                add(f"row {n}, column {c}", f"{c} must be positive, got {v:g}")
        d, D = vals["d_mm"], vals["D_mm"]
        if d and D and d > 0 and D <= d:
            add(f"row {n}, column D_mm", f"outer diameter {D:g} mm must exceed the bore {d:g} mm")
        for c in ("Cu_N", "limiting_speed_rpm", "f0", "e", "Y2", "Y0"):
            v = vals[c]
            if v is not None and v <= 0:
                add(f"row {n}, column {c}", f"{c} must be positive, got {v:g}")
        if vals["a_mm"] is not None and (vals["a_mm"] < 0 or (B := vals["B_mm"]) is not None and vals["a_mm"] > 5 * B):
            add(f"row {n}, column a_mm", f"a_mm (pressure centre from mid-width toward the back face) must lie "
                                         f"in 0 … 5·B, got {vals['a_mm']:g}")
        if vals["Y1"] is not None and vals["Y1"] < 0:
            add(f"row {n}, column Y1", f"Y1 must not be negative, got {vals['Y1']:g}")
        C, C0 = vals["C_N"], vals["C0_N"]
        if C and C0 and C0 > 0 and not (0.1 <= C / C0 <= 10):
            add(f"row {n}, column C0_N", f"C/C0 = {C / C0:.3g} is implausible (check the units: N)")
        a = vals["contact_angle_deg"]
        if a is not None and not (0 < a < 90):
            add(f"row {n}, column contact_angle_deg", f"contact angle must lie in 0–90°, got {a:g}")
        if kind == "angular_contact_ball":
            if a is None:
                add(f"row {n}, column contact_angle_deg", "angular contact rows need the contact angle")
            elif not (20 <= a <= 45):
                add(f"row {n}, column contact_angle_deg",
                    f"angular contact factors are tabulated for 20–45° here, got {a:g}")
        if kind == "deep_groove_ball" and vals["f0"] is None and "f0" not in str(issues[row_bad:]):
            add(f"row {n}, column f0", "deep groove rows need f0 (the ISO 76 factor of the bearing, "
                                       "12–17 is usual; it is on the supplier's data sheet)")
        for c in _ROW_FACTOR_TYPES.get(kind, ()):
            if vals[c] is None and f"column {c}" not in str(issues[row_bad:]):
                add(f"row {n}, column {c}", f"{kind} rows need {c} (from the supplier's data sheet)")
        if len(issues) > row_bad:
            continue
        if vals["Cu_N"] is None:
            dpw = 0.5 * (d + D)
            roller = kind not in _BALL
            base = C0 / 8.2 if roller else C0 / 22.0
            red = (100.0 / dpw) ** (0.3 if roller else 0.5) if dpw > 100 else 1.0
            vals["Cu_N"] = base * red
            cu_estimated += 1
        if vals["limiting_speed_rpm"] is None:
            no_speed += 1
        if kind == "tapered_roller" and vals["Y1"] is None:
            vals["Y1"] = 0.0
        cols["designation"].append(desig)
        cols["bearing_type"].append(kind)
        cols["series"].append(series)
        for c in _NUMERIC:
            cols[c].append(math.nan if vals[c] is None else vals[c])
        line_no.append(n)
    if issues:
        raise DesignError(issues[:MAX_ISSUES])
    if not line_no:
        raise DesignError([Issue(path="header", message=f"{name} has a header but no rows")])
    if cu_estimated:
        warnings.append(f"{name}: {cu_estimated} row(s) have no Cu_N; estimated as C0/22 (ball) or "
                        "C0/8.2 (roller), ISO 281 approximation")
    if no_speed:
        warnings.append(f"{name}: {no_speed} row(s) have no limiting speed; their speed is not checked")
    f = lambda c: np.asarray(cols[c], dtype=float)  # noqa: E731
    return Catalogue(
        name=name, designation=np.asarray(cols["designation"], dtype=object),
        bearing_type=np.asarray(cols["bearing_type"], dtype=object),
        series=np.asarray(cols["series"], dtype=object),
        d_mm=f("d_mm"), D_mm=f("D_mm"), B_mm=f("B_mm"), contact_angle_deg=f("contact_angle_deg"),
        C_N=f("C_N"), C0_N=f("C0_N"), Cu_N=f("Cu_N"), limiting_speed_rpm=f("limiting_speed_rpm"),
        f0=f("f0"), e=f("e"), Y1=f("Y1"), Y2=f("Y2"), Y0=f("Y0"),
        row_line=np.asarray(line_no, dtype=int), warnings=tuple(warnings), a_mm=f("a_mm"),
        da_min_mm=f("da_min_mm"), Da_max_mm=f("Da_max_mm"))


def load_catalogue(source: str | Path) -> Catalogue:
    """Read and validate a bearing table from a CSV file (see :func:`parse_catalogue`).

    Raises
    ------
    engine.model.DesignError
        Path ``catalogue`` when the file cannot be read; row/column paths for bad content.
    """
    p = Path(source)
    try:
        text = p.read_text(encoding="utf-8-sig")
    except (OSError, UnicodeDecodeError) as exc:
        raise DesignError([Issue(path="catalogue", message=f"cannot read bearing table {p.name}: {exc}")]) from None
    return parse_catalogue(text, name=p.name)


@functools.lru_cache(maxsize=1)
def bundled_catalogue() -> Catalogue:
    """The bundled illustrative table ``sample_data/bearings.csv``, loaded once."""
    return load_catalogue(BUNDLED_PATH)
