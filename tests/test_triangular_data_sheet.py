"""``wheelgen gear --form triangular``: the form's own data sheet, each quantity checked
against a hand derivation and against the generated outline, and the pair's play and
transmission error against a contact worked out by hand (a sharp corner on a straight
flank, in closed form).

Derivations used below (on paper, written out beside each check):

- A triangular tooth of included angle b leans each flank b/2 towards its middle. The
  upper flank of one tooth points outward at -b/2 to that tooth's axis, the lower
  flank of the next tooth at 360/z + b/2; the space between them opens at their
  difference, b + 360/z.
- The backlash thins each tooth by turning its flanks about the centre by
  thinning / (2 r) each (docs/format.md), so the tooth as cut has the included angle
  b + thinning / r (radians) and the space b + thinning / r + 360/z.
- The basic tooth is half a pitch thick on the pitch circle: its flank crosses it 90/z
  degrees from the tooth's middle, where the radius is turned 90/z from the middle's;
  leaning in by b/2, the flank meets that radius at b/2 + 90/z. The default
  b = 60 - 180/z puts it at 30 degrees on every wheel, and turning the flank about
  the centre keeps it so.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from _contact import rot, touch_angles
from click.testing import CliRunner

from wheelgen.cli import main
from wheelgen.teeth import ToothSpec, outline_for
from wheelgen.teeth.outline import circle_through
from wheelgen.teeth.triangular_data import triangular_data

INVOLUTE_ONLY = (
    "base_diameter",
    "base_pitch",
    "form_diameter",
    "span_teeth",
    "span_width",
    "pin_diameter",
    "over_pins",
    "pin_contact_diameter",
    "cutter_number",
    "undercut_limit",
    "working_pressure_angle",
    "contact_ratio",
    "normal_backlash",
    "shift_sum_to_fit",
    "interference1",
)


def _gear(*args: str) -> CliRunner:
    return CliRunner().invoke(main, ["gear", "--form", "triangular", *args])


def _json(*args: str) -> dict:
    result = _gear(*args, "--json")
    assert result.exit_code == 0, result.output
    return json.loads(result.output)


def _flanks(spec: ToothSpec) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """The lower and upper straight flanks of the tooth on +X, as (start, end) each."""
    lines = [s for s in outline_for(spec).tooth if s.kind == "line"]
    lo, hi = lines
    return lo.start, lo.end, hi.start, hi.end


def _cross(p: np.ndarray, d: np.ndarray, radius: float) -> np.ndarray:
    """Where the line p + t d (extended) crosses the circle of ``radius`` (larger t)."""
    a, b, c = d @ d, 2 * p @ d, p @ p - radius * radius
    t = (-b + math.sqrt(b * b - 4 * a * c)) / (2 * a)
    return p + t * d


def _angle(u: np.ndarray, v: np.ndarray) -> float:
    return math.degrees(math.atan2(abs(u[0] * v[1] - u[1] * v[0]), u @ v))


# z, module, basic tooth angle (None: default), backlash (mm), tip and root rounding
# (x module), dedendum (x module)
CASES = [
    (20, 1.0, None, 0.6, 0.0, 0.1, 0.85),
    (32, 1.5, None, 0.2, 0.25, 0.1, 0.85),
    (12, 2.0, 50.0, 0.3, 0.2, 0.15, 0.85),
    (150, 0.8, 58.0, 0.05, 0.1, 0.05, 0.85),
    # derived: the flanks of a 10-tooth space meet about 0.97 m below the pitch
    # circle, above a root circle 1.25 m down: a V-shaped space
    (10, 1.0, None, 0.35, 0.25, 0.1, 1.25),
]


@pytest.mark.parametrize(("z", "m", "angle", "backlash", "tip", "root", "ded"), CASES)
def test_every_quantity_against_the_outline_and_a_hand_derivation(
    z, m, angle, backlash, tip, root, ded
):
    args = ["-z", str(z), "-m", str(m), "--backlash", str(backlash),
            "--tip-radius", str(tip), "--root-radius", str(root),
            "--dedendum", str(ded)]  # fmt: skip
    if angle is not None:
        args += ["--tooth-angle", str(angle)]
    data = _json(*args)
    for key in INVOLUTE_ONLY:
        assert key not in data
    b = 60.0 - 180.0 / z if angle is None else angle  # the documented default
    r, thinning = m * z / 2, backlash / 2
    spec = ToothSpec(
        z, m, form="triangular", tooth_angle_deg=b, addendum=0.6, dedendum=ded,
        tip_radius=tip, root_radius=root, thinning=thinning,
    )  # fmt: skip
    lo0, lo1, hi0, hi1 = _flanks(spec)
    d_lo, d_hi = lo1 - lo0, hi0 - hi1  # both pointing outward
    # tooth angle as cut: measured between the flanks; derived b + thinning / r
    cut = b + math.degrees(thinning / r)
    assert _angle(d_lo, d_hi) == pytest.approx(cut, abs=1e-9)
    assert data["tooth_angle_deg"] == pytest.approx(cut, abs=1e-9)
    assert data["basic_angle_deg"] == pytest.approx(b)
    # space angle: measured between this tooth's upper flank and the next tooth's
    # lower flank; derived b + thinning / r + 360 / z (module docstring)
    pitch = 2 * math.pi / z
    d_next = rot(d_lo, pitch)
    space = cut + 360.0 / z
    assert _angle(d_hi, d_next) == pytest.approx(space, abs=1e-9)
    assert data["space_angle_deg"] == pytest.approx(space, abs=1e-9)
    assert data["cutter_angle_deg"] == pytest.approx(space, abs=1e-9)
    # flank angle at the pitch circle: measured between flank and radius there;
    # derived b/2 + 90/z (30 for the default angle)
    q = _cross(lo0, d_lo, r)
    flank = _angle(d_lo, q)
    assert flank == pytest.approx(b / 2 + 90.0 / z, abs=1e-9)
    assert data["flank_angle_deg"] == pytest.approx(flank, abs=1e-9)
    if angle is None:
        assert flank == pytest.approx(30.0, abs=1e-9)
    # thickness on the pitch circle: derived arc pi m / 2 - thinning, chord
    # 2 r sin(s / 2r); measured between the two flanks' crossings
    s = math.pi * m / 2 - thinning
    q_hi = _cross(hi1, d_hi, r)
    assert data["pitch_thickness_arc"] == pytest.approx(s, abs=1e-9)
    assert 2 * r * math.atan2(q[1] * -1, q[0]) == pytest.approx(s, abs=1e-9)
    assert data["pitch_thickness_chord"] == pytest.approx(2 * r * math.sin(s / (2 * r)))
    assert float(np.hypot(*(q_hi - q))) == pytest.approx(
        data["pitch_thickness_chord"], abs=1e-9
    )
    # tip width: the flanks carried up to the tip circle r + 0.6 m, measured chord
    ra = r + 0.6 * m
    tip_w = float(np.hypot(*(_cross(lo0, d_lo, ra) - _cross(hi1, d_hi, ra))))
    assert data["tip_width"] == pytest.approx(tip_w, abs=1e-9)
    # tip land: the chord of the tip arc left between the roundings (the outline's arc
    # on the tip circle); without rounding it is the tip width itself
    tip_arcs = [
        seg for seg in outline_for(spec).tooth
        if seg.kind == "arc" and np.allclose(np.hypot(*seg.points.T), ra)
    ]  # fmt: skip
    (land,) = tip_arcs
    assert data["tip_land"] == pytest.approx(
        float(np.hypot(*(land.end - land.start))), abs=1e-9
    )
    if tip == 0.0:
        assert data["tip_land"] == pytest.approx(tip_w, abs=1e-9)
    # root width: the space between the flanks carried down to the root circle,
    # measured from this tooth's upper flank to the next tooth's lower flank
    rf = r - ded * m
    a_hi = _inward(hi0, -d_hi, rf)
    a_nx = _inward(rot(lo1, pitch), -d_next, rf)
    if data["v_root"]:
        # the flanks meet above the root circle: they cross before reaching it
        assert data["root_width"] == 0.0
        assert math.atan2(a_hi[1], a_hi[0]) > math.atan2(a_nx[1], a_nx[0])
    else:
        assert data["root_width"] == pytest.approx(
            float(np.hypot(*(a_nx - a_hi))), abs=1e-9
        )
        assert data["cutter_tip_width"] == data["root_width"]
    # depth of cut, blank and the cutter's tip radius, measured on the outline
    radius = np.hypot(*outline_for(spec).tooth_polyline(1e-5).T)
    assert data["cutter_depth"] == pytest.approx(radius.max() - radius.min(), abs=1e-6)
    assert data["blank_diameter"] == pytest.approx(2 * radius.max(), abs=1e-9)
    roundings = [
        circle_through(*seg.points)
        for seg in outline_for(spec).tooth
        if seg.kind == "arc"
        and not np.allclose(circle_through(*seg.points)[0], 0.0, atol=1e-9)
    ]
    assert any(rad == pytest.approx(root * m, abs=1e-9) for _, rad in roundings), (
        "the root rounding is the cutter's tip radius"
    )
    assert data["cutter_tip_radius"] == pytest.approx(root * m)


def _inward(p: np.ndarray, d: np.ndarray, radius: float) -> np.ndarray:
    """Where the line from ``p`` along ``d`` first meets the circle of ``radius``."""
    a, b, c = d @ d, 2 * p @ d, p @ p - radius * radius
    t = (-b - math.sqrt(b * b - 4 * a * c)) / (2 * a)
    return p + t * d


# --- the pair: play and transmission error against a contact worked out by hand


def _wrap(a: float) -> float:
    return (a + math.pi) % (2 * math.pi) - math.pi


def _teeth(spec: ToothSpec, near: float, span: int = 3) -> tuple[list, list]:
    """Tip corners and straight flanks (p0, p1) of the teeth whose middles lie within
    ``span`` pitches of the polar angle ``near`` (radians), in the wheel's frame."""
    lo0, lo1, hi0, hi1 = _flanks(spec)
    pitch = 2 * math.pi / spec.teeth
    k0 = round(near / pitch)
    corners, flanks = [], []
    for k in range(k0 - span, k0 + span + 1):
        a = k * pitch
        corners += [rot(lo1, a), rot(hi0, a)]
        flanks += [(rot(lo0, a), rot(lo1, a)), (rot(hi1, a), rot(hi0, a))]
    return corners, flanks


def _touch_offsets(s1, s2, a, th1, ideal):
    """Every offset of the driven wheel from its ideal angle at which a sharp tip
    corner of one wheel lies on a straight flank of the other, driver turned ``th1``
    (the closed form of tests/_contact.py)."""
    c1, f1 = _teeth(s1, -th1)  # driver teeth facing the driven wheel
    c2, f2 = _teeth(s2, math.pi - ideal)  # driven teeth facing the driver
    return [_wrap(t2 - ideal) for t2 in touch_angles(c1, f1, c2, f2, a, th1)]


@pytest.mark.parametrize(("z1", "z2", "backlash"), [(20, 30, 0.6), (12, 40, 0.8)])
def test_play_and_transmission_error_of_the_pair_by_hand(z1, z2, backlash):
    # sharp tips, so that every first contact is a tip corner on a straight flank
    data = _json("-z", str(z1), "-m", "1", "--mate", str(z2), "--tip-radius", "0",
                 "--backlash", str(backlash), "--process", "hand")  # fmt: skip
    assert data["runs"] and data["centre_distance"] == pytest.approx((z1 + z2) / 2)
    s1, s2 = (
        ToothSpec(z, 1.0, form="triangular", tooth_angle_deg=60 - 180 / z,
                  addendum=0.6, dedendum=0.85, root_radius=0.1, tip_radius=0.0,
                  thinning=backlash / 2)
        for z in (z1, z2)
    )  # fmt: skip
    a = (z1 + z2) / 2
    p2 = 2 * math.pi / z2
    drive, coast = [], []
    for th1_deg in data["te_curve"]["wheel_deg"]:
        th1 = math.radians(th1_deg)
        # the simulator's frame: the driven wheel's space faces the driver at the start
        ideal = math.pi - p2 / 2 - th1 * z1 / z2
        offsets = _touch_offsets(s1, s2, a, th1, ideal)
        # this much backlash leaves the ideal position free; turning the driven
        # wheel either way from it, the first touching is the contact
        drive.append(min(o for o in offsets if 0 < o < p2))
        coast.append(max(o for o in offsets if -p2 < o < 0))
    drive, coast = np.array(drive), np.array(coast)
    play = np.degrees(drive - coast)
    te = np.degrees(drive - drive[0])
    r2 = z2 / 2
    # the simulator resolves about 1e-4 degrees, 5e-4 where the contact passes from
    # one corner to another (mesh_sim docstring)
    assert data["least_play_deg"] == pytest.approx(play.min(), abs=5e-4)
    assert data["most_play_deg"] == pytest.approx(play.max(), abs=5e-4)
    assert data["least_play"] == pytest.approx(math.radians(play.min()) * r2, abs=2e-4)
    assert data["te_peak_to_peak_deg"] == pytest.approx(np.ptp(te), abs=5e-4)
    assert np.array(data["te_curve"]["te_deg"]) == pytest.approx(te, abs=5e-4)
    assert data["te_share_of_pitch"] == pytest.approx(np.ptp(te) / (360 / z2), abs=1e-4)


def test_text_sheet_shows_the_form_and_none_of_the_involute_items():
    result = _gear("-z", "32", "-m", "1", "--mate", "48", "--process", "hand")
    assert result.exit_code == 0, result.output
    text = result.output
    for line in ("tooth angle", "space angle", "flank angle", "tooth at pitch circle",
                 "tooth at tip", "space at root", "cutter", "play",
                 "transmission error", "verdict               runs"):  # fmt: skip
        assert line in text
    for word in ("base diameter", "working pressure angle", "contact ratio",
                 "span over", "over two", "form cutter", "undercut"):  # fmt: skip
        assert word not in text


def test_a_jamming_pair_says_so():
    # derived: no backlash and tall teeth (addendum 1.0 m) overlap somewhere in the
    # pitch (the straight flanks leave the ideal curve with the square of the height)
    data = _json("-z", "12", "-m", "1", "--mate", "12", "--addendum", "1.0",
                 "--dedendum", "1.25", "--backlash", "0")  # fmt: skip
    assert data["jams"] and not data["runs"] and data["least_play"] < 0
    text = _gear("-z", "12", "-m", "1", "--mate", "12", "--addendum", "1.0",
                 "--dedendum", "1.25", "--backlash", "0").output  # fmt: skip
    assert "JAMS" in text


def test_the_library_function_agrees_with_the_sheet():
    spec = ToothSpec(40, 1.0, form="triangular", tooth_angle_deg=55.5, thinning=0.1)
    data = triangular_data(spec)
    out = _json("-z", "40", "-m", "1", "--tooth-angle", "55.5", "--backlash", "0.2",
                "--addendum", "1", "--dedendum", "1.25", "--tip-radius", "0",
                "--root-radius", "0.38")  # fmt: skip
    assert out["space_angle_deg"] == pytest.approx(data.space_angle_deg)
    assert out["tip_width"] == pytest.approx(data.tip_width)
