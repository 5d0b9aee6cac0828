"""Checks on each wheel's teeth and on each pair of wheels in mesh.

Every function returns a list of :class:`~wheelgen.findings.Finding`; an empty
list means the check passed. Lengths in mm, angles in degrees.

Involute pairs are judged with the usual formulas (working pressure angle, working
centre distance, transverse contact ratio, tip-root clearance, the start of active
profile against the form circle), worked out by :mod:`wheelgen.teeth.involute_mesh`; the
distance each pair stands at on the layout comes from :mod:`wheelgen.layout.centres`. Every pair is also turned through a tooth pitch with
the outline simulator (:mod:`wheelgen.checks.mesh_sim`): it is the only verdict for
triangular teeth, and a second opinion on involute ones.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Mapping
from dataclasses import replace
from functools import lru_cache

from ..design.model import Design, Process, Wheel
from ..design.process_limits import (
    centre_tolerance,
    default_backlash,
    min_backlash,
)
from ..findings import Change, Finding, Level
from ..layout.centres import mesh_distances
from ..layout.placement import tooth_spec
from ..teeth.forms import outline_for
from ..teeth.involute_mesh import InvoluteMesh, involute_mesh
from ..teeth.involute_tooth import generate_tooth
from ..teeth.limits import (
    CONTACT_RATIO_ERROR,
    CONTACT_RATIO_WARNING,
    MIN_CLEARANCE,
    short_of,
    tooth_verdicts,
)
from ..teeth.mesh_data import mesh_data
from ..teeth.outline import WheelOutline
from ..teeth.spec import ToothSpec
from .least_play import MAX_ADVISED_PLAY, least_play_findings, running_advice
from .mesh_sim import CHECK_STEPS, MeshSimulation, simulate_mesh

__all__ = [
    "check_wheel",
    "check_mesh",
    "design_mesh_checks",
]

#: Simulated transmission error (degrees) of an involute pair above which something is
#: wrong with the flanks: far above the simulator's resolution (about 1e-3 degrees).
INVOLUTE_TE_LIMIT_DEG = 0.01


def _mm(value: float, digits: int = 3) -> str:
    return f"{value:.{digits}f} mm"


def check_wheel(spec: ToothSpec, subject: str) -> list[Finding]:
    """Checks on one wheel's teeth alone: pointed tips, undercut.

    The verdicts are :func:`wheelgen.teeth.limits.tooth_verdicts`, the same that the
    data sheet of ``wheelgen gear`` prints. ``subject`` names the wheel (``"wheel w3"``).
    """
    name = subject.split()[-1]
    out = []
    for v in tooth_verdicts(spec):
        changes: tuple[Change, ...] = ()
        if v.check == "wheel.undercut" and v.shift is not None:
            shift = _shift_that_clears(spec, v.shift)
            if shift is not None:
                changes = (Change("wheel", name, "shift", shift),)
            advice = (
                _set_text(changes, "shift it positively")
                + " (and less on its mate), or use more teeth"
            )
        else:
            advice = f"reduce the shift or the addendum of {name}"
        out.append(
            Finding(
                v.level,
                v.check,
                subject,
                f"{subject}: {v.message}",
                measured=v.measured,
                limit=v.limit,
                advice=advice,
                changes=changes,
            )
        )
    return out


def _shift_that_clears(spec: ToothSpec, start: float) -> float | None:
    """The smallest shift from ``start`` up, in 0.05 steps, that leaves no undercut
    (and is one the train format allows, at most 2)."""
    shift = start
    while shift <= 2.0 + 1e-9:
        try:
            if not generate_tooth(replace(spec, shift=shift)).undercut:
                return round(shift, 2)
        except ValueError:
            return None
        shift += 0.05
    return None


def _mismatch(spec1: ToothSpec, spec2: ToothSpec, subject: str) -> list[Finding]:
    problems = []
    if spec1.form != spec2.form:
        problems.append(("tooth forms", spec1.form, spec2.form))
    if not math.isclose(spec1.module, spec2.module, rel_tol=1e-12):
        problems.append(("modules", f"{spec1.module:g} mm", f"{spec2.module:g} mm"))
    if spec1.form == spec2.form == "involute" and not math.isclose(
        spec1.pressure_angle_deg, spec2.pressure_angle_deg, rel_tol=1e-12
    ):
        problems.append(
            (
                "pressure angles",
                f"{spec1.pressure_angle_deg:g} deg",
                f"{spec2.pressure_angle_deg:g} deg",
            )
        )
    # Triangular wheels of different tooth angles can mesh (the default angle follows
    # the tooth count); the simulator judges them, and a jam's advice names the angle.
    return [
        Finding(
            "error",
            "mesh.mismatch",
            subject,
            f"{subject}: the two wheels have different {what}; their teeth cannot mesh",
            measured=f"{one} and {two}",
            limit="equal",
            advice=f"give both wheels the same {what[:-1]}",
        )
        for what, one, two in problems
    ]


def check_mesh(
    spec1: ToothSpec,
    spec2: ToothSpec,
    subject: str,
    *,
    centre_distance: float | None = None,
    process: Process | None = None,
    simulate: bool = True,
    outlines: tuple[WheelOutline, WheelOutline] | None = None,
    names: tuple[str, str] = ("wheel 1", "wheel 2"),
    judge_centres: bool = True,
) -> list[Finding]:
    """Checks on one external pair; wheel 1 drives.

    Parameters
    ----------
    spec1, spec2
        The two wheels' teeth (``thinning`` included).
    subject
        Names the pair in the findings, ``"mesh w1-w2"``.
    centre_distance
        Where the axes actually are (mm); ``None`` means at the working centre distance,
        and the centre-distance check is skipped.
    process
        Sets the backlash and centre-distance limits (``[process]`` keys
        ``min_backlash`` and ``centre_tolerance``, mm).
    simulate
        Also turn the outlines through a pitch (jamming, transmission error).
    outlines
        The two outlines if already built (else made from the specs).
    names
        The two wheels' names, used in the messages.
    judge_centres
        Report a ``centre_distance`` off the working one (``mesh.centre_distance``);
        a whole design leaves that to the layout, which knows the arbors to move.
    """
    out = _mismatch(spec1, spec2, subject)
    if out:
        return out
    n1, n2 = names
    m = spec1.module
    if spec1.form == "involute":
        try:
            data = involute_mesh(spec1, spec2, centre_distance)
        except ValueError as exc:
            # only a centre distance inside the base circles gets here
            out.append(
                Finding(
                    "error",
                    "mesh.centre_distance",
                    subject,
                    f"{subject}: the axes are far too close, the wheels overlap: {exc}",
                    measured=_mm(float(centre_distance or 0.0), 4),
                    advice="place the arbors at the working centre distance",
                )
            )
            return out
        a = data.centre_distance
        out += _involute_findings(
            data,
            spec1,
            spec2,
            subject,
            (n1, n2),
            process,
            centre_distance if judge_centres else None,
        )
    else:
        # triangular teeth: the pitch circles roll on each other
        a_w = m * (spec1.teeth + spec2.teeth) / 2
        a = a_w if centre_distance is None else float(centre_distance)
        if centre_distance is not None and judge_centres:
            out += _centre_distance(a, a_w, None, subject, process)
    if spec1.form == "involute" and not simulate:
        return out
    o1, o2 = (
        outlines if outlines is not None else (outline_for(spec1), outline_for(spec2))
    )
    if spec1.form != "involute":
        out += _clearance_from_outlines(o1, o2, a, subject, (n1, n2), m)
        if not simulate:
            return out
    if outlines is None:
        sim = _simulated(spec1, spec2, a)
    else:
        sim = simulate_mesh(o1, o2, a, steps=CHECK_STEPS)
    out += _simulation_findings(sim, spec1, spec2, subject, o2, process, (n1, n2))
    return out


@lru_cache(maxsize=512)
def _simulated(spec1: ToothSpec, spec2: ToothSpec, a: float) -> MeshSimulation:
    """The simulation of a pair at ``a`` mm, once per pair: large trains repeat pairs."""
    return simulate_mesh(outline_for(spec1), outline_for(spec2), a, steps=CHECK_STEPS)


def _centre_distance(
    a: float, a_w: float, backlash: float | None, subject: str, process: Process | None
) -> list[Finding]:
    from ..layout.centres import centres_fit

    proc = process or Process()
    dev = a - a_w
    binds = backlash is not None and backlash < 0
    if centres_fit(dev, proc) and not binds:
        return []
    side = "far apart" if dev > 0 else "close"
    what = "the teeth bind" if dev < 0 else "the teeth lose depth and contact"
    return [
        Finding(
            "error",
            "mesh.centre_distance",
            subject,
            f"{subject}: the axes are {_mm(abs(dev))} too {side}; {what}",
            measured=_mm(a, 4),
            limit=f"{_mm(a_w, 4)} +- {_mm(centre_tolerance(proc))} (working centre "
            "distance)",
            advice=f"place the arbors {_mm(a_w, 4)} apart, or change the shifts",
        )
    ]


def _involute_findings(
    data: InvoluteMesh,
    spec1: ToothSpec,
    spec2: ToothSpec,
    subject: str,
    names: tuple[str, str],
    process: Process | None,
    centre_distance: float | None,
) -> list[Finding]:
    out: list[Finding] = []
    m = spec1.module
    if centre_distance is not None:
        out += _centre_distance(
            data.centre_distance,
            data.working_centre_distance,
            data.backlash,
            subject,
            process,
        )
    eps, eff = data.contact_ratio, data.contact_ratio_effective
    if eff < CONTACT_RATIO_WARNING:
        level: Level = "error" if eff < CONTACT_RATIO_ERROR else "warning"
        what = (
            "one pair of teeth lets go before the next takes over"
            if level == "error"
            else "the next pair of teeth takes over late; running will be rough"
        )
        lost = (
            ""
            if eff >= eps - 1e-9
            else f" (of {eps:.3f} by the tip circles, the rest falls on undercut flank)"
        )
        out.append(
            Finding(
                level,
                "mesh.contact_ratio",
                subject,
                f"{subject}: contact ratio {eff:.3f}{lost}: {what}",
                measured=f"{eff:.3f}",
                limit=f"{CONTACT_RATIO_WARNING} (warning), "
                f"{CONTACT_RATIO_ERROR} (error)",
                advice="use more teeth at a smaller module, shift the smaller wheel "
                "positively, or bring the axes to the working centre distance",
            )
        )
    for tip, root, c in (
        (names[0], names[1], data.clearance_1),
        (names[1], names[0], data.clearance_2),
    ):
        if c < MIN_CLEARANCE * m:
            level = "error" if c <= 0 else "warning"
            out.append(
                Finding(
                    level,
                    "mesh.clearance",
                    subject,
                    _clearance_message(subject, tip, root, c),
                    measured=_mm(c),
                    limit=f"{_mm(MIN_CLEARANCE * m)} ({MIN_CLEARANCE} x module)",
                    advice=f"reduce the addendum of {tip}, deepen {root} "
                    "(dedendum), or move the axes apart",
                )
            )
    sides = (
        (names[1], names[0], data.reach_1, data.start_radius_1, data.form_radius_1),
        (names[0], names[1], data.reach_2, data.start_radius_2, data.form_radius_2),
    )
    # Generated teeth are undercut exactly where a mate's tip would interfere, so the
    # flanks do not collide there (Mechanical Engineering Design, McGraw-Hill, spur-gear
    # chapter, "interference": undercutting removes the interfering flank; from
    # memory, docs/references.md section 6); the
    # contact is lost instead and the flank is weakened. The simulator says whether the
    # pair actually binds (mesh.jam).
    for tip, flank, reach, start, form in sides:
        if reach < 0:
            out.append(
                Finding(
                    "warning",
                    "mesh.interference",
                    subject,
                    f"{subject}: the tips of {tip} reach past the interference point "
                    f"of {flank}, below its base circle; only its undercut makes room "
                    "for them",
                    measured=f"{_mm(-reach)} past it along the line of action",
                    limit="0 mm",
                    advice=f"shift {flank} positively (and {tip} negatively), "
                    f"shorten the tips of {tip}, or give {flank} more teeth",
                )
            )
        elif start < form - 1e-6 * m:
            out.append(
                Finding(
                    "warning",
                    "mesh.interference",
                    subject,
                    f"{subject}: the tips of {tip} reach below the involute of {flank} "
                    "(into its root fillet region); contact is lost there",
                    measured=f"contact down to {_mm(2 * start)} dia.",
                    limit=f"form circle {_mm(2 * form)} dia.",
                    advice=f"shift {flank} positively, or shorten the tips of {tip}",
                )
            )
    need = min_backlash(process or Process())
    if data.backlash >= 0 and short_of(data.backlash, need):
        kind = "mill" if process is None else process.kind

        def enough(b: float) -> bool:
            s1, s2 = (replace(x, thinning=b / 2) for x in (spec1, spec2))
            got = mesh_data(s1, s2, data.centre_distance).backlash
            return got is not None and not short_of(got, need)

        changes = _backlash_changes(spec1, spec2, names, need - data.backlash, enough)
        out.append(
            Finding(
                "warning",
                "mesh.backlash",
                subject,
                f"{subject}: {_mm(data.backlash)} backlash is less than the {kind} "
                "process holds; the pair may bind",
                measured=_mm(data.backlash),
                limit=_mm(need),
                advice=_set_text(
                    changes,
                    "more play than thinner teeth can give: the arbors stand too "
                    "close for these teeth; move them apart",
                ),
                changes=changes,
            )
        )
    return out


def _set_text(changes: tuple[Change, ...], otherwise: str) -> str:
    if not changes:
        return otherwise
    return "set " + " and ".join(str(c) for c in changes)


def _backlash_changes(
    spec1: ToothSpec,
    spec2: ToothSpec,
    names: tuple[str, str],
    short: float,
    enough: Callable[[float], bool],
) -> tuple[Change, ...]:
    """The 'backlash' for both wheels (mm) that ``enough`` accepts, found by trying.

    Starts from the larger of the two wheels' values plus ``short`` (mm) and widens the
    step until it clears, never past :data:`MAX_ADVISED_PLAY` of the pitch; ``()``
    when no such value is found (then the arbors or the teeth are at fault).
    """
    now = 2 * max(spec1.thinning, spec2.thinning)
    most = now + MAX_ADVISED_PLAY * math.pi * spec1.module
    step = max(short, 0.001)
    for _ in range(8):
        b = math.ceil((now + step) * 1000 - 1e-6) / 1000
        if b > most:
            return ()
        try:
            if enough(b):
                return tuple(
                    Change("wheel", n, "backlash", b)
                    for n, sp in zip(names, (spec1, spec2))
                    if not math.isclose(2 * sp.thinning, b)
                )
        except ValueError:  # so thin the tooth is gone
            return ()
        step *= 1.5
    return ()


def _clearance_message(subject: str, tip: str, root: str, c: float) -> str:
    if c <= 0:
        return f"{subject}: the tips of {tip} reach {_mm(-c)} into the root of {root}"
    return f"{subject}: the tips of {tip} come within {_mm(c)} of the root of {root}"


def _clearance_from_outlines(
    o1: WheelOutline,
    o2: WheelOutline,
    a: float,
    subject: str,
    names: tuple[str, str],
    m: float,
) -> list[Finding]:
    out = []
    pairs = ((names[0], names[1], o1, o2), (names[1], names[0], o2, o1))
    for tip, root, ot, orr in pairs:
        if "tip" not in ot.radii or "root" not in orr.radii:
            continue
        c = a - ot.radii["tip"] - orr.radii["root"]
        if c < MIN_CLEARANCE * m:
            out.append(
                Finding(
                    "error" if c <= 0 else "warning",
                    "mesh.clearance",
                    subject,
                    _clearance_message(subject, tip, root, c),
                    measured=_mm(c),
                    limit=f"{_mm(MIN_CLEARANCE * m)} ({MIN_CLEARANCE} x module)",
                    advice=f"shorten the teeth of {tip} or deepen {root}",
                )
            )
    return out


def _jam_backlash(sim: MeshSimulation, driven: ToothSpec) -> float:
    """Extra circumferential play (mm) on the driven pitch circle that frees a jam."""
    # derived: the arc of the overlap angle on the pitch circle, r = m z / 2
    return -sim.min_play_deg * math.pi / 180.0 * driven.module * driven.teeth / 2.0


def _simulation_findings(
    sim: MeshSimulation,
    spec1: ToothSpec,
    spec2: ToothSpec,
    subject: str,
    driven: WheelOutline,
    process: Process | None,
    names: tuple[str, str] = ("wheel 1", "wheel 2"),
) -> list[Finding]:
    out: list[Finding] = []
    need = min_backlash(process or Process())
    triangular = spec1.form == "triangular"
    if sim.jams:
        overlap = _jam_backlash(sim, spec2)
        if triangular:
            # straight flanks: the matching tooth angle, the backlash or shorter teeth
            advice, changes = running_advice(
                spec1, spec2, sim.centre_distance, need, names
            )
            advice = advice or (
                "more than thinner or shorter teeth can give: the arbors are too "
                "close for these teeth; move them apart"
            )
        else:

            def frees(b: float) -> bool:
                s1, s2 = (replace(x, thinning=b / 2) for x in (spec1, spec2))
                o1, o2 = outline_for(s1), outline_for(s2)
                again = simulate_mesh(o1, o2, sim.centre_distance, steps=CHECK_STEPS)
                return not again.jams

            changes = _backlash_changes(spec1, spec2, names, overlap, frees)
            advice = _set_text(
                changes,
                "more than thinner teeth can take: the arbors are too close for these "
                "teeth; move them apart or shorten the teeth ('addendum')",
            )
        out.append(
            Finding(
                "error",
                "mesh.jam",
                subject,
                f"{subject}: turned through a tooth pitch, the outlines overlap by "
                f"{_mm(overlap)} on the driven pitch circle: the pair jams",
                measured=f"play {sim.min_play_deg:.4f} deg at the driven wheel",
                limit="0 deg",
                advice=advice,
                changes=changes,
            )
        )
        return out
    if sim.contact_lost:
        out.append(
            Finding(
                "error",
                "mesh.contact_ratio",
                subject,
                f"{subject}: turned through a tooth pitch, at some positions no tooth "
                "drives: the driven wheel runs free",
                measured="contact lost",
                limit="a tooth in contact at every position",
                advice="bring the axes closer or use longer teeth",
            )
        )
        return out
    te = sim.te_peak_to_peak_deg
    pitch2 = 360.0 / spec2.teeth
    if spec1.form == "involute":
        if te > INVOLUTE_TE_LIMIT_DEG:
            out.append(
                Finding(
                    "warning",
                    "mesh.transmission_error",
                    subject,
                    f"{subject}: the driven wheel lags and leads by {te:.4f} deg "
                    "within a tooth; the involute flanks are not working as involutes "
                    "(tip or root contact)",
                    measured=f"{te:.4f} deg peak to peak",
                    limit=f"{INVOLUTE_TE_LIMIT_DEG} deg",
                    advice="see the interference and contact-ratio findings for "
                    "this mesh",
                )
            )
    else:
        limit = 0.1 * pitch2  # common practice, no source: a tenth of a tooth pitch
        level: Level = "warning" if te > limit else "note"
        out.append(
            Finding(
                level,
                "mesh.transmission_error",
                subject,
                f"{subject}: triangular teeth turn the driven wheel unevenly by "
                f"{te:.3f} deg within each tooth, {sim.backlash_deg:.3f} deg of play",
                measured=f"{te:.3f} deg peak to peak",
                limit=f"{limit:.3f} deg (a tenth of the driven pitch)",
                advice="" if level == "note" else "use more teeth or involute teeth",
            )
        )
        if short_of(sim.backlash_mm, need):
            kind = "mill" if process is None else process.kind
            advice, changes = running_advice(
                spec1, spec2, sim.centre_distance, need, names
            )
            out.append(
                Finding(
                    "warning",
                    "mesh.backlash",
                    subject,
                    f"{subject}: the pair runs with only {_mm(sim.backlash_mm)} of "
                    f"play at its tightest, less than the {kind} process holds; it "
                    "may bind",
                    measured=f"least play {_mm(sim.backlash_mm)} on the pitch circle",
                    limit=_mm(need),
                    advice=advice
                    or "more play than thinner teeth can give: move the arbors apart",
                    changes=changes,
                )
            )
    return out


def design_mesh_checks(
    design: Design,
    distances: Mapping[int, float] | None = None,
    *,
    simulate: bool = True,
) -> list[Finding]:
    """Wheel and mesh checks over a whole design, each pair where the layout puts it.

    Parameters
    ----------
    design
        The loaded design.
    distances
        Centre distance (mm) of each mesh by its 1-based ``index``. ``None``: measured
        on the final layout (:func:`wheelgen.layout.centres.mesh_centres`), whatever
        placed the arbors. A mesh with no distance is judged at its working centre
        distance. Whether the distance itself is right is the layout's check
        (``mesh.centre_distance`` in :func:`wheelgen.checks.layout_checks.layout_findings`).
    simulate
        Also run the outline simulator on every mesh.
    """
    findings: list[Finding] = []
    specs: dict[str, ToothSpec] = {}
    for wheel in design.wheels:
        subject = f"wheel {wheel.name}"
        try:
            spec = tooth_spec(wheel)
            # generating the outline is where impossible tooth forms show up
            outline_for(spec)
            findings += check_wheel(spec, subject)
        except ValueError as exc:
            findings.append(_unmakeable(design, wheel, exc))
            continue
        specs[wheel.name] = spec
    if distances is None:
        distances = mesh_distances(design)
    for mesh in design.meshes:
        w1, w2 = design.wheel(mesh.pair[0]), design.wheel(mesh.pair[1])
        if w1.name not in specs or w2.name not in specs:
            continue  # already reported: a wheel whose teeth cannot be made
        findings += check_mesh(
            specs[w1.name],
            specs[w2.name],
            mesh.label,
            centre_distance=distances.get(mesh.index),
            process=design.process,
            simulate=simulate,
            names=(w1.name, w2.name),  # outlines: outline_for's, shared with pairs
            judge_centres=False,
        )
    return findings + least_play_findings(design)


def _unmakeable(design: Design, wheel: Wheel, exc: ValueError) -> Finding:
    subject = f"wheel {wheel.name}"
    if "'thinning'" in str(exc):
        # the generators speak of thinning; the file sets it as 'backlash'
        usual = default_backlash(design.process)
        change = Change("wheel", wheel.name, "backlash", usual)
        return Finding(
            "error",
            "wheel.teeth",
            subject,
            f"{subject}: these teeth cannot be made: backlash = {wheel.backlash:g} mm "
            f"takes {wheel.backlash / 2:g} mm off each tooth, more than the tooth has",
            measured=f"backlash {wheel.backlash:g} mm",
            limit=f"less than a tooth ({math.pi * wheel.module / 2:.3f} mm)",
            advice=f"set {change}, the {design.process.kind} default",
            changes=(change,),
        )
    return Finding(
        "error",
        "wheel.teeth",
        subject,
        f"{subject}: these teeth cannot be made: {exc}",
        advice="change the tooth settings of this wheel",
    )
