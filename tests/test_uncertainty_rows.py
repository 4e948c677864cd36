"""The band's vectorised rows against the check's own solve (coldplate/uncertainty/propagate.py): the flow split's
share, thermoelectric modules, several sources, a supply that sets the flow.  Every reference here is computed by
our own solver (``solve_plate`` or the network check, ``solve(..., model="network")``, row by row): internal
consistency of two paths, not an outside source.  VALIDATION.md "Uncertainty bands" lists them."""
from __future__ import annotations

from dataclasses import replace

import numpy as np
import pytest

from coldplate.design.reader import design_from_dict
from coldplate.plate.solve import solve_plate
from coldplate.uncertainty.propagate import RowPlate

from .helpers import example_dict

KEYS = ["heat.load", "coolant.inlet_temperature", "coolant.flow"]


def _load_rows(d, flow, load):
    """Four fixed rows: the nominal, then load, inlet and flow moved (10 %, 3 K, 20 %)."""
    T = d.inlet_temperature
    return np.array([[load, T, flow], [1.1 * load, T + 3, flow], [0.9 * load, T - 3, 0.8 * flow],
                     [load, T, 1.25 * flow]])


@pytest.mark.parametrize("name", ["laser-bar-offset-ports", "reagent-block-channels"])
def test_rows_carry_the_checks_least_fed_share(name):
    # Source: computed by our own solver (solve_plate with its flow split, row by row).  The rows take the
    # check's least-fed share at the nominal: the nominal row equals solve_plate (the evaluator's table
    # interpolation, 1e-5), the others within 1 % of R_th (the share moves with the flow and the viscosity:
    # 0.563 at the nominal, 0.553 to 0.575 over these rows on the offset-port plate; measured 0.7 % at most).
    d = design_from_dict(example_dict(name))
    r = solve_plate(d)
    rows = _load_rows(d, d.flow, d.heat.load)
    plate = RowPlate(d, r, KEYS, rows)
    assert plate.share == pytest.approx(r.flow_split_min_to_mean) and plate.share < 0.9
    got = plate(rows[:, 2], rows[:, 0])
    for i, (Q, T, V) in enumerate(rows):
        ri = solve_plate(replace(d, inlet_temperature=T, heat=replace(d.heat, load=Q)), V, Q)
        assert (got.T_face[i] - T) / Q == pytest.approx(ri.R_th, rel=1e-5 if i == 0 else 1e-2)
