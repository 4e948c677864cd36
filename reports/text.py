"""The text summary printed by ``coldplate check``: an aligned table with units, then findings.

Only formatting: every number comes from the result object.
"""
from __future__ import annotations

import textwrap

from .display_units import DisplayUnits, annotate, exact_values, format_number, passage_line
from .flow_split import split_rows
from .module_report import module_text
from .supply import supply_lines

WIDTH = 92


def _table(rows, title):
    lines = [title, "-" * len(title)]
    wq = max(len(q) for q, _, _ in rows)
    wv = max(len(v) for _, v, _ in rows)
    for q, v, u in rows:
        lines.append(f"  {q:<{wq}}  {v:>{wv}}  {u}".rstrip())
    return lines


def render_text(r, version: str = "", units: str = "si") -> str:
    d = r.design
    u = DisplayUnits(units)

    def v(kind, x, spec=None):  # one number format throughout: 4 significant figures, separators from 10 000
        return format_number(u.value(kind, x), kind) if spec is None else format(u.value(kind, x), spec)

    def t(x):
        return v("temperature", x, ".2f")

    deg = u.label("temperature")
    rows = [
        ("heat load", v("power", r.load), u.label("power")),
        ("coolant flow", v("flow", r.V_dot), u.label("flow")),
        ("thermal resistance", v("thermal_resistance", r.R_th),
         f"{u.label('thermal_resistance')}  (hottest mounting face - inlet) / load"),
        ("mounting face, hottest", t(r.T_face_max),
         f"{deg}  at {v('length', r.x_hot, '.3g')} {u.label('length')} from the inlet edge"),
        ("plate top, hottest", t(r.T_plate_max), deg),
        ("inlet / outlet water", f"{t(r.T_in)} / {t(r.T_out)}", deg),
        ("pressure drop (plate)", v("pressure", r.dp),
         f"{u.label('pressure')}  (friction {v('pressure', r.dp_friction)} {u.label('pressure')})"),
        ("velocity in passage", v("velocity", r.velocity, ".3f"), u.label("velocity")),
        ("Reynolds / Prandtl", f"{r.Re:.0f} / {r.Pr:.2f}", r.regime),
        ("Nusselt number", f"{r.Nu:.2f}", f"length mean; {r.Nu_hot:.2f} at the hottest point"),
        ("heat transfer coefficient", v("heat_transfer_coefficient", r.h),
         f"{u.label('heat_transfer_coefficient')}  length mean; {v('heat_transfer_coefficient', r.h_hot)} at the "
         "hottest point"),
    ]
    rows += split_rows(r, u)  # the flow split across channels (none without one)
    if r.eta_fin is not None:
        rows.append(("fin efficiency of walls", f"{r.eta_fin:.3f}", ""))
    if d.supply.once_through:
        rows.append(("water use (once-through)", v("volume_per_day", r.water_use_L_per_day, ",.0f"),
                     f"{u.label('volume_per_day')} at {d.supply.hours_per_day:g} h/day  "
                     f"({v('volume_per_year', r.water_use_m3_per_year, ',.1f')} {u.label('volume_per_year')})"))
    else:
        rows.append(("water use", "none", "the water returns to its loop"))
    rows += [
        (f"room {r.dew_kind}", t(r.T_dew),
         f"{deg}  (room {t(d.room.temperature)} {deg}, {d.room.relative_humidity * 100:.0f} % RH)"),
    ]
    out = [f"{d.title}", "=" * min(len(d.title), WIDTH),
           f"passage: {passage_line(r.geometry, u)}",
           f"coolant: {d.coolant.label()}; supply: {d.supply.source}", ""]
    out += _table(rows, "Result")
    out.append("")
    R_unit = u.label("thermal_resistance")
    parts = [(name, v("thermal_resistance", value), f"{R_unit}  {100 * value / r.R_th:5.1f} %")
             for name, value in r.resistances]
    parts.append(("total", v("thermal_resistance", r.R_th), R_unit))
    out += _table(parts, "Thermal resistance, hottest point to inlet water")
    out.append("")
    out += module_text(r.module, units)
    out += supply_lines(r, _table, units)
    out.append("Correlations used")
    out.append("-----------------")
    wr = max(len(m.role) for m in r.methods)
    wm = max(len(m.method) for m in r.methods)
    for m in r.methods:
        where = "inside its range" if not m.outside else "OUTSIDE its range (see findings)"
        out.append(f"  {m.role:<{wr}}  {m.method:<{wm}}  {where}")
    out.append("")
    out.append(f"Findings ({len(r.findings)})")
    out.append("-" * len(out[-1]))
    exact = exact_values(r, r.module, r.circuit, r.planning, d) if u.system != "si" else ()
    for f in r.findings:
        head = f"[{f.severity.upper()}] {f.id}: "
        out += textwrap.wrap(head + annotate(f.message, u, exact), WIDTH, subsequent_indent="    ")
        out += textwrap.wrap("What to do: " + annotate(f.action, u, exact), WIDTH, initial_indent="    ",
                             subsequent_indent="    ")
    if version:
        out += ["", f"coldplate {version}"]
    return "\n".join(out) + "\n"
