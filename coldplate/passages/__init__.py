"""Passage kinds.  Each module provides ``geometry``, ``back_side`` and ``minor_losses``
with the same signatures; :data:`PASSAGES` maps the design file's ``kind`` to its module.

To add a passage kind: write a module here with those three functions, add it to
:data:`PASSAGES`, add its dataclass and reader to :mod:`coldplate.design`, and extend
``tests/test_passages.py`` (which checks that the names here and in the design reader agree).
"""
from . import cavity, channels, tube

PASSAGES = {"channels": channels, "tube": tube, "cavity": cavity}
