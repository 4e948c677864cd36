"""The design file as a JSON Schema (draft 2020-12), for editors that check TOML against one while typing.

Built, never written by hand, from the four places that already hold the design file's rules: the keys each
table accepts (its reader's own tuples, :func:`key_sets`), each key's kind and description
(:mod:`coldplate.design.catalogue`), the choices of a choice (the reader's own tuples, :func:`choices`) and
the plausible ranges (:mod:`coldplate.design.ranges`, quoted in the descriptions: a range on a unit string
cannot be a JSON Schema bound).  ``coldplate schema`` prints it; ``coldplate new`` writes its comments from the
same records.  This module sits with the command line (layer 8): it reads every concept's reader.
"""
from __future__ import annotations

from hydraulics.circuit import FITTINGS
from hydraulics.coolant import FLUIDS

from coldplate.air import reader as air_reader
from coldplate.design import reader
from coldplate.design.catalogue import FIELDS, OTHER_KINDS, Field
from coldplate.design.fields import show
from coldplate.design.ranges import plausible
from coldplate.design.units import KINDS
from coldplate.modules import reader as module_reader
from coldplate.plate import materials
from coldplate.plate.sources import SOURCE_KEYS
from coldplate.sizing.search import HEADER_VARIABLES, LIMITS, VARIABLES
from coldplate.supply import reader as supply_reader
from coldplate.uncertainty import reader as uncertainty_reader

DRAFT = "https://json-schema.org/draft/2020-12/schema"
_NUMBER = r"[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?"
#: "<number> <unit>": the shape ``design.units.parse_value`` reads (the unit itself is pint's to judge).
UNIT_PATTERN = rf"^\s*{_NUMBER}\s*[^\s\d.+-].*$"
#: A number with an optional unit: a fraction may be "55 %" or 0.55.
FRACTION_PATTERN = rf"^\s*{_NUMBER}\s*.*$"
#: "<number> <CUR>[/<unit>]": the shape ``supply.reader._money`` reads.
MONEY_PATTERN = rf"^\s*{_NUMBER}\s*[A-Z]{{3}}\s*(/\s*.+?)?\s*$"


def key_sets() -> dict[str, tuple[str, ...]]:
    """Every key each table accepts, from the readers' own tuples (``source``: one ``[[source]]`` table,
    ``circuit.part``: one ``[[circuit.part]]``; ``passage``: any kind's keys)."""
    search = (tuple(dict.fromkeys(k for kind in VARIABLES.values() for k in kind)) + tuple(HEADER_VARIABLES)
              + tuple(LIMITS))
    return {"top": ("title",), **{t: tuple(keys) for t, keys in reader.KEYS.items()},
            "passage": reader.ANY_PASSAGE_KEY, "module": module_reader._KEYS,
            "circuit": supply_reader.CIRCUIT_KEYS, "circuit.part": supply_reader.ANY_PART_KEY,
            "source": SOURCE_KEYS, "search": search, "air": air_reader._KEYS,
            "uncertainty": (*uncertainty_reader.SETTINGS, *uncertainty_reader.INPUTS)}


def tables() -> tuple[str, ...]:
    """Every table a design file may hold, as the design reader lists them (the check's, then the optional
    ones, then those read by other commands)."""
    return (*reader._TOP[1:], *reader._OPTIONAL, *reader._FEATURE_TABLES)


def choices() -> dict[str, tuple[str, ...]]:
    """The words each ``choice`` field accepts, from the readers' own tuples."""
    return {
        "[passage] kind": reader.PASSAGE_KINDS,
        "[passage] bond": tuple(materials.BONDS),
        "[coolant] fluid": FLUIDS,
        "[coolant] basis": reader.BASES,
        "[supply] source": reader.SOURCES,
        "[supply] discharge": reader.DISCHARGES,
        "[supply] drive": supply_reader.DRIVES,
        "[correlations] laminar": reader.LAMINAR_CHOICES,
        "[correlations] turbulent": reader.TURBULENT_CHOICES,
        "[module] wiring": module_reader.WIRINGS,
        "[circuit.part] kind": supply_reader.PART_KINDS,
        "[circuit.part] fitting": tuple(FITTINGS),
        "[circuit.part] device": tuple(supply_reader.BACKFLOW_DEVICES),
        "[air] drive": air_reader.DRIVES,
        "[air] sink": air_reader.SINKS,
    }


def names() -> dict[str, tuple[str, ...]]:
    """Suggested names of the ``name`` fields (our tables' keys; exact aliases are accepted too)."""
    return {"[plate] material": tuple(materials.MATERIALS), "[passage] material": tuple(materials.MATERIALS),
            "[air] material": tuple(materials.MATERIALS),
            "[circuit.part] material": tuple(materials.ROUGHNESS)}


def _unit_string(kind: str) -> dict:
    return {"type": "string", "pattern": UNIT_PATTERN}


def describe(name: str, f: Field) -> str:
    """The one-line description with the plausible range, where the ranges hold one."""
    table, key = name[1:].split("] ")
    bound = plausible(table, key)
    if bound is not None and f.kind in KINDS:
        return f"{f.text} (plausible: {show(bound.low, f.kind)} to {show(bound.high, f.kind)})"
    return f.text


def value_schema(name: str, f: Field) -> dict:
    """The JSON Schema of one field's value, with its description."""
    kind = f.kind
    if kind == "fraction":
        s = {"anyOf": [{"type": "number"}, {"type": "string", "pattern": FRACTION_PATTERN}]}
    elif kind in KINDS:
        s = _unit_string(kind)
    elif kind == "text":
        s = {"type": "string", "minLength": 1}
    elif kind == "name":
        s = {"type": "string", "minLength": 1, "examples": list(names().get(name, ()))}
    elif kind == "choice":
        s = {"enum": list(choices()[name])}
    elif kind == "integer":
        s = {"type": "integer", "minimum": 1}
    elif kind == "number":
        s = {"type": "number", "exclusiveMinimum": 0}
    elif kind == "boolean":
        s = {"type": "boolean"}
    elif kind in ("lengths", "offsets"):
        s = {"type": "array", "items": _unit_string("length"), "minItems": 2, "maxItems": 2}
    elif kind == "placements":
        pair = {"type": "array", "items": _unit_string("length"), "minItems": 2, "maxItems": 2}
        s = {"type": "array", "items": pair, "minItems": 1}
    elif kind == "hours":
        s = {"anyOf": [{"type": "number", "exclusiveMinimum": 0}, _unit_string("time")]}
    elif kind == "days":
        s = {"type": "number", "minimum": 1}
    elif kind == "flows":
        s = {"type": "array", "items": _unit_string("flow"), "minItems": 1}
    elif kind == "heads":
        s = {"type": "array", "items": _unit_string("length"), "minItems": 1}
    elif kind == "money":
        s = {"type": "string", "pattern": MONEY_PATTERN}
    elif kind == "parts":
        s = {"type": "array", "minItems": 1, "items": _table_schema("circuit.part")}
    elif kind == "spread":
        one = _unit_string("")
        pm = {"type": "string", "pattern": "^\\s*(±|\\+/-)"}
        s = {"anyOf": [pm, {"type": "array", "items": one, "minItems": 2, "maxItems": 2},
                       {"type": "object", "required": ["spread"], "additionalProperties": False,
                        "properties": {"spread": {"anyOf": [pm, {"type": "array", "items": one, "minItems": 2,
                                                                  "maxItems": 2}]},
                                       "distribution": {"enum": list(uncertainty_reader.DISTRIBUTIONS)}}}]}
    elif kind == "variants":
        s = {"anyOf": [_unit_string("length"), {"type": "array", "items": _unit_string("length"), "minItems": 1}]}
    elif kind == "axis":
        one = {"anyOf": [{"type": "number"}, _unit_string("")]}
        s = {"anyOf": [one, {"type": "array", "items": one, "minItems": 1},
                       {"type": "object", "required": ["from", "to"], "additionalProperties": False,
                        "properties": {"from": one, "to": one, "steps": {"type": "integer", "minimum": 1},
                                       "spacing": {"enum": ["linear", "log"]}}}]}
    else:  # pragma: no cover - the catalogue test holds every kind
        raise KeyError(f"{name}: kind {kind!r} is neither a unit kind nor one of {', '.join(OTHER_KINDS)}")
    return {"description": describe(name, f), **s}


def _by_kind(table: str, kinds: dict[str, tuple[str, ...]]) -> list[dict]:
    """Per kind (``[passage] kind``, a part's kind): only that kind's keys."""
    return [{"if": {"required": ["kind"], "properties": {"kind": {"const": k}}},
             "then": {"propertyNames": {"enum": list(keys)}}} for k, keys in kinds.items()]


def _table_schema(table: str) -> dict:
    keys = key_sets()[table]
    props = {k: value_schema(f"[{table}] {k}", FIELDS[f"[{table}] {k}"]) for k in keys}
    s = {"type": "object", "properties": props, "additionalProperties": False}
    if table == "passage":
        s |= {"required": ["kind"], "allOf": _by_kind(table, reader.PASSAGE_KEYS)}
    elif table == "circuit.part":
        s |= {"required": ["kind"], "allOf": _by_kind(table, supply_reader.PART_KEYS)}
    elif table == "circuit":
        s["required"] = ["part"]
    return s


def design_schema() -> dict:
    """The whole design file's JSON Schema (draft 2020-12)."""
    props = {"title": value_schema("[top] title", FIELDS["[top] title"])}
    for table in tables():
        t = _table_schema(table)
        props[table] = {"type": "array", "minItems": 1, "items": t,
                        "description": "heat sources on the mounting face, one [[source]] table each "
                                       "(instead of [heat])"} if table == "source" else t
    # the reader's own list: every table of _TOP but the title and [correlations] is required ([heat] or
    # [[source]], or [module] with positions: the anyOf below)
    required = ["title"] + [t for t in reader._TOP[1:-1] if t != "heat"]
    return {"$schema": DRAFT, "title": "coldplate design file", "type": "object", "properties": props,
            "required": required, "additionalProperties": False,
            "anyOf": [{"required": ["heat"]}, {"required": ["source"]},
                      {"required": ["module"], "properties": {"module": {"required": ["positions"]}}}],
            "not": {"required": ["heat", "source"]}}


def schema_text() -> str:
    import json

    return json.dumps(design_schema(), indent=2, ensure_ascii=False) + "\n"
