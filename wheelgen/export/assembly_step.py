"""The assembly STEP: every part's solid at its place, coloured by kind, cached as a
whole under a key of the parts' keys and places.
"""

from __future__ import annotations

import hashlib
import io
import json
import shutil
from collections.abc import Callable, Sequence
from pathlib import Path

from ..design.model import Design
from ..layout.part_kinds import Part
from ..version import __version__
from .build_options import BuildOptions
from .cache import DamagedEntry, PartCache
from .cached_parts import changing_cache, read_part_file
from .part_files import BREP_FILE
from .staging import Staging, inside, safe_name

__all__ = ["ASSEMBLY_FILE", "stage_assembly"]

#: The assembly's file, inside the output folder.
ASSEMBLY_FILE = "step/assembly.step"

# part colours in the assembly (RGB 0..1): brass wheels, steel arbors, bronze sleeves,
# pale brass plates and cocks, steel pillars, dark screws, dark hands on a pale dial, a
# wooden knob or crank
_COLOURS = {
    "wheel": (0.80, 0.62, 0.25),
    "arbor": (0.62, 0.64, 0.68),
    "sleeve": (0.70, 0.45, 0.25),
    "collar": (0.74, 0.52, 0.30),
    "pin": (0.30, 0.30, 0.32),
    "plate": (0.86, 0.78, 0.55),
    "pillar": (0.55, 0.57, 0.60),
    "cock": (0.78, 0.66, 0.38),
    "screw": (0.20, 0.20, 0.22),
    "bearing": (0.45, 0.47, 0.50),
    "hand": (0.12, 0.14, 0.22),
    "dial": (0.93, 0.91, 0.84),
    "knob": (0.45, 0.30, 0.18),
    "crank": (0.45, 0.30, 0.18),
}


def _assembly_key(design: Design, parts: Sequence[Part], keys: Sequence[str]) -> str:
    data = {
        "wheelgen": __version__,
        "design": design.name,
        "parts": [
            [
                p.name,
                p.kind,
                k,
                [p.placement.x, p.placement.y, p.placement.z, p.placement.angle_deg],
            ]
            for p, k in zip(parts, keys)
        ],
    }
    return hashlib.sha256(json.dumps(data, sort_keys=True).encode()).hexdigest()


def _write_assembly(
    design: Design, parts: Sequence[Part], breps: Sequence[bytes], path: Path
) -> None:
    import cadquery as cq

    from .step import write_step_assembly

    items = []
    for p, brep in zip(parts, breps):
        shape = cq.Shape.importBrep(io.BytesIO(brep))
        pl = p.placement
        loc = cq.Location(cq.Vector(pl.x, pl.y, pl.z), cq.Vector(0, 0, 1), pl.angle_deg)
        items.append((p.name, shape, loc, _COLOURS.get(p.kind, (0.5, 0.5, 0.5))))
    write_step_assembly(
        safe_name(design.name, "design name", reserved=False), items, path
    )


def _make_assembly(
    design: Design,
    parts: Sequence[Part],
    breps: Sequence[bytes],
    cache: PartCache,
    akey: str,
) -> None:
    tmp = cache.new_entry()
    try:
        dest = inside(tmp, ASSEMBLY_FILE)
        dest.parent.mkdir(parents=True)
        _write_assembly(design, parts, breps, dest)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    cache.publish(akey, tmp, [ASSEMBLY_FILE])


def stage_assembly(
    design: Design,
    parts: Sequence[Part],
    keys: Sequence[str],
    cache: PartCache,
    options: BuildOptions,
    stage: Staging,
    tell: Callable[..., None],
) -> str:
    """Copy the assembly STEP into the staging folder, made first if not in the cache.

    Returns the assembly's cache key. A damaged entry is made again once; twice is a
    :class:`~wheelgen.export.cached_parts.CacheError`.
    """
    akey = _assembly_key(design, parts, keys)
    for attempt in (1, 2):
        try:
            if not cache.check(akey):
                breps = [
                    read_part_file(cache, k, p, BREP_FILE, options, tell)
                    for p, k in zip(parts, keys)
                ]
                _make_assembly(design, parts, breps, cache, akey)
            cache.copy_verified(akey, ASSEMBLY_FILE, stage.path(ASSEMBLY_FILE))
            break
        except DamagedEntry as exc:
            if attempt == 2:
                raise changing_cache(cache) from None
            tell(f"the assembly's cache entry is damaged ({exc}); making it again")
            cache.discard(akey)
    return akey
