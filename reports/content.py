"""What a design report says, gathered once for both layouts (HTML and Markdown).

Formatting only: every number comes from the solved result, the flow curve and its fit (computed in
``coldplate.curves``), or the optional thermoelectric and supply results; this module converts units for
display and chooses words.  Sections for ``result.module``, ``result.circuit`` and ``result.planning`` appear
only when the field exists and is not None.
"""
from __future__ import annotations

import dataclasses
import hashlib
import math
from .display_units import DisplayUnits, annotate, exact_values, format_number, passage_line
from .air_report import air_section
from .flow_split import split_section
from .uncertainty import uncertainty_section
from .optional_sections import (circuit_section, field_section, module_inputs, module_section, planning_section,
                                source_rows)
from .text import model_line


from .report_model import Figure, Finding, Report, Row, Section  # noqa: F401 (re-exported)

STANDING_CAUTION = (
    "This report gives engineering estimates, not approval. Water near mains-powered electronics, a connection "
    "to the drinking-water supply, hot discharge, condensation on live circuits and pressure on a box not rated "
    "for it can hurt people and property.")

#: Passage fields that are lengths (shown in the display length unit); other numbers are shown as they are.
_LENGTH_FIELDS = {"width", "depth", "plenum_length", "port_diameter", "roughness", "inner_diameter",
                  "outer_diameter", "bend_radius", "height", "inlet_port", "outlet_port", "plenum_depth"}


def finding_counts(findings) -> str:
    """'6: 1 warning, 3 cautions, 2 notes', in the order the findings come (most severe first)."""
    counts: dict[str, int] = {}
    for f in findings:
        counts[f.severity] = counts.get(f.severity, 0) + 1
    if not counts:
        return "none"
    parts = ", ".join(f"{n} {sev}{'s' if n > 1 else ''}" for sev, n in counts.items())
    return f"{len(findings)}: {parts}"


def sha256_text(data: bytes) -> str:
    return hashlib.sha256(data).hexdigest()


_SOURCE_WORDS = {"potable": "the building's drinking-water supply", "recirculating": "a recirculating loop",
                 "process": "a process loop"}


def job_line(r, u: DisplayUnits) -> str:
    d = r.design
    where = "once-through to a drain" if d.supply.once_through else "returning to its loop"
    return (f"Carry {u.text('power', r.load)} from a {u.fmt('length', d.heat.footprint_length)} × "
            f"{u.text('length', d.heat.footprint_width)} footprint into the "
            f"{u.fmt('length', d.plate.length)} × {u.text('length', d.plate.width)} "
            f"{d.plate.material or 'plate'} plate ({passage_line(r.geometry, u)}), cooled by "
            f"{u.text('flow', r.V_dot)} of {d.coolant.label()} at {u.text('temperature', r.T_in)} "
            f"from {_SOURCE_WORDS.get(d.supply.source, d.supply.source)}, {where}.")


def _inputs(r, u: DisplayUnits) -> Section:
    d = r.design
    load = (Row("heat load", u.fmt("power", d.heat.load), u.label("power")) if math.isfinite(d.heat.load)
            else Row("heat load", "the modules' hot-side heat, solved", ""))
    rows = [
        load,
        Row("footprint (along × across the flow)",
            f"{u.fmt('length', d.heat.footprint_length)} × {u.fmt('length', d.heat.footprint_width)}",
            u.label("length")),
        Row("interface", annotate(d.interface.described_as, u), ""),
        Row("interface resistance per area", u.fmt("area_resistance", d.interface.resistance_area),
            u.label("area_resistance")),
        Row("plate material", d.plate.material or "(conductivity given)", ""),
        Row("plate conductivity", u.fmt("conductivity", d.plate.conductivity), u.label("conductivity")),
        Row("plate length × width",
            f"{u.fmt('length', d.plate.length)} × {u.fmt('length', d.plate.width)}", u.label("length")),
        Row("base (face to passage roof)", u.fmt("length", d.plate.base), u.label("length")),
    ]
    if d.plate.pressure_rating is not None:
        rows.append(Row("plate pressure rating (gauge)", u.fmt("pressure", d.plate.pressure_rating, 3),
                        u.label("pressure")))
    rows.append(Row("passage", d.passage.kind, ""))
    for f in dataclasses.fields(d.passage):
        v = getattr(d.passage, f.name)
        if f.name == "kind" or v is None:
            continue
        if f.name in _LENGTH_FIELDS:
            rows.append(Row(f"passage {f.name.replace('_', ' ')}", u.fmt("length", v, 3), u.label("length")))
        else:
            rows.append(Row(f"passage {f.name.replace('_', ' ')}", str(v), ""))
    rows += module_inputs(d.module, u)
    rows += [
        Row("coolant", d.coolant.label(), ""),
        Row("inlet temperature", u.fmt("temperature", d.inlet_temperature), u.label("temperature")),
        Row("flow", u.fmt("flow", d.flow), u.label("flow")) if d.flow is not None
        else Row("flow", "set by the supply circuit", ""),
        Row("supply source / discharge", f"{d.supply.source} / {d.supply.discharge}", ""),
        Row("hours a day / days a year", f"{d.supply.hours_per_day:g} / {d.supply.days_per_year:g}", ""),
    ]
    if d.supply.static_pressure is not None:
        rows.append(Row("static supply pressure (gauge)", u.fmt("pressure", d.supply.static_pressure),
                        u.label("pressure")))
    rows += [
        Row("discharge temperature limit", u.fmt("temperature", d.supply.discharge_limit), u.label("temperature")),
        Row("room air", f"{u.fmt('temperature', d.room.temperature)} {u.label('temperature')}, "
                        f"{d.room.relative_humidity * 100:.0f} % RH", ""),
        Row("correlations (laminar / turbulent)", f"{d.model.laminar} / {d.model.turbulent}", ""),
        Row("segments along the flow", str(d.model.segments), ""),
    ]
    return Section("inputs", "Inputs", rows=tuple(rows))


def _headline(r, u: DisplayUnits) -> tuple[Row, ...]:
    rows = [
        Row("thermal resistance, (hottest mounting face − inlet) / load", u.fmt("thermal_resistance", r.R_th),
            u.label("thermal_resistance"), "thermal_resistance_K_per_W"),
        Row("hottest mounting face", u.fmt("temperature", r.T_face_max), u.label("temperature"),
            "surface_temperature_max_C"),
        Row("hottest point from the inlet edge", u.fmt("length", r.x_hot), u.label("length"),
            "hot_spot_from_inlet_edge_m"),
        Row("inlet water", u.fmt("temperature", r.T_in), u.label("temperature"), "inlet_temperature_C"),
        Row("outlet water", u.fmt("temperature", r.T_out), u.label("temperature"), "outlet_temperature_C"),
        Row("heat load", u.fmt("power", r.load), u.label("power"), "heat_load_W"),
        Row("flow", u.fmt("flow", r.V_dot), u.label("flow"), "flow_m3_per_s"),
        Row("pressure drop (plate)", u.fmt("pressure", r.dp), u.label("pressure"), "pressure_drop_Pa"),
        Row("velocity in passage", u.fmt("velocity", r.velocity), u.label("velocity"), "velocity_m_per_s"),
        Row("Reynolds number", format_number(r.Re), f"({r.regime})", "reynolds"),
        Row("heat transfer coefficient, length mean", u.fmt("heat_transfer_coefficient", r.h),
            u.label("heat_transfer_coefficient"), "heat_transfer_coefficient_W_per_m2K"),
        Row("heat transfer coefficient at the hottest point", u.fmt("heat_transfer_coefficient", r.h_hot),
            u.label("heat_transfer_coefficient"), "heat_transfer_coefficient_hot_spot_W_per_m2K"),
        Row(f"room {r.dew_kind}", u.fmt("temperature", r.T_dew), u.label("temperature"), "dew_point_C"),
        Row("boiling point in the plate", u.fmt("temperature", r.T_boil), u.label("temperature"),
            "boiling_point_C"),
    ]
    if r.design.supply.once_through:
        rows.append(Row("water use (once-through)", u.fmt("volume_per_day", r.water_use_L_per_day),
                        u.label("volume_per_day"), "water_use_L_per_day"))
        rows.append(Row("water use a year", u.fmt("volume_per_year", r.water_use_m3_per_year),
                        u.label("volume_per_year"), "water_use_m3_per_year"))
    else:
        rows.append(Row("water use", "none", "the water returns to its loop"))
    return tuple(rows)


def _breakdown(r, u: DisplayUnits, figures) -> Section:
    rows = [Row(name, u.fmt("thermal_resistance", v), f"{u.label('thermal_resistance')}  "
                                                       f"({100 * v / r.R_th:.1f} %)")
            for name, v in r.resistances]
    rows.append(Row("total", u.fmt("thermal_resistance", r.R_th), u.label("thermal_resistance")))
    return Section("breakdown", "Thermal resistance breakdown",
                   ("From the hottest point of the mounting face to the inlet water, in path order; "
                    "the parts add up to the total.",), rows=tuple(rows), figures=figures)


def _flow(curve, fit, u: DisplayUnits, figures, module: bool = False) -> Section:
    load = (f"the operating point's plate load of {u.text('power', curve.load)} (the modules' hot-side heat, "
            "held fixed)" if module else f"the design load of {u.text('power', curve.load)}")
    paras = [f"The plate solved at {len(curve.V_dot)} flows from {u.text('flow', min(curve.V_dot), 3)} to "
             f"{u.text('flow', max(curve.V_dot), 3)} at {load}; the design point is marked.",
             "Fitted flow curves for system models (SI: V̇ in m³/s, Δp in Pa, R in K/W; R0 is the part no "
             "flow removes, computed from the plate, not fitted; the command 'coldplate curves' exports the "
             "points and these formulas as CSV or JSON): "
             f"Δp = {fit.a:.5g}·V̇ + {fit.b:.5g}·V̇², largest error {100 * fit.dp_max_error:.1f} %; "
             f"R = {fit.R0:.5g} + {fit.c:.5g}·V̇^(−{fit.n:.4f}), largest error {100 * fit.R_max_error:.1f} %; "
             f"fitted over {fit.V_min:.4g} to {fit.V_max:.4g} m³/s."]
    if curve.skipped:
        n = len(curve.skipped)
        paras.append(f"Left out {n} flow{'s' if n > 1 else ''} at or below "
                     f"{u.text('flow', max(v for v, _ in curve.skipped), 3)}, where the flow "
                     f"{curve.skipped[0][1].rstrip('.')}.")
    return Section("flow", "Thermal resistance and pressure drop against flow", tuple(paras), figures=figures)


def _methods(r) -> Section:
    head = ("role", "method", "validity range", "this design", "status", "reference")
    body = []
    for m in r.methods:
        here = ", ".join(f"{k} = {format_number(v)}" for k, v in m.values)
        body.append((m.role, m.method, m.validity, here,
                     "inside" if not m.outside else "OUTSIDE: " + "; ".join(m.outside), m.reference))
    paras = ["Each published correlation the solve used, where the design sits in its range, and the reference. "
             "Outside its range a result is an extrapolation (see the findings)."]
    if r.regime == "transitional":
        paras.append(f"The flow is transitional (Re = {format_number(r.Re)}): the result interpolates between "
                     "the laminar methods, evaluated and checked at the end of the laminar range, and the turbulent "
                     "ones, evaluated and checked at the start of the turbulent range.")
    return Section("methods", "Methods and their validity ranges", tuple(paras), table=(head, *body))


def report_findings(r, u: DisplayUnits) -> tuple[Finding, ...]:
    """The findings as the report words them (US units annotated beside the SI figures they quote)."""
    exact = exact_values(r, r.module, r.circuit, r.planning, r.design) if u.system != "si" else ()
    return tuple(Finding(f.severity, f.id, annotate(f.message, u, exact), annotate(f.action, u, exact))
                 for f in r.findings)


def summary(r, units: str = "si") -> tuple[str, str, tuple[Row, ...], tuple[Finding, ...]]:
    """The report's summary, without figures or sections: (title, job line, headline rows, findings)."""
    u = DisplayUnits(units)
    return r.design.title, job_line(r, u), _headline(r, u), report_findings(r, u)


def build_report(r, curve, fit, *, figures: dict, units: str = "si", version: str = "",
                 source_name: str = "", source_bytes: bytes = b"") -> Report:
    """Gather a report.  ``figures`` maps names (breakdown, profile, flow, plate, facemap, coolant, water,
    module, circuit) to SVG text."""
    u = DisplayUnits(units)

    def fig(name, caption):
        return (Figure(name, caption, figures[name]),) if name in figures else ()

    findings = report_findings(r, u)
    sections = [
        _inputs(r, u),
        Section("plate", "The plate and its heat sources",
                (f"Model: {model_line(r, u)}. Seen from above, to scale: x along the flow from the inlet edge, "
                 "y across from the centre line, positive on the left of the flow.",),
                rows=tuple(source_rows(r, u)),
                figures=fig("plate", "The plate from above with its passage and every heat source.")),
        _breakdown(r, u, fig("breakdown", "Parts of the thermal resistance, hottest point to inlet water.")),
        Section("profile", "Temperatures along the flow path",
                ("Mounting face within the footprint (plate top plus the interface's rise), plate top face and "
                 "water along the centre line; the hottest point of the mounting face is marked.",),
                figures=fig("profile", "Temperatures along the flow path.")),
        _flow(curve, fit, u, fig("flow", "Thermal resistance and pressure drop against flow; design point marked."),
              r.module is not None),
    ]
    if r.field is not None:
        sections.append(field_section(r, u, fig("facemap", "Mounting-face temperature map with isotherms; each "
                                                "source's hottest point marked.")
                                      + fig("coolant", "Coolant temperature along the flow in each channel."),
                                      model_line(r, u)))
    split = split_section(r, u, fig("flow_split", "Flow per channel with the mean and the 80 % line."))
    if split is not None:
        sections.append(split)
    module = r.module
    if module is not None:
        sections.append(module_section(module, u, fig("module", "Thermoelectric current sweep; coldest current marked.")))
    circuit = r.circuit
    if circuit is not None:
        sections.append(circuit_section(circuit, u, fig("circuit", "System and supply curves with the operating point.")))
    planning = r.planning
    water_fig = fig("water", "Water use against the hottest mounting-face temperature; operating point marked.")
    if planning is not None:
        sections.append(planning_section(planning, u, water_fig))
    elif r.design.supply.once_through:
        sections.append(Section("water", "Water use", (
            f"Once-through at {r.design.supply.hours_per_day:g} h a day and {r.design.supply.days_per_year:g} days "
            "a year: more flow buys a cooler mounting face with more water.",), figures=water_fig))
    air = getattr(r, "air", None)
    if air is not None:
        sections.append(air_section(air, u, fig("air", "The air sink's fins to scale (a cut across the air flow) "
                                                       "and the hottest faces beside the water design.")))
    band = uncertainty_section(r, u, fig("tornado", "Hottest mounting face with each input at its low and high "
                                              "end; the band and the nominal marked."))
    if band is not None:
        sections.append(band)
    sections.append(_methods(r))
    sections.append(Section("assumptions", "Assumptions", tuple(r.assumptions)))
    return Report(title=r.design.title, job=job_line(r, u), units=units, version=version,
                  source_name=source_name, source_sha256=sha256_text(source_bytes),
                  source_text=source_bytes.decode("utf-8", errors="replace"), headline=_headline(r, u),
                  findings=findings, sections=tuple(sections))
