"""The uncertainty band in the outputs: JSON keys, text lines and the report section.

Formatting only, against the field names of coldplate/uncertainty/result.py (``Result.uncertainty``); every
number comes from the band.  Nothing is added when a result has no band.
"""
from __future__ import annotations

import math

from .display_units import DisplayUnits
from .report_model import Row, Section

#: Band output -> (the check's JSON key it bands, display kind, label).
OUTPUT_KEYS = {
    "face": ("surface_temperature_max_C", "temperature", "mounting face, hottest"),
    "outlet": ("outlet_temperature_C", "temperature", "outlet water"),
    "pressure_drop": ("pressure_drop_Pa", "pressure", "pressure drop (plate)"),
    "water_use": ("water_use_L_per_day", "volume_per_day", "water use (once-through)"),
}


def percent_key(q: float) -> str:
    """The JSON key of a percentile: ``p05``, ``p50``, ``p95`` (``p2.5`` where it is not whole)."""
    p = q * 100
    return f"p{round(p):02d}" if abs(p - round(p)) < 1e-9 else f"p{p:g}"


def _json_value(kind: str, x: float):
    if not math.isfinite(x):
        return None
    return x - 273.15 if kind == "temperature" else x


def uncertainty_dict(r) -> dict:
    """``uncertainty`` and ``sensitivity`` for ``coldplate check --format json`` (SI, degC); empty without a band."""
    u = r.uncertainty
    if u is None:
        return {}
    keys = [percent_key(q) for q in (u.lower_q, 0.5, u.upper_q)]
    out = {"confidence": u.confidence, "samples": u.samples, "seed": u.seed, "method": u.method,
           "unsolved_samples": u.unsolved, "notes": list(u.notes),
           "inputs": [{"input": k, "low": lo, "high": hi, "distribution": dist, "given": text}
                      for k, lo, hi, dist, text in u.inputs],
           "correlations": [{"quantity": q, "method": m, "band": b, "source": s} for q, m, b, s in u.correlations]}
    for b in u.bands:
        key, kind, _ = OUTPUT_KEYS[b.output]
        values = (b.low, b.median, b.high)
        errors = (b.low_error, b.median_error, b.high_error)
        out[key] = {"nominal": _json_value(kind, b.nominal),
                    **{k: _json_value(kind, v) for k, v in zip(keys, values)},
                    "sampling_error": {k: e if math.isfinite(e) else None for k, e in zip(keys, errors)}}
    sens = [{"input": s.input, "low": _json_value("temperature", s.low), "high": _json_value("temperature", s.high),
             "input_low": s.input_low, "input_high": s.input_high, "output": "surface_temperature_max_C",
             "pressure_drop_low_Pa": s.pressure_low, "pressure_drop_high_Pa": s.pressure_high}
            for s in u.sensitivity]
    return {"uncertainty": out, "sensitivity": sens}


def _shown(u: DisplayUnits, kind: str, x: float) -> str:
    return u.fmt(kind, x) if math.isfinite(x) else "unsolved"


def band_rows(r, u: DisplayUnits) -> list[tuple[str, str, str]]:
    """(label, nominal, "band (median; sampling error)") for every headline number with a band."""
    band = r.uncertainty
    rows = []
    for b in band.bands:
        _, kind, label = OUTPUT_KEYS[b.output]
        if b.output == "water_use" and not r.design.supply.once_through:
            continue
        err = max(b.low_error, b.high_error)
        err_text = u.fmt("temperature_difference" if kind == "temperature" else kind, err) \
            if math.isfinite(err) else "-"
        rows.append((label, _shown(u, kind, b.nominal),
                     f"{_shown(u, kind, b.low)} to {_shown(u, kind, b.high)} {u.label(kind)}  (median "
                     f"{_shown(u, kind, b.median)}; sampling error ±{err_text})"))
    return rows


def sensitivity_rows(r, u: DisplayUnits) -> list[tuple[str, str, str]]:
    deg = u.label("temperature")
    return [(s.input, f"{_shown(u, 'temperature', s.low)} / {_shown(u, 'temperature', s.high)}",
             f"{deg}  (swing {u.fmt('temperature_difference', s.swing) if math.isfinite(s.swing) else '-'})")
            for s in r.uncertainty.sensitivity]


def _heading(band) -> str:
    return (f"Uncertainty: {band.confidence * 100:g} % band ({percent_key(band.lower_q)} to "
            f"{percent_key(band.upper_q)}), {band.samples} samples, {band.method}")


def uncertainty_lines(r, table, units: str = "si") -> list[str]:
    """The text summary's block: each headline number beside its band, then the inputs ranked by their swing."""
    band = r.uncertainty
    if band is None:
        return []
    u = DisplayUnits(units)
    out = table([(q, v, b) for q, v, b in band_rows(r, u)], _heading(band))
    out.append("")
    if band.sensitivity:
        out += table(sensitivity_rows(r, u), "Hottest face with each input at its low / high end")
        out.append("")
    out += [f"  {n}" for n in band.notes]
    out.append("")
    return out


def uncertainty_section(r, u: DisplayUnits, figures) -> Section | None:
    """The report's section: the band beside each headline number, the tornado chart, the notes."""
    band = r.uncertainty
    if band is None:
        return None
    rows = tuple(Row(label, nominal, text, OUTPUT_KEYS_BY_LABEL[label]) for label, nominal, text in band_rows(r, u))
    sens = (("input", f"low end [{u.label('temperature')}]", f"high end [{u.label('temperature')}]"),) + tuple(
        (s.input, _shown(u, "temperature", s.low), _shown(u, "temperature", s.high))
        for s in band.sensitivity)
    corr = [f"{q}: {m} ±{b * 100:g} % ({s})" for q, m, b, s in band.correlations]
    paras = (_heading(band) + ". Nominal value, then the band, its median and the larger sampling error of its "
             "two ends (half the 95 % order-statistic interval).",
             "Inputs as given: " + ("; ".join(f"{k} {text} ({dist})" for k, _, _, dist, text in band.inputs)
                                    or "none") + ".",
             "Correlation scatter: " + ("; ".join(corr) if corr else "not included") + ".",
             *band.notes)
    return Section("uncertainty", "Uncertainty band and sensitivities", paras, rows=rows,
                   table=sens if band.sensitivity else (), figures=figures)


OUTPUT_KEYS_BY_LABEL = {label: f"uncertainty.{key}.nominal" for key, _, label in OUTPUT_KEYS.values()}
