"""Outline generation cost against tooth count (run by hand, prints figures).

    .venv/bin/python benchmarks/bench_outline.py

Targets (issue): cost linear in z; a 2000-tooth outline under 50 ms. Times are the
best of several runs on this machine; "outline" is outline_for (one tooth generated,
the chain repeated), "polyline" adds the whole wheel as points at 1 micrometre chord
tolerance, "svg" the 1:1 drawing text.
"""

from __future__ import annotations

import time

from wheelgen.teeth import ToothSpec, outline_for, outline_svg


def best(fn, repeat: int = 7) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return min(times)


def main() -> None:
    print(
        f"{'z':>6} {'form':>10} {'outline ms':>11} {'polyline ms':>12} "
        f"{'points':>8} {'svg ms':>8}"
    )
    for form in ("involute", "triangular"):
        for z in (10, 100, 500, 1000, 2000, 4000):
            spec = ToothSpec(
                z, 0.5, form=form, root_radius=0.38 if form == "involute" else 0.1
            )
            t_out = best(lambda spec=spec: outline_for(spec))
            outline = outline_for(spec)
            t_poly = best(lambda o=outline: o.polyline(0.001))
            n = len(outline.polyline(0.001))
            t_svg = (
                best(lambda o=outline: outline_svg(o), repeat=3)
                if z <= 2000
                else float("nan")
            )
            print(
                f"{z:>6} {form:>10} {t_out * 1e3:>11.2f} "
                f"{(t_out + t_poly) * 1e3:>12.2f} "
                f"{n:>8} {t_svg * 1e3:>8.1f}"
            )


if __name__ == "__main__":
    main()
