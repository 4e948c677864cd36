"""Sizing: search many candidate plates at once and recommend one (``coldplate size``).

search.py reads ``[search]``; evaluate.py evaluates candidates with numpy (the check's physics), with
proptable.py and platetable.py tabulating coolant properties and the plate's spreading; run.py runs the
search in chunks and keeps the Pareto set (pareto.py); refine.py polishes the best with scipy.optimize;
recommend.py picks, explains and checks the recommendation; writer.py writes it as a design file;
command.py is the CLI subcommand.  DEVELOPERS.md describes how this shares its formulas with the check.
"""
