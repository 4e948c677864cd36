"""The result as one JSON object: SI units, with the unit in each key's name.

Only formatting: every number comes from the result object.
"""
from __future__ import annotations

import json

from .flow_split import split_dict
from .module_report import module_to_dict
from .air_report import air_to_dict
from .supply import supply_dict
from .uncertainty import uncertainty_dict


def _c(T: float) -> float:
    return T - 273.15


def result_to_dict(r, version: str = "") -> dict:
    d = r.design
    return {
        "title": d.title,
        "software_version": version,
        "thermal_resistance_K_per_W": r.R_th,
        "resistances_K_per_W": {name: value for name, value in r.resistances},
        "surface_temperature_max_C": _c(r.T_face_max),
        "plate_surface_temperature_max_C": _c(r.T_plate_max),
        "hot_spot_from_inlet_edge_m": r.x_hot,
        "inlet_temperature_C": _c(r.T_in),
        "outlet_temperature_C": _c(r.T_out),
        "heat_load_W": r.load,
        "pressure_drop_Pa": r.dp,
        "pressure_drop_parts_Pa": {"friction": r.dp_friction,
                                   **{m.name: m.pressure_drop(r.props.rho) for m in r.minor_losses}},
        "velocity_m_per_s": r.velocity,
        "reynolds": r.Re,
        "prandtl": r.Pr,
        "nusselt": r.Nu,
        "darcy_friction_factor": r.f_darcy,
        "regime": r.regime,
        "heat_transfer_coefficient_W_per_m2K": r.h,
        "nusselt_hot_spot": r.Nu_hot,  # the local values where the hottest point is (the two above: length means)
        "heat_transfer_coefficient_hot_spot_W_per_m2K": r.h_hot,
        "fin_efficiency": r.eta_fin,
        "wetted_area_m2": r.wetted_area,
        "flow_m3_per_s": r.V_dot,
        "mass_flow_kg_per_s": r.m_dot,
        "line_pressure_Pa_abs": r.line_pressure,
        "boiling_point_C": _c(r.T_boil),
        "once_through": d.supply.once_through,
        "water_use_L_per_day": r.water_use_L_per_day,
        "water_use_m3_per_year": r.water_use_m3_per_year,
        "dew_point_C": _c(r.T_dew),
        "dew_point_kind": r.dew_kind,
        "passage": r.geometry.description,
        "coolant": d.coolant.label(),
        "profile": {"x_m": list(r.profile.x), "bulk_temperature_C": [_c(t) for t in r.profile.T_bulk],
                    "plate_top_temperature_C": [_c(t) for t in r.profile.T_top]},
        "methods": [{"role": m.role, "method": m.method, "reference": m.reference, "validity": m.validity,
                     "values": dict(m.values), "outside_range": list(m.outside)} for m in r.methods],
        "assumptions": list(r.assumptions),
        "findings": [{"id": f.id, "severity": f.severity, "message": f.message, "action": f.action}
                     for f in r.findings],
        **supply_dict(r),
        **sources_dict(r),
        **split_dict(r),  # the flow split across channels (nulls without one)
    }


def _finite_or_none(x):
    return None if x is None or x != x else x


def sources_dict(r) -> dict:
    """The plate model and each heat source's own figures (the field model gives them; the network none)."""
    return {
        "model": r.model,
        "sources": [{"name": s.name, "load_W": _finite_or_none(s.load), "face_max_C": _c(s.face_max),
                     "face_mean_C": _finite_or_none(_c(s.face_mean)),
                     "limit_C": None if s.limit is None else _c(s.limit), "margin_K": s.margin,
                     "resistance_K_per_W": _finite_or_none(s.resistance(r.T_in)),
                     "hottest_at_m": list(s.hottest_at)} for s in r.sources],
        "coupling_K_per_W": [[float(v) for v in row] for row in r.coupling],
        "grid_uncertainty_K": _finite_or_none(r.grid_uncertainty) if r.model == "field" else None,
    }


def check_to_dict(r, version: str = "") -> dict:
    """What ``coldplate check --format json`` prints, as a dict (the modules' keys included when present)."""
    out = result_to_dict(r, version)
    out.update(module_to_dict(r.module))
    out.update(air_to_dict(r))
    out.update(uncertainty_dict(r))  # only with a band ([uncertainty] or --confidence)
    return out


def render_json(r, version: str = "") -> str:
    return json.dumps(check_to_dict(r, version), indent=2, ensure_ascii=False)
