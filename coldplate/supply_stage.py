"""The supply stage of :func:`coldplate.solve.solve`: operating point, then planning, attached to the result.

Kept apart so the plain design check (no [circuit], no planning keys) imports neither scipy nor these modules.
"""
from __future__ import annotations

from dataclasses import replace


def supply_stage(design):
    """(flow for solve_plate or None, function that attaches the circuit and planning results)."""
    from .planning import wants_planning

    if design.circuit is None and not wants_planning(design):
        return None, lambda result: result
    from .operating import circuit_methods, operate
    from .planning import plan

    circuit = operate(design) if design.circuit is not None else None
    flow = circuit.V_dot if circuit is not None else None

    def attach(result):
        methods = result.methods + (circuit_methods(design, circuit) if circuit is not None else ())
        planning = plan(design, result.V_dot) if wants_planning(design) else None
        return replace(result, circuit=circuit, planning=planning, methods=methods)

    return flow, attach
