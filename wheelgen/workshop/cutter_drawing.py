"""The 1:1 drawing of the form cutter that cuts one triangular wheel's teeth.

The cutter's profile is the space between two basic teeth of the wheel (before the
backlash, which comes from feeding the cutter further), taken from the same outline the
wheel's part files are made from: its straight flanks, its tip rounded as the wheel's
root and its shoulders rounded as the wheel's tooth tips. The page is drawn in
millimetres: printed at actual size, the left-hand profile is the cutter itself, to
grind to or to lay a ground cutter on; the right-hand profile is the same, enlarged,
with the sizes, written in the design's units (:class:`wheelgen.design.units.Lengths`).
A check bar (10 mm, or 1/2 in in inches) tells whether the printer kept the scale.
"""

from __future__ import annotations

import math

import numpy as np

from ..design.units import MM, Lengths
from ..teeth.forms import outline_for
from ..teeth.outline import WheelOutline
from ..teeth.spec import ToothSpec
from ..teeth.triangular_cut import TriangularCut
from ._svg import esc, fmt

__all__ = ["cutter_profile", "cutter_svg"]

_CHORD = 0.001  # mm: the profile's chord error, far below what a grinder holds
#: The check bar in each unit: its length (mm) and its label.
_BAR = {"mm": (10.0, "10 mm"), "in": (12.7, "1/2 in")}  # derived: 25.4 / 2


def cutter_profile(spec: ToothSpec) -> np.ndarray:
    """The cutter's profile as a closed ``(n, 2)`` polyline in mm.

    The space's middle is the +y axis, the blank's rim (the tip circle) is y = 0, the
    cutter's tip points down to y = -full depth; above the rim the profile runs on
    from the middles of the two neighbouring teeth up to the cutter's body.
    """
    from dataclasses import replace

    outline: WheelOutline = outline_for(replace(spec, thinning=0.0))
    one = outline.tooth_polyline(_CHORD)
    ang = np.arctan2(one[:, 1], one[:, 0])
    pitch = 2 * math.pi / spec.teeth
    upper = one[ang >= 0]  # this tooth from its middle to the space above it
    a = pitch
    rot = np.array([[math.cos(a), -math.sin(a)], [math.sin(a), math.cos(a)]])
    lower = one[ang < 0] @ rot.T  # the next tooth from the space to its middle
    chain = np.vstack((upper, lower))
    # turn the space's middle (at half a pitch) onto +y, outward
    t = math.pi / 2 - pitch / 2
    rot = np.array([[math.cos(t), -math.sin(t)], [math.sin(t), math.cos(t)]])
    chain = chain @ rot.T
    tip = float(np.hypot(*chain.T).max())
    chain[:, 1] -= tip
    # the chain runs from this tooth's middle (now on the right) down through the
    # space and up to the next tooth's middle (on the left); the body closes it above
    body = max(0.6 * float(-chain[:, 1].min()), 0.5)
    top = np.array([[chain[-1, 0], body], [chain[0, 0], body]])
    return np.vstack((chain, top))


def _poly(points: np.ndarray, scale: float, ox: float, oy: float) -> str:
    pts = " ".join(
        f"{fmt(ox + scale * x, 4)},{fmt(oy - scale * y, 4)}" for x, y in points
    )
    return pts


def _nice_scale(depth: float) -> float:
    """The largest of the usual enlargements that keeps the cutter within 45 mm."""
    for k in (200, 100, 50, 20, 10, 5, 2):
        if depth * k <= 45:
            return float(k)
    return 1.0


def _pitch(spec: ToothSpec, cut: TriangularCut, u: Lengths) -> str:
    """The tooth size in the title: the diametral pitch of a DP wheel in inches."""
    if u.inches and spec.diametral_pitch is not None:
        return f"{spec.diametral_pitch:g} diametral pitch"
    return f"module {fmt(cut.module, 4)} mm"


def cutter_svg(
    wheel: str, spec: ToothSpec, cut: TriangularCut, lengths: Lengths = MM
) -> str:
    """The drawing of ``wheel``'s form cutter as SVG text, 1 user unit = 1 mm; its
    sizes in ``lengths``' units."""
    u = lengths
    bar, bar_label = _BAR[u.unit]
    prof = cutter_profile(spec)
    depth = cut.full_depth
    k = _nice_scale(depth)
    width_1 = float(prof[:, 0].max() - prof[:, 0].min())
    big_w = k * width_1
    margin = 10.0
    page_w = max(170.0, margin * 3 + width_1 + 45 + big_w + 38)
    body = float(prof[:, 1].max())
    y_rim = 30.0 + k * body  # page y of the rim line in the enlarged view
    page_h = y_rim + k * depth + 52.0
    out = [
        '<?xml version="1.0" encoding="UTF-8"?>\n',
        f'<svg xmlns="http://www.w3.org/2000/svg" width="{fmt(page_w, 2)}mm" '
        f'height="{fmt(page_h, 2)}mm" viewBox="0 0 {fmt(page_w, 2)} {fmt(page_h, 2)}" '
        'font-family="sans-serif">\n',
        f'<text x="{margin}" y="10" font-size="4.2" font-weight="bold">Form cutter for '
        f"{esc(wheel)}: {cut.teeth} triangular teeth, {esc(_pitch(spec, cut, u))}"
        "</text>\n",
        f'<text x="{margin}" y="16" font-size="3">Print at actual size (100 %, no '
        f"fitting to the page); the check bar must measure {bar_label}.</text>\n",
    ]
    # 1:1 profile
    x1 = margin + 5 + width_1 / 2
    out.append(
        f'<polygon id="{esc(wheel)}-profile-1to1" points="{_poly(prof, 1.0, x1, y_rim)}" '
        'fill="#cfd6dd" stroke="#000" stroke-width="0.05"/>\n'
    )
    out.append(
        f'<text x="{fmt(x1, 3)}" y="{fmt(y_rim + depth + 6, 3)}" font-size="3" '
        'text-anchor="middle">1:1</text>\n'
    )
    # enlarged profile with its sizes
    xb = margin * 2 + width_1 + 45 + big_w / 2
    out.append(
        f'<polygon id="{esc(wheel)}-profile-enlarged" points="{_poly(prof, k, xb, y_rim)}" '
        'fill="#e8ecf0" stroke="#000" stroke-width="0.3"/>\n'
    )
    rim_l, rim_r = xb - big_w / 2 - 4, xb + big_w / 2 + 4
    out.append(
        f'<line x1="{fmt(rim_l)}" y1="{fmt(y_rim)}" x2="{fmt(rim_r)}" y2="{fmt(y_rim)}" '
        'stroke="#1f5f8b" stroke-width="0.25" stroke-dasharray="2,1"/>\n'
        f'<text x="{fmt(rim_l - 1)}" y="{fmt(y_rim + 1)}" font-size="2.8" '
        'fill="#1f5f8b" text-anchor="end">blank rim</text>\n'
    )
    y_tip = y_rim + k * depth
    dx = xb + big_w / 2 + 8
    out.append(
        f'<line x1="{fmt(dx)}" y1="{fmt(y_rim)}" x2="{fmt(dx)}" y2="{fmt(y_tip)}" '
        'stroke="#000" stroke-width="0.25"/>\n'
        f'<line x1="{fmt(xb)}" y1="{fmt(y_tip)}" x2="{fmt(dx + 2)}" y2="{fmt(y_tip)}" '
        'stroke="#000" stroke-width="0.15" stroke-dasharray="1,1"/>\n'
        f'<text x="{fmt(dx + 1.5)}" y="{fmt((y_rim + y_tip) / 2 + 1)}" '
        f'font-size="2.8">depth {u.num(depth, 3)}</text>\n'
    )
    # the space angle: an arc between the two flanks, centred where they would meet
    half = math.radians(cut.space_angle_deg) / 2
    flank = prof[np.argmin(np.abs(prof[:, 1] + depth / 2))]
    apex_y = flank[1] - abs(flank[0]) / math.tan(half)  # mm, cutter frame
    ay = y_rim - k * apex_y
    rad = k * depth * 0.9
    p0 = (xb - rad * math.sin(half), ay - rad * math.cos(half))
    p1 = (xb + rad * math.sin(half), ay - rad * math.cos(half))
    out.append(
        f'<path d="M{fmt(p0[0])},{fmt(p0[1])} A{fmt(rad)},{fmt(rad)} 0 0 1 '
        f'{fmt(p1[0])},{fmt(p1[1])}" fill="none" stroke="#b5562d" '
        'stroke-width="0.25"/>\n'
        f'<text x="{fmt(xb)}" y="{fmt(ay - rad - 1.5)}" font-size="2.8" fill="#b5562d" '
        f'text-anchor="middle">{cut.space_angle_deg:.2f}\u00b0 included</text>\n'
    )
    # the list of sizes under the drawing
    lines = [
        f"included angle {cut.space_angle_deg:.4f}\u00b0 (tooth angle "
        f"{cut.space_angle_deg - 360 / cut.teeth:g}\u00b0 + 360\u00b0/{cut.teeth})",
        f"full depth {u.fixed(cut.full_depth, 3)} from the rim; feed in "
        f"{u.fixed(cut.infeed, 4)} (+{u.fixed(cut.extra_infeed, 4)} for a thinning "
        f"of {u.fixed(cut.thinning, 4)})",
        f"tip {u.fixed(cut.tip_width, 3)} across the flanks, rounded R "
        f"{u.fixed(cut.tip_radius, 3)}",
        f"shoulders rounded R {u.fixed(cut.shoulder_radius, 3)} (the teeth's tips)"
        if cut.shoulder_radius > 0
        else "shoulders sharp (the teeth's tips are not rounded)",
        f"check: {u.fixed(cut.over_pins, 4)} over two \u00d8{u.fixed(cut.pin_diameter, 2)} "
        f"{'balls' if cut.teeth % 2 else 'pins'} at the full feed",
        f"enlarged view {k:g}:1",
    ]
    y = y_tip + 12
    for line in lines:
        out.append(
            f'<text x="{margin}" y="{fmt(y)}" font-size="3">{esc(line)}</text>\n'
        )
        y += 5
    # the check bar at 1:1
    by = page_h - 8
    out.append(
        f'<g id="{esc(wheel)}-check-bar" stroke="#000" stroke-width="0.3"><line x1="{margin}" '
        f'y1="{fmt(by)}" x2="{fmt(margin + bar)}" y2="{fmt(by)}"/><line x1="{margin}" '
        f'y1="{fmt(by - 1.5)}" x2="{margin}" y2="{fmt(by + 1.5)}"/><line '
        f'x1="{fmt(margin + bar)}" y1="{fmt(by - 1.5)}" x2="{fmt(margin + bar)}" '
        f'y2="{fmt(by + 1.5)}"/></g>\n'
        f'<text x="{fmt(margin + bar + 3)}" y="{fmt(by + 1)}" font-size="3">'
        f"{bar_label}</text>\n"
    )
    out.append("</svg>\n")
    return "".join(out)
