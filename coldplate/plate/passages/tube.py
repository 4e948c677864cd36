"""A round tube bonded into a groove in the plate, in serpentine passes.

The passes run along the plate length, joined by 180-degree return bends of
centre-line radius ``bend_radius`` (so adjacent passes are ``2·bend_radius``
apart; a single pass has no bend and needs no ``bend_radius``).  Heat crosses, in series: the plate metal between
passes to the groove (1-D conduction with a uniform source, its peak rise mid-strip), the bond over the groove's
contact arc,
the tube wall, and convection inside the tube, where the unbonded half of the
tube takes heat through the wall acting as a curved fin.  The groove is taken to hold half
the tube's circumference (common practice for a half-round groove).
"""
from __future__ import annotations

import math

import numpy as np

from hydraulics.losses import MinorLoss, K_return_bend

from coldplate.plate import materials
from coldplate.plate.conduction import R_cylinder_wall, R_strip_lateral, fin_efficiency_straight, fin_m
from coldplate.plate.passages.base import BackSide, Geometry

#: Share of the tube circumference in contact with the groove (common practice, half-round groove).
CONTACT_ARC = 0.5


def tube_length(passage, plate) -> float:
    bends = max(passage.passes - 1, 0)
    return passage.passes * plate.length + bends * math.pi * (passage.bend_radius or 0.0)


def geometry(passage, plate) -> Geometry:
    di = passage.inner_diameter
    return Geometry(
        kind="tube",
        shape="circle",
        n_parallel=1,
        flow_area=math.pi * di**2 / 4,
        wetted_perimeter=math.pi * di,
        D_h=di,
        alpha=1.0,
        path_length=tube_length(passage, plate),
        heated_length=passage.passes * plate.length,
        heated="4",
        roughness=passage.roughness,
        description=(f"{passage.material} tube {di * 1e3:.3g}/{passage.outer_diameter * 1e3:.3g} mm, "
                     f"{passage.passes} {'pass' if passage.passes == 1 else 'passes'}, {passage.bond} bond"),
        description_template=(f"{passage.material} tube {{0}} / {{1}}, "
                              f"{passage.passes} {'pass' if passage.passes == 1 else 'passes'}, {passage.bond} bond"),
        description_lengths=(di, passage.outer_diameter),
        single_pass=passage.passes == 1,
    )


def strips(passage, plate) -> tuple[tuple[float, float], ...]:
    """The plate strips that conduct sideways to a groove: (width, conduction length) pairs [m].

    Adjacent passes are ``2·bend_radius`` apart, so each gap between grooves is a strip of width
    ``2·bend_radius − D_o`` that drains to both sides (length half its width); the plate outside the outer
    passes drains to one side only (length its full width).
    """
    do, pitch, n = passage.outer_diameter, 2 * (passage.bend_radius or 0.0), passage.passes  # one pass: no pitch
    gap = max(pitch - do, 0.0)
    edge = max((plate.width - (n - 1) * pitch - do) / 2.0, 0.0)
    out = [(gap, gap / 2)] * (n - 1) + [(edge, edge)] * 2
    return tuple((w, l) for w, l in out if w > 0)


def conduction_parts(passage, plate, geom: Geometry) -> tuple[tuple[str, float], ...]:
    """The back side's parts that do not depend on the coolant: the plate between and beside the passes, the
    bond and the tube wall [K/W]."""
    L = geom.heated_length
    do, di = passage.outer_diameter, passage.inner_diameter
    area_plate = plate.length * plate.width
    # The plate between and beside the passes: the hottest point of a strip is its centre line (its outer edge
    # for a strip beside the outer passes), l^2/(2 k t) per unit of heat per area.  Which strip lies under the
    # hot spot is not known here, so the strip with the longest conduction length is taken (cautious).
    r_lat = max((float(R_strip_lateral(l, plate.conductivity, plate.base, area_plate))
                 for _, l in strips(passage, plate)), default=0.0)
    r_bond = materials.bond(passage.bond).value / (CONTACT_ARC * math.pi * do * L)
    k_tube = materials.material(passage.material).conductivity
    r_wall = float(R_cylinder_wall(di, do, k_tube, L, CONTACT_ARC))
    return (("plate between passes", r_lat), ("bond", r_bond), ("tube wall", r_wall))


def convection(passage, geom: Geometry, h):
    """Convection inside the tube [K/W], the wall's fin parameter m [1/m], the arc length s [m] and the arc's
    fin efficiency [-].  ``h`` a float or a numpy array (the sizing search passes many flows at once).

    Heat reaches the unbonded half of the tube by conduction round the wall: two curved fins of a quarter of
    the mean circumference each, wetted on one face (m = sqrt(h/(k t)), i.e. fin_m with 2t):
    R = 1 / (h π D_i L (f + (1 − f) η_arc)), f the bonded share of the circumference.
    """
    do, di = passage.outer_diameter, passage.inner_diameter
    k_tube = materials.material(passage.material).conductivity
    m = fin_m(h, k_tube, do - di)
    s = math.pi * (do + di) / 8
    eta_arc = fin_efficiency_straight(m, s)
    wetted = math.pi * di * geom.heated_length
    return 1.0 / (h * wetted * (CONTACT_ARC + (1 - CONTACT_ARC) * eta_arc)), m, s, eta_arc


def back_side_total(passage, plate, geom: Geometry, h):
    """The back side's total resistance [K/W] (:func:`back_side`'s total) at ``h`` [W/(m² K)], float or array:
    the coolant-independent parts once, the convection at every ``h``."""
    fixed = sum(r for _, r in conduction_parts(passage, plate, geom))
    return fixed + convection(passage, geom, np.asarray(h, dtype=float))[0]


def back_side(passage, plate, geom: Geometry, h: float) -> BackSide:
    do, di = passage.outer_diameter, passage.inner_diameter
    k_tube = materials.material(passage.material).conductivity
    t_wall = (do - di) / 2
    r_conv, m, s, _ = convection(passage, geom, h)
    checks = [("tube wall as fin", fin_efficiency_straight, {"mL": float(m) * s, "Bi": h * t_wall / k_tube})]
    parts_lat = strips(passage, plate)
    if parts_lat:
        checks.append(("plate between passes", R_strip_lateral,
                       {"thickness/half_width": plate.base / max(l for _, l in parts_lat)}))
    return BackSide(parts=conduction_parts(passage, plate, geom) + (("convection", float(r_conv)),),
                    wetted_area=math.pi * di * geom.heated_length, methods=tuple(checks))


def bend_loss_coefficient(passage, fd, Re):
    """All return bends together, K on the tube velocity [-], less the arc friction the straight-tube friction
    already counts.  ``fd``, ``Re`` floats or numpy arrays."""
    bends = passage.passes - 1
    if bends <= 0:
        return np.zeros_like(np.asarray(fd, dtype=float))
    K = K_return_bend(passage.inner_diameter, passage.bend_radius, fd, Re)
    K_arc = np.asarray(fd) * math.pi * passage.bend_radius / passage.inner_diameter
    return bends * np.maximum(K - K_arc, 0.0)


def minor_losses(passage, plate, geom: Geometry, V: float, Re: float, fd: float) -> tuple[MinorLoss, ...]:
    """The return bends.  Rennels' bend K includes the friction of the bend's own arc, which the solve already
    counts in the straight-tube friction over ``path_length``; that part, fd·π·r/D, is taken out here."""
    bends = passage.passes - 1
    if bends <= 0:
        return ()
    K = float(bend_loss_coefficient(passage, fd, Re))
    return (MinorLoss(f"{bends} return bends (less arc friction)", K, V),)
