"""What every finding shares: the finding record, the severities, the one sentence that defers to local codes
and licensed practice, the thresholds more than one stage reads, and the wording helpers.

Each stage's own rules live with it (``coldplate.findings.plate``, ``coldplate.modules.findings``,
``coldplate.supply.findings``); the check (``coldplate.check``) runs them all.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

SEVERITIES = ("danger", "warning", "caution", "note")  #: most severe first


@dataclass(frozen=True)
class Finding:
    """One finding: an id, a severity from :data:`SEVERITIES`, the message with its numbers, what to do."""

    id: str
    severity: str
    message: str
    action: str

    def __post_init__(self):
        if self.severity not in SEVERITIES:
            raise ValueError(f"unknown severity {self.severity!r}")


DEFER = ("Local plumbing and electrical codes, the water supplier and licensed practice decide; "
         "this tool gives guidance, not approval.")

#: Margin above the dew point below which a surface is treated as at risk of sweating [K] (common practice).
DEW_MARGIN = 2.0
#: Continuous pressure longer than this rules out an atmospheric vacuum breaker [h] (common in codes).
AVB_MAX_HOURS = 12.0
#: Air gap at the drain: at least twice the outlet's diameter, and not less than 25 mm (ASME A112.1.2).
AIR_GAP_MIN = 0.025
#: Mounting-face limit assumed for the loss-of-flow estimate when the design gives none [K]: 85 degC, the usual
#: top of the operating range of industrial-grade electronic parts (common practice).
DEVICE_LIMIT_DEFAULT = 358.15

#: Backflow devices by what they cover, as the US model plumbing codes' device tables list them (from memory):
#: both vacuum breakers serve a high or a low hazard against back-siphonage only (the atmospheric one only
#: where it never stays under pressure); the double check serves a low hazard only, against back-siphonage and
#: back-pressure; the reduced-pressure principle assembly and an air gap serve any hazard against both.
AVB = "an atmospheric vacuum breaker (ASSE 1001)"
PVB = "a pressure vacuum breaker (ASSE 1020)"
DCVA = "a double check valve assembly (ASSE 1015)"
RPZ = "a reduced-pressure principle assembly (ASSE 1013)"


def back_pressure_causes(d) -> list[str]:
    """What can push water back against the supply (back-pressure backflow), which rules out both vacuum
    breakers: a back pressure at the outlet, a pump in the circuit, or a loop or vessel that holds its own
    pressure downstream."""
    out = []
    c = d.circuit
    if c is not None and c.back_pressure > 0:
        out.append(f"the outlet is held at {c.back_pressure / 1e5:.2f} bar (gauge)")
    if d.supply.drive == "pump":
        out.append("a pump in the circuit can raise the pressure downstream above the supply's")
    if not d.supply.once_through:
        out.append("the water returns to a loop that holds its own pressure")
    return out


def continuous_causes(d, after: int = -1) -> list[str]:
    """What keeps a device under pressure for long (continuous pressure), which rules out the atmospheric
    vacuum breaker only: a valve after part ``after`` of the circuit, or long running hours."""
    from dataclasses import replace

    out = []
    c = d.circuit
    if c is not None and replace(c, back_pressure=0.0).can_hold_pressure(after):
        out.append("a valve after it can hold the line under pressure")
    if d.supply.hours_per_day > AVB_MAX_HOURS:
        out.append(f"the supply stays under pressure {d.supply.hours_per_day:g} h a day (more than "
                   f"{AVB_MAX_HOURS:g} h)")
    return out


def protection_choice(high_hazard: bool, back: list[str], continuous: list[str]) -> str:
    """The backflow protection that serves a hazard and the pressures it sees, with the reason, as words."""
    if back:
        devices = f"{RPZ} or an air gap" if high_hazard else f"{RPZ}, {DCVA} or an air gap"
        why = ("; ".join(back) + ": that is back-pressure, against which neither vacuum breaker protects"
               + ("; the hazard rules out the double check, which serves a low hazard only" if high_hazard else ""))
        return f"{devices} ({why})"
    low = "" if high_hazard else f", {DCVA}"
    if continuous:
        return (f"{PVB}{low} or {RPZ} ({'; '.join(continuous)}: that is continuous pressure, which rules out an "
                "atmospheric vacuum breaker; a vacuum breaker guards against back-siphonage only)")
    return (f"at least {AVB}, mounted above the highest point downstream with no shut-off valve after it; "
            f"if a valve can hold the line under pressure use {PVB}{low} or {RPZ}, and if anything can push "
            f"water back (a pump, a back pressure, a pressurised vessel) {RPZ} or an air gap")


def slug(text: str) -> str:
    """A finding id from a method name: lower case, '&' as 'and', other runs of symbols as one '-'."""
    return re.sub(r"[^a-z0-9]+", "-", text.lower().replace("&", "and")).strip("-")


def amount(x: float, digits: int = 3) -> str:
    """A number as the findings write it: ``digits`` significant figures, whole numbers with thousands
    separators once it has more digits than that (never an exponent)."""
    return f"{x:,.0f}" if abs(x) >= 10 ** digits else f"{x:.{digits}g}"


def degc(T: float) -> str:
    """A temperature [K] as the findings write it: one decimal, in degC."""
    return f"{T - 273.15:.1f} degC"


def device_limit(d) -> tuple[float, str]:
    """The device's temperature limit [K] and where it comes from: the supply's face_limit, the modules'
    hot-side limit, or the usual rating of electronic parts (common practice)."""
    if d.supply.face_limit is not None:
        return d.supply.face_limit, "the face limit"
    if d.module is not None:
        return d.module.hot_side_limit, "the modules' hot-side limit"
    return DEVICE_LIMIT_DEFAULT, "no limit given: the usual top rating of industrial electronic parts, common practice"
