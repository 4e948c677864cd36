"""Findings for thermoelectric modules on the plate (read ``Result.module``; nothing when it is None).

Run by :mod:`coldplate.check` after the plate's rules.  Wording that touches electrical safety or condensation on
live parts ends with :data:`coldplate.findings.base.DEFER`.
"""
from __future__ import annotations

import math

from coldplate.modules import model as te
from coldplate.findings.base import DEFER, DEW_MARGIN, degc
from coldplate.findings.base import Finding

#: Current past the coldest point that counts as "past it": 2 % of I_max and 0.05 K colder there
#: (common practice: inside this the curve is flat and the difference is below what a sensor resolves).
PAST_COLDEST_CURRENT = 0.02
PAST_COLDEST_K = 0.05
#: Datasheet Q_max and the model's differ by more than this fraction: the datasheet set is not consistent
#: with the ideal model at its rated temperature (common practice: about 10 % is the usual spread).
QMAX_MISMATCH = 0.10


def overdriven(r):
    """The cold face ends hotter than the hot face: the load is beyond what the modules can pump at all."""
    m = r.module
    if m is None or m.T_cold <= m.T_hot:
        return
    S, R, K = m.parameters
    q_max = te.max_heat_pumping(S, R, m.T_hot)[0]  # one module, no temperature difference, at this hot face
    need = math.ceil(m.Q_cold / q_max) if q_max > 0 else None
    more = f"at least {need} modules of this kind (each pumps at most {q_max:.3g} W with no temperature " \
           "difference at this hot face, and less against one)" if need else "larger modules"
    yield Finding(
        "module-overdriven", "danger",
        f"The cold load of {m.Q_cold:.4g} W is more than {m.count} module(s) can pump: the cold face would end at "
        f"{degc(m.T_cold)}, hotter than the hot face ({degc(m.T_hot)}), so the heat leaks backwards through the "
        "modules and the COP, power and cold-face numbers here mean nothing.",
        f"Lower the cold load or use {more}; check the cold stage's temperature before it is powered. " + DEFER)


def past_coldest(r):
    m = r.module
    if m is None or m.mode != "current":
        return
    if m.current > m.coldest_current + PAST_COLDEST_CURRENT * m.max_current and \
            m.T_cold > m.T_cold_coldest + PAST_COLDEST_K:
        same = (f"the same cold face needs just {m.best_cop_current:.3g} A" if m.best_cop_current > 0 else
                "with no current at all the cold face would be colder than this")
        yield Finding(
            "module-past-coldest-current", "warning",
            f"At {m.current:.3g} A per module the cold face sits at {degc(m.T_cold)}, but this plate and flow give "
            f"the coldest cold face, {degc(m.T_cold_coldest)}, at {m.coldest_current:.3g} A: past that point more "
            f"current only heats the hot side faster than it pumps ({same}).",
            f"Run at or below {m.coldest_current:.3g} A per module, or lower the plate's resistance (more flow, "
            "colder water, a better plate or interface) to move the turning point up.")


def target_unreachable(r):
    m = r.module
    if m is not None and m.shortfall:
        yield Finding("module-target-unreachable", "warning", m.shortfall,
                      "Change what the message says would reach the target, or accept the coldest cold face "
                      "shown; never run above the coldest current, which only warms the cold face.")


def hot_face_limit(r):
    m = r.module
    if m is not None and m.T_hot > m.hot_side_limit:
        over = [p for p in m.placed if p.limit_margin < 0]
        if over:
            names = ", ".join(f"{p.name} ({degc(p.T_hot)})" for p in over)
            text = f"The hot face of {names} is above the modules' rated maximum of {degc(m.hot_side_limit)}"
        else:
            text = (f"The modules' hot face reaches {degc(m.T_hot)}, above their rated maximum of "
                    f"{degc(m.hot_side_limit)}")
        yield Finding(
            "module-hot-face-above-rating", "warning",
            f"{text}: solder joints and the thermoelectric material age fast or fail.",
            "Lower the current, raise the flow or use colder water, or improve the plate and the interface "
            "under the modules.")


def sweep_stopped(r):
    m = r.module
    if m is not None and m.sweep.stopped:
        yield Finding(
            "module-sweep-stops", "caution",
            f"The current sweep stops before I_max ({m.max_current:g} A): {m.sweep.stopped}.",
            "Keep the current well below that point and protect the modules against a loss of water flow.")


def cold_face_dew(r):
    m = r.module
    if m is None:
        return
    frost = m.T_dew < 273.15 or m.T_cold < 273.15
    kind = "frost point" if m.T_dew < 273.15 else "dew point"
    remedies = ("Seal the cold stage: closed-cell insulation around it and a vapour seal to the load, dry gas "
                "(nitrogen or dry air) purged through the enclosure, desiccant in a closed housing, or a higher "
                "set point; keep leads and boards where melt water cannot reach them. " + DEFER)
    if m.dew_margin < 0:
        yield Finding(
            "module-cold-face-frost" if frost else "module-cold-face-condensation", "warning",
            f"The modules' cold face ({degc(m.T_cold)}) is {-m.dew_margin:.1f} K below the room {kind} "
            f"({degc(m.T_dew)}): the cold stage will {'collect frost, which melts to water when it is switched off' if frost else 'sweat'}, "
            "and the water can short the modules and nearby electronics.", remedies)
    elif m.dew_margin < DEW_MARGIN:
        yield Finding(
            "module-cold-face-condensation", "caution",
            f"The modules' cold face ({degc(m.T_cold)}) is within {DEW_MARGIN:.0f} K of the room {kind} "
            f"({degc(m.T_dew)}): a more humid day will make the cold stage sweat.", remedies)


def module_electrical(r):
    m = r.module
    if m is None:
        return
    yield Finding(
        "module-supply-near-water", "caution",
        f"A DC supply of {m.array_voltage:.3g} V and {m.array_current:.3g} A ({m.power:.4g} W) drives modules on a "
        "water-cooled plate: a leak or condensation can bridge the leads, and a loss of water flow overheats "
        "the modules within seconds.",
        "Fuse the supply, keep leads and terminals above and away from fittings, and interlock the module "
        "current with the water (a flow switch or an over-temperature cut-out on the hot side). " + DEFER)


def datasheet_consistency(r):
    m = r.module
    if m is None:
        return
    given = r.design.module.max_heat
    if given and abs(m.max_heat_model - given) > QMAX_MISMATCH * given:
        yield Finding(
            "module-datasheet-mismatch", "note",
            f"The datasheet's Q_max ({given:.4g} W) differs from the ideal model's ({m.max_heat_model:.4g} W at "
            "I_max with no temperature difference) by more than 10 %: the module's maxima do not fit one set of "
            "constant S, R and K well.",
            "Treat the results as estimates; measured S, R and K at the working temperature would be closer.")


RULES = (overdriven, past_coldest, target_unreachable, hot_face_limit, sweep_stopped, cold_face_dew, module_electrical,
                datasheet_consistency)
