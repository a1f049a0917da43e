"""Run floatcalc's benchmarks side by side in one process and print figures against targets.

Usage::

    python tests/benchmarks/run.py [--quick] [--json]

Each sibling module ``bench_<name>.py`` provides ``run(quick: bool) -> dict`` of figures and
may provide ``TARGETS = {key: (op, value)}`` with op one of ``>=``, ``<=``, ``==``. Known
modules that are absent are reported as "not available"; a module that raises is reported
with its error and the others still run. ``--quick`` uses fewer repeats and smaller baseline
subsets (under a minute in total). Exit code 1 if any figure misses its target. The number
of cores and the 1-minute load average before and after are printed with the figures: on a
shared machine other jobs slow every timing.
These scripts are not collected by pytest (``norecursedirs`` in pyproject.toml).
"""

from __future__ import annotations

import argparse
import importlib.util
import json
import math
import operator
import os
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
KNOWN = ("bench_import", "bench_rod", "bench_axisym", "bench_device", "bench_uncertainty")
OPS = {">=": operator.ge, "<=": operator.le, "==": operator.eq}


def _modules():
    names = list(KNOWN) + sorted(p.stem for p in HERE.glob("bench_*.py") if p.stem not in KNOWN)
    for name in names:
        path = HERE / f"{name}.py"
        if not path.exists():
            yield name, None
            continue
        spec = importlib.util.spec_from_file_location(name, path)
        mod = importlib.util.module_from_spec(spec)
        spec.loader.exec_module(mod)
        yield name, mod


def _fmt(v) -> str:
    if isinstance(v, bool):
        return str(v)
    if isinstance(v, (int, float)):
        return f"{v:.4g}" if math.isfinite(v) else str(v)
    return str(v)


def collect(quick: bool) -> dict:
    report = {"quick": quick, "modules": {}, "results": {}, "targets": {}, "pass": {}}
    # Other people's jobs on a shared machine slow every figure; record the conditions.
    report["results"]["machine_cores"] = os.cpu_count()
    report["results"]["load_average_1min_before"] = _load()
    t_start = time.perf_counter()
    for name, mod in _modules():
        if mod is None:
            report["modules"][name] = "not available"
            continue
        t0 = time.perf_counter()
        try:
            figures = mod.run(quick)
        except Exception as exc:  # a broken benchmark must not hide the others' figures
            report["modules"][name] = f"error: {type(exc).__name__}: {exc}"
            continue
        report["modules"][name] = f"ok ({time.perf_counter() - t0:.1f} s)"
        targets = getattr(mod, "TARGETS", {})
        for key, value in figures.items():
            report["results"][key] = value
            if key in targets:
                op, goal = targets[key]
                report["targets"][key] = f"{op} {goal:g}"
                report["pass"][key] = bool(OPS[op](value, goal))
    report["results"]["load_average_1min_after"] = _load()
    report["elapsed_s"] = time.perf_counter() - t_start
    return report


def _load() -> float | str:
    try:
        return os.getloadavg()[0]
    except (AttributeError, OSError):  # not available on this platform
        return "n/a"



def print_table(report: dict) -> None:
    rows = [("key", "value", "target", "result")]
    for key, value in report["results"].items():
        ok = report["pass"].get(key)
        rows.append((key, _fmt(value), report["targets"].get(key, "-"),
                     "-" if ok is None else ("pass" if ok else "FAIL")))
    widths = [max(len(r[i]) for r in rows) for i in range(4)]
    for i, r in enumerate(rows):
        print("  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip())
        if i == 0:
            print("  ".join("-" * w for w in widths))
    print()
    for name, state in report["modules"].items():
        print(f"{name}: {state}")
    n_fail = sum(not v for v in report["pass"].values())
    print(f"\n{len(report['pass']) - n_fail} pass, {n_fail} fail; "
          f"{'quick' if report['quick'] else 'full'} run took {report['elapsed_s']:.1f} s")


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="fewer repeats, smaller baseline subsets (< 60 s)")
    ap.add_argument("--json", action="store_true", help="print the figures as JSON")
    args = ap.parse_args(argv)
    report = collect(args.quick)
    if args.json:
        json.dump(report, sys.stdout, indent=2)
        sys.stdout.write("\n")
    else:
        print_table(report)
    return 0 if all(report["pass"].values()) else 1


if __name__ == "__main__":
    sys.exit(main())
