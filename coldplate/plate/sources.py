"""Heat sources on the mounting face: the ``[[source]]`` tables, or the one centred source ``[heat]`` means.

Where a source sits (looking down on the mounting face, the coolant entering at the left edge and leaving at
the right)::

        y > 0  (offset across is positive on this side)
      +--------------------------------------------+
      |            +------+                        |
   inlet  -------> | src  |  - - - - - - centre line (y = 0) - - ->  outlet
      |            +------+                        |
      +--------------------------------------------+
      x = 0        at[0] = x of the source's centre      x = plate length

``at = [x, y]``: ``x`` the distance of the source's centre from the plate's inlet edge along the flow (the
plate's own edge, plenum included), ``y`` its offset across from the plate's centre line, positive on the
left of the flow (upward in the drawing).  ``size = [along, across]`` like ``[heat] footprint``.

A source's own interface (``interface_resistance``, or ``interface_conductivity`` with
``interface_thickness``) replaces ``[interface]`` for that source; without one it takes ``[interface]``.
``limit`` is the hottest face temperature the device allows (optional).

Sources that overlap each other or reach past the plate's edge are refused, naming both.  ``[heat]`` is
read as one source named ``"heat"`` centred on the plate, so every design without ``[[source]]`` keeps its
meaning.
"""
from __future__ import annotations

from dataclasses import dataclass

from hydraulics.validity import at_most

from coldplate.design.errors import DesignError
from coldplate.design.fields import Table, check_range
from coldplate.design.ranges import INTERFACE_RESISTANCE, RANGES
from coldplate.design.units import parse_value

#: The keys of one ``[[source]]`` table.
SOURCE_KEYS = ("name", "load", "size", "at", "limit", "interface_resistance", "interface_conductivity",
               "interface_thickness")
#: The name the one source of ``[heat]`` is given.
HEAT_SOURCE_NAME = "heat"
#: Two sources whose rectangles share less than this length [m] on both axes do not overlap (touching edges).
_TOUCH = 1e-9


@dataclass(frozen=True)
class Source:
    """One heat source on the mounting face, in SI units (see the module's drawing for the axes)."""

    name: str
    load: float  #: [W] (NaN for a module array, whose heat the module solve sets)
    size: tuple[float, float]  #: (along the flow, across) [m]
    at: tuple[float, float]  #: centre: (distance from the inlet edge, offset across from the centre line) [m]
    interface: float  #: its interface resistance per area R'' [m² K/W]
    interface_described_as: str  #: how the user gave it ("[interface]" when it is the plate's)
    limit: float | None = None  #: hottest face temperature the device allows [K]

    @property
    def area(self) -> float:
        return self.size[0] * self.size[1]

    def edges(self) -> tuple[float, float, float, float]:
        """(x low, x high, y low, y high) [m]."""
        (x, y), (a, b) = self.at, self.size
        return x - a / 2, x + a / 2, y - b / 2, y + b / 2


def centred_source(load: float, footprint_length: float, footprint_width: float, plate_length: float,
                   interface: float, described_as: str) -> Source:
    """The source ``[heat]`` means: its footprint centred on the plate."""
    return Source(HEAT_SOURCE_NAME, load, (footprint_length, footprint_width), (plate_length / 2, 0.0),
                  interface, described_as)


def read_pair(raw, field: str) -> tuple[float, float, list]:
    """Two lengths ``[along the flow, across]`` [m], ``field`` naming the key in a refusal."""
    if not isinstance(raw, list) or len(raw) != 2:
        raise DesignError(field, "must be an array of two lengths, along the flow and across, "
                                 "e.g. [\"10 mm\", \"5 mm\"]")
    a = parse_value(raw[0], "length", field + " (along the flow)")
    b = parse_value(raw[1], "length", field + " (across)")
    return a, b, raw


def _pair(t: Table, key: str) -> tuple[float, float, list]:
    return read_pair(t.raw(key), t.field(key))


def _interface(t: Table, plate_interface: float, plate_described: str) -> tuple[float, str]:
    if t.has("interface_resistance"):
        if t.has("interface_conductivity") or t.has("interface_thickness"):
            raise DesignError(t.field("interface_resistance"), "give either interface_resistance, or "
                                                               "interface_conductivity and interface_thickness")
        r = parse_value(t.raw("interface_resistance"), "area_resistance", t.field("interface_resistance"))
        check_range(t.field("interface_resistance"), t.data["interface_resistance"], r, "area_resistance",
                    INTERFACE_RESISTANCE)
        return r, f"R'' = {r:.3g} m²K/W"
    if t.has("interface_conductivity") or t.has("interface_thickness"):
        if not (t.has("interface_conductivity") and t.has("interface_thickness")):
            missing = "interface_thickness" if t.has("interface_conductivity") else "interface_conductivity"
            raise DesignError(t.field(missing), "is missing (an own interface needs both conductivity and thickness)")
        k = parse_value(t.raw("interface_conductivity"), "conductivity", t.field("interface_conductivity"))
        check_range(t.field("interface_conductivity"), t.data["interface_conductivity"], k, "conductivity",
                    RANGES["[interface] conductivity"])
        th = parse_value(t.raw("interface_thickness"), "length", t.field("interface_thickness"))
        check_range(t.field("interface_thickness"), t.data["interface_thickness"], th, "length",
                    RANGES["[interface] thickness"])
        check_range(t.field("interface_thickness") + " / interface_conductivity",
                    f"{t.data['interface_thickness']} at {t.data['interface_conductivity']}", th / k,
                    "area_resistance", INTERFACE_RESISTANCE)
        return th / k, f"{th * 1e3:.3g} mm at {k:.3g} W/(m K)"
    return plate_interface, plate_described


def read_sources(raw, plate_length: float, plate_width: float, plate_interface: float,
                 plate_described: str) -> tuple[Source, ...]:
    """The ``[[source]]`` array of tables as :class:`Source` records, checked against the plate and each other."""
    if not isinstance(raw, list) or not raw or not all(isinstance(s, dict) for s in raw):
        raise DesignError("[[source]]", "list each heat source as a [[source]] table (name, load, size, at)")
    out: list[Source] = []
    for i, data in enumerate(raw, 1):
        t = Table(data, f"source {i}", SOURCE_KEYS)
        name = t.raw("name")
        if not isinstance(name, str) or not name.strip() or len(name) > 60:
            raise DesignError(t.field("name"), "must be a short name (1 to 60 characters)")
        name = name.strip()
        t.name = f"source {name!r}" if all(c.isprintable() for c in name) else t.name
        if any(s.name == name for s in out):
            raise DesignError(t.field("name"), f"two sources are named {name!r}; give each its own name")
        load = t.value("load", "power")
        a, b, size_raw = _pair(t, "size")
        for v, what, r in ((a, "along the flow", size_raw[0]), (b, "across", size_raw[1])):
            check_range(t.field("size") + f" ({what})", r, v, "length", RANGES["[heat] footprint"])
        x, y, _ = _pair(t, "at")
        limit = t.value("limit", "temperature", required=False)
        if limit is not None:
            check_range(t.field("limit"), t.data["limit"], limit, "temperature", RANGES["[supply] face_limit"])
        interface, described = _interface(t, plate_interface, plate_described)
        t.finish()
        s = Source(name, load, (a, b), (x, y), interface, described, limit)
        _fits(s, out, t.field("at"), "source", f"source {name!r}", plate_length, plate_width)
        out.append(s)
    return tuple(out)


def _fits(s: Source, placed, field: str, kind: str, label: str, plate_length: float, plate_width: float) -> None:
    """Refuse ``s`` (called ``label``, a ``kind``) when it leaves the plate or overlaps one already ``placed``."""
    x0, x1, y0, y1 = s.edges()
    if not (at_most(0.0, x0) and at_most(x1, plate_length)):
        raise DesignError(field, f"the {kind} runs from x = {x0 * 1e3:.4g} mm to {x1 * 1e3:.4g} mm, past "
                                 f"the plate's length (0 to {plate_length * 1e3:.4g} mm from the inlet edge)")
    if not (at_most(-plate_width / 2, y0) and at_most(y1, plate_width / 2)):
        raise DesignError(field, f"the {kind} runs from y = {y0 * 1e3:.4g} mm to {y1 * 1e3:.4g} mm, past "
                                 f"the plate's edges (±{plate_width / 2 * 1e3:.4g} mm from the centre line)")
    for other in placed:
        if overlap(s, other):
            other_label = other.name if kind == "module" else f"{kind} {other.name!r}"
            raise DesignError(field, f"{label} overlaps {other_label}; {kind}s must not share mounting face "
                                     "(touching edges are fine)")


def place_modules(size: tuple[float, float], positions, plate_length: float, plate_width: float,
                  interface: float, described_as: str) -> tuple[Source, ...]:
    """Placed thermoelectric modules as sources named "module 1", "module 2", ... (load NaN: the module solve
    sets each one's hot-side heat), refused like sources when one leaves the plate or two overlap."""
    out: list[Source] = []
    for i, at in enumerate(positions, 1):
        s = Source(f"module {i}", float("nan"), tuple(size), tuple(at), interface, described_as)
        _fits(s, out, f"[module] positions (module {i})", "module", s.name, plate_length, plate_width)
        out.append(s)
    return tuple(out)


def overlap(a: Source, b: Source) -> bool:
    """Whether two sources share an area of the mounting face (touching edges do not)."""
    ax0, ax1, ay0, ay1 = a.edges()
    bx0, bx1, by0, by1 = b.edges()
    return min(ax1, bx1) - max(ax0, bx0) > _TOUCH and min(ay1, by1) - max(ay0, by0) > _TOUCH
