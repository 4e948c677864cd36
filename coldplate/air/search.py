"""The search: every fin count, thickness and height inside the envelope, evaluated at once.

The axes: fin count from 2 to as many as the thinnest fin and narrowest gap allow across the width; thickness
from the thinnest fin to three times it (at least 3 mm), geometric; height from a fifth of the room above the
base to all of it.  Candidates whose gap is below the shop's narrowest or above the fin height (a gap wider
than the fins are tall is not the fin channel the correlations describe) are dropped.  Each candidate is
solved with the air's properties at the inlet and the spreading interpolated in h (``sink.SpreadingTable``);
the chosen one is solved again exactly by the stage.  The best: the lightest sink holding the face limit
(fan power breaks ties), else the one with the coolest face; with thermoelectric modules the coolest face.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from coldplate.air import sink as model
from hydraulics.pump import PumpTable, intersect_many

THICKNESS_STEPS = 8
HEIGHT_STEPS = 10
MAX_FINS = 400


@dataclass(frozen=True)
class Found:
    index: int  #: into the candidate arrays
    candidates: model.Candidates
    face: np.ndarray  #: [K], inf where the drive gives no operating point
    flow: np.ndarray | None
    evaluated: int
    feasible: int


def candidates(air) -> model.Candidates:
    """The grid of fin count x thickness x height within the envelope and the shop limits."""
    room = air.height - air.base
    t_axis = np.geomspace(air.min_fin, max(3.0 * air.min_fin, 3e-3), THICKNESS_STEPS)
    H_axis = np.linspace(0.2 * room, room, HEIGHT_STEPS)
    n_max = int(min(MAX_FINS, math.floor((air.width + air.min_gap) / (air.min_fin + air.min_gap))))
    N_axis = np.arange(2, max(n_max, 2) + 1, dtype=float)
    N, t, H = (a.ravel() for a in np.meshgrid(N_axis, t_axis, H_axis, indexing="ij"))
    c = model.Candidates(N, t, H)
    s = c.gap(air.width)
    keep = (s >= air.min_gap * (1 - 1e-9)) & (s <= H)
    return model.Candidates(N[keep], t[keep], H[keep])


def evaluate(air, c: model.Candidates, load: float, fp: tuple[float, float], R_interface: float):
    """Hottest face [K] of every candidate and the air flow through it (None for natural convection)."""
    pr = model.air_props(air.temperature, air.pressure)
    table = model.spreading_table(air, *(float(v) for v in fp))
    area = air.length * air.width
    if air.drive == "natural":
        props_at = model.air_props_table(air.temperature, air.pressure)
        hA = model.natural_conductance(c, load, air, props_at)[0]
        return air.temperature + load * (table.R_centroid(hA / area) + R_interface), None
    if air.drive == "fan":
        fan = PumpTable(air.fan_flow, air.fan_pressure)
        Q = intersect_many(fan, model.pressure_drop_many(c, air, pr), c.N.size)
    else:
        Q = model.frontal_flow(air, c.H, air.velocity)
    ok = np.isfinite(Q)
    Q_safe = np.where(ok, Q, 1.0)
    hA = model.forced_conductance(c, Q_safe, air, pr)[0]
    T_out = air.temperature + model.air_rise(load, pr.rho * Q_safe, pr.cp)
    face = T_out + load * (table.R_centroid(hA / area) + R_interface)
    return np.where(ok, face, math.inf), Q


def search(air, load: float, fp: tuple[float, float], R_interface: float, density: float,
           coolest: bool = False) -> Found:
    """The best candidate; ``coolest``: the coolest face whatever its mass (thermoelectric modules: a cooler hot
    face is a colder cold face, so the lightest sink holding the hot-side limit is not the best)."""
    c = candidates(air)
    if c.N.size == 0:
        return Found(-1, c, np.array([]), None, 0, 0)
    face, Q = evaluate(air, c, load, fp, R_interface)
    holds = face <= air.face_limit
    if holds.any() and not coolest:
        m = model.mass(c, air, density)
        power = np.zeros_like(m) if Q is None else Q * model.pressure_drop(c, np.where(np.isfinite(Q), Q, 1.0),
                                                                            air, model.air_props(
                                                                                air.temperature, air.pressure))[0]
        order = np.lexsort((power, np.where(holds, m, np.inf)))
        best = int(order[0])
    else:
        best = int(np.argmin(face)) if np.isfinite(face).any() else -1
    return Found(best, c, face, Q, int(c.N.size), int(holds.sum()))
