"""The air stage the check runs when the design has ``[air]``: search, the chosen sink solved exactly, the
modules on it (when the design has them), and the comparison with the water design.

This module sits one layer above the air model (it runs the module solve, which the model may not import):
``coldplate.check`` calls :func:`solve_air` once and sets ``Result.air``.
"""
from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from coldplate.air import correlations as corr
from coldplate.air import sink as model
from coldplate.air.result import AirPlate, AirResult, AirSink, Comparison
from coldplate.air.search import search
from coldplate.design.errors import DesignError, SolveError
from coldplate.modules import model as te
from coldplate.plate import conduction
from coldplate.plate.solve import _methods, _use
from hydraulics.pump import PumpError, PumpTable, intersect

#: The air's properties are taken at the bulk mean temperature; this many passes settle it (the change after
#: the third is below 1e-6 K on the examples).
PROPERTY_PASSES = 4

#: Hottest air leaving a sink the model accepts [K]: 500 degC, far past any sink one would build (common
#: practice), inside CoolProp's range for air.
T_AIR_MAX = 773.15

ASSUMPTIONS = (
    "air sink: straight plate fins on a flat base covering the [air] envelope's length and width; forced air is "
    "ducted (a shroud over the fin tips, all the air between the fins, tips adiabatic); the outer half-gaps "
    "beside the end fins are left out",
    "air sink: the face is taken above the air's outlet temperature with the fins' whole conductance "
    "(never cooler than the isothermal-base effectiveness answer); dry air from CoolProp at the bulk mean "
    "temperature (humidity raises cp slightly, so dry air errs toward a hotter face); no radiation",
    "air sink: natural convection with the fins vertical and open at both ends and at the tips, nothing "
    "blocking the rising air (Bar-Cohen & Rohsenow's isothermal plates)",
)


def _density(air) -> float:
    if air.material not in model.DENSITY:
        raise DesignError("[air] material", f"{air.material!r} has no density in our table for the sink's mass; "
                                            f"use one of {', '.join(sorted(model.DENSITY))}")
    return model.DENSITY[air.material]


def _one(c: model.Candidates, i: int) -> model.Candidates:
    return model.Candidates(c.N[i:i + 1], c.t[i:i + 1], c.H[i:i + 1])


def solve_sink(air, c: model.Candidates, load: float, fp, R_interface: float, density: float):
    """One sink (one-entry candidate arrays) at one load, exactly: (AirSink, methods)."""
    T0, area = air.temperature, air.length * air.width
    s = float(c.gap(air.width)[0])
    N, t, H = int(c.N[0]), float(c.t[0]), float(c.H[0])
    if air.drive == "natural":
        hA, h, Nu, eta, Bi, El, dT = (float(np.asarray(x)[0]) for x in model.natural_conductance(
            c, load, air, lambda T: model.air_props(float(np.asarray(T).ravel()[0]), air.pressure)))
        pr = model.air_props(T0 + 0.5 * dT, air.pressure)
        Q = V = Re = T_out = None
        dp, regime = 0.0, "natural convection"
        methods = (_use("natural convection", corr.Nu_vertical_channel_Bar_Cohen_Rohsenow, {"El": El}),
                   _use("fin", corr.fin_efficiency_corrected_tip, {"mL": 0.0, "Bi": Bi}))
        s_opt = corr.spacing_optimum_Bar_Cohen_Rohsenow(air.length, dT, pr.nu, pr.alpha, 1.0 / pr.T)
        reference = T0
    else:
        pr = model.air_props(T0, air.pressure)
        for _ in range(PROPERTY_PASSES):
            if air.drive == "fan":
                fan = PumpTable(air.fan_flow, air.fan_pressure)
                try:
                    Q = intersect(fan, model.pressure_drop_of_one(c, air, pr))
                except PumpError as exc:
                    raise SolveError("the air sink's fan: " + str(exc).replace("pump", "fan").replace(
                        "circuit", "sink").replace(" L/min", " L/min of air")) from None
            else:
                Q = float(model.frontal_flow(air, H, air.velocity))
            T_out = T0 + float(model.air_rise(load, pr.rho * Q, pr.cp))
            if T_out > T_AIR_MAX:
                raise SolveError(f"the air sink: {Q * 3600:.3g} m^3/h of air would leave above "
                                 f"{T_AIR_MAX - 273.15:.0f} degC with {load:.4g} W; no air sink of this drive can "
                                 "carry the heat")
            pr = model.air_props(0.5 * (T0 + T_out), air.pressure)
        dp_a, V_a, Re_a, fr, _, _ = model.pressure_drop(c, Q, air, pr)
        hA_a, h_a, Nu_a, eta_a, Bi_a, cv = model.forced_conductance(c, Q, air, pr)
        dp, V, Re = float(dp_a[0]), float(V_a[0]), float(Re_a[0])
        hA, h, Nu, eta, Bi = (float(np.asarray(x)[0]) for x in (hA_a, h_a, Nu_a, eta_a, Bi_a))
        regime = str(np.asarray(cv.regime).ravel()[0])
        D_h = 2.0 * s * H / (s + H)
        methods = _methods(fr.methods, cv.methods, Re=Re, Pr=pr.Pr, L_over_D=air.length / D_h,
                           alpha=min(s, H) / max(s, H), Gz=Re * pr.Pr * D_h / air.length)
        m = float(np.asarray(conduction.fin_m(h, air.conductivity, t)))
        methods += (_use("fin", conduction.fin_efficiency_straight, {"mL": m * H, "Bi": Bi}),)
        dT = s_opt = None
        reference = T_out
    sp = model.exact_centroid(air, fp[0], fp[1], hA / area)
    methods += (_use("spreading", conduction.spreading_MCY,
                     {"c/a": fp[0] / air.length, "d/b": fp[1] / air.width,
                      "Bi": hA / area * air.base / air.conductivity}),)
    face = reference + load * (sp.R_centroid + R_interface)
    sk = AirSink(
        fins=N, fin_thickness=t, fin_height=H, gap=s, base=air.base, length=air.length, width=air.width,
        height=air.base + H, material=air.material, mass=float(model.mass(c, air, density)[0]), drive=air.drive,
        flow=Q, velocity=V, dp=dp, fan_power=(Q or 0.0) * dp, Re=Re, Nu=Nu, h=h, eta_fin=eta, regime=regime,
        T_air_in=T0, T_air_out=T_out, R_air_rise=0.0 if T_out is None else (T_out - T0) / load, R_fins=1.0 / hA, R_spreading=sp.R_centroid - 1.0 / hA,
        R_interface=R_interface, R_th=(face - T0) / load, T_face_max=face, load=load, base_rise=dT,
        optimum_spacing=s_opt)
    return sk, methods


def _bare_module(design, air) -> None:
    """A thermoelectric module with no sink: refused, with the runaway it would meet explained."""
    m = design.module
    if m is None:
        raise DesignError("[air] sink", '"none" asks about a thermoelectric module with no sink, but the design has '
                                        "no [module] table")
    fl, fw = design.heat.footprint_length, design.heat.footprint_width
    A, T0 = fl * fw, air.temperature
    dT = max(air.face_limit - T0, 1.0)  # the most the bare face may be above the air: its best coefficient
    pr = model.air_props(T0 + 0.5 * dT, air.pressure)
    Lc = A / (2.0 * (fl + fw))
    Ra = corr.G0 * dT / pr.T * Lc**3 / (pr.nu * pr.alpha)
    h = float(corr.Nu_hot_plate_up_Lloyd_Moran(Ra)) * pr.k / Lc
    R = 1.0 / (h * A) + design.interface.resistance_area / A
    I = m.current if m.current is not None else m.max_current
    q = m.cold_load / m.count
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    slope = m.count * R * c1
    # the current where the slope reaches one: c1(I) = 1/(N R), c1 = S^2 I^2/(S I + K) -> S^2 I^2 - x S I - x K = 0
    x = 1.0 / (m.count * R)
    I_run = (x * m.S + math.sqrt((x * m.S) ** 2 + 4.0 * m.S**2 * x * m.K)) / (2.0 * m.S**2)
    if slope >= 1.0:
        why = (f"at {I:.3g} A per module each kelvin the hot face rises makes the {m.count} module(s) put "
               f"{m.count * c1:.3g} W more into a bare face that sheds about {1.0 / R:.3g} W/K (product "
               f"{slope:.2f}, at least 1): the hot side runs away")
    else:
        T_h = (T0 + m.count * R * c0) / (1.0 - slope)
        why = (f"at {I:.3g} A per module the hot face would settle near {T_h - 273.15:.0f} degC, against the "
               f"limit of {air.face_limit - 273.15:.0f} degC")
    raise DesignError("[air] sink", f"a thermoelectric module with no sink is not a design: its bare hot face "
                                    f"({A * 1e6:.4g} mm^2, still air by Lloyd & Moran, about {h:.3g} W/(m^2 K), "
                                    f"{R:.3g} K/W) cannot take the heat; {why}; above {I_run:.3g} A per module "
                                    "there is no steady state at all. Give the modules a sink "
                                    '([air] sink = "finned") or the water plate')


def solve_air(design, water) -> AirResult:
    """The air-cooled alternative beside the solved water design ``water`` (a plate Result)."""
    from coldplate.modules.solve import solve_with_module

    air = design.air
    if air.sink == "none":
        _bare_module(design, air)
    density = _density(air)
    fp = (design.heat.footprint_length, design.heat.footprint_width)
    R_int = design.interface.resistance_area / (fp[0] * fp[1])
    load = water.load
    found = search(air, load, fp, R_int, density, coolest=design.module is not None)
    if found.index < 0:
        if found.evaluated == 0:
            raise DesignError("[air] width", f"holds no two fins at the shop limits (fin {air.min_fin * 1e3:.3g} mm, "
                                             f"gap {air.min_gap * 1e3:.3g} mm, from {air.shop_limits_from})")
        raise SolveError("the air sink's fan moves no air through any fin layout in the envelope: its curve and "
                         "the sinks' system curves do not cross")
    best = _one(found.candidates, found.index)
    sk, methods = solve_sink(air, best, load, fp, R_int, density)
    module, refused, face = None, "", sk.T_face_max
    if design.module is not None:
        def plate(d, load):
            s, _ = solve_sink(air, best, max(load, 1e-6), fp, R_int, density)
            return AirPlate(R_th=s.R_th, T_face_max=s.T_face_max, T_dew=water.T_dew, load=load, sink=s)
        try:
            on_air = solve_with_module(replace(design, inlet_temperature=air.temperature), plate)
            module, sk, face = on_air.module, on_air.sink, on_air.T_face_max
        except SolveError as exc:
            refused = str(exc)
            face = math.inf
    holds = face <= air.face_limit and not (module is not None and module.shortfall)
    rows = [Comparison("hottest mounting face", "temperature", water.T_face_max, face if math.isfinite(face) else None),
            Comparison("water a year", "volume_per_year", water.water_use_m3_per_year, 0.0),
            Comparison("fan's air power", "power", None, sk.fan_power),
            Comparison("length", "length", design.plate.length, sk.length),
            Comparison("width", "length", design.plate.width, sk.width),
            Comparison("height (base and fins)", "length", None, sk.height),
            Comparison("sink mass", "mass", None, sk.mass)]
    wm = getattr(water, "module", None)
    if wm is not None:
        rows.insert(1, Comparison("module cold face", "temperature", wm.T_cold,
                                  module.T_cold if module is not None else None))
    outside = tuple(f"{u.method}: {msg}" for u in methods for msg in u.outside)
    return AirResult(
        sink=sk, face_limit=air.face_limit, face_limit_from=air.face_limit_from, holds=bool(holds),
        margin=air.face_limit - face, water_face=water.T_face_max, water_m3_per_year=water.water_use_m3_per_year,
        candidates=found.evaluated, feasible=found.feasible,
        shop_limits=(air.min_fin, air.min_gap, air.shop_limits_from), comparison=tuple(rows), methods=methods,
        assumptions=ASSUMPTIONS, pressure=air.pressure, module=module, module_refused=refused, outside=outside)
