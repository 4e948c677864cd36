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


def slug(text: str) -> str:
    """A finding id from a method name: lower case, '&' as 'and', other runs of symbols as one '-'."""
    return re.sub(r"[^a-z0-9]+", "-", text.lower().replace("&", "and")).strip("-")


def degc(T: float) -> str:
    """A temperature [K] as the findings write it: one decimal, in degC."""
    return f"{T - 273.15:.1f} degC"
