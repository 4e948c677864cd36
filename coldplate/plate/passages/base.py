"""What every passage kind tells the solver: its flow geometry, its back-side
resistances for a given heat transfer coefficient, and its minor losses.

The passage modules are the only places that know a passage's shape.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Geometry:
    """Flow geometry of one passage kind (SI)."""

    kind: str
    shape: str  #: "rectangle" or "circle" (for the friction and Nu correlations)
    n_parallel: int  #: identical flow paths in parallel
    flow_area: float  #: one path's cross-section [m^2]
    wetted_perimeter: float  #: one path [m]
    D_h: float  #: hydraulic diameter [m]
    alpha: float  #: aspect ratio short/long side [-] (1 for a circle)
    path_length: float  #: one path's length [m]
    heated_length: float  #: length of one path in contact with the plate [m]
    heated: str  #: heated-wall arrangement for the laminar Nu table ("4", "3L", "3S", "1L"; see convection)
    roughness: float  #: absolute [m]
    description: str  #: one line for reports, lengths in mm
    #: True when the coolant crosses the plate once along its length, so its local bulk temperature follows
    #: the heat absorbed up to x; False for a serpentine, where the solve takes the outlet temperature.
    single_pass: bool = True
    #: Plate length before the cooled part along the flow, and the same after it [m]: a channel field's
    #: plenums.  The plate model cools only the length between (the channels' conductance is smeared over the
    #: channel length, not over the plenums).
    cooled_offset: float = 0.0
    #: The same line with its lengths as slots ``{0}``, ``{1}``, ...: a report in other units formats
    #: ``description_lengths`` [m] into them (the counts and names are in the template as they are).
    description_template: str = ""
    description_lengths: tuple[float, ...] = ()

    @property
    def rel_roughness(self) -> float:
        return self.roughness / self.D_h


@dataclass(frozen=True)
class BackSide:
    """Resistances between the passage roof and the coolant [K/W], named for the breakdown."""

    parts: tuple[tuple[str, float], ...]
    wetted_area: float  #: heated wetted area [m^2] (for the report)
    eta_fin: float | None = None  #: fin efficiency of channel walls, where there are fins
    #: correlations used here, for the range checks: (role, function with a .validity, {variable: value})
    methods: tuple = ()

    @property
    def total(self) -> float:
        return sum(r for _, r in self.parts)
