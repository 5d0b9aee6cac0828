"""Stopping a parallel build: SIGTERM and Ctrl-C stop the workers with the parent, a
killed parent's workers end by themselves, and the earlier output stays as it was.

Each build runs in a session of its own, so its process group holds the command, the
kernel's process server and the workers; the test looks the group up in /proc.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from tests._demo import DEMO

pytest.importorskip("cadquery")

pytestmark = [
    pytest.mark.cad,
    pytest.mark.slow,
    pytest.mark.skipif(
        not Path("/proc/self/stat").exists(), reason="reads processes from /proc"
    ),
]

# Deadlines of the waits below: a stuck build or a worker left behind fails the test
# when they pass (they bound the wait; nothing is timed).
_START_S, _END_S = 180.0, 30.0


def group(pgid: int) -> list[int]:
    """Live processes of process group ``pgid`` (zombies left out)."""
    out = []
    for entry in os.listdir("/proc"):
        if not entry.isdigit():
            continue
        try:
            text = Path(f"/proc/{entry}/stat").read_text()
        except OSError:
            continue
        fields = text.rsplit(")", 1)[1].split()
        if int(fields[2]) == pgid and fields[0] != "Z":
            out.append(int(entry))
    return out


def tree(root: Path) -> dict[str, bytes]:
    return {
        p.relative_to(root).as_posix(): p.read_bytes()
        for p in sorted(root.rglob("*"))
        if p.is_file()
    }


def wait_for(condition, deadline_s: float) -> bool:
    end = time.monotonic() + deadline_s
    while time.monotonic() < end:
        if condition():
            return True
        time.sleep(0.2)
    return condition()


@pytest.mark.parametrize("sig", [signal.SIGTERM, signal.SIGINT, signal.SIGKILL])
def test_a_stopped_build_leaves_no_process_and_no_damage(tmp_path, sig):
    out = tmp_path / "out"
    wheelgen = [sys.executable, "-m", "wheelgen", "build", str(DEMO), "-o", str(out)]
    quick = subprocess.run([*wheelgen, "--formats", "dxf"], capture_output=True)
    assert quick.returncode == 0, quick.stderr
    earlier = tree(out)
    proc = subprocess.Popen(
        [*wheelgen, "--formats", "step", "--jobs", "2", "--no-cache"],
        start_new_session=True,
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        cwd=tmp_path,
    )
    try:
        # the command, the process server and two workers
        assert wait_for(lambda: len(group(proc.pid)) >= 3, _START_S), group(proc.pid)
        os.kill(proc.pid, sig)
        _, err = proc.communicate(timeout=_END_S)
    finally:
        if proc.poll() is None:
            os.killpg(proc.pid, signal.SIGKILL)
    assert wait_for(lambda: not group(proc.pid), _END_S), group(proc.pid)
    if sig != signal.SIGKILL:
        assert proc.returncode == 128 + sig, err
        assert b"stopped" in err and b"Traceback" not in err
    assert tree(out) == earlier
    # a build killed outright leaves its staging folder; the next build sweeps it
    leftovers = [p.name for p in tmp_path.iterdir() if p.name not in ("out",)]
    assert all(name == ".wheelgen-cache" or ".staging-" in name for name in leftovers)
