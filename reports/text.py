"""The text summary printed by ``coldplate check``: an aligned table with units, then findings.

Only formatting: every number comes from the result object.
"""
from __future__ import annotations

import textwrap

from .display_units import DisplayUnits, annotate, exact_values, format_number, passage_line
from .flow_split import split_rows
from .module_report import module_text
from .air_report import air_text
from .supply import supply_lines
from .uncertainty import uncertainty_lines

WIDTH = 92


def _table(rows, title):
    lines = [title, "-" * len(title)]
    wq = max(len(q) for q, _, _ in rows)
    wv = max(len(v) for _, v, _ in rows)
    for q, v, u in rows:
        lines.append(f"  {q:<{wq}}  {v:>{wv}}  {u}".rstrip())
    return lines


def model_line(r, u: DisplayUnits) -> str:
    """Which plate model produced the temperatures, in words (the text summary and the report)."""
    f = r.field
    if r.model == "field" and f is not None:
        unc = r.grid_uncertainty
        grid = (f", grid uncertainty ± {format_number(u.value('temperature_difference', unc), 'temperature_difference')}"
                f" {u.label('temperature_difference')}" if unc is not None and unc == unc else "")
        return f"field: 3-D finite-volume solve, {f.cells:,} cells{grid}"
    return "network: resistance network (spreading series over the smeared back side)"


def source_lines(r, u: DisplayUnits, table) -> list[str]:
    """Per heat source (when there are several, or one has a limit) and the coupling (several sources)."""
    S = r.sources
    if not S or (len(S) == 1 and S[0].limit is None):
        return []
    deg, dK = u.label("temperature"), u.label("temperature_difference")
    R_unit = u.label("thermal_resistance")

    def t(x):
        return format(u.value("temperature", x), ".2f")

    rows = []
    for s in S:
        mean = "" if s.face_mean != s.face_mean else f", mean {t(s.face_mean)}"
        margin = ("no limit given" if s.margin is None else
                  f"margin {format(u.value('temperature_difference', s.margin), '+.2f')} {dK} to "
                  f"{t(s.limit)} {deg}")
        alone = s.load != s.load and len(S) == 1  # NaN: a module array, whose heat is the plate's load
        load, R = (r.load, r.R_th) if alone else (s.load, s.resistance(r.T_in))
        shown = "?" if load != load else format_number(u.value("power", load), "power")
        own = "—" if R != R else format_number(u.value("thermal_resistance", R), "thermal_resistance")
        rows.append((f"{s.name} ({shown} {u.label('power')})",
                     t(s.face_max), f"{deg} hottest{mean}; {own} {R_unit} own; {margin}"))
    out = table(rows, "Heat sources: hottest mounting face, mean, own resistance (hottest - inlet) / own load")
    out.append("")
    C = r.coupling
    if len(S) > 1 and len(C) == len(S):
        names = [s.name for s in S]
        w = max(len(n) for n in names)
        cw = max(10, w)
        title = f"Coupling: mean face rise of the row's source per unit heat of the column's [{R_unit}]"
        out += [title, "-" * len(title), "  " + " " * w + "".join(f"  {n:>{cw}}" for n in names)]
        for n, row in zip(names, C):
            out.append(f"  {n:<{w}}" + "".join(
                f"  {format_number(u.value('thermal_resistance', v), 'thermal_resistance'):>{cw}}" for v in row))
        out.append("")
    return out


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
           f"coolant: {d.coolant.label()}; supply: {d.supply.source}",
           f"model: {model_line(r, u)}", ""]
    out += _table(rows, "Result")
    out.append("")
    out += source_lines(r, u, _table)
    out += uncertainty_lines(r, _table, units)
    R_unit = u.label("thermal_resistance")
    parts = [(name, v("thermal_resistance", value), f"{R_unit}  {100 * value / r.R_th:5.1f} %")
             for name, value in r.resistances]
    parts.append(("total", v("thermal_resistance", r.R_th), R_unit))
    out += _table(parts, "Thermal resistance, hottest point to inlet water")
    out.append("")
    out += module_text(r.module, units)
    out += supply_lines(r, _table, units)
    out += air_text(getattr(r, "air", None), units)
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
