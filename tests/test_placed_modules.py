"""Thermoelectric modules placed one by one on the plate ([module] size and positions), on the field model.

Sources of the expectations: the module and plate values are computed by our own solver (the lumped array solve
of coldplate.modules.solve and fresh field solves of coldplate.plate.fieldcheck); the symmetry and the first law
are laws the answer must keep whatever the numbers (symmetry of the plate about its centre line; energy balance
of the standard module model, Q_h = Q_c + V I, Ioffe 1957); warmer water downstream is common practice.  Bad
input follows the project's own input contract (one line naming the field, exit 2).
"""
from __future__ import annotations

import json

import pytest

from coldplate.check import solve
from coldplate.cli import main
from coldplate.design.reader import design_from_dict
from coldplate.modules.placed import with_loads
from coldplate.plate.fieldcheck import solve_plate_field

from .helpers import example_dict, modified, write

PLACED = example_dict("sample-stage-placed-modules")
LUMPED = example_dict("sample-stage-thermoelectric")


def _solve(data):
    return solve(design_from_dict(data), model="field")


@pytest.fixture(scope="module")
def example():
    return _solve(PLACED)


def test_one_placed_module_matches_the_lumped_field_solve():
    # computed by our own solver: one module placed on the centred footprint is today's one-module field solve
    one = modified(LUMPED, module__count=1, module__cold_load="9 W", heat__footprint=["40 mm", "40 mm"])
    lumped = _solve(one)
    placed = modified(one, heat=None, module__size=["40 mm", "40 mm"], module__positions=[["35 mm", "0 mm"]])
    r = _solve(placed)
    a, b = lumped.module, r.module
    assert len(b.placed) == 1 and not a.placed
    assert b.T_hot == pytest.approx(a.T_hot, abs=1e-3)
    assert b.T_cold == pytest.approx(a.T_cold, abs=1e-3)
    assert b.Q_hot == pytest.approx(a.Q_hot, abs=1e-4)  # dQ_h/dT_h about 0.04 W/K here (our own solver)


def test_modules_placed_symmetrically_about_the_centre_line_have_equal_hot_faces():
    # symmetry: centred ports, modules mirrored about the centre line
    # (the example's plate widened to 90 mm so that two 40 mm modules sit side by side)
    r = _solve(modified(PLACED, plate__width="90 mm", module__positions=[["47 mm", "22 mm"], ["47 mm", "-22 mm"]]))
    one, two = r.module.placed
    assert one.T_hot == pytest.approx(two.T_hot, rel=1e-6)
    assert one.Q_hot == pytest.approx(two.Q_hot, rel=1e-6)


def test_each_hot_face_is_a_fresh_field_solve_at_the_solved_loads(example):
    # computed by our own solver: the field at the solved hot-side heats, solved again on its own
    m = example.module
    loads = [p.Q_hot for p in m.placed]
    fresh = solve_plate_field(with_loads(example.design, loads), load=sum(loads))
    assert [s.name for s in fresh.sources] == [p.name for p in m.placed]
    for s, p in zip(fresh.sources, m.placed):
        assert s.face_max == pytest.approx(p.T_hot, abs=1e-3), p.name
    assert m.T_hot == max(p.T_hot for p in m.placed)  # the headline is the worst module


def test_first_law_for_each_module_and_the_array(example):
    # Ioffe 1957 (standard module model): the hot side rejects the heat pumped plus the electrical power
    m = example.module
    total_hot = sum(p.Q_hot for p in m.placed)
    total_in = sum(p.Q_cold + p.voltage * m.current for p in m.placed)
    assert total_hot == pytest.approx(total_in, rel=1e-9)
    assert total_hot == pytest.approx(m.Q_hot, rel=1e-9)
    assert sum(p.Q_cold for p in m.placed) == pytest.approx(m.Q_cold, rel=1e-12)
    assert [s.load for s in example.sources] == pytest.approx([p.Q_hot for p in m.placed], rel=1e-12)


def test_a_module_near_the_outlet_runs_hotter_than_one_near_the_inlet():
    # common practice: the water warms along the flow (and the entry region cools best)
    r = _solve(modified(PLACED, module__positions=[["24 mm", "0 mm"], ["70 mm", "0 mm"]]))
    inlet, outlet = r.module.placed
    assert outlet.T_hot > inlet.T_hot + 0.1
    assert outlet.T_cold > inlet.T_cold


def test_a_module_over_its_hot_side_limit_is_named(example):
    # computed by our own solver: a limit between the two hot faces names only the hotter module
    one, two = example.module.placed
    limit = 0.5 * (one.T_hot + two.T_hot) - 273.15
    r = _solve(modified(PLACED, module__hot_side_limit=f"{limit} degC"))
    hot = max(r.module.placed, key=lambda p: p.T_hot)
    cool = min(r.module.placed, key=lambda p: p.T_hot)
    texts = [f.message for f in r.findings if f.id == "module-hot-face-above-rating"]
    assert len(texts) == 1 and hot.name in texts[0] and cool.name not in texts[0]


def test_the_network_solves_placed_modules_as_one_cautious_array():
    # computed by our own solver: the network's cautious several-source face, stated in the assumptions
    r = solve(design_from_dict(PLACED), model="network")
    assert r.module.placed == ()
    assert r.module.T_hot == pytest.approx(max(s.face_max for s in r.sources), abs=1e-6)
    assert any("placed modules on the resistance network" in a for a in r.assumptions)


BAD = [
    ("overlap", {"module__positions": [["40 mm", "10 mm"], ["60 mm", "-10 mm"]]},
     "[module] positions (module 2): module 2 overlaps module 1"),
    ("leaves the plate", {"module__positions": [["28 mm", "30 mm"], ["72 mm", "-15 mm"]]},
     "[module] positions (module 1): the module runs from y"),
    ("count mismatch", {"module__count": 3}, "[module] positions: gives 2 position(s) for count = 3"),
    ("positions with [heat]", {"heat": {"footprint": ["40 mm", "80 mm"]}}, "[module] positions: "),
    ("size without positions", {"module__positions": None}, "[module] positions: is missing"),
    ("a target no current reaches", {"module__current": None, "module__cold_face_temperature": "-40 degC"},
     "[module] cold_face_temperature: -40.00 degC is out of reach of the placed modules"),
    ("a target warmer than with no current", {"module__current": None, "module__cold_face_temperature": "60 degC"},
     "[module] cold_face_temperature: 60.00 degC is warmer than"),
]


@pytest.mark.parametrize("name, changes, needle", BAD, ids=[b[0] for b in BAD])
def test_bad_placement_one_line_exit_2(tmp_path, capsys, name, changes, needle):
    # the project's input contract: one line naming the field, exit 2, no traceback
    path = write(tmp_path, modified(PLACED, **changes))
    code = main(["check", str(path)])
    captured = capsys.readouterr()
    assert code == 2, captured.err
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1 and needle in lines[0], captured.err
    assert "Traceback" not in captured.err


def test_json_lists_each_module(tmp_path, capsys, example):
    # computed by our own solver: the JSON carries the result's per-module figures, SI-suffixed keys
    assert main(["check", str(write(tmp_path, PLACED)), "--format", "json"]) == 0
    out = json.loads(capsys.readouterr().out)
    rows = out["module"]["modules"]
    assert [r["name"] for r in rows] == ["module 1", "module 2"]
    for row, p in zip(rows, example.module.placed):
        assert row["hot_face_temperature_C"] == pytest.approx(p.T_hot - 273.15, abs=1e-6)
        assert row["cold_face_temperature_C"] == pytest.approx(p.T_cold - 273.15, abs=1e-6)
        assert row["heat_into_plate_W"] == pytest.approx(p.Q_hot, rel=1e-9)
        assert row["module_voltage_V"] == pytest.approx(p.voltage, rel=1e-9)
        assert row["module_current_A"] == pytest.approx(p.current, rel=1e-12)
        assert set(row) >= {"heat_pumped_W", "electrical_power_W", "runaway_slope", "hot_side_limit_margin_K"}
    assert out["hot_face_temperature_C"] == pytest.approx(max(r["hot_face_temperature_C"] for r in rows))


def test_runaway_is_refused_naming_the_worst_module():
    # closed form (computed): the eigenvalues of the symmetric 2x2 c1 C are c1 (a + c ± sqrt((a - c)^2 + 4 b^2)) / 2
    import math

    import numpy as np

    from coldplate.design.errors import SolveError
    from coldplate.modules.placed import _runaway

    a, b, c = 0.5, 0.3, 0.6
    top = (a + c + math.sqrt((a - c) ** 2 + 4 * b * b)) / 2  # 0.8562 K/W
    C = np.array([[a, b], [b, c]])
    _runaway(["module 1", "module 2"], 0.99 / top, C, 3.0)  # radius 0.99: a steady state
    with pytest.raises(SolveError, match=r"spectral radius of 1\.01.*module 2 is the worst"):
        _runaway(["module 1", "module 2"], 1.01 / top, C, 3.0)


# --- wiring: series strings carry one current, parallel strings share one voltage --------------------------------
#
# The hot faces below were solved by the placed-module solve before parallel wiring was modelled (every module at
# the design's current per module, which series wiring keeps); the series path must give them again.
SERIES_BEFORE = ((294.1796643964348, 249.08868979596298, 39.621451762536545),
                 (295.57761818561005, 250.10516547332523, 39.68267198401008))


def test_series_wiring_is_unchanged(example):
    # computed by our own solver: the solve as it was before parallel strings were modelled (values above)
    m = example.module
    assert m.wiring == "series" and m.strings == 1
    for p, (T_h, T_c, Q_h) in zip(m.placed, SERIES_BEFORE):
        assert p.current == 3.5  # the design's current per module, exactly
        assert p.T_hot == pytest.approx(T_h, abs=1e-6)
        assert p.T_cold == pytest.approx(T_c, abs=1e-6)
        assert p.Q_hot == pytest.approx(Q_h, abs=1e-6)
    assert m.array_current == 3.5
    assert m.array_voltage == pytest.approx(sum(p.voltage for p in m.placed), rel=1e-12)


def _module_checks(m, design):
    # the standard model at each module's own faces and current (Ioffe 1957), from the reported figures alone
    from coldplate.modules import model as te

    S, R, K = m.parameters
    for p in m.placed:
        assert te.cold_side_heat(S, R, K, p.current, p.T_cold, p.T_hot) == pytest.approx(p.Q_cold, abs=1e-9)
        assert p.voltage == pytest.approx(te.module_voltage(S, R, p.current, p.T_cold, p.T_hot), rel=1e-12)
        assert p.power == pytest.approx(p.voltage * p.current, rel=1e-12)
        assert p.Q_hot == pytest.approx(p.Q_cold + p.power, rel=1e-12)  # the first law, module by module
    assert sum(p.power for p in m.placed) == pytest.approx(m.power, rel=1e-12)
    loads = [p.Q_hot for p in m.placed]
    fresh = solve_plate_field(with_loads(design, loads), load=sum(loads))
    for s, p in zip(fresh.sources, m.placed):
        assert s.face_max == pytest.approx(p.T_hot, abs=1e-3), p.name


def test_parallel_modules_mirrored_about_the_centre_line_take_equal_currents():
    # symmetry: centred ports, modules mirrored about the centre line, in parallel
    r = _solve(modified(PLACED, plate__width="90 mm", module__wiring="parallel",
                        module__positions=[["47 mm", "22 mm"], ["47 mm", "-22 mm"]]))
    one, two = r.module.placed
    assert one.current == pytest.approx(two.current, rel=1e-9)
    assert one.T_hot == pytest.approx(two.T_hot, rel=1e-9)
    assert one.current + two.current == pytest.approx(2 * 3.5, rel=1e-12)


PARALLEL = modified(PLACED, module__wiring="parallel", module__positions=[["24 mm", "0 mm"], ["70 mm", "0 mm"]])


@pytest.fixture(scope="module")
def parallel():
    return _solve(PARALLEL)


def test_in_parallel_the_hotter_module_near_the_outlet_takes_less_current(parallel):
    # Kirchhoff: parallel modules share one voltage and the array's current (2 x 3.5 A); the hotter module's
    # larger Seebeck voltage leaves it less current; the first law and the standard model module by module
    r = parallel
    m = r.module
    inlet, outlet = m.placed
    assert outlet.T_hot > inlet.T_hot + 0.1
    assert outlet.current < inlet.current - 1e-3
    assert inlet.voltage == pytest.approx(outlet.voltage, rel=1e-12)
    assert m.array_voltage == pytest.approx(inlet.voltage, rel=1e-12)
    assert inlet.current + outlet.current == pytest.approx(m.array_current, rel=1e-12)
    assert m.array_current == pytest.approx(2 * 3.5, rel=1e-12)
    assert m.T_cold == max(p.T_cold for p in m.placed) and m.T_hot == max(p.T_hot for p in m.placed)
    _module_checks(m, r.design)


def test_series_parallel_strings_share_one_voltage():
    # Kirchhoff: two strings of two modules in series (string 1 near the inlet, string 2 near the outlet)
    data = modified(PLACED, module__count=4, module__wiring="series-parallel", module__strings=2,
                    module__cold_load="16 W", module__size=["20 mm", "20 mm"],
                    module__positions=[["20 mm", "-12 mm"], ["20 mm", "12 mm"], ["74 mm", "-12 mm"],
                                       ["74 mm", "12 mm"]])
    r = _solve(data)
    m = r.module
    a, b, c, d = m.placed
    assert a.current == b.current and c.current == d.current
    assert a.current > c.current
    assert a.voltage + b.voltage == pytest.approx(c.voltage + d.voltage, rel=1e-12)
    assert m.array_voltage == pytest.approx(a.voltage + b.voltage, rel=1e-12)
    assert a.current + c.current == pytest.approx(m.array_current, rel=1e-12)
    _module_checks(m, r.design)


def test_parallel_newton_against_a_bisection_on_the_current_split():
    # computed: two parallel modules on a coupling matrix set in the test; the current split found by bisection on
    # the voltage difference, the hot faces by the linear system at each split (no Newton, no Jacobian)
    import numpy as np

    from coldplate.design.reader import design_from_dict as read
    from coldplate.modules.placed import Linear, _hot_faces, _module, operate, string_of

    m = read(modified(PLACED, module__wiring="parallel")).module
    q = m.cold_load / m.count
    lin = Linear(F=np.array([300.0, 304.0]), C=np.array([[0.30, 0.05], [0.04, 0.35]]), Q=np.array([38.0, 40.0]))
    total = 7.0

    def dv(x):
        I = np.array([total / 2 + x, total / 2 - x])
        V = _module(m, q, I, _hot_faces(m, q, lin, I))[2]
        return V[0] - V[1]

    lo, hi = -1.0, 1.0
    assert dv(lo) < 0 < dv(hi)
    for _ in range(100):
        mid = 0.5 * (lo + hi)
        lo, hi = (mid, hi) if dv(mid) < 0 else (lo, mid)
    op = operate(m, q, lin, string_of(2, 2), total)
    assert op.I[0] == pytest.approx(total / 2 + lo, abs=1e-9)
    assert op.I.sum() == pytest.approx(total, rel=1e-14)
    assert op.V[0] == pytest.approx(op.V[1], rel=1e-12)
    assert op.T_h == pytest.approx(lin.F + lin.C @ (op.Q_h - lin.Q), abs=1e-9)


# --- a target cold face: the current at which the warmest module meets it ----------------------------------------

@pytest.mark.parametrize("wiring", ["series", "parallel"])
def test_target_cold_face_met_by_the_warmest_module(wiring):
    # computed by our own solver (brute force): the placed solve at the current found, given as a drive current,
    # puts the warmest module's cold face on the target
    target = -25.0
    data = modified(PLACED, module__wiring=wiring, module__current=None,
                    module__cold_face_temperature=f"{target} degC")
    r = _solve(data)
    m = r.module
    assert m.mode == "target" and not m.shortfall
    assert max(p.T_cold for p in m.placed) - 273.15 == pytest.approx(target, abs=1e-6)
    assert m.T_cold - 273.15 == pytest.approx(target, abs=1e-6)
    assert m.best_cop_current == m.current
    assert m.field_solves <= 5  # the lumped array's two and two or three fresh ones
    assert any("placed modules at a target cold face" in a and "fresh field solves" in a for a in r.assumptions)
    again = _solve(modified(PLACED, module__wiring=wiring, module__current=f"{m.current!r} A")).module
    assert max(p.T_cold for p in again.placed) - 273.15 == pytest.approx(target, abs=1e-3)
    per_string = m.count // m.strings  # modules in series in each string, each at its string's current
    assert sum(p.current for p in m.placed) / per_string == pytest.approx(m.array_current, rel=1e-12)


# --- the placed modules' own current sweep ------------------------------------------------------------------------

@pytest.mark.parametrize("which", ["series", "parallel"])
def test_sweep_against_full_placed_solves(which, example, parallel):
    # computed by our own solver (two paths): the sweep on the field's coupling matrix about the solved field
    # against the full placed solve (lumped array, fresh field solves) at two of its currents; the errors are
    # tabulated in VALIDATION.md
    r, data = (example, PLACED) if which == "series" else (parallel, PARALLEL)
    s = r.module.sweep
    assert len(s.current) == 31 and not s.stopped
    for k in (10, 28):  # 1.87 A and 5.23 A per module, about half and one and a half times the 3.5 A solved
        full = _solve(modified(data, module__current=f"{s.current[k]!r} A")).module
        assert s.T_cold[k] == pytest.approx(full.T_cold, abs=0.02)
        assert s.T_hot[k] == pytest.approx(full.T_hot, abs=0.02)
        assert s.power[k] == pytest.approx(full.power, rel=1e-4)
        assert s.cop[k] == pytest.approx(full.cop, rel=1e-4)
        assert s.Q_hot[k] == pytest.approx(full.Q_hot, rel=1e-4)


def test_coldest_and_best_cop_currents_are_the_placed_modules_own(example):
    # computed by our own solver: the coldest current is the least warmest cold face of the placed sweep; at the
    # example's 3.5 A (below it) the best-COP current is the operating one; the assumption says where they come from
    m = example.module
    assert m.T_cold_coldest <= min(m.sweep.T_cold) + 1e-12
    assert 0 < m.coldest_current <= m.max_current and m.best_cop_current == m.current
    assert any("coupling matrix about the solved field" in a for a in example.assumptions)
    assert not any("are the lumped array's" in a for a in example.assumptions)


def test_past_the_coldest_current_the_best_cop_current_reaches_the_same_cold_face():
    # computed by our own solver (two paths): at 5.5 A, past the coldest current, the best-COP current found on the
    # placed sweep's field gives the same warmest cold face in a full placed solve; the finding says so
    r = _solve(modified(PLACED, module__current="5.5 A"))
    m = r.module
    assert m.best_cop_current < m.coldest_current < m.current
    assert any(f.id == "module-past-coldest-current" for f in r.findings)
    full = _solve(modified(PLACED, module__current=f"{m.best_cop_current!r} A")).module
    assert full.T_cold == pytest.approx(m.T_cold, abs=0.02)
