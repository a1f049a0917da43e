"""``floatcalc liquid NAME``: properties of a liquid and where they come from."""

from __future__ import annotations

from ..liquids import contaminated, liquid, list_liquids
from ._format import add_json_flag, print_json, print_table


ORDER = 20


def register(sub) -> None:
    p = sub.add_parser("liquid", help="surface tension, density and capillary length of a liquid")
    p.add_argument("name", nargs="?", default="water", help="liquid name, e.g. water, seawater, ethanol; 'list' lists them")
    p.add_argument("--temperature", default="20 degC", help="e.g. 20degC (default 20 degC)")
    p.add_argument("--salinity", default=None, help="absolute salinity for seawater, e.g. 35g/kg")
    p.add_argument("--surface-tension", default=None, help="measured surface tension of a contaminated surface, e.g. 60mN/m")
    add_json_flag(p)
    p.set_defaults(func=run)


def run(args) -> int:
    if args.name == "list":
        rows = list_liquids()
        if args.json:
            print_json({"liquids": rows})
        else:
            print_table("Named liquids", [(r["name"], r["range"]) for r in rows])
        return 0
    liq = liquid(args.name, args.temperature, args.salinity)
    if args.surface_tension is not None:
        liq = contaminated(liq, surface_tension=args.surface_tension)
    if args.json:
        print_json(liq.summary())
        return 0
    rows = [
        ("temperature", f"{liq.T - 273.15:.2f} °C"),
        ("surface tension", f"{liq.sigma * 1e3:.3f} mN/m   ({liq.sigma_source})"),
        ("density", f"{liq.rho:.2f} kg/m³   ({liq.rho_source})"),
        ("capillary length", f"{liq.lc * 1e3:.4f} mm   (sqrt(σ/ρg), g = {liq.g} m/s²)"),
        ("valid range", liq.valid_range),
    ]
    if liq.salinity is not None:
        rows.insert(1, ("salinity", f"{liq.salinity:g} g/kg"))
    print_table(f"Liquid: {liq.name}", rows, liq.cautions)
    return 0
