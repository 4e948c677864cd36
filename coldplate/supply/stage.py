"""The supply stage of :func:`coldplate.solve.solve`: operating point, then planning, attached to the result.

Kept apart so the plain design check (no [circuit], no planning keys) imports neither scipy nor these modules.
"""
from __future__ import annotations

from dataclasses import replace

#: What the circuit model assumes, added to the result's assumptions when there is a circuit.
CIRCUIT_ASSUMPTIONS = (
    "circuit: lines before the plate carry the coolant at the inlet temperature, lines after it at the outlet "
    "temperature, at the same mass flow; pressures are static gauge values with the velocity head lost only at "
    "the outlet",
    "circuit: fitting loss coefficients are the turbulent values (Crane TP-410, Rennels); backflow devices lose "
    "their opening loss plus a part growing with the square of the flow (typical values unless given)",
)

#: With thermoelectric modules the plate's load changes with the flow (their hot face moves); planning holds it.
MODULE_PLANNING_ASSUMPTION = (
    "planning with modules: the least flow and the water-use curve hold the plate's load at the modules' heat at "
    "the operating point (at less flow their hot face and heat rise a little, so the least flow is a lower bound)")


def supply_stage(design, load: float | None = None):
    """(flow for solve_plate or None, function that attaches the circuit and planning results).

    ``load`` is the heat into the plate [W] when it is not the design's own (thermoelectric modules).
    """
    from coldplate.supply.planning import wants_planning

    if design.circuit is None and not wants_planning(design):
        return None, lambda result: result
    from coldplate.supply.operating import PlateAt, circuit_methods, operate, system_curve
    from coldplate.supply.planning import plan

    plate = PlateAt(design, load)  # one set of plate solves for the operating point and planning
    planning_wanted = wants_planning(design)
    # with planning (and no pump, whose curve the system curve must reach), the system curve is drawn through the
    # water-use curve's flows, which planning solves anyway (from half the least flow to twice the operating flow)
    shared = planning_wanted and design.supply.drive != "pump"
    circuit = operate(design, load, plate, curve=not shared) if design.circuit is not None else None
    flow = circuit.V_dot if circuit is not None else None

    def attach(result):
        nonlocal circuit
        methods = result.methods + (circuit_methods(design, circuit, result) if circuit is not None else ())
        planning = plan(design, result.V_dot, load, plate) if planning_wanted else None
        if circuit is not None and circuit.curve is None:
            flows = planning.use_curve.V_dot
            circuit = replace(circuit, curve=system_curve(plate, 2.0 * circuit.V_dot, flows=flows or None))
        assumptions = result.assumptions + (CIRCUIT_ASSUMPTIONS if circuit is not None else ())
        if planning is not None and load is not None:
            assumptions += (MODULE_PLANNING_ASSUMPTION,)
        return replace(result, circuit=circuit, planning=planning, methods=methods, assumptions=assumptions)

    return flow, attach
