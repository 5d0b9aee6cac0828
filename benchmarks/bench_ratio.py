"""Speed and memory of the tooth-count search (run by hand, prints figures).

    .venv/bin/python benchmarks/bench_ratio.py            # the two issue cases
    .venv/bin/python benchmarks/bench_ratio.py --growth   # plus cost vs range/stages

Each case runs in a fresh interpreter so its peak memory (max RSS) is its own and the
product tables are built from scratch (no cache from an earlier case).
Targets: 3 stages, teeth 10..150, non-exact target < 2 s; 4 stages < 30 s, < 2 GiB.
"""

from __future__ import annotations

import json
import subprocess
import sys

CASE = r"""
import json, resource, sys, time
from wheelgen.kinematics.ratio_search import Limits, search_trains, stage_ranges
from wheelgen.kinematics.ratio_search import _products  # table size, for the figures
from wheelgen.kinematics.ratio_target import parse_target
target, lo, hi, k = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), int(sys.argv[4])
goal = parse_target(target)
limits = Limits(teeth=(lo, hi), stages=k)
t0 = time.perf_counter()
found = search_trains(goal.value, limits, top=10)
seconds = time.perf_counter() - t0
rss_mib = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
size = len(_products(stage_ranges(limits, k))[0])
best = found[0]
print(json.dumps({"seconds": seconds, "rss_mib": rss_mib, "products": size,
                  "best": " x ".join(f"{a}/{b}" for a, b in best.stages),
                  "error_ppm": best.error_ppm}))
"""

TARGET = "27.321661 d per 365.2422 d"


def run(lo: int, hi: int, k: int, target: str = TARGET) -> dict[str, object]:
    out = subprocess.run(
        [sys.executable, "-c", CASE, target, str(lo), str(hi), str(k)],
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(out.stdout)


def show(label: str, r: dict[str, object]) -> None:
    print(
        f"{label:<34} {r['seconds']:8.2f} s {r['rss_mib']:8.0f} MiB"
        f"  |P_k| {r['products']:>10,}  best {r['best']} ({r['error_ppm']:+.3g} ppm)"
    )


def main() -> None:
    print(f"target {TARGET!r}, top 10, stages 1..k\n")
    show("3 stages, teeth 10..150", run(10, 150, 3))
    show("4 stages, teeth 10..150", run(10, 150, 4))
    if "--growth" in sys.argv:
        print("\ngrowth with range and stages:")
        for k, ranges in (
            (2, (75, 150, 300)),
            (3, (75, 150, 300)),
            (4, (40, 75, 110, 150)),
        ):
            for hi in ranges:
                show(f"{k} stages, teeth 10..{hi}", run(10, hi, k))


if __name__ == "__main__":
    main()
