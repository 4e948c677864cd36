"""Units at the edges: the one pint registry and the helpers that parse design values.

Inside the project every number is an SI float (temperatures in kelvin).  Pint is
used only here, in the design reader and in the reports.  Values are parsed in the
constructor form ``Quantity(number, unit)`` so that offset units such as
``"25 degC"`` work, and offset autoconversion is never switched on.  Units pint
does not define (``gpm``, ``lpm``, ``psig``) are rejected with a hint, never
guessed; ``cfm`` is rejected too because pint would read it as something else.
"""
from __future__ import annotations

import math
import re

import pint

from coldplate.design.errors import DesignError


def _make_registry() -> pint.UnitRegistry:
    try:
        # The parsed-definition cache makes a new process start about ten times faster.
        return pint.UnitRegistry(cache_folder=":auto:")
    except Exception:  # pragma: no cover - unwritable cache folder
        return pint.UnitRegistry()


ureg = _make_registry()
Quantity = ureg.Quantity

_NUMBER_UNIT = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")

#: Unit names that look familiar but pint either lacks or reads differently.
_REFUSED_UNITS = {
    "gpm": "write US gallons per minute as 'gallon/minute'",
    "lpm": "write litres per minute as 'L/min'",
    "psig": "give gauge pressure in 'psi' (all pressures in a design file are gauge unless said)",
    "psia": "give pressure in 'psi'",
    "cfm": "pint reads 'cfm' as something other than cubic feet per minute; write 'ft**3/min'",
    "barg": "give gauge pressure in 'bar'",
}

#: Dimensionality the design reader asks for, by kind of value.
KINDS = {
    "length": "[length]",
    "area": "[length] ** 2",
    "power": "[power]",
    "flow": "[length] ** 3 / [time]",
    "temperature": "[temperature]",
    "pressure": "[pressure]",
    "conductivity": "[power] / [length] / [temperature]",
    "area_resistance": "[temperature] * [length] ** 2 / [power]",
    "fraction": "[]",
    "time": "[time]",
    "velocity": "[length] / [time]",
    "current": "[current]",
    "voltage": "[electric_potential]",
    "electrical_resistance": "[electric_potential] / [current]",
    "thermal_resistance": "[temperature] / [power]",
    "thermal_conductance": "[power] / [temperature]",
    "seebeck": "[electric_potential] / [temperature]",
    "volume": "[length] ** 3",
    "energy": "[energy]",
    "temperature_difference": "[temperature]",
}

_SI_UNIT = {
    "length": "m",
    "area": "m**2",
    "power": "W",
    "flow": "m**3/s",
    "temperature": "K",
    "pressure": "Pa",
    "conductivity": "W/(m*K)",
    "area_resistance": "K*m**2/W",
    "fraction": "dimensionless",
    "time": "s",
    "velocity": "m/s",
    "current": "A",
    "voltage": "V",
    "electrical_resistance": "ohm",
    "thermal_resistance": "K/W",
    "thermal_conductance": "W/K",
    "seebeck": "V/K",
    "volume": "m**3",
    "energy": "J",
    "temperature_difference": "K",
}

_EXAMPLE = {
    "length": "'12 mm'",
    "area": "'4 cm**2'",
    "power": "'85 W'",
    "flow": "'1.5 L/min'",
    "temperature": "'18 degC'",
    "pressure": "'3 bar'",
    "conductivity": "'3 W/(m*K)'",
    "area_resistance": "'2e-5 K*m**2/W'",
    "fraction": "'55 %'",
    "time": "'8 h'",
    "velocity": "'1 m/s'",
    "current": "'4.5 A'",
    "voltage": "'15 V'",
    "electrical_resistance": "'1.9 ohm'",
    "thermal_resistance": "'0.05 K/W'",
    "thermal_conductance": "'0.5 W/K'",
    "seebeck": "'0.05 V/K'",
    "volume": "'1 m**3'",
    "energy": "'1 kWh'",
    "temperature_difference": "'68 K'",
}

#: Longest unit text read: a real unit is a few symbols; pint's parser recurses on long products.
MAX_UNIT_LENGTH = 60
#: Units a user may spell with the wrong case (lower-case key -> the spelling pint knows).
_CASE = {u.lower(): u for u in (
    "degC", "degF", "degK", "degR", "K", "Pa", "kPa", "MPa", "hPa", "mbar", "bar", "psi", "W", "kW", "mW", "MW",
    "mm", "cm", "m", "um", "km", "inch", "ft", "L", "mL", "min", "h", "s", "ms", "day", "J", "kJ", "kWh", "Wh",
    "A", "mA", "V", "mV", "uV", "ohm", "kohm", "mohm", "delta_degC", "delta_degF", "gallon", "percent")}
_DECIMAL_COMMA = re.compile(r"^\s*[-+]?\d+,\d+(?:[eE][-+]?\d+)?(\s|$)")


def quoted(raw: object, limit: int = 60) -> str:
    """``raw`` as a message shows it: its repr, cut to ``limit`` characters (one line, never a page)."""
    text = repr(raw)
    return text if len(text) <= limit else text[: limit - 5] + "...'" if isinstance(raw, str) else text[:limit] + "..."


def parse_value(text: object, kind: str, field: str) -> float:
    """Parse a design-file value ``"<number> <unit>"`` into an SI float of ``kind``.

    Raises :class:`DesignError` naming ``field`` for anything else: a bare number
    where a unit is needed, an unknown unit, a unit of the wrong kind, NaN or
    infinity, a decimal comma, a temperature difference where a temperature is
    needed (or the reverse).  Fractions may also be given as a bare number.
    """
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise DesignError(field, f"expected a value with a unit such as {_EXAMPLE[kind]}, got {quoted(text)}")
    if isinstance(text, (int, float)):
        if kind == "fraction":
            value = float(text) if abs(text) < 1e300 else math.inf  # whole numbers past a float: not finite
            _finite(value, field)
            return value
        raise DesignError(field, f"a bare number has no unit; write it with one, e.g. {_EXAMPLE[kind]}")
    if _DECIMAL_COMMA.match(text):
        fixed = text.replace(",", ".", 1).strip()
        raise DesignError(field, f"{quoted(text)} has a decimal comma: write decimals with a point, "
                                 f"{quoted(fixed)}, and thousands with no separator")
    match = _NUMBER_UNIT.match(text)
    if not match:
        raise DesignError(field, f"cannot read {quoted(text)}; write a number then a unit, e.g. {_EXAMPLE[kind]}")
    number, unit = float(match.group(1)), match.group(2)
    _finite(number, field)
    if not unit:
        if kind == "fraction":
            return number
        raise DesignError(field, f"{quoted(text)} has no unit; write it with one, e.g. {_EXAMPLE[kind]}")
    if len(unit) > MAX_UNIT_LENGTH:
        raise DesignError(field, f"the unit of {quoted(text)} is longer than {MAX_UNIT_LENGTH} characters; "
                                 f"write a plain unit, e.g. {_EXAMPLE[kind]}")
    if unit.count("(") != unit.count(")"):
        raise DesignError(field, f"the unit of {quoted(text)} has unbalanced brackets; write a plain unit, e.g. "
                                 f"{_EXAMPLE[kind]}")
    for name, hint in _REFUSED_UNITS.items():
        if re.search(rf"(?<![A-Za-z_]){name}(?![A-Za-z_])", unit):
            raise DesignError(field, f"unit '{name}' is not accepted: {hint}")
    q = _quantity(number, unit, text, kind, field)
    if not q.check(KINDS[kind]):
        case = _CASE.get(unit.lower())
        hint = f"; did you mean {case!r}?" if case and case != unit else ""
        raise DesignError(field, f"{quoted(text)} is not a {kind.replace('_', ' ')} (expected a unit like "
                                 f"{_EXAMPLE[kind]}){hint}")
    names = dict(q._units)
    if kind == "temperature" and any(n.startswith("delta_") for n in names):
        raise DesignError(field, f"{quoted(text)} is a temperature difference where a temperature is needed; "
                                 f"write it in degC, degF or K, e.g. {_EXAMPLE[kind]}")
    if kind == "temperature_difference" and not q._is_multiplicative:
        raise DesignError(field, f"{quoted(text)} is a temperature where a temperature difference is needed; "
                                 "write it in K or delta_degC")
    try:
        value = float(q.to(_SI_UNIT[kind]).magnitude)
    except pint.errors.OffsetUnitCalculusError:
        raise DesignError(field, f"{quoted(text)}: write temperature differences in K or delta_degC") from None
    except (OverflowError, ArithmeticError):
        raise DesignError(field, f"{quoted(text)} is too large a number to read") from None
    _finite(value, field)
    return value


def _quantity(number: float, unit: str, text: str, kind: str, field: str):
    """``Quantity(number, unit)``, every failure of pint's parser a one-line DesignError naming ``field``."""
    try:
        return Quantity(number, unit)
    except pint.errors.UndefinedUnitError as exc:
        bad = [str(u) for u in getattr(exc, "unit_names", ()) or ()] or [unit]
        hint = next((f"; did you mean {_CASE[b.lower()]!r}?" for b in bad if b.lower() in _CASE), "")
        hint = hint or f", e.g. {_EXAMPLE[kind]}"
        raise DesignError(field, f"unknown unit {bad[0]!r} in {quoted(text)}{hint}") from None
    except RecursionError:
        raise DesignError(field, f"cannot read the unit of {quoted(text)}; write a plain unit, e.g. "
                                 f"{_EXAMPLE[kind]}") from None
    except Exception as exc:  # the parser's own faults: unbalanced brackets, division by zero, stray symbols
        what = "divides by zero" if isinstance(exc, ZeroDivisionError) else f"is not a unit ({type(exc).__name__})"
        raise DesignError(field, f"the unit of {quoted(text)} {what}; write a plain unit, e.g. "
                                 f"{_EXAMPLE[kind]}") from None


def _finite(value: float, field: str) -> None:
    if not math.isfinite(value):
        raise DesignError(field, "must be a finite number (NaN and infinity are not values)")
