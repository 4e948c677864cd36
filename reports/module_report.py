"""The thermoelectric stage in the reports: JSON keys and the text section with the current sweep.

Only formatting: every number comes from ``Result.module``.
"""
from __future__ import annotations

import math


def _c(T: float) -> float:
    return T - 273.15


def _num(x: float):
    """JSON has no NaN or infinity: undefined values (COP with no power drawn) become null."""
    return x if math.isfinite(x) else None


def module_to_dict(m) -> dict:
    """The module's keys for the JSON object (empty when there are no modules)."""
    if m is None:
        return {}
    s = m.sweep
    return {
        "cold_face_temperature_C": _c(m.T_cold),
        "hot_face_temperature_C": _c(m.T_hot),
        "module_current_A": m.current,
        "module_voltage_V": m.voltage,
        "electrical_power_W": m.power,
        "cop": _num(m.cop),
        "heat_into_plate_W": m.Q_hot,
        "coldest_current_A": m.coldest_current,
        "module": {
            "count": m.count, "wiring": m.wiring, "strings": m.strings, "mode": m.mode,
            "array_current_A": m.array_current, "array_voltage_V": m.array_voltage,
            "cold_load_W": m.Q_cold, "load_temperature_C": _c(m.T_load),
            "coldest_cold_face_temperature_C": _c(m.T_cold_coldest), "best_cop_current_A": m.best_cop_current,
            "max_current_A": m.max_current, "hot_side_limit_C": _c(m.hot_side_limit),
            "dew_point_C": _c(m.T_dew), "dew_margin_K": m.dew_margin,
            "plate_resistance_K_per_W": m.R_plate, "runaway_slope": m.runaway_slope,
            "seebeck_V_per_K": m.parameters[0], "resistance_ohm": m.parameters[1],
            "conductance_W_per_K": m.parameters[2], "max_heat_model_W": m.max_heat_model,
            "modules": [placed_to_dict(p) for p in m.placed],
            "sweep": {"current_A": list(s.current), "cold_face_temperature_C": [_c(t) for t in s.T_cold],
                      "hot_face_temperature_C": [_c(t) for t in s.T_hot], "cop": [_num(x) for x in s.cop],
                      "electrical_power_W": list(s.power), "heat_into_plate_W": list(s.Q_hot),
                      "stopped": s.stopped or None},
        },
    }


def placed_to_dict(p) -> dict:
    """One placed module's JSON object."""
    return {"name": p.name, "at_m": list(p.at), "hot_face_temperature_C": _c(p.T_hot),
            "cold_face_temperature_C": _c(p.T_cold), "heat_into_plate_W": p.Q_hot, "heat_pumped_W": p.Q_cold,
            "module_current_A": p.current, "module_voltage_V": p.voltage, "electrical_power_W": p.power,
            "runaway_slope": p.runaway_slope, "hot_side_limit_margin_K": p.limit_margin}


def placed_text(m, _t, _w, _d, deg: str, heat: str, diff: str) -> list[str]:
    """The text rows of each placed module (empty when the modules are not placed)."""
    if not m.placed:
        return []
    out = ["", "  each placed module (the figures above are the worst module's: hottest hot face, warmest cold face;",
           "  the current above is the design's per module)",
           f"  {'module':<10}  {'at mm':>13}  {'hot ' + deg:>8}  {'cold ' + deg:>9}  {'to plate ' + heat:>12}  "
           f"{'pumped ' + heat:>10}  {'A':>6}  {'V':>6}  {'power ' + heat:>9}  {'slope':>6}  {'margin ' + diff:>11}"]
    for p in m.placed:
        at = f"{p.at[0] * 1e3:.0f}, {p.at[1] * 1e3:+.0f}"
        out.append(f"  {p.name:<10}  {at:>13}  {_t(p.T_hot):8.2f}  {_t(p.T_cold):9.2f}  {_w(p.Q_hot):12.2f}  "
                   f"{_w(p.Q_cold):10.2f}  {p.current:6.3f}  {p.voltage:6.3f}  {_w(p.power):9.2f}  "
                   f"{p.runaway_slope:6.3f}  {_d(p.limit_margin):+11.1f}")
    return out


#: Rows of the text sweep table (of the sweep's points, evenly spaced).
TEXT_ROWS = 11


def module_text(m, units: str = "si") -> list[str]:
    """The text section: the operating point and a small table of the current sweep.

    ``units="us"`` shows temperatures in degF and heat in BTU/h (reports.display_units); the default is SI.
    """
    if m is None:
        return []
    if units == "us":
        from .display_units import DisplayUnits

        du = DisplayUnits("us")
        deg, heat, diff = "degF", "BTU/h", "degF"

        def _t(T):
            return du.value("temperature", T)

        def _w(Q):
            return du.value("power", Q)

        def _d(dT):
            return du.value("temperature_difference", dT)
    else:
        deg, heat, diff = "degC", "W", "K"
        _t, _w = _c, (lambda Q: Q)

        def _d(dT):
            return dT
    wiring = m.wiring if m.wiring != "series-parallel" else f"{m.strings} strings of {m.count // m.strings}"
    cop = f"{m.cop:.3f}" if math.isfinite(m.cop) else "-"
    rows = [
        ("modules", f"{m.count}", f"wired {wiring}; S {m.parameters[0]:.4g} V/K, R {m.parameters[1]:.4g} ohm, "
                                  f"K {m.parameters[2]:.4g} W/K each"),
        ("current / voltage per module", f"{m.current:.3f} / {m.voltage:.3f}",
         "A / V" + ("  (set to reach the target cold face)" if m.mode == "target" and not m.shortfall else
                   "  (the coldest current: the target cold face is out of reach)" if m.mode == "target" else "")),
        ("supply current / voltage", f"{m.array_current:.3f} / {m.array_voltage:.3f}", "A / V"),
        ("cold face / hot face", f"{_t(m.T_cold):.2f} / {_t(m.T_hot):.2f}",
         f"{deg}  (hot-face limit {_t(m.hot_side_limit):.0f} {deg})"),
        ("load temperature", f"{_t(m.T_load):.2f}", f"{deg}  (beyond the cold-side path)"),
        ("cold load / electrical power", f"{_w(m.Q_cold):.4g} / {_w(m.power):.4g}", heat),
        ("heat into the plate", f"{_w(m.Q_hot):.4g}", heat),
        ("COP", cop, "-"),
        ("coldest current", f"{m.coldest_current:.3f}", f"A per module  (cold face {_t(m.T_cold_coldest):.2f} {deg})"),
        ("best-COP current", f"{m.best_cop_current:.3f}", "A per module  (least current reaching this cold face)"),
        ("cold face - room dew/frost point", f"{_d(m.dew_margin):+.1f}", diff),
    ]
    wq = max(len(q) for q, _, _ in rows)
    wv = max(len(v) for _, v, _ in rows)
    out = ["Thermoelectric modules", "----------------------"]
    out += [f"  {q:<{wq}}  {v:>{wv}}  {u}" for q, v, u in rows]
    out += placed_text(m, _t, _w, _d, deg, heat, diff)
    s = m.sweep
    n = len(s.current)
    idx = sorted({round(i * (n - 1) / (TEXT_ROWS - 1)) for i in range(TEXT_ROWS)}) if n > 1 else [0]
    which = "; the warmest cold face, the hottest hot face" if m.placed else ""
    out += ["", f"  current sweep (per module{which}; power and heat for the whole array)",
            f"  {'A':>6}  {'cold ' + deg:>9}  {'hot ' + deg:>8}  {'COP':>6}  {'power ' + heat:>8}  "
            f"{'to plate ' + heat:>10}"]
    for i in idx:
        c = f"{s.cop[i]:.3f}" if math.isfinite(s.cop[i]) else "-"
        out.append(f"  {s.current[i]:6.2f}  {_t(s.T_cold[i]):9.2f}  {_t(s.T_hot[i]):8.2f}  {c:>6}  "
                   f"{abs(_w(s.power[i])) if s.power[i] == 0 else _w(s.power[i]):8.1f}  {_w(s.Q_hot[i]):10.1f}")
    if s.stopped:
        out.append(f"  (stops: {s.stopped})")
    if m.coldest_current < m.max_current * (1 - 1e-6):
        out.append(f"  coldest cold face at {m.coldest_current:.2f} A; more current makes it warmer")
    else:
        out.append("  the cold face is still cooling at I_max: no turning point within the module's rating")
    out.append("")
    return out
