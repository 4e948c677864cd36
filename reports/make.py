"""Put a report together and write it: figures, content, layout, atomic file output.

The physics (the solved result, the flow curve and its fit) is computed by the caller in ``coldplate``; this
module only draws and lays out.  Files are written atomically: a temporary file in the target's directory,
then ``os.replace``; an existing file is replaced only when ``force`` is given.
"""
from __future__ import annotations

import os
import tempfile
from pathlib import Path

from coldplate.design.errors import DesignError

from . import plots
from .content import Report, build_report
from .display_units import DisplayUnits

FORMATS = {".html": "html", ".htm": "html", ".md": "markdown"}


def report_format(path: str | Path) -> str:
    suffix = Path(path).suffix.lower()
    if suffix not in FORMATS:
        raise DesignError("-o", f"cannot tell the report format from {str(path)!r}: end the name in .html or .md")
    return FORMATS[suffix]


def draw_figures(r, curve, fit, face, units: str = "si") -> dict[str, str]:
    """Every figure the result supports, as SVG text by name."""
    u = DisplayUnits(units)
    figs = {
        "breakdown": plots.draw(plots.breakdown, r, u, name="breakdown"),
        "profile": plots.draw(plots.profile, r, face, u, name="profile"),
        "flow": plots.draw(plots.flow_curves, curve, fit, u, name="flow"),
    }
    planning = r.planning
    if planning is not None and len(planning.use_curve.T_face):
        T_min, use_min = planning.T_face_at_min, planning.water_m3_per_year_min
        least = (T_min, use_min) if T_min is not None and use_min is not None else None
        figs["water"] = plots.draw(plots.water_use, planning.use_curve.T_face, planning.use_curve.m3_per_year,
                                   r.T_face_max, planning.water_m3_per_year, u, least,
                                   planning.face_limit, name="water")
    elif r.design.supply.once_through:
        figs["water"] = plots.draw(plots.water_use, curve.T_face, curve.water_m3_per_year, r.T_face_max,
                                   r.water_use_m3_per_year, u, name="water")
    module = r.module
    if module is not None:
        figs["module"] = plots.draw(plots.module_sweep, module, u, name="module")
    circuit = r.circuit
    if circuit is not None:
        figs["circuit"] = plots.draw(plots.system_curve, circuit, u, name="circuit")
    return figs


def make_report(r, curve, fit, face, *, units="si", version="", source_name="", source_bytes=b"") -> Report:
    figures = draw_figures(r, curve, fit, face, units)
    return build_report(r, curve, fit, figures=figures, units=units, version=version, source_name=source_name,
                        source_bytes=source_bytes)


def check_targets(paths, force: bool) -> None:
    """Refuse (DesignError) to replace an existing file unless ``force``; refuse a missing directory."""
    for p in map(Path, paths):
        if p.exists() and not force:
            raise DesignError("-o", f"{str(p)!r} exists; give --force to replace it")
        if p.exists() and not p.is_file():
            raise DesignError("-o", f"{str(p)!r} is not a file")
        if not p.parent.is_dir():
            raise DesignError("-o", f"directory {str(p.parent)!r} does not exist")


def write_atomic(path: str | Path, text: str) -> None:
    """Write text to a temporary file beside ``path`` and rename it into place."""
    path = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.name}.", suffix=".tmp", dir=path.parent)
    try:
        with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
        os.chmod(tmp, 0o644)
        os.replace(tmp, path)
    except BaseException:
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def write_report(rep: Report, out: str | Path, force: bool = False) -> list[Path]:
    """Lay out and write the report (format from the suffix); returns the files written."""
    from .html import render_html
    from .markdown import render_markdown

    out = Path(out)
    if report_format(out) == "html":
        files = {out: render_html(rep)}
    else:
        text, figs = render_markdown(rep, out.stem)
        files = {out: text, **{out.parent / name: svg for name, svg in figs.items()}}
    check_targets(files, force)
    for path, text in files.items():
        write_atomic(path, text)
    return list(files)
