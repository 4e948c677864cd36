"""coldplate: size a water-cooled cold plate and check its once-through water supply.

Python API::

    from coldplate import check_file
    result = check_file("examples/reagent-block-channels.toml")
    result.R_th, result.T_face_max, result.findings

    from coldplate import size_file
    s = size_file("examples/laser-mount-sizing.toml")
    s.recommended, s.why, s.check.findings, s.text
"""
__version__ = "0.1.0"


def check_file(path, model="field"):
    """Read a design file and solve it; returns a frozen :class:`coldplate.plate.result.Result`.
    ``model``: "field" (the plate as a 3-D field, default) or "network" (the fast resistance network)."""
    from coldplate.check import check_file as _check_file

    return _check_file(path, model=model)


def solve(design, model="field"):
    """Solve an already-read :class:`coldplate.design.reader.Design` (``model`` as in :func:`check_file`)."""
    from coldplate.check import solve as _solve

    return _solve(design, model=model)


def size_file(path):
    """Read a design file with a ``[search]`` table, search it and recommend a plate (``coldplate size``);
    returns a frozen :class:`coldplate.sizing.recommend.SizingResult`."""
    from coldplate.sizing.recommend import size_file as _size_file

    return _size_file(path)
