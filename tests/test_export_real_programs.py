"""Open exported meshes in real programs, when they are installed (else skip).

A slicer's command line (``prusa-slicer --info``) and ``admesh`` read the STL and 3MF
files as any user's tools would; the sizes they report must be the wheel's true sizes.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest
from click.testing import CliRunner

from wheelgen.cli import main

pytestmark = pytest.mark.cad

DESIGN = Path(__file__).parent / "data" / "two_stage.toml"


@pytest.fixture(scope="module")
def built(tmp_path_factory):
    out = tmp_path_factory.mktemp("real") / "two_stage"
    result = CliRunner().invoke(
        main,
        ["build", str(DESIGN), "-o", str(out), "--formats", "stl,3mf", "--no-cache"],
    )
    assert result.exit_code == 0, result.output
    return out


def _info(path: Path) -> dict[str, str]:
    done = subprocess.run(
        ["prusa-slicer", "--info", str(path)],
        capture_output=True,
        text=True,
        timeout=300,
    )
    assert done.returncode == 0, done.stderr[-2000:]
    return dict(re.findall(r"^(\w+) = (.+)$", done.stdout, flags=re.M))


@pytest.mark.skipif(
    shutil.which("prusa-slicer") is None, reason="prusa-slicer not installed"
)
@pytest.mark.parametrize("fmt", ["stl", "3mf"])
def test_slicer_reads_the_wheel_at_its_true_size(built, fmt):
    info = _info(built / fmt / f"wheel_a.{fmt}")
    # derived: tip diameter m (z + 2) = 1 * (48 + 2) = 50 mm; face width 3 mm, lying flat
    assert float(info["size_x"]) == pytest.approx(50.0, abs=0.01)
    assert float(info["size_y"]) == pytest.approx(50.0, abs=0.01)
    assert float(info["size_z"]) == pytest.approx(3.0, abs=1e-6)
    assert float(info["min_z"]) == pytest.approx(0.0, abs=1e-6)
    assert info["manifold"] == "yes"


@pytest.mark.skipif(shutil.which("admesh") is None, reason="admesh not installed")
def test_admesh_finds_a_closed_mesh(built):
    done = subprocess.run(
        ["admesh", str(built / "stl" / "wheel_b.stl")],
        capture_output=True,
        text=True,
        timeout=120,
    )
    assert done.returncode == 0, done.stderr
    text = done.stdout
    assert re.search(r"Backwards edges\s*:\s*0\b", text)
    assert re.search(r"Facets with 1 disconnected edge\s*:\s*0\b", text)
    assert re.search(r"Number of parts\s*:\s*1\b", text)
