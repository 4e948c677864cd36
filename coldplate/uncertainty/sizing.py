"""Sizing under uncertainty: ``[search] face_limit_confidence = "95 %"`` holds the face limit at that percentile.

The search itself holds limits at the nominal (coldplate/sizing/).  Here it is run, the recommendation's band
is taken (the ``[uncertainty]`` spreads about the recommended design, with the correlations' scatter unless
the table leaves it out), and while the band's percentile at the confidence lies above the limit the search
runs again with the face limit lowered by the excess (plus :data:`STEP_K`), at most :data:`ROUNDS` times.  The
recommendation so carries its margin on purpose; the notes say by how much, and its check carries the band.
"""
from __future__ import annotations

from dataclasses import replace

from coldplate.sizing.recommend import read_file
from coldplate.sizing.recommend import size as size_nominal
from coldplate.uncertainty.propagate import propagate
from coldplate.uncertainty.reader import read_uncertainty
from coldplate.uncertainty.run import attach

#: Searches at most, and the extra lowering of the limit per round [K] (so the loop does not creep).
ROUNDS = 5
STEP_K = 0.05


def size(data: dict, design, spec, progress=None, do_refine: bool = True):
    """``coldplate size``: the nominal search, or with ``face_limit_confidence`` the search held at a percentile."""
    c = spec.limits.face_confidence
    if c is None:
        return size_nominal(data, design, spec, progress, do_refine)
    band_spec = read_uncertainty(data, design, 2.0 * c - 1.0)  # the central band whose upper end is the c point
    limit = target = spec.limits.face
    res, band = None, None
    for _ in range(ROUNDS):
        res = size_nominal(data, design, replace(spec, limits=replace(spec.limits, face=target)), progress,
                           do_refine)
        if res.check is None:
            break
        band = propagate(res.check.design, res.check, band_spec, data)
        high = band.band("face").high
        if high <= limit:
            break
        target -= high - limit + STEP_K
        if target <= design.inlet_temperature:
            break
    note = _note(c, limit, target, band)
    if res.check is None or band is None:
        return replace(res, notes=(*res.notes, note))
    return replace(res, check=attach(res.check, band), notes=(*res.notes, note))


def _note(c: float, limit: float, target: float, band) -> str:
    head = f"face limit held at the {c * 100:g} % point of the band: "
    if band is None:
        return head + f"nothing meets the limit lowered to {target - 273.15:.2f} degC"
    high = band.band("face").high
    met = "meets" if high <= limit else "still misses"
    return (head + f"searched with the limit lowered by {limit - target:.2f} K to {target - 273.15:.2f} degC; the "
            f"recommendation's {c * 100:g} % face is {high - 273.15:.2f} degC, which {met} {limit - 273.15:.2f} degC "
            f"({band.samples} samples, {band.method})")


def size_file(path, progress=None, do_refine: bool = True):
    """The Python API of ``coldplate size`` (``coldplate.size_file``)."""
    data, design, spec = read_file(path)
    return size(data, design, spec, progress, do_refine)
