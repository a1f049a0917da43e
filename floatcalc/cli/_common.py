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


def element_json(r, args, names) -> dict:
    """The one JSON shape of every element command: the result's keys (limit force and depth,
    force parts, own weight, payload, contact perimeter, Bond and Baudoin numbers, liquid) plus
    ``inputs``, the command's inputs echoed as given."""
    d = r.to_dict()
    d["inputs"] = {n: getattr(args, n) for n in names if getattr(args, n, None) is not None}
    d.setdefault("liquid", r.liquid.summary() if getattr(r, "liquid", None) is not None else None)
    return d


def refuse_unless(value, needed: bool, option: str, needs: str) -> None:
    """Refuse an option that does not apply (one line naming what it needs)."""
    if value is not None and not needed:
        from ..errors import input_error

        raise input_error(option, f"applies only {needs}", value)
