"""A round tube bonded into a groove in the plate, in serpentine passes.

The passes run along the plate length, joined by 180-degree return bends of
centre-line radius ``bend_radius`` (so adjacent passes are ``2·bend_radius``
apart).  Heat crosses, in series: the plate metal between passes to the groove
(1-D conduction with a uniform source), the bond over the groove's contact arc,
the tube wall, and convection inside the tube.  The groove is taken to hold half
the tube's circumference (common practice for a half-round groove).
"""
from __future__ import annotations

import math

from hydraulics.losses import MinorLoss, K_return_bend

from .. import materials
from ..conduction import R_cylinder_wall, R_strip_lateral
from .base import BackSide, Geometry

#: Share of the tube circumference in contact with the groove (common practice, half-round groove).
CONTACT_ARC = 0.5


def tube_length(passage, plate) -> float:
    bends = max(passage.passes - 1, 0)
    return passage.passes * plate.length + bends * math.pi * passage.bend_radius


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
                     f"{passage.passes} passes, {passage.bond} bond"),
    )


def back_side(passage, plate, geom: Geometry, h: float) -> BackSide:
    L = geom.heated_length
    do, di = passage.outer_diameter, passage.inner_diameter
    pitch = plate.width / passage.passes
    half = max((pitch - do) / 2.0, 0.0)
    area_plate = plate.length * plate.width
    r_lat = float(R_strip_lateral(half, plate.conductivity, plate.base, area_plate)) if half > 0 else 0.0
    bond = materials.BONDS[passage.bond]
    r_bond = bond.value / (CONTACT_ARC * math.pi * do * L)
    k_tube = materials.material(passage.material).conductivity
    r_wall = float(R_cylinder_wall(di, do, k_tube, L, CONTACT_ARC))
    wetted = math.pi * di * L
    r_conv = 1.0 / (h * wetted)
    return BackSide(parts=(("plate between passes", r_lat), ("bond", r_bond), ("tube wall", r_wall),
                           ("convection", r_conv)), wetted_area=wetted,
                    methods=(("plate between passes", R_strip_lateral,
                              {"thickness/half_width": plate.base / half}),) if half > 0 else ())


def minor_losses(passage, plate, geom: Geometry, V: float, Re: float, fd: float) -> tuple[MinorLoss, ...]:
    bends = passage.passes - 1
    if bends <= 0:
        return ()
    K = K_return_bend(passage.inner_diameter, passage.bend_radius, fd, Re)
    return (MinorLoss(f"{bends} return bends", bends * K, V),)
