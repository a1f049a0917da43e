"""Dimensionless groups with a one-line plain reading for the CLI and the page.

Each function returns a :class:`Group`: the value, the length (or other scale) used, the
definition, and a reading in words. Inputs follow the package conventions (quantities, SI
floats or strings).

References
----------
.. [1] J. W. M. Bush, D. L. Hu, "Walking on water: biolocomotion at the interface",
   Annu. Rev. Fluid Mech. 38, 339 (2006) (Baudoin number).
.. [2] P.-G. de Gennes, F. Brochard-Wyart, D. Quéré, Capillarity and Wetting Phenomena,
   Springer (2004) (capillary length, capillary–gravity waves).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from . import _validate as v
from .errors import input_error
from .liquids import Liquid, as_liquid
from .units import Q_, to_si


@dataclass(frozen=True)
class Group:
    """A dimensionless group: ``value``, its ``definition``, the ``scale`` used and a ``reading``."""

    name: str
    symbol: str
    value: float
    definition: str
    scale: str
    reading: str

    def to_dict(self) -> dict[str, Any]:
        return {"name": self.name, "symbol": self.symbol, "value": self.value,
                "definition": self.definition, "scale": self.scale, "reading": self.reading}


def capillary_length(liq: Liquid):
    """Capillary length l_c = sqrt(σ/(ρ g)) as a quantity [mm] [2]_.

    >>> from floatcalc.liquids import water
    >>> round(capillary_length(water("20 degC")).magnitude, 2)
    2.73
    """
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    return Q_(liq.lc * 1e3, "mm")


def bond_number(liq: Liquid, length: Any, which: str = "radius") -> Group:
    """Bond number Bo = ρ g L² / σ = (L/l_c)², with L named by ``which``.

    >>> from floatcalc.liquids import water
    >>> bond_number(water(), "0.25 mm").value < 0.01
    True
    """
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    L = v.length(length, "length")
    bo = (L / liq.lc) ** 2
    reading = bond_reading(bo)
    return Group("Bond number", "Bo", bo, "ρ g L² / σ", f"L = {which} = {L * 1e3:.4g} mm", reading)


def baudoin_number(liq: Liquid, weight: Any, perimeter: Any) -> Group:
    """Baudoin number Ba = W / (σ P): weight over the largest surface-tension force [1]_.

    ``weight`` is a force or a mass (then W = m g); ``perimeter`` the total contact-line length.

    >>> from floatcalc.liquids import water
    >>> round(baudoin_number(water(), "10 mg", "40 mm").value, 3)
    0.034
    """
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    W = _weight(weight, liq.g)
    P = v.length(perimeter, "perimeter", upper=1e3)
    ba = baudoin(W, liq.sigma, P)
    if ba < 1:
        reading = ("Ba < 1: the largest surface-tension force exceeds the weight "
                   "(necessary, not sufficient, for standing on surface tension)")
    else:
        reading = "Ba ≥ 1: weight exceeds the largest surface-tension force on this perimeter"
    return Group("Baudoin number", "Ba", ba, "W / (σ P)",
                 f"W = {W * 1e3:.4g} mN, P = {P * 1e3:.4g} mm", reading)


def baudoin(weight: float, sigma: float, perimeter: float) -> float:
    """Ba = W / (σ P) on SI floats: the one formula every result uses [1]_.

    ``weight`` [N] is the load carried (a device's weight plus its payload, or an element's own
    weight), ``perimeter`` [m] the contact-line length at the limit.

    >>> round(baudoin(1e-3, 0.072, 0.04), 4)
    0.3472
    """
    return weight / (sigma * perimeter) if perimeter > 0 else float("inf")


def bond_reading(bo: float) -> str:
    """Plain reading of a Bond number (thresholds 0.1 and 10, common practice).

    >>> bond_reading(0.12)
    'Bo < 1: surface tension dominates, meniscus pressure adds a little'
    """
    if bo < 0.1:
        return "Bo ≪ 1: surface tension dominates buoyancy at this size"
    if bo < 1:
        return "Bo < 1: surface tension dominates, meniscus pressure adds a little"
    if bo <= 10:
        return "Bo ~ 1: surface tension and buoyancy (meniscus pressure) both matter"
    return "Bo ≫ 1: buoyancy of the displaced volume dominates surface tension"


def weber_number(liq: Liquid, speed: Any, length: Any) -> Group:
    """Weber number We = ρ U² L / σ of a leg stroke of speed U and leg size L.

    >>> from floatcalc.liquids import water
    >>> round(weber_number(water(), "0.5 m/s", "0.1 mm").value, 3)
    0.343
    """
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    U = to_si(speed, "speed", "speed")
    if U < 0:
        raise input_error("speed", "must be zero or positive", f"{U:g} m/s")
    L = v.length(length, "length")
    we = liq.rho * U**2 * L / liq.sigma
    reading = ("We < 1: surface tension holds the meniscus together during the stroke"
               if we < 1 else "We ≥ 1: inertia can break the meniscus; static results overestimate")
    return Group("Weber number", "We", we, "ρ U² L / σ", f"U = {U:.4g} m/s, L = {L * 1e3:.4g} mm", reading)


def reynolds_number(liq: Liquid, speed: Any, length: Any, viscosity: Any | None = None) -> Group:
    """Reynolds number Re = ρ U L / μ of a leg stroke (μ from the liquid unless given).

    >>> from floatcalc.liquids import water
    >>> round(reynolds_number(water(), "0.5 m/s", "0.1 mm").value)
    50
    """
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    U = to_si(speed, "speed", "speed")
    if U < 0:
        raise input_error("speed", "must be zero or positive", f"{U:g} m/s")
    L = v.length(length, "length")
    if viscosity is None:
        if liq.mu is None:
            raise input_error("viscosity", f"is not known for {liq.name}; give it, e.g. '1 mPa*s'", None)
        mu = liq.mu
    else:
        mu = v.positive(viscosity, "viscosity", "viscosity", show="mPa*s")
    re = liq.rho * U * L / mu
    reading = ("Re < 1: viscous drag dominates the stroke" if re < 1 else
               "Re ≥ 1: inertia dominates viscous drag in the stroke")
    return Group("Reynolds number", "Re", re, "ρ U L / μ", f"U = {U:.4g} m/s, L = {L * 1e3:.4g} mm", reading)


def min_wave_speed(liq: Liquid):
    """Minimum phase speed of capillary–gravity waves c_min = (4 g σ / ρ)^(1/4) [m/s] [2]_.

    >>> from floatcalc.liquids import water
    >>> round(min_wave_speed(water()).magnitude, 3)
    0.231
    """
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    return Q_((4.0 * liq.g * liq.sigma / liq.rho) ** 0.25, "m/s")


def wave_reading(liq: Liquid, speed: Any | None = None) -> str:
    """Plain reading of a leg or body speed against the minimum wave speed."""
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    c = min_wave_speed(liq).magnitude
    if speed is None:
        return f"c_min = {c:.3f} m/s: a steadily moving leg slower than this makes no steady waves"
    U = to_si(speed, "speed", "speed")
    side = "below" if U < c else "above"
    return f"U = {U:.3g} m/s is {side} c_min = {c:.3f} m/s" + (
        ": no steady wave drag" if U < c else ": steady wave drag is possible")


def _weight(weight: Any, g: float) -> float:
    if isinstance(weight, str) or hasattr(weight, "units"):
        # Decide force or mass by the dimension first, so that a bad value of the right
        # dimension (e.g. "-5 mN") is reported as such, not as "must be a mass".
        try:
            to_si(weight, "force", "weight")
        except ValueError as as_force:
            try:
                to_si(weight, "mass", "weight")
            except ValueError:
                if "must be a force" not in str(as_force):
                    raise as_force from None
                raise input_error("weight", "must be a force or a mass (e.g. '5 mN' or '0.5 g')",
                                  repr(weight)) from None
            return v.positive(weight, "mass", "weight", show="g") * g
    return v.positive(weight, "force", "weight", show="mN")


def all_groups(liq: Liquid, length: Any, which: str = "radius", speed: Any | None = None,
               weight: Any | None = None, perimeter: Any | None = None) -> list[Group]:
    """The groups that apply to an element of size ``length`` (and stroke speed, weight)."""
    liq = as_liquid(liq)  # a Liquid or a liquid name; anything else is an InputError
    out = [bond_number(liq, length, which)]
    if weight is not None and perimeter is not None:
        out.append(baudoin_number(liq, weight, perimeter))
    if speed is not None:
        out.append(weber_number(liq, speed, length))
        if liq.mu is not None:
            out.append(reynolds_number(liq, speed, length))
    return out


__all__ = ["Group", "capillary_length", "bond_number", "baudoin_number", "weber_number",
           "reynolds_number", "min_wave_speed", "wave_reading", "all_groups"]

_ = math  # keep the import for doctest namespaces
