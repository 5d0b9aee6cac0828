"""Mesh files without the CAD kernel: a 3MF of many objects (and the STL reader).

The build plates of a printed design are put together from the parts' STL files after
they are written, by a sheet writer that must not load the kernel; the part writers of
:mod:`wheelgen.export.mesh` use the same 3MF package code, so every 3MF wheelgen writes
has the same fixed zip dates and the same XML.
"""

from __future__ import annotations

import io
import zipfile
from pathlib import Path
from typing import Sequence

import numpy as np

from ..design.names import xml_text
from ..workshop.stl_file import STL_DTYPE, read_stl

__all__ = ["STL_DTYPE", "read_stl", "write_3mf_objects"]

_CONTENT_TYPES = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    '<Types xmlns="http://schemas.openxmlformats.org/package/2006/content-types">'
    '<Default Extension="rels" ContentType="application/vnd.openxmlformats-package.relationships+xml"/>'
    '<Default Extension="model" ContentType="application/vnd.ms-package.3dmanufacturing-3dmodel+xml"/>'
    "</Types>\n"
)
_RELS = (
    '<?xml version="1.0" encoding="UTF-8"?>\n'
    '<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships">'
    '<Relationship Target="/3D/3dmodel.model" Id="rel0" '
    'Type="http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel"/>'
    "</Relationships>\n"
)


def _model_xml(
    title: str, objects: Sequence[tuple[str, np.ndarray, np.ndarray]]
) -> str:
    out = io.StringIO()
    out.write('<?xml version="1.0" encoding="UTF-8"?>\n')
    out.write(
        '<model unit="millimeter" xml:lang="en-US" '
        'xmlns="http://schemas.microsoft.com/3dmanufacturing/core/2015/02">\n'
    )
    out.write(f' <metadata name="Title">{xml_text(title)}</metadata>\n')
    out.write(" <resources>\n")
    for k, (name, vertices, triangles) in enumerate(objects, start=1):
        out.write(
            f'  <object id="{k}" type="model" name="{xml_text(name)}">\n'
            "   <mesh>\n    <vertices>\n"
        )
        out.writelines(
            f'     <vertex x="{x:.6f}" y="{y:.6f}" z="{z:.6f}"/>\n'
            for x, y, z in np.asarray(vertices).tolist()
        )
        out.write("    </vertices>\n    <triangles>\n")
        out.writelines(
            f'     <triangle v1="{a}" v2="{b}" v3="{c}"/>\n'
            for a, b, c in np.asarray(triangles).tolist()
        )
        out.write("    </triangles>\n   </mesh>\n  </object>\n")
    out.write(" </resources>\n <build>\n")
    out.writelines(f'  <item objectid="{k}"/>\n' for k in range(1, len(objects) + 1))
    out.write(" </build>\n</model>\n")
    return out.getvalue()


def write_3mf_objects(
    path: Path, title: str, objects: Sequence[tuple[str, np.ndarray, np.ndarray]]
) -> Path:
    """A 3MF package in mm holding ``objects`` (name, vertices, triangles) where their
    vertices stand; fixed zip dates: equal meshes, equal bytes."""
    entries = (
        ("[Content_Types].xml", _CONTENT_TYPES),
        ("_rels/.rels", _RELS),
        ("3D/3dmodel.model", _model_xml(title, objects)),
    )
    with zipfile.ZipFile(path, "w") as zf:
        for entry, text in entries:
            info = zipfile.ZipInfo(entry, date_time=(2000, 1, 1, 0, 0, 0))
            info.compress_type = zipfile.ZIP_DEFLATED
            info.external_attr = 0o644 << 16
            zf.writestr(info, text.encode("utf-8"))
    return path
