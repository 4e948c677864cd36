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
                "face_limit_from": p.face_limit_from,
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


def supply_lines(r, table, units: str = "si") -> list[str]:
    """Text sections for the supply side; ``table(rows, title)`` is the report's table formatter.

    ``units="us"`` shows gpm, psi, gallons and BTU/h (reports.display_units); the default is the SI text.
    """
    c, p = r.circuit, r.planning
    us = units == "us"
    if us:
        from .display_units import DisplayUnits

        u = DisplayUnits("us")

    def flow(x, spec=".4g"):
        return (f"{u.value('flow', x):{spec}}", "gpm") if us else (f"{x * 6e4:{spec}}", "L/min")

    def pres(x, spec=".3f"):
        return (f"{u.value('pressure', x):{spec}}", "psi") if us else (f"{x / 1e5:{spec}}", "bar")

    def day(x):
        return (f"{u.value('volume_per_day', x):,.0f}", "gal/day") if us else (f"{x:,.0f}", "L/day")

    def temp(x):
        return (f"{u.value('temperature', x):.2f}", "degF") if us else (f"{x - 273.15:.2f}", "degC")

    def year(x):
        return (f"{u.value('volume_per_year', x):,.1f}", "gal/year") if us else (f"{x:,.1f}", "m³/year")

    out: list[str] = []
    if c is not None:
        how = {"flow": "flow given", "pressure": "set by the static supply pressure",
               "pump": "where the pump curve meets the system curve"}[c.drive]
        v, f_unit = flow(c.V_dot)
        rows = [("operating flow", v, f"{f_unit}  ({how})")]
        p_unit = pres(0.0)[1]
        if c.supply_pressure is not None:
            rows.append(("supply pressure used", pres(c.supply_pressure)[0], f"{p_unit} (gauge)"))
        rows.append(("pressure the circuit needs", pres(c.needed_pressure)[0], f"{p_unit} (gauge) at the supply"))
        rows.append(("plate inlet / outlet", f"{pres(c.plate_inlet_pressure)[0]} / {pres(c.plate_outlet_pressure)[0]}",
                     f"{p_unit} (gauge) while flowing; plate rated {pres(c.plate_rating, '.3g')[0]} {p_unit}"))
        out += table(rows, "Supply circuit")
        out.append("")
        out += table([(name, pres(value)[0], p_unit) for name, value in c.points],
                     "Pressure after each part (gauge)")
        out.append("")
    if p is not None:
        cur = p.currency or ""
        rows = []
        if math.isfinite(p.V_dot_min):
            v, f_unit = flow(p.V_dot_min)
            rows.append(("least flow meeting the limits", v, f"{f_unit}  (set by the {p.binding})"))
            t_v, t_u = temp(p.T_face_at_min)
            note = ("no mounting-face limit given: not a safe flow for the device" if p.face_limit_from == "none"
                    else f"limit {temp(p.face_limit)[0]} {t_u}" + ("" if p.face_limit_from == "face_limit"
                                                                  else f", the {p.face_limit_from}"))
            rows.append(("mounting face at the least flow", t_v, f"{t_u}  ({note})"))
        else:
            rows.append(("least flow meeting the limits", "none", "no flow keeps the mounting face within its limit"))
        (d_v, d_u), (y_v, y_u) = day(p.water_L_per_day), year(p.water_m3_per_year)
        rows.append(("water use", d_v, f"{d_u}  ({y_v} {y_u})"))
        if p.water_m3_per_year_min is not None:
            rows.append(("water use at the least flow", *year(p.water_m3_per_year_min)))
        if p.cost_per_year is not None:
            rows.append(("water cost", f"{p.cost_per_year:,.0f}", f"{cur}/year"))
        if p.cost_per_year_min is not None:
            rows.append(("water cost at the least flow", f"{p.cost_per_year_min:,.0f}", f"{cur}/year"))
        b = p.breakeven
        if b is not None:
            power = f"{u.value('power', b.chiller_power):,.0f} BTU/h" if us else f"{b.chiller_power / 1e3:.3g} kW"
            rows.append(("chiller electricity", f"{b.electricity_cost_per_year:,.0f}", f"{cur}/year  ({power})"))
            v, f_unit = flow(b.breakeven_flow, ".3g")
            rows.append(("break-even flow", v, f"{f_unit}  (water bill = chiller electricity)"))
            if b.payback_years is not None:
                rows.append(("chiller payback", f"{b.payback_years:.1f}", "years"))
        out += table(rows, "Water planning (once-through)")
        out.append("")
    return out
