"""Argument groups and output helpers shared by the study commands of the CLI (front end only).

The design of a rod set is given by options; the model and its checks live in
:mod:`floatcalc.studies.models`.
"""

from __future__ import annotations

import sys
from pathlib import Path

from ..errors import input_error
from ..units import to_si

ROD_DEFAULTS = {"radius": "0.2mm", "length": "40mm", "contact_angle": "150deg", "count": "1",
                "material_density": "7850kg/m^3", "payload": "0g"}


def add_rod_args(p, *, payload_help: str = "design payload carried besides the legs, e.g. 2g (default 0 g)") -> None:
    g = p.add_argument_group("rod legs (long horizontal legs, far apart)")
    g.add_argument("--radius", default=ROD_DEFAULTS["radius"], help="leg radius (default 0.2mm)")
    g.add_argument("--length", default=ROD_DEFAULTS["length"], help="wetted length of each leg (default 40mm)")
    g.add_argument("--contact-angle", default=ROD_DEFAULTS["contact_angle"], help="advancing contact angle (default 150deg)")
    g.add_argument("--count", default=ROD_DEFAULTS["count"], help="number of legs (default 1)")
    g.add_argument("--material-density", default=ROD_DEFAULTS["material_density"],
                   help="leg material density (default steel 7850kg/m^3, common practice)")
    g.add_argument("--payload", default=ROD_DEFAULTS["payload"], help=payload_help)


def rod_values(args) -> dict[str, float]:
    """SI base values of the rod model from the options (checked by the model)."""
    from .. import _validate as v

    return {
        "radius": v.length(args.radius, "radius"),
        "length": v.length(args.length, "length"),
        "contact_angle": v.angle(args.contact_angle, "contact_angle"),
        "count": float(v.count(args.count)),
        "material_density": v.density(args.material_density, "material_density"),
        "payload_mass": _mass(args.payload),
    }


def _mass(text) -> float:
    m = to_si(text, "mass", "payload")
    if not 0.0 <= m <= 1e3:
        raise input_error("payload", "must be from 0 to 1000 kg", f"{m:g} kg")
    return m


def add_design_args(p) -> None:
    g = p.add_argument_group("whole device (instead of the rod options)")
    g.add_argument("--design", default=None, help="device design file (TOML); see 'floatcalc device --help'")
    g.add_argument("--example", default=None, help="built-in invented device, e.g. skimmer")
    g.add_argument("--element", default="rod", help="rod legs (default), or one ball or pad (uses --radius, "
                   "--contact-angle, --material-density, --payload, --thickness)")
    g.add_argument("--thickness", default=None, help="pad thickness (default 0.5mm; with --element pad only)")


def model_from_args(args, liquid_from_args):
    """The study model the options ask for: a device (design file or example) or rod legs."""
    from .models import rod_model

    if getattr(args, "design", None) is not None or getattr(args, "example", None) is not None:
        if args.design is not None and args.example is not None:
            raise input_error("design", "give either --design or --example, not both", repr(args.design))
        from .device_model import device_model

        if (getattr(args, "element", "rod") or "rod") != "rod":
            raise input_error("--element", "applies to rod legs, a ball or a pad, not to a whole device "
                              "(--design/--example)", repr(args.element))
        if getattr(args, "thickness", None) is not None:
            raise input_error("--thickness", "applies only with --element pad, not to a whole device "
                              "(--design/--example)", args.thickness)
        for key in ("radius", "length", "contact_angle", "count", "material_density"):
            if getattr(args, key, ROD_DEFAULTS.get(key)) != ROD_DEFAULTS.get(key):
                raise input_error("--" + key.replace("_", "-"), "applies to rod legs, not to a whole device (--design/"
                                  "--example): vary radius_factor, length_factor or contact_angle_shift instead",
                                  getattr(args, key))
        if args.example is not None:
            from ..device.design import list_examples

            names = [e["name"] for e in list_examples()]
            if args.example not in names:
                raise input_error("example", f"must be one of {', '.join(names)}", repr(args.example))
            m = device_model(args.example)
        else:
            m = device_model(args.design)
        if getattr(args, "payload", None) not in (None, ROD_DEFAULTS["payload"]):
            m = _with_base(m, payload_mass=_mass(args.payload))
        if getattr(args, "surface_tension", None) is not None:
            m = _with_base(m, surface_tension=to_si(args.surface_tension, "surface_tension", "surface_tension"))
        return m
    element = getattr(args, "element", "rod") or "rod"
    if getattr(args, "thickness", None) is not None and element != "pad":
        raise input_error("--thickness", "applies only with --element pad", args.thickness)
    if element in ("ball", "pad"):
        from .. import _validate as v
        from .element_model import element_model

        vals = rod_values(args)
        base = {k: vals[k] for k in ("radius", "contact_angle", "material_density", "payload_mass")}
        if element == "pad":
            base["thickness"] = v.length(args.thickness or "0.5mm", "thickness")
        return element_model(element, liquid_from_args(args), **base)
    if element != "rod":
        raise input_error("element", "must be rod, ball or pad", repr(element))
    return rod_model(liquid_from_args(args), **rod_values(args))


def _with_base(model, **values):
    from dataclasses import replace

    model.merged(values)  # checks
    return replace(model, base={**model.base, **values})


def add_exec_args(p) -> None:
    g = p.add_argument_group("where to run (results are identical on every executor)")
    g.add_argument("--executor", default="auto", help="auto (default), serial, local (all cores) or dask")
    g.add_argument("--workers", default=None, help="local worker processes (default: all cores)")
    g.add_argument("--scheduler", default=None, help="address of a running Dask scheduler, e.g. tcp://10.0.0.5:8786")
    g.add_argument("--progress", action="store_true", help="show a progress bar on stderr (default: only on a terminal)")


def exec_kwargs(args) -> dict:
    from .executors import check_workers

    if args.workers is not None and args.executor in ("serial", "dask"):
        raise input_error("--workers", f"applies only to the local executor (--executor local or auto), not "
                          f"'{args.executor}'", args.workers)
    return {"executor": args.executor, "scheduler": args.scheduler, "workers": check_workers(args.workers),
            "progress": True if args.progress else None}


def checked_path(path: str | None, suffixes: tuple[str, ...], field: str) -> Path | None:
    """A path whose suffix is allowed and whose folder exists (checked before any work)."""
    if path is None:
        return None
    p = Path(path)
    if p.suffix.lower() not in suffixes:
        raise input_error(field, f"file name must end in {' or '.join(suffixes)}", repr(path))
    if not p.parent.exists():
        raise input_error(field, "folder does not exist", repr(str(p.parent)))
    return p


def save_figure(fig, path: Path) -> None:
    fig.savefig(path, dpi=150)
    print(f"plot written to {path}", file=sys.stderr)


def notes(*groups) -> list[str]:
    out: list[str] = []
    for g in groups:
        for s in g:
            if s not in out:
                out.append(s)
    return out
