"""The hostile-input corpus: mutated train files and command lines, made on the fly.

Every case is a command line (``args``) and the files it needs (``files``: name ->
text, or one of the special kinds in :data:`SPECIAL`). The cases are generated from the
bundled demo design, one mutation each, in a fixed order, so the corpus is the same on
every run:

- every number a design file holds or may hold, set to hostile values (zero, negative,
  the smallest and largest floats, nan and infinities, integers no float holds, text,
  lists, tables);
- every text key set to hostile text (control characters, very long, empty, unicode);
- names that break the name rule or collide, references to nothing, cycles;
- whole files that are no train file (empty, binary, not UTF-8, nested too deeply,
  too large, a pipe, a device, a folder);
- command lines of ``check``, ``gear``, ``index``, ``motion`` and ``build`` with
  hostile numbers and paths.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from pathlib import Path

from wheelgen.design.settings_tables import PROCESS_KEYS
from wheelgen.design.train_tables import WHEEL_KEYS

__all__ = ["Case", "SPECIAL", "cases"]

DEMO_TEXT = (
    Path(__file__).resolve().parents[1]
    / "wheelgen"
    / "designs"
    / "harbour_tide_clock.toml"
).read_text(encoding="utf-8")

#: File contents that are not text: made by the test as these kinds of file.
SPECIAL = ("<fifo>", "<dev-zero-link>", "<folder>", "<big>", "<latin1>")

HOSTILE_NUMBERS = (
    "0",
    "-1",
    "5e-324",
    "1e-300",
    "1e308",
    "9.2e18",
    "1e10",
    "nan",
    "inf",
    "-inf",
    "1" + "0" * 400,  # an integer no float holds
    '"3"',
    "true",
    "[1.0, 2.0]",
    "{ a = 1 }",
)
HOSTILE_TEXT = (
    '""',
    '"sun\\n"',
    '"\\u0000\\u001b[31m"',
    '"' + "x" * 5000 + '"',
    '"Uhr_ä"',
    '"-rf"',
    '"../../etc/x"',
    "42",
    "[]",
)


@dataclass(frozen=True)
class Case:
    id: str
    args: tuple[str, ...]
    files: dict[str, str] = field(default_factory=dict)


def _blocks(text: str) -> list[tuple[int, int, str]]:
    """(first line, end line, header) of every table of ``text``."""
    lines = text.splitlines()
    starts = [i for i, line in enumerate(lines) if line.startswith("[")]
    return [
        (s, (starts[k + 1] if k + 1 < len(starts) else len(lines)), lines[s])
        for k, s in enumerate(starts)
    ]


def _set_key(text: str, anchor: str, key: str, value: str) -> str:
    """``text`` with ``key = value`` in the table that holds line ``anchor``."""
    lines = text.splitlines()
    at = next(i for i, line in enumerate(lines) if line.startswith(anchor))
    for start, end, _ in _blocks(text):
        if start <= at < end:
            for i in range(start + 1, end):
                if re.match(rf"^{re.escape(key)}\s*=", lines[i]):
                    lines[i] = f"{key} = {value}"
                    return "\n".join(lines) + "\n"
            lines.insert(at + 1, f"{key} = {value}")
            return "\n".join(lines) + "\n"
    raise ValueError(anchor)


# (table anchor line, keys): every number a design may hold, each in one table.
_NUMBER_KEYS = [
    ('name = "moon_wheel"', [*(k for k, v in WHEEL_KEYS.items() if v[1] != "string"),
                             "teeth", "height"]),
    ("[defaults]", ["module", "face_width", "backlash"]),
    ("[process]", [*(k for k, v in PROCESS_KEYS.items() if v[0] != "string"), "bed"]),
    ("[frame]", ["plates", "thickness", "margin", "clearance", "corner", "pillars",
                 "pillar_diameter", "rectangle", "polygon"]),
    ('name = "lay"', ["at", "diameter"]),
    ('name = "planet"', ["at", "diameter"]),
    ('name = "moon_coupling"', ["radius", "offset", "bearing", "pin_diameter"]),
    ('pair = ["day_wheel", "lay_pinion"]', ["bearing"]),
    ("[[stock]]", ["outside", "inside"]),
    ("[[hand]]", ["length", "tail", "counterweight", "width", "thickness", "rest"]),
    ('arbor = "tide"', ["zero"]),
    ("[display]", ["dial_gap", "hand_gap", "dial_thickness", "hand_thickness"]),
    ('period = "12.4206012 h"     # mean period of the principal lunar tide', ["turns"]),
]  # fmt: skip

_TEXT_KEYS = [
    ('title = "Harbour tide clock (Saltmere Quay)"', ["title", "process"]),
    ('name = "moon_wheel"', ["name", "arbor", "form", "seat"]),
    ('name = "stud"', ["name", "around"]),
    ('name = "planet"', ["carrier"]),
    ('name = "moon_coupling"', ["name", "pin", "slot", "pin_part"]),
    ("[drive]", ["arbor", "period", "sense"]),
    ('period = "12.4206012 h"     # mean period of the principal lunar tide',
     ["period", "tolerance", "sense", "arbor"]),
    ("[process]", ["fit"]),
]  # fmt: skip

_STOCK = (
    "\n[[stock]]\noutside = 6.0\ninside = 4.0\n"
    '\n[[hand]]\narbor = "hours"\n\n[display]\nreadings = "targets"\n'
)


def _label(anchor: str) -> str:
    """A short name for the table an anchor line stands in."""
    words = re.findall(r"[A-Za-z0-9_]+", anchor.split("#")[0])
    return "_".join(words[-2:] if anchor.startswith(("name", "pair")) else words[:1])


def _design_cases() -> list[Case]:
    base = DEMO_TEXT + _STOCK
    out = []
    for anchor, keys in _NUMBER_KEYS:
        for key in keys:
            for k, value in enumerate(HOSTILE_NUMBERS):
                text = _set_key(base, anchor, key, value)
                out.append(
                    Case(f"number-{_label(anchor)}-{key}-{k}", (), {"d.toml": text})
                )
    for anchor, keys in _TEXT_KEYS:
        for key in keys:
            for k, value in enumerate(HOSTILE_TEXT):
                text = _set_key(base, anchor, key, value)
                out.append(
                    Case(f"text-{_label(anchor)}-{key}-{k}", (), {"d.toml": text})
                )
    return [Case(c.id, ("check", "d.toml"), c.files) for c in out]


def _arbors(count: int, link: str) -> str:
    tables = ['[design]\ntitle = "t"\n[drive]\narbor = "a0"\nperiod = "1 h"\n']
    tables.append('[[arbor]]\nname = "a0"\nat = [0.0, 0.0]\n')
    for i in range(1, count):
        extra = {
            "around": f'around = "a{i - 1}"\n',
            "none": f"at = [{i % 50 * 10.0}, {i // 50 * 10.0}]\n",
        }[link]
        tables.append(f'[[arbor]]\nname = "a{i}"\n{extra}')
    return "\n".join(tables)


def _structure_cases() -> list[Case]:
    base = DEMO_TEXT
    texts: dict[str, str] = {
        "empty": "",
        "only-comment": "# nothing\n",
        "binary": "\x00\x01\x02\x03" * 100,
        "not-toml": "this is not toml\n",
        "bom": "\ufeff" + base,
        "crlf": base.replace("\n", "\r\n"),
        "dotted-50000": base + "a" + ".b" * 50_000 + " = 1\n",
        "dotted-9": base + "a.b.c.d.e.f.g.h.i = 1\n",
        "brackets-50000": "a = " + "[" * 50_000 + "]" * 50_000 + "\n",
        "brackets-900": base + "x = " + "[" * 900 + "]" * 900 + "\n",
        "inline-deep": base + "x = " + "{a = " * 30 + "1" + "}" * 30 + "\n",
        "long-int": base + "x = " + "9" * 5000 + "\n",
        "nul-in-string": base.replace('title = "', 'title = "\\u0000'),
        "no-design": re.sub(r"\[design\][^\[]*", "", base, count=1),
        "no-drive": re.sub(r"\[drive\][^\[]*", "", base, count=1),
        "design-array": base.replace("[design]", "[[design]]"),
        "arbor-table": base.replace("[[arbor]]", "[arbor]", 1),
        "duplicate-name": base.replace('name = "lay"', 'name = "main"'),
        "case-twins": base.replace('name = "lay"', 'name = "MAIN"'),
        "cycle-around": base.replace('around = "main"', 'around = "tide"'),
        "carried-by-own-wheel": base.replace('carrier = "hour_wheel"', 'carrier = "planet_wheel"'),
        "missing-wheel": base.replace('pair = ["sun", "planet_wheel"]', 'pair = ["sun", "nowhere"]'),
        "self-mesh": base.replace('pair = ["sun", "planet_wheel"]', 'pair = ["sun", "sun"]'),
        "sleeve-meshes-its-shaft": base.replace(
            'pair = ["day_wheel", "lay_pinion"]', 'pair = ["day_wheel", "sun"]'),
        "undriven-2500": _arbors(2500, "none"),
        "undriven-1500": _arbors(1500, "none"),
        "nested-3000": _arbors(3000, "around"),
        "nested-1000": _arbors(1000, "around"),
        "title-1mb": base.replace('title = "', 'title = "' + "x" * 1_000_000, 1),
        "many-unknown-keys": base.replace(
            "[design]", "[design]\n" + "".join(f"k{i} = 1\n" for i in range(20_000))),
        "many-bad-refs": base + "".join(
            f'[[mesh]]\npair = ["sun", "no{i}"]\n' for i in range(3000)),
    }  # fmt: skip
    out = [
        Case(f"file-{k}", ("check", "d.toml"), {"d.toml": v}) for k, v in texts.items()
    ]
    for special in SPECIAL:
        out.append(
            Case(f"file-{special[1:-1]}", ("check", "d.toml"), {"d.toml": special})
        )
    out.append(Case("file-missing", ("check", "absent.toml")))
    out.append(Case("file-dev-zero", ("check", "/dev/zero")))
    return out


_DEMO = {"d.toml": DEMO_TEXT}


def _command_cases() -> list[Case]:
    rows: list[tuple[str, ...]] = []
    gear_numbers = ("nan", "inf", "-inf", "1e999999", "0", "-1", "1e308", "5e-324",
                    "9" * 5000, "x", "")  # fmt: skip
    for option in ("--teeth", "--module", "--pin", "--backlash", "--shift",
                   "--pressure-angle", "--tooth-angle", "--addendum", "--dedendum",
                   "--root-radius", "--tip-radius", "--mate", "--mate-shift",
                   "--centre-distance"):  # fmt: skip
        for value in gear_numbers:
            base = {"--teeth": ("--module", "1"), "--module": ("--teeth", "20")}
            rest = base.get(option, ("--teeth", "20", "--module", "1"))
            extra = ("--mate", "30") if option == "--centre-distance" else ()
            rows.append(("gear", *rest, *extra, option, value))
    for value in ("1e7", "10000000", "nan", "0", "-5", "1e999999", "9" * 5000):
        rows.append(("index", "127", "--ratio", value))
        rows.append(("index", value))
        rows.append(("index", "--angle", value))
    rows += [
        ("index", "127", "--plates", ",".join(["15"] * 500)),
        ("index", "127", "--plates", "9" * 5000),
        ("index", "127", "--gears", ",".join(str(20 + i) for i in range(40))),
        ("index", "127", "--gears", "24,24,24,24,24,24,24,24,24,24,24,24,24,24,24,24"),
        ("index", "127", "--ratio", "997", "--plates", "991,997,1000"),
    ]
    for value in ("nan", "inf", "0", "-1", "1e999999", "1e300", "100000000"):
        rows.append(("motion", "d.toml", "--turns", value))
        rows.append(("motion", "d.toml", "--samples", value))
    rows.append(("motion", "d.toml", "--samples", "100000", "--csv", "m.csv"))
    rows.append(("motion", "d.toml", "--arbor", "nowhere"))
    rows.append(("motion", "d.toml", "--plot", "m.gif"))
    rows.append(("motion", "d.toml", "--csv", "/proc/x/m.csv"))
    for value in ("0", "-1", "nan", "1e999999", "65"):
        rows.append(("build", "d.toml", "--jobs", value))
    for value in ("nan", "inf", "0", "1e-9", "5"):
        rows.append(("build", "d.toml", "--tolerance", value))
    rows += [
        ("build", "d.toml", "--formats", "dxf", "-o", "/proc/x"),
        ("build", "d.toml", "--formats", "dxf", "-o", "/dev/null"),
        ("build", "d.toml", "--formats", "dxf", "-o", "d.toml"),
        ("build", "d.toml", "--formats", "exe"),
        ("build", "d.toml", "--formats", ""),
        ("gear", "-z", "20", "-m", "1", "--svg", "/proc/x.svg"),
        ("check", "d.toml", "--json"),
    ]
    return [
        Case(f"cli-{k}-{' '.join(r)[:40]}", r, dict(_DEMO)) for k, r in enumerate(rows)
    ]


def cases() -> list[Case]:
    """The whole corpus, in a fixed order, each id unique."""
    out = _design_cases() + _structure_cases() + _command_cases()
    ids = [c.id for c in out]
    assert len(ids) == len(set(ids)), "case ids must differ"
    return out
