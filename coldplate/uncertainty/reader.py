"""The optional ``[uncertainty]`` table: which design values are unsure, and by how much.

Each entry names a design key (``"table.key"``, quoted in TOML because of the dot) and its spread:

* ``"±30 %"`` (or ``"+-30 %"``): a relative tolerance about the design's value;
* ``"±0.02 mm"``: an absolute tolerance in the key's units (a temperature's in K or delta_degC);
* ``["8 degC", "22 degC"]``: a range of values (seasonal tap water);
* ``{ spread = "±10 %", distribution = "normal" }``: any of the above with a distribution.  ``uniform`` (the
  default) spreads the values evenly between the ends; ``normal`` puts the ends at ±2 standard deviations
  (about 95 % of values inside them), centred between the ends.

Besides the spreads: ``correlations`` (default true: each correlation's published scatter, coldplate/uncertainty/
scatter.py), ``samples`` (default 4000 through the evaluator, 200 through repeated checks, 64 where each of those
solves a circuit or modules too), ``seed`` (default 1)
and ``confidence`` (default "90 %": the 5 %–95 % band; ``coldplate check --confidence`` overrides it).
Every error names ``[uncertainty] key`` on one line; the table is read before anything is solved.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from coldplate.design.errors import DesignError
from coldplate.design.fields import Table, check_range, nearest
from coldplate.design.ranges import RANGES
from coldplate.design.units import parse_value, quoted

TABLE = "uncertainty"
#: design key -> unit kind of its value.  The keys the propagation knows how to vary.
INPUTS = {
    "heat.load": "power",
    "coolant.inlet_temperature": "temperature",
    "coolant.flow": "flow",
    "interface.resistance": "area_resistance",
    "interface.conductivity": "conductivity",
    "interface.thickness": "length",
    "passage.width": "length",
    "passage.depth": "length",
    "passage.inner_diameter": "length",
    "passage.height": "length",
}
#: Passage keys and the passage kind that has them.
PASSAGE_INPUTS = {"passage.width": "channels", "passage.depth": "channels", "passage.inner_diameter": "tube",
                  "passage.height": "cavity"}
SETTINGS = ("correlations", "samples", "seed", "confidence")
DISTRIBUTIONS = ("uniform", "normal")
#: Samples through the vectorised evaluator, and through repeated checks (each a whole check).
DEFAULT_SAMPLES = 4000
FALLBACK_SAMPLES = 200
#: ... and where each sample also solves a circuit's operating point or the modules (0.1 to 0.15 s a check here).
SLOW_FALLBACK_SAMPLES = 64
SAMPLE_RANGE = (16, 200_000)
DEFAULT_SEED = 1
DEFAULT_CONFIDENCE = 0.90
CONFIDENCE_RANGE = (0.5, 0.998)  #: open at both ends: a band needs room for samples beyond each end
_PLUS_MINUS = re.compile(r"^\s*(?:±|\+/-|\+-)\s*(.+?)\s*$")


@dataclass(frozen=True)
class Spread:
    """One unsure input, resolved against a design: its ends (SI, kelvin) and distribution."""

    key: str  #: design key, e.g. "heat.load"
    nominal: float  #: the design's value
    low: float
    high: float
    distribution: str  #: "uniform" or "normal"
    text: str  #: as written


@dataclass(frozen=True)
class Written:
    """One entry as written, before a design gives it a nominal: ``form`` "relative", "absolute" or "range"."""

    key: str
    form: str
    a: float  #: relative or absolute half-width, or the range's low end
    b: float  #: the range's high end (unused otherwise)
    distribution: str
    text: str


@dataclass(frozen=True)
class UncertaintySpec:
    """A read ``[uncertainty]`` table (or the correlation scatter alone, from ``--confidence``)."""

    entries: tuple[Written, ...]
    correlations: bool
    samples: int | None  #: None: the default of the path taken
    seed: int
    confidence: float

    def spreads(self, design, data: dict) -> tuple[Spread, ...]:
        """The entries resolved against ``design`` (the recommendation of a search, or the file's own)."""
        return tuple(_resolve(w, design, data) for w in self.entries)


def parse_confidence(raw, field: str) -> float:
    """A confidence such as ``"90 %"`` or ``0.9`` (a fraction), inside :data:`CONFIDENCE_RANGE`."""
    c = parse_value(raw, "fraction", field)
    lo, hi = CONFIDENCE_RANGE
    if not (lo < c < hi):
        raise DesignError(field, f"{quoted(raw)} is outside {lo * 100:g} % < confidence < {hi * 100:g} %")
    return c


def read_uncertainty(data: dict, design, confidence: float | None = None) -> UncertaintySpec | None:
    """The ``[uncertainty]`` table of a design file's data, checked against ``design``; None when absent and no
    ``confidence`` is asked for (with one and no table: the correlation scatter alone)."""
    raw = data.get(TABLE)
    if raw is None:
        if confidence is None:
            return None
        return UncertaintySpec((), True, None, DEFAULT_SEED, confidence)
    t = Table(raw, TABLE, (*SETTINGS, *INPUTS))
    for key in (*SETTINGS, *INPUTS):
        if key in raw:
            t.raw(key)
    t.finish()  # a misspelt key is named first, with the nearest known one
    correlations = raw.get("correlations", True)
    if not isinstance(correlations, bool):
        raise DesignError(t.field("correlations"), f"must be true or false, got {quoted(correlations)}")
    samples = t.integer("samples", *SAMPLE_RANGE) if t.has("samples") else None
    seed = t.integer("seed", 0, 2**32 - 1) if t.has("seed") else DEFAULT_SEED
    if confidence is None:
        confidence = parse_confidence(raw["confidence"], t.field("confidence")) if t.has("confidence") \
            else DEFAULT_CONFIDENCE
    entries = tuple(_written(key, raw[key], t.field(key)) for key in INPUTS if key in raw)
    spec = UncertaintySpec(entries, correlations, samples, seed, confidence)
    spec.spreads(design, data)  # every entry checked against the design now, before anything is solved
    if not entries and not correlations:
        raise DesignError(f"[{TABLE}]", "names no unsure input and leaves the correlations out: nothing to vary")
    return spec


def _written(key: str, raw, field: str) -> Written:
    distribution = "uniform"
    if isinstance(raw, dict):
        unknown = sorted(set(raw) - {"spread", "distribution"})
        if unknown:
            raise DesignError(field, f"unknown key {quoted(unknown[0])} (known: "
                                     f"{', '.join(nearest(unknown[0], ('spread', 'distribution')))})")
        if "spread" not in raw:
            raise DesignError(field, "an inline table needs 'spread', e.g. { spread = \"±10 %\", distribution = "
                                     "\"normal\" }")
        distribution = raw.get("distribution", "uniform")
        if distribution not in DISTRIBUTIONS:
            raise DesignError(field, f"distribution must be one of {', '.join(DISTRIBUTIONS)}, not "
                                     f"{quoted(distribution)}")
        raw = raw["spread"]
    kind = INPUTS[key]
    if isinstance(raw, list):
        if len(raw) != 2:
            raise DesignError(field, "a range is two values, low and high, e.g. [\"8 degC\", \"22 degC\"]")
        lo, hi = (parse_value(v, kind, f"{field} ({end})") for v, end in zip(raw, ("low", "high")))
        if not hi > lo:
            raise DesignError(field, "the range's high end must be above its low end")
        return Written(key, "range", lo, hi, distribution, f"{raw[0]} to {raw[1]}")
    m = _PLUS_MINUS.match(raw) if isinstance(raw, str) else None
    if m is None:
        raise DesignError(field, f"cannot read {quoted(raw)}; write a tolerance such as \"±10 %\" or "
                                 "\"±0.02 mm\", or a range [low, high]")
    rest = m.group(1)
    if rest.endswith("%"):
        a = parse_value(rest, "fraction", field)
        if kind == "temperature":
            raise DesignError(field, "a temperature's tolerance is in K or delta_degC, not %")
        if not 0 < a < 1:
            raise DesignError(field, f"{quoted(raw)}: a relative tolerance must be above 0 % and below 100 %")
        return Written(key, "relative", a, 0.0, distribution, raw.strip())
    a = parse_value(rest, "temperature_difference" if kind == "temperature" else kind, field)
    if not a > 0:
        raise DesignError(field, f"{quoted(raw)}: a tolerance must be above zero")
    return Written(key, "absolute", a, 0.0, distribution, raw.strip())


def nominal_value(key: str, design, data: dict) -> float:
    """The design's own value of an unsure input (SI); DesignError when the design has no such value."""
    d, field = design, f"[{TABLE}] {key}"
    if key in PASSAGE_INPUTS and d.passage.kind != PASSAGE_INPUTS[key]:
        raise DesignError(field, f"a {d.passage.kind} passage has no {key.split('.')[1]}")
    if key == "heat.load":
        return d.module.cold_load if d.module is not None else d.heat.load
    if key == "coolant.inlet_temperature":
        return d.inlet_temperature
    if key == "coolant.flow":
        if d.flow is None:
            raise DesignError(field, "the supply sets this design's flow (drive is not \"flow\"); give the "
                                     "supply's spread instead, or fix the flow")
        return d.flow
    if key == "interface.resistance":
        return d.interface.resistance_area
    if key.startswith("interface."):
        name = key.split(".")[1]
        given = data.get("interface", {})
        if name not in given:
            raise DesignError(field, f"the design gives the interface as {d.interface.described_as}, without "
                                     f"{name}; give interface.resistance's spread instead")
        return parse_value(given[name], INPUTS[key], f"[interface] {name}")
    return float(getattr(d.passage, key.split(".")[1]))


def _resolve(w: Written, design, data: dict) -> Spread:
    nom = nominal_value(w.key, design, data)
    field = f"[{TABLE}] {w.key}"
    if w.form == "relative":
        lo, hi = nom * (1 - w.a), nom * (1 + w.a)
    elif w.form == "absolute":
        lo, hi = nom - w.a, nom + w.a
    else:
        lo, hi = w.a, w.b
    kind = INPUTS[w.key]
    if kind != "temperature" and not lo > 0:
        raise DesignError(field, f"{quoted(w.text)} reaches zero or below; give a smaller tolerance")
    table, name = w.key.split(".")
    bound = RANGES.get(f"[{table}] {name}")
    if bound is not None:
        for end, v in (("low end", lo), ("high end", hi)):
            check_range(f"{field} ({end})", w.text, v, kind, bound)
    if w.key == "passage.width" and hi * design.passage.count >= design.plate.width:
        raise DesignError(f"{field} (high end)", f"{design.passage.count} channels {hi * 1e3:.4g} mm wide do not fit "
                                                 f"the plate's {design.plate.width * 1e3:.4g} mm width")
    return Spread(w.key, nom, lo, hi, w.distribution, w.text)
