"""Plausible ranges of the design file's values, kept once, as data.

Each record is a :class:`hydraulics.validity.Bound` (the same record the correlations' validity ranges use),
keyed by the field as a user reads it, ``"[table] key"`` (circuit parts as ``"[circuit.part] key"``), in SI
units (kelvin).  ``Table.value`` looks the field up here, compares under the one rule
(:data:`hydraulics.validity.REL_TOL`) and names the range in the user's units when it refuses a value.
Readers add limits that depend on other fields (a channel no wider than its plate) on top.

The ranges are what an engineer would call plausible for a water-fed cold plate on a bench: wide enough for
every real design we know of, narrow enough that a slip of the unit (µm for mm, a missing exponent) is
refused instead of solved to a face of millions of degrees.  Unless a note says otherwise they are common
practice, chosen for this tool (not from a standard).  The interface's two ways of writing share one range:
conductivity and thickness are checked as the resistance per area they make (``INTERFACE_RESISTANCE``).
"""
from __future__ import annotations

from hydraulics.validity import Bound

#: Relative humidity below this is refused [-]: 0.1 %.  At the coldest room the reader accepts (-50 degC)
#: the frost point of air this dry is about -95 degC (psychrolib agrees), still inside the Hyland-Wexler
#: ice equation's range (down to -100 degC; ASHRAE Handbook Fundamentals 2017 ch. 1), so every accepted
#: room can be solved.
RH_FLOOR = 1e-3

_CP = "common practice"


def _b(field: str, low: float, high: float, note: str = _CP, low_open: bool = False) -> tuple[str, Bound]:
    return field, Bound(field, low, high, note, low_open)


#: The interface as resistance per area [m² K/W], however it is written: from a bare metal-to-metal
#: contact with a liquid metal or solder (0) up to a thick, poor gap pad (5e-2 m² K/W: 5 mm at 0.1 W/(m K)).
INTERFACE_RESISTANCE = Bound("[interface] resistance", 0.0, 5e-2, _CP)

RANGES: dict[str, Bound] = dict((
    # [heat]: from a milliwatt detector to a large power stage on one plate
    _b("[heat] load", 1e-3, 1e5),
    _b("[heat] footprint", 1e-4, 2.0),
    # [interface]
    ("[interface] resistance", INTERFACE_RESISTANCE),
    _b("[interface] conductivity", 1e-2, 2000.0, "common practice: foams and pads 0.05, diamond 2000 W/(m K)"),
    _b("[interface] thickness", 1e-6, 5e-3, "common practice: a 1 µm bond line to a 5 mm gap pad"),
    # [plate]
    _b("[plate] conductivity", 0.1, 5000.0, "common practice: plastics 0.2, diamond 2000 W/(m K)"),
    _b("[plate] length", 1e-3, 2.0),
    _b("[plate] width", 1e-3, 2.0),
    _b("[plate] base", 1e-4, 0.2),
    _b("[plate] pressure_rating", 1e3, 1e8),
    # [passage]: micro-channels start at about 50 µm (common practice); bores from 0.5 mm; ports from a 0.2 mm
    # orifice (a pinhole port is a mistake the check must explain, with its velocity, not refuse)
    _b("[passage] width", 5e-5, 0.5),
    _b("[passage] depth", 5e-5, 0.1),
    _b("[passage] height", 5e-5, 0.1),
    _b("[passage] plenum_length", 0.0, 1.0),
    _b("[passage] port_diameter", 2e-4, 0.1),
    # the ports' offsets across the plate (the plate's own edge is the reader's limit) and the plenums' depth
    _b("[passage] inlet_port", -1.0, 1.0),
    _b("[passage] outlet_port", -1.0, 1.0),
    _b("[passage] plenum_depth", 5e-5, 0.1, low_open=True),
    _b("[passage] roughness", 0.0, 1e-3),
    _b("[passage] inner_diameter", 5e-4, 0.1),
    _b("[passage] outer_diameter", 5e-4, 0.1),
    _b("[passage] bend_radius", 5e-4, 0.5),
    # [coolant]: the liquid check then narrows the temperature to the coolant's liquid range
    _b("[coolant] fraction", 0.0, 1.0, low_open=True),
    _b("[coolant] inlet_temperature", 173.15, 473.15),
    _b("[coolant] flow", 1e-9, 0.01, "common practice: 0.06 mL/min to 600 L/min"),
    # [supply]
    _b("[supply] static_pressure", 0.0, 5e6),
    _b("[supply] discharge_limit", 273.15, 373.15, "common practice: between freezing and boiling"),
    _b("[supply] face_limit", 273.15, 573.15),
    _b("[supply] chiller_power", 1.0, 1e6),
    # running time, in hours a day and days a year (not SI: as the design file writes them)
    _b("[supply] hours_per_day", 1 / 60, 24.0, "a minute a day to all day"),
    _b("[supply] days_per_year", 1.0, 366.0, "a day a year to every day of a leap year"),
    _b("[supply] drain_air_gap", 0.0, 2.0, "common practice: from none to an outlet 2 m above the flood rim"),
    # [room]: a room people or instruments work in
    _b("[room] temperature", 223.15, 333.15),
    _b("[room] relative_humidity", RH_FLOOR, 1.0,
       "below 0.1 % the frost point leaves the psychrometric equations' range"),
    # [circuit] and its parts
    _b("[circuit] back_pressure", 0.0, 5e6),
    _b("[circuit] outlet_diameter", 5e-4, 0.2),
    _b("[circuit] air_gap", 0.0, 2.0),
    _b("[circuit.part] inner_diameter", 5e-4, 0.2),
    _b("[circuit.part] length", 1e-3, 1000.0),
    _b("[circuit.part] roughness", 0.0, 0.01),
    _b("[circuit.part] diameter", 5e-4, 0.2),
    _b("[circuit.part] bore", 1e-4, 0.2),
    _b("[circuit.part] loss", 1.0, 1e6),
    _b("[circuit.part] rated_flow", 1e-9, 0.01),
    _b("[circuit.part] opening_loss", 0.0, 1e6),
    _b("[circuit.part] height", -100.0, 100.0),
    # [module]: one thermoelectric module's datasheet or model values
    _b("[module] max_current", 1e-3, 1000.0),
    _b("[module] seebeck", 1e-5, 10.0),
    _b("[module] resistance", 1e-4, 1e4),
    _b("[module] conductance", 1e-4, 1e3),
    _b("[module] max_voltage", 1e-3, 1000.0),
    _b("[module] rated_hot_side", 173.15, 473.15),
    _b("[module] max_temperature_difference", 0.0, 400.0, low_open=True),
    _b("[module] max_heat", 1e-3, 1e5),
    _b("[module] cold_load", 0.0, 1e5),
    _b("[module] current", 0.0, 1000.0),
    _b("[module] cold_face_temperature", 173.15, 473.15),
    _b("[module] cold_side_resistance", 0.0, 100.0),
    _b("[module] hot_side_limit", 273.15, 573.15),
    # [air]: the air-cooled alternative beside the water design (coldplate.air)
    _b("[air] length", 5e-3, 1.0),
    _b("[air] width", 5e-3, 1.0),
    _b("[air] height", 3e-3, 0.5),
    _b("[air] base", 5e-4, 0.05),
    _b("[air] temperature", 223.15, 333.15),
    _b("[air] altitude", -500.0, 11000.0, "ISO 2533 standard atmosphere: the troposphere, up to 11 km"),
    _b("[air] pressure", 2.0e4, 1.1e5, "the standard atmosphere from 11 km up to 110 kPa"),
    _b("[air] velocity", 0.05, 30.0),
    _b("[air] fan_flow", 0.0, 1.0),
    _b("[air] fan_pressure", 0.0, 5000.0),
    _b("[air] min_fin", 1e-5, 0.02),
    _b("[air] min_gap", 1e-5, 0.05),
    _b("[air] face_limit", 273.15, 573.15),
    # [search] limits (the free variables' ranges are in coldplate.sizing.search.VARIABLES)
    _b("[search] face_limit", 200.0, 600.0),
    _b("[search] pressure_drop_limit", 1.0, 1e8),
    _b("[search] discharge_limit", 273.15, 373.15),
    _b("[search] min_width", 1e-5, 0.1),
    _b("[search] min_wall", 1e-5, 0.1),
    _b("[search] max_thickness", 1e-4, 0.5),
    _b("[search] max_water", 1e-9, 1.0),
    _b("[search] face_limit_confidence", 0.5, 0.998, "a percentile above the median, below 99.8 %", low_open=True),
))

#: Money: plausible amounts per SI unit, wide enough for every currency (some count 10 000 to the euro),
#: narrow enough that every cost, break-even and payback stays a finite number: water per m³ (above zero:
#: water and its drain are never free, and a zero price has no break-even), electricity per J, a chiller's price.
MONEY = {
    "tariff": Bound("[supply] tariff", 1e-6, 1e7, "common practice: a millionth to 10 million of a currency per m³"),
    "electricity_tariff": Bound("[supply] electricity_tariff", 0.0, 1e6 / 3.6e6,
                                "common practice: up to 1 million of a currency per kWh"),
    "chiller_price": Bound("[supply] chiller_price", 0.0, 1e12, "common practice"),
}


def plausible(table: str, key: str) -> Bound | None:
    """The plausible range of ``[table] key`` (a circuit part's number is dropped), or None."""
    return RANGES.get(f"[{table.split(' ')[0]}] {key}")
