"""Figures for the reports: matplotlib drawn to SVG strings that can sit inline in an HTML page.

Formatting only: every number plotted comes from a result or a curve computed in ``coldplate``.  The style is
plain: white ground, a colour-blind-safe palette (Okabe & Ito) with line styles and markers that also tell the
series apart in grey print, labelled axes with units.  Text is drawn as paths (no font is loaded by the
viewer), ids are prefixed per figure so several figures can share one page, and output is deterministic
(fixed hash salt, no date).  matplotlib is imported here only, never on the ``coldplate check`` path.
"""
from __future__ import annotations

import io
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
