"""``wheelgen build`` through click: exit codes, JSON on stdout, nothing written on errors."""

from __future__ import annotations

import json
from pathlib import Path

import pytest
from click.testing import CliRunner

from wheelgen.cli import main
from wheelgen.cli.build import DEFAULT_DESIGN

ROOT = Path(__file__).resolve().parents[1]
DATA = Path(__file__).parent / "data"


def test_default_design_is_the_bundled_demo():
    assert DEFAULT_DESIGN.name == "harbour_tide_clock.toml"
    assert DEFAULT_DESIGN.is_file()


def test_help_names_the_cache_folder():
    result = CliRunner().invoke(main, ["build", "--help"])
    assert result.exit_code == 0
    assert ".wheelgen-cache" in result.output
    for option in ("--formats", "--jobs", "--force", "--json", "-o"):
        assert option in result.output


@pytest.mark.cad
def test_build_json_reports_files_and_writes_them(tmp_path):
    out = tmp_path / "two"
    args = [
        "build",
        str(DATA / "two_stage.toml"),
        "-o",
        str(out),
        "--formats",
        "dxf,step",
        "--json",
    ]
    result = CliRunner().invoke(main, args)
    assert result.exit_code == 0, result.output
    data = json.loads(result.stdout)  # stdout holds only the JSON object
    assert data["built"] is True and data["checked"] is True
    assert "step/assembly.step" in data["files"] and "dxf/wheel_b.dxf" in data["files"]
    assert not any(f.startswith(("stl/", "3mf/", "svg/")) for f in data["files"])
    for rel in data["files"]:
        assert (out / rel).is_file()
    # the sizes of what was written, the manifest itself aside
    written = {rel: (out / rel).stat().st_size for rel in data["files"]}
    assert data["sizes"]["total_bytes"] == sum(
        n for rel, n in written.items() if rel != "manifest.json"
    )
    dxf = [rel for rel in data["files"] if rel.endswith(".dxf")]
    assert data["sizes"]["formats"]["dxf"]["files"] == len(dxf) > 0
    assert data["cache"] == str(tmp_path / ".wheelgen-cache")
    # again: everything from the cache
    again = CliRunner().invoke(main, args)
    assert (
        json.loads(again.stdout)["parts_reused"]
        == data["parts_built"] + data["parts_reused"]
    )


def test_error_finding_exits_1_with_the_table_and_writes_nothing(tmp_path):
    out = tmp_path / "bad"
    result = CliRunner().invoke(
        main, ["build", str(DATA / "checks" / "bad_teeth.toml"), "-o", str(out)]
    )
    assert result.exit_code == 1
    assert "ERROR" in result.stdout
    assert "--force" in result.stderr
    assert not out.exists() and list(tmp_path.iterdir()) == []


def test_error_finding_json(tmp_path):
    result = CliRunner().invoke(
        main,
        [
            "build",
            str(DATA / "checks" / "bad_teeth.toml"),
            "-o",
            str(tmp_path / "b"),
            "--json",
        ],
    )
    assert result.exit_code == 1
    data = json.loads(result.stdout)
    assert data["built"] is False
    assert any(f["level"] == "error" for f in data["findings"])


def test_missing_design_exits_2(tmp_path):
    result = CliRunner().invoke(main, ["build", str(tmp_path / "nope.toml")])
    assert result.exit_code == 2
    assert "Traceback" not in result.output


def test_unknown_format_exits_2(tmp_path):
    result = CliRunner().invoke(
        main, ["build", str(DATA / "two_stage.toml"), "--formats", "step,obj"]
    )
    assert result.exit_code == 2
    assert "obj" in result.stderr
