"""Frozen results of the air-cooled alternative (SI units, kelvin): the chosen sink and its comparison with the
water design (``Result.air``)."""
from __future__ import annotations

from dataclasses import dataclass, field

from coldplate.plate.result import MethodUse


@dataclass(frozen=True)
class AirSink:
    """One finned sink, solved at one load."""

    fins: int
    fin_thickness: float  #: [m]
    fin_height: float  #: [m]
    gap: float  #: between fins [m]
    base: float  #: [m]
    length: float  #: along the air [m]
    width: float  #: [m]
    height: float  #: base plus fins [m]
    material: str
    mass: float  #: [kg]
    drive: str  #: "fan", "velocity" or "natural"
    flow: float | None  #: air through the fins [m^3/s] (None: natural convection)
    velocity: float | None  #: in the gaps [m/s]
    dp: float  #: across the sink [Pa] (0 for natural convection)
    fan_power: float  #: air power the fan gives the air, flow times pressure [W]
    Re: float | None
    Nu: float
    h: float  #: on the fins and base [W/(m^2 K)]
    eta_fin: float
    regime: str
    T_air_in: float
    T_air_out: float | None  #: forced air only (natural: the rise is inside the correlation's coefficient)
    R_air_rise: float  #: the air's rise over the load, (T_out - T_in) / P [K/W] (0 for natural convection)
    R_fins: float  #: 1 / hA [K/W]
    R_spreading: float  #: base's spreading and conduction at the footprint centre [K/W]
    R_interface: float  #: [K/W]
    R_th: float  #: (hottest face - inlet air) / load [K/W]
    T_face_max: float  #: hottest mounting face [K]
    load: float  #: [W]
    base_rise: float | None = None  #: natural convection: base above ambient [K]
    optimum_spacing: float | None = None  #: natural convection: Bar-Cohen & Rohsenow's S_opt at the base's rise [m]


@dataclass(frozen=True)
class AirPlate:
    """The air sink as the module solve sees a plate: a resistance from the hottest face to the inlet air."""

    R_th: float
    T_face_max: float
    T_dew: float
    load: float
    sink: AirSink
    methods: tuple = ()
    assumptions: tuple = ()
    module: object | None = None


@dataclass(frozen=True)
class Comparison:
    """One line of the side-by-side table: water design against the air sink."""

    quantity: str
    kind: str  #: display kind (temperature, volume_per_year, power, length, mass)
    water: float | None
    air: float | None


@dataclass(frozen=True)
class AirResult:
    sink: AirSink
    face_limit: float  #: [K]
    face_limit_from: str
    holds: bool  #: the air sink's hottest face is at or below the limit
    margin: float  #: limit - air sink's hottest face [K] (negative: short by that much)
    water_face: float  #: the water design's hottest face [K]
    water_m3_per_year: float  #: once-through water the water design uses (0 on a loop)
    candidates: int  #: sinks the search evaluated
    feasible: int  #: of them within the shop limits and holding the limit
    shop_limits: tuple[float, float, str]  #: thinnest fin, narrowest gap [m], where from
    comparison: tuple[Comparison, ...]
    methods: tuple[MethodUse, ...]
    assumptions: tuple[str, ...]
    pressure: float  #: air pressure [Pa]
    module: object | None = None  #: the modules solved on the air sink (a ModuleResult) when the design has them
    module_refused: str = ""  #: why the modules have no steady state on the air sink, when so
    outside: tuple[str, ...] = field(default=())  #: correlation ranges the chosen sink leaves
