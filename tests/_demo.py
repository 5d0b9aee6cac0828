"""The bundled demo design as text, and variants of it for tests."""

from __future__ import annotations

from wheelgen.design import Design, demo_path, loads_design

#: The bundled demo's train file, where the installed package keeps it.
DEMO = demo_path()
DEMO_TEXT = DEMO.read_text()


def demo_text(*pairs: tuple[str, str]) -> str:
    """The demo's text with each ``old`` (which must occur once) replaced by ``new``."""
    text = DEMO_TEXT
    for old, new in pairs:
        assert text.count(old) == 1, old
        text = text.replace(old, new)
    return text


def demo_variant(*pairs: tuple[str, str]) -> Design:
    """The demo with each ``old`` text (which must occur once) replaced by ``new``."""
    return loads_design(demo_text(*pairs), "demo.toml")
