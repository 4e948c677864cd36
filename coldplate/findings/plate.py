"""Findings: the rules that read a solved result and say what needs attention.

Each rule returns zero or more :class:`Finding` objects; each finding is raised
once per design, not once per segment.  All wording that touches plumbing or
electrical safety ends with :data:`DEFER`, the one place where the project defers
to local codes and licensed practice.  Thresholds are named constants with their
source (a code, a standard, or "common practice").
"""
from __future__ import annotations

from hydraulics.circuit import Backflow

from coldplate.plate import materials
from coldplate.findings.base import (AIR_GAP_MIN, DEFER, DEW_MARGIN, Finding, amount, device_limit,
                                     back_pressure_causes, continuous_causes, degc, protection_choice, slug)
from coldplate.findings.sources import from_heat_table

#: Margin above the freezing point inside which ice is a risk [K] (common practice).
FREEZE_MARGIN = 3.0
#: Margin below saturation inside which local boiling is a risk [K] (common practice).
BOIL_MARGIN = 10.0
#: Copper-tube velocity limits [m/s]: about 8 ft/s cold, 5 ft/s hot (copper-industry design guidance).
COPPER_V_COLD, COPPER_V_HOT, COPPER_HOT_T = 2.4, 1.5, 333.15
#: Below this mean velocity sediment settles and deposits build (common practice).
V_SLOW = 0.1
#: Velocity above which a wetted metal erodes [m/s], (cold, hot above COPPER_HOT_T), by family (common practice:
#: copper alloys as above; aluminium alloys about 2 m/s; stainless steels about 6 m/s). A metal not listed, or a
#: plate given by its conductivity only, takes the lowest value.
EROSION_V = {"copper alloy": (COPPER_V_COLD, COPPER_V_HOT), "aluminium alloy": (2.0, 2.0),
             "stainless steel": (6.0, 6.0)}
#: Above this velocity water rushing through small ports and fittings is plainly audible [m/s] (common practice).
NOISE_V = 3.0
#: Velocity above this multiple of the erosion limit wears a plate through within its life (common practice).
EROSION_SEVERE = 3.0
#: Passages or ports narrower than this clog on tap water's scale and debris [m] (common practice: about 1 mm).
SMALL_PASSAGE = 1.0e-3
#: Time without water within which the device must be cut off automatically [s] (this tool's threshold: one
#: minute is faster than anyone notices and reacts; common practice).
LOSS_OF_FLOW_TIME = 60.0
#: Mounting face above this is no working design [K]: 200 degC, above the melting point of tin-lead eutectic
#: solder (183 degC, a published fact of the alloy), and far above any electronic part's rating.
FACE_ABSURD = 473.15
#: Static pressure above which US model plumbing codes call for a pressure-reducing valve [Pa] (80 psi).
PRV_PRESSURE = 551_581.0
#: Anodic-index difference above which a metal pair is treated as galvanically incompatible in water [V]
#: (common practice for harsh environments, after MIL-STD-889-style anodic index tables).
GALVANIC_LIMIT = 0.15


def condensation(r):
    d = r.design
    T_cold = r.T_in  # the coldest wetted surface: inlet water, supply hose and the plate near the inlet
    kind = r.dew_kind
    room = f"room {degc(d.room.temperature)} at {d.room.relative_humidity * 100:.0f} % RH"
    if T_cold < r.T_dew:
        what = "frost" if kind == "frost point" else "condensation"
        yield Finding(
            "frost" if what == "frost" else "condensation", "warning",
            f"The inlet water ({degc(T_cold)}) is below the room {kind} ({degc(r.T_dew)}, {room}): "
            f"the supply hose, fittings and the plate near the inlet will {'frost over' if what == 'frost' else 'sweat'}, "
            "and drips can reach live electronics.",
            "Raise the inlet temperature above the dew point plus a margin, or insulate hoses and plate with a "
            "closed-cell sleeve and vapour seal, add a drip tray, keep connectors and boards above and away from "
            "the water path, or purge the enclosure with dry gas. " + DEFER)
    elif T_cold < r.T_dew + DEW_MARGIN:
        yield Finding(
            "condensation", "caution",
            f"The inlet water ({degc(T_cold)}) is within {DEW_MARGIN:.0f} K of the room {kind} ({degc(r.T_dew)}, {room}): "
            "a more humid day will make hoses and the plate sweat.",
            "Insulate cold hoses and the plate's exposed faces, or set the inlet a few kelvin warmer. " + DEFER)


def freezing(r):
    tf = r.design.coolant.freezing_point()
    if r.T_in < tf + FREEZE_MARGIN:
        yield Finding(
            "freezing-risk", "warning",
            f"The inlet ({degc(r.T_in)}) is within {FREEZE_MARGIN:.0f} K of the coolant's freezing point ({degc(tf)}): "
            "ice can block the passages and burst the plate or hoses.",
            "Keep the supply warmer, add glycol with the backflow consequences that brings, or fit a "
            "low-temperature cut-out.")


def boiling(r):
    if r.T_plate_max > r.T_boil - BOIL_MARGIN:
        yield Finding(
            "near-boiling", "danger",
            f"The plate's top face (an upper bound on the wetted wall) reaches {degc(r.T_plate_max)}, within "
            f"{BOIL_MARGIN:.0f} K of the coolant's boiling point ({degc(r.T_boil)} at {r.line_pressure / 1e3:.0f} kPa "
            "absolute, the pressure in the plate while flowing): local boiling, steam and pressure spikes "
            "are possible.",
            "Raise the flow, lower the load, or improve the plate; never let a closed plate boil dry. " + DEFER)


def cross_connection(r):
    d = r.design
    if d.supply.source != "potable":
        if d.coolant.has_additive:
            yield Finding(
                "make-up-protection", "caution",
                f"The circuit carries {d.coolant.label()}; any make-up connection from the drinking-water supply "
                "is a high-hazard cross-connection.",
                "Fill through an air gap or a reduced-pressure principle assembly (ASSE 1013): the loop holds its "
                "own pressure, which is back-pressure against the supply and rules out both vacuum breakers, and "
                "the additive is a high hazard, which rules out the double check. Never connect the loop to the "
                "drinking-water supply directly. " + DEFER)
        return
    high = d.coolant.has_additive
    hazard = "high hazard (contamination)" if high else "low hazard (pollution) at least"
    device = protection_choice(high, back_pressure_causes(d), continuous_causes(d, _first_backflow(d)))
    yield Finding(
        "cross-connection", "warning",
        f"The drinking-water supply feeds equipment: this is a cross-connection, {hazard}. "
        "Without protection, back-siphonage or back-pressure can draw water that has been through the plate "
        "back into the building's drinking water.",
        f"Fit backflow protection at the supply: {device}. Never return cooling water to the drinking-water "
        "system. " + DEFER)
    outlet = d.circuit.outlet_diameter if d.circuit is not None else None
    need = max(2 * outlet, AIR_GAP_MIN) if outlet else None
    here = f" (here {need * 1e3:.0f} mm)" if need else ""
    gap = d.drain_air_gap
    if gap is None:
        yield Finding(
            "drain-air-gap", "caution",
            "The discharge goes to a drain: a hose pushed into the drain can siphon waste water back.",
            f"Discharge through an air gap of at least twice the outlet's diameter and not less than "
            f"{AIR_GAP_MIN * 1e3:.0f} mm above the drain's flood rim (ASME A112.1.2){here}. " + DEFER)
    elif gap >= (need or AIR_GAP_MIN):  # a shorter gap is a warning of supply.findings.air_gap
        against = (f"this outlet needs at least {need * 1e3:.0f} mm (twice its diameter, not less than "
                   f"{AIR_GAP_MIN * 1e3:.0f} mm; ASME A112.1.2)" if need else
                   f"enough if it is at least twice the outlet's diameter (and never less than "
                   f"{AIR_GAP_MIN * 1e3:.0f} mm; ASME A112.1.2): the outlet's diameter is not given")
        yield Finding(
            "drain-air-gap", "note",
            f"The discharge falls through the {gap * 1e3:.0f} mm air gap given above the drain's flood rim; "
            f"{against}.",
            "Keep the hose end fixed at that height in a bracket it cannot slip from, so it can never be pushed "
            "into the drain. " + DEFER)
    yield Finding(
        "once-through-restriction", "note",
        f"Once-through cooling with drinking water uses {r.water_use_L_per_day:,.0f} L a day here; some "
        "jurisdictions, water suppliers and green-building standards restrict or forbid it above small sizes.",
        "Check the local rules; a recirculating loop with a chiller or a heat exchanger removes the water use "
        "and the cross-connection. " + DEFER)


def _first_backflow(d) -> int:
    """Index of the circuit's first backflow device (-1: none listed, or no circuit): pressure after it counts."""
    if d.circuit is None:
        return -1
    return next((i for i, p in enumerate(d.circuit.parts) if isinstance(p, Backflow)), -1)


def discharge(r):
    d = r.design
    if not d.supply.once_through:
        return
    if r.T_out > d.supply.discharge_limit:
        yield Finding(
            "discharge-temperature", "warning",
            f"The discharge leaves at {degc(r.T_out)}, above the drain limit of {degc(d.supply.discharge_limit)}: "
            "hot waste water can scald and can damage drain lines.",
            "Raise the flow, temper the discharge with cold water before the drain, or use a recirculating loop. "
            + DEFER)


def _wetted(d):
    """The wetted metal's key (None when the plate is given by its conductivity only)."""
    return d.passage.material if d.passage.kind == "tube" else d.plate.material


def erosion_limit(d, T_out: float) -> tuple[float, str]:
    """The erosion velocity [m/s] of the wetted metal at outlet temperature T_out, and the metal's family."""
    key = _wetted(d)
    fam = materials.material(key).family if key else "unknown metal"
    if fam in EROSION_V:
        cold, hot = EROSION_V[fam]
    else:
        cold = hot = min(v for pair in EROSION_V.values() for v in pair)
    return (hot if T_out > COPPER_HOT_T else cold), fam


def fastest_water(r) -> tuple[float, str]:
    """The highest velocity anywhere in the plate [m/s] and where: the passage, or a port or plenum minor loss
    (each minor loss carries the velocity it refers to; a channel plate's ports are its narrowest section)."""
    where, v = "passage", r.velocity
    if r.channel_flows:  # a split channel plate: r.velocity is the least-fed channel's; the fastest channel's
        fastest = max(r.channel_flows) * r.m_dot / (r.V_dot * r.props.rho) / r.geometry.flow_area
        if fastest > v:
            where, v = "the fastest channel", fastest
    for m in r.minor_losses:
        if m.velocity > v:
            where, v = m.name, m.velocity
    return v, where


def velocity(r):
    d = r.design
    limit, fam = erosion_limit(d, r.T_out)
    v, where = fastest_water(r)
    if v > limit:
        severe = v > EROSION_SEVERE * limit
        yield Finding(
            "velocity-high", "warning" if severe else "caution",
            f"The water reaches {amount(v)} m/s ({where}), above about {limit:g} m/s where {fam} erodes "
            f"(common practice){'; this far above it the metal wears through and the jet is loud' if severe else ''}.",
            "Use larger ports and more or larger passages, or less flow, to slow the water.")
    elif v > NOISE_V:
        yield Finding(
            "velocity-noise", "note",
            f"The water reaches {amount(v)} m/s ({where}): above about {NOISE_V:g} m/s it is plainly audible "
            "(common practice).",
            "Use larger ports or less flow if the noise matters.")
    if r.velocity < V_SLOW:
        yield Finding(
            "velocity-low", "note",
            f"The mean velocity in the passage is {r.velocity:.3f} m/s: below about {V_SLOW} m/s sediment in tap "
            "water settles and deposits build up (common practice).",
            "Fit a strainer upstream and flush the plate from time to time.")


def pressure_budget(r):
    """The plate's pressure drop against the supply's static pressure and the plate's rating, and the fastest
    water against the wetted metal's limits: in every check, with or without a circuit."""
    d = r.design
    rating, given = materials.plate_rating(d.plate.pressure_rating, d.passage.kind)
    p = d.supply.static_pressure
    v, where = fastest_water(r)
    limit, fam = erosion_limit(d, r.T_out)
    if r.dp > rating:
        yield Finding(
            "plate-drop-above-rating", "danger",
            f"The plate alone needs {amount(r.dp / 1e5)} bar to pass {r.V_dot * 6e4:.3g} L/min, more than {given}, "
            f"{rating / 1e5:.1f} bar: its inlet would sit at least that far above the outlet, and the water reaches "
            f"{amount(v)} m/s ({where}). This is no working design.",
            "Widen the ports and passages or lower the flow until the drop is a small part of the rating; never "
            "pressurise a plate or box beyond its rating. " + DEFER)
    if p is not None and r.dp > p and d.circuit is None:
        yield Finding(
            "supply-pressure-short", "warning",
            f"The plate alone needs {amount(r.dp / 1e5)} bar to pass {r.V_dot * 6e4:.3g} L/min, more than the static "
            f"supply pressure of {p / 1e5:.2f} bar: the design flow will not arrive.",
            "Widen the ports and passages, lower the flow, or describe the lines in a [circuit] to see the flow "
            "this supply gives.")
    share = f"{amount(100 * r.dp / p)} % of the static supply pressure ({p / 1e5:.2f} bar) and " if p else ""
    yield Finding(
        "pressure-budget", "note",
        f"The plate takes {amount(r.dp / 1e3)} kPa at {r.V_dot * 6e4:.3g} L/min: {share}{amount(100 * r.dp / rating)} % of "
        f"{given}, {rating / 1e5:.1f} bar. The fastest water, {amount(v)} m/s, is "
        f"{'in the passage' if where == 'passage' else 'at the ' + where}; {fam} erodes above "
        f"about {limit:g} m/s and water is audible above about {NOISE_V:g} m/s (common practice).",
        "Keep the plate's drop well inside the supply pressure and the rating, and the fastest water below both "
        "velocity limits.")


def pressure(r):
    d = r.design
    rating, given = materials.plate_rating(d.plate.pressure_rating, d.passage.kind)
    p = d.supply.static_pressure
    if p is None:
        if d.supply.source == "potable":
            yield Finding(
                "pressure-unknown", "caution",
                f"No static supply pressure is given; building mains often stand at 3 to 6 bar and more, while "
                f"{given} is {rating / 1e5:.1f} bar.",
                "Measure the static pressure, and fit a pressure-reducing valve if it exceeds the plate's rating. "
                + DEFER)
        return
    if p > rating:
        yield Finding(
            "pressure-rating", "warning",
            f"The static supply pressure {p / 1e5:.2f} bar exceeds {given}, {rating / 1e5:.1f} bar: a blocked "
            "outlet puts the full supply pressure on the plate.",
            "Fit a pressure-reducing valve and a relief path, or use a plate rated for the supply. " + DEFER)
    if p > PRV_PRESSURE:
        yield Finding(
            "pressure-reducing-valve", "caution",
            f"The static supply pressure {p / 1e3:.0f} kPa is above 552 kPa (80 psi), where common US model plumbing "
            "codes call for a pressure-reducing valve.",
            "Fit a pressure-reducing valve at the supply. " + DEFER)


def metals(r):
    d = r.design
    keys = [k for k in (d.plate.material, d.passage.material if d.passage.kind == "tube" else None) if k]
    mats = [materials.material(k) for k in keys]
    indices = [m.anodic_index for m in mats if m.anodic_index is not None]
    if len(mats) == 2 and len(indices) == 2 and abs(indices[0] - indices[1]) > GALVANIC_LIMIT:
        yield Finding(
            "mixed-metals", "caution",
            f"{mats[0].name} and {mats[1].name} meet in one water circuit; their anodic indices differ by "
            f"{abs(mats[0].anodic_index - mats[1].anodic_index):.2f} V, enough for galvanic corrosion.",
            "Keep dissimilar metals apart (same metal throughout, or an insulating bond), or use an inhibited "
            "closed loop instead of once-through water.")
    if any(m.family == "aluminium alloy" for m in mats) and d.supply.source == "potable" and \
            not any(m.family == "copper alloy" for m in mats):
        yield Finding(
            "aluminium-in-tap-water", "note",
            "Aluminium is wetted by tap water, which usually carries dissolved copper from the building's pipes; "
            "copper ions plate out on aluminium and pit it.",
            "Prefer copper or stainless passages for once-through tap water, or a closed, inhibited loop.")


def electrical(r):
    yield Finding(
        "electricity-near-water", "caution",
        "Water and mains-powered electronics share this set-up: a leak or condensation can make exposed metal live.",
        "Supply the equipment through a residual-current device (GFCI), earth the plate, route hoses below and "
        "away from connectors with drip loops, and check fittings for leaks before powering up. " + DEFER)


def ranges(r):
    for use in r.methods:
        if use.outside:
            yield Finding(
                "range-" + slug(use.method), "caution",
                f"{use.method} ({use.role}) is used outside its published range: {'; '.join(use.outside)}.",
                "Treat this part of the result as an extrapolation; check it against a test or a finer model.")
    if r.regime == "transitional":
        yield Finding(
            "transition-regime", "caution",
            f"Re = {r.Re:.0f} lies in the laminar-turbulent transition (2300 to 10 000), where measured heat "
            "transfer scatters widely; the interpolation used is smooth but uncertain (easily ±25 %, common practice).",
            "Prefer a design clearly laminar or clearly turbulent, or allow a margin on the mounting-face temperature.")


def cavity_distribution(r):
    d = r.design
    if d.passage.kind == "cavity" and d.passage.port_diameter < 0.5 * d.plate.width:
        yield Finding(
            "cavity-flow-spread", "note",
            f"The {d.passage.port_diameter * 1e3:.3g} mm ports feed a {d.plate.width * 1e3:.4g} mm wide cavity: the "
            "jet leaves slow corners, so the even-spread result is optimistic there.",
            "Add a distributor or turn the cavity into channels for a predictable result.")


def plate_heat_capacity(d) -> float:
    """Heat capacity of the plate's base slab [J/K]: length x width x base, the metal under the passages only
    (the fins, lid and water are left out, so the plate is taken to warm faster than it does)."""
    return d.plate.length * d.plate.width * d.plate.base * materials.heat_capacity(d.plate.material)


def loss_of_flow(r):
    d = r.design
    if r.load <= 0:
        return
    C = plate_heat_capacity(d)
    rate = r.load / C
    limit, source = device_limit(d)
    t = max(limit - r.T_face_max, 0.0) / rate
    if t < LOSS_OF_FLOW_TIME:
        yield Finding(
            "loss-of-flow", "warning",
            f"If the water stops, {r.load:.4g} W warms the plate ({C:.3g} J/K in its base) at about {rate:.2g} K/s: "
            f"the mounting face passes {degc(limit)} ({source}) within {t:.0f} s, faster than anyone reacts.",
            "Fit a flow switch or a temperature interlock on the mounting face that cuts the device's power when "
            "the flow fails, and test it. " + DEFER)


def small_passages(r):
    d = r.design
    if d.supply.source != "potable":
        return
    pa = d.passage
    sizes = {"channels": lambda: [("channel", min(pa.width, pa.depth)), ("port", pa.port_diameter)],
             "tube": lambda: [("tube", pa.inner_diameter)],
             "cavity": lambda: [("cavity", pa.height), ("port", pa.port_diameter)]}[pa.kind]()
    narrow = [(what, x) for what, x in sizes if x is not None and x < SMALL_PASSAGE]
    if narrow:
        what, x = min(narrow, key=lambda n: n[1])
        yield Finding(
            "small-passages-tap-water", "caution",
            f"The narrowest {what} is {x * 1e3:.3g} mm, below about {SMALL_PASSAGE * 1e3:.0f} mm, on tap water: scale, "
            "rust flakes and sand from the building's pipes clog it, and the face overheats where the flow stops "
            "(common practice).",
            "Fit a fine strainer (finer than the narrowest passage) upstream, flush the plate before first use and "
            "from time to time, and watch the flow or the face temperature. " + DEFER)


def freezing_room(r):
    d = r.design
    tf = d.coolant.freezing_point()
    if d.room.temperature < tf:
        yield Finding(
            "freezing-room", "warning",
            f"The room is at {degc(d.room.temperature)}, below the coolant's freezing point ({degc(tf)}): when the "
            "flow stops, the water standing in the plate and the lines freezes, and ice can split them and flood "
            "the equipment when it thaws.",
            "Drain and blow out the plate and lines whenever the flow stops, or keep the water moving, or heat-trace "
            "and insulate the lines; a glycol loop changes the backflow protection needed. " + DEFER)


def face_absurd(r):
    d = r.design
    if r.T_face_max > FACE_ABSURD:
        limit, source = device_limit(d)
        need = (limit - r.T_in) / r.load if r.load > 0 and limit > r.T_in else None
        what = (f"to hold the face at {degc(limit)} ({source}) the path from face to water must be below "
                f"{need:.3g} K/W (now {r.R_th:.3g} K/W)" if need else "no plate at this inlet temperature can hold it")
        yield Finding(
            "face-temperature-absurd", "danger",
            f"The mounting face would reach {degc(r.T_face_max)}, above {degc(FACE_ABSURD)} where solder melts and "
            "no electronic part survives: the load is far beyond what this interface and plate can carry, and "
            "the numbers are not a working design.",
            f"Spread the load, improve the interface and the plate, or lower the load: {what}. " + DEFER)


def footprint_over_plenum(r):
    """The plate model cools only the length between the plenums (coldplate.plate.solve.cooled_span)."""
    off = r.geometry.cooled_offset
    d = r.design
    cooled = d.plate.length - 2 * off
    if not from_heat_table(d):  # [[source]] tables: findings.sources.over_plenum places each source
        return
    if off > 0 and d.heat.footprint_length > cooled * (1 + 1e-9):
        over = 0.5 * (d.heat.footprint_length - cooled)
        yield Finding(
            "footprint-over-plenum", "caution",
            f"The {d.heat.footprint_length * 1e3:.4g} mm footprint reaches {over * 1e3:.3g} mm over each plenum, "
            f"beyond the {cooled * 1e3:.4g} mm of channels: the plate model gives the plate over a plenum no "
            "cooling and counts that heat at the channels' ends, so the face over the plenums may run hotter "
            "than reported.",
            "Keep the heated footprint within the channel length (shorter plenums or a longer plate), or check "
            "the plenum ends against a test or a finer model.")


RULES = (face_absurd, condensation, freezing, freezing_room, boiling, cross_connection, discharge, velocity,
         pressure_budget, pressure, loss_of_flow, small_passages, metals, electrical, ranges, cavity_distribution,
         footprint_over_plenum)

