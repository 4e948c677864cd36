"""The cold plate itself: its materials table (``materials``), one function per published convection
correlation (``convection``) and conduction model (``conduction``), the room air's dew and frost point
(``psychro``), the passage kinds (``passages``: channels, tube, cavity), the plate solve at one flow and load
(``solve.solve_plate``), its frozen result (``result``) and the plate's curves against flow (``curves``).
It knows nothing of modules, the supply circuit or the findings; those stages call it.
"""
