"""floatcalc page: how much load small objects carry on a liquid surface.

Run with ``streamlit run app.py`` from the repository root (settings in .streamlit/config.toml).
This file is a thin entry: the page lives in :mod:`floatcalc.page`.
"""

from floatcalc.page.main import main

main()
