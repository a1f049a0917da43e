"""n-Hexadecane (floatcalc.liquids) against the `chemicals` package.

* σ: Jasper, J. Phys. Chem. Ref. Data 1, 841 (1972), σ = a − b t, as tabulated in
  `chemicals.interface.sigma_data_Jasper_Lange` (same fit: the check is that the coefficients
  were copied correctly, 1e-4 mN/m) and, independently, the VDI Heat Atlas PPDS correlation
  (`sigma_data_VDI_PPDS_11`, DIPPR eq. 106): 1 % (the two data sets differ by up to 0.5 %
  near 20 °C).
* ρ: floatcalc's linear fit (CRC values, from memory) against the PPDS density correlation
  (`rho_data_VDI_PPDS_2`): 0.5 %, as for the other organic liquids.
"""

from __future__ import annotations

import numpy as np
import pytest

import floatcalc as fc
from floatcalc.errors import InputError

chemicals = pytest.importorskip("chemicals", reason="chemicals is in the test extra; needed as reference")

CAS = "544-76-3"
T0 = 273.15


def test_name_and_aliases():
    assert chemicals.CAS_from_any("n-hexadecane") == CAS
    for name in ("n-hexadecane", "hexadecane", "cetane", "N-Hexadecane"):
        assert fc.liquid(name, "25 degC").name == "n-hexadecane"
    assert any(r["name"] == "n-hexadecane" for r in fc.list_liquids())


def test_surface_tension_is_jaspers_fit():
    row = chemicals.interface.sigma_data_Jasper_Lange.loc[CAS]
    for t_c in np.linspace(18.2, 100.0, 6):
        assert fc.liquid("n-hexadecane", f"{t_c} degC").sigma * 1e3 == pytest.approx(row.a - row.b * t_c, abs=1e-4)


def test_against_ppds_correlations():
    from chemicals.dippr import EQ106
    from chemicals.interface import sigma_data_VDI_PPDS_11
    from chemicals.volume import rho_data_VDI_PPDS_2, volume_VDI_PPDS

    s = sigma_data_VDI_PPDS_11.loc[CAS]
    r = rho_data_VDI_PPDS_2.loc[CAS]
    for t_c in (20.0, 25.0, 40.0, 60.0, 100.0):
        T = t_c + T0
        liq = fc.liquid("n-hexadecane", f"{t_c} degC")
        assert liq.sigma == pytest.approx(EQ106(T, s.Tc, s.A, s.B, s.C, s.D, s.E), rel=0.01)
        assert liq.rho == pytest.approx(r.MW * 1e-3 / volume_VDI_PPDS(T, r.Tc, r.rhoc, r.A, r.B, r.C, r.D, r.MW),
                                        rel=0.005)


def test_frozen_below_its_melting_point():
    with pytest.raises(InputError, match="temperature"):
        fc.liquid("n-hexadecane", "10 degC")
    # capillary length about 1.9 mm at 20 °C: sqrt(27.47e-3 / (773.4 · 9.80665))
    assert fc.liquid("n-hexadecane", "20 degC").lc == pytest.approx(1.902e-3, rel=2e-3)
