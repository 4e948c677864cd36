"""The frozen result of one design check, in SI units (temperatures in kelvin).

The plate solve fills it; the check attaches the findings and, where the design has them, the modules' and the
supply's own results (``coldplate.modules.result``, ``coldplate.supply.result``).
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from hydraulics.coolant import Props
from hydraulics.losses import MinorLoss

from coldplate.plate.passages.base import Geometry

if TYPE_CHECKING:  # annotations only: the plate's result knows the other stages' results by name
    from coldplate.plate.field import FieldResult
    from coldplate.plate.sources import Source
    from coldplate.plate.split import Split
    from coldplate.design.reader import Design
    from coldplate.findings.base import Finding
    from coldplate.modules.result import ModuleResult
    from coldplate.air.result import AirResult
    from coldplate.supply.result import CircuitResult, PlanningResult
    from coldplate.uncertainty.result import Uncertainty

@dataclass(frozen=True)
class MethodUse:
    """A published correlation the check used, with where the design sits in its range."""

    role: str  #: e.g. "laminar Nu", "turbulent friction", "spreading"
    method: str
    reference: str
    validity: str  #: the range, as text (from the Validity record)
    values: tuple[tuple[str, float], ...]  #: the design's values of the range variables
    outside: tuple[str, ...]  #: messages for values outside the range (empty = inside)


@dataclass(frozen=True)
class Profile:
    """Temperatures along the flow (x from the plate's inlet edge) [m], [K]."""

    x: tuple[float, ...]
    T_bulk: tuple[float, ...]
    T_top: tuple[float, ...]  #: plate top face on the centre line (add the interface rise within the footprint)


@dataclass(frozen=True)
class SourceOutcome:
    """One heat source's figures from the plate solve (temperatures on the device side of its interface) [K]."""

    name: str
    load: float  #: [W]
    face_max: float  #: hottest face temperature [K]
    face_mean: float  #: mean face temperature [K] (NaN when the model gives none)
    limit: float | None  #: the device's own limit [K], if given
    hottest_at: tuple[float, float]  #: (x from the inlet edge, y across from the centre line) [m]
    grid_uncertainty: float  #: of face_max [K] (NaN when not estimated)

    @property
    def margin(self) -> float | None:
        """limit - hottest face [K] (negative: over the limit); None without a limit."""
        return None if self.limit is None else self.limit - self.face_max

    def resistance(self, inlet: float) -> float:
        """(hottest face - inlet) / own load [K/W]."""
        return (self.face_max - inlet) / self.load if self.load > 0 else float("nan")


def source_outcomes(field: FieldResult, sources: tuple[Source, ...]) -> tuple[SourceOutcome, ...]:
    """The field's per-source figures with each source's limit, in the design's source order."""
    by_name = {s.name: s for s in sources}
    return tuple(SourceOutcome(f.name, f.load, f.face_max, f.face_mean, by_name[f.name].limit, f.hottest_at,
                               f.grid_uncertainty) for f in field.sources)


@dataclass(frozen=True)
class Result:
    design: Design
    geometry: Geometry
    props: Props  #: at the bulk mean temperature
    R_th: float  #: (hottest mounting-face T - inlet T) / load [K/W]
    resistances: tuple[tuple[str, float], ...]  #: parts of R_th, in path order [K/W]
    T_in: float
    T_out: float
    T_face_max: float  #: hottest mounting face (device side of the interface) [K]
    T_plate_max: float  #: hottest point of the plate's top face [K]
    x_hot: float  #: where along the flow the hottest point is [m]
    dp: float  #: plate pressure drop [Pa]
    dp_friction: float
    minor_losses: tuple[MinorLoss, ...]
    velocity: float  #: mean velocity in the passage [m/s]
    Re: float
    Pr: float
    Nu: float
    f_darcy: float
    regime: str
    h: float  #: heat transfer coefficient on the wetted wall [W/(m^2 K)]
    eta_fin: float | None
    wetted_area: float
    V_dot: float  #: [m^3/s]
    m_dot: float  #: [kg/s]
    line_pressure: float  #: absolute pressure in the plate while flowing, cautious low value [Pa]
    T_boil: float  #: saturation temperature at that pressure [K]
    T_dew: float  #: room dew point (frost point below 0 degC) [K]
    dew_kind: str  #: "dew point" or "frost point"
    water_use_L_per_day: float  #: once-through consumption (0 when the water returns to a loop)
    water_use_m3_per_year: float
    methods: tuple[MethodUse, ...]
    profile: Profile
    iterations: int
    assumptions: tuple[str, ...]
    load: float  #: heat into the plate [W]
    findings: tuple[Finding, ...] = field(default=())
    module: ModuleResult | None = None  #: thermoelectric modules solved with the plate (from [module])
    circuit: CircuitResult | None = None  #: the operating point in its circuit ([circuit])
    planning: PlanningResult | None = None  #: least flow, water and money per year (once-through)
    Nu_hot: float | None = None  #: local Nusselt number where the hottest point is (Nu is the length mean)
    h_hot: float | None = None  #: local heat transfer coefficient there [W/(m^2 K)]
    model: str = "network"  #: the plate model that produced the temperatures: "network" or "field"
    sources: tuple[SourceOutcome, ...] = ()  #: per heat source, in the design's order
    coupling: tuple[tuple[float, ...], ...] = ()  #: [K/W] mean face rise of source i per watt of source j
    grid_uncertainty: float | None = None  #: of T_face_max [K] (field model: Richardson / grid convergence index)
    field: FieldResult | None = None  #: the solved field (face map, coolant per channel) with model "field"
    air: AirResult | None = None  #: the air-cooled alternative beside this design (from [air]; coldplate.air)
    uncertainty: Uncertainty | None = None  #: the band of the headline numbers ([uncertainty]; set by
    #: coldplate.uncertainty.run after the check, never by the check itself)
    # the flow split across a channel plate's channels (coldplate.plate.split); empty / None without one
    channel_flows: tuple[float, ...] = ()  #: per channel, across the plate from y < 0 to y > 0 [m^3/s, inlet]
    flow_split_min_to_mean: float | None = None  #: least channel flow over the mean [-]
    header_pressure_drop: tuple[float, float] | None = None  #: largest pressure change along (inlet, outlet) [Pa]
    port_arrangement: str | None = None  #: "U", "Z" or "centred" (hydraulics.manifold.Manifold.arrangement)
    flow_split: Split | None = None  #: the solved split (both header solves' ManifoldResult)
