"""The band's rules: a limit that the nominal meets but the band's far end crosses.

Each reads ``Result.uncertainty`` (coldplate/uncertainty/result.py) beside the check's own result; the check's
findings already cover a nominal past a limit, so these speak only where the nominal is inside and the
upper (or, for the dew point, the lower) percentile is not.  Limits are the check's own: the device limit
(``findings.plate.device_limit``), the drain's discharge limit, the supply's static pressure and the plate's
rating (``materials.plate_rating``), the room's dew point.
"""
from __future__ import annotations

from coldplate.findings.base import DEFER, Finding, amount, degc
from coldplate.findings.plate import device_limit
from coldplate.plate import materials


def _pct(q: float) -> str:
    return f"{q * 100:g} %"


def face_limit(r):
    u = r.uncertainty
    limit, where = device_limit(r.design)
    b = u.band("face")
    if b.nominal <= limit < b.high:
        yield Finding(
            "face-limit-in-band", "warning",
            f"The hottest mounting face is {degc(b.nominal)} as designed, but its {_pct(u.upper_q)} value is "
            f"{degc(b.high)}, above {where} of {degc(limit)}: with the spreads given, "
            f"{_pct(1 - u.upper_q)} or more of builds and days run the device hotter than it allows.",
            "Narrow the spread that drives the band most (see the sensitivities), or size for the limit at a "
            "percentile ([search] face_limit_confidence); a device run hot near water and mains electricity needs "
            "its over-temperature cut-out. " + DEFER)


def discharge(r):
    d, u = r.design, r.uncertainty
    if not d.supply.once_through:
        return
    b = u.band("outlet")
    if b.nominal <= d.supply.discharge_limit < b.high:
        yield Finding(
            "discharge-in-band", "caution",
            f"The discharge leaves at {degc(b.nominal)} as designed, but at {degc(b.high)} at the band's "
            f"{_pct(u.upper_q)} point, above the drain limit of {degc(d.supply.discharge_limit)}: hot waste water "
            "can scald and can damage drain lines.",
            "Keep a margin of flow, or temper the discharge before the drain. " + DEFER)


def pressure(r):
    d, u = r.design, r.uncertainty
    b = u.band("pressure_drop")
    rating, given = materials.plate_rating(d.plate.pressure_rating, d.passage.kind)
    if b.nominal <= rating < b.high:
        yield Finding(
            "plate-rating-in-band", "danger",
            f"The plate's drop is {amount(b.nominal / 1e5)} bar as designed, but {amount(b.high / 1e5)} bar at the "
            f"band's {_pct(u.upper_q)} point, more than {given}, {rating / 1e5:.1f} bar.",
            "Widen the passages or lower the flow so that the whole band stays well under the rating; never "
            "pressurise a plate or box beyond its rating. " + DEFER)
    p = d.supply.static_pressure
    if p is not None and d.circuit is None and b.nominal <= p < b.high:
        yield Finding(
            "supply-pressure-in-band", "warning",
            f"The plate alone needs {amount(b.nominal / 1e5)} bar as designed, but {amount(b.high / 1e5)} bar at the "
            f"band's {_pct(u.upper_q)} point, more than the supply's static pressure of {amount(p / 1e5)} bar: "
            "the flow would fall short and the face run hotter.",
            "Open up the passages or ports, or raise the supply's pressure within what the plumbing allows. "
            + DEFER)


def dew_point(r):
    u = r.uncertainty
    b = u.band("face")
    for what, nominal, low in (("hottest mounting face", b.nominal, b.low), ("inlet water", r.T_in, u.inlet_low)):
        if low < r.T_dew <= nominal:
            yield Finding(
                "dew-point-in-band", "warning",
                f"The {what} is {degc(nominal)} as designed, above the room {r.dew_kind} ({degc(r.T_dew)}), but "
                f"{degc(low)} at the band's {_pct(u.lower_q)} point, below it: on the cold days or builds the plate "
                "and hoses sweat, and drips can reach live electronics.",
                "Keep the inlet above the dew point plus a margin on the coldest supply day, or insulate and seal "
                "the cold parts, add a drip tray and keep connectors above the water path. " + DEFER)


def unsolved(r):
    u = r.uncertainty
    if u.unsolved:
        yield Finding(
            "band-unsolved-samples", "warning",
            f"{u.unsolved} of {u.samples} samples could not be solved (the water would boil or leave the property "
            "data): the band's upper end is not a number there.",
            "Narrow the spreads of load, flow and inlet until every sample can be solved, or add flow. " + DEFER)


#: Every rule of the band, in the order their findings are listed within one severity.
RULES = (face_limit, discharge, pressure, dew_point, unsolved)
