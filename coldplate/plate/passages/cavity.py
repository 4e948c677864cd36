"""An open rectangular box under the plate with nothing inside.

The box spans the plate's length and width, ``height`` deep, fed and drained by a
round port at each end.  Only the floor (the plate's underside) takes heat, so the
laminar Nu is the one-heated-wall value.  Flow is taken as spread evenly across the
box; a real jet from a small port leaves dead corners, so the result is optimistic
where the port is much narrower than the box (a finding says so).
"""
from __future__ import annotations

import math

import numpy as np

from hydraulics.ducts import aspect_ratio, hydraulic_diameter_rectangle
from hydraulics.losses import MinorLoss, K_sudden_contraction, K_sudden_expansion

from coldplate.plate.passages.base import BackSide, Geometry


def geometry(passage, plate) -> Geometry:
    w, hgt = plate.width, passage.height
    return Geometry(
        kind="cavity",
        shape="rectangle",
        n_parallel=1,
        flow_area=w * hgt,
        wetted_perimeter=2 * (w + hgt),
        D_h=hydraulic_diameter_rectangle(w, hgt),
        alpha=aspect_ratio(w, hgt),
        path_length=plate.length,
        heated_length=plate.length,
        heated="1L",  # the floor, a long side, alone
        roughness=passage.roughness,
        description=f"open cavity {plate.length * 1e3:.4g} × {w * 1e3:.4g} × {hgt * 1e3:.3g} mm, "
                    f"ports {passage.port_diameter * 1e3:.3g} mm",
        description_template="open cavity {0} × {1} × {2}, ports {3}",
        description_lengths=(plate.length, w, hgt, passage.port_diameter),
    )


def back_side_total(passage, plate, geom: Geometry, h):
    """The back side's total resistance [K/W] (:func:`back_side`'s total) at ``h`` [W/(m² K)], float or array."""
    return 1.0 / (np.asarray(h, dtype=float) * (plate.length * plate.width))


def back_side(passage, plate, geom: Geometry, h: float) -> BackSide:
    floor = plate.length * plate.width
    return BackSide(parts=(("convection", 1.0 / (h * floor)),), wetted_area=floor)


def minor_losses(passage, plate, geom: Geometry, V: float, Re: float, fd: float) -> tuple[MinorLoss, ...]:
    port_area = math.pi * passage.port_diameter**2 / 4
    V_port = V * geom.flow_area / port_area
    return (
        MinorLoss("inlet port into cavity", K_sudden_expansion(port_area, geom.flow_area), V_port),
        MinorLoss("cavity into outlet port", K_sudden_contraction(geom.flow_area, port_area), V_port),
    )
