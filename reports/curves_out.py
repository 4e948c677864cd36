"""The plate's flow curve for system models and spreadsheets: CSV or JSON, SI with units in the names.

Formatting only: the points and the fitted flow curves come from :mod:`coldplate.plate.curves`.  The CSV has one row per
flow with the fitted values beside the solved ones; the JSON adds the fit's constants and its largest errors.
"""
from __future__ import annotations

import csv
import io
import json

COLUMNS = ("flow_m3_per_s", "flow_L_per_min", "thermal_resistance_K_per_W", "pressure_drop_Pa",
           "surface_temperature_max_C", "outlet_temperature_C", "thermal_resistance_fit_K_per_W",
           "pressure_drop_fit_Pa")


def curve_rows(curve, fit) -> list[dict]:
    R_fit, dp_fit = fit.R_th(curve.V_dot), fit.dp(curve.V_dot)
    return [{"flow_m3_per_s": V, "flow_L_per_min": V * 6e4, "thermal_resistance_K_per_W": R,
             "pressure_drop_Pa": dp, "surface_temperature_max_C": Tf - 273.15, "outlet_temperature_C": To - 273.15,
             "thermal_resistance_fit_K_per_W": float(Rf), "pressure_drop_fit_Pa": float(dpf)}
            for V, R, dp, Tf, To, Rf, dpf in zip(curve.V_dot, curve.R_th, curve.dp, curve.T_face, curve.T_out,
                                                  R_fit, dp_fit)]


def render_csv(curve, fit) -> str:
    buf = io.StringIO()
    w = csv.DictWriter(buf, fieldnames=COLUMNS, lineterminator="\n")
    w.writeheader()
    for row in curve_rows(curve, fit):
        w.writerow({k: f"{v:.8g}" for k, v in row.items()})
    return buf.getvalue()


def curves_to_dict(curve, fit, title: str = "", version: str = "") -> dict:
    return {
        "title": title,
        "software_version": version,
        "heat_load_W": curve.load,
        "design_point": {"flow_m3_per_s": curve.design_V_dot, "thermal_resistance_K_per_W": curve.design_R_th,
                         "pressure_drop_Pa": curve.design_dp},
        "points": curve_rows(curve, fit),
        "skipped": [{"flow_m3_per_s": V, "reason": why} for V, why in curve.skipped],
        "fit": {
            "pressure_drop": {"form": "dp = a*V + b*V**2", "a_Pa_s_per_m3": fit.a, "b_Pa_s2_per_m6": fit.b,
                              "max_relative_error": fit.dp_max_error},
            "thermal_resistance": {"form": "R = R0 + c*V**(-n)", "R0_K_per_W": fit.R0, "c": fit.c, "n": fit.n,
                                   "max_relative_error": fit.R_max_error},
            "flow_range_m3_per_s": [fit.V_min, fit.V_max],
            "units": "V in m3/s, dp in Pa, R in K/W",
        },
    }


def render_curves_json(curve, fit, title: str = "", version: str = "") -> str:
    return json.dumps(curves_to_dict(curve, fit, title, version), indent=2, ensure_ascii=False)
