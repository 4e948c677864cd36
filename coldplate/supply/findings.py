"""Findings on the supply side: what the circuit, the operating point and the water planning add.

The general plumbing findings (cross-connection and the protection it needs, drain air gap, once-through
restriction, pressure-reducing valve, discharge temperature, static pressure against the plate's rating) stay
in :mod:`coldplate.findings`; these rules add what only the circuit and the planning know.  Thresholds are
named constants with their source.
"""
from __future__ import annotations

from hydraulics.circuit import Backflow

from coldplate.plate import materials
from coldplate.supply.reader import BACKFLOW_DEVICES
from coldplate.supply.operating import FLOW_MAX
from coldplate.findings.base import (AIR_GAP_MIN, DEFER, back_pressure_causes, continuous_causes, degc,
                                     protection_choice)
from coldplate.findings.base import Finding

#: Height of an atmospheric vacuum breaker above the highest downstream point [m]: 6 in (152 mm) in common US
#: model codes; from memory.
AVB_ABOVE = 0.152
#: Height of a pressure vacuum breaker above the highest downstream point [m]: 12 in (305 mm), common US model
#: codes; from memory.
PVB_ABOVE = 0.305
#: Operating flow above this multiple of the least flow is flagged as wasteful (common practice for this tool:
#: half the water or less would do).
WASTE_RATIO = 2.0
#: Surge above which a fast-closing valve calls for a water-hammer arrester [Pa] (common practice: about the
#: static pressure of a building main; ASSE 1010 arresters are sized by fixture units).
SURGE_NOTE = 3.0e5


def supply_pressure(r):
    c, d = r.circuit, r.design
    if c is None:
        return
    rating, given = materials.plate_rating(d.plate.pressure_rating, d.passage.kind)
    if c.plate_inlet_pressure > rating:
        yield Finding(
            "plate-inlet-pressure", "warning",
            f"While water flows, the plate inlet sits at {c.plate_inlet_pressure / 1e5:.2f} bar (gauge), above {given}, "
            f"{rating / 1e5:.1f} bar.",
            "Move the throttling valve upstream of the plate, fit a pressure-reducing valve, or use a plate rated "
            "for the pressure. " + DEFER)
    if c.plate_outlet_pressure < 0:
        yield Finding(
            "plate-below-atmosphere", "note",
            f"The drain line falls far enough to siphon: the plate outlet sits {-c.plate_outlet_pressure / 1e3:.1f} kPa "
            "below atmospheric pressure while water flows, so a loose joint there draws air in rather than "
            "leaking, and the water boils a little sooner.",
            "Keep joints after the plate tight; an air release or a vented drain break stops the siphon.")
    p = d.supply.static_pressure
    if c.drive == "flow" and p is not None and c.needed_pressure > p:
        yield Finding(
            "supply-pressure-short", "warning",
            f"The circuit needs {c.needed_pressure / 1e5:.2f} bar at the supply to pass {r.V_dot * 6e4:.3g} L/min, "
            f"more than the static supply pressure of {p / 1e5:.2f} bar: the design flow will not arrive.",
            "Use drive = \"pressure\" to see the flow this supply gives, shorten or widen the lines, or open the "
            "valve further.")
    shut = (d.supply.static_pressure or 0.0) + c.pump.dp[0] if c.pump is not None else 0.0
    if shut > rating:
        yield Finding(
            "pump-above-rating", "warning",
            f"If a valve or a blockage stops the flow, the pump's shut-off head puts {shut / 1e5:.2f} bar (gauge) on "
            f"the plate, above {given} ({rating / 1e5:.1f} bar).",
            "Fit a relief valve or a bypass around the plate, or choose a pump with less head. " + DEFER)


def backflow_fit(r):
    """Whether the backflow device listed in the circuit fits this hazard, this circuit, and its height."""
    d, c = r.design, r.design.circuit
    if c is None or d.supply.source != "potable":
        return
    devices = [(i, p) for i, p in enumerate(c.parts) if isinstance(p, Backflow)]
    if not devices:
        yield Finding(
            "backflow-device-not-listed", "caution",
            "The circuit lists no backflow device, so its pressure loss is not counted in the flow.",
            "Add the device chosen for the cross-connection as a part (kind = \"backflow\") where it will be "
            "fitted. " + DEFER)
        return
    heights = c.heights()
    for i, part in devices:
        kind = BACKFLOW_DEVICES[part.device]
        why = []
        if d.coolant.has_additive and not kind.high_hazard:
            why.append(f"{d.coolant.label()} makes this a high hazard, which a {kind.name} does not serve "
                       "(it is for a low hazard only)")
        back = back_pressure_causes(d)
        if back and not kind.back_pressure:
            why.append(f"{'; '.join(back)}: that is back-pressure, and a {kind.name} guards against "
                       "back-siphonage only")
        held = continuous_causes(d, i)
        if held and not kind.continuous:
            why.append(f"{'; '.join(held)}: a {kind.name} may not stay under continuous pressure")
        if why:
            yield Finding(
                "backflow-device-unsuitable", "warning",
                f"The {kind.name} ({kind.standard}) at '{part.name}' does not fit this circuit: {'; '.join(why)}.",
                f"Use {protection_choice(d.coolant.has_additive, back, held)}. " + DEFER)
        if r.V_dot > part.flow_rated:
            yield Finding(
                "backflow-device-size", "caution",
                f"The {kind.name} at '{part.name}' passes {r.V_dot * 6e4:.3g} L/min, above the {part.flow_rated * 6e4:.3g} "
                "L/min its loss is given for: its loss rises steeply beyond its size.",
                "Choose the next size up, or give the device's own loss at this flow. " + DEFER)
        need = {"atmospheric-vacuum-breaker": AVB_ABOVE, "pressure-vacuum-breaker": PVB_ABOVE}.get(part.device)
        downstream = heights[i + 1:]
        if need is not None and downstream:
            above = heights[i] - max(downstream)
            if above < need:
                yield Finding(
                    "backflow-device-height", "warning",
                    f"The {kind.name} at '{part.name}' sits {above * 1e3:.0f} mm above the highest point downstream; "
                    f"it needs at least {need * 1e3:.0f} mm (common US model codes) to work.",
                    "Mount it higher, above every hose and the plate it serves. " + DEFER)


def air_gap(r):
    d, c = r.design, r.design.circuit
    gap = d.drain_air_gap
    if not d.supply.once_through or gap is None:
        return
    need = max(2.0 * ((c.outlet_diameter if c is not None else None) or 0.0), AIR_GAP_MIN)
    if gap < need:
        yield Finding(
            "drain-air-gap-short", "warning",
            f"The air gap at the drain is {gap * 1e3:.0f} mm; this outlet needs at least {need * 1e3:.0f} mm "
            "(twice its diameter, and not less than 25 mm).",
            "Fix the hose end higher above the drain's flood rim, in a bracket it cannot slip from. " + DEFER)


def water_hammer(r):
    c = r.circuit
    if c is None:
        return
    for name, dp in c.surges:
        yield Finding(
            "water-hammer", "caution" if dp > SURGE_NOTE else "note",
            f"'{name}' closes fast: stopping {r.V_dot * 6e4:.3g} L/min at once raises the pressure by up to "
            f"{dp / 1e5:.1f} bar (Joukowsky, rigid line; a hose softens it) on top of the supply pressure.",
            "Fit a water-hammer arrester (ASSE 1010) close to the valve, or use a slow-closing valve. " + DEFER)


def planning(r):
    p = r.planning
    if p is None:
        return
    if p.binding == "unreachable":
        limits = [f"discharge at most {degc(p.discharge_limit)}"]
        if p.face_limit is not None:
            limits.insert(0, f"mounting face at most {degc(p.face_limit)}")
        yield Finding(
            "limits-unreachable", "warning",
            f"No flow up to {FLOW_MAX * 6e4:.0f} L/min meets the limits ({', '.join(limits)}) with water entering at "
            f"{degc(r.T_in)}: the plate's conduction and interface, or the inlet temperature itself, exceed them.",
            "Improve the interface or the plate, lower the load, or use colder water.")
        return
    if p.face_limit_from == "face_limit" and r.T_face_max > p.face_limit:
        yield Finding(
            "face-limit", "warning",
            f"At {r.V_dot * 6e4:.3g} L/min the hottest mounting face reaches {degc(r.T_face_max)}, above its limit of "
            f"{degc(p.face_limit)}; the limits need at least {p.V_dot_min * 6e4:.3g} L/min.",
            "Raise the flow (open the valve, shorten or widen the lines) or improve the plate.")
    if p.waste_ratio is not None and p.waste_ratio > WASTE_RATIO:
        money = ""
        if p.cost_per_year is not None:
            money = f", about {p.cost_per_year - p.cost_per_year_min:,.0f} {p.currency} a year"
        extra = (f"{p.water_m3_per_year - p.water_m3_per_year_min:,.0f} m³ of drinking water a year more than the "
                 f"least flow{money}")
        if p.face_limit_from == "none":
            yield Finding(
                "water-waste", "caution",
                f"The plate runs at {r.V_dot * 6e4:.3g} L/min, {p.waste_ratio:.1f} times the least flow that keeps the "
                f"discharge under its limit ({p.V_dot_min * 6e4:.3g} L/min): {extra}. No mounting-face limit is "
                f"given, and at that flow the mounting face would reach {degc(p.T_face_at_min)}, so no lower flow "
                "is advised.",
                "Give face_limit in [supply] (the device's rated mounting-face temperature, with a margin) to find "
                "the least flow that is safe for the device, or switch the water on only while the load runs; "
                "a recirculating loop uses none.")
        else:
            yield Finding(
                "water-waste", "caution",
                f"The plate runs at {r.V_dot * 6e4:.3g} L/min, {p.waste_ratio:.1f} times the least flow its limits "
                f"need ({p.V_dot_min * 6e4:.3g} L/min, set by the {p.binding}, where the mounting face reaches "
                f"{degc(p.T_face_at_min)} against its limit of {degc(p.face_limit)}"
                f"{'' if p.face_limit_from == 'face_limit' else ', the ' + p.face_limit_from}): {extra}.",
                "Throttle to the least flow plus a margin with a fixed flow regulator, or switch the water on only "
                "while the load runs; a recirculating loop uses none.")
    b = p.breakeven
    if b is not None and b.saving_per_year > 0 and r.design.supply.source == "potable":
        pay = f"; it pays for itself in {b.payback_years:.1f} years" if b.payback_years is not None else ""
        yield Finding(
            "chiller-cheaper", "note",
            f"A recirculating chiller drawing {b.chiller_power / 1e3:.3g} kW would cost {b.electricity_cost_per_year:,.0f} "
            f"{p.currency} a year in electricity against {b.water_cost_per_year:,.0f} {p.currency} of water{pay}.",
            "Consider a recirculating loop: it also removes the cross-connection. " + DEFER)


RULES = (supply_pressure, backflow_fit, air_gap, water_hammer, planning)

