"""Put a report together and write it: figures, content, layout, atomic file output.

The physics (the solved result, the flow curve and its fit) is computed by the caller in ``coldplate``; this
module only draws and lays out.  Files are written atomically: a temporary file in the target's directory,
then ``os.replace``; a Markdown report and its figures go through a temporary folder, all or none; an existing
file is replaced only when ``force`` is given; new files get the permissions the umask gives.
"""
from __future__ import annotations

import os
import shutil
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
        "plate": plots.draw(plots.plate_top, r, u, name="plate"),
    }
    if r.field is not None:
        figs["facemap"] = plots.draw(plots.face_map, r, u, name="facemap")
        if r.field.bulk.size:
            figs["coolant"] = plots.draw(plots.coolant_along, r, u, name="coolant")
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
    air = getattr(r, "air", None)
    if air is not None:
        figs["air"] = plots.draw(plots.air_sink, air, u, name="air")
    if r.uncertainty is not None and r.uncertainty.sensitivity:
        figs["tornado"] = plots.draw(plots.tornado, r.uncertainty, u, name="tornado")
    if getattr(r, "channel_flows", ()):  # the flow split across channels
        figs["flow_split"] = plots.draw(plots.channel_flows, r, u, name="flow_split")
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


#: Temporaries are named ``.<target name>.<process id>.tmp`` beside the target, so a later run can tell the
#: leftovers of a killed run (its process is gone) from those of a run still going.
_MANIFEST = ".targets"


def _temporary(path: Path) -> Path:
    return path.parent / f".{path.name}.{os.getpid()}.tmp"


def _alive(pid: int) -> bool:
    if pid == os.getpid():  # a leftover under our own id is from an earlier process with a reused id
        return False
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


def remove_leftovers(path: str | Path) -> None:
    """Remove what a killed run (its process gone) left for ``path``: its temporary file or folder, and the
    files it had moved into place from an unfinished folder (a Markdown report's figures without the report)."""
    path = Path(path)
    prefix = f".{path.name}."
    try:
        entries = list(path.parent.iterdir())
    except OSError:
        return
    for p in entries:
        pid = p.name[len(prefix):-len(".tmp")]
        if not (p.name.startswith(prefix) and p.name.endswith(".tmp") and pid.isdigit()) or _alive(int(pid)):
            continue
        if p.is_dir():
            try:
                names = (p / _MANIFEST).read_text(encoding="utf-8").splitlines()
            except OSError:
                names = []  # killed while filling the folder: nothing was moved yet
            if names and (p / names[0]).exists():  # the report itself (moved last) was not: remove the rest
                for n in names[1:]:
                    if n and "/" not in n and not (p / n).exists():
                        try:
                            (path.parent / n).unlink()
                        except FileNotFoundError:
                            pass
            shutil.rmtree(p, ignore_errors=True)
        else:
            try:
                p.unlink()
            except FileNotFoundError:
                pass


def _write_new(path: Path, text: str) -> None:
    """Create ``path`` (it must not exist) with the umask's permissions, as any new file gets."""
    fd = os.open(path, os.O_WRONLY | os.O_CREAT | os.O_EXCL, 0o666)
    with os.fdopen(fd, "w", encoding="utf-8", newline="\n") as fh:
        fh.write(text)


def write_atomic(path: str | Path, text: str) -> None:
    """Write text to a temporary file beside ``path`` and rename it into place (the umask sets the mode)."""
    path = Path(path)
    remove_leftovers(path)
    tmp = _temporary(path)
    try:
        _write_new(tmp, text)
        os.replace(tmp, path)
    except BaseException:  # Ctrl-C and SIGTERM (coldplate.cli raises it) too: no temporary is left
        try:
            os.unlink(tmp)
        except FileNotFoundError:
            pass
        raise


def write_together(files: dict[Path, str], force: bool = False) -> list[Path]:
    """Write several files beside each other (a Markdown report and its figures) all or none.

    They are written into a temporary folder beside them (then a list of their names), then moved into place,
    the first file last; on an interrupt the files already moved are removed again.  A run killed outright
    (SIGKILL) leaves its folder; the next run for the same report removes it, with the files it had moved.
    """
    paths = list(files)
    first = paths[0]
    remove_leftovers(first)
    check_targets(paths, force)
    stage = _temporary(first)
    moved: list[Path] = []
    try:
        os.mkdir(stage)
        for p, text in files.items():
            _write_new(stage / p.name, text)
        # written last: a folder with its list holds every file, so a name missing from it was moved
        _write_new(stage / _MANIFEST, "\n".join(p.name for p in paths) + "\n")
        for p in paths[1:] + paths[:1]:
            os.replace(stage / p.name, p)
            moved.append(p)
    except BaseException:
        for p in moved:
            try:
                p.unlink()
            except FileNotFoundError:
                pass
        raise
    finally:
        shutil.rmtree(stage, ignore_errors=True)
    return paths


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
    return write_together(files, force)
