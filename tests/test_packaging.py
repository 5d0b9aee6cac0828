"""The wheel carries what the program needs: built from this tree, installed into a
fresh environment, it checks the bundled demo when given no design file.

The fresh environment gets wheelgen only from the wheel. The libraries wheelgen uses
(numpy, click, cadquery...) are borrowed from the environment running the tests, by a
path line in a ``.pth`` file, so the test needs no network for them; a path line does
not run that environment's own ``.pth`` files, so its editable install of wheelgen
stays out of sight. The first lines of the check ask where wheelgen was imported from.
"""

from __future__ import annotations

import os
import site
import subprocess
import sys
import venv
import zipfile
from pathlib import Path

import pytest

from wheelgen.design.bundled import DEMO_NAME

pytestmark = pytest.mark.slow

ROOT = Path(__file__).resolve().parents[1]


def _run(args: list[str], cwd: Path) -> subprocess.CompletedProcess[str]:
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONHOME")}
    return subprocess.run(args, cwd=cwd, env=env, capture_output=True, text=True)


def test_an_installed_wheel_checks_the_bundled_demo(tmp_path: Path) -> None:
    dist = tmp_path / "dist"
    built = _run(
        [sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist),
         str(ROOT)],
        tmp_path,
    )  # fmt: skip
    assert built.returncode == 0, built.stderr[-3000:]
    (wheel,) = dist.glob("wheelgen-*.whl")
    with zipfile.ZipFile(wheel) as whl:
        names = set(whl.namelist())
    assert f"wheelgen/designs/{DEMO_NAME}" in names
    assert "wheelgen/py.typed" in names
    assert not any(n.startswith(("tests/", "benchmarks/", "docs/")) for n in names)

    env = tmp_path / "env"
    venv.create(env, with_pip=True)
    python = env / "bin" / "python"
    done = _run([str(python), "-m", "pip", "install", "--no-deps", "-q", str(wheel)],
                tmp_path)  # fmt: skip
    assert done.returncode == 0, done.stderr[-3000:]
    (own,) = [
        Path(p)
        for p in _run(
            [str(python), "-c", "import site; print(*site.getsitepackages())"], tmp_path
        ).stdout.split()
    ]
    (own / "borrowed.pth").write_text("\n".join(site.getsitepackages()) + "\n")

    where = _run(
        [str(python), "-c", "import wheelgen; print(wheelgen.__file__)"], tmp_path
    )
    assert Path(where.stdout.strip()).is_relative_to(own), where.stdout + where.stderr
    check = _run([str(env / "bin" / "wheelgen"), "check"], tmp_path)
    assert check.returncode == 0, check.stdout[-2000:] + check.stderr[-2000:]
    first = check.stdout.splitlines()[0]
    assert first.startswith("Harbour tide clock") and DEMO_NAME in first
    assert str(own) in first  # the demo came out of the installed package
