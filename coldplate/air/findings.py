"""Findings for the air-cooled alternative (read ``Result.air``; nothing when it is None).

Run by :mod:`coldplate.check` after the other concepts' rules.  Wording that touches electrical safety ends with
:data:`coldplate.findings.base.DEFER`.
"""
from __future__ import annotations

from coldplate.findings.base import DEFER, Finding, amount, degc

#: A surface people may touch above this is a burn risk on brief contact [K]: 60 degC (common practice; the
#: usual touch limit for metal parts in electrical-equipment safety standards, from memory).
TOUCH_LIMIT = 333.15
#: Air leaving the sink above this is worth a word: 50 degC (common practice).
HOT_EXHAUST = 323.15


def _cold_faces(r) -> str:
    a = r.air
    if a.module is None or r.module is None:
        return ""
    return (f"; the modules' cold face is {degc(a.module.T_cold)} on it against {degc(r.module.T_cold)} on the "
            f"water plate")


def air_holds(r):
    """The air sink holds the face limit: the water could be saved."""
    a = r.air
    if a is None or not a.holds:
        return
    s = a.sink
    litres = a.water_m3_per_year * 1000.0
    saved = (f"the {amount(litres)} L of water a year this design runs to the drain could be saved"
             if litres > 0 else "this design's water returns to its loop, so air would save the loop and its "
                                "chiller rather than water")
    drive = {"fan": f"a fan giving {amount(s.fan_power)} W of air power", "velocity": "the given approach velocity",
             "natural": "natural convection"}[s.drive]
    yield Finding(
        "air-holds", "note",
        f"An air sink holds the face limit ({degc(a.face_limit)}, {a.face_limit_from}): {s.fins} fins "
        f"{amount(s.fin_thickness * 1e3)} mm thick and {amount(s.fin_height * 1e3)} mm high on a "
        f"{amount(s.base * 1e3)} mm base, {amount(s.mass * 1e3)} g, with {drive}, keeps the hottest face at "
        f"{degc(s.T_face_max)} ({amount(a.margin)} K to spare){_cold_faces(r)}; {saved}.",
        "Weigh the air sink against the water design (the comparison table); a fan and its wiring near the "
        "device need the usual electrical care. " + DEFER)


def air_short(r):
    """The air sink does not hold the face limit: by how much."""
    a = r.air
    if a is None or a.holds:
        return
    s = a.sink
    if a.module_refused:
        msg = (f"On the best air sink in the envelope ({s.fins} fins, {amount(s.fin_height * 1e3)} mm high) the "
               f"thermoelectric modules have no steady state: {a.module_refused}")
    else:
        msg = (f"No air sink in the envelope holds the face limit ({degc(a.face_limit)}, {a.face_limit_from}): "
               f"the best of {a.candidates:,} layouts ({s.fins} fins {amount(s.fin_thickness * 1e3)} mm thick and "
               f"{amount(s.fin_height * 1e3)} mm high) reaches {degc(s.T_face_max)}, {amount(-a.margin)} K over "
               f"it; the water design holds the face at {degc(a.water_face)}{_cold_faces(r)}.")
    yield Finding("air-short", "note", msg,
                  "Keep the water design, or give the air sink more room (a larger envelope), a stronger fan or "
                  "a better interface.")


def air_ranges(r):
    """The chosen air sink lies outside a correlation's range."""
    a = r.air
    if a is None:
        return
    for text in a.outside:
        yield Finding("air-correlation-range", "caution",
                      f"The air sink's estimate uses a correlation outside its published range: {text}.",
                      "Treat the air sink's numbers as rough; test the sink before relying on it.")


def air_hot_surface(r):
    """The air sink's base or its exhaust is hot enough to burn on contact."""
    a = r.air
    if a is None:
        return
    s = a.sink
    if s.T_face_max > TOUCH_LIMIT:
        yield Finding("air-hot-sink", "caution",
                      f"The air sink's base runs up to {degc(s.T_face_max)}, above the {degc(TOUCH_LIMIT)} usual "
                      "touch limit for metal parts.",
                      "Guard the sink from touch and label it. " + DEFER)
    if s.T_air_out is not None and s.T_air_out > HOT_EXHAUST:
        yield Finding("air-hot-exhaust", "note",
                      f"Air leaves the sink at {degc(s.T_air_out)}.",
                      "Point the exhaust away from people, cables and other instruments.")


RULES = (air_holds, air_short, air_ranges, air_hot_surface)
