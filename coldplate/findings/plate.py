"""Findings: the rules that read a solved result and say what needs attention.

Each rule returns zero or more :class:`Finding` objects; each finding is raised
once per design, not once per segment.  All wording that touches plumbing or
electrical safety ends with :data:`DEFER`, the one place where the project defers
to local codes and licensed practice.  Thresholds are named constants with their
source (a code, a standard, or "common practice").
"""
from __future__ import annotations

from coldplate.plate import materials
from coldplate.findings.base import AIR_GAP_MIN, AVB_MAX_HOURS, DEFER, DEW_MARGIN, Finding, degc, slug

#: Margin above the freezing point inside which ice is a risk [K] (common practice).
FREEZE_MARGIN = 3.0
#: Margin below saturation inside which local boiling is a risk [K] (common practice).
BOIL_MARGIN = 10.0
#: Copper-tube velocity limits [m/s]: about 8 ft/s cold, 5 ft/s hot (copper-industry design guidance).
COPPER_V_COLD, COPPER_V_HOT, COPPER_HOT_T = 2.4, 1.5, 333.15
#: Below this mean velocity sediment settles and deposits build (common practice).
V_SLOW = 0.1
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
                "Fill through an air gap or a reduced-pressure principle assembly (ASSE 1013); never connect "
                "the loop to the drinking-water supply directly. " + DEFER)
        return
    hazard = "high hazard (contamination)" if d.coolant.has_additive else "low hazard (pollution) at least"
    continuous = d.supply.hours_per_day > AVB_MAX_HOURS
    held = d.circuit is not None and d.circuit.outlet_side_held()  # a valve or back pressure in the circuit
    if d.coolant.has_additive:
        device = ("a reduced-pressure principle assembly (ASSE 1013) or an air gap: additives such as glycol "
                  "or inhibitors make this a high hazard, for which a vacuum breaker is not enough")
    elif continuous or held:
        why = (f"the supply is under pressure {d.supply.hours_per_day:g} h a day, longer than an atmospheric vacuum "
               "breaker (ASSE 1001) may be" if continuous else "a valve or back pressure in the circuit can hold the "
               "outlet side under pressure, which an atmospheric vacuum breaker (ASSE 1001) may not be")
        device = (f"a pressure vacuum breaker (ASSE 1020) or a reduced-pressure principle assembly: {why}, and that "
                  "device guards against back-siphonage only")
    else:
        device = ("at least an atmospheric vacuum breaker (ASSE 1001), mounted above the highest point downstream "
                  "with no shut-off valve after it; if a valve or anything else can hold the outlet side under "
                  "pressure, use a pressure vacuum breaker (ASSE 1020) or a reduced-pressure principle assembly")
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


def velocity(r):
    d = r.design
    wetted = d.passage.material if d.passage.kind == "tube" else d.plate.material
    fam = materials.material(wetted).family if wetted else None
    if fam == "copper alloy":
        limit = COPPER_V_HOT if r.T_out > COPPER_HOT_T else COPPER_V_COLD
        if r.velocity > limit:
            yield Finding(
                "velocity-high", "caution",
                f"The mean velocity in the passage is {r.velocity:.2f} m/s, above about {limit} m/s where copper "
                "alloys erode (copper-industry design guidance).",
                "Use more or larger passages, or less flow, to slow the water.")
    if r.velocity < V_SLOW:
        yield Finding(
            "velocity-low", "note",
            f"The mean velocity in the passage is {r.velocity:.3f} m/s: below about {V_SLOW} m/s sediment in tap "
            "water settles and deposits build up (common practice).",
            "Fit a strainer upstream and flush the plate from time to time.")


def pressure(r):
    d = r.design
    kind = d.passage.kind
    rating = d.plate.pressure_rating or materials.pressure_rating(kind).value
    given = "its stated rating" if d.plate.pressure_rating else f"the usual rating of a {kind} plate (common practice)"
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


RULES = (condensation, freezing, boiling, cross_connection, discharge, velocity, pressure, metals, electrical,
         ranges, cavity_distribution)

