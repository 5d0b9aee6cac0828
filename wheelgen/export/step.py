"""Deterministic STEP (AP214) files: one part, or an assembly with named, placed parts.

OCC's writer varies between runs (measured, see the team's cadquery notes §3): the
header time stamp; product names and assembly-usage ids from process-wide counters;
and, with two or more coloured parts, colour entities in pointer-hash order. We fix
the header, rename the counters' products, number the usage ids ourselves, and
rewrite the colour tail of the data section in a canonical order (the geometry
section is stable and left untouched).

Size: every file is then compacted (:func:`compact_step`): a point, direction,
circle, surface or curve that the kernel wrote several times is written once and
shared, which halves a wheel's file; the flanks themselves are already as small as
their accuracy allows (:mod:`wheelgen.solids.spline_fit`), and no 2D parameter
curves are written (readers rebuild them).

Speed: a single part skips the kernel's model check, whose cost grows faster than
the tooth count (see :func:`write_step`); the assembly writer runs it inside
STEPCAFControl_Writer and cannot skip it.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

import cadquery as cq
from cadquery.occ_impl.assembly import toCAF
from OCP.APIHeaderSection import APIHeaderSection_MakeHeader
from OCP.IFSelect import IFSelect_ContextWrite, IFSelect_ReturnStatus
from OCP.Interface import Interface_Static
from OCP.StepBasic import StepBasic_Product
from OCP.STEPCAFControl import STEPCAFControl_Writer
from OCP.STEPControl import STEPControl_AsIs, STEPControl_Writer
from OCP.StepRepr import StepRepr_NextAssemblyUsageOccurrence
from OCP.TCollection import TCollection_HAsciiString
from OCP.XSControl import XSControl_WorkSession

__all__ = [
    "STEP_TIME_STAMP",
    "canonical_step",
    "compact_step",
    "write_step",
    "write_step_assembly",
]

#: Fixed header time stamp, so that the same design gives the same bytes.
STEP_TIME_STAMP = "2000-01-01T00:00:00"


def _statics(pcurves: bool = False) -> None:
    # no 2D parameter curves: half the size and time (12.3 -> 6.6 MB for a 127-tooth
    # wheel); readers rebuild them, and the re-import tests measure the result
    # Interface_Static values are process-global and sticky: set every one each time
    Interface_Static.SetIVal_s("write.surfacecurve.mode", int(pcurves))
    Interface_Static.SetIVal_s("write.precision.mode", 0)
    Interface_Static.SetCVal_s("xstep.cascade.unit", "MM")
    Interface_Static.SetCVal_s("write.step.unit", "MM")


def _of_type(model: Any, kind: Any) -> list[Any]:  # an OCP model and OCP class
    # the type filter runs in C++: a Python loop over a 400-tooth wheel's 266 k
    # entities took 0.9 ms per tooth; the model's order (and so the numbering) is kept
    it = model.Entities()
    it.SelectType(kind.get_type_descriptor_s(), True)
    found = []
    it.Start()
    while it.More():
        found.append(it.Value())
        it.Next()
    return found


def _normalize(model, name: str) -> None:  # type: ignore[no-untyped-def]  # OCP model
    for n, e in enumerate(_of_type(model, StepRepr_NextAssemblyUsageOccurrence), 1):
        e.SetId(TCollection_HAsciiString(str(n)))
    for e in _of_type(model, StepBasic_Product):
        if e.Name().ToCString().startswith("Open CASCADE STEP translator"):
            e.SetName(TCollection_HAsciiString(name))
            e.SetId(TCollection_HAsciiString(name))
    header = APIHeaderSection_MakeHeader(model)
    header.SetTimeStamp(TCollection_HAsciiString(STEP_TIME_STAMP))
    header.SetName(TCollection_HAsciiString(name))


_ENTITY = re.compile(r"\n(?=#\d+ = )")
_STRING = re.compile(r"('(?:[^']|'')*')")
_REF = re.compile(r"#(\d+)")


def _subrefs(body: str, f: Callable[[re.Match[str]], str]) -> str:
    # replace references outside quoted strings only
    return "".join(
        _REF.sub(f, p) if k % 2 == 0 else p for k, p in enumerate(_STRING.split(body))
    )


def canonical_step(text: str) -> str:
    """Reorder and renumber the colour/presentation tail of a STEP text canonically."""
    pre, rest = text.split("\nDATA;\n", 1)
    data, post = rest.split("\nENDSEC;", 1)
    chunks = _ENTITY.split(data)
    i0 = next(
        (
            i
            for i, c in enumerate(chunks)
            if "MECHANICAL_DESIGN_GEOMETRIC_PRESENTATION_REPRESENTATION(" in c
        ),
        None,
    )
    if i0 is None:
        return text
    tail = {int(c[1 : c.index(" ")]): c[c.index("=") + 1 :] for c in chunks[i0:]}
    kids = {
        n: [
            int(r)
            for p in _STRING.split(b)[::2]
            for r in _REF.findall(p)
            if int(r) in tail
        ]
        for n, b in tail.items()
    }
    memo: dict[int, str] = {}
    new: dict[int, int] = {}

    def sig(n: int) -> str:
        # the entity's content with references into the tail expanded
        if n not in memo:
            memo[n] = _subrefs(
                tail[n],
                lambda m: "{%s}" % sig(int(m[1])) if int(m[1]) in tail else m[0],
            )
        return memo[n]

    def visit(n: int) -> None:
        if n not in new:
            new[n] = min(tail) + len(new)
            for k in kids[n]:
                visit(k)

    referenced = {k for v in kids.values() for k in v}
    for root in sorted((n for n in tail if n not in referenced), key=sig) + list(tail):
        visit(root)

    def renumber(m: re.Match[str]) -> str:
        return "#%d" % new.get(int(m[1]), int(m[1]))

    body = [
        "#%d =%s" % (new[o], _subrefs(tail[o], renumber))
        for o in sorted(tail, key=lambda o: new[o])
    ]
    return pre + "\nDATA;\n" + "\n".join(chunks[:i0] + body) + "\nENDSEC;" + post


#: Geometry entities that carry no identity of their own: two with the same contents
#: are the same point, direction, curve or surface, and a reader may share them.
#: Topology (vertices, edges, faces) is never merged: two coincident vertices would
#: be a different solid.
_SHAREABLE = frozenset(
    {
        "CARTESIAN_POINT",
        "DIRECTION",
        "VECTOR",
        "AXIS2_PLACEMENT_3D",
        "LINE",
        "CIRCLE",
        "PLANE",
        "CYLINDRICAL_SURFACE",
        "B_SPLINE_CURVE_WITH_KNOTS",
        "SURFACE_OF_LINEAR_EXTRUSION",
    }
)
_TYPE = re.compile(r"\s*([A-Z_0-9]+)\(")
_WRAP = re.compile(r"\n\s*")
_STRING_OR_REF = re.compile(r"('(?:[^']|'')*')|#(\d+)")
# representations of a shape (not the entities that link one to a product or a
# placement: SHAPE_DEFINITION_ and CONTEXT_DEPENDENT_SHAPE_REPRESENTATION)
_SHAPE_REPRESENTATION = re.compile(
    r"(?!SHAPE_DEFINITION_|CONTEXT_DEPENDENT_)[A-Z_]*SHAPE_REPRESENTATION"
)


def compact_step(text: str) -> str:
    """Write every geometry entity once: identical ones are merged, ids renumbered.

    OCC writes each use of a geometry anew: the direction (0, 0, 1) once per line,
    every vertex's point twice (the vertex and the side edge's line), and a flank's
    curve again as the base of its side face. Shared, the file of a wheel shrinks by
    about half (measured in ``benchmarks/bench_step.py``). Only the
    :data:`_SHAREABLE` types with empty names are merged; the first of equal
    entities (in file order) stays, and the ids are then numbered from 1 in file
    order, so equal input gives equal output.
    """
    pre, rest = text.split("\nDATA;\n", 1)
    data, post = rest.split("\nENDSEC;", 1)
    chunks = _ENTITY.split(data)
    ids = [int(c[1 : c.index(" ")]) for c in chunks]
    shareable = {}
    shapes = []
    for n, c in zip(ids, chunks):
        body = c[c.index("=") + 1 :]
        m = _TYPE.match(body)
        if m and m[1] in _SHAREABLE and set(_STRING.findall(body)) <= {"''"}:
            shareable[n] = _WRAP.sub("", body)
        elif m and _SHAPE_REPRESENTATION.fullmatch(m[1]):
            shapes.append(n)
    owner = _owners(ids, chunks, shapes) if len(shapes) > 1 else {}
    same: dict[int, int] = {}
    first: dict[str, int] = {}

    def keep(n: int) -> int:
        # the entity that stands for n: the first one with the same contents in the
        # same shape representation (an item is never shared between two of them)
        if n not in shareable:
            return n
        if n not in same:
            key = _REF.sub(lambda m: "#%d" % keep(int(m[1])), shareable[n])
            same[n] = first.setdefault(f"{owner.get(n, 0)}:{key}", n)
        return same[n]

    kept = [c for n, c in zip(ids, chunks) if keep(n) == n]
    new = {n: "#%d" % i for i, n in enumerate((n for n in ids if keep(n) == n), 1)}
    target = {str(n): new[keep(n)] for n in ids}

    def renumber(m: re.Match[str]) -> str:
        # a quoted string stays as it is; a reference goes to its kept entity
        return m[0] if m[2] is None else target[m[2]]

    out = _STRING_OR_REF.sub(renumber, "\n".join(kept))
    return pre + "\nDATA;\n" + out + "\nENDSEC;" + post


def _owners(ids: list[int], chunks: list[str], shapes: list[int]) -> dict[int, int]:
    """The shape representation (the first, in file order) each entity is used by."""
    refs = {}
    for n, c in zip(ids, chunks):
        outside = "".join(_STRING.split(c[c.index("=") + 1 :])[::2])
        refs[n] = [int(r) for r in _REF.findall(outside)]
    roots = set(shapes)
    owner: dict[int, int] = {}
    for root in shapes:
        todo = [root]
        while todo:
            for k in refs.get(todo.pop(), ()):
                if k not in owner and k not in roots:
                    owner[k] = root
                    todo.append(k)
    return owner


def _compact_file(path: Path) -> None:
    text = compact_step(path.read_text(encoding="latin-1"))
    with open(path, "w", encoding="latin-1", newline="") as fh:
        fh.write(text)


def write_step(shape: cq.Shape, path: Path, name: str) -> Path:
    """Write one shape as STEP, its product called ``name``; the same bytes each run."""
    writer = STEPControl_Writer()
    _statics()
    # compgraph=False: by default Transfer then builds the entity graph and runs the
    # model's semantic check (IFSelect_WorkSession::ComputeCheck), whose cost grows
    # with the size of each edge loop: perf shows it copying share lists
    # (Interface_ShareTool::IsShared -> Interface_Graph::Shareds) for the entities of
    # a loop, and a wheel's top and bottom loops hold every tooth. Measured: about
    # 0.5 ms/tooth at 50 teeth, 3.6 at 400; the whole export at 800 teeth fell from
    # 11.4 to 4.6 ms/tooth. Its result is only a check list that nothing reads; the
    # file does not depend on it.
    writer.Transfer(shape.wrapped, STEPControl_AsIs, False)
    model = writer.Model()
    _normalize(model, name)
    # STEPControl_Writer.Write refuses a session without a graph, and building one
    # runs the check; the session's STEP work library (what Write calls in the end)
    # writes the model alone: the same bytes (compared for wheels of 12..400 teeth,
    # every part of the demo design, boxes, exported in either order)
    session = writer.WS()
    context = IFSelect_ContextWrite(model, session.Protocol(), None, str(path))
    if not session.WorkLibrary().WriteFile(context):
        raise OSError(f"could not write STEP file {path}")
    _compact_file(path)
    return path


def write_step_assembly(
    name: str,
    items: Sequence[tuple[str, cq.Shape, cq.Location, tuple[float, float, float]]],
    path: Path,
) -> Path:
    """Write an assembly; ``items``: (part name, shape, placement, RGB colour 0..1)."""
    assy = cq.Assembly(name=name)
    for part_name, shape, loc, rgb in items:
        assy.add(shape, name=part_name, loc=loc, color=cq.Color(*rgb, 1.0))
    _, doc = toCAF(assy, True)
    writer = STEPCAFControl_Writer(XSControl_WorkSession(), False)
    writer.SetColorMode(True)
    writer.SetLayerMode(True)
    writer.SetNameMode(True)
    _statics()
    Interface_Static.SetIVal_s("write.stepcaf.subshapes.name", 1)
    writer.Transfer(doc, STEPControl_AsIs)
    _normalize(writer.ChangeWriter().Model(), name)
    if writer.Write(str(path)) != IFSelect_ReturnStatus.IFSelect_RetDone:
        raise OSError(f"could not write STEP file {path}")
    text = compact_step(canonical_step(path.read_text(encoding="latin-1")))
    with open(path, "w", encoding="latin-1", newline="") as fh:
        fh.write(text)
    return path
