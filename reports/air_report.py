"""The air-cooled alternative in the outputs: its JSON object (key ``air``), its text lines and its report
section with the side-by-side comparison.  Formatting only, against the field names of coldplate.air.result.
"""
from __future__ import annotations

import math

from .display_units import DisplayUnits, annotate, format_number
from .report_model import Row, Section

_DRIVES = {"fan": "fan (curve and sink's system curve intersected)", "velocity": "given approach velocity",
           "natural": "natural convection, fins vertical"}


def _c(T):
    return None if T is None or not math.isfinite(T) else T - 273.15


def _f(x):
    return None if x is None or not math.isfinite(x) else float(x)


def air_to_dict(r) -> dict:
    """``{"air": {...}}`` when the design has [air], else nothing (SI; temperatures in degC)."""
    a = getattr(r, "air", None)
    if a is None:
        return {}
    s = a.sink
    out = {
        "holds_face_limit": a.holds,
        "face_limit_C": _c(a.face_limit),
        "face_limit_from": a.face_limit_from,
        "margin_K": _f(a.margin),
        "hottest_face_C": _c(s.T_face_max),
        "water_design_hottest_face_C": _c(a.water_face),
        "water_saved_L_per_year": a.water_m3_per_year * 1000.0 if a.holds else 0.0,
        "sink": {
            "fins": s.fins, "fin_thickness_m": s.fin_thickness, "fin_height_m": s.fin_height, "gap_m": s.gap,
            "base_m": s.base, "length_m": s.length, "width_m": s.width, "height_m": s.height,
            "material": s.material, "mass_kg": s.mass,
        },
        "drive": s.drive,
        "air_flow_m3_per_s": s.flow,
        "air_velocity_in_fins_m_per_s": s.velocity,
        "pressure_drop_Pa": s.dp,
        "fan_air_power_W": s.fan_power,
        "reynolds_number": s.Re,
        "regime": s.regime,
        "nusselt_number": s.Nu,
        "heat_transfer_coefficient_W_per_m2K": s.h,
        "fin_efficiency": s.eta_fin,
        "air_inlet_C": _c(s.T_air_in),
        "air_outlet_C": _c(s.T_air_out),
        "air_pressure_Pa": a.pressure,
        "resistances_K_per_W": {"air_rise": s.R_air_rise, "fins_to_air": s.R_fins, "base_spreading": s.R_spreading,
                                "interface": s.R_interface, "total": s.R_th},
        "load_W": s.load,
        "base_rise_K": s.base_rise,
        "optimum_spacing_m": s.optimum_spacing,
        "candidates": a.candidates,
        "candidates_holding_limit": a.feasible,
        "shop_limits": {"thinnest_fin_m": a.shop_limits[0], "narrowest_gap_m": a.shop_limits[1],
                        "from": a.shop_limits[2]},
        "comparison": [{"quantity": c.quantity, "water": c.water, "air": c.air,
                        "unit": {"temperature": "degC", "volume_per_year": "m3/year", "power": "W",
                                 "length": "m", "mass": "kg"}[c.kind]}
                       for c in (_comparison_c(x) for x in a.comparison)],
        "methods": [{"role": m.role, "method": m.method, "reference": m.reference, "outside": list(m.outside)}
                    for m in a.methods],
        "module_refused": a.module_refused or None,
    }
    m = a.module
    if m is not None:
        out["module"] = {"current_A": m.current, "cold_face_temperature_C": _c(m.T_cold),
                         "hot_face_temperature_C": _c(m.T_hot), "heat_into_sink_W": m.Q_hot,
                         "electrical_power_W": m.power, "cop": _f(m.cop), "coldest_current_A": m.coldest_current,
                         "sweep_stopped": m.sweep.stopped or None}
    return {"air": out}


def _comparison_c(c):
    if c.kind != "temperature":
        return c
    return type(c)(c.quantity, c.kind, _c(c.water), _c(c.air))


def _cell(u: DisplayUnits, kind: str, x) -> str:
    if x is None or (isinstance(x, float) and not math.isfinite(x)):
        return "-"
    return u.fmt(kind, x)


def comparison_table(a, u: DisplayUnits) -> tuple[tuple[str, ...], ...]:
    head = ("", "water design", "air sink", "unit")
    body = tuple((c.quantity, _cell(u, c.kind, c.water), _cell(u, c.kind, c.air), u.label(c.kind))
                 for c in a.comparison)
    return (head, *body)


def _verdict(a, u: DisplayUnits) -> str:
    s = a.sink
    if a.module_refused:
        return annotate("On the best air sink the modules have no steady state: " + a.module_refused, u)
    if a.holds:
        return (f"The air sink holds the face limit ({u.text('temperature', a.face_limit)}, {a.face_limit_from}) "
                f"with {u.text('temperature_difference', a.margin)} to spare.")
    return (f"The best air sink misses the face limit ({u.text('temperature', a.face_limit)}, {a.face_limit_from}) "
            f"by {u.text('temperature_difference', -a.margin)} (hottest face {u.text('temperature', s.T_face_max)}).")


def air_section(a, u: DisplayUnits, figures) -> Section:
    s = a.sink
    rows = [
        Row("fins", f"{s.fins}, {u.text('length', s.fin_thickness)} thick and {u.text('length', s.fin_height)} "
                    f"high, gap {u.text('length', s.gap)}", ""),
        Row("base / sink length × width × height", f"{u.fmt('length', s.base)} / {u.fmt('length', s.length)} × "
                               f"{u.fmt('length', s.width)} × {u.fmt('length', s.height)}", u.label("length")),
        Row("material", s.material, ""),
        Row("mass", u.fmt("mass", s.mass), u.label("mass"), "air.sink.mass_kg"),
        Row("air drive", _DRIVES[s.drive], ""),
        Row("hottest mounting face", u.fmt("temperature", s.T_face_max), u.label("temperature"),
            "air.hottest_face_C"),
        Row("thermal resistance, face to inlet air", u.fmt("thermal_resistance", s.R_th),
            u.label("thermal_resistance"), "air.resistances_K_per_W.total"),
        Row("heat transfer coefficient / fin efficiency", f"{u.fmt('heat_transfer_coefficient', s.h)} / "
                                                          f"{format_number(s.eta_fin, digits=3)}",
            u.label("heat_transfer_coefficient")),
    ]
    if s.flow is not None:
        rows += [Row("air flow / pressure drop", f"{u.fmt('air_flow', s.flow)} / {u.fmt('air_pressure', s.dp)}",
                     f"{u.label('air_flow')} / {u.label('air_pressure')}"),
                 Row("fan's air power", u.fmt("power", s.fan_power), u.label("power"), "air.fan_air_power_W"),
                 Row("air in / out", f"{u.fmt('temperature', s.T_air_in)} / {u.fmt('temperature', s.T_air_out)}",
                     u.label("temperature")),
                 Row("Reynolds number in the fins / regime", f"{format_number(s.Re)} / {s.regime}", "")]
    else:
        rows.append(Row("base above the room air / optimum spacing (Bar-Cohen & Rohsenow)",
                        f"{u.fmt('temperature_difference', s.base_rise)} / {u.fmt('length', s.optimum_spacing)}",
                        f"{u.label('temperature_difference')} / {u.label('length')}"))
    paras = [_verdict(a, u),
             f"Searched {a.candidates:,} layouts of fin count, thickness and height in the envelope (thinnest fin "
             f"{u.text('length', a.shop_limits[0])}, narrowest gap {u.text('length', a.shop_limits[1])}, from "
             f"{a.shop_limits[2]}); {a.feasible:,} hold the limit."]
    return Section("air", "The air-cooled alternative", tuple(paras), rows=tuple(rows),
                   table=comparison_table(a, u), figures=figures)


def air_text(a, units: str = "si") -> list[str]:
    """The text lines: the verdict, the sink and the comparison."""
    if a is None:
        return []
    u = DisplayUnits(units)
    sec = air_section(a, u, ())
    out = ["The air-cooled alternative", "--------------------------"]
    out += [f"  {p}" for p in sec.paragraphs]
    w = max(len(r.label) for r in sec.rows)
    out += [f"  {r.label:<{w}}  {r.value} {r.unit}".rstrip() for r in sec.rows]
    table = comparison_table(a, u)
    widths = [max(len(row[i]) for row in table) for i in range(4)]
    out += ["  " + "  ".join(cell.ljust(widths[i]) for i, cell in enumerate(row)).rstrip() for row in table]
    out.append("")
    return out
