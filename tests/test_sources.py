"""Every citation can be followed from a clone of the repository.

The sources live in docs/references.md; code and tests cite them by name and by that
page's sections. No file names a place outside the repository.
"""

from __future__ import annotations

import re
import subprocess
from collections.abc import Iterator
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
REFERENCES = ROOT / "docs" / "references.md"

# Spelled in pieces so that this file does not name them itself.
OUTSIDE = ("/" + "work/", ".." + "/shared", "check" + "-values", "/" + "home/")


def _project_files() -> list[Path]:
    try:
        listed = subprocess.run(
            ["git", "ls-files", "-z"], cwd=ROOT, capture_output=True, check=True
        ).stdout.decode()
        names = [n for n in listed.split("\0") if n]
    except (OSError, subprocess.CalledProcessError):  # not a git checkout
        names = [
            str(p.relative_to(ROOT))
            for p in ROOT.rglob("*")
            if p.is_file() and not {".git", ".venv", "output"} & set(p.parts)
        ]
    return [ROOT / n for n in names if (ROOT / n).is_file()]


def _text(path: Path) -> str | None:
    data = path.read_bytes()
    if b"\0" in data:
        return None
    return data.decode("utf-8", errors="replace")


def _lines() -> Iterator[tuple[str, int, str]]:
    """Every line of every text file of the project: (file, line number, line)."""
    for path in _project_files():
        text = _text(path)
        if text is not None:
            for n, line in enumerate(text.splitlines(), 1):
                yield str(path.relative_to(ROOT)), n, line


def test_no_file_names_a_place_outside_the_repository() -> None:
    found = [
        f"{name}:{n}: {line.strip()}"
        for name, n, line in _lines()
        if any(word in line for word in OUTSIDE)
    ]
    assert not found, "\n".join(found)


def test_cited_sections_of_the_references_exist() -> None:
    headings = set(re.findall(r"^## (\d+)\. ", REFERENCES.read_text(), re.MULTILINE))
    assert headings == {str(n) for n in range(1, len(headings) + 1)}
    cited = re.compile(
        r"references\.md[,):]*\s+(?:sections?\s+|§)(\d+(?:(?:,\s*|\s+and\s+)\d+)*)"
    )
    missing = []
    for path in _project_files():
        text = _text(path)
        if text is None:
            continue
        flat = " ".join(line.lstrip("#: ").strip() for line in text.splitlines())
        for match in cited.finditer(flat):
            for number in re.findall(r"\d+", match.group(1)):
                if number not in headings:
                    missing.append(f"{path.relative_to(ROOT)}: section {number}")
    assert not missing, "\n".join(missing)


def test_no_file_holds_a_merge_conflict_marker() -> None:
    # a line that starts with seven '<', '>' or '=' (the last alone on its line) is what
    # an unresolved merge leaves; spelled in pieces so this file holds none
    marks = re.compile("^(" + "<" * 7 + " |" + ">" * 7 + " |" + "=" * 7 + "$)")
    found = [
        f"{name}:{n}: {line.strip()[:60]}"
        for name, n, line in _lines()
        if marks.match(line)
    ]
    assert not found, "\n".join(found)
