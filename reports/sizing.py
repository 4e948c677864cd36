"""The output of ``coldplate size``: text and one JSON object.  Formatting only: every number comes from the
:class:`coldplate.sizing.recommend.SizingResult` it is given."""
from __future__ import annotations

import json
import textwrap

from .jsonout import check_to_dict

WIDTH = 92
#: Rows of the trade-off front shown in the text (all of them are in the JSON).
FRONT_ROWS = 25
_SHOW = {  # variable -> (heading, scale from SI, format)
    "count": ("channels", 1, "{:.0f}"), "passes": ("passes", 1, "{:.0f}"),
    "width": ("width mm", 1e3, "{:.3g}"), "depth": ("depth mm", 1e3, "{:.3g}"),
    "inner_diameter": ("bore mm", 1e3, "{:.3g}"), "base": ("base mm", 1e3, "{:.3g}"),
    "flow": ("L/min", 6e4, "{:.3g}"),
    "plenum_depth": ("plenum mm", 1e3, "{:.3g}"), "inlet_port": ("in port mm", 1e3, "{:+.3g}"),
    "outlet_port": ("out port mm", 1e3, "{:+.3g}"),
}


def _row(c, names, design):
    cells = [_SHOW[n][2].format(c.value(n) * _SHOW[n][1]) for n in names]
    water = f"{c.flow * 1e3 * 3600 * design.supply.hours_per_day:,.0f}" if design.supply.once_through else "-"
    return cells + [f"{c.R_th:.4f}", f"{c.dp / 1e3:.2f}", water, f"{c.T_face - 273.15:.1f}", f"{c.T_out - 273.15:.1f}"]


def _grid(rows, heads):
    widths = [max(len(h), *(len(r[i]) for r in rows)) for i, h in enumerate(heads)]
    out = ["  " + "  ".join(h.rjust(w) for h, w in zip(heads, widths))]
    out += ["  " + "  ".join(c.rjust(w) for c, w in zip(r, widths)) for r in rows]
    return out


def describe_axis(name: str, values) -> str:
    """One line: the variable and its values in the usual units."""
    scale, unit = {"flow": (6e4, "L/min"), "count": (1, ""), "passes": (1, "")}.get(name, (1e3, "mm"))
    if values.size == 1:
        return f"{name} {values[0] * scale:.4g} {unit}".rstrip()
    return f"{name} {values.size} values {values.min() * scale:.4g} to {values.max() * scale:.4g} {unit}".rstrip()


def render_sizing_text(s, version: str = "") -> str:
    d, o, spec = s.design, s.outcome, s.spec
    out = [f"Sizing: {d.title}", "=" * min(len("Sizing: " + d.title), WIDTH)]
    out.append(f"searched ({spec.kind}): " + "; ".join(describe_axis(n, spec.axes[n]) for n in spec.axes))
    out.append(f"candidates: {o.candidates:,} buildable ({o.unbuildable:,} more do not fit the plate), "
               f"{o.evaluated:,} evaluated in {o.seconds:.2f} s, {o.feasible:,} meet every limit")
    out += [f"note: {n}" for n in s.notes]
    out.append("")
    names = tuple(spec.axes)
    heads = [_SHOW[n][0] for n in names] + ["R K/W", "dp kPa", "L/day", "face °C", "out °C"]
    if o.pareto:
        title = f"Trade-off front: thermal resistance, pressure drop, water ({len(o.pareto)} designs)"
        out += [title, "-" * len(title)]
        picks = sorted({round(i * (len(o.pareto) - 1) / (FRONT_ROWS - 1)) for i in range(FRONT_ROWS)})
        shown = [o.pareto[i] for i in picks] if len(o.pareto) > FRONT_ROWS else o.pareto
        out += _grid([_row(c, names, d) for c in shown], heads)
        if len(o.pareto) > FRONT_ROWS:
            out.append(f"  ({len(shown)} of {len(o.pareto)} shown, spread from least to most flow; "
                       "all in --format json)")
        out.append("")
    if s.recommended is None:
        out += ["No design found", "---------------"]
        for line in s.binding:
            out += textwrap.wrap(line, WIDTH, initial_indent="  ", subsequent_indent="    ")
    else:
        out += ["Recommended", "-----------"]
        out += _grid([_row(s.recommended, names, d)], heads)
        out.append("  (the row above: the search, network model)")
        n = getattr(s, "network_check", None)
        if n is not None and s.check is not None:
            f = s.check
            out.append(f"  R K/W      network {n.R_th:.4f}   field {f.R_th:.4f}   "
                       f"difference {(f.R_th / n.R_th - 1) * 100:+.1f} %")
            out.append(f"  face °C    network {n.T_face_max - 273.15:.1f}     field {f.T_face_max - 273.15:.1f}     "
                       f"difference {f.T_face_max - n.T_face_max:+.2f} K")
        out.append("")
        out.append("Why")
        for line in s.why:
            out += textwrap.wrap(line, WIDTH, initial_indent="  - ", subsequent_indent="    ")
        r = s.check
        out.append("")
        out.append(f"Findings of the one-design check on the recommendation ({len(r.findings)})")
        for f in r.findings:
            out += textwrap.wrap(f"[{f.severity.upper()}] {f.id}: {f.message}", WIDTH, initial_indent="  ",
                                 subsequent_indent="    ")
            out += textwrap.wrap("What to do: " + f.action, WIDTH, initial_indent="    ", subsequent_indent="    ")
    if version:
        out += ["", f"coldplate {version}"]
    return "\n".join(out) + "\n"


def _candidate(c, design):
    return {"variables_SI": dict(c.values), "thermal_resistance_K_per_W": c.R_th, "pressure_drop_Pa": c.dp,
            "flow_m3_per_s": c.flow,
            "water_use_L_per_day": c.flow * 1e3 * 3600 * design.supply.hours_per_day
            if design.supply.once_through else 0.0,
            "surface_temperature_max_C": c.T_face - 273.15, "outlet_temperature_C": c.T_out - 273.15,
            "velocity_m_per_s": c.velocity, "reynolds": c.Re}


def sizing_to_dict(s, version: str = "") -> dict:
    d, o, spec = s.design, s.outcome, s.spec
    lim = spec.limits
    return {
        "title": d.title,
        "software_version": version,
        "passage_kind": spec.kind,
        "axes_SI": {n: v.tolist() for n, v in spec.axes.items()},
        "limits_SI": {"face_limit_K": lim.face, "pressure_drop_limit_Pa": lim.pressure_drop,
                      "pressure_limit_source": lim.pressure_source, "discharge_limit_K": lim.discharge,
                      "min_width_m": lim.min_width, "min_wall_m": lim.min_wall,
                      "max_thickness_m": lim.max_thickness, "max_water_m3_per_s": lim.max_water},
        "candidates": o.candidates, "unbuildable": o.unbuildable, "evaluated": o.evaluated,
        "feasible": o.feasible, "seconds": o.seconds, "interrupted": o.interrupted,
        "limit_counts": [{"limit": c.name, "value_SI": c.limit, "failed": c.failed, "failed_only_this": c.only,
                          "nearest_SI": c.nearest} for c in o.limits],
        "pareto": [_candidate(c, d) for c in o.pareto],
        "grid_best": _candidate(o.best, d) if o.best else None,
        "refined": _candidate(s.refinement.result, d) if s.refinement and s.refinement.result else None,
        "recommended": _candidate(s.recommended, d) if s.recommended else None,
        "why": list(s.why),
        "binding": list(s.binding),
        "notes": list(s.notes),
        "check": check_to_dict(s.check, version) if s.check else None,
        "recheck": ({"search_model": "network", "check_model": s.check.model,
                     "network_thermal_resistance_K_per_W": s.network_check.R_th,
                     "field_thermal_resistance_K_per_W": s.check.R_th,
                     "field_minus_network_percent": (s.check.R_th / s.network_check.R_th - 1) * 100,
                     "network_surface_temperature_max_C": s.network_check.T_face_max - 273.15,
                     "field_surface_temperature_max_C": s.check.T_face_max - 273.15}
                    if s.check is not None and getattr(s, "network_check", None) is not None else None),
        "design_file": s.text,
    }


def front_rows(s) -> list[dict]:
    """The trade-off front, one flat dict a design (SI, the units in the names): for CSV and data frames."""
    rows = []
    for c in s.outcome.pareto:
        d = _candidate(c, s.design)
        rows.append({**{f"{n}_SI": v for n, v in d.pop("variables_SI").items()}, **d})
    return rows


def render_sizing_csv(s) -> str:
    """The trade-off front as CSV (``coldplate size --format csv``): one row a design, SI."""
    import csv
    import io

    rows = front_rows(s)
    buf = io.StringIO()
    heads = list(rows[0]) if rows else [f"{n}_SI" for n in s.spec.axes]  # no front: the header of its axes
    w = csv.DictWriter(buf, fieldnames=heads, lineterminator="\n")
    w.writeheader()
    for row in rows:
        w.writerow({k: f"{v:.8g}" for k, v in row.items()})
    return buf.getvalue()


def render_sizing_html(s, version: str = "") -> str:
    """The sizing summary for a notebook: the text summary as preformatted text, then the recommendation's check
    summary (no scripts)."""
    from html import escape

    from .content import summary
    from .html import render_summary_html

    parts = ['<div class="coldplate-sizing">', f"<pre>{escape(render_sizing_text(s, version))}</pre>"]
    if s.check is not None:
        parts.append(render_summary_html(*summary(s.check), version))
    return "\n".join(parts + ["</div>"]) + "\n"


def render_sizing_json(s, version: str = "") -> str:
    return json.dumps(sizing_to_dict(s, version), indent=2, ensure_ascii=False)
