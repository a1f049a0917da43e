"""Property correlations for liquids, on bare SI numbers (K, g/kg, N/m, kg/m³).

Each function is one published correlation; validity ranges are stated in its docstring and
enforced by the caller (:mod:`floatcalc.liquids`), not here, so that arrays pass through freely.

References
----------
.. [1] IAPWS R1-76(2014), Revised Release on Surface Tension of Ordinary Water Substance.
.. [2] M. Tanaka, G. Girard, R. Davis, A. Peuto, N. Bignell, "Recommended table for the density
   of water between 0 °C and 40 °C based on recent experimental reports", Metrologia 38, 301 (2001).
.. [3] G. S. Kell, "Density, thermal expansivity, and compressibility of liquid water from 0 °C to
   150 °C", J. Chem. Eng. Data 20, 97 (1975).
.. [4] K. G. Nayar, D. Panchanathan, G. H. McKinley, J. H. Lienhard, "Surface tension of seawater",
   J. Phys. Chem. Ref. Data 43, 043103 (2014).
.. [5] F. J. Millero, A. Poisson, "International one-atmosphere equation of state of seawater",
   Deep-Sea Research 28A, 625 (1981) (UNESCO EOS-80).
.. [6] J. J. Jasper, "The surface tension of pure liquid compounds", J. Phys. Chem. Ref. Data 1,
   841 (1972).
"""

from __future__ import annotations

import numpy as np

T_CRITICAL_WATER = 647.096  # K, IAPWS
KELVIN = 273.15


def water_surface_tension_iapws(T):
    """Surface tension of water [N/m] at temperature ``T`` [K], IAPWS R1-76(2014) [1]_.

    .. math:: \\sigma = B \\tau^{\\mu} (1 + b \\tau), \\quad \\tau = 1 - T/T_c

    with B = 235.8 mN/m, b = −0.625, μ = 1.256, T_c = 647.096 K. Valid from the triple point to
    the critical point.

    >>> round(float(water_surface_tension_iapws(298.15)) * 1e3, 2)
    71.97
    """
    tau = 1.0 - np.asarray(T, dtype=float) / T_CRITICAL_WATER
    return 235.8e-3 * tau**1.256 * (1.0 - 0.625 * tau)


def water_density_tanaka(t_c):
    """Density of air-free water [kg/m³] at ``t_c`` [°C, ITS-90], 0–40 °C, Tanaka et al. [2]_.

    .. math:: \\rho = a_5 \\left[1 - \\frac{(t + a_1)^2 (t + a_2)}{a_3 (t + a_4)}\\right]

    >>> round(float(water_density_tanaka(3.983035)), 5)
    999.97495
    """
    t = np.asarray(t_c, dtype=float)
    a1, a2, a3, a4, a5 = -3.983035, 301.797, 522528.9, 69.34881, 999.974950
    return a5 * (1.0 - (t + a1) ** 2 * (t + a2) / (a3 * (t + a4)))


def water_density_kell(t_c):
    """Density of water at 1 atm [kg/m³] at ``t_c`` [°C], 0–150 °C, Kell (1975) [3]_.

    Rational polynomial fit (degree 5 over degree 1) to the measurements of the time; used here
    above 40 °C where Tanaka's formula is not stated to hold.

    >>> round(float(water_density_kell(60.0)), 1)
    983.2
    """
    t = np.asarray(t_c, dtype=float)
    num = (
        999.83952
        + 16.945176 * t
        - 7.9870401e-3 * t**2
        - 46.170461e-6 * t**3
        + 105.56302e-9 * t**4
        - 280.54253e-12 * t**5
    )
    return num / (1.0 + 16.879850e-3 * t)


def seawater_surface_tension_nayar(T, S):
    """Surface tension of seawater [N/m] at ``T`` [K] and absolute salinity ``S`` [g/kg] [4]_.

    .. math:: \\sigma_{sw} = \\sigma_w (1 + 3.766\\times10^{-4} S + 2.347\\times10^{-6} S t)

    with t in °C and σ_w from IAPWS R1-76. Stated validity: 0 ≤ t ≤ 90 °C, 0 ≤ S ≤ 131 g/kg.
    """
    t = np.asarray(T, dtype=float) - KELVIN
    S = np.asarray(S, dtype=float)
    return water_surface_tension_iapws(T) * (1.0 + 3.766e-4 * S + 2.347e-6 * S * t)


def seawater_density_eos80(t_c, SP):
    """One-atmosphere density of seawater [kg/m³], UNESCO EOS-80 (Millero & Poisson 1981) [5]_.

    ``t_c`` in °C, ``SP`` practical salinity. Stated validity 0–40 °C, SP 0.5–43.
    """
    t = np.asarray(t_c, dtype=float)
    S = np.asarray(SP, dtype=float)
    rho_w = (
        999.842594
        + 6.793952e-2 * t
        - 9.095290e-3 * t**2
        + 1.001685e-4 * t**3
        - 1.120083e-6 * t**4
        + 6.536332e-9 * t**5
    )
    A = 8.24493e-1 - 4.0899e-3 * t + 7.6438e-5 * t**2 - 8.2467e-7 * t**3 + 5.3875e-9 * t**4
    B = -5.72466e-3 + 1.0227e-4 * t - 1.6546e-6 * t**2
    C = 4.8314e-4
    return rho_w + A * S + B * S**1.5 + C * S**2


def linear_in_temperature(t_c, value_at_ref, slope, t_ref=20.0):
    """A property linear in temperature: ``value_at_ref + slope (t − t_ref)`` (t in °C).

    Jasper's [6]_ surface tension fits take this form with t_ref = 0 °C.
    """
    return value_at_ref + slope * (np.asarray(t_c, dtype=float) - t_ref)


VOGEL_SOURCE = "Vogel equation for water, A = 2.414e-5 Pa·s, B = 247.8 K, C = 140 K (common practice, about ±2.5 %)"


def water_viscosity_vogel(T):
    """Dynamic viscosity of water [Pa·s] at ``T`` [K], Vogel form μ = A·10^(B/(T − C)).

    Engineering approximation (common practice), within a few per cent from 0 to 100 °C; used
    only for the Reynolds number of a leg stroke.

    >>> round(float(water_viscosity_vogel(293.15)) * 1e3, 2)
    1.0
    """
    return 2.414e-5 * 10.0 ** (247.8 / (np.asarray(T, dtype=float) - 140.0))
