"""Parallel rectangular channels machined in the plate, with inlet and outlet plenums.

``count`` channels of ``width`` × ``depth`` share the plate width with ``count + 1``
walls of equal thickness (the two outer walls included).  The channel floors and
the two side walls take heat; the walls act as straight fins of height ``depth``
(the two outer walls wetted on one face) with an adiabatic tip at the lid (the lid is taken as unheated: a cautious,
common-practice assumption).  Flow enters a plenum across the plate, contracts
into the channels and expands into the outlet plenum; optional round ports feed
the plenums.
"""
from __future__ import annotations

import math

import numpy as np

from hydraulics.ducts import aspect_ratio, hydraulic_diameter_rectangle
from hydraulics.losses import MinorLoss, K_sudden_contraction, K_sudden_expansion

from coldplate.plate.conduction import fin_efficiency_straight, fin_m
from coldplate.plate.passages.base import BackSide, Geometry


def wall_thickness(passage, plate) -> float:
    """Thickness of each wall between channels [m]."""
    return (plate.width - passage.count * passage.width) / (passage.count + 1)


def channel_length(passage, plate) -> float:
    return plate.length - 2 * passage.plenum_length


def heated_walls(width, depth):
    """Heated-wall arrangement for the laminar Nu: floor and both side walls heated, the lid not.  A channel at
    least as deep as it is wide has its two long walls and one short wall heated ("3L"), a wide shallow one
    its two short walls and one long wall ("3S").  Floats or numpy arrays."""
    return np.where(np.asarray(depth) >= np.asarray(width), "3L", "3S")


def geometry(passage, plate) -> Geometry:
    w, d = passage.width, passage.depth
    L = channel_length(passage, plate)
    return Geometry(
        kind="channels",
        shape="rectangle",
        n_parallel=passage.count,
        flow_area=w * d,
        wetted_perimeter=2 * (w + d),
        D_h=hydraulic_diameter_rectangle(w, d),
        alpha=aspect_ratio(w, d),
        path_length=L,
        heated_length=L,
        heated=str(heated_walls(w, d)),  # floor and side walls heated, lid not
        roughness=passage.roughness,
        description=(f"{passage.count} channels {w * 1e3:.3g} × {d * 1e3:.3g} mm, {L * 1e3:.4g} mm long, "
                     f"walls {wall_thickness(passage, plate) * 1e3:.3g} mm"),
        description_template=f"{passage.count} channels {{0}} × {{1}}, {{2}} long, walls {{3}}",
        description_lengths=(w, d, L, wall_thickness(passage, plate)),
        cooled_offset=passage.plenum_length,
    )


def fin_areas(count, width, depth, length, wall, k, h):
    """Wetted and fin-effective heat-transfer areas of a channel field [m^2], the inner walls' fin parameter m
    [1/m] and fin efficiency [-].  Floats or numpy arrays (the sizing search evaluates many fields at once).

    The n - 1 walls between channels are wetted on both faces, m = sqrt(2 h / (k t_wall)); the two outer
    walls on their inner face only, m_o = sqrt(h / (k t_wall)) (the same fin as half of a wall 2 t_wall
    thick, wetted on both faces).  eta = tanh(m d)/(m d) for each; m and eta returned are the inner walls'
    (the lower efficiency)::

        wetted    = n L (w + 2 d)
        effective = L (n w + 2 d ((n - 1) eta + eta_o))
    """
    m = fin_m(h, k, wall)
    eta = fin_efficiency_straight(m, depth)
    eta_outer = fin_efficiency_straight(fin_m(h, k, 2 * np.asarray(wall)), depth)
    wetted = count * length * (width + 2 * depth)
    effective = length * (count * width + 2 * depth * ((count - 1) * eta + eta_outer))
    return wetted, effective, m, eta


def back_side_total(passage, plate, geom: Geometry, h):
    """The back side's total resistance [K/W] (:func:`back_side`'s total) at coefficients ``h`` [W/(m² K)], a
    float or a numpy array (the march asks for every point's at once)."""
    _, effective, _, _ = fin_areas(passage.count, passage.width, passage.depth, geom.path_length,
                                   wall_thickness(passage, plate), plate.conductivity, h)
    return 1.0 / (np.asarray(h, dtype=float) * effective)


def back_side(passage, plate, geom: Geometry, h: float) -> BackSide:
    t_w = wall_thickness(passage, plate)
    area, effective, m, eta = fin_areas(passage.count, passage.width, passage.depth, geom.path_length, t_w,
                                        plate.conductivity, h)
    eta = float(eta)
    checks = (("fin efficiency", fin_efficiency_straight,
               {"mL": float(m) * passage.depth, "Bi": h * (t_w / 2) / plate.conductivity}),)
    return BackSide(parts=(("convection", 1.0 / (h * effective)),), wetted_area=area, eta_fin=eta,
                    methods=checks)


def minor_losses(passage, plate, geom: Geometry, V: float, Re: float, fd: float) -> tuple[MinorLoss, ...]:
    """Plenum-to-channel contraction and channel-to-plenum expansion; port losses if ports are given."""
    return tuple(MinorLoss(name, K, V * ratio)
                 for name, K, ratio in loss_coefficients(passage.count, passage.width, passage.depth, plate.width,
                                                         passage.port_diameter, passage.header_depth))


#: The names of the two port losses in :func:`loss_coefficients` (the rest belong to each channel).
PORT_LOSSES = ("inlet port into plenum", "plenum into outlet port")


def loss_coefficients(count, width, depth, plate_width, port_diameter, plenum_depth=None):
    """The channel field's minor losses in flow order as (name, K, velocity ratio) [-]: K refers to the
    channel velocity times the ratio.  Floats or numpy arrays for the sizes; ports only when a diameter is
    given (``None`` or 0: none).  The plenum's face is the plate width times the deeper of the channel and the
    plenum (``plenum_depth``, None: the channel depth): the larger area ratio gives the larger K, cautious."""
    plenum_face = plate_width * (depth if plenum_depth is None else np.maximum(depth, plenum_depth))
    channels = count * width * depth
    out = [("contraction into channels", K_sudden_contraction(plenum_face, channels), 1.0),
           ("expansion out of channels", K_sudden_expansion(channels, plenum_face), 1.0)]
    if port_diameter:
        port_area = math.pi * port_diameter**2 / 4
        ratio = channels / port_area
        out.insert(0, ("inlet port into plenum", K_sudden_expansion(port_area, plenum_face), ratio))
        out.append(("plenum into outlet port", K_sudden_contraction(plenum_face, port_area), ratio))
    return tuple(out)
