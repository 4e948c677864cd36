"""Frozen results of the thermoelectric stage: the operating point and the current sweep (SI, kelvin)."""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class ModuleSweep:
    """The coupled module and plate from zero current to I_max, one entry per current."""

    current: tuple[float, ...]  #: per module [A]
    T_cold: tuple[float, ...]  #: cold face [K] (placed modules: the warmest module's)
    T_hot: tuple[float, ...]  #: hot face (hottest mounting face of the plate; placed: the hottest module's) [K]
    cop: tuple[float, ...]  #: [-]; NaN where no power is drawn
    power: tuple[float, ...]  #: whole array [W]
    Q_hot: tuple[float, ...]  #: heat into the plate, whole array [W]
    stopped: str = ""  #: why the sweep ends below I_max (empty when it reaches I_max)


@dataclass(frozen=True)
class PlacedModule:
    """One placed module's operating point (model "field"; coldplate.modules.placed)."""

    name: str  #: "module 1", "module 2", ... in the order of [module] positions
    at: tuple[float, float]  #: its centre (from the inlet edge, across from the centre line) [m]
    T_hot: float  #: hot face: the field's hottest face under this module [K]
    T_cold: float  #: cold face [K]
    Q_hot: float  #: heat into the plate [W]
    Q_cold: float  #: heat pumped from the cold stage (the array's cold load shared equally) [W]
    voltage: float  #: [V]
    power: float  #: electrical power, its voltage times its current [W]
    runaway_slope: float  #: its row sum of C diag(c1) (the field's coupling): its face's rise per kelvin of all [-]
    limit_margin: float  #: hot_side_limit - T_hot [K] (negative: over the rating)
    current: float  #: its own current [A]: the design's current per module in series, its string's in parallel


@dataclass(frozen=True)
class ModuleResult:
    """The thermoelectric array solved together with the plate at its real hot-side heat."""

    count: int
    wiring: str  #: "series", "parallel" or "series-parallel"
    current: float  #: per module [A]
    voltage: float  #: per module [V]
    array_current: float  #: what the power supply delivers [A]
    array_voltage: float  #: [V]
    T_cold: float  #: cold face [K]
    T_hot: float  #: hot face [K]
    Q_cold: float  #: heat pumped from the cold stage, whole array [W]
    Q_hot: float  #: heat into the plate, whole array [W]
    power: float  #: electrical power, whole array [W]
    cop: float  #: Q_cold / power [-]; NaN where no power is drawn
    coldest_current: float  #: per-module current of the coldest cold face for this plate and flow [A]
    best_cop_current: float  #: least current reaching the operating cold-face temperature (its best COP) [A]
    sweep: ModuleSweep
    T_dew: float  #: room dew point (frost point below 0 degC) [K]
    dew_margin: float  #: T_cold - T_dew [K]
    strings: int = 1  #: parallel strings of count // strings modules in series
    mode: str = "current"  #: "current" (drive current given) or "target" (cold-face temperature given)
    T_load: float = 0.0  #: the load, beyond the cold-side path [K]
    T_cold_coldest: float = 0.0  #: cold face at the coldest current [K]
    max_current: float = 0.0  #: [A]
    hot_side_limit: float = 0.0  #: rated maximum hot-face temperature [K]
    R_plate: float = 0.0  #: the plate's resistance at the operating point, hot face to inlet [K/W]
    runaway_slope: float = 0.0  #: N R_plate dQ_h/dT_h at the operating point; 1 or more has no steady state
    max_heat_model: float = 0.0  #: the model's Q_max (I_max, no temperature difference, rated hot side) [W]
    parameters: tuple[float, float, float] = (0.0, 0.0, 0.0)  #: (S [V/K], R [ohm], K [W/K]) of one module
    iterations: int = 0  #: plate solves of the coupled operating point
    shortfall: str = ""  #: when a target cold face is out of reach: why, and what would reach it (else empty)
    field_solves: int = 0  #: field solves of the calibrated module solve (model "field"; 0 on the network)
    #: the field's resistance over the network's at the modules' heat, the scale the module solve ran the
    #: network with (model "field"; None on the network; coldplate.modules.solve.solve_with_module_field)
    field_scale: float | None = None
    #: each placed module's operating point (empty unless the modules are placed and solved on the field); the
    #: headline figures above are then the worst module's (hottest hot face, warmest cold face), the sums the
    #: array's
    placed: tuple[PlacedModule, ...] = ()
