"""coldplate: size a water-cooled cold plate and check its once-through water supply.

Python API::

    from coldplate import check_file
    result = check_file("examples/reagent-block-channels.toml")
    result.R_th, result.T_face_max, result.findings

    from coldplate import size_file
    s = size_file("examples/laser-mount-sizing.toml")
    s.recommended, s.why, s.check.findings, s.text

In a notebook both results show the report's summary; ``result.to_dict()`` is the JSON object and
``result.to_frame()`` a pandas DataFrame (``pip install "coldplate[frames]"``; see coldplate.notebook).
"""
from coldplate._version import __version__  # noqa: F401  (re-exported)


def check_file(path, model="field"):
    """Read a design file and solve it; returns a frozen :class:`coldplate.plate.result.Result`.
    ``model``: "field" (the plate as a 3-D field, default) or "network" (the fast resistance network)."""
    from coldplate.check import check_file as _check_file

    return _notebook(_check_file(path, model=model))


def solve(design, model="field"):
    """Solve an already-read :class:`coldplate.design.reader.Design` (``model`` as in :func:`check_file`)."""
    from coldplate.check import solve as _solve

    return _notebook(_solve(design, model=model))


def size_file(path):
    """Read a design file with a ``[search]`` table, search it and recommend a plate (``coldplate size``);
    returns a frozen :class:`coldplate.sizing.recommend.SizingResult`."""
    from coldplate.uncertainty.sizing import size_file as _size_file  # face_limit_confidence: held at a percentile

    return _notebook(_size_file(path))


def _notebook(result):
    """The result, its class given the notebook and spreadsheet methods (coldplate.notebook)."""
    import coldplate.notebook  # noqa: F401  (installs them on import)

    return result


def check_file_with_band(path, confidence=None):
    """``coldplate check`` with the uncertainty band (``[uncertainty]``, or ``confidence`` such as 0.9 for the
    correlations' scatter alone); ``result.uncertainty`` holds the band."""
    from coldplate.uncertainty.run import check_file_with_band as _check

    return _notebook(_check(path, confidence))
