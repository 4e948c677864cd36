"""Findings about the heat sources on the mounting face (``[[source]]`` tables, or the one source of ``[heat]``).

Each rule reads the solved result only: ``Result.sources`` (per source, from the field model), ``Result.coupling``,
``Result.model``, ``Result.geometry`` and the design's sources.  None of these rules touches plumbing or electrical
safety (a device past its own temperature limit is a question of its datasheet), so none ends with ``DEFER``; the
plate's own rules (condensation on the face, cross-connection, ...) keep theirs.  Thresholds are named constants
with their source.
"""
from __future__ import annotations

from coldplate.findings.base import Finding, amount, degc
from coldplate.plate.sources import HEAT_SOURCE_NAME

#: A source whose hottest face is within this of its own limit gets a caution [K] (common practice: about the
#: spread of a datasheet's limit, a thermocouple's error and a few percent of the rise; the plate's dew-point
#: margin uses the same 2 K).
LIMIT_MARGIN = 2.0
#: Source j heats source i strongly when the coupling (mean face rise of i per watt of j) is above this share of
#: i's own rise per watt of its own load (our choice, common practice for calling a neighbour's heat
#: significant: a quarter of a device's own rise per watt).
COUPLING_SHARE = 0.25


def from_heat_table(d) -> bool:
    """Whether the design's one source is the centred source ``[heat]`` means (not ``[[source]]`` tables)."""
    if len(d.sources) != 1:
        return False
    s = d.sources[0]
    return (s.name == HEAT_SOURCE_NAME and abs(s.at[0] - d.plate.length / 2) < 1e-12 and s.at[1] == 0.0
            and s.size == (d.heat.footprint_length, d.heat.footprint_width))


def _judged(r):
    """(name, hottest face [K], limit [K], how it was found) for every source with a limit.  The field gives
    each source its own hottest face; the network its cautious estimate per source
    (``coldplate.plate.solve.network_sources``), or, without per-source figures, the plate's hottest face for
    every source (the cautious side)."""
    if r.sources:
        how = " (the network model's cautious estimate)" if r.model == "network" and len(r.sources) > 1 else ""
        return [(s.name, s.face_max, s.limit, how) for s in r.sources if s.limit is not None]
    return [(s.name, r.T_face_max, s.limit, " (the network model's hottest mounting face, taken for every source)")
            for s in r.design.sources if s.limit is not None]


def over_limit(r):
    """A source whose hottest face is above its own limit."""
    for name, hot, limit, how in _judged(r):
        if hot > limit:
            yield Finding(
                "source-over-limit", "warning",
                f"Source {name!r} reaches {degc(hot)}{how}, {amount(hot - limit)} K above its limit of "
                f"{degc(limit)}.",
                f"Lower the load on {name!r}, move it toward the inlet or away from its neighbours, add flow or a "
                "thinner interface, and check the device's own datasheet for what its limit protects.")


def near_limit(r):
    """A source within LIMIT_MARGIN of its limit (at or below it)."""
    for name, hot, limit, how in _judged(r):
        if limit - LIMIT_MARGIN < hot <= limit:
            yield Finding(
                "source-near-limit", "caution",
                f"Source {name!r} reaches {degc(hot)}{how}, within {amount(limit - hot)} K of its limit of "
                f"{degc(limit)} (a margin under {LIMIT_MARGIN:g} K leaves no room for the model's and the "
                "datasheet's own uncertainty; common practice).",
                f"Keep at least {LIMIT_MARGIN:g} K between {name!r} and its limit: a little more flow, a better "
                "interface or a place nearer the inlet.")


def over_plenum(r):
    """A ``[[source]]`` reaching over a plenum (and the ports that feed it) at either end of a channel plate.
    The ``[heat]`` footprint has its own rule (``findings.plate.footprint_over_plenum``)."""
    d = r.design
    off = r.geometry.cooled_offset
    if off <= 0 or from_heat_table(d):
        return
    L = d.plate.length
    ends = ((0.0, off, "inlet"), (L - off, L, "outlet"))
    for s in d.sources:
        x0, x1 = s.edges()[:2]
        for lo, hi, end in ends:
            over = min(x1, hi) - max(x0, lo)
            if over > 1e-9:
                yield Finding(
                    "source-over-plenum", "caution",
                    f"Source {s.name!r} reaches {amount(over * 1e3)} mm over the {end} plenum (the "
                    f"{amount(off * 1e3)} mm at the plate's {end} end, where the port feeds the channels): no "
                    "channel runs under that part of it, which is cooled only through the metal around it.",
                    f"Move {s.name!r} onto the channel length (between {amount(off * 1e3)} and "
                    f"{amount((L - off) * 1e3)} mm from the inlet edge), or shorten the plenum.")


def coupled(r):
    """Pairs of sources where one heats the other by more than COUPLING_SHARE of its own rise per watt."""
    C, S = r.coupling, r.sources
    if len(S) < 2 or len(C) != len(S):
        return
    pairs = []
    for i, si in enumerate(S):
        for j, sj in enumerate(S):
            if i != j and C[i][i] > 0 and C[i][j] > COUPLING_SHARE * C[i][i]:
                pairs.append(f"{sj.name!r} heats {si.name!r} by {amount(C[i][j])} K/W "
                             f"({100 * C[i][j] / C[i][i]:.0f} % of {si.name!r}'s own {amount(C[i][i])} K/W; "
                             f"{amount(C[i][j] * sj.load)} K at its load)")
    if pairs:
        yield Finding(
            "sources-coupled", "note",
            "Sources heat each other strongly (mean face rise per watt of the neighbour above "
            f"{100 * COUPLING_SHARE:.0f} % of the source's own, our threshold): " + "; ".join(pairs) + ".",
            "Spread the sources apart or put the one that tolerates heat downstream; a change of one source's "
            "load moves its neighbours' temperatures too.")


def network_smears(r):
    """With several sources, the network model estimates each cautiously instead of placing it."""
    d = r.design
    if r.model == "network" and len(d.sources) > 1:
        yield Finding(
            "network-smears-sources", "note",
            f"The network model does not place the {len(d.sources)} sources ({amount(r.load)} W): it estimates "
            "each one cautiously (its own spreading, plus the most every other source puts anywhere on the face, "
            "plus the water warmed upstream), so its figures can be well above the field's.",
            "Use the field model for each source's own hottest face, its margin and the coupling.")


RULES = (over_limit, near_limit, over_plenum, coupled, network_smears)
