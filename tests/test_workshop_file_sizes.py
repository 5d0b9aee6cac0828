"""File sizes as a user reads them: per format, per part, with SI prefixes."""

from __future__ import annotations

from pathlib import Path

import pytest

from wheelgen.workshop.file_sizes import (
    file_format,
    list_files,
    part_file,
    size_summary,
    size_text,
)


@pytest.mark.parametrize(
    ("size", "text"),
    # derived: SI prefixes, 1 kB = 1000 bytes, three significant digits
    [
        (0, "0 B"),
        (999, "999 B"),
        (1000, "1.00 kB"),
        (12_345, "12.3 kB"),
        (999_499, "999 kB"),
        (999_500, "1.00 MB"),
        (72_000_000, "72.0 MB"),
        (1_500_000_000, "1.50 GB"),
    ],  # fmt: skip
)
def test_size_text(size, text):
    assert size_text(size) == text


def test_part_files_and_formats():
    assert part_file("step/day_wheel.step") == ("day_wheel", "step")
    assert part_file("3mf/hub.3mf") == ("hub", "3mf")
    assert part_file("cutting.csv") is None
    assert part_file("drilling/front.csv") is None
    assert file_format("report.HTML") == "html" and file_format("README") == ""


def test_summary_and_listing(tmp_path: Path):
    (tmp_path / "step").mkdir()
    (tmp_path / "step" / "a.step").write_bytes(b"x" * 10)
    (tmp_path / "step" / "assembly.step").write_bytes(b"x" * 30)
    (tmp_path / "cutting.csv").write_bytes(b"x" * 5)
    (tmp_path / ".cache").mkdir()
    (tmp_path / ".cache" / "k.step").write_bytes(b"x" * 7)
    files = list_files(tmp_path, skip={"cutting.csv"})
    assert files == [("step/a.step", 10), ("step/assembly.step", 30)]
    summary = size_summary(list_files(tmp_path))
    assert summary == {
        "total_bytes": 45,
        "formats": {"csv": {"files": 1, "bytes": 5}, "step": {"files": 2, "bytes": 40}},
    }
