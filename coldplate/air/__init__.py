"""The air-cooled alternative beside every water design: what a finned sink with a fan (or still air) would do.

This folder owns the ``[air]`` table (reader.py), the air side's own correlations (correlations.py: fin with a
convecting tip, Bar-Cohen & Rohsenow natural convection between vertical plates and its optimum spacing, the
bare hot plate), the sink model over arrays of candidates (sink.py: ducted fin channels on the plate's duct
correlations, fin efficiency, the base's spreading series, the air's rise, entry and exit losses, the fan's
operating point by the pump machinery), the search of fin count, thickness and height in the envelope
(search.py), the stage the check runs (stage.py: the chosen sink solved exactly, modules on it, the comparison
with the water design), its frozen result (result.py, ``Result.air``) and its findings (findings.py).
"""
