"""Benchmark: cost of ``import floatcalc`` in a fresh interpreter, and what it pulls in.

* ``import_s``: wall time of ``python -c "import floatcalc"`` in a subprocess, best of 5,
  nothing subtracted (interpreter start-up included);
* ``python_startup_s``: the same for ``python -c "pass"``, printed beside it for comparison;
* ``import_pulls_heavy``: 1 if ``import floatcalc`` loads any of matplotlib, streamlit, scipy or
  pint (checked in ``sys.modules`` of a fresh subprocess), else 0; ``import_heavy_modules``
  names them.
"""

from __future__ import annotations

import json
import math
import subprocess
import sys
import time

TARGETS = {
    "import_s": ("<=", 0.3),
    "import_pulls_heavy": ("==", 0),
}

HEAVY = ("matplotlib", "streamlit", "scipy", "pint")


def _wall(code: str, repeats: int = 5) -> float:
    best = math.inf
    for _ in range(repeats):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-c", code], check=True, capture_output=True)
        best = min(best, time.perf_counter() - t0)
    return best


def run(quick: bool = False) -> dict:
    probe = (
        "import sys, json, floatcalc; "
        f"print(json.dumps([m for m in {HEAVY!r} if m in sys.modules]))"
    )
    out = subprocess.run([sys.executable, "-c", probe], check=True, capture_output=True, text=True)
    heavy = json.loads(out.stdout)
    return {
        "import_s": _wall("import floatcalc"),
        "python_startup_s": _wall("pass"),
        "import_pulls_heavy": int(bool(heavy)),
        "import_heavy_modules": ", ".join(heavy) or "none",
    }


if __name__ == "__main__":  # pragma: no cover
    print(run())
