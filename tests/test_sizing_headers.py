"""Sizing over header variants: ``[search] plenum_depth``, ``inlet_port`` and ``outlet_port``.

Sources: the one-design check (coldplate.check, the network model: its own flow split,
coldplate.plate.split) for what each variant achieves, computed by our own solver; the definition of the
Pareto front (a merged search equals the best of the variants searched one by one).
"""
from __future__ import annotations

import copy

import numpy as np
import pytest

from coldplate.check import solve
from coldplate.cli import main
from coldplate.design.reader import design_from_dict, parse_design
from coldplate.sizing.headers import Evaluators, variants
from coldplate.sizing.recommend import size
from coldplate.sizing.run import run_search
from coldplate.sizing.search import read_search
from coldplate.sizing.writer import toml_text

from .helpers import example_dict, write

BASE = example_dict("laser-bar-offset-ports")  # 16 channels, a U with both ports 30 mm off the centre line
SEARCH = {"flow": ["0.5 L/min", "1 L/min", "2 L/min"], "plenum_depth": ["4 mm", "8 mm"],
          "inlet_port": ["30 mm", "0 mm"], "outlet_port": ["30 mm", "-30 mm"], "face_limit": "40 degC"}


def _spec(search: dict, base: dict = BASE):
    data = copy.deepcopy(base)
    data["search"] = search
    design = design_from_dict(data)
    return data, design, read_search(data, design)


def _variant_data(v: dict, flow: str | None = None, base: dict = BASE) -> dict:
    data = copy.deepcopy(base)
    for k, x in v.items():
        data["passage"][k] = f"{x * 1e3:.10g} mm"
    if flow is not None:
        data["coolant"]["flow"] = flow
    return data


def test_each_variant_is_evaluated_as_the_check_solves_it():
    # computed by our own solver: the evaluator of each header variant against the one-design check (network)
    # of the same design written out, at the least flow searched
    _, design, spec = _spec(SEARCH)
    evs = Evaluators(design)
    Rs = []
    for v in variants(spec):
        e = evs.for_values(v).channels([16], [2e-3], [3e-3], [2e-3], [0.5 / 6e4])
        r = solve(design_from_dict(_variant_data(v, "0.5 L/min")), model="network")
        assert float(e.R_th.item()) == pytest.approx(r.R_th, rel=1e-6), v
        Rs.append(r.R_th)
    assert len(Rs) == 8 and np.ptp(Rs) / np.mean(Rs) > 0.1  # the variants differ: the split matters here


def test_merged_front_is_the_best_of_the_variants_searched_alone():
    # the definition of the front: one search over the variants finds what the best separate search finds
    _, design, spec = _spec(SEARCH)
    merged = run_search(spec, design)
    alone = []
    for v in variants(spec):
        search = {k: x for k, x in SEARCH.items() if k not in ("plenum_depth", "inlet_port", "outlet_port")}
        _, d_v, s_v = _spec(search, _variant_data(v))
        o = run_search(s_v, d_v)
        assert o.candidates == 3
        alone.append((o, v))
    assert merged.candidates == 8 * 3 and merged.evaluated == 24
    assert merged.feasible == sum(o.feasible for o, _ in alone)
    best = min((o.best for o, _ in alone if o.best is not None), key=lambda c: (c.flow, c.R_th))
    assert merged.best.flow == best.flow and merged.best.R_th == pytest.approx(best.R_th, rel=1e-12)
    for c in merged.pareto:  # every front point carries its variant, and no other point dominates it
        assert {"plenum_depth", "inlet_port", "outlet_port"} <= set(dict(c.values))
        others = [o.pareto for o, _ in alone]
        assert not any(p.R_th < c.R_th and p.dp < c.dp and p.flow <= c.flow for ps in others for p in ps)


def test_the_recommendation_is_written_with_its_headers_and_reads_back():
    data, design, spec = _spec(SEARCH)
    out = size(data, design, spec, do_refine=False)
    chosen = dict(out.recommended.values)
    back = parse_design(out.text)
    for k in ("plenum_depth", "inlet_port", "outlet_port"):
        assert getattr(back.passage, k) == pytest.approx(chosen[k], abs=1e-12), k
    # the written design's own network check equals the search's row (computed by our own solver)
    assert out.network_check.R_th == pytest.approx(out.recommended.R_th, rel=1e-6)


@pytest.mark.parametrize("search, field, words", [
    ({"plenum_depth": {"from": "2 mm", "to": "8 mm", "steps": 4}}, "[search] plenum_depth", "not a range"),
    ({"inlet_port": ["60 mm"]}, "[search] inlet_port", "plausible range: between -47 mm and 47 mm"),
    ({"outlet_port": "-48 mm"}, "[search] outlet_port", "below the plausible range"),
    ({"plenum_depth": ["0 mm"]}, "[search] plenum_depth", ""),
    ({"plenum_depth": ["2 mm", "3 mm", "4 mm", "5 mm"], "inlet_port": ["0 mm", "5 mm", "10 mm"],
      "outlet_port": ["0 mm", "5 mm", "10 mm"]}, "[search]", "more than"),
])
def test_bad_header_variables_are_refused_in_one_line(tmp_path, capsys, search, field, words):
    data = copy.deepcopy(BASE)
    data["search"] = {"flow": ["1 L/min"], "face_limit": "40 degC", **search}
    path = tmp_path / "design.toml"
    path.write_text(toml_text(data), encoding="utf-8")  # the writer's TOML: it writes inline tables (a range)
    assert main(["size", str(path)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1, err
    assert field in err[0] and words in err[0], err


def test_header_variables_need_a_channel_plate_with_plenums(tmp_path, capsys):
    data = copy.deepcopy(BASE)
    data["passage"]["plenum_length"] = "0 mm"
    for key in ("plenum_depth", "inlet_port", "outlet_port"):
        data["passage"].pop(key, None)
    data["search"] = {"flow": ["1 L/min"], "face_limit": "40 degC", "plenum_depth": ["4 mm"]}
    assert main(["size", str(write(tmp_path, data))]) == 2
    err = capsys.readouterr().err.strip()
    assert "[search] plenum_depth" in err and "plenum_length" in err
    tube = example_dict("laser-mount-tube")
    tube["search"] = {"flow": ["1 L/min"], "face_limit": "60 degC", "inlet_port": ["0 mm"]}
    assert main(["size", str(write(tmp_path, tube, "tube.toml"))]) == 2
    assert "[search] inlet_port" in capsys.readouterr().err
