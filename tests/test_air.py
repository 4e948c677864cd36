"""The air-cooled alternative ([air], coldplate/air): correlations against outside sources, the fan's operating
point by hand, the energy balance, the search, the wiring into check, JSON, text and report.

Each check names its source; "from memory" marks a value recalled rather than looked up.  The check values, their
tolerances and the agreement measured: VALIDATION.md, "Air-cooled alternative".
"""
from __future__ import annotations

import json
import math

import numpy as np
import pytest
from CoolProp.CoolProp import PropsSI

from coldplate.air import correlations as corr
from coldplate.air import sink as model
from coldplate.air.reader import pressure_at_altitude
from coldplate.air.search import candidates, evaluate
from coldplate.air.stage import solve_sink
from coldplate.check import solve
from coldplate.design.errors import DesignError
from coldplate.design.reader import design_from_dict, load_design
from coldplate.plate.conduction import fin_efficiency_straight, fin_m
from coldplate.plate.convection import Nu_rectangular_Shah_London
from hydraulics.pump import PumpTable, intersect, intersect_many
from tests.helpers import ROOT, example_dict

HOLDS = ROOT / "examples" / "small-amplifier-air-holds.toml"
SHORT = ROOT / "examples" / "laser-mount-still-air.toml"
MODULES = ROOT / "examples" / "sample-stage-air.toml"


# ------------------------------------------------------------------ fins


def test_fin_efficiency_analytic_form():
    # Incropera et al. 6th ed. eq. 3.89 / Table 3.4 case B: eta = tanh(mL)/(mL); tanh(1) = 0.761594 (analytic).
    assert fin_efficiency_straight(1.0, 1.0) == pytest.approx(math.tanh(1.0), rel=1e-12)
    # corrected length L_c = L + t/2 (Harper & Brown, as Incropera eq. 3.89): m = 10, L = 0.1, t = 0.02 -> mL_c = 1.1
    assert corr.fin_efficiency_corrected_tip(10.0, 0.1, 0.02) == pytest.approx(math.tanh(1.1) / 1.1, rel=1e-12)


def test_fin_efficiency_against_ht_annular_fin_of_huge_radius():
    # ht.fin_efficiency_Kern_Kraus (independent library: Kern & Kraus 1972 annular fin, insulated tip) tends to the
    # straight fin as the tube radius grows: a 10 mm fin on a 10 m tube differs by O(L/r) = 0.2 %.
    import ht

    h, k, t, L = 50.0, 200.0, 1e-3, 0.01
    ours = fin_efficiency_straight(fin_m(h, k, t), L)
    theirs = ht.fin_efficiency_Kern_Kraus(10.0, 10.0 + 2 * L, t, k, h)
    assert ours == pytest.approx(theirs, rel=3e-3)


# ------------------------------------------------------------------ parallel-plate limits


def test_parallel_plate_fully_developed_limits_shah_london():
    # Shah & London (1978), parallel plates: Nu_T = 7.541, Nu_H1 = 8.235 (both plates heated), f Re = 96 (Darcy).
    assert Nu_rectangular_Shah_London(0.0, "4", "T") == pytest.approx(7.541, abs=1e-3)
    assert Nu_rectangular_Shah_London(0.0, "4", "H1") == pytest.approx(8.235, abs=1e-3)


def _long_sink(gap=1e-3, height=0.05, length=1.0):
    """A sink of tall, close fins and a long flow length: the gaps are parallel-plate channels, fully developed."""
    data = example_dict("small-amplifier-air-holds")
    data["air"].update(length=f"{length} m", width="60 mm", height=f"{height * 1e3 + 5} mm")
    data["air"].pop("fan_flow")
    data["air"].pop("fan_pressure")
    data["air"].update(drive="velocity", velocity="0.2 m/s")
    data["air"]["min_gap"] = "0.5 mm"
    d = design_from_dict(data)
    N = 20.0
    t = (0.06 - (N - 1) * gap) / N
    return d.air, model.Candidates(np.array([N]), np.array([t]), np.array([height]))


def test_sink_gap_friction_tends_to_96_over_Re():
    # Shah & London (1978): fully developed laminar flow between parallel plates, Darcy f Re = 96; for the
    # rectangle alpha = 0.02 their polynomial 96 (1 - 1.3553 a + 1.9467 a^2 - 1.7012 a^3 + 0.9564 a^4 - 0.2537 a^5)
    # (from memory) gives 93.5.  A 1 m long gap at Re below 100 is fully developed over nearly all of it.
    air, c = _long_sink()
    pr = model.air_props(300.0, 101325.0)
    a = 1e-3 / 0.05
    expected = 96 * (1 - 1.3553 * a + 1.9467 * a**2 - 1.7012 * a**3 + 0.9564 * a**4 - 0.2537 * a**5)
    Q = 1e-4
    dp, V, Re, fr, Kc, Ke = model.pressure_drop(c, Q, air, pr)
    assert float(Re[0]) < 100
    assert float(fr.f[0]) * float(Re[0]) == pytest.approx(expected, rel=0.02)


def test_one_sink_drop_equals_the_search_formula():
    # Computed by our own functions: the fan's operating point asks pressure_drop_of_one (the geometry held),
    # which must equal pressure_drop itself, laminar through the VDI blend to turbulent, to round-off.
    d = load_design(ROOT / "examples" / "sample-stage-air.toml")
    cands = candidates(d.air)
    pr = model.air_props(300.0, 101325.0)
    for k in (0, cands.N.size // 2, cands.N.size - 1):
        one = model.Candidates(cands.N[k:k + 1], cands.t[k:k + 1], cands.H[k:k + 1])
        dp = model.pressure_drop_of_one(one, d.air, pr)
        for Q in (1e-6, 1e-4, 3e-3, 0.05, 0.4):
            assert dp(Q) == pytest.approx(float(model.pressure_drop(one, Q, d.air, pr)[0][0]), rel=1e-12)
    many = model.pressure_drop_many(cands, d.air, pr)             # every candidate at once, as the search asks
    for Q in (1e-6, 1e-4, 3e-3, 0.05, 0.4):
        q = np.full(cands.N.size, Q) * np.linspace(0.5, 1.5, cands.N.size)
        assert many(q) == pytest.approx(model.pressure_drop(cands, q, d.air, pr)[0], rel=1e-12)


def test_sink_gap_nusselt_tends_to_shah_london_parallel_plates():
    # Fully developed, the gap's Nu approaches the two-plates-heated H1 value 8.235 (Shah & London 1978); at
    # alpha = 0.02 with the base heated too it stays within 4 % of it.
    air, c = _long_sink()
    pr = model.air_props(300.0, 101325.0)
    hA, h, Nu, eta, Bi, cv = model.forced_conductance(c, 1e-4, air, pr)
    assert float(Nu[0]) == pytest.approx(8.235, rel=0.04)


# ------------------------------------------------------------------ fan curve


def test_fan_curve_intersection_by_hand():
    # By hand: a straight fan curve dp = 60 (1 - Q / 0.01) Pa (PCHIP through collinear points is that line) and
    # a system dp = a Q^2 meet where a Q^2 + 6000 Q - 60 = 0: a = 1.2e6 -> Q = (-6000 + 18000) / 2.4e6 = 5e-3;
    # a = 4.8e6 -> Q = (-6000 + sqrt(3.6e7 + 1.152e9)) / 9.6e6 = 28467.38 / 9.6e6 = 2.96535e-3.
    fan = PumpTable((0.0, 0.005, 0.01), (60.0, 30.0, 0.0))
    assert intersect(fan, lambda q: 1.2e6 * q * q) == pytest.approx(5e-3, rel=1e-9)
    a = np.array([1.2e6, 4.8e6])
    Q = intersect_many(fan, lambda q: a * q * q, 2)
    by_hand = (-6000 + np.sqrt(3.6e7 + 240.0 * a)) / (2 * a)
    assert Q == pytest.approx(by_hand, rel=1e-9)
    assert by_hand[1] == pytest.approx(2.96535e-3, rel=1e-5)


def test_sink_operating_point_is_on_the_fan_curve():
    # The chosen sink's flow: the fan's fitted rise there equals the sink's own pressure drop (internal check).
    d = load_design(HOLDS)
    r = solve(d)
    s = r.air.sink
    from hydraulics.pump import pump_curve

    rise = pump_curve(PumpTable(d.air.fan_flow, d.air.fan_pressure))(s.flow)
    assert rise == pytest.approx(s.dp, rel=1e-6)
    assert s.fan_power == pytest.approx(s.flow * s.dp, rel=1e-12)


# ------------------------------------------------------------------ natural convection


def test_optimum_spacing_against_published_form():
    # Bar-Cohen & Rohsenow (1984): S_opt = 2.714 L Ra_L^(-1/4); at S_opt the Elenbaas number is 2.714^4 and
    # their composite gives Nu_S = 1.307 (the optimum-spacing Nusselt number, from memory).
    L, dT, nu, alpha, beta = 0.18, 50.0, 1.857e-5, 1.857e-5 / 0.7202, 1.0 / 328.15
    Ra = corr.G0 * beta * dT * L**3 / (nu * alpha)
    S = corr.spacing_optimum_Bar_Cohen_Rohsenow(L, dT, nu, alpha, beta)
    assert S == pytest.approx(2.714 * L * Ra**-0.25, rel=1e-12)
    assert corr.Nu_vertical_channel_Bar_Cohen_Rohsenow(2.714**4) == pytest.approx(1.307, abs=1e-3)


def test_textbook_vertical_fin_array_example():
    # Cengel & Ghajar, Heat and Mass Transfer, the worked example of a vertical heat sink's optimum fin spacing
    # (from memory): a 12 cm wide, 18 cm high base at 80 degC in 30 degC air, fins 1 mm thick and 2.4 cm high;
    # film-temperature air k = 0.02808 W/(m K), nu = 1.857e-5 m^2/s, Pr = 0.7202 (the book's table, from memory);
    # answers S_opt = 7.5 mm, h = 4.9 W/(m^2 K), about 14 fins, Q = 29.7 W (from memory).
    k, nu, Pr = 0.02808, 1.857e-5, 0.7202
    L, H, t, W, dT = 0.18, 0.024, 1e-3, 0.12, 50.0
    alpha = nu / Pr
    S = corr.spacing_optimum_Bar_Cohen_Rohsenow(L, dT, nu, alpha, 1.0 / 328.15, g=9.81)
    assert S == pytest.approx(7.5e-3, rel=0.02)
    El = 9.81 / 328.15 * dT * S**4 / (nu * alpha * L)
    h = corr.Nu_vertical_channel_Bar_Cohen_Rohsenow(El) * k / S
    assert h == pytest.approx(4.9, rel=0.02)
    n = round(W / (S + t))
    assert n == 14
    assert h * 2 * n * L * H * dT == pytest.approx(29.7, rel=0.03)


def test_natural_search_lands_near_the_optimum_spacing():
    # The coolest layout of the still-air example has its gap within a quarter of Bar-Cohen & Rohsenow's optimum
    # at its own base rise (the search knows nothing of S_opt: it only evaluates the composite Nu).
    r = solve(load_design(SHORT))
    s = r.air.sink
    assert s.drive == "natural"
    assert s.gap == pytest.approx(s.optimum_spacing, rel=0.25)


def test_hot_plate_up_against_ht():
    # ht.Nu_horizontal_plate_McAdams (independent library; McAdams' hot-face-up laminar form 0.54 Ra^(1/4)).
    import ht

    for Ra in (2e4, 3e5, 5e6):
        assert corr.Nu_hot_plate_up_Lloyd_Moran(Ra) == pytest.approx(ht.Nu_horizontal_plate_McAdams(0.7, Ra / 0.7),
                                                                     rel=1e-9)


# ------------------------------------------------------------------ air, energy balance


def test_standard_atmosphere_against_fluids():
    # fluids.atmosphere.ATMOSPHERE_1976 (the 1976 US Standard Atmosphere, equal to ISO 2533 below 32 km).
    from fluids.atmosphere import ATMOSPHERE_1976

    for z in (0.0, 1000.0, 2500.0, 8000.0):
        assert pressure_at_altitude(z) == pytest.approx(ATMOSPHERE_1976(z).P, rel=2e-5)


def test_energy_balance_on_the_air_side():
    # The heat the air carries, from CoolProp's enthalpy (not the cp the model used): m_dot (h_out - h_in) = P.
    d = load_design(HOLDS)
    s = solve(d).air.sink
    p = d.air.pressure
    T_mean = 0.5 * (s.T_air_in + s.T_air_out)
    m_dot = PropsSI("D", "T", T_mean, "P", p, "Air") * s.flow
    carried = m_dot * (PropsSI("H", "T", s.T_air_out, "P", p, "Air") - PropsSI("H", "T", s.T_air_in, "P", p, "Air"))
    assert carried == pytest.approx(s.load, rel=2e-3)


def test_face_never_below_the_isothermal_base_answer():
    # The simplification errs hot: T_out + P/hA is at least the effectiveness answer P / (m cp (1 - e^-NTU)).
    d = load_design(HOLDS)
    s = solve(d).air.sink
    pr = model.air_props(0.5 * (s.T_air_in + s.T_air_out), d.air.pressure)
    mcp = pr.rho * s.flow * pr.cp
    ntu = 1.0 / (s.R_fins * mcp)
    exact = s.load / (mcp * (1.0 - math.exp(-ntu)))
    assert (s.T_air_out - s.T_air_in) + s.load * s.R_fins >= exact


# ------------------------------------------------------------------ search


def test_search_values_agree_with_the_exact_sink_solve():
    # Internal consistency: the vectorised search (inlet properties, interpolated spreading) against the exact
    # one-sink solve, within 3 % of the face's rise above the air, on a spread of candidates.
    d = load_design(HOLDS)
    air = d.air
    c = candidates(air)
    fp, R_int = (d.heat.footprint_length, d.heat.footprint_width), d.interface.resistance_area / (0.03 * 0.03)
    face, Q = evaluate(air, c, 30.0, fp, R_int)
    for i in np.linspace(0, c.N.size - 1, 7).astype(int):
        if not math.isfinite(face[i]):
            continue
        one = model.Candidates(c.N[i:i + 1], c.t[i:i + 1], c.H[i:i + 1])
        s, _ = solve_sink(air, one, 30.0, fp, R_int, 2690.0)
        assert face[i] - air.temperature == pytest.approx(s.T_face_max - air.temperature, rel=0.03)


def test_search_keeps_the_shop_limits():
    d = load_design(HOLDS)
    c = candidates(d.air)
    assert np.all(c.t >= d.air.min_fin * (1 - 1e-9))
    assert np.all(c.gap(d.air.width) >= d.air.min_gap * (1 - 1e-9))
    assert np.all(c.H + d.air.base <= d.air.height * (1 + 1e-9))


def test_shop_limits_from_the_search_table():
    data = example_dict("small-amplifier-air-holds")
    data["search"] = {"min_wall": "1.5 mm", "min_width": "3 mm"}
    a = design_from_dict(data).air
    assert (a.min_fin, a.min_gap, a.shop_limits_from) == (pytest.approx(1.5e-3), pytest.approx(3e-3), "[search]")


# ------------------------------------------------------------------ the check, outputs


def test_example_where_air_holds():
    r = solve(load_design(HOLDS))
    assert r.air.holds and r.air.margin > 0
    note = [f for f in r.findings if f.id == "air-holds"]
    assert note and "L of water a year" in note[0].message
    assert r.air.sink.T_face_max <= r.air.face_limit


def test_example_where_air_does_not_hold():
    r = solve(load_design(SHORT))
    assert not r.air.holds
    note = [f for f in r.findings if f.id == "air-short"]
    assert note and f"{-r.air.margin:.3g} K over" in note[0].message


def test_modules_on_the_air_sink():
    r = solve(load_design(MODULES))
    a = r.air
    assert a.module is not None and a.module.sweep.current
    # the modules' hot face is the air sink's hottest face, and it is warmer than on the water plate
    assert a.module.T_hot == pytest.approx(a.sink.T_face_max, abs=1e-5)
    assert a.module.T_cold > r.module.T_cold


def test_bare_module_is_refused_with_the_runaway_explained():
    data = example_dict("sample-stage-air")
    data["air"] = {"length": "70 mm", "width": "90 mm", "height": "30 mm", "sink": "none"}
    d = design_from_dict(data)
    with pytest.raises(DesignError) as exc:
        solve(d)
    text = str(exc.value)
    assert "[air] sink" in text and "no steady state" in text and "\n" not in text


@pytest.mark.parametrize("change, field", [
    ({"length": "10 mm"}, "[air] length"),
    ({"base": "50 mm"}, "[air] base"),
    ({"altitude": "1000 m", "pressure": "90 kPa"}, "[air]"),
    ({"fan_pressure": ["10 Pa", "20 Pa", "30 Pa", "40 Pa"]}, "[air] fan_pressure"),
    ({"drive": "wind"}, "[air] drive"),
    ({"colour": "red"}, "[air] colour"),
])
def test_bad_air_tables_are_refused_in_one_line(change, field):
    data = example_dict("small-amplifier-air-holds")
    data["air"].update(change)
    with pytest.raises(DesignError) as exc:
        design_from_dict(data)
    assert exc.value.field == field


def test_json_text_and_report_section():
    from reports.jsonout import render_json
    from reports.text import render_text

    r = solve(load_design(HOLDS))
    out = json.loads(render_json(r))["air"]
    assert out["holds_face_limit"] is True
    assert out["sink"]["fins"] == r.air.sink.fins
    assert out["water_saved_L_per_year"] == pytest.approx(r.water_use_m3_per_year * 1000.0)
    assert out["hottest_face_C"] == pytest.approx(r.air.sink.T_face_max - 273.15)
    text = render_text(r)
    assert "The air-cooled alternative" in text and "water design" in text
    from coldplate.plate.curves import fit_flow_curves, flow_curve, mounting_face_profile
    from reports.make import make_report

    curve = flow_curve(r.design)
    rep = make_report(r, curve, fit_flow_curves(curve), mounting_face_profile(r), version="test")
    sec = [x for x in rep.sections if x.id == "air"]
    assert sec, "the report has the air section"
    head, *body = sec[0].table
    assert head[1:3] == ("water design", "air sink")
    assert any(row[0] == "water a year" for row in body)
    assert sec[0].figures and sec[0].figures[0].svg.startswith("<svg")


def test_fins_drawn_to_scale():
    from matplotlib.patches import Rectangle

    from reports import plots
    from reports.display_units import DisplayUnits

    a = solve(load_design(HOLDS)).air
    fig = plots.air_sink(a, DisplayUnits("si"))
    rects = [p for p in fig.axes[0].patches if isinstance(p, Rectangle)]
    assert len(rects) == a.sink.fins + 1  # the base and every fin
    fin = rects[1]
    assert fin.get_width() == pytest.approx(a.sink.fin_thickness * 1e3)
    assert fin.get_height() == pytest.approx(a.sink.fin_height * 1e3)
    assert fig.axes[0].get_aspect() == 1.0
