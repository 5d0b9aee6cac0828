"""Reading a binary STL back (numpy only): the print sheet lays the parts' meshes out
on the build plates after they are written, without the CAD kernel."""

from __future__ import annotations

from pathlib import Path

import numpy as np

__all__ = ["STL_DTYPE", "read_stl"]

#: One binary STL record: normal, three corners, attribute count.
STL_DTYPE = np.dtype([("n", "<f4", (3,)), ("v", "<f4", (3, 3)), ("a", "<u2")])


def read_stl(path: Path) -> tuple[np.ndarray, np.ndarray]:
    """A binary STL as (welded vertices (n, 3) in mm, triangles (m, 3))."""
    raw = Path(path).read_bytes()
    count = int(np.frombuffer(raw[80:84], "<u4")[0])
    rec = np.frombuffer(raw[84:], dtype=STL_DTYPE, count=count)
    corners = rec["v"].reshape(-1, 3).astype(np.float64)
    unique, inverse = np.unique(corners, axis=0, return_inverse=True)
    return unique, inverse.reshape(-1, 3)
