"""Speed of the display's plan and checks (run by hand, prints figures).

    .venv/bin/python benchmarks/bench_display.py

Figures: planning the demo's dials, hands and knob; every display check on the demo;
and the worst case of the joint-cycle check, two hands whose sweeps overlap followed
through the largest number of time steps it allows (``MAX_CYCLE_SAMPLES``).
"""

from __future__ import annotations

import time
from pathlib import Path

from wheelgen.design import load_design, loads_design
from wheelgen.display import checks, motion, plan

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "wheelgen" / "designs" / "harbour_tide_clock.toml"

# Two hands 55 mm apart, 30 mm long, whose sweeps overlap; "c" turns 2 x 97/89 times per turn of
# the drive "a", so the pair repeats only after 89 turns of the drive.
PAIR = """
[design]
title = "bench: a long joint cycle"
[process]
cutter = 0.3
[frame]
plates = [0.0, 20.0]
[drive]
arbor = "a"
period = "1 h"
[[arbor]]
name = "a"
at = [0.0, 0.0]
[[arbor]]
name = "b"
[[arbor]]
name = "c"
[[wheel]]
name = "wa"
arbor = "a"
teeth = 40
height = 5.0
[[wheel]]
name = "wb"
arbor = "b"
teeth = 20
height = 5.0
module = 1.0
[[wheel]]
name = "b2"
arbor = "b"
teeth = 97
height = 10.0
module = 0.5
[[wheel]]
name = "wc"
arbor = "c"
teeth = 89
height = 10.0
module = 0.5
[[mesh]]
pair = ["wa", "wb"]
bearing = 0.0
[[mesh]]
pair = ["b2", "wc"]
bearing = 90.0
[[hand]]
arbor = "a"
length = 30.0
[[hand]]
arbor = "c"
length = 30.0
"""


def best_of(fn, runs: int = 3) -> float:  # type: ignore[no-untyped-def]
    best = float("inf")
    for _ in range(runs):
        t = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t)
    return best


def main() -> None:
    demo = load_design(DEMO)
    t = best_of(lambda: plan._Planner(demo).plan())
    print(f"demo: display plan {t * 1000:.1f} ms (best of 3, layout cached)")

    def demo_checks() -> None:
        plan.display_plan.cache_clear()
        checks.display_findings(demo)

    t = best_of(demo_checks)
    print(f"demo: every display check, plan included {t * 1000:.1f} ms")
    pair = loads_design(PAIR, "pair.toml")
    found = []

    def run() -> None:
        plan.display_plan.cache_clear()
        found[:] = checks.display_findings(pair)

    t = best_of(run, 1)
    clash = [f for f in found if f.check == "display.hand_clash"]
    turns = motion.joint_cycle_turns(pair, ("a", "c"))
    print(
        f"two hands through a joint cycle of {turns} drive turns: {t:.2f} s"
        f" ({'a meeting found' if clash else 'clear'};"
        f" at most {checks.MAX_CYCLE_SAMPLES:,} steps of {checks._STEP_DEG} degrees)"
    )


if __name__ == "__main__":
    main()
