"""The layer contract of DEVELOPERS.md, read from its table and checked on the source.

Every import of every module of the package is found with ``ast`` (imports inside
functions and under ``TYPE_CHECKING`` too: a circle hidden in a function is still a
circle). An import ``from a.b import c`` depends on ``a.b.c`` when that is a module, else
on ``a.b``; either way also on the packages above it (their ``__init__`` runs first),
except those the importing module is itself inside. The checks:

- each module imports only the layers its row of the table names, and only the
  third-party libraries it names (the standard library is always allowed);
- the import graph has no circles (each is named, module by module);
- only the kernel layers import cadquery or OCP, and in a fresh interpreter neither
  importing every other module nor running ``wheelgen check`` starts the kernel.
"""

from __future__ import annotations

import ast
import re
import subprocess
import sys
from dataclasses import dataclass
from functools import cache
from pathlib import Path

from tests._demo import DEMO

ROOT = Path(__file__).resolve().parents[1]
PACKAGE = ROOT / "wheelgen"
GUIDE = ROOT / "DEVELOPERS.md"

#: Libraries a row may name in its "may import" column (the rest is the stdlib).
THIRD_PARTY = ("numpy", "scipy", "matplotlib", "ezdxf", "click", "cadquery", "OCP")
KERNEL = ("cadquery", "OCP")


@dataclass(frozen=True)
class Row:
    name: str  # "design", "findings", "__init__", ...
    layers: frozenset[str]  # the layers it may import
    libraries: frozenset[str]  # the third-party libraries it may import


@cache
def layer_table() -> tuple[Row, ...]:
    """The rows of the table under "## Layers" in DEVELOPERS.md, in order."""
    text = GUIDE.read_text(encoding="utf-8")
    section = text.split("\n## Layers\n", 1)[1].split("\n## ", 1)[0]
    rows: list[Row] = []
    for line in section.splitlines():
        cells = [c.strip() for c in line.strip().strip("|").split("|")]
        if len(cells) != 3 or not cells[0].startswith("`"):
            continue
        name = cells[0].strip("`").removesuffix("/").removesuffix(".py")
        column = cells[2]
        layers = {w for w in re.findall(r"`([\w.]+)`", column)}
        if "every layer above" in column:
            layers |= {r.name for r in rows}
        libraries = {lib for lib in THIRD_PARTY if re.search(rf"\b{lib}\b", column)}
        rows.append(Row(name, frozenset(layers), frozenset(libraries)))
    return tuple(rows)


@cache
def modules() -> dict[str, Path]:
    """Every module of the package: dotted name -> file."""
    out: dict[str, Path] = {}
    for path in sorted(PACKAGE.rglob("*.py")):
        parts = list(path.relative_to(ROOT).with_suffix("").parts)
        if parts[-1] == "__init__":
            parts.pop()
        out[".".join(parts)] = path
    return out


def layer_of(module: str) -> str:
    parts = module.split(".")
    if len(parts) == 1:
        return "__init__"
    return parts[1]


@dataclass(frozen=True)
class Import:
    source: str  # importing module
    target: str  # a module of the package, or a top-level third-party name
    line: int


def _is_package(module: str) -> bool:
    return modules()[module].name == "__init__.py"


@cache
def imports() -> tuple[Import, ...]:
    """Every import of every module, resolved to modules of the package (with the
    packages above them) or to top-level library names."""
    mods = modules()
    stdlib = set(sys.stdlib_module_names) | {"__future__"}
    found: list[Import] = []
    for source, path in mods.items():
        own = source if _is_package(source) else source.rpartition(".")[0]
        tree = ast.parse(path.read_text(encoding="utf-8"), str(path))
        for node in ast.walk(tree):
            targets: list[str] = []
            if isinstance(node, ast.Import):
                targets = [a.name for a in node.names]
            elif isinstance(node, ast.ImportFrom):
                if node.level:
                    base = own.split(".")
                    base = base[: len(base) - (node.level - 1)]
                    module = ".".join(base + ([node.module] if node.module else []))
                else:
                    module = node.module or ""
                for alias in node.names:
                    sub = f"{module}.{alias.name}"
                    targets.append(sub if sub in mods else module)
            else:
                continue
            for target in targets:
                top = target.split(".")[0]
                if top != "wheelgen":
                    if top not in stdlib:
                        found.append(Import(source, top, node.lineno))
                    continue
                parts = target.split(".")
                for end in range(1, len(parts) + 1):
                    up = ".".join(parts[:end])
                    inside = own == up or own.startswith(up + ".")
                    if up in mods and up != source and not inside:
                        found.append(Import(source, up, node.lineno))
    return tuple(found)


def _where(i: Import) -> str:
    return f"{modules()[i.source].relative_to(ROOT)}:{i.line}"


def test_every_module_has_a_row_and_every_row_its_modules() -> None:
    rows = {r.name for r in layer_table()}
    assert len(rows) == len(layer_table()), "a layer named twice in DEVELOPERS.md"
    layers = {layer_of(m) for m in modules()}
    assert layers - rows == set(), "modules of no row in DEVELOPERS.md's table"
    assert rows - layers == set(), "rows in DEVELOPERS.md's table with no module"


def test_rows_name_only_layers_above_them() -> None:
    seen: set[str] = set()
    for row in layer_table():
        assert row.layers <= seen, f"{row.name} may import {sorted(row.layers - seen)}"
        seen.add(row.name)


def test_each_import_is_one_its_row_allows() -> None:
    rows = {r.name: r for r in layer_table()}
    wrong = []
    for i in imports():
        row = rows[layer_of(i.source)]
        if i.target.startswith("wheelgen"):
            layer = layer_of(i.target)
            if layer != row.name and layer not in row.layers:
                wrong.append(f"{_where(i)}: {i.source} imports {i.target}")
        elif i.target not in row.libraries:
            wrong.append(f"{_where(i)}: {i.source} imports the library {i.target}")
    assert not wrong, "imports the table does not allow:\n" + "\n".join(wrong)


def _circles(edges: dict[str, set[str]]) -> list[list[str]]:
    """The strongly connected components of more than one module (Tarjan)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    on_stack: set[str] = set()
    found: list[list[str]] = []

    def visit(v: str) -> None:
        index[v] = low[v] = len(index)
        stack.append(v)
        on_stack.add(v)
        for w in sorted(edges.get(v, ())):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on_stack:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            group = []
            while True:
                w = stack.pop()
                on_stack.discard(w)
                group.append(w)
                if w == v:
                    break
            if len(group) > 1:
                found.append(sorted(group))

    for v in sorted(edges):
        if v not in index:
            visit(v)
    return found


def _a_circle(group: list[str], edges: dict[str, set[str]]) -> list[str]:
    """One circle through the first module of ``group``, as a path of modules."""
    start, members = group[0], set(group)
    paths = {start: [start]}
    todo = [start]
    while todo:
        v = todo.pop(0)
        for w in sorted(edges[v] & members):
            if w == start:
                return paths[v] + [start]
            if w not in paths:
                paths[w] = paths[v] + [w]
                todo.append(w)
    return group  # pragma: no cover - a component always holds a circle


def test_the_import_graph_has_no_circles() -> None:
    edges: dict[str, set[str]] = {m: set() for m in modules()}
    for i in imports():
        if i.target.startswith("wheelgen"):
            edges[i.source].add(i.target)
    circles = [" -> ".join(_a_circle(g, edges)) for g in _circles(edges)]
    assert not circles, "import circles:\n" + "\n".join(circles)


def test_the_circle_finder_finds_circles() -> None:
    edges = {"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}, "e": {"e"}}
    (group,) = _circles(edges)
    assert group == ["a", "b", "c"]
    assert _a_circle(group, edges) == ["a", "b", "c", "a"]


def test_only_the_kernel_layers_import_the_kernel() -> None:
    rows = {r.name: r for r in layer_table()}
    kernel = {name for name, row in rows.items() if row.libraries & set(KERNEL)}
    assert kernel == {"solids", "export"}
    # the command line loads the kernel only inside the commands that build solids
    # (the fresh-interpreter test below); every other layer never reaches it
    for name, row in rows.items():
        if name in kernel | {"cli", "__main__"}:
            continue
        reach, todo = set(), list(row.layers)
        while todo:
            layer = todo.pop()
            if layer not in reach:
                reach.add(layer)
                todo.extend(rows[layer].layers)
        assert not reach & (kernel | {"cli"}), f"{name} reaches {reach & kernel}"


def test_numeric_layers_and_the_command_line_run_without_the_kernel() -> None:
    rows = {r.name: r for r in layer_table()}
    light = sorted(
        m
        for m in modules()
        if not rows[layer_of(m)].libraries & set(KERNEL)
        and layer_of(m) not in ("__main__",)
    )
    code = "\n".join(
        [
            "import importlib, io, sys",
            f"for name in {light!r}:",
            "    importlib.import_module(name)",
            "from click.testing import CliRunner",
            "from wheelgen.cli import main",
            "from wheelgen.design import load_design",
            "from wheelgen.parts import plan_parts",
            "from wheelgen.teeth import ToothSpec, outline_for",
            "from wheelgen.workshop.drilling import drilling_svg",
            f"result = CliRunner().invoke(main, ['check', {str(DEMO)!r}])",
            "assert result.exit_code in (0, 1), result.output",
            f"design = load_design({str(DEMO)!r})",
            "plan_parts(design); drilling_svg(design, 'back')",
            "outline_for(ToothSpec(12, 1.0, form='triangular'))",
            "kernel = sorted(m for m in ('cadquery', 'OCP') if m in sys.modules)",
            "assert not kernel, f'started the CAD kernel: {kernel}'",
        ]
    )
    done = subprocess.run(
        [sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT
    )
    assert done.returncode == 0, done.stderr[-3000:]
