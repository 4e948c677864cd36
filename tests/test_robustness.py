"""Robustness: any design the reader accepts solves to finite numbers, or fails with a DesignError (one line,
exit 2). Nothing else may escape: no traceback for a user. Property-based (hypothesis), common practice."""
from __future__ import annotations

import math

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from coldplate.design.reader import LAMINAR_CHOICES, TURBULENT_CHOICES

from .helpers import example_dict, modified, solved_or_refused

BASES = {name: example_dict(name) for name in ("reagent-block-channels", "laser-mount-tube", "detector-cavity-glycol")}


def _mm(lo, hi):
    return st.floats(lo, hi).map(lambda v: f"{v:.4g} mm")


COMMON = {
    "heat__load": st.floats(0.01, 5000).map(lambda v: f"{v:.4g} W"),
    "coolant__flow": st.floats(0.005, 40).map(lambda v: f"{v:.4g} L/min"),
    "coolant__inlet_temperature": st.floats(-5, 95).map(lambda v: f"{v:.3g} degC"),
    "plate__base": _mm(0.2, 20),
    "plate__length": _mm(10, 400),
    "plate__width": _mm(10, 300),
    "room__relative_humidity": st.floats(1, 100).map(lambda v: f"{v:.3g} %"),
    "room__temperature": st.floats(-10, 45).map(lambda v: f"{v:.3g} degC"),
    "supply__static_pressure": _mm(0, 1).map(lambda s: s.replace("mm", "MPa")),
    "correlations__laminar": st.sampled_from(LAMINAR_CHOICES),
    "correlations__turbulent": st.sampled_from(TURBULENT_CHOICES),
}
KIND = {
    "reagent-block-channels": {"passage__count": st.integers(1, 60), "passage__width": _mm(0.2, 8),
                               "passage__depth": _mm(0.2, 20)},
    "laser-mount-tube": {"passage__passes": st.integers(1, 8), "passage__bend_radius": _mm(2, 30),
                         "passage__inner_diameter": _mm(1, 12)},
    "detector-cavity-glycol": {"passage__height": _mm(0.3, 20), "passage__port_diameter": _mm(1, 20)},
}


@st.composite
def designs(draw):
    name = draw(st.sampled_from(sorted(BASES)))
    fields = {**COMMON, **KIND[name]}
    chosen = draw(st.lists(st.sampled_from(sorted(fields)), min_size=1, max_size=5, unique=True))
    changes = {k: draw(fields[k]) for k in chosen}
    if "passage__inner_diameter" in changes:  # keep the wall: outer = inner + 1.5 mm
        inner = float(changes["passage__inner_diameter"].split()[0])
        changes["passage__outer_diameter"] = f"{inner + 1.5:.4g} mm"
    return modified(BASES[name], **changes)


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(designs())
def test_any_design_solves_or_says_why(data):
    solved = solved_or_refused(data)
    if solved is None:
        return
    d, r = solved
    numbers = [r.R_th, r.dp, r.T_out, r.T_face_max, r.h, r.Re, r.velocity, r.T_dew, r.water_use_L_per_day]
    numbers += [v for _, v in r.resistances]
    assert all(math.isfinite(v) for v in numbers)
    assert r.R_th > 0 and r.dp > 0 and r.T_out > r.T_in
    assert math.isclose(sum(v for _, v in r.resistances), r.R_th, rel_tol=1e-9)
