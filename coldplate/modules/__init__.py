"""Thermoelectric modules on the plate: the standard module model and Luo's derivation from datasheet
maxima as pure functions (``model``), the ``[module]`` table (``reader``), the module and plate solved as one system
with the current sweep and the coldest current (``solve``), the frozen ``ModuleResult`` (``result``) and the
modules' own findings (``findings``).  The plate is reached only through the ``solve_plate`` it is handed.
"""
