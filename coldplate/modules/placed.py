"""Thermoelectric modules placed one by one on the plate, each with its own hot face from the field.

With ``[module] size`` and ``positions`` each module is a field source (``coldplate.plate.sources.place_modules``).
Every module runs at the design's current per module ``I`` and pumps an equal share ``q = Q_c / N`` of the cold
load, so each one's hot-side heat is linear in its own hot face with the same coefficients
(thermoelectric.hot_side_heat_line):

    Q_h,i = c0 + c1 T_h,i

The field is linear in the loads at fixed properties (superposition): its faces at loads ``Q`` are
``F(Q) = F(Q_k) + C (Q - Q_k)`` near a solved ``Q_k``, ``C`` the coupling matrix.  With ``Q = c0 + c1 T_h``:

    (I - c1 C) T_h = F(Q_k) - C Q_k + C c0

A fresh field solve at the new loads then corrects ``F`` (each source's hottest face, which ``C``'s mean faces
only approximate, and the properties at the new heat) until every module's hot face agrees with its field within
:data:`~coldplate.modules.solve.FIELD_TOLERANCE_K`.  No steady state: the spectral radius of ``c1 C`` at least
one (each kelvin of the faces brings back a kelvin or more); each module's own share is ``c1`` times its row sum.

The operating current, the sweep and the coldest current come from the lumped array first solved on the field
(:func:`coldplate.modules.solve.solve_with_module_field`, the modules' heat shared equally), whose field solve at
equal shares is also the first step here.
"""
from __future__ import annotations

from dataclasses import replace

import numpy as np

from coldplate.design.errors import SolveError
from coldplate.modules import model as te
from coldplate.modules.result import PlacedModule
from coldplate.modules.solve import ASSUMPTIONS, FIELD_TOLERANCE_K, MAX_FIELD_SOLVES, solve_with_module_field

PLACED_ASSUMPTIONS = (
    "placed thermoelectric modules: each module a source of its own footprint where [module] positions puts "
    "it, its hot face the field's hottest face under it; every module at the design's current per module "
    "(with parallel wiring the modules' different voltages would share the current unequally; not modelled) "
    "and pumping an equal share of the cold load, each cold face following from its own hot face",
    "placed modules: the current sweep and the coldest and best-COP currents are the lumped array's (all "
    "modules at one hot face, the heat shared equally on the field); the headline figures are the worst "
    "module's (hottest hot face, warmest cold face), the dew margin the coldest cold face's, the supply "
    "voltage from the modules' mean voltage",
)


def with_loads(design, loads):
    """The design with each source's load set (the field then places exactly these watts)."""
    sources = tuple(replace(s, load=float(q)) for s, q in zip(design.sources, loads))
    return replace(design, sources=sources, heat=replace(design.heat, load=float(sum(loads))))


def _faces(result) -> np.ndarray:
    return np.array([s.face_max for s in result.sources], float)


def _runaway(names, c1: float, C: np.ndarray, I: float) -> None:
    """Refuse a coupling with no steady state, naming the module that contributes most."""
    G = c1 * C
    rho = float(max(abs(np.linalg.eigvals(G))))
    if rho >= 1.0:
        rows = G.sum(axis=1)
        k = int(np.argmax(rows))
        raise SolveError(f"at {I:.3g} A per module the hot sides have no steady state (the field's coupling "
                         f"times dQ_h/dT_h has a spectral radius of {rho:.2f}, at least 1); {names[k]} is the "
                         f"worst (its face rises {rows[k]:.2f} K per kelvin of all hot faces): lower the current, "
                         "spread the modules or improve the plate")


def solve_placed_field(design, field, network, scale: float = 1.0):
    """Placed modules on the field model: the field Result at each module's own hot-side heat, ``.module`` set
    with ``placed`` (one :class:`PlacedModule` each) and the worst module's headline figures.

    ``field``, ``network`` and ``scale`` as in :func:`coldplate.modules.solve.solve_with_module_field`, which
    gives the operating current; then the coupled hot faces by the coupling matrix, corrected by fresh field
    solves.  Raises :class:`SolveError` on a runaway or when the field solves do not agree.
    """
    base = solve_with_module_field(design, field, network, scale)
    lumped = base.module
    m = design.module
    N, I, q = m.count, lumped.current, m.cold_load / m.count
    names = [s.name for s in design.sources]
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    fr, Q = base, np.array([s.load for s in base.sources], float)
    F, C = _faces(base), np.array(base.coupling, float)
    gaps, solves = [], 0
    while True:
        _runaway(names, c1, C, I)
        T_h = np.linalg.solve(np.eye(N) - c1 * C, F - C @ Q + c0 * C.sum(axis=1))
        Q = c0 + c1 * T_h
        fr = field(with_loads(design, Q), load=float(Q.sum()))
        solves += 1
        F, C = _faces(fr), np.array(fr.coupling, float)
        gap = float(np.max(np.abs(F - T_h)))
        gaps.append(gap)
        if gap <= FIELD_TOLERANCE_K:
            break
        if solves >= MAX_FIELD_SOLVES:
            raise SolveError(f"the placed modules and the field did not agree in {MAX_FIELD_SOLVES} field solves "
                             f"(largest hot-face gap: {', '.join(f'{g:.3g} K' for g in gaps)}); the network model "
                             "(--model network) solves the modules as one array")
    _runaway(names, c1, C, I)
    T_c = te.cold_face_temperature(m.S, m.R, m.K, I, q, T_h)
    V = te.module_voltage(m.S, m.R, I, T_c, T_h)
    P = V * I
    slopes = c1 * C.sum(axis=1)
    placed = tuple(PlacedModule(n, s.at, float(th), float(tc), float(qh), q, float(v), float(p), float(k),
                                m.hot_side_limit - float(th))
                   for n, s, th, tc, qh, v, p, k in zip(names, design.sources, T_h, T_c, Q, V, P, slopes))
    worst = max(placed, key=lambda pm: pm.T_hot)
    power = float(P.sum())
    I_arr, V_arr = te.array_supply(I, float(V.mean()), N, m.strings)
    T_cold_min = float(T_c.min())
    mr = replace(lumped, voltage=worst.voltage, array_current=I_arr, array_voltage=V_arr, T_cold=worst.T_cold,
                 T_hot=worst.T_hot, Q_hot=float(Q.sum()), power=power,
                 cop=float(te.coefficient_of_performance(m.cold_load, power)), T_dew=fr.T_dew,
                 dew_margin=T_cold_min - fr.T_dew, T_load=worst.T_cold + m.cold_load * m.cold_side_resistance,
                 R_plate=fr.R_th, runaway_slope=float(max(abs(np.linalg.eigvals(c1 * C)))),
                 field_solves=lumped.field_solves + solves, placed=placed)
    module_methods = tuple(u for u in base.methods if u.role == "thermoelectric module")
    return replace(fr, design=design, module=mr,
                   assumptions=fr.assumptions + ASSUMPTIONS[:1] + PLACED_ASSUMPTIONS,
                   methods=fr.methods + module_methods)
