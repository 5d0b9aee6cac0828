"""Measure how default triangular pairs run (run by hand; prints the figures that
docs/format.md quotes in "Triangular teeth that run").

    .venv/bin/python benchmarks/triangular_margins.py            # a sample of counts
    .venv/bin/python benchmarks/triangular_margins.py --full     # the whole grid

For every ordered pair of tooth counts (the first drives) at module 1 and the standard
centre distance, with the default proportions of each process:

- k: the least backlash that runs (no margin), over m (1/z1 + 1/z2); the default
  backlash assumes ``TRIANGULAR_BACKLASH_FACTOR`` for it;
- spare: the least play with the default backlash, less the process's smallest
  backlash (must stay >= 0);
- te: the transmission error over one pitch, as a share of the driven pitch (the
  checks warn above 0.1);
- clearance: tip circle to the mate's root, x module.

The simulator turns each pair exactly as the checks do (``CHECK_STEPS`` per pitch).
"""

from __future__ import annotations

import math
import sys
import time

from wheelgen.checks.mesh_sim import CHECK_STEPS, simulate_mesh
from wheelgen.design.model import Process
from wheelgen.design.process_limits import min_backlash
from wheelgen.design.tooth_defaults import (
    TRIANGULAR_BACKLASH_FACTOR,
    tooth_defaults,
)
from wheelgen.teeth.forms import outline_for
from wheelgen.teeth.spec import ToothSpec

SAMPLE = (10, 11, 12, 13, 15, 17, 20, 24, 30, 37, 48, 60, 80, 101, 127, 173, 240, 300)
FULL = tuple(
    sorted(set(range(10, 31)) | set(range(32, 61, 4)) | set(range(70, 301, 10)))
)


def spec(z: int, process: Process, thinned: bool) -> ToothSpec:
    values = tooth_defaults("triangular", z, 1.0, process)
    backlash = values.pop("backlash")
    return ToothSpec(
        z, 1.0, form="triangular", thinning=backlash / 2 if thinned else 0.0, **values
    )


def measure(counts: tuple[int, ...], kind: str) -> None:
    process = Process(kind=kind)  # type: ignore[arg-type]
    margin = min_backlash(process)
    bare = {z: outline_for(spec(z, process, False)) for z in counts}
    dressed = {z: outline_for(spec(z, process, True)) for z in counts}
    k_max, k_at = 0.0, (0, 0)
    spare_min, spare_at = math.inf, (0, 0)
    te_max, te_at = 0.0, (0, 0)
    clear_min = math.inf
    bad = []
    t0 = time.perf_counter()
    for z1 in counts:
        for z2 in counts:
            a = (z1 + z2) / 2
            r2 = z2 / 2
            sim0 = simulate_mesh(bare[z1], bare[z2], a, steps=CHECK_STEPS)
            k = -math.radians(sim0.min_play_deg) * r2 / (1 / z1 + 1 / z2)
            if k > k_max:
                k_max, k_at = k, (z1, z2)
            sim = simulate_mesh(dressed[z1], dressed[z2], a, steps=CHECK_STEPS)
            if sim.jams or sim.contact_lost:
                bad.append((z1, z2))
                continue
            spare = math.radians(sim.min_play_deg) * r2 - margin
            if spare < spare_min:
                spare_min, spare_at = spare, (z1, z2)
            te = sim.te_peak_to_peak_deg / (360.0 / z2)
            if te > te_max:
                te_max, te_at = te, (z1, z2)
            o1, o2 = dressed[z1], dressed[z2]
            clear_min = min(
                clear_min,
                a - o1.radii["tip"] - o2.radii["root"],
                a - o2.radii["tip"] - o1.radii["root"],
            )
    n = len(counts) ** 2
    print(
        f"{kind:5} {n} pairs in {time.perf_counter() - t0:.0f} s: "
        f"k max {k_max:.3f} at {k_at} (default assumes {TRIANGULAR_BACKLASH_FACTOR}); "
        f"spare play min {spare_min:+.4f} mm at {spare_at} (margin {margin} mm); "
        f"TE max {te_max:.3f} of a pitch at {te_at}; "
        f"clearance min {clear_min:.3f} m; not running: {bad or 'none'}"
    )


def main() -> None:
    counts = FULL if "--full" in sys.argv else SAMPLE
    print(f"tooth counts: {counts[0]} to {counts[-1]}, {len(counts)} of them")
    for kind in ("hand", "mill", "print"):
        measure(counts, kind)


if __name__ == "__main__":
    main()
