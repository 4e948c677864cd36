"""Thermoelectric modules on the field model in a few field solves (coldplate.modules.solve.solve_with_module_field).

What is checked, and against what (the module model itself is checked against outside references in
test_thermoelectric.py and test_demo_module.py; these hold the calibration to the field it stands in for):

* the modules' hot face equals the hottest mounting face of a fresh field solve at the modules' heat, within
  1e-3 K (computed by our own solver: the field solve itself, coldplate.plate.fieldcheck.solve_plate_field);
* the calibrated answer equals the module solve run on the field at every step (the former path, seven field
  solves) within 1e-4 K (computed by our own solver, two paths);
* the number of field solves is small: counted with a wrapper, never timed;
* the network model's numbers are those of the module solve on solve_plate (the path before the calibration)
  to 1e-12 (computed by our own solver, two paths);
* the first law: Q_hot = Q_cold + electrical power (common practice);
* the calibration's algorithm on stand-in plate functions whose true scale is known exactly (computed: the
  scale is set in the test).
"""
from __future__ import annotations

import json
from functools import partial

import pytest

from coldplate import check
from coldplate.design.errors import SolveError
from coldplate.design.reader import design_from_dict
from coldplate.modules import solve as modsolve
from coldplate.plate import fieldcheck
from coldplate.plate.solve import solve_plate
from tests.helpers import example_dict, modified

TE = example_dict("sample-stage-thermoelectric")
#: the thermoelectric stage fed through the tap circuit (as test_module_with_supply.py builds it)
TAP = example_dict("tap-to-drain-circuit")
COMBINED = dict(TE, supply=dict(TAP["supply"]), circuit=TAP["circuit"],
                coolant={k: v for k, v in TE["coolant"].items() if k != "flow"})
#: the same stage asked for a cold face instead of a current
TARGET = modified(TE, module__current=None, module__cold_face_temperature="-5 degC")


class Counted:
    """A plate function with a count of its calls."""

    def __init__(self, solve):
        self.solve, self.calls = solve, 0

    def __call__(self, *args, **kwargs):
        self.calls += 1
        return self.solve(*args, **kwargs)


@pytest.fixture
def counted(monkeypatch):
    """Every field solve the check makes goes through a counter (check.plate_model reads the attribute)."""
    counter = Counted(fieldcheck.solve_plate_field)
    monkeypatch.setattr(fieldcheck, "solve_plate_field", counter)
    return counter


#: the agreement asked of the modules' hot face and the field's hottest face [K] (the calibration's own
#: FIELD_TOLERANCE_K may be tighter, not looser)
TOL = 1e-3

DESIGNS = {"te": TE, "combined": COMBINED, "target": TARGET}
_SOLVED: dict = {}


def _solved(name: str):
    """(design, field-model result, field solves counted) for one of the designs above, solved once."""
    if name not in _SOLVED:
        design = design_from_dict(DESIGNS[name])
        original = fieldcheck.solve_plate_field
        counter = fieldcheck.solve_plate_field = Counted(original)
        try:
            result = check.solve(design, model="field")
        finally:
            fieldcheck.solve_plate_field = original
        _SOLVED[name] = (design, result, counter.calls)
    return _SOLVED[name]


@pytest.mark.parametrize("name", ["te", "combined", "target"])
def test_hot_face_is_the_fields_hottest_face_at_the_modules_heat(name):
    design, r, _ = _solved(name)
    m = r.module
    fresh = fieldcheck.solve_plate_field(design, flow=r.V_dot, load=m.Q_hot)
    # computed: the field solve itself at the modules' heat and the operating flow
    assert modsolve.FIELD_TOLERANCE_K <= TOL
    assert abs(fresh.T_face_max - m.T_hot) <= TOL
    # the reported plate result is that true field solve (same load, same face), with the modules attached
    assert r.model == "field" and r.load == pytest.approx(m.Q_hot, rel=1e-12)
    assert r.T_face_max == pytest.approx(fresh.T_face_max, abs=1e-9)
    assert r.R_th == pytest.approx(fresh.R_th, rel=1e-9)
    assert r.field is not None and r.grid_uncertainty == pytest.approx(fresh.grid_uncertainty, abs=1e-9)
    # the scale the modules ran on is the field's resistance over the network's there (within the tolerance)
    network = solve_plate(design, flow=r.V_dot, load=m.Q_hot)
    assert m.field_scale * network.R_th * m.Q_hot == pytest.approx(fresh.R_th * m.Q_hot,
                                                                   abs=TOL)


@pytest.mark.parametrize("name, most", [("te", 3), ("target", 3), ("combined", 4)])
def test_few_field_solves(name, most):
    _, r, calls = _solved(name)
    # counted with a wrapper around solve_plate_field, no clock: the module solve on the field was 7 field
    # solves (14 with the circuit's two passes) before the calibration
    assert 2 <= calls <= most
    # the last calibration's own count (with a circuit the first pass's solves come before it)
    assert r.module.field_solves == (calls if name != "combined" else calls - 2)


def test_energy_balance_on_the_field():
    # the first law, Q_hot = Q_cold + P (common practice), at the operating point the field calibration found
    for name in ("te", "combined", "target"):
        m = _solved(name)[1].module
        assert m.Q_hot == pytest.approx(m.Q_cold + m.power, rel=1e-9)


def test_target_cold_face_met_on_the_field():
    design, r, _ = _solved("target")
    # the design asks for -5 degC at the cold face; the module solve's secant stops within 1e-5 K
    assert r.module.T_cold == pytest.approx(design.module.cold_face_target, abs=1e-5)


def test_calibration_equals_the_module_solve_on_the_field_at_every_step():
    """The former path (every module-solve step a field solve) against the calibrated one (computed: our
    own solver on two paths); the hot faces agree within a tenth of the calibration's tolerance."""
    design, r, _ = _solved("te")
    full = modsolve.solve_with_module(design, fieldcheck.solve_plate_field)
    assert r.module.T_hot == pytest.approx(full.module.T_hot, abs=1e-4)
    assert r.module.T_cold == pytest.approx(full.module.T_cold, abs=1e-4)
    assert r.module.Q_hot == pytest.approx(full.module.Q_hot, abs=1e-4)
    assert r.T_face_max == pytest.approx(full.T_face_max, abs=1e-4)
    # the sweep runs on the scaled network against the field's own nodes: within 0.02 K (as the plate line's
    # interpolation is held in test_module_solve.py)
    assert max(abs(a - b) for a, b in zip(r.module.sweep.T_cold, full.module.sweep.T_cold)) < 0.02


def _numbers(r) -> dict:
    m = r.module
    out = {k: getattr(r, k) for k in ("T_face_max", "R_th", "load", "V_dot", "dp", "T_out", "T_plate_max")}
    out.update({f"module.{k}": getattr(m, k) for k in ("T_hot", "T_cold", "Q_hot", "current", "power",
                                                         "coldest_current", "best_cop_current", "R_plate")})
    out.update({f"sweep.{i}": t for i, t in enumerate(m.sweep.T_cold)})
    return out


@pytest.mark.parametrize("name", ["te", "target", "combined"])
def test_network_model_unchanged(name, counted):
    design = design_from_dict(DESIGNS[name])
    r = check.solve(design, model="network")
    assert counted.calls == 0 and r.model == "network"
    assert r.module.field_solves == 0 and r.module.field_scale is None
    # the path before the calibration: the module solve on solve_plate (with a circuit: the supply at twice
    # the cold load, the modules at that flow, the supply at their heat, the modules once more)
    from coldplate.supply.stage import supply_stage

    flow, attach = supply_stage(design, load=max(2.0 * design.module.cold_load, 1.0))
    if flow is not None:
        first = modsolve.solve_with_module(design, partial(solve_plate, flow=flow))
        flow, attach = supply_stage(design, load=first.load)
    before = modsolve.solve_with_module(design, partial(solve_plate, flow=flow))
    if flow is None:
        _, attach = supply_stage(design, load=before.load)
    before = attach(before)
    a, b = _numbers(r), _numbers(before)
    assert a.keys() == b.keys()
    for k in a:
        assert a[k] == pytest.approx(b[k], rel=1e-12, abs=1e-12), k


def _pretend(scale):
    """A stand-in pair of plate functions: the network as "field", the network times ``scale`` as "network"
    (so the true field-over-network ratio is exactly 1 / scale at every load)."""
    return solve_plate, modsolve.scaled_solver(solve_plate, scale)


@pytest.mark.parametrize("scale", [1.7, 0.6])
def test_calibration_finds_a_known_scale(scale):
    # computed: with the ratio known exactly, the first update is exact and the answer is the module solve on
    # the stand-in "field" itself
    design = design_from_dict(TE)
    field, network = _pretend(scale)
    calls = []

    def counted_field(d, load):
        calls.append(load)
        return field(d, load=load)

    r = modsolve.solve_with_module_field(design, counted_field, network)
    exact = modsolve.solve_with_module(design, solve_plate)
    assert len(calls) == 2 == r.module.field_solves
    assert r.module.field_scale == pytest.approx(1.0 / scale, rel=1e-12)
    assert r.module.T_hot == pytest.approx(exact.module.T_hot, abs=1e-5)
    assert r.T_face_max == pytest.approx(exact.T_face_max, abs=1e-5)


def test_calibration_rescues_a_runaway_of_the_unscaled_network():
    """The stand-in "network" 200 times worse runs away at 3.5 A (product N R dQh/dTh over one); the field
    does not: the scale is taken at the module solve's first load and the answer is the field's."""
    design = design_from_dict(TE)
    exact = modsolve.solve_with_module(design, solve_plate)
    assert 200.0 * exact.module.runaway_slope >= 1.0  # the premise: the worse plate has no steady state
    field, network = _pretend(200.0)
    with pytest.raises(SolveError):
        modsolve.solve_with_module(design, network)
    r = modsolve.solve_with_module_field(design, field, network)
    assert r.module.T_hot == pytest.approx(exact.module.T_hot, abs=1e-5)
    # one field solve for the scale at the first load (exact here), one at the modules' heat that agrees
    assert r.module.field_solves == 2
    assert r.module.field_scale == pytest.approx(1.0 / 200.0, rel=1e-12)


def test_calibration_gives_up_in_one_line():
    design = design_from_dict(TE)

    def drifting(d, load, _n=[0]):  # a "field" whose face moves on every call: it never agrees
        _n[0] += 1
        r = solve_plate(d, load=load)
        return modsolve.scaled_plate(r, 1.0 + 0.1 * _n[0])

    with pytest.raises(SolveError) as err:
        modsolve.solve_with_module_field(design, drifting, solve_plate)
    assert "\n" not in str(err.value) and str(modsolve.MAX_FIELD_SOLVES) in str(err.value)


def test_scaled_plate_scales_the_face_rise_only():
    design = design_from_dict(TE)
    r = solve_plate(design, load=60.0)
    s = modsolve.scaled_plate(r, 0.8)
    assert s.R_th == pytest.approx(0.8 * r.R_th, rel=1e-15)
    assert sum(R for _, R in s.resistances) == pytest.approx(s.R_th, rel=1e-12)
    assert s.T_face_max - s.T_in == pytest.approx(0.8 * (r.T_face_max - r.T_in), rel=1e-12)
    assert (s.T_face_max - s.T_in) / s.load == pytest.approx(s.R_th, rel=1e-12)  # still R = rise / load
    assert s.profile.T_bulk == r.profile.T_bulk and s.T_out == r.T_out and s.dp == r.dp
    assert modsolve.scaled_plate(r, 1.0).T_face_max == r.T_face_max


def test_air_and_supply_stages_make_no_field_solves_of_their_own(counted):
    """The air stage solves its sink itself and the supply stage its trial flows on solve_plate (network):
    with both, the field solves are still only the calibration's."""
    data = example_dict("sample-stage-air")
    r = check.solve(design_from_dict(data), model="field")
    assert r.module is not None and r.air is not None
    assert counted.calls == r.module.field_solves <= 3
    assert json.dumps(r.module.field_solves)  # a plain int
