"""Reading the ``[circuit]`` table and the supply-side keys of ``[supply]`` (drive, pump, limits, tariffs).

``[circuit]`` lists the parts around the plate in flow order as an array of tables ``[[circuit.part]]``;
each part has a ``kind``: ``hose`` (or ``tube``), ``fitting``, ``valve``, ``backflow``, ``rise`` or ``plate``
(exactly one).  The parts become :mod:`hydraulics.circuit` objects in SI.  Typical backflow-device losses are
kept here as a table with their source (common practice; the maker's curve decides).
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass

from hydraulics.circuit import (FITTINGS, Backflow, Circuit, Fitting, Line, PlateSlot, Rise, Valve,
                                Kv_from_Cv)
from hydraulics.pump import PumpError, check_table

from coldplate.plate import materials
from coldplate.design.errors import DesignError
from coldplate.design.fields import Table, check_range
from coldplate.design.ranges import MONEY
from coldplate.design.units import parse_value, quoted


@dataclass(frozen=True)
class BackflowKind:
    """A kind of backflow preventer: what it protects against and its usual losses (1/2-inch size)."""

    key: str
    name: str
    standard: str
    high_hazard: bool  #: may serve a high hazard (contamination: glycol, inhibitors)
    back_pressure: bool  #: protects against back-pressure, not only back-siphonage
    continuous: bool  #: may stay under pressure for long periods (more than 12 h in 24)
    dp_open: float  #: [Pa] held by its checks while any water flows
    dp_rated: float  #: [Pa] at flow_rated
    flow_rated: float  #: [m^3/s]
    source: str


_BF = ("common practice: typical of 1/2-inch devices in makers' flow charts; from memory. Give the device's "
       "own curve with loss, opening_loss and rated_flow")

#: What each device covers follows the US model plumbing codes' backflow-device tables (from memory): both
#: vacuum breakers serve a high or a low hazard against back-siphonage only, the atmospheric one never under
#: continuous pressure; the double check serves a low hazard only; the reduced-pressure assembly any hazard.
BACKFLOW_DEVICES: dict[str, BackflowKind] = {b.key: b for b in (
    BackflowKind("atmospheric-vacuum-breaker", "atmospheric vacuum breaker", "ASSE 1001", True, False, False,
                 0.0, 0.15e5, 15 / 6e4, _BF),
    BackflowKind("pressure-vacuum-breaker", "pressure vacuum breaker", "ASSE 1020", True, False, True,
                 0.07e5, 0.5e5, 30 / 6e4, _BF),
    BackflowKind("double-check", "double check valve assembly", "ASSE 1015", False, True, True,
                 0.14e5, 0.5e5, 30 / 6e4, _BF),
    BackflowKind("reduced-pressure", "reduced-pressure principle assembly", "ASSE 1013", True, True, True,
                 0.7e5, 1.0e5, 30 / 6e4, _BF),
)}

PART_KINDS = ("hose", "tube", "fitting", "valve", "backflow", "rise", "plate")
DRIVES = ("flow", "pressure", "pump")
#: Every key a part of each kind may hold (a misspelt key is named as unknown, with the nearest known one).
_LINE_KEYS = ("kind", "name", "inner_diameter", "length", "material", "roughness")
PART_KEYS = {"hose": _LINE_KEYS, "tube": _LINE_KEYS,
             "fitting": ("kind", "name", "fitting", "diameter", "count", "bore"),
             "valve": ("kind", "name", "kv", "cv", "solenoid", "diameter"),
             "backflow": ("kind", "name", "device", "loss", "rated_flow", "opening_loss"),
             "rise": ("kind", "name", "height"), "plate": ("kind", "name")}
ANY_PART_KEY = tuple(sorted({k for keys in PART_KEYS.values() for k in keys}))  #: before the kind is read
#: Every key [circuit] itself may hold.
CIRCUIT_KEYS = ("part", "back_pressure", "outlet_diameter", "air_gap")


# ---------------------------------------------------------------- [circuit]

def read_circuit(data) -> Circuit:
    t = Table(data, "circuit", CIRCUIT_KEYS)
    raw = t.raw("part")
    if not isinstance(raw, list) or not raw or not all(isinstance(p, dict) for p in raw):
        raise DesignError(t.field("part"), "list the parts in flow order as [[circuit.part]] tables")
    parts = tuple(_part(Table(p, f"circuit.part {i}", ANY_PART_KEY), i) for i, p in enumerate(raw, 1))
    plates = [i for i, p in enumerate(parts, 1) if isinstance(p, PlateSlot)]
    if len(plates) != 1:
        raise DesignError(t.field("part"), f"exactly one part must be kind = \"plate\" (where the plate sits); "
                                           f"found {len(plates)}")
    back = t.value("back_pressure", "pressure", required=False, default=0.0)
    sizes = [p.diameter for p in parts if isinstance(p, (Line, Fitting))]
    outlet = t.value("outlet_diameter", "length", required=False, default=sizes[-1] if sizes else None)
    gap = t.value("air_gap", "length", required=False)
    t.finish()
    if back > 0 and gap is not None:
        raise DesignError(t.field("air_gap"), "an outlet held at a back pressure has no air gap; give one or the other")
    return Circuit(parts, back, outlet, gap)


def _part(t: Table, i: int):
    kind = t.choice("kind", PART_KINDS)
    t.keys = PART_KEYS[kind]
    name = t.raw("name", required=False)
    if name is not None and (not isinstance(name, str) or not name.strip()):
        raise DesignError(t.field("name"), "must be a non-empty string")
    name = (name or f"{kind} {i}").strip()
    if kind in ("hose", "tube"):
        D = t.value("inner_diameter", "length")
        L = t.value("length", "length")
        which = t.exactly_one("material", "roughness")
        if which == "material":
            try:
                e = materials.roughness(t.word("material"))
            except (KeyError, TypeError) as exc:
                raise DesignError(t.field("material"), str(exc).strip("'\"")) from None
        else:
            e = t.value("roughness", "length")
        t.finish()
        return Line(name, D, L, e)
    if kind == "fitting":
        fitting = t.choice("fitting", tuple(FITTINGS))
        D = t.value("diameter", "length")
        count = t.integer("count", 1, 100) if t.has("count") else 1
        bore = None
        if FITTINGS[fitting].needs_other:
            bore = t.value("bore", "length")
            if fitting == "expansion" and bore <= D:
                raise DesignError(t.field("bore"), "an expansion's bore must be larger than its diameter")
            if fitting != "expansion" and bore >= D:
                raise DesignError(t.field("bore"), f"a {fitting}'s bore must be smaller than its diameter")
        t.finish()
        return Fitting(name, fitting, D, count, bore)
    if kind == "valve":
        which = t.exactly_one("kv", "cv")
        coeff = t.raw(which)
        if isinstance(coeff, bool) or not isinstance(coeff, (int, float)) or not (0 < coeff < 1e4) \
                or not math.isfinite(coeff):
            unit = "m³/h at 1 bar" if which == "kv" else "US gal/min at 1 psi"
            raise DesignError(t.field(which), f"{quoted(coeff)} must be a positive number ({unit})")
        Kv = float(coeff) if which == "kv" else Kv_from_Cv(float(coeff))
        solenoid = t.raw("solenoid", required=False) or False
        if not isinstance(solenoid, bool):
            raise DesignError(t.field("solenoid"), "must be true or false")
        D = t.value("diameter", "length", required=False)
        t.finish()
        return Valve(name, Kv, solenoid, D)
    if kind == "backflow":
        device = t.choice("device", tuple(BACKFLOW_DEVICES))
        b = BACKFLOW_DEVICES[device]
        dp = t.value("loss", "pressure", required=False, default=b.dp_rated)
        q = t.value("rated_flow", "flow", required=False, default=b.flow_rated)
        dp0 = t.value("opening_loss", "pressure", required=False, default=min(b.dp_open, dp))
        if dp0 > dp:
            raise DesignError(t.field("opening_loss"), "cannot exceed the loss at the rated flow")
        t.finish()
        return Backflow(name, device, dp, q, dp0)
    if kind == "rise":
        h = t.value("height", "length")
        t.finish()
        return Rise(name, h)
    t.finish()
    return PlateSlot(name if t.has("name") else "plate")


# ---------------------------------------------------------------- [supply] additions

_MONEY = re.compile(r"^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([A-Z]{3})\s*(?:/\s*(.+?))?\s*$")


def _money(t: Table, key: str, per: str | None, example: str):
    """Read "<number> <CUR>/<unit of per>" (or "<number> <CUR>" when per is None) -> (value per SI unit, CUR)."""
    raw = t.raw(key, required=False)
    if raw is None:
        return None, None
    m = _MONEY.match(raw) if isinstance(raw, str) else None
    if not m or (per is None) != (m.group(3) is None):
        raise DesignError(t.field(key), f"write a number, a three-letter currency code{' and a unit' if per else ''}, "
                                        f"e.g. {example!r}")
    amount = float(m.group(1))
    if not math.isfinite(amount) or amount < 0:
        raise DesignError(t.field(key), f"{quoted(raw)} must be a finite amount, zero or more")
    if per is None:
        check_range(t.field(key), raw, amount, "money", MONEY[key])
        return amount, m.group(2)
    size = parse_value(f"1 {m.group(3)}", per, t.field(key))
    value = amount / size
    check_range(t.field(key), raw, value, "money_volume" if per == "volume" else "money_energy", MONEY[key])
    return value, m.group(2)


def read_supply_extras(t: Table, source: str, discharge: str, static_pressure) -> dict:
    """The drive mode, pump table, limits and tariffs of ``[supply]`` as keyword arguments for Supply."""
    drive = t.choice("drive", DRIVES, default="flow")
    out = {"drive": drive}
    has_pump = t.has("pump_flow") or t.has("pump_head")
    if drive == "pump":
        out.update(_pump(t))
    elif has_pump:
        raise DesignError(t.field("pump_flow" if t.has("pump_flow") else "pump_head"),
                          f"a pump curve is only read with drive = \"pump\" (drive is {drive!r})")
    if drive == "pressure" and static_pressure is None:
        raise DesignError(t.field("static_pressure"), "drive = \"pressure\" needs the supply's static pressure")
    out["face_limit"] = t.value("face_limit", "temperature", required=False)
    tariff, cur = _money(t, "tariff", "volume", "3.80 EUR/m**3")
    power = t.value("chiller_power", "power", required=False)
    etariff, ecur = _money(t, "electricity_tariff", "energy", "0.30 EUR/kWh")
    price, pcur = _money(t, "chiller_price", None, "2500 EUR")
    planning = [k for k in ("tariff", "face_limit", "chiller_power", "electricity_tariff", "chiller_price")
                if t.has(k)]
    if planning and discharge != "drain":
        raise DesignError(t.field(planning[0]), "water planning is for once-through supplies (discharge = \"drain\")")
    if (power is None) != (etariff is None):
        raise DesignError(t.field("chiller_power" if power is None else "electricity_tariff"),
                          "the chiller comparison needs both chiller_power and electricity_tariff")
    if price is not None and power is None:
        raise DesignError(t.field("chiller_price"), "needs chiller_power and electricity_tariff too")
    if power is not None and tariff is None:
        raise DesignError(t.field("tariff"), "the chiller comparison needs the water tariff")
    currencies = {c for c in (cur, ecur, pcur) if c}
    if len(currencies) > 1:
        raise DesignError(t.field("electricity_tariff" if ecur and ecur != cur else "chiller_price"),
                          f"all money in one currency, please (found {', '.join(sorted(currencies))})")
    out.update(tariff=tariff, currency=cur, chiller_power=power, electricity_tariff=etariff, chiller_price=price)
    return out


def _pump(t: Table) -> dict:
    flows, heads = t.raw("pump_flow"), t.raw("pump_head")
    for key, v in (("pump_flow", flows), ("pump_head", heads)):
        if not isinstance(v, list) or not v:
            raise DesignError(t.field(key), "must be a list of values, e.g. [\"0 L/min\", \"4 L/min\", \"8 L/min\"]")
    if len(flows) != len(heads):
        raise DesignError(t.field("pump_head"), f"has {len(heads)} points, pump_flow has {len(flows)}")
    V = [parse_value(v, "flow", t.field("pump_flow")) for v in flows]
    as_pressure = any(isinstance(h, str) and _is_pressure(h) for h in heads)
    kind = "pressure" if as_pressure else "length"
    H = [parse_value(h, kind, t.field("pump_head")) for h in heads]
    try:
        table = check_table(V, H)
    except PumpError as exc:
        raise DesignError(t.field("pump_head"), str(exc)) from None
    return {"pump_flow": table.V_dot, "pump_rise": table.dp, "pump_rise_is_head": not as_pressure}


def _is_pressure(text: str) -> bool:
    try:
        parse_value(text, "pressure", "")
        return True
    except DesignError:
        return False
