"""Sizing: search many candidate plates at once and recommend one (``coldplate size``).

search.py reads ``[search]``; evaluate.py evaluates candidates with numpy (the check's physics);
proptable.py and platetable.py tabulate coolant properties and the plate's spreading; pareto.py keeps the
non-dominated candidates; refine.py polishes the best with scipy.optimize; writer.py writes a design file.
"""
