"""Thermoelectric modules solved together with the plate: checks against calculations written here.

Sources, named beside each check:
- *computed*: an independent damped fixed-point iteration written in this file (module equations typed
  out again here, plate from ``solve_plate`` at the module's hot-side heat) for the operating point, the
  sweep and the turning point;
- *computed*: for a plate of constant resistance the coupled hot face has the closed form
  T_h = (T_in + N R c0) / (1 - N R c1) and no steady state once N R c1 >= 1 (linear algebra of the
  standard model, Ioffe 1957);
- *common practice*: the project's input contract (one-line error naming "[module] key", exit 2).
"""
from __future__ import annotations

import math
import re
from types import SimpleNamespace

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from coldplate.cli import main
from coldplate.design.reader import design_from_dict
from coldplate.design.errors import DesignError, SolveError
from coldplate.modules.solve import couple
from .helpers import network_solve as solve  # the network model's numbers
from coldplate.plate.solve import solve_plate
from reports.jsonout import render_json
from reports.text import render_text

from .helpers import example_dict, modified, write

BASE = example_dict("sample-stage-thermoelectric")
DESIGN = design_from_dict(BASE)
RESULT = solve(DESIGN)
# a weak heat path: little water through a thick, poor interface, so the turning point lies below I_max
WEAK = modified(BASE, coolant__flow="0.3 L/min", module__current="5.6 A", interface__conductivity="0.3 W/(m*K)",
                interface__thickness="0.5 mm")


def luo(I_max, V_max, dT_max, T_h):
    """Luo (2008, Electronics Cooling), typed out again (VALIDATION.md)."""
    return V_max / T_h, (T_h - dT_max) * V_max / (T_h * I_max), (T_h - dT_max) * V_max * I_max / (2 * T_h * dT_max)


def fixed_point(design, I):
    """Independent coupled solve: damped fixed point on the hot face, plate from solve_plate (computed)."""
    m = design.module
    S, R, K = luo(m.max_current, m.max_voltage, m.max_temperature_difference, m.rated_hot_side)
    N, q = m.count, m.cold_load / m.count
    T_h = design.inlet_temperature + 1.0
    for _ in range(500):
        T_c = (q + 0.5 * I * I * R + K * T_h) / (S * I + K)  # cold-side equation solved for T_c
        Q_h = S * I * T_h + 0.5 * I * I * R - K * (T_h - T_c)
        T_new = solve_plate(design, load=N * Q_h).T_face_max
        if abs(T_new - T_h) < 1e-9:
            return T_c, T_h, N * Q_h
        T_h = 0.5 * (T_h + T_new)
    raise AssertionError("the test's fixed point did not settle")


def test_operating_point_matches_independent_fixed_point():
    m = RESULT.module
    T_c, T_h, Q_h = fixed_point(DESIGN, m.current)
    assert m.T_cold == pytest.approx(T_c, abs=1e-5)
    assert m.T_hot == pytest.approx(T_h, abs=1e-5)
    assert m.Q_hot == pytest.approx(Q_h, rel=1e-6)
    # the plate result is the plate at the module's real hot-side heat
    assert RESULT.load == pytest.approx(m.Q_hot, rel=1e-9)
    assert RESULT.T_face_max == pytest.approx(m.T_hot, abs=1e-5)


def test_energy_balance_and_supply():
    """First law for the array (Q_h - Q_c = P) and series wiring (Kirchhoff, common practice)."""
    m = RESULT.module
    assert m.Q_hot - m.Q_cold == pytest.approx(m.power, rel=1e-6)
    assert m.power == pytest.approx(m.count * m.voltage * m.current, rel=1e-12)
    assert (m.array_current, m.array_voltage) == (pytest.approx(m.current), pytest.approx(m.count * m.voltage))
    assert m.cop == pytest.approx(m.Q_cold / m.power, rel=1e-12)
    assert m.dew_margin == pytest.approx(m.T_cold - RESULT.T_dew)


@pytest.mark.parametrize("k", [0, 7, 15, 24, 30])
def test_sweep_matches_full_coupled_solve(k):
    """The sweep's interpolated plate against the independent fixed point with full plate solves."""
    s = RESULT.module.sweep
    T_c, T_h, Q_h = fixed_point(DESIGN, s.current[k])
    assert s.T_cold[k] == pytest.approx(T_c, abs=0.02)
    assert s.T_hot[k] == pytest.approx(T_h, abs=0.02)
    assert s.Q_hot[k] == pytest.approx(Q_h, rel=1e-3)


@pytest.mark.parametrize("data", [BASE, WEAK], ids=["example", "weak heat path"])
def test_turning_point(data):
    """The coldest current: the independent fixed point is no colder a little either side (computed)."""
    design = design_from_dict(data)
    m = solve(design).module
    I_c = m.coldest_current
    assert 0 < I_c < m.max_current
    T_c0 = fixed_point(design, I_c)[0]
    assert m.T_cold_coldest == pytest.approx(T_c0, abs=0.02)
    for dI in (-0.2, 0.2):
        assert fixed_point(design, I_c + dI)[0] > T_c0
    # and the sweep falls before it and rises after it
    s = m.sweep
    before = [t for i, t in zip(s.current, s.T_cold) if i < I_c - 0.3]
    after = [t for i, t in zip(s.current, s.T_cold) if i > I_c + 0.3]
    assert all(a > b for a, b in zip(before, before[1:]))
    assert all(a < b for a, b in zip(after, after[1:]))


def test_past_coldest_current_finding():
    r = solve(design_from_dict(WEAK))
    m = r.module
    assert m.current > m.coldest_current
    ids = [f.id for f in r.findings]
    assert "module-past-coldest-current" in ids
    assert "module-hot-face-above-rating" in ids  # the weak path also overheats the hot face
    # the best-COP current reaches the same cold face with less current, or none is needed at all
    if m.best_cop_current > 0:
        assert fixed_point(design_from_dict(WEAK), m.best_cop_current)[0] == pytest.approx(m.T_cold, abs=0.05)
    assert "module-past-coldest-current" not in [f.id for f in RESULT.findings]


def test_target_cold_face():
    design = design_from_dict(modified(BASE, module__current=None, module__cold_face_temperature="-15 degC"))
    m = solve(design).module
    assert m.mode == "target"
    assert m.T_cold - 273.15 == pytest.approx(-15.0, abs=1e-4)
    assert m.current < m.coldest_current  # the lower-current branch: the better COP for the same cold face
    assert m.best_cop_current == m.current
    assert fixed_point(design, m.current)[0] == pytest.approx(m.T_cold, abs=1e-4)


def _unreachable(**changes):
    """An unreachable target is a finding: the result runs at the coldest current and says what would reach it."""
    result = solve(design_from_dict(modified(BASE, module__current=None, **changes)))
    m = result.module
    assert m.current == pytest.approx(m.coldest_current) and m.T_cold == pytest.approx(m.T_cold_coldest, abs=1e-3)
    found = [f for f in result.findings if f.id == "module-target-unreachable"]
    assert len(found) == 1 and found[0].severity == "warning"
    text = found[0].message
    assert "not reachable at any current" in text and "the coldest is" in text
    return text


def test_target_unreachable_colder_water_would_reach_it():
    text = _unreachable(module__cold_face_temperature="-30 degC")
    found = re.search(r"inlet water at or below (-?[\d.]+) degC", text)
    assert found and "plate resistance below" in text, text
    # the suggestion holds with the full solve: that inlet gets within 0.2 K of the target
    colder = design_from_dict(modified(BASE, module__current=None, module__cold_face_temperature="-29.8 degC",
                                       coolant__inlet_temperature=f"{float(found.group(1))} degC"))
    assert solve(colder).module.T_cold == pytest.approx(273.15 - 29.8, abs=1e-3)


def test_target_unreachable_more_modules_would_reach_it():
    text = _unreachable(module__cold_load="90 W", module__cold_face_temperature="5 degC")
    found = re.search(r"(\d+) modules of this kind", text)
    assert found, text
    more = design_from_dict(modified(BASE, module__current=None, module__cold_load="90 W",
                                     module__count=int(found.group(1)), module__cold_face_temperature="5.2 degC"))
    assert solve(more).module.T_cold == pytest.approx(273.15 + 5.2, abs=1e-3)


def test_target_unreachable_is_reported_not_refused(tmp_path, capsys):
    path = write(tmp_path, modified(BASE, module__current=None, module__cold_face_temperature="-60 degC"))
    assert main(["check", str(path)]) == 0
    out = capsys.readouterr().out
    assert "module-target-unreachable" in out and "not reachable" in out


class _LinearPlate:
    """A plate of constant resistance: T_face = T_in + R Q (for the closed-form checks)."""

    def __init__(self, T_in, R):
        self.T_in, self.R = T_in, R

    def __call__(self, design, load):
        return SimpleNamespace(T_face_max=self.T_in + self.R * load, R_th=self.R, load=load)


@pytest.mark.parametrize("R_plate", [0.05, 0.5, 2.0])
def test_coupling_closed_form_constant_plate(R_plate):
    """computed: T_h = (T_in + N R c0) / (1 - N R c1), the model's equations typed out here."""
    m = DESIGN.module
    S, R, K = luo(m.max_current, m.max_voltage, m.max_temperature_difference, m.rated_hot_side)
    I, N, q, T_in = 4.0, m.count, m.cold_load / m.count, DESIGN.inlet_temperature
    a = (q + 0.5 * I * I * R) / (S * I + K)
    c0, c1 = 0.5 * I * I * R + K * a, S * S * I * I / (S * I + K)
    T_h = (T_in + N * R_plate * c0) / (1 - N * R_plate * c1)
    got = couple(DESIGN, I, _LinearPlate(T_in, R_plate))
    assert got[0] == pytest.approx(T_h, abs=1e-6)
    assert got[1] == pytest.approx(a + K / (S * I + K) * T_h, abs=1e-6)


def test_runaway_has_no_steady_state():
    """N R c1 >= 1: each kelvin on the hot side adds more heat than the plate removes (computed)."""
    m = DESIGN.module
    S, R, K = luo(m.max_current, m.max_voltage, m.max_temperature_difference, m.rated_hot_side)
    I = 6.0
    c1 = S * S * I * I / (S * I + K)
    with pytest.raises(SolveError, match="runs away"):
        couple(DESIGN, I, _LinearPlate(DESIGN.inlet_temperature, 1.05 / (m.count * c1)))


def test_sweep_stops_where_the_water_would_boil():
    data = modified(BASE, module__max_voltage=None, module__max_temperature_difference=None,
                    module__rated_hot_side=None, module__max_heat=None, module__seebeck="0.1 V/K",
                    module__resistance="2 ohm", module__conductance="0.5 W/K", module__max_current="10 A",
                    module__current="2 A", interface__conductivity=None, interface__thickness=None,
                    interface__resistance="3e-3 K*m**2/W")
    r = solve(design_from_dict(data))
    s = r.module.sweep
    assert s.stopped and s.current[-1] < 10.0
    assert "module-sweep-stops" in [f.id for f in r.findings]
    with pytest.raises(SolveError):
        solve(design_from_dict(modified(data, module__current="10 A")))


def test_cold_face_dew_findings():
    ids = [f.id for f in RESULT.findings]
    assert "module-cold-face-frost" in ids  # -22 degC cold face in a 23 degC, 45 % room
    dry = design_from_dict(modified(BASE, module__current=None, module__cold_face_temperature="12 degC",
                                    room__relative_humidity="30 %"))
    assert not any(f.id.startswith("module-cold-face") for f in solve(dry).findings)
    near = design_from_dict(modified(BASE, module__current=None, module__cold_face_temperature="11.5 degC"))
    found = [f for f in solve(near).findings if f.id == "module-cold-face-condensation"]
    assert found and found[0].severity == "caution" and "vapour seal" in found[0].action


def test_safety_wording_defers():
    from coldplate.findings.base import DEFER

    for f in RESULT.findings:
        if f.id in ("module-supply-near-water", "module-cold-face-frost"):
            assert f.action.endswith(DEFER)


def test_wiring_series_parallel():
    data = modified(BASE, module__count=4, module__wiring="series-parallel", module__strings=2,
                    heat__footprint=["60 mm", "80 mm"])
    m = solve(design_from_dict(data)).module
    assert m.array_current == pytest.approx(2 * m.current)
    assert m.array_voltage == pytest.approx(2 * m.voltage)


def test_reports():
    text = render_text(RESULT)
    assert "current sweep" in text and "coldest cold face at" in text
    import json

    d = json.loads(render_json(RESULT))
    for key in ("cold_face_temperature_C", "hot_face_temperature_C", "module_current_A", "module_voltage_V",
                "electrical_power_W", "cop", "heat_into_plate_W", "coldest_current_A"):
        assert isinstance(d[key], float), key
    assert d["cold_face_temperature_C"] == pytest.approx(RESULT.module.T_cold - 273.15)
    assert d["module"]["sweep"]["cop"][0] is None  # no power drawn at zero current
    plain = solve(design_from_dict(example_dict("reagent-block-channels")))
    assert plain.module is None and "cop" not in json.loads(render_json(plain))


def test_result_without_module_unchanged():
    plain = design_from_dict(example_dict("reagent-block-channels"))
    assert plain.module is None
    assert solve(plain).R_th == pytest.approx(solve_plate(plain).R_th)


MODULE_CASES = [
    ("negative current", {"module__current": "-1 A"}, "[module] current"),
    ("current above I_max", {"module__current": "6.5 A"}, "[module] current: 6.5 A is above"),
    ("dT_max above rated hot side", {"module__max_temperature_difference": "310 K"},
     "[module] max_temperature_difference"),
    ("dT_max in degC", {"module__max_temperature_difference": "68 degC"}, "[module] max_temperature_difference"),
    ("impossible wiring", {"module__count": 3, "module__wiring": "series-parallel", "module__strings": 2},
     "[module] strings"),
    ("strings without series-parallel", {"module__strings": 2}, "[module] strings"),
    ("unknown wiring", {"module__wiring": "delta"}, "[module] wiring"),
    ("zero modules", {"module__count": 0}, "[module] count"),
    ("current and target", {"module__cold_face_temperature": "-5 degC"}, "exactly one"),
    ("neither current nor target", {"module__current": None}, "exactly one"),
    ("heat load with modules", {"heat__load": "40 W"}, "[heat] load"),
    ("both parameter forms", {"module__seebeck": "0.05 V/K"}, "[module]"),
    ("current as a voltage", {"module__current": "3 V"}, "[module] current"),
    ("unknown key", {"module__colour": "white"}, "[module] colour: unknown key"),
    ("missing cold load", {"module__cold_load": None}, "[module] cold_load: is missing"),
    ("direct form without conductance", {"module__max_voltage": None, "module__max_temperature_difference": None,
                                         "module__rated_hot_side": None, "module__max_heat": None,
                                         "module__seebeck": "0.05 V/K", "module__resistance": "2 ohm"},
     "[module] conductance"),
]


@pytest.mark.parametrize("name,changes,needle", MODULE_CASES, ids=[c[0] for c in MODULE_CASES])
def test_bad_module_input_exit_2(tmp_path, capsys, name, changes, needle):
    path = write(tmp_path, modified(BASE, **changes))
    code = main(["check", str(path)])
    captured = capsys.readouterr()
    assert code == 2, captured.err
    assert captured.out == ""
    lines = captured.err.strip().splitlines()
    assert len(lines) == 1 and needle in lines[0], captured.err


MODULE_FIELDS = {
    "module__current": st.floats(0, 6).map(lambda v: f"{v:.4g} A"),
    "module__cold_load": st.floats(0, 200).map(lambda v: f"{v:.4g} W"),
    "module__count": st.integers(1, 8),
    "module__max_temperature_difference": st.floats(20, 90).map(lambda v: f"{v:.3g} K"),
    "module__rated_hot_side": st.floats(0, 80).map(lambda v: f"{v:.3g} degC"),
    "module__cold_side_resistance": st.floats(0, 2).map(lambda v: f"{v:.3g} K/W"),
    "coolant__flow": st.floats(0.02, 10).map(lambda v: f"{v:.4g} L/min"),
    "coolant__inlet_temperature": st.floats(2, 60).map(lambda v: f"{v:.3g} degC"),
    "interface__thickness": st.floats(0.01, 2).map(lambda v: f"{v:.3g} mm"),
    "room__relative_humidity": st.floats(1, 100).map(lambda v: f"{v:.3g} %"),
}


@st.composite
def module_designs(draw):
    chosen = draw(st.lists(st.sampled_from(sorted(MODULE_FIELDS)), min_size=1, max_size=5, unique=True))
    changes = {k: draw(MODULE_FIELDS[k]) for k in chosen}
    if draw(st.booleans()):
        changes["module__current"] = None
        changes["module__cold_face_temperature"] = f"{draw(st.floats(-40, 30)):.3g} degC"
    return modified(BASE, **changes)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(module_designs())
def test_any_module_design_solves_or_says_why(data):
    """Property-based (common practice): finite numbers that balance, or a one-line error with a reason."""
    try:
        r = solve(design_from_dict(data))
    except (DesignError, SolveError) as exc:
        assert str(exc) and "\n" not in str(exc)
        return
    m = r.module
    numbers = [m.T_cold, m.T_hot, m.Q_hot, m.power, m.voltage, m.coldest_current, m.best_cop_current, r.R_th]
    assert all(math.isfinite(v) for v in numbers)
    assert m.Q_hot - m.Q_cold == pytest.approx(m.power, rel=1e-6, abs=1e-9)
    assert 0 <= m.best_cop_current <= m.max_current and 0 <= m.coldest_current <= m.max_current
    assert m.T_cold_coldest <= min(m.sweep.T_cold) + 1e-6
    assert r.T_face_max == pytest.approx(m.T_hot, abs=1e-5)
