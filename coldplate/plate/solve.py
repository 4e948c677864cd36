"""The plate solve: one plate at one flow and load, a frozen :class:`Result` without findings.

Chain (each step a published method, see DEVELOPERS.md):

1. coolant properties at the bulk mean temperature (CoolProp), iterated with the
   outlet temperature from an enthalpy balance, and with the wall temperature
   where the laminar model carries a viscosity correction (Sieder-Tate);
2. passage geometry → velocity, Reynolds and Prandtl numbers, regime;
3. Darcy friction (apparent friction in developing laminar flow, Gnielinski's
   transition interpolation, Petukhov or Colebrook when turbulent) and the minor
   losses of plenums, ports and bends;
4. Nusselt number → heat transfer coefficient → the passage's back-side
   resistances (fins, bond, tube wall, convection);
5. the plate: Muzychka-Culham-Yovanovich spreading series with the mean back side
   smeared into an effective coefficient over the cooled length (between a channel
   plate's plenums), then a march over that whole length: at each point the local
   Nusselt number (the laminar model's local form), the back side and fin efficiency
   at that coefficient, the change this makes to the base temperature with axial
   conduction in the base, and the coolant's local bulk temperature, so the hottest
   point of the mounting face is found, not assumed, beyond the footprint too.

The check (``coldplate/check.py``) runs this with the modules, the supply and the findings.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import TYPE_CHECKING

import numpy as np

from hydraulics.coolant import StateError as _CoolantStateError
from hydraulics.coolant import SATURATION_MARGIN_K, enthalpy
from hydraulics.ducts import RE_LAMINAR_END, RE_TURBULENT_START
from hydraulics.losses import MinorLoss, total_pressure_drop

from coldplate.plate import conduction, psychro
from coldplate.plate.convection import LAMINAR_LOCAL_FORMS, Nu_Muzychka_Yovanovich_local, nusselt_local
from coldplate.plate.flow import friction_pressure_drop, passage_flow  # noqa: F401  (the sizing evaluator imports them here)
from coldplate.design.errors import DesignError, SolveError
from coldplate.plate.passages import PASSAGES
from coldplate.plate.passages.base import BackSide, Geometry
from coldplate.plate.result import MethodUse, Profile, Result, SourceOutcome
from hydraulics.coolant import Props
from coldplate.plate.passages.channels import PORT_LOSSES
from coldplate.plate.split import least_fed_loop, solve_channel_split

if TYPE_CHECKING:
    from coldplate.design.reader import Design

MAX_ITERATIONS = 60
#: Intervals of the march grid per segment, and grid points per profile point (see march_grid).
GRID_PER_SEGMENT = 1
PROFILE_EVERY = 1
TOLERANCE_K = 1e-5
#: The names of the header parts in a split channel plate's pressure breakdown (Result.minor_losses).
HEADER_PARTS = ("inlet header to the least-fed channel", "outlet header from the least-fed channel")


def solve_plate(design: Design, flow: float | None = None, load: float | None = None,
                split_start=None) -> Result:
    """The plate alone at a volumetric flow [m^3/s] and heat load [W] (the design's own when not given).

    Returns a :class:`Result` without findings.  Features that vary the operating point (a flow set by the
    supply circuit, a load set by a thermoelectric module, curves against flow) call this, so every such
    number comes from the same chain as the design check.
    """
    Q = design.heat.load if load is None else float(load)
    flow = design.flow if flow is None else float(flow)
    return plate_at(design, operating_point(design, flow, Q, split_start))


def split_carrying(flow: float | None = None):
    """``solve(design, load=None) -> Result``: :func:`solve_plate` at ``flow``, each call's flow split starting
    from the previous call's (the thermoelectric module solve calls the plate again and again at one flow and a
    changing load, so each split needs a Newton step or two instead of four).  For one caller whose sequence of
    calls is fixed, so its answers are too."""
    last = [None]

    def solve(design, load=None):
        r = solve_plate(design, flow, load, split_start=last[0])
        if r.flow_split is not None:
            last[0] = r.flow_split
        return r

    return solve


def plate_at(design: Design, op: OperatingPoint) -> Result:
    """The plate's solve (:func:`solve_plate`) at an operating point already solved (its flow and load): the
    spreading and the march to the hottest face.  Callers that need only the coolant side (a circuit's pressure
    at a trial flow) stop at :func:`operating_point`."""
    d, Q = design, op.load
    geom, module, T_in, T_out, pr, cv, h, back = op.geom, op.module, op.T_in, op.T_out, op.props, op.cv, op.h, op.back
    Re, mu_ratio = op.Re, op.mu_ratio
    A_fp = d.heat.footprint_length * d.heat.footprint_width

    # the flow split (channel plates): the least-fed channel's coolant rises by the mean rise over its share
    rise_scale = 1.0 / op.split.min_to_mean if op.split is not None else 1.0

    # --- the plate: spreading with the mean back side smeared over the cooled length, then the march with the
    # local coefficient and the local bulk temperature at each point
    off = geom.cooled_offset
    L_cool, c_cool = cooled_span(d.plate.length, off, d.heat.footprint_length)
    A_cool = L_cool * d.plate.width
    R_below = back.total
    r_mean = A_cool * R_below  # 1 / h_eff [m² K/W]
    h_eff = 1.0 / r_mean
    spread = conduction.spreading_MCY(L_cool, d.plate.width, c_cool, d.heat.footprint_width, d.plate.base,
                                      d.plate.conductivity, h_eff)
    n = d.model.segments
    xg = march_grid(L_cool, n)  # the local coefficient and the base's axial change, over the whole length
    xf = march_points(L_cool, c_cool, n)  # where the hottest point is searched: the grid and the footprint
    s_path = path_position(xg, L_cool, n, geom)
    cv_x = nusselt_local(Re, pr.Pr, s_path, geom.heated_length, geom.D_h, geom.alpha, shape=geom.shape,
                         laminar=d.model.laminar, turbulent=d.model.turbulent, heated=geom.heated, mu_ratio=mu_ratio,
                         rel_roughness=geom.rel_roughness, mean=cv)
    h_x = np.asarray(cv_x.Nu) * pr.k / geom.D_h
    r_x = A_cool * np.broadcast_to(module.back_side_total(d.passage, d.plate, geom, h_x), np.shape(xg))
    delta = conduction.base_axial_perturbation(xg[1] - xg[0], d.plate.conductivity * d.plate.base,
                                               spread.cooled_flux_centreline(xg), r_x, r_mean)
    frac = (np.asarray(spread.absorbed_fraction(xf)) if geom.single_pass else np.ones_like(xf))
    T_bulk_f = T_in + (T_out - T_in) * rise_scale * frac
    T_top_f = T_bulk_f + Q * local_rise(spread.top_rise_centreline(xf), np.interp(xf, xg, delta))
    on_grid = np.searchsorted(xf, xg[::PROFILE_EVERY])  # the profile: points of the grid (all in xf)
    x_prof, T_bulk, T_top = xf[on_grid], T_bulk_f[on_grid], T_top_f[on_grid]
    i_hot = int(np.argmax(T_top_f))
    x_hot = float(xf[i_hot]) + off
    T_plate_max = float(T_top_f[i_hot])
    back_hot = module.back_side(d.passage, d.plate, geom, float(np.interp(xf[i_hot], xg, h_x)))
    R_int = conduction.R_interface(d.interface.resistance_area, A_fp)
    T_face_max = T_plate_max + Q * R_int
    R_th = (T_face_max - T_in) / Q

    R_base = conduction.R_layer(d.plate.base, d.plate.conductivity, A_cool)
    R_coolant = (float(T_bulk_f[i_hot]) - T_in) / Q
    theta_hot = (T_plate_max - float(T_bulk_f[i_hot])) / Q
    parts = [("interface", R_int), ("spreading", theta_hot - R_base - back_hot.total), ("base conduction", R_base)]
    parts += list(back_hot.parts)
    parts.append(("coolant temperature rise", R_coolant))

    methods = op.methods(cv_x.methods, spreading=(_use("spreading", conduction.spreading_MCY,
                                         {"c/a": c_cool / L_cool, "d/b": d.heat.footprint_width / d.plate.width,
                                          "Bi": h_eff * d.plate.base / d.plate.conductivity}),))

    sources = network_sources(d, op, Q, L_cool, h_eff, T_face_max, x_hot)
    hottest = max(sources, key=lambda s: s.face_max)
    if len(sources) > 1 and hottest.face_max > T_face_max:
        # several sources: the headline is the hottest source's cautious face (network_sources), and the
        # breakdown names what the sources add over the stand-in's footprint, so the parts still sum to R_th
        parts.append(("several sources (network, cautious)", (hottest.face_max - T_face_max) / Q))
        T_face_max, x_hot = hottest.face_max, hottest.hottest_at[0]
        R_th = (T_face_max - T_in) / Q
    result = Result(
        **op.result_fields(), R_th=R_th, resistances=tuple(parts), T_face_max=T_face_max,
        T_plate_max=T_plate_max, x_hot=x_hot, methods=methods,
        profile=Profile(tuple(map(float, x_prof + off)), tuple(map(float, T_bulk)), tuple(map(float, T_top))),
        assumptions=_assumptions(d), load=Q,
        Nu_hot=float(np.interp(xf[i_hot], xg, np.asarray(cv_x.Nu))), h_hot=float(np.interp(xf[i_hot], xg, h_x)),
        model="network", sources=sources,
    )
    return result


def network_sources(d: Design, op: OperatingPoint, Q: float, L_cool: float, h_eff: float, T_face_max: float,
                    x_hot: float) -> tuple[SourceOutcome, ...]:
    """Per source, the network's cautious hottest face [K].

    One source: the network's own hottest face.  Several: each source's own spreading (the
    Muzychka-Culham-Yovanovich series at its own load and footprint, centred on the cooled length, with the mean
    back side ``h_eff``) at its centroid, plus every other source's spreading rise at that source's own centroid
    (the most a source puts anywhere on the face, so their sum bounds the heating of neighbours through the
    plate), plus its own interface, plus the coolant's rise from all the load whose centre lies upstream of this
    source's outlet-side edge (the source's own included), and never below the stand-in's hottest face (the
    total load over the sources' bounding box).  Cautious by construction except for a source at a plate edge,
    whose own spreading the centred series understates (the field model places it; measured in
    tests/test_field_check.py on the three-source case).
    No mean face (NaN), no grid uncertainty.  Loads scale with ``Q`` when the solve's load differs from the
    sources' total; placed modules (no loads given) share ``Q`` by area."""
    sources = d.sources
    total = sum(s.load for s in sources)
    scale = Q / total if total > 0 and math.isfinite(total) else 1.0
    if len(sources) == 1:
        s = sources[0]
        return (SourceOutcome(s.name, Q, T_face_max, math.nan, s.limit, (x_hot, s.at[1]), math.nan),)
    mcp = op.m_dot * op.props.cp
    if math.isfinite(total):
        loads = [s.load * scale for s in sources]
    else:  # placed modules, whose heat the module solve sets: shared by area (equal for equal modules)
        loads = [Q * s.area / sum(o.area for o in sources) for s in sources]
    rises = []  # each source's spreading rise at its own centroid [K]: the most it can put anywhere
    for s, q in zip(sources, loads):
        own = conduction.spreading_MCY(L_cool, d.plate.width, min(s.size[0], L_cool), s.size[1], d.plate.base,
                                       d.plate.conductivity, h_eff)
        rises.append(q * own.R_centroid)
    out = []
    for s, q in zip(sources, loads):
        upstream = sum(qo for o, qo in zip(sources, loads) if o.at[0] <= s.edges()[1])
        T = op.T_in + upstream / mcp + sum(rises) + q * s.interface / s.area
        out.append(SourceOutcome(s.name, q, max(T, T_face_max), math.nan, s.limit, s.at, math.nan))
    return tuple(out)


@dataclass(frozen=True)
class OperatingPoint:
    """The passage at one flow and load, shared by both plate models (the network below, the field in
    ``plate/fieldcheck.py``): coolant properties at the bulk mean temperature iterated with the outlet (and the
    wall, for a viscosity correction), the flow's Re, friction, mean Nusselt number and coefficient, the mean
    back side, the pressure drop and the room air."""

    design: object
    geom: Geometry
    module: object
    flow: float  #: [m^3/s]
    load: float  #: [W]
    T_in: float
    T_out: float
    T_boil: float
    props: Props
    m_dot: float
    mu_ratio: float
    V: float
    Re: float
    fr: object
    cv: object
    h: float
    back: BackSide
    iterations: int
    dp: float
    dp_friction: float
    losses: tuple
    T_dew: float
    dew_kind: str
    split: object = None  #: the flow split across a channel plate's channels (coldplate.plate.split), or None

    def result_fields(self) -> dict:
        """The Result fields both plate models take from here as they are."""
        d, pr = self.design, self.props
        litres_per_day = self.flow * 1000.0 * d.supply.seconds_per_day if d.supply.once_through else 0.0
        return dict(
            design=d, geometry=self.geom, props=pr, T_in=self.T_in, T_out=self.T_out, dp=self.dp,
            dp_friction=self.dp_friction, minor_losses=self.losses, velocity=self.V, Re=self.Re, Pr=pr.Pr,
            Nu=float(self.cv.Nu), f_darcy=float(self.fr.f), regime=self.cv.regime, h=self.h,
            eta_fin=self.back.eta_fin, wetted_area=self.back.wetted_area, V_dot=self.flow, m_dot=self.m_dot,
            line_pressure=d.supply.line_pressure, T_boil=self.T_boil, T_dew=self.T_dew, dew_kind=self.dew_kind,
            water_use_L_per_day=litres_per_day,
            water_use_m3_per_year=litres_per_day * d.supply.days_per_year / 1000.0, iterations=self.iterations,
            **_split_fields(self.split, self.flow))

    def methods(self, local_methods=None, spreading=()) -> tuple[MethodUse, ...]:
        """The range checks of the methods used: friction and convection (``local_methods``: the local
        correlation's records, the mean's by default), the plate model's own (``spreading``), the back side's
        and the dew point."""
        d, geom, pr, Re = self.design, self.geom, self.props, self.Re
        out = _methods(self.fr.methods, self.cv.methods if local_methods is None else local_methods, Re=Re,
                       Pr=pr.Pr, L_over_D=geom.heated_length / geom.D_h, alpha=geom.alpha,
                       Gz=Re * pr.Pr * geom.D_h / geom.heated_length)
        out += tuple(spreading)
        out += tuple(_use(role, fn, values) for role, fn, values in self.back.methods)
        out += _split_methods(self.split)
        out += (_use("dew point", psychro.dew_point, {"T": d.room.temperature, "RH": d.room.relative_humidity}),)
        return out


def operating_point(design: Design, flow: float, Q: float, split_start=None) -> OperatingPoint:
    """The coolant's state, the passage's flow and heat transfer at its mean, and the pressure drop for a
    volumetric flow [m^3/s] and heat load [W] (see :class:`OperatingPoint`)."""
    d = design
    p = d.supply.line_pressure
    coolant = d.coolant
    module = PASSAGES[d.passage.kind]
    geom = module.geometry(d.passage, d.plate)
    T_in = d.inlet_temperature
    T_boil = coolant.boiling_point(p)

    pr_in = coolant.props(T_in, p)
    m_dot = pr_in.rho * flow  # the volumetric flow is taken at inlet conditions
    H_in = enthalpy(coolant, T_in, p)
    total_area = geom.n_parallel * geom.flow_area

    T_out = T_in + Q / (m_dot * pr_in.cp)
    T_wall = T_out
    # the wall's viscosity correction (Sieder-Tate) needs the coefficient inside the loop; otherwise only the
    # properties iterate, and the passage is solved once at the settled ones (the same values)
    wall = d.model.laminar == "sieder-tate"

    def coolant_side(pr, mu_ratio):
        V, Re, fr, cv, h = passage_flow(m_dot, pr, total_area, geom.D_h, geom.alpha, geom.shape, geom.path_length,
                                        geom.heated_length, geom.heated, geom.rel_roughness, d.model, mu_ratio)
        return V, Re, fr, cv, h, module.back_side(d.passage, d.plate, geom, h)

    for iteration in range(1, MAX_ITERATIONS + 1):
        _check_outlet(T_out, T_boil, coolant, p)
        T_mean = 0.5 * (T_in + T_out)
        pr = coolant.props(T_mean, p)
        mu_ratio = 1.0
        if wall:
            mu_ratio = pr.mu / coolant.props(min(T_wall, coolant.upper_limit(p) - 0.5), p).mu
            V, Re, fr, cv, h, back = coolant_side(pr, mu_ratio)
        # outlet from the enthalpy balance H(T_out) = H(T_in) + Q / m_dot (secant on the mean cp)
        H_target = H_in + Q / m_dot
        cp_bar = (enthalpy(coolant, T_out, p) - H_in) / (T_out - T_in) if T_out - T_in > 1e-9 else pr.cp
        T_out_new = T_in + (H_target - H_in) / cp_bar
        T_wall_new = T_mean + Q * dict(back.parts)["convection"] if wall else T_wall
        change = max(abs(T_out_new - T_out), abs(T_wall_new - T_wall) if mu_ratio != 1.0 else 0.0)
        T_out, T_wall = T_out_new, T_wall_new
        if change < TOLERANCE_K:
            break
    else:
        raise SolveError(f"the outlet temperature did not settle in {MAX_ITERATIONS} iterations "
                         f"(last change {change:.3g} K)")
    _check_outlet(T_out, T_boil, coolant, p)
    if not wall:
        V, Re, fr, cv, h, back = coolant_side(pr, mu_ratio)

    # --- the flow split across a channel plate's channels: the least-fed channel sets the hot spot (its Re, h and
    # the local march, every channel taken as that one), and its coolant rises by the mean over its flow
    split = None
    rise_scale = 1.0
    if d.passage.kind == "channels":
        split = solve_channel_split(d.passage, d.plate, geom, pr, d.model, m_dot / pr.rho, split_start)
    if split is not None:
        rise_scale = 1.0 / split.min_to_mean
        q_least = float(np.min(split.flows.channel_flows))
        V_mean = V
        V, Re, fr, cv, h = passage_flow(pr.rho * q_least * geom.n_parallel, pr, total_area, geom.D_h, geom.alpha,
                                        geom.shape, geom.path_length, geom.heated_length, geom.heated,
                                        geom.rel_roughness, d.model, mu_ratio)
        back = module.back_side(d.passage, d.plate, geom, h)

    # --- pressure drop
    if split is None:
        losses = module.minor_losses(d.passage, d.plate, geom, V, Re, float(fr.f))
        dp_f = friction_pressure_drop(float(fr.f), geom.path_length, geom.D_h, pr.rho, V)
    else:
        dp_f, losses = _split_pressure_parts(d, geom, pr, split, module.minor_losses(d.passage, d.plate, geom,
                                                                                      V_mean, Re, float(fr.f)))
    dp = dp_f + total_pressure_drop(losses, pr.rho)
    T_dew = _condensation_point(d.room.temperature, d.room.relative_humidity)
    dew_kind = "dew point" if T_dew >= 273.15 else "frost point"
    return OperatingPoint(d, geom, module, flow, Q, T_in, T_out, T_boil, pr, m_dot, mu_ratio, V, Re, fr, cv, h,
                          back, iteration, dp, dp_f, losses, T_dew, dew_kind, split)


@lru_cache(maxsize=64)
def _condensation_point(T: float, RH: float) -> float:
    """psychro.condensation_point, kept per room (every solve of a design asks for the same room)."""
    return psychro.condensation_point(T, RH)


def _split_pressure_parts(d, geom, pr, split, mean_losses):
    """The pressure drop's parts through the least-fed channel's loop of the higher-drop split: that channel's
    friction, and as minor losses the inlet port, the inlet header (port to the channel), the channel's
    contraction and expansion at its own velocity, the outlet header and the outlet port.  They sum to the
    port-to-port drop plus the ports' losses."""
    m = split.drop
    i, p_inlet, p_outlet = least_fed_loop(m)
    q = float(m.channel_flows[i])
    V_i, _, fr_i, _, _ = passage_flow(pr.rho * q, pr, geom.flow_area, geom.D_h, geom.alpha, geom.shape,
                                      geom.path_length, geom.heated_length, geom.heated, geom.rel_roughness, d.model)
    dyn = 0.5 * pr.rho * V_i**2
    ports = {loss.name: loss for loss in mean_losses if loss.name in PORT_LOSSES}
    inner = [MinorLoss(loss.name, loss.K, V_i) for loss in mean_losses if loss.name not in PORT_LOSSES]
    parts = ([ports[PORT_LOSSES[0]]] if PORT_LOSSES[0] in ports else [])
    parts += [MinorLoss(HEADER_PARTS[0], p_inlet / dyn, V_i)] + inner + [MinorLoss(HEADER_PARTS[1], p_outlet / dyn, V_i)]
    parts += [ports[PORT_LOSSES[1]]] if PORT_LOSSES[1] in ports else []
    return friction_pressure_drop(float(fr_i.f), geom.path_length, geom.D_h, pr.rho, V_i), tuple(parts)


def _split_methods(split) -> tuple[MethodUse, ...]:
    """The header model and the headers' friction records, checked at the headers' largest Reynolds number; a
    laminar record at most at the end of the laminar range, a turbulent one at least at the start of the
    turbulent range (where the transition blend evaluates them, as in :func:`_methods`)."""
    if split is None:
        return ()
    Re = max(max(split.flows.header_reynolds), max(split.drop.header_reynolds))
    out = []
    for v in dict.fromkeys(split.flows.methods + split.drop.methods):
        laminar = any(b.variable == "Re" and b.high <= RE_LAMINAR_END for b in v.bounds)
        at = min(Re, RE_LAMINAR_END) if laminar else max(Re, RE_TURBULENT_START)
        used = {"Re": at} if any(b.variable == "Re" for b in v.bounds) else {}
        out.append(MethodUse(role="flow split" if not v.bounds else "header friction", method=v.method,
                             reference=v.reference, validity=v.describe(),
                             values=tuple((k, float(x)) for k, x in used.items()), outside=v.violations(**used)))
    return tuple(out)


def _split_fields(split, flow) -> dict:
    """The Result's flow-split fields: channel flows at inlet conditions (summing to ``flow``), min over mean,
    the header drops and the arrangement (empty without a split)."""
    if split is None:
        return {}
    q = np.asarray(split.flows.channel_flows)
    return dict(channel_flows=tuple(map(float, q * (flow / np.sum(q)))), flow_split_min_to_mean=split.min_to_mean,
                header_pressure_drop=(split.drop.inlet_header_drop, split.drop.outlet_header_drop),
                port_arrangement=split.flows.arrangement, flow_split=split)


def cooled_span(plate_length: float, offset: float, footprint_length: float) -> tuple[float, float]:
    """The cooled length between the plenums [m] and the part of the centred footprint over it [m].

    The plate model is the cooled length alone, its ends adiabatic: the plate over the plenums is given no
    cooling and no spreading (a hotter face), and heat of a footprint reaching over a plenum is put on the
    cooled length's ends (``findings.plate`` says so when a footprint does)."""
    L = plate_length - 2.0 * offset
    return L, min(footprint_length, L)


def march_grid(length: float, segments: int) -> np.ndarray:
    """The march's grid [m from the cooled length's inlet end]: GRID_PER_SEGMENT · segments + 1 evenly spaced
    points over the whole cooled length, where the local coefficient, the back side and the base's axial change
    are computed (linear in between).  Every PROFILE_EVERY-th point is a point of the profile."""
    return np.linspace(0.0, length, GRID_PER_SEGMENT * segments + 1)


def march_points(length: float, footprint_length: float, segments: int) -> np.ndarray:
    """Where the march looks for the hottest point [m from the cooled length's inlet end]: the grid over the
    whole cooled length, outlet end included (the coolant's rise can put the hottest point beyond the
    footprint), and segments + 1 points over the centred footprint, where the spreading field peaks.  The
    profile's points are among them, so the profile never shows a point hotter than the one reported.  Shared
    with the sizing evaluator, so both take the maximum over the same points."""
    x0 = 0.5 * (length - footprint_length)
    return np.unique(np.concatenate([march_grid(length, segments),
                                     np.linspace(x0, x0 + footprint_length, segments + 1)]))


def path_position(x, length: float, segments: int, geom) -> np.ndarray:
    """Distance from the passage's entry [m] at which the local coefficient is taken for points x [m] of the
    cooled length: x itself for a single pass, not less than half a segment (the entry's coefficient is
    unbounded; a shorter distance would only raise it); for a serpentine, which crosses the plate once per
    pass, the end of the path everywhere (its smallest local coefficient, cautious)."""
    x = np.asarray(x, dtype=float)
    if not geom.single_pass:
        return np.full(x.shape, float(geom.heated_length))
    return np.maximum(x, 0.5 * length / segments)


def local_rise(top, delta, out=None):
    """Top-face rise per watt above the local bulk water [K/W]: the spreading series' rise ``top`` with the mean
    back side plus the change ``delta`` that the local back side makes
    (:func:`coldplate.plate.conduction.base_axial_perturbation`).  Never below zero: the mounting face is never
    reported cooler than the water under it.  Floats or numpy arrays (the sizing evaluator passes arrays, and
    ``out``, an array of the result's shape to write into, which may be ``top`` itself)."""
    if out is None:
        return np.maximum(np.asarray(top) + np.asarray(delta), 0.0)
    np.add(top, delta, out=out)
    return np.maximum(out, 0.0, out=out)


def _check_outlet(T_out, T_boil, coolant, p):
    """The outlet must stay liquid and within the property data; otherwise the flow is too small."""
    if not math.isfinite(T_out) or T_out >= T_boil - SATURATION_MARGIN_K:
        raise DesignError("[coolant] flow", f"is too small for the load: the coolant would reach boiling "
                                            f"({T_boil - 273.15:.1f} degC at {p / 1e3:.0f} kPa absolute) before the outlet")
    try:
        coolant.check_liquid(T_out, p)
    except _CoolantStateError as exc:
        raise DesignError("[coolant] flow", f"is too small for the load: at the outlet, {exc}") from None


def _use(role, fn, values):
    v = fn.validity
    return MethodUse(role=role, method=v.method, reference=v.reference, validity=v.describe(),
                     values=tuple((k, float(x)) for k, x in values.items()), outside=v.violations(**values))


def _methods(friction_methods, convection_methods, **values) -> tuple[MethodUse, ...]:
    """Range checks for the friction and convection methods used.

    In the transition (2300 < Re < 1e4) the laminar methods are evaluated at Re = 2300 and the turbulent ones
    at Re = 1e4 (Gnielinski's interpolation), so each is checked at the Re it was evaluated at.
    """
    out, seen = [], set()
    Re = values["Re"]
    transitional = RE_LAMINAR_END < Re < RE_TURBULENT_START
    for role, records in (("friction", friction_methods), ("convection", convection_methods)):
        for v in records:
            if (role, v.method) in seen:
                continue
            seen.add((role, v.method))
            here = dict(values)
            if transitional:
                laminar = any(b.variable == "Re" and b.high <= RE_LAMINAR_END for b in v.bounds)
                here["Re"] = RE_LAMINAR_END if laminar else RE_TURBULENT_START
                here["Gz"] = values["Gz"] * here["Re"] / Re
            used = {k: x for k, x in here.items() if any(b.variable == k for b in v.bounds)}
            out.append(MethodUse(role=role, method=v.method, reference=v.reference, validity=v.describe(),
                                 values=tuple((k, float(x)) for k, x in used.items()),
                                 outside=v.violations(**used)))
    return tuple(out)


def _assumptions(d: Design) -> tuple[str, ...]:
    out = [
        "steady state; the heated footprint is centred on the plate with a uniform heat flux",
        "the passage's back-side resistances are smeared over the cooled length as one effective coefficient "
        "for the spreading series; along the flow the local coefficient (and fin efficiency) changes the base "
        "temperature, conducted along the base only; the coolant's bulk temperature rise is added along the flow",
        "coolant properties at the bulk mean temperature and the line pressure; flow given at inlet conditions",
        "the sides and the lid of the plate are adiabatic (no heat to room air)",
    ]
    if d.passage.kind == "channels":
        if d.passage.count > 1 and d.passage.plenum_length > 0:
            out.append("the flow split between channels is solved through the plenums as headers (Bajura & Jones' "
                       "momentum form); the hot spot takes every channel at the least-fed channel's flow and its "
                       "coolant rise (the outlet and the water use stay on the total flow)")
        elif d.passage.count > 1:
            out.append("no plenum (plenum_length zero): flow is shared evenly between channels")
        out.append("the walls are fins with an adiabatic tip at the lid")
        out.append("the plate over the plenums is given no cooling (the channels' conductance is smeared over the "
                   "channel length only)")
        if d.passage.port_diameter is None:
            out.append("no port diameter given: port losses are not included in the pressure drop")
    elif d.passage.kind == "tube":
        out.append("the groove holds half the tube's circumference; the plate between passes conducts "
                   "sideways through the base thickness only")
        if d.passage.passes > 1:
            out.append("a serpentine crosses the plate once per pass: the coolant under the hot spot is taken at "
                       "the outlet temperature (cautious), and the profile's bulk temperature is that value")
    else:
        out.append("flow spreads evenly across the cavity width")
    if LAMINAR_LOCAL_FORMS[d.model.laminar] is not Nu_Muzychka_Yovanovich_local:
        out.append(f"the laminar model ({d.model.laminar}) publishes only a length mean: in laminar flow the march "
                   "takes the fully developed value as the local coefficient (the least along the channel)")
    if d.supply.static_pressure is None:
        out.append("no static pressure given: properties and boiling point at atmospheric pressure")
    return tuple(out)
