"""Display units and significant figures: the one place where the web layer converts.

Inside the engine and the design document everything is SI-mm (mm, N, N·m, rpm, kW, MPa,
GPa, kg, kg/m³, h). The page may show US customary units instead; every conversion between
the two goes through :func:`to_display` and :func:`from_display`, and every number shown is
formatted by :func:`fmt` (significant figures, not fixed decimals).

Quantities are named by the *kind* of number (``"length"``, ``"force"``, ...), so a field
declares what it is once and the unit label, the factor and the format follow.

Conversion factors are exact by definition (NIST SP 811, appendix B): 1 in = 25.4 mm;
1 lbf = 4.4482216152605 N; 1 lb = 0.45359237 kg; 1 hp (mechanical) = 0.745699872 kW;
1 psi = 6894.757293168 Pa.

>>> to_display(25.4, "length", "us")
1.0
>>> fmt(1234.5678, "force", "si")
'1235'
>>> fmt(0.000123456, "slope", "si")
'0.000123'
>>> fmt(5.597e8, "time", unit=True)
'559\u202f700\u202f000\u202fh'
"""
from __future__ import annotations

import math
from dataclasses import dataclass

__all__ = [
    "SYSTEMS", "Quantity", "QUANTITIES", "unit_label", "to_display", "from_display",
    "fmt", "fmt_input", "sig", "quantity_of_unit",
]

SYSTEMS = ("si", "us")

_IN_MM = 25.4
_LBF_N = 4.4482216152605
_LB_KG = 0.45359237
_PSI_MPA = 6894.757293168e-6
_LBFFT_NM = _LBF_N * 0.3048


@dataclass(frozen=True)
class Quantity:
    """One kind of number: its SI unit label, its US label, and SI = (US − offset) · factor
    (the offset is zero but for temperature: °C = (°F − 32) · 5/9)."""

    si: str
    us: str
    us_factor: float  # value_SI = (value_US - us_offset) * us_factor
    sig: int = 4
    us_offset: float = 0.0


QUANTITIES: dict[str, Quantity] = {
    "length": Quantity("mm", "in", _IN_MM),
    "deflection": Quantity("mm", "in", _IN_MM, 3),
    "force": Quantity("N", "lbf", _LBF_N),
    "moment": Quantity("N·m", "lbf·ft", _LBFFT_NM),
    "speed": Quantity("rpm", "rpm", 1.0),
    "power": Quantity("kW", "hp", 0.745699872),
    "mass": Quantity("kg", "lb", _LB_KG),
    "stress": Quantity("MPa", "ksi", _PSI_MPA * 1000.0),
    "modulus": Quantity("GPa", "Mpsi", _PSI_MPA * 1000.0),  # 1 Mpsi = 6.894757 GPa
    "density": Quantity("kg/m³", "lb/in³", _LB_KG / (_IN_MM * 1e-3) ** 3),
    "time": Quantity("h", "h", 1.0),
    "angle": Quantity("°", "°", 1.0),
    "slope": Quantity("rad", "rad", 1.0, 3),  # 0.000120 rad, not 0.0001204 rad
    "percent": Quantity("%", "%", 1.0),
    "stiffness": Quantity("N/mm", "lbf/in", _LBF_N / _IN_MM),
    "ratio": Quantity("", "", 1.0),
    "count": Quantity("", "", 1.0, 6),
    "temperature": Quantity("°C", "°F", 5.0 / 9.0, 3, us_offset=32.0),
    "twist": Quantity("°/m", "°/ft", 1.0 / 0.3048, 3),  # angle of twist per length: 1 °/ft = 3.281 °/m
}

# engine result "unit" strings -> quantity names (for checks, whose unit comes as text)
_UNIT_TO_QUANTITY = {"mm": "length", "N": "force", "N·m": "moment", "Nm": "moment",
                     "rpm": "speed", "kW": "power", "kg": "mass", "MPa": "stress",
                     "GPa": "modulus", "h": "time", "rad": "slope", "%": "percent", "°/m": "twist"}


_SUPERSCRIPT = str.maketrans("-0123456789", "⁻⁰¹²³⁴⁵⁶⁷⁸⁹")


def _q(quantity: str) -> Quantity:
    return QUANTITIES.get(quantity) or QUANTITIES["ratio"]


def quantity_of_unit(unit: str) -> str | None:
    """Quantity name of an SI unit string as the engine writes it (``"mm"`` → ``"length"``)."""
    return _UNIT_TO_QUANTITY.get(unit.strip())


def unit_label(quantity: str, system: str = "si") -> str:
    """Unit label to show next to a value of this quantity."""
    q = _q(quantity)
    return q.us if system == "us" else q.si


def to_display(value_si: float | None, quantity: str, system: str = "si") -> float | None:
    """SI value → display value."""
    if value_si is None:
        return None
    if system != "us":
        return float(value_si)
    q = _q(quantity)
    return float(value_si) / q.us_factor + q.us_offset


def from_display(value: float, quantity: str, system: str = "si") -> float:
    """Display value → SI value."""
    if system != "us":
        return float(value)
    q = _q(quantity)
    return (float(value) - q.us_offset) * q.us_factor


def sig(value: float, n: int = 4) -> float:
    """Round to ``n`` significant figures (0 and non-finite pass through)."""
    if value == 0 or not math.isfinite(value):
        return value
    return round(value, n - 1 - int(math.floor(math.log10(abs(value)))))


_GROUP = "\u202f"  # narrow no-break space between groups of three digits (ISO 80000-1, 7.3.1)
BIG_DISPLAY = 1e9  # shown in full digits below this; a life of 559 700 000 h reads as such


def _text(value: float, n: int, big: float = 1e7) -> str:
    if not math.isfinite(value):
        return "—"
    v = sig(value, n)
    if v == 0:
        return "0"
    a = abs(v)
    if a >= big or a < 1e-5:
        mant, _, exp = f"{v:.{n - 1}e}".partition("e")
        if "." in mant:
            mant = mant.rstrip("0").rstrip(".")
        return f"{mant}e{exp}"
    digits = max(0, n - 1 - int(math.floor(math.log10(a))))
    s = f"{v:.{digits}f}"
    if "." in s:
        s = s.rstrip("0").rstrip(".")
    return "-0" if s == "-0" else s


def _grouped(s: str) -> str:
    """``"88060"`` → ``"88 060"`` (narrow no-break spaces), for five digits and more before
    the decimal point; four-digit numbers stay whole (``"7850"``)."""
    sign = s[0] if s[:1] in "-+" else ""
    body = s[len(sign):]
    whole, dot, frac = body.partition(".")
    if len(whole) < 5 or not whole.isdigit():
        return s
    head = len(whole) % 3 or 3
    parts = [whole[:head]] + [whole[i:i + 3] for i in range(head, len(whole), 3)]
    return sign + _GROUP.join(parts) + dot + frac


def fmt(value_si: float | None, quantity: str = "ratio", system: str = "si", *,
        n: int | None = None, unit: bool = False) -> str:
    """Format an SI value for display: converted, to ``n`` significant figures (default per
    quantity, usually 4), digits in groups of three from 10 000 up, a power of ten only from
    10⁹ up or below 10⁻⁵, optionally followed by its unit label. ``None`` gives an en dash.
    The groups are narrow no-break spaces, which :func:`app.web.parse_number` ignores."""
    if value_si is None:
        return "–"
    v = to_display(value_si, quantity, system)
    s = _text(v, n or _q(quantity).sig, BIG_DISPLAY)
    if "e" not in s:
        s = _grouped(s)
    if "e" in s:  # 5.597e+08 -> 5.597×10⁸
        mant, _, exp = s.partition("e")
        s = mant + "×10" + str(int(exp)).translate(_SUPERSCRIPT)
    if s.startswith("-"):
        s = "−" + s[1:]  # a true minus sign
    if unit:
        lab = unit_label(quantity, system)
        if lab:
            s += ("" if lab in ("°", "%") else "\u202f") + lab
    return s


def fmt_input(value_si: float | None, quantity: str, system: str = "si") -> str:
    """Text for an input box: enough figures (7) that a unit switch and back changes nothing
    a designer would notice, plain ASCII minus so that it parses back."""
    if value_si is None:
        return ""
    v = to_display(value_si, quantity, system)
    if _q(quantity).us_factor == 1.0 or system != "us":
        return _text(v, 12)
    return _text(v, 7)
