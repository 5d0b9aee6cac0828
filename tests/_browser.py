"""Render a page in headless Chromium and keep the screenshot (tests skip without it)."""

from __future__ import annotations

import shutil
import subprocess
import tempfile
from pathlib import Path

__all__ = ["chromium", "screenshot"]


def chromium() -> str | None:
    """The Chromium (or Chrome) executable, if one is installed."""
    for name in ("chromium", "chromium-browser", "google-chrome", "chrome"):
        path = shutil.which(name)
        if path:
            return path
    return None


def screenshot(page: Path, shot: Path, size: str = "1000,1400") -> str | None:
    """Render ``page`` into the PNG ``shot``, window ``size`` pixels ("w,h").

    Returns why it could not (for ``pytest.skip``), or None when the PNG is there.
    No network: every fetching service of the browser is turned off.
    """
    browser = chromium()
    if browser is None:
        return "Chromium is not installed"
    with tempfile.TemporaryDirectory() as profile:
        cmd = [
            browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
            "--no-first-run", "--disable-background-networking",
            "--disable-component-update", "--disable-sync",
            f"--user-data-dir={profile}", f"--window-size={size}",
            "--hide-scrollbars", f"--screenshot={shot}", page.as_uri(),
        ]  # fmt: skip
        try:
            subprocess.run(cmd, capture_output=True, timeout=90, check=False)
        except subprocess.TimeoutExpired:
            return "Chromium did not finish within 90 s"
    if not shot.exists():
        return "Chromium ran but wrote no screenshot (no usable display stack)"
    return None
