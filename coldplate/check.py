"""The check: one design in, one frozen :class:`Result` out, every stage in order.

design (``coldplate.design``) → supply stage (``coldplate.supply``: the flow a circuit delivers, the water
planning) → plate (``coldplate.plate``), with thermoelectric modules solved together with it when the design has
them (``coldplate.modules``) → findings (the plate's rules in ``coldplate.findings``, then each concept's own).
This is the only module that knows every stage; the stages know nothing of it.
"""
from __future__ import annotations

from dataclasses import replace
from functools import partial

from coldplate.air.findings import RULES as AIR_RULES
from coldplate.design.reader import Design, load_design
from coldplate.findings.base import SEVERITIES, Finding
from coldplate.findings.flow_split import RULES as FLOW_SPLIT_RULES
from coldplate.findings.plate import RULES as PLATE_RULES
from coldplate.findings.sources import RULES as SOURCE_RULES
from coldplate.modules.findings import RULES as MODULE_RULES
from coldplate.plate.result import Result
from coldplate.plate.solve import solve_plate, split_carrying
from coldplate.supply.findings import RULES as SUPPLY_RULES

#: Every rule, in the order their findings are listed within one severity.
RULES = PLATE_RULES + FLOW_SPLIT_RULES + SOURCE_RULES + MODULE_RULES + SUPPLY_RULES + AIR_RULES


#: The plate models: "field" (the 3-D solve, default) and "network" (the fast resistance network).
MODELS = ("field", "network")


def plate_model(model: str):
    """The plate function of a model name (both take design, flow, load and return a Result)."""
    if model == "field":
        from coldplate.plate.fieldcheck import solve_plate_field  # imports scipy

        return solve_plate_field
    if model == "network":
        return solve_plate
    raise ValueError(f"unknown plate model {model!r}: one of {', '.join(MODELS)}")


def check_file(path, model: str = "field") -> Result:
    """Read a design file and solve it (the Python API of ``coldplate check``)."""
    return solve(load_design(path), model=model)


def solve(design: Design, model: str = "field") -> Result:
    """Solve the design check for one design: the plate at the design's flow and load, then the findings.

    ``model``: "field" (the plate as a 3-D field, every source placed; default) or "network" (the fast
    resistance network over one stand-in footprint).  With a [circuit], the flow is the circuit's operating
    point; once-through supplies with planning keys get the water planning (coldplate/supply/stage.py).  With
    thermoelectric modules the plate's load is their hot-side heat (coldplate/modules/solve.py), solved with
    the chosen model's plate function.
    """
    from coldplate.supply.stage import supply_stage  # imports scipy only when a circuit or planning is asked for

    plate = plate_model(model)
    if design.module is None:
        flow, attach = supply_stage(design)
        result = attach(plate(design, flow))
    else:
        result = _solve_with_modules(design, supply_stage, plate)
    if design.air is not None:  # the air-cooled alternative beside the water design (coldplate/air/stage.py)
        from coldplate.air.stage import solve_air
        result = replace(result, air=solve_air(design, result))
    return replace(result, findings=collect_findings(result))


def _solve_with_modules(design: Design, supply_stage, plate=solve_plate) -> Result:
    """Modules and supply together.  The supply's flow depends on the plate's load only through the coolant's
    properties, so: the supply at a first load (twice the cold-side load, a COP of one), the modules at that
    flow, then the supply at the modules' real heat and the modules once more at its flow.  On the field model
    the modules are solved by :func:`module_solver`'s calibration, the second pass starting from the first's
    scale (one field solve more when it still holds)."""
    solve_modules = module_solver(plate)
    flow, attach = supply_stage(design, load=max(2.0 * design.module.cold_load, 1.0))
    if flow is not None:
        first = solve_modules(design, flow)
        flow, attach = supply_stage(design, load=first.load)
    result = solve_modules(design, flow)
    if flow is None:  # no circuit: planning (if any) at the modules' real heat
        _, attach = supply_stage(design, load=result.load)
    return attach(result)


def module_solver(plate=solve_plate):
    """``solve(design, flow) -> Result`` for the modules on the plate function ``plate``.

    The network (``solve_plate``) is handed to the module solve as it is (coldplate.modules.solve.solve_with_module,
    several plate solves).  Any other plate function (the field) is not called once per step of the module solve:
    the module solve runs on the network scaled by the field's resistance over the network's, and the field is
    solved only at the modules' heat until the two agree (solve_with_module_field: two field solves, one more on
    a later call, which starts from the scale the last call ended with).  Modules placed one by one ([module] positions)
    then get each its own hot face from the field (coldplate.modules.placed.solve_placed_field).
    """
    from coldplate.modules.placed import solve_placed_field
    from coldplate.modules.solve import solve_with_module, solve_with_module_field

    if plate is solve_plate:
        return lambda design, flow: solve_with_module(design, split_carrying(flow))
    scale = [1.0]

    def on_field(design, flow):
        solver = solve_placed_field if design.module.placed else solve_with_module_field
        result = solver(design, partial(plate, flow=flow), split_carrying(flow), scale=scale[0])
        scale[0] = result.module.field_scale
        return result

    return on_field


def collect_findings(r) -> tuple[Finding, ...]:
    """Every finding for a solved result, most severe first."""
    out: list[Finding] = []
    for rule in RULES:
        out.extend(rule(r))
    rank = {s: i for i, s in enumerate(SEVERITIES)}
    return tuple(sorted(out, key=lambda f: rank[f.severity]))
