"""The design file and everything about reading it: the one pint registry and the unit-string parser
(``units``), the table reader that parses units, checks ranges and refuses unknown keys (``fields``), the typed
error tree (``errors``), and the reader that turns a TOML design file into frozen dataclasses in SI units
(``reader``: ``load_design``, ``parse_design``, ``design_from_dict``, ``Design``).  Each concept's own table is read
by that concept's ``reader`` (``coldplate.modules.reader``, ``coldplate.supply.reader``); ``reader`` here puts them
together.  Units live at this edge only: everything past it is SI floats, temperatures in kelvin.

This ``__init__`` imports nothing, so a concept's reader can import ``fields`` and ``errors`` from here while
``reader`` imports that concept's reader.
"""
