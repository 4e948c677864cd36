"""The design report as one self-contained HTML file: inline CSS and SVG, no scripts, no fonts, no links out.

Layout only: the words and numbers come from :mod:`reports.content`.  Prints on A4 or Letter (the page size
is left to the printer; figures and tables are kept whole across page breaks).
"""
from __future__ import annotations

from html import escape

from .content import STANDING_CAUTION, Report, Section, finding_counts

CSS = """
:root { color-scheme: light; }
body { font-family: sans-serif; font-size: 10.5pt; line-height: 1.4; color: #111; background: #fff;
       max-width: 190mm; margin: 1.5em auto; padding: 0 1em; }
h1 { font-size: 1.6em; margin: 0 0 .2em; }
h2 { font-size: 1.2em; margin: 1.6em 0 .5em; border-bottom: 1px solid #999; padding-bottom: .15em; }
p.job { font-size: 1.1em; margin: .3em 0 .6em; }
p.trace, .small { color: #444; font-size: .85em; }
table { border-collapse: collapse; margin: .4em 0 .8em; }
th, td { border: 1px solid #bbb; padding: .2em .5em; vertical-align: top; text-align: left; }
th { background: #eee; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
table.methods td { font-size: .85em; }
figure { margin: .8em 0; break-inside: avoid; page-break-inside: avoid; }
figure svg { width: 100%; height: auto; display: block; }
figcaption { font-size: .85em; color: #333; }
.finding { border-left: 6px solid #777; padding: .3em .7em; margin: .5em 0; break-inside: avoid; }
.finding.danger { border-color: #a00; background: #fbeaea; }
.finding.warning { border-color: #d55e00; background: #fdf0e6; }
.finding.caution { border-color: #e69f00; background: #fef8e7; }
.finding.note { border-color: #0072b2; background: #eaf3fa; }
.severity { font-weight: bold; text-transform: uppercase; letter-spacing: .04em; }
.caution-box { border: 2px solid #111; padding: .5em .8em; margin: .8em 0; }
pre { background: #f5f5f5; padding: .6em; overflow-x: auto; font-size: .85em; white-space: pre-wrap; }
@media print { body { max-width: none; margin: 0; } h2 { break-after: avoid; } table { break-inside: avoid; } }
@page { margin: 14mm; }
"""


def _rows(rows) -> str:
    out = ['<table class="rows"><tbody>']
    for r in rows:
        key = f' data-key="{escape(r.key)}"' if r.key else ""
        out.append(f"<tr{key}><th scope=\"row\">{escape(r.label)}</th><td class=\"num\">{escape(r.value)}</td>"
                   f"<td>{escape(r.unit)}</td></tr>")
    out.append("</tbody></table>")
    return "\n".join(out)


def _cell(text: str) -> str:
    if text.startswith("OUTSIDE"):
        return f"<td><strong>{escape(text)}</strong></td>"
    try:
        float(text.replace(",", ""))
    except ValueError:
        return f"<td>{escape(text)}</td>"
    return f'<td class="num">{escape(text)}</td>'


def _table(table, css="") -> str:
    head, *body = table
    cls = f' class="{css}"' if css else ""
    out = [f"<table{cls}><thead><tr>" + "".join(f"<th>{escape(h)}</th>" for h in head) + "</tr></thead><tbody>"]
    for row in body:
        out.append("<tr>" + "".join(_cell(c) for c in row) + "</tr>")
    out.append("</tbody></table>")
    return "\n".join(out)


def _section(s: Section) -> str:
    out = [f'<section id="{escape(s.id)}">', f"<h2>{escape(s.title)}</h2>"]
    if s.id == "assumptions":
        out.append("<ul>" + "".join(f"<li>{escape(p)}</li>" for p in s.paragraphs) + "</ul>")
    else:
        out += [f"<p>{escape(p)}</p>" for p in s.paragraphs]
    if s.rows:
        out.append(_rows(s.rows))
    if s.table:
        out.append(_table(s.table, "methods" if s.id == "methods" else ""))
    for f in s.figures:
        out.append(f'<figure id="fig-{escape(f.name)}" role="img" aria-label="{escape(f.caption)}">{f.svg}'
                   f"<figcaption>{escape(f.caption)}</figcaption></figure>")
    out.append("</section>")
    return "\n".join(out)


def _results_and_findings(headline, findings) -> list[str]:
    """The report's summary: the headline table, the standing caution and the findings."""
    out = ['<section id="results"><h2>Results</h2>', _rows(headline), "</section>",
           f'<section id="findings"><h2>Findings ({finding_counts(findings)}), most severe first</h2>',
           f'<div class="caution-box">{escape(STANDING_CAUTION)}</div>']
    for f in findings:
        out.append(f'<div class="finding {escape(f.severity)}" data-id="{escape(f.id)}">'
                   f'<p><span class="severity">{escape(f.severity)}</span> · <code>{escape(f.id)}</code>: '
                   f"{escape(f.message)}</p><p><strong>What to do:</strong> {escape(f.action)}</p></div>")
    if not findings:
        out.append("<p>No findings.</p>")
    out.append("</section>")
    return out


#: The notebook summary's style, every rule scoped to its own box so the notebook's page is left as it is.
SUMMARY_CSS = "\n".join(f".coldplate-summary {rule}" for rule in (
    "table { border-collapse: collapse; margin: .4em 0 .8em; }",
    "th, td { border: 1px solid #bbb; padding: .2em .5em; text-align: left; }",
    "td.num { text-align: right; font-variant-numeric: tabular-nums; }",
    ".finding { border-left: 6px solid #777; padding: .2em .7em; margin: .4em 0; }",
    ".finding.danger { border-color: #a00; }", ".finding.warning { border-color: #d55e00; }",
    ".finding.caution { border-color: #e69f00; }", ".finding.note { border-color: #0072b2; }",
    ".caution-box { border: 2px solid #111; padding: .4em .8em; margin: .6em 0; }"))


def render_summary_html(title: str, job: str, headline, findings, version: str = "") -> str:
    """The report's summary (title, job line, results, findings) as an HTML fragment for a notebook: scoped
    style, no scripts (``Result._repr_html_``)."""
    return "\n".join([f'<div class="coldplate-summary"><style>{SUMMARY_CSS}</style>', f"<h3>{escape(title)}</h3>",
                      f"<p>{escape(job)}</p>", *_results_and_findings(headline, findings),
                      f'<p class="small">coldplate {escape(version)}</p></div>']) + "\n"


def render_html(rep: Report) -> str:
    units = "SI" if rep.units == "si" else "US customary"
    out = [
        "<!DOCTYPE html>",
        '<html lang="en"><head><meta charset="utf-8">',
        '<meta name="viewport" content="width=device-width, initial-scale=1">',
        f'<meta name="generator" content="coldplate {escape(rep.version)}">',
        f"<title>{escape(rep.title)}: cold plate design report</title>",
        f"<style>{CSS}</style></head><body>",
        "<header>",
        f"<h1>{escape(rep.title)}</h1>",
        f'<p class="job">{escape(rep.job)}</p>',
        f'<p class="trace">coldplate {escape(rep.version)} · design file {escape(rep.source_name)} · '
        f'SHA-256 <code>{escape(rep.source_sha256)}</code> · units: {units}</p>',
        "</header>",
        *_results_and_findings(rep.headline, rep.findings),
    ]
    out += [_section(s) for s in rep.sections]
    out += [
        '<section id="trace"><h2>Traceability</h2>',
        f"<p>Software: coldplate {escape(rep.version)}. Design file: {escape(rep.source_name)}, "
        f"SHA-256 <code>{escape(rep.source_sha256)}</code>. The design file as read:</p>",
        f"<pre>{escape(rep.source_text)}</pre>",
        "</section>",
        "</body></html>",
    ]
    return "\n".join(out) + "\n"
