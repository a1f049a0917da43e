"""``floatcalc device``: does a whole device float, how deep and level, what it carries, what
breaks through first, and its verdict."""

from __future__ import annotations

from ._designs import add_design_choice, design_from_args
from ._format import add_json_flag, print_json, print_table

ORDER = 50


def register(sub) -> None:
    p = sub.add_parser("device", help="does a whole device float, how deep and level, how much more can it carry")
    add_design_choice(p)
    p.add_argument("--list-examples", action="store_true", help="list the built-in example designs")
    p.add_argument("--payload", default=None, help="payload to carry, e.g. 0.5g (default: the file's [load] payload)")
    p.add_argument("--payload-at", default=None,
                   help="plan position of the payload as x,y, e.g. 3mm,0mm (default: the file's, else the "
                        "centre of mass)")
    p.add_argument("--safety-factor", default=None, help="required safety factor (default: the file's, else 1)")
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
    from ..design import list_examples
    from ..device import solve_device
    from ..errors import input_error

    if args.list_examples:
        rows = list_examples()
        if args.json:
            print_json({"examples": rows})
        else:
            print_table("Built-in example designs (all invented)", [(r["name"], r["description"]) for r in rows])
        return 0
    design = design_from_args(args, "device")
    if args.payload_at is not None and args.payload is None and design.load["payload"] == 0.0:
        raise input_error("--payload-at", "needs a payload (--payload, or [load] payload in the file)", args.payload_at)
    r = solve_device(design, payload=args.payload, payload_position=_position(args.payload_at),
                     safety_factor=args.safety_factor)
    if args.json:
        print_json(r.to_dict())
        return 0
    print_device(r)
    return 0


def _mm(q) -> str:
    return f"{q.to('mm').magnitude:.3g} mm"


def _mN(q, g) -> str:
    return f"{q.to('mN').magnitude:.4g} mN = {q.to('N').magnitude / g * 1e3:.4g} g"


def print_device(r, title: str | None = None) -> None:
    """Text report of a :class:`~floatcalc.device.DeviceResult` (also used by ``floatcalc demo``)."""
    liq = r.device.liquid
    g = liq.g
    pay = r.applied_payload.magnitude > 0
    pos = r.max_payload_position.to("mm").magnitude
    where = f"({pos[0]:.2f}, {pos[1]:.2f}) mm" if pay else "the centre of mass"
    verdict = r.verdict.upper()
    if r.shortfall is not None:
        verdict += f" (short by {_mN(r.shortfall, g)})"
    if r.broken_through:
        verdict += f"; broken through: {', '.join(r.broken_through)}"
    rows = [
        ("design", r.description or "(no description)"),
        ("liquid", f"{liq.name} at {liq.T - 273.15:.1f} °C, σ = {liq.sigma * 1e3:.2f} mN/m, l_c = {liq.lc * 1e3:.3f} mm"),
        ("weight (body + elements)", _mN(r.weight, g)),
        ("payload", _mN(r.applied_payload, g) + (f" at {where}" if pay else "")),
        ("verdict", verdict),
        ("safety factor (capacity / load)", f"{r.safety_factor:.3g} (required {r.required_safety_factor:g})"
         + ("  BELOW THE REQUIRED SAFETY FACTOR" if r.below_required_safety_factor else "")),
        ("capacity (largest load, all intact)", _mN(r.capacity, g)),
        (f"max payload at {where}", _mN(r.max_payload, g)),
        ("sinking payload (elements breaking through)", _mN(r.sinking_payload, g)),
        ("first to break through", r.first_to_fail),
        ("heave (depth at origin)", _mm(r.heave)),
        ("pitch / roll", f"{r.pitch.magnitude:+.3f}° / {r.roll.magnitude:+.3f}° (+: the +x / +y side lower)"),
        ("best payload position", f"({r.best_payload_position.to('mm').magnitude[0]:.2f}, "
                                  f"{r.best_payload_position.to('mm').magnitude[1]:.2f}) mm, carries "
                                  f"{r.best_payload.to('N').magnitude / g * 1e3:.4g} g"),
        ("stiffness heave", f"{r.stiffness_heave.to('N/m').magnitude:.4g} N/m"),
        ("stiffness pitch / roll", f"{r.stiffness_pitch.to('mN*m/rad').magnitude:.4g} / "
                                   f"{r.stiffness_roll.to('mN*m/rad').magnitude:.4g} mN·m/rad"),
        ("Baudoin number", f"{r.baudoin_number:.3g} (load / (σ × contact perimeter {r.contact_perimeter.to('mm').magnitude:.4g} mm); "
                           "< 1 needed)"),
    ]
    if r.tipping:
        pm = r.tipping_payload.to("N").magnitude / g * 1e3
        tips = ", ".join(f"{t['direction']} {t['offset_m'] * 1e3:.3g} mm" if t["offset_m"] is not None
                         else f"{t['direction']} none" for t in r.tipping)
        rows.append((f"{pm:.3g} g payload breaks an element at", tips + " from the centre of mass"))
    print_table(title or "Whole device: static equilibrium, capacity and verdict", rows)
    print()
    w = max(len(_safe(e.name)) for e in r.elements)
    print(f"  {'element':<{w}}  {'force':>9}  {'share':>6}  {'depth':>8}  {'limit':>9}  {'utilisation':>11}  "
          f"{'breaks':>6}")
    for e in r.elements:
        order = "-" if e.breakthrough_order is None else f"#{e.breakthrough_order}"
        state = " (broken through)" if e.broken else ""
        print(f"  {_safe(e.name):<{w}}  {e.force.to('mN').magnitude:7.4g}mN  {e.share * 100:5.1f}%  "
              f"{e.depth.to('mm').magnitude:6.3g}mm  {e.limit_force.to('mN').magnitude:7.4g}mN  "
              f"{e.utilisation * 100:10.1f}%  {order:>6}{state}")
    notes = [*r.warnings, *r.cautions]
    if notes:
        print()
        for n in notes:
            print(f"  note: {_safe(n)}")


def _safe(text: str) -> str:
    """Control characters from a design file shown escaped, never sent to the terminal."""
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in str(text))
