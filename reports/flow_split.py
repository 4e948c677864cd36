"""The flow split across a channel plate's channels in the text summary, the JSON and the design report.

Only formatting: every number comes from the result (``Result.channel_flows``, ``flow_split_min_to_mean``,
``header_pressure_drop``, ``port_arrangement``, solved in ``coldplate.plate.split``).  Nothing is shown for a
result without a split (one channel, no plenum, or a passage other than channels).
"""
from __future__ import annotations

from .display_units import DisplayUnits, format_number
from .report_model import Row, Section


def has_split(r) -> bool:
    return bool(getattr(r, "channel_flows", ()))


def split_dict(r) -> dict:
    """The JSON keys (SI): per-channel flows, min over mean and the header drops; nulls without a split."""
    if not has_split(r):
        return {"channel_flows_m3_per_s": None, "flow_split_min_to_mean": None, "header_pressure_drop_Pa": None}
    inlet, outlet = r.header_pressure_drop
    return {"channel_flows_m3_per_s": list(r.channel_flows), "flow_split_min_to_mean": r.flow_split_min_to_mean,
            "header_pressure_drop_Pa": {"inlet": inlet, "outlet": outlet},
            "port_arrangement": r.port_arrangement}


def least_and_most(r) -> tuple[int, int]:
    """The 1-based numbers of the least- and the most-fed channel (counted from the right of the flow)."""
    q = r.channel_flows
    return q.index(min(q)) + 1, q.index(max(q)) + 1


def split_rows(r, u: DisplayUnits) -> list[tuple[str, str, str]]:
    """Rows (quantity, value, unit and note) for the text summary's result table."""
    if not has_split(r):
        return []
    low, high = least_and_most(r)
    n = len(r.channel_flows)
    inlet, outlet = r.header_pressure_drop
    mean = sum(r.channel_flows) / n
    return [
        ("flow split, least / mean", f"{r.flow_split_min_to_mean:.3f}",
         f"channel {low} of {n} least fed, {100 * max(r.channel_flows) / mean:.1f} % of the mean in channel "
         f"{high}; ports {r.port_arrangement}"),
        ("header pressure change", f"{u.fmt('pressure', inlet)} / {u.fmt('pressure', outlet)}",
         f"{u.label('pressure')}  along the inlet / outlet plenum"),
    ]


def split_section(r, u: DisplayUnits, figures) -> Section | None:
    """The report's section: what the split is, a row per channel, the figure."""
    if not has_split(r):
        return None
    n = len(r.channel_flows)
    mean = sum(r.channel_flows) / n
    low, _ = least_and_most(r)
    inlet, outlet = r.header_pressure_drop
    paras = (
        f"The {n} channels share {u.text('flow', sum(r.channel_flows))} through the inlet and outlet plenums "
        f"(ports {r.port_arrangement}). The least-fed channel, number {low} counted from the right of the flow, "
        f"gets {100 * r.flow_split_min_to_mean:.1f} % of the mean; the hot spot is computed with every channel at "
        "its flow. The pressure along the inlet plenum changes by "
        f"{u.text('pressure', inlet)}, along the outlet plenum by {u.text('pressure', outlet)}.",
        "At least 80 % of the mean in every channel is a common design aim (common practice).",
    )
    rows = tuple(Row(f"channel {i + 1}", u.fmt("flow", q, 4), f"{u.label('flow')}  ({100 * q / mean:.1f} % of the mean)")
                 for i, q in enumerate(r.channel_flows))
    rows += (Row("least / mean", format_number(r.flow_split_min_to_mean), ""),)
    return Section("flow-split", "Flow split across the channels", paras, rows=rows, figures=figures)
