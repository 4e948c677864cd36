"""``coldplate new KIND``: a complete, commented design file to start from, one neutral scenario per kind.

Each scenario is data (tables of keys and values, invented numbers for the demo); the comment beside every key
is its one-line description from :mod:`coldplate.design.catalogue`, the same record the schema reads, so the
two cannot drift.  Optional tables and keys are written commented out (``# key = value``): removing the ``# ``
of such a line gives a design the reader still accepts (``tests/test_workday.py`` checks both states).
"""
from __future__ import annotations

import textwrap

from coldplate.design.catalogue import FIELDS
from coldplate.findings.base import DEFER
from coldplate.sizing.writer import _key, _value

#: Column the comments start at.
COMMENT_AT = 40

_ROOM = ("room", [("temperature", "23 degC"), ("relative_humidity", "50 %")])
_TAP = ("supply", [("source", "potable"), ("hours_per_day", 8), ("?days_per_year", 250),
                   ("static_pressure", "3 bar"), ("discharge_limit", "60 degC")])
_MODEL = ("?correlations", [("laminar", "muzychka-yovanovich"), ("turbulent", "gnielinski"), ("segments", 40)])

#: A table is (name, [(key, value)]); a leading "?" marks an optional table or key (written commented out).
SCENARIOS: dict[str, tuple[str, list]] = {
    "channels": ("A bench amplifier stage rejects 70 W into an aluminium channel plate fed from a cold-water tap "
                 "and run to a sink (an invented scenario: change every value to your own).", [
        ("title", "Amplifier stage, aluminium channel plate on tap water"),
        ("heat", [("load", "70 W"), ("footprint", ["35 mm", "35 mm"])]),
        ("interface", [("conductivity", "4 W/(m*K)"), ("thickness", "0.08 mm")]),
        ("plate", [("material", "aluminium-6061"), ("length", "90 mm"), ("width", "60 mm"), ("base", "3 mm"),
                   ("?pressure_rating", "6 bar")]),
        ("passage", [("kind", "channels"), ("count", 10), ("width", "2.5 mm"), ("depth", "5 mm"),
                     ("plenum_length", "6 mm"), ("port_diameter", "8 mm"), ("?roughness", "0.0016 mm")]),
        ("coolant", [("fluid", "water"), ("inlet_temperature", "17 degC"), ("flow", "1.2 L/min")]),
        _TAP, _ROOM, _MODEL,
        ("?search", [("count", {"from": 6, "to": 16}), ("width", {"from": "1.5 mm", "to": "3 mm", "steps": 7}),
                     ("depth", ["4 mm", "5 mm", "6 mm"]),
                     ("flow", {"from": "0.5 L/min", "to": "3 L/min", "steps": 11}), ("face_limit", "40 degC"),
                     ("pressure_drop_limit", "50 kPa"), ("min_width", "1 mm"), ("min_wall", "0.8 mm")]),
    ]),
    "tube": ("A laser mount rejects 90 W into an aluminium plate with a soldered copper tube in three passes, on "
             "tap water to a sink (an invented scenario: change every value to your own).", [
        ("title", "Laser mount, copper tube in an aluminium plate"),
        ("heat", [("load", "90 W"), ("footprint", ["30 mm", "20 mm"])]),
        ("interface", [("resistance", "2e-5 K*m**2/W")]),
        ("plate", [("material", "aluminium-6061"), ("length", "100 mm"), ("width", "60 mm"), ("base", "5 mm")]),
        ("passage", [("kind", "tube"), ("inner_diameter", "4.6 mm"), ("outer_diameter", "6.35 mm"),
                     ("passes", 3), ("bend_radius", "9 mm"), ("material", "copper"), ("bond", "solder"),
                     ("?roughness", "0.0015 mm")]),
        ("coolant", [("fluid", "water"), ("inlet_temperature", "18 degC"), ("flow", "1 L/min")]),
        _TAP, _ROOM, _MODEL,
        ("?search", [("inner_diameter", ["3.5 mm", "4.6 mm"]), ("passes", [1, 3]),
                     ("flow", {"from": "0.4 L/min", "to": "2 L/min", "steps": 9}), ("face_limit", "45 degC"),
                     ("pressure_drop_limit", "60 kPa")]),
    ]),
    "cavity": ("A detector block sheds 25 W into a brass plate with one open cavity, on a glycol loop from a "
               "chiller (an invented scenario: change every value to your own).", [
        ("title", "Detector block, brass cavity plate on a glycol loop"),
        ("heat", [("load", "25 W"), ("footprint", ["30 mm", "30 mm"])]),
        ("interface", [("conductivity", "3 W/(m*K)"), ("thickness", "0.1 mm")]),
        ("plate", [("material", "brass"), ("length", "70 mm"), ("width", "50 mm"), ("base", "4 mm")]),
        ("passage", [("kind", "cavity"), ("height", "3 mm"), ("port_diameter", "6 mm"),
                     ("?roughness", "0.0016 mm")]),
        ("coolant", [("fluid", "propylene-glycol"), ("fraction", "30 %"), ("basis", "mass"),
                     ("inlet_temperature", "10 degC"), ("flow", "0.8 L/min")]),
        ("supply", [("source", "process"), ("hours_per_day", 24), ("?static_pressure", "1 bar")]),
        ("room", [("temperature", "22 degC"), ("relative_humidity", "40 %")]), _MODEL,
    ]),
    "modules": ("Two thermoelectric modules pump 15 W from a cold stage into a copper channel plate on tap water "
                "(an invented module, no product's datasheet: change every value to your own).", [
        ("title", "Cooled stage, two thermoelectric modules on a channel plate"),
        ("module", [("max_current", "6 A"), ("max_voltage", "15 V"), ("max_temperature_difference", "68 K"),
                    ("rated_hot_side", "27 degC"), ("count", 2), ("wiring", "series"), ("cold_load", "15 W"),
                    ("current", "3 A"), ("cold_side_resistance", "0.1 K/W"), ("hot_side_limit", "80 degC")]),
        ("heat", [("footprint", ["40 mm", "80 mm"])]),
        ("interface", [("conductivity", "5 W/(m*K)"), ("thickness", "0.05 mm")]),
        ("plate", [("material", "copper"), ("length", "70 mm"), ("width", "90 mm"), ("base", "4 mm")]),
        ("passage", [("kind", "channels"), ("count", 14), ("width", "2.5 mm"), ("depth", "5 mm"),
                     ("plenum_length", "6 mm"), ("port_diameter", "8 mm")]),
        ("coolant", [("fluid", "water"), ("inlet_temperature", "16 degC"), ("flow", "1.2 L/min")]),
        ("supply", [("source", "potable"), ("hours_per_day", 10), ("static_pressure", "3.5 bar")]),
        ("room", [("temperature", "23 degC"), ("relative_humidity", "45 %")]), _MODEL,
    ]),
    "placed-modules": ("Two thermoelectric modules, each placed where its cold stage sits, pump 15 W into a copper "
                       "channel plate on tap water; each gets its own hot face from the plate's field (an invented "
                       "module, no product's datasheet: change every value to your own).", [
        ("title", "Two placed thermoelectric modules on a channel plate"),
        ("module", [("max_current", "6 A"), ("max_voltage", "15 V"), ("max_temperature_difference", "68 K"),
                    ("rated_hot_side", "27 degC"), ("count", 2), ("wiring", "series"), ("cold_load", "15 W"),
                    ("current", "3 A"), ("cold_side_resistance", "0.1 K/W"), ("hot_side_limit", "80 degC"),
                    ("size", ["40 mm", "40 mm"]), ("positions", [["27 mm", "12 mm"], ["67 mm", "-12 mm"]])]),
        ("interface", [("conductivity", "5 W/(m*K)"), ("thickness", "0.05 mm")]),
        ("plate", [("material", "copper"), ("length", "94 mm"), ("width", "70 mm"), ("base", "4 mm")]),
        ("passage", [("kind", "channels"), ("count", 14), ("width", "2.5 mm"), ("depth", "5 mm"),
                     ("plenum_length", "6 mm"), ("port_diameter", "8 mm")]),
        ("coolant", [("fluid", "water"), ("inlet_temperature", "16 degC"), ("flow", "1.2 L/min")]),
        ("supply", [("source", "potable"), ("hours_per_day", 10), ("static_pressure", "3.5 bar")]),
        ("room", [("temperature", "23 degC"), ("relative_humidity", "45 %")]), _MODEL,
    ]),
    "circuit": ("A power stage rejects 100 W into a copper channel plate; the tap's pressure pushes the water "
                "through a backflow preventer, a hose and a valve to a floor sink (an invented scenario: change "
                "every value to your own).", [
        ("title", "Test stand, tap pressure through a circuit to a drain"),
        ("heat", [("load", "100 W"), ("footprint", ["50 mm", "40 mm"])]),
        ("interface", [("conductivity", "3 W/(m*K)"), ("thickness", "0.1 mm")]),
        ("plate", [("material", "copper"), ("length", "100 mm"), ("width", "60 mm"), ("base", "3 mm")]),
        ("passage", [("kind", "channels"), ("count", 10), ("width", "2.5 mm"), ("depth", "5 mm"),
                     ("port_diameter", "8 mm")]),
        ("coolant", [("fluid", "water"), ("inlet_temperature", "15 degC")]),
        ("supply", [("source", "potable"), ("drive", "pressure"), ("static_pressure", "3 bar"),
                    ("hours_per_day", 8), ("days_per_year", 220), ("discharge_limit", "60 degC"),
                    ("?face_limit", "35 degC"), ("?tariff", "3.50 EUR/m**3")]),
        ("circuit", [("air_gap", "50 mm")]),
        ("circuit.part", [("kind", "backflow"), ("name", "vacuum breaker"), ("device", "pressure-vacuum-breaker")]),
        ("circuit.part", [("kind", "hose"), ("name", "supply hose"), ("inner_diameter", "9.5 mm"),
                          ("length", "2 m"), ("material", "rubber-hose")]),
        ("circuit.part", [("kind", "valve"), ("name", "needle valve"), ("kv", 0.15)]),
        ("circuit.part", [("kind", "fitting"), ("name", "elbows"), ("fitting", "elbow-90"),
                          ("diameter", "9.5 mm"), ("count", 2)]),
        ("circuit.part", [("kind", "plate")]),
        ("circuit.part", [("kind", "hose"), ("name", "drain hose"), ("inner_diameter", "9.5 mm"),
                          ("length", "3 m"), ("material", "pvc-hose")]),
        ("circuit.part", [("kind", "rise"), ("name", "down to the sink"), ("height", "-0.5 m")]),
        _ROOM, _MODEL,
    ]),
}
KINDS = tuple(SCENARIOS)


def _line(text: str, comment: str, off: bool) -> str:
    text = ("# " if off else "") + text
    return f"{text.ljust(COMMENT_AT - 1)} # {comment}" if comment else text


def starter_text(kind: str) -> str:
    """The design file of ``kind``'s scenario, every key with its description beside it."""
    about, tables = SCENARIOS[kind]
    head = (f"{about} Each key's meaning is beside it. Lines starting '# key =' or '# [table]' are optional: "
            "remove the '# ' to use them; `coldplate schema` gives editors the same descriptions. Water supplies, "
            f"drains and electricity near water: {DEFER}")
    out = [f"# {line}" for line in textwrap.wrap(head, 100)] + [""]
    for name, body in tables:
        if name == "title":
            out.append(_line(f"title = {_value(body)}", FIELDS["[top] title"].text, False))
            continue
        off = name.startswith("?")
        table = name.lstrip("?")
        out.append("")
        out.append(_line(f"[[{table}]]" if table == "circuit.part" else f"[{table}]", "", off))
        for key, value in body:
            key_off = off or key.startswith("?")
            key = key.lstrip("?")
            out.append(_line(f"{_key(key)} = {_value(value)}", FIELDS[f"[{table}] {key}"].text, key_off))
    return "\n".join(out) + "\n"
