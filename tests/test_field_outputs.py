"""What the field shows: per-source JSON keys and text, the coupling, the model line, ``check --map``, the
sources' findings and the report's two plate figures.

Sources of the checks, named beside each: the project's output contract (issue 13's keys and definitions, README
"Several heat sources"), the definition of the degree Celsius (T/degC = T/K - 273.15, SI Brochure, from memory),
the field's own arrays (the reports must show what the field solved, nothing else), and common practice for the
2 K margin.  The field's physics itself is checked in tests/test_field.py.

:func:`field_result` is the check on the field model (``solve(design, model="field")``); ``solve`` in this file is
the check on the network model (the model without a field), so each test says which model it reads.
"""
from __future__ import annotations

import csv
import io
import json
import math
import re
from dataclasses import replace
from functools import lru_cache

import numpy as np
import pytest

from functools import partial

from coldplate.check import collect_findings
from coldplate.check import solve as check_solve
from coldplate.design.reader import design_from_dict
from coldplate.plate.field import ChannelCooling, FieldPlate, FieldSource, solve_field
from coldplate.plate.result import source_outcomes
from reports.jsonout import check_to_dict
from reports.text import render_text
from tests.helpers import ROOT, example_dict

import tomllib

THREE = tomllib.loads((ROOT / "examples" / "three-sources-channels.toml").read_text())


solve = partial(check_solve, model="network")


def field_result(design):
    """The check on the field model."""
    return check_solve(design, model="field")


@lru_cache(maxsize=None)
def three():
    """The three-source example on the field model (solved once for the module)."""
    return field_result(design_from_dict(THREE))


def with_findings(r, **changes):
    out = replace(r, **changes)
    return replace(out, findings=collect_findings(out))


def ids(r):
    return [f.id for f in r.findings]


# ------------------------------------------------------------------------------------------------ JSON

def test_json_lists_every_source_with_its_own_figures():
    # source: the project's output contract (issue 13's keys); degC = K - 273.15 (SI Brochure, from memory);
    # own resistance = (hottest face - inlet) / own load (issue 13's definition)
    r = three()
    j = json.loads(json.dumps(check_to_dict(r), allow_nan=False))  # strict JSON: no NaN anywhere
    assert j["model"] == "field"
    assert [s["name"] for s in j["sources"]] == ["bridge", "diode-bar", "sensor"]
    for s, f, d in zip(j["sources"], r.field.sources, r.design.sources):
        assert s["load_W"] == pytest.approx(d.load, rel=1e-12)
        assert s["face_max_C"] == pytest.approx(f.face_max - 273.15, abs=1e-9)
        assert s["face_mean_C"] == pytest.approx(f.face_mean - 273.15, abs=1e-9)
        assert s["face_mean_C"] < s["face_max_C"]
        assert s["resistance_K_per_W"] == pytest.approx((f.face_max - r.T_in) / d.load, rel=1e-12)
        assert s["hottest_at_m"] == pytest.approx(list(f.hottest_at), abs=1e-12)
        if d.limit is None:
            assert s["limit_C"] is None and s["margin_K"] is None
        else:
            assert s["limit_C"] == pytest.approx(d.limit - 273.15, abs=1e-9)
            assert s["margin_K"] == pytest.approx(d.limit - f.face_max, abs=1e-9)
    assert np.allclose(j["coupling_K_per_W"], r.field.coupling, rtol=1e-12, atol=0)
    assert j["grid_uncertainty_K"] == pytest.approx(r.field.grid_uncertainty, rel=1e-12)
    # the existing key keeps its meaning: (hottest face - inlet) / total load
    assert j["thermal_resistance_K_per_W"] == pytest.approx((r.T_face_max - r.T_in) / r.load, rel=1e-12)


def test_json_of_the_network_has_no_field_figures():
    # source: the project's output contract: the network gives its hottest face per source, no mean face, no
    # coupling and no grid uncertainty
    r = solve(design_from_dict(example_dict()))
    j = check_to_dict(r)
    assert j["model"] == "network"
    assert j["grid_uncertainty_K"] is None
    assert [s["name"] for s in j["sources"]] == ["heat"] and j["sources"][0]["face_mean_C"] is None
    assert j["sources"][0]["face_max_C"] == pytest.approx(r.T_face_max - 273.15, abs=1e-9)
    assert j["coupling_K_per_W"] == []
    assert "thermal_resistance_K_per_W" in j and "surface_temperature_max_C" in j


# ------------------------------------------------------------------------------------------------ text

def test_text_says_the_model_and_shows_each_source_and_the_coupling():
    # source: the project's output contract (issue 13: the text says which model produced the figures)
    r = three()
    text = render_text(r)
    assert f"model: field: 3-D finite-volume solve, {r.field.cells:,} cells, grid uncertainty ± " in text
    assert f"± {r.grid_uncertainty:.4g} K" in text
    block = text[text.index("Heat sources"):text.index("Thermal resistance, hottest")]
    for s in r.sources:
        line = next(ln for ln in block.splitlines() if ln.strip().startswith(s.name + " ("))
        assert f"{s.face_max - 273.15:.2f}" in line
        assert f"mean {s.face_mean - 273.15:.2f}" in line
        assert ("no limit given" in line) == (s.limit is None)
        if s.limit is not None:
            assert f"margin {s.margin:+.2f} K" in line
    coupling = block[block.index("Coupling"):]
    assert all(name in coupling for name in ("bridge", "diode-bar", "sensor"))
    assert f"{r.coupling[0][2]:.4g}" in coupling


def test_text_in_us_units_converts_the_source_block():
    # source: 1 K = 1.8 °F and °F = 1.8 °C + 32 (NIST SP 811, from memory); the field's own values
    r = three()
    text = render_text(r, units="us")
    block = text[text.index("Heat sources"):text.index("Thermal resistance, hottest")]
    s = r.sources[1]
    assert f"{(s.face_max - 273.15) * 1.8 + 32:.2f}" in block
    assert f"margin {s.margin * 1.8:+.2f} °F to {(s.limit - 273.15) * 1.8 + 32:.2f} °F" in block
    assert "per unit heat" in block and "°F·h/BTU" in block
    assert f"± {r.grid_uncertainty * 1.8:.4g} °F" in text


def test_text_of_one_source_without_a_limit_has_no_source_block():
    # source: the project's output contract (the block appears with several sources or a limit)
    r = solve(design_from_dict(example_dict()))
    text = render_text(r)
    assert "model: network" in text
    assert "Heat sources" not in text and "Coupling" not in text


# ------------------------------------------------------------------------------------------------ --map

def _run(argv, monkeypatch, result):
    from coldplate import cli
    import coldplate.uncertainty.run

    monkeypatch.setattr(coldplate.uncertainty.run, "check_file_with_band", lambda path, confidence=None, **kw: result)
    return cli.main(argv)


def test_map_writes_every_face_cell(tmp_path, monkeypatch, capsys):
    # source: the field's own map (Result.field.face at its cell centres); degC = K - 273.15 (from memory)
    r = three()
    out = tmp_path / "face.csv"
    assert _run(["check", "x.toml", "--map", str(out)], monkeypatch, r) == 0
    text = out.read_text()
    comments = [ln for ln in text.splitlines() if ln.startswith("#")]
    assert any("plate side of any interface" in c for c in comments)
    rows = list(csv.DictReader(ln for ln in io.StringIO(text) if not ln.startswith("#")))
    f = r.field
    assert len(rows) == f.face_x.size * f.face_y.size
    got = np.array([[float(x["x_m"]), float(x["y_m"]), float(x["T_C"])] for x in rows])
    X, Y = np.meshgrid(f.face_x, f.face_y, indexing="ij")
    assert np.allclose(got[:, 0], X.ravel(), rtol=1e-5, atol=1e-9)
    assert np.allclose(got[:, 1], Y.ravel(), rtol=1e-5, atol=1e-9)
    assert np.allclose(got[:, 2], f.face.ravel() - 273.15, atol=1e-4)
    assert got[:, 2].max() == pytest.approx(f.face.max() - 273.15, abs=1e-4)
    assert not list(tmp_path.glob(".*.tmp"))
    assert "Heat sources" in capsys.readouterr().out


def test_map_with_the_network_is_refused_in_one_line(tmp_path, capsys):
    # source: the project's error contract (DEVELOPERS.md "Errors": exit 2, one line, nothing written)
    from coldplate import cli

    out = tmp_path / "face.csv"
    assert cli.main(["check", str(ROOT / "examples" / "reagent-block-channels.toml"), "--model", "network",
                     "--map", str(out)]) == 2
    err = capsys.readouterr()
    assert err.out == ""
    assert err.err.count("\n") == 1 and err.err.startswith("coldplate: error: --map: ")
    assert "network" in err.err
    assert not out.exists() and not list(tmp_path.iterdir())


def test_map_refuses_to_replace_a_file_without_force(tmp_path, monkeypatch, capsys):
    # source: the project's file contract (as `report` and `curves`: an existing file needs --force)
    out = tmp_path / "face.csv"
    out.write_text("keep\n")
    assert _run(["check", "x.toml", "--map", str(out)], monkeypatch, three()) == 2
    assert out.read_text() == "keep\n"
    assert "--map" in capsys.readouterr().err
    assert _run(["check", "x.toml", "--map", str(out), "--force"], monkeypatch, three()) == 0
    assert out.read_text().startswith("#")


# ------------------------------------------------------------------------------------------------ findings

def _limits(r, **limits):
    """The result with the sources' limits set (K), as a check with those limits would carry them."""
    S = tuple(replace(s, limit=limits.get(s.name.replace("-", "_"), s.limit)) for s in r.sources)
    return with_findings(r, sources=S)


def test_a_source_over_its_limit_is_a_warning():
    # source: the project's rule (issue 13: over its limit -> WARNING); the margin is limit - hottest
    r = three()
    bridge = r.sources[0]
    out = _limits(r, bridge=bridge.face_max - 0.5)
    f = next(f for f in out.findings if f.id == "source-over-limit")
    assert f.severity == "warning" and "'bridge'" in f.message and "0.5 K above" in f.message
    assert "source-near-limit" not in ids(out)


@pytest.mark.parametrize("below, near", [(0.3, True), (1.99, True), (2.01, False), (10.0, False)])
def test_a_source_within_2_K_of_its_limit_is_a_caution(below, near):
    # source: common practice, a 2 K margin (findings.sources.LIMIT_MARGIN); at or under the limit only
    r = three()
    out = _limits(r, sensor=r.sources[2].face_max + below)
    assert ("source-near-limit" in ids(out)) == near
    assert "source-over-limit" not in ids(out)
    if near:
        f = next(f for f in out.findings if f.id == "source-near-limit")
        assert f.severity == "caution" and "'sensor'" in f.message and "common practice" in f.message


def test_the_network_judges_each_limit_at_its_cautious_estimate():
    # source: the project's rule: the network's per-source figures are its cautious estimates, and say so
    data = dict(THREE, source=[dict(s) for s in THREE["source"]])
    r = solve(design_from_dict(data))
    data["source"][2]["limit"] = f"{r.sources[2].face_max - 273.15 - 1.0} degC"
    again = solve(design_from_dict(data))
    text = " ".join(f.message for f in again.findings)
    assert "source-over-limit" in ids(again) and "network model's cautious estimate" in text


def test_a_source_over_a_plenum_is_named_with_its_end():
    # source: the plate's geometry: the plenums take plenum_length at each end (Result.geometry.cooled_offset)
    data = dict(THREE, source=[dict(s) for s in THREE["source"]])
    data["source"][1]["at"] = ["112 mm", "0 mm"]  # 107 .. 117 mm, the outlet plenum begins at 113 mm
    r = solve(design_from_dict(data))
    f = [f for f in r.findings if f.id == "source-over-plenum"]
    assert len(f) == 1 and "'diode-bar'" in f[0].message and "outlet plenum" in f[0].message
    assert "4 mm over" in f[0].message
    assert "footprint-over-plenum" not in ids(r)  # the [heat] rule does not judge [[source]] tables
    assert "source-over-plenum" not in ids(solve(design_from_dict(THREE)))


def test_heat_table_keeps_its_own_plenum_rule():
    # source: the project's rule: [heat] is judged by findings.plate.footprint_over_plenum alone
    r = solve(design_from_dict(example_dict("reagent-block-channels") | {
        "heat": {"load": "85 W", "footprint": ["75 mm", "40 mm"]}}))
    assert "footprint-over-plenum" in ids(r) and "source-over-plenum" not in ids(r)


def test_sources_that_heat_each_other_strongly_are_noted():
    # source: our threshold (findings.sources.COUPLING_SHARE = 25 % of the source's own rise per watt), read off
    # the coupling matrix the field gives
    r = three()
    C = np.array(r.coupling)
    assert "sources-coupled" not in ids(r)  # the example's strongest is 0.019 / 0.18 (11 %)
    assert (C - np.diag(np.diag(C)) < 0.25 * np.diag(C)[:, None]).all()
    strong = [list(row) for row in C]
    strong[2][0] = 0.3 * C[2][2]  # the bridge heating the sensor by 30 % of the sensor's own
    out = with_findings(r, coupling=tuple(map(tuple, strong)))
    f = next(f for f in out.findings if f.id == "sources-coupled")
    assert f.severity == "note" and "'bridge' heats 'sensor'" in f.message and "(30 %" in f.message
    assert f.message.count(" heats ") == 1


def test_the_network_with_several_sources_says_it_smears_them():
    # source: the project's rule (issue 13: the network puts the sources' total on one footprint)
    assert "network-smears-sources" in ids(solve(design_from_dict(THREE)))
    assert "network-smears-sources" not in ids(three())
    assert "network-smears-sources" not in ids(solve(design_from_dict(example_dict())))


# ------------------------------------------------------------------------------------------------ figures

def _svg(func, r, units="si"):
    from reports import plots
    from reports.display_units import DisplayUnits

    return plots.draw(func, r, DisplayUnits(units), name="t")


def _labels(svg):
    """The texts matplotlib drew (as paths, each preceded by its text in a comment)."""
    return re.findall(r"<!-- (.*?) -->", svg)


def _png_pixels(svg):
    """The RGB pixels of every image embedded in the SVG (the rasterized map and its colour bar)."""
    import base64
    from matplotlib import image

    out = []
    for data in re.findall(r'xlink:href="data:image/png;base64,([^"]+)"', svg):
        px = image.imread(io.BytesIO(base64.b64decode("".join(data.split()))), format="png")
        rgb = px[..., :3].reshape(-1, 3)
        out.append(rgb[px[..., 3].ravel() > 0.99])
    return out


def _outline_aspect(svg):
    """Width / height of the plate outline's path (its id is set in plots.plate_top)."""
    g = re.search(r'<g id="t-plate-outline">\s*<path d="([^"]+)"', svg)
    nums = np.array([float(v) for v in re.findall(r"-?\d+(?:\.\d+)?", g.group(1))]).reshape(-1, 2)
    return np.ptp(nums[:, 0]) / np.ptp(nums[:, 1])


@pytest.mark.parametrize("example", ["three-sources-channels", "laser-mount-tube", "detector-cavity-glycol"])
def test_top_view_is_to_scale_with_one_label_per_source(example):
    # source: the design's own plate (length x width) and sources; drawn to scale (equal axes)
    r = solve(design_from_dict(tomllib.loads((ROOT / "examples" / f"{example}.toml").read_text())))
    from reports.plots import plate_top

    svg = _svg(plate_top, r)
    labels = _labels(svg)
    for s in r.design.sources:
        assert labels.count(s.name) == 1, (s.name, labels)
    assert _outline_aspect(svg) == pytest.approx(r.design.plate.length / r.design.plate.width, rel=2e-3)
    assert "flow, +x" in labels and "+y" in labels
    kind = r.design.passage.kind
    assert {"channels": "channels", "tube": "tube (serpentine)", "cavity": "cavity"}[kind] in labels
    if kind == "channels":
        assert "plenums" in labels and "ports" in labels


def test_face_map_uses_cividis_with_isotherms_and_each_hottest_point():
    # source: cividis, a perceptually uniform colour map readable with colour-vision deficiencies (Nuñez,
    # Anderton & Renslow 2018, from memory; matplotlib's own table); the map's values are the field's
    from matplotlib import colormaps
    from reports.plots import ISOTHERMS, face_map

    r = three()
    svg = _svg(face_map, r)
    table = colormaps["cividis"](np.linspace(0, 1, 256))[:, :3]
    jet = colormaps["jet"](np.linspace(0, 1, 256))[:, :3]
    images = _png_pixels(svg)
    assert len(images) == 2  # the map and its colour bar
    for px in images:
        far = np.min(np.linalg.norm(px[:, None, :] - table[None, :, :], axis=2), axis=1)
        assert far.max() < 0.03  # every pixel is a cividis colour (8-bit rounding and resampling)
        off_jet = np.min(np.linalg.norm(px[:, None, :] - jet[None, 128:160, :], axis=2), axis=1)
        assert off_jet.min() > 0.1  # none of a rainbow's greens
    labels = _labels(svg)
    assert "mounting face [°C]" in labels
    numbers = [float(v) for v in labels if re.fullmatch(r"\d+\.\d", v)]
    lo, hi = r.field.face.min() - 273.15, r.field.face.max() - 273.15
    assert len(set(numbers)) >= ISOTHERMS // 2 and all(lo <= v <= hi for v in numbers)  # labelled isotherms
    for s in r.sources:
        assert labels.count(s.name) == 1
        assert f'id="t-hottest-{s.name}"' in svg
    assert _svg(face_map, r, "us").count("mounting face [°F]") == 1


def test_coolant_plot_has_one_line_per_channel():
    # source: the field's own coolant array (Result.field.bulk: one row per channel)
    from reports.plots import coolant_along

    r = three()
    svg = _svg(coolant_along, r)
    n = r.field.bulk.shape[0]
    assert f"Coolant along the flow, each of {n} channels" in _labels(svg)
    paths = re.findall(r'<g id="t-channel-(\d+)">\s*<path d="([^"]+)"', svg)
    assert sorted(int(i) for i, _ in paths) == list(range(1, n + 1))
    for _, d in paths:  # every point along the flow where the field holds a bulk temperature
        assert d.count("L") + 1 == r.field.bulk_x.size


def test_report_with_the_field_has_the_map_section_in_both_layouts(tmp_path, monkeypatch):
    # source: the project's report contract (both layouts carry the same sections and figures)
    import coldplate.check
    from coldplate import cli

    r = three()
    monkeypatch.setattr(coldplate.check, "solve", lambda design, **kw: r)  # the stand-in's result
    import coldplate.uncertainty.run
    monkeypatch.setattr(coldplate.uncertainty.run, "solve", lambda design, **kw: r)  # the report's path to it
    src = ROOT / "examples" / "three-sources-channels.toml"
    assert cli.main(["report", str(src), "-o", str(tmp_path / "r.html")]) == 0
    html = (tmp_path / "r.html").read_text()
    for fig in ("plate", "facemap", "coolant"):
        assert f'id="fig-{fig}"' in html
    assert "Mounting-face temperature map" in html and "sensor: hottest mounting face" in html
    assert cli.main(["report", str(src), "-o", str(tmp_path / "r.md")]) == 0
    md = (tmp_path / "r.md").read_text()
    for fig in ("plate", "facemap", "coolant"):
        assert f"r.{fig}.svg" in md and (tmp_path / f"r.{fig}.svg").is_file()
    assert "| bridge |" in md  # the coupling table
