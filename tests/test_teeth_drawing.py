"""The 1:1 SVG drawing and the polyline that feeds it."""

from __future__ import annotations

import math
import re

import numpy as np
import pytest

from wheelgen.teeth import ToothSpec, outline_for, outline_svg
from wheelgen.teeth.involute_tooth import generate_tooth


def test_svg_is_full_size_in_millimetres():
    outline = outline_for(ToothSpec(24, 1.5))
    text = outline_svg(outline, title="24 teeth")
    head = re.search(
        r'<svg[^>]*width="([\d.]+)mm" height="([\d.]+)mm" viewBox="([-\d. ]+)"', text
    )
    assert head, text[:300]
    width, height = float(head.group(1)), float(head.group(2))
    vb = [float(v) for v in head.group(3).split()]
    # 1:1: the viewBox (user units) spans exactly the printed millimetres
    assert vb[2] == pytest.approx(width) and vb[3] == pytest.approx(height)
    assert width >= 2 * outline.radii["tip"]
    # the four named circles at their radii (mm)
    for name in ("pitch", "base", "tip", "root"):
        r = float(re.search(rf'<circle id="{name}"[^>]* r="([\d.]+)"', text).group(1))
        assert r == pytest.approx(outline.radii[name], abs=1e-4)
    assert "<title>24 teeth</title>" in text


def test_svg_path_follows_the_outline():
    outline = outline_for(ToothSpec(12, 2.0))
    text = outline_svg(outline, chord_tol=0.001)
    d = re.search(r'<path id="outline" d="([^"]+)"', text).group(1)
    nums = np.array([float(v) for v in re.findall(r"-?[\d.]+", d)]).reshape(-1, 2)
    radius = np.hypot(nums[:, 0], nums[:, 1])
    # every vertex between root and tip circles (4 decimals written)
    assert radius.min() >= outline.radii["root"] - 1e-4
    assert radius.max() <= outline.radii["tip"] + 1e-4
    # y is flipped (SVG y points down): the first point, at -180/z deg (below +X in
    # the wheel frame), is written with a positive y
    assert nums[0, 1] > 0
    assert d.endswith("Z")


def test_polyline_keeps_its_chord_tolerance_on_the_involute():
    # derived: every polyline vertex of a flank lies on the involute within the
    # spline error, and the chords between vertices bulge less than chord_tol
    spec = ToothSpec(20, 1.0)
    gen = generate_tooth(spec)
    flank = [s for s in outline_for(spec).tooth if s.kind == "spline"][1]
    for tol in (1e-2, 1e-3, 1e-5):
        pts = flank.polyline(tol)
        t = np.linspace(gen.form_roll_rad, gen.tip_roll_rad, 4001)
        rad = gen.base_radius * np.sqrt(1 + t * t)
        th = gen.base_start_angle_rad + t - np.arctan(t)
        exact = np.column_stack((rad * np.cos(th), rad * np.sin(th)))
        # largest distance from the exact curve to the polyline
        worst = 0.0
        a, b = pts[:-1], pts[1:]
        ab = b - a
        l2 = (ab**2).sum(1)
        for p in exact[::20]:
            u = np.clip(((p - a) * ab).sum(1) / l2, 0, 1)
            worst = max(worst, float(np.hypot(*(a + u[:, None] * ab - p).T).min()))
        assert worst <= tol * 1.05 + 1e-7
        # and not absurdly many points: about sqrt(curvature / tol) per mm
        assert len(pts) < 40 + 10 / math.sqrt(tol)


def test_bad_drawing_arguments_are_refused():
    with pytest.raises(ValueError, match="chord_tol"):
        outline_svg(outline_for(ToothSpec(12, 1.0)), chord_tol=0.0)
