"""Report sections for the optional parts of a result: thermoelectric modules (``result.module``), the supply
circuit (``result.circuit``), water planning (``result.planning``), the field's map and coupling
(``result.field``), and the ``[module]`` inputs.

Formatting only, against the field names of coldplate.modules.result and coldplate.supply.result.
"""
from __future__ import annotations

import math

from .display_units import DisplayUnits, annotate, format_number
from .report_model import Row, Section


def module_inputs(m, u: DisplayUnits) -> list[Row]:
    """The [module] table as read (field names of coldplate.modules.reader.Module)."""
    if m is None:
        return []
    rows = [Row("modules", annotate(m.described_as, u), ""),
            Row("module count / wiring", f"{m.count} / {m.wiring}", ""),
            Row("cold-side load (array)", u.fmt("power", m.cold_load), u.label("power"))]
    if m.current is not None:
        rows.append(Row("drive current per module", format_number(m.current), "A"))
    if m.cold_face_target is not None:
        rows.append(Row("target cold face", u.fmt("temperature", m.cold_face_target), u.label("temperature")))
    rows += [Row("cold-side resistance (stage)", u.fmt("thermal_resistance", m.cold_side_resistance),
                 u.label("thermal_resistance")),
             Row("hot-face limit", u.fmt("temperature", m.hot_side_limit), u.label("temperature"))]
    return rows


def module_section(m, u: DisplayUnits, figures) -> Section:
    def num(x, unit_note=""):
        return format_number(x) if math.isfinite(x) else "not defined" + unit_note

    rows = [
        Row("modules / wiring", f"{m.count} / {m.wiring}", ""),
        Row("current per module", num(m.current), "A", "module_current_A"),
        Row("voltage per module", num(m.voltage), "V", "module_voltage_V"),
        Row("power supply must deliver", f"{num(m.array_current)} A at {num(m.array_voltage)}", "V"),
        Row("cold face", u.fmt("temperature", m.T_cold), u.label("temperature"), "cold_face_temperature_C"),
        Row("hot face", u.fmt("temperature", m.T_hot), u.label("temperature"), "hot_face_temperature_C"),
        Row("heat pumped (cold side, array)", u.fmt("power", m.Q_cold), u.label("power"), "module.cold_load_W"),
        Row("heat into the plate (hot side, array)", u.fmt("power", m.Q_hot), u.label("power"), "heat_into_plate_W"),
        Row("electrical power (array)", u.fmt("power", m.power), u.label("power"), "electrical_power_W"),
        Row("coefficient of performance", num(m.cop, " (no power drawn)"), "-", "cop"),
        Row("coldest current", num(m.coldest_current), "A per module", "coldest_current_A"),
        Row("best-COP current", num(m.best_cop_current), "A per module", "module.best_cop_current_A"),
        Row("room dew/frost point", u.fmt("temperature", m.T_dew), u.label("temperature"), "module.dew_point_C"),
        Row("dew margin (cold face − room dew/frost point)", u.fmt("temperature_difference", m.dew_margin),
            u.label("temperature_difference"), "module.dew_margin_K"),
    ]
    paras = []
    T_coldest = m.T_cold_coldest
    if T_coldest:
        rows.insert(11, Row("cold face at the coldest current", u.fmt("temperature", T_coldest),
                            u.label("temperature"), "module.coldest_cold_face_temperature_C"))
    limit = m.hot_side_limit
    if limit:
        rows.insert(6, Row("hot-face limit", u.fmt("temperature", limit), u.label("temperature"),
                           "module.hot_side_limit_C"))
    for note in (m.shortfall, m.sweep.stopped):
        if note:
            paras.append(annotate(note[0].upper() + note[1:], u))
    if m.placed:
        paras.append("Each module is placed on the plate and has its own hot face from the field, and its own "
                     "current (parallel strings share one voltage); the figures above are the worst module's "
                     "(hottest hot face, warmest cold face), the current the design's per module, the heat and "
                     "power the whole array's; the current sweep (the warmest cold face, the hottest hot face) and "
                     "the coldest and best-COP currents are the placed modules' own.")
        for p in m.placed:
            rows.append(Row(f"{p.name}: hot / cold face",
                            f"{u.fmt('temperature', p.T_hot)} / {u.fmt('temperature', p.T_cold)}",
                            u.label("temperature")))
            rows.append(Row(f"{p.name}: heat into the plate / electrical power",
                            f"{u.fmt('power', p.Q_hot)} / {u.fmt('power', p.power)}", u.label("power")))
            rows.append(Row(f"{p.name}: current / voltage", f"{format_number(p.current)} / "
                            f"{format_number(p.voltage)}", "A / V"))
            rows.append(Row(f"{p.name}: margin to the hot-face limit",
                            u.fmt('temperature_difference', p.limit_margin), u.label("temperature_difference")))
    return Section("module", "Thermoelectric module", tuple(paras), rows=tuple(rows), figures=figures)


def circuit_section(c, u: DisplayUnits, figures) -> Section:
    how = {"flow": "the flow is given", "pressure": "the static supply pressure sets the flow",
           "pump": "the pump curve meets the system curve"}.get(c.drive, c.drive)
    P, lab = (lambda x: u.fmt("pressure", x)), u.label("pressure")
    rows = [Row("drive", f"{c.drive} ({how})", ""),
            Row("operating flow", u.fmt("flow", c.V_dot), u.label("flow"), "operating_flow_m3_per_s")]
    if c.supply_pressure is not None:
        rows.append(Row("supply pressure used (gauge)", P(c.supply_pressure), lab, "supply_pressure_used_Pa"))
    needed = c.needed_pressure
    if needed is not None:
        rows.append(Row("pressure the circuit needs at the supply (gauge)", P(needed), lab,
                        "circuit.needed_supply_pressure_Pa"))
    rows.append(Row("plate inlet pressure (gauge)", P(c.plate_inlet_pressure), lab, "circuit.plate_inlet_pressure_Pa"))
    for name, key, label in (("plate_outlet_pressure", "circuit.plate_outlet_pressure_Pa",
                              "plate outlet pressure (gauge)"),
                             ("plate_rating", "circuit.plate_pressure_rating_Pa", "plate pressure rating (gauge)")):
        value = getattr(c, name)
        if value is not None:  # a rating to 3 figures: 6.9 bar is 100 psi, not 100.08
            rows.append(Row(label, u.fmt("pressure", value, 3) if name == "plate_rating" else P(value), lab, key))
    heights = dict(c.heights)
    head = ("after part", f"gauge pressure [{lab}]") + ((f"height above the supply [{u.label('length_m')}]",)
                                                      if heights else ())
    scale = max((abs(p) for _, p in c.points), default=0.0)

    def P0(p):  # a gauge pressure that is zero to the solver's tolerance (the open outlet) shows as 0
        return "0" if abs(p) < 1e-9 * scale else P(p)

    body = [(name, P0(p)) + ((u.fmt("length_m", heights[name], 3) if name in heights else "",) if heights else ())
            for name, p in c.points]
    paras = ["Gauge pressure after each part, in flow order (negative: below atmospheric, a siphon)."]
    for valve, rise in c.surges:
        paras.append(f"Closing {valve} quickly raises the pressure by about {u.text('pressure', rise)} "
                     "(Joukowsky): close it slowly.")
    return Section("circuit", "Supply circuit", tuple(paras), rows=tuple(rows), table=(head, *body),
                   figures=figures)


def planning_section(p, u: DisplayUnits, figures) -> Section:
    money = (lambda x: f"{x:,.2f}")
    cur = p.currency or ""
    if math.isfinite(p.V_dot_min):
        rows = [Row("least flow meeting the limits", u.fmt("flow", p.V_dot_min), u.label("flow"),
                    "minimum_flow_m3_per_s")]
    else:
        rows = [Row("least flow meeting the limits", "none", "no flow meets the limits")]
    rows.append(Row("limit that binds", p.binding, "", "planning.binding_limit"))
    for name, label, key in (("face_limit", "mounting-face limit", "planning.face_limit_C"),
                             ("discharge_limit", "discharge limit", "planning.discharge_limit_C"),
                             ("T_face_at_min", "hottest mounting face at the least flow",
                              "planning.surface_temperature_at_minimum_C"),
                             ("T_out_at_min", "discharge at the least flow", "planning.outlet_temperature_at_minimum_C")):
        value = getattr(p, name)
        if value is not None:
            rows.append(Row(label, u.fmt("temperature", value), u.label("temperature"), key))
    rows += [Row("water use at the operating flow", u.fmt("volume_per_day", p.water_L_per_day),
                 u.label("volume_per_day"), "planning.water_L_per_day"),
             Row("water use a year", u.fmt("volume_per_year", p.water_m3_per_year), u.label("volume_per_year"),
                 "planning.water_m3_per_year")]
    at_min = p.water_m3_per_year_min
    if at_min is not None:
        rows.append(Row("water use a year at the least flow", u.fmt("volume_per_year", at_min),
                        u.label("volume_per_year"), "planning.water_m3_per_year_at_minimum"))
    ratio = p.waste_ratio
    if ratio is not None:
        rows.append(Row("operating flow / least flow", format_number(ratio), "-", "planning.flow_over_minimum"))
    if p.cost_per_year is not None:
        rows.append(Row("water cost a year", money(p.cost_per_year), cur, "water_cost_per_year"))
        cost_min = p.cost_per_year_min
        if cost_min is not None:
            rows.append(Row("water cost a year at the least flow", money(cost_min), cur,
                            "planning.water_cost_per_year_at_minimum"))
    b = p.breakeven
    if b is not None:
        rows += [Row("recirculating chiller, electrical input", u.fmt("power", b.chiller_power), u.label("power"),
                     "planning.chiller.power_W"),
                 Row("chiller electricity a year", money(b.electricity_cost_per_year), cur,
                     "planning.chiller.electricity_cost_per_year"),
                 Row("chiller saving a year (water cost − electricity)", money(b.saving_per_year), cur,
                     "planning.chiller.saving_per_year")]
        if math.isfinite(b.breakeven_flow):
            rows.append(Row("flow whose water costs as much as the chiller", u.fmt("flow", b.breakeven_flow),
                            u.label("flow"), "planning.chiller.breakeven_flow_m3_per_s"))
        if math.isfinite(b.breakeven_tariff):
            rows.append(Row("water price at which they cost the same", money(b.breakeven_tariff),
                            f"{cur} per m³", "planning.chiller.breakeven_water_tariff_per_m3"))
        if b.payback_years is not None:
            rows.append(Row("chiller payback", format_number(b.payback_years), "years", "planning.chiller.payback_years"))
    return Section("water", "Water use and planning", rows=tuple(rows), figures=figures)


def source_rows(r, u: DisplayUnits) -> list[Row]:
    """One row per heat source: load, where it sits, and (from the field model) its own figures."""
    deg, dK = u.label("temperature"), u.label("temperature_difference")
    by_name = {s.name: s for s in r.sources}
    rows = []
    for s in r.design.sources:
        where = (f"{u.fmt('length', s.size[0])} × {u.fmt('length', s.size[1])} {u.label('length')} at x = "
                 f"{u.fmt('length', s.at[0])}, y = {u.fmt('length', s.at[1])} {u.label('length')}")
        o = by_name.get(s.name)
        if math.isnan(s.load) and o is not None and math.isfinite(o.load):  # a placed module: its own heat
            load, unit = u.fmt("power", o.load), f"{u.label('power')} (this module's hot-side heat); {where}"
        elif math.isnan(s.load):  # a module array: the modules' hot-side heat is the plate's load
            load, unit = u.fmt("power", r.load), f"{u.label('power')} (the modules' hot-side heat); {where}"
        else:
            load, unit = u.fmt("power", s.load), f"{u.label('power')}; {where}"
        rows.append(Row(f"{s.name}: load, size and place", load, unit))
        if o is not None:
            limit = ("no limit given" if o.margin is None else
                     f"margin {u.fmt('temperature_difference', o.margin)} {dK} to {u.fmt('temperature', o.limit)} {deg}")
            mean = "" if math.isnan(o.face_mean) else f"mean {u.fmt('temperature', o.face_mean)} {deg}; "
            rows.append(Row(f"{s.name}: hottest mounting face", u.fmt("temperature", o.face_max),
                            f"{deg}; {mean}own {u.fmt('thermal_resistance', o.resistance(r.T_in))} "
                            f"{u.label('thermal_resistance')}; {limit}"))
    return rows


def field_section(r, u: DisplayUnits, figures, model: str) -> Section:
    """The field's mounting-face map, the coolant per channel and the coupling between sources."""
    paras = [f"Model: {model}. The map is the mounting face on the plate side of any interface (a source's own "
             "face adds its interface's rise); isotherms are labelled in " + u.label("temperature") + ".",
             "Coupling: the mean face rise of the row's source per unit heat of the column's (" +
             u.label("thermal_resistance") + "); the coolant carries heat downstream, so the matrix need not "
             "be symmetric."]
    names = tuple(s.name for s in r.sources)
    table = ()
    if len(names) > 1 and len(r.coupling) == len(names):
        table = (("source", *names),) + tuple(
            (n, *(u.fmt("thermal_resistance", v) for v in row)) for n, row in zip(names, r.coupling))
    else:
        paras = paras[:1]
    return Section("field", "Mounting-face temperature map", tuple(paras), table=table, figures=figures)
