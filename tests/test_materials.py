"""Checks of coldplate.materials: provenance, sane values, exact look-ups.

Independent reference: ht.insulation.building_materials (DIN EN 12524 design
values for building metals), read by exact key only; the code under test does
not use it.
"""
import pytest
import ht.insulation

from coldplate.plate import materials as mt

REQUIRED = ("copper", "aluminium-6061", "aluminium-6063", "aluminium-1100", "brass",
            "stainless-304", "stainless-316", "silicon")
LABELS = ("from memory", "common practice", "Table", "typical", "Handbook", "Incropera")


def _all_entries():
    yield from mt.MATERIALS.values()
    yield from mt.ROUGHNESS.values()
    yield from mt.BONDS.values()
    yield from mt.PRESSURE_RATING.values()


def test_required_keys_present():
    # source: the project's brief (list of materials, roughness, bonds, passage kinds)
    assert set(REQUIRED) <= set(mt.MATERIALS)
    assert set(mt.ROUGHNESS) >= {"drawn-tubing", "machined-aluminium", "machined-copper",
                                 "pvc-hose", "rubber-hose", "commercial-steel",
                                 "machined-metal"}
    assert set(mt.BONDS) >= {"solder", "epoxy", "press-fit"}
    assert set(mt.PRESSURE_RATING) >= {"channels", "tube", "cavity"}


def test_every_entry_has_source_and_note():
    # source: project rule, every value says where it comes from (or is labelled)
    for e in _all_entries():
        assert e.source.strip() and e.note.strip(), e.key
        assert any(label.lower() in e.source.lower() for label in LABELS), e.key


# building-material design values (DIN EN 12524 via ht), W/(m K), and the
# tolerated ratio ours/theirs: alloys and tempers differ from the generic entry
_HT = {
    "copper": ("Metals, copper", 0.95, 1.06),
    "brass": ("Metals, brass", 0.85, 1.15),
    "aluminium-6061": ("Metals, aluminium alloys", 0.9, 1.5),
    "aluminium-6063": ("Metals, aluminium alloys", 0.9, 1.5),
    "aluminium-1100": ("Metals, aluminium alloys", 0.9, 1.5),
    "stainless-304": ("Metals, stainless steel", 0.75, 1.1),
    "stainless-316": ("Metals, stainless steel", 0.75, 1.1),
}


@pytest.mark.parametrize("key", sorted(_HT))
def test_conductivity_against_design_values(key):
    # source: library, ht.insulation.building_materials (DIN EN 12524 design values)
    ht_key, lo, hi = _HT[key]
    k_ref = ht.insulation.building_materials[ht_key][1]
    assert lo <= mt.MATERIALS[key].conductivity / k_ref <= hi


def test_conductivity_sane_bands_and_order():
    # source: common practice (room-temperature bands of each family); pure metal
    # conducts best, the alloy less: copper > 1100 > 6063 > 6061 > brass > steels
    bands = {"copper alloy": (100, 402), "aluminium alloy": (150, 237),
             "stainless steel": (12, 20), "silicon": (120, 160)}
    for m in mt.MATERIALS.values():
        lo, hi = bands[m.family]
        assert lo <= m.conductivity <= hi, m.key
    k = {key: mt.MATERIALS[key].conductivity for key in REQUIRED}
    assert (k["copper"] > k["aluminium-1100"] > k["aluminium-6063"] > k["aluminium-6061"]
            > k["brass"] > k["stainless-304"] > k["stainless-316"])


def test_anodic_indices():
    # source: anodic index table (MIL-DTL-14072 Table VI; common practice): copper 0.35,
    # high brass 0.45, 18 % Cr steels 0.50, wrought aluminium (not 2000 series) 0.90
    assert mt.material("copper").anodic_index == 0.35
    assert mt.material("brass").anodic_index == 0.45
    assert mt.material("stainless-304").anodic_index == 0.50
    assert mt.material("aluminium-6061").anodic_index == 0.90
    # copper against aluminium exceeds even the controlled-environment limit
    diff = mt.material("aluminium-6063").anodic_index - mt.material("copper").anodic_index
    assert diff > mt.ANODIC_INDEX_LIMITS["controlled"]
    for m in mt.MATERIALS.values():
        assert m.anodic_index is None or 0.0 <= m.anodic_index <= 1.85


def test_roughness_values():
    # source: Moody chart as tabulated by Çengel & Cimbala, Table 8-2 (from memory):
    # drawn copper tubing 0.0015 mm, commercial steel 0.045 mm, smoothed rubber 0.01 mm
    assert mt.roughness("drawn-tubing") == pytest.approx(1.5e-6)
    assert mt.roughness("commercial-steel") == pytest.approx(4.5e-5)
    assert mt.roughness("rubber-hose") == pytest.approx(1.0e-5)
    for e in mt.ROUGHNESS.values():
        assert e.unit == "m" and 0.0 <= e.low <= e.value <= e.high < 1e-3


def test_bond_ordering_and_ranges():
    # source: layer estimate t/k (common practice): a 0.1-0.25 mm epoxy layer at
    # 1-3 W/(m K) spans t/k = 3.3e-5 .. 2.5e-4; solder is far lower; Incropera
    # et al. Table 3.2 (from memory): aluminium contact in air 2.75e-4
    epoxy = mt.bond("epoxy")
    assert epoxy.low <= 0.1e-3 / 3.0 and epoxy.high >= 0.25e-3 / 1.0
    assert mt.bond("solder").value < epoxy.value
    assert mt.bond("press-fit").value == pytest.approx(2.75e-4)
    for e in mt.BONDS.values():
        assert e.unit == "m2K/W" and 0.0 < e.low <= e.value <= e.high < 1e-3


def test_pressure_ratings():
    # source: common practice; anything on mains water should exceed the 552 kPa
    # static pressure above which a pressure-reducing valve is called for
    # (US model plumbing codes, VALIDATION.md) unless a valve is fitted
    assert mt.pressure_rating("channels").value > 5.52e5
    assert mt.pressure_rating("tube").value > 5.52e5
    for e in mt.PRESSURE_RATING.values():
        assert e.unit == "Pa" and 1e5 < e.low <= e.value <= e.high < 1e7


def test_lookups_are_exact():
    assert mt.material("copper") is mt.MATERIALS["copper"]
    assert mt.material("aluminum-6061") is mt.MATERIALS["aluminium-6061"]
    assert mt.material("cu") is mt.MATERIALS["copper"]
    for near_miss in ("Copper", "copper ", "aluminium6061", "aluminium-606", "stainless",
                      "ss-304", "6061", "alu"):
        with pytest.raises(KeyError) as info:
            mt.material(near_miss)
        assert "aluminium-6061" in str(info.value)  # lists the known keys
    for fn, bad in ((mt.roughness, "drawn tubing"), (mt.bond, "Solder"),
                    (mt.pressure_rating, "channel")):
        with pytest.raises(KeyError):
            fn(bad)


def test_aliases_point_to_existing_keys_and_do_not_collide():
    seen = set()
    for key, names in mt.ALIASES.items():
        assert key in mt.MATERIALS
        for name in names:
            assert name not in mt.MATERIALS and name not in seen
            seen.add(name)
