"""Large and hostile trains, run by hand: ``.venv/bin/python benchmarks/bench_large_train.py``.

Each case runs as its own ``wheelgen`` process (interpreter start included), stopped
after 120 s; the figures are its wall time and its peak memory (largest resident set).

1. ``wheelgen check`` of chains of N arbors (two wheels each, N - 1 meshes, N from 250 to
   the 2000 the bounds allow): every pair alike, pairs of 350 kinds (each kind of pair
   is worked out once), the pairs alike in a frame (plates, pillars and their checks),
   and every pair different (N from 100 to 400: each pair costs its own simulation). Target: the time per arbor does not grow with N (no worse than
   linear).
2. The hostile cases that used to run for minutes or out of memory. Target: each ends
   with exit 1 or 2 within 15 s and under 500 MB.

``--quick`` runs only the cases of part 2 and the two smallest chains.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
DEMO = ROOT / "wheelgen" / "designs" / "harbour_tide_clock.toml"
LIMIT_S = 120.0


def chain(count: int, kinds: str) -> str:
    """A train of ``count`` arbors in a line, each driving the next (derived layout:
    wheels on three heights, so no wheel meets one it does not mesh with).

    ``kinds``: ``"alike"`` (every pair 30:30; ``"frame"``: the same between plates),
    ``"350"`` (pairs of 350 kinds) or
    ``"all"`` (every pair different: 30 + i teeth driven by 12).
    """
    out = ['[design]\ntitle = "chain"\n[drive]\narbor = "a0"\nperiod = "1 h"\n']
    if kinds == "all":
        out[0] += "[defaults]\nmodule = 0.5\n"
    if kinds == "frame":
        out[0] += "[frame]\nplates = [0.0, 24.0]\n"
    for i in range(count):
        zw, zp = {
            "alike": (30, 30),
            "frame": (30, 30),
            "350": (30 + (i * 7) % 50, 12 + (i * 3) % 7),
            "all": (30 + i, 12),
        }[kinds]
        at = "at = [0.0, 0.0]\n" if i == 0 else ""
        out.append(f'[[arbor]]\nname = "a{i}"\n{at}')
        out.append(
            f'[[wheel]]\nname = "w{i}"\narbor = "a{i}"\nteeth = {zw}\n'
            f"height = {2.0 + 6 * (i % 3)}\n"
        )
        out.append(
            f'[[wheel]]\nname = "p{i}"\narbor = "a{i}"\nteeth = {zp}\n'
            f"height = {2.0 + 6 * ((i + 1) % 3)}\n"
        )
        if i:
            out.append(f'[[mesh]]\npair = ["p{i - 1}", "w{i}"]\nbearing = 0.0\n')
    return "\n".join(out)


def arbors(count: int, link: str) -> str:
    out = ['[design]\ntitle = "t"\n[drive]\narbor = "a0"\nperiod = "1 h"\n']
    out.append('[[arbor]]\nname = "a0"\nat = [0.0, 0.0]\n')
    for i in range(1, count):
        extra = (
            f'around = "a{i - 1}"' if link == "around" else f"at = [{i * 10.0}, 0.0]"
        )
        out.append(f'[[arbor]]\nname = "a{i}"\n{extra}\n')
    return "\n".join(out)


def run(args: list[str], cwd: Path) -> tuple[float, float, int | None]:
    """Wall seconds, peak resident MB and exit status of one ``wheelgen`` process."""
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    t0 = time.perf_counter()
    proc = subprocess.Popen(
        [sys.executable, "-m", "wheelgen", *args],
        cwd=cwd,
        env=env,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
        start_new_session=True,
    )
    timer = threading.Timer(LIMIT_S, lambda: os.killpg(proc.pid, signal.SIGKILL))
    timer.start()
    _, status, usage = os.wait4(proc.pid, 0)
    timer.cancel()
    seconds = time.perf_counter() - t0
    proc.returncode = os.waitstatus_to_exitcode(status)
    code = None if proc.returncode < 0 else proc.returncode
    return seconds, usage.ru_maxrss / 1024, code


def show(label: str, result: tuple[float, float, int | None], extra: str = "") -> None:
    seconds, mb, code = result
    ended = f"exit {code}" if code is not None else f"stopped at {LIMIT_S:.0f} s"
    print(f"  {label:<44} {seconds:7.2f} s {mb:7.0f} MB  {ended}{extra}", flush=True)


def main() -> None:
    quick = "--quick" in sys.argv
    with tempfile.TemporaryDirectory() as tmp:
        where = Path(tmp)
        print("hostile cases (wheelgen check unless said otherwise):")
        demo = DEMO.read_text(encoding="utf-8")
        files = {
            "module = 1e10": demo.replace("module = 1.0\nface_width", "module = 1e10\nface_width", 1),
            "50,000-level dotted key": demo + "a" + ".b" * 50_000 + " = 1\n",
            "3,000 nested tubes": arbors(3000, "around"),
            "1,000 nested tubes (under the count bound)": arbors(1000, "around"),
            "5,000 undriven arbors": arbors(5000, "at"),
        }  # fmt: skip
        for label, text in files.items():
            (where / "h.toml").write_text(text, encoding="utf-8")
            show(label, run(["check", "h.toml"], where))
        os.mkfifo(where / "fifo.toml")
        show("a FIFO as the design", run(["check", "fifo.toml"], where))
        show("/dev/zero as the design", run(["check", "/dev/zero"], where))
        show(
            "index 127 --ratio 10000000",
            run(["index", "127", "--ratio", "10000000"], where),
        )
        show(
            "gear --pin nan",
            run(["gear", "-z", "20", "-m", "1", "--pin", "nan"], where),
        )
        print("large trains, wheelgen check (time per arbor should not grow):")
        sizes = (250, 500) if quick else (250, 500, 1000, 2000)
        for kinds, counts in (
            ("alike", sizes),
            ("frame", sizes),
            ("350", sizes),
            ("all", (100, 200, 400)),
        ):
            for n in counts if not quick else counts[:2]:
                (where / "c.toml").write_text(chain(n, kinds), encoding="utf-8")
                result = run(["check", "c.toml"], where)
                label = {"alike": "pairs alike", "frame": "alike, in a frame",
                         "350": "pairs of 350 kinds",
                         "all": "every pair different"}[kinds]  # fmt: skip
                per = f"  {1000 * result[0] / n:6.1f} ms per arbor"
                show(f"{n} arbors, {label}", result, per)


if __name__ == "__main__":
    main()
