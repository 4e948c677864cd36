"""The sizing search: the Pareto filter against the definition, a known-good design is found, an empty search
names the limit that binds, the [search] reader's ranges.

Sources: the definition of Pareto dominance (brute force, computed in the test); the one-design check
(coldplate.check) for what a design achieves.
"""
from __future__ import annotations

import dataclasses

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from coldplate.design.reader import design_from_dict
from coldplate.design.errors import DesignError
from coldplate.sizing.evaluate import Evaluator
from coldplate.sizing.pareto import pareto_mask, pareto_mask_brute_force
from coldplate.sizing.recommend import size
from coldplate.sizing.run import run_search
from coldplate.sizing.search import read_search
from coldplate.plate.solve import solve_plate

from .helpers import example_dict

BASE = example_dict("reagent-block-channels")


def _data(search: dict, base: dict = BASE) -> dict:
    data = dict(base)
    data["search"] = search
    return data


def _spec(search: dict, base: dict = BASE):
    data = _data(search, base)
    design = design_from_dict(data)
    return data, design, read_search(data, design)


SMALL = {"count": [6, 10, 14], "width": ["1.5 mm", "2 mm", "2.5 mm"], "depth": ["4 mm", "6 mm"],
         "base": ["2 mm", "4 mm"], "flow": {"from": "0.3 L/min", "to": "3 L/min", "steps": 10},
         "face_limit": "32 degC", "pressure_drop_limit": "2 kPa"}


# ---------------------------------------------------------------- Pareto


@pytest.mark.parametrize("method", ["levels", "divide", None])
@pytest.mark.parametrize("seed", range(6))
def test_pareto_filter_matches_the_definition(seed, method):
    rng = np.random.default_rng(seed)
    n = 700  # more than one block of the divide-and-conquer method
    F = rng.random((n, 3)) if seed % 2 else rng.integers(0, 5, (n, 3)).astype(float)  # ties and copies too
    assert np.array_equal(pareto_mask(F, method), pareto_mask_brute_force(F))


def test_pareto_edge_cases():
    assert pareto_mask(np.empty((0, 3))).size == 0
    assert pareto_mask([[1.0, 2.0, 3.0]]).tolist() == [True]
    # copies dominate neither each other; a point better in one objective only still dominates
    F = [[1, 1, 1], [1, 1, 1], [1, 1, 2], [2, 0, 2]]
    assert pareto_mask(F).tolist() == [True, True, False, True]
    with pytest.raises(ValueError):
        pareto_mask([[1.0, 2.0]])
    with pytest.raises(ValueError):
        pareto_mask([[1.0, 2.0, 3.0]], method="guess")


def test_pareto_methods_are_the_named_functions():
    from coldplate.sizing import pareto

    assert pareto.METHODS == {"levels": pareto._by_levels, "divide": pareto._divide_and_conquer}


def test_search_front_equals_brute_force_front_on_a_small_grid():
    data, design, spec = _spec(SMALL)
    ev = Evaluator(design)
    outcome = run_search(spec, design, ev, chunk=40)  # several chunks, so the front is merged
    # brute force: every candidate, every limit, the O(n^2) filter
    ax = spec.axes
    n, w, d = (a.ravel() for a in np.meshgrid(ax["count"], ax["width"], ax["depth"], indexing="ij"))
    e = ev.channels(n, w, d, ax["base"], ax["flow"])
    ok = e.solvable & (e.T_face <= spec.limits.face) & (e.dp <= spec.limits.pressure_drop)
    ok &= e.T_out <= spec.limits.discharge
    F = np.column_stack([e.R_th[ok], e.dp[ok], e.flow[ok]])
    front = F[pareto_mask_brute_force(F)]
    got = np.array([[c.R_th, c.dp, c.flow] for c in outcome.pareto])
    assert outcome.feasible == int(ok.sum())
    assert sorted(map(tuple, front.round(12))) == sorted(map(tuple, got.round(12)))
    # the grid's pick is the least flow, then the lowest R_th, then the lowest dp of every feasible candidate
    least = min(map(tuple, F[:, [2, 0, 1]]))
    assert (outcome.best.flow, outcome.best.R_th, outcome.best.dp) == pytest.approx(least, rel=1e-12)


# ---------------------------------------------------------------- known-good design


def test_known_good_design_in_the_grid_is_found():
    d0 = design_from_dict(BASE)  # the example: 12 channels 2 x 6 mm, base 3 mm, 1.5 L/min
    r0 = solve_plate(d0)
    search = {"count": [12], "width": ["2 mm"], "depth": ["6 mm"], "base": ["3 mm"],
              "flow": ["1 L/min", "1.25 L/min", "1.5 L/min", "1.75 L/min", "2 L/min"],
              "face_limit": f"{r0.T_face_max - 273.15 + 0.01} degC", "pressure_drop_limit": f"{r0.dp * 1.0001} Pa"}
    data, design, spec = _spec(search)
    s = size(data, design, spec, do_refine=False)
    assert dict(s.recommended.values) == pytest.approx({"count": 12, "width": 2e-3, "depth": 6e-3, "base": 3e-3,
                                                        "flow": 1.5 / 6e4})
    assert s.network_check.R_th == pytest.approx(r0.R_th, rel=1e-9)  # the search's model


def test_known_good_design_is_feasible_or_dominated_in_a_wider_grid():
    d0 = design_from_dict(BASE)
    r0 = solve_plate(d0)
    search = dict(SMALL, count=[8, 12, 16], width=["1.5 mm", "2 mm"], depth=["4 mm", "6 mm"], base=["3 mm"],
                  flow=["1 L/min", "1.5 L/min", "2 L/min"], face_limit=f"{r0.T_face_max - 273.15 + 0.01} degC",
                  pressure_drop_limit=f"{r0.dp * 1.0001} Pa")
    data, design, spec = _spec(search)
    outcome = run_search(spec, design)
    assert any(c.R_th <= r0.R_th * (1 + 1e-3) and c.dp <= r0.dp * (1 + 1e-3) and c.flow <= r0.V_dot
               for c in outcome.pareto)
    assert outcome.best.flow <= r0.V_dot


def test_refinement_needs_less_flow_and_still_meets_the_limits():
    # 24.5 degC: with the flow split across the channels (the least-fed channel sets the face) 24 degC is out
    # of this grid's reach
    data, design, spec = _spec(dict(SMALL, face_limit="24.5 degC"))
    s = size(data, design, spec)
    grid = s.outcome.best
    assert s.refinement is not None and s.refinement.result is not None
    assert s.recommended.flow < grid.flow
    lim = spec.limits
    # the one-design check of the written design meets every limit
    n = s.network_check  # the search's model; the field's re-check is s.check
    assert n.T_face_max <= lim.face and n.dp <= lim.pressure_drop and n.T_out <= lim.discharge
    for name in ("width", "depth", "base"):
        assert spec.axes[name].min() - 1e-12 <= s.recommended.value(name) <= spec.axes[name].max() + 1e-12


# ---------------------------------------------------------------- nothing feasible


def test_impossible_face_limit_binds():
    data, design, spec = _spec(dict(SMALL, face_limit="15.5 degC"))
    s = size(data, design, spec)
    assert s.recommended is None and s.text is None
    assert any(line.startswith("face_limit binds") for line in s.binding)


def test_shop_wall_limit_binds():
    data, design, spec = _spec(dict(SMALL, face_limit="60 degC", pressure_drop_limit="100 kPa", min_wall="8 mm"))
    s = size(data, design, spec)
    assert s.recommended is None
    assert s.binding[1].startswith("min_wall binds")


def test_boiling_is_named_when_every_flow_is_too_small():
    data, design, spec = _spec(dict(SMALL, flow=["0.001 L/min"], face_limit="200 degC"))
    s = size(data, design, spec)
    assert s.recommended is None
    assert any(line.startswith("boiling binds") for line in s.binding)


# ---------------------------------------------------------------- the [search] reader


def test_ranges_lists_and_single_values():
    _, design, spec = _spec({"count": {"from": 4, "to": 8}, "width": ["2 mm", "1 mm", "2 mm"],
                             "depth": {"from": "1 mm", "to": "9 mm", "steps": 3, "spacing": "log"},
                             "flow": "1 L/min", "face_limit": "40 degC"})
    assert spec.axes["count"].tolist() == [4, 5, 6, 7, 8]
    assert spec.axes["width"] == pytest.approx([1e-3, 2e-3])  # sorted, copies dropped
    assert spec.axes["depth"] == pytest.approx([1e-3, 3e-3, 9e-3])
    assert spec.axes["base"] == pytest.approx([design.plate.base])  # not given: the design's value
    assert spec.axes["flow"] == pytest.approx([1 / 6e4])
    assert spec.given == ("count", "width", "depth", "flow")
    assert spec.size == 5 * 2 * 3


def test_static_pressure_is_the_pressure_limit_when_none_is_given():
    _, _, spec = _spec({"flow": ["1 L/min"], "face_limit": "40 degC"})
    assert spec.limits.pressure_drop == pytest.approx(4e5)
    assert "fittings, hose and valves are not counted" in spec.limits.pressure_source


def test_tube_search_reads_its_own_variables():
    tube = example_dict("laser-mount-tube")
    _, _, spec = _spec({"inner_diameter": ["4 mm", "6 mm"], "passes": [1, 2, 3], "face_limit": "50 degC"}, tube)
    assert spec.kind == "tube" and spec.size == 6
    with pytest.raises(DesignError, match=r"\[search\] width"):
        _spec({"width": ["4 mm"], "face_limit": "50 degC"}, tube)


def test_a_small_tube_search_runs_and_its_recommendation_checks():
    tube = example_dict("laser-mount-tube")
    data, design, spec = _spec({"inner_diameter": ["3.5 mm", "4.6 mm", "6 mm"], "passes": [1, 2, 3],
                                "base": ["3 mm", "5 mm"], "flow": {"from": "0.4 L/min", "to": "3 L/min",
                                                                   "steps": 14},
                                "face_limit": "50 degC", "pressure_drop_limit": "50 kPa"}, tube)
    s = size(data, design, spec)
    assert s.recommended is not None
    assert s.network_check.T_face_max <= spec.limits.face
    assert s.network_check.R_th == pytest.approx(s.recommended.R_th, rel=1e-3)
    assert s.check.model == "field" and s.network_check.model == "network"
    assert dataclasses.replace(s.check.design.passage).kind == "tube"


def test_writer_places_every_searched_variable():
    # the writer's table of places names exactly the variables the [search] reader knows
    from coldplate.sizing.search import HEADER_VARIABLES, VARIABLES
    from coldplate.sizing.writer import PLACES

    assert set(PLACES) == {name for kind in VARIABLES.values() for name in kind} | set(HEADER_VARIABLES)


@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(count=st.lists(st.integers(1, 60), min_size=1, max_size=3),
       width=st.lists(st.floats(0.2, 12.0), min_size=1, max_size=3),
       depth=st.lists(st.floats(0.3, 12.0), min_size=1, max_size=3),
       flow=st.lists(st.floats(0.001, 20.0), min_size=1, max_size=3),
       face=st.floats(15.5, 120.0))
def test_any_accepted_search_finishes_with_a_design_or_the_binding_limit(count, width, depth, flow, face):
    # property-based (hypothesis): every [search] the reader accepts is searched to a recommendation that the
    # one-design check confirms, or to a statement of the binding limit; never an internal error
    search = {"count": count, "width": [f"{w} mm" for w in width], "depth": [f"{d} mm" for d in depth],
              "flow": [f"{q} L/min" for q in flow], "face_limit": f"{face} degC"}
    try:
        data, design, spec = _spec(search)
    except DesignError:
        return
    s = size(data, design, spec)
    if s.recommended is None:
        assert s.binding and s.binding[0].startswith("No ")
    else:
        # the search's own model confirms it; the field's re-check is shown beside it (and may differ: the
        # network's smeared back side is not always the hotter one, see the lead's report)
        assert s.network_check.T_face_max <= spec.limits.face + 1e-6
        assert s.network_check.R_th == pytest.approx(s.recommended.R_th, rel=1e-3)
        assert s.check.model == "field" and any("re-checked as a field" in w for w in s.why)
