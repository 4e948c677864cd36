"""Turbulent and regime-blended Darcy friction factors.

:func:`darcy_friction` picks the laminar apparent friction (developing flow),
the turbulent friction, or - between Re = 2300 and 1e4 - the linear
interpolation of VDI Heat Atlas G1 between the laminar value AT 2300 and the
turbulent value AT 1e4, so the result is continuous in Re.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

from hydraulics.ducts import (
    RE_LAMINAR_END,
    RE_TURBULENT_START,
    _out,
    f_apparent_Muzychka_Yovanovich,
    f_apparent_Shah,
    transition_weight,
)
from hydraulics.validity import Bound, Validity, with_validity

PETUKHOV = Validity(
    method="Petukhov",
    reference=(
        "Petukhov, B.S. (1970) Heat transfer and friction in turbulent pipe flow with "
        "variable physical properties, Adv. Heat Transfer 6:503-564; smooth tubes"
    ),
    bounds=(Bound("Re", 3000.0, 5.0e6, "smooth tube, turbulent"),),
)


@with_validity(PETUKHOV)
def f_Petukhov(Re):
    """Darcy friction factor of a smooth tube in turbulent flow [-].

    f = (0.790 ln Re - 1.64)^-2, natural logarithm, Re [-] on the (hydraulic)
    diameter.
    """
    Re = np.asarray(Re, dtype=float)
    return _out((0.790 * np.log(Re) - 1.64) ** -2)


COLEBROOK = Validity(
    method="Colebrook",
    reference=(
        "Colebrook, C.F. (1939) Turbulent flow in pipes, with particular reference to the "
        "transition region between the smooth and rough pipe laws, J. Inst. Civ. Eng. "
        "11:133-156; solved with Clamond's algorithm (Clamond 2009, Ind. Eng. Chem. Res. 48:3665, "
        "exact to machine precision, no iteration loop, no scipy)"
    ),
    bounds=(
        Bound("Re", 4000.0, 1.0e8, "turbulent; common practice (Moody chart range)"),
        Bound("rel_roughness", 0.0, 0.05, "roughness/D_h; common practice (Moody chart range)"),
    ),
)

@with_validity(COLEBROOK)
def f_Colebrook(Re, rel_roughness):
    """Darcy friction factor from the Colebrook equation [-].

    1/sqrt(f) = -2 log10( (e/D)/3.7 + 2.51 / (Re sqrt(f)) ), with Re [-] and
    relative roughness e/D [-].  Solved with Clamond's (2009) method: two
    fixed steps of a third-order correction to the Lambert-W form, exact to
    machine precision (the same steps as ``fluids.friction.Clamond``, written
    with numpy so that a whole array of candidates is solved at once; the
    tests check it against ``fluids.friction.Clamond`` and ``Colebrook``).
    With X1 = (e/D) Re ln10/18.574, X2 = ln(Re ln10/5.02) = ln Re - ln(5.02/ln10),
    F0 = X2 - 0.2, two steps of::

        E  = (ln(X1 + F) + F - X2) / (1 + X1 + F)       (in the first step F - X2 = -0.2)
        F <- F - (1 + X1 + F + E/2) E (X1 + F) / (1 + X1 + F + E (1 + E/3))
        f  = (ln10 / 2)^2 / F^2
    """
    Re = np.asarray(Re, dtype=float)
    eD = np.asarray(rel_roughness, dtype=float)
    X1 = eD * Re * 0.1239681863354175460160858261654858382699
    X2 = np.log(Re) - 0.7793974884556819406441139701653776731705
    F = X2 - 0.2
    X1F = X1 + F
    X1F1 = 1.0 + X1F
    E = (np.log(X1F) - 0.2) / X1F1
    F = F - (X1F1 + 0.5 * E) * E * X1F / (X1F1 + E * (1.0 + E / 3.0))
    X1F = X1 + F
    X1F1 = 1.0 + X1F
    E = (np.log(X1F) + F - X2) / X1F1
    F = F - (X1F1 + 0.5 * E) * E * X1F / (X1F1 + E * (1.0 + E / 3.0))
    return _out(1.325474527619599502640416597148504422899 / (F * F))


KONAKOV = Validity(
    method="Konakov",
    reference=(
        "Konakov, P.K. (1946), smooth-tube friction in the form Gnielinski uses in the VDI Heat Atlas, "
        "2nd ed. (2010), chapter G1, and in Gnielinski (2013) On heat transfer in tubes, Int. J. Heat Mass "
        "Transfer 63:134-140 (form and range from memory)"
    ),
    bounds=(Bound("Re", 1.0e4, 1.0e6, "smooth tube, fully turbulent"),),
)


@with_validity(KONAKOV)
def f_Konakov(Re):
    """Darcy friction factor of a smooth tube, f = (1.8 log10 Re - 1.5)^-2 [-], Re [-] on the diameter.

    The friction factor inside Gnielinski's VDI Heat Atlas form of the turbulent Nusselt number.
    """
    Re = np.asarray(Re, dtype=float)
    return _out((1.8 * np.log10(Re) - 1.5) ** -2)


def f_turbulent_heat_transfer(Re, rel_roughness):
    """The Darcy friction factor Gnielinski's Nusselt number takes [-].

    Smooth walls (every rel_roughness == 0): :func:`f_Konakov`, the factor of Gnielinski's own form;
    rough walls: :func:`f_Colebrook` at e/D_h, as Gnielinski proposes for rough tubes (from memory).  Re and
    rel_roughness floats or numpy arrays.
    """
    if np.all(np.asarray(rel_roughness) == 0.0):
        return f_Konakov(Re)
    return f_Colebrook(Re, rel_roughness)


@dataclass(frozen=True)
class FrictionResult:
    """Darcy friction factor and how it was obtained.

    ``regime`` is "laminar", "transitional" or "turbulent" (an array of these
    strings when Re is an array); ``methods`` the Validity records of the
    correlations that contributed.
    """

    f: float | np.ndarray
    regime: str | np.ndarray
    methods: tuple[Validity, ...]


def _regime(Re):
    Re = np.asarray(Re, dtype=float)
    reg = np.where(
        Re <= RE_LAMINAR_END,
        "laminar",
        np.where(Re >= RE_TURBULENT_START, "turbulent", "transitional"),
    )
    return str(reg) if reg.ndim == 0 else reg


def _laminar_f(Re, L, D_h, alpha, shape):
    if shape == "circle":
        return f_apparent_Shah(Re, L, D_h), f_apparent_Shah.validity
    return f_apparent_Muzychka_Yovanovich(Re, L, D_h, alpha), f_apparent_Muzychka_Yovanovich.validity


def _turbulent_f(Re, rel_roughness):
    if np.all(np.asarray(rel_roughness) == 0.0):
        return f_Petukhov(Re), f_Petukhov.validity
    return f_Colebrook(Re, rel_roughness), f_Colebrook.validity


def darcy_friction(Re, L, D_h, alpha, shape, rel_roughness=0.0) -> FrictionResult:
    """Darcy friction factor over all regimes for a straight channel [-].

    Re [-] on D_h, channel length L [m], hydraulic diameter D_h [m], aspect
    ratio alpha [-] (ignored for shape "circle"), shape "rectangle" or
    "circle", relative roughness e/D_h [-].

    * Re <= 2300: laminar apparent friction over the length L (developing
      flow): Shah (circle) or Muzychka & Yovanovich (rectangle).
    * Re >= 1e4: Petukhov (smooth, rel_roughness == 0) or Colebrook.
    * in between: (1 - w) f_lam(2300) + w f_turb(1e4), w = transition_weight(Re)
      (VDI Heat Atlas G1 interpolation), continuous at both ends.

    Turbulent flow in the rectangle uses the hydraulic diameter (common practice).
    """
    if shape not in ("rectangle", "circle"):
        raise ValueError(f"shape must be 'rectangle' or 'circle', not {shape!r}")
    Re = np.asarray(Re, dtype=float)
    if np.any(Re <= 0):
        raise ValueError("Re must be positive")
    # each regime's correlation is evaluated only where some Re needs it (the same values otherwise)
    lam_here, v_lam = (_laminar_f(np.minimum(Re, RE_LAMINAR_END), L, D_h, alpha, shape)
                       if np.any(Re < RE_TURBULENT_START) else (0.0, None))
    turb_here, v_turb = (_turbulent_f(np.maximum(Re, RE_TURBULENT_START), rel_roughness)
                         if np.any(Re > RE_LAMINAR_END) else (0.0, None))
    if np.any((Re > RE_LAMINAR_END) & (Re < RE_TURBULENT_START)):  # the blend's two ends, only where it is used
        w = np.asarray(transition_weight(Re), dtype=float)
        lam_end, _ = _laminar_f(RE_LAMINAR_END, L, D_h, alpha, shape)
        turb_start, _ = _turbulent_f(RE_TURBULENT_START, rel_roughness)
        blend = (1.0 - w) * lam_end + w * turb_start
    else:
        blend = 0.0
    f = np.where(Re <= RE_LAMINAR_END, lam_here, np.where(Re >= RE_TURBULENT_START, turb_here, blend))
    used = []
    if np.any(Re < RE_TURBULENT_START):
        used.append(v_lam)
    if np.any(Re > RE_LAMINAR_END):
        used.append(v_turb)
    return FrictionResult(f=_out(f), regime=_regime(Re), methods=tuple(used))


class DuctFriction:
    """:func:`darcy_friction` of one duct whose geometry stays fixed while its Reynolds number changes (a header
    or a channel through the flow split's Newton steps): the same regimes, correlations and blend, with the
    parts that depend on the geometry alone (the Shah & London f Re, the sqrt(A) scale of Muzychka & Yovanovich,
    the transition blend's two ends) computed once, so a call costs a few array operations.

    ``DuctFriction(L, D_h, alpha, shape, rel_roughness)(Re)`` equals
    ``darcy_friction(Re, L, D_h, alpha, shape, rel_roughness).f`` to round-off (tests/test_friction_fixed.py);
    build it through :func:`duct_friction`, which keeps one per geometry.  The geometry may also be arrays (many
    candidate ducts, Re of the same shape: the air sink search).  Positive Re only; no records: the
    caller takes the Validity records from one :func:`darcy_friction` call at its answer.  Laminar rectangle,
    with r = sqrt(A)/D_h and L+ = L / (D_h r^2 Re) as in :func:`f_apparent_Muzychka_Yovanovich`::

        f = (4 / (r Re)) sqrt(3.44^2 D_h r^2 Re / L + (r fRe_fd / 4)^2)        [-]
    """

    def __init__(self, L, D_h, alpha, shape, rel_roughness=0.0):
        if shape not in ("rectangle", "circle"):
            raise ValueError(f"shape must be 'rectangle' or 'circle', not {shape!r}")
        num = lambda x: float(x) if np.ndim(x) == 0 else np.asarray(x, dtype=float)  # noqa: E731
        self.L, self.D_h, self.shape = num(L), num(D_h), shape
        self.rel_roughness = num(rel_roughness)
        self._smooth = bool(np.all(np.asarray(rel_roughness) == 0.0))
        if shape == "rectangle":
            from hydraulics.ducts import fRe_rectangular_Shah_London, sqrtA_over_Dh

            r = num(sqrtA_over_Dh(alpha))
            self._c = 4.0 / r
            self._a = 3.44**2 * self.D_h * r * r / self.L            # zero for a fully developed length (inf)
            self._b = (r * num(fRe_rectangular_Shah_London(alpha)) / 4.0) ** 2
        self._lam_end = num(self._laminar(np.asarray(RE_LAMINAR_END)))
        self._turb_start = num(self._turbulent(np.asarray(RE_TURBULENT_START)))

    def _laminar(self, Re):
        if self.shape == "circle":
            return f_apparent_Shah(Re, self.L, self.D_h)
        return self._c * np.sqrt(self._a * Re + self._b) / Re

    def _turbulent(self, Re):
        if self._smooth:
            return (0.790 * np.log(Re) - 1.64) ** -2                   # f_Petukhov
        return f_Colebrook(Re, self.rel_roughness)

    def methods(self, Re) -> tuple[Validity, ...]:
        """The Validity records :func:`darcy_friction` reports at these Re [-] (laminar where any Re < 1e4,
        turbulent where any Re > 2300)."""
        Re = np.asarray(Re, dtype=float)
        used = []
        if Re.min() < RE_TURBULENT_START:
            used.append((f_apparent_Shah if self.shape == "circle" else f_apparent_Muzychka_Yovanovich).validity)
        if Re.max() > RE_LAMINAR_END:
            used.append((f_Petukhov if self._smooth else f_Colebrook).validity)
        return tuple(used)

    def __call__(self, Re):
        """Darcy friction factor [-] at Re [-] (an array of any shape, every value positive)."""
        Re = np.asarray(Re, dtype=float)
        top = Re.max()
        if top <= RE_LAMINAR_END:                                   # all laminar (the split's usual case)
            return self._laminar(Re)
        low = Re.min()
        lam = self._laminar(np.minimum(Re, RE_LAMINAR_END)) if low <= RE_LAMINAR_END else 0.0
        turb = self._turbulent(np.maximum(Re, RE_TURBULENT_START)) if top >= RE_TURBULENT_START else 0.0
        w = np.clip((Re - RE_LAMINAR_END) / (RE_TURBULENT_START - RE_LAMINAR_END), 0.0, 1.0)
        blend = (1.0 - w) * self._lam_end + w * self._turb_start
        return np.where(Re <= RE_LAMINAR_END, lam, np.where(Re >= RE_TURBULENT_START, turb, blend))


@lru_cache(maxsize=256)
def duct_friction(L: float, D_h: float, alpha: float, shape: str, rel_roughness: float = 0.0) -> DuctFriction:
    """The :class:`DuctFriction` of one geometry (kept: a plate's headers and channels keep their geometry from
    one solve to the next)."""
    return DuctFriction(L, D_h, alpha, shape, rel_roughness)
