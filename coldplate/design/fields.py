"""Reading one TOML table of a design file: every read recorded, values parsed with units.

Shared by every part of the design file (``design/reader.py`` and each concept's reader), so each table
refuses unknown keys and names its fields the same way: ``[table] key``.  Every value's plausible range
comes from :mod:`coldplate.design.ranges` (data, one record per field) and is compared under the one rule
of :mod:`hydraulics.validity` (a relative tolerance); a refusal names the range in the user's units.
A table that declares its ``keys`` names a typo as the unknown key it is, with the nearest known key.
"""
from __future__ import annotations

import difflib
from typing import Any, Iterable

from hydraulics.validity import Bound, above, at_least, at_most

from coldplate.design.errors import DesignError
from coldplate.design.ranges import plausible
from coldplate.design.units import parse_value, quoted

SI_LABEL = {"length": "m", "power": "W", "flow": "m³/s", "pressure": "Pa (gauge)", "conductivity": "W/(m K)",
            "area_resistance": "m² K/W", "fraction": "(as a fraction)", "current": "A", "voltage": "V",
            "electrical_resistance": "ohm", "thermal_resistance": "K/W", "thermal_conductance": "W/K",
            "seebeck": "V/K", "temperature_difference": "K", "time": "s", "volume": "m³", "energy": "J",
            "hours": "h"}


#: How a kind of value is shown to a user: degC, mm, L/min, bar, %, money per m³ or kWh; SI otherwise.
_SHOW = {
    "temperature": lambda x: f"{x - 273.15:g} degC",
    "length": lambda x: f"{x * 1e3:g} mm",
    "flow": lambda x: f"{x * 6e4:g} L/min",
    "pressure": lambda x: f"{x / 1e5:g} bar",
    "fraction": lambda x: f"{x * 100:g} %",
    "money_volume": lambda x: f"{x:g} per m³",
    "money_energy": lambda x: f"{x * 3.6e6:g} per kWh",
    "money": lambda x: f"{x:g}",
    "hours": lambda x: f"{x:g} h" if x >= 1 else f"{x * 60:g} min",
    "days": lambda x: f"{x:g} day" + ("" if x == 1 else "s"),
}


def show(x: float, kind: str) -> str:
    """An SI value in the units a user reads (see ``_SHOW``)."""
    fmt = _SHOW.get(kind)
    return fmt(x) if fmt else f"{x:g} {SI_LABEL.get(kind, '(SI)')}"


def nearest(key: str, choices: Iterable[str]) -> list[str]:
    """``choices`` ordered nearest to ``key`` first (by similarity of spelling), ties alphabetically."""
    return sorted(set(choices), key=lambda c: (-difflib.SequenceMatcher(None, key.lower(), c.lower()).ratio(), c))


def check_range(field: str, raw, v: float, kind: str, bound: Bound, why: str = "") -> None:
    """Refuse ``v`` (parsed from ``raw``) outside ``bound``, naming the range in the user's units; ``why``
    names a limit that comes from the rest of the design (a channel no wider than its plate)."""
    low, high = bound.low, bound.high
    low_ok = above(v, low) if bound.low_open else at_least(v, low)
    if low_ok and at_most(v, high):
        return
    given = quoted(raw)
    seen = show(v, kind)
    number = isinstance(raw, (int, float)) and seen.split(" ", 1)[0] == f"{raw:g}"
    if not number and seen.split(" ", 1)[-1] not in str(raw):  # the value again in the range's units
        given += f" ({seen})"
    if not low_ok and low == 0:
        what = "zero or negative" if bound.low_open else "negative"
        raise DesignError(field, f"{given} is {what}; it must be {'above zero' if bound.low_open else 'zero or more'}")
    hint = ""
    if kind == "fraction" and isinstance(raw, (int, float)) and v > 1:
        hint = f"; a bare number is a fraction of one: write '{raw:g} %'"
    elif kind == "fraction" and isinstance(raw, str) and v > 1 and "%" not in raw:
        hint = f"; a number without a unit is a fraction of one: write '{v:g} %'"
    where = "below" if not low_ok else "above"
    if why:
        limit = show(low if not low_ok else high, kind)
        raise DesignError(field, f"{given} is {where} {limit}, {why}")
    raise DesignError(field, f"{given} is {where} the plausible range: between {show(low, kind)} and "
                             f"{show(high, kind)}{hint}")


class Table:
    """One TOML table with every read recorded, so unknown keys can be refused.

    ``keys``: every key this table may hold (declare them, or set :attr:`keys` once the table's kind is
    known), so a misspelt key is named as unknown, with the nearest known key, even where it stands in for
    a key that is required.
    """

    def __init__(self, data: Any, name: str, keys: Iterable[str] | None = None):
        if not isinstance(data, dict):
            raise DesignError(f"[{name}]", "must be a table")
        self.data, self.name, self.used = data, name, set()
        self.keys = tuple(keys) if keys is not None else None
        if "" in data:
            raise DesignError(f"[{name}] \"\"", "an empty key (\"\" = ...) is not a key; remove it or name it")

    def field(self, key: str) -> str:
        return f"[{self.name}] {key}"

    def has(self, key: str) -> bool:
        return key in self.data

    def _known(self) -> set[str]:
        return set(self.keys or ()) | self.used

    def _unknown_for(self, key: str) -> None:
        """A required ``key`` is missing: if a key not known here is spelt like it, name that key instead."""
        strangers = [k for k in self.data if k not in self._known() and k != key]
        if self.keys is None:
            return
        close = difflib.get_close_matches(key, strangers, n=1, cutoff=0.6)
        if close:
            raise DesignError(self.field(close[0]), f"unknown key `{close[0]}`; did you mean `{key}`?")

    def raw(self, key: str, required: bool = True):
        self.used.add(key)
        if key not in self.data:
            if required:
                self._unknown_for(key)
                raise DesignError(self.field(key), "is missing")
            return None
        return self.data[key]

    def word(self, key: str) -> str:
        """A name to look up in one of our tables (a material): a short string, so no refusal echoes a page."""
        raw = self.raw(key)
        if not isinstance(raw, str) or not raw.strip() or len(raw) > 60:
            raise DesignError(self.field(key), f"{quoted(raw)} is not a name; write one of the names listed for it")
        return raw

    def value(self, key: str, kind: str, *, required=True, low=None, high=None, low_inclusive=False,
              default=None, why="the limit the rest of the design sets") -> float | None:
        """The value of ``key`` in SI: its plausible range (:mod:`~coldplate.design.ranges`) is checked, and
        ``low``/``high`` add limits that depend on the rest of the design (``low`` is excluded unless
        ``low_inclusive``), named in a refusal by ``why``."""
        raw = self.raw(key, required and default is None)
        if raw is None:
            return default
        field = self.field(key)
        v = parse_value(raw, kind, field)
        bound = plausible(self.name, key)
        if bound is not None:
            check_range(field, raw, v, kind, bound)
        if low is not None or high is not None:
            extra = Bound(key, low if low is not None else -float("inf"), high if high is not None else float("inf"),
                          low_open=not low_inclusive)
            check_range(field, raw, v, kind, extra, why)
        return v

    def integer(self, key: str, low: int, high: int) -> int:
        raw = self.raw(key)
        if isinstance(raw, bool) or not isinstance(raw, int):
            raise DesignError(self.field(key), f"must be a whole number, got {quoted(raw)}")
        if not (low <= raw <= high):
            raise DesignError(self.field(key), f"{quoted(raw)} is outside the accepted whole numbers {low} to {high}")
        return raw

    def choice(self, key: str, choices, default=None) -> str:
        raw = self.raw(key, default is None)
        if raw is None:
            return default
        if not isinstance(raw, str) or raw not in choices:
            near = difflib.get_close_matches(raw, choices, n=1, cutoff=0.6) if isinstance(raw, str) else []
            hint = f"; did you mean {near[0]!r}?" if near else ""
            raise DesignError(self.field(key), f"{quoted(raw)} is not one of: {', '.join(choices)}{hint}")
        return raw

    def exactly_one(self, *keys: str) -> str:
        given = [k for k in keys if k in self.data]
        if len(given) != 1:
            if not given:
                for k in keys:
                    self._unknown_for(k)
            which = "both" if len(given) > 1 else "neither"
            raise DesignError(f"[{self.name}]", f"give exactly one of {' or '.join(keys)} ({which} given)")
        return given[0]

    def finish(self) -> None:
        known = self._known()
        unknown = sorted(set(self.data) - self.used)
        if unknown:
            key = unknown[0]
            if key in known:
                raise DesignError(self.field(key), "does not apply with the other keys this table gives; remove it")
            order = nearest(key, known)
            mean = f"; did you mean `{order[0]}`?" if order and difflib.get_close_matches(key, order, 1, 0.6) else ""
            raise DesignError(self.field(key), f"unknown key `{key}`{mean} (known here: {', '.join(order)})")
