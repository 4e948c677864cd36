"""Findings: the shared machinery and wording (``base``: ``Finding``, the severities, ``DEFER``, the
thresholds more than one stage reads) and the plate's own rules (``plate``: condensation, freezing, boiling,
cross-connection, discharge, velocity, pressure, metals, electrical safety, correlation ranges).  The modules'
and the supply's rules live in their own folders; ``coldplate.check`` runs them all.
"""
