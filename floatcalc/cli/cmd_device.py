"""``floatcalc device``: equilibrium, capacity and margins of a whole device from a design file."""

from __future__ import annotations

from ._format import add_json_flag, print_json, print_table

ORDER = 50


def register(sub) -> None:
    p = sub.add_parser("device", help="does a whole device float, how deep and level, how much more can it carry")
    p.add_argument("file", nargs="?", default=None, help="design file (TOML, see README 'Design files')")
    p.add_argument("--example", default=None, help="run a built-in example design instead of a file")
    p.add_argument("--list-examples", action="store_true", help="list the built-in example designs")
    p.add_argument("--payload", default=None, help="extra mass to carry, e.g. 0.5g (default none)")
    p.add_argument("--payload-at", default=None,
                   help="plan position of the payload as x,y, e.g. 3mm,0mm (default the centre of mass)")
    add_json_flag(p)
    p.set_defaults(func=run)


def _position(text: str | None):
    if text is None:
        return None
    from ..errors import input_error

    parts = [t.strip() for t in text.split(",")]
    if len(parts) != 2 or not all(parts):
        raise input_error("--payload-at", "must be two lengths x,y such as 3mm,0mm", repr(text))
    return parts


def run(args) -> int:
    from ..device import example, list_examples, load_design, solve_device
    from ..errors import input_error

    if args.list_examples:
        rows = list_examples()
        if args.json:
            print_json({"examples": rows})
        else:
            print_table("Built-in example designs (all invented)", [(r["name"], r["description"]) for r in rows])
        return 0
    if (args.file is None) == (args.example is None):
        raise input_error("device", "give a design file or --example NAME (see --list-examples)",
                          "both" if args.file else "neither")
    design = example(args.example) if args.example else load_design(args.file)
    r = solve_device(design, payload=args.payload, payload_position=_position(args.payload_at))
    if args.json:
        print_json(r.to_dict())
        return 0
    print_device(r)
    return 0


def _mm(q) -> str:
    return f"{q.to('mm').magnitude:.3g} mm"


def _mN(q) -> str:
    return f"{q.to('mN').magnitude:.4g} mN"


def print_device(r, title: str | None = None) -> None:
    """Text report of a :class:`~floatcalc.device.DeviceResult` (also used by ``floatcalc demo``)."""
    g = r.device.liquid.g
    liq = r.device.liquid
    rows = [
        ("design", r.description or "(no description)"),
        ("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m, l_c = {liq.lc * 1e3:.3f} mm"),
        ("weight (body + legs)", f"{_mN(r.weight)} = {r.weight.to('N').magnitude / g * 1e3:.4g} g"),
    ]
    if r.payload.magnitude > 0:
        rows.append(("payload", f"{_mN(r.payload)} = {r.payload.to('N').magnitude / g * 1e3:.4g} g"))
    pos = r.max_payload_position.to("mm").magnitude
    where = f"({pos[0]:.2f}, {pos[1]:.2f}) mm" if r.payload.magnitude > 0 else "the centre of mass"
    verdict = r.verdict.upper()
    if r.shortfall is not None:
        verdict += f" (short by {_mN(r.shortfall)} = {r.shortfall.to('N').magnitude / g * 1e3:.4g} g)"
    rows += [
        ("verdict", verdict),
        ("heave (depth at origin)", _mm(r.heave)),
        ("pitch / roll", f"{r.pitch.magnitude:+.3f}° / {r.roll.magnitude:+.3f}° (+: the +x / +y side lower)"),
        (f"largest extra payload at {where}", f"{_mN(r.max_payload)} = {r.max_payload_mass.to('g').magnitude:.4g} g"),
        ("first to give way", r.first_to_fail),
        ("best payload position", f"({r.best_payload_position.to('mm').magnitude[0]:.2f}, "
                                  f"{r.best_payload_position.to('mm').magnitude[1]:.2f}) mm, carries "
                                  f"{r.best_payload.to('N').magnitude / g * 1e3:.4g} g"),
        ("stiffness heave", f"{r.stiffness_heave.to('N/m').magnitude:.4g} N/m"),
        ("stiffness pitch / roll", f"{r.stiffness_pitch.to('mN*m/rad').magnitude:.4g} / "
                                   f"{r.stiffness_roll.to('mN*m/rad').magnitude:.4g} mN·m/rad"),
        ("Baudoin number", f"{r.baudoin_number:.3g} (weight / (σ × contact perimeter); < 1 needed)"),
    ]
    if r.tipping:
        pm = r.tipping_payload.to("N").magnitude / g * 1e3
        tips = ", ".join(f"{t['direction']} {t['offset_m'] * 1e3:.3g} mm" if t["offset_m"] is not None
                         else f"{t['direction']} none" for t in r.tipping)
        rows.append((f"{pm:.3g} g payload tips a leg past its limit at", tips + " from the centre of mass"))
    print_table(title or "Whole device: static equilibrium and margins", rows)
    print()
    w = max(len(e.name) for e in r.elements)
    print(f"  {'element':<{w}}  {'force':>9}  {'share':>6}  {'depth':>8}  {'limit':>9}  {'margin':>6}")
    for e in r.elements:
        print(f"  {e.name:<{w}}  {e.force.to('mN').magnitude:7.4g}mN  {e.share * 100:5.1f}%  "
              f"{e.depth.to('mm').magnitude:6.3g}mm  {e.limit_force.to('mN').magnitude:7.4g}mN  {e.margin * 100:5.1f}%")
    notes = [*r.warnings, *r.cautions]
    if notes:
        print()
        for n in notes:
            print(f"  note: {n}")
