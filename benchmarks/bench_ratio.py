"""Speed and memory of the tooth-count search (run by hand, prints figures).

    .venv/bin/python benchmarks/bench_ratio.py            # the cases below
    .venv/bin/python benchmarks/bench_ratio.py --growth   # plus cost vs range/stages

Each case runs in a fresh interpreter so its peak memory (max RSS) is its own and the
product tables are built from scratch (no cache from an earlier case).
Targets: 3 stages, teeth 10..150, non-exact target < 2 s; 4 stages < 30 s, < 2 GiB;
the 2,000 best trains of a 3-stage year search (teeth 10..120) in a few seconds, the
search alone and the whole command (which also lays out every train); a search beyond
the budget refused at once.
"""

from __future__ import annotations

import json
import resource
import subprocess
import sys
import time

CASE = r"""
import json, resource, sys, time
from wheelgen.kinematics.ratio_search import Limits, search_cost, search_trains
from wheelgen.kinematics.ratio_search import stage_counts
from wheelgen.kinematics.ratio_search import _products  # table size, for the figures
from wheelgen.kinematics.ratio_target import parse_target
target, lo, hi, k, top = sys.argv[1], *map(int, sys.argv[2:6])
goal = parse_target(target)
limits = Limits(teeth=(lo, hi), stages=k)
estimate = search_cost(limits).seconds
t0, c0 = time.perf_counter(), time.process_time()
found = search_trains(goal.value, limits, top=top, one_pairing=True)
seconds, cpu = time.perf_counter() - t0, time.process_time() - c0
rss_mib = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
size = len(_products(stage_counts(limits, k))[0])
best = found[0]
print(json.dumps({"seconds": seconds, "cpu": cpu, "rss_mib": rss_mib, "products": size,
                  "estimate": estimate, "trains": len(found),
                  "best": " x ".join(f"{a}/{b}" for a, b in best.stages),
                  "error_ppm": best.error_ppm}))
"""

MONTH = "27.321661 d per 365.2422 d"
YEAR = "365.2422 d per 1 d"


def run(
    lo: int, hi: int, k: int, target: str = MONTH, top: int = 10
) -> dict[str, object]:
    out = subprocess.run(
        [sys.executable, "-c", CASE, target, str(lo), str(hi), str(k), str(top)],
        capture_output=True,
        text=True,
        check=True,
    )
    return json.loads(out.stdout)


def show(label: str, r: dict[str, object]) -> None:
    print(
        f"{label:<40} {r['seconds']:6.2f} s ({r['cpu']:5.2f} s CPU)"
        f" {r['rss_mib']:5.0f} MiB"
        f"  |P_k| {r['products']:>10,}  est. {r['estimate']:6.2f} s"
        f"  {r['trains']:>5} trains, best {r['best']} ({r['error_ppm']:+.3g} ppm)"
    )


def command(*args: str) -> tuple[float, float, int]:
    """Wall time, CPU time and exit status of one ``wheelgen ratio`` command."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    out = subprocess.run(
        [sys.executable, "-m", "wheelgen", "ratio", *args], capture_output=True
    )
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = after.ru_utime + after.ru_stime - before.ru_utime - before.ru_stime
    return time.perf_counter() - t0, cpu, out.returncode


def main() -> None:
    print("search alone, one_pairing, stages 1..k\n")
    show("month, 3 stages, teeth 10..150", run(10, 150, 3))
    show("month, 4 stages, teeth 10..150", run(10, 150, 4))
    show("year, 3 stages, teeth 10..120, top 300", run(10, 120, 3, YEAR, 300))
    show("year, 3 stages, teeth 10..120, top 2000", run(10, 120, 3, YEAR, 2000))
    print("\nthe whole command (start, search, layout of every train, table):\n")
    for label, args in (
        ("year, 3 stages, top 2000", (YEAR, "--stages", "3", "--top", "2000")),
        ("1/12 coaxial, teeth 8-300", ("1/12", "--coaxial", "--teeth", "8-300")),
        (
            "refused: 4 stages, teeth 10-300",
            ("12", "--teeth", "10-300", "--stages", "4"),
        ),
        (
            "refused: 3 stages, teeth 3-2000",
            ("12", "--teeth", "3-2000", "--stages", "3"),
        ),
    ):
        seconds, cpu, code = command(*args)
        print(f"{label:<40} {seconds:6.2f} s ({cpu:5.2f} s CPU)  exit {code}")
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
