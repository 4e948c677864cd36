"""The shape of a design report: rows, sections, figures and findings (plain frozen records, no logic)."""
from __future__ import annotations

from dataclasses import dataclass, field


@dataclass(frozen=True)
class Row:
    label: str
    value: str
    unit: str = ""
    key: str = ""  #: the matching key of ``coldplate check --format json`` (for tracing and tests)


@dataclass(frozen=True)
class Figure:
    name: str  #: also the SVG file stem in the Markdown layout
    caption: str
    svg: str


@dataclass(frozen=True)
class Section:
    id: str
    title: str
    paragraphs: tuple[str, ...] = ()
    rows: tuple[Row, ...] = ()
    table: tuple[tuple[str, ...], ...] = ()  #: a free table: the first tuple is the header
    figures: tuple[Figure, ...] = ()


@dataclass(frozen=True)
class Finding:
    severity: str
    id: str
    message: str
    action: str


@dataclass(frozen=True)
class Report:
    title: str
    job: str
    units: str
    version: str
    source_name: str
    source_sha256: str
    source_text: str
    headline: tuple[Row, ...]
    findings: tuple[Finding, ...]
    sections: tuple[Section, ...] = field(default=())
