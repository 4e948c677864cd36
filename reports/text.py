"""The text summary printed by ``coldplate check``: an aligned table with units, then findings.

Only formatting: every number comes from the result object.
"""
from __future__ import annotations

import textwrap

from .module_report import module_text
from .supply import supply_lines

WIDTH = 92


def _c(T: float) -> str:
    return f"{T - 273.15:.2f}"


def _table(rows, title):
    lines = [title, "-" * len(title)]
    wq = max(len(q) for q, _, _ in rows)
    wv = max(len(v) for _, v, _ in rows)
    for q, v, u in rows:
        lines.append(f"  {q:<{wq}}  {v:>{wv}}  {u}")
    return lines


def render_text(r, version: str = "") -> str:
    d = r.design
    rows = [
        ("heat load", f"{r.load:.4g}", "W"),
        ("coolant flow", f"{r.V_dot * 6e4:.4g}", "L/min"),
        ("thermal resistance", f"{r.R_th:.4f}", "K/W  (hottest mounting face - inlet) / load"),
        ("mounting face, hottest", _c(r.T_face_max), f"degC  at {r.x_hot * 1e3:.1f} mm from the inlet edge"),
        ("plate top, hottest", _c(r.T_plate_max), "degC"),
        ("inlet / outlet water", f"{_c(r.T_in)} / {_c(r.T_out)}", "degC"),
        ("pressure drop (plate)", f"{r.dp / 1e3:.3f}", f"kPa  (friction {r.dp_friction / 1e3:.3f} kPa)"),
        ("velocity in passage", f"{r.velocity:.3f}", "m/s"),
        ("Reynolds / Prandtl", f"{r.Re:.0f} / {r.Pr:.2f}", r.regime),
        ("Nusselt / heat transfer coeff.", f"{r.Nu:.2f} / {r.h:.0f}", "- / W/(m² K)"),
    ]
    if r.eta_fin is not None:
        rows.append(("fin efficiency of walls", f"{r.eta_fin:.3f}", "-"))
    if d.supply.once_through:
        rows.append(("water use (once-through)", f"{r.water_use_L_per_day:,.0f}",
                     f"L/day at {d.supply.hours_per_day:g} h/day  ({r.water_use_m3_per_year:,.1f} m³/year)"))
    else:
        rows.append(("water use", "none", "the water returns to its loop"))
    rows += [
        (f"room {r.dew_kind}", _c(r.T_dew),
         f"degC  (room {_c(d.room.temperature)} degC, {d.room.relative_humidity * 100:.0f} % RH)"),
    ]
    out = [f"{d.title}", "=" * min(len(d.title), WIDTH),
           f"passage: {r.geometry.description}",
           f"coolant: {d.coolant.label()}; supply: {d.supply.source}", ""]
    out += _table(rows, "Result")
    out.append("")
    parts = [(name, f"{value:.4f}", f"K/W  {100 * value / r.R_th:5.1f} %") for name, value in r.resistances]
    parts.append(("total", f"{r.R_th:.4f}", "K/W"))
    out += _table(parts, "Thermal resistance, hottest point to inlet water")
    out.append("")
    out += module_text(getattr(r, "module", None))
    out += supply_lines(r, _table)
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
    for f in r.findings:
        head = f"[{f.severity.upper()}] {f.id}: "
        out += textwrap.wrap(head + f.message, WIDTH, subsequent_indent="    ")
        out += textwrap.wrap("What to do: " + f.action, WIDTH, initial_indent="    ", subsequent_indent="    ")
    if version:
        out += ["", f"coldplate {version}"]
    return "\n".join(out) + "\n"
