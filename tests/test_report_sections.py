"""Report sections for the thermoelectric module, the supply circuit and water planning, written against the
field names fixed in the interface between the branches (result.module, result.circuit, result.planning).

The stand-in results here are demo data, built with the physics of each part (the standard thermoelectric
model with the check constants of the reference values; a quadratic hose loss and pump curve), so the layout
is tested with numbers of the right shape; the real parts are tested with the example designs that carry them.
"""
from __future__ import annotations

import dataclasses
import math
import re

import numpy as np
import pytest

from coldplate.plate.curves import fit_flow_curves, flow_curve, mounting_face_profile
from coldplate.check import check_file
from coldplate.supply.result import Breakeven, CircuitResult, PlanningResult, PumpCurve, SystemCurve, UseCurve
from coldplate.modules.result import ModuleResult, ModuleSweep
from reports.display_units import DisplayUnits
from reports.html import render_html
from reports.make import make_report
from reports.markdown import render_markdown

from .helpers import ROOT
from .test_report import parse


class With:
    """A solved result with extra optional parts, as a later solve would carry them."""

    def __init__(self, base, **parts):
        self._base = base
        self.__dict__.update(parts)

    def __getattr__(self, name):
        return getattr(self._base, name)


def module_demo(T_dew):
    # standard thermoelectric model, reference values' check constants (computed): S 0.05 V/K, R 1.91667 ohm,
    # K 0.492857 W/K; hot face held at 300 K, 10 W pumped per module, two modules in series
    S, R, K, Th, Qc, n = 0.05, 1.91667, 0.492857, 300.0, 10.0, 2
    I = np.linspace(0.5, 6.0, 40)
    Tc = (Qc + 0.5 * I**2 * R + K * Th) / (S * I + K)
    P = I * (S * (Th - Tc) + I * R)
    cop = Qc / P
    k, j = int(np.argmin(Tc)), int(np.argmax(cop))
    i = 20
    sweep = ModuleSweep(tuple(I), tuple(Tc), (Th,) * len(I), tuple(cop), tuple(n * P), tuple(n * (Qc + P)))
    V = S * (Th - Tc[i]) + I[i] * R
    return ModuleResult(n, "series", float(I[i]), float(V), float(I[i]), float(n * V), float(Tc[i]), Th, n * Qc,
                        float(n * (Qc + P[i])), float(n * P[i]), float(cop[i]), float(I[k]), float(I[j]), sweep,
                        T_dew, float(Tc[i] - T_dew), hot_side_limit=353.15, T_cold_coldest=float(Tc[k]))


def circuit_demo(curve):
    # a hose adding k V^2 and a pump with a falling quadratic curve; operating point where they meet (computed)
    V = np.asarray(curve.V_dot)
    dp_plate = np.asarray(curve.dp)
    hose = 2.0e11 * V**2
    system = dp_plate + hose
    p0, Vmax = 1.5 * system.max(), 1.2 * V.max()
    pump = p0 * (1 - (V / Vmax) ** 2)
    k = int(np.argmin(np.abs(pump - system)))
    points = (("supply", float(pump[k])), ("hose", float(pump[k] - hose[k])), ("plate", 0.0))
    return CircuitResult("pump", float(V[k]), float(pump[k]), float(pump[k] - hose[k]), points,
                         SystemCurve(tuple(V), tuple(system), tuple(dp_plate)), PumpCurve(tuple(V), tuple(pump)),
                         needed_pressure=float(system[k]), plate_outlet_pressure=0.0,
                         heights=(("hose", -0.5), ("plate", -0.5)), surges=(("needle valve", 2.0e5),),
                         m_dot=float(V[k]) * 998.0, plate_rating=5e5)


def planning_demo(curve, cost=412.5, currency="EUR"):
    V = curve.V_dot
    return PlanningResult(V[3], "mounting face", 303.15, 333.15, curve.T_face[3], curve.T_out[3], 512.0, 186.9,
                          curve.water_m3_per_year[3], cost, None if cost is None else 100.0, currency, 2.5,
                          UseCurve(V, curve.T_face, curve.T_out, curve.water_m3_per_year),
                          Breakeven(900.0, 630.0, 412.5, 1.7e-5, 1.13, -217.5, None))


@pytest.fixture(scope="module")
def built():
    r = check_file(ROOT / "examples" / "reagent-block-channels.toml")
    curve = flow_curve(r.design)
    full = With(r, module=module_demo(r.T_dew), circuit=circuit_demo(curve), planning=planning_demo(curve))
    rep = make_report(full, curve, fit_flow_curves(curve), mounting_face_profile(r), version="test",
                      source_name="demo.toml", source_bytes=b"title = 'demo'\n")
    return full, rep


def test_sections_and_figures_present(built):
    _, rep = built
    page = parse(render_html(rep))
    for sec in ("module", "circuit", "water"):
        assert sec in page.sections
    assert {"fig-module", "fig-circuit", "fig-water"} <= set(page.figures)
    text, files = render_markdown(rep, "demo")
    assert {"demo.module.svg", "demo.circuit.svg", "demo.water.svg"} <= set(files)
    assert "## Thermoelectric module" in text and "## Supply circuit" in text


def _row(rep, section, label):
    sec = next(s for s in rep.sections if s.id == section)
    return next(r for r in sec.rows if r.label == label)


def test_module_numbers_as_given(built):
    full, rep = built
    m, u = full.module, DisplayUnits()
    assert _row(rep, "module", "current per module").value == f"{m.current:.4g}"
    assert _row(rep, "module", "heat into the plate (hot side, array)").value == u.fmt("power", m.Q_hot)
    cold, hot = _row(rep, "module", "cold face").value, _row(rep, "module", "hot face").value
    assert float(cold) == pytest.approx(m.T_cold - 273.15, abs=0.005)
    assert float(hot) == pytest.approx(m.T_hot - 273.15, abs=0.005)
    margin = _row(rep, "module", "dew margin (cold face − room dew/frost point)").value
    assert float(margin) == pytest.approx(m.dew_margin, rel=1e-3)


def test_circuit_numbers_as_given(built):
    full, rep = built
    c = full.circuit
    assert float(_row(rep, "circuit", "operating flow").value) == pytest.approx(c.V_dot * 6e4, rel=1e-3)
    assert float(_row(rep, "circuit", "supply pressure used (gauge)").value) == pytest.approx(
        c.supply_pressure / 1e3, rel=1e-3)
    sec = next(s for s in rep.sections if s.id == "circuit")
    assert [row[0] for row in sec.table[1:]] == [name for name, _ in c.points]


def test_planning_numbers_as_given(built):
    full, rep = built
    p = full.planning
    assert _row(rep, "water", "limit that binds").value == p.binding
    assert _row(rep, "water", "water cost a year").value == "412.50"
    assert _row(rep, "water", "water cost a year").unit == "EUR"
    assert _row(rep, "water", "chiller saving a year (water cost − electricity)").value == "-217.50"
    assert float(_row(rep, "water", "least flow meeting the limits").value) == pytest.approx(p.V_dot_min * 6e4,
                                                                                            rel=1e-3)


def test_flow_drive_without_pump_and_no_cost(built):
    full, _ = built
    r = full._base
    curve = flow_curve(r.design)
    c = circuit_demo(curve)
    flow_driven = dataclasses.replace(c, drive="flow", supply_pressure=None, pump=None)
    plan = dataclasses.replace(planning_demo(curve, cost=None, currency=None), V_dot_min=math.inf,
                               binding="unreachable", T_face_at_min=None, T_out_at_min=None, breakeven=None)
    rep = make_report(With(r, circuit=flow_driven, planning=plan, module=None), curve, fit_flow_curves(curve),
                      mounting_face_profile(r))
    page = parse(render_html(rep))
    assert "circuit" in page.sections and "module" not in page.sections
    labels = [row.label for s in rep.sections for row in s.rows]
    assert "supply pressure used (gauge)" not in labels and "water cost a year" not in labels
    assert _row(rep, "water", "least flow meeting the limits").value == "none"
    assert re.search(r'id="fig-circuit"', render_html(rep))
