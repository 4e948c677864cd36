"""Material, roughness, bond and pressure-rating tables for cold plates.

Every entry carries its value in SI, where it comes from and a note.  Labels in
``source``: a named publication or standard; "common practice" for a fact of
the trade with no single source; "from memory" where the value was recalled
and not looked up again.  Look-ups are exact on the key or a listed alias,
never fuzzy: an unknown key raises KeyError naming the known keys.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Material:
    """A plate, tube or die material."""

    key: str
    name: str
    conductivity: float  # [W/(m K)] near 20-25 °C
    anodic_index: float | None  # [V] relative to gold; None where the table has no entry
    family: str
    source: str
    note: str


@dataclass(frozen=True)
class Entry:
    """A tabulated value [SI] with its usual range, source and note."""

    key: str
    value: float
    low: float
    high: float
    unit: str
    source: str
    note: str


_ASM = "ASM Handbook Vol. 2, Properties and Selection: Nonferrous Alloys (1990)"
_INCROPERA = ("Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, "
              "6th ed. (2007), Table A.1 (300 K)")
_ANODIC = ("anodic index table of MIL-DTL-14072 (Table VI), the usual 'MIL-STD-889 style' "
           "galvanic compatibility table; common practice")

MATERIALS: dict[str, Material] = {m.key: m for m in (
    Material("copper", "Copper C11000 (ETP) / C10100 (OFE)", 388.0, 0.35, "copper alloy",
             f"{_ASM}: C11000 388 W/(m K) at 20 °C; from memory",
             "C10100 is 391 W/(m K); pure copper 401 at 300 K (Incropera Table A.1)"),
    Material("aluminium-6061", "Aluminium 6061-T6", 167.0, 0.90, "aluminium alloy",
             f"{_ASM}: 6061-T6 167 W/(m K) at 25 °C; from memory",
             "6061-O is about 180 W/(m K); anodic index: wrought alloys other than 2000 series"),
    Material("aluminium-6063", "Aluminium 6063-T6 (T5 similar)", 200.0, 0.90, "aluminium alloy",
             "Aluminum Association typical values as reproduced in mill data sheets: "
             "6063-T6 200, T5 209, O 218 W/(m K) at 20 °C",
             "the usual extrusion alloy; T5 is about 4 % higher than the value used"),
    Material("aluminium-1100", "Aluminium 1100 (commercially pure)", 222.0, 0.90,
             "aluminium alloy", f"{_ASM}: 1100-O 222 W/(m K) at 20 °C; from memory",
             "work-hardened H18 is about 218 W/(m K)"),
    Material("brass", "Free-cutting brass C36000", 115.0, 0.45, "copper alloy",
             f"{_ASM}: C36000 115 W/(m K) at 20 °C; from memory",
             "about 61.5 Cu / 35.4 Zn / 3 Pb: a high brass in the anodic index table"),
    Material("stainless-304", "Stainless steel 304", 14.9, 0.50, "stainless steel",
             f"{_INCROPERA}: AISI 304 14.9 W/(m K); from memory",
             "about 16.2 W/(m K) at 100 °C; anodic index of 18 % chromium steels"),
    Material("stainless-316", "Stainless steel 316", 13.4, 0.50, "stainless steel",
             f"{_INCROPERA}: AISI 316 13.4 W/(m K); from memory",
             "about 16.3 W/(m K) at 100 °C; anodic index of 18 % chromium steels"),
    Material("silicon", "Silicon, single crystal", 148.0, None, "silicon",
             f"{_INCROPERA}: silicon 148 W/(m K); from memory",
             "falls with temperature (about 120 W/(m K) at 350 K); a die, never wetted, "
             "so it has no anodic index entry"),
)}

# explicit aliases per key (exact strings only)
ALIASES: dict[str, tuple[str, ...]] = {
    "copper": ("cu", "copper-c11000", "copper-c10100"),
    "aluminium-6061": ("aluminum-6061", "al-6061", "6061-t6"),
    "aluminium-6063": ("aluminum-6063", "al-6063", "6063-t5", "6063-t6"),
    "aluminium-1100": ("aluminum-1100", "al-1100"),
    "brass": ("brass-c36000", "c36000"),
    "stainless-304": ("ss304", "aisi-304"),
    "stainless-316": ("ss316", "aisi-316"),
    "silicon": ("si",),
}

# largest anodic index difference [V] usually accepted between two metals in contact
ANODIC_INDEX_LIMITS: dict[str, float] = {
    "harsh": 0.15,  # outdoors, high humidity, salt
    "normal": 0.25,  # warehouses, uncontrolled indoor
    "controlled": 0.50,  # temperature and humidity controlled
}
ANODIC_INDEX_LIMITS_SOURCE = _ANODIC

_MOODY = "Moody (1944) chart values as tabulated in Çengel & Cimbala, Fluid Mechanics, Table 8-2; from memory"

ROUGHNESS: dict[str, Entry] = {e.key: e for e in (
    Entry("drawn-tubing", 1.5e-6, 1.5e-6, 2.0e-6, "m", _MOODY,
          "copper or brass tubing 0.0015 mm; stainless steel 0.002 mm"),
    Entry("commercial-steel", 4.5e-5, 4.5e-5, 4.6e-5, "m", _MOODY,
          "commercial or wrought steel 0.045-0.046 mm"),
    Entry("rubber-hose", 1.0e-5, 1.0e-5, 1.0e-5, "m", _MOODY, "'rubber, smoothed' 0.01 mm"),
    Entry("pvc-hose", 1.5e-6, 0.0, 7.0e-6, "m",
          "common practice: plastics are hydraulically smooth in Moody's chart (0 in the "
          "table above); 0.0015 mm is the usual design value for drawn plastic tubing",
          "a corrugated or reinforced hose is rougher; measure its pressure drop"),
    Entry("galvanized-steel", 1.5e-4, 1.5e-4, 1.5e-4, "m", _MOODY,
          "galvanized iron 0.15 mm: older building supply pipe ahead of the lab tap"),
    Entry("pex-tubing", 7.0e-6, 1.5e-6, 7.0e-6, "m",
          "common practice: cross-linked polyethylene tubing is usually taken as 0.007 mm in plumbing "
          "design tables; from memory",
          "hydraulically smooth at the flows of a cold plate; the fittings' reduced bores matter more"),
    Entry("machined-aluminium", 1.6e-6, 0.8e-6, 3.2e-6, "m",
          "common practice: milled surface Ra 0.8-3.2 µm (N6-N8), 1.6 µm typical",
          "Ra taken as the absolute roughness; the equivalent sand-grain roughness can be "
          "a few times Ra"),
    Entry("machined-metal", 1.6e-6, 0.8e-6, 3.2e-6, "m",
          "common practice: milled surface Ra 0.8-3.2 µm (N6-N8), 1.6 µm typical",
          "generic machined passage in any plate metal; Ra taken as the absolute roughness"),
    Entry("machined-copper", 1.6e-6, 0.8e-6, 3.2e-6, "m",
          "common practice: milled surface Ra 0.8-3.2 µm (N6-N8), 1.6 µm typical",
          "Ra taken as the absolute roughness; soft copper may tear and be rougher"),
)}

BONDS: dict[str, Entry] = {e.key: e for e in (
    Entry("solder", 5.0e-6, 1.0e-6, 2.0e-5, "m2K/W",
          "common practice: layer t/k with t = 0.05-0.1 mm of tin-based solder "
          "(k about 50 W/(m K)) gives 1-2e-6; voids and partial fill raise it",
          "upper end for a poorly wetted joint; well below the epoxy bond"),
    Entry("epoxy", 1.5e-4, 3.0e-5, 3.0e-4, "m2K/W",
          "common practice: layer t/k with t = 0.1-0.25 mm of filled, thermally "
          "conductive epoxy (k about 1-3 W/(m K))",
          "value for 0.15 mm at 1 W/(m K); a round tube in a groove has a thicker fillet "
          "at the sides"),
    Entry("press-fit", 2.75e-4, 1.0e-5, 5.0e-4, "m2K/W",
          "Incropera et al. (2007) Tables 3.1 and 3.2: metal contacts 1e-5 to 5e-4 "
          "depending on pressure; aluminium, 10 µm roughness, 1e5 Pa, air gap 2.75e-4; "
          "from memory",
          "no filler; high interference (swaged, expanded tube) approaches the low end"),
)}

PRESSURE_RATING: dict[str, Entry] = {e.key: e for e in (
    Entry("channels", 6.9e5, 3.4e5, 1.0e6, "Pa",
          "common practice (no standard): machined channels closed by a brazed or "
          "bolted-and-sealed lid are usually rated about 100 psi (690 kPa) gauge",
          "confirm by a proof test of the actual part; mains water can reach 552 kPa "
          "before a pressure-reducing valve is required"),
    Entry("tube", 1.0e6, 6.9e5, 1.7e6, "Pa",
          "common practice (no standard): plates with an embedded copper or stainless "
          "tube are usually rated about 150 psi (1 MPa) gauge",
          "the tube itself holds far more; fittings and hose usually set the limit"),
    Entry("cavity", 3.4e5, 2.0e5, 6.9e5, "Pa",
          "common practice (no standard): a wide open cavity under a flat lid bends "
          "under pressure; about 50 psi (345 kPa) gauge is usual",
          "check lid deflection; consider a pressure-reducing valve on mains supply"),
)}


def _lookup(table: dict, key: str, what: str, aliases: dict | None = None):
    if key in table:
        return table[key]
    for canonical, names in (aliases or {}).items():
        if key in names:
            return table[canonical]
    known = sorted(table)
    if aliases:
        known += sorted(a for names in aliases.values() for a in names)
    raise KeyError(f"unknown {what} {key!r}; known: {', '.join(known)}")


def material(key: str) -> Material:
    """The :class:`Material` for ``key`` or one of its exact aliases (KeyError otherwise)."""
    return _lookup(MATERIALS, key, "material", ALIASES)


def roughness(key: str) -> float:
    """Absolute wall roughness [m] for ``key`` (exact; KeyError otherwise).

    The full entry, with range and source, is ``ROUGHNESS[key]``.
    """
    return _lookup(ROUGHNESS, key, "roughness", None).value


def bond(key: str) -> Entry:
    """Tube-to-plate bond resistance entry R'' [m² K/W] for ``key`` (exact; KeyError otherwise)."""
    return _lookup(BONDS, key, "bond", None)


def pressure_rating(kind: str) -> Entry:
    """Usual gauge pressure rating entry [Pa] for passage ``kind`` (exact; KeyError otherwise)."""
    return _lookup(PRESSURE_RATING, kind, "passage kind", None)


_INCROPERA_RHO_CP = ("Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, 6th ed. "
                     "(2007), Table A.1 (300 K): density times specific heat; from memory")

#: Volumetric heat capacity rho*c_p of the plate materials [J/(m^3 K)], for how fast a plate warms without water.
HEAT_CAPACITY: dict[str, Entry] = {e.key: e for e in (
    Entry("copper", 8933.0 * 385.0, 3.4e6, 3.5e6, "J/(m3 K)", _INCROPERA_RHO_CP, "pure copper 8933 kg/m3, 385 J/(kg K)"),
    Entry("aluminium-6061", 2700.0 * 896.0, 2.4e6, 2.45e6, "J/(m3 K)",
          "ASM Handbook Vol. 2: 6061 2700 kg/m3, 896 J/(kg K); from memory", "pure aluminium 2702 x 903"),
    Entry("aluminium-6063", 2700.0 * 900.0, 2.4e6, 2.45e6, "J/(m3 K)",
          "ASM Handbook Vol. 2: 6063 2700 kg/m3, about 900 J/(kg K); from memory", ""),
    Entry("aluminium-1100", 2710.0 * 904.0, 2.4e6, 2.45e6, "J/(m3 K)",
          "ASM Handbook Vol. 2: 1100 2710 kg/m3, 904 J/(kg K); from memory", ""),
    Entry("brass", 8500.0 * 380.0, 3.2e6, 3.3e6, "J/(m3 K)", _INCROPERA_RHO_CP,
          "cartridge brass 8530 kg/m3, 380 J/(kg K); free-cutting brass is close"),
    Entry("stainless-304", 7900.0 * 477.0, 3.7e6, 3.8e6, "J/(m3 K)", _INCROPERA_RHO_CP, "AISI 304 7900 kg/m3, 477 J/(kg K)"),
    Entry("stainless-316", 8238.0 * 468.0, 3.8e6, 3.9e6, "J/(m3 K)", _INCROPERA_RHO_CP, "AISI 316 8238 kg/m3, 468 J/(kg K)"),
    Entry("silicon", 2330.0 * 712.0, 1.6e6, 1.7e6, "J/(m3 K)", _INCROPERA_RHO_CP, "silicon 2330 kg/m3, 712 J/(kg K)"),
)}


def heat_capacity(key: str | None) -> float:
    """Volumetric heat capacity [J/(m^3 K)] of material ``key`` (exact, or an exact alias).

    ``None`` (a plate given by its conductivity only) takes the least value of the metals in the table, so a
    plate of unknown metal is taken to warm as fast as any listed one would.
    """
    if key is None:
        return min(e.value for k, e in HEAT_CAPACITY.items() if k != "silicon")
    return HEAT_CAPACITY[material(key).key].value


def plate_rating(stated: float | None, kind: str) -> tuple[float, str]:
    """The plate's gauge pressure rating [Pa]: the stated one, else the usual one for passage ``kind``; and how
    it is known, in words for the findings."""
    if stated:
        return stated, "its stated rating"
    return pressure_rating(kind).value, f"the usual rating of a {kind} plate (common practice)"
