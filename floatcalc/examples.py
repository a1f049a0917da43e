"""Coating presets of the page: typical contact angles on water of a few common coatings.

The built-in example designs live in ``floatcalc/data/examples/*.toml`` (read through
:mod:`floatcalc.design`); this module keeps only the table the page offers as a starting point
for a coating's angles.

>>> COATINGS["PTFE film"]
('115 deg', '95 deg')
"""

from __future__ import annotations

#: Typical advancing / receding angles on water [deg] of common coatings. Values recalled from
#: memory (common practice); they spread widely with preparation, so measure your own coating.
COATINGS: dict[str, tuple[str, str]] = {
    "PTFE film": ("115 deg", "95 deg"),
    "paraffin wax": ("110 deg", "95 deg"),
    "superhydrophobic spray": ("160 deg", "150 deg"),
    "bare steel": ("75 deg", "35 deg"),
}

#: Where the values come from (shown beside the preset chooser).
COATINGS_SOURCE = "typical values from memory; measure your own coating"

__all__ = ["COATINGS", "COATINGS_SOURCE"]
