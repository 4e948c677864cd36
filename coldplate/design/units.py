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
}


def parse_value(text: object, kind: str, field: str) -> float:
    """Parse a design-file value ``"<number> <unit>"`` into an SI float of ``kind``.

    Raises :class:`DesignError` naming ``field`` for anything else: a bare number
    where a unit is needed, an unknown unit, a unit of the wrong kind, NaN or
    infinity.  Fractions may also be given as a bare number between 0 and 1.
    """
    if isinstance(text, bool) or not isinstance(text, (str, int, float)):
        raise DesignError(field, f"expected a value with a unit such as {_EXAMPLE[kind]}, got {text!r}")
    if isinstance(text, (int, float)):
        if kind == "fraction":
            value = float(text)
            _finite(value, field)
            return value
        raise DesignError(field, f"a bare number has no unit; write it with one, e.g. {_EXAMPLE[kind]}")
    match = _NUMBER_UNIT.match(text)
    if not match:
        raise DesignError(field, f"cannot read {text!r}; write a number then a unit, e.g. {_EXAMPLE[kind]}")
    number, unit = float(match.group(1)), match.group(2)
    _finite(number, field)
    if not unit:
        if kind == "fraction":
            return number
        raise DesignError(field, f"{text!r} has no unit; write it with one, e.g. {_EXAMPLE[kind]}")
    for name, hint in _REFUSED_UNITS.items():
        if re.search(rf"(?<![A-Za-z_]){name}(?![A-Za-z_])", unit):
            raise DesignError(field, f"unit '{name}' is not accepted: {hint}")
    try:
        q = Quantity(number, unit)
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, AttributeError,
            TypeError, ValueError, SyntaxError, AssertionError) as exc:
        raise DesignError(field, f"unknown unit in {text!r} ({exc})") from None
    if not q.check(KINDS[kind]):
        raise DesignError(field, f"{text!r} is not a {kind.replace('_', ' ')} (expected a unit like {_EXAMPLE[kind]})")
    try:
        value = float(q.to(_SI_UNIT[kind]).magnitude)
    except pint.errors.OffsetUnitCalculusError:
        raise DesignError(field, f"{text!r}: write temperature differences in K or delta_degC") from None
    _finite(value, field)
    return value


def _finite(value: float, field: str) -> None:
    if not math.isfinite(value):
        raise DesignError(field, "must be a finite number (NaN and infinity are not values)")
