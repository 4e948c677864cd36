"""Sizing end to end: read the design file and its ``[search]``, search, refine, recommend, check.

:func:`size_file` is the Python API of ``coldplate size``.  The recommended design is solved once more by the
one-design check (:func:`coldplate.solve.solve`, with its findings), and its design-file text is built, so
what is printed and written is what ``coldplate check`` says about it.
"""
from __future__ import annotations

from dataclasses import dataclass, replace

from hydraulics.validity import at_most

from coldplate.design.reader import Design, design_from_dict, load_data, parse_design
from coldplate.plate.result import Result
from coldplate.check import solve
from coldplate.sizing.evaluate import Evaluator
from coldplate.sizing.refine import Refinement, refine
from coldplate.sizing.headers import Evaluators
from coldplate.sizing.run import Candidate, SearchOutcome, run_search
from coldplate.sizing.search import SearchSpec, read_search
from coldplate.sizing.writer import design_text


@dataclass(frozen=True)
class SizingResult:
    """What ``coldplate size`` reports (SI, kelvin)."""

    design: Design  #: the design file's own design (the starting point)
    spec: SearchSpec
    outcome: SearchOutcome
    refinement: Refinement | None
    recommended: Candidate | None  #: the refined candidate when refinement helped, else the grid's best
    why: tuple[str, ...]  #: sentences: why this one
    binding: tuple[str, ...]  #: when nothing is feasible: which limits bind, with the nearest values
    check: Result | None  #: the one-design check of the recommendation, with findings (the field model)
    text: str | None  #: the recommendation as a design file
    notes: tuple[str, ...]
    network_check: Result | None = None  #: the same check with the network model the search runs on


def read_file(path) -> tuple[dict, Design, SearchSpec]:
    """Read a design file with a ``[search]`` table; DesignError on any problem."""
    data = load_data(path)
    design = design_from_dict(data)
    return data, design, read_search(data, design)


def size_file(path, progress=None, do_refine: bool = True) -> SizingResult:
    data, design, spec = read_file(path)
    return size(data, design, spec, progress, do_refine)


def size(data: dict, design: Design, spec: SearchSpec, progress=None, do_refine: bool = True) -> SizingResult:
    first = []
    if design.module is not None:  # the plate's load is the modules' heat: take it at the starting design
        start = solve(design, model="network")  # the search runs on the network
        design = replace(design, heat=replace(design.heat, load=start.load))
        first.append(f"plate load: the modules' hot-side heat at the starting design, {start.load:.4g} W "
                     f"({start.module.current:.3g} A per module); the recommendation's check below solves the "
                     "modules on it again")
    if design.supply.drive != "flow":
        first.append("the written design fixes the recommended flow (drive = \"flow\"); its [circuit] then reports "
                     "the supply pressure that flow needs: set the flow with a valve")
    ev = Evaluators(design, Evaluator(design))  # one per header variant the search lists (sizing.headers)
    outcome = run_search(spec, design, ev, progress=progress)
    refinement = None
    interrupted = outcome.interrupted
    if do_refine and not interrupted and outcome.best is not None:
        try:
            refinement = refine(outcome, ev)
        except KeyboardInterrupt:
            interrupted = True
    chosen = outcome.best
    if refinement is not None and refinement.result is not None:
        chosen = refinement.result
    notes = [f"pressure limit: {spec.limits.pressure_source}"] + first
    if interrupted:
        notes.append("the search was interrupted: the result is the best of the part searched")
    if chosen is None:
        return SizingResult(design, spec, outcome, refinement, None, (), _binding(outcome), None, None,
                            tuple(notes))
    flows = spec.axes["flow"]
    if flows.size > 1 and chosen.flow <= flows.min() * (1 + 1e-9):
        notes.append("the recommended flow is the lowest of the range: a lower 'from' may find a design that "
                     "uses even less water")
    text = design_text(data, dict(chosen.values), design,
                       header=f"Written by coldplate size: the recommended plate for {design.title!r}.")
    recommended = parse_design(text)
    check = solve(recommended, model="field")  # the re-check: the plate as a field
    network = solve(recommended, model="network")
    why = _why(outcome, refinement, chosen, check, design, network)
    return SizingResult(design, spec, outcome, refinement, chosen, why, (), check, text, tuple(notes), network)


def _water(flow: float, design: Design) -> str:
    if design.supply.once_through:
        return (f"{flow * 1e3 * design.supply.seconds_per_day:,.0f} L/day "
                f"({flow * 6e4:.3g} L/min for {design.supply.hours_per_day:g} h a day)")
    return f"{flow * 6e4:.3g} L/min (the water returns to its loop)"


def _why(outcome: SearchOutcome, refinement: Refinement | None, chosen: Candidate, check: Result,
         design: Design, network: Result | None = None) -> tuple[str, ...]:
    lim = outcome.spec.limits
    grid = outcome.best
    out = [f"Of {outcome.feasible:,} candidates that meet every limit, it needs the least water: "
           f"{_water(chosen.flow, design)}."]
    same = sum(1 for c in outcome.pareto if c.flow == grid.flow)
    there = ("it is the only design on the trade-off front there" if same == 1 else
             f"of the {same} designs on the trade-off front there, the grid's pick runs coolest, leaving the most "
             "margin on the mounting face")
    out.append(f"On the grid, the least flow that meets every limit is {grid.flow * 6e4:.3g} L/min; {there}.")
    if refinement is not None and refinement.result is not None:
        points = "grid point" if refinement.starts == 1 else "grid points"
        gain = (f"cut the flow from {grid.flow * 6e4:.3g} to {chosen.flow * 6e4:.3g} L/min"
                if chosen.flow < grid.flow else f"lowered R from {grid.R_th:.4f} to {chosen.R_th:.4f} K/W")
        out.append(f"Refinement (SLSQP over {', '.join(refinement.varied)}, from {refinement.starts} {points}) "
                   f"{gain}, rounded to 0.01 mm and 0.01 L/min and checked again.")
    elif refinement is not None:
        out.append("Refinement between grid points found nothing better that still meets every limit.")
    def vs(value, limit):  # the one-design check is compared, not assumed to meet the limit
        return "<=" if at_most(value, limit) else "> (NOT MET)"

    met = [f"mounting face {check.T_face_max - 273.15:.1f} degC {vs(check.T_face_max, lim.face)} "
           f"{lim.face - 273.15:.1f} degC"]
    if lim.pressure_drop is not None:
        met.append(f"plate pressure drop {check.dp / 1e3:.2f} kPa {vs(check.dp, lim.pressure_drop)} "
                   f"{lim.pressure_drop / 1e3:.3g} kPa")
    if lim.discharge is not None:
        met.append(f"outlet {check.T_out - 273.15:.1f} degC {vs(check.T_out, lim.discharge)} "
                   f"{lim.discharge - 273.15:.1f} degC")
    out.append(f"Limits in the one-design check ({check.model} model): " + "; ".join(met) + ".")
    if network is not None:
        out.append(f"The one-design check with the network model (the search's) gives R = {network.R_th:.4f} K/W "
                   f"against the search's {chosen.R_th:.4f} K/W ({abs(network.R_th / chosen.R_th - 1) * 100:.3f} % "
                   f"apart); re-checked as a field, R = {check.R_th:.4f} K/W, "
                   f"{(check.R_th / network.R_th - 1) * 100:+.1f} % against the network, the hottest face "
                   f"{check.T_face_max - 273.15:.1f} degC against {network.T_face_max - 273.15:.1f} degC.")
    else:
        out.append(f"The one-design check ({check.model} model) gives R = {check.R_th:.4f} K/W against the "
                   f"search's {chosen.R_th:.4f} K/W ({abs(check.R_th / chosen.R_th - 1) * 100:.3f} % apart).")
    return tuple(out)


#: How each limit's values are shown: name -> (label, formatter of an SI value).
LIMIT_TEXT = {
    "boiling": ("the coolant boils (flow too small for the load)", None),
    "face_limit": ("mounting-face limit", lambda v: f"{v - 273.15:.2f} degC"),
    "pressure_drop_limit": ("pressure-drop limit", lambda v: f"{v / 1e3:.3g} kPa"),
    "discharge_limit": ("discharge limit", lambda v: f"{v - 273.15:.1f} degC"),
    "max_water": ("water-use limit", lambda v: f"{v * 86400e3:,.0f} L/day"),
    "min_width": ("smallest channel width", lambda v: f"{v * 1e3:.3g} mm"),
    "min_wall": ("thinnest wall", lambda v: f"{v * 1e3:.3g} mm"),
    "max_thickness": ("plate stock thickness", lambda v: f"{v * 1e3:.3g} mm"),
}


def binding_line(outcome: SearchOutcome) -> str:
    """One line for stderr when nothing is feasible: which limits bind, with the nearest values reached."""
    if outcome.candidates == 0:
        return "no combination of the [search] ranges can be built (no wall between channels, or the passes do not fit)"
    alone = sorted((c for c in outcome.limits if c.only), key=lambda c: -c.only)
    head = f"no design meets every limit ({outcome.evaluated:,} evaluated)"
    if alone:
        parts = []
        for c in alone:
            label, fmt = LIMIT_TEXT[c.name]
            parts.append(f"[search] {c.name} ({label}) binds alone in {c.only:,}" if fmt is None else
                         f"[search] {c.name} {fmt(c.limit)} binds alone in {c.only:,} (nearest {fmt(c.nearest)})")
        return f"{head}: " + "; ".join(parts) + "; relax one of these or widen the ranges"
    failing = [f"{c.name} fails {c.failed:,}" for c in outcome.limits if c.failed]
    return f"{head}: every candidate fails two or more limits ({', '.join(failing)}); widen the ranges"


def _binding(outcome: SearchOutcome) -> tuple[str, ...]:
    if outcome.candidates == 0:
        return ("No combination of the ranges can be built: the channels leave no wall between them, or the "
                "passes do not fit the plate.",)
    alone = sorted((c for c in outcome.limits if c.only), key=lambda c: -c.only)
    out = [f"No candidate meets every limit ({outcome.evaluated:,} evaluated)."]
    for c in alone:
        label, fmt = LIMIT_TEXT[c.name]
        if fmt is None:
            out.append(f"{c.name} binds: {label} in {c.only:,} candidates; raise the flow's range.")
        else:
            out.append(f"{c.name} binds: relaxing the {label} ({fmt(c.limit)}) alone would admit {c.only:,} "
                       f"candidates; the nearest reaches {fmt(c.nearest)}.")
    if not alone:
        parts = [f"{c.name} fails {c.failed:,}" for c in outcome.limits if c.failed]
        out.append("No single limit binds alone: every candidate fails two or more (" + ", ".join(parts) + ").")
    return tuple(out)
