"""The build pipeline: manifest, same bytes, cache, parallel jobs, nothing lost, safe names."""

from __future__ import annotations

import hashlib
import json
import subprocess
import sys
from pathlib import Path

import pytest

pytest.importorskip("cadquery")

from wheelgen.design import load_design  # noqa: E402
from wheelgen.export import build as build_mod  # noqa: E402
from wheelgen.export import sheets  # noqa: E402
from wheelgen.export.build import BuildBlocked, BuildOptions, build_design  # noqa: E402
from wheelgen.export.output_folder import (  # noqa: E402
    MARKER_NAME,
    OutputFolderError,
)
from wheelgen.export.staging import UnsafeNameError  # noqa: E402
from wheelgen.layout.part_kinds import (  # noqa: E402
    BOUGHT_KINDS,
    FLAT_KINDS,
    TURNED_KINDS,
    ArborPart,
    WheelPart,
)
from wheelgen.parts import plan_parts  # noqa: E402
from wheelgen.teeth.spec import ToothSpec  # noqa: E402

pytestmark = pytest.mark.cad

ROOT = Path(__file__).resolve().parents[1]
DESIGN = ROOT / "tests" / "data" / "two_stage.toml"


def tree(root: Path) -> dict[str, bytes]:
    return {
        p.relative_to(root).as_posix(): p.read_bytes()
        for p in sorted(root.rglob("*"))
        if p.is_file()
    }


@pytest.fixture(scope="module")
def design():
    return load_design(DESIGN)


@pytest.fixture(scope="module")
def first(design, tmp_path_factory):
    base = tmp_path_factory.mktemp("first")
    out = base / "output" / design.name
    result = build_design(design, out, BuildOptions())
    return base, out, result, tree(out)


def test_every_part_gets_its_files(first, design):
    _, out, result, files = first
    parts = plan_parts(design)
    assert {"plate", "pillar", "cock", "screw"} <= {p.kind for p in parts}
    for p in parts:
        made = p.kind not in BOUGHT_KINDS  # screws are bought: in the assembly only
        assert (f"step/{p.name}.step" in files) == made
        assert (f"stl/{p.name}.stl" in files) == made
        assert (f"3mf/{p.name}.3mf" in files) == made
        planar = p.kind in FLAT_KINDS | TURNED_KINDS  # profiles, or 1:1 drawings
        assert (f"dxf/{p.name}.dxf" in files) == planar
        assert (f"svg/{p.name}.svg" in files) == planar
    assert "step/assembly.step" in files and "manifest.json" in files
    text = files["step/assembly.step"].decode("latin-1")
    for p in parts:
        assert f"PRODUCT('{p.name}'" in text
    assert result.built == len(parts) and result.reused == 0


def test_turned_parts_get_their_drawing_at_true_size(first, design):
    """Read back from the build: each arbor's SVG and DXF draw every length at its
    diameter (the outline's top edge at radius r) from 0 to the part's length."""
    import xml.etree.ElementTree as ET

    import ezdxf

    _, out, _, files = first
    arbors = [p for p in plan_parts(design) if isinstance(p, ArborPart)]
    assert arbors
    ns = "{http://www.w3.org/2000/svg}"
    for part in arbors:
        root = ET.fromstring(files[f"svg/{part.name}.svg"])
        assert root.get("width").endswith("mm")
        group = next(g for g in root.iter(f"{ns}g") if g.get("id") == "outline")
        svg_lines = [
            tuple(float(e.get(k)) for k in ("x1", "y1", "x2", "y2"))
            for e in group.iter(f"{ns}line")
        ]
        msp = ezdxf.readfile(out / f"dxf/{part.name}.dxf").modelspace()
        dxf_lines = [
            (e.dxf.start.x, e.dxf.start.y, e.dxf.end.x, e.dxf.end.y)
            for e in msp.query("LINE")
            if e.dxf.layer == "OUTLINE"
        ]
        assert part.sections, part.name
        for s in part.sections:
            r = s.diameter / 2
            for lines, y in ((svg_lines, -r), (dxf_lines, r)):  # SVG's y runs down
                assert any(
                    abs(y0 - y) < 1e-3 and abs(y1 - y) < 1e-3
                    and min(x0, x1) <= s.z0 + 1e-3 and max(x0, x1) >= s.z1 - 1e-3
                    for x0, y0, x1, y1 in lines
                ), (part.name, s)  # fmt: skip
        xs = [x for x0, _, x1, _ in dxf_lines for x in (x0, x1)]
        assert (min(xs), max(xs)) == pytest.approx((0.0, part.length), abs=1e-6)


def test_assembly_order_names_every_part_of_the_assembly_once(first, design):
    """assembly.csv against the written assembly.step: each product in one step."""
    import csv
    import io
    import re

    _, _, _, files = first
    step = files["step/assembly.step"].decode("latin-1")
    products = set(re.findall(r"PRODUCT\('([^']+)'", step))
    rows = list(csv.DictReader(io.StringIO(files["assembly.csv"].decode("utf-8"))))
    named = [r["part"] for r in rows]
    assert len(named) == len(set(named))
    assert set(named) == products - {design.name}  # the root product: the design
    assert "drawings/elevation.svg" in files


def test_manifest_lists_every_file_with_its_hash(first, design):
    _, out, _, files = first
    m = json.loads(files["manifest.json"])
    from wheelgen import __version__

    assert m["wheelgen"] == __version__
    assert (
        m["design"]["sha256"]
        == design.sha256
        == hashlib.sha256(DESIGN.read_bytes()).hexdigest()
    )
    assert m["checked"] is True
    listed = {r["path"]: r["sha256"] for r in m["files"]}
    assert set(listed) == set(files) - {"manifest.json", MARKER_NAME}
    for path, digest in listed.items():
        assert hashlib.sha256(files[path]).hexdigest() == digest
    names = {p["name"]: p for p in m["parts"]}
    assert names["wheel_b"]["parameters"]["tooth"]["teeth"] == 30
    assert names["wheel_b"]["parameters"]["spokes"] == 4


def test_manifest_gives_the_sizes_a_shop_receives(first, design):
    _, out, _, files = first
    m = json.loads(files["manifest.json"])
    sizes = {r["path"]: r["bytes"] for r in m["files"]}
    assert sizes == {
        k: len(v) for k, v in files.items() if k not in ("manifest.json", MARKER_NAME)
    }
    assert m["sizes"]["total_bytes"] == sum(sizes.values())
    step = m["sizes"]["formats"]["step"]
    made = [p for p in plan_parts(design) if p.kind not in BOUGHT_KINDS]
    assert step["files"] == len(made) + 1  # and the assembly
    assert step["bytes"] == sum(v for k, v in sizes.items() if k.endswith(".step"))
    wheel = next(p for p in m["parts"] if p["name"] == "wheel_b")
    assert set(wheel["file_bytes"]) == {"step", "stl", "3mf", "dxf", "svg"}
    assert wheel["file_bytes"]["dxf"] == sizes["dxf/wheel_b.dxf"]
    arbor = next(p for p in m["parts"] if p["kind"] == "arbor")
    assert set(arbor["file_bytes"]) == {"step", "stl", "3mf", "dxf", "svg"}
    pillar = next(p for p in m["parts"] if p["kind"] == "pillar")
    assert set(pillar["file_bytes"]) == {"step", "stl", "3mf"}
    assert m["options"]["dxf_curves"] == "splines"


def test_rebuild_reuses_the_cache_and_gives_the_same_bytes(first, design):
    base, out, _, files = first
    result = build_design(design, out, BuildOptions())
    assert result.built == 0 and result.reused == len(plan_parts(design))
    assert result.cache_root == base / "output" / ".wheelgen-cache"
    assert tree(out) == files
    # nothing written beside the output folder except the cache
    assert sorted(p.name for p in (base / "output").iterdir()) == [
        ".wheelgen-cache",
        design.name,
    ]


# Run in a fresh interpreter: build the design again without the cache on two worker
# processes, then its DXF files alone in the lines-and-arcs flavour.
_AGAIN = """
import sys
from pathlib import Path
from wheelgen.design import load_design
from wheelgen.export.build import BuildOptions, build_design
design = load_design(sys.argv[1])
build_design(design, Path(sys.argv[2]), BuildOptions(jobs=2, use_cache=False))
arcs = BuildOptions(formats=("dxf",), dxf_curves="arcs", use_cache=False)
build_design(design, Path(sys.argv[3]), arcs)
"""


@pytest.mark.slow
def test_another_process_and_hash_seed_give_the_same_bytes(first, design, tmp_path):
    # Every byte of a build is the same whatever the process, its hash seed, the
    # number of worker processes, or what was exported before in the same process
    # (each worker exports another run of parts than the first build did): every
    # format, the assembly, the sheets and the manifest, and both DXF flavours.
    arcs = tmp_path / "arcs_here"
    only_arcs = BuildOptions(formats=("dxf",), dxf_curves="arcs", use_cache=False)
    build_design(design, arcs, only_arcs)
    again, arcs_again = tmp_path / "again", tmp_path / "arcs_again"
    env = {"PYTHONHASHSEED": "123", "PATH": "/usr/bin:/bin", "PYTHONPATH": str(ROOT)}
    done = subprocess.run(
        [sys.executable, "-c", _AGAIN, str(DESIGN), str(again), str(arcs_again)],
        env=env,
        cwd=ROOT,
        capture_output=True,
        text=True,
    )
    assert done.returncode == 0, done.stderr[-3000:]
    assert tree(again) == first[3]
    assert tree(arcs_again) == tree(arcs)
    assert any(name.endswith(".dxf") for name in tree(arcs))


def test_failing_exporter_leaves_previous_output_untouched(first, design, monkeypatch):
    base, out, _, files = first

    def broken(work, path):
        path.write_bytes(b"half a file")
        raise RuntimeError("disk full (simulated)")

    monkeypatch.setitem(build_mod.PART_WRITERS, "3mf", broken)
    with pytest.raises(RuntimeError, match="simulated"):
        build_design(design, out, BuildOptions(use_cache=False))
    assert tree(out) == files
    leftovers = [p.name for p in (base / "output").iterdir() if "staging" in p.name]
    assert leftovers == []


def test_failing_sheet_writer_leaves_previous_output_untouched(
    first, design, monkeypatch
):
    base, out, _, files = first

    def broken(design, parts, findings, staging_dir):
        (staging_dir / "half.txt").write_text("x")
        raise KeyboardInterrupt  # an interrupted build, the worst case

    monkeypatch.setattr(sheets, "SHEET_WRITERS", (broken,))
    with pytest.raises(KeyboardInterrupt):
        build_design(design, out, BuildOptions())
    assert tree(out) == files


def test_sheet_writer_may_not_point_outside(design, tmp_path, monkeypatch):
    outside = tmp_path / "elsewhere.txt"
    outside.write_text("mine")

    def sneaky(design, parts, findings, staging_dir):
        return [outside]

    monkeypatch.setattr(sheets, "SHEET_WRITERS", (sneaky,))
    part = ArborPart("a1", 3.0, 10.0)
    with pytest.raises(UnsafeNameError):
        build_design(
            design, tmp_path / "out", BuildOptions(), findings=[], parts=[part]
        )
    assert not (tmp_path / "out").exists()


@pytest.mark.parametrize(
    "name", ["../x", "/etc/x", "a/b", "..", "", ".hidden", "assembly"]
)
def test_build_refuses_unsafe_part_names(design, tmp_path, name):
    part = WheelPart(name, ToothSpec(12, 1.0), 3.0, 2.0)
    with pytest.raises(UnsafeNameError):
        build_design(
            design, tmp_path / "out", BuildOptions(), findings=[], parts=[part]
        )
    assert list(tmp_path.iterdir()) == []


def test_error_finding_blocks_unless_forced(design, tmp_path, monkeypatch):
    from wheelgen.findings import Finding

    monkeypatch.setattr(sheets, "SHEET_WRITERS", ())
    bad = [Finding("error", "test.made_up", "wheel x", "made up for the test")]
    part = ArborPart("a1", 3.0, 10.0)
    with pytest.raises(BuildBlocked) as info:
        build_design(
            design, tmp_path / "out", BuildOptions(), findings=bad, parts=[part]
        )
    assert info.value.findings == bad
    assert not (tmp_path / "out").exists()
    result = build_design(
        design,
        tmp_path / "out",
        BuildOptions(force=True, formats=("step",)),
        findings=bad,
        parts=[part],
    )
    m = json.loads((tmp_path / "out" / "manifest.json").read_text())
    assert result.checked is False and m["checked"] is False
    assert m["status"].startswith("UNCHECKED") and m["findings"]["errors"] == 1


def test_refuses_to_replace_a_folder_that_is_not_a_build(design, tmp_path):
    mine = tmp_path / "documents"
    mine.mkdir()
    (mine / "letter.txt").write_text("keep me")
    with pytest.raises(OutputFolderError, match="not a folder wheelgen wrote"):
        build_design(
            design, mine, BuildOptions(), findings=[], parts=[ArborPart("a", 3.0, 5.0)]
        )
    assert (mine / "letter.txt").read_text() == "keep me"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["documents"]


def test_every_exported_step_reimports_valid(first, design):
    import cadquery as cq

    _, out, _, _ = first
    parts = plan_parts(design)
    for p in parts:
        if p.kind in BOUGHT_KINDS:
            continue
        shape = cq.importers.importStep(str(out / "step" / f"{p.name}.step")).val()
        assert shape.isValid(), p.name
        assert len(shape.Solids()) == 1, p.name
    assy = cq.Assembly.importStep(str(out / "step" / "assembly.step"))
    placed = {name: obj.loc.toTuple()[0] for name, obj in assy.traverse()}
    for p in parts:
        pl = p.placement
        assert placed[p.name] == pytest.approx((pl.x, pl.y, pl.z), abs=1e-9), p.name


def test_staging_left_by_a_killed_build_is_swept_and_output_restored(tmp_path):
    from wheelgen.export.staging import Staging

    target = tmp_path / "out"
    # a build killed outright (pid 999999999 does not exist) in the middle of a swap:
    # its staging folder is left, and the previous output sits under its .old name
    dead = tmp_path / ".out.staging-999999999-abc"
    dead.mkdir()
    old = tmp_path / ".out.old-999999999-def"
    old.mkdir()
    (old / "manifest.json").write_text("{}")
    with Staging(target) as st:
        assert target.is_dir() and (target / "manifest.json").is_file()  # restored
        assert not dead.exists() and not old.exists()
        (st.path("a/b.txt")).write_text("new")
        st.commit()
    assert (target / "a" / "b.txt").read_text() == "new"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out"]


def test_cache_prunes_entries_unused_for_a_month_and_stale_temporaries(tmp_path):
    # derived: KEEP_DAYS = 30; an entry last used 31 days ago goes, one used 29 days ago
    # stays; a temporary folder of a killed build older than a day goes
    import os
    import time

    from wheelgen.export.cache import KEEP_DAYS, PartCache

    cache = PartCache(tmp_path / "c")
    now = time.time()
    for key, days in (
        ("aa" + "0" * 62, KEEP_DAYS + 1),
        ("bb" + "0" * 62, KEEP_DAYS - 1),
    ):
        tmp = cache.new_entry()
        (tmp / "f.txt").write_text(key)
        cache.publish(key, tmp, ["f.txt"])
        marker = cache.entry(key) / ".complete"
        os.utime(marker, (now - days * 86400, now - days * 86400))
    stale = cache.new_entry()
    os.utime(stale, (now - 2 * 86400, now - 2 * 86400))
    fresh_tmp = cache.new_entry()
    assert cache.prune(now=now) == 2
    assert not cache.has("aa" + "0" * 62) and cache.has("bb" + "0" * 62)
    assert not stale.exists() and fresh_tmp.exists()
    cache.mark_used("bb" + "0" * 62)  # a build that uses it keeps it another month
    assert cache.prune(now=now + 2 * 86400) == 1  # only the temporary, a day old now
    assert cache.has("bb" + "0" * 62)
