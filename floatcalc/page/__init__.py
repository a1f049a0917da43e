"""The floatcalc page (Streamlit): panels generated from the element-kind registry.

``app.py`` at the repository root is a thin entry (``streamlit run app.py``) that calls
:func:`floatcalc.page.main.main`. The page holds no physics: it edits a schema-2 design
(:mod:`floatcalc.design`), solves it with :func:`floatcalc.device.solve.solve_device` through
:mod:`floatcalc.page.solver` (cache and time budget), and shows the words and drawings of
:mod:`floatcalc.output` and :mod:`floatcalc.plotting`. Importing :mod:`floatcalc` never
imports this package (Streamlit is imported here only).
"""
