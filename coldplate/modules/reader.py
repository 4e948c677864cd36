"""Read the design file's ``[module]`` table: thermoelectric modules on the plate.

The module is given either by its datasheet maxima (``max_current``, ``max_voltage``,
``max_temperature_difference`` at ``rated_hot_side``), from which S, R and K follow by Luo's
derivation at that rated temperature, or directly by ``seebeck``, ``resistance`` and ``conductance``
(with ``max_current``).  Every problem is a :class:`DesignError` naming ``[module] key``.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from coldplate.modules import model as te
from coldplate.design.errors import DesignError
from coldplate.design.fields import Table, check_range
from coldplate.design.ranges import RANGES
from coldplate.design.units import quoted

WIRINGS = ("series", "parallel", "series-parallel")
#: Hot-side temperature a standard module may run at when the datasheet gives none: 80 degC
#: (common practice for modules assembled with ordinary low-temperature solder).
DEFAULT_HOT_SIDE_LIMIT = 353.15
#: Least Seebeck coefficient of a real module [V/K]: one thermocouple, a p and an n leg of about 200 uV/K each
#: near room temperature (bismuth telluride; from memory), taken at half that to leave room. Below it the
#: datasheet values describe less than one couple.
MIN_SEEBECK = 2.0e-4
#: Largest module figure of merit Z T accepted (at the rated hot side, or 300 K) [-]: bulk thermoelectric
#: materials near room temperature reach about 1 (common practice); 4 leaves room for any in use. From Luo's
#: relations Z T_h = 2 dT_max T_h / (T_h - dT_max)^2, which is 4 where dT_max is half of T_h: this refuses a
#: dT_max above half the rated hot-side temperature (150 K at 27 degC).
ZT_MAX = 4.0
_DATASHEET_KEYS = ("max_voltage", "max_temperature_difference", "rated_hot_side", "max_heat")
_DIRECT_KEYS = ("seebeck", "resistance", "conductance")
#: Every key [module] may hold (a misspelt key is named as unknown, with the nearest known one).
_KEYS = ("max_current", *_DATASHEET_KEYS, *_DIRECT_KEYS, "count", "wiring", "strings", "cold_load", "current",
         "cold_face_temperature", "cold_side_resistance", "hot_side_limit", "size", "positions")


@dataclass(frozen=True)
class Module:
    """N identical modules between the cold stage and the plate, in SI units (kelvin)."""

    S: float  #: Seebeck coefficient of one module [V/K]
    R: float  #: electrical resistance of one module [ohm]
    K: float  #: thermal conductance of one module [W/K]
    max_current: float  #: [A]
    count: int
    wiring: str  #: "series", "parallel" or "series-parallel"
    strings: int  #: parallel strings (1 = all in series, count = all in parallel)
    cold_load: float  #: heat the whole array pumps from the cold stage [W]
    current: float | None  #: drive current per module [A], or None when a target is given
    cold_face_target: float | None  #: target cold-face temperature [K], or None when a current is given
    cold_side_resistance: float  #: cold faces to the load, the whole stage [K/W] (0 = none given)
    hot_side_limit: float  #: rated maximum hot-face temperature [K]
    max_voltage: float | None = None  #: datasheet values, when given [V]
    max_temperature_difference: float | None = None  #: [K]
    rated_hot_side: float | None = None  #: [K]
    max_heat: float | None = None  #: datasheet Q_max at I_max and no temperature difference [W]
    #: one module's footprint (along the flow, across) [m] when the modules are placed, else None
    size: tuple[float, float] | None = None
    #: each module's centre (from the inlet edge, across from the centre line) [m]; empty when not placed
    positions: tuple[tuple[float, float], ...] = ()

    @property
    def placed(self) -> bool:
        """Whether each module has its own position on the plate (``size`` and ``positions``)."""
        return bool(self.positions)

    @property
    def described_as(self) -> str:
        if self.max_voltage is not None:
            return (f"datasheet I_max {self.max_current:g} A, V_max {self.max_voltage:g} V, dT_max "
                    f"{self.max_temperature_difference:g} K at {self.rated_hot_side - 273.15:g} degC (Luo 2008)")
        return f"S {self.S:.4g} V/K, R {self.R:.4g} ohm, K {self.K:.4g} W/K"


def read_module(data) -> Module:
    """The ``[module]`` table as a :class:`Module`."""
    t = Table(data, "module", _KEYS)
    direct = any(t.has(k) for k in _DIRECT_KEYS)
    if direct and any(t.has(k) for k in _DATASHEET_KEYS):
        raise DesignError("[module]", "give either the datasheet maxima (max_voltage, max_temperature_difference, "
                                      "rated_hot_side) or seebeck, resistance and conductance, not both")
    I_max = t.value("max_current", "current")
    extra = {}
    if direct:
        S = t.value("seebeck", "seebeck")
        R = t.value("resistance", "electrical_resistance")
        K = t.value("conductance", "thermal_conductance")
    else:
        V_max = t.value("max_voltage", "voltage")
        T_rated = t.value("rated_hot_side", "temperature")
        dT_max = _difference(t, "max_temperature_difference")
        if dT_max >= T_rated:
            raise DesignError(t.field("max_temperature_difference"),
                              f"{dT_max:g} K is not below the rated hot-side temperature "
                              f"({T_rated:g} K): the cold side would be at or below absolute zero")
        S, R, K = te.luo_parameters(I_max, V_max, dT_max, T_rated)
        q_max = t.value("max_heat", "power", required=False)
        extra = dict(max_voltage=V_max, max_temperature_difference=dT_max, rated_hot_side=T_rated, max_heat=q_max)

    _physical(t, direct, S, R, K, extra.get("rated_hot_side"))
    count = t.integer("count", 1, 500) if t.has("count") else 1
    wiring = t.choice("wiring", WIRINGS, default="series")
    strings = _strings(t, wiring, count)
    Q_c = t.value("cold_load", "power")
    which = t.exactly_one("current", "cold_face_temperature")
    current = target = None
    if which == "current":
        current = t.value("current", "current")
        if current > I_max:
            raise DesignError(t.field("current"), f"{current:g} A is above the module's max_current {I_max:g} A")
        if current == 0 and Q_c == 0:
            raise DesignError(t.field("current"), "with no cold-side load and no current there is nothing to solve")
    else:
        target = t.value("cold_face_temperature", "temperature")
    R_cold = t.value("cold_side_resistance", "thermal_resistance", required=False, default=0.0)
    limit = t.value("hot_side_limit", "temperature", required=False, default=DEFAULT_HOT_SIDE_LIMIT)
    size, positions = _placement(t, count)
    t.finish()
    return Module(S, R, K, I_max, count, wiring, strings, Q_c, current, target, R_cold, limit, **extra,
                  size=size, positions=positions)


def _placement(t: Table, count: int):
    """``size`` and ``positions`` (both or neither): one module's footprint and each module's centre [m].

    Whether they fit the plate and keep apart is checked with the plate (coldplate.plate.sources.place_modules).
    """
    if t.has("size") != t.has("positions"):
        missing = "positions" if t.has("size") else "size"
        raise DesignError(t.field(missing), "is missing: placed modules need both size (one module's footprint) "
                                            "and positions (each module's centre)")
    if not t.has("size"):
        return None, ()
    from coldplate.plate.sources import read_pair

    a, b, size_raw = read_pair(t.raw("size"), t.field("size"))
    for v, what, r in ((a, "along the flow", size_raw[0]), (b, "across", size_raw[1])):  # as a source's size
        check_range(t.field("size") + f" ({what})", r, v, "length", RANGES["[heat] footprint"])
    if a <= 0 or b <= 0:
        raise DesignError(t.field("size"), "both lengths must be above zero")
    raw = t.raw("positions")
    if not isinstance(raw, list) or not raw:
        raise DesignError(t.field("positions"), "must be an array of module centres, each [along, across], "
                                                "e.g. [[\"20 mm\", \"0 mm\"], [\"50 mm\", \"0 mm\"]]")
    if len(raw) != count:
        raise DesignError(t.field("positions"), f"gives {len(raw)} position(s) for count = {count} modules: give "
                                                "one centre per module")
    positions = tuple(read_pair(p, f"{t.field('positions')} (module {i})")[:2] for i, p in enumerate(raw, 1))
    return (a, b), positions


def _physical(t: Table, direct: bool, S: float, R: float, K: float, T_rated: float | None) -> None:
    """Refuse datasheet values that give no physical module: less than one thermocouple, or a figure of merit
    no thermoelectric material reaches."""
    if S < MIN_SEEBECK:
        key = "seebeck" if direct else "max_voltage"
        raise DesignError(t.field(key), f"gives a Seebeck coefficient of {S:.3g} V/K, less than one thermocouple "
                                        f"(about {MIN_SEEBECK:g} V/K): check the value and its unit")
    T = T_rated if T_rated is not None else 300.0
    ZT = S * S / (R * K) * T
    if ZT > ZT_MAX:
        key = "resistance" if direct else "max_temperature_difference"
        raise DesignError(t.field(key), f"gives a figure of merit Z T = {ZT:.3g} at {T - 273.15:.0f} degC, above "
                                        f"{ZT_MAX:g}, which no thermoelectric material reaches (about 1 is usual): "
                                        "check the datasheet values")


def _difference(t: Table, key: str) -> float:
    """A temperature difference: kelvin or delta_degC; degC/degF would be read as absolute temperatures."""
    raw = t.raw(key)
    if isinstance(raw, str) and re.search(r"(?<!delta_)(deg[CF]|celsius|fahrenheit)", raw):
        raise DesignError(t.field(key), f"{quoted(raw)} is a temperature, not a difference: write it in K or "
                                        "delta_degC")
    v = t.value(key, "temperature_difference")
    return v


def _strings(t: Table, wiring: str, count: int) -> int:
    if wiring == "series-parallel":
        strings = t.integer("strings", 2, 500)
        if strings >= count or count % strings:
            raise DesignError(t.field("strings"), f"{count} modules cannot form {strings} equal strings of two or "
                                                  "more modules in series")
        return strings
    if t.has("strings"):
        raise DesignError(t.field("strings"), f"only for wiring = \"series-parallel\" (wiring is {wiring!r})")
    return 1 if wiring == "series" else count
