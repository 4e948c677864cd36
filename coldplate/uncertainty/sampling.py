"""Seeded Latin hypercube samples, their transformation to the inputs' distributions, and percentiles with
their sampling error.

Latin hypercube (McKay, Beckman & Conover 1979, Technometrics 21, 239), by ``scipy.stats.qmc.LatinHypercube``:
each of the d inputs' n values falls once into each of n equal-probability strata.  A uniform input takes
``low + u (high − low)``; a normal one ``mid + σ Φ⁻¹(u)`` with ``σ = (high − low) / 4`` (the ends at ±2σ).

Percentiles: ``numpy.quantile`` (linear between order statistics).  Sampling error: the distribution-free
confidence interval of a quantile from order statistics (e.g. Conover, Practical Nonparametric Statistics,
3rd ed., 1999, §3.2): the q-quantile lies between the order statistics of ranks n q ∓ z √(n q (1 − q)) with
probability about 95 % (z = 1.96); the error quoted is half that interval.  It holds for independent samples;
a Latin hypercube is never worse for monotone outputs (McKay et al. 1979), so the figure is an upper bound.
scipy is imported inside the functions: never on the plain check's path.
"""
from __future__ import annotations

import math

import numpy as np

#: Two-sided 95 % normal quantile for the order-statistic interval [-] (published: Φ⁻¹(0.975)).
Z_95 = 1.959963984540054


def latin_hypercube(n: int, d: int, seed: int) -> np.ndarray:
    """(n, d) points in (0, 1), one per stratum of each column, repeatable for a seed."""
    from scipy.stats import qmc

    if d == 0:
        return np.empty((n, 0))
    return qmc.LatinHypercube(d=d, seed=np.random.default_rng(seed)).random(n)


def to_values(u: np.ndarray, low: float, high: float, distribution: str) -> np.ndarray:
    """Points ``u`` in (0, 1) as values of an input spread between ``low`` and ``high``."""
    if distribution == "uniform":
        return low + u * (high - low)
    from scipy.stats import norm

    return 0.5 * (low + high) + 0.25 * (high - low) * norm.ppf(u)


def ends(low: float, high: float, distribution: str, confidence: float) -> tuple[float, float]:
    """An input's low and high ends for the one-at-a-time sensitivities: a uniform input's own ends, a normal
    input's percentiles at the band's confidence (the 5 % and 95 % points for 90 %)."""
    if distribution == "uniform":
        return low, high
    from scipy.stats import norm

    z = norm.ppf(0.5 + 0.5 * confidence)
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
