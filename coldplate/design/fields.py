"""Reading one TOML table of a design file: every read recorded, values parsed with units.

Shared by every part of the design file (``design.py`` and the tables that features add), so each
table refuses unknown keys and names its fields the same way: ``[table] key``.
"""
from __future__ import annotations

from typing import Any

from coldplate.design.errors import DesignError
from coldplate.design.units import parse_value

SI_LABEL = {"length": "m", "power": "W", "flow": "m³/s", "pressure": "Pa (gauge)", "conductivity": "W/(m K)",
           "area_resistance": "m² K/W", "fraction": "(as a fraction)"}


class Table:
    """One TOML table with every read recorded, so unknown keys can be refused."""

    def __init__(self, data: Any, name: str):
        if not isinstance(data, dict):
            raise DesignError(f"[{name}]", "must be a table")
        self.data, self.name, self.used = data, name, set()

    def field(self, key: str) -> str:
        return f"[{self.name}] {key}"

    def has(self, key: str) -> bool:
        return key in self.data

    def raw(self, key: str, required: bool = True):
        self.used.add(key)
        if key not in self.data:
            if required:
                raise DesignError(self.field(key), "is missing")
            return None
        return self.data[key]

    def value(self, key: str, kind: str, *, required=True, low=None, high=None, low_inclusive=False,
              default=None) -> float | None:
        raw = self.raw(key, required and default is None)
        if raw is None:
            return default
        v = parse_value(raw, kind, self.field(key))
        self._range(key, v, low, high, low_inclusive, raw, kind)
        return v

    def _range(self, key, v, low, high, low_inclusive, raw, kind):
        def show(x):  # limits in the units a user reads: degC for temperatures, SI otherwise
            return f"{x - 273.15:g} degC" if kind == "temperature" else f"{x:g} {SI_LABEL.get(kind, '(SI)')}"

        if low is not None and ((v < low) if low_inclusive else (v <= low)):
            if low == 0:
                what = "negative" if low_inclusive else "zero or negative"
                raise DesignError(self.field(key), f"{raw!r} is {what}; it must be "
                                                   f"{'zero or more' if low_inclusive else 'above zero'}")
            raise DesignError(self.field(key), f"{raw!r} is below the accepted range (at least {show(low)})")
        if high is not None and v > high:
            raise DesignError(self.field(key), f"{raw!r} is implausibly large (at most {show(high)})")

    def integer(self, key: str, low: int, high: int) -> int:
        raw = self.raw(key)
        if isinstance(raw, bool) or not isinstance(raw, int):
            raise DesignError(self.field(key), f"must be a whole number, got {raw!r}")
        if not (low <= raw <= high):
            raise DesignError(self.field(key), f"{raw} is outside {low}..{high}")
        return raw

    def choice(self, key: str, choices, default=None) -> str:
        raw = self.raw(key, default is None)
        if raw is None:
            return default
        if raw not in choices:
            raise DesignError(self.field(key), f"{raw!r} is not one of: {', '.join(choices)}")
        return raw

    def exactly_one(self, *keys: str) -> str:
        given = [k for k in keys if k in self.data]
        if len(given) != 1:
            which = "both" if len(given) > 1 else "neither"
            raise DesignError(f"[{self.name}]", f"give exactly one of {' or '.join(keys)} ({which} given)")
        return given[0]

    def finish(self) -> None:
        unknown = sorted(set(self.data) - self.used)
        if unknown:
            raise DesignError(self.field(unknown[0]), f"unknown key (known here: {', '.join(sorted(self.used))})")
