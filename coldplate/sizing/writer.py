"""Writing a design file back as TOML text (a small writer of our own: tables of strings, numbers,
booleans and arrays, which is all a design file holds).

:func:`design_text` takes the design file's data as read (the dict from ``tomllib``), sets the chosen
passage sizes, base thickness and flow as unit strings, drops ``[search]`` and returns the text; the file
it gives reads back with :func:`coldplate.design.load_design` to the same design.
"""
from __future__ import annotations

import copy
import json
import math

#: How values are written back: variable -> (table, key, scale from SI, unit).
PLACES = {
    "count": ("passage", "count", None, ""),
    "passes": ("passage", "passes", None, ""),
    "width": ("passage", "width", 1e3, "mm"),
    "depth": ("passage", "depth", 1e3, "mm"),
    "inner_diameter": ("passage", "inner_diameter", 1e3, "mm"),
    "base": ("plate", "base", 1e3, "mm"),
    "flow": ("coolant", "flow", 6e4, "L/min"),
    "plenum_depth": ("passage", "plenum_depth", 1e3, "mm"),
    "inlet_port": ("passage", "inlet_port", 1e3, "mm"),
    "outlet_port": ("passage", "outlet_port", 1e3, "mm"),
}


def _number(x: float) -> str:
    """Shortest text that reads back to the same float (10 significant digits is plenty for a drawing)."""
    return f"{x:.10g}"


def chosen_data(data: dict, values: dict, design) -> dict:
    """A copy of the design file's data with the chosen values (SI) in place and ``[search]`` removed."""
    out = copy.deepcopy(data)
    out.pop("search", None)
    for name, v in values.items():
        table, key, scale, unit = PLACES[name]
        out[table][key] = int(round(v)) if scale is None else f"{_number(v * scale)} {unit}"
    if "flow" in values and out.get("supply", {}).get("drive", "flow") != "flow":
        # the recommendation fixes the flow; its [circuit] then reports the supply pressure that flow needs
        out["supply"]["drive"] = "flow"
    if "inner_diameter" in values:  # the tube keeps its wall thickness
        wall = 0.5 * (design.passage.outer_diameter - design.passage.inner_diameter)
        out["passage"]["outer_diameter"] = f"{_number((values['inner_diameter'] + 2 * wall) * 1e3)} mm"
    return out


def _value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, int):
        return str(v)
    if isinstance(v, float):
        if not math.isfinite(v):
            raise ValueError("a design file holds finite numbers only")
        return repr(v)
    if isinstance(v, str):
        return json.dumps(v, ensure_ascii=False)  # a JSON string is a valid TOML basic string
    if isinstance(v, list):
        return "[" + ", ".join(_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{_key(k)} = {_value(x)}" for k, x in v.items()) + " }"
    raise TypeError(f"cannot write {type(v).__name__} to a design file")


def _key(k: str) -> str:
    return k if k.replace("_", "").replace("-", "").isalnum() else json.dumps(k)


def toml_text(data: dict, header: str = "") -> str:
    """TOML text of a design file's data: top-level keys first, then one ``[table]`` per table."""
    lines = [f"# {line}" if line else "#" for line in header.splitlines()]
    lines += [f"{_key(k)} = {_value(v)}" for k, v in data.items() if not isinstance(v, dict)]
    for k, v in data.items():
        if isinstance(v, dict):
            lines.append("")
            lines.append(f"[{_key(k)}]")
            lines += [f"{_key(kk)} = {_value(vv)}" for kk, vv in v.items()]
    return "\n".join(lines) + "\n"


def design_text(data: dict, values: dict, design, header: str = "") -> str:
    """The design file for the chosen values, as text."""
    return toml_text(chosen_data(data, values, design), header)
