"""Nothing of the user's is lost: which output folder a build replaces, a cache that
proves itself, and a message (never a traceback) for every error of the system.

The builds here write DXF and SVG only, which needs no CAD kernel: quick, and the same
folder, cache and manifest code as a full build.
"""

from __future__ import annotations

import errno
import hashlib
import json
import os
import shutil
from pathlib import Path

import pytest
from click.testing import CliRunner

from wheelgen.cli import main
from wheelgen.design import load_design
from wheelgen.export import build as build_mod
from wheelgen.export import staging as staging_mod
from wheelgen.export.build import BuildOptions, PartSizeError, build_design
from wheelgen.export.cache import CACHE_DIR_NAME
from wheelgen.export.output_folder import (
    MARKER_NAME,
    OutputFolderError,
    check_replaceable,
)
from wheelgen.layout.part_kinds import WheelPart
from wheelgen.teeth.spec import ToothSpec

DESIGN = Path(__file__).parent / "data" / "two_stage.toml"
FAST = ["--formats", "dxf,svg"]


def run(*args: str):
    return CliRunner().invoke(main, ["build", *args])


def build(out: Path, *extra: str):
    return run(str(DESIGN), *FAST, "-o", str(out), *extra)


def tree(root: Path) -> dict[str, bytes]:
    return {
        p.relative_to(root).as_posix(): p.read_bytes()
        for p in sorted(root.rglob("*"))
        if p.is_file()
    }


def clean(result) -> None:
    """A refusal: exit 2, one message, no traceback."""
    assert result.exit_code == 2, result.output
    assert "Traceback" not in result.output
    assert result.exception is None or isinstance(result.exception, SystemExit)


@pytest.fixture(scope="module")
def earlier(tmp_path_factory):
    """An earlier build in <base>/out, and its files."""
    base = tmp_path_factory.mktemp("earlier")
    result = build(base / "out")
    assert result.exit_code == 0, result.output
    return base, tree(base / "out")


def fresh_copy(earlier, tmp_path: Path) -> Path:
    base, _ = earlier
    shutil.copytree(base / "out", tmp_path / "out", symlinks=True)
    return tmp_path / "out"


# --- which folder a build replaces ---------------------------------------------------


def test_a_build_leaves_its_marker_naming_the_manifest(earlier):
    _, files = earlier
    marker = json.loads(files[MARKER_NAME])
    assert (
        marker["manifest_sha256"] == hashlib.sha256(files["manifest.json"]).hexdigest()
    )
    manifest = json.loads(files["manifest.json"])
    assert manifest["design"]["file"] == "two_stage.toml"  # no folder, only the name
    # the marker is not in the manifest's list (it names the manifest)
    assert MARKER_NAME not in {r["path"] for r in manifest["files"]}


def test_an_earlier_build_is_replaced(earlier, tmp_path):
    out = fresh_copy(earlier, tmp_path)
    result = build(out)
    assert result.exit_code == 0, result.output
    assert tree(out) == earlier[1]


def test_a_project_folder_with_a_manifest_is_never_replaced(tmp_path):
    # the case that was wiped: a web project with manifest.json, src/ and .git/
    web = tmp_path / "web"
    (web / "src").mkdir(parents=True)
    (web / ".git").mkdir()
    (web / "manifest.json").write_text('{"name": "my app"}')
    (web / "src" / "app.js").write_text("console.log(1)")
    (web / ".git" / "HEAD").write_text("ref: refs/heads/main")
    before = tree(web)
    result = build(web)
    clean(result)
    for name in (".git", "manifest.json", "src", "not a folder wheelgen wrote"):
        assert name in result.stderr
    assert tree(web) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["web"]  # no staging left


@pytest.mark.parametrize(
    ("change", "named"),
    [
        (lambda out: (out / "notes.txt").write_text("mine"), "notes.txt"),
        (
            lambda out: (out / "mine").mkdir() or (out / "mine" / "a").write_text("x"),
            "mine/",
        ),
        (lambda out: (out / "dxf" / "extra.dxf").write_text("x"), "dxf/extra.dxf"),
        (lambda out: (out / "link").symlink_to(out / "cutting.csv"), "link"),
        (lambda out: (out / "cutting.csv").write_text("edited"), "cutting.csv"),
        (lambda out: (out / "empty").mkdir(), "empty/"),
    ],
    ids=["file", "folder", "file in a part folder", "symbolic link", "edited", "empty"],
)
def test_anything_wheelgen_did_not_write_is_named_and_kept(
    earlier, tmp_path, change, named
):
    out = fresh_copy(earlier, tmp_path)
    change(out)
    before = tree(out)
    result = build(out)
    clean(result)
    assert named in result.stderr and "nothing was changed" in result.stderr
    assert tree(out) == before


def test_a_manifest_the_marker_does_not_name_is_refused(earlier, tmp_path):
    out = fresh_copy(earlier, tmp_path)
    manifest = out / "manifest.json"
    manifest.write_text(manifest.read_text().replace('"checked": true', '"checked": 1'))
    result = build(out)
    clean(result)
    assert "not the one the marker names" in result.stderr


def test_a_write_protected_folder_is_refused(earlier, tmp_path):
    out = fresh_copy(earlier, tmp_path)
    out.chmod(0o555)
    try:
        result = build(out)
        clean(result)
        assert "write-protected" in result.stderr
        assert tree(out) == earlier[1]
    finally:
        out.chmod(0o755)


def test_o_at_a_symbolic_link_builds_into_its_folder_and_keeps_the_link(
    earlier, tmp_path
):
    real = fresh_copy(earlier, tmp_path)
    link = tmp_path / "link"
    link.symlink_to(real)
    result = build(link)
    assert result.exit_code == 0, result.output
    assert link.is_symlink() and link.resolve() == real.resolve()
    assert tree(real) == earlier[1]
    # nothing left beside them: no .old-* link, no staging folder
    assert sorted(p.name for p in tmp_path.iterdir()) == [CACHE_DIR_NAME, "link", "out"]


def test_a_link_that_points_nowhere_is_refused(tmp_path):
    (tmp_path / "link").symlink_to(tmp_path / "nowhere")
    result = build(tmp_path / "link")
    clean(result)
    assert "does not exist" in result.stderr


def test_two_design_files_with_one_output_folder_do_not_replace_each_other(
    tmp_path, monkeypatch
):
    # "Uhr_ä" and "Uhr_ö" both give the design name "Uhr__" (derived: every character
    # the name rule does not allow becomes "_")
    monkeypatch.chdir(tmp_path)
    for name in ("Uhr_ä.toml", "Uhr_ö.toml"):
        shutil.copy(DESIGN, tmp_path / name)
    first = run("Uhr_ä.toml", *FAST)
    assert first.exit_code == 0, first.output
    kept = tree(tmp_path / "output" / "Uhr__")
    second = run("Uhr_ö.toml", *FAST)
    clean(second)
    assert "'Uhr_ä.toml'" in second.stderr and "'Uhr_ö.toml'" in second.stderr
    assert tree(tmp_path / "output" / "Uhr__") == kept
    assert run("Uhr_ä.toml", *FAST).exit_code == 0  # its own output: replaced


def test_check_replaceable_allows_new_and_empty_folders(tmp_path):
    check_replaceable(tmp_path / "new")
    (tmp_path / "empty").mkdir()
    check_replaceable(tmp_path / "empty")
    (tmp_path / "file").write_text("x")
    with pytest.raises(OutputFolderError, match="not a folder"):
        check_replaceable(tmp_path / "file")


# --- the part cache -------------------------------------------------------------------


def _damage_truncate(path: Path) -> None:
    path.write_bytes(path.read_bytes()[:100])


def _damage_same_size(path: Path) -> None:
    data = bytearray(path.read_bytes())
    data[len(data) // 2] ^= 0x20
    path.write_bytes(bytes(data))


def _damage_link(path: Path) -> None:
    # another file's contents must never reach the output through a link
    other = path.parent.parent / "svg" / (path.stem + ".svg")
    path.unlink()
    path.symlink_to(other)


def _damage_delete(path: Path) -> None:
    path.unlink()


def _damage_index(path: Path) -> None:
    (path.parent.parent / ".complete").write_text("{not json")


def _damage_old_index(path: Path) -> None:
    (path.parent.parent / ".complete").write_text('{"files": ["dxf/wheel_b.dxf"]}')


def _damage_fifo(path: Path) -> None:
    path.unlink()
    os.mkfifo(path)


DAMAGE = {
    "truncated": _damage_truncate,
    "changed, same size": _damage_same_size,
    "symbolic link": _damage_link,
    "deleted": _damage_delete,
    "garbled index": _damage_index,
    "index of an older kind": _damage_old_index,
    "a pipe": _damage_fifo,
}


@pytest.mark.parametrize("how", sorted(DAMAGE))
def test_a_damaged_cache_entry_is_made_again_never_shipped(earlier, tmp_path, how):
    base, files = earlier
    shutil.copytree(base / CACHE_DIR_NAME, tmp_path / CACHE_DIR_NAME, symlinks=True)
    out = fresh_copy(earlier, tmp_path)
    (target,) = (tmp_path / CACHE_DIR_NAME).glob("*/*/dxf/wheel_b.dxf")
    DAMAGE[how](target)
    result = build(out)
    assert result.exit_code == 0, result.output
    assert "Traceback" not in result.output
    notes = [line for line in result.stderr.splitlines() if "note:" in line]
    assert len(notes) == 1 and "part wheel_b" in notes[0], result.stderr
    assert "1 part(s) built" in result.stdout
    assert tree(out) == files  # the very bytes of the first build
    # and the entry is whole again: the next build reuses it without a note
    again = build(out)
    assert again.exit_code == 0 and "note:" not in again.stderr


def test_the_cache_is_private(earlier):
    base, _ = earlier
    mode = (base / CACHE_DIR_NAME).stat().st_mode & 0o777
    assert mode == 0o700


@pytest.mark.skipif(
    not hasattr(os, "geteuid") or os.geteuid() != 0,
    reason="giving a folder to another user needs the administrator",
)
def test_a_cache_of_another_user_is_not_used(earlier, tmp_path):
    out = fresh_copy(earlier, tmp_path)
    theirs = tmp_path / CACHE_DIR_NAME
    theirs.mkdir(mode=0o700)
    (theirs / "planted").write_text("x")
    os.chown(theirs, 65534, 65534)  # "nobody" (derived: the usual unprivileged id)
    result = build(out)
    assert result.exit_code == 0, result.output
    assert "belongs to another user" in result.stderr
    assert "--no-cache" in result.stderr
    assert sorted(p.name for p in theirs.iterdir()) == ["planted"]  # untouched
    assert tree(out) == earlier[1]


# --- errors of the system: a message and exit 2, earlier output untouched --------------


@pytest.mark.parametrize(
    ("err", "fix"),
    [
        (errno.ENOSPC, "free some space"),
        (errno.EACCES, "choose a folder you may write to"),
        (errno.EROFS, "read-only"),
    ],
)
def test_a_failed_write_gives_the_place_and_the_fix(
    earlier, tmp_path, monkeypatch, err, fix
):
    out = fresh_copy(earlier, tmp_path)

    def broken(work, path):
        raise OSError(err, os.strerror(err), str(path))

    monkeypatch.setitem(build_mod.PART_WRITERS, "dxf", broken)
    result = build(out, "--no-cache")
    clean(result)
    assert fix in result.stderr and str(out) in result.stderr
    assert "previous output is untouched" in result.stderr
    assert tree(out) == earlier[1]


def test_a_folder_in_use_gives_a_message(earlier, tmp_path, monkeypatch):
    out = fresh_copy(earlier, tmp_path)
    real_rename = os.rename

    def busy(src, dst):
        if Path(src) == out:  # the swap: the output folder is a mount point, say
            raise OSError(errno.EBUSY, os.strerror(errno.EBUSY), str(src))
        return real_rename(src, dst)

    monkeypatch.setattr(staging_mod.os, "rename", busy)
    result = build(out)
    clean(result)
    assert "in use" in result.stderr
    assert tree(out) == earlier[1]
    assert sorted(p.name for p in tmp_path.iterdir()) == [CACHE_DIR_NAME, "out"]


def test_an_unwritable_place_gives_a_message(tmp_path, monkeypatch):
    def refused(*args, **kwargs):
        raise PermissionError(errno.EACCES, "Permission denied", str(tmp_path))

    monkeypatch.setattr(staging_mod.tempfile, "mkdtemp", refused)
    result = build(tmp_path / "out")
    clean(result)
    assert "Permission denied" in result.stderr and "-o" in result.stderr


def test_o_in_proc_gives_a_message():
    result = run(str(DESIGN), *FAST, "-o", "/proc/wheelgen-test/x")
    clean(result)
    assert "cannot write the build" in result.stderr


def test_a_part_beyond_the_bounds_is_refused_before_the_kernel(tmp_path):
    design = load_design(DESIGN)
    thin = WheelPart("w", ToothSpec(20, 1.0), 5e-324, 3.0)
    with pytest.raises(PartSizeError, match="face_width = 5e-324"):
        build_design(
            design, tmp_path / "out", BuildOptions(formats=("dxf",)), findings=[],
            parts=[thin],
        )  # fmt: skip
    assert not (tmp_path / "out").exists()
