"""What every key of the design file holds: its kind of value and a one-line description, kept once.

One record per field, keyed ``"[table] key"`` as a user reads it (circuit parts as ``"[circuit.part] key"``, the
heat sources as ``"[source] key"``, the top-level ``title`` as ``"[top] title"``).  Which keys a table accepts stays with its reader (``design.reader.KEYS``,
``PASSAGE_KEYS``, ``modules.reader``, ``supply.reader``, ``plate.sources.SOURCE_KEYS``, ``sizing.search``);
plausible ranges stay in :mod:`coldplate.design.ranges`; the choices of a ``choice`` stay with the reader's own
tuple.  :mod:`coldplate.design.schema` puts the four together for ``coldplate schema`` and ``coldplate new``, and
``tests/test_schema.py`` fails when a key a reader accepts has no record here, or a record names a key no reader
reads.  Adding a key: one line in ``FIELDS`` (its kind and its description), beside the reader's change.

Kinds: a unit kind of :data:`coldplate.design.units.KINDS` ("length", "temperature", ...: a ``"<number> <unit>"``
string), or one of :data:`OTHER_KINDS`.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Field:
    kind: str  #: a unit kind (design.units.KINDS) or one of OTHER_KINDS
    text: str  #: one line: what the key means, as a comment beside it says it


#: Kinds of value that are not a "<number> <unit>" string.
OTHER_KINDS = {
    "text": "a string",
    "name": "a name from one of our tables (a material, a fitting)",
    "choice": "one of the reader's words",
    "integer": "a whole number",
    "number": "a plain number",
    "boolean": "true or false",
    "lengths": "an array of two lengths: along the flow, across",
    "offsets": "an array of two lengths: from the inlet edge, across from the centre line",
    "placements": "an array of centres, each [from the inlet edge, across from the centre line]",
    "hours": "hours a day: a number, or a time such as '90 min'",
    "days": "days a year: a number",
    "flows": "an array of flows",
    "heads": "an array of heads (lengths) or pressures",
    "money": "an amount and a three-letter currency code, per a unit where asked ('4.10 EUR/m**3')",
    "parts": "an array of tables, [[circuit.part]]",
    "spread": "an input's spread: '±x %', '±x <unit>', [low, high], or { spread = ..., distribution = ... }",
    "axis": "one value, an array of values, or { from, to, steps } (spacing = \"log\" for geometric)",
    "variants": "one length or an array of lengths, each a variant searched on its own (no range)",
}

_F = Field
FIELDS: dict[str, Field] = {
    "[top] title": _F("text", "a line naming the design; reports print it"),
    # [heat]
    "[heat] load": _F("power", "heat the device puts into the plate"),
    "[heat] footprint": _F("lengths", "the device's contact patch, along the flow and across, centred on the plate"),
    # [interface]
    "[interface] resistance": _F("area_resistance", "the interface's resistance per area (or conductivity and "
                                                    "thickness)"),
    "[interface] conductivity": _F("conductivity", "the interface material's conductivity (with thickness)"),
    "[interface] thickness": _F("length", "the interface's thickness (with conductivity)"),
    # [plate]
    "[plate] material": _F("name", "plate metal from our table (or give conductivity)"),
    "[plate] conductivity": _F("conductivity", "plate conductivity, when no material is named"),
    "[plate] length": _F("length", "plate length along the flow"),
    "[plate] width": _F("length", "plate width across the flow"),
    "[plate] base": _F("length", "metal between the heated face and the passage roof"),
    "[plate] pressure_rating": _F("pressure", "gauge pressure the plate is rated for (default: usual for the kind)"),
    # [passage]
    "[passage] kind": _F("choice", "the passage: parallel channels, a pressed-in tube, or one open cavity"),
    "[passage] count": _F("integer", "number of parallel channels"),
    "[passage] width": _F("length", "width of one channel across the flow"),
    "[passage] depth": _F("length", "depth of one channel"),
    "[passage] plenum_length": _F("length", "header at each end of the channels, along the flow"),
    "[passage] port_diameter": _F("length", "bore of the inlet and outlet ports"),
    "[passage] inlet_port": _F("length", "inlet port's offset across from the centre line (+ on the left of the flow)"),
    "[passage] outlet_port": _F("length", "outlet port's offset across from the centre line (+ on the left of the "
                                          "flow)"),
    "[passage] plenum_depth": _F("length", "depth of the plenums the channels start and end in (default: the "
                                           "channel depth)"),
    "[passage] roughness": _F("length", "absolute wall roughness (default: machined metal or drawn tubing)"),
    "[passage] inner_diameter": _F("length", "tube bore"),
    "[passage] outer_diameter": _F("length", "tube outside diameter"),
    "[passage] passes": _F("integer", "straight runs of the tube across the plate"),
    "[passage] bend_radius": _F("length", "centre-line radius of the return bends (more than one pass)"),
    "[passage] material": _F("name", "tube metal from our table"),
    "[passage] bond": _F("choice", "how the tube is joined to the plate"),
    "[passage] height": _F("length", "gap height of the cavity"),
    # [coolant]
    "[coolant] fluid": _F("choice", "the coolant"),
    "[coolant] fraction": _F("fraction", "glycol share of the mixture (glycols only)"),
    "[coolant] basis": _F("choice", "whether fraction is by mass or by volume (glycols only)"),
    "[coolant] inlet_temperature": _F("temperature", "coolant temperature at the plate's inlet"),
    "[coolant] flow": _F("flow", "coolant flow through the plate (absent when the supply sets it)"),
    # [supply]
    "[supply] source": _F("choice", "where the water comes from: drinking water, a closed loop, process water"),
    "[supply] hours_per_day": _F("hours", "hours a day the water runs"),
    "[supply] days_per_year": _F("days", "days a year the water runs (default 365)"),
    "[supply] static_pressure": _F("pressure", "gauge pressure at the supply with no flow"),
    "[supply] discharge_limit": _F("temperature", "hottest water allowed down the drain (default 60 degC)"),
    "[supply] discharge": _F("choice", "where the water goes: to a drain, or back to its loop"),
    "[supply] drive": _F("choice", "what sets the flow: given, the supply's pressure, or a pump ([circuit])"),
    "[supply] pump_flow": _F("flows", "the pump table's flows (drive = \"pump\")"),
    "[supply] pump_head": _F("heads", "the pump table's head or pressure at each flow"),
    "[supply] face_limit": _F("temperature", "hottest mounting face allowed, for the least-flow planning"),
    "[supply] tariff": _F("money", "price of water and drain per volume"),
    "[supply] chiller_power": _F("power", "electrical input of a recirculating chiller, for the comparison"),
    "[supply] electricity_tariff": _F("money", "price of electricity per energy"),
    "[supply] chiller_price": _F("money", "price of that chiller"),
    "[supply] drain_air_gap": _F("length", "air gap above the drain's flood rim"),
    # [room]
    "[room] temperature": _F("temperature", "air temperature around the plate"),
    "[room] relative_humidity": _F("fraction", "relative humidity of that air"),
    # [correlations]
    "[correlations] laminar": _F("choice", "laminar heat-transfer method"),
    "[correlations] turbulent": _F("choice", "turbulent heat-transfer method"),
    "[correlations] segments": _F("integer", "steps of the march along the flow (default 40)"),
    # [uncertainty]: spreads of the inputs (coldplate/uncertainty/reader.py)
    "[uncertainty] correlations": _F("boolean", "include each correlation's published scatter (default true)"),
    "[uncertainty] samples": _F("integer", "how many samples to draw (default 4000)"),
    "[uncertainty] seed": _F("integer", "the sampler's seed, so runs repeat exactly"),
    "[uncertainty] confidence": _F("fraction", "the band's width, e.g. '90 %' for the 5 % to 95 % points"),
    "[uncertainty] heat.load": _F("spread", "spread of the heat load"),
    "[uncertainty] coolant.inlet_temperature": _F("spread", "spread of the inlet water, e.g. the seasons' range"),
    "[uncertainty] coolant.flow": _F("spread", "spread of the flow"),
    "[uncertainty] interface.resistance": _F("spread", "spread of the interface's resistance per area"),
    "[uncertainty] interface.conductivity": _F("spread", "spread of the interface material's conductivity"),
    "[uncertainty] interface.thickness": _F("spread", "spread of the interface's thickness"),
    "[uncertainty] passage.width": _F("spread", "machining tolerance of the channel width"),
    "[uncertainty] passage.depth": _F("spread", "machining tolerance of the channel depth"),
    "[uncertainty] passage.inner_diameter": _F("spread", "tolerance of the tube's bore"),
    "[uncertainty] passage.height": _F("spread", "machining tolerance of the cavity height"),
    # [air]: the air-cooled alternative (coldplate/air/reader.py)
    "[air] length": _F("length", "sink envelope along the air (the vertical for natural convection)"),
    "[air] width": _F("length", "sink envelope across the fins"),
    "[air] height": _F("length", "sink envelope from the mounting face to the fin tips"),
    "[air] base": _F("length", "the sink's base thickness"),
    "[air] material": _F("name", "sink metal from our table"),
    "[air] temperature": _F("temperature", "the air at the sink (default: the room's)"),
    "[air] altitude": _F("length", "site altitude, for the standard-atmosphere pressure (or give pressure)"),
    "[air] pressure": _F("pressure", "the air's absolute pressure (default: sea level)"),
    "[air] drive": _F("choice", "what moves the air: a fan curve, an approach velocity, or natural convection"),
    "[air] fan_flow": _F("flows", "the fan curve's flows"),
    "[air] fan_pressure": _F("heads", "the fan curve's static pressures, one per flow"),
    "[air] velocity": _F("velocity", "the air's approach velocity (drive = \"velocity\")"),
    "[air] min_fin": _F("length", "the shop's thinnest fin"),
    "[air] min_gap": _F("length", "the shop's narrowest gap between fins"),
    "[air] face_limit": _F("temperature", "the hottest face the air sink must hold"),
    "[air] sink": _F("choice", "\"finned\" (searched), or \"none\" for a module with nothing on its hot face"),
    # [module]
    "[module] max_current": _F("current", "one module's maximum current"),
    "[module] max_voltage": _F("voltage", "one module's voltage at that current (datasheet)"),
    "[module] max_temperature_difference": _F("temperature_difference", "one module's largest temperature "
                                                                       "difference (datasheet)"),
    "[module] rated_hot_side": _F("temperature", "hot-side temperature the maxima are rated at"),
    "[module] max_heat": _F("power", "one module's largest heat pumped (datasheet; checked against the model)"),
    "[module] seebeck": _F("seebeck", "one module's Seebeck coefficient (instead of the datasheet maxima)"),
    "[module] resistance": _F("electrical_resistance", "one module's electrical resistance (with seebeck)"),
    "[module] conductance": _F("thermal_conductance", "one module's thermal conductance (with seebeck)"),
    "[module] count": _F("integer", "modules on the plate (default 1)"),
    "[module] wiring": _F("choice", "how the modules are wired (parallel strings share one voltage, each "
                                    "its own current)"),
    "[module] strings": _F("integer", "parallel strings (series-parallel; placed modules fill them in the order "
                                      "of positions)"),
    "[module] cold_load": _F("power", "heat the whole array pumps from the cold stage"),
    "[module] current": _F("current", "drive current per module: the array's over its strings (or "
                                      "cold_face_temperature)"),
    "[module] cold_face_temperature": _F("temperature", "cold-face temperature to reach, by the warmest placed "
                                                       "module (or current)"),
    "[module] cold_side_resistance": _F("thermal_resistance", "cold faces to the load, the whole stage"),
    "[module] hot_side_limit": _F("temperature", "hottest hot face the modules allow"),
    "[module] size": _F("lengths", "one module's footprint, along the flow and across (with positions)"),
    "[module] positions": _F("placements", "each module's centre, as a source's at (one per module; "
                                           "instead of [heat])"),
    # [circuit]
    "[circuit] part": _F("parts", "the parts around the plate in flow order, one [[circuit.part]] each"),
    "[circuit] back_pressure": _F("pressure", "gauge pressure held at the outlet"),
    "[circuit] outlet_diameter": _F("length", "bore of the outlet (default: the last line's)"),
    "[circuit] air_gap": _F("length", "air gap between the outlet and the drain's flood rim"),
    "[circuit.part] kind": _F("choice", "what the part is"),
    "[circuit.part] name": _F("text", "a name the results use for the part"),
    "[circuit.part] inner_diameter": _F("length", "bore of the hose or tube"),
    "[circuit.part] length": _F("length", "length of the hose or tube"),
    "[circuit.part] material": _F("name", "wall from our roughness table (or roughness)"),
    "[circuit.part] roughness": _F("length", "absolute wall roughness (or material)"),
    "[circuit.part] fitting": _F("choice", "kind of fitting"),
    "[circuit.part] diameter": _F("length", "bore of the pipe the fitting or valve sits in"),
    "[circuit.part] count": _F("integer", "how many of this fitting (default 1)"),
    "[circuit.part] bore": _F("length", "the other bore of a reducer, expansion, barb or orifice"),
    "[circuit.part] kv": _F("number", "valve flow coefficient Kv, m³/h at 1 bar (or cv)"),
    "[circuit.part] cv": _F("number", "valve flow coefficient Cv, US gal/min at 1 psi (or kv)"),
    "[circuit.part] solenoid": _F("boolean", "the valve is a solenoid valve"),
    "[circuit.part] device": _F("choice", "kind of backflow preventer"),
    "[circuit.part] loss": _F("pressure", "the device's loss at rated_flow (default: typical)"),
    "[circuit.part] rated_flow": _F("flow", "flow at which loss is given"),
    "[circuit.part] opening_loss": _F("pressure", "loss held by the checks at any flow"),
    "[circuit.part] height": _F("length", "rise of the line (negative: down)"),
    # [[source]]
    "[source] name": _F("text", "a name the results use for the source"),
    "[source] load": _F("power", "heat of this source"),
    "[source] size": _F("lengths", "the source's patch, along the flow and across"),
    "[source] at": _F("offsets", "centre of the patch: from the inlet edge, across from the centre line"),
    "[source] limit": _F("temperature", "hottest face this device allows"),
    "[source] interface_resistance": _F("area_resistance", "its own interface per area (default: [interface])"),
    "[source] interface_conductivity": _F("conductivity", "its own interface conductivity (with thickness)"),
    "[source] interface_thickness": _F("length", "its own interface thickness (with conductivity)"),
    # [search] (coldplate size)
    "[search] count": _F("axis", "channel counts to search"),
    "[search] width": _F("axis", "channel widths to search"),
    "[search] depth": _F("axis", "channel depths to search"),
    "[search] inner_diameter": _F("axis", "tube bores to search"),
    "[search] passes": _F("axis", "tube passes to search"),
    "[search] base": _F("axis", "base thicknesses to search"),
    "[search] flow": _F("axis", "flows to search"),
    "[search] plenum_depth": _F("variants", "plenum depths to search (channel plates; each a variant)"),
    "[search] inlet_port": _F("variants", "inlet port offsets across the plate to search, as [passage] inlet_port"),
    "[search] outlet_port": _F("variants", "outlet port offsets across the plate to search, as [passage] "
                                           "outlet_port"),
    "[search] face_limit": _F("temperature", "hottest mounting face a candidate may have"),
    "[search] face_limit_confidence": _F("fraction", "hold the face limit at this percentile of the band, e.g. '95 %'"),
    "[search] pressure_drop_limit": _F("pressure", "largest plate pressure drop"),
    "[search] discharge_limit": _F("temperature", "hottest outlet allowed"),
    "[search] min_width": _F("length", "narrowest channel the shop can cut"),
    "[search] min_wall": _F("length", "thinnest wall between channels"),
    "[search] max_thickness": _F("length", "plate stock: base plus channel depth at most"),
    "[search] max_water": _F("flow", "once-through water a day at most, as a flow ('2000 L/day')"),
}

def field(table: str, key: str) -> Field:
    """The record of ``[table] key`` (KeyError when none: every key a reader accepts has one)."""
    return FIELDS[f"[{table}] {key}"]
