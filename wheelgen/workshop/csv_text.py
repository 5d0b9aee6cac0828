"""The CSV text of every workshop sheet, written one way.

A header row, then one row per item; comma-separated with the standard library's
quoting and ``\\n`` line ends, so a sheet is the same bytes on every system.
"""

from __future__ import annotations

import csv
import io
from collections.abc import Iterable, Sequence

__all__ = ["csv_text"]


def csv_text(header: Sequence[str], rows: Iterable[Sequence[object]]) -> str:
    """``header`` and ``rows`` as CSV text (``\\n`` line ends)."""
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\n")
    writer.writerow(header)
    writer.writerows(rows)
    return buf.getvalue()
