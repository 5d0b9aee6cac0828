"""The least backlash, or the least cut of the addendum, with which a pair runs.

A pair runs when the mesh simulator (:mod:`wheelgen.checks.mesh_sim`), turned through a
pitch exactly as the checks turn it, finds neither overlap nor a position where no tooth
drives. Its least play (mm on the pitch circles, which roll on each other) grows one for
one with the backlash (the backlash turns the flanks about the centre) and falls as the
teeth get taller, so both searches are short: a secant search on the backlash, a
bracketed secant search on the addendum. Each aims at the process's margin
(``[process] min_backlash``), rounds to the running side and checks the result again.

:func:`settle_play` applies ``least_play`` requests of a design's meshes: it returns the
design with the chosen backlash or addendum on the wheels and, on each such mesh, what
was chosen in words. It is idempotent, so every command may call it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace
from typing import Literal

from ..design.model import Design, Mesh, Process, Wheel
from ..design.process_limits import min_backlash
from ..design.tooth_defaults import tooth_angle_for_flank_deg
from ..findings import Change, Finding
from ..layout.placement import tooth_spec, working_centre_distance
from ..teeth.forms import outline_for
from ..teeth.spec import ToothSpec
from ..teeth.triangular import triangular_tooth
from .mesh_sim import CHECK_STEPS, MeshSimulation, simulate_mesh

__all__ = [
    "FLANK_MISMATCH_DEG",
    "PlayFit",
    "least_addendum",
    "least_backlash",
    "least_play_findings",
    "pair_play",
    "running_advice",
    "settle_play",
]

#: Most play (x the circular pitch) the advice ever asks of 'backlash'; a pair that
#: needs more is in the wrong place or has the wrong teeth (common practice, no source:
#: thinning a tooth by more than an eighth of a pitch on each flank spoils it).
MAX_ADVISED_PLAY = 0.25
#: Backlash (mm) and addendum (x module) found are rounded to these, always to the
#: running side, so that the values read well in a file.
_ROUND_MM = 0.001
_ROUND_COEFF = 0.001
#: The smallest addendum the search tries, x module (the loader's lower bound).
_MIN_ADDENDUM = 0.1
#: Flanks whose angles to the radius at the pitch circle differ by more than this
#: (degrees) get advice to match them (derived: 0.5 deg turns the end of a flank 0.6 m
#: tall, 0.69 m long at 30 degrees, about 0.006 m off a matched one).
FLANK_MISMATCH_DEG = 0.5
#: How ``Mesh.chosen`` starts when no value runs.
_NOTHING_RUNS = "nothing found"


@dataclass(frozen=True, slots=True)
class PlayFit:
    """What a least-play search chose (mm; addendum x module).

    ``by`` says which proportion changed; ``backlash`` is each wheel's backlash and
    ``addendum`` each wheel's addendum with the choice applied, ``cut`` how much the
    addenda were cut. ``bare`` is, for the backlash, the backlash at which the least
    play is zero (the pair just runs); for the addendum, the addendum of wheel 1
    chosen. ``margin`` is the play added for the process, ``play`` the least play then
    measured (mm on the pitch circle) and ``te_deg`` the transmission error (degrees
    at the driven wheel, peak to peak).
    """

    by: Literal["backlash", "addendum"]
    backlash: tuple[float, float]
    addendum: tuple[float, float]
    bare: float
    margin: float
    play: float
    te_deg: float
    cut: float = 0.0  # how much the addenda were cut, x module


def pair_play(
    spec1: ToothSpec, spec2: ToothSpec, centre_distance: float
) -> tuple[float, MeshSimulation]:
    """Least play (mm on the driven pitch circle) of a pair turned as the checks turn
    it, and the simulation; ``-inf`` when the driven wheel is lost (no tooth drives)."""
    sim = simulate_mesh(
        outline_for(spec1), outline_for(spec2), centre_distance, steps=CHECK_STEPS
    )
    if sim.contact_lost:
        return -math.inf, sim
    r2 = spec2.module * spec2.teeth / 2
    return math.radians(sim.min_play_deg) * r2, sim


def _runs(play: float, sim: MeshSimulation, margin: float) -> bool:
    return not sim.contact_lost and not sim.jams and play >= margin


def least_backlash(
    spec1: ToothSpec, spec2: ToothSpec, centre_distance: float, margin: float
) -> PlayFit | None:
    """The least backlash (mm, the same on both wheels) that runs with ``margin`` mm of
    play to spare; ``None`` if no backlash that leaves a tooth does.

    Each wheel is thinned by half its backlash, so the pair's backlash equals it.
    """

    def at(b: float) -> tuple[float, MeshSimulation]:
        return pair_play(
            replace(spec1, thinning=b / 2),
            replace(spec2, thinning=b / 2),
            centre_distance,
        )

    # more play than this spoils the teeth: the pair is in the wrong place
    most = MAX_ADVISED_PLAY * math.pi * min(spec1.module, spec2.module)
    b, slope = spec1.thinning + spec2.thinning, 1.0
    f, sim = at(b)
    if not math.isfinite(f):
        return None  # teeth that do not reach each other: backlash cannot help
    # Secant steps on the play less the margin. Turning the flanks about the centre,
    # the play grows one for one with the backlash (derived), so one step lands.
    for _ in range(8):
        if abs(f - margin) < _ROUND_MM / 20 or (b == 0.0 and f > margin):
            break
        b_new = max(0.0, b + (margin - f) / slope)
        if b_new >= most:
            return None
        f_new, sim = at(b_new)
        if not math.isfinite(f_new):
            return None
        if b_new != b and (f_new - f) / (b_new - b) > 0.2:
            slope = (f_new - f) / (b_new - b)
        b, f = b_new, f_new
    bare = max(0.0, b - f / slope)
    b = round(math.ceil(b / _ROUND_MM - 1e-6) * _ROUND_MM, 6)
    f, sim = at(b)
    while not _runs(f, sim, margin):
        b = round(b + _ROUND_MM, 6)
        if b >= most:
            return None
        f, sim = at(b)
    return PlayFit(
        by="backlash",
        backlash=(b, b),
        addendum=(spec1.addendum, spec2.addendum),
        bare=bare,
        margin=margin,
        play=f,
        te_deg=sim.te_peak_to_peak_deg,
    )


def least_addendum(
    spec1: ToothSpec, spec2: ToothSpec, centre_distance: float, margin: float
) -> PlayFit | None:
    """The least cut of both addenda (the same amount, x module) that runs with
    ``margin`` mm of play to spare, the backlash kept; ``None`` if no addendum from the
    present one down to 0.1 module does. No cut when the pair already runs so."""

    def at(cut: float) -> tuple[float, MeshSimulation] | None:
        try:
            s1 = replace(spec1, addendum=spec1.addendum - cut)
            s2 = replace(spec2, addendum=spec2.addendum - cut)
            return pair_play(s1, s2, centre_distance)
        except ValueError:  # no straight flank left between the roundings
            return None

    def fit(cut: float, play: float, sim: MeshSimulation, bare: float) -> PlayFit:
        return PlayFit(
            by="addendum",
            backlash=(2 * spec1.thinning, 2 * spec2.thinning),
            addendum=(round(spec1.addendum - cut, 6), round(spec2.addendum - cut, 6)),
            bare=bare,
            margin=margin,
            play=play,
            te_deg=sim.te_peak_to_peak_deg,
            cut=cut,
        )

    first = at(0.0)
    if first is not None and _runs(*first, margin):
        return fit(0.0, first[0], first[1], spec1.addendum)
    most = min(spec1.addendum, spec2.addendum) - _MIN_ADDENDUM
    last = at(most)
    if last is None or not _runs(*last, margin):
        return None

    def gap(got: tuple[float, MeshSimulation] | None) -> float:
        # play less the margin; a pair that cannot be made or is lost counts as tight
        if got is None or not math.isfinite(got[0]):
            return -1e3
        return got[0] - margin

    # The play grows steadily as the teeth get shorter: a bracketed secant search
    # (regula falsi, halving a stale end's value: the "Illinois" variant).
    lo, hi = 0.0, most
    g_lo, g_hi = gap(first), gap(last)
    side = 0
    while hi - lo > _ROUND_COEFF / 4:
        mid = hi - g_hi * (hi - lo) / (g_hi - g_lo)
        mid = min(max(mid, lo + (hi - lo) / 64), hi - (hi - lo) / 64)
        g_mid = gap(at(mid))
        if abs(g_mid) < _ROUND_MM / 20 and g_mid >= 0:
            lo = hi = mid
            break
        if g_mid >= 0:
            hi, g_hi = mid, g_mid
            if side == 1:
                g_lo /= 2
            side = 1
        else:
            lo, g_lo = mid, g_mid
            if side == -1:
                g_hi /= 2
            side = -1
    cut = round(math.ceil(hi / _ROUND_COEFF - 1e-6) * _ROUND_COEFF, 6)
    got = at(cut)
    while got is None or not _runs(*got, margin):
        cut = round(cut + _ROUND_COEFF, 6)
        if cut > most + 1e-12:
            return None
        got = at(cut)
    return fit(cut, got[0], got[1], spec1.addendum - cut)


def running_advice(
    spec1: ToothSpec,
    spec2: ToothSpec,
    centre_distance: float,
    margin: float,
    names: tuple[str, str],
) -> tuple[str, tuple[Change, ...]]:
    """Advice for a triangular pair that jams or runs too tight, and its changes.

    Each option names the keys to change and their values, found with the simulator
    to run with ``margin`` mm of play to spare: the tooth angle that matches the
    flanks (with the backlash it then needs), the backlash on both wheels, or a
    shorter addendum on both. The first option found is returned as the changes; the
    text lists every option. ``("", ())`` when none runs.
    """
    n1, n2 = names
    options: list[tuple[Change, ...]] = []
    why = ""
    t1 = triangular_tooth(spec1).pitch_flank_angle_deg
    t2 = triangular_tooth(spec2).pitch_flank_angle_deg
    if abs(t1 - t2) > FLANK_MISMATCH_DEG:
        # flanks at different angles to the radius touch by their corners: give the
        # smaller wheel the tooth angle that matches its mate's flanks
        w, spec, target = (
            (n1, spec1, t2) if spec1.teeth <= spec2.teeth else (n2, spec2, t1)
        )
        angle = round(tooth_angle_for_flank_deg(spec.teeth, target), 2)
        turned = replace(spec, tooth_angle_deg=angle)
        pair = (turned, spec2) if w == n1 else (spec1, turned)
        try:
            fit = least_backlash(*pair, centre_distance, margin)
        except ValueError:
            fit = None
        if fit is not None:
            options.append(
                (Change("wheel", w, "tooth_angle", angle),)
                + _backlash(names, (spec1, spec2), fit.backlash[0])
            )
            why = (
                f" The flanks of {n1} cross the pitch circle at {t1:.1f} deg to the "
                f"radius and those of {n2} at {t2:.1f} deg; tooth_angle = {angle:g} on "
                f"{w} makes them equal."
            )
    fit = least_backlash(spec1, spec2, centre_distance, margin)
    mode = "backlash" if fit is not None else "addendum"
    if fit is not None:
        options.append(_backlash(names, (spec1, spec2), fit.backlash[0]))
    cut = least_addendum(spec1, spec2, centre_distance, margin)
    if cut is not None and cut.cut > 0:
        options.append(
            tuple(
                Change("wheel", n, "addendum", h)
                for n, h in zip(names, cut.addendum, strict=True)
            )
        )
    options = [o for o in options if o]
    if not options:
        return "", ()
    text = (
        "set "
        + "; or ".join(" and ".join(str(c) for c in o) for o in options)
        + f". Each leaves {margin:g} mm of play to spare.{why} Or let the tool "
        f'choose: least_play = "{mode}" on this [[mesh]].'
    )
    return text, options[0]


def _backlash(
    names: tuple[str, str], specs: tuple[ToothSpec, ToothSpec], b: float
) -> tuple[Change, ...]:
    """Set 'backlash' to ``b`` mm on each wheel that has another value."""
    return tuple(
        Change("wheel", n, "backlash", b)
        for n, sp in zip(names, specs, strict=True)
        if not math.isclose(2 * sp.thinning, b, abs_tol=1e-9)
    )


def _margin(process: Process) -> float:
    return min_backlash(process)


def settle_play(design: Design) -> Design:
    """The design with every ``least_play`` request of its meshes applied.

    For ``"backlash"`` both wheels of the mesh get the least backlash that runs with
    the process's smallest backlash to spare; for ``"addendum"`` both addenda are cut
    by the least amount that does, the backlash kept. A wheel in several such meshes
    keeps the largest backlash (or the shortest teeth) any of them needs, and a wheel
    that also meshes without a request never gets less backlash than it had. Each
    mesh's ``chosen`` says what was chosen, the least play then measured, and where
    nothing runs, that too. Meshes already settled are left alone.
    """
    todo = [m for m in design.meshes if m.least_play is not None and not m.chosen]
    if not todo:
        return design
    margin = _margin(design.process)
    wheels = {w.name: w for w in design.wheels}
    plain = {n for m in design.meshes if m.least_play is None for n in m.pair}
    backlash: dict[str, float] = {}
    addendum: dict[str, float] = {}
    fits: dict[int, PlayFit | None] = {}
    for mesh in todo:
        w1, w2 = wheels[mesh.pair[0]], wheels[mesh.pair[1]]
        try:
            s1, s2 = tooth_spec(w1), tooth_spec(w2)
            a = working_centre_distance(s1, s2)
            search = least_backlash if mesh.least_play == "backlash" else least_addendum
            fit = search(s1, s2, a, margin)
        except ValueError:
            fit = None  # teeth that cannot be made or mixed forms: the checks say so
        fits[mesh.index] = fit
        if fit is None:
            continue
        for w, b, h in zip((w1, w2), fit.backlash, fit.addendum):
            if fit.by == "backlash":
                backlash[w.name] = max(backlash.get(w.name, 0.0), b)
            else:
                addendum[w.name] = min(addendum.get(w.name, math.inf), h)
    new_wheels: list[Wheel] = []
    for w in design.wheels:
        b = backlash.get(w.name, w.backlash)
        if w.name in plain:
            b = max(b, w.backlash)
        new_wheels.append(
            replace(w, backlash=b, addendum=addendum.get(w.name, w.addendum))
        )
    settled = replace(design, wheels=tuple(new_wheels))
    meshes: list[Mesh] = []
    for mesh in design.meshes:
        if mesh not in todo:
            meshes.append(mesh)
            continue
        meshes.append(replace(mesh, chosen=_chosen(settled, mesh, fits[mesh.index])))
    return replace(settled, meshes=tuple(meshes))


def _chosen(design: Design, mesh: Mesh, fit: PlayFit | None) -> str:
    n1, n2 = mesh.pair
    kind = design.process.kind
    margin = _margin(design.process)
    if fit is None:
        what = "backlash" if mesh.least_play == "backlash" else "cut of the addendum"
        return f"{_NOTHING_RUNS}: no {what} lets this pair run; the teeth are as given"
    w1, w2 = design.wheel(n1), design.wheel(n2)
    s1, s2 = tooth_spec(w1), tooth_spec(w2)
    play, sim = pair_play(s1, s2, working_centre_distance(s1, s2))
    if fit.by == "backlash":
        head = (
            f"backlash {w1.backlash:g} mm on {n1} and {w2.backlash:g} mm on {n2}: "
            f"about {fit.bare:.3f} mm is the least that runs, plus {margin:g} mm "
            f"for {kind} work"
        )
    elif fit.cut == 0.0:
        head = f"no cut of the addendum was needed for {margin:g} mm of play"
    else:
        head = (
            f"addendum {w1.addendum:g} on {n1} and {w2.addendum:g} on {n2} (x module): "
            f"cut by {fit.cut:g} to leave {margin:g} mm of play for {kind} work"
        )
    return (
        f"{head}; least play {play:.3f} mm, transmission error "
        f"{sim.te_peak_to_peak_deg:.3f} deg peak to peak"
    )


def least_play_findings(design: Design) -> list[Finding]:
    """A note for each settled ``least_play`` request saying what was chosen; a
    warning where nothing runs (the jam itself is reported by the mesh checks)."""
    out = []
    for mesh in design.meshes:
        if mesh.least_play is None or not mesh.chosen:
            continue
        failed = mesh.chosen.startswith(_NOTHING_RUNS)
        other = "addendum" if mesh.least_play == "backlash" else "backlash"
        out.append(
            Finding(
                "warning" if failed else "note",
                "mesh.least_play",
                mesh.label,
                f'{mesh.label}: least_play = "{mesh.least_play}": {mesh.chosen}',
                advice=f'try least_play = "{other}", or fewer, larger teeth'
                if failed
                else "",
            )
        )
    return out
