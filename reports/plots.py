"""Figures for the reports: matplotlib drawn to SVG strings that can sit inline in an HTML page.

Formatting only: every number plotted comes from a result or a curve computed in ``coldplate``.  The style is
plain: white ground, a colour-blind-safe palette (Okabe & Ito) with line styles and markers that also tell the
series apart in grey print, labelled axes with units.  Text is drawn as paths (no font is loaded by the
viewer), ids are prefixed per figure so several figures can share one page, and output is deterministic
(fixed hash salt, no date).  matplotlib is imported here only, never on the ``coldplate check`` path.
"""
from __future__ import annotations

import io
import math
import re

import matplotlib
import numpy as np
from matplotlib.figure import Figure
from matplotlib.ticker import FuncFormatter, LogLocator, NullFormatter

from .display_units import DisplayUnits

#: Okabe & Ito (2008) palette, safe for the common colour-vision deficiencies.
BLUE, VERMILION, GREEN, ORANGE, SKY, PURPLE, BLACK = (
    "#0072B2", "#D55E00", "#009E73", "#E69F00", "#56B4E9", "#CC79A7", "#000000")

_STYLE = {
    "svg.fonttype": "path",
    "svg.hashsalt": "coldplate",
    "font.family": "sans-serif",
    "font.size": 9.0,
    "axes.grid": True,
    "grid.color": "#d9d9d9",
    "grid.linewidth": 0.6,
    "axes.spines.top": False,
    "axes.spines.right": False,
    "axes.titlesize": 10.0,
    "axes.titleweight": "bold",
    "legend.frameon": False,
    "lines.linewidth": 1.8,
    "axes.axisbelow": True,
}
WIDTH_IN = 7.0  #: fits an A4 or Letter page with margins


def _figure(height_in: float = 3.2, ncols: int = 1) -> tuple[Figure, list]:
    fig = Figure(figsize=(WIDTH_IN, height_in), layout="constrained")
    axes = [fig.add_subplot(1, ncols, i + 1) for i in range(ncols)]
    return fig, axes


def _svg(fig: Figure, name: str) -> str:
    """The figure as an SVG element (no XML prolog), its ids prefixed with ``name``."""
    buf = io.StringIO()
    with matplotlib.rc_context({"svg.hashsalt": name}):
        fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    text = buf.getvalue()
    text = text[text.index("<svg"):]
    text = re.sub(r"\s*<metadata>.*?</metadata>", "", text, flags=re.S)  # RDF block: links out, says nothing
    ids = set(re.findall(r'\bid="([^"]+)"', text))
    for old in sorted(ids, key=len, reverse=True):
        new = f"{name}-{old}"
        text = text.replace(f'id="{old}"', f'id="{new}"').replace(f"#{old})", f"#{new})") \
            .replace(f'"#{old}"', f'"#{new}"')
    return text


def _plain_log(axis) -> None:
    """A log axis labelled 0.5, 1, 2, 5, 10 ... in plain numbers."""
    axis.set_major_locator(LogLocator(base=10.0, subs=(1.0, 2.0, 5.0)))
    axis.set_major_formatter(FuncFormatter(lambda v, _: f"{v:g}"))
    axis.set_minor_formatter(NullFormatter())


def draw(func, *args, name: str) -> str:
    """Run a drawing function under the report style and return the SVG text."""
    with matplotlib.rc_context(_STYLE):
        fig = func(*args)
        return _svg(fig, name)


# ------------------------------------------------------------------ figures


def breakdown(result, u: DisplayUnits) -> Figure:
    """Horizontal bars: each part of the thermal resistance, hottest point to inlet water."""
    names = [n for n, _ in result.resistances]
    values = [u.value("thermal_resistance", v) for _, v in result.resistances]
    total = u.value("thermal_resistance", result.R_th)
    fig, (ax,) = _figure(0.45 * len(names) + 1.2)
    y = list(range(len(names)))[::-1]
    ax.barh(y, values, color=BLUE, height=0.6)
    for yi, v in zip(y, values):
        ax.annotate(f"{v:.4g} ({100 * v / total:.0f} %)", (max(v, 0.0), yi), xytext=(4, 0),
                    textcoords="offset points", va="center", fontsize=8)
    ax.set_yticks(y, names)
    ax.grid(axis="y", visible=False)
    ax.set_xlabel(f"thermal resistance [{u.label('thermal_resistance')}]")
    ax.set_title(f"Thermal resistance breakdown: total {total:.4g} {u.label('thermal_resistance')}", loc="left")
    ax.set_xlim(min(0.0, min(values) * 1.1), max(values) * 1.35)
    return fig


def profile(result, face, u: DisplayUnits) -> Figure:
    """Water and mounting-face temperatures along the flow; the footprint shaded, the hottest point marked."""
    d = result.design
    x = u.value("length", result.profile.x)
    fig, (ax,) = _figure(3.2)
    x0 = 0.5 * (d.plate.length - d.heat.footprint_length)
    ax.axvspan(u.value("length", x0), u.value("length", x0 + d.heat.footprint_length), color="#eeeeee",
               label="heated footprint")
    ax.plot(u.value("length", face[0]), u.value("temperature", face[1]), color=VERMILION,
            label="mounting face (centre line)")
    ax.plot(x, u.value("temperature", result.profile.T_top), color=ORANGE, linestyle="--",
            label="plate top face (centre line)")
    ax.plot(x, u.value("temperature", result.profile.T_bulk), color=BLUE, linestyle="-.", label="water (bulk)")
    ax.plot([u.value("length", result.x_hot)], [u.value("temperature", result.T_face_max)], marker="v",
            color=BLACK, linestyle="none", markersize=7, label="hottest mounting face")
    ax.axhline(u.value("temperature", result.T_dew), color=PURPLE, linestyle=":",
               label=f"room {result.dew_kind}")
    ax.set_xlabel(f"distance from the inlet edge [{u.label('length')}]")
    ax.set_ylabel(f"temperature [{u.label('temperature')}]")
    ax.set_title("Temperatures along the flow path", loc="left")
    ax.legend(loc="center left", bbox_to_anchor=(1.0, 0.5), fontsize=8)
    return fig


def flow_curves(curve, fit, u: DisplayUnits) -> Figure:
    """R and dp against flow, with the fitted flow curves and the design point."""
    fig, (ax1, ax2) = _figure(3.2, ncols=2)
    V = u.value("flow", curve.V_dot)
    Vd = u.value("flow", curve.design_V_dot)
    Vf = np.geomspace(fit.V_min, fit.V_max, 120)
    for ax, kind, ys, yd, fitted, title in (
            (ax1, "thermal_resistance", curve.R_th, curve.design_R_th, fit.R_th(Vf), "Thermal resistance"),
            (ax2, "pressure", curve.dp, curve.design_dp, fit.dp(Vf), "Pressure drop (plate)")):
        ax.plot(V, u.value(kind, ys), color=BLUE, marker="o", markersize=3, linestyle="-", label="solved")
        ax.plot(u.value("flow", Vf), u.value(kind, fitted), color=ORANGE, linestyle="--", label="fitted curve")
        ax.plot([Vd], [u.value(kind, yd)], marker="D", color=VERMILION, markersize=7, linestyle="none",
                label="design point")
        ax.set_xscale("log")
        _plain_log(ax.xaxis)
        ax.set_xlabel(f"flow [{u.label('flow')}]")
        ax.set_ylabel(f"{title.lower()} [{u.label(kind)}]")
        ax.set_title(title, loc="left")
    ax2.set_yscale("log")
    _plain_log(ax2.yaxis)
    ax1.legend(fontsize=8)
    return fig


def water_use(T_face, m3_per_year, design_T, design_use, u: DisplayUnits, least=None, face_limit=None) -> Figure:
    """Once-through water use against the hottest mounting-face temperature, the operating point marked;
    ``least`` = (T_face, m3/year) at the least flow meeting the limits, ``face_limit`` the limit [K]."""
    fig, (ax,) = _figure(3.0)
    ax.plot(u.value("temperature", T_face), u.value("volume_per_year", m3_per_year), color=GREEN, marker="o",
            markersize=3, label="over the flow range")
    ax.plot([u.value("temperature", design_T)], [u.value("volume_per_year", design_use)], marker="D",
            color=VERMILION, markersize=7, linestyle="none", label="operating point")
    if least is not None:
        ax.plot([u.value("temperature", least[0])], [u.value("volume_per_year", least[1])], marker="s",
                color=BLUE, markersize=7, linestyle="none", label="least flow meeting the limits")
    if face_limit is not None:
        ax.axvline(u.value("temperature", face_limit), color=BLACK, linestyle=":", label="mounting-face limit")
    ax.set_yscale("log")
    _plain_log(ax.yaxis)
    ax.set_xlabel(f"hottest mounting face [{u.label('temperature')}]")
    ax.set_ylabel(f"water use [{u.label('volume_per_year')}]")
    ax.set_title("Water use against mounting-face temperature", loc="left")
    ax.legend(fontsize=8)
    return fig


def module_sweep(module, u: DisplayUnits) -> Figure:
    """Thermoelectric current sweep: face temperatures and COP against current; coldest and operating marked."""
    s = module.sweep
    fig, (ax1, ax2) = _figure(3.8, ncols=2)
    ax1.plot(s.current, u.value("temperature", s.T_cold), color=BLUE, label="cold face")
    ax1.plot(s.current, u.value("temperature", s.T_hot), color=VERMILION, linestyle="--", label="hot face")
    ax1.axvline(module.coldest_current, color=BLACK, linestyle=":", linewidth=1.0)
    ax1.plot([module.current], [u.value("temperature", module.T_cold)], marker="D", color=BLACK,
             linestyle="none", label="operating point")
    ax1.axhline(u.value("temperature", module.T_dew), color=PURPLE, linestyle=":", label="room dew/frost point")
    limit = module.hot_side_limit
    if limit:
        ax1.axhline(u.value("temperature", limit), color=VERMILION, linestyle=":", linewidth=1.0,
                    label="hot-face limit")
    ax1.annotate("coldest", (module.coldest_current, 0.02), xycoords=("data", "axes fraction"),
                 xytext=(3, 0), textcoords="offset points", fontsize=8)
    ax1.set_xlabel("current per module [A]")
    ax1.set_ylabel(f"temperature [{u.label('temperature')}]")
    ax1.set_title("Module faces against current", loc="left")
    ax1.legend(fontsize=8, loc="upper center", bbox_to_anchor=(0.5, -0.2), ncol=2)
    ax2.plot(s.current, s.cop, color=GREEN, label="COP")
    cops = np.asarray(s.cop, dtype=float)
    cops = cops[np.isfinite(cops)]
    if cops.size and np.isfinite(module.cop):  # COP soars as the current goes to zero: show the useful part
        ax2.set_ylim(0.0, min(float(cops.max()) * 1.05, max(3.0, 4.0 * module.cop)))
    ax2.axvline(module.best_cop_current, color=GREEN, linestyle=":", linewidth=1.0)
    ax2.set_xlabel("current per module [A]")
    ax2.set_ylabel("coefficient of performance [-]")
    ax2b = ax2.twinx()
    ax2b.plot(s.current, u.value("power", s.power), color=ORANGE, linestyle="--", label="electrical power")
    ax2b.set_ylabel(f"electrical power, array [{u.label('power')}]")
    ax2b.grid(False)
    ax2.set_title("COP and power against current", loc="left")
    lines = ax2.get_lines()[:1] + ax2b.get_lines()
    ax2.legend(lines, [ln.get_label() for ln in lines], fontsize=8, loc="upper center", bbox_to_anchor=(0.5, -0.2),
               ncol=2)
    return fig


def system_curve(circuit, u: DisplayUnits) -> Figure:
    """Whole-circuit and plate pressure drop against flow, the pump curve, the operating point."""
    c = circuit.curve
    fig, (ax,) = _figure(3.2)
    V = u.value("flow", c.V_dot)
    ax.plot(V, u.value("pressure", c.dp_circuit), color=BLUE, label="system (whole circuit)")
    ax.plot(V, u.value("pressure", c.dp_plate), color=SKY, linestyle="-.", label="plate alone")
    if circuit.pump is not None:
        ax.plot(u.value("flow", circuit.pump.V_dot), u.value("pressure", circuit.pump.dp), color=VERMILION,
                linestyle="--", label="pump")
    if circuit.supply_pressure is not None:
        if circuit.pump is None:
            ax.axhline(u.value("pressure", circuit.supply_pressure), color=VERMILION, linestyle="--",
                       label="supply pressure")
        ax.plot([u.value("flow", circuit.V_dot)], [u.value("pressure", circuit.supply_pressure)], marker="D",
                color=BLACK, linestyle="none", markersize=7, label="operating point")
    else:
        ax.axvline(u.value("flow", circuit.V_dot), color=BLACK, linestyle=":", label="operating flow")
    ax.set_xlabel(f"flow [{u.label('flow')}]")
    ax.set_ylabel(f"pressure [{u.label('pressure')}]")
    ax.set_title(f"Supply circuit ({circuit.drive} drive)", loc="left")
    ax.legend(fontsize=8)
    return fig


# ------------------------------------------------------------------ the plate seen from above, and its field

#: The sequential colour map of the temperature map: perceptually uniform and readable with the common
#: colour-vision deficiencies (Nuñez, Anderton & Renslow 2018, from memory); never a rainbow.
FACE_CMAP = "cividis"
#: Isotherms drawn on the temperature map.
ISOTHERMS = 8


def _passage_outline(ax, result, L: float, W: float) -> None:
    """The passage under the face, in display units: channels and plenums, the tube's passes, or the cavity."""
    from matplotlib.patches import Arc, Circle, Rectangle

    d, p = result.design, result.design.passage
    off = result.geometry.cooled_offset * L / d.plate.length
    ports = []
    if p.kind == "channels":
        pitch = (W - p.count * p.width * W / d.plate.width) / (p.count + 1)
        w = p.width * W / d.plate.width
        for i in range(p.count):
            y0 = -W / 2 + pitch * (i + 1) + w * i
            ax.add_patch(Rectangle((off, y0), L - 2 * off, w, facecolor="#cfe3f3", edgecolor=SKY, linewidth=0.5,
                                   label="channels" if i == 0 else None))
        if off > 0:
            for x in (0.0, L - off):
                ax.add_patch(Rectangle((x, -W / 2), off, W, facecolor="#e7f0f7", edgecolor=SKY, linewidth=0.6,
                                       hatch="///", label="plenums" if x == 0.0 else None))
        if p.port_diameter:
            ports = [(off / 2 if off else 0.0, p.port_diameter * L / d.plate.length),
                     (L - off / 2 if off else L, p.port_diameter * L / d.plate.length)]
    elif p.kind == "tube":  # passes along the plate, return bends beyond its ends (coldplate.plate.passages.tube)
        from matplotlib.patches import Wedge

        k = W / d.plate.width
        pitch, do = 2 * (p.bend_radius or 0.0) * k, p.outer_diameter * k
        ys = [(i - (p.passes - 1) / 2) * pitch for i in range(p.passes)]
        for i, y in enumerate(ys):
            ax.add_patch(Rectangle((0, y - do / 2), L, do, facecolor="#cfe3f3", edgecolor=SKY, linewidth=0.6,
                                   label="tube (serpentine)" if i == 0 else None))
        for i in range(p.passes - 1):
            x = L if i % 2 == 0 else 0.0
            ax.add_patch(Wedge((x, (ys[i] + ys[i + 1]) / 2), pitch / 2 + do / 2, -90 if x else 90, 90 if x else 270,
                               width=do, facecolor="#cfe3f3", edgecolor=SKY, linewidth=0.6))
    else:  # cavity: one pocket under the whole face, a port at each end on the centre line
        ax.add_patch(Rectangle((0.02 * L, -0.48 * W), 0.96 * L, 0.96 * W, facecolor="#e7f0f7", edgecolor=SKY,
                               linewidth=0.8, linestyle="--", label="cavity"))
        ports = [(0.04 * L, p.port_diameter * L / d.plate.length), (0.96 * L, p.port_diameter * L / d.plate.length)]
    for i, (x, dia) in enumerate(ports):
        ax.add_patch(Circle((x, 0.0), dia / 2, facecolor="white", edgecolor=BLUE, linewidth=1.0,
                            label="ports" if i == 0 else None))


def _sources_on(ax, result, u: DisplayUnits, *, filled: bool) -> None:
    """Every source's rectangle with its name (display lengths)."""
    from matplotlib.patches import Rectangle

    for s in result.design.sources:
        x0, x1, y0, y1 = (u.value("length", e) for e in s.edges())
        ax.add_patch(Rectangle((x0, y0), x1 - x0, y1 - y0, facecolor=ORANGE if filled else "none",
                               alpha=0.85 if filled else 1.0, edgecolor=BLACK if filled else "white",
                               linewidth=1.0))
        ax.annotate(s.name, ((x0 + x1) / 2, (y0 + y1) / 2), ha="center", va="center", fontsize=8,
                    color=BLACK if filled else "white", gid=f"source-label-{s.name}")


def _axes_arrows(ax, L: float, W: float) -> None:
    """The flow's direction (+x, from the inlet edge) and +y, drawn beside the plate."""
    ax.annotate("", (0.25 * L, -0.62 * W), (0.0, -0.62 * W),
                arrowprops={"arrowstyle": "-|>", "color": BLUE, "linewidth": 1.4})
    ax.annotate("flow, +x", (0.27 * L, -0.62 * W), va="center", fontsize=8, color=BLUE)
    ax.annotate("", (-0.15 * L, 0.3 * W), (-0.15 * L, 0.0),
                arrowprops={"arrowstyle": "-|>", "color": BLACK, "linewidth": 1.2})
    ax.annotate("+y", (-0.15 * L, 0.33 * W), ha="center", fontsize=8)


def plate_top(result, u: DisplayUnits) -> Figure:
    """The plate seen from above, to scale: outline, passage, plenums and ports, every source labelled."""
    from matplotlib.patches import Rectangle

    d = result.design
    L, W = u.value("length", d.plate.length), u.value("length", d.plate.width)
    fig, (ax,) = _figure(min(1.2 + 5.0 * W / L, 6.0))
    ax.grid(False)
    ax.add_patch(Rectangle((0, -W / 2), L, W, facecolor="#f4f4f4", edgecolor=BLACK, linewidth=1.4,
                           gid="plate-outline", label="plate"))
    _passage_outline(ax, result, L, W)
    _sources_on(ax, result, u, filled=True)
    ax.axhline(0.0, color="#888888", linestyle=(0, (6, 4)), linewidth=0.6)
    _axes_arrows(ax, L, W)
    ax.set_xlim(-0.2 * L, 1.12 * L)
    ax.set_ylim(-0.72 * W, 0.6 * W)
    ax.set_aspect("equal")
    ax.set_xlabel(f"x, from the inlet edge [{u.label('length')}]")
    ax.set_ylabel(f"y, across [{u.label('length')}]")
    ax.set_title("The plate from above (to scale), heat sources on the mounting face", loc="left")
    ax.legend(loc="center left", bbox_to_anchor=(1.0, 0.5), fontsize=8)
    return fig


def face_map(result, u: DisplayUnits) -> Figure:
    """The mounting-face temperature map (plate side of any interface) with labelled isotherms, each source
    outlined and its hottest point marked; colour bar in the display's temperature unit."""
    f, d = result.field, result.design
    L, W = u.value("length", d.plate.length), u.value("length", d.plate.width)
    X, Y = u.value("length", f.face_x), u.value("length", f.face_y)
    T = u.value("temperature", f.face).T  # (ny, nx): y up
    fig, (ax,) = _figure(min(1.4 + 5.0 * W / L, 6.0))
    ax.grid(False)
    # drawn as an embedded image: 10⁴ cells as vector paths would make a page of megabytes
    mesh = ax.pcolormesh(X, Y, T, cmap=FACE_CMAP, shading="nearest", rasterized=True)
    levels = np.linspace(float(T.min()), float(T.max()), ISOTHERMS + 2)[1:-1]
    iso = ax.contour(X, Y, T, levels=levels, colors="white", linewidths=0.7)
    ax.clabel(iso, fmt=lambda v: f"{v:.1f}", fontsize=7, colors="white")
    _sources_on(ax, result, u, filled=False)
    for s in result.sources:
        hx, hy = (u.value("length", v) for v in s.hottest_at)
        ax.plot([hx], [hy], marker="x", color=VERMILION, markersize=7, markeredgewidth=2.0, linestyle="none",
                gid=f"hottest-{s.name}")
    ax.set_xlim(0, L)
    ax.set_ylim(-W / 2, W / 2)
    ax.set_aspect("equal")
    bar = fig.colorbar(mesh, ax=ax, shrink=0.9)
    bar.set_label(f"mounting face [{u.label('temperature')}]")
    ax.set_xlabel(f"x, from the inlet edge [{u.label('length')}]")
    ax.set_ylabel(f"y, across [{u.label('length')}]")
    ax.set_title("Mounting-face temperature, plate side of the interface\n(× the hottest point of each source)",
                 loc="left")
    return fig


def coolant_along(result, u: DisplayUnits) -> Figure:
    """Each channel's coolant bulk temperature along the flow (``Result.field.bulk``), the sources' spans
    along the flow shaded."""
    from matplotlib import colormaps

    f = result.field
    fig, (ax,) = _figure(3.2)
    n = f.bulk.shape[0]
    colours = colormaps[FACE_CMAP](np.linspace(0.0, 0.85, max(n, 1)))
    spans = []
    for s in result.design.sources:
        x0, x1 = (u.value("length", e) for e in s.edges()[:2])
        row = sum(1 for a, b in spans if min(b, x1) > max(a, x0))  # names of sources side by side stack
        spans.append((x0, x1))
        ax.axvspan(x0, x1, color="#eeeeee")
        ax.annotate(s.name, ((x0 + x1) / 2, 0.98 - 0.07 * row), xycoords=("data", "axes fraction"), ha="center",
                    va="top", fontsize=7)
    x = u.value("length", f.bulk_x)
    for i in range(n):
        ax.plot(x, u.value("temperature", f.bulk[i]), color=colours[i], linewidth=1.0,
                label=f"channel {i + 1}" if i in (0, n - 1) else None, gid=f"channel-{i + 1}")
    ax.set_xlabel(f"distance from the inlet edge [{u.label('length')}]")
    ax.set_ylabel(f"coolant bulk temperature [{u.label('temperature')}]")
    ax.set_title(f"Coolant along the flow, each of {n} channels", loc="left")
    ax.legend(fontsize=8, loc="lower right")
    return fig


def air_sink(air, u: DisplayUnits) -> Figure:
    """The air sink's cut across the air flow drawn to scale (base and every fin), and the hottest faces of the
    water design and the air sink against the face limit."""
    from matplotlib.patches import Rectangle

    s = air.sink
    fig, (ax1, ax2) = _figure(3.4, ncols=2)
    k = u.value("length", 1.0)  # display length per metre
    ax1.add_patch(Rectangle((0.0, 0.0), s.width * k, s.base * k, facecolor=SKY, edgecolor=BLACK, linewidth=0.6,
                            label="base"))
    pitch = (s.width - s.fin_thickness) / (s.fins - 1)
    for i in range(s.fins):
        ax1.add_patch(Rectangle((i * pitch * k, s.base * k), s.fin_thickness * k, s.fin_height * k, facecolor=BLUE,
                                edgecolor=BLACK, linewidth=0.4, label="fins" if i == 0 else None))
    ax1.set_xlim(-0.05 * s.width * k, 1.05 * s.width * k)
    ax1.set_ylim(0.0, 1.08 * s.height * k)
    ax1.set_aspect("equal")
    ax1.set_xlabel(f"across the fins [{u.label('length')}]")
    ax1.set_ylabel(f"height [{u.label('length')}]")
    ax1.set_title(f"{s.fins} fins, to scale", loc="left")
    ax1.grid(False)
    names, values, colours = ["water design"], [u.value("temperature", air.water_face)], [BLUE]
    if math.isfinite(s.T_face_max):
        names.append("air sink")
        values.append(u.value("temperature", s.T_face_max))
        colours.append(VERMILION)
    ax2.bar(names, values, color=colours, hatch=None, width=0.5)
    ax2.axhline(u.value("temperature", air.face_limit), color=BLACK, linestyle="--", linewidth=1.0,
                label="face limit")
    ax2.set_ylabel(f"hottest mounting face [{u.label('temperature')}]")
    ax2.set_title("Hottest face", loc="left")
    ax2.legend(fontsize=8, loc="upper left")
    return fig


def tornado(band, u: DisplayUnits) -> Figure:
    """Tornado chart: for each input (largest swing on top) a bar from the hottest face at its low end to the
    face at its high end, around the nominal; the band's ends as dotted lines (``band``: Result.uncertainty)."""
    face = band.band("face")
    rows = [s for s in band.sensitivity if np.isfinite(s.low) and np.isfinite(s.high)]
    nominal = u.value("temperature", face.nominal)
    fig, (ax,) = _figure(0.42 * len(rows) + 1.4)
    y = list(range(len(rows)))[::-1]
    for yi, s in zip(y, rows):
        lo, hi = u.value("temperature", s.low), u.value("temperature", s.high)
        ax.barh(yi, lo - nominal, left=nominal, color=BLUE, height=0.6, label="input at its low end" if yi == y[0]
                else None)
        ax.barh(yi, hi - nominal, left=nominal, color=VERMILION, height=0.6, hatch="//",
                label="input at its high end" if yi == y[0] else None)
    ax.axvline(nominal, color=BLACK, linewidth=1.0, label="nominal")
    for q, x in ((band.lower_q, face.low), (band.upper_q, face.high)):
        if np.isfinite(x):
            ax.axvline(u.value("temperature", x), color=PURPLE, linestyle=":", label=f"{q * 100:g} % of the band")
    ax.set_yticks(y, [s.input for s in rows])
    ax.grid(axis="y", visible=False)
    ax.set_xlabel(f"hottest mounting face [{u.label('temperature')}]")
    ax.set_title(f"What drives the hottest face: {band.confidence * 100:g} % band, {band.samples} samples", loc="left")
    ax.legend(loc="lower right", fontsize=7)
    return fig


# ------------------------------------------------------------------ flow split across channels


def channel_flows(result, u: DisplayUnits) -> Figure:
    """Bars: the flow in each channel (counted from the right of the flow), the mean and 80 % of the mean (a
    common design aim, common practice); the least-fed channel drawn in the warning colour."""
    q = u.value("flow", np.asarray(result.channel_flows, dtype=float))
    mean = float(np.mean(q))
    low = int(np.argmin(q))
    fig, (ax,) = _figure(3.0)
    x = np.arange(1, q.size + 1)
    colours = [VERMILION if i == low else BLUE for i in range(q.size)]
    ax.bar(x, q, color=colours, width=0.7, label="flow in the channel")
    ax.axhline(mean, color=BLACK, linestyle="--", label="mean")
    ax.axhline(0.8 * mean, color=ORANGE, linestyle=":", label="80 % of the mean")
    ax.set_xlabel("channel (counted from the right of the flow)")
    ax.set_ylabel(f"flow [{u.label('flow')}]")
    ax.set_title(f"Flow per channel: least {100 * result.flow_split_min_to_mean:.1f} % of the mean "
                 f"(ports {result.port_arrangement})", loc="left")
    ax.set_ylim(0.0, max(float(np.max(q)), mean) * 1.15)
    if q.size <= 30:
        ax.set_xticks(x)
    ax.grid(axis="x", visible=False)
    ax.legend(loc="center left", bbox_to_anchor=(1.0, 0.5), fontsize=8)
    return fig
