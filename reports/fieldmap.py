"""The mounting-face temperature map as CSV (``coldplate check FILE --map OUT.csv``).

Only formatting: the map is ``Result.field`` (face cell centres and temperatures) as the field model solved it.
Columns ``x_m, y_m, T_C``: one row per face cell, x from the plate's inlet edge along the flow, y across from the
centre line (positive on the left of the flow, as ``coldplate.plate.sources`` draws it), the temperature on the
plate side of any interface (a source's device face adds its interface's rise).  Comment lines start with ``#``.
"""
from __future__ import annotations

from coldplate.design.errors import DesignError

HEADER = ("# mounting-face temperature map: x from the inlet edge along the flow, y across from the centre line "
          "(positive on the left of the flow); T on the plate side of any interface",)


def render_face_map(r) -> str:
    """The CSV text; a result without a field (the network model) is refused naming ``--map``."""
    f = r.field
    if f is None:
        raise DesignError("--map", f"the {r.model} model gives no temperature map; the map needs the field model")
    lines = [*HEADER, f"# {r.design.title}".replace("\n", " "), "x_m,y_m,T_C"]
    for i, x in enumerate(f.face_x):
        for j, y in enumerate(f.face_y):
            lines.append(f"{float(x):.6g},{float(y):.6g},{float(f.face[i, j]) - 273.15:.4f}")
    return "\n".join(lines) + "\n"
