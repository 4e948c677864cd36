"""Propagation: every sample a candidate with perturbed inputs and correlation factors, run all at once.

Rows: the nominal (every input at its design value), then each input at its low and at its high end with the
others nominal (the one-at-a-time sensitivities), then the Latin hypercube samples.  Two paths:

* **vectorised evaluator** (channel plates, a tube plate whose tube size is not varied, or an open cavity; at a
  given flow or at the flow a supply circuit sets; one heat source or several; with or without thermoelectric
  modules; any laminar model, Sieder-Tate's wall iterated per row): :func:`evaluator_rows` runs the rows
  through the sizing evaluator's stages
  (``coldplate/sizing/evaluate.py``: the same ``passage_flow``, ``nusselt_local``, ``fin_areas`` or the tube's
  ``convection`` and ``conduction_parts`` or the cavity's ``back_side``, ``PlateTable.rises``, the minor
  losses) with one candidate per row, so flow, load, inlet and interface vary per row; the Nusselt number (mean
  and local) and the friction factor are multiplied by the row's correlation factors.  A channel plate's rows
  carry the check's least-fed share of the flow split (:class:`RowPlate`), not re-solved per row.  With
  modules, :func:`module_rows` couples them to every row's plate in closed form (a few plate evaluations of all
  rows at once); with several sources, :class:`SourceRows` gives every row the network's cautious
  several-source face (``network_sources``' formula over arrays); where a static pressure or a pump sets the
  flow, :class:`SupplyRows` finds every row's operating flow by a bracketed root over all rows at once.  The
  evaluator agrees with the check within 0.1 % (tests/test_sizing_evaluate.py); each row is reported as the
  check's value plus the row's change from the nominal row (temperatures) or times its ratio to it (pressure
  drop), so with every spread zero the band is the check itself.
* **repeated check** (a tube whose size varies): :func:`check_rows`
  solves each row's design as the check does (the supply's operating point, the plate, the modules; not the water
  planning or the findings, which are not banded) but on the resistance network (the field model would cost
  seconds a row), and :func:`anchored` moves the rows onto the check's own values as the evaluator's rows are,
  at a smaller sample count (200 by default, 64 where each
  sample solves a circuit or modules).  The check takes no correlation factors, so this path leaves the
  correlation scatter out, and says so in the notes.

Samples that cannot be solved (boiling, beyond the property data) count as the hottest and highest values, so
they widen the upper end instead of vanishing from it.
"""
from __future__ import annotations

import math
from dataclasses import replace
from types import SimpleNamespace

import numpy as np

from hydraulics.circuit import G, Fluid, required_pressure, static_head
from hydraulics.ducts import aspect_ratio, hydraulic_diameter_rectangle
from hydraulics.pump import PumpTable, pump_curve_many

from coldplate.design.errors import ColdplateError
from coldplate.modules import model as te
from coldplate.modules import solve as module_solve
from coldplate.plate import conduction
from coldplate.plate.convection import nusselt_local
from coldplate.plate.passages import cavity as cavity_passage
from coldplate.plate.passages import channels as channel_passage
from coldplate.plate.passages import tube as tube_passage
from coldplate.plate.flow import passage_friction
from coldplate.plate.solve import friction_pressure_drop, passage_flow, path_position
from coldplate.sizing.evaluate import LOCAL_BLOCK, Evaluator
from coldplate.sizing.proptable import PropertyState
from coldplate.supply.operating import FLOW_MAX
from coldplate.uncertainty.reader import (DEFAULT_SAMPLES, FALLBACK_SAMPLES, SLOW_FALLBACK_SAMPLES, Spread,
                                         UncertaintySpec)
from coldplate.uncertainty.result import OUTPUTS, Band, Sensitivity, Uncertainty
from coldplate.uncertainty.sampling import ends, latin_hypercube, percentile, to_values
from coldplate.uncertainty.scatter import band_of

#: Passage kinds the vectorised rows cover.
ROW_PASSAGES = ("channels", "tube", "cavity")
#: Keys of the correlation factors among the inputs.
NU_FACTOR, F_FACTOR = "correlations.Nu", "correlations.f"


def covered(design, result, keys=()) -> bool:
    """Whether the vectorised evaluator covers this design (else: repeated checks)."""
    d = design
    given = d.supply.drive == "flow" and d.flow is not None
    supplied = d.supply.drive in ("pressure", "pump") and d.circuit is not None
    return (d.passage.kind in ROW_PASSAGES and (given or supplied)
            and not (keys and "passage.inner_diameter" in keys))


def propagate(design, result, spec: UncertaintySpec, data: dict) -> Uncertainty:
    """The band of ``result`` (the check of ``design``) under the spreads of ``spec``."""
    spreads = list(spec.spreads(design, data))
    fast = covered(design, result, [s.key for s in spreads])
    notes = []
    factors = []
    if spec.correlations:
        for key, quantity in ((NU_FACTOR, "Nu"), (F_FACTOR, "f")):
            s = band_of(result.methods, result.regime, quantity)
            if s is not None:
                factors.append((quantity, s.method, s.band, s.source))
                if fast:
                    spreads.append(Spread(key, 1.0, 1.0 - s.band, 1.0 + s.band, "uniform",
                                          f"±{s.band * 100:g} % ({s.method})"))
        if not fast:
            notes.append("the correlations' scatter is left out: the repeated check takes no correlation factors")
            factors = []
    slow = design.module is not None or (design.circuit is not None and design.supply.drive != "flow")
    n = spec.samples or (DEFAULT_SAMPLES if fast else SLOW_FALLBACK_SAMPLES if slow else FALLBACK_SAMPLES)
    if fast:
        notes.insert(0, f"{n} samples through the sizing search's vectorised evaluator, anchored to the check")
        if len(design.sources) > 1:
            notes.insert(1, f"{len(design.sources)} sources: each sample's hottest face is the resistance network's "
                            "cautious several-source face, moved onto the check's own hottest face by its change "
                            "from the nominal sample (the check places the sources on the field model)")
    else:
        notes.insert(0, f"{n} samples, each a whole check (the vectorised evaluator covers channel plates, cavities "
                        "and tubes of fixed size)")
    k = len(spreads)
    u = latin_hypercube(n, k, spec.seed)
    sampled = np.column_stack([to_values(u[:, i], s.low, s.high, s.distribution) for i, s in enumerate(spreads)]) \
        if k else np.empty((n, 0))
    nominal = np.array([s.nominal for s in spreads])
    oat_ends = [ends(s.low, s.high, s.distribution, spec.confidence) for s in spreads]
    oat = np.repeat(nominal[None, :], 2 * k, axis=0)
    for i, (lo, hi) in enumerate(oat_ends):
        oat[2 * i, i], oat[2 * i + 1, i] = lo, hi
    rows = np.vstack([nominal[None, :], oat, sampled])
    keys = [s.key for s in spreads]
    out = evaluator_rows(design, result, keys, rows) if fast else anchored(result, check_rows(design, keys, rows))
    body = slice(1 + 2 * k, None)
    unsolved = int(np.count_nonzero(~np.isfinite(out["face"][body])))
    if unsolved:
        notes.append(f"{unsolved} of {n} samples could not be solved (boiling or beyond the property data); they "
                     "count as the hottest")
    lq, uq = 0.5 - 0.5 * spec.confidence, 0.5 + 0.5 * spec.confidence
    nominal_of = {"face": result.T_face_max, "outlet": result.T_out, "pressure_drop": result.dp,
                  "water_use": result.water_use_L_per_day}
    bands = []
    for name in OUTPUTS:
        x = np.where(np.isfinite(out[name][body]), out[name][body], math.inf)
        (lo, elo), (med, emed), (hi, ehi) = (percentile(x, q) for q in (lq, 0.5, uq))
        bands.append(Band(name, nominal_of[name], lo, med, hi, elo, emed, ehi))
    sens = tuple(sorted((Sensitivity(keys[i], oat_ends[i][0], oat_ends[i][1], float(out["face"][1 + 2 * i]),
                                     float(out["face"][2 + 2 * i]), float(out["pressure_drop"][1 + 2 * i]),
                                     float(out["pressure_drop"][2 + 2 * i])) for i in range(k)),
                        key=lambda s: -s.swing if math.isfinite(s.swing) else -math.inf))
    if "coolant.inlet_temperature" in keys:
        inlet_low = percentile(sampled[:, keys.index("coolant.inlet_temperature")], lq)[0]
    else:
        inlet_low = result.T_in
    inputs = tuple((s.key, s.low, s.high, s.distribution, s.text) for s in spreads
                   if s.key not in (NU_FACTOR, F_FACTOR))
    return Uncertainty(spec.confidence, n, spec.seed, "vectorised evaluator" if fast else "repeated check",
                       tuple(bands), sens, inputs, tuple(factors), unsolved, float(inlet_low), tuple(notes))


def _columns(keys, rows, defaults: dict) -> dict:
    """Each input as a column of ``rows`` (its default where no spread names it)."""
    return {name: rows[:, keys.index(name)] if name in keys else np.full(rows.shape[0], float(value))
            for name, value in defaults.items()}


def _interface_factor(keys, rows) -> np.ndarray:
    """R''/R''_design of each row: resistance in proportion, conductivity inversely, thickness in proportion."""
    factor = np.ones(rows.shape[0])
    for key in ("interface.resistance", "interface.conductivity", "interface.thickness"):
        if key in keys:
            v = rows[:, keys.index(key)]
            nominal = rows[0, keys.index(key)]
            factor = factor * (nominal / v if key == "interface.conductivity" else v / nominal)
    return factor


def evaluator_rows(design, result, keys, rows) -> dict:
    """Every row through the evaluator's stages, one candidate per row (channels, or the design's tube);
    anchored to the check (:func:`anchored`)."""
    d = design
    plate = RowPlate(design, result, keys, rows)
    c = plate.c
    T_in = c["coolant.inlet_temperature"]
    if d.supply.drive == "flow":
        flow = c["coolant.flow"]
        if d.module is None:
            got = plate(flow, c["heat.load"])
        else:
            got = module_rows(d.module, plate, flow, c["heat.load"], T_in)
    else:  # the supply sets each row's flow (check._solve_with_modules' order with modules)
        supply = SupplyRows(d, result, plate)
        if d.module is None:
            flow = supply.flows(c["heat.load"])
            got = supply.at(flow, c["heat.load"])
        else:
            first = supply.flows(np.maximum(2.0 * c["heat.load"], 1.0))
            first_rows = module_rows(d.module, plate, np.where(np.isfinite(first), first, result.V_dot),
                                     c["heat.load"], T_in)
            flow = np.where(first_rows.ok & np.isfinite(first), supply.flows(
                np.where(first_rows.ok, first_rows.Q, result.load)), np.nan)
            got = module_rows(d.module, plate, np.where(np.isfinite(flow), flow, result.V_dot), c["heat.load"], T_in)
        got.ok = got.ok & np.isfinite(flow)
    out = anchored(result, {"face": got.T_face, "outlet": got.T_out, "pressure_drop": got.dp,
                            "water_use": flow})  # the water in proportion to the flow
    bad = ~got.ok
    return {name: np.where(bad, np.nan, v) if name != "water_use" or d.supply.drive != "flow" else v
            for name, v in out.items()}


class RowPlate:
    """The plate of every row through the evaluator's stages: ``plate(flow, load, idx)`` gives the hottest face,
    the outlet, the plate's pressure drop and whether the row solves (SimpleNamespace of arrays) for the rows
    ``idx`` (all when None) at those rows' flows [m³/s] and loads [W].  Every other input of a row (inlet,
    interface, channel width and depth, the correlation factors) is the row's own, read once from ``rows``.

    Channel plates carry the check's least-fed share of the flow split (``Result.flow_split_min_to_mean``) in
    every row: the least-fed channel's Reynolds number and coefficient, the coolant's rise under the hot spot
    over the share, as the check does; the split itself is not solved again per row (the batched header network
    takes about 1.7 s for 4000 rows here), so a row whose flow or channels differ from the nominal keeps the
    nominal share.  The pressure drop is the even split's (the rows are anchored to the check's drop by ratio).
    """

    def __init__(self, design, result, keys, rows):
        d = self.design = design
        load = d.module.cold_load if d.module is not None else d.heat.load
        defaults = {"heat.load": load, "coolant.inlet_temperature": d.inlet_temperature,
                    "coolant.flow": d.flow if d.flow is not None else result.V_dot, NU_FACTOR: 1.0, F_FACTOR: 1.0}
        if d.passage.kind == "channels":
            defaults.update({"passage.width": d.passage.width, "passage.depth": d.passage.depth})
        if d.passage.kind == "cavity":
            defaults["passage.height"] = d.passage.height
        self.c = _columns(keys, rows, defaults)
        self.factor = _interface_factor(keys, rows)
        self.R_area = d.interface.resistance_area * self.factor
        self.ev = Evaluator(replace(d, inlet_temperature=float(np.min(self.c["coolant.inlet_temperature"]))),
                            passages=ROW_PASSAGES, wall_viscosity=True)
        share = getattr(result, "flow_split_min_to_mean", None)
        self.share = float(share) if d.passage.kind == "channels" and share is not None else 1.0
        self.evaluations = 0
        self.sources = SourceRows(d, self.ev.plate.a) if len(d.sources) > 1 else None

    def __call__(self, flow, load, idx=None):
        c = self.c
        pick = (lambda a: a) if idx is None else (lambda a: a[idx])  # noqa: E731
        flow, load = np.asarray(flow, dtype=float), np.asarray(load, dtype=float)
        common = (flow, load, pick(c["coolant.inlet_temperature"]), pick(self.R_area), pick(c[NU_FACTOR]),
                  pick(c[F_FACTOR]))
        self.evaluations += 1
        kind = self.design.passage.kind
        if kind == "channels":
            run = lambda mu_ratio: evaluate_channel_rows(  # noqa: E731
                self.ev, pick(c["passage.width"]), pick(c["passage.depth"]), *common, share=self.share,
                mu_ratio=mu_ratio)
        elif kind == "cavity":
            run = lambda mu_ratio: evaluate_cavity_rows(self.ev, pick(c["passage.height"]), *common,  # noqa: E731
                                                        mu_ratio=mu_ratio)
        else:
            run = lambda mu_ratio: evaluate_tube_rows(self.ev, *common, mu_ratio=mu_ratio)  # noqa: E731
        got = run(1.0) if self.design.model.laminar != "sieder-tate" else self._wall_iteration(run, load)
        if self.sources is not None:  # several sources: the hottest of their cautious faces, as the network's
            got.T_face = np.maximum(got.T_face, self.sources.hottest(load, common[2], pick(self.factor), got))
        return got

    def _wall_iteration(self, run, load):
        """Sieder-Tate's viscosity correction, as ``plate.solve.operating_point`` iterates it: the wall at the
        bulk mean plus the load times the back side's convection part, mu_bulk / mu_wall from the property
        table (the wall held below the end of the data, as the check does), the rows evaluated again until no
        row's wall moves by more than the check's 1e-5 K (``WALL_ITERATIONS`` at most; a row still moving is
        unsolved)."""
        props, top = self.ev.props, self.ev.T_top
        mu_ratio = np.ones(np.size(load))
        T_wall = None
        for _ in range(WALL_ITERATIONS):
            got = run(mu_ratio)
            T_new = np.minimum(got.T_mean + load * got.conv, top)
            settled = T_wall is not None and np.all(~got.ok | (np.abs(T_new - T_wall) < WALL_TOLERANCE_K))
            if settled:
                return got
            T_wall = np.where(got.ok, T_new, got.T_mean)
            mu_ratio = np.where(got.ok, got.mu / props.at(np.where(got.ok, T_wall, top)).mu, 1.0)
        got.ok = got.ok & False
        return got


#: Sieder-Tate's wall iteration over the rows: the check's own tolerance and count (plate.solve.TOLERANCE_K,
#: MAX_ITERATIONS).
WALL_TOLERANCE_K, WALL_ITERATIONS = 1e-5, 60

#: Nodes a decade of h_eff at which a source's centroid rise is tabulated (a cubic in log h through the four
#: around each value; the series' 1-D part 1/(h a b) is added back exactly): within 1e-6 of the series on the
#: three-source example.
SOURCE_NODES_PER_DECADE = 32


class SourceRows:
    """The network's several-source faces (:func:`coldplate.plate.solve.network_sources`) for arrays of rows.

    Per row and source: the inlet, plus the coolant's rise from all the load whose centre lies upstream of the
    source's outlet-side edge (the source's own included) over the row's heat capacity rate, plus every source's
    spreading rise at its own centroid (the series at the source's load and footprint, centred on the cooled
    length, at the row's mean smeared coefficient h_eff), plus its own interface (times the row's interface
    factor, as the repeated check scales every source's); the loads scale with the row's load (placed modules,
    without loads of their own, share it by area).  The centroid rise of each source is tabulated in log h_eff
    (:data:`SOURCE_NODES_PER_DECADE`), the nodes computed as the rows reach them."""

    def __init__(self, design, cooled_length):
        d = self.design = design
        self.L = cooled_length
        src = d.sources
        total = sum(s.load for s in src)
        areas = np.array([s.area for s in src])
        # each source's share of the load, and the share upstream of its outlet-side edge
        self.part = (np.array([s.load for s in src]) / total if math.isfinite(total) and total > 0
                     else areas / areas.sum())
        self.upstream = np.array([sum(p for o, p in zip(src, self.part) if o.at[0] <= s.edges()[1]) for s in src])
        self.interface = np.array([s.interface / s.area for s in src])  # [K/W]
        self._nodes: list[dict[int, float]] = [{} for _ in src]

    def _centroid(self, i: int, h: np.ndarray) -> np.ndarray:
        """Source i's centroid rise per watt [K/W] at coefficients ``h`` (1-D, finite, positive)."""
        d, s = self.design, self.design.sources[i]
        n = SOURCE_NODES_PER_DECADE
        ab = self.L * d.plate.width
        u = np.log10(h) * n  # node units
        lo, hi = int(np.floor(u.min())) - 1, int(np.floor(u.max())) + 2
        nodes = self._nodes[i]
        for j in range(lo, hi + 1):
            if j not in nodes:
                hj = 10.0 ** (j / n)
                sp = conduction.spreading_MCY(self.L, d.plate.width, min(s.size[0], self.L), s.size[1], d.plate.base,
                                              d.plate.conductivity, hj)
                nodes[j] = sp.R_centroid - 1.0 / (hj * ab)
        # the cubic through the four nodes around each h (Lagrange)
        left = np.floor(u).astype(int)
        t = u - left
        table = np.array([nodes[j] for j in range(lo, hi + 1)])
        y = [table[left + o - lo] for o in (-1, 0, 1, 2)]
        smooth = (-t * (t - 1) * (t - 2) / 6 * y[0] + (t + 1) * (t - 1) * (t - 2) / 2 * y[1]
                  - (t + 1) * t * (t - 2) / 2 * y[2] + (t + 1) * t * (t - 1) / 6 * y[3])
        return smooth + 1.0 / (h * ab)

    def hottest(self, load, T_in, factor, got) -> np.ndarray:
        """The hottest source face of each row [K] (NaN where the row's plate is not solved)."""
        load = np.asarray(load, dtype=float)
        h = np.asarray(got.h_eff, dtype=float)
        good = np.isfinite(h) & (h > 0) & got.ok
        out = np.full(load.size, np.nan)
        if not good.any():
            return out
        hg, Qg = h[good], load[good]
        spread = sum(p * self._centroid(i, hg) for i, p in enumerate(self.part)) * Qg
        faces = (T_in[good][:, None] + Qg[:, None] * self.upstream[None, :] / got.mcp[good][:, None]
                 + spread[:, None] + Qg[:, None] * self.part[None, :] * self.interface[None, :]
                 * factor[good][:, None])
        out[good] = faces.max(axis=1)
        return out


#: Flow roots of a supply that sets the flow: the bracket grows (or shrinks) by this factor a step from the
#: check's own operating flow, at most SUPPLY_BRACKET_STEPS steps; then at most SUPPLY_ROOT_STEPS safeguarded
#: regula falsi steps (Illinois), each row stopping when its bracket is within SUPPLY_RTOL of its flow or its
#: pressure balance within SUPPLY_PRESSURE_TOL [Pa].
SUPPLY_BRACKET, SUPPLY_BRACKET_STEPS, SUPPLY_ROOT_STEPS = 1.25, 40, 60
SUPPLY_RTOL, SUPPLY_PRESSURE_TOL = 1e-10, 1e-4


class SupplyRows:
    """A supply that sets the flow (``[supply] drive`` "pressure" or "pump" with a ``[circuit]``), for every
    row at once: each row's flow is where the circuit's need equals what the supply gives
    (:func:`coldplate.supply.operating.operate`), the need being the circuit's line losses, lifts and back
    pressure (:func:`hydraulics.circuit.required_pressure`, over arrays of rows: the upstream water at the row's
    inlet, the downstream at its outlet, from the evaluator's property table) plus the row's plate drop; below
    the plate's least flow (it would boil) the static part alone, as ``PlateAt.need``.

    The plate's drop in the need is the row's evaluator drop times the check's drop over the nominal row's at
    the check's operating flow (the check's drop carries the flow split and its headers, which the rows hold at
    the nominal): so the nominal row's root is the check's own flow, to the root's tolerance, and every row's
    drop moves with its flow as the evaluator's does.  The roots: a bracket from the check's flow (growing by
    :data:`SUPPLY_BRACKET` a step; a pump's table ends), then the Illinois variant of regula falsi, which keeps
    the bracket and converges superlinearly; a fixed, deterministic sequence of all rows' evaluations.  A row
    whose supply does not overcome the static part, whose pump does not cross its need inside the table, or
    whose root is where its plate starts to boil (the check refuses each) is unsolved."""

    def __init__(self, design, result, plate: "RowPlate"):
        d = self.design = design
        self.plate, self.circuit = plate, d.circuit
        self.T_in = plate.c["coolant.inlet_temperature"]
        pr = plate.ev.props.at(self.T_in)
        self.rho, self.mu = pr.rho, pr.mu
        self.V0 = float(result.V_dot)
        nominal = plate(np.array([self.V0]), np.array([float(result.load)]), np.array([0]))
        self.k = float(result.dp / nominal.dp[0]) if nominal.ok[0] else 1.0
        s = d.supply
        self.pump = None
        if s.drive == "pump":
            self.pump = pump_curve_many(PumpTable(s.pump_flow, s.pump_rise))
            self.span = (float(s.pump_flow[0]), float(s.pump_flow[-1]))

    def available(self, V, idx):
        """What the supply gives at flows V [Pa]: the static pressure, or suction plus the pump's rise."""
        s = self.design.supply
        if self.pump is None:
            return np.full(V.shape, float(s.static_pressure))
        rise = np.asarray(self.pump(V), dtype=float)
        if s.pump_rise_is_head:  # a head table: the rise in the row's own water at the inlet
            rise = rise * self.rho[idx] * G
        return (s.static_pressure or 0.0) + rise

    def need(self, V, load, idx):
        """The circuit's need at flows V [m³/s] with the rows' loads (rows ``idx``) [Pa], and the rows' plates."""
        up = Fluid(self.rho[idx], self.mu[idx])
        static = static_head(self.circuit, up, up)
        p = self.plate(np.maximum(V, 1e-12), load, idx)
        ok = p.ok & (V > 0)
        down_pr = self.plate.ev.props.at(np.where(ok, p.T_out, self.T_in[idx]))
        need = required_pressure(self.circuit, self.rho[idx] * V, up, Fluid(down_pr.rho, down_pr.mu),
                                 np.where(ok, self.k * p.dp, 0.0))
        return np.where(ok, need, static), p

    def excess(self, V, load, idx):
        need, p = self.need(V, load, idx)
        return self.available(V, idx) - need, p

    def flows(self, load):
        """Each row's operating flow [m³/s] at its load [W] (one per row of the plate; NaN where it has none)."""
        n = load.size
        idx = np.arange(n)
        V = np.full(n, np.nan)
        if self.pump is None:
            up = Fluid(self.rho, self.mu)
            alive = float(self.design.supply.static_pressure) > static_head(self.circuit, up, up)
            lo, hi = np.full(n, self.V0), np.full(n, self.V0)
            g_lo, _ = self.excess(lo, load, idx)
            g_hi = g_lo.copy()
            for _ in range(SUPPLY_BRACKET_STEPS):  # grow the bracket until the excess changes sign
                up_, down_ = alive & (g_hi > 0), alive & (g_lo <= 0)
                if not (up_.any() or down_.any()):
                    break
                r = np.flatnonzero(up_)
                if r.size:
                    lo[r], g_lo[r] = hi[r], g_hi[r]
                    hi[r] = np.minimum(hi[r] * SUPPLY_BRACKET, FLOW_MAX)
                    g_hi[r] = self.excess(hi[r], load[r], r)[0]
                    alive[r[(hi[r] >= FLOW_MAX) & (g_hi[r] > 0)]] = False  # drives more than the largest flow
                r = np.flatnonzero(down_)
                if r.size:
                    hi[r], g_hi[r] = lo[r], g_lo[r]
                    lo[r] = lo[r] / SUPPLY_BRACKET
                    g_lo[r] = self.excess(lo[r], load[r], r)[0]
            alive &= (g_lo > 0) & (g_hi <= 0)
        else:
            lo, hi = np.full(n, self.span[0]), np.full(n, self.span[1])
            g_lo, _ = self.excess(lo, load, idx)
            g_hi, _ = self.excess(hi, load, idx)
            alive = (g_lo >= 0) & (g_hi <= 0)  # the pump crosses the need inside its table
            V[alive & (g_lo == 0)] = lo[alive & (g_lo == 0)]
            alive &= g_lo > 0
        V[alive & (g_hi == 0)] = hi[alive & (g_hi == 0)]
        live = np.flatnonzero(alive & (g_hi < 0))
        side = np.zeros(n, dtype=int)  # which end the last step moved (Illinois: halve the other end's excess)
        for _ in range(SUPPLY_ROOT_STEPS):
            if not live.size:
                break
            a, b, ga, gb = lo[live], hi[live], g_lo[live], g_hi[live]
            x = (a * gb - b * ga) / (gb - ga)
            x = np.where(np.isfinite(x) & (x > a) & (x < b), x, 0.5 * (a + b))  # safeguard: bisect
            gx, _ = self.excess(x, load[live], live)
            right = gx > 0  # the root lies above x
            lo[live] = np.where(right, x, a)
            g_lo[live] = np.where(right, gx, np.where(side[live] == -1, 0.5 * ga, ga))
            hi[live] = np.where(right, b, x)
            g_hi[live] = np.where(right, np.where(side[live] == 1, 0.5 * gb, gb), gx)
            side[live] = np.where(right, 1, -1)
            done = (np.abs(gx) <= SUPPLY_PRESSURE_TOL) | (hi[live] - lo[live] <= SUPPLY_RTOL * hi[live])
            V[live[done]] = x[done]
            live = live[~done]
        return V

    def at(self, flow, load):
        """The rows' plates at their operating flows; unsolved where the flow is NaN or the balance fails (the
        root sits where the plate starts to boil: the check refuses it, ``operate``)."""
        n = flow.size
        idx = np.arange(n)
        V = np.where(np.isfinite(flow), flow, self.V0)
        g, p = self.excess(V, load, idx)
        avail = self.available(V, idx)
        p.ok = p.ok & np.isfinite(flow) & (np.abs(g) <= np.maximum(1.0, 1e-6 * np.abs(avail)))
        return p


#: The rows' hot faces agree with the plate's hottest face at the modules' heat within this [K] (the module
#: solve's own tolerance, coldplate.modules.solve.TOLERANCE_K).
MODULE_TOLERANCE_K = module_solve.TOLERANCE_K
#: Plate evaluations of the rows' module coupling before a row counts as unsolved (three to five settle them on
#: the examples: the plate's resistance barely moves with its load).
MODULE_ITERATIONS = 40
#: Golden-section and bisection steps over the current for a target cold face (closed forms, all rows at once):
#: 0.618^90 and 0.5^60 of I_max, below any tolerance that matters.
GOLDEN_STEPS, BISECTION_STEPS = 90, 60


def module_rows(m, plate, flow, cold_load, T_in, idx=None):
    """Thermoelectric modules on every row's plate (``plate``: a :class:`RowPlate`; ``idx`` its rows, all when
    None; ``flow``, ``cold_load`` (the whole array's) and ``T_in`` of those rows): the plate's figures at the
    modules' hot-side heat, ``ok`` False where a row has no steady state, boils or does not settle.

    Per row, with the cold-side load q of one module and the current I fixed, the hot-side heat is linear in the
    hot face, Q_h = c0 + c1 T_h (:func:`coldplate.modules.model.hot_side_heat_line`), so with the plate's
    resistance R = (T_face − T_in) / Q at the last load the coupled hot face is the closed form
    T_h = (T_in + N R c0) / (1 − N R c1) of :func:`coldplate.modules.solve.faces_at_resistance`, for every row at
    once; the plate is evaluated again at the new load N (c0 + c1 T_h) until its hottest face is T_h within
    :data:`MODULE_TOLERANCE_K` (``couple``'s own test).  N R c1 ≥ 1: the hot side runs away (unsolved, as the
    check refuses it).  With a target cold face instead of a current, each step first finds the row's current at
    that R: the coldest current by golden section over [0, I_max], and the current that reaches the target by
    bisection on [0, coldest] (the check's ``_bisect``); a target below the coldest cold face runs at the coldest
    current (the check's shortfall), one above the cold face with no current is unsolved (the check refuses it).
    The check's coldest current is taken on its plate line (R moving with the load along the sweep); here R is
    the row's at the operating point, a difference of the plate's slight change of R with its load."""
    n = flow.size
    N = m.count
    q = cold_load / N
    base = np.arange(n) if idx is None else np.asarray(idx)  # the plate's rows
    flow, q, T_in = (np.asarray(a, dtype=float) for a in (flow, q, T_in))
    target = m.current is None
    I = np.full(n, 0.0 if target else float(m.current))
    # a first load no hotter than the answer: the modules' heat with the hot face at the inlet water
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    Q = N * (q if target else c0 + c1 * T_in)
    out = SimpleNamespace(T_face=np.full(n, np.nan), T_out=np.full(n, np.nan), dp=np.full(n, np.nan),
                          ok=np.zeros(n, dtype=bool), h_eff=np.full(n, np.nan), mcp=np.full(n, np.nan),
                          current=np.full(n, np.nan), Q=np.full(n, np.nan))
    p = plate(flow, Q, base)
    live = np.flatnonzero(p.ok & (Q > 0))
    R_p = np.where(p.ok, (p.T_face - T_in) / np.where(Q > 0, Q, 1.0), np.nan)
    for _ in range(MODULE_ITERATIONS):
        if not live.size:
            break
        Rl, ql, Tl = R_p[live], q[live], T_in[live]
        if target:
            I[live], good = _target_current(m, ql, Tl, Rl)
        else:
            good = np.ones(live.size, dtype=bool)
        c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I[live], ql)
        slope = N * Rl * c1
        good &= slope < 1.0  # else the hot side runs away
        live, Rl, Tl, c0, c1, slope = (a[good] for a in (live, Rl, Tl, c0, c1, slope))
        T_h = (Tl + N * Rl * c0) / (1.0 - slope)
        Ql = N * (c0 + c1 * T_h)
        pl = plate(flow[live], Ql, base[live])
        done = pl.ok & (np.abs(pl.T_face - T_h) < MODULE_TOLERANCE_K)
        hit = live[done]
        for name in ("T_face", "T_out", "dp", "h_eff", "mcp"):
            getattr(out, name)[hit] = getattr(pl, name)[done]
        out.ok[hit], out.current[hit], out.Q[hit] = True, I[hit], Ql[done]
        keep = pl.ok & ~done
        R_p[live[keep]] = (pl.T_face[keep] - Tl[keep]) / Ql[keep]
        live = live[keep]
    return out


def _cold_faces(m, I, q, T_in, R_p):
    """Cold face [K] of one module at currents ``I`` with the hot face coupled to a plate of resistance ``R_p``
    (arrays of rows); +inf where the hot side runs away."""
    c0, c1 = te.hot_side_heat_line(m.S, m.R, m.K, I, q)
    slope = m.count * R_p * c1
    with np.errstate(divide="ignore", invalid="ignore"):
        T_h = (T_in + m.count * R_p * c0) / (1.0 - slope)
        T_c = te.cold_face_temperature(m.S, m.R, m.K, I, q, T_h)
    return np.where(slope < 1.0, T_c, np.inf)


def _target_current(m, q, T_in, R_p):
    """Each row's current for the target cold face at plate resistance ``R_p`` (see :func:`module_rows`) and
    whether the row is solvable."""
    target = m.cold_face_target
    cold = lambda I: _cold_faces(m, I, q, T_in, R_p)  # noqa: E731
    g = (math.sqrt(5.0) - 1.0) / 2.0
    a, b = np.zeros(q.size), np.full(q.size, m.max_current)
    c, e = b - g * (b - a), a + g * (b - a)
    fc, fe = cold(c), cold(e)
    for _ in range(GOLDEN_STEPS):  # the minimum in [a, e] where f(c) <= f(e), else in [c, b]
        left = fc <= fe
        b = np.where(left, e, b)
        a = np.where(left, a, c)
        c_new = np.where(left, b - g * (b - a), e)
        e_new = np.where(left, c, a + g * (b - a))
        f_new = cold(np.where(left, c_new, e_new))  # the one new point of each row
        fc, fe = np.where(left, f_new, fe), np.where(left, fc, f_new)
        c, e = c_new, e_new
    I_cold = 0.5 * (a + b)
    T_cold = cold(I_cold)
    T_none = cold(np.zeros(q.size))
    lo, hi = np.zeros(q.size), I_cold.copy()
    for _ in range(BISECTION_STEPS):
        mid = 0.5 * (lo + hi)
        above = cold(mid) > target
        lo, hi = np.where(above, mid, lo), np.where(above, hi, mid)
    I = np.where(target < T_cold - 1e-6, I_cold, 0.5 * (lo + hi))
    return I, np.isfinite(T_cold) & (target <= T_none)


def _coolant(ev: Evaluator, flow, Q, T_in):
    """Mass flow, outlet, solvable, bulk-mean properties and the rise per watt of each row: the enthalpy balance
    on the evaluator's property table (any shape of rows)."""
    m_dot = ev.props.at(T_in).rho * flow  # the volumetric flow is taken at inlet conditions
    T_out = ev.props.temperature(ev.props.enthalpy(T_in) + Q / m_dot)
    ok = np.isfinite(T_out) & (T_out < ev.T_top)
    T_out = np.where(ok, T_out, np.nan)
    pr = ev.props.at(np.where(ok, 0.5 * (T_in + T_out), T_in))
    return m_dot, T_out, ok, pr, (T_out - T_in) / Q


def _take(pr: PropertyState, rows) -> PropertyState:
    return PropertyState(pr.rho[rows], pr.mu[rows], pr.cp[rows], pr.k[rows])


def evaluate_channel_rows(ev: Evaluator, width, depth, flow, load, T_in, R_area, nu, ff, share=1.0, mu_ratio=1.0):
    """Hottest face [K], outlet [K], plate pressure drop [Pa] of N channel-plate candidates, one per row (arrays
    of length N: channel width and depth [m], flow [m³/s], load [W], inlet [K], interface R'' [m² K/W], factors
    on the Nusselt number and the friction factor [-]).  The channel count, plate and base are the design's.
    ``share``: the least-fed channel's flow over the mean (a number or one per row; 1 = the even split): that
    channel's flow sets the heat transfer and the coolant's rise under the hot spot is the mean's over it, as in
    the check; the pressure drop stays the even split's.  Also returned: the mean smeared coefficient ``h_eff``
    [W/(m² K)] and the heat capacity rate ``mcp`` [W/K] of each row (the several-source faces use them), and for
    the Sieder-Tate wall iteration (:meth:`RowPlate.__call__`; ``mu_ratio`` bulk over wall viscosity per row) the
    bulk-mean temperature ``T_mean`` [K], viscosity ``mu`` [Pa s] and the convection part of the back side at
    the even split's mean coefficient ``conv`` [K/W] (the check's ``operating_point`` takes the wall there).

    The steps of :meth:`coldplate.sizing.evaluate.Evaluator.channels` with every per-flow quantity per row
    (shape (N, 1, 1) throughout, so the evaluator's functions broadcast row by row)."""
    d = ev.design
    col = lambda a: np.asarray(a, dtype=float).reshape(-1, 1, 1)  # noqa: E731
    w, dep, flow, Q, T_in, nu, ff = (col(a) for a in (width, depth, flow, load, T_in, nu, ff))
    N = w.shape[0]
    share = np.broadcast_to(col(share), w.shape)
    mu_ratio = np.broadcast_to(col(mu_ratio), w.shape)
    even = bool(np.all(share == 1.0))
    n = np.full_like(w, float(d.passage.count))
    m_dot, T_out, ok, pr, s = _coolant(ev, flow, Q, T_in)
    passage = SimpleNamespace(count=n, width=w, depth=dep, plenum_length=d.passage.plenum_length)
    wall = channel_passage.wall_thickness(passage, d.plate)
    L = channel_passage.channel_length(passage, d.plate)
    D_h = hydraulic_diameter_rectangle(w, dep)
    alpha = aspect_ratio(w, dep)
    V, Re, f, h, h_even = (np.empty((N, 1, 1)) for _ in range(5))
    heated = channel_passage.heated_walls(w, dep).ravel()
    for kind in np.unique(heated):
        r = heated == kind
        args = (_take(pr, r), (n * w * dep)[r], D_h[r], alpha[r], "rectangle", L, L, str(kind),
                d.passage.roughness / D_h[r], d.model, mu_ratio[r])
        V[r], Re[r], fr, _, h[r] = passage_flow((m_dot * share)[r], *args)  # the least-fed channel: heat
        f[r], h_even[r] = fr.f, h[r]
        if not even:  # the pressure drop (and the wall's coefficient) at the mean channel flow: the even split's
            V[r], _, fr, _, h_even[r] = passage_flow(m_dot[r], *args)
            f[r] = fr.f
    h = h * nu
    f = f * ff
    _, effective, _, _ = channel_passage.fin_areas(n, w, dep, L, wall, d.plate.conductivity, h)
    _, effective_even, _, _ = channel_passage.fin_areas(n, w, dep, L, wall, d.plate.conductivity, h_even * nu)
    h_eff = effective * h / ev.A_cool
    P = ev.plate.xg.size
    x = path_position(ev.plate.xg, ev.plate.a, ev.plate.segments, SimpleNamespace(single_pass=True))
    r_x = np.empty((N, 1, P))
    for kind in np.unique(heated):
        idx = np.flatnonzero(heated == kind)
        for a in range(0, idx.size, max(1, LOCAL_BLOCK // P)):
            rows = idx[a:a + max(1, LOCAL_BLOCK // P)]
            e = lambda v: v[rows][..., None]  # noqa: E731  (rows, 1, 1, 1): march points last
            cv_x = nusselt_local(e(Re), e(pr.Pr), x, L, e(D_h), e(alpha), laminar=d.model.laminar,
                                 turbulent=d.model.turbulent, heated=str(kind), mu_ratio=e(mu_ratio),
                                 rel_roughness=d.passage.roughness / e(D_h))
            h_x = np.asarray(cv_x.Nu) * e(pr.k) / e(D_h) * e(nu)
            _, eff_x, _, _ = channel_passage.fin_areas(e(n), e(w), e(dep), L, e(wall), d.plate.conductivity, h_x)
            r_x[rows] = (ev.A_cool / (h_x * eff_x))[:, 0]
    R_plate = ev.plate.rises(np.array([d.plate.base]), h_eff[:, 0, :], (s / share)[:, 0, :], r_x)[:, 0, 0]
    dp = friction_pressure_drop(f, L, D_h, pr.rho, V)
    dyn = 0.5 * pr.rho * V**2
    for _, K, ratio in channel_passage.loss_coefficients(n, w, dep, d.plate.width, d.passage.port_diameter,
                                                         d.passage.plenum_depth):
        dp = dp + K * ratio**2 * dyn
    A_fp = d.heat.footprint_length * d.heat.footprint_width
    R_th = R_plate + conduction.R_interface(np.asarray(R_area, dtype=float), A_fp)
    ok = ok.ravel() & np.isfinite(R_th)
    flat = lambda a: np.asarray(a, dtype=float).ravel()  # noqa: E731
    return SimpleNamespace(T_face=flat(T_in) + flat(Q) * R_th, T_out=flat(T_out), dp=flat(dp), ok=ok,
                           h_eff=flat(h_eff), mcp=flat(m_dot * pr.cp), T_mean=flat(0.5 * (T_in + T_out)),
                           mu=flat(pr.mu), conv=flat(1.0 / (h_even * nu * effective_even)))


def evaluate_tube_rows(ev: Evaluator, flow, load, T_in, R_area, nu, ff, mu_ratio=1.0):
    """:func:`evaluate_channel_rows` for the design's serpentine tube (its geometry fixed, 1-D arrays of rows):
    the steps of :meth:`coldplate.sizing.evaluate.Evaluator.tubes` with the rows on the flow axis."""
    d = ev.design
    flow, Q, T_in, nu, ff = (np.asarray(a, dtype=float).ravel() for a in (flow, load, T_in, nu, ff))
    mu_ratio = np.broadcast_to(np.asarray(mu_ratio, dtype=float), flow.shape)
    m_dot, T_out, ok, pr, s = _coolant(ev, flow, Q, T_in)
    passage = d.passage
    geom = tube_passage.geometry(passage, d.plate)
    V, Re, fr, _, h = passage_flow(m_dot, pr, geom.n_parallel * geom.flow_area, geom.D_h, geom.alpha, geom.shape,
                                   geom.path_length, geom.heated_length, geom.heated, geom.rel_roughness, d.model,
                                   mu_ratio)
    h = h * nu
    f = np.asarray(fr.f) * ff
    dp = (friction_pressure_drop(f, geom.path_length, geom.D_h, pr.rho, V)
          + tube_passage.bend_loss_coefficient(passage, f, Re) * 0.5 * pr.rho * V**2)
    r_conv = tube_passage.convection(passage, geom, h)[0]
    x = path_position(ev.plate.xg, ev.plate.a, ev.plate.segments, geom)
    cv_x = nusselt_local(np.asarray(Re)[:, None], pr.Pr[:, None], x, geom.heated_length, geom.D_h, geom.alpha,
                         shape=geom.shape, laminar=d.model.laminar, turbulent=d.model.turbulent, heated=geom.heated,
                         mu_ratio=mu_ratio[:, None], rel_roughness=geom.rel_roughness)
    r_conv_x = tube_passage.convection(passage, geom, np.asarray(cv_x.Nu) * pr.k[:, None] / geom.D_h * nu[:, None])[0]
    fixed = sum(r for _, r in tube_passage.conduction_parts(passage, d.plate, geom))
    R_plate = ev.plate.rise(d.plate.base, 1.0 / (ev.A_cool * (fixed + r_conv)), s, ev.A_cool * (fixed + r_conv_x),
                            single_pass=geom.single_pass)
    R_th = R_plate + conduction.R_interface(np.asarray(R_area, dtype=float),
                                            d.heat.footprint_length * d.heat.footprint_width)
    ok = ok & np.isfinite(R_th)
    return SimpleNamespace(T_face=T_in + Q * R_th, T_out=T_out, dp=np.asarray(dp, dtype=float), ok=ok,
                           h_eff=1.0 / (ev.A_cool * (fixed + r_conv)), mcp=m_dot * pr.cp, T_mean=0.5 * (T_in + T_out),
                           mu=pr.mu, conv=np.asarray(r_conv, dtype=float))


def evaluate_cavity_rows(ev: Evaluator, height, flow, load, T_in, R_area, nu, ff, mu_ratio=1.0):
    """:func:`evaluate_channel_rows` for an open cavity, one row each (1-D arrays; ``height`` the cavity's [m]):
    the one-design check's steps (``plate.solve.solve_plate`` with the cavity module) over the rows: the box's
    duct (the plate's width by the row's height, the floor heated alone) through ``passage_flow``, the floor's
    convection ``cavity.back_side`` at the mean and at the local coefficient of every march point
    (``nusselt_local``), the plate table's spreading and march, the friction and the ports'
    ``cavity.minor_losses``."""
    d = ev.design
    flow, Q, T_in, nu, ff, hgt = (np.asarray(a, dtype=float).ravel() for a in (flow, load, T_in, nu, ff, height))
    mu_ratio = np.broadcast_to(np.asarray(mu_ratio, dtype=float), flow.shape)
    m_dot, T_out, ok, pr, s = _coolant(ev, flow, Q, T_in)
    w, L = d.plate.width, d.plate.length
    D_h, alpha = hydraulic_diameter_rectangle(w, hgt), aspect_ratio(w, hgt)
    rough = d.passage.roughness / D_h
    V, Re, fr, _, h = passage_flow(m_dot, pr, w * hgt, D_h, alpha, "rectangle", L, L, "1L", rough, d.model,
                                   mu_ratio)
    h = h * nu
    f = np.asarray(fr.f) * ff
    geom = SimpleNamespace(flow_area=w * hgt)  # what the ports' losses read of the geometry
    dp = friction_pressure_drop(f, L, D_h, pr.rho, V) + sum(
        loss.pressure_drop(pr.rho) for loss in cavity_passage.minor_losses(d.passage, d.plate, geom, V, Re, f))
    r_mean = ev.A_cool * cavity_passage.back_side(d.passage, d.plate, geom, h).total
    x = path_position(ev.plate.xg, ev.plate.a, ev.plate.segments, SimpleNamespace(single_pass=True))
    col = lambda a: np.asarray(a)[:, None]  # noqa: E731  rows, march points
    cv_x = nusselt_local(col(Re), col(pr.Pr), x, L, col(D_h), col(alpha), shape="rectangle",
                         laminar=d.model.laminar, turbulent=d.model.turbulent, heated="1L", mu_ratio=col(mu_ratio),
                         rel_roughness=col(rough))
    h_x = np.asarray(cv_x.Nu) * col(pr.k) / col(D_h) * col(nu)
    r_x = ev.A_cool * cavity_passage.back_side(d.passage, d.plate, geom, h_x).total
    R_plate = ev.plate.rise(d.plate.base, 1.0 / r_mean, s, r_x, single_pass=True)
    R_th = R_plate + conduction.R_interface(np.asarray(R_area, dtype=float),
                                            d.heat.footprint_length * d.heat.footprint_width)
    ok = ok & np.isfinite(R_th)
    conv = cavity_passage.back_side(d.passage, d.plate, geom, h).total
    return SimpleNamespace(T_face=T_in + Q * R_th, T_out=T_out, dp=np.asarray(dp, dtype=float), ok=ok,
                           h_eff=1.0 / r_mean, mcp=m_dot * pr.cp, T_mean=0.5 * (T_in + T_out), mu=pr.mu,
                           conv=np.asarray(conv, dtype=float))


def _design_for(design, values: dict):
    """The design with one row's values (SI) put in."""
    d = design
    if "heat.load" in values:
        load = values["heat.load"]
        if d.module is not None:
            d = replace(d, module=replace(d.module, cold_load=load))
        else:
            scale = load / d.heat.load
            d = replace(d, heat=replace(d.heat, load=load),
                        sources=tuple(replace(s, load=s.load * scale) for s in d.sources))
    if "coolant.inlet_temperature" in values:
        d = replace(d, inlet_temperature=values["coolant.inlet_temperature"])
    if "coolant.flow" in values:
        d = replace(d, flow=values["coolant.flow"])
    passage = {k.split(".")[1]: v for k, v in values.items() if k.startswith("passage.")}
    if "inner_diameter" in passage:  # a tube keeps its wall thickness
        wall = 0.5 * (d.passage.outer_diameter - d.passage.inner_diameter)
        passage["outer_diameter"] = passage["inner_diameter"] + 2 * wall
    if passage:
        d = replace(d, passage=replace(d.passage, **passage))
    return d


def _solve_row(d):
    """One row's design solved as the check solves it, without the planning and the findings."""
    if d.module is not None:
        from coldplate.check import solve

        return solve(d, model="network")  # a field solve per sample would cost seconds; anchored to the check
    from coldplate.plate.solve import solve_plate
    from coldplate.supply.stage import supply_stage

    flow, _ = supply_stage(d)  # a circuit's operating point (the planning it would attach is not banded)
    return solve_plate(d, flow)


def anchored(result, out: dict, ratio_keys=("pressure_drop", "water_use")) -> dict:
    """Rows of the network model (or the evaluator) moved onto the check's own values (which the field model
    may have given): the check's value plus each row's change from the nominal row 0, times its ratio for the
    outputs in ``ratio_keys`` (the pressure drop and the water)."""
    nominal = {"face": result.T_face_max, "outlet": result.T_out, "pressure_drop": result.dp,
               "water_use": result.water_use_L_per_day}

    def times_ratio(value, rows):  # a zero nominal (no water used: a loop) stays the rows' own values
        return value * rows / rows[0] if rows[0] != 0 else rows

    return {name: times_ratio(nominal[name], rows) if name in ratio_keys else nominal[name] + (rows - rows[0])
            for name, rows in out.items()}


def check_rows(design, keys, rows) -> dict:
    """Every row solved as the check solves it (:func:`_solve_row`); NaN where a row cannot be solved."""
    R0 = design.interface.resistance_area
    factor = _interface_factor(keys, rows)
    out = {name: np.full(rows.shape[0], np.nan) for name in OUTPUTS}
    for i, row in enumerate(rows):
        values = {k: float(v) for k, v in zip(keys, row) if not k.startswith("interface.")}
        d = _design_for(design, values)
        if factor[i] != 1.0:
            R = R0 * factor[i]
            d = replace(d, interface=replace(d.interface, resistance_area=R),
                        sources=tuple(replace(s, interface=s.interface * factor[i]) for s in d.sources))
        try:
            r = _solve_row(d)
        except (ColdplateError, ArithmeticError, ValueError):
            continue
        out["face"][i], out["outlet"][i], out["pressure_drop"][i], out["water_use"][i] = (
            r.T_face_max, r.T_out, r.dp, r.water_use_L_per_day)
    return out
