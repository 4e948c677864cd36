"""Each correlation's published scatter band, as data, keyed by the method name of its validity record.

A band ``b`` says the correlation's values lie within ±b of the data it was fitted to (for most of them); the
uncertainty sampler multiplies the Nusselt number (or the friction factor) by a factor drawn uniformly over
[1 − b, 1 + b].  Uniform over the band, not normal with the band as two standard deviations: the uniform
gives the wider 5 %–95 % band, so the band errs toward a hotter face and a higher pressure.

Every key must be the ``method`` of a :class:`hydraulics.validity.Validity` record in the code
(``tests/test_uncertainty.py`` checks it), so the band stands beside the record's range.  Labels: "from
memory" where the band is recalled, not looked up; "common practice" where it is a fact of the trade.
"""
from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Scatter:
    """One correlation's scatter: ``quantity`` "Nu" or "f", ``band`` relative half-width [-], the source."""

    method: str
    quantity: str
    band: float
    source: str


#: Every band, in no particular order; look-ups go through :data:`SCATTER`.
BANDS = (
    # heat transfer ("convection" in Result.methods)
    Scatter("Gnielinski", "Nu", 0.20, "Gnielinski (1976), Int. Chem. Eng. 16, 359; VDI Heat Atlas G1: most data "
                                      "within about ±10 to ±20 % (the wider end kept: a hotter face; from memory)"),
    Scatter("Dittus-Boelter", "Nu", 0.25, "±25 % about the data (common practice, from memory)"),
    Scatter("Hausen", "Nu", 0.20, "Hausen (1943) laminar developing flow: about ±20 % (from memory)"),
    Scatter("Sieder-Tate", "Nu", 0.25, "Sieder & Tate (1936): about ±25 % (common practice, from memory)"),
    Scatter("Muzychka & Yovanovich", "Nu", 0.10, "Muzychka & Yovanovich (2004), J. Heat Transfer 126, 54: the "
                                                 "combined-entry model within about ±10 % of the data (from memory)"),
    Scatter("Muzychka & Yovanovich (local)", "Nu", 0.10, "as the combined-entry model, Muzychka & Yovanovich (2004) "
                                                         "(from memory)"),
    Scatter("Shah & London (fully developed)", "Nu", 0.10, "an exact laminar solution; the band is that of real "
                                                           "channels against ideal walls (common practice)"),
    Scatter("Fully developed circular tube", "Nu", 0.10, "an exact laminar solution; real-tube band (common practice)"),
    Scatter("Finite-difference H1 table (computed)", "Nu", 0.10, "a computed table; real-channel band (common "
                                                                 "practice)"),
    # friction ("friction" in Result.methods)
    Scatter("Muzychka & Yovanovich", "f", 0.10, "Muzychka & Yovanovich (2009), J. Fluids Eng. 131, 111105: apparent "
                                                "friction within about ±10 % (from memory)"),
    Scatter("Shah", "f", 0.05, "Shah (1978) apparent friction in developing flow: within a few per cent; ±5 % kept "
                               "(from memory)"),
    Scatter("Shah & London", "f", 0.05, "exact laminar f·Re; the band is that of real channels (common practice)"),
    Scatter("Petukhov", "f", 0.05, "Petukhov (1970) smooth-tube friction: within about ±5 % (from memory)"),
    Scatter("Colebrook", "f", 0.15, "Colebrook (1939) / Moody (1944): about ±5 % smooth to ±15 % rough; ±15 % kept "
                                    "(common practice, from memory)"),
)
#: (method, quantity) -> Scatter.
SCATTER = {(s.method, s.quantity): s for s in BANDS}
#: Nusselt band in the transition range (the check's blend between the laminar and turbulent forms): the data
#: scatter far more there than either form claims (common practice, from memory).
TRANSITION_NU = Scatter("transition blend", "Nu", 0.30, "the transition range 2300 < Re < 10^4 scatters widely; "
                                                       "±30 % (common practice, from memory)")
#: Roles of Result.methods that carry each quantity.
ROLES = {"Nu": "convection", "f": "friction"}


def band_of(methods, regime: str, quantity: str) -> Scatter | None:
    """The widest band of the methods a check used for ``quantity`` ("Nu" or "f"); the transition band for the
    Nusselt number in transitional flow.  ``methods``: ``Result.methods``.  None when no method has a band."""
    found = [SCATTER[(m.method, quantity)] for m in methods
             if m.role == ROLES[quantity] and (m.method, quantity) in SCATTER]
    if quantity == "Nu" and regime == "transitional":
        found.append(TRANSITION_NU)
    return max(found, key=lambda s: s.band, default=None)
