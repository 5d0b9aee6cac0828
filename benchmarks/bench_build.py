"""Build benchmarks, run by hand: ``.venv/bin/python benchmarks/bench_build.py``.

Prints, best of three unless said otherwise (the kernel import is not timed):

1. one 127-tooth involute wheel (module 1, face 3 mm, 6 mm bore): solid + STEP + STL
   in one process; target under 1.5 s;
2. the same for 12..400 teeth, as milliseconds per tooth; target: flat;
3. the bundled demo built twice into a fresh folder (second build from the cache);
   target: the second at least 5x faster than the first.
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import cadquery  # noqa: E402, F401  (imported up front: its start-up is not measured)

from wheelgen.export.build import BuildOptions, build_design  # noqa: E402
from wheelgen.export.mesh import mesh_shape, write_stl  # noqa: E402
from wheelgen.export.step import write_step  # noqa: E402
from wheelgen.layout.part_kinds import WheelPart  # noqa: E402
from wheelgen.solids.wheel import make_wheel  # noqa: E402
from wheelgen.teeth.spec import ToothSpec  # noqa: E402


def wheel_once(z: int, out: Path) -> dict[str, float]:
    part = WheelPart(f"w{z}", ToothSpec(z, 1.0), 3.0, 6.0 if z >= 40 else 2.0)
    t0 = time.perf_counter()
    solid = make_wheel(part)
    t1 = time.perf_counter()
    write_step(solid, out / f"w{z}.step", part.name)
    t2 = time.perf_counter()
    write_stl(mesh_shape(solid, 0.01), out / f"w{z}.stl", part.name)
    t3 = time.perf_counter()
    return {"solid": t1 - t0, "step": t2 - t1, "stl": t3 - t2, "total": t3 - t0}


def best(z: int, out: Path, runs: int = 3) -> dict[str, float]:
    return min((wheel_once(z, out) for _ in range(runs)), key=lambda r: r["total"])


def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp)
        r = best(127, out)
        size = (
            (out / "w127.step").stat().st_size / 1e6,
            (out / "w127.stl").stat().st_size / 1e6,
        )
        print(
            f"127 teeth: solid {r['solid']:.3f} s + STEP {r['step']:.3f} s + STL "
            f"{r['stl']:.3f} s = {r['total']:.3f} s (target < 1.5 s); "
            f"STEP {size[0]:.2f} MB, STL {size[1]:.2f} MB"
        )
        print("teeth   total s   ms/tooth  (solid + STEP + STL, best of 3)")
        for z in (12, 25, 50, 100, 200, 400):
            r = best(z, out)
            print(f"{z:5d}   {r['total']:7.3f}   {1000 * r['total'] / z:8.2f}")
        from wheelgen.cli._common import DEFAULT_DESIGN
        from wheelgen.design import load_design

        design = load_design(DEFAULT_DESIGN)
        target = out / "output" / design.name
        t0 = time.perf_counter()
        first = build_design(design, target, BuildOptions())
        t1 = time.perf_counter()
        second = build_design(design, target, BuildOptions())
        t2 = time.perf_counter()
        print(
            f"demo ({len(first.files)} files): first build {t1 - t0:.2f} s "
            f"({first.built} parts built), second {t2 - t1:.2f} s ({second.reused} reused): "
            f"{(t1 - t0) / (t2 - t1):.1f}x faster (target >= 5x)"
        )


if __name__ == "__main__":
    main()
