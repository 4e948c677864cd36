"""Header variants of a channel search: ``[search]`` may list plenum depths and port positions.

The plenums' depth (``plenum_depth``) and the ports' offsets across the plate (``inlet_port``,
``outlet_port``: from the centre line, positive on the left of the flow, as in ``[passage]``) change the flow
split across the channels (:mod:`coldplate.plate.split`), not the channels themselves.  They are searched as
a few discrete variants: every combination of the values given is one variant, a copy of the design with
those values in ``[passage]``, evaluated over the whole channel grid by its own
:class:`~coldplate.sizing.evaluate.Evaluator` (the split is solved per variant); the search keeps one
trade-off front over all variants.  Variables not given keep the design file's value and are not written.
"""
from __future__ import annotations

import itertools
from dataclasses import replace

from coldplate.design.reader import Design
from coldplate.sizing.evaluate import Evaluator

#: The header variables a channel search may list (in this order in a candidate's values).
HEADER = ("plenum_depth", "inlet_port", "outlet_port")


def header_values(values: dict) -> dict:
    """The header variables among a candidate's values (SI)."""
    return {k: float(values[k]) for k in HEADER if k in values}


def variants(spec) -> list[dict]:
    """Every combination of the header axes the search lists, as dicts (one empty dict: none listed)."""
    names = [k for k in HEADER if k in spec.axes]
    return [dict(zip(names, map(float, combo))) for combo in itertools.product(*(spec.axes[k] for k in names))]


def with_header(design: Design, values: dict) -> Design:
    """The design with a variant's header values in its passage (unchanged for an empty dict)."""
    return replace(design, passage=replace(design.passage, **values)) if values else design


class Evaluators:
    """One :class:`Evaluator` per header variant of a design, each built on first use; ``first`` (optional) is
    the design's own, used for the variant that changes nothing."""

    def __init__(self, design: Design, first: Evaluator | None = None):
        self.design = design
        self._made = {(): first} if first is not None else {}

    def for_values(self, values: dict) -> Evaluator:
        """The evaluator of the variant that ``values`` (a candidate's values, or a variant) names."""
        h = header_values(values)
        key = tuple(sorted(h.items()))
        if key not in self._made:
            self._made[key] = Evaluator(with_header(self.design, h))
        return self._made[key]
