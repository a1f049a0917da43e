"""Argument groups shared by several CLI commands (liquid selection, output)."""

from __future__ import annotations

from ..liquids import Liquid, contaminated, liquid


def add_liquid_args(p) -> None:
    g = p.add_argument_group("liquid")
    g.add_argument("--liquid", default="water", help="liquid name (default water); see 'floatcalc liquid list'")
    g.add_argument("--temperature", default="20 degC", help="e.g. 20degC (default 20 degC)")
    g.add_argument("--salinity", default=None, help="absolute salinity for seawater, e.g. 35g/kg")
    g.add_argument("--surface-tension", default=None,
                   help="measured surface tension of a contaminated surface, e.g. 60mN/m")


def liquid_from_args(args) -> Liquid:
    liq = liquid(args.liquid, args.temperature, args.salinity)
    if args.surface_tension is not None:
        liq = contaminated(liq, surface_tension=args.surface_tension)
    return liq


def fmt(q, unit: str, digits: int = 4) -> str:
    """Format a quantity in ``unit`` with ``digits`` significant figures."""
    return f"{q.to(unit).magnitude:.{digits}g} {unit}"
