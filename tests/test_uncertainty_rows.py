"""The band's vectorised rows against the check's own solve (coldplate/uncertainty/propagate.py): the flow split's
share, thermoelectric modules, several sources, a supply that sets the flow, cavities, Sieder-Tate.  Every reference here is computed by
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


def _assert_zero_spread_is_the_check(d, r, data, keys, samples):
    """Every spread zero: the band (vectorised) is the check itself, each percentile of each output."""
    from coldplate.uncertainty.propagate import propagate
    from coldplate.uncertainty.reader import UncertaintySpec, Written

    spec = UncertaintySpec(tuple(Written(k, "absolute", 0.0, 0.0, "uniform", "±0") for k in keys), False, samples, 1,
                           0.90)
    band = propagate(d, r, spec, data)
    assert band.method == "vectorised evaluator"
    for b, nominal in zip(band.bands, (r.T_face_max, r.T_out, r.dp, r.water_use_L_per_day)):
        for v in (b.low, b.median, b.high):
            assert v == pytest.approx(nominal, rel=1e-12, abs=1e-12)


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


# --------------------------------------------------------------------------- thermoelectric modules

def _module_data(mode="current"):
    data = example_dict("sample-stage-thermoelectric")
    if mode == "target":
        del data["module"]["current"]
        data["module"]["cold_face_temperature"] = "-5 degC"
    return data


def _module_rows(d):
    q, T, V = d.module.cold_load, d.inlet_temperature, d.flow
    return np.array([[q, T, V], [1.1 * q, T + 3, V], [0.9 * q, T - 3, 0.8 * V], [q, T, 1.25 * V], [1.3 * q, T + 6, V]])


@pytest.mark.parametrize("mode", ["current", "target"])
def test_module_rows_equal_repeated_network_checks(mode):
    # Source: computed by our own solver: each row's design through the network check with its module solve
    # (solve(..., model="network"), the repeated-check path's own row), against the vectorised coupling.  Without
    # the flow split (no plenums) the two use the same physics: within the module solve's tolerance and the
    # evaluator's table interpolation (measured 1e-6 K on the face).
    from coldplate.uncertainty.propagate import check_rows, module_rows

    d = design_from_dict(_module_data(mode))
    d = replace(d, passage=replace(d.passage, plenum_length=0.0))
    rows = _module_rows(d)
    r = solve_network(d)
    plate = RowPlate(d, r, KEYS, rows)
    got = module_rows(d.module, plate, rows[:, 2], rows[:, 0], rows[:, 1])
    ref = check_rows(d, KEYS, rows)
    assert got.ok.all()
    assert got.T_face == pytest.approx(ref["face"], abs=1e-5)
    assert got.T_out == pytest.approx(ref["outlet"], abs=1e-5)
    assert got.dp == pytest.approx(ref["pressure_drop"], rel=1e-5)
    assert plate.evaluations <= 8  # the plate's resistance barely moves with its load: a few steps settle it


def solve_network(d):
    from coldplate.check import solve

    return solve(d, model="network")


@pytest.mark.parametrize("mode", ["current", "target"])
def test_module_band_rows_agree_with_the_repeated_check_on_the_example(mode):
    # Source: computed by our own solver: the example as it is (a split plate, least-fed share 0.67), both paths
    # anchored to the same network check.  The rows hold the nominal share, the network check re-solves the split
    # per row: measured 0.075 K at most on the face (current), 0.03 K (target); dp ratios within 0.15 %.
    from coldplate.uncertainty.propagate import anchored, check_rows, evaluator_rows

    d = design_from_dict(_module_data(mode))
    rows = _module_rows(d)
    r = solve_network(d)
    a, b = evaluator_rows(d, r, KEYS, rows), anchored(r, check_rows(d, KEYS, rows))
    assert a["face"][0] == b["face"][0] == r.T_face_max
    assert a["face"] == pytest.approx(b["face"], abs=0.1)
    assert a["pressure_drop"] == pytest.approx(b["pressure_drop"], rel=3e-3)
    assert a["water_use"] == pytest.approx(b["water_use"], rel=1e-12)


class _FixedPlate:
    """A plate of constant resistance R [K/W] above each row's inlet: the coupling's closed form is exact."""

    def __init__(self, R, T_in):
        self.R, self.T_in, self.evaluations = R, np.asarray(T_in, dtype=float), 0

    def __call__(self, flow, load, idx=None):
        from types import SimpleNamespace

        self.evaluations += 1
        T_in = self.T_in if idx is None else self.T_in[idx]
        Q = np.asarray(load, dtype=float)
        n = Q.size
        return SimpleNamespace(T_face=T_in + self.R * Q, T_out=T_in + 0.0 * Q, dp=np.ones(n), ok=np.ones(n, bool),
                               h_eff=np.ones(n), mcp=np.ones(n))


@pytest.mark.parametrize("mode", ["current", "target", "unreachable"])
def test_module_rows_on_a_plate_of_fixed_resistance(mode):
    # Source (computed, analytic): on a plate of fixed resistance R the hot face is T_h = (T_in + N R c0) /
    # (1 − N R c1) (Ioffe's standard model with the hot-side line of coldplate/modules/model.py), the target cold
    # face is met exactly, and an unreachable target runs at the current of the coldest face, found here by brute
    # force over 20,001 currents; N R c1 ≥ 1 at the given current is refused (runaway).
    from coldplate.modules import model as te
    from coldplate.uncertainty.propagate import module_rows

    data = _module_data("target" if mode != "current" else "current")
    if mode == "unreachable":
        data["module"]["cold_face_temperature"] = "-40 degC"
    m = design_from_dict(data).module
    T_in = np.array([289.15, 295.0, 280.0, 289.15])
    q = np.array([18.0, 12.0, 22.0, 18.0])
    R = np.array([0.05, 0.1, 0.02, 25.0])  # the last row runs away at the example's 3.5 A (N R c1 = 2.2)
    out = []
    for i in range(4):
        plate = _FixedPlate(R[i], T_in[i:i + 1])
        out.append(module_rows(m, plate, np.ones(1), q[i:i + 1], T_in[i:i + 1]))
    N = m.count
    for i, o in enumerate(out[:3]):
        assert o.ok[0]
        I = o.current[0]
        c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q[i] / N)
        T_h = (T_in[i] + N * R[i] * c0) / (1 - N * R[i] * c1)
        assert o.T_face[0] == pytest.approx(T_h, abs=1e-6)
        T_c = te.cold_face_temperature(m.S, m.R, m.K, I, q[i] / N, T_h)
        if mode == "current":
            assert I == m.current
        elif mode == "target":
            assert T_c == pytest.approx(m.cold_face_target, abs=1e-6)
        else:
            Is = np.linspace(0.0, m.max_current, 20001)
            c0s, c1s = te.hot_side_heat_line(m.S, m.R, m.K, Is, q[i] / N)
            s = N * R[i] * c1s
            T_hs = (T_in[i] + N * R[i] * c0s) / (1 - s)
            T_cs = np.where(s < 1, te.cold_face_temperature(m.S, m.R, m.K, Is, q[i] / N, T_hs), np.inf)
            assert I == pytest.approx(Is[np.argmin(T_cs)], abs=2 * m.max_current / 20000)
            assert T_c == pytest.approx(T_cs.min(), abs=1e-6)
    if mode == "current":
        assert not out[3].ok[0]  # runaway: no steady state


def test_module_band_nominal_and_seeded_repeat():
    # Source: computed by our own solver (internal consistency, determinism): with every spread zero the module
    # example's band, through the evaluator, is the check's own numbers; a seeded band repeats bit for bit.
    import copy

    from coldplate.check import solve
    from coldplate.uncertainty.propagate import propagate
    from coldplate.uncertainty.reader import read_uncertainty

    data = _module_data()
    d = design_from_dict(data)
    r = solve(d)
    _assert_zero_spread_is_the_check(d, r, data, KEYS, 300)
    data["uncertainty"] = {"heat.load": "±10 %", "coolant.inlet_temperature": "±3 K", "coolant.flow": "±10 %"}
    spec = read_uncertainty(data, d)
    a, b = propagate(d, r, spec, copy.deepcopy(data)), propagate(d, r, spec, copy.deepcopy(data))
    assert a == b and a.samples == 4000 and a.unsolved == 0
    assert not any("left out" in n for n in a.notes) and {c[0] for c in a.correlations} == {"Nu", "f"}


# --------------------------------------------------------------------------- several sources

def _source_rows(d, load, thickness):
    T, V = d.inlet_temperature, d.flow
    return np.array([[load, T, V, thickness], [1.1 * load, T + 3, V, thickness], [0.9 * load, T - 3, 0.8 * V, 1.2 * thickness],
                     [load, T, 1.25 * V, 0.8 * thickness], [0.3 * load, T, 1.25 * V, thickness]])


SOURCE_KEYS = KEYS + ["interface.thickness"]


def test_several_source_rows_equal_the_network_row_by_row():
    # Source: computed by our own solver: solve_plate's several-source faces (network_sources: each source's own
    # spreading at its centroid, every other source's there, its interface, the coolant upstream) row by row,
    # against the rows' vectorised formula (load, inlet, flow and the interface's thickness moved), without
    # plenums so both carry the same flow (measured 3e-5 K).
    from coldplate.uncertainty.propagate import check_rows

    d = design_from_dict(example_dict("three-sources-channels"))
    d = replace(d, passage=replace(d.passage, plenum_length=0.0))
    rows = _source_rows(d, d.heat.load, 1e-4)
    r = solve_plate(d)
    assert r.T_face_max > max(s.face_max for s in r.sources) - 1e-9 > r.T_plate_max  # the sources set the face
    plate = RowPlate(d, r, SOURCE_KEYS, rows)
    got = plate(rows[:, 2], rows[:, 0])
    ref = check_rows(d, SOURCE_KEYS, rows)
    assert got.T_face == pytest.approx(ref["face"], abs=2e-4)


def test_source_centroid_table_against_the_series():
    # Source: computed (the Muzychka-Culham-Yovanovich series, coldplate.plate.conduction.spreading_MCY, at
    # each h): the tabulated centroid rise between nodes, within 1e-6 relative.
    from coldplate.plate.conduction import spreading_MCY
    from coldplate.uncertainty.propagate import SourceRows

    d = design_from_dict(example_dict("three-sources-channels"))
    L = RowPlate(d, solve_plate(d), [], np.empty((1, 0))).ev.plate.a
    table = SourceRows(d, L)
    h = np.geomspace(800.0, 40000.0, 23)
    for i, s in enumerate(d.sources):
        exact = [spreading_MCY(L, d.plate.width, min(s.size[0], L), s.size[1], d.plate.base, d.plate.conductivity,
                               float(x)).R_centroid for x in h]
        assert table._centroid(i, h) == pytest.approx(exact, rel=1e-6)


@pytest.mark.parametrize("name", ["three-sources-channels", "sample-stage-placed-modules"])
def test_several_source_band_rows_agree_with_the_repeated_check(name):
    # Source: computed by our own solver: the examples as they are (split plates), both paths anchored to the
    # same network check (the repeated check re-solves the split per row; the rows hold the nominal share):
    # measured 0.05 K at most on the face, 1.1 % on the drop.  Placed modules: the module coupling on the
    # several-source face (the network's lumped array, PLACED_ON_NETWORK).
    from coldplate.uncertainty.propagate import anchored, check_rows, evaluator_rows

    d = design_from_dict(example_dict(name))
    load = d.module.cold_load if d.module is not None else d.heat.load
    rows = _source_rows(d, load, 1e-4 if d.module is None else 5e-5)
    r = solve_network(d)
    a, b = evaluator_rows(d, r, SOURCE_KEYS, rows), anchored(r, check_rows(d, SOURCE_KEYS, rows))
    assert a["face"] == pytest.approx(b["face"], abs=0.1)
    assert a["pressure_drop"] == pytest.approx(b["pressure_drop"], rel=0.02)


def test_placed_module_rows_equal_the_network_without_plenums():
    # Source: computed by our own solver (the network check's module solve on the several-source face, row by
    # row; no plenums so both carry the same flow): measured 3e-5 K.
    from coldplate.uncertainty.propagate import check_rows, module_rows

    d = design_from_dict(example_dict("sample-stage-placed-modules"))
    d = replace(d, passage=replace(d.passage, plenum_length=0.0))
    rows = _source_rows(d, d.module.cold_load, 5e-5)
    plate = RowPlate(d, solve_network(d), SOURCE_KEYS, rows)
    got = module_rows(d.module, plate, rows[:, 2], rows[:, 0], rows[:, 1])
    ref = check_rows(d, SOURCE_KEYS, rows)
    assert got.ok.all() and got.T_face == pytest.approx(ref["face"], abs=2e-4)


@pytest.mark.parametrize("name", ["three-sources-channels", "sample-stage-placed-modules"])
def test_several_source_band_is_the_check_with_zero_spread(name):
    # Source: computed by our own solver (internal consistency): zero spread, the band is the check (field model).
    from coldplate.check import solve

    data = example_dict(name)
    d = design_from_dict(data)
    r = solve(d)
    _assert_zero_spread_is_the_check(d, r, data, KEYS, 200)


# --------------------------------------------------------------------------- a supply that sets the flow

def _pump_data():
    data = example_dict("tap-to-drain-circuit")
    data["supply"].update(drive="pump", pump_flow=["0 L/min", "2 L/min", "4 L/min", "6 L/min"],
                          pump_head=["20 m", "18 m", "13 m", "5 m"])
    del data["supply"]["static_pressure"]
    return data


def _modules_on_the_tap():
    te, tap = example_dict("sample-stage-thermoelectric"), example_dict("tap-to-drain-circuit")
    return dict(te, supply=dict(tap["supply"]), circuit=tap["circuit"],
                coolant={k: v for k, v in te["coolant"].items() if k != "flow"})


SUPPLY_CASES = {"pressure": lambda: example_dict("tap-to-drain-circuit"), "pump": _pump_data,
                "modules": _modules_on_the_tap}
SUPPLY_KEYS = ["heat.load", "coolant.inlet_temperature", "interface.thickness"]


def _supply_rows(d):
    q = d.module.cold_load if d.module is not None else d.heat.load
    th, T = (5e-5 if d.module is not None else 1e-4), d.inlet_temperature
    return np.array([[q, T, th], [1.1 * q, T + 3, th], [0.9 * q, T - 3, 1.2 * th], [q, T, 0.8 * th],
                     [0.3 * q, T, th]])


@pytest.mark.parametrize("case", list(SUPPLY_CASES))
def test_supply_rows_find_the_operating_flow_of_each_row(case):
    # Source: computed by our own solver: each row's design through the supply stage (supply.operating.operate:
    # brentq on solve_plate's drop and the circuit's lines) and the network check, against the rows' vectorised
    # root and coupling, without plenums so both carry the same flow: flows within 1e-8 (measured 4e-9), faces
    # within 1e-5 K (measured 1e-6 K), drops within 1e-5.
    from coldplate.supply.stage import supply_stage
    from coldplate.uncertainty.propagate import SupplyRows, anchored, check_rows, evaluator_rows

    d = design_from_dict(SUPPLY_CASES[case]())
    d = replace(d, passage=replace(d.passage, plenum_length=0.0))
    rows = _supply_rows(d)
    r = solve_network(d)
    if d.module is None:
        plate = RowPlate(d, r, SUPPLY_KEYS, rows)
        flows = SupplyRows(d, r, plate).flows(rows[:, 0])
        for row, V in zip(rows, flows):
            di = replace(d, inlet_temperature=row[1], heat=replace(d.heat, load=row[0]))
            assert V == pytest.approx(supply_stage(di)[0], rel=1e-8)
        assert plate.evaluations <= 12
    a, b = evaluator_rows(d, r, SUPPLY_KEYS, rows), anchored(r, check_rows(d, SUPPLY_KEYS, rows))
    assert a["face"] == pytest.approx(b["face"], abs=1e-5)
    assert a["pressure_drop"] == pytest.approx(b["pressure_drop"], rel=1e-5)
    assert a["water_use"] == pytest.approx(b["water_use"], rel=1e-8)


@pytest.mark.parametrize("case", list(SUPPLY_CASES))
def test_supply_band_rows_agree_with_the_repeated_check_on_split_plates(case):
    # Source: computed by our own solver: the designs as they are (split plates), both paths anchored to the
    # same network check; the rows hold the nominal share and scale the drop in the circuit's need by the check's
    # over the nominal row's, so the nominal row's root is the check's own flow: measured 0.04 K on the face,
    # 0.75 % on the drop, 2e-5 on the flow.
    from coldplate.uncertainty.propagate import SupplyRows, anchored, check_rows, evaluator_rows

    d = design_from_dict(SUPPLY_CASES[case]())
    rows = _supply_rows(d)
    r = solve_network(d)
    if d.module is None:
        assert SupplyRows(d, r, RowPlate(d, r, SUPPLY_KEYS, rows)).flows(rows[:, 0])[0] == pytest.approx(r.V_dot,
                                                                                                       rel=1e-8)
    a, b = evaluator_rows(d, r, SUPPLY_KEYS, rows), anchored(r, check_rows(d, SUPPLY_KEYS, rows))
    assert a["face"] == pytest.approx(b["face"], abs=0.1)
    assert a["pressure_drop"] == pytest.approx(b["pressure_drop"], rel=0.01)
    assert a["water_use"] == pytest.approx(b["water_use"], rel=1e-4)


def test_circuit_losses_over_arrays_equal_the_scalar_walk():
    # Source: computed (the same functions of hydraulics/circuit.py on floats, row by row): the need of the
    # tap-to-drain circuit for arrays of flows and fluids, as the band's supply rows call it.
    from hydraulics.circuit import Fluid, required_pressure, static_head

    d = design_from_dict(example_dict("tap-to-drain-circuit"))
    V = np.array([0.0, 1e-7, 0.5 / 6e4, 3 / 6e4, 9 / 6e4])
    rho, mu = np.linspace(990.0, 1000.0, 5), np.linspace(8e-4, 1.2e-3, 5)
    rho_d, mu_d = rho - 2.0, mu * 0.9
    dp = np.linspace(0.0, 3000.0, 5)
    got = required_pressure(d.circuit, rho * V, Fluid(rho, mu), Fluid(rho_d, mu_d), dp)
    held = static_head(d.circuit, Fluid(rho, mu), Fluid(rho, mu))
    for i in range(5):
        one = required_pressure(d.circuit, float(rho[i] * V[i]), Fluid(float(rho[i]), float(mu[i])),
                                Fluid(float(rho_d[i]), float(mu_d[i])), float(dp[i]))
        assert isinstance(one, float) and got[i] == pytest.approx(one, rel=1e-14, abs=1e-9)
        assert held[i] == pytest.approx(static_head(d.circuit, Fluid(float(rho[i]), float(mu[i])),
                                                    Fluid(float(rho[i]), float(mu[i]))), rel=1e-14)


@pytest.mark.parametrize("case", ["pressure", "modules"])
def test_supply_band_is_the_check_with_zero_spread_and_repeats(case):
    # Source: computed by our own solver (internal consistency; determinism): zero spread, the band of a design
    # whose supply sets the flow is the (field) check's numbers, the nominal row's root the check's own flow;
    # a seeded band repeats bit for bit.
    import copy

    from coldplate.check import solve
    from coldplate.uncertainty.propagate import propagate
    from coldplate.uncertainty.reader import read_uncertainty

    data = SUPPLY_CASES[case]()
    d = design_from_dict(data)
    r = solve(d)
    _assert_zero_spread_is_the_check(d, r, data, SUPPLY_KEYS[:2], 200)
    data["uncertainty"] = {"heat.load": "±10 %", "coolant.inlet_temperature": "±3 K"}
    spec = read_uncertainty(data, d)
    a, b = propagate(d, r, spec, copy.deepcopy(data)), propagate(d, r, spec, copy.deepcopy(data))
    assert a == b and a.samples == 4000 and a.unsolved == 0
    assert not any("left out" in n for n in a.notes)


# --------------------------------------------------------------------------- cavity plates

def test_cavity_rows_equal_the_network_row_by_row():
    # Source: computed by our own solver: solve_plate on each row's design (load, inlet, flow and the cavity's
    # height moved), against the rows' cavity stages on the evaluator's tables: faces within 1e-5 K (measured
    # 2e-6 K), outlets 1e-5 K, drops 1e-5 (measured 1e-6).
    from coldplate.uncertainty.propagate import check_rows, covered

    d = design_from_dict(example_dict("detector-cavity-glycol"))
    r = solve_plate(d)
    keys = KEYS + ["passage.height"]
    Q, T, V, H = d.heat.load, d.inlet_temperature, d.flow, d.passage.height
    rows = np.array([[Q, T, V, H], [1.1 * Q, T + 3, V, H], [0.9 * Q, T - 3, 0.8 * V, 1.1 * H],
                     [Q, T, 1.25 * V, 0.9 * H], [0.3 * Q, T, 3 * V, H]])
    assert covered(d, r, keys)
    got = RowPlate(d, r, keys, rows)(rows[:, 2], rows[:, 0])
    ref = check_rows(d, keys, rows)
    assert got.ok.all()
    assert got.T_face == pytest.approx(ref["face"], abs=1e-5)
    assert got.T_out == pytest.approx(ref["outlet"], abs=1e-5)
    assert got.dp == pytest.approx(ref["pressure_drop"], rel=1e-5)


def test_cavity_band_through_the_evaluator_repeats_with_the_scatter():
    # Source: none needed (determinism, behaviour): the cavity example's band takes the vectorised path with
    # the correlations' scatter, and a seeded band repeats bit for bit.
    import copy

    from coldplate.uncertainty.run import check_data

    data = example_dict("detector-cavity-glycol")
    data["uncertainty"] = {"heat.load": "±10 %", "passage.height": "±0.2 mm"}
    a, b = check_data(copy.deepcopy(data)).uncertainty, check_data(copy.deepcopy(data)).uncertainty
    assert a == b and a.method == "vectorised evaluator" and a.samples == 4000
    assert {c[0] for c in a.correlations} == {"Nu", "f"} and not any("left out" in n for n in a.notes)


# --------------------------------------------------------------------------- Sieder-Tate

@pytest.mark.parametrize("name", ["reagent-block-channels", "laser-mount-tube", "detector-cavity-glycol",
                                  "three-sources-channels"])
def test_sieder_tate_rows_equal_the_network_row_by_row(name):
    # Source: computed by our own solver: solve_plate with Sieder-Tate's viscosity correction (its wall iterated
    # with the outlet, operating_point) on each row's design, against the rows' own wall iteration; channel
    # plates without plenums so both carry the same flow: measured 7e-6 K (laminar channels, cavity, three
    # sources), 2e-4 K (the tube in transitional flow, the blend's weight moving with the wall viscosity).
    from coldplate.uncertainty.propagate import check_rows, covered

    data = example_dict(name)
    data.setdefault("correlations", {})["laminar"] = "sieder-tate"
    d = design_from_dict(data)
    if d.passage.kind == "channels":
        d = replace(d, passage=replace(d.passage, plenum_length=0.0))
    r = solve_plate(d)
    rows = _load_rows(d, d.flow, d.heat.load)
    assert covered(d, r, KEYS)
    got = RowPlate(d, r, KEYS, rows)(rows[:, 2], rows[:, 0])
    ref = check_rows(d, KEYS, rows)
    assert got.ok.all()
    assert got.T_face == pytest.approx(ref["face"], abs=5e-4)
    assert got.dp == pytest.approx(ref["pressure_drop"], rel=1e-5)


def test_sieder_tate_band_is_the_check_with_zero_spread():
    # Source: computed by our own solver (internal consistency): zero spread, the band is the (field) check.
    from coldplate.check import solve

    data = example_dict("reagent-block-channels")
    data.setdefault("correlations", {})["laminar"] = "sieder-tate"
    d = design_from_dict(data)
    r = solve(d)
    _assert_zero_spread_is_the_check(d, r, data, KEYS, 200)
