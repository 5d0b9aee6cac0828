"""Index-plate hole circles and change-gear sets for a worm dividing head.

The sets are plain tuples of whole numbers (holes per circle, teeth per gear).
``plate_set`` and ``gear_set`` turn a name or a comma-separated list, as typed on the
command line, into such a tuple and say what is wrong when they cannot.
"""

from __future__ import annotations

from ..design.bounds import BOUNDS

__all__ = [
    "THREE_PLATE",
    "TWO_SIDED",
    "PLATE_SETS",
    "DEFAULT_PLATES",
    "CHANGE_GEARS",
    "plate_set",
    "gear_set",
]

# Three-plate set, the one most commonly supplied with a 40:1 head. From memory;
# cross-checked against the published claim in "Practical Treatise on Milling and
# Milling Machines" (en.wikisource.org, p. 58) that these plates index "all divisions
# up to 50, even numbers up to 100, except 96" (docs/references.md section 12).
THREE_PLATE: tuple[int, ...] = (
    15, 16, 17, 18, 19, 20,  # plate 1
    21, 23, 27, 29, 31, 33,  # plate 2
    37, 39, 41, 43, 47, 49,  # plate 3
)  # fmt: skip

# One plate drilled on both faces. Published: ordnance manual OD 16448, dividing-head
# chapter, armyordnance.tpub.com/od16448/od164480030.htm (docs/references.md
# section 12).
TWO_SIDED: tuple[int, ...] = (
    24, 25, 28, 30, 34, 37, 38, 39, 41, 42, 43,  # side 1
    46, 47, 49, 51, 53, 54, 57, 58, 59, 62, 66,  # side 2
)  # fmt: skip

#: Named plate sets, as accepted by ``plate_set`` and ``wheelgen index --plates``.
PLATE_SETS: dict[str, tuple[int, ...]] = {
    "three-plate": THREE_PLATE,
    "two-sided": TWO_SIDED,
}

DEFAULT_PLATES = "three-plate"

# Change gears commonly supplied with a head that can index differentially. From
# memory (after Machinery's Handbook, "Differential Indexing"; docs/references.md
# section 12). 24 comes twice, so a compound train may use two 24s.
CHANGE_GEARS: tuple[int, ...] = (24, 24, 28, 32, 40, 44, 48, 56, 64, 72, 86, 100)


def _count_list(text: str, what: str, each: str, count: str) -> tuple[int, ...]:
    """Whole numbers from ``"15, 16, 17"``, each within bound ``each`` and at most as
    many as bound ``count`` allows (both from the bounds table)."""
    items = [item.strip() for item in text.split(",")]
    if not text.strip() or any(item == "" for item in items):
        raise ValueError(
            f"'{what}' must be a comma-separated list of whole numbers, got {text[:40]!r}"
        )
    most, limit = BOUNDS[count], BOUNDS[each]
    if len(items) > most.high:
        raise ValueError(
            f"'{what}' may list at most {int(most.high)}, got {len(items)} "
            f"({most.reason})"
        )
    counts = []
    for item in items:
        try:
            if len(item) > 12:  # int() of thousands of digits is slow and says so
                raise ValueError
            number = int(item)
        except ValueError:
            raise ValueError(
                f"'{what}' must be a comma-separated list of whole numbers, "
                f"got {item[:20]!r} in {text[:40]!r}"
            ) from None
        if not limit.holds(number):
            raise ValueError(
                f"each of '{what}' must be {limit.allowed()}, got {number} "
                f"({limit.reason})"
            )
        counts.append(number)
    return tuple(counts)


def plate_set(spec: str) -> tuple[int, ...]:
    """Hole circles from a set name or a list such as ``"15,16,17"``.

    Parameters
    ----------
    spec
        One of ``'three-plate'``, ``'two-sided'``, or whole numbers >= 2 separated by
        commas (holes per circle).

    Returns
    -------
    tuple of int
        The circles, sorted, each once.
    """
    key = spec.strip().lower()
    if key in PLATE_SETS:
        return PLATE_SETS[key]
    if key and not any(ch.isdigit() for ch in key):
        names = ", ".join(f"'{name}'" for name in PLATE_SETS)
        raise ValueError(
            f"'plates' must be one of {names} or a list like '15,16,17', got {spec!r}"
        )
    return tuple(
        sorted(
            set(
                _count_list(
                    spec, "plates", "option.index.holes", "option.index.circles"
                )
            )
        )
    )


def gear_set(spec: str) -> tuple[int, ...]:
    """Change gears from a list such as ``"24,24,28"``, ``'standard'`` or ``'none'``.

    Parameters
    ----------
    spec
        Teeth per gear (whole numbers >= 8), one entry per gear owned: a count written
        twice is two gears. ``'standard'`` is ``CHANGE_GEARS``; ``'none'`` means no
        change gears (simple indexing only).

    Returns
    -------
    tuple of int
        The gears, sorted, duplicates kept.
    """
    key = spec.strip().lower()
    if key == "standard":
        return CHANGE_GEARS
    if key == "none":
        return ()
    return tuple(
        sorted(
            _count_list(spec, "gears", "option.index.gear_teeth", "option.index.gears")
        )
    )
