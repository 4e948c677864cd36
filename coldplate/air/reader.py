"""Read the design file's ``[air]`` table: the air-cooled alternative beside the water design.

The envelope the finned sink may fill (``length`` along the air, ``width`` across it, ``height`` from the
mounting face to the fin tips), its ``base`` thickness and ``material``, the air (``temperature``, defaulting to
the room's; ``altitude`` or ``pressure``), how the air moves (``drive``: ``"fan"`` with ``fan_flow`` and
``fan_pressure`` points, ``"velocity"`` with an approach ``velocity``, or ``"natural"`` with the fins vertical),
the shop limits (``min_fin``, ``min_gap``; else the ``[search]`` table's ``min_wall`` and ``min_width``) and the
face limit.  ``sink = "none"`` asks about a thermoelectric module with no sink at all (refused in the solve,
with the runaway explained).  Every problem is a one-line :class:`DesignError` naming ``[air] key``.
"""
from __future__ import annotations

from dataclasses import dataclass

from hydraulics.pump import PumpError, check_table

from coldplate.design.errors import DesignError
from coldplate.design.fields import Table
from coldplate.design.units import parse_value
from coldplate.findings.base import device_limit
from coldplate.plate import materials

DRIVES = ("fan", "velocity", "natural")
SINKS = ("finned", "none")
#: Base of the sink when the file gives none [m]: 5 mm, a usual extruded or machined aluminium base
#: (common practice).
DEFAULT_BASE = 5.0e-3
#: Default material: the usual extrusion alloy (common practice).
DEFAULT_MATERIAL = "aluminium-6063"
#: Shop limits when neither [air] nor [search] gives them: the thinnest fin and the narrowest gap between fins
#: a bench shop saws or an extruder holds on a small sink, 1 mm and 2 mm (common practice).
DEFAULT_MIN_FIN = 1.0e-3
DEFAULT_MIN_GAP = 2.0e-3
#: Sea-level standard pressure [Pa] (ISO 2533:1975, ICAO Doc 7488).
P_SEA_LEVEL = 101325.0

_KEYS = ("length", "width", "height", "base", "material", "temperature", "altitude", "pressure", "drive",
         "fan_flow", "fan_pressure", "velocity", "min_fin", "min_gap", "face_limit", "sink")


@dataclass(frozen=True)
class Air:
    """The ``[air]`` table in SI units (kelvin)."""

    length: float  #: envelope along the air flow (the vertical for natural convection) [m]
    width: float  #: envelope across the fins [m]
    height: float  #: envelope from the mounting face to the fin tips [m]
    base: float  #: base thickness [m]
    material: str  #: key in coldplate.plate.materials
    conductivity: float  #: [W/(m K)]
    temperature: float  #: air at the sink's entry [K]
    pressure: float  #: absolute [Pa]
    altitude: float | None  #: [m] when given
    drive: str  #: "fan", "velocity" or "natural"
    fan_flow: tuple[float, ...] = ()  #: [m^3/s]
    fan_pressure: tuple[float, ...] = ()  #: [Pa]
    velocity: float | None = None  #: approach velocity [m/s]
    min_fin: float = DEFAULT_MIN_FIN  #: thinnest fin [m]
    min_gap: float = DEFAULT_MIN_GAP  #: narrowest gap between fins [m]
    shop_limits_from: str = "defaults"  #: "[air]", "[search]" or "defaults"
    face_limit: float = 0.0  #: hottest mounting face the air sink must hold [K]
    face_limit_from: str = ""
    sink: str = "finned"


def pressure_at_altitude(z: float) -> float:
    """Pressure [Pa] of the ISO 2533 / ICAO standard atmosphere at altitude z [m] above sea level in the
    troposphere: the geopotential altitude H = r0 z / (r0 + z), r0 = 6 356 766 m, then
    p = p0 (1 - L H / T0)^(g0 M / (R L)), T0 = 288.15 K, L = 0.0065 K/m, exponent 5.25588 (ISO 2533:1975;
    ICAO Doc 7488/3)."""
    H = 6356766.0 * z / (6356766.0 + z)
    return P_SEA_LEVEL * (1.0 - 0.0065 * H / 288.15) ** 5.25588


def _shop(t: Table, search: dict | None) -> tuple[float, float, str]:
    if t.has("min_fin") or t.has("min_gap"):
        return (t.value("min_fin", "length", default=DEFAULT_MIN_FIN),
                t.value("min_gap", "length", default=DEFAULT_MIN_GAP), "[air]")
    if isinstance(search, dict) and ("min_wall" in search or "min_width" in search):
        s = Table(search, "search")  # the water sizing's shop limits: thinnest wall, narrowest channel
        return (s.value("min_wall", "length", default=DEFAULT_MIN_FIN),
                s.value("min_width", "length", default=DEFAULT_MIN_GAP), "[search]")
    return DEFAULT_MIN_FIN, DEFAULT_MIN_GAP, "defaults"


def read_air(data, design) -> Air:
    """The ``[air]`` table as an :class:`Air`; ``design`` is the water design read so far (room, heat, module)."""
    t = Table(data.get("air"), "air", _KEYS)
    sink = t.choice("sink", SINKS, default="finned")
    L = t.value("length", "length")
    W = t.value("width", "length")
    fp_l, fp_w = design.heat.footprint_length, design.heat.footprint_width
    if fp_l > L * (1 + 1e-9):
        raise DesignError(t.field("length"), f"is shorter than the heat footprint ({fp_l * 1e3:.4g} mm): the sink's "
                                             "base must cover the footprint")
    if fp_w > W * (1 + 1e-9):
        raise DesignError(t.field("width"), f"is narrower than the heat footprint ({fp_w * 1e3:.4g} mm): the sink's "
                                            "base must cover the footprint")
    H = t.value("height", "length")
    base = t.value("base", "length", default=DEFAULT_BASE)
    if base >= H:
        raise DesignError(t.field("base"), f"leaves no room for fins: the envelope is {H * 1e3:.4g} mm high")
    key = t.word("material") if t.has("material") else DEFAULT_MATERIAL
    try:
        k = materials.material(key).conductivity
    except (KeyError, ValueError) as exc:
        raise DesignError(t.field("material"), str(exc).strip("'\"")) from None
    T = t.value("temperature", "temperature", default=design.room.temperature)
    altitude = None
    if t.has("altitude") and t.has("pressure"):
        raise DesignError("[air]", "give either altitude or pressure, not both")
    if t.has("altitude"):
        altitude = t.value("altitude", "length")
        p = pressure_at_altitude(altitude)
    else:
        p = t.value("pressure", "pressure", default=P_SEA_LEVEL)
    drive = t.choice("drive", DRIVES, default="natural" if sink == "none" else None)
    extra: dict = {}
    if drive == "fan":
        flows, rises = t.raw("fan_flow"), t.raw("fan_pressure")
        for name, v in (("fan_flow", flows), ("fan_pressure", rises)):
            if not isinstance(v, list) or not v:
                raise DesignError(t.field(name), "must be a list of values, e.g. [\"0 m**3/h\", \"20 m**3/h\", "
                                                 "\"40 m**3/h\"]")
        if len(flows) != len(rises):
            raise DesignError(t.field("fan_pressure"), f"has {len(rises)} points, fan_flow has {len(flows)}")
        V = [parse_value(v, "flow", t.field("fan_flow")) for v in flows]
        P = [parse_value(v, "pressure", t.field("fan_pressure")) for v in rises]
        try:
            table = check_table(V, P)
        except PumpError as exc:
            raise DesignError(t.field("fan_pressure"), str(exc).replace("pump", "fan")) from None
        extra = {"fan_flow": table.V_dot, "fan_pressure": table.dp}
    elif drive == "velocity":
        extra = {"velocity": t.value("velocity", "velocity")}
    min_fin, min_gap, shop_from = _shop(t, data.get("search"))
    limit = t.value("face_limit", "temperature", required=False)
    if limit is not None:
        limit_from = "[air] face_limit"
    else:
        limit, limit_from = device_limit(design)
    if limit <= T:
        raise DesignError(t.field("face_limit") if t.has("face_limit") else t.field("temperature"),
                          "the face limit is not above the air temperature: no air sink can hold it")
    t.finish()
    return Air(length=L, width=W, height=H, base=base, material=key, conductivity=k, temperature=T, pressure=p,
               altitude=altitude, drive=drive, min_fin=min_fin, min_gap=min_gap, shop_limits_from=shop_from,
               face_limit=limit, face_limit_from=limit_from, sink=sink, **extra)
