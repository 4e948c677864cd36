"""Reading the ``[search]`` table: the free variables' ranges and the limits a design must meet.

A free variable is given as one value (``"3 mm"``), a list (``["2 mm", "3 mm"]``) or an evenly spaced range
``{ from = "1 mm", to = "3 mm", steps = 9 }`` (add ``spacing = "log"`` for geometric spacing).  Whole-number
variables (``count``, ``passes``) take whole numbers: ``8``, ``[6, 8, 12]`` or ``{ from = 4, to = 30 }``
(every whole number, or ``steps`` of them).  Variables not given keep the design file's value.

Every error is a one-line :class:`~coldplate.errors.DesignError` naming ``[search] key``.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from coldplate.design.reader import Design
from coldplate.design.errors import DesignError
from hydraulics.validity import Bound

from coldplate.design.fields import Table, check_range, nearest
from coldplate.design.ranges import RANGES
from coldplate.design.units import parse_value, quoted

def _plausible(field: str) -> tuple[float, float]:
    b = RANGES[field]
    return b.low, b.high


#: Free variables by passage kind: name -> (unit kind, whole number?, plausible low, high in SI).  The
#: continuous ones share the design file's plausible ranges (coldplate.design.ranges), so every candidate
#: is a design the reader would accept; the whole numbers the reader's own limits.
VARIABLES = {
    "channels": {
        "count": ("count", True, 1, 2000),
        "width": ("length", False, *_plausible("[passage] width")),
        "depth": ("length", False, *_plausible("[passage] depth")),
        "base": ("length", False, *_plausible("[plate] base")),
        "flow": ("flow", False, *_plausible("[coolant] flow")),
    },
    "tube": {
        "inner_diameter": ("length", False, *_plausible("[passage] inner_diameter")),
        "passes": ("count", True, 1, 200),
        "base": ("length", False, *_plausible("[plate] base")),
        "flow": ("flow", False, *_plausible("[coolant] flow")),
    },
}
#: Header variables of a channel search (coldplate.sizing.headers): name -> the [passage] key's plausible range.
#: Searched as discrete variants, each value given; in the axes only when the table lists them (the others keep
#: the design's value: a plenum as deep as the channels unless [passage] says otherwise, its ports).
HEADER_VARIABLES = {name: _plausible(f"[passage] {name}") for name in ("plenum_depth", "inlet_port", "outlet_port")}
#: Most header variants one search may hold (each is a whole search of the channel grid).
MAX_VARIANTS = 27
#: Limits: name -> unit kind.
LIMITS = {
    "face_limit": "temperature",
    "pressure_drop_limit": "pressure",
    "discharge_limit": "temperature",
    "min_width": "length",
    "min_wall": "length",
    "max_thickness": "length",
    "max_water": "flow",
    "face_limit_confidence": "fraction",
}
#: The most candidates one search may hold (memory for the axes is small; this guards against typos).
MAX_CANDIDATES = 200_000_000
MAX_STEPS = 100_000


@dataclass(frozen=True)
class Limits:
    """What every candidate must meet (SI, kelvin); None where the design file sets no such limit."""

    face: float  #: hottest mounting face [K]
    pressure_drop: float | None  #: plate pressure drop [Pa]: the smaller of the stated limit and the static pressure
    pressure_source: str  #: where the pressure limit comes from, for the report
    discharge: float | None  #: outlet [K] (once-through: [supply] discharge_limit unless [search] sets one)
    min_width: float | None  #: narrowest channel the shop can cut [m]
    min_wall: float | None  #: thinnest wall between channels [m]
    max_thickness: float | None  #: plate stock: base + channel depth (or base + tube radius) at most [m]
    max_water: float | None  #: once-through water per day, as an average flow [m^3/s]
    face_confidence: float | None = None  #: hold the face limit at this percentile of the band ([uncertainty])


@dataclass(frozen=True)
class SearchSpec:
    """A parsed ``[search]`` table: axes of the free variables (SI arrays) and the limits."""

    kind: str  #: "channels" or "tube"
    axes: dict  #: variable name -> 1-D numpy array of values (SI; whole numbers as integers)
    limits: Limits
    given: tuple[str, ...]  #: the variables the table lists (the others keep the design's value)

    @property
    def size(self) -> int:
        return int(np.prod([v.size for v in self.axes.values()]))


def design_values(design: Design) -> dict:
    """The design file's own values of the free variables (SI)."""
    p = design.passage
    base = {"base": design.plate.base, "flow": design.flow}
    if p.kind == "channels":
        return {"count": p.count, "width": p.width, "depth": p.depth, **base}
    return {"inner_diameter": p.inner_diameter, "passes": p.passes, **base}


def read_search(data: dict, design: Design) -> SearchSpec:
    """Read the ``[search]`` table of a design file's data (the dict from TOML) for ``design``."""
    if "search" not in data:
        raise DesignError("[search]", "table is missing: give the ranges to search and the limits to meet")
    kind = design.passage.kind
    if kind not in VARIABLES:
        raise DesignError("[passage] kind", f"sizing covers channels and tube passages, not {kind}")
    if design.supply.drive == "pump":
        raise DesignError("[supply] drive", "sizing searches the flow itself: size with drive = \"flow\" or "
                                            "\"pressure\", then check the pump on the result with coldplate check")
    if design.flow is None and not (isinstance(data["search"], dict) and "flow" in data["search"]):
        raise DesignError("[search] flow", "is needed: the supply sets this design's flow, so give the flows to search")
    headers = HEADER_VARIABLES if kind == "channels" else {}
    t = Table(data["search"], "search", (*VARIABLES[kind], *headers, *LIMITS))
    own = design_values(design)
    axes, given = {}, []
    for name, (unit, whole, low, high) in VARIABLES[kind].items():
        if t.has(name):
            given.append(name)
            axes[name] = _axis(t, name, unit, whole, low, high)
        else:
            axes[name] = np.array([own[name]], dtype=int if whole else float)
    for name in headers:
        if t.has(name):
            given.append(name)
            axes[name] = _header_axis(t, name, design)
    n_variants = int(np.prod([axes[k].size for k in headers if k in axes]))
    if n_variants > MAX_VARIANTS:
        raise DesignError("[search]", f"{n_variants} combinations of plenum_depth, inlet_port and outlet_port is more "
                                      f"than the {MAX_VARIANTS} one search may hold (each is a search of its own)")
    limits = _limits(t, design)
    t.finish()
    if not given:
        raise DesignError("[search]", f"gives no variable to search; give one or more of: "
                                      f"{', '.join(VARIABLES[kind])}")
    spec = SearchSpec(kind, axes, limits, tuple(given))
    if spec.size > MAX_CANDIDATES:
        raise DesignError("[search]", f"{spec.size:,} candidates is more than the {MAX_CANDIDATES:,} one search "
                                      "may hold; use fewer steps")
    return spec


def _limits(t: Table, design: Design) -> Limits:
    face = t.value("face_limit", "temperature")
    if face <= design.inlet_temperature:
        raise DesignError(t.field("face_limit"), "is not above the inlet temperature: no plate can meet it")
    dp_given = t.value("pressure_drop_limit", "pressure", required=False)
    static = design.supply.static_pressure
    if dp_given is not None and (static is None or dp_given <= static):
        dp, source = dp_given, "[search] pressure_drop_limit, for the plate alone"
    elif static is not None:
        dp, source = static, "[supply] static_pressure, all of it across the plate"
    else:
        dp, source = None, "none given"
    if dp is not None:
        source += " (fittings, hose and valves are not counted: leave them their share)"
    once = design.supply.once_through
    discharge = t.value("discharge_limit", "temperature", required=False)
    if discharge is None and once:
        discharge = design.supply.discharge_limit
    kind = design.passage.kind
    min_width = t.value("min_width", "length", required=False)
    min_wall = t.value("min_wall", "length", required=False)
    if kind != "channels":
        for key in ("min_width", "min_wall"):
            if t.has(key):
                raise DesignError(t.field(key), "applies to channel plates only")
    max_thickness = t.value("max_thickness", "length", required=False)
    max_water = t.value("max_water", "flow", required=False)
    if max_water is not None and not once:
        raise DesignError(t.field("max_water"), "the water returns to its loop, so it uses none; "
                                                "bound the flow's range instead")
    # face_limit_confidence: the percentile of the band at which the face limit must hold (coldplate/uncertainty/
    # sizing.py runs the search again with the limit lowered until it does)
    return Limits(face, dp, source, discharge, min_width, min_wall, max_thickness, max_water,
                  t.value("face_limit_confidence", "fraction", required=False))


def _header_axis(t: Table, name: str, design: Design) -> np.ndarray:
    """A header variable's values: one value or a list (discrete variants, not a range), each a value the
    design file's ``[passage]`` would accept there."""
    field = t.field(name)
    if design.passage.plenum_length <= 0:
        raise DesignError(field, "needs a plenum: give [passage] plenum_length above zero")
    if isinstance(t.raw(name), dict):
        raise DesignError(field, "takes one value or a list of values (each variant is a search of its own), "
                                 "not a range")
    low, high = HEADER_VARIABLES[name]
    if name != "plenum_depth":  # the whole port on the plate, as [passage] inlet_port / outlet_port
        half = 0.5 * design.plate.width - 0.5 * (design.passage.port_diameter or 0.0)
        low, high = max(low, -half), min(high, half)
    values = _axis(t, name, "length", False, low, high)
    if name == "plenum_depth" and np.any(values <= 0):
        raise DesignError(field, "must be above zero")
    return values


def _axis(t: Table, name: str, unit: str, whole: bool, low: float, high: float) -> np.ndarray:
    field = t.field(name)
    raw = t.raw(name)
    if isinstance(raw, list):
        if not raw:
            raise DesignError(field, "is an empty list; give at least one value")
        if len(raw) > MAX_STEPS:
            raise DesignError(field, f"lists more than {MAX_STEPS:,} values")
        values = np.array([_one(v, unit, whole, field, low, high) for v in raw])
    elif isinstance(raw, dict):
        values = _range(raw, unit, whole, field, low, high)
    else:
        values = np.array([_one(raw, unit, whole, field, low, high)])
    values = np.unique(values)
    return values.astype(int) if whole else values.astype(float)


def _one(v, unit, whole, field, low, high):
    """One value of a free variable, checked against its plausible range before numpy sees it (a whole
    number past 64 bits, or near 2**63, must be refused here, not overflow an array)."""
    if whole:
        if isinstance(v, bool) or not isinstance(v, int):
            raise DesignError(field, f"must be whole numbers, got {quoted(v)}")
        if not (low <= v <= high):
            raise DesignError(field, f"{quoted(v)} is outside the plausible range, whole numbers {low:g} to {high:g}")
        return v
    x = parse_value(v, unit, field)
    check_range(field, v, x, unit, Bound(field, low, high))
    return x


def _range(raw: dict, unit: str, whole: bool, field: str, low: float, high: float) -> np.ndarray:
    unknown = sorted(set(raw) - {"from", "to", "steps", "spacing"})
    if unknown:
        order = nearest(unknown[0], ("from", "to", "steps", "spacing"))
        raise DesignError(field, f"unknown key {quoted(unknown[0])} in a range (known: {', '.join(order)})")
    for key in ("from", "to"):
        if key not in raw:
            raise DesignError(field, f"a range needs 'from' and 'to' (missing {key!r})")
    lo, hi = (_one(raw[k], unit, whole, field, low, high) for k in ("from", "to"))
    if hi < lo:
        raise DesignError(field, "the range runs backwards: 'to' is below 'from'")
    steps = raw.get("steps")
    if steps is None:
        if not whole:
            raise DesignError(field, "a range of lengths or flows needs 'steps' (how many values)")
        steps = hi - lo + 1
    if isinstance(steps, bool) or not isinstance(steps, int) or not (1 <= steps <= MAX_STEPS):
        raise DesignError(field, f"steps must be a whole number from 1 to {MAX_STEPS:,}, got {quoted(steps)}")
    if steps == 1 and hi != lo:
        raise DesignError(field, "one step cannot span a range; give steps of 2 or more, or one value")
    spacing = raw.get("spacing", "linear")
    if spacing not in ("linear", "log"):
        raise DesignError(field, f"spacing must be 'linear' or 'log', not {quoted(spacing)}")
    if spacing == "log":
        if lo <= 0:
            raise DesignError(field, "log spacing needs a range above zero")
        values = np.geomspace(lo, hi, steps)
    else:
        values = np.linspace(lo, hi, steps)
    if whole:
        values = np.unique(np.rint(values).astype(int))
    if not np.all(np.isfinite(values)):
        raise DesignError(field, "the range is not finite")
    return values

