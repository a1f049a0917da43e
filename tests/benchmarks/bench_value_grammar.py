"""Benchmark: the value grammar of floatcalc.units against pint's own expression parser.

Measured side by side in one run on the same texts:

* ``value_grammar_per_s``: ``to_si(text, kind, field)`` calls per second on 12 ordinary value
  texts (``"0.25 mm"``, ``"72 mN/m"``, ``"1000 kg/m^3"``, ``"20 °C"``, ...), best repeat;
* ``value_baseline_pint_per_s``: the former way, ``ureg.Quantity(text).to(si_unit)`` with the
  same registry on the same texts (pint evaluates the text as an expression);
* ``value_grammar_worst_hostile_cpu_s``: largest CPU time of one ``to_si`` call on hostile
  texts (power towers, 10 kB unit strings, huge exponents; each refused);
* ``value_baseline_tower_s``: wall time of the former parser on ``"9**9**9 mm"`` in a child
  process, stopped after a time limit (``value_baseline_tower_finished`` 0 means it was still
  busy when stopped); the grammar refuses the same text in microseconds.
"""

from __future__ import annotations

import subprocess
import sys
import time

TARGETS = {
    "value_grammar_worst_hostile_cpu_s": ("<=", 0.01),
}

ORDINARY = [
    ("0.25 mm", "length"), ("150 um", "length"), ("1e-3 m", "length"), ("150 deg", "angle"),
    ("20 °C", "temperature"), ("300 K", "temperature"), ("72 mN/m", "surface_tension"),
    ("1000 kg/m^3", "density"), ("7.85 g/cm^3", "density"), ("35 g/kg", "salinity"),
    ("5 mN", "force"), ("1 mPa*s", "viscosity"),
]
HOSTILE = [
    "9**9**9**9 mm", "2**2**2**2**2 mm", "10**400 mm", "1e999 mm", "(1+1) mm", "x" * 10240,
    "1 " + "m*" * 5000 + "m", "1 " + "m" * 10000, "9" * 40 + " mm", "0,6mm", "22 C", "mm",
]
_SI = {"length": "m", "angle": "rad", "temperature": "K", "surface_tension": "N/m",
       "density": "kg/m**3", "salinity": "g/kg", "force": "N", "viscosity": "Pa*s"}


def _rate(fn, n: int, repeats: int) -> float:
    best = float("inf")
    for _ in range(repeats):
        t0 = time.perf_counter()
        for _ in range(n):
            fn()
        best = min(best, time.perf_counter() - t0)
    return n / best


def run(quick: bool = False) -> dict:
    import floatcalc.units as units
    from floatcalc.errors import InputError
    from floatcalc.units import registry, to_si

    if not hasattr(units, "unit_text"):  # a floatcalc from before the grammar would hang below
        raise RuntimeError(f"{units.__file__} has no value grammar; run with this tree on sys.path")

    ureg = registry()
    to_si("1 mm", "length", "x")  # registry built before timing
    n, repeats = (20, 3) if quick else (100, 5)

    def grammar():
        for text, kind in ORDINARY:
            to_si(text, kind, "x")

    def baseline():
        for text, kind in ORDINARY:
            ureg.Quantity(text.replace("°C", " degC")).to(_SI[kind])

    worst = 0.0
    for text in HOSTILE:
        t0 = time.process_time()
        try:
            to_si(text, "temperature" if text == "22 C" else "length", "x")
        except InputError:
            pass
        worst = max(worst, time.process_time() - t0)

    limit = 3.0 if quick else 10.0
    probe = "from floatcalc.units import registry; registry().Quantity('9**9**9 mm')"
    t0 = time.perf_counter()
    try:
        subprocess.run([sys.executable, "-c", probe], timeout=limit, capture_output=True)
        finished = 1
    except subprocess.TimeoutExpired:
        finished = 0
    tower = time.perf_counter() - t0
    return {
        "value_grammar_per_s": _rate(grammar, n, repeats) * len(ORDINARY),
        "value_baseline_pint_per_s": _rate(baseline, n, repeats) * len(ORDINARY),
        "value_grammar_worst_hostile_cpu_s": worst,
        "value_baseline_tower_s": tower,
        "value_baseline_tower_finished": finished,
    }


if __name__ == "__main__":  # pragma: no cover
    print(run(quick="--quick" in sys.argv))
