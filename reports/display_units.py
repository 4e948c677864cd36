"""Display units for reports: SI (the default) or US customary.  Formatting only; inside, everything is SI.

Each kind of quantity has an SI base unit (what the result holds), a display unit per system and a label.
The conversion factor and offset come from the project's pint registry (coldplate/units.py), evaluated once
per kind; tests check every factor against an independent pint registry and against NIST SP 811.
US energy is the International Table Btu (``Btu_it``), the one NIST SP 811 lists; pint's bare ``Btu`` is the
ISO value, 1.4e-7 apart.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass
from functools import lru_cache

import numpy as np

SYSTEMS = ("si", "us")

#: kind -> (SI unit the result holds, {system: (pint unit, label)})
KINDS = {
    "temperature": ("K", {"si": ("degC", "°C"), "us": ("degF", "°F")}),
    "temperature_difference": ("K", {"si": ("K", "K"), "us": ("delta_degF", "°F")}),
    "flow": ("m**3/s", {"si": ("L/min", "L/min"), "us": ("gallon/minute", "gpm")}),
    "pressure": ("Pa", {"si": ("kPa", "kPa"), "us": ("psi", "psi")}),
    "length": ("m", {"si": ("mm", "mm"), "us": ("inch", "in")}),
    "length_m": ("m", {"si": ("m", "m"), "us": ("ft", "ft")}),
    "power": ("W", {"si": ("W", "W"), "us": ("Btu_it/hour", "BTU/h")}),
    "thermal_resistance": ("K/W", {"si": ("K/W", "K/W"), "us": ("delta_degF/(Btu_it/hour)", "°F·h/BTU")}),
    "velocity": ("m/s", {"si": ("m/s", "m/s"), "us": ("ft/s", "ft/s")}),
    "heat_transfer_coefficient": ("W/(m**2*K)", {"si": ("W/(m**2*K)", "W/(m²·K)"),
                                                 "us": ("Btu_it/(hour*ft**2*delta_degF)", "BTU/(h·ft²·°F)")}),
    "conductivity": ("W/(m*K)", {"si": ("W/(m*K)", "W/(m·K)"),
                                 "us": ("Btu_it/(hour*ft*delta_degF)", "BTU/(h·ft·°F)")}),
    "mass": ("kg", {"si": ("g", "g"), "us": ("lb", "lb")}),
    "air_flow": ("m**3/s", {"si": ("m**3/hour", "m³/h"), "us": ("ft**3/minute", "ft³/min")}),
    "air_pressure": ("Pa", {"si": ("Pa", "Pa"), "us": ("inch_H2O", "inH₂O")}),
    "volume_per_day": ("L/day", {"si": ("L/day", "L/day"), "us": ("gallon/day", "gal/day")}),
    "volume_per_year": ("m**3/year", {"si": ("m**3/year", "m³/year"), "us": ("gallon/year", "gal/year")}),
    "area_resistance": ("K*m**2/W", {"si": ("K*m**2/W", "K·m²/W"),
                                     "us": ("delta_degF*ft**2/(Btu_it/hour)", "°F·ft²·h/BTU")}),
}


@lru_cache(maxsize=None)
def conversion(kind: str, system: str) -> tuple[float, float]:
    """(factor, offset) with display = factor * SI + offset, from the project's pint registry."""
    from coldplate.design.units import Quantity

    si, table = KINDS[kind]
    unit = table[system][0]
    zero = float(Quantity(0.0, si).to(unit).magnitude)
    span = float(Quantity(1000.0, si).to(unit).magnitude)  # a wide span keeps the offset's rounding out
    return (span - zero) / 1000.0, zero


@dataclass(frozen=True)
class DisplayUnits:
    """Converts SI values to one display system and formats them with their labels."""

    system: str = "si"

    def __post_init__(self):
        if self.system not in SYSTEMS:
            raise ValueError(f"unknown unit system {self.system!r}; choose one of {', '.join(SYSTEMS)}")

    def label(self, kind: str) -> str:
        return KINDS[kind][1][self.system][1]

    def value(self, kind: str, si):
        """SI value (float or array) in display units."""
        factor, offset = conversion(kind, self.system)
        if isinstance(si, (int, float)):
            return factor * float(si) + offset
        return factor * np.asarray(si, dtype=float) + offset

    def fmt(self, kind: str, si: float, digits: int = 4) -> str:
        """The number alone, ``digits`` significant figures (temperatures to 0.01)."""
        return format_number(self.value(kind, si), kind, digits)

    def text(self, kind: str, si: float, digits: int = 4) -> str:
        """Number and unit, e.g. '26.55 °C'."""
        return f"{self.fmt(kind, si, digits)} {self.label(kind)}"


def passage_line(geometry, u: DisplayUnits) -> str:
    """The passage's one-line description in the display system: its lengths formatted into the slots of its
    template (SI keeps the plate solve's own line, in mm)."""
    if u.system == "si" or not geometry.description_template:
        return geometry.description
    return geometry.description_template.format(*(u.text("length", x, 3) for x in geometry.description_lengths))


def format_number(x: float, kind: str = "", digits: int = 4) -> str:
    """``digits`` significant figures in plain notation (0.0006798, 5465, 43,640: thousands separated from
    10**digits up); exponent notation only below 1e-4 and from 1e12 up, where plain figures stop being
    readable."""
    if kind == "temperature":
        return f"{x:.2f}"
    if x != 0 and (abs(x) >= 1e12 or abs(x) < 1e-4):
        return f"{x:.{digits - 1}e}"
    if abs(x) >= 10**digits:
        return f"{x:,.0f}"
    if x == 0:
        return "0"
    decimals = max(digits - 1 - math.floor(math.log10(abs(x))), 0)
    text = f"{x:.{decimals}f}"
    if abs(float(text)) >= 10**digits:  # rounded up across the separator's threshold
        return f"{x:,.0f}"
    return text.rstrip("0").rstrip(".") if "." in text else text  # as the 'g' format: no trailing zeros


_IN_TEXT = {  # unit in a finding's wording -> (kind, SI value of one such unit; None: offset)
    "degC": ("temperature", None),
    "kPa": ("pressure", 1e3),
    "bar": ("pressure", 1e5),
    "L/min": ("flow", 1.0 / 6e4),
    "m/s": ("velocity", 1.0),
    "mm": ("length", 1e-3),
}
_NUMBER_UNIT = re.compile(r"(?<![\w.])(-?\d+(?:[.,]\d+)*(?:\.\d+)?) ?(degC|kPa|bar|L/min|m/s|mm)(?![\w/])")


def exact_values(*objects, depth: int = 3) -> tuple[float, ...]:
    """Every finite float held by these results (dataclasses, their fields, tuples of them), SI.

    Findings quote rounded SI figures; :func:`annotate` converts the value a figure was rounded from, found
    here, so the bracket agrees with the tables (1.773 kPa quoted as '1.8 kPa' is shown as 0.257 psi).
    """
    from dataclasses import fields, is_dataclass

    out: list[float] = []
    seen: set[int] = set()

    def walk(x, level):
        if isinstance(x, bool) or id(x) in seen:
            return
        if isinstance(x, (int, float)):
            if np.isfinite(x):
                out.append(float(x))
            return
        if level >= depth:
            return
        seen.add(id(x))
        if is_dataclass(x) and not isinstance(x, type):
            for f in fields(x):
                walk(getattr(x, f.name, None), level + 1)
        elif isinstance(x, (tuple, list)) and len(x) <= 64:
            for y in x:
                walk(y, level + 1)
        elif isinstance(x, np.ndarray) and x.size <= 64 and x.dtype.kind == "f":
            out.extend(float(v) for v in x.ravel() if np.isfinite(v))

    for obj in objects:
        walk(obj, 0)
    return tuple(out)


def _exact(number_text: str, unit: str, exact) -> float | None:
    """The SI value among ``exact`` that rounds to the quoted figure in the quoted unit (None when none does)."""
    kind, factor = _IN_TEXT[unit]
    figure = number_text.replace(",", "")
    decimals = len(figure.split(".")[1]) if "." in figure else 0
    quoted = float(figure)
    best = None
    for v in exact:
        shown = v - 273.15 if kind == "temperature" else abs(v / factor)  # '1.8 kPa below' quotes a magnitude
        if f"{shown:.{decimals}f}" == f"{quoted:.{decimals}f}" and (best is None or abs(shown - quoted) < best[0]):
            best = (abs(shown - quoted), shown * factor if kind != "temperature" else v)
    return None if best is None else best[1]


def annotate(text: str, units: DisplayUnits, exact=()) -> str:
    """Add the display-unit equivalent after each SI quantity quoted in a sentence from the solver.

    Findings are worded by the solver in SI; with US units, '15.0 degC' becomes '15.0 degC (59.0 °F)'.  The
    equivalent is converted from the exact value the figure was rounded from when ``exact`` (SI values, from
    :func:`exact_values`) holds one that rounds to it, else from the figure itself.
    """
    if units.system == "si":
        return text

    def repl(m):
        number, unit = float(m.group(1).replace(",", "")), m.group(2)
        kind, factor = _IN_TEXT[unit]
        si = _exact(m.group(1), unit, exact)
        if si is None:
            si = number + 273.15 if kind == "temperature" else number * factor
        shown = units.value(kind, si)
        return f"{m.group(0)} ({format_number(shown, '', 3) if kind != 'temperature' else f'{shown:.1f}'} " \
               f"{units.label(kind)})"

    return _NUMBER_UNIT.sub(repl, text)
