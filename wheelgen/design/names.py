"""The name rule, and how free text reaches files safely.

Names of arbors, wheels and couplings become file names of parts (``step/<name>.step``),
and the design file's name becomes the output folder's. One rule serves the loader
(``wheelgen check``) and the build alike, so a design that checks also builds:

- a name is matched as a whole string (a final newline is no part of a name);
- letters ``A-Z a-z``, digits, ``_`` and ``-``, and not ``-`` first (a file called
  ``-rf`` reads as an option to every command-line tool);
- at most :data:`~wheelgen.design.bounds.BOUNDS` ``["name_length"]`` characters;
- no two names equal after case folding (:func:`name_key`): on the case-insensitive disks
  of two common systems ``Sun.step`` and ``sun.step`` are one file.

Free text (the title) may hold any printable character; control characters are refused
where it is read, and :func:`xml_text` keeps any text that reaches an SVG, HTML or 3MF
file well-formed.
"""

from __future__ import annotations

import re
import unicodedata

from .bounds import BOUNDS

__all__ = [
    "NAME_ALLOWED",
    "RESERVED_NAMES",
    "control_characters",
    "design_name",
    "name_key",
    "name_problem",
    "xml_text",
]

_NAME_LENGTH = BOUNDS["name_length"]
_NAME = re.compile(
    rf"[A-Za-z0-9_][A-Za-z0-9_-]{{0,{int(_NAME_LENGTH.high) - 1}}}", re.ASCII
)
#: The rule in words, for messages.
NAME_ALLOWED = (
    f"1 to {int(_NAME_LENGTH.high)} letters, digits, '_' and '-' (A-Z, a-z, 0-9; "
    "not '-' first), as names become file names of parts"
)
#: Names the build uses for files of its own.
RESERVED_NAMES = frozenset(
    {"assembly", "manifest", "report", "parts", "cutting", "print", "fit-test"}
)


def name_problem(name: object) -> str | None:
    """``None`` if ``name`` is a usable name, else what is wrong with it, in words."""
    if not isinstance(name, str):
        return "not text"
    if _NAME.fullmatch(name):
        if name_key(name) in RESERVED_NAMES:
            return "kept for the build's own files"
        return None
    bad = control_characters(name)
    if bad:
        return f"holds the control character {bad[0]}"
    if not name:
        return "empty"
    if len(name) > _NAME_LENGTH.high:
        return f"{len(name)} characters long"
    if name.startswith("-") and _NAME.fullmatch("_" + name[1:]):
        return "starts with '-'"
    return "not a safe file name"


def name_key(name: str) -> str:
    """The form two names are compared in: case folded, as a case-insensitive disk does."""
    return name.casefold()


def design_name(stem: str) -> str:
    """The design's name, from its file name without the suffix: a safe file name.

    Every character the name rule does not allow becomes ``_`` (``Uhr_ä`` ->
    ``Uhr__``, ``-x`` -> ``_x``), so two file names may give one design name; the build
    then refuses to replace the other's output (see ``export/output_folder.py``).
    """
    name = re.sub(r"[^A-Za-z0-9_-]", "_", stem, flags=re.ASCII)
    if name.startswith("-"):
        name = "_" + name[1:]
    return name[: int(_NAME_LENGTH.high)] or "design"


def control_characters(text: str) -> list[str]:
    """The control characters in ``text``, each as ``U+000A``, in order of appearance."""
    return [f"U+{ord(c):04X}" for c in text if unicodedata.category(c) == "Cc"]


# Characters XML 1.0 forbids anywhere, even escaped: C0 controls but tab, line feed and
# carriage return; surrogates; U+FFFE and U+FFFF (XML 1.0, fifth edition, section 2.2).
_NOT_XML = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\ud800-\udfff\ufffe\uffff]")


def xml_text(text: object, quote: bool = True) -> str:
    """``text`` safe inside XML or HTML content and quoted attributes.

    Escapes ``& < >`` (and both quotes when ``quote``, as :func:`html.escape` does)
    and drops the characters XML 1.0 cannot hold at all, so a file stays well-formed
    whatever the text holds.
    """
    out = (
        _NOT_XML.sub("", str(text))
        .replace("&", "&amp;")
        .replace("<", "&lt;")
        .replace(">", "&gt;")
    )
    return out.replace('"', "&quot;").replace("'", "&#x27;") if quote else out
