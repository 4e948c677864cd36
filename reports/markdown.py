"""The design report as Markdown, its figures as SVG files beside it (``<stem>.<figure>.svg``).

Layout only: the words and numbers come from :mod:`reports.content`, as in the HTML report.

Every piece of text is escaped (:func:`md`): many Markdown viewers render HTML, so a title or part name such as
``<script>`` must reach the reader as text, and Markdown's own marks in it ([links], *emphasis*, `code`) as
the characters typed.  The design file is quoted in a code fence longer than any run of backticks inside it.
"""
from __future__ import annotations

import re
from urllib.parse import quote

from .content import STANDING_CAUTION, Report, Section, finding_counts

_HTML = {"&": "&amp;", "<": "&lt;", ">": "&gt;"}
_MARKS = re.compile(r"([\\`*_\[\]|!#~])")


def md(text) -> str:
    """Text as Markdown shows it literally: HTML characters as entities, Markdown marks backslash-escaped."""
    text = " ".join(str(text).splitlines())
    text = "".join(_HTML.get(c, c) for c in text)
    return _MARKS.sub(r"\\\1", text)


def _cell(text: str) -> str:
    return md(text)


def _fence(text: str) -> str:
    longest = max((len(m) for m in re.findall(r"`+", text)), default=0)
    return "`" * max(3, longest + 1)


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
    out = [f"## {md(s.title)}", ""]
    if s.id == "assumptions":
        out += [f"- {md(p)}" for p in s.paragraphs] + [""]
    else:
        for p in s.paragraphs:
            out += [md(p), ""]
    if s.rows:
        out += _rows(s.rows)
    if s.table:
        out += _table(s.table)
    for f in s.figures:
        out += [f"![{md(f.caption)}]({quote(figure_file(stem, f.name))})", ""]
    return out


def render_markdown(rep: Report, stem: str) -> tuple[str, dict[str, str]]:
    """The Markdown text and the figure files it links to ({file name: SVG text})."""
    units = "SI" if rep.units == "si" else "US customary"
    out = [f"# {md(rep.title)}", "", md(rep.job), "",
           f"*coldplate {md(rep.version)} · design file {md(rep.source_name)} · SHA-256 `{rep.source_sha256}` · "
           f"units: {units}*", "", "## Results", ""]
    out += _rows(rep.headline)
    out += [f"## Findings ({finding_counts(rep.findings)}), most severe first", "", f"> {md(STANDING_CAUTION)}", ""]
    for f in rep.findings:
        out += [f"- **{f.severity.upper()}** `{f.id}`: {md(f.message)}", f"  *What to do:* {md(f.action)}"]
    out += ["" if rep.findings else "No findings.", ""]
    files = {}
    fence = _fence(rep.source_text)
    for s in rep.sections:
        out += _section(s, stem)
        for f in s.figures:
            files[figure_file(stem, f.name)] = f.svg
    out += ["## Traceability", "",
            f"Software: coldplate {md(rep.version)}. Design file: {md(rep.source_name)}, SHA-256 "
            f"`{rep.source_sha256}`. The design file as read:", "",
            fence + "toml", rep.source_text.rstrip("\n"), fence, ""]
    return "\n".join(out), files
