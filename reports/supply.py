"""The supply side in the reports: operating point, pressures along the circuit, curves and water planning.

Only formatting: every number comes from ``result.circuit`` and ``result.planning``; sections are left out
when those are None.
"""
from __future__ import annotations

import math


def _finite(x):
    return x if x is not None and math.isfinite(x) else None


def supply_dict(r) -> dict:
    """JSON keys for the supply side (empty when the design has no circuit and no planning)."""
    c, p = r.circuit, r.planning
    out: dict = {}
    if c is not None:
        out.update({
            "operating_flow_m3_per_s": c.V_dot,
            "supply_pressure_used_Pa": c.supply_pressure,
            "circuit": {
                "drive": c.drive,
                "needed_supply_pressure_Pa": c.needed_pressure,
                "plate_inlet_pressure_Pa": c.plate_inlet_pressure,
                "plate_outlet_pressure_Pa": c.plate_outlet_pressure,
                "plate_pressure_rating_Pa": c.plate_rating,
                "pressures_Pa": [{"after": name, "pressure_Pa": value} for name, value in c.points],
                "heights_m": [{"after": name, "height_m": value} for name, value in c.heights],
                "surges_Pa": [{"valve": name, "surge_Pa": value} for name, value in c.surges],
                "system_curve": {"flow_m3_per_s": list(c.curve.V_dot), "circuit_Pa": list(c.curve.dp_circuit),
                                 "plate_Pa": list(c.curve.dp_plate)},
                "pump_curve": None if c.pump is None else {"flow_m3_per_s": list(c.pump.V_dot),
                                                           "rise_Pa": list(c.pump.dp)},
            },
        })
    if p is not None:
        b = p.breakeven
        out.update({
            "minimum_flow_m3_per_s": _finite(p.V_dot_min),
            "water_cost_per_year": p.cost_per_year,
            "planning": {
                "binding_limit": p.binding,
                "face_limit_C": None if p.face_limit is None else p.face_limit - 273.15,
                "discharge_limit_C": p.discharge_limit - 273.15,
                "surface_temperature_at_minimum_C": None if p.T_face_at_min is None else p.T_face_at_min - 273.15,
                "outlet_temperature_at_minimum_C": None if p.T_out_at_min is None else p.T_out_at_min - 273.15,
                "water_L_per_day": p.water_L_per_day,
                "water_m3_per_year": p.water_m3_per_year,
                "water_m3_per_year_at_minimum": p.water_m3_per_year_min,
                "water_cost_per_year_at_minimum": p.cost_per_year_min,
                "currency": p.currency,
                "flow_over_minimum": p.waste_ratio,
                "use_curve": {"flow_m3_per_s": list(p.use_curve.V_dot),
                              "surface_temperature_C": [t - 273.15 for t in p.use_curve.T_face],
                              "outlet_temperature_C": [t - 273.15 for t in p.use_curve.T_out],
                              "water_m3_per_year": list(p.use_curve.m3_per_year)},
                "chiller": None if b is None else {
                    "power_W": b.chiller_power, "electricity_cost_per_year": b.electricity_cost_per_year,
                    "water_cost_per_year": b.water_cost_per_year, "breakeven_flow_m3_per_s": _finite(b.breakeven_flow),
                    "breakeven_water_tariff_per_m3": _finite(b.breakeven_tariff),
                    "saving_per_year": b.saving_per_year, "payback_years": b.payback_years},
            },
        })
    return out


def supply_lines(r, table) -> list[str]:
    """Text sections for the supply side; ``table(rows, title)`` is the report's table formatter."""
    c, p = r.circuit, r.planning
    out: list[str] = []
    if c is not None:
        how = {"flow": "flow given", "pressure": "set by the static supply pressure",
               "pump": "where the pump curve meets the system curve"}[c.drive]
        rows = [("operating flow", f"{c.V_dot * 6e4:.4g}", f"L/min  ({how})")]
        if c.supply_pressure is not None:
            rows.append(("supply pressure used", f"{c.supply_pressure / 1e5:.3f}", "bar (gauge)"))
        rows.append(("pressure the circuit needs", f"{c.needed_pressure / 1e5:.3f}", "bar (gauge) at the supply"))
        rows.append(("plate inlet / outlet", f"{c.plate_inlet_pressure / 1e5:.3f} / {c.plate_outlet_pressure / 1e5:.3f}",
                     f"bar (gauge) while flowing; plate rated {c.plate_rating / 1e5:.2f} bar"))
        out += table(rows, "Supply circuit")
        out.append("")
        out += table([(name, f"{value / 1e5:.3f}", "bar") for name, value in c.points],
                     "Pressure after each part (gauge)")
        out.append("")
    if p is not None:
        cur = p.currency or ""
        rows = []
        if math.isfinite(p.V_dot_min):
            rows.append(("least flow meeting the limits", f"{p.V_dot_min * 6e4:.4g}", f"L/min  (set by the {p.binding})"))
        else:
            rows.append(("least flow meeting the limits", "none", "no flow keeps the mounting face within its limit"))
        rows.append(("water use", f"{p.water_L_per_day:,.0f}", f"L/day  ({p.water_m3_per_year:,.1f} m³/year)"))
        if p.water_m3_per_year_min is not None:
            rows.append(("water use at the least flow", f"{p.water_m3_per_year_min:,.1f}", "m³/year"))
        if p.cost_per_year is not None:
            rows.append(("water cost", f"{p.cost_per_year:,.0f}", f"{cur}/year"))
        if p.cost_per_year_min is not None:
            rows.append(("water cost at the least flow", f"{p.cost_per_year_min:,.0f}", f"{cur}/year"))
        b = p.breakeven
        if b is not None:
            rows.append(("chiller electricity", f"{b.electricity_cost_per_year:,.0f}",
                         f"{cur}/year  ({b.chiller_power / 1e3:.3g} kW)"))
            rows.append(("break-even flow", f"{b.breakeven_flow * 6e4:.3g}", "L/min  (water bill = chiller electricity)"))
            if b.payback_years is not None:
                rows.append(("chiller payback", f"{b.payback_years:.1f}", "years"))
        out += table(rows, "Water planning (once-through)")
        out.append("")
    return out
