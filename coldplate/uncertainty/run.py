"""The wiring: a checked result plus its band.  The command line (and the report) call this after the check;
the check itself never does, so
 ``coldplate.check`` stays below this folder in the layers."""
from __future__ import annotations

from dataclasses import replace

from coldplate.check import solve
from coldplate.design.reader import design_from_dict, load_data
from coldplate.findings.base import SEVERITIES
from coldplate.uncertainty.findings import RULES
from coldplate.uncertainty.reader import read_uncertainty


def attach(result, band):
    """``result`` with ``uncertainty`` set to ``band`` and the band's findings merged in, most severe first."""
    with_u = replace(result, uncertainty=band)
    extra = [f for rule in RULES for f in rule(with_u)]
    rank = {s: i for i, s in enumerate(SEVERITIES)}
    return replace(with_u, findings=tuple(sorted((*result.findings, *extra), key=lambda f: rank[f.severity])))


def check_data(data: dict, confidence: float | None = None, model: str = "field"):
    """Read, check and band a design file's data; the ``[uncertainty]`` table is read before anything is solved
    (a bad entry is a one-line DesignError, nothing computed)."""
    design = design_from_dict(data)
    spec = read_uncertainty(data, design, confidence)
    result = solve(design, model=model)
    if spec is None:
        return result
    from coldplate.uncertainty.propagate import propagate  # the evaluator: only when a band is asked for

    return attach(result, propagate(design, result, spec, data))


def check_file_with_band(path, confidence: float | None = None, model: str = "field"):
    """``coldplate check`` with the band: the Python API (``coldplate.check_file`` stays the nominal check);
    ``model`` is the nominal check's plate model (the band's samples run on the network, anchored to it)."""
    return check_data(load_data(path), confidence, model)
