"""Uncertainty: how sure the check's headline numbers are, and which inputs make them unsure.

The optional ``[uncertainty]`` table (reader.py) names design keys and their spreads (a relative or absolute
tolerance, or a range), the sample count, the seed and the confidence.  sampling.py draws a seeded Latin
hypercube and reads percentiles with their order-statistic sampling error; scatter.py holds each correlation's
published scatter band as data, keyed by the method name of its validity record.  propagate.py runs every
sample, each a candidate with perturbed inputs and correlation factors, through the sizing search's vectorised
evaluator (channel, tube and cavity plates, several sources, modules, a supply that sets the flow: every
sample at once) or, for what the evaluator does not cover (a varied tube size), through repeated checks
at a smaller sample count; it also runs the one-at-a-time ends for the tornado chart.  result.py is the frozen
``Band`` result the check's :class:`~coldplate.plate.result.Result` carries as ``uncertainty``; findings.py
holds the rules for a band that crosses a limit the nominal meets.  run.py is the wiring (the command line
calls it after the check), sizing.py holds a face limit at a percentile in ``coldplate size``.  This folder
sits above ``coldplate.sizing`` in the layers: it imports the check and the evaluator, never the reverse.
"""
