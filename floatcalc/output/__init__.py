"""Output of a solved design: rows of text (:mod:`.text`), CSV tables (:mod:`.csv`) and the PDF
report (:mod:`.pdf`). No physics and no verdict logic here: every number comes from
:func:`floatcalc.device.solve.solve_device` and the element kinds' own functions.
"""
