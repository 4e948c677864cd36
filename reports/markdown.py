"""The design report as Markdown, its figures as SVG files beside it (``<stem>.<figure>.svg``).

Layout only: the words and numbers come from :mod:`reports.content`, as in the HTML report.
"""
from __future__ import annotations

from .content import STANDING_CAUTION, Report, Section, finding_counts


def _cell(text: str) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def _rows(rows) -> list[str]:
    out = ["| quantity | value | unit |", "|---|---:|---|"]
    out += [f"| {_cell(r.label.strip())} | {_cell(r.value)} | {_cell(r.unit)} |" for r in rows]
    return out + [""]


def _table(table) -> list[str]:
    head, *body = table
    out = ["| " + " | ".join(_cell(h) for h in head) + " |", "|" + "---|" * len(head)]
    out += ["| " + " | ".join(_cell(c) for c in row) + " |" for row in body]
    return out + [""]


def figure_file(stem: str, name: str) -> str:
    return f"{stem}.{name}.svg"


def _section(s: Section, stem: str) -> list[str]:
    out = [f"## {s.title}", ""]
    if s.id == "assumptions":
        out += [f"- {p}" for p in s.paragraphs] + [""]
    else:
        for p in s.paragraphs:
            out += [p, ""]
    if s.rows:
        out += _rows(s.rows)
    if s.table:
        out += _table(s.table)
    for f in s.figures:
        out += [f"![{f.caption}]({figure_file(stem, f.name)})", ""]
    return out


def render_markdown(rep: Report, stem: str) -> tuple[str, dict[str, str]]:
    """The Markdown text and the figure files it links to ({file name: SVG text})."""
    units = "SI" if rep.units == "si" else "US customary"
    out = [f"# {rep.title}", "", rep.job, "",
           f"*coldplate {rep.version} · design file {rep.source_name} · SHA-256 `{rep.source_sha256}` · "
           f"units: {units}*", "", "## Results", ""]
    out += _rows(rep.headline)
    out += [f"## Findings ({finding_counts(rep.findings)}), most severe first", "", f"> {STANDING_CAUTION}", ""]
    for f in rep.findings:
        out += [f"- **{f.severity.upper()}** `{f.id}`: {f.message}", f"  *What to do:* {f.action}"]
    out += ["" if rep.findings else "No findings.", ""]
    files = {}
    for s in rep.sections:
        out += _section(s, stem)
        for f in s.figures:
            files[figure_file(stem, f.name)] = f.svg
    out += ["## Traceability", "",
            f"Software: coldplate {rep.version}. Design file: {rep.source_name}, SHA-256 `{rep.source_sha256}`. "
            "The design file as read:", "", "```toml", rep.source_text.rstrip("\n"), "```", ""]
    return "\n".join(out), files
