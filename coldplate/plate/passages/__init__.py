"""The passage kinds, one module each (``channels``, ``tube``, ``cavity``), with the shared
``Geometry`` and ``BackSide`` records (``base``).  Each kind gives ``geometry()``, ``back_side()``,
``back_side_total()`` (its total at an array of coefficients) and ``minor_losses()``; ``PASSAGES`` maps the design file's kind name to its module.
"""
from coldplate.plate.passages import cavity, channels, tube

PASSAGES = {"channels": channels, "tube": tube, "cavity": cavity}
