"""Read a design file (TOML with unit strings) into frozen dataclasses of SI floats.

Everything a user can get wrong is caught here, with a :class:`DesignError` that
names the field as ``[table] key`` and says what is wrong.  Nothing downstream
parses units.  The field names are part of the project's interface (scripts and
tests rely on them); README.md documents them.
"""
from __future__ import annotations

import difflib
import math
import tomllib
from dataclasses import dataclass, replace
from pathlib import Path

from hydraulics.coolant import FLUIDS, P_ATM, Coolant, StateError as _CoolantStateError

from hydraulics.circuit import Circuit
from hydraulics.validity import at_most

from coldplate.plate import materials
from coldplate.supply.reader import read_circuit, read_supply_extras
from coldplate.design.errors import DesignError, StateError
from coldplate.design.fields import Table, check_range, nearest
from coldplate.design.ranges import INTERFACE_RESISTANCE, RANGES
from coldplate.modules.reader import Module, read_module
from coldplate.air.reader import Air, read_air
from coldplate.plate.sources import Source, centred_source, place_modules, read_sources
from coldplate.design.units import parse_value, quoted

# ---------------------------------------------------------------- dataclasses


@dataclass(frozen=True)
class Heat:
    load: float  #: [W]
    footprint_length: float  #: along the flow [m]
    footprint_width: float  #: across the flow [m]


@dataclass(frozen=True)
class Interface:
    resistance_area: float  #: R'' [m^2 K/W]
    described_as: str  #: how the user gave it


@dataclass(frozen=True)
class Plate:
    material: str | None  #: key in coldplate.materials, or None when conductivity was given
    conductivity: float  #: [W/(m K)]
    length: float  #: along the flow [m]
    width: float  #: [m]
    base: float  #: metal between the heated face and the passage roof [m]
    pressure_rating: float | None  #: gauge [Pa]; None = usual rating for the passage kind


@dataclass(frozen=True)
class Channels:
    count: int
    width: float  #: [m]
    depth: float  #: [m]
    plenum_length: float  #: each end [m]
    port_diameter: float | None  #: [m]
    roughness: float  #: absolute [m]
    kind: str = "channels"
    #: the ports' offsets across from the plate's centre line [m], positive on the left of the flow (the
    #: drawing in coldplate/plate/sources.py); 0 = centred
    inlet_port: float = 0.0
    outlet_port: float = 0.0
    plenum_depth: float | None = None  #: [m]; None = the channel depth

    @property
    def header_depth(self) -> float:
        """The plenums' depth normal to the plate [m] (the channel depth unless ``plenum_depth`` is given)."""
        return self.depth if self.plenum_depth is None else self.plenum_depth


@dataclass(frozen=True)
class Tube:
    inner_diameter: float  #: [m]
    outer_diameter: float  #: [m]
    passes: int
    bend_radius: float | None  #: centre-line [m]; None for a single pass (no return bend)
    material: str
    bond: str
    roughness: float  #: [m]
    kind: str = "tube"


@dataclass(frozen=True)
class Cavity:
    height: float  #: [m]
    port_diameter: float  #: [m]
    roughness: float  #: [m]
    kind: str = "cavity"


@dataclass(frozen=True)
class Supply:
    source: str  #: "potable", "recirculating" or "process"
    hours_per_day: float
    days_per_year: float
    static_pressure: float | None  #: gauge [Pa] (no-flow pressure at the supply)
    discharge_limit: float  #: [K]
    discharge: str  #: "drain" (once-through) or "return" (back to a loop)
    # supply side (coldplate/circuit_design.py reads these; README "[circuit]")
    drive: str = "flow"  #: "flow" (given), "pressure" (static supply pressure) or "pump"
    pump_flow: tuple[float, ...] = ()  #: pump table flows [m^3/s]
    pump_rise: tuple[float, ...] = ()  #: pump table head [m] or pressure rise [Pa]
    pump_rise_is_head: bool = True  #: pump_rise in metres of coolant (True) or in Pa
    face_limit: float | None = None  #: hottest mounting face allowed [K]
    tariff: float | None = None  #: water price per m^3 [currency/m^3]
    currency: str | None = None  #: three-letter code the user gave
    chiller_power: float | None = None  #: electrical power of a recirculating chiller [W]
    electricity_tariff: float | None = None  #: [currency/J]
    chiller_price: float | None = None  #: [currency]
    drain_air_gap: float | None = None  #: measured air gap above the drain's flood rim [m] (a [circuit] says air_gap)

    @property
    def seconds_per_day(self) -> float:
        """Running time a day [s]: water use per day is the flow times this."""
        return 3600.0 * self.hours_per_day

    @property
    def seconds_per_year(self) -> float:
        """Running time a year [s]."""
        return self.seconds_per_day * self.days_per_year

    @property
    def once_through(self) -> bool:
        return self.discharge == "drain"

    @property
    def line_pressure(self) -> float:
        """Absolute pressure in the plate while flowing [Pa], the cautious (low) value.

        Once-through to an open drain, the plate sits near one atmosphere while the water flows: the
        supply valve takes up the static pressure.  On a loop the static (fill) pressure stays.
        """
        if self.once_through:
            return P_ATM
        return P_ATM + (self.static_pressure or 0.0)


@dataclass(frozen=True)
class Room:
    temperature: float  #: [K]
    relative_humidity: float  #: [-] 0..1


@dataclass(frozen=True)
class Model:
    laminar: str = "muzychka-yovanovich"
    turbulent: str = "gnielinski"
    segments: int = 40


@dataclass(frozen=True)
class Design:
    title: str
    heat: Heat
    interface: Interface
    plate: Plate
    passage: Channels | Tube | Cavity
    coolant: Coolant
    inlet_temperature: float  #: [K]
    flow: float | None  #: [m^3/s]; None when the supply sets it (drive "pressure" or "pump")
    supply: Supply
    room: Room
    model: Model
    module: Module | None = None  #: thermoelectric modules on the plate, from [module]
    circuit: Circuit | None = None  #: the lines around the plate ([circuit])
    #: the heat sources on the mounting face ([[source]] tables; [heat] is one centred source named "heat")
    sources: tuple[Source, ...] = ()
    air: Air | None = None  #: the air-cooled alternative to compare, from [air] (coldplate.air)

    @property
    def drain_air_gap(self) -> float | None:
        """The air gap at the drain the user gave ([supply] drain_air_gap or [circuit] air_gap) [m]."""
        if self.circuit is not None and self.circuit.air_gap is not None:
            return self.circuit.air_gap
        return self.supply.drain_air_gap


PASSAGE_KINDS = ("channels", "tube", "cavity")
SOURCES = ("potable", "recirculating", "process")
DISCHARGES = ("drain", "return")
#: Where the water goes when the design file does not say: drinking water runs to a drain, loops return.
DEFAULT_DISCHARGE = {"potable": "drain", "recirculating": "return", "process": "return"}
LAMINAR_CHOICES = ("muzychka-yovanovich", "hausen", "sieder-tate", "fully-developed")
TURBULENT_CHOICES = ("gnielinski", "dittus-boelter")
#: How a glycol's fraction is counted.
BASES = ("mass", "volume")

#: Default drain temperature limit: 60 degC (140 degF), a common plumbing-code limit.
DEFAULT_DISCHARGE_LIMIT = 333.15
#: Default plenum length at each end of a channel field, when not given [m].
DEFAULT_PLENUM_LENGTH = 0.005

#: Every key each table may hold (so a misspelt key is named as unknown, with the nearest known one).
KEYS = {
    "plate": ("material", "conductivity", "length", "width", "base", "pressure_rating"),
    "heat": ("load", "footprint"),
    "interface": ("resistance", "conductivity", "thickness"),
    "supply": ("source", "hours_per_day", "days_per_year", "static_pressure", "discharge_limit", "discharge",
               "drive", "pump_flow", "pump_head", "face_limit", "tariff", "chiller_power", "electricity_tariff",
               "chiller_price", "drain_air_gap"),
    "coolant": ("fluid", "fraction", "basis", "inlet_temperature", "flow"),
    "room": ("temperature", "relative_humidity"),
    "correlations": ("laminar", "turbulent", "segments"),
}
PASSAGE_KEYS = {
    "channels": ("kind", "count", "width", "depth", "plenum_length", "port_diameter", "roughness", "inlet_port",
                 "outlet_port", "plenum_depth"),
    "tube": ("kind", "inner_diameter", "outer_diameter", "passes", "bend_radius", "material", "bond", "roughness"),
    "cavity": ("kind", "height", "port_diameter", "roughness"),
}
#: Before the kind is read: any passage kind's keys.
ANY_PASSAGE_KEY = tuple(sorted({k for keys in PASSAGE_KEYS.values() for k in keys}))

# ---------------------------------------------------------------- reading


def load_design(path: str | Path) -> Design:
    """Read and check a design file; raise :class:`DesignError` on any problem."""
    return design_from_dict(load_data(path))


def load_data(path: str | Path) -> dict:
    """A design file's TOML data as read, not yet checked (feature tables read their own parts from it)."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8-sig")  # a byte-order mark at the start is accepted
    except FileNotFoundError:
        raise DesignError("", f"design file {str(path)!r} does not exist") from None
    except (OSError, UnicodeDecodeError) as exc:
        raise DesignError("", f"cannot read design file {str(path)!r}: {exc}") from None
    return _toml(text)


def parse_design(text: str) -> Design:
    """Parse design-file text (TOML)."""
    return design_from_dict(_toml(text))


def _toml(text: str) -> dict:
    if text.startswith("\ufeff"):  # a UTF-8 byte-order mark, as some editors write one
        text = text[1:]
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise DesignError("", f"not a valid TOML file: {exc}") from None


_TOP = ("title", "heat", "interface", "plate", "passage", "coolant", "supply", "room", "correlations")
_OPTIONAL = ("module", "circuit", "source", "air")
#: Tables read by features outside the design check (``[search]``: coldplate.sizing; ``[uncertainty]``:
#: coldplate.uncertainty); the check ignores them.
_FEATURE_TABLES = ("search", "uncertainty")


def design_from_dict(data: dict) -> Design:
    known = _TOP + _OPTIONAL + _FEATURE_TABLES
    unknown = sorted(set(data) - set(known))
    if unknown:
        key = unknown[0]
        if key == "":
            raise DesignError('top-level key ""', "an empty key (\"\" = ...) is not a key or table; remove it or name it")
        order = nearest(key, known)
        mean = f"; did you mean `{order[0]}`?" if difflib.get_close_matches(key, order, 1, 0.6) else ""
        raise DesignError(key, f"unknown top-level key or table `{key}`{mean} (known: {', '.join(order)})")
    title = data.get("title")
    if not isinstance(title, str) or not title.strip():
        raise DesignError("title", "is missing or empty")
    if "source" in data and "heat" in data:
        raise DesignError("[[source]]", "give the heat either as [heat] (one centred source) or as [[source]] "
                                        "tables, not both")
    placed = isinstance(data.get("module"), dict) and bool({"positions", "size"} & set(data["module"]))
    if placed and ("heat" in data or "source" in data):
        which = "[heat]" if "heat" in data else "[[source]]"
        raise DesignError("[module] positions", f"placed modules are the plate's heat sources: remove {which} "
                                                "(or remove size and positions and give [heat] footprint)")
    for name in _TOP[1:-1]:
        if name not in data and not (name == "heat" and ("source" in data or placed)):
            raise DesignError(f"[{name}]", "table is missing" + (" (or give [[source]] tables)" if name == "heat" else ""))

    plate = _plate(Table(data["plate"], "plate", KEYS["plate"]))
    module = read_module(data["module"]) if "module" in data else None
    interface = _interface(Table(data["interface"], "interface", KEYS["interface"]))
    if "source" in data:
        if module is not None:
            raise DesignError("[[source]]", "with a [module] table the modules are the heat source: give their "
                                            "footprint as [heat] footprint")
        sources = read_sources(data["source"], plate.length, plate.width, interface.resistance_area,
                               interface.described_as)
        heat = _sources_stand_in(sources)
    elif module is not None and module.placed:
        sources = place_modules(module.size, module.positions, plate.length, plate.width,
                                interface.resistance_area, interface.described_as)
        heat = _sources_stand_in(sources)
    else:
        heat = _heat(Table(data["heat"], "heat", KEYS["heat"]), plate, module is not None)
        sources = (centred_source(heat.load, heat.footprint_length, heat.footprint_width, plate.length,
                                  interface.resistance_area, interface.described_as),)
    search = data.get("search")
    passage = _passage(Table(data["passage"], "passage", ANY_PASSAGE_KEY), plate,
                       searches_passes=isinstance(search, dict) and "passes" in search)
    supply = _supply(Table(data["supply"], "supply", KEYS["supply"]))
    coolant, T_in, flow = _coolant(Table(data["coolant"], "coolant", KEYS["coolant"]), supply)
    room = _room(Table(data["room"], "room", KEYS["room"]))
    model = _model(Table(data.get("correlations", {}), "correlations", KEYS["correlations"]))
    circuit = read_circuit(data["circuit"]) if "circuit" in data else None
    if circuit is not None and circuit.air_gap is not None and supply.drain_air_gap is not None:
        raise DesignError("[supply] drain_air_gap", "the [circuit] gives air_gap already; give the air gap once")
    if supply.drive != "flow" and circuit is None:
        raise DesignError("[supply] drive", f"drive = {supply.drive!r} needs a [circuit] table (the lines the "
                                            "supply pushes water through)")
    design = Design(title.strip(), heat, interface, plate, passage, coolant, T_in, flow, supply, room, model,
                    module=module, circuit=circuit, sources=sources)
    if "air" in data:
        design = replace(design, air=read_air(data, design))
    return design


def _sources_stand_in(sources: tuple[Source, ...]) -> Heat:
    """The one footprint the resistance network sees for several sources: the total load over the sources'
    bounding box (the field solve places each source where it is)."""
    x0 = min(s.edges()[0] for s in sources)
    x1 = max(s.edges()[1] for s in sources)
    y0 = min(s.edges()[2] for s in sources)
    y1 = max(s.edges()[3] for s in sources)
    return Heat(sum(s.load for s in sources), x1 - x0, y1 - y0)


def _plate(t: Table) -> Plate:
    which = t.exactly_one("material", "conductivity")
    if which == "material":
        key = t.word("material")
        try:
            mat = materials.material(key)
        except (KeyError, TypeError) as exc:
            raise DesignError(t.field("material"), str(exc).strip("'\"")) from None
        k, key = mat.conductivity, mat.key
    else:
        k, key = t.value("conductivity", "conductivity"), None
    length = t.value("length", "length")
    width = t.value("width", "length")
    base = t.value("base", "length")
    rating = t.value("pressure_rating", "pressure", required=False)
    t.finish()
    return Plate(key, k, length, width, base, rating)


def _heat(t: Table, plate: Plate, module: bool = False) -> Heat:
    if module and t.has("load"):
        raise DesignError(t.field("load"), "remove it: with a [module] table the plate's load is the modules' "
                                           "hot-side heat, and the cold-side load is [module] cold_load")
    # With modules the plate's load is solved, not given: NaN here, the solve passes the real load.
    load = math.nan if module else t.value("load", "power")
    fp = t.raw("footprint")
    if not isinstance(fp, list) or len(fp) != 2:
        raise DesignError(t.field("footprint"), "must be an array of two lengths, along the flow and across, e.g. [\"40 mm\", \"40 mm\"]")
    fl = parse_value(fp[0], "length", t.field("footprint") + " (along the flow)")
    fw = parse_value(fp[1], "length", t.field("footprint") + " (across)")
    for v, what, limit, pname in ((fl, "along the flow", plate.length, "length"), (fw, "across", plate.width, "width")):
        check_range(t.field("footprint") + f" ({what})", fp[0] if what == "along the flow" else fp[1], v, "length",
                    RANGES["[heat] footprint"])
        if v <= 0:
            raise DesignError(t.field("footprint"), f"the length {what} must be above zero")
        if not at_most(v, limit):
            raise DesignError(t.field("footprint"), f"{v * 1e3:.4g} mm {what} is larger than the plate {pname} {limit * 1e3:.4g} mm")
    t.finish()
    return Heat(load, fl, fw)


def _interface(t: Table) -> Interface:
    if t.has("resistance"):
        if t.has("conductivity") or t.has("thickness"):
            raise DesignError("[interface]", "give either resistance, or conductivity and thickness (both given)")
        r = t.value("resistance", "area_resistance")
        t.finish()
        return Interface(r, f"R'' = {r:.3g} m²K/W")
    if not (t.has("conductivity") and t.has("thickness")):
        raise DesignError("[interface]", "give either resistance, or conductivity and thickness (neither complete)")
    k = t.value("conductivity", "conductivity")
    th = t.value("thickness", "length")
    # one range for the interface however it is written: as the resistance per area it makes
    check_range(t.field("thickness") + " / conductivity", f"{t.data['thickness']} at {t.data['conductivity']}",
                th / k, "area_resistance", INTERFACE_RESISTANCE)
    t.finish()
    return Interface(th / k, f"{th * 1e3:.3g} mm at {k:.3g} W/(m K)")


def _port_offset(t: Table, key: str, plate: Plate, diameter: float | None) -> float:
    """A port's offset across from the centre line [m]: the whole port on the plate (its centre when no
    diameter is given)."""
    half = 0.5 * plate.width - 0.5 * (diameter or 0.0)
    if half < 0:
        raise DesignError(t.field("port_diameter"), "is wider than the plate")
    return t.value(key, "length", required=False, default=0.0, low=-half, high=half, low_inclusive=True,
                   why="the plate's edge (half its width less half the port's diameter, either side)")


def _passage(t: Table, plate: Plate, searches_passes: bool = False):
    kind = t.choice("kind", PASSAGE_KINDS)
    t.keys = PASSAGE_KEYS[kind]
    if kind == "channels":
        count = t.integer("count", 1, 2000)
        w = t.value("width", "length", high=plate.width, why="the plate's width")
        d = t.value("depth", "length")
        plen = t.value("plenum_length", "length", required=False, default=DEFAULT_PLENUM_LENGTH)
        port = t.value("port_diameter", "length", required=False)
        rough = t.value("roughness", "length", required=False, default=materials.roughness("machined-metal"))
        wall = (plate.width - count * w) / (count + 1)
        if wall <= 0:
            raise DesignError(t.field("count"), f"{count} channels of {w * 1e3:.4g} mm do not fit the plate width "
                                                f"{plate.width * 1e3:.4g} mm with a wall between them")
        if plate.length - 2 * plen <= 0:
            raise DesignError(t.field("plenum_length"), "two plenums leave no length for the channels")
        plen_depth = t.value("plenum_depth", "length", required=False)
        ports = [_port_offset(t, key, plate, port) for key in ("inlet_port", "outlet_port")]
        if plen == 0 and (plen_depth is not None or any(ports)):
            key = "plenum_depth" if plen_depth is not None else ("inlet_port" if ports[0] else "outlet_port")
            raise DesignError(t.field(key), "needs a plenum: give plenum_length above zero")
        t.finish()
        return Channels(count, w, d, plen, port, rough, inlet_port=ports[0], outlet_port=ports[1],
                        plenum_depth=plen_depth)
    if kind == "tube":
        di = t.value("inner_diameter", "length")
        do = t.value("outer_diameter", "length")
        if do <= di:
            raise DesignError(t.field("outer_diameter"), "must be larger than inner_diameter")
        passes = t.integer("passes", 1, 200)
        # one pass has no return bend: bend_radius is asked for only with more (or with passes to search)
        rb = t.value("bend_radius", "length", required=passes > 1 or searches_passes)
        mkey = t.word("material")
        try:
            mat = materials.material(mkey)
        except (KeyError, TypeError) as exc:
            raise DesignError(t.field("material"), str(exc).strip("'\"")) from None
        bond = t.choice("bond", tuple(materials.BONDS))
        rough = t.value("roughness", "length", required=False, default=materials.roughness("drawn-tubing"))
        if rb is not None and passes > 1 and 2 * rb < do:
            raise DesignError(t.field("bend_radius"), "a return bend of this radius puts adjacent passes closer than the tube diameter")
        span = (passes - 1) * 2 * (rb or 0.0) + do
        if span > plate.width:
            raise DesignError(t.field("passes"), f"{passes} passes at {2 * rb * 1e3:.4g} mm pitch need {span * 1e3:.4g} mm, "
                                                 f"wider than the plate ({plate.width * 1e3:.4g} mm)")
        t.finish()
        return Tube(di, do, passes, rb, mat.key, bond, rough)
    h = t.value("height", "length")
    port = t.value("port_diameter", "length")
    rough = t.value("roughness", "length", required=False, default=materials.roughness("machined-metal"))
    if port > plate.width:
        raise DesignError(t.field("port_diameter"), "is wider than the plate")
    if h > plate.width:
        raise DesignError(t.field("height"), "a cavity taller than it is wide is a channel; use kind = \"channels\"")
    t.finish()
    return Cavity(h, port, rough)


def _supply(t: Table) -> Supply:
    source = t.choice("source", SOURCES)
    hraw = t.raw("hours_per_day")
    if isinstance(hraw, (int, float)) and not isinstance(hraw, bool):
        if not -1e6 < hraw < 1e6:  # NaN, infinity, a whole number past 64 bits: never a float to compare
            raise DesignError(t.field("hours_per_day"), f"{quoted(hraw)} must be a number of hours from 1/60 to 24")
        hours = float(hraw)
    else:
        hours = parse_value(hraw, "time", t.field("hours_per_day")) / 3600.0
    check_range(t.field("hours_per_day"), hraw, hours, "hours", RANGES["[supply] hours_per_day"])
    days = t.raw("days_per_year", required=False)
    if days is None:
        days = 365.0
    elif isinstance(days, bool) or not isinstance(days, (int, float)) or not -1e6 < days < 1e6:
        raise DesignError(t.field("days_per_year"), f"{quoted(days)} must be a number of days from 1 to 366")
    check_range(t.field("days_per_year"), days, float(days), "days", RANGES["[supply] days_per_year"])
    p = t.value("static_pressure", "pressure", required=False)
    limit = t.value("discharge_limit", "temperature", required=False, default=DEFAULT_DISCHARGE_LIMIT)
    discharge = t.choice("discharge", DISCHARGES, default=DEFAULT_DISCHARGE[source])
    extras = read_supply_extras(t, source, discharge, p)
    gap = t.value("drain_air_gap", "length", required=False)
    if gap is not None and discharge != "drain":
        raise DesignError(t.field("drain_air_gap"), "is for water discharged to a drain (discharge = \"drain\")")
    if source == "potable" and discharge == "return":
        raise DesignError(t.field("discharge"), "drinking water that has been through equipment must never return "
                                                "to the drinking-water system; potable water runs to a drain")
    if source == "recirculating" and discharge == "drain":
        raise DesignError(t.field("discharge"), "a recirculating supply returns its water; use source = \"process\" "
                                                "or \"potable\" for water that runs to a drain")
    t.finish()
    return Supply(source, hours, float(days), p, limit, discharge, **extras, drain_air_gap=gap)


def _coolant(t: Table, supply: Supply):
    fluid = t.choice("fluid", FLUIDS)
    if fluid == "water":
        fraction, basis = 0.0, "mass"
    else:
        fraction = t.value("fraction", "fraction")
        basis = t.choice("basis", BASES)
    try:
        coolant = Coolant(fluid, fraction, basis)
    except ValueError as exc:
        raise DesignError(t.field("fraction"), str(exc)) from None
    T_in = t.value("inlet_temperature", "temperature")
    try:
        coolant.check_liquid(T_in, supply.line_pressure)
    except _CoolantStateError as exc:
        raise StateError(t.field("inlet_temperature"), str(exc)) from None
    if supply.drive != "flow" and t.has("flow"):
        raise DesignError(t.field("flow"), f"the supply sets the flow (drive = {supply.drive!r}); remove this key "
                                           "or use drive = \"flow\"")
    flow = t.value("flow", "flow", required=supply.drive == "flow")
    t.finish()
    return coolant, T_in, flow


def _room(t: Table) -> Room:
    T = t.value("temperature", "temperature")
    rh = t.value("relative_humidity", "fraction")
    t.finish()
    return Room(T, rh)


def _model(t: Table) -> Model:
    lam = t.choice("laminar", LAMINAR_CHOICES, default=Model.laminar)
    turb = t.choice("turbulent", TURBULENT_CHOICES, default=Model.turbulent)
    seg = t.raw("segments", required=False)
    if seg is None:
        seg = Model.segments
    elif isinstance(seg, bool) or not isinstance(seg, int) or not (4 <= seg <= 2000):
        raise DesignError(t.field("segments"), f"{quoted(seg)} must be a whole number from 4 to 2000")
    t.finish()
    return Model(lam, turb, seg)
