"""The band: percentiles of every headline number, their sampling error, and the inputs that drive them."""
from __future__ import annotations

from dataclasses import dataclass

#: The outputs a band is given for, in the order reported: name -> what it is.
OUTPUTS = {
    "face": "hottest mounting face",
    "outlet": "outlet water",
    "pressure_drop": "plate pressure drop",
    "water_use": "water use (once-through)",
}


@dataclass(frozen=True)
class Band:
    """One output's spread (SI, kelvin): nominal (the check), the lower, middle and upper percentiles, each
    with its sampling error (half the 95 % order-statistic interval)."""

    output: str  #: a key of OUTPUTS
    nominal: float
    low: float
    median: float
    high: float
    low_error: float
    median_error: float
    high_error: float


@dataclass(frozen=True)
class Sensitivity:
    """One input at its low and its high end, everything else at its design value: the hottest face there."""

    input: str  #: the design key, or "correlations.Nu" / "correlations.f"
    input_low: float  #: the input's value at its low end (SI; a factor for the correlations)
    input_high: float
    low: float  #: hottest face with the input at its low end [K]
    high: float  #: ... at its high end [K]
    pressure_low: float  #: plate pressure drop at the low end [Pa]
    pressure_high: float

    @property
    def swing(self) -> float:
        """How far the face moves across the input's range [K]."""
        return abs(self.high - self.low)


@dataclass(frozen=True)
class Uncertainty:
    """``Result.uncertainty``: the band of the check's headline numbers (coldplate/uncertainty/propagate.py)."""

    confidence: float  #: the band's central probability, e.g. 0.90 for the 5 %–95 % band
    samples: int
    seed: int
    method: str  #: "vectorised evaluator" or "repeated check"
    bands: tuple[Band, ...]
    sensitivity: tuple[Sensitivity, ...]  #: largest swing of the face first
    inputs: tuple[tuple[str, float, float, str, str], ...]  #: (key, low, high, distribution, as written)
    correlations: tuple[tuple[str, str, float, str], ...]  #: (quantity, method, band, source) of the factors
    unsolved: int  #: samples that could not be solved (boiling, beyond the property data): counted as hottest
    inlet_low: float  #: the inlet's lower percentile [K] (the coldest wetted surface)
    notes: tuple[str, ...]

    @property
    def lower_q(self) -> float:
        return 0.5 - 0.5 * self.confidence

    @property
    def upper_q(self) -> float:
        return 0.5 + 0.5 * self.confidence

    def band(self, output: str) -> Band:
        return next(b for b in self.bands if b.output == output)
