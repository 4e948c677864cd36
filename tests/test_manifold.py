"""The flow split across parallel channels (hydraulics.manifold) against its limits, the literature's trends and
independent solves written here.  Sources as in VALIDATION.md, "Flow split across channels"; labels as there:
published / computed / computed by our own solver / common practice / from memory.
"""
import dataclasses
import math

import numpy as np
import pytest
import scipy.optimize as so
import scipy.sparse as sp
import scipy.sparse.linalg as spla

from hydraulics.manifold import (
    Header,
    LinearQuadraticChannel,
    Manifold,
    ManifoldError,
    laminar_channel,
    solve_split,
    uniform_manifold,
)
from hydraulics.friction import darcy_friction

# Water near 25 degC (density and viscosity from memory; the split only takes them as inputs).
RHO, MU = 997.0, 8.9e-4
LPM = 1.0 / 60000.0                       # 1 L/min in m^3/s
PLATE = 0.05                              # header length across the plate [m]
CHANNEL = laminar_channel(1e-3, 3e-3, 0.1, MU, RHO, K_minor=1.5)


def _fRe_series(alpha, terms=400):
    """Darcy f Re of a rectangular duct, the exact series of Shah & London (1978), written out here."""
    n = np.arange(1, 2 * terms, 2, dtype=float)
    s = np.sum(np.tanh(n * math.pi / (2 * alpha)) / n**5)
    return 4 * 24 / ((1 + alpha) ** 2 * (1 - 192 * alpha / math.pi**5 * s))


def _ends():
    return {"U": (-PLATE / 2, -PLATE / 2), "Z": (-PLATE / 2, PLATE / 2), "centred": (0.0, 0.0),
            "off-centre": (0.012, -0.004)}


# ----------------------------------------------------------------- limits


@pytest.mark.parametrize("ports", list(_ends().values()), ids=list(_ends()))
def test_equal_split_when_header_loss_is_negligible(ports):
    # common practice (and the limit of every manifold model, Bajura & Jones 1976): a plenum whose pressure
    # variation is negligible against the channels' drop feeds every channel alike, wherever the ports are.
    deep = Header(PLATE, 0.5, 0.02)
    r = solve_split(uniform_manifold(24, deep, deep, CHANNEL, *ports), 2 * LPM, RHO, MU)
    assert r.min_to_mean > 1 - 5e-5
    assert np.max(r.channel_flows) / np.mean(r.channel_flows) < 1 + 5e-5
    # and the port-to-port drop is the channel's own drop at the mean flow (computed)
    assert r.port_to_port == pytest.approx(float(CHANNEL(2 * LPM / 24)), rel=1e-4)


@pytest.mark.parametrize("flow_lpm", [0.2, 2.0, 12.0])
@pytest.mark.parametrize("ports", list(_ends().values()), ids=list(_ends()))
def test_mass_is_conserved(ports, flow_lpm):
    # common practice: what enters the inlet port leaves through the channels (to 1e-9), laminar to turbulent
    shallow = Header(PLATE, 2.5e-3, 6e-3)
    r = solve_split(uniform_manifold(16, shallow, shallow, CHANNEL, *ports), flow_lpm * LPM, RHO, MU)
    assert abs(np.sum(r.channel_flows) - flow_lpm * LPM) <= 1e-9 * flow_lpm * LPM
    assert np.all(r.channel_flows > 0)


def _developing_channel(width=1e-3, depth=3e-3, length=0.1, K=1.5):
    """A channel's drop from the project's own apparent-friction model (laminar developing to turbulent),
    as the caller will pass it."""
    A, D = width * depth, 2 * width * depth / (width + depth)
    alpha = min(width, depth) / max(width, depth)

    def dp(Q):
        V = Q / A
        Re = RHO * V * D / MU
        f = float(darcy_friction(Re, length, D, alpha, "rectangle").f)
        return (f * length / D + K) * RHO * V * V / 2
    return dp


@pytest.mark.parametrize("ports", list(_ends().values()), ids=list(_ends()))
@pytest.mark.parametrize("channel", ["laminar+quadratic", "developing"])
def test_pressure_balances_around_every_loop(ports, channel):
    # common practice (Kirchhoff's loop law): inlet header at the take-off - outlet header at the discharge
    # = the channel's drop at its own flow, for every channel, to the solver's tolerance.  The channel drop is
    # evaluated here from the channel's own function, not taken from the result.
    dp = CHANNEL if channel == "laminar+quadratic" else _developing_channel()
    header = Header(PLATE, 3e-3, 8e-3)
    m = uniform_manifold(20, header, Header(PLATE, 4e-3, 8e-3), dp, *ports)
    r = solve_split(m, 6 * LPM, RHO, MU)
    own = np.array([dp(q) for q in r.channel_flows])
    scale = float(np.mean(own))
    assert np.max(np.abs(r.inlet_pressure - r.outlet_pressure - own)) < 1e-9 * scale
    # the header pressures are relative to the inlet port, so the outlet port sits at -port_to_port: the
    # outlet header never lies below its own port by more than its own drop (combining flow falls toward the port)
    assert np.all(r.outlet_pressure >= -r.port_to_port - 1e-9 * scale)
    assert r.iterations <= 12


def test_hand_written_three_channel_model_agrees():
    # computed: the model's own equations (module docstring) written out by hand for three channels with a port
    # between channels 1 and 2 at the inlet and at the outlet end, laminar header friction from the Shah &
    # London series written here, momentum coefficients 1 (dividing) and 2 (combining); solved with
    # scipy.optimize.fsolve.  An independent coding of the same model (catches sign and side conventions).
    h = Header(0.03, 2e-3, 5e-3)
    y = (-0.01, 0.0, 0.01)
    ch = LinearQuadraticChannel(a=4e8, b=2e12)
    m = Manifold(h, h, y, (ch,) * 3, inlet_port=-0.005, outlet_port=0.01, friction_length=math.inf)
    Qt = 0.3 * LPM
    r = solve_split(m, Qt, RHO, MU)
    A, D = h.area, 2 * h.depth * h.width / (h.depth + h.width)
    fRe = _fRe_series(h.depth / h.width)

    def fric(F, dx):                      # drop in the +y direction over dx at flow F toward +y
        V = F / A
        return fRe * MU / (RHO * D) * dx / D * RHO * V / 2 if V else 0.0   # laminar: f = fRe/Re, f V|V| = fRe nu V / D

    def mom(k, V_far, V_port):
        return -k * RHO * (V_far**2 - V_port**2) / 2

    def eqs(x):
        q0, q1, q2, dP = x[0] * LPM, x[1] * LPM, x[2] * LPM, x[3] * 1e3
        # inlet: port at -0.005 between y0 and y1; flow left of port toward -y is q0, right of it q1 + q2
        p0 = +fric(-q0, 0.005) + mom(1.0, 0.0, -q0 / A)                  # march left from the port to y0
        p1 = -fric(q1 + q2, 0.005) + mom(1.0, q2 / A, (q1 + q2) / A)     # march right to y1
        p2 = p1 - fric(q2, 0.01) + mom(1.0, 0.0, q2 / A)                 # then on to y2
        # outlet: port at y2 (a channel node: no momentum there); flows toward +y: q0 then q0 + q1
        o2 = 0.0
        o1 = o2 + fric(q0 + q1, 0.01) + mom(2.0, q0 / A, (q0 + q1) / A)
        o0 = o1 + fric(q0, 0.01) + mom(2.0, 0.0, q0 / A)
        loops = [p - (o - dP) - float(ch(q)) for p, o, q in ((p0, o0, q0), (p1, o1, q1), (p2, o2, q2))]
        return [v / 1e3 for v in loops] + [(q0 + q1 + q2 - Qt) / LPM]

    sol = so.fsolve(eqs, [Qt / 3 / LPM] * 3 + [1.0], xtol=1e-13)
    assert np.allclose(r.channel_flows, np.array(sol[:3]) * LPM, rtol=1e-8, atol=0)
    assert r.port_to_port == pytest.approx(sol[3] * 1e3, rel=1e-8)


# ----------------------------------------------------------------- the trends the literature reports


def _profile(ports, header, n=20, flow=2.0, k=None, channel=CHANNEL, developed=False):
    kw = {} if k is None else {"k_divide": k[0], "k_combine": k[1]}
    if developed:
        kw["friction_length"] = math.inf
    return solve_split(uniform_manifold(n, header, header, channel, *ports, **kw), flow * LPM, RHO, MU)


def test_u_arrangement_starves_the_channels_far_from_the_ports():
    # published (from memory): Bajura & Jones (1976) and Bassiouny & Martin (1984, part I, U-type): with both
    # ports at one end the channels nearest the ports take the most flow and the flow falls away from them,
    # whether the header friction or the momentum (combining loss > dividing recovery) dominates.
    friction_only = _profile(_ends()["U"], Header(PLATE, 1.5e-3, 4e-3), flow=0.1, k=(0.0, 0.0))
    momentum = _profile(_ends()["U"], Header(PLATE, 3e-3, 8e-3), flow=3.0)
    for r in (friction_only, momentum):
        q = r.channel_flows
        assert np.all(np.diff(q) < 0), q
        assert r.min_to_mean < 0.95
    assert friction_only.min_to_mean == pytest.approx(friction_only.channel_flows[-1] / np.mean(
        friction_only.channel_flows))


def test_z_arrangement_momentum_dominated_feeds_the_last_channels():
    # published (from memory): Bajura & Jones (1976); Bassiouny & Martin (1984, part II, Z-type): when the
    # momentum terms dominate (short, wide header at high flow), the dividing header's pressure recovers toward
    # its closed end and the combining header's falls toward its port, so in a Z arrangement the flow rises
    # from the first channel to the last (the one nearest the outlet port).
    r = _profile(_ends()["Z"], Header(PLATE, 3e-3, 8e-3), flow=3.0)
    q = r.channel_flows
    assert np.all(np.diff(q) > 0), q
    assert q[-1] / np.mean(q) > 1.5


def test_z_arrangement_friction_dominated_is_symmetric_with_the_middle_starved():
    # computed: with identical headers, linear (laminar) friction and no momentum term, a Z network is mapped
    # onto itself by reflecting it across the centre line and reversing the flow, and the reciprocity of a linear
    # network then makes the split symmetric; the loop pressure inlet - outlet ~ dP - c (y - y^2/L) is lowest in
    # the middle, so the middle channels get least (the "parabolic" Z profile, Bassiouny & Martin 1984, part II,
    # from memory).
    linear = LinearQuadraticChannel(a=float(CHANNEL.a))
    r = _profile(_ends()["Z"], Header(PLATE, 1.5e-3, 4e-3), flow=0.1, k=(0.0, 0.0), channel=linear, developed=True)
    q = r.channel_flows
    assert np.allclose(q, q[::-1], rtol=1e-9, atol=0)
    assert np.argmin(q) in (9, 10)
    assert q[0] > q[5] > q[9]


def test_a_centred_port_splits_more_evenly_than_one_at_the_side():
    # common practice (the advice: centred or opposite ports): for the same plate, a centred inlet and
    # outlet halve each header's run and raise the least channel's share compared with a U at one side.
    header = Header(PLATE, 2.5e-3, 6e-3)
    side = _profile(_ends()["U"], header, flow=2.0)
    centred = _profile(_ends()["centred"], header, flow=2.0)
    assert centred.min_to_mean > side.min_to_mean
    # and a deeper plenum helps (common practice)
    deeper = _profile(_ends()["U"], Header(PLATE, 5e-3, 6e-3), flow=2.0)
    assert deeper.min_to_mean > side.min_to_mean


def test_default_header_friction_errs_toward_a_higher_drop():
    # published model form: Muzychka & Yovanovich (2009) apparent friction of a developing laminar flow is
    # never below the fully developed Shah & London value; the project's rule (common practice here) is that a
    # simplification errs toward a higher pressure: the default (developing over the header's length) gives the
    # higher port-to-port drop, U or Z, and in the U arrangement (where header friction only starves the far
    # channels) the lower least-channel share.  In a Z the extra friction can offset the momentum terms, so no
    # direction of the split is claimed there.
    header = Header(PLATE, 1.5e-3, 4e-3)
    for name in ("U", "Z"):
        default = _profile(_ends()[name], header, flow=0.1)
        developed = _profile(_ends()[name], header, flow=0.1, developed=True)
        assert max(default.header_reynolds) < 2300          # laminar headers: the length matters
        assert default.port_to_port > developed.port_to_port
        if name == "U":
            assert default.min_to_mean < developed.min_to_mean


# ----------------------------------------------------------------- independent fine-grained network


def _fine_network(header_in, header_out, y, a, ports, total, sub=8):
    """Linear laminar pipe network solved as one sparse system (nodal analysis), each header gap cut into
    ``sub`` elements: header conductance 2 D_h^2 A / (fRe mu dx) from the series above, channel conductance
    1/a.  Unknowns: the pressures of every inlet and outlet node, the outlet port held at 0."""
    y = np.asarray(y)
    rows, cols, vals = [], [], []
    b = []
    nodes = {}

    def line(header, port, tag):
        pts = np.union1d(y, [port])
        fine = np.unique(np.concatenate([np.linspace(p, q, sub + 1) for p, q in zip(pts[:-1], pts[1:])]))
        base = len(nodes)
        for i, p in enumerate(fine):
            nodes[(tag, i)] = base + i
        A = header.depth * header.width
        D = 2 * header.depth * header.width / (header.depth + header.width)
        G = 2 * D**2 * A / (_fRe_series(min(header.depth, header.width) / max(header.depth, header.width))
                            * MU * np.diff(fine))
        return fine, base, G

    fin, bin_, Gin = line(header_in, ports[0], "in")
    fout, bout, Gout = line(header_out, ports[1], "out")
    size = len(nodes)
    Y = sp.lil_matrix((size, size))
    for base, G in ((bin_, Gin), (bout, Gout)):
        for i, g in enumerate(G):
            u, v = base + i, base + i + 1
            Y[u, u] += g
            Y[v, v] += g
            Y[u, v] -= g
            Y[v, u] -= g
    ci = [bin_ + int(np.argmin(np.abs(fin - yy))) for yy in y]
    co = [bout + int(np.argmin(np.abs(fout - yy))) for yy in y]
    for u, v in zip(ci, co):
        Y[u, u] += 1 / a
        Y[v, v] += 1 / a
        Y[u, v] -= 1 / a
        Y[v, u] -= 1 / a
    rhs = np.zeros(size)
    rhs[bin_ + int(np.argmin(np.abs(fin - ports[0])))] = total
    ground = bout + int(np.argmin(np.abs(fout - ports[1])))
    keep = [i for i in range(size) if i != ground]
    Y = Y.tocsr()[keep][:, keep]
    p = np.zeros(size)
    p[keep] = spla.spsolve(Y.tocsc(), rhs[keep])
    flows = (p[ci] - p[co]) / a
    p_in_port = p[bin_ + int(np.argmin(np.abs(fin - ports[0])))]
    return flows, p_in_port


@pytest.mark.parametrize("ports", list(_ends().values()), ids=list(_ends()))
def test_agrees_with_an_independent_fine_grained_network(ports):
    # computed by our own solver: an independent sparse nodal solve of the same linear laminar network (header
    # friction only, no momentum term, linear channels), each header gap cut into 8 elements; the split and the
    # port-to-port drop agree to round-off.
    a = float(CHANNEL.a)
    hin, hout = Header(PLATE, 1.5e-3, 4e-3), Header(PLATE, 2e-3, 5e-3)
    m = uniform_manifold(16, hin, hout, LinearQuadraticChannel(a=a), *ports, k_divide=0.0, k_combine=0.0,
                         friction_length=math.inf)
    total = 0.1 * LPM                   # header Re below 2300: laminar, linear
    r = solve_split(m, total, RHO, MU)
    assert all(v.method == "Bajura & Jones" or "Shah" in v.method or "Muzychka" in v.method
               for v in r.methods)
    flows, dP = _fine_network(hin, hout, m.positions, a, ports, total)
    assert np.allclose(r.channel_flows, flows, rtol=1e-8, atol=0)
    assert r.port_to_port == pytest.approx(dP, rel=1e-8)
    assert r.min_to_mean < 0.99        # the case is not the trivial equal split


# ----------------------------------------------------------------- the result and bad input


def test_result_is_frozen_and_reports_its_methods():
    # common practice (project rule: one solve returns a frozen result)
    r = _profile(_ends()["U"], Header(PLATE, 2.5e-3, 6e-3))
    with pytest.raises(dataclasses.FrozenInstanceError):
        r.min_to_mean = 1.0
    with pytest.raises(ValueError):
        r.channel_flows[0] = 0.0
    assert r.arrangement == "U"
    assert r.methods[0].method == "Bajura & Jones"
    assert r.inlet_header_drop > 0 and r.outlet_header_drop > 0
    assert r.port_to_port > float(np.max(r.channel_drops)) - 1e-9


def test_bad_input_is_refused():
    # common practice: a one-line ValueError naming what is wrong
    h = Header(PLATE, 2e-3, 5e-3)
    with pytest.raises(ValueError, match="depth"):
        Header(PLATE, 0.0, 5e-3)
    with pytest.raises(ValueError, match="increasing"):
        Manifold(h, h, (0.01, 0.0), (CHANNEL,) * 2)
    with pytest.raises(ValueError, match="port"):
        Manifold(h, h, (-0.01, 0.01), (CHANNEL,) * 2, inlet_port=0.04)
    with pytest.raises(ValueError, match="total flow"):
        solve_split(uniform_manifold(4, h, h, CHANNEL), 0.0, RHO, MU)


def test_an_unsolvable_split_is_a_manifold_error():
    # common practice: a channel whose drop falls as its flow rises has no single balanced split from here;
    # the solver says so in one line instead of returning a wrong answer
    h = Header(PLATE, 1e-3, 2e-3)
    bad = LinearQuadraticChannel(a=-1e9, b=0.0)
    with pytest.raises(ManifoldError):
        solve_split(uniform_manifold(6, h, h, bad, -PLATE / 2, -PLATE / 2), 1 * LPM, RHO, MU)
