"""The water supply: the ``[circuit]`` parts and supply keys with the backflow-device table (``reader``),
the operating point of a fixed flow, a tap pressure or a pump and the system curve (``operating``), the least
flow meeting the limits with water, money and the chiller break-even (``planning``), the supply stage the check
runs (``stage``), its frozen results (``result``) and the supply's own findings (``findings``).  Every plate number
here comes from ``coldplate.plate.solve.solve_plate``; the line physics lives in ``hydraulics``.
"""
