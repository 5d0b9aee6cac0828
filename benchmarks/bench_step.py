"""STEP size and speed, run by hand: ``.venv/bin/python benchmarks/bench_step.py``.

Prints, for involute wheels of module 1 (face 3 mm, bore):

1. per tooth count from 12 to 400: the STEP file's size in all and per tooth (target:
   at most 10 kB per tooth), the time to build the solid and to write the file per
   tooth (best of three), the processor time of both per tooth (best of five; the
   measure to compare when the machine is shared), and the time the kernel takes to
   read the file back;
2. the bundled demo's STEP files (every part and ``assembly.step``): their sizes, the
   time to write them, and the kernel's read time of the assembly.

The kernel import is not timed. ``--quick`` skips the demo.
"""

from __future__ import annotations

import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

import cadquery as cq  # noqa: E402  (imported up front: its start-up is not measured)

from wheelgen.export.build import BuildOptions, build_design  # noqa: E402
from wheelgen.export.step import write_step  # noqa: E402
from wheelgen.layout.part_kinds import WheelPart  # noqa: E402
from wheelgen.solids.wheel import make_wheel  # noqa: E402
from wheelgen.teeth.spec import ToothSpec  # noqa: E402

TEETH = (12, 25, 50, 100, 127, 200, 400)


def _best(fn, runs: int = 3, clock=time.perf_counter) -> tuple[float, object]:
    best, out = float("inf"), None
    for _ in range(runs):
        t0 = clock()
        out = fn()
        best = min(best, clock() - t0)
    return best, out


def _fresh_wheel(part: WheelPart) -> object:
    # time the flank fits too: forget the fits kept from an earlier run
    fits = sys.modules.get("wheelgen.solids.spline_fit")
    if fits is not None:
        fits._fit_kept.cache_clear()
    return make_wheel(part)


def wheels(out: Path) -> None:
    print(
        "teeth   STEP kB   kB/tooth   solid ms/tooth   write ms/tooth   "
        "CPU ms/tooth   read s"
    )
    for z in TEETH:
        part = WheelPart(f"w{z}", ToothSpec(z, 1.0), 3.0, 6.0 if z >= 40 else 2.0)
        path = out / f"w{z}.step"
        t_solid, solid = _best(lambda part=part: _fresh_wheel(part))
        t_write, _ = _best(lambda s=solid, p=path: write_step(s, p, "w"))
        # the processor time of both (less disturbed by other work on the machine)
        t_cpu, _ = _best(
            lambda part=part, p=path: write_step(_fresh_wheel(part), p, "w"),
            5,
            time.process_time,
        )
        t_read, _ = _best(lambda p=path: cq.importers.importStep(str(p)), 2)
        size = path.stat().st_size
        print(
            f"{z:5d}   {size / 1e3:7.0f}   {size / 1e3 / z:8.2f}   "
            f"{1e3 * t_solid / z:14.2f}   {1e3 * t_write / z:14.2f}   "
            f"{1e3 * t_cpu / z:12.2f}   {t_read:6.2f}"
        )


def demo(out: Path) -> None:
    from wheelgen.cli._common import DEFAULT_DESIGN
    from wheelgen.design import load_design

    design = load_design(DEFAULT_DESIGN)
    target = out / "demo"
    options = BuildOptions(formats=("step",), use_cache=False)
    t0 = time.perf_counter()
    build_design(design, target, options)
    t_build = time.perf_counter() - t0
    files = sorted((target / "step").glob("*.step"))
    total = sum(p.stat().st_size for p in files)
    assy = target / "step" / "assembly.step"
    t_read, _ = _best(lambda: cq.Assembly.importStep(str(assy)), 1)
    print(
        f"demo: {len(files)} STEP files {total / 1e6:.2f} MB "
        f"(assembly.step {assy.stat().st_size / 1e6:.2f} MB); "
        f"checks + solids + STEP {t_build:.1f} s; the kernel reads the assembly in "
        f"{t_read:.1f} s"
    )


def main() -> None:
    with tempfile.TemporaryDirectory() as tmp:
        wheels(Path(tmp))
        if "--quick" not in sys.argv:
            demo(Path(tmp))


if __name__ == "__main__":
    main()
