"""Uncertainty bands and sensitivities (coldplate/uncertainty/).  Each check names its source; VALIDATION.md
"Uncertainty bands" lists them."""
from __future__ import annotations

import copy
import json
import math
from dataclasses import replace

import numpy as np
import pytest
from scipy.stats import norm

from coldplate.check import solve
from coldplate.design.errors import DesignError
from coldplate.design.reader import design_from_dict
from coldplate.uncertainty.propagate import covered, evaluate_channel_rows, evaluate_tube_rows, propagate
from coldplate.uncertainty.reader import UncertaintySpec, Written, read_uncertainty
from coldplate.uncertainty.run import check_data
from coldplate.uncertainty.sampling import Z_95, ends, latin_hypercube, percentile, to_values
from coldplate.uncertainty.scatter import BANDS

from .helpers import EXAMPLES, ROOT, example_dict

EXAMPLE = "optics-bench-uncertainty"


def _linear_case(n, seed, coefficients=(2.0, -3.0, 0.5), means=(10.0, 4.0, -2.0), sigmas=(1.0, 0.5, 3.0)):
    """y = 1 + Σ b_i x_i with normal x_i: y is normal with mean 1 + Σ b_i μ_i, σ_y² = Σ b_i² σ_i²."""
    u = latin_hypercube(n, len(means), seed)
    x = np.column_stack([to_values(u[:, i], m - 2 * s, m + 2 * s, "normal") for i, (m, s) in
                         enumerate(zip(means, sigmas))])  # the ends at ±2σ
    y = 1.0 + x @ np.array(coefficients)
    mu = 1.0 + float(np.dot(coefficients, means))
    sd = math.sqrt(float(np.dot(np.square(coefficients), np.square(sigmas))))
    return y, mu, sd


@pytest.mark.parametrize("q", [0.05, 0.5, 0.95])
def test_linear_function_of_normal_inputs_has_the_normal_band(q):
    # Source (library): scipy.stats.norm.ppf, the normal distribution's percentiles; a linear function of
    # independent normal inputs is normal (published: any probability text).  The code under test draws its
    # normal values with the standard library's NormalDist, not scipy.
    y, mu, sd = _linear_case(4000, seed=3)
    value, err = percentile(y, q)
    exact = norm.ppf(q, loc=mu, scale=sd)
    assert abs(value - exact) <= err  # inside the reported sampling error
    # and within three standard errors of a sample quantile, √(q(1 - q)) / φ(z_q) σ / √n (published: the
    # asymptotic variance of a sample quantile; φ from scipy.stats.norm.pdf)
    se = math.sqrt(q * (1 - q)) / norm.pdf(norm.ppf(q)) * sd / math.sqrt(y.size)
    assert abs(value - exact) <= 3 * se


def test_uniform_input_percentiles_and_strata():
    # Source (published): McKay, Beckman & Conover (1979): one sample in each of the n equal strata of every
    # column; the q-quantile of U(a, b) is a + q (b - a).
    n = 1000
    u = latin_hypercube(n, 4, seed=11)
    for col in u.T:
        assert np.array_equal(np.sort(np.floor(col * n).astype(int)), np.arange(n))
    x = to_values(u[:, 0], 2.0, 6.0, "uniform")
    for q in (0.05, 0.5, 0.95):
        assert percentile(x, q)[0] == pytest.approx(2.0 + 4.0 * q, abs=4.0 / n)


def test_percentiles_converge_with_the_sample_count():
    # Source (library): scipy.stats.norm.ppf as the exact percentile.  The mean error over seeds falls as the
    # count grows, and the order-statistic error (Conover 1999 §3.2) shrinks about as 1/sqrt(n).
    errors, reported = [], []
    for n in (250, 1000, 4000, 16000):
        e, r = [], []
        for seed in range(5):
            y, mu, sd = _linear_case(n, seed)
            value, err = percentile(y, 0.95)
            e.append(abs(value - norm.ppf(0.95, mu, sd)) / sd)
            r.append(err / sd)
        errors.append(np.mean(e))
        reported.append(np.mean(r))
    assert errors[-1] < errors[0] and errors[-1] < errors[1]
    assert all(a > b for a, b in zip(reported, reported[1:]))
    assert reported[0] / reported[-1] == pytest.approx(math.sqrt(16000 / 250), rel=0.25)
    assert all(e <= r for e, r in zip(errors, reported))


def test_order_statistic_interval_constant():
    # Source (library): scipy.stats.norm.ppf(0.975), the two-sided 95 % normal quantile.
    assert Z_95 == pytest.approx(norm.ppf(0.975), rel=1e-12)
    assert ends(0.0, 4.0, "normal", 0.90) == pytest.approx((2.0 - norm.ppf(0.95), 2.0 + norm.ppf(0.95)), rel=1e-9)


def _zero_spread_spec(keys, seed=1):
    return UncertaintySpec(tuple(Written(k, "absolute", 0.0, 0.0, "uniform", "±0") for k in keys), False, 500,
                           seed, 0.90)


@pytest.mark.parametrize("name", ["reagent-block-channels", "laser-mount-sizing", "laser-mount-tube",
                                  "detector-cavity-glycol"])
def test_nominal_equals_the_check_when_every_spread_is_zero(name):
    # Source: computed by our own solver (the check), internal consistency: with no spread every sample is the
    # nominal design, and the band collapses onto the check's own numbers.
    data = example_dict(name)
    design = design_from_dict(data)
    r = solve(design)
    keys = ["heat.load", "coolant.inlet_temperature", "coolant.flow"]
    band = propagate(design, r, _zero_spread_spec(keys), data)
    for b, nominal in zip(band.bands, (r.T_face_max, r.T_out, r.dp, r.water_use_L_per_day)):
        for v in (b.low, b.median, b.high, b.nominal):
            assert v == pytest.approx(nominal, rel=1e-12, abs=1e-12)
    for s in band.sensitivity:
        assert s.low == pytest.approx(r.T_face_max, rel=1e-12) and s.high == pytest.approx(r.T_face_max, rel=1e-12)


@pytest.mark.parametrize("name", ["reagent-block-channels", "laser-mount-tube"])
def test_evaluator_rows_agree_with_the_check_unanchored(name):
    # Source: computed by our own solver; the evaluator's stated agreement with the check, 0.1 % on R_th
    # (DEVELOPERS.md "Sizing", tests/test_sizing_evaluate.py), holds row by row with load, inlet and flow varied
    # (laminar channels; a tube in transitional flow).
    from coldplate.sizing.evaluate import Evaluator

    data = example_dict(name)
    d = design_from_dict(data)
    if d.passage.kind == "channels":  # the band's rows carry no flow split (they are anchored to the check's)
        d = replace(d, passage=replace(d.passage, plenum_length=0.0))
    rows = [(d.heat.load, d.inlet_temperature, d.flow), (0.7 * d.heat.load, d.inlet_temperature - 6, 1.3 * d.flow),
            (1.4 * d.heat.load, d.inlet_temperature + 5, 0.6 * d.flow)]
    ev = Evaluator(replace(d, inlet_temperature=d.inlet_temperature - 6))
    Q, T, V = (np.array(c) for c in zip(*rows))
    common = (V, Q, T, np.full(3, d.interface.resistance_area), np.ones(3), np.ones(3))
    if d.passage.kind == "channels":
        got = evaluate_channel_rows(ev, np.full(3, d.passage.width), np.full(3, d.passage.depth), *common)
    else:
        got = evaluate_tube_rows(ev, *common)
    for i, (q, t, v) in enumerate(rows):
        ri = solve(replace(d, heat=replace(d.heat, load=q), inlet_temperature=t, flow=v), model="network")
        assert (got.T_face[i] - t) / q == pytest.approx(ri.R_th, rel=1e-3)
        assert got.dp[i] == pytest.approx(ri.dp, rel=1e-3)
        assert got.T_out[i] == pytest.approx(ri.T_out, abs=2e-3)


def test_seeded_runs_repeat_exactly():
    # Source: none needed (determinism): the same seed gives the same band bit for bit, another seed another.
    data = example_dict(EXAMPLE)
    a, b = check_data(copy.deepcopy(data)), check_data(copy.deepcopy(data))
    assert a.uncertainty == b.uncertainty
    data["uncertainty"]["seed"] = 8
    c = check_data(data)
    assert c.uncertainty.band("face").high != a.uncertainty.band("face").high


def test_example_band_findings_and_ranking():
    # Source: computed by our own solver (behaviour): with a face limit set between the nominal and the 95 % point, the
    # nominal meets it and the 95 % point does not (a finding); the example's inlet range reaches below the room's dew
    # point though the nominal inlet does not.
    data = example_dict(EXAMPLE)
    first = check_data(copy.deepcopy(data)).uncertainty.band("face")
    limit = 0.5 * (first.nominal + first.high) - 273.15  # a limit the nominal meets and the 95 % point does not
    data["supply"]["face_limit"] = f"{limit:.3f} degC"
    r = check_data(data)
    u = r.uncertainty
    assert u.method == "vectorised evaluator" and u.samples == 4000
    face = u.band("face")
    assert face.low < face.median < face.high and face.nominal < limit + 273.15 < face.high
    ids = {f.id for f in r.findings}
    assert {"face-limit-in-band", "dew-point-in-band"} <= ids
    dew = [f for f in r.findings if f.id == "dew-point-in-band"]
    assert all("Local plumbing and electrical codes" in f.action for f in dew)
    swings = [s.swing for s in u.sensitivity]
    assert swings == sorted(swings, reverse=True)
    assert u.sensitivity[0].input == "coolant.inlet_temperature"


def test_sensitivity_of_the_inlet_and_the_load():
    # Source (common practice): the network is referred to the inlet water, so the face moves with the inlet
    # almost one to one (properties change a little), and with the load in proportion to R_th.
    r = check_data(example_dict(EXAMPLE))
    s = {x.input: x for x in r.uncertainty.sensitivity}
    t = s["coolant.inlet_temperature"]
    assert (t.high - t.low) / (t.input_high - t.input_low) == pytest.approx(1.0, abs=0.03)
    q = s["heat.load"]  # the rows' changes come from the network (anchored to the check's own value)
    R_network = solve(design_from_dict(example_dict(EXAMPLE)), model="network").R_th
    assert (q.high - q.low) / (q.input_high - q.input_low) == pytest.approx(R_network, rel=0.03)


def test_fallback_path_for_what_the_evaluator_does_not_cover():
    # Source: computed by our own solver: a tube whose size varies goes through repeated checks, says so, and
    # leaves the correlations' scatter out with a note.
    data = example_dict("laser-mount-tube")
    data["uncertainty"] = {"heat.load": "±10 %", "passage.inner_diameter": "±0.1 mm", "samples": 40}
    r = check_data(data)
    assert not covered(r.design, r, ["passage.inner_diameter"])
    assert r.uncertainty.method == "repeated check" and r.uncertainty.samples == 40
    assert any("scatter is left out" in n for n in r.uncertainty.notes)
    assert r.uncertainty.band("face").low < r.T_face_max < r.uncertainty.band("face").high


def test_correlation_bands_are_beside_validity_records():
    # Source: the code's own Validity records: every scatter band is keyed by a method name a record carries.
    import coldplate.plate.convection as cv
    import hydraulics.ducts as ducts
    import hydraulics.friction as fr

    methods = {getattr(v, "validity").method for m in (cv, ducts, fr) for v in vars(m).values()
               if hasattr(v, "validity")}
    methods |= {v.method for m in (ducts, fr) for v in vars(m).values() if type(v).__name__ == "Validity"}
    for s in BANDS:
        assert s.method in methods, s.method
        assert 0 < s.band < 1 and ("from memory" in s.source or "common practice" in s.source or "(" in s.source)


@pytest.mark.parametrize("table, field", [
    ({"heat.lod": "±10 %"}, "[uncertainty] heat.lod"),
    ({"coolant.inlet_temperature": "±10 %"}, "[uncertainty] coolant.inlet_temperature"),
    ({"heat.load": ["90 W", "80 W"]}, "[uncertainty] heat.load"),
    ({"heat.load": "±150 %"}, "[uncertainty] heat.load"),
    ({"passage.inner_diameter": "±0.1 mm"}, "[uncertainty] passage.inner_diameter"),
    ({"heat.load": {"spread": "±10 %", "distribution": "lognormal"}}, "[uncertainty] heat.load"),
    ({"heat.load": "10 %"}, "[uncertainty] heat.load"),
    ({"samples": 3}, "[uncertainty] samples"),
    ({"correlations": False}, "[uncertainty]"),
    ({"passage.width": "±3 mm"}, "[uncertainty] passage.width"),
])
def test_bad_tables_are_one_line_errors_naming_the_key(table, field):
    # Source (common practice): the project's error contract (DEVELOPERS.md "Errors").
    data = example_dict("reagent-block-channels")
    data["uncertainty"] = table
    with pytest.raises(DesignError) as exc:
        read_uncertainty(data, design_from_dict(data))
    assert exc.value.field.startswith(field) and "\n" not in str(exc.value)


def test_flow_spread_refused_where_the_supply_sets_the_flow():
    data = example_dict("tap-to-drain-circuit")
    data["uncertainty"] = {"coolant.flow": "±5 %"}
    with pytest.raises(DesignError, match="supply sets"):
        read_uncertainty(data, design_from_dict(data))


def _run(tmp_path, text, *args):
    from coldplate.cli import main

    import contextlib
    import io

    path = tmp_path / "d.toml"
    path.write_text(text)
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        status = main(["check", str(path), *args])
    return status, out.getvalue(), err.getvalue()


def test_cli_json_keys_and_confidence(tmp_path):
    text = (ROOT / "examples" / f"{EXAMPLE}.toml").read_text()
    status, out, _ = _run(tmp_path, text, "--format", "json")
    assert status == 0
    d = json.loads(out)
    for key in ("surface_temperature_max_C", "outlet_temperature_C", "pressure_drop_Pa", "water_use_L_per_day"):
        band = d["uncertainty"][key]
        assert band["p05"] <= band["p50"] <= band["p95"]
        assert set(band["sampling_error"]) == {"p05", "p50", "p95"}
    assert d["uncertainty"]["surface_temperature_max_C"]["nominal"] == pytest.approx(d["surface_temperature_max_C"])
    assert {"input", "low", "high"} <= set(d["sensitivity"][0])
    status, out, _ = _run(tmp_path, text, "--format", "json", "--confidence", "80 %")
    band = json.loads(out)["uncertainty"]["surface_temperature_max_C"]
    assert {"p10", "p50", "p90"} <= set(band)
    status, out, err = _run(tmp_path, text.replace('"±30 %"', '"±30 K"'), "--format", "json")
    assert status == 2 and out == "" and err.count("\n") == 1 and "[uncertainty] interface.conductivity" in err


def test_cli_plain_check_has_no_band_and_text_shows_it(tmp_path):
    plain = (ROOT / "examples" / "reagent-block-channels.toml").read_text()
    status, out, _ = _run(tmp_path, plain, "--format", "json")
    assert "uncertainty" not in json.loads(out)
    status, out, _ = _run(tmp_path, plain, "--confidence", "90 %")
    assert "Uncertainty: 90 % band (p05 to p95)" in out and "correlations.Nu" in out
    assert "coolant.inlet_temperature" not in out  # the correlations' scatter alone


def test_tornado_chart_and_report_section():
    # Source: none (content of a figure): one bar pair per input, largest swing on top, the band's ends drawn.
    from reports import plots
    from reports.content import build_report
    from reports.display_units import DisplayUnits
    from coldplate.plate.curves import fit_flow_curves, flow_curve

    r = check_data(example_dict(EXAMPLE))
    u = DisplayUnits("si")
    import matplotlib

    with matplotlib.rc_context(plots._STYLE):
        fig = plots.tornado(r.uncertainty, u)
    ax = fig.axes[0]
    sens = [s for s in r.uncertainty.sensitivity if np.isfinite(s.swing)]
    assert len(ax.patches) == 2 * len(sens)
    ticks = dict(zip(ax.get_yticks(), (t.get_text() for t in ax.get_yticklabels())))
    assert ticks[max(ticks)] == sens[0].input and ticks[min(ticks)] == sens[-1].input  # largest swing on top
    lines = [ln.get_xdata()[0] for ln in ax.get_lines()]
    assert pytest.approx(r.uncertainty.band("face").high - 273.15) in lines
    svg = plots.draw(plots.tornado, r.uncertainty, u, name="tornado")
    assert svg.startswith("<svg")
    curve = flow_curve(r.design, [r.V_dot * f for f in (0.5, 0.8, 1.0, 1.5, 2.0)], load=r.load, flow=r.V_dot)
    rep = build_report(r, curve, fit_flow_curves(curve), figures={"tornado": svg})
    sec = next(s for s in rep.sections if s.id == "uncertainty")
    assert sec.figures and sec.table[1][0] == sens[0].input
    assert any("coolant.inlet_temperature" in p for p in sec.paragraphs)


def test_sizing_holds_the_face_limit_at_the_percentile():
    # Source: computed by our own solver (behaviour): held at 95 %, the recommendation's 95 % face meets the
    # limit; the nominal search's recommendation sits at the limit, so its 95 % face is above it.
    from coldplate.sizing.recommend import size as size_nominal
    from coldplate.sizing.search import read_search
    from coldplate.uncertainty.sizing import size

    data = example_dict("laser-mount-sizing")
    data["search"].update(count={"from": 8, "to": 16}, flow={"from": "0.4 L/min", "to": "4 L/min", "steps": 19},
                          face_limit_confidence="95 %")
    data["uncertainty"] = {"heat.load": "±10 %", "coolant.inlet_temperature": ["12 degC", "22 degC"]}
    design = design_from_dict(data)
    spec = read_search(data, design)
    limit = spec.limits.face
    held = size(data, design, spec)
    assert held.check.uncertainty.band("face").high <= limit
    assert any("95 % point of the band" in n for n in held.notes)
    plain = size_nominal(data, design, replace(spec, limits=replace(spec.limits, face_confidence=None)))
    band = propagate(plain.check.design, plain.check, read_uncertainty(data, plain.check.design, 0.90), data)
    assert band.band("face").high > limit
    assert held.recommended.flow >= plain.recommended.flow or held.check.R_th < plain.check.R_th


def test_every_example_reads_with_a_band():
    # Source: none (contract): every example accepts --confidence (the correlations' scatter alone) and gives a
    # finite band.
    for path in EXAMPLES:
        data = example_dict(path.stem)
        if "uncertainty" not in data:
            data["uncertainty"] = {"heat.load": "±5 %", "samples": 24}
        r = check_data(data)
        assert all(math.isfinite(b.high) for b in r.uncertainty.bands), path.stem
