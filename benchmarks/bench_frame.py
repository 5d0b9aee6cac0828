"""Speed of planning the frame (run by hand, prints figures).

    .venv/bin/python benchmarks/bench_frame.py [design.toml]

Plans the frame (zones, holes, cocks, pillars, outline, screws) of a design, and of a
long train of our own (arbors in a zig-zag, two wheels each
(see :func:`long_train`) to see how the work grows. The frame is planned during every
`wheelgen check`, so it should stay a small part of the checks' one second.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEFAULT = ROOT / "wheelgen" / "designs" / "harbour_tide_clock.toml"


def long_train(arbors: int = 20) -> str:
    """A chain of ``arbors`` arbors, a 40-tooth wheel driving a 12-tooth pinion each."""
    lines = [
        "[design]",
        'title = "long train (benchmark)"',
        "[frame]",
        f"plates = [0.0, {4.0 * arbors + 10.0}]",
        "[drive]",
        'arbor = "a0"',
        'period = "1 h"',
    ]
    for i in range(arbors):
        lines += ["[[arbor]]", f'name = "a{i}"'] + (
            ["at = [0.0, 0.0]"] if i == 0 else []
        )
        lines += [
            "[[wheel]]", f'name = "p{i}"', f'arbor = "a{i}"', "teeth = 12",
            f"height = {2.0 + 4.0 * i}", "shift = 0.4",
            "[[wheel]]", f'name = "w{i}"', f'arbor = "a{i}"', "teeth = 40",
            f"height = {2.0 + 4.0 * (i + 1)}",
        ]  # fmt: skip
    for i in range(arbors - 1):
        bearing = 30.0 if i % 2 == 0 else -30.0
        lines += ["[[mesh]]", f'pair = ["w{i}", "p{i + 1}"]', f"bearing = {bearing}"]
    return "\n".join(lines) + "\n"


def bench(design, label: str, runs: int = 3) -> None:
    from wheelgen.frame.checks import findings_for_frame
    from wheelgen.frame.plan import _plan
    from wheelgen.layout.train_layout import plan_layout

    layout = plan_layout(design)
    best = float("inf")
    plan = None
    for _ in range(runs):
        t = time.perf_counter()
        plan = _plan(layout)  # uncached
        findings_for_frame(plan)
        best = min(best, time.perf_counter() - t)
    assert plan is not None
    print(
        f"{label}: plan and check the frame {best:.3f} s (best of {runs}); "
        f"{len(plan.zones)} zones, {len(plan.pillars)} pillars, {len(plan.cocks)} cocks"
    )


if __name__ == "__main__":
    from wheelgen.design import load_design, loads_design

    path = Path(sys.argv[1]) if len(sys.argv) > 1 else DEFAULT
    bench(load_design(path), path.name)
    for n in (10, 20, 40):
        bench(loads_design(long_train(n), f"long{n}.toml"), f"long train, {n} arbors")
