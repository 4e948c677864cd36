"""Seeded Latin hypercube samples, their transformation to the inputs' distributions, and percentiles with
their sampling error.

Latin hypercube (McKay, Beckman & Conover 1979, Technometrics 21, 239): each of the d inputs' n values falls
once into each of n equal-probability strata, (π(i) + U) / n with a random permutation π per column and U
uniform in [0, 1), drawn from one seeded ``numpy.random.Generator``.  A uniform input takes
``low + u (high − low)``; a normal one ``mid + σ Φ⁻¹(u)`` with ``σ = (high − low) / 4`` (the ends at ±2σ),
Φ⁻¹ from the standard library's ``statistics.NormalDist`` (importing scipy.stats would cost a second here).

Percentiles: ``numpy.quantile`` (linear between order statistics).  Sampling error: the distribution-free
confidence interval of a quantile from order statistics (e.g. Conover, Practical Nonparametric Statistics,
3rd ed., 1999, §3.2): the q-quantile lies between the order statistics of ranks n q ∓ z √(n q (1 − q)) with
probability about 95 % (z = 1.96); the error quoted is half that interval.  It holds for independent samples;
a Latin hypercube is never worse for monotone outputs (McKay et al. 1979), so the figure is an upper bound.
"""
from __future__ import annotations

import math
from statistics import NormalDist

import numpy as np

#: Two-sided 95 % normal quantile for the order-statistic interval [-] (published: Φ⁻¹(0.975)).
Z_95 = 1.959963984540054
_PHI = NormalDist()


def latin_hypercube(n: int, d: int, seed: int) -> np.ndarray:
    """(n, d) points in (0, 1), one per stratum of each column, repeatable for a seed."""
    rng = np.random.default_rng(seed)
    strata = np.column_stack([rng.permutation(n) for _ in range(d)]) if d else np.empty((n, 0))
    u = (strata + rng.random((n, d))) / n
    return np.clip(u, 0.5 / n**2, 1.0 - 0.5 / n**2)  # never exactly 0: a normal input stays finite


def to_values(u: np.ndarray, low: float, high: float, distribution: str) -> np.ndarray:
    """Points ``u`` in (0, 1) as values of an input spread between ``low`` and ``high``."""
    if distribution == "uniform":
        return low + u * (high - low)
    z = np.array([_PHI.inv_cdf(float(p)) for p in np.ravel(u)]).reshape(np.shape(u))
    return 0.5 * (low + high) + 0.25 * (high - low) * z


def ends(low: float, high: float, distribution: str, confidence: float) -> tuple[float, float]:
    """An input's low and high ends for the one-at-a-time sensitivities: a uniform input's own ends, a normal
    input's percentiles at the band's confidence (the 5 % and 95 % points for 90 %)."""
    if distribution == "uniform":
        return low, high
    z = _PHI.inv_cdf(0.5 + 0.5 * confidence)
    mid, sigma = 0.5 * (low + high), 0.25 * (high - low)
    return mid - z * sigma, mid + z * sigma


def percentile(x: np.ndarray, q: float) -> tuple[float, float]:
    """The q-quantile of samples ``x`` (0 < q < 1; +inf counts as the hottest possible) and its sampling
    error (half the 95 % order-statistic interval), both in ``x``'s units."""
    xs = np.sort(np.asarray(x, dtype=float))
    n = xs.size
    value = float(np.quantile(xs, q))
    half = Z_95 * math.sqrt(n * q * (1.0 - q))
    j = min(max(int(math.floor(n * q - half)) - 1, 0), n - 1)  # ranks are 1-based
    k = min(max(int(math.ceil(n * q + half)) - 1, 0), n - 1)
    lo, hi = xs[j], xs[k]
    err = 0.5 * (hi - lo) if math.isfinite(hi) and math.isfinite(lo) else math.inf
    return value, float(err)
