"""Several designs side by side (``coldplate check A.toml B.toml ...``) and what changed between two solves of
one design (``coldplate check FILE --watch``).  Formatting only: every number is a field of a result.

Rows: the headline figures (:data:`FIGURES`) and the finding counts by severity; columns: the designs.  In
each row whose figures differ and have a direction, the best and the worst are marked (lower is better: a
cooler face, less resistance, pressure drop and water, fewer findings; flow, velocity, Reynolds number, outlet
and notes are shown unmarked).  A design that could not be read or solved is
one line in its column (``error``); the others are compared without it.
"""
from __future__ import annotations

import csv
import io
import json
from dataclasses import dataclass

from .display_units import DisplayUnits, format_number

#: (label, display kind or "" for a plain number, result field, lower is better?).  Kept once: the
#: comparison, its CSV and the watch mode's "what changed" read the same rows.
FIGURES = (
    ("mounting face, hottest", "temperature", "T_face_max", True),
    ("thermal resistance", "thermal_resistance", "R_th", True),
    ("outlet water", "temperature", "T_out", None),
    ("pressure drop (plate)", "pressure", "dp", True),
    ("coolant flow", "flow", "V_dot", None),
    ("velocity in passage", "velocity", "velocity", None),
    ("Reynolds number", "", "Re", None),
    ("water use a day", "volume_per_day", "water_use_L_per_day", True),
)
BEST, WORST = "best", "worst"


@dataclass(frozen=True)
class Column:
    """One design of a comparison: its name (the file) and its result, or the one line saying why not."""

    name: str
    result: object = None
    error: str = ""


def figures(r) -> list[tuple[str, str, float, bool | None]]:
    """The headline figures of one result: (label, kind, SI value, lower is better?)."""
    return [(label, kind, float(getattr(r, attr)), lower) for label, kind, attr, lower in FIGURES]


def counts(r, severities) -> dict[str, int]:
    """Findings by severity, every severity present (zero when none)."""
    out = {s: 0 for s in severities}
    for f in r.findings:
        out[f.severity] = out.get(f.severity, 0) + 1
    return out


def _rows(columns, severities):
    """(label, unit label, kind, [SI value or None per column], lower is better?) for every row."""
    solved = [c.result for c in columns]
    rows = []
    for i, (label, kind, attr, lower) in enumerate(FIGURES):
        rows.append((label, kind, [None if r is None else figures(r)[i][2] for r in solved], lower))
    for s in severities:  # fewer is better, but for the least severe kind (a note is information)
        rows.append((f"{s} findings", "count", [None if r is None else counts(r, severities)[s] for r in solved],
                     True if s != severities[-1] else None))
    return rows


def marks(values, lower) -> list[str]:
    """"best" / "worst" for the columns at the row's extremes (none when the row has no direction, fewer than
    two values, or all values equal)."""
    given = [v for v in values if v is not None]
    if lower is None or len(given) < 2 or max(given) == min(given):
        return ["" for _ in values]
    best, worst = (min(given), max(given)) if lower else (max(given), min(given))
    return [BEST if v == best else WORST if v == worst else "" for v in values]


def _shown(u: DisplayUnits, kind: str, v) -> str:
    if v is None:
        return ""
    if kind == "count":
        return str(v)
    if kind == "":
        return f"{v:.0f}"
    return format_number(u.value(kind, v), kind)


def _label(u: DisplayUnits, kind: str) -> str:
    return "" if kind in ("", "count") else u.label(kind)


def render_comparison_text(columns, severities, units: str = "si") -> str:
    """The comparison as a text table: one row a figure, one column a design; (best) and (worst) marked."""
    u = DisplayUnits(units)
    head = ["", "unit", *[c.name for c in columns]]
    body = []
    for label, kind, values, lower in _rows(columns, severities):
        m = marks(values, lower)
        body.append([label, _label(u, kind),
                     *[(_shown(u, kind, v) + (f" ({mk})" if mk else "")) if c.result is not None else ""
                       for v, mk, c in zip(values, m, columns)]])
    if any(c.error for c in columns):
        body.append(["could not check", "", *[c.error for c in columns]])
    widths = [max(len(row[i]) for row in [head, *body]) for i in range(len(head))]
    line = lambda row: "  ".join(cell.ljust(w) for cell, w in zip(row, widths)).rstrip()  # noqa: E731
    out = [line(head), "  ".join("-" * w for w in widths)] + [line(row) for row in body]
    titles = [f"{c.name}: {c.result.design.title}" for c in columns if c.result is not None]
    return "\n".join(out + ([""] + titles if titles else [])) + "\n"


def render_comparison_csv(columns, severities) -> str:
    """The comparison as CSV in the SI display units (°C, kPa, L/min, named in each row's unit column): row,
    unit, one column per design, then the designs best and worst in the row."""
    u = DisplayUnits("si")
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["row", "unit", *[c.name for c in columns], "best", "worst"])
    for label, kind, values, lower in _rows(columns, severities):
        m = marks(values, lower)
        cells = [("" if v is None else f"{u.value(kind, v):.6g}" if kind not in ("", "count") else f"{v:.6g}")
                 for v in values]
        w.writerow([label, _label(u, kind), *cells, ";".join(c.name for c, mk in zip(columns, m) if mk == BEST),
                    ";".join(c.name for c, mk in zip(columns, m) if mk == WORST)])
    if any(c.error for c in columns):
        w.writerow(["could not check", "", *[c.error for c in columns], "", ""])
    return buf.getvalue()


def render_comparison_json(columns, version: str = "") -> str:
    """A list: for each design the check's JSON object (with its ``file``), or ``{file, error}``."""
    from .jsonout import check_to_dict

    items = [{"file": c.name, **check_to_dict(c.result, version)} if c.result is not None else
             {"file": c.name, "error": c.error} for c in columns]
    return json.dumps(items, indent=2, ensure_ascii=False)


def changes(before, after, units: str = "si") -> list[str]:
    """What changed between two solves of one design: figures up or down, findings added or gone."""
    u = DisplayUnits(units)
    out = []
    for (label, kind, old, _), (_, _, new, _) in zip(figures(before), figures(after)):
        if old == new or format_number(u.value(kind, old) if kind else old) == \
                format_number(u.value(kind, new) if kind else new):
            continue
        word = "up" if new > old else "down"
        unit = f" {_label(u, kind)}" if _label(u, kind) else ""
        out.append(f"{label} {word}: {_shown(u, kind, old)} -> {_shown(u, kind, new)}{unit}")
    old_ids = {f.id: f for f in before.findings}
    new_ids = {f.id: f for f in after.findings}
    out += [f"finding added: {f.severity} {f.id}" for i, f in new_ids.items() if i not in old_ids]
    out += [f"finding gone: {f.severity} {f.id}" for i, f in old_ids.items() if i not in new_ids]
    return out
