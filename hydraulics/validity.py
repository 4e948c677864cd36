"""Validity ranges of published correlations, kept once, as data.

Every correlation function in :mod:`hydraulics` and :mod:`coldplate` carries a
:class:`Validity` record attached with :func:`with_validity`.  The decorator
appends the range to the function's docstring, so the docstring, the solver's
range checks, the findings and the reports all read the same numbers.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

#: The one comparison rule for limits, everywhere (field ranges, correlation ranges, sizing limits): a value
#: within this relative distance of a limit is on the limit.  "725.1886886510462 psi" is 50 bar and
#: "0.19685039370078744 inch" is 5 mm, though their SI floats differ from the limit's in the last bits.
REL_TOL = 1e-9


def slack(limit):
    """How far past ``limit`` a value may lie and still count as on it (zero at a zero limit)."""
    limit = np.asarray(limit, dtype=float)
    out = np.where(np.isfinite(limit), REL_TOL * np.abs(limit), 0.0)
    return float(out) if out.ndim == 0 else out


def at_least(value, limit):
    """``value >= limit`` under the one comparison rule (numpy-friendly)."""
    return np.asarray(value) >= limit - slack(limit)


def at_most(value, limit):
    """``value <= limit`` under the one comparison rule (numpy-friendly)."""
    return np.asarray(value) <= limit + slack(limit)


def above(value, limit):
    """``value > limit`` beyond round-off: strictly above a zero limit, above the slack of any other."""
    return np.asarray(value) > limit + slack(limit)


@dataclass(frozen=True)
class Bound:
    """One variable's range: ``low <= value <= high`` (either end may be infinite), compared under the one
    rule (:data:`REL_TOL`).  ``low_open``: the low end itself is excluded (``low < value``), for ranges that
    start above zero."""

    variable: str
    low: float
    high: float
    note: str = ""
    low_open: bool = False

    def contains(self, value: float) -> bool:
        low_ok = above(value, self.low) if self.low_open else at_least(value, self.low)
        return bool(low_ok and at_most(value, self.high))

    def describe(self) -> str:
        if math.isinf(self.low) and math.isinf(self.high):
            text = f"{self.variable} any"
        elif math.isinf(self.high):
            text = f"{self.variable} {'>' if self.low_open else '>='} {self.low:g}"
        elif math.isinf(self.low):
            text = f"{self.variable} <= {self.high:g}"
        else:
            text = f"{self.low:g} {'<' if self.low_open else '<='} {self.variable} <= {self.high:g}"
        return f"{text} ({self.note})" if self.note else text


@dataclass(frozen=True)
class Validity:
    """The published validity range of one correlation.

    ``method`` is the name the trade uses (e.g. "Gnielinski"), ``reference`` the
    citation, ``bounds`` one :class:`Bound` per variable the source restricts.
    """

    method: str
    reference: str
    bounds: tuple[Bound, ...] = ()

    def describe(self) -> str:
        return "; ".join(b.describe() for b in self.bounds) or "no stated limits"

    def violations(self, **values: float) -> tuple[str, ...]:
        """Messages for each given variable that lies outside its bound.

        Variables the record does not restrict are ignored; a bound whose
        variable is not given is not checked.
        """
        out = []
        for b in self.bounds:
            if b.variable in values:
                v = float(values[b.variable])
                if not b.contains(v):
                    out.append(f"{b.variable} = {v:.4g} outside {b.describe()}")
        return tuple(out)


def with_validity(validity: Validity):
    """Attach ``validity`` to a correlation function and append it to its docstring."""

    def decorate(fn):
        fn.validity = validity
        doc = fn.__doc__ or ""
        fn.__doc__ = (
            doc.rstrip()
            + "\n\n    Validity (from the attached record): "
            + validity.describe()
            + "\n    Reference: "
            + validity.reference
            + "\n"
        )
        return fn

    return decorate
